package assert

import (
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/sergi/go-diff/diffmatchpatch"
)

// Markers that make invisible characters visible in text edits. They are
// spelled between ⟨ and ⟩ so that they cannot be mistaken for the text.
var invisibleNames = map[rune]string{
	'\t':     "tab",
	'\r':     "cr",
	'\n':     "lf",
	'\u00a0': "nbsp",
	'\u00ad': "shy",
	'\u200b': "zwsp",
	'\u200c': "zwnj",
	'\u200d': "zwj",
	'\u2060': "wj",
	'\ufeff': "bom",
}

// visibleRune returns the marker of an invisible rune, or "" for a rune
// that shows as itself.
func visibleRune(r rune) string {
	if r >= byteRunes && r < byteRunes+256 {
		return fmt.Sprintf("⟨0x%02X⟩", r-byteRunes)
	}
	if name, ok := invisibleNames[r]; ok {
		return "⟨" + name + "⟩"
	}
	if r == ' ' {
		return ""
	}
	if unicode.IsControl(r) || unicode.Is(unicode.Cf, r) || unicode.Is(unicode.Zs, r) || unicode.Is(unicode.Zl, r) || unicode.Is(unicode.Zp, r) {
		return fmt.Sprintf("⟨U+%04X⟩", r)
	}
	return ""
}

// visible writes s with its invisible characters as markers. Spaces are
// shown as ⟨sp⟩ when allSpaces is set; otherwise only spaces at the start
// (lead) or the end (trail) of s are.
func visible(s string, allSpaces, lead, trail bool) string {
	var b strings.Builder
	first := len(s) - len(strings.TrimLeft(s, " "))
	last := len(strings.TrimRight(s, " "))
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			fmt.Fprintf(&b, "⟨0x%02X⟩", s[i])
		case r == ' ' && (allSpaces || (lead && i < first) || (trail && i >= last)):
			b.WriteString("⟨sp⟩")
		default:
			if m := visibleRune(r); m != "" {
				b.WriteString(m)
			} else {
				b.WriteRune(r)
			}
		}
		i += size
	}
	return b.String()
}

// Edit markers: a changed stretch of text is written ⟦want→got⟧, with
// either side empty for a pure deletion or insertion.
const (
	editOpen  = "⟦"
	editArrow = "→"
	editClose = "⟧"
)

// editStyle colours the parts of an edit; the zero value writes plain text.
type editStyle struct {
	want, got, reset string
}

// textEdit returns a one-line character edit from want to got: common text
// as it is, changed stretches as ⟦want→got⟧, invisible characters as
// markers. ok is false when the strings share too little for an edit to
// help (then both are best read whole).
func textEdit(want, got string, st editStyle) (line string, ok bool) {
	diffs := charDiff(keepBytes(want), keepBytes(got))
	common := 0
	for _, d := range diffs {
		if d.Type == diffmatchpatch.DiffEqual {
			common += utf8.RuneCountInString(d.Text)
		}
	}
	longest := max(utf8.RuneCountInString(want), utf8.RuneCountInString(got))
	if (common < 2 || common*3 < longest) && !hasInvisible(want) && !hasInvisible(got) {
		return "", false
	}
	var b strings.Builder
	n := len(diffs)
	for i := 0; i < n; i++ {
		d := diffs[i]
		if d.Type == diffmatchpatch.DiffEqual {
			b.WriteString(visible(elide(d.Text, i == 0, i == n-1), false, i == 0, i == n-1))
			continue
		}
		var del, ins string
		for ; i < n && diffs[i].Type != diffmatchpatch.DiffEqual; i++ {
			if diffs[i].Type == diffmatchpatch.DiffDelete {
				del += diffs[i].Text
			} else {
				ins += diffs[i].Text
			}
		}
		i--
		b.WriteString(editOpen)
		if del != "" {
			b.WriteString(st.want + visible(elideChange(del), true, true, true) + st.reset)
		}
		b.WriteString(editArrow)
		if ins != "" {
			b.WriteString(st.got + visible(elideChange(ins), true, true, true) + st.reset)
		}
		b.WriteString(editClose)
	}
	return b.String(), true
}

// editMiddle bounds, in bytes of both sides together, the changed middle
// of two texts (what is left between their common start and end) that
// is diffed character by character. A character diff costs time that
// grows with the product of the lengths of the middles: two differing
// cells of 10,000 characters took a second each (and then gave up at the
// library's time limit, so the edit also depended on the machine's
// speed). A longer middle is shown as one change.
const editMiddle = 512

