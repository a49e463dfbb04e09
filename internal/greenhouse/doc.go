// Package greenhouse is the demo's cleanup chain: it reads the invented
// datalogger uploads of a network of community greenhouses and produces a
// daily table per house and season-to-date growing degree days.
package greenhouse

//go:generate go run gen_raw.go
