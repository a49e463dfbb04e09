package assert

import (
	"fmt"
	"html"
	"math"
	"strconv"
	"strings"

	"github.com/proofsheet/proofsheet/internal/textwidth"
)

// The pictures of a Diff's Overview, drawn as inline SVG by this file: no
// script, no outside resource, no library. Every picture is a <figure
// class="ps-figure" data-picture=…> holding an <svg class="ps-pic"
// role="img"> with an aria-label, a <title> and a <desc>, and a
// <figcaption> that says in words what the picture shows, so a reader
// without the picture (a screen reader, a text browser) loses nothing.
// Colours are SVG presentation attributes, so the pictures look the same
// on a page with no style sheet.

// HTMLPicture is the class of every <svg> the HTML renderer draws, and of
// no other element.
const HTMLPicture = "ps-pic"

// Colours of the pictures (the page's palette: want is red-brown, got is
// green, changes amber).
const (
	picInk     = "#1e2529"
	picMuted   = "#66707a"
	picRule    = "#d9d6cc"
	picChanged = "#c98a00"
	picWant    = "#a23b2a"
	picGot     = "#14665a"
	picBand    = "#dcf1ea"
)

// htmlPictures writes the pictures of the Overview, when there is one.
func (d *Diff) htmlPictures(h *htmlWriter) {
	o := d.Overview
	if o == nil || (len(o.Strip.Bins) == 0 && len(o.Numbers) == 0 && len(o.Categories) == 0) {
		return
	}
	h.heading("Pictures of the change")
	h.open("div", "ps-pictures")
	if len(o.Strip.Bins) > 0 {
		d.stripFigure(h, o.Strip)
	}
	for _, n := range o.Numbers {
		if n.Cells == 0 {
			continue
		}
		if len(n.Bins) > 0 { // a Diff read from JSON may have none
			d.histogramFigure(h, n)
		}
		d.scatterFigure(h, n)
	}
	for _, c := range o.Categories {
		d.levelsFigure(h, c)
	}
	h.close("div")
}

// figure writes a figure with its picture and the words that say the same.
func figure(h *htmlWriter, kind, column, label, caption string, w, ht int, body string) {
	h.open("figure", "ps-figure", "data-picture", kind, "data-column", column)
	fmt.Fprintf(h.b, `<svg class="%s" role="img" aria-label="%s" viewBox="0 0 %d %d" width="%d" height="%d" font-family="system-ui, sans-serif" font-size="11">`,
		HTMLPicture, html.EscapeString(label), w, ht, w, ht)
	h.raw("<title>" + html.EscapeString(label) + "</title><desc>" + html.EscapeString(caption) + "</desc>")
	h.raw(body)
	h.raw("</svg>")
	h.elem("figcaption", "ps-caption", caption)
	h.close("figure")
}

// svgText writes an escaped <text> element.
func svgText(x, y float64, anchor, fill, s string) string {
	return fmt.Sprintf(`<text x="%.1f" y="%.1f" text-anchor="%s" fill="%s">%s</text>`, x, y, anchor, fill, html.EscapeString(s))
}

// count writes n with a noun in the right number.
func count(n int, one, many string) string { return plural(n, one, many) }

