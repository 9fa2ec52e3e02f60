package chart

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"bivar/analysis/report"
)

// Sizes of the figures in CSS pixels (width, height).
const (
	ScatterW, ScatterH   = 680, 500
	StripH               = 230 // the drift strip: as wide as the scatterplot, low
	ResidualW, ResidualH = 480, 360
	ResidualXH           = 220 // the distances along x, under the scatterplot and as wide
)

// AxisTitle is a variable's label with its unit as people write it
// (report.Variable.Symbol, filled by the analysis), in parentheses; a label
// that already ends in a parenthesis takes the unit after a comma, so
// "Surface hardness (Rockwell C), HRC" does not stack two parentheses.
//
// A variable on a transformed scale adds it: "Income (BEF), natural-log
// scale".
func AxisTitle(v report.Variable) string {
	name := varName(v)
	switch {
	case v.Symbol == "":
	case strings.HasSuffix(name, ")"):
		name += ", " + v.Symbol
	default:
		name += " (" + v.Symbol + ")"
	}
	if sc := scaleNames[v.Scale]; sc != "" {
		name += ", " + sc
	}
	return name
}

// InUnit is a variable's label followed by "in" and its unit, for
// sentences and captions: "Surface hardness (Rockwell C) in HRC".
//
// A variable on a transformed scale adds it: "Income in BEF, on the
// natural-log scale".
func InUnit(v report.Variable) string {
	name := varName(v)
	if v.Symbol != "" {
		name += " in " + v.Symbol
	}
	if sc := scaleNames[v.Scale]; sc != "" {
		name += ", on the " + sc
	}
	return name
}

// GroupName is the group column as people read it: its label, else the
// column name.
func GroupName(s *report.Study) string {
	if s.GroupLabel != "" {
		return s.GroupLabel
	}
	return s.Group
}

// OrderName is the order column as people read it: its label, else the
// column name, else "run order".
func OrderName(s *report.Study) string {
	switch {
	case s.OrderLabel != "":
		return s.OrderLabel
	case s.Order != "":
		return s.Order
	}
	return "run order"
}

// varName is the label, or the column when there is none.
func varName(v report.Variable) string {
	if v.Label != "" {
		return v.Label
	}
	return v.Column
}

// looks assigns the plot's group levels to series: with at most
// GroupLooks levels each has its own series; with more, the GroupLooks − 1
// largest (ties by name) keep their own look, in sorted order, and the rest
// share one grey series after them. seriesOf[level] is the level's series
// index; others is the number of levels in the grey series.
func looks(p *report.Plot) (own []int, seriesOf []int, others int) {
	n := len(p.Levels)
	seriesOf = make([]int, n)
	if n <= GroupLooks {
		for i := range n {
			own = append(own, i)
			seriesOf[i] = i
		}
		return own, seriesOf, 0
	}
	bySize := make([]int, n)
	for i := range bySize {
		bySize[i] = i
	}
	count := func(i int) int {
		if i < len(p.LevelCounts) {
			return p.LevelCounts[i]
		}
		return 0
	}
	slices.SortStableFunc(bySize, func(a, b int) int { return count(b) - count(a) })
	own = slices.Clone(bySize[:GroupLooks-1])
	slices.Sort(own)
	for i := range seriesOf {
		seriesOf[i] = len(own)
	}
	for k, i := range own {
		seriesOf[i] = k
	}
	return own, seriesOf, n - len(own)
}

// series splits the plot's points by group level (see looks), or returns
// one series of all points; pick chooses the two coordinates. It returns
// nil when the plot holds density grids instead of points.
func series(p *report.Plot, pick func(report.PlotPoint) (float64, float64)) []Series {
	if p.Points == nil {
		return nil
	}
	if len(p.Levels) == 0 {
		out := Series{Name: fmt.Sprintf("rows (n = %d)", len(p.Points))}
		for _, q := range p.Points {
			x, y := pick(q)
			out.X, out.Y = append(out.X, x), append(out.Y, y)
		}
		return []Series{out}
	}
	own, seriesOf, others := looks(p)
	out := make([]Series, len(own), len(own)+1)
	for k, i := range own {
		out[k].Level = p.Levels[i]
	}
	if others > 0 {
		out = append(out, Series{Other: true})
	}
	for _, q := range p.Points {
		x, y := pick(q)
		k := seriesOf[q.Group]
		out[k].X = append(out[k].X, x)
		out[k].Y = append(out[k].Y, y)
	}
	for i := range out {
		out[i].Name = fmt.Sprintf("%s (n = %d)", out[i].Level, len(out[i].X))
	}
	if others > 0 {
		o := &out[len(out)-1]
		o.Name = fmt.Sprintf("%d other levels, alike in grey (n = %d)", others, len(o.X))
	}
	return out
}

