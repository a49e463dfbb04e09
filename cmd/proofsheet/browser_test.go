package main

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
	"github.com/proofsheet/proofsheet/golden"
)

// chromiumPath is where Debian's chromium package puts the browser.
const chromiumPath = "/usr/bin/chromium"

// inCI reports whether the CI variable is set to a true value, as CI
// services set it.
func inCI() bool {
	switch strings.ToLower(os.Getenv("CI")) {
	case "", "0", "false", "no", "off":
		return false
	}
	return true
}

// hostileCells are cell texts that would run script or add elements if a
// page wrote them unescaped.
var hostileCells = []string{
	`<script>window.__pwned=1</script>`,
	`<img src=x onerror="window.__pwned=2">`,
	`"><svg onload="window.__pwned=3">`,
	`</td></tr></table><iframe srcdoc="<script>parent.__pwned=4</script>">`,
	`' onmouseover='window.__pwned=5`,
}

// browserGoldens builds a repository whose work tree changes many cells of
// several golden tables (with hostile text among them), rewrites two
// tables with float noise only, and changes a text and a JSON file.
func browserGoldens(t *testing.T) (repo string, tol assert.Option, tables []string) {
	t.Helper()
	rng := rand.New(rand.NewPCG(7, 11))
	schema := fixtures.Schema{
		fixtures.Col("house", fixtures.String),
		fixtures.Col("day", fixtures.Date),
		fixtures.Col("tmax", fixtures.Float64),
		fixtures.Col("kept", fixtures.Int64),
		fixtures.Col("note", fixtures.String),
	}
	houses := []string{"Étang", "Les Pins", "Mühlbach", hostileCells[0], hostileCells[2]}
	encode := func(b *fixtures.Builder) string {
		tb, err := b.Build()
		require.NoError(t, err)
		data, err := golden.EncodeTable(tb, []string{"house", "day"})
		require.NoError(t, err)
		return string(data)
	}
	oldFiles, newFiles := map[string]string{}, map[string]string{}
	for f := 0; f < 6; f++ {
		name := fmt.Sprintf("report/testdata/daily/house-%d.gold.tbl", f)
		if f == 5 {
			name = "report/testdata/daily/" + `"><svg onload=x>` + ".gold.tbl" // a hostile file name
		}
		noiseOnly := f >= 4
		ob, nb := fixtures.NewBuilder(schema), fixtures.NewBuilder(schema)
		for i := 0; i < 40; i++ {
			house := houses[i%len(houses)]
			day := fmt.Sprintf("2026-04-%02d", 1+i/len(houses))
			tmax := float64(10+rng.IntN(200)) / 8
			kept := int64(100 + rng.IntN(50))
			note := fmt.Sprintf("reading %d", i)
			ob.Row(house, day, tmax, kept, note)
			switch {
			case noiseOnly:
				tmax = tmax * (1 + 1e-15)
			case rng.IntN(3) == 0:
				tmax += 0.5
				if rng.IntN(2) == 0 {
					kept++
				}
				if rng.IntN(2) == 0 {
					note = hostileCells[rng.IntN(len(hostileCells))]
				}
			}
			nb.Row(house, day, tmax, kept, note)
		}
		oldFiles[name], newFiles[name] = encode(ob), encode(nb)
		tables = append(tables, name)
	}
	oldFiles["report/testdata/summary.gold.txt"] = "season 2026\nhouses 5\n"
	newFiles["report/testdata/summary.gold.txt"] = "season 2026\nhouses " + hostileCells[1] + "\n"
	oldFiles["report/testdata/season.gold.json"] = `{"gdd": 120.5}`
	newFiles["report/testdata/season.gold.json"] = `{"gdd": 121, "note": "` + strings.ReplaceAll(hostileCells[0], `"`, `\"`) + `"}`
	repo = newRepo(t, oldFiles)
	writeTree(t, repo, newFiles)
	return repo, assert.Tol("*", 0, 1e-12), tables
}

