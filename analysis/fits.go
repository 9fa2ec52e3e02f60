package analysis

// This file holds the fits and tests of one study: summaries, the
// straight line and the other models, the diagnostics and the per-group
// lines.

import (
	"fmt"
	"math"
	"slices"
	"sync"

	"bivar/analysis/report"
	"bivar/analysis/stats"
)

func describe(d stats.Summary) report.Describe {
	return report.Describe{N: d.N, Mean: report.Float(d.Mean), SD: report.Float(d.SD), Min: report.Float(d.Min),
		Q1: report.Float(d.Q1), Median: report.Float(d.Median), Q3: report.Float(d.Q3), Max: report.Float(d.Max)}
}

func coef(name string, c stats.Coef) report.Coef {
	return report.Coef{Name: name, Estimate: report.Float(c.Estimate), SE: report.Float(c.SE), T: report.Float(c.T),
		P: report.Float(c.P), CILow: report.Float(c.CILow), CIHigh: report.Float(c.CIHigh)}
}

// regFit turns a least-squares fit into the report's Fit.
func regFit(name, formula string, coefNames []string, r stats.Regression) report.Fit {
	f := report.Fit{Name: name, Formula: formula, ResidualSE: report.Float(r.ResidualSE), RSS: report.Float(r.RSS),
		R2: report.Float(r.R2), AdjR2: report.Float(r.AdjR2), F: report.Float(r.F), FP: report.Float(r.FP),
		DFResid: r.DFResid, AIC: report.Float(r.AIC), Vertex: report.NaN()}
	for i, c := range r.Coef {
		name := fmt.Sprintf("b%d", i)
		if i < len(coefNames) {
			name = coefNames[i]
		}
		f.Coefficients = append(f.Coefficients, coef(name, c))
	}
	return f
}

func lineFit(l stats.LineFit) report.Fit {
	f := regFit("line", "y = b0 + b1·x", []string{"intercept", "x"}, l.Regression)
	ic, sl := coef("intercept", l.Intercept), coef("x", l.Slope)
	f.Intercept, f.Slope = &ic, &sl
	f.Coefficients = []report.Coef{ic, sl}
	return f
}

// logModels fits the linearising transforms the data allow: log-x where
// every x is positive, log-y where every y is positive, log-log where both
// are. Natural logarithms.
func logModels(x, y []float64, conf float64) []report.Fit {
	pos := func(v []float64) bool {
		for _, a := range v {
			if !(a > 0) {
				return false
			}
		}
		return true
	}
	logs := func(v []float64) []float64 {
		out := make([]float64, len(v))
		for i, a := range v {
			out[i] = math.Log(a)
		}
		return out
	}
	xp, yp := pos(x), pos(y)
	var lx, ly []float64
	if xp {
		lx = logs(x)
	}
	if yp {
		ly = logs(y)
	}
	var out []report.Fit
	add := func(name, formula, xname string, u, v []float64) {
		if c, _ := constant(u); c {
			return
		}
		l, err := stats.Line(u, v, conf)
		if err != nil {
			return
		}
		f := regFit(name, formula, []string{"intercept", xname}, l.Regression)
		ic, sl := coef("intercept", l.Intercept), coef(xname, l.Slope)
		f.Coefficients = []report.Coef{ic, sl}
		out = append(out, f)
	}
	if xp {
		add("log-x", "y = b0 + b1·ln(x)", "ln(x)", lx, y)
	}
	if yp {
		add("log-y", "ln(y) = b0 + b1·x", "x", x, ly)
	}
	if xp && yp {
		add("log-log", "ln(y) = b0 + b1·ln(x)", "ln(x)", lx, ly)
	}
	return out
}

// diagnostics runs the tests of form, spread and order on the pairs ps,
// line being the straight line fitted to ps.X, ps.Y (its residuals in
// canonical order); the quadratic's p, the distance correlation and the
// resistant line come from sideStatistics. order holds the run order of
// each complete case in data order, or nil: then the data order is the run
// order.
func diagnostics(ps *stats.Sorted, line stats.LineFit, order []float64) *report.Diagnostics {
	d := &report.Diagnostics{QuadraticP: report.NaN(), DurbinWatson: report.NaN()}
	// The lack-of-fit test needs settings that were repeated on purpose.
	// Where x is continuous, a few values repeat only by rounding, and a
	// test with a handful of pure-error degrees of freedom against a
	// hundred levels says little. So it is reported only when the levels
	// of x are at most half the rows (each level holds two rows on
	// average); levels = df1 + 2.
	if f, df1, df2, p, ok := ps.LackOfFit(line.Slope.Estimate); ok && 2*(df1+2) <= ps.Len() {
		d.LackOfFit = &report.LackOfFit{F: report.Float(f), DF1: df1, DF2: df2, P: report.Float(p)}
	}
	bp, df, pbp := stats.BreuschPagan(line.Residuals, ps.X)
	d.BreuschPagan = &report.ChiTest{Stat: report.Float(bp), DF: df, P: report.Float(pbp)}

	// Residuals in run order: by the order column (ties in canonical
	// order, so by x), else in data order.
	e := line.Residuals
	if order != nil {
		ro, oo := make([]float64, len(e)), make([]float64, len(e))
		for j, k := range ps.OrderOf(order) {
			ro[j], oo[j] = e[k], order[ps.Row[k]]
		}
		d.DurbinWatson = report.Float(stats.DurbinWatson(ro))
		slope, p, r := stats.OrderTrend(oo, ro)
		d.OrderTrend = &report.OrderTrend{Slope: report.Float(slope), P: report.Float(p), R: report.Float(r)}
	} else {
		d.DurbinWatson = report.Float(stats.DurbinWatson(ps.ToRows(e)))
	}
	return d
}

