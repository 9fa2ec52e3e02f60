package chart

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strings"
	"unicode/utf8"

	"bivar/themes"
)

type svgDrawer struct{ pal themes.Palette }

const (
	tickFont   = 11.5
	titleFont  = 13
	labelFont  = 11
	charW      = 0.58 // average glyph width in em, to size text without a font file
	cellPx     = 8    // density cell size in pixels
	maxVerts   = 600  // polylines are thinned to this many vertices
	labelRunes = 24   // point labels longer than this are shortened in the figure
)

// textWidth estimates the width of s at the given font size without a
// font file: average advance widths in em of DejaVu Sans, the fallback
// sans-serif on Linux, by kind of character (digits 0.64, capitals 0.70,
// narrow punctuation 0.32, others charW), rounded up so that a label's
// plate and the legend's spacing err on the wide side.
func textWidth(s string, size float64) float64 {
	w := 0.0
	for _, r := range s {
		switch {
		case r >= '0' && r <= '9':
			w += 0.64
		case r >= 'A' && r <= 'Z':
			w += 0.70
		case strings.ContainsRune(" .,:;'|!()[]-/", r):
			w += 0.32
		case r == 'm' || r == 'w' || r == 'M' || r == 'W':
			w += 0.9
		default:
			w += charW
		}
	}
	return w * size
}

