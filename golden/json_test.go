package golden

import (
	"encoding/json"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestCanonicalJSONForm(t *testing.T) {
	type house struct {
		Name string  `json:"name"`
		TMax float64 `json:"tmax"`
		Kept int     `json:"kept"`
	}
	v := map[string]any{
		"season": "2026",
		"houses": []house{{"Étang", 21.25, 140}, {"Les Pins", 19, 0}},
		"empty":  map[string]any{},
		"none":   []int{},
		"note":   "<b>&</b>\n",
		"ok":     true,
		"gap":    nil,
	}
	got, err := CanonicalJSON(v)
	require.NoError(t, err)
	require.Equal(t, `{
  "empty": {},
  "gap": null,
  "houses": [
    {
      "kept": 140,
      "name": "Étang",
      "tmax": 21.25
    },
    {
      "kept": 0,
      "name": "Les Pins",
      "tmax": 19
    }
  ],
  "none": [],
  "note": "<b>&</b>\n",
  "ok": true,
  "season": "2026"
}
`, string(got))
	// The same value spelled otherwise gives the same bytes.
	again, err := CanonicalJSON(json.RawMessage(`{"season":"2026","ok":true,"note":"\u003cb\u003e\u0026\u003c/b\u003e\n","none":[],"houses":[{"tmax":21.25e0,"name":"\u00c9tang","kept":1.4e2},{"tmax":19.0,"name":"Les Pins","kept":-0}],"gap":null,"empty":{}}`))
	require.NoError(t, err)
	require.Equal(t, string(got), string(again))
}

func TestCanonicalNumber(t *testing.T) {
	// RFC 8259 §6 number grammar; shortest round trip as strconv.FormatFloat
	// with precision -1 defines it.
	cases := []struct{ in, want string }{
		{"0", "0"},
		{"-0", "0"},
		{"-0.0", "0"},
		{"1.0", "1"},
		{"1e3", "1000"},
		{"1E+2", "100"},
		{"21.25", "21.25"},
		{"0.1", "0.1"},
		{"0.10000000000000001", "0.1"}, // same float64 as 0.1
		{"1e-7", "1e-7"},
		{"1.5e-10", "1.5e-10"},
		{"1e21", "1e+21"},
		{"123456789012345678901234567890", "123456789012345678901234567890"}, // integer literals keep all digits
		{"-17", "-17"},
		{"1e400", "1e400"}, // beyond float64: kept as written
	}
	for _, c := range cases {
		require.Equal(t, c.want, canonicalNumber(c.in), c.in)
	}
}

func TestCanonicalJSONErrors(t *testing.T) {
	_, err := CanonicalJSON(math.NaN())
	require.Error(t, err)
	_, err = CanonicalJSON(json.RawMessage(`{"a":1} {"b":2}`))
	require.Error(t, err)
	_, err = CanonicalJSON(make(chan int))
	require.Error(t, err)
}

func TestCanonicalJSONEscapes(t *testing.T) {
	got, err := CanonicalJSON("q\"b\\t\tc\x01\u2028é")
	require.NoError(t, err)
	require.Equal(t, `"q\"b\\t\tc\u0001\u2028é"`+"\n", string(got))
	var back string
	require.NoError(t, json.Unmarshal(got, &back)) // still valid JSON (RFC 8259 §7)
	require.Equal(t, "q\"b\\t\tc\x01\u2028é", back)
}

func TestJSONDiffPaths(t *testing.T) {
	cases := []struct {
		name, want, got string
		lines           []string
	}{
		{"changed number", `{"houses":[{"tmax":1},{"tmax":2},{"tmax":21.25}]}`, `{"houses":[{"tmax":1},{"tmax":2},{"tmax":21.5}]}`,
			[]string{"$.houses[2].tmax: got 21.5 want 21.25"}},
		{"added and removed keys", `{"a":1,"gone":"x"}`, `{"a":1,"new":[1,2]}`,
			[]string{`$.gone: removed: "x"`, `$.new: added: [1,2]`}},
		{"odd key", `{"day 1":1}`, `{"day 1":2}`, []string{`$["day 1"]: got 2 want 1`}},
		{"type change", `{"a":"5"}`, `{"a":5}`, []string{`$.a: got 5 want "5"`}},
		{"element inserted in the middle", `[1,2,3,4]`, `[1,2,9,3,4]`, []string{`$[2]: added: 9`}},
		{"element removed", `[{"n":"a"},{"n":"b"},{"n":"c"}]`, `[{"n":"a"},{"n":"c"}]`, []string{`$[1]: removed: {"n":"b"}`}},
		{"element changed in place", `[{"n":"a","t":1},{"n":"b","t":2}]`, `[{"n":"a","t":1},{"n":"b","t":3}]`, []string{`$[1].t: got 3 want 2`}},
		{"root scalar", `1`, `2`, []string{`$: got 2 want 1`}},
		{"null vs missing", `{"a":null}`, `{}`, []string{`$.a: removed: null`}},
		{"numbers equal by value", `{"a":1.0,"b":[1e2]}`, `{"b":[100],"a":1}`, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			out, err := JSONDiff([]byte(c.want), []byte(c.got))
			require.NoError(t, err)
			if c.lines == nil {
				require.Equal(t, "", out)
				return
			}
			lines := strings.Split(strings.TrimSuffix(out, "\n"), "\n")
			require.Equal(t, c.lines, lines[1:], out)
		})
	}
	_, err := JSONDiff([]byte(`{`), []byte(`{}`))
	require.ErrorContains(t, err, "want")
}

