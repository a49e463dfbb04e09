package main

import (
	"context"
	"fmt"
	"math"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
	"github.com/stretchr/testify/require"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// saveScreenshot keeps a screenshot as a test artifact: in the test's
// artifact directory (Go's -artifacts flag keeps it after the run; without
// the flag it is a temporary directory), and in PROOFSHEET_SCREENSHOT_DIR
// when that is set.
func saveScreenshot(t *testing.T, name string, png []byte) {
	t.Helper()
	// Source: PNG specification (ISO/IEC 15948) §5.2 — every PNG file
	// starts with the signature 89 50 4E 47 0D 0A 1A 0A.
	require.True(t, strings.HasPrefix(string(png), "\x89PNG\r\n\x1a\n"), "a PNG")
	file := filepath.Join(t.ArtifactDir(), name)
	require.NoError(t, os.WriteFile(file, png, 0o644))
	t.Logf("screenshot: %s (%d bytes)", file, len(png))
	if dir := os.Getenv("PROOFSHEET_SCREENSHOT_DIR"); dir != "" {
		require.NoError(t, os.WriteFile(filepath.Join(dir, name), png, 0o644))
	}
}

// needChromium skips the test when Debian's Chromium is missing, except
// under CI, where it fails.
func needChromium(t *testing.T) {
	t.Helper()
	if _, err := os.Stat(chromiumPath); err != nil {
		if inCI() {
			t.Fatalf("Chromium is not installed at %s, and CI must run the browser test: .ci/run installs Debian's chromium package", chromiumPath)
		}
		t.Skipf("Chromium is not installed at %s (Debian: apt-get install chromium); skipping the browser test outside CI", chromiumPath)
	}
}

// browse opens a page in headless Chromium and returns the browser's
// context; the browser closes when the test ends. With noScript the
// page's own scripts do not run.
func browse(t *testing.T, page string, noScript bool) context.Context {
	t.Helper()
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(chromiumPath), chromedp.Headless, chromedp.NoSandbox, chromedp.DisableGPU, chromedp.NoFirstRun,
		chromedp.Flag("disable-quic", true), chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true), chromedp.Flag("disable-sync", true),
		chromedp.WindowSize(1366, 900),
	}
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
	t.Cleanup(cancel)
	// Start the browser; on a busy machine Chromium now and then exits
	// while starting, so a failed start is tried once more. Only the
	// start: everything the test checks runs once.
	var bctx context.Context
	for attempt := 1; ; attempt++ {
		actx, acancel := chromedp.NewExecAllocator(ctx, append(opts, chromedp.UserDataDir(t.TempDir()))...)
		t.Cleanup(acancel)
		c, bcancel := chromedp.NewContext(actx, chromedp.WithErrorf(t.Logf))
		t.Cleanup(bcancel)
		err := chromedp.Do(c, chromedp.Navigate("about:blank"))
		if err == nil {
			bctx = c
			break
		}
		bcancel()
		acancel()
		require.Less(t, attempt, 2, "Chromium did not start twice: %v", err)
		t.Logf("Chromium did not start (%v); trying once more", err)
	}
	u := url.URL{Scheme: "file", Path: filepath.ToSlash(page)}
	if noScript {
		require.NoError(t, chromedp.Do(bctx, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
			_, err := cdp.Call(ctx, tg, emulation.SetScriptExecutionDisabled, emulation.SetScriptExecutionDisabledParams{Value: true})
			return err
		})))
	}
	require.NoError(t, chromedp.Do(bctx, chromedp.Navigate(u.String())))
	return bctx
}

// evalJS evaluates a script in the page and returns its value.
func evalJS[T any](t *testing.T, ctx context.Context, js string) T {
	t.Helper()
	v, err := chromedp.Run(ctx, chromedp.Evaluate[T](js))
	require.NoError(t, err, js)
	return v
}

