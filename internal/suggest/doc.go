// Package suggest finds the name a person probably meant when they typed
// one that does not exist: the closest of the known names by edit
// distance, for "did you mean" messages of assert and the command line.
//
// Typical use:
//
//	if best, ok := suggest.Closest("hosue", []string{"house", "day", "tmax"}); ok {
//		msg += fmt.Sprintf(" (did you mean %q?)", best) // "house"
//	}
package suggest
