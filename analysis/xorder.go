package analysis

// This file holds the figures about the line's residuals taken in order of
// x, and the LOWESS curve's extremes: numbers the findings judge, computed
// here so results.json carries every number a verdict rests on.

import (
	"math"

	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// maxXOrderRows is the most rows the x-order figures use; above it they
// take every k-th pair in x order, k = ⌈n/maxXOrderRows⌉. That keeps the
// Spearman coefficient's cost bounded while a pattern along x stays as
// visible as in the LOWESS curve, fitted to a sample of the same size
// (Config.LowessMaxN's default).
const maxXOrderRows = 20000

// xOrderStep returns k for n rows.
func xOrderStep(n int) int {
	return max(1, (n+maxXOrderRows-1)/maxXOrderRows)
}

// xOrderFigures sets d.DurbinWatsonX, d.DurbinWatsonXRows and d.SpreadRho
// from the line's residuals e, given in the canonical order of ps (x
// ascending, tied x in an order set by their y values, see stats.Sorted):
// on every k-th pair in that order (xOrderStep), the Durbin–Watson
// statistic (stats.DurbinWatson) of the residuals, and Spearman's ρ
// (stats.Spearman) of |residual| on x. Residuals of a correct straight line
// are close to independent in any fixed order; in order of x they swing
// together when the line misses a pattern that goes up and down.
// DurbinWatsonX is NaN below 8 rows (too few for the statistic to say
// anything), SpreadRho below 3.
func xOrderFigures(d *report.Diagnostics, ps *stats.Sorted, e []float64) {
	d.DurbinWatsonX, d.SpreadRho = report.NaN(), report.NaN()
	if ps.Len() != len(e) {
		return
	}
	step := xOrderStep(len(e))
	n := (len(e) + step - 1) / step
	xs, r, abs := make([]float64, n), make([]float64, n), make([]float64, n)
	for j := range n {
		k := j * step
		xs[j], r[j], abs[j] = ps.X[k], e[k], math.Abs(e[k])
	}
	d.DurbinWatsonXRows = n
	if n >= 3 {
		rho, _ := stats.Spearman(xs, abs)
		d.SpreadRho = report.Float(rho)
	}
	if n < 8 {
		return
	}
	d.DurbinWatsonX = report.Float(stats.DurbinWatson(r))
}

// lowessExtremes records in li the LOWESS curve's first, last, highest and
// lowest points (curve sorted by x; the first of equal extremes), or NaN
// for all of them when the curve has fewer than 3 points.
func lowessExtremes(li *report.LowessInfo, c []report.XY) {
	nan := report.NaN()
	li.FirstX, li.FirstY, li.LastX, li.LastY = nan, nan, nan, nan
	li.MaxX, li.MaxY, li.MinX, li.MinY = nan, nan, nan, nan
	if len(c) < 3 {
		return
	}
	hi, lo := 0, 0
	for i, p := range c {
		if p.Y > c[hi].Y {
			hi = i
		}
		if p.Y < c[lo].Y {
			lo = i
		}
	}
	last := c[len(c)-1]
	li.FirstX, li.FirstY = report.Float(c[0].X), report.Float(c[0].Y)
	li.LastX, li.LastY = report.Float(last.X), report.Float(last.Y)
	li.MaxX, li.MaxY = report.Float(c[hi].X), report.Float(c[hi].Y)
	li.MinX, li.MinY = report.Float(c[lo].X), report.Float(c[lo].Y)
}