func TestReviewPageInBrowser(t *testing.T) {
	if _, err := os.Stat(chromiumPath); err != nil {
		if inCI() {
			t.Fatalf("Chromium is not installed at %s, and CI must run the browser test: .ci/run installs Debian's chromium package", chromiumPath)
		}
		t.Skipf("Chromium is not installed at %s (Debian: apt-get install chromium); skipping the browser test outside CI", chromiumPath)
	}
	repo, tol, tables := browserGoldens(t)

	// The number of differing cells, from assert itself.
	wantCells, unchanged := 0, 0
	for _, name := range tables {
		old := gitT(t, repo, "show", "HEAD:"+name)
		cur, err := os.ReadFile(filepath.Join(repo, filepath.FromSlash(name)))
		require.NoError(t, err)
		ot, info, err := golden.DecodeTable("old", []byte(old))
		require.NoError(t, err)
		nt, _, err := golden.DecodeTable("new", cur)
		require.NoError(t, err)
		d := assert.Compare(ot, nt, assert.ByKey(info.Keys...), tol, assert.ListLimit(-1))
		wantCells += d.CellsDiffering
		if d.Equal() {
			unchanged++
		}
	}
	require.Greater(t, wantCells, 40, "many differences")
	require.Equal(t, 2, unchanged)

	page := filepath.Join(t.TempDir(), "review.html")
	r := runBin(t, repo, noEnv, "changes", "--format", "html", "--tol", "*=rel:1e-12", "--max-cells", "-1", "--out", page)
	require.Equal(t, exitDiffers, r.code, r.stderr)

	shot, facts := openInBrowser(t, page)
	require.Equal(t, wantCells, facts.changedCells, "one highlighted cell per differing cell")
	require.True(t, facts.pwnedUndefined, "no injected script ran")
	require.Equal(t, 1, facts.scripts, "the page's own script only")
	require.Zero(t, facts.injected, "no img, svg or iframe element from cell text")
	require.Positive(t, facts.pictures, "the changed tables have pictures")
	require.Zero(t, facts.picturesInCells, "no picture comes from a cell")
	require.Empty(t, facts.wordsCut, "no word sticks out of its picture")
	require.Zero(t, facts.handlers, "no inline event handler attribute")
	require.True(t, facts.hostileShown, "hostile text shows as text")
	require.Equal(t, 8, facts.sectionsBefore)
	require.Equal(t, 8-unchanged, facts.sectionsFiltered, "changed only hides the files unchanged within tolerance")
	require.Equal(t, 8, facts.sectionsAgain, "a second click shows them again")
	require.True(t, facts.fitsWidth, "no horizontal scrolling of the page on a laptop screen")

	// Source: PNG specification (ISO/IEC 15948) §5.2 — every PNG file
	// starts with the signature 89 50 4E 47 0D 0A 1A 0A.
	require.True(t, bytes.HasPrefix(shot, []byte("\x89PNG\r\n\x1a\n")))
	saveScreenshot(t, "review.png", shot)
}

// pageFacts is what the browser test reads off the page.
type pageFacts struct {
	changedCells, scripts, injected, handlers       int
	pictures, picturesInCells                       int
	wordsCut                                        []string
	pwnedUndefined, hostileShown, fitsWidth         bool
	sectionsBefore, sectionsFiltered, sectionsAgain int
}

// openInBrowser loads the page in headless Chromium, reads the facts,
// works the changed-only button and takes a screenshot.
func openInBrowser(t *testing.T, page string) ([]byte, pageFacts) {
	t.Helper()
	// The same start as the pictures test: a failed start of Chromium on
	// a busy machine is tried once more, and the browser closes with the
	// test.
	bctx := browse(t, page, false)
	num := func(js string) int {
		n, err := chromedp.Run(bctx, chromedp.Evaluate[int](js))
		require.NoError(t, err, js)
		return n
	}
	truth := func(js string) bool {
		b, err := chromedp.Run(bctx, chromedp.Evaluate[bool](js))
		require.NoError(t, err, js)
		return b
	}
	visible := `Array.from(document.querySelectorAll("section.ps-file")).filter(function(s){return s.getClientRects().length>0}).length`
	var f pageFacts
	f.changedCells = num(`document.querySelectorAll("td.` + assert.HTMLChangedCell + `").length`)
	f.scripts = num(`document.scripts.length`)
	f.injected = num(`document.querySelectorAll("img, svg:not(.` + assert.HTMLPicture + `), iframe, object, embed").length`)
	f.pictures = num(`document.querySelectorAll("figure.ps-figure > svg.` + assert.HTMLPicture + `").length`)
	f.picturesInCells = num(`document.querySelectorAll("td svg, th svg").length`)
	words, err := chromedp.Run(bctx, chromedp.Evaluate[[]string](`Array.from(document.querySelectorAll("svg.`+assert.HTMLPicture+` text")).filter(function(t){
		var b=t.getBoundingClientRect(), s=t.ownerSVGElement.getBoundingClientRect();
		return b.left < s.left-0.5 || b.top < s.top-0.5 || b.right > s.right+0.5 || b.bottom > s.bottom+0.5}).map(function(t){
		return t.closest("figure").getAttribute("data-picture")+": "+t.textContent})`))
	require.NoError(t, err)
	f.wordsCut = words
	f.handlers = num(`Array.from(document.querySelectorAll("*")).filter(function(e){return Array.from(e.attributes).some(function(a){return a.name.indexOf("on")===0})}).length`)
	f.hostileShown = truth(`Array.from(document.querySelectorAll("td.` + assert.HTMLChangedCell + ` ins")).some(function(e){return e.textContent.indexOf("<script>window.__pwned=1</script>")>=0})`)
	f.fitsWidth = truth(`document.documentElement.scrollWidth <= document.documentElement.clientWidth`)
	f.sectionsBefore = num(visible)
	require.NoError(t, chromedp.Do(bctx, chromedp.Click(chromedp.ID("ps-only-changed"))))
	f.sectionsFiltered = num(visible)
	shot, err := chromedp.Run(bctx, chromedp.FullScreenshot(100))
	require.NoError(t, err)
	require.NoError(t, chromedp.Do(bctx, chromedp.Click(chromedp.ID("ps-only-changed"))))
	f.sectionsAgain = num(visible)
	// Checked last, after the clicks and the scrolling a screenshot does.
	f.pwnedUndefined = truth(`typeof window.__pwned === "undefined"`)
	return shot, f
}
