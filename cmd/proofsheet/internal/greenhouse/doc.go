// Package greenhouse is the demo's cleanup chain: it reads the invented
// datalogger uploads of a network of community greenhouses and produces a
// daily table per house (minimum, maximum and mean temperature, readings
// kept and dropped) and season-to-date growing degree days, base 10 °C.
// Its tests use every part of proofsheet; proofsheet demo runs it.
//
// Typical use:
//
//	var uploads []*fixtures.Table
//	for _, u := range greenhouse.Uploads() {
//		tb, _, err := greenhouse.Load(u.Name, u.Data) // read as text
//		if err != nil {
//			return err
//		}
//		uploads = append(uploads, tb)
//	}
//	report, err := greenhouse.Report(uploads, greenhouse.Options{})
package greenhouse

//go:generate go run gen_raw.go