func TestJSONDiffLongValuesAreCut(t *testing.T) {
	long := `"` + strings.Repeat("x", 500) + `"`
	out, err := JSONDiff([]byte(`{}`), []byte(`{"a":`+long+`}`))
	require.NoError(t, err)
	require.Contains(t, out, "…")
	require.Less(t, len(out), 200)
}

func TestJSONCheckLifecycle(t *testing.T) {
	quietEnv(t, false)
	s := tempStore(t)
	path := filepath.Join(s.Root, "season.gold.json")
	v := map[string]any{"gdd": 412.5, "houses": []string{"Étang", "Les Pins"}}

	ft := newFake(t)
	require.False(t, s.JSON(ft, "season", v))
	require.Contains(t, ft.failures(), "does not exist")
	ft.end()

	*updateFlag = true
	ft = newFake(t)
	require.True(t, s.JSON(ft, "season", v), ft.failures())
	ft.end()
	*updateFlag = false
	want, err := CanonicalJSON(v)
	require.NoError(t, err)
	require.Equal(t, string(want), readFile(t, path))

	// A hand-edited file with other spacing still matches.
	writeFile(t, path, `{"houses":["Étang","Les Pins"],"gdd":4.125e2}`)
	ft = newFake(t)
	require.True(t, s.JSON(ft, "season", v), ft.failures())
	ft.end()

	ft = newFake(t)
	require.False(t, s.JSON(ft, "season", map[string]any{"gdd": 413, "houses": []string{"Étang", "Les Pins", "Ruche"}}))
	require.Contains(t, ft.failures(), "$.gdd: got 413 want 412.5")
	require.Contains(t, ft.failures(), `$.houses[2]: added: "Ruche"`)
	ft.end()

	// A stored file that is not JSON fails, and says so.
	writeFile(t, path, `{"gdd":`)
	ft = newFake(t)
	require.False(t, s.JSON(ft, "season", v))
	require.Contains(t, ft.failures(), "cannot read")
	ft.end()

	// v that cannot be JSON fails.
	ft = newFake(t)
	require.False(t, s.JSON(ft, "nan", math.Inf(1)))
	require.Contains(t, ft.failures(), "unsupported value")
	ft.end()
}