// sideStats are statistics that need only the sorted pairs: Analyze runs
// them beside its other work (sideStatistics).
type sideStats struct {
	spearman  report.Spearman
	kendall   report.Kendall
	dcor      *report.DistanceCorr
	resistant *report.Resistant
	quad      *stats.Regression // the quadratic fit, nil when it could not be fitted or n < 4
	models    []report.Fit      // the quadratic (when fitted) and logModels, in that order
}

// sideStatistics starts, on wg, goroutines that fill out with Kendall's
// τ-b and the distance-correlation test (one), Spearman's ρ and the
// Theil–Sen line (another) and the quadratic and log models (a third) of
// ps. Each statistic is computed sequentially on its own, with its own
// random source, so the numbers are the same whichever goroutine runs them
// and when. The caller reads out after wg.Wait.
func sideStatistics(wg *sync.WaitGroup, out *sideStats, id string, ps *stats.Sorted, conf float64, cfg Config) {
	wg.Go(func() {
		tau, ptau := ps.KendallTauB()
		out.kendall = report.Kendall{TauB: report.Float(tau), P: report.Float(ptau)}
		dc, p, used, method := ps.DistanceCorrTest(cfg.DcorPerms, cfg.DcorMaxN, source(cfg.Seed, id, "dcor"))
		out.dcor = &report.DistanceCorr{DCor: report.Float(dc), P: report.Float(p), Permutations: cfg.DcorPerms,
			Sampled: used, Method: method}
	})
	wg.Go(func() {
		rho, prho := ps.Spearman()
		out.spearman = report.Spearman{Rho: report.Float(rho), P: report.Float(prho)}
		slope, icpt, method := stats.TheilSen(ps.X, ps.Y, cfg.TheilSenMaxExact, source(cfg.Seed, id, "theil-sen"))
		out.resistant = &report.Resistant{Method: method, Slope: report.Float(slope), Intercept: report.Float(icpt)}
	})
	wg.Go(func() {
		if ps.Len() >= 4 {
			if q, err := stats.Polynomial(ps.X, ps.Y, 2, conf); err == nil && len(q.Coef) == 3 {
				out.quad = &q
				f := regFit("quadratic", "y = b0 + b1·x + b2·x²", []string{"intercept", "x", "x^2"}, q)
				if b2 := q.Coef[2].Estimate; b2 != 0 {
					f.Vertex = report.Float(-q.Coef[1].Estimate / (2 * b2))
				}
				out.models = append(out.models, f)
			}
		}
		out.models = append(out.models, logModels(ps.X, ps.Y, conf)...)
	})
}

// lowessDelta is the smoother's interpolation distance: 0 (a local fit at
// every distinct x) up to stats.LowessAutoDeltaN points, 1% of the x range
// beyond. Interpolation between anchor points within delta of each other
// is the "delta" of Cleveland's program (Cleveland, W. S. (1981), "LOWESS:
// a program for smoothing scatterplots by robust locally weighted
// regression", The American Statistician 35(1):54), which leaves its size
// to the user; 0.01 of the range is common practice (statsmodels'
// documentation suggests it for large n) and the rule of stats.Lowess for a
// negative delta, written out here so the report can state it.
func lowessDelta(x []float64) float64 {
	if len(x) <= stats.LowessAutoDeltaN {
		return 0
	}
	lo, hi := x[0], x[0]
	for _, v := range x {
		lo, hi = min(lo, v), max(hi, v)
	}
	return 0.01 * (hi - lo)
}

// groupFits fits the straight line within each level of the group, levels
// in sorted order. A level with fewer than 3 rows or a constant x gets NaN.
func groupFits(x, y []float64, groups []string, conf float64) []report.GroupFit {
	byLevel := map[string][]int{}
	for i, g := range groups {
		byLevel[g] = append(byLevel[g], i)
	}
	levels := make([]string, 0, len(byLevel))
	for g := range byLevel {
		levels = append(levels, g)
	}
	slices.Sort(levels)
	out := make([]report.GroupFit, 0, len(levels))
	for _, g := range levels {
		idx := byLevel[g]
		gf := report.GroupFit{Group: g, N: len(idx), R: report.NaN(), Slope: report.NaN(), Intercept: report.NaN(),
			SlopeLow: report.NaN(), SlopeHigh: report.NaN()}
		gx, gy := pick(x, idx), pick(y, idx)
		if len(idx) >= 3 {
			if cx, _ := constant(gx); !cx {
				if l, err := stats.Line(gx, gy, conf); err == nil {
					gf.Slope, gf.Intercept = report.Float(l.Slope.Estimate), report.Float(l.Intercept.Estimate)
					gf.SlopeLow, gf.SlopeHigh = report.Float(l.Slope.CILow), report.Float(l.Slope.CIHigh)
				}
				gf.R = report.Float(stats.Pearson(gx, gy, conf).R)
			}
		}
		out = append(out, gf)
	}
	return out
}

func pick(v []float64, idx []int) []float64 {
	out := make([]float64, len(idx))
	for j, i := range idx {
		out[j] = v[i]
	}
	return out
}