// pictureTables writes the want and got files of a daily report whose
// tmax, status and rain changed in a late stretch of the key order (tmax
// by amounts from 0.1 to 3.2, some within the tolerance; status lost the
// level "gap" to "sensor-gap"; rain by amounts from 0.001 to 10 of both
// signs, four decades), and which lost two rows and gained one. It
// returns the file names, the tmax cells that differ beyond the
// tolerance, the rows of "gap" and the rain cells that differ.
func pictureTables(t *testing.T, dir string) (want, got string, tmaxDiffering, gaps, rainDiffering int) {
	t.Helper()
	houses := []string{"Bellecôte", "Kæreby", "Les Pins", "Étang", "Mas", "Source", "Verger", "Colline"}
	var wb, gb strings.Builder
	wb.WriteString("house,day,tmax,status,rain\n")
	gb.WriteString("house,day,tmax,status,rain\n")
	n := 0
	for _, h := range houses {
		for day := 1; day <= 30; day++ {
			n++
			key := fmt.Sprintf("%s,2026-04-%02d", h, day)
			tmax := 10 + float64((n*37)%150)/10
			late := h == "Source" || h == "Verger"
			status := []string{"ok", "ok", "fault"}[n%3]
			if late && n%2 == 1 {
				status = "gap"
				gaps++
			}
			rain := float64(n%7) * 1.5
			fmt.Fprintf(&wb, "%s,%s,%s,%s\n", key, fixtures.FormatFloat(tmax), status, fixtures.FormatFloat(rain))
			if h == "Mas" && day > 28 {
				continue // missing in got
			}
			gs := status
			if gs == "gap" {
				gs = "sensor-gap"
			}
			gt := tmax
			if late {
				delta := float64(n%33) / 10
				if n%2 == 0 {
					delta = -delta
				}
				gt = tmax + delta
				if delta > 0.05 || delta < -0.05 {
					tmaxDiffering++
				}
			}
			gr := rain
			if late && n%3 == 0 {
				delta := math.Pow(10, float64(n%5)-3) // 0.001 to 10
				if n%2 == 0 {
					delta = -delta
				}
				gr = rain + delta
				rainDiffering++
			}
			fmt.Fprintf(&gb, "%s,%s,%s,%s\n", key, fixtures.FormatFloat(gt), gs, fixtures.FormatFloat(gr))
		}
	}
	gb.WriteString("Ruche,2026-04-01,12.5,ok,0\n") // extra
	want, got = filepath.Join(dir, "want.csv"), filepath.Join(dir, "got.csv")
	require.NoError(t, os.WriteFile(want, []byte(wb.String()), 0o644))
	require.NoError(t, os.WriteFile(got, []byte(gb.String()), 0o644))
	return want, got, tmaxDiffering, gaps, rainDiffering
}

