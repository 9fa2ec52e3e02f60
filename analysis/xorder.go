package analysis

// This file holds the figures about the line's residuals taken in order of
// x, and the LOWESS curve's extremes: numbers the findings judge, computed
// here so results.json carries every number a verdict rests on.

import (
	"math"

	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/internal/hugepage"
)

// maxXOrderRows is the most rows the x-order figures use; above it they
// use a sample of this many chosen by the rows' values (the study's
// sample, rowSample.sub; diagnostics draws it), so
// their cost stays bounded (a sort of at most this many rows) while they
// remain a function of the set of rows. A pattern along x stays as visible
// as in the LOWESS curve, fitted to a sample of the same size
// (Config.LowessMaxN's default).
const maxXOrderRows = 20000

// xOrderFigures sets d.DurbinWatsonX, d.DurbinWatsonXRows and d.SpreadRho
// from the line's residuals e at x, on the rows given (all rows, or the
// sample diagnostics draws above maxXOrderRows): the Durbin–Watson statistic of the
// residuals sorted by x, averaged over every order of rows whose x ties
// (stats.DurbinWatsonTied: a file that lists tied rows in another order
// gives the same figure), and Spearman's ρ (stats.Spearman) of |residual|
// on x. Residuals of a correct straight line are close to independent in
// any fixed order; in order of x they swing together when the line misses
// a pattern that goes up and down. DurbinWatsonX is NaN below 8 rows (too
// few for the statistic to say anything), SpreadRho below 3.
func xOrderFigures(d *report.Diagnostics, x, e []float64) {
	d.DurbinWatsonX, d.SpreadRho = report.NaN(), report.NaN()
	if len(x) != len(e) {
		return
	}
	n := len(x)
	d.DurbinWatsonXRows = n
	if n >= 3 {
		abs := hugepage.Make[float64](n)
		for k, v := range e {
			abs[k] = math.Abs(v)
		}
		rho, _ := stats.Spearman(x, abs)
		d.SpreadRho = report.Float(rho)
	}
	if n < 8 {
		return
	}
	d.DurbinWatsonX = report.Float(stats.DurbinWatsonTied(x, e))
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