// marks are the plot's named rows at the coordinates pick chooses, the
// first report.LabelMax with their row name as a label.
func marks(p *report.Plot, pick func(report.Marked) (float64, float64)) []Mark {
	var out []Mark
	for _, m := range p.Marked {
		x, y := pick(m)
		k := Mark{X: x, Y: y}
		if m.Label {
			k.Label = m.Row
		}
		out = append(out, k)
	}
	return out
}

func markNames(m []Mark) string {
	if len(m) == 0 {
		return "No row is named."
	}
	var names []string
	for _, k := range m {
		if k.Label != "" {
			names = append(names, k.Label)
		}
	}
	if len(names) == len(m) {
		return fmt.Sprintf("%d named rows are circled and labelled: %s.", len(m), strings.Join(names, ", "))
	}
	return fmt.Sprintf("%d named rows are circled; the first %d are labelled: %s.", len(m), len(names), strings.Join(names, ", "))
}

// denseNote says why a chart draws density cells: more rows than
// DensityAbove, or (a study left in the database below that, with a
// max_rows set lower) rows that were never fetched one by one.
func denseNote(n, marked int) string {
	why := fmt.Sprintf("With %d rows, more than %d,", n, DensityAbove)
	if n <= DensityAbove {
		why = fmt.Sprintf("The %d rows stayed in the database, so", n)
	}
	if marked == 0 {
		return fmt.Sprintf(" %s the points are drawn as density cells (darker cells hold more rows); no row is named.", why)
	}
	return fmt.Sprintf(" %s the points are drawn as density cells (darker cells hold more rows); the %d named rows are drawn individually on top.", why, marked)
}

func pickXY(q report.PlotPoint) (float64, float64)    { return q.X, q.Y }
func pickOrder(q report.PlotPoint) (float64, float64) { return q.Order, q.Residual }
func markXY(m report.Marked) (float64, float64)       { return m.X, m.Y }
func markOrder(m report.Marked) (float64, float64)    { return m.Order, m.Residual }
func dense(p *report.Plot, g *report.Grid) (bool, *report.Grid) {
	return p.Points == nil && g != nil, g
}

