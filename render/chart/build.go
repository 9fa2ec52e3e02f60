package chart

import (
	"fmt"
	"slices"
	"strings"

	"bivar/analysis/report"
)

// Sizes of the figures in CSS pixels (width, height).
const (
	ScatterW, ScatterH   = 680, 500
	ResidualW, ResidualH = 480, 360
)

// AxisTitle is a variable's label with its unit as people write it
// (report.Variable.Symbol, filled by the analysis), in parentheses; a label
// that already ends in a parenthesis takes the unit after a comma, so
// "Surface hardness (Rockwell C), HRC" does not stack two parentheses.
func AxisTitle(v report.Variable) string {
	name := varName(v)
	switch {
	case v.Symbol == "":
		return name
	case strings.HasSuffix(name, ")"):
		return name + ", " + v.Symbol
	}
	return name + " (" + v.Symbol + ")"
}

// InUnit is a variable's label followed by "in" and its unit, for
// sentences and captions: "Surface hardness (Rockwell C) in HRC".
func InUnit(v report.Variable) string {
	if v.Symbol == "" {
		return varName(v)
	}
	return varName(v) + " in " + v.Symbol
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

// series splits the points by group level (levels in sorted order), or
// returns one series of all points.
func series(p *report.Plot, xs, ys []float64) []Series {
	if len(p.Groups) != len(xs) || len(p.Groups) == 0 {
		return []Series{{Name: fmt.Sprintf("rows (n = %d)", len(xs)), X: xs, Y: ys}}
	}
	var levels []string
	for _, g := range p.Groups {
		if !slices.Contains(levels, g) {
			levels = append(levels, g)
		}
	}
	slices.Sort(levels)
	own := levels
	if len(levels) > GroupLooks {
		// The GroupLooks − 1 largest levels (ties by name) keep their own look.
		count := map[string]int{}
		for _, g := range p.Groups {
			count[g]++
		}
		bySize := slices.Clone(levels)
		slices.SortStableFunc(bySize, func(a, b string) int { return count[b] - count[a] })
		own = slices.Clone(bySize[:GroupLooks-1])
		slices.Sort(own)
	}
	out := make([]Series, len(own), len(own)+1)
	for i, l := range own {
		out[i].Level = l
	}
	var other *Series
	if len(own) < len(levels) {
		out = append(out, Series{Other: true})
		other = &out[len(out)-1]
	}
	for i, g := range p.Groups {
		if k, ok := slices.BinarySearch(own, g); ok {
			out[k].X = append(out[k].X, xs[i])
			out[k].Y = append(out[k].Y, ys[i])
		} else {
			other.X = append(other.X, xs[i])
			other.Y = append(other.Y, ys[i])
		}
	}
	for i := range out {
		out[i].Name = fmt.Sprintf("%s (n = %d)", out[i].Level, len(out[i].X))
	}
	if other != nil {
		other.Name = fmt.Sprintf("%d other levels, alike in grey (n = %d)", len(levels)-len(own), len(other.X))
	}
	return out
}

func marks(p *report.Plot, xs, ys []float64) []Mark {
	var out []Mark
	for _, i := range p.Flagged {
		if i < 0 || i >= len(xs) || i >= len(ys) {
			continue
		}
		name := fmt.Sprint(i + 1)
		if i < len(p.Rows) {
			name = p.Rows[i]
		}
		out = append(out, Mark{X: xs[i], Y: ys[i], Label: name})
	}
	return out
}

func markNames(m []Mark) string {
	if len(m) == 0 {
		return "No rows are flagged."
	}
	names := make([]string, len(m))
	for i, k := range m {
		names[i] = k.Label
	}
	return fmt.Sprintf("%d flagged rows are circled and labelled: %s.", len(m), strings.Join(names, ", "))
}

func denseNote(n, flagged int) string {
	return fmt.Sprintf(" With %d rows, more than %d, the points are drawn as density cells (darker cells hold more rows); the %d flagged rows are drawn individually on top.",
		n, DensityAbove, flagged)
}

// Scatter is the scatterplot of y against x with the least-squares line,
// its confidence band, the prediction band, the LOWESS curve, the curved
// model when the study has one, and the flagged rows labelled. level is the
// confidence in percent as the report states it, e.g. "95". It returns nil
// when the study has no plot data.
func Scatter(s *report.Study, id, level string) *Figure {
	p := s.Plot
	if p == nil || len(p.X) == 0 || len(p.X) != len(p.Y) {
		return nil
	}
	f := &Figure{
		ID: id, Width: ScatterW, Height: ScatterH,
		XLabel: AxisTitle(s.X), YLabel: AxisTitle(s.Y),
		Title:  fmt.Sprintf("%s against %s", varName(s.Y), varName(s.X)),
		Points: series(p, p.X, p.Y),
		Marked: marks(p, p.X, p.Y),
		Dense:  len(p.X) > DensityAbove,
	}
	if len(p.Band) > 0 {
		var bx, fit, cl, ch, pl, ph []float64
		for _, b := range p.Band {
			bx = append(bx, b.X)
			fit = append(fit, b.Fit)
			cl = append(cl, b.ConfLow)
			ch = append(ch, b.ConfHigh)
			pl = append(pl, b.PredLow)
			ph = append(ph, b.PredHigh)
		}
		f.Bands = []Band{
			{Name: level + "% prediction band (one new row)", X: bx, Low: pl, High: ph, Role: RolePred},
			{Name: level + "% confidence band (the line)", X: bx, Low: cl, High: ch, Role: RoleConf},
		}
		f.Lines = append(f.Lines, Line{Name: "least-squares line", X: bx, Y: fit, Role: RoleFit})
	}
	f.Lines = append(f.Lines, groupLines(s, f.Points)...)
	if len(p.Lowess) > 0 {
		f.Lines = append(f.Lines, xyLine("LOWESS curve", p.Lowess, RoleLowess))
	}
	if len(p.Curve) > 0 {
		f.Lines = append(f.Lines, xyLine("quadratic fit", p.Curve, RoleCurve))
	}
	groups := ""
	if len(f.Points) > 1 && !f.Dense {
		groups = fmt.Sprintf(" Points are coloured and shaped by %s (%d levels).", GroupName(s), len(f.Points))
	}
	f.Desc = fmt.Sprintf("Scatterplot of %d rows, %s on the vertical axis against %s on the horizontal axis, with the least-squares line, its %s%% confidence band, the %s%% prediction band and a LOWESS curve.%s %s",
		len(p.X), f.YLabel, f.XLabel, level, level, groups, markNames(f.Marked))
	f.Caption = fmt.Sprintf("%s against %s. Solid line: least squares; darker band: %s%% confidence for the line; lighter band: %s%% prediction for one new row; dashed: LOWESS.",
		varName(s.Y), varName(s.X), level, level)
	if len(p.Curve) > 0 {
		f.Caption += " Dotted: quadratic fit."
	}
	switch {
	case len(f.Points) > 1 && f.Dense:
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
		case len(s.Groups) > 0:
			f.Caption += "; thin lines: the line within each group"
		}
		f.Caption += "."
	}
	if len(f.Marked) > 0 {
		f.Caption += " Circled and labelled: flagged rows."
	}
	if f.Dense {
		f.Caption += denseNote(len(p.X), len(f.Marked))
		f.Desc += denseNote(len(p.X), len(f.Marked))
	}
	return f
}

