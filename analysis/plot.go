package analysis

// This file holds the plot data: what the charts draw, computed here so
// renderers only draw.

import (
	"cmp"
	"math"
	"slices"
	"strings"
	"sync"

	"bivar/analysis/dataset"
	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/internal/hugepage"
)

// Grid sizes of the density grids: about 7 px cells on the charts.
const (
	gridNX, gridNY = 90, 64
)

// plotData gathers what the charts draw, bounded whatever n is: every row
// up to report.PlotPointsMax, else density grids; the named rows marked.
// lv and gidx are the group levels and each row's index into them
// (levels); nil without a group. lowess is the smoother's curve
// (lowessCurve), computed beside the study's other statistics.
//
// quad is the quadratic fit (nil without one): its fitted values and
// residuals go beside the line's, for assess to put in place when the form
// is curved and the curve is the main fit.
func plotData(x, y []float64, cc cases, lv []string, gidx []int32, line stats.LineFit, quad *stats.Regression, inf *report.Influence, lowess []report.XY, conf float64, cfg Config) *report.Plot {
	n := len(x)
	p := &report.Plot{N: n, ResidualsOf: "line"}
	resid := line.Residuals // data order (analyze)
	fittedAt := func(i int) float64 { return line.FittedAt(x[i]) }
	cFitted := func(i int) float64 { return math.NaN() }
	if quad != nil {
		cFitted = func(i int) float64 { return quad.FittedAt(x[i]) }
	}
	if gidx != nil {
		p.Levels = lv
		p.LevelCounts = make([]int, len(p.Levels))
		p.LevelXMin, p.LevelXMax = make([]float64, len(p.Levels)), make([]float64, len(p.Levels))
		for i, g := range gidx {
			if p.LevelCounts[g] == 0 || x[i] < p.LevelXMin[g] {
				p.LevelXMin[g] = x[i]
			}
			if p.LevelCounts[g] == 0 || x[i] > p.LevelXMax[g] {
				p.LevelXMax[g] = x[i]
			}
			p.LevelCounts[g]++
		}
	}
	if n <= report.PlotPointsMax {
		p.Points = make([]report.PlotPoint, n)
		for i := range n {
			cf := cFitted(i)
			pt := report.PlotPoint{X: x[i], Y: y[i], Fitted: fittedAt(i), Residual: resid[i], CFitted: cf, CResidual: y[i] - cf, Order: math.NaN()}
			if cc.order != nil {
				pt.Order = cc.order[i]
			}
			if gidx != nil {
				pt.Group = int(gidx[i])
			}
			p.Points[i] = pt
		}
		slices.SortFunc(p.Points, func(a, b report.PlotPoint) int {
			return cmp.Or(cmp.Compare(a.Order, b.Order), cmp.Compare(a.X, b.X), cmp.Compare(a.Y, b.Y), cmp.Compare(a.Group, b.Group))
		})
	} else {
		// Each grid is a pass over every row: they run as tasks.
		var wg sync.WaitGroup
		async := task(&wg)
		async(func() { p.Scatter = grid(x, y, gridNX, gridNY) })
		async(func() { p.ResidX = grid(x, resid, gridNX, gridNY) })
		if cc.order != nil {
			async(func() { p.ResidOrder = grid(cc.order, resid, gridNX, gridNY) })
		}
		if quad != nil {
			cResid := func(i int) float64 { return y[i] - cFitted(i) }
			async(func() { p.CurveResidX = gridAt(n, func(i int) float64 { return x[i] }, cResid, gridNX, gridNY) })
			if cc.order != nil {
				async(func() {
					p.CurveResidOrder = gridAt(n, func(i int) float64 { return cc.order[i] }, cResid, gridNX, gridNY)
				})
			}
		}
		wg.Wait()
	}
	p.Band = lineBand(slices.Min(x), slices.Max(x), cfg.BandPoints, func(x0 float64) (f, cl, ch, pl, ph float64) {
		return line.Interval(x0, conf)
	})
	p.Lowess = lowess
	for k, pt := range inf.Points {
		i := pt.Index
		cf := cFitted(i)
		m := report.Marked{Row: pt.Row, X: x[i], Y: y[i], Fitted: fittedAt(i), Residual: resid[i], CFitted: cf, CResidual: y[i] - cf, Order: math.NaN(), Label: k < report.LabelMax}
		if cc.order != nil {
			m.Order = cc.order[i]
		}
		p.Marked = append(p.Marked, m)
	}
	return p
}