// Scatter is the scatterplot of y against x with the least-squares line,
// its confidence band, the prediction band, the LOWESS curve, the curved
// model when the study has one, and the flagged rows labelled. level is the
// confidence in percent as the report states it, e.g. "95". It returns nil
// when the study has no plot data.
func Scatter(s *report.Study, id, level string) *Figure {
	p := s.Plot
	if p == nil || p.N == 0 || (p.Points == nil && p.Scatter == nil) {
		return nil
	}
	f := &Figure{
		ID: id, Width: ScatterW, Height: ScatterH,
		XLabel: AxisTitle(s.X), YLabel: AxisTitle(s.Y),
		Title:  fmt.Sprintf("%s against %s", varName(s.Y), varName(s.X)),
		Points: series(p, pickXY),
		Marked: marks(p, markXY),
		Levels: p.Levels,
		XScale: s.X.Scale, YScale: s.Y.Scale,
		TickRoom: alignedTicks,
	}
	f.Dense, f.Density = dense(p, p.Scatter)
	// A study the analysis found curved is drawn with its curve as the
	// main fit and the straight line, without bands, for comparison.
	curved := s.Findings != nil && s.Findings.Form == "curved" && len(p.Curve) > 0
	reversal := !curved && s.Findings != nil && s.Findings.Reversal && len(groupLines(s)) > 0
	if len(p.Band) > 0 {
		var bx, fit, cl, ch []float64
		for _, b := range p.Band {
			bx = append(bx, b.X)
			fit = append(fit, b.Fit)
			cl = append(cl, b.ConfLow)
			ch = append(ch, b.ConfHigh)
		}
		switch {
		case curved:
			f.Lines = append(f.Lines, Line{Name: "straight line, for comparison", X: bx, Y: fit, Role: RoleOld})
		case reversal:
			// the lines within the groups are the main fit; the pooled
			// line, without its band, is for comparison
			f.Lines = append(f.Lines, Line{Name: "pooled line, for comparison", X: bx, Y: fit, Role: RoleOld})
		default:
			f.Bands = []Band{{Name: level + "% confidence band of the line", X: bx, Low: cl, High: ch, Role: RoleConf}}
			f.Lines = append(f.Lines, Line{Name: "least-squares line", X: bx, Y: fit, Role: RoleFit})
		}
	}
	gl := groupLines(s)
	for i := range gl {
		gl[i].Heavy = reversal
	}
	f.Lines = append(f.Lines, gl...)
	if len(p.Lowess) > 0 {
		f.Lines = append(f.Lines, xyLine("LOWESS curve", p.Lowess, RoleLowess))
	}
	if curved {
		f.Lines = append(f.Lines, xyLine("parabola (the main fit)", p.Curve, RoleFit))
	} else if len(p.Curve) > 0 {
		f.Lines = append(f.Lines, xyLine("parabola", p.Curve, RoleCurve))
	}
	groups := ""
	if len(f.Points) > 1 && !f.Dense {
		groups = fmt.Sprintf(" Points are coloured and shaped by %s (%d levels).", GroupName(s), len(f.Points))
	}
	if curved {
		f.Desc = fmt.Sprintf("Scatterplot of %d rows, %s on the vertical axis against %s on the horizontal axis, with the parabola the analysis found as the main fit, the straight line for comparison and a LOWESS curve.%s %s",
			p.N, f.YLabel, f.XLabel, groups, markNames(f.Marked))
		// What each line is stands once in the appendix (Reading the
		// charts); the caption names only what this chart adds.
		f.Caption = "Solid: the parabola, the main fit; long dashes: the straight line; dash-dot: LOWESS."
	} else {
		f.Desc = fmt.Sprintf("Scatterplot of %d rows, %s on the vertical axis against %s on the horizontal axis, with the least-squares line, its %s%% confidence band and a LOWESS curve.%s %s",
			p.N, f.YLabel, f.XLabel, level, groups, markNames(f.Marked))
		f.Caption = LineCaption(level)
		if len(p.Curve) > 0 {
			f.Caption += " Dotted: parabola."
		}
	}
	switch {
	case len(p.Levels) > 1 && f.Dense:
		// Density cells pool the groups; only the groups' own lines show them.
		if len(s.Groups) > 0 {
			f.Caption += fmt.Sprintf(" Thin lines: the line within each level of %s (the density cells pool the levels).", GroupName(s))
		}
	case len(f.Points) > 1:
		f.Caption += fmt.Sprintf(" Colour and marker shape show %s", GroupName(s))
		o := f.Points[len(f.Points)-1]
		if o.Other {
			f.Caption += fmt.Sprintf(" for its %d largest levels; the %s", len(f.Points)-1, strings.TrimSuffix(o.Name, fmt.Sprintf(" (n = %d)", len(o.X))))
		}
		switch {
		case len(s.Groups) > 0 && o.Other:
			f.Caption += "; thin lines: the line within each level with a look of its own"
		case len(s.Groups) > 0 && reversal:
			f.Caption = strings.Replace(f.Caption, LineCaption(level), "Heavy coloured lines: the line within each group, the main fit; long dashes: the pooled line; dash-dot: LOWESS.", 1)
		case len(s.Groups) > 0:
			f.Caption += "; thin lines: the line within each group"
		}
		f.Caption += "."
	}
	if len(f.Marked) > 0 {
		f.Caption += " Circled: named rows (labelled: the first " + fmt.Sprint(min(len(f.Marked), report.LabelMax)) + ", where a label has room beside its mark)."
	}
	if f.Dense {
		f.Caption += denseNote(p.N, len(f.Marked))
		f.Desc += denseNote(p.N, len(f.Marked))
	}
	return f
}

// groupLines draws each group's own least-squares line (intercept and
// slope from the report's per-group fits) across that group's x range,
// in the colour of the group's level.
func groupLines(s *report.Study) []Line {
	p := s.Plot
	if p == nil || len(p.Levels) < 2 || len(s.Groups) == 0 || len(p.LevelXMin) != len(p.Levels) {
		return nil
	}
	own, seriesOf, _ := looks(p)
	var out []Line
	for _, i := range own {
		level := p.Levels[i]
		lo, hi := p.LevelXMin[i], p.LevelXMax[i]
		for _, g := range s.Groups {
			if g.Group != level || p.LevelCounts[i] == 0 || !g.Slope.Valid() || !g.Intercept.Valid() {
				continue
			}
			a, b := float64(g.Intercept), float64(g.Slope)
			name := ""
			if len(out) == 0 {
				name = "line within each group"
			}
			out = append(out, Line{Name: name, X: []float64{lo, hi}, Y: []float64{a + b*lo, a + b*hi}, Role: RoleGroup, Group: seriesOf[i]})
		}
	}
	return out
}

func xyLine(name string, pts []report.XY, r Role) Line {
	l := Line{Name: name, Role: r, X: make([]float64, len(pts)), Y: make([]float64, len(pts))}
	for i, q := range pts {
		l.X[i], l.Y[i] = q.X, q.Y
	}
	return l
}

// residualTitle is the residual axis's title, in the unit of y.
func residualTitle(s *report.Study) string {
	if sc := scaleNames[s.Y.Scale]; sc != "" {
		return "Residual (on the " + sc + ")" // a difference of logarithms or roots has no unit
	}
	if s.Y.Symbol != "" {
		return "Residual (" + s.Y.Symbol + ")"
	}
	return "Residual"
}

