package analysis

// This file holds the fits and tests of one study: summaries, the
// straight line and the other models, the diagnostics and the per-group
// lines.

import (
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"sync"

	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/internal/hugepage"
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
		DFResid: r.DFResid, AIC: report.Float(r.AIC), Vertex: report.NaN(), AICVsLine: report.NaN(), ShareVsLine: report.NaN()}
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

// compareFits sets, for the line and every model, the y scale it was fitted
// on, its AIC and residual sum of squares against the line's where the
// scales agree, and for a quadratic whether its turning point lies near
// the observed x range x (report.VertexMargin). AIC differences between
// fits of the same response on the same rows are the usual comparison
// (Burnham & Anderson, Model Selection and Multimodel Inference, 2nd ed.,
// 2002, section 2.6, cited from memory); fits of ln(y) are not comparable
// with fits of y that way, so they get NaN.
//
// The quadratic holds the line and one term more, so its share is formed
// from that term's t on df residual degrees of freedom, share = t²/(t² +
// df), and its AIC difference as n·ln(1 − share) + 2: the F test of one
// added term is t² = (RSS_line − RSS_quad)/(RSS_quad/df) (the extra sum
// of squares; e.g. Draper & Smith, Applied Regression Analysis, 3rd ed.
// 1998, §6.1, from memory), so 1 − RSS_quad/RSS_line = t²/(t² + df). As
// 1 − RSS_quad/RSS_line the share keeps only the digits the two sums do
// not share: with x near 10⁶ it came out 6.05·10⁻¹⁴ and 8.8·10⁻¹⁵ in two
// computations of the same rows, where t gives 6.4382·10⁻¹⁴ in both
// (TestQuadraticShareExact checks it against exact rational arithmetic).
//
// Where the line is exact to rounding (its RSS at or below (16ε)²·Σy², the
// floor stats.NewLineInfluence takes for an exact fit; sumY2 is Σy²), no
// term can be told from that rounding: every model's share and AIC
// against the line are then NaN, and no study is called curved from
// them (from an independent review: rows on y = 0.25 + 0.35·x, computed
// in double precision, gave the x² term a t with p < 0.05 and a share of
// 0.298).
func compareFits(line *report.Fit, models []report.Fit, x report.Describe, sumY2 float64) {
	exact := stats.ExactFit(float64(line.RSS), sumY2)
	scale := func(name string) string {
		if name == "log-y" || name == "log-log" {
			return "ln(y)"
		}
		return "y"
	}
	line.YScale, line.AICVsLine, line.ShareVsLine, line.ExactToRounding = "y", 0, 0, exact
	for i := range models {
		m := &models[i]
		m.YScale = scale(m.Name)
		m.AICVsLine, m.ShareVsLine = report.NaN(), report.NaN()
		if m.YScale == "y" && !exact {
			if share, ok := addedTermShare(m, line); ok {
				n := float64(m.DFResid + len(m.Coefficients))
				m.ShareVsLine = report.Float(share)
				m.AICVsLine = report.Float(n*math.Log1p(-share) + 2*float64(len(m.Coefficients)-len(line.Coefficients)))
			} else {
				m.AICVsLine = m.AIC - line.AIC
				if float64(line.RSS) > 0 {
					m.ShareVsLine = 1 - m.RSS/line.RSS
				}
			}
		}
		if v := float64(m.Vertex); m.Vertex.Valid() && x.Min.Valid() && x.Max.Valid() {
			lo, hi := float64(x.Min), float64(x.Max)
			margin := report.VertexMargin * (hi - lo)
			m.VertexNear = v >= lo-margin && v <= hi+margin
		}
	}
}

// sumSquaresY is Σy² of a study's pairs from its moments, Syy + n·ȳ²
// (0 without them).
func sumSquaresY(m *report.Moments) float64 {
	if m == nil {
		return 0
	}
	return float64(m.Syy) + float64(m.N)*float64(m.MeanY)*float64(m.MeanY)
}