// stripFigure draws where along the tables the differing, missing and
// extra rows lie: one column of stacked marks per stretch of rows.
func (d *Diff) stripFigure(h *htmlWriter, s RowStrip) {
	const w, ht, left, top, barH = 720, 106, 8, 8, 40
	n := len(s.Bins)
	peak := 1
	var differing, missing, extra, touched int
	busiest := 0
	for i, b := range s.Bins {
		t := b.Differing + b.Missing + b.Extra
		peak = max(peak, t)
		differing, missing, extra = differing+b.Differing, missing+b.Missing, extra+b.Extra
		if t > 0 {
			touched++
		}
		if t > s.Bins[busiest].Differing+s.Bins[busiest].Missing+s.Bins[busiest].Extra {
			busiest = i
		}
	}
	order := "row order"
	if s.Order == StripByKey {
		order = "key order"
	}
	var body strings.Builder
	fmt.Fprintf(&body, `<rect x="%d" y="%d" width="%d" height="%d" fill="#fafaf8" stroke="%s"/>`, left, top, w-2*left, barH, picRule)
	cw := float64(w-2*left) / float64(n)
	for i, b := range s.Bins {
		x := float64(left) + float64(i)*cw
		y := float64(top + barH)
		for _, part := range []struct {
			n     int
			fill  string
			class string
		}{{b.Differing, picChanged, "ps-mark-differing"}, {b.Missing, picWant, "ps-mark-missing"}, {b.Extra, picGot, "ps-mark-extra"}} {
			if part.n == 0 {
				continue
			}
			bh := max(2, float64(barH)*float64(part.n)/float64(peak))
			y -= bh
			fmt.Fprintf(&body, `<rect class="ps-mark %s" x="%.1f" y="%.1f" width="%.1f" height="%.1f" fill="%s"><title>%s</title></rect>`,
				part.class, x, y, max(cw-0.5, 0.5), bh, part.fill, html.EscapeString(fmt.Sprintf("from %s: %d differing, %d missing, %d extra", b.From, b.Differing, b.Missing, b.Extra)))
		}
	}
	body.WriteString(svgText(left, top+barH+14, "start", picMuted, "first stretch from "+s.Bins[0].From))
	body.WriteString(svgText(left, top+barH+28, "start", picMuted, "last stretch from "+s.Bins[n-1].From))
	legendY := float64(top + barH + 48)
	x := float64(left)
	for _, l := range []struct{ fill, text string }{{picChanged, "differing cells"}, {picWant, "missing rows"}, {picGot, "extra rows"}} {
		fmt.Fprintf(&body, `<rect x="%.1f" y="%.1f" width="10" height="10" fill="%s"/>`, x, legendY-9, l.fill)
		body.WriteString(svgText(x+14, legendY, "start", picInk, l.text))
		x += 120
	}
	var parts []string
	if differing > 0 {
		parts = append(parts, count(differing, "row with differing cells", "rows with differing cells"))
	}
	if missing > 0 {
		parts = append(parts, count(missing, "missing row", "missing rows"))
	}
	if extra > 0 {
		parts = append(parts, count(extra, "extra row", "extra rows"))
	}
	bb := s.Bins[busiest]
	caption := fmt.Sprintf("Where the changes lie, in %s of %s cut into %d stretches: %s, in %d of the %d stretches; the most (%d differing, %d missing, %d extra) in the stretch from %s.",
		order, count(s.Rows, "row", "rows"), n, strings.Join(parts, ", "), touched, n, bb.Differing, bb.Missing, bb.Extra, bb.From)
	figure(h, "strip", "", "Strip of where the differing, missing and extra rows lie, in "+order, caption, w, ht, body.String())
}