// zeroLine is the reference line at zero across [lo, hi].
func zeroLine(lo, hi float64) Line {
	if !(hi >= lo) {
		return Line{Role: RoleZero}
	}
	return Line{X: []float64{lo, hi}, Y: []float64{0, 0}, Role: RoleZero}
}

// spanOf is the range of the first coordinate pick chooses over the
// plot's points, or of the grid's x when it holds a grid.
func spanOf(p *report.Plot, g *report.Grid, pick func(report.PlotPoint) (float64, float64)) (lo, hi float64) {
	if p.Points == nil {
		if g == nil {
			return math.NaN(), math.NaN()
		}
		return g.XLo, g.XHi
	}
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, q := range p.Points {
		v, _ := pick(q)
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	return lo, hi
}

// fitName names the fit whose residuals the plot data hold: "curve" when
// the analysis put the quadratic's in place (report.Plot.ResidualsOf),
// else "line"; fitLong says it in full.
func fitName(p *report.Plot) string {
	if p.ResidualsOf == "curve" {
		return "curve"
	}
	return "line"
}

func fitLong(p *report.Plot) string {
	if p.ResidualsOf == "curve" {
		return "quadratic curve"
	}
	return "straight line"
}

// LineCaption is the caption of a scatter chart drawn the usual way: the
// least-squares line in its band at level percent, and the LOWESS smooth.
func LineCaption(level string) string {
	return fmt.Sprintf("Least-squares line in its %s%% band; dash-dot: LOWESS.", level)
}

// alignedTicks is the room the scatterplot and the distances against x
// under it keep for their y tick labels (up to "−0.0000"), so that
// their x axes line up.
var alignedTicks = textWidth("−0.0000", tickFont)

// ResidualsX plots each row's distance from the main fit against x, as
// wide as the scatterplot and on its x axis, to stand under it: a bow, a
// funnel or a run on one side shows where along x the fit misses. Above
// PlotPointsMax the rows are density cells (Plot.ResidX).
func ResidualsX(s *report.Study, id string) *Figure {
	p := s.Plot
	if p == nil || p.N == 0 || (p.Points == nil && p.ResidX == nil) {
		return nil
	}
	fit := fitName(p)
	f := &Figure{
		ID: id, Width: ScatterW, Height: ResidualXH,
		XLabel: AxisTitle(s.X), YLabel: residualTitle(s),
		Title:  "Distance from the " + fit + ", along " + varName(s.X),
		Points: series(p, pickResidX),
		Marked: marks(p, markResidX),
		Lines:  []Line{zeroLine(spanOf(p, p.ResidX, pickResidX))},
		Levels: p.Levels,
		XScale: s.X.Scale, TickRoom: alignedTicks,
	}
	f.Dense, f.Density = dense(p, p.ResidX)
	f.Desc = fmt.Sprintf("Residuals of the least-squares %s for %d rows against %s, on the scatterplot's x axis, with a dashed line at zero. %s", fitLong(p), p.N, varName(s.X), markNames(f.Marked))
	f.Caption = f.Title + "."
	if f.Dense {
		// The scatterplot's caption above says it once for both.
		f.Desc += denseNote(p.N, len(f.Marked))
	}
	return f
}

func pickResidX(q report.PlotPoint) (float64, float64) { return q.X, q.Residual }
func markResidX(m report.Marked) (float64, float64)    { return m.X, m.Residual }

// ResidualsOrder plots the residuals in run order (the analysis gives the
// points in run order, so the joining line follows the run). It returns
// nil when the study has no order column.
func ResidualsOrder(s *report.Study, id string) *Figure {
	p := s.Plot
	if p == nil || p.N == 0 || s.Order == "" || (p.Points == nil && p.ResidOrder == nil) {
		return nil
	}
	order := OrderName(s)
	xl := order
	if !strings.Contains(strings.ToLower(order), "order") {
		xl += " (run order)"
	}
	f := &Figure{
		ID: id, Width: ScatterW, Height: StripH,
		XLabel: xl, YLabel: residualTitle(s),
		Title:  "Drift strip: distance from the " + fitName(p) + ", in the order of " + order,
		Points: series(p, pickOrder),
		Marked: marks(p, markOrder),
		Lines:  []Line{zeroLine(spanOf(p, p.ResidOrder, pickOrder))},
		Levels: p.Levels,
	}
	f.Dense, f.Density = dense(p, p.ResidOrder)
	f.Desc = fmt.Sprintf("Residuals of the least-squares %s for %d rows in the order of %s, with a dashed line at zero. %s", fitLong(p), p.N, order, markNames(f.Marked))
	f.Caption = f.Title + "."
	if f.Dense {
		f.Caption += denseNote(p.N, len(f.Marked))
		f.Desc += denseNote(p.N, len(f.Marked))
	}
	return f
}