// charDiff returns the character edit from want to got. When the changed
// middle is short it is diffmatchpatch's semantic edit of the two texts,
// without a time limit, so the result never depends on the machine (the
// library trims the common start and end itself, in time linear in their
// length); else it is the common start, one deletion, one insertion and
// the common end.
func charDiff(want, got string) []diffmatchpatch.Diff {
	p := commonPrefix(want, got)
	sfx := commonSuffix(want[p:], got[p:])
	mw, mg := want[p:len(want)-sfx], got[p:len(got)-sfx]
	if len(mw)+len(mg) <= editMiddle {
		dmp := diffmatchpatch.New()
		dmp.DiffTimeout = 0
		return tidyDiffs(dmp.DiffCleanupSemantic(dmp.DiffMain(want, got, false)))
	}
	var diffs []diffmatchpatch.Diff
	if p > 0 {
		diffs = append(diffs, diffmatchpatch.Diff{Type: diffmatchpatch.DiffEqual, Text: want[:p]})
	}
	if mw != "" {
		diffs = append(diffs, diffmatchpatch.Diff{Type: diffmatchpatch.DiffDelete, Text: mw})
	}
	if mg != "" {
		diffs = append(diffs, diffmatchpatch.Diff{Type: diffmatchpatch.DiffInsert, Text: mg})
	}
	if sfx > 0 {
		diffs = append(diffs, diffmatchpatch.Diff{Type: diffmatchpatch.DiffEqual, Text: want[len(want)-sfx:]})
	}
	return diffs
}

// tidyDiffs drops the empty pieces diffmatchpatch's semantic cleanup can
// leave ("0" → "010001…" gave an empty deletion beside an empty equal
// piece, which an edit would show as ⟦→⟧) and joins neighbours of one
// type.
func tidyDiffs(diffs []diffmatchpatch.Diff) []diffmatchpatch.Diff {
	out := diffs[:0]
	for _, d := range diffs {
		switch {
		case d.Text == "":
		case len(out) > 0 && out[len(out)-1].Type == d.Type:
			out[len(out)-1].Text += d.Text
		default:
			out = append(out, d)
		}
	}
	return out
}

// commonPrefix is the length in bytes of the common start of a and b, on
// a character boundary.
func commonPrefix(a, b string) int {
	n := 0
	for n < len(a) && n < len(b) && a[n] == b[n] {
		n++
	}
	for n > 0 && n < len(a) && !utf8.RuneStart(a[n]) {
		n--
	}
	for n > 0 && n < len(b) && !utf8.RuneStart(b[n]) {
		n--
	}
	return n
}

// commonSuffix is the length in bytes of the common end of a and b, on a
// character boundary.
func commonSuffix(a, b string) int {
	n := 0
	for n < len(a) && n < len(b) && a[len(a)-1-n] == b[len(b)-1-n] {
		n++
	}
	for n > 0 && !utf8.RuneStart(a[len(a)-n]) {
		n--
	}
	return n
}

// maxChange is how many characters of a changed stretch an edit shows;
// the middle of a longer one is cut to "…".
const maxChange = 4 * editContext

// elideChange shortens a long changed stretch of an edit, keeping both
// ends.
func elideChange(s string) string {
	if utf8.RuneCountInString(s) <= maxChange {
		return s
	}
	r := []rune(s)
	return string(r[:maxChange/2]) + "…" + string(r[len(r)-maxChange/2:])
}

// editContext is how many characters of unchanged text an edit keeps next
// to each change; longer unchanged stretches are cut to "…".
const editContext = 16

// elide shortens an unchanged stretch of an edit: the first stretch keeps
// its end, the last its start, inner ones both ends.
func elide(s string, first, last bool) string {
	r := []rune(s)
	if len(r) <= 2*editContext+1 {
		return s
	}
	switch {
	case first && last:
		return s
	case first:
		return "…" + string(r[len(r)-editContext:])
	case last:
		return string(r[:editContext]) + "…"
	}
	return string(r[:editContext]) + "…" + string(r[len(r)-editContext:])
}

// hasInvisible reports whether s holds a character an edit would show as
// a marker, or starts or ends with a space.
func hasInvisible(s string) bool {
	if strings.HasPrefix(s, " ") || strings.HasSuffix(s, " ") || !utf8.ValidString(s) {
		return true
	}
	for _, r := range s {
		if visibleRune(r) != "" {
			return true
		}
	}
	return false
}

// byteRunes is where keepBytes puts invalid UTF-8 bytes: 256 code points of
// Supplementary Private Use Area-B, which the character diff treats like
// any rune and visibleRune writes back as ⟨0xNN⟩.
const byteRunes = 0x10ff00

// keepBytes replaces each byte of s that is not valid UTF-8 by its stand-in
// rune, so the character diff (which works on runes) keeps it distinct.
func keepBytes(s string) string {
	if utf8.ValidString(s) {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 {
			b.WriteRune(byteRunes + rune(s[i]))
		} else {
			b.WriteString(s[i : i+size])
		}
		i += size
	}
	return b.String()
}
