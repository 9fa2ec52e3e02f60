package analysis

// This file holds the plot data: what the charts draw, computed here so
// renderers only draw.

import (
	"slices"

	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// plotData gathers what the charts draw.
func plotData(x, y []float64, cc cases, line stats.LineFit, inf *report.Influence, lx, ly []float64, conf float64, cfg Config) *report.Plot {
	p := &report.Plot{X: x, Y: y, Rows: cc.rows, Groups: cc.groups, Order: cc.order,
		Fitted: line.Fitted, Residuals: line.Residuals}
	lo, hi := slices.Min(x), slices.Max(x)
	k := cfg.BandPoints
	p.Band = make([]report.BandPoint, k)
	for i := range k {
		x0 := lo + (hi-lo)*float64(i)/float64(k-1)
		if i == k-1 {
			x0 = hi
		}
		f, cl, ch, pl, ph := line.Interval(x0, conf)
		p.Band[i] = report.BandPoint{X: x0, Fit: f, ConfLow: cl, ConfHigh: ch, PredLow: pl, PredHigh: ph}
	}
	p.Lowess = lowessCurve(lx, ly, cfg)
	for _, pt := range inf.Points {
		p.Flagged = append(p.Flagged, pt.Index)
	}
	slices.Sort(p.Flagged)
	return p
}

// lowessCurve is the LOWESS fit as a curve sorted by x (stats.LowessCurve:
// the points at which local fits were made, at most stats.LowessCurveMax),
// on the rows given (all rows, or the sample that sample drew).
func lowessCurve(x, y []float64, cfg Config) []report.XY {
	xs, ys := stats.LowessCurve(x, y, cfg.LowessFrac, cfg.LowessIter, lowessDelta(x))
	curve := make([]report.XY, len(xs))
	for i := range xs {
		curve[i] = report.XY{X: xs[i], Y: ys[i]}
	}
	return curve
}

// quadraticCurve is the quadratic model on a grid over the observed x.
func quadraticCurve(s *report.Study, k int) []report.XY {
	var q *report.Fit
	for i := range s.Models {
		if s.Models[i].Name == "quadratic" {
			q = &s.Models[i]
		}
	}
	if q == nil || len(q.Coefficients) != 3 || s.Describe == nil {
		return nil
	}
	b0, b1, b2 := float64(q.Coefficients[0].Estimate), float64(q.Coefficients[1].Estimate), float64(q.Coefficients[2].Estimate)
	lo, hi := float64(s.Describe.X.Min), float64(s.Describe.X.Max)
	out := make([]report.XY, k)
	for i := range k {
		x0 := lo + (hi-lo)*float64(i)/float64(k-1)
		if i == k-1 {
			x0 = hi
		}
		out[i] = report.XY{X: x0, Y: b0 + x0*(b1+b2*x0)}
	}
	return out
}
