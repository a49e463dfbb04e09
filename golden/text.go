package golden

import (
	"fmt"
	"strconv"
	"strings"
	"unicode"

	"github.com/sergi/go-diff/diffmatchpatch"
)

// Text checks got against the golden text file of name under the store's
// directory (<name>.gold.txt), byte for byte. When they differ the test
// fails with a line diff (see TextDiff). A missing file fails and prints
// the command that creates it; in update mode (-update or
// PROOFSHEET_UPDATE=1, refused under CI) the file is written instead and
// the check passes. The result reports whether the check passed.
//
// The file is compared exactly, line endings included: if your repository
// converts line endings on checkout, exempt golden files (for git, a
// .gitattributes line such as "*.gold.* -text").
func (s Store) Text(t T, name string, got string) bool {
	t.Helper()
	return s.run(t, name, KindText, course{
		compare: func(_ string, stored []byte) result {
			if string(stored) == got {
				return result{equal: true}
			}
			return result{diff: TextDiff(string(stored), got)}
		},
		encode: func() ([]byte, error) { return []byte(got), nil },
	})
}

// editOps returns a shortest edit script turning a into b, with the runes
// of a and b as the symbols. The diff has no time limit, so it is minimal
// and the same on every machine (go-diff's default one-second limit would
// make large diffs depend on the machine's speed).
func editOps(a, b []rune) []diffmatchpatch.Diff {
	dmp := diffmatchpatch.New()
	dmp.DiffTimeout = 0
	return dmp.DiffMainRunes(a, b, false)
}

// lineDiffs returns the line-level edit script from want to got: each line
// (with its newline) is one symbol.
func lineDiffs(want, got string) []diffmatchpatch.Diff {
	dmp := diffmatchpatch.New()
	ra, rb, lines := dmp.DiffLinesToRunes(want, got)
	return dmp.DiffCharsToLines(editOps(ra, rb), lines)
}

// lineOp is one line of a line diff.
type lineOp struct {
	op    diffmatchpatch.Operation
	text  string // without its newline
	noEOL bool   // the file's last line, with no newline after it
	a, b  int    // 1-based line numbers in want and got; 0 where absent
}

func lineOps(want, got string) []lineOp {
	var ops []lineOp
	a, b := 1, 1
	for _, d := range lineDiffs(want, got) {
		text := d.Text
		for text != "" {
			line, rest, nl := strings.Cut(text, "\n")
			text = rest
			op := lineOp{op: d.Type, text: line, noEOL: !nl}
			switch d.Type {
			case diffmatchpatch.DiffEqual:
				op.a, op.b = a, b
				a++
				b++
			case diffmatchpatch.DiffDelete:
				op.a = a
				a++
			case diffmatchpatch.DiffInsert:
				op.b = b
				b++
			}
			ops = append(ops, op)
		}
	}
	return ops
}

// textContext is how many unchanged lines TextDiff shows around a change.
const textContext = 3

// textDiffMaxLines caps the listed lines of TextDiff.
const textDiffMaxLines = 400

// TextDiff describes how got differs from want, line by line, in groups of
// changed lines with up to three unchanged lines around them. Each listed
// line shows its number in want and in got and a mark: "-" only in want
// (the golden file), "+" only in got, blank in both. Lines with invisible
// content (trailing blanks, tabs, carriage returns, control characters)
// are shown as quoted Go strings; a last line without a newline is marked.
// The edit script is a shortest one (Myers' algorithm, as go-diff
// implements it), so the output is the same on every run. It returns ""
// when want equals got.
func TextDiff(want, got string) string {
	if want == got {
		return ""
	}
	ops := lineOps(want, got)
	changed, dels, ins := changedOps(ops)
	maxA, maxB := 1, 1
	for _, op := range ops {
		maxA, maxB = max(maxA, op.a), max(maxB, op.b)
	}
	wa, wb := len(strconv.Itoa(maxA)), len(strconv.Itoa(maxB))
	var sb strings.Builder
	fmt.Fprintf(&sb, "%s only in want (-), %s only in got (+):\n", plural(dels, "line", "lines"), plural(ins, "line", "lines"))
	listed := 0
	for _, h := range hunks(changed, len(ops)) {
		from, to := h[0], h[1]
		fmt.Fprintf(&sb, "want %s, got %s:\n", lineRange(ops[from:to+1], true), lineRange(ops[from:to+1], false))
		for k := from; k <= to; k++ {
			if listed == textDiffMaxLines {
				rest := 0
				for _, c := range changed {
					if c >= k {
						rest++
					}
				}
				fmt.Fprintf(&sb, "… %s not shown\n", plural(rest, "more changed line", "more changed lines"))
				return sb.String()
			}
			op := ops[k]
			fmt.Fprintf(&sb, "%*s %*s %c  %s\n", wa, lineNo(op.a), wb, lineNo(op.b), op.mark(), showLine(op))
			listed++
		}
	}
	return sb.String()
}

// changedOps returns the indexes of the inserted and deleted lines of
// ops, and how many of each there are.
func changedOps(ops []lineOp) (changed []int, dels, ins int) {
	for i, op := range ops {
		switch op.op {
		case diffmatchpatch.DiffDelete:
			dels++
		case diffmatchpatch.DiffInsert:
			ins++
		default:
			continue
		}
		changed = append(changed, i)
	}
	return changed, dels, ins
}

// hunks groups changed op indexes into [from, to] spans of ops with
// textContext unchanged lines around them; changes closer than twice the
// context share a span.
func hunks(changed []int, n int) [][2]int {
	var out [][2]int
	for i := 0; i < len(changed); {
		j := i
		for j+1 < len(changed) && changed[j+1]-changed[j] <= 2*textContext+1 {
			j++
		}
		out = append(out, [2]int{max(0, changed[i]-textContext), min(n-1, changed[j]+textContext)})
		i = j + 1
	}
	return out
}

// mark is the line's sign in a diff: - deleted, + inserted, blank kept.
func (op lineOp) mark() byte {
	switch op.op {
	case diffmatchpatch.DiffDelete:
		return '-'
	case diffmatchpatch.DiffInsert:
		return '+'
	}
	return ' '
}

func lineNo(n int) string {
	if n == 0 {
		return ""
	}
	return strconv.Itoa(n)
}

// lineRange writes the span of line numbers of one side in ops, "3-7",
// "3", or "none" when the side has no line there.
func lineRange(ops []lineOp, want bool) string {
	first, last := 0, 0
	for _, op := range ops {
		n := op.b
		if want {
			n = op.a
		}
		if n == 0 {
			continue
		}
		if first == 0 {
			first = n
		}
		last = n
	}
	switch {
	case first == 0:
		return "no lines"
	case first == last:
		return "line " + strconv.Itoa(first)
	}
	return fmt.Sprintf("lines %d-%d", first, last)
}

// showLine writes a line for TextDiff: quoted when it has invisible
// content, marked when it has no newline.
func showLine(op lineOp) string {
	s := op.text
	if strings.TrimRight(s, " \t") != s || strings.IndexFunc(s, func(r rune) bool { return r != ' ' && !unicode.IsPrint(r) }) >= 0 {
		s = strconv.Quote(s)
	}
	if op.noEOL {
		s += "   [no newline at end]"
	}
	return s
}