// addedTermShare is the share of the line's residual sum of squares that
// m removes, from the t of its last coefficient, when m is the line with
// that one term more (the quadratic) and t is a number (see compareFits).
func addedTermShare(m, line *report.Fit) (float64, bool) {
	if m.Name != "quadratic" || len(m.Coefficients) != len(line.Coefficients)+1 || m.DFResid < 1 {
		return 0, false
	}
	t := float64(m.Coefficients[len(m.Coefficients)-1].T)
	if math.IsNaN(t) || math.IsInf(t, 0) {
		return 0, false
	}
	t2 := t * t
	return t2 / (t2 + float64(m.DFResid)), true
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
		out := hugepage.Make[float64](len(v))
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
		l, err := stats.LineSummary(u, v, conf)
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

// diagnostics computes the tests of form, spread and order of the line
// fitted to x and y (data order; ps holds the same pairs in canonical
// order). line's fitted values and residuals are in data order; order is
// the run order per row, nil when the study has none. The quadratic's p,
// Theil–Sen and LOWESS are set by Analyze from the side statistics.
//
// smp is the study's sample (studySample), from which the figures
// computed on a sample draw theirs.
func diagnostics(x, y []float64, smp rowSample, ps *stats.Sorted, line stats.LineFit, order []float64, cfg Config) *report.Diagnostics {
	d := &report.Diagnostics{QuadraticP: report.NaN(), DurbinWatson: report.NaN()}
	// The lack-of-fit test needs settings that were repeated on purpose.
	// Where x is continuous, a few values repeat only by rounding, and a
	// test with a handful of pure-error degrees of freedom against a
	// hundred levels says little. So it is reported only when the levels
	// of x are at most half the rows (each level holds two rows on
	// average); levels = df1 + 2.
	if f, df1, df2, p, ok := ps.LackOfFit(line.Slope.Estimate); df1 > 0 && 2*(df1+2) <= ps.Len() {
		d.LackOfFit = &report.LackOfFit{F: report.Float(f), DF1: df1, DF2: df2, P: report.Float(p), NoPureError: !ok}
	}
	dc, p, mcse, perms, used, resolved, method := dcorTestSample(x, y, smp, cfg.Alpha, cfg.DcorPerms, cfg.DcorMaxN)
	d.DistanceCorr = &report.DistanceCorr{DCor: report.Float(dc), P: report.Float(p), Permutations: perms,
		Sampled: used, Method: method, MCError: report.Float(mcse), Resolved: resolved, FlipRisk: dcorFlipRisk}
	bp, df, pbp := stats.BreuschPagan(line.Residuals, x)
	d.BreuschPagan = &report.ChiTest{Stat: report.Float(bp), DF: df, P: report.Float(pbp)}

	// Run order: the Durbin–Watson statistic averaged over the orders of
	// rows whose run order ties (a function of the set of rows, not of the
	// file's order), and the trend of the residuals on run order.
	resid := line.Residuals
	if order != nil {
		d.DurbinWatson = report.Float(stats.DurbinWatsonTied(order, resid))
		slope, p, r := stats.OrderTrend(order, resid)
		d.OrderTrend = &report.OrderTrend{Slope: report.Float(slope), P: report.Float(p), R: report.Float(r)}
	} else {
		d.DurbinWatson = report.Float(stats.DurbinWatson(resid))
	}
	// The x-order figures on the rows of the sample (all rows up to
	// maxXOrderRows), sorted by x, with their residuals from the line.
	cx, cy := smp.sub(maxXOrderRows) // may be the sample's own slices: read only
	e := make([]float64, len(cy))
	for k := range cy {
		e[k] = line.Residual(cx[k], cy[k])
	}
	xOrderFigures(d, cx, e)
	return d
}

// sideStats are statistics that need only the sorted pairs: Analyze runs
// them beside its other work (sideStatistics).
type sideStats struct {
	spearman  report.Spearman
	kendall   report.Kendall
	resistant *report.Resistant
	quad      *stats.Regression
	models    []report.Fit
}

// sideStatistics starts, on wg, goroutines that fill out with Kendall's
// τ-b, Spearman's ρ with the Theil–Sen line, and the quadratic and log
// models, all from the canonical order ps.
func sideStatistics(wg *sync.WaitGroup, out *sideStats, ps *stats.Sorted, conf float64, cfg Config) {
	async := task(wg)
	async(func() {
		tau, ptau := ps.KendallTauB()
		out.kendall = report.Kendall{TauB: report.Float(tau), P: report.Float(ptau)}
	})
	async(func() {
		rho, prho := ps.Spearman()
		out.spearman = report.Spearman{Rho: report.Float(rho), P: report.Float(prho)}
		// Theil–Sen samples pairs above its exact bound from a stream
		// seeded by the rows themselves, over the canonical order: the
		// same set of rows gives the same line.
		src := rand.Source(rand.NewPCG(0, 0)) // unused by the exact method
		if ps.Len() > cfg.TheilSenMaxExact {
			src = rowSource(ps.X, ps.Y, "theil-sen")
		}
		f := stats.TheilSenFit(ps.X, ps.Y, cfg.TheilSenMaxExact, src)
		out.resistant = &report.Resistant{Method: f.Method, Slope: report.Float(f.Slope), Intercept: report.Float(f.Intercept), Pairs: f.Pairs}
	})
	async(func() {
		if ps.Len() >= 4 {
			if q, err := ps.PolynomialSummary(2, conf); err == nil && len(q.Coef) == 3 {
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
func groupFits(x, y []float64, lv []string, gidx []int32, conf float64) []report.GroupFit {
	// The rows level by level (a counting sort: one int32 per row, not a
	// list per level).
	start := make([]int, len(lv)+1)
	for _, g := range gidx {
		start[g+1]++
	}
	for k := range lv {
		start[k+1] += start[k]
	}
	rows := hugepage.Make[int32](len(gidx))
	next := slices.Clone(start[:len(lv)])
	for i, g := range gidx {
		rows[next[g]] = int32(i)
		next[g]++
	}
	out := make([]report.GroupFit, 0, len(lv))
	for k, g := range lv {
		idx := rows[start[k]:start[k+1]]
		gf := report.GroupFit{Group: g, N: len(idx), R: report.NaN(), Slope: report.NaN(), Intercept: report.NaN(),
			SlopeLow: report.NaN(), SlopeHigh: report.NaN()}
		gx, gy := pick(x, idx), pick(y, idx)
		if len(idx) >= 3 {
			if cx, _ := constant(gx); !cx {
				if l, err := stats.LineSummary(gx, gy, conf); err == nil {
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

func pick[I int | int32](v []float64, idx []I) []float64 {
	out := make([]float64, len(idx))
	for j, i := range idx {
		out[j] = v[i]
	}
	return out
}

// groupLines compares the lines within the group's levels
// (stats.CompareGroupLines).
func groupLines(x, y []float64, gidx []int32) *report.GroupLines {
	return reportGroupLines(stats.CompareGroupLines(x, y, gidx))
}

// reportGroupLines is the comparison of the levels' lines as results.json
// holds it.
func reportGroupLines(c stats.GroupLines) *report.GroupLines {
	return &report.GroupLines{Groups: c.Groups, N: c.N, SlopesF: report.Float(c.SlopesF), SlopesDF1: c.SlopesDF1, SlopesP: report.Float(c.SlopesP),
		LinesF: report.Float(c.LinesF), LinesDF1: c.LinesDF1, LinesP: report.Float(c.LinesP), DF2: c.DF2,
		RWithin: report.Float(c.RWithin), RWithinDF: c.RWithinDF, RWithinP: report.Float(c.RWithinP)}
}

// taskSlots bounds the statistics of all studies that run at once to one
// fewer than the processors (at least one), the study's own goroutine
// working beside them: more would not finish sooner, and each holds its
// working memory (copies of a column or two: 80 MB each at 10⁷ rows)
// while it runs. At 10⁷ rows (one study, 2 processors) starting them all
// together took the peak past 1 GB, and one slot per processor did so in
// 2 of 6 runs once the statistics had got quicker (1 080 and 1 090 MiB;
// 737 to 814 MiB in 16 runs with one fewer, at 0.1 s more wall time at
// 10⁶ rows and the same CPU time). Studies take their own slots (Run); a
// statistic takes a task slot and never waits for anything while it
// holds it.
var taskSlots = make(chan struct{}, max(1, runtime.GOMAXPROCS(0)-1))

// task returns a function that runs f on a goroutine of wg once a task
// slot is free. Each f writes only its own results, so they are the same
// whatever the schedule.
func task(wg *sync.WaitGroup) func(f func()) {
	return func(f func()) {
		wg.Go(func() {
			taskSlots <- struct{}{}
			defer func() { <-taskSlots }()
			f()
		})
	}
}