// esc escapes s for XML text and attribute values. Bytes that are not valid
// UTF-8 and characters XML 1.0 forbids become U+FFFD, so any label gives a
// well-formed document.
func esc(s string) string {
	var b strings.Builder
	for i, w := 0, 0; i < len(s); i += w {
		r, size := utf8.DecodeRuneInString(s[i:])
		w = size
		if r == utf8.RuneError && size == 1 {
			r = '\uFFFD'
		}
		switch {
		case r == '&':
			b.WriteString("&amp;")
		case r == '<':
			b.WriteString("&lt;")
		case r == '>':
			b.WriteString("&gt;")
		case r == '"':
			b.WriteString("&quot;")
		case r == '\'':
			b.WriteString("&#39;")
		case r == '\t' || r == '\n' || r == '\r':
			b.WriteByte(' ')
		case r < 0x20 || (r >= 0xD800 && r <= 0xDFFF) || r == 0xFFFE || r == 0xFFFF:
			b.WriteRune('\uFFFD')
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}

// shorten cuts a label to n runes, ending with an ellipsis.
func shorten(s string, n int) string {
	if utf8.RuneCountInString(s) <= n {
		return s
	}
	r := []rune(s)
	return string(r[:n-1]) + "…"
}

func finite(vs ...float64) bool {
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}

// thin keeps at most maxVerts evenly spaced indices of a polyline,
// always the first and the last.
func thin(n int) []int {
	idx := make([]int, 0, min(n, maxVerts))
	if n <= maxVerts {
		for i := range n {
			idx = append(idx, i)
		}
		return idx
	}
	for k := range maxVerts {
		idx = append(idx, k*(n-1)/(maxVerts-1))
	}
	return idx
}

type layout struct {
	x, y          Axis
	left, right   float64 // plot area in pixels
	top, bottom   float64
	width, height float64
	legend        []legendItem
	legendRows    [][]legendItem
	legendTop     float64
}

type legendItem struct {
	kind  string // "series", "band", "line", "mark", "density"
	index int    // series index or Role
	role  Role
	text  string
}

func (d *svgDrawer) seriesColour(i, n int) string {
	if n <= 1 {
		return d.pal.Point
	}
	return d.pal.Groups[i%len(d.pal.Groups)]
}

func (d *svgDrawer) roleStyle(r Role) (stroke string, width float64, dash string) {
	switch r {
	case RoleFit:
		return d.pal.Fit, 2, ""
	case RoleLowess:
		// dash-dot: told apart from the old or comparison line's long
		// dashes ("8 4") and the curve's dots ("2 3") where a theme draws
		// them all in one colour (contrast)
		return d.pal.Lowess, 1.8, "7 3 1.5 3"
	case RoleCurve:
		return d.pal.Curve, 2.2, "2 3"
	case RoleZero:
		return d.pal.Muted, 1, "4 3"
	case RolePred:
		return d.pal.Pred, 0.8, "3 3"
	case RoleGroup:
		return d.pal.Ink, 1.3, "1 0"
	case RoleOld:
		return d.pal.Muted, 2, "8 4"
	default:
		return d.pal.Conf, 0, ""
	}
}

func (d *svgDrawer) bandFill(r Role) (fill string, opacity float64) {
	if r == RolePred {
		return d.pal.Pred, 0.16
	}
	if r == RoleOldBand {
		return d.pal.Muted, 0.22
	}
	return d.pal.Conf, 0.30
}

func (d *svgDrawer) plan(f *Figure) *layout {
	var ex, ey extent
	for _, s := range f.Points {
		for i := range s.X {
			if finite(s.X[i], s.Y[i]) {
				ex.add(s.X[i])
				ey.add(s.Y[i])
			}
		}
	}
	for _, m := range f.Marked {
		if finite(m.X, m.Y) {
			ex.add(m.X)
			ey.add(m.Y)
		}
	}
	if g := f.Density; f.Dense && g != nil && finite(g.XLo, g.XHi, g.YLo, g.YHi) {
		ex.add(g.XLo, g.XHi)
		ey.add(g.YLo, g.YHi)
	}
	// A figure without points (two runs' lines) takes its x range from
	// its lines.
	if ex.n == 0 {
		for _, l := range f.Lines {
			for i := range l.X {
				if finite(l.X[i], l.Y[i]) {
					ex.add(l.X[i])
				}
			}
		}
	}
	// Lines and bands are drawn across the points' x range only; their y
	// values widen the y range so the bands are seen whole.
	for _, l := range f.Lines {
		for i := range l.X {
			if finite(l.X[i], l.Y[i]) && (ex.n == 0 || (l.X[i] >= ex.lo && l.X[i] <= ex.hi)) {
				ey.add(l.Y[i])
			}
		}
	}
	for _, b := range f.Bands {
		for i := range b.X {
			if finite(b.X[i], b.Low[i], b.High[i]) && (ex.n == 0 || (b.X[i] >= ex.lo && b.X[i] <= ex.hi)) {
				ey.add(b.Low[i], b.High[i])
			}
		}
	}
	L := &layout{width: float64(f.Width), height: float64(f.Height)}
	L.x = scaledAxis(newAxis(ex, 7), f.XScale, 7)
	L.y = scaledAxis(newAxis(ey, 6), f.YScale, 6)
	wide := 0.0
	for _, s := range L.y.Labels {
		wide = math.Max(wide, textWidth(s, tickFont))
	}
	wide = math.Max(wide, f.TickRoom)
	L.left = 10 + titleFont + 10 + wide + 6
	L.right = L.width - 18
	L.top = 14

	// Legend entries in a fixed order.
	ns := len(f.Points)
	if f.Dense {
		L.legend = append(L.legend, legendItem{kind: "density", text: "density of rows (darker = more)"})
	} else {
		for i, s := range f.Points {
			L.legend = append(L.legend, legendItem{kind: "series", index: i, text: s.Name})
			_ = ns
		}
	}
	for _, b := range f.Bands {
		if b.Name != "" { // an unnamed band shares the legend entry of a named one
			L.legend = append(L.legend, legendItem{kind: "band", role: b.Role, text: b.Name})
		}
	}
	for _, l := range f.Lines {
		if l.Name != "" {
			L.legend = append(L.legend, legendItem{kind: "line", role: l.Role, text: l.Name})
		}
	}
	if len(f.Marked) > 0 {
		L.legend = append(L.legend, legendItem{kind: "mark", text: "named row"})
	}
	// Wrap the legend into rows.
	var row []legendItem
	x := 0.0
	avail := L.width - 24
	for _, it := range L.legend {
		w := 26 + textWidth(shorten(it.text, 40), labelFont) + 16
		if x+w > avail && len(row) > 0 {
			L.legendRows = append(L.legendRows, row)
			row, x = nil, 0
		}
		row = append(row, it)
		x += w
	}
	if len(row) > 0 {
		L.legendRows = append(L.legendRows, row)
	}
	legendH := float64(len(L.legendRows)) * 17
	L.bottom = L.height - (tickFont + 8 + titleFont + 12 + legendH + 6)
	L.legendTop = L.bottom + tickFont + 8 + titleFont + 16
	return L
}

func (L *layout) px(v float64) float64 { return L.x.pos(v, L.left, L.right) }
func (L *layout) py(v float64) float64 { return L.y.pos(v, L.bottom, L.top) }

// marker writes the path of marker shape k (0 circle, 1 square, 2 triangle,
// 3 diamond, 4 inverted triangle, 5 cross) centred at (x, y), radius r.
func marker(k int, x, y, r float64) string {
	c := coord
	switch k % 6 {
	case 0:
		return fmt.Sprintf(`<circle cx="%s" cy="%s" r="%s"`, c(x), c(y), c(r))
	case 1:
		s := r * 0.9
		return fmt.Sprintf(`<rect x="%s" y="%s" width="%s" height="%s"`, c(x-s), c(y-s), c(2*s), c(2*s))
	case 2:
		return fmt.Sprintf(`<path d="M%s %sL%s %sL%s %sZ"`, c(x), c(y-r*1.15), c(x+r*1.05), c(y+r*0.8), c(x-r*1.05), c(y+r*0.8))
	case 3:
		return fmt.Sprintf(`<path d="M%s %sL%s %sL%s %sL%s %sZ"`, c(x), c(y-r*1.25), c(x+r*1.1), c(y), c(x), c(y+r*1.25), c(x-r*1.1), c(y))
	case 4:
		return fmt.Sprintf(`<path d="M%s %sL%s %sL%s %sZ"`, c(x), c(y+r*1.15), c(x+r*1.05), c(y-r*0.8), c(x-r*1.05), c(y-r*0.8))
	default:
		a, b := r*1.1, r*0.38
		return fmt.Sprintf(`<path d="M%s %sH%sV%sH%sV%sH%sV%sH%sV%sH%sV%sZ"`,
			c(x-a), c(y-b), c(x-b), c(y-a), c(x+b), c(y-b), c(x+a), c(y+b), c(x+b), c(y+a), c(x-b), c(y+b))
	}
}

// look is series i's marker shape and paint: its own (marker, markerPaint),
// or for the series of other group levels the one shape no level uses, in
// the muted colour, open.
func (d *svgDrawer) look(f *Figure, i int) (shape int, paint string) {
	if i < len(f.Points) && f.Points[i].Other {
		return GroupLooks - 1, fmt.Sprintf(` fill="%s" fill-opacity="0.5" stroke="%s" stroke-width="0.6"/>`, d.pal.Muted, d.pal.Muted)
	}
	return i, d.markerPaint(i, len(f.Points))
}

// markerPaint is the fill and stroke of series i's markers. In a
// monochrome palette every other shape is drawn open, so shapes differ in
// two ways.
func (d *svgDrawer) markerPaint(i, n int) string {
	col := d.seriesColour(i, n)
	if d.pal.Monochrome && i%2 == 1 {
		return fmt.Sprintf(` fill="%s" stroke="%s" stroke-width="1.3"/>`, d.pal.Background, col)
	}
	return fmt.Sprintf(` fill="%s" fill-opacity="0.78" stroke="%s" stroke-width="0.6"/>`, col, d.pal.Background)
}

// Draw writes f as a standalone SVG document.
func (d *svgDrawer) Draw(w io.Writer, f *Figure) error {
	if f.Width <= 0 || f.Height <= 0 {
		return fmt.Errorf("chart %q: width and height must be positive, got %d×%d", f.ID, f.Width, f.Height)
	}
	bw := bufio.NewWriter(w)
	L := d.plan(f)
	id := esc(f.ID)
	p := func(format string, a ...any) { fmt.Fprintf(bw, format, a...) }
	c := coord

	p(`<svg xmlns="http://www.w3.org/2000/svg" width="%d" height="%d" viewBox="0 0 %d %d" role="img" aria-labelledby="%s-title %s-desc" font-family="system-ui, 'DejaVu Sans', sans-serif">`+"\n",
		f.Width, f.Height, f.Width, f.Height, id, id)
	p("<title id=\"%s-title\">%s</title>\n<desc id=\"%s-desc\">%s</desc>\n", id, esc(f.Title), id, esc(f.Desc))
	p("<defs><clipPath id=\"%s-clip\"><rect x=\"%s\" y=\"%s\" width=\"%s\" height=\"%s\"/></clipPath></defs>\n",
		id, c(L.left), c(L.top), c(L.right-L.left), c(L.bottom-L.top))
	p("<rect width=\"%d\" height=\"%d\" fill=\"%s\"/>\n", f.Width, f.Height, d.pal.Background)

	// Grid and frame.
	p("<g stroke=\"%s\" stroke-width=\"1\">", d.pal.Grid)
	for _, t := range L.x.Ticks {
		p(`<path d="M%s %sV%s"/>`, c(L.px(t)), c(L.top), c(L.bottom))
	}
	for _, t := range L.y.Ticks {
		p(`<path d="M%s %sH%s"/>`, c(L.left), c(L.py(t)), c(L.right))
	}
	p("</g>\n")

	p("<g clip-path=\"url(#%s-clip)\">\n", id)
	d.drawBands(bw, f, L)
	if f.Dense {
		d.drawDensity(bw, f, L)
	} else {
		d.drawPoints(bw, f, L)
	}
	d.drawLines(bw, f, L)
	d.drawMarks(bw, f, L)
	p("</g>\n")
	d.drawLabels(bw, f, L)

	// Axes: frame, ticks, labels, titles.
	p("<path d=\"M%s %sV%sH%s\" fill=\"none\" stroke=\"%s\" stroke-width=\"1\"/>\n", c(L.left), c(L.top), c(L.bottom), c(L.right), d.pal.Ink)
	p("<g fill=\"%s\" font-size=\"%s\">", d.pal.Ink, c(tickFont))
	for i, t := range L.x.Ticks {
		x := L.px(t)
		p(`<path d="M%s %sv5" stroke="%s"/><text x="%s" y="%s" text-anchor="middle">%s</text>`,
			c(x), c(L.bottom), d.pal.Ink, c(x), c(L.bottom+5+tickFont), esc(L.x.Labels[i]))
	}
	for i, t := range L.y.Ticks {
		y := L.py(t)
		p(`<path d="M%s %sh-5" stroke="%s"/><text x="%s" y="%s" text-anchor="end">%s</text>`,
			c(L.left), c(y), d.pal.Ink, c(L.left-8), c(y+tickFont*0.35), esc(L.y.Labels[i]))
	}
	p("</g>\n")
	midX := (L.left + L.right) / 2
	midY := (L.top + L.bottom) / 2
	p("<text x=\"%s\" y=\"%s\" text-anchor=\"middle\" font-size=\"%s\" font-weight=\"600\" fill=\"%s\">%s</text>\n",
		c(midX), c(L.bottom+tickFont+8+titleFont+2), c(titleFont), d.pal.Ink, esc(shorten(f.XLabel, 90)))
	p("<text transform=\"translate(%s %s) rotate(-90)\" text-anchor=\"middle\" font-size=\"%s\" font-weight=\"600\" fill=\"%s\">%s</text>\n",
		c(10+titleFont*0.8), c(midY), c(titleFont), d.pal.Ink, esc(shorten(f.YLabel, 60)))
	d.drawLegend(bw, f, L)
	p("</svg>\n")
	return bw.Flush()
}

func (d *svgDrawer) drawBands(w io.Writer, f *Figure, L *layout) {
	for _, b := range f.Bands {
		var up, down []string
		for i := range b.X {
			if !finite(b.X[i], b.Low[i], b.High[i]) {
				continue
			}
			x := coord(L.px(b.X[i]))
			up = append(up, x+","+coord(L.py(b.High[i])))
			down = append(down, x+","+coord(L.py(b.Low[i])))
		}
		if len(up) < 2 {
			continue
		}
		up, down = thinStrings(up), thinStrings(down)
		fill, op := d.bandFill(b.Role)
		pts := strings.Join(up, " ")
		for i := len(down) - 1; i >= 0; i-- {
			pts += " " + down[i]
		}
		fmt.Fprintf(w, "<polygon points=\"%s\" fill=\"%s\" fill-opacity=\"%s\" stroke=\"none\"/>\n", pts, fill, coord(op))
		if b.Role == RolePred {
			stroke, width, dash := d.roleStyle(RolePred)
			for _, edge := range [][]string{up, down} {
				fmt.Fprintf(w, "<polyline points=\"%s\" fill=\"none\" stroke=\"%s\" stroke-width=\"%s\" stroke-dasharray=\"%s\"/>\n",
					strings.Join(edge, " "), stroke, coord(width), dash)
			}
		}
	}
}

func thinStrings(s []string) []string {
	idx := thin(len(s))
	if len(idx) == len(s) {
		return s
	}
	out := make([]string, len(idx))
	for k, i := range idx {
		out[k] = s[i]
	}
	return out
}

func (d *svgDrawer) drawPoints(w io.Writer, f *Figure, L *layout) {
	n := len(f.Points)
	for si, s := range f.Points {
		if f.Join {
			var seg []string
			for i := range s.X {
				if finite(s.X[i], s.Y[i]) {
					seg = append(seg, coord(L.px(s.X[i]))+","+coord(L.py(s.Y[i])))
				}
			}
			if len(seg) > 1 {
				fmt.Fprintf(w, "<polyline points=\"%s\" fill=\"none\" stroke=\"%s\" stroke-width=\"0.7\" stroke-opacity=\"0.6\"/>\n",
					strings.Join(seg, " "), d.seriesColour(si, n))
			}
		}
		shape, paint := d.look(f, si)
		fmt.Fprintf(w, "<g>")
		for i := range s.X {
			if !finite(s.X[i], s.Y[i]) {
				continue
			}
			fmt.Fprint(w, marker(shape, L.px(s.X[i]), L.py(s.Y[i]), 3.6), paint)
		}
		fmt.Fprint(w, "</g>\n")
	}
}

// drawDensity draws the figure's density grid (binned by the analysis):
// each non-empty cell as a rectangle shaded in five steps on a log scale of
// its count relative to the fullest cell.
func (d *svgDrawer) drawDensity(w io.Writer, f *Figure, L *layout) {
	g := f.Density
	if g == nil || g.NX <= 0 || g.NY <= 0 || len(g.Counts) != g.NX*g.NY {
		return
	}
	peak := 0
	for _, k := range g.Counts {
		peak = max(peak, k)
	}
	cw := (g.XHi - g.XLo) / float64(g.NX)
	ch := (g.YHi - g.YLo) / float64(g.NY)
	fmt.Fprintf(w, "<g fill=\"%s\">", d.pal.Point)
	for j := range g.NY {
		for i := range g.NX {
			k := g.Counts[j*g.NX+i]
			if k == 0 {
				continue
			}
			x0, x1 := L.px(g.XLo+float64(i)*cw), L.px(g.XLo+float64(i+1)*cw)
			y1, y0 := L.py(g.YLo+float64(j)*ch), L.py(g.YLo+float64(j+1)*ch)
			level := math.Ceil(5 * math.Log1p(float64(k)) / math.Log1p(float64(peak)))
			fmt.Fprintf(w, `<rect x="%s" y="%s" width="%s" height="%s" fill-opacity="%s"/>`,
				coord(x0), coord(y0), coord(x1-x0), coord(y1-y0), coord(0.12+0.176*level))
		}
	}
	fmt.Fprint(w, "</g>\n")
}

func (d *svgDrawer) drawLines(w io.Writer, f *Figure, L *layout) {
	for _, l := range f.Lines {
		stroke, width, dash := d.roleStyle(l.Role)
		if l.Role == RoleGroup {
			stroke, dash = d.seriesColour(l.Group, max(len(f.Points), len(f.Levels))), ""
			if d.pal.Monochrome {
				dash = []string{"", "5 2", "1 2", "8 2 1 2"}[l.Group%4]
			}
			if l.Heavy {
				width = 2.6
			}
		}
		if l.Role == RoleLowess && len(f.Levels) > 1 {
			// neutral where colours name the groups: no level's colour
			stroke = d.pal.Muted
		}
		var b strings.Builder
		pen := false
		for _, i := range thin(len(l.X)) {
			if !finite(l.X[i], l.Y[i]) {
				pen = false
				continue
			}
			if pen {
				b.WriteString("L")
			} else {
				b.WriteString("M")
			}
			b.WriteString(coord(L.px(l.X[i])) + " " + coord(L.py(l.Y[i])))
			pen = true
		}
		if b.Len() == 0 {
			continue
		}
		da := ""
		if dash != "" {
			da = ` stroke-dasharray="` + dash + `"`
		}
		fmt.Fprintf(w, "<path d=\"%s\" fill=\"none\" stroke=\"%s\" stroke-width=\"%s\"%s stroke-linejoin=\"round\"/>\n", b.String(), stroke, coord(width), da)
	}
}

func (d *svgDrawer) drawMarks(w io.Writer, f *Figure, L *layout) {
	if len(f.Marked) == 0 {
		return
	}
	fmt.Fprintf(w, "<g fill=\"none\" stroke=\"%s\" stroke-width=\"2\">", d.pal.Flag)
	for _, m := range f.Marked {
		if !finite(m.X, m.Y) {
			continue
		}
		x, y := L.px(m.X), L.py(m.Y)
		fmt.Fprintf(w, `<circle cx="%s" cy="%s" r="7.5"/><path d="M%s %sh4M%s %sh-4"/>`,
			coord(x), coord(y), coord(x+7.5), coord(y), coord(x-7.5), coord(y))
	}
	fmt.Fprint(w, "</g>\n")
}

type box struct{ x0, y0, x1, y1 float64 }

func (a box) overlaps(b box) bool { return a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1 }

// drawLabels names each flagged row beside its mark. Of eight places
// around the mark it takes the one inside the plot area that overlaps no
// earlier label or mark and covers the fewest ordinary points (the first
// such place in a fixed order on a tie), so the result is deterministic.
// Where none is free (marks crowded together) it tries the same places
// on two rings farther out, joined to the mark by a thin line; where none
// of those is free either, the mark has no label.
// Each label sits on a plate of the background colour with a thin rim in
// the flag colour, so it stays legible over points, lines and bands.
func (d *svgDrawer) drawLabels(w io.Writer, f *Figure, L *layout) {
	if len(f.Marked) == 0 {
		return
	}
	var taken []box
	for _, m := range f.Marked {
		if finite(m.X, m.Y) {
			x, y := L.px(m.X), L.py(m.Y)
			taken = append(taken, box{x - 8, y - 8, x + 8, y + 8})
		}
	}
	// Ordinary points as pixel positions (density cells are not counted:
	// there the label plate covers whatever it lies on).
	var pts [][2]float64
	if !f.Dense {
		for _, s := range f.Points {
			for i := range s.X {
				if finite(s.X[i], s.Y[i]) {
					pts = append(pts, [2]float64{L.px(s.X[i]), L.py(s.Y[i])})
				}
			}
		}
	}
	covered := func(b box) int {
		k := 0
		for _, p := range pts {
			if p[0] > b.x0-3 && p[0] < b.x1+3 && p[1] > b.y0-3 && p[1] < b.y1+3 {
				k++
			}
		}
		return k
	}
	type spot struct {
		dx, dy float64
		anchor string
	}
	near := []spot{{11, 4, "start"}, {-11, 4, "end"}, {0, -12, "middle"}, {0, 20, "middle"},
		{9, -9, "start"}, {9, 16, "start"}, {-9, -9, "end"}, {-9, 16, "end"}}
	// Where marks crowd together, rings of the same places farther out,
	// each joined to its mark by a thin line: the offsets from the text's
	// baseline (4 below the mark's centre) times the ring's factor.
	var spots []spot
	for _, r := range []float64{1, 2.5, 4} {
		for _, s := range near {
			spots = append(spots, spot{s.dx * r, (s.dy-4)*r + 4, s.anchor})
		}
	}
	type placed struct {
		b    box
		s    spot
		x, y float64
		text string
		far  bool // on an outer ring: joined to its mark by a line
	}
	var out []placed
	for _, m := range f.Marked {
		if !finite(m.X, m.Y) || m.Label == "" {
			continue
		}
		text := shorten(m.Label, labelRunes)
		tw := textWidth(text, labelFont)
		x, y := L.px(m.X), L.py(m.Y)
		best, bs, bestCover, far := box{}, spot{}, -1, false
		for k, s := range spots {
			if k == len(near) && bestCover >= 0 || k == 2*len(near) && bestCover >= 0 {
				break // a nearer ring had a free place
			}
			bx := box{x + s.dx, y + s.dy - labelFont, x + s.dx + tw, y + s.dy + 3}
			switch s.anchor {
			case "end":
				bx.x0, bx.x1 = x+s.dx-tw, x+s.dx
			case "middle":
				bx.x0, bx.x1 = x-tw/2, x+tw/2
			}
			if bx.x0 < L.left || bx.x1 > L.right || bx.y0 < L.top || bx.y1 > L.bottom {
				continue
			}
			free := true
			for _, t := range taken {
				if bx.overlaps(t) {
					free = false
					break
				}
			}
			if !free {
				continue
			}
			if c := covered(bx); bestCover < 0 || c < bestCover {
				best, bs, bestCover, far = bx, s, c, k >= len(near)
			}
		}
		if bestCover < 0 {
			// No place beside the mark is free: the mark stays unlabelled
			// (the row is named in the report's tables), rather than its
			// label printed over another and both left unreadable.
			continue
		}
		taken = append(taken, best)
		out = append(out, placed{best, bs, x, y, text, far})
	}
	// The lines to labels on an outer ring, from the mark's rim to the
	// nearest point of the label's plate, under the plates.
	var lines strings.Builder
	for _, p := range out {
		if !p.far {
			continue
		}
		tx, ty := math.Max(p.b.x0-2.5, math.Min(p.x, p.b.x1+2.5)), math.Max(p.b.y0-0.5, math.Min(p.y, p.b.y1+0.5))
		if l := math.Hypot(tx-p.x, ty-p.y); l > 8 {
			sx, sy := p.x+(tx-p.x)*7.5/l, p.y+(ty-p.y)*7.5/l
			fmt.Fprintf(&lines, `<path d="M%s %sL%s %s"/>`, coord(sx), coord(sy), coord(tx), coord(ty))
		}
	}
	if lines.Len() > 0 {
		fmt.Fprintf(w, "<g stroke=\"%s\" stroke-width=\"0.8\">%s</g>\n", d.pal.Flag, lines.String())
	}
	fmt.Fprintf(w, "<g fill=\"%s\" fill-opacity=\"0.9\" stroke=\"%s\" stroke-width=\"0.8\">", d.pal.Background, d.pal.Flag)
	for _, p := range out {
		fmt.Fprintf(w, `<rect x="%s" y="%s" width="%s" height="%s" rx="2"/>`,
			coord(p.b.x0-2.5), coord(p.b.y0-0.5), coord(p.b.x1-p.b.x0+5), coord(p.b.y1-p.b.y0+1))
	}
	fmt.Fprint(w, "</g>\n")
	fmt.Fprintf(w, "<g font-size=\"%s\" fill=\"%s\">", coord(labelFont), d.pal.Ink)
	for _, p := range out {
		fmt.Fprintf(w, `<text x="%s" y="%s" text-anchor="%s">%s</text>`, coord(p.x+p.s.dx), coord(p.y+p.s.dy), p.s.anchor, esc(p.text))
	}
	fmt.Fprint(w, "</g>\n")
}

func (d *svgDrawer) drawLegend(w io.Writer, f *Figure, L *layout) {
	for r, row := range L.legendRows {
		y := L.legendTop + float64(r)*17
		x := 14.0
		for _, it := range row {
			sx := x + 11
			switch it.kind {
			case "series":
				shape, paint := d.look(f, it.index)
				fmt.Fprint(w, marker(shape, sx, y-4, 3.8), paint)
			case "density":
				fmt.Fprintf(w, `<rect x="%s" y="%s" width="7" height="9" fill="%s" fill-opacity="0.3"/><rect x="%s" y="%s" width="7" height="9" fill="%s" fill-opacity="0.9"/>`,
					coord(sx-8), coord(y-8.5), d.pal.Point, coord(sx), coord(y-8.5), d.pal.Point)
			case "band":
				fill, op := d.bandFill(it.role)
				fmt.Fprintf(w, `<rect x="%s" y="%s" width="20" height="10" fill="%s" fill-opacity="%s"/>`, coord(sx-10), coord(y-9), fill, coord(op*1.6))
			case "line":
				stroke, width, dash := d.roleStyle(it.role)
				if it.role == RoleGroup {
					dash = ""
				}
				if it.role == RoleLowess && len(f.Levels) > 1 {
					stroke = d.pal.Muted // as drawn: neutral beside the groups' colours
				}
				da := ""
				if dash != "" {
					da = ` stroke-dasharray="` + dash + `"`
				}
				fmt.Fprintf(w, `<path d="M%s %sh22" stroke="%s" stroke-width="%s"%s/>`, coord(sx-11), coord(y-4), stroke, coord(width), da)
			case "mark":
				fmt.Fprintf(w, `<circle cx="%s" cy="%s" r="5.5" fill="none" stroke="%s" stroke-width="2"/>`, coord(sx), coord(y-4), d.pal.Flag)
			}
			text := shorten(it.text, 40)
			fmt.Fprintf(w, `<text x="%s" y="%s" font-size="%s" fill="%s">%s</text>`, coord(x+26), coord(y), coord(labelFont), d.pal.Ink, esc(text))
			x += 26 + textWidth(text, labelFont) + 16
		}
		fmt.Fprint(w, "\n")
	}
}
