// Package textwidth measures how many terminal columns a string takes, so
// that the aligned layouts of fixtures and assert line up with accented,
// East Asian and combining text and with emoji (modifiers, ZWJ sequences,
// flags and variation selectors): it measures grapheme clusters with
// github.com/rivo/uniseg.
//
// Typical use:
//
//	w := textwidth.Width("Bellecôte")          // 9
//	cell := textwidth.PadRight("Ørnely", 12)   // padded to 12 columns
//	short := textwidth.Truncate(long, 20)      // at most 20 columns, ending in …
package textwidth
