package property

import (
	"fmt"
	"hash/fnv"
	"strings"
	"testing"

	"github.com/proofsheet/proofsheet/fixtures"
)

// FromBytes makes a sample of the schema from fuzz input: data is the
// random source of every choice — the row count (within Options.MinRows
// and MaxRows), each value, null and spelling — read eight bytes at a
// time, zeros once it runs out (so empty input gives an empty table, and
// short input a plain one). The same bytes always make the same sample,
// so a crasher Go's fuzzer saves under testdata/fuzz replays as the same
// table. The sample's Seed is a hash of data.
func FromBytes(schema fixtures.Schema, opts Options, data []byte) (*Sample, error) {
	c, err := opts.compile(schema)
	if err != nil {
		return nil, err
	}
	r := newByteRng(data)
	n := c.minRows + r.intn(c.maxRows-c.minRows+1)
	return generateFrom(schema, n, bytesSeed(data), r, c), nil
}

// FileFromBytes is FromBytes for a raw CSV file: the bytes also choose its
// delimiter, quoting, encoding and line ending (or one of the given
// styles).
func FileFromBytes(schema fixtures.Schema, opts Options, data []byte, styles ...CSVStyle) (*File, error) {
	c, err := opts.compile(schema)
	if err != nil {
		return nil, err
	}
	r := newByteRng(data)
	var st CSVStyle
	if len(styles) > 0 {
		st = styles[r.intn(len(styles))]
	} else {
		st = CSVStyle{
			Delimiter:  pick(r, Delimiters()),
			Quoting:    Quoting(r.intn(int(QuoteMixed) + 1)),
			Encoding:   pick(r, Encodings()),
			LineEnding: LineEnding(r.intn(int(MixedEndings) + 1)),
		}
	}
	if st, err = st.norm(); err != nil {
		return nil, err
	}
	cc := *c
	cc.fits = fitsFor(st.Encoding)
	n := c.minRows + r.intn(c.maxRows-c.minRows+1)
	s := generateFrom(schema, n, bytesSeed(data), r, &cc)
	out, err := s.CSV(st)
	if err != nil {
		return nil, err
	}
	return &File{Data: out, Style: st, Sample: s}, nil
}

// bytesSeed hashes fuzz input to a sample seed (FNV-1a, 64 bits).
func bytesSeed(data []byte) int64 {
	h := fnv.New64a()
	h.Write(data)
	return int64(h.Sum64())
}

// Fuzz drives a table function from Go's fuzzer: each input of the fuzz
// target becomes a sample (FromBytes), the function runs on its raw table
// and every invariant (NoPanic when none is given) is checked. A failure
// is shrunk as Check shrinks and reported once with every invariant it
// breaks and the table ready to paste; Go saves the input under
// testdata/fuzz, and `go test -run` with its name replays the same table.
// Fuzz adds a few seed inputs to the corpus; add your own with f.Add
// before calling it.
//
//	func FuzzCleanReadings(f *testing.F) {
//		property.Fuzz(f, schema, CleanReadings, property.Options{Mess: property.Heavy},
//			property.NoPanic(), property.Idempotent())
//	}
//
// Run it with go test -fuzz FuzzCleanReadings; a plain go test runs the
// seeds and the saved corpus.
func Fuzz(f *testing.F, schema fixtures.Schema, fn Func, opts Options, invs ...Invariant) {
	f.Helper()
	if _, err := opts.compile(schema); err != nil {
		f.Fatal(err)
	}
	for _, seed := range fuzzSeeds() {
		f.Add(seed)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		t.Helper()
		s, err := FromBytes(schema, opts, data)
		if err != nil {
			t.Fatal(err)
		}
		if msg := fuzzVerdict(fn, s, invs); msg != "" {
			t.Error(msg)
		}
	})
}

// fuzzSeeds are the corpus seeds Fuzz adds: no bytes (an empty table), and
// a few of a fixed pseudo-random stream.
func fuzzSeeds() [][]byte {
	out := [][]byte{{}}
	r := newRng(0x5eed)
	for _, n := range []int{16, 64, 256, 1024} {
		b := make([]byte, n)
		for i := range b {
			b[i] = byte(r.next())
		}
		out = append(out, b)
	}
	return out
}

// fuzzVerdict checks the invariants on one sample; on failure it shrinks
// the sample while the same invariants break the same way and returns the
// report, else "".
func fuzzVerdict(fn Func, s *Sample, invs []Invariant) string {
	bs := verdicts(tableTrial(fn, s), invs)
	if len(bs) == 0 {
		return ""
	}
	want := classesOf(bs)
	small, steps := Shrink(s, func(c *Sample) bool {
		return classesOf(verdicts(tableTrial(fn, c), invs)) == want
	})
	final := verdicts(tableTrial(fn, small), invs)
	var b strings.Builder
	names := make([]string, len(final))
	for i, x := range final {
		names[i] = fmt.Sprintf("%q", x.name)
	}
	fmt.Fprintf(&b, "property: invariants broken by this fuzz input: %s\n", strings.Join(names, ", "))
	for _, x := range final {
		b.WriteString(strings.TrimRight(x.name+": "+x.msg, "\n"))
		b.WriteByte('\n')
	}
	describeShrink(&b, s, small, steps)
	b.WriteString(indentLines(PasteReady("raw", small.Raw()), "\t"))
	return b.String()
}

// classesOf is the class of a failure, as failures.judge computes it.
func classesOf(bs []broken) string {
	cs := make([]string, len(bs))
	for i, b := range bs {
		cs[i] = b.name + ": " + classOf(b.msg)
	}
	return strings.Join(cs, "\n")
}