// histogramFigure draws the spread of got − want of a number column.
func (d *Diff) histogramFigure(h *htmlWriter, n NumberShape) {
	wn, gn := d.wantName(), d.gotName()
	const w, ht, left, right, top, bottom = 360, 200, 36, 12, 12, 40
	plotW, plotH := float64(w-left-right), float64(ht-top-bottom)
	peak := 1
	most := 0
	for i, b := range n.Bins {
		peak = max(peak, b.Count)
		if b.Count > n.Bins[most].Count {
			most = i
		}
	}
	var body strings.Builder
	fmt.Fprintf(&body, `<line x1="%d" y1="%.1f" x2="%d" y2="%.1f" stroke="%s"/>`, left, float64(top)+plotH, w-right, float64(top)+plotH, picMuted)
	bw := plotW / float64(len(n.Bins))
	for i, b := range n.Bins {
		if b.Count == 0 {
			continue
		}
		bh := max(1.5, plotH*float64(b.Count)/float64(peak))
		fill := picGot
		if b.Hi <= 0 {
			fill = picWant
		}
		fmt.Fprintf(&body, `<rect class="ps-bar" x="%.1f" y="%.1f" width="%.1f" height="%.1f" fill="%s"><title>%s</title></rect>`,
			float64(left)+float64(i)*bw+0.5, float64(top)+plotH-bh, max(bw-1, 0.5), bh, fill, html.EscapeString(binText(b, n.Log, wn, gn)+": "+count(b.Count, "cell", "cells")))
	}
	// On a log scale the decades below zero stand left of those above:
	// zero is the border between them.
	if n.Log {
		negs := 0
		for _, b := range n.Bins {
			if b.Hi <= 0 {
				negs++
			}
		}
		if negs > 0 && negs < len(n.Bins) {
			x := float64(left) + float64(negs)*bw
			fmt.Fprintf(&body, `<line class="ps-zero" x1="%.1f" y1="%d" x2="%.1f" y2="%.1f" stroke="%s" stroke-dasharray="3 2"/>`, x, top, x, float64(top)+plotH, picInk)
			body.WriteString(svgText(x, float64(top)+plotH+14, "middle", picMuted, "0"))
		}
	}
	// The zero line, and the tolerance where the axis is linear.
	if !n.Log && len(n.Bins) > 0 {
		lo, hi := n.Bins[0].Lo, n.Bins[len(n.Bins)-1].Hi
		at := func(v float64) float64 { return float64(left) + plotW*(v-lo)/(hi-lo) }
		if hi > lo && lo < 0 && hi > 0 {
			fmt.Fprintf(&body, `<line class="ps-zero" x1="%.1f" y1="%d" x2="%.1f" y2="%.1f" stroke="%s" stroke-dasharray="3 2"/>`, at(0), top, at(0), float64(top)+plotH, picInk)
		}
		for _, t := range []float64{-n.Abs, n.Abs} {
			if n.Abs > 0 && hi > lo && t > lo && t < hi {
				fmt.Fprintf(&body, `<line class="ps-tol" x1="%.1f" y1="%d" x2="%.1f" y2="%.1f" stroke="%s" stroke-dasharray="1 2"/>`, at(t), top, at(t), float64(top)+plotH, picChanged)
			}
		}
	}
	if len(n.Bins) > 0 {
		body.WriteString(svgText(left, float64(top)+plotH+14, "start", picMuted, fmtNum(n.Bins[0].Lo)))
		body.WriteString(svgText(float64(w-right), float64(top)+plotH+14, "end", picMuted, fmtNum(n.Bins[len(n.Bins)-1].Hi)))
	}
	scale, axis := "equal-width bins", "equal-width bins"
	if n.Log {
		scale = "log scale: one bin per decade of |" + gn + " − " + wn + "| on each side of zero"
		axis = "log scale, a bin per decade"
	}
	// The axis gets the short words (the caption has the long ones): the
	// picture is 360 units wide and cuts what does not fit.
	body.WriteString(svgText(float64(left)+plotW/2, float64(ht-10), "middle", picInk, gn+" − "+wn+" ("+axis+")"))
	body.WriteString(svgText(float64(left-4), float64(top+10), "end", picMuted, strconv.Itoa(peak)))
	caption := fmt.Sprintf("Histogram of %s − %s in column %s over %s, %s; from %s to %s; the most, %s, in %s.",
		gn, wn, n.Column, count(n.Cells, "differing cell", "differing cells"), scale, fmtNum(n.Bins[0].Lo), fmtNum(n.Bins[len(n.Bins)-1].Hi),
		count(n.Bins[most].Count, "cell", "cells"), binText(n.Bins[most], n.Log, wn, gn))
	if n.Others > 0 {
		caption += fmt.Sprintf(" %s with a null, NaN or infinity left out.", capitalise(count(n.Others, "cell", "cells")))
	}
	figure(h, "histogram", n.Column, "Histogram of "+gn+" − "+wn+" in column "+n.Column, caption, w, ht, body.String())
}

// binText writes a histogram bin's range.
func binText(b DeltaBin, log bool, wn, gn string) string {
	if log {
		// Below zero the bin's Lo is the larger magnitude: name the
		// smaller first either way.
		a, z := math.Abs(b.Lo), math.Abs(b.Hi)
		return fmt.Sprintf("|%s − %s| from %s to %s (%s)", gn, wn, fmtNum(min(a, z)), fmtNum(max(a, z)), pick(b.Hi <= 0, gn+" below "+wn, gn+" above "+wn))
	}
	return fmt.Sprintf("[%s, %s]", fmtNum(b.Lo), fmtNum(b.Hi))
}

func fmtNum(v float64) string { return strconv.FormatFloat(v, 'g', 3, 64) }