// groupLines draws each group's own least-squares line (intercept and
// slope from the report's per-group fits) across that group's x range.
func groupLines(s *report.Study, pts []Series) []Line {
	if len(pts) < 2 || len(s.Groups) == 0 {
		return nil
	}
	var out []Line
	for i, ser := range pts {
		var e extent
		e.add(ser.X...)
		for _, g := range s.Groups {
			if g.Group != ser.Level || e.n == 0 || !g.Slope.Valid() || !g.Intercept.Valid() {
				continue
			}
			a, b := float64(g.Intercept), float64(g.Slope)
			name := ""
			if len(out) == 0 {
				name = "line within each group"
			}
			out = append(out, Line{Name: name, X: []float64{e.lo, e.hi}, Y: []float64{a + b*e.lo, a + b*e.hi}, Role: RoleGroup, Group: i})
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
	if s.Y.Symbol != "" {
		return "Residual (" + s.Y.Symbol + ")"
	}
	return "Residual"
}

func zeroLine(xs []float64) Line {
	var e extent
	e.add(xs...)
	if e.n == 0 {
		return Line{Role: RoleZero}
	}
	return Line{X: []float64{e.lo, e.hi}, Y: []float64{0, 0}, Role: RoleZero}
}

// ResidualsFitted plots the straight line's residuals against its fitted
// values. It returns nil when the study has none.
func ResidualsFitted(s *report.Study, id string) *Figure {
	p := s.Plot
	if p == nil || len(p.Fitted) == 0 || len(p.Fitted) != len(p.Residuals) {
		return nil
	}
	f := &Figure{
		ID: id, Width: ResidualW, Height: ResidualH,
		XLabel: "Fitted value: " + AxisTitle(s.Y), YLabel: residualTitle(s),
		Title:  "Residuals against fitted values",
		Points: series(p, p.Fitted, p.Residuals),
		Marked: marks(p, p.Fitted, p.Residuals),
		Lines:  []Line{zeroLine(p.Fitted)},
		Dense:  len(p.Fitted) > DensityAbove,
	}
	f.Desc = fmt.Sprintf("Residuals of the least-squares line for %d rows against the fitted values, with a dashed line at zero. %s", len(p.Fitted), markNames(f.Marked))
	f.Caption = "Residuals against fitted values; dashed: zero. A curve or a funnel here means the straight line or its constant spread does not describe the data."
	if f.Dense {
		f.Caption += denseNote(len(p.Fitted), len(f.Marked))
		f.Desc += denseNote(len(p.Fitted), len(f.Marked))
	}
	return f
}

// ResidualsOrder plots the residuals in run order. It returns nil when the
// study has no order column.
func ResidualsOrder(s *report.Study, id string) *Figure {
	p := s.Plot
	if p == nil || len(p.Order) == 0 || len(p.Order) != len(p.Residuals) {
		return nil
	}
	// Sort the points by run order so the joining line follows the run.
	idx := make([]int, len(p.Order))
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(a, b int) int {
		switch {
		case p.Order[a] < p.Order[b]:
			return -1
		case p.Order[a] > p.Order[b]:
			return 1
		}
		return 0
	})
	ox := make([]float64, len(idx))
	ry := make([]float64, len(idx))
	var groups []string
	if len(p.Groups) == len(idx) {
		groups = make([]string, len(idx))
	}
	for k, i := range idx {
		ox[k], ry[k] = p.Order[i], p.Residuals[i]
		if groups != nil {
			groups[k] = p.Groups[i]
		}
	}
	sorted := &report.Plot{Groups: groups}
	order := OrderName(s)
	xl := order
	if !strings.Contains(strings.ToLower(order), "order") {
		xl += " (run order)"
	}
	f := &Figure{
		ID: id, Width: ResidualW, Height: ResidualH,
		XLabel: xl, YLabel: residualTitle(s),
		Title:  "Residuals in run order",
		Points: series(sorted, ox, ry),
		Marked: marks(p, p.Order, p.Residuals),
		Lines:  []Line{zeroLine(ox)},
		Dense:  len(ox) > DensityAbove,
		Join:   len(ox) <= DensityAbove && groups == nil,
	}
	f.Desc = fmt.Sprintf("Residuals of the least-squares line for %d rows in the order of %s, with a dashed line at zero. %s", len(ox), order, markNames(f.Marked))
	f.Caption = fmt.Sprintf("Residuals in the order of %s; dashed: zero. A trend or long runs on one side mean the relationship drifted during the run.", order)
	if f.Dense {
		f.Caption += denseNote(len(ox), len(f.Marked))
		f.Desc += denseNote(len(ox), len(f.Marked))
	}
	return f
}