// TestDiffPagePicturesInBrowser draws the pictures of a diff page in
// headless Chromium and checks the drawn elements: their number, where
// they stand, and that each picture has its words.
func TestDiffPagePicturesInBrowser(t *testing.T) {
	needChromium(t)
	dir := t.TempDir()
	want, got, differing, gaps, rainDiffering := pictureTables(t, dir)
	require.Greater(t, differing, 20)
	page := filepath.Join(dir, "diff.html")
	r := runBin(t, "", nil, "diff", "--key", "house,day", "--tol", "tmax=abs:0.05", "--format", "html", "--out", page, want, got)
	require.Equal(t, exitDiffers, r.code, r.stderr)

	// What assert measured, to check the drawing against.
	wt, _, err := fixtures.ReadFile(want)
	require.NoError(t, err)
	gt, _, err := fixtures.ReadFile(got)
	require.NoError(t, err)
	d := assert.Compare(wt, gt, assert.ByKey("house", "day"), assert.Tol("tmax", 0.05, 0))
	require.NotNil(t, d.Overview)
	require.Len(t, d.Overview.Numbers, 2)
	require.Equal(t, "tmax", d.Overview.Numbers[0].Column)
	require.Equal(t, differing, d.Overview.Numbers[0].Cells)
	rain := d.Overview.Numbers[1]
	require.Equal(t, "rain", rain.Column)
	require.Equal(t, rainDiffering, rain.Cells)
	require.True(t, rain.Log, "four decades of differences: a log scale")
	require.Len(t, d.Overview.Categories, 1)

	ctx := browse(t, page, false)
	num := func(js string) int { return evalJS[int](t, ctx, js) }
	truth := func(js string) bool { return evalJS[bool](t, ctx, js) }

	// One picture of each kind, each an accessible image with words.
	for kind, n := range map[string]int{"strip": 1, "histogram": 2, "scatter": 2, "levels": 1} {
		require.Equal(t, n, num(`document.querySelectorAll('figure.ps-figure[data-picture="`+kind+`"]').length`), kind)
	}
	require.True(t, truth(`Array.from(document.querySelectorAll("svg.`+assert.HTMLPicture+`")).every(function(s){
		var f=s.closest("figure"), c=f&&f.querySelector("figcaption");
		return s.getAttribute("role")==="img" && s.getAttribute("aria-label").length>10 &&
			s.querySelector("title") && s.querySelector("desc").textContent.length>20 && c && c.textContent.length>20})`),
		"every picture has a role, a label, a title, a description and a caption")
	// Every word drawn in a picture lies inside it: nothing is cut at
	// the picture's edges.
	cut := evalJS[[]string](t, ctx, `Array.from(document.querySelectorAll("svg.`+assert.HTMLPicture+` text")).filter(function(t){
		var b=t.getBoundingClientRect(), s=t.ownerSVGElement.getBoundingClientRect();
		return b.left < s.left-0.5 || b.top < s.top-0.5 || b.right > s.right+0.5 || b.bottom > s.bottom+0.5}).map(function(t){
		return t.closest("figure").getAttribute("data-picture")+": "+t.textContent})`)
	require.Empty(t, cut, "words that stick out of their picture")
	// Drawn: every picture has a size on the page, inside the page's width.
	require.True(t, truth(`Array.from(document.querySelectorAll("svg.`+assert.HTMLPicture+`")).every(function(s){
		var r=s.getBoundingClientRect(); return r.width>100 && r.height>40 && r.right<=document.documentElement.clientWidth})`))

	// The histogram's bars hold every differing tmax cell.
	require.Equal(t, differing, num(`Array.from(document.querySelectorAll('[data-picture="histogram"][data-column="tmax"] rect.ps-bar')).reduce(function(n,b){
		return n+parseInt(b.querySelector("title").textContent.split(": ")[1])},0)`))
	// The scatter: one point per differing cell, the diagonal, the band;
	// every point inside the plot and on the side of the diagonal its
	// values say (got above want: above the line).
	require.Equal(t, differing, num(`document.querySelectorAll('[data-picture="scatter"][data-column="tmax"] circle.ps-pt').length`))
	require.Equal(t, 1, num(`document.querySelectorAll('[data-picture="scatter"][data-column="tmax"] line.ps-diag').length`))
	require.Equal(t, 1, num(`document.querySelectorAll('[data-picture="scatter"][data-column="tmax"] polygon.ps-band').length`))
	require.True(t, truth(`(function(){
		var svg=document.querySelector('[data-picture="scatter"][data-column="tmax"] svg'), l=svg.querySelector("line.ps-diag");
		var x1=+l.getAttribute("x1"), y1=+l.getAttribute("y1"), x2=+l.getAttribute("x2"), y2=+l.getAttribute("y2");
		return Array.from(svg.querySelectorAll("circle.ps-pt")).every(function(c){
			var m=c.querySelector("title").textContent.match(/want (\S+), got (\S+)/), w=+m[1], g=+m[2];
			var cx=+c.getAttribute("cx"), cy=+c.getAttribute("cy");
			var lineY=y1+(y2-y1)*(cx-x1)/(x2-x1);
			var inside=cx>=x1-0.1 && cx<=x2+0.1 && cy>=y2-0.1 && cy<=y1+0.1;
			return inside && (g>w ? cy<lineY : cy>lineY)})})()`), "points stand where their values say")
	// The band is drawn around the diagonal: it contains the diagonal's
	// middle point.
	require.True(t, truth(`(function(){
		var svg=document.querySelector('[data-picture="scatter"][data-column="tmax"] svg'), l=svg.querySelector("line.ps-diag"), b=svg.querySelector("polygon.ps-band");
		var p=svg.createSVGPoint(); p.x=(+l.getAttribute("x1")+ +l.getAttribute("x2"))/2; p.y=(+l.getAttribute("y1")+ +l.getAttribute("y2"))/2;
		return b.isPointInFill(p)})()`), "the tolerance band lies along got = want")

	// The rain histogram, on a log scale: its bars hold every differing
	// rain cell, one bar per decade that has any; the decades where got is
	// below want stand left of those where it is above, in want's colour,
	// the others in got's; the axis says the scale.
	logBars := `document.querySelectorAll('[data-picture="histogram"][data-column="rain"] rect.ps-bar')`
	require.Equal(t, rainDiffering, num(`Array.from(`+logBars+`).reduce(function(n,b){
		return n+parseInt(b.querySelector("title").textContent.split(": ")[1])},0)`))
	nonEmpty := 0
	for _, b := range rain.Bins {
		if b.Count > 0 {
			nonEmpty++
		}
	}
	require.Equal(t, nonEmpty, num(logBars+`.length`))
	require.True(t, truth(`(function(){
		var bars=Array.from(`+logBars+`), below=[], above=[];
		bars.forEach(function(b){(/ below /.test(b.querySelector("title").textContent)?below:above).push(b)});
		if(!below.length||!above.length) return false;
		var maxBelow=Math.max.apply(null,below.map(function(b){return +b.getAttribute("x")}));
		var minAbove=Math.min.apply(null,above.map(function(b){return +b.getAttribute("x")}));
		var fills=function(xs){return new Set(xs.map(function(b){return b.getAttribute("fill")}))};
		return maxBelow<minAbove && fills(below).size===1 && fills(above).size===1 && !fills(above).has(below[0].getAttribute("fill"))})()`),
		"decades below zero on the left, above on the right, each side in its colour")
	require.True(t, truth(`Array.from(document.querySelectorAll('[data-picture="histogram"][data-column="rain"] svg text')).some(function(t){
		return t.textContent.indexOf("log scale")>=0})`))
	require.True(t, truth(`(function(){
		var svg=document.querySelector('[data-picture="histogram"][data-column="rain"] svg'), z=svg.querySelectorAll("line.ps-zero");
		if(z.length!==1) return false;
		var x=+z[0].getAttribute("x1");
		return Array.from(svg.querySelectorAll("rect.ps-bar")).every(function(b){
			var below=/ below /.test(b.querySelector("title").textContent), bx=+b.getAttribute("x"), bw=+b.getAttribute("width");
			return below ? bx+bw<=x+0.01 : bx>=x-0.01})})()`), "zero divides the decades below from those above")
	require.Equal(t, rainDiffering, num(`document.querySelectorAll('[data-picture="scatter"][data-column="rain"] circle.ps-pt').length`))

	// The strip: the changed tmax rows (Source, Verger) are late in the key
	// order, the missing Mas rows in the middle, the extra Ruche row after
	// Mas; marks of differing rows stand only in the right half.
	require.True(t, truth(`(function(){
		var svg=document.querySelector('[data-picture="strip"] svg'), w=+svg.getAttribute("width");
		var d=Array.from(svg.querySelectorAll("rect.ps-mark-differing"));
		return d.length>0 && d.every(function(r){return +r.getAttribute("x")>w/2})})()`), "differing rows lie late in the key order")
	require.Equal(t, 2, num(`Array.from(document.querySelectorAll('[data-picture="strip"] rect.ps-mark-missing')).reduce(function(n,r){
		return n+parseInt(r.querySelector("title").textContent.match(/(\d+) missing/)[1])},0)`))
	require.Equal(t, 1, num(`Array.from(document.querySelectorAll('[data-picture="strip"] rect.ps-mark-extra')).reduce(function(n,r){
		return n+parseInt(r.querySelector("title").textContent.match(/(\d+) extra/)[1])},0)`))

	// The levels: gap removed, sensor-gap added, with their row counts.
	require.Equal(t, 2*len(d.Overview.Categories[0].Levels), num(`document.querySelectorAll('[data-picture="levels"] rect.ps-level').length`))
	caption := evalJS[string](t, ctx, `document.querySelector('[data-picture="levels"] figcaption').textContent`)
	require.Contains(t, caption, fmt.Sprintf("gap (removed) %d → 0", gaps))
	require.Contains(t, caption, fmt.Sprintf("sensor-gap (added) 0 → %d", gaps))
	require.True(t, truth(`document.documentElement.scrollWidth <= document.documentElement.clientWidth`), "no horizontal scrolling")
	shot, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
	require.NoError(t, err)
	saveScreenshot(t, "diff-pictures.png", shot)

	// No script is needed to see the pictures: with the page's scripts
	// off, every picture is drawn the same.
	quiet := browse(t, page, true)
	require.Equal(t, num(`document.querySelectorAll("svg.`+assert.HTMLPicture+` *").length`),
		evalJS[int](t, quiet, `document.querySelectorAll("svg.`+assert.HTMLPicture+` *").length`))
	require.True(t, evalJS[bool](t, quiet, `Array.from(document.querySelectorAll("svg.`+assert.HTMLPicture+`")).every(function(s){
		var r=s.getBoundingClientRect(); return r.width>100 && r.height>40})`))
}