// scatterFigure draws want against got with the line got = want and the
// tolerance band around it.
func (d *Diff) scatterFigure(h *htmlWriter, n NumberShape) {
	wn, gn := d.wantName(), d.gotName()
	const size, pad = 220, 34
	w, ht := size+pad+12, size+pad+12
	if len(n.Points) == 0 {
		return
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	above, below := 0, 0
	for _, p := range n.Points {
		lo, hi = min(lo, p.Want, p.Got), max(hi, p.Want, p.Got)
		if p.Got > p.Want {
			above++
		} else if p.Got < p.Want {
			below++
		}
	}
	if hi == lo {
		lo, hi = lo-1, hi+1
	}
	span := hi - lo
	lo, hi = lo-span*0.04, hi+span*0.04
	sx := func(v float64) float64 { return float64(pad) + float64(size)*(v-lo)/(hi-lo) }
	sy := func(v float64) float64 { return float64(12+size) - float64(size)*(v-lo)/(hi-lo) }
	// The band is {(x, y): lower(x) ≤ y ≤ upper(x)}; clamping both edges
	// to the plot is its intersection with the plot.
	clampY := func(y float64) float64 { return min(max(y, 12), float64(12+size)) }
	var body strings.Builder
	fmt.Fprintf(&body, `<rect x="%d" y="12" width="%d" height="%d" fill="#fafaf8" stroke="%s"/>`, pad, size, size, picRule)
	if n.Abs > 0 || n.Rel > 0 {
		// got within max(abs, rel × |x|) of x: the PEP 485 rule, with the
		// larger magnitude approximated by |x|.
		var upper, lower []string
		for k := 0; k <= 48; k++ {
			x := lo + (hi-lo)*float64(k)/48
			r := max(n.Abs, n.Rel*math.Abs(x))
			upper = append(upper, fmt.Sprintf("%.1f,%.1f", sx(x), clampY(sy(x+r))))
			lower = append([]string{fmt.Sprintf("%.1f,%.1f", sx(x), clampY(sy(x-r)))}, lower...)
		}
		fmt.Fprintf(&body, `<polygon class="ps-band" points="%s" fill="%s" fill-opacity="0.8"/>`, strings.Join(append(upper, lower...), " "), picBand)
	}
	fmt.Fprintf(&body, `<line class="ps-diag" x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s"/>`, sx(lo), sy(lo), sx(hi), sy(hi), picMuted)
	for _, p := range n.Points {
		fill := picGot
		if p.Got < p.Want {
			fill = picWant
		}
		fmt.Fprintf(&body, `<circle class="ps-pt" cx="%.1f" cy="%.1f" r="2.5" fill="%s" fill-opacity="0.75"><title>%s</title></circle>`,
			sx(p.Want), sy(p.Got), fill, html.EscapeString(wn+" "+fixtureNum(p.Want)+", "+gn+" "+fixtureNum(p.Got)))
	}
	body.WriteString(svgText(float64(pad), float64(ht-18), "start", picMuted, fmtNum(lo)))
	body.WriteString(svgText(float64(pad+size), float64(ht-18), "end", picMuted, fmtNum(hi)))
	body.WriteString(svgText(float64(pad)+float64(size)/2, float64(ht-4), "middle", picInk, wn))
	fmt.Fprintf(&body, `<text x="12" y="%.1f" text-anchor="middle" fill="%s" transform="rotate(-90 12 %.1f)">%s</text>`, 12+float64(size)/2, picInk, 12+float64(size)/2, html.EscapeString(gn))
	band := "no tolerance band (exact)"
	switch {
	case n.Abs > 0 && n.Rel > 0:
		band = fmt.Sprintf("the tolerance band |%s − %s| ≤ max(%s, %s × |%s|)", gn, wn, fmtNum(n.Abs), fmtNum(n.Rel), wn)
	case n.Abs > 0:
		band = fmt.Sprintf("the tolerance band |%s − %s| ≤ %s", gn, wn, fmtNum(n.Abs))
	case n.Rel > 0:
		band = fmt.Sprintf("the tolerance band |%s − %s| ≤ %s × |%s|", gn, wn, fmtNum(n.Rel), wn)
	}
	shown := count(len(n.Points), "differing cell", "differing cells")
	if len(n.Points) < n.Cells {
		shown = fmt.Sprintf("%d of %d differing cells (every %s)", len(n.Points), n.Cells, ordinal((n.Cells+ScatterPoints-1)/ScatterPoints))
	}
	caption := fmt.Sprintf("Scatter of %s (across) against %s (up) in column %s for %s, with the line %s = %s and %s: %d above the line (%s larger), %d below.",
		wn, gn, n.Column, shown, gn, wn, band, above, gn, below)
	figure(h, "scatter", n.Column, "Scatter of "+wn+" against "+gn+" in column "+n.Column, caption, w, ht, body.String())
}

func ordinal(k int) string {
	if k == 2 {
		return "second"
	}
	return strconv.Itoa(k) + "th"
}

// fixtureNum writes a value of a scatter point in shortest form.
func fixtureNum(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// levelsFigure draws the rows of each changed level of a category column
// on both sides.
// levelLabelCols is how many terminal columns of a level's name the levels
// picture shows beside its bars: 144 units of 11-unit sans-serif text, at
// about 7 units a column, which leaves room for punctuation and capitals
// in a wide face such as DejaVu Sans (Debian's fallback for system-ui).
// Common practice, no published source: the average advance of Latin
// sans-serif text is a little over half its size.
const levelLabelCols = 20

func (d *Diff) levelsFigure(h *htmlWriter, c CategoryShape) {
	wn, gn := d.wantName(), d.gotName()
	const w, labelW, rowH, top = 520, 150, 22, 22
	ht := top + rowH*len(c.Levels) + 12
	peak := 1
	for _, l := range c.Levels {
		peak = max(peak, l.Want, l.Got)
	}
	barMax := float64(w - labelW - 60)
	var body strings.Builder
	body.WriteString(svgText(labelW, 12, "start", picWant, wn))
	body.WriteString(svgText(labelW+60, 12, "start", picGot, gn))
	var words []string
	for i, l := range c.Levels {
		y := float64(top + i*rowH)
		name, mark := l.Level, ""
		if l.Added {
			mark = " (added)"
		} else if l.Removed {
			mark = " (removed)"
		}
		name += mark
		// The label has labelW units, about levelLabelCols columns of
		// text at this size: a longer level is shortened here (whole in
		// the label's title, the bars' titles and the caption), never cut
		// by the picture's edge.
		label := textwidth.Truncate(l.Level, max(levelLabelCols-textwidth.Width(mark), 4)) + mark
		fmt.Fprintf(&body, `<text x="%d" y="%.1f" text-anchor="end" fill="%s"><title>%s</title>%s</text>`,
			labelW-6, y+13, picInk, html.EscapeString(name), html.EscapeString(label))
		for k, side := range []struct {
			n     int
			fill  string
			class string
		}{{l.Want, picWant, "ps-level-want"}, {l.Got, picGot, "ps-level-got"}} {
			bw := barMax * float64(side.n) / float64(peak)
			if side.n > 0 {
				bw = max(bw, 1.5)
			}
			fmt.Fprintf(&body, `<rect class="ps-level %s" x="%d" y="%.1f" width="%.1f" height="8" fill="%s"><title>%s</title></rect>`,
				side.class, labelW, y+2+float64(k)*9, bw, side.fill, html.EscapeString(fmt.Sprintf("%s: %s in %s", l.Level, count(side.n, "row", "rows"), pick(k == 0, wn, gn))))
		}
		body.WriteString(svgText(float64(labelW)+barMax*float64(max(l.Want, l.Got))/float64(peak)+6, y+13, "start", picMuted, fmt.Sprintf("%d → %d", l.Want, l.Got)))
		words = append(words, fmt.Sprintf("%s %d → %d", name, l.Want, l.Got))
	}
	caption := fmt.Sprintf("Rows per level of column %s, %s then %s, for the %s that changed: %s.",
		c.Column, wn, gn, count(len(c.Levels), "level", "levels"), strings.Join(words, "; "))
	if c.More > 0 {
		caption += fmt.Sprintf(" %s left out.", capitalise(count(c.More, "more changed level", "more changed levels")))
	}
	figure(h, "levels", c.Column, "Rows per level of column "+c.Column+", "+wn+" and "+gn, caption, w, ht, body.String())
}