// levels returns the sorted distinct values of g and each row's index
// into them: computed once per study and shared by the per-group lines,
// the comparison of the group lines and the plot. Indices follow the
// sorted levels, so they do not depend on the file's order of rows.
func levels(g dataset.Strings) ([]string, []int32) {
	seen := map[string]int{}
	var lv []string
	for i := range g.Len() {
		if v := g.At(i); !hasKey(seen, v) {
			v = strings.Clone(v) // the report keeps it, not the column
			seen[v] = 0
			lv = append(lv, v)
		}
	}
	slices.Sort(lv)
	for i, v := range lv {
		seen[v] = i
	}
	idx := hugepage.Make[int32](g.Len())
	for i := range g.Len() {
		idx[i] = int32(seen[g.At(i)])
	}
	return lv, idx
}

// grid counts the rows (u, v) in nx × ny equal cells over their range
// (report.Grid); a degenerate range gets a cell of width 1 around it. It
// is gridAt on stored columns, read directly rather than through a call
// per value.
func grid(u, v []float64, nx, ny int) *report.Grid {
	v = v[:len(u)]
	g := &report.Grid{NX: nx, NY: ny, Counts: make([]int, nx*ny)}
	g.XLo, g.XHi = widen(minMax(u))
	g.YLo, g.YHi = widen(minMax(v))
	sx := float64(nx) / (g.XHi - g.XLo)
	sy := float64(ny) / (g.YHi - g.YLo)
	for i, a := range u {
		b := v[i]
		if math.IsNaN(a) || math.IsNaN(b) {
			continue
		}
		g.Counts[cell(b, g.YLo, sy, ny)*nx+cell(a, g.XLo, sx, nx)]++
	}
	return g
}

// gridAt is grid of the n points (u(i), v(i)), for values made row by row
// (such as the fitted values) that are never stored.
func gridAt(n int, u, v func(i int) float64, nx, ny int) *report.Grid {
	g := &report.Grid{NX: nx, NY: ny, Counts: make([]int, nx*ny)}
	g.XLo, g.XHi = spanAt(n, u)
	g.YLo, g.YHi = spanAt(n, v)
	sx := float64(nx) / (g.XHi - g.XLo)
	sy := float64(ny) / (g.YHi - g.YLo)
	for i := range n {
		a, b := u(i), v(i)
		if math.IsNaN(a) || math.IsNaN(b) {
			continue
		}
		g.Counts[cell(b, g.YLo, sy, ny)*nx+cell(a, g.XLo, sx, nx)]++
	}
	return g
}

// cell is the cell of a among n cells from lo, s cells a unit.
func cell(a, lo, s float64, n int) int {
	return min(max(int((a-lo)*s), 0), n-1)
}

// spanAt is the range of the finite values at(0), …, at(n−1), widened to
// width 1 when they are all equal.
func spanAt(n int, at func(i int) float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for i := range n {
		a := at(i)
		if a < lo {
			lo = a
		}
		if a > hi {
			hi = a
		}
	}
	return widen(lo, hi)
}

// minMax is the smallest and the largest value of v (NaN skipped; +Inf
// and −Inf when there is none).
func minMax(v []float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, a := range v {
		if a < lo {
			lo = a
		}
		if a > hi {
			hi = a
		}
	}
	return lo, hi
}

// widen widens the range [lo, hi] to width 1 around lo when it is empty
// or a single value.
func widen(lo, hi float64) (float64, float64) {
	if !(hi > lo) {
		lo, hi = lo-0.5, lo+0.5
	}
	return lo, hi
}

// lowessCurve is the LOWESS fit as a curve sorted by x (stats.LowessCurve:
// the points at which local fits were made, at most stats.LowessCurveMax),
// on the rows given (all rows, or the sample that canonical chose).
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
		x0 := stats.GridX(lo, hi, i, k)
		out[i] = report.XY{X: x0, Y: b0 + x0*(b1+b2*x0)}
	}
	return out
}

// lineBand is the line's confidence and prediction band at k evenly
// spaced x from lo to hi (stats.GridX), at(x0) giving the fit and the interval
// ends there (stats.LineFit.Interval's order).
func lineBand(lo, hi float64, k int, at func(x0 float64) (f, cl, ch, pl, ph float64)) []report.BandPoint {
	band := make([]report.BandPoint, k)
	for i := range k {
		x0 := stats.GridX(lo, hi, i, k)
		f, cl, ch, pl, ph := at(x0)
		band[i] = report.BandPoint{X: x0, Fit: f, ConfLow: cl, ConfHigh: ch, PredLow: pl, PredHigh: ph}
	}
	return band
}

func hasKey(m map[string]int, k string) bool {
	_, ok := m[k]
	return ok
}
