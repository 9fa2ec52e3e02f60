package analysis

// This file holds the slope's intervals that do not assume independent
// rows with an even scatter, and r with an effective sample size.

import (
	"fmt"
	"math"

	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/internal/hugepage"
)

// slopeInterval is the slope b with standard error se: a normal interval at
// conf and the two-sided normal p.
func slopeInterval(method string, lags int, b, se, conf float64) *report.SlopeInterval {
	z := stats.NormalQuantile((1 + conf) / 2)
	return &report.SlopeInterval{Method: method, Lags: lags, SE: report.Float(se),
		CILow: report.Float(b - z*se), CIHigh: report.Float(b + z*se), P: report.Float(stats.TwoSidedNormal(b / se))}
}

// robust fills report.Robust: the HC3 interval of the slope always; with
// a run order (order non-nil), the Newey–West interval with
// stats.NeweyWestLags(n) lags on the rows in run order, and r with
// Bartlett's effective sample size (stats.EffectiveN) from the lag-1
// autocorrelations in run order of x and of the line's residuals. The
// residuals stand for y: under the hypothesis r = 0 they are y about its
// mean, and where x explains a trend in y (x is time, say) y's own
// persistence would count that trend as dependence between rows and
// leave almost no effective rows. Rows whose run order ties are taken in
// the canonical order of ps (x, then a hash of y), so the figures are a
// function of the set of rows; ps holds the pairs x, y in that order.
func robust(x, y []float64, ps *stats.Sorted, order []float64, r, conf float64) *report.Robust {
	nan := report.NaN()
	out := &report.Robust{Rho1X: nan, Rho1E: nan, NEff: nan, RP: nan, RLow: nan, RHigh: nan}
	b, se := stats.SlopeHC3(x, y)
	out.HC3 = slopeInterval("HC3 (MacKinnon & White 1985)", 0, b, se, conf)
	if order == nil {
		return out
	}
	// The pairs in run order: the caller's columns themselves when the
	// run order increases down them (the common case: a file written as
	// the process ran), else gathered once through an index into the
	// canonical order. The line is summed in canonical order either way.
	n := len(x)
	rx, ry := x, y
	if !increasing(order) {
		pos := ps.OrderOf(order)
		rx, ry = hugepage.Make[float64](n), hugepage.Make[float64](n)
		for t, k := range pos {
			rx[t], ry[t] = ps.X[k], ps.Y[k]
		}
	}
	lags := stats.NeweyWestLags(n)
	b, se = stats.SlopeHACRun(ps.X, ps.Y, rx, ry, lags)
	out.HAC = slopeInterval(fmt.Sprintf("Newey–West HAC, Bartlett kernel, %d lags = floor(4(n/100)^(2/9))", lags), lags, b, se, conf)
	rho1x := stats.Lag1Autocorr(rx)
	e := hugepage.Make[float64](n)
	for t := range e {
		e[t] = ry[t] - b*rx[t]
	}
	rho1e := stats.Lag1Autocorr(e)
	out.Rho1X, out.Rho1E = report.Float(rho1x), report.Float(rho1e)
	ne := stats.EffectiveN(n, rho1x, rho1e)
	out.NEff = report.Float(ne)
	if !math.IsNaN(ne) {
		p, lo, hi := stats.CorrelationEff(r, ne, conf)
		out.RP, out.RLow, out.RHigh = report.Float(p), report.Float(lo), report.Float(hi)
	}
	return out
}

// increasing reports whether v strictly increases from first to last.
func increasing(v []float64) bool {
	for i := 1; i < len(v); i++ {
		if !(v[i-1] < v[i]) {
			return false
		}
	}
	return true
}
