package chart

// This file builds the two charts of an agreement study: the difference
// of the methods against their mean, with the bias and the limits of
// agreement, and the two methods against each other, with the identity
// line and the Deming line. Both draw the analysis's bounded plot data
// (report.AgreementPlot): every item up to report.PlotPointsMax, density
// cells above.

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"bivar/analysis/report"
)

// agreementSpan is the range of the first coordinate of pts, or of the
// grid's x when there are no points.
func agreementSpan(pts []report.XY, g *report.Grid) (lo, hi float64) {
	if pts == nil {
		if g == nil {
			return math.NaN(), math.NaN()
		}
		return g.XLo, g.XHi
	}
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, q := range pts {
		lo, hi = math.Min(lo, q.X), math.Max(hi, q.X)
	}
	return lo, hi
}

// xySeries is one series of all the points.
func xySeries(pts []report.XY) []Series {
	if pts == nil {
		return nil
	}
	s := Series{Name: fmt.Sprintf("items (n = %d)", len(pts)), X: make([]float64, len(pts)), Y: make([]float64, len(pts))}
	for i, q := range pts {
		s.X[i], s.Y[i] = q.X, q.Y
	}
	return []Series{s}
}

// flat is a horizontal line at y across [lo, hi].
func flat(name string, y, lo, hi float64, r Role) Line {
	return Line{Name: name, X: []float64{lo, hi}, Y: []float64{y, y}, Role: r}
}

// g4 writes v with four significant digits and the ASCII minus of every
// output.
func g4(v float64) string {
	return strconv.FormatFloat(v, 'g', 4, 64)
}

// denseItems says the items are drawn as density cells.
func denseItems(n int) string {
	return fmt.Sprintf(" With %d items, more than %d, the points are drawn as density cells (darker cells hold more items).", n, DensityAbove)
}

// withSymbol appends a unit symbol in parentheses, when there is one.
func withSymbol(s, sym string) string {
	if sym == "" {
		return s
	}
	return s + " (" + sym + ")"
}

// DifferenceMean is the difference of the two methods (y − x) against
// their mean, with the bias, the limits of agreement and their confidence
// intervals, and the acceptable difference when one is declared. level is
// the confidence in percent as the report states it. It returns nil for a
// study without agreement figures.
func DifferenceMean(s *report.Study, id, level string) *Figure {
	a := s.Agreement
	if a == nil || a.Plot == nil || a.Plot.N == 0 || (a.Plot.Points == nil && a.Plot.Grid == nil) {
		return nil
	}
	p := a.Plot
	sym := s.X.Symbol
	f := &Figure{
		ID: id, Width: ResidualW, Height: ResidualH,
		XLabel: withSymbol(fmt.Sprintf("Mean of %s and %s", varName(s.X), varName(s.Y)), sym),
		YLabel: withSymbol(fmt.Sprintf("%s - %s", varName(s.Y), varName(s.X)), sym),
		Title:  "Difference against mean",
		Points: xySeries(p.Points),
	}
	if p.Points == nil {
		f.Dense, f.Density = true, p.Grid
	}
	lo, hi := agreementSpan(p.Points, p.Grid)
	if finite(float64(a.LowerLow), float64(a.LowerHigh), float64(a.UpperLow), float64(a.UpperHigh)) {
		f.Bands = []Band{
			{Name: level + "% interval of each limit", X: []float64{lo, hi}, Low: []float64{float64(a.LowerLow), float64(a.LowerLow)}, High: []float64{float64(a.LowerHigh), float64(a.LowerHigh)}, Role: RoleConf},
			{X: []float64{lo, hi}, Low: []float64{float64(a.UpperLow), float64(a.UpperLow)}, High: []float64{float64(a.UpperHigh), float64(a.UpperHigh)}, Role: RoleConf},
		}
	}
	f.Lines = []Line{
		zeroLine(lo, hi),
		flat("bias (mean difference)", float64(a.Bias), lo, hi, RoleFit),
		flat("limits of agreement", float64(a.Lower), lo, hi, RoleLowess),
		flat("", float64(a.Upper), lo, hi, RoleLowess),
	}
	if a.Acceptable.Valid() {
		acc := float64(a.Acceptable)
		f.Lines = append(f.Lines, flat(strings.TrimSpace("acceptable ±"+g4(acc)+" "+sym), -acc, lo, hi, RoleCurve), flat("", acc, lo, hi, RoleCurve))
	}
	f.Desc = fmt.Sprintf("Difference %s minus %s against the mean of the two for %d items, with the bias, the limits of agreement and their %s%% intervals.",
		varName(s.Y), varName(s.X), p.N, level)
	f.Caption = fmt.Sprintf("Difference %s - %s against their mean. Solid: bias; dashed: limits of agreement, each in its %s%% interval (shaded).",
		varName(s.Y), varName(s.X), level)
	if a.Acceptable.Valid() {
		f.Caption += " Dotted: the acceptable difference."
	}
	if f.Dense {
		f.Caption += denseItems(p.N)
		f.Desc += denseItems(p.N)
	}
	return f
}

// MethodPair is the y method against the x method for each item (means of
// replicate readings), with the identity line y = x and the Deming line.
// It returns nil for a study without agreement figures.
func MethodPair(s *report.Study, id string) *Figure {
	a := s.Agreement
	if a == nil || a.Plot == nil || a.Plot.N == 0 || (a.Plot.Pairs == nil && a.Plot.PairGrid == nil) {
		return nil
	}
	p := a.Plot
	f := &Figure{
		ID: id, Width: ResidualW, Height: ResidualH,
		XLabel: AxisTitle(s.X), YLabel: AxisTitle(s.Y),
		Title:  fmt.Sprintf("%s against %s", varName(s.Y), varName(s.X)),
		Points: xySeries(p.Pairs),
	}
	if p.Pairs == nil {
		f.Dense, f.Density = true, p.PairGrid
	}
	lo, hi := p.Lo, p.Hi
	f.Lines = []Line{{Name: "identity (y = x)", X: []float64{lo, hi}, Y: []float64{lo, hi}, Role: RoleZero}}
	if d := a.Deming; d != nil && d.Slope.Valid() && d.Intercept.Valid() {
		b, c := float64(d.Slope), float64(d.Intercept)
		f.Lines = append(f.Lines, Line{Name: "Deming line", X: []float64{lo, hi}, Y: []float64{c + b*lo, c + b*hi}, Role: RoleFit})
	}
	f.Desc = fmt.Sprintf("%s against %s for %d items, with the identity line and the Deming line.", varName(s.Y), varName(s.X), p.N)
	f.Caption = "Thin dashed: identity (exact agreement); solid: the Deming line."
	if a.XReadings > 1 || a.YReadings > 1 {
		f.Caption += " Each point is an item's mean reading per method."
		f.Desc += " Each point is an item's mean reading per method."
	}
	if f.Dense {
		f.Caption += denseItems(p.N)
		f.Desc += denseItems(p.N)
	}
	return f
}
