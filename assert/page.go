package assert

import (
	"flag"
	"fmt"
	"html"
	"os"
	"path/filepath"
	"strconv"

	"github.com/proofsheet/proofsheet/fixtures"
)

// pageCSS styles the fragment HTML writes, for HTMLPage.
const pageCSS = `:root{--ink:#1e2529;--paper:#f7f6f2;--rule:#d9d6cc;--muted:#66707a;--chg-bg:#fdf0c4;--chg-edge:#c98a00;--want:#a23b2a;--got:#14665a}
*{box-sizing:border-box}
body{margin:0 auto;max-width:78rem;padding:1rem 1.5rem;background:var(--paper);color:var(--ink);font:15px/1.45 system-ui,-apple-system,"Segoe UI",Roboto,"DejaVu Sans",sans-serif}
h1{font-size:1.15rem;margin:.2rem 0 .8rem}
.ps-scroll{overflow-x:auto;max-width:100%;margin:.3rem 0 .8rem}
table{border-collapse:collapse;font-size:.85rem}
th,td{border:1px solid var(--rule);padding:.2rem .5rem;text-align:left;vertical-align:top}
thead th{background:#eef0ee;font-weight:600}
td,th.ps-key{font-family:ui-monospace,"DejaVu Sans Mono",Menlo,Consolas,monospace;max-width:28rem;overflow-wrap:anywhere}
th.ps-key{background:#f4f3ee;font-weight:500}
.ps-num{text-align:right}
td.ps-changed{background:var(--chg-bg);box-shadow:inset 3px 0 0 var(--chg-edge)}
td.ps-changed del{color:var(--want);display:block}
td.ps-changed ins{color:var(--got);text-decoration:none;font-weight:650;display:block}
td.ps-changed small{display:block;color:var(--muted);font-size:.75rem}
.ps-missing tbody tr{background:#fbeeea}.ps-extra tbody tr{background:#e9f6f1}
.ps-verdict{font-weight:650;margin:.4rem 0 .1rem}.ps-match{margin:0 0 .4rem;color:var(--muted);font-size:.9rem}
h4.ps-heading{font-size:.9rem;margin:.9rem 0 .2rem}.ps-problems{color:var(--want)}
.ps-hints{margin:.2rem 0 .6rem;padding-left:1.2rem}
.ps-pictures{display:flex;flex-wrap:wrap;gap:.8rem 1.4rem;align-items:flex-start;margin:.3rem 0 .8rem;overflow-x:auto}
.ps-figure{margin:0}.ps-figure svg{display:block}
.ps-caption{font-size:.78rem;color:var(--muted);width:0;min-width:100%;margin-top:.2rem}`

// HTMLPage writes the Diff as one self-contained HTML page: the HTML
// fragment (with its pictures) under a title, an inline style, no script
// and nothing fetched (its Content-Security-Policy allows neither).
func (d *Diff) HTMLPage(title string) string {
	return "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n" +
		`<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'">` + "\n" +
		`<meta name="viewport" content="width=device-width, initial-scale=1">` + "\n" +
		"<title>" + html.EscapeString(title) + "</title>\n<style>\n" + pageCSS + "\n</style>\n</head>\n<body>\n<h1>" +
		html.EscapeString(title) + "</h1>\n" + d.HTML() + "</body>\n</html>\n"
}

// artifactDirer is a test that keeps files of its own (Go 1.26
// testing.T.ArtifactDir).
type artifactDirer interface{ ArtifactDir() string }

// ArtifactsKept reports whether the test binary runs with Go's -artifacts
// flag, which keeps what a test writes to its ArtifactDir after the run.
func ArtifactsKept() bool {
	f := flag.Lookup("test.artifacts")
	return f != nil && f.Value.String() == "true"
}

// WriteArtifactPage writes the Diff as an HTML page (HTMLPage) into the
// test's artifact directory and returns its path, when the test runs with
// -artifacts and t has an ArtifactDir (as *testing.T has since Go 1.26);
// otherwise, or when the page cannot be written, it returns "". Pages of
// several checks of one test are numbered: diff.html, diff-2.html, ….
func WriteArtifactPage(t any, d *Diff, title string) string {
	ad, ok := t.(artifactDirer)
	if !ok || d == nil || !ArtifactsKept() {
		return ""
	}
	dir := ad.ArtifactDir()
	for n := 1; n < 1000; n++ {
		name := "diff.html"
		if n > 1 {
			name = "diff-" + strconv.Itoa(n) + ".html"
		}
		path := filepath.Join(dir, name)
		if _, err := os.Stat(path); err == nil {
			continue
		}
		if err := fixtures.WriteFileAtomic(path, []byte(d.HTMLPage(title)), 0o644); err != nil {
			return ""
		}
		return path
	}
	return ""
}

// artifactNote is the line a failure message gets for an artifact page.
func artifactNote(t any, d *Diff, title string) string {
	if p := WriteArtifactPage(t, d, title); p != "" {
		return fmt.Sprintf("\nHTML diff page: %s", p)
	}
	return ""
}
