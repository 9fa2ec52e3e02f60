package analysis

// This file fills the parts of a study about measurement (study.kind,
// replicate columns, gauge_sd, [study.agreement], [study.plan]): the
// agreement of two methods, r and the slope corrected for the gauges'
// measurement error, and the planning of the next run. Run calls measure
// after a study's figures and measureFindings after its findings.

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strconv"

	"bivar/analysis/findings"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/internal/hugepage"
)

// agreementK is the multiplier of the SD in the limits of agreement:
// z_{0.975}, so that the limits hold 95 % of the differences (Bland &
// Altman 1999). It does not follow the manifest's alpha, which sets the
// confidence of the intervals around the limits.
var agreementK = stats.NormalQuantile(0.975)

// measure fills s.Kind, s.Agreement, s.ErrorCorrection and s.Plan for the
// study st, whose rows are in (Keep says which may be used) and whose
// dataset's numeric columns are cols (the replicate columns among them).
// A study that did not run gets its Kind only.
func measure(s *report.Study, st manifest.Study, in Input, cols map[string][]float64, cfg Config) {
	s.Kind = st.Kind
	if s.Kind == "" {
		s.Kind = manifest.KindRelationship
	}
	if s.Error != nil {
		return
	}
	conf := 1 - cfg.Alpha
	// The readings are the recorded values: the manifest refuses x_scale
	// and y_scale on an agreement study and with gauge_sd or replicates.
	// The readings are gathered (a copy of x and y: 160 MB at 10⁷ rows)
	// only for a study that uses them.
	if s.Kind == manifest.KindAgreement {
		xcols, ycols, rows := readings(st, in, cols)
		s.Agreement = agreement(xcols, ycols, rows, st, s.X.Unit, conf)
		if pb := s.Agreement.PassingBablok; pb != nil && pb.Sampled {
			s.Approximations = append(s.Approximations, passingBablokApproximation(rows, conf))
		}
	} else if st.GaugeSD != nil || len(st.XReplicates) > 0 || len(st.YReplicates) > 0 {
		xcols, ycols, rows := readings(st, in, cols)
		s.ErrorCorrection = errorCorrection(xcols, ycols, rows, st.GaugeSD, conf)
	}
	s.Plan = plan(s, st.Plan, cfg.Alpha)
}

// passingBablokApproximation states the sample of pairs behind a
// Passing–Bablok line above stats.PassingBablokExactMax items, with its
// error at this n (stats.PassingBablokSampleError).
func passingBablokApproximation(n int, conf float64) report.Approximation {
	return report.Approximation{Figure: "Passing–Bablok line", Rows: stats.PassingBablokSample, Of: n,
		Method: "pairs of items (the count is of pairs) drawn from a random stream seeded by the items sorted by value, so the same items give the same sample in any order",
		Error: fmt.Sprintf("the sampled ranks move the slope and the ends of its %s interval by about %s of the interval's half-width (1 SD; 1.5·√(n/M)/z with n = %d items and M = %d pairs, derived from the binomial error of a sample quantile and checked by resampling at 6000 items); the error grows as √n",
			strconv.FormatFloat(100*conf, 'f', -1, 64)+"%", num(report.Float(stats.PassingBablokSampleError(n, conf))), n, stats.PassingBablokSample)}
}

// readings gathers the x and y readings of the rows that may be used and
// have every reading present: xcols[0] is x, then x's replicates in the
// manifest's order; likewise ycols. rows is how many rows were kept.
func readings(st manifest.Study, in Input, cols map[string][]float64) (xcols, ycols [][]float64, rows int) {
	src := func(first []float64, reps []string) [][]float64 {
		out := [][]float64{first}
		for _, c := range reps {
			out = append(out, cols[c])
		}
		return out
	}
	xs, ys := src(in.XS, st.XReplicates), src(in.YS, st.YReplicates)
	xcols, ycols = make([][]float64, len(xs)), make([][]float64, len(ys))
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	all := append(slices.Clone(xs), ys...)
rowLoop:
	for i := range in.XS {
		if in.Keep != nil && !in.Keep[i] {
			continue
		}
		for _, c := range all {
			if c == nil || i >= len(c) || !finite(c[i]) {
				continue rowLoop
			}
		}
		for j, c := range xs {
			xcols[j] = append(xcols[j], c[i])
		}
		for j, c := range ys {
			ycols[j] = append(ycols[j], c[i])
		}
		rows++
	}
	return xcols, ycols, rows
}

// agreement computes the agreement of the y method with the x method on
// the rows' replicate means (see report.Agreement and the functions of
// stats/agreement.go it calls).
func agreement(xcols, ycols [][]float64, n int, st manifest.Study, unit string, conf float64) *report.Agreement {
	f := func(v float64) report.Float { return report.Float(v) }
	a := &report.Agreement{N: n, XReadings: len(xcols), YReadings: len(ycols), Unit: unit, Acceptable: report.NaN()}
	if v, ok := st.Agreement.AcceptableIn(unit); ok {
		a.Acceptable = f(v)
	}
	var loa stats.LimitsOfAgreement
	if len(xcols) > 1 || len(ycols) > 1 {
		loa = stats.BlandAltmanReplicates(ycols, xcols, agreementK, conf)
	} else {
		loa = stats.BlandAltman(ycols[0], xcols[0], agreementK, conf)
	}
	a.Bias, a.BiasLow, a.BiasHigh, a.SD, a.K = f(loa.Bias), f(loa.BiasLo), f(loa.BiasHi), f(loa.SD), f(loa.K)
	a.Lower, a.LowerLow, a.LowerHigh = f(loa.Lower), f(loa.LowerLo), f(loa.LowerHi)
	a.Upper, a.UpperLow, a.UpperHigh = f(loa.Upper), f(loa.UpperLo), f(loa.UpperHi)
	a.BiasSE = f(loa.SDMeans / math.Sqrt(float64(n)))
	a.TrendSlope, a.TrendP = f(loa.TrendSlope), f(loa.TrendP)
	a.TrendLow, a.TrendHigh = report.NaN(), report.NaN()
	if n >= 3 {
		h := stats.TQuantile(0.5+conf/2, float64(n-2)) * loa.TrendSlopeSE
		a.TrendLow, a.TrendHigh = f(loa.TrendSlope-h), f(loa.TrendSlope+h)
	}

	xm, ym := stats.RowMeans(xcols, n), stats.RowMeans(ycols, n)
	a.MeanLow, a.MeanHigh = report.NaN(), report.NaN()
	for i := range xm {
		m := (xm[i] + ym[i]) / 2
		if i == 0 || m < float64(a.MeanLow) {
			a.MeanLow = f(m)
		}
		if i == 0 || m > float64(a.MeanHigh) {
			a.MeanHigh = f(m)
		}
	}
	// δ = var(error of y)/var(error of x). A declared (or assumed) δ is
	// per single reading; the Deming line is fitted to the replicate
	// means, whose error variances are σ²/m, so it becomes δ·m_x/m_y
	// (DemingDeltaFromReplicates estimates the means' ratio directly).
	delta, from := 1.0, "assumed 1"
	switch {
	case st.Agreement != nil && st.Agreement.Delta != nil:
		delta, from = *st.Agreement.Delta, "declared"
	case len(xcols) > 1 && len(ycols) > 1:
		if d := stats.DemingDeltaFromReplicates(xcols, ycols); d > 0 && !math.IsInf(d, 0) {
			delta, from = d, "replicates"
		}
	}
	if from != "replicates" {
		delta *= float64(len(xcols)) / float64(len(ycols))
	}
	dm := stats.Deming(xm, ym, delta, conf)
	a.Deming = &report.MethodLine{Intercept: f(dm.Intercept), InterceptLow: f(dm.InterceptLo), InterceptHigh: f(dm.InterceptHi),
		Slope: f(dm.Slope), SlopeLow: f(dm.SlopeLo), SlopeHigh: f(dm.SlopeHi), Delta: f(delta), DeltaFrom: from}
	pb := stats.PassingBablok(xm, ym, conf)
	a.PassingBablok = &report.MethodLine{Intercept: f(pb.Intercept), InterceptLow: f(pb.InterceptLo), InterceptHigh: f(pb.InterceptHi),
		Slope: f(pb.Slope), SlopeLow: f(pb.SlopeLo), SlopeHigh: f(pb.SlopeHi), Sampled: pb.Sampled}
	cc := stats.LinCCC(xm, ym, conf)
	a.Concordance = &report.Concordance{CCC: f(cc.CCC), Low: f(cc.Lo), High: f(cc.Hi), Pearson: f(cc.Pearson), Cb: f(cc.Cb)}

	a.Repeatability = []report.Repeatability{}
	for _, m := range []struct {
		method string
		cols   [][]float64
		names  []string
	}{{"x", xcols, append([]string{st.X}, st.XReplicates...)}, {"y", ycols, append([]string{st.Y}, st.YReplicates...)}} {
		if len(m.cols) < 2 {
			continue
		}
		r := stats.Repeatability(m.cols, conf)
		a.Repeatability = append(a.Repeatability, report.Repeatability{Method: m.method, Column: m.names[0], Readings: len(m.cols), DF: r.DF,
			SW: f(r.SW), SWLow: f(r.SWLo), SWHigh: f(r.SWHi), Coef: f(r.Coef), CoefLow: f(r.CoefLo), CoefHigh: f(r.CoefHi)})
	}
	a.Plot = agreementPlot(xm, ym)
	return a
}

// agreementPlot is the bounded plot data of the agreement charts.
func agreementPlot(xm, ym []float64) *report.AgreementPlot {
	n := len(xm)
	p := &report.AgreementPlot{N: n, Lo: math.Inf(1), Hi: math.Inf(-1)}
	mean, diff := hugepage.Make[float64](n), hugepage.Make[float64](n)
	for i := range xm {
		mean[i], diff[i] = (xm[i]+ym[i])/2, ym[i]-xm[i]
		p.Lo = math.Min(p.Lo, math.Min(xm[i], ym[i]))
		p.Hi = math.Max(p.Hi, math.Max(xm[i], ym[i]))
	}
	if n > report.PlotPointsMax {
		p.Grid = grid(mean, diff, gridNX, gridNY)
		p.PairGrid = grid(xm, ym, gridNX, gridNY)
		return p
	}
	sorted := func(u, v []float64) []report.XY {
		out := make([]report.XY, len(u))
		for i := range u {
			out[i] = report.XY{X: u[i], Y: v[i]}
		}
		slices.SortFunc(out, func(a, b report.XY) int { return cmp.Or(cmp.Compare(a.X, b.X), cmp.Compare(a.Y, b.Y)) })
		return out
	}
	p.Points, p.Pairs = sorted(mean, diff), sorted(xm, ym)
	return p
}

// errorCorrection corrects r and the slope for the gauges' measurement
// error, with SDs declared (gauge_sd) or estimated from the replicate
// readings (stats.Repeatability); x and y are the first readings.
func errorCorrection(xcols, ycols [][]float64, n int, g *manifest.GaugeSD, conf float64) *report.ErrorCorrection {
	sd := func(cols [][]float64, declared *float64) (float64, string) {
		switch {
		case declared != nil:
			return *declared, "declared"
		case len(cols) > 1:
			return stats.Repeatability(cols, 0).SW, "replicates"
		}
		return 0, "none"
	}
	var gx, gy *float64
	if g != nil {
		gx, gy = g.X, g.Y
	}
	sx, fx := sd(xcols, gx)
	sy, fy := sd(ycols, gy)
	c := stats.CorrectForError(xcols[0], ycols[0], sx, sy, conf)
	f := func(v float64) report.Float { return report.Float(v) }
	return &report.ErrorCorrection{N: n, SDErrorX: f(sx), SDErrorY: f(sy), FromX: fx, FromY: fy,
		ReliabilityX: f(c.ReliabilityX), ReliabilityY: f(c.ReliabilityY),
		R: f(c.R), RCorrected: f(c.RCorrected), RCorrectedClipped: c.RClipped, RUnclipped: f(c.RUnclipped), RCorrectedLow: f(c.RCorrectedLo), RCorrectedHigh: f(c.RCorrectedHi),
		Slope: f(c.Slope), SlopeCorrected: f(c.SlopeCorrected), SlopeCorrectedLow: f(c.SlopeCorrectedLo), SlopeCorrectedHigh: f(c.SlopeCorrectedHi)}
}

// plan says how many rows the next run needs (see report.Plan), from the
// study's r, residual SD and SD of x, and the targets of [study.plan] or
// their defaults (manifest.DefaultRHalfWidth, manifest.DefaultPower, half
// the slope's present half-width). An agreement study plans only the
// intervals of its limits of agreement (planAgreement).
func plan(s *report.Study, pl *manifest.Plan, alpha float64) *report.Plan {
	if pl == nil {
		pl = &manifest.Plan{}
	}
	if s.Kind == manifest.KindAgreement {
		return planAgreement(s, pl, alpha)
	}
	if s.Pearson == nil {
		return nil
	}
	f := func(v float64) report.Float { return report.Float(v) }
	conf := 1 - alpha
	r := float64(s.Pearson.R)
	nan := report.Float(math.NaN())
	p := &report.Plan{N: s.N, Alpha: f(alpha), RHalfWidthFrom: "default", SlopeHalfWidthFrom: "default", DetectRFrom: "observed",
		LimitsHalfWidthNow: nan, LimitsHalfWidth: nan}
	p.RHalfWidthNow = f(stats.FisherHalfWidth(r, s.N, conf))
	p.RHalfWidth = manifest.DefaultRHalfWidth
	if pl.RHalfWidth != nil {
		p.RHalfWidth, p.RHalfWidthFrom = f(*pl.RHalfWidth), "declared"
	}
	p.NForR = stats.NForCorrelationHalfWidth(r, float64(p.RHalfWidth), conf)

	resid, sdx := math.NaN(), math.NaN()
	if s.Line != nil && !s.Line.ExactToRounding {
		// A line exact to rounding has no scatter to plan from: its
		// residual SD is rounding (from an independent review: 200 rows
		// of y = 3 − 7·0.1·x planned the slope's interval from ±2.9e-17
		// to ±1.4e-17 with 790 rows). The slope's figures are then NaN.
		resid = float64(s.Line.ResidualSE)
	}
	if s.Describe != nil {
		sdx = float64(s.Describe.X.SD)
	}
	now := stats.SlopeHalfWidth(resid, sdx, s.N, conf)
	p.SlopeHalfWidthNow, p.SlopeHalfWidth = f(now), f(now/2)
	if pl.SlopeHalfWidth != nil {
		p.SlopeHalfWidth, p.SlopeHalfWidthFrom = f(*pl.SlopeHalfWidth), "declared"
	}
	p.NForSlope = stats.NForSlopeHalfWidth(resid, sdx, float64(p.SlopeHalfWidth), conf)

	p.DetectR = f(math.Abs(r))
	if pl.SmallestR != nil {
		p.DetectR, p.DetectRFrom = f(*pl.SmallestR), "declared"
	}
	p.Power = manifest.DefaultPower
	if pl.Power != nil {
		p.Power = f(*pl.Power)
	}
	p.NForPower = stats.NForCorrelationPower(float64(p.DetectR), alpha, float64(p.Power))
	// The power of this run at the observed r is a transform of its p
	// ("observed power"): it is given only for a declared r.
	p.PowerNow = nan
	if p.DetectRFrom == "declared" {
		p.PowerNow = f(stats.CorrelationPower(float64(p.DetectR), s.N, alpha))
	}
	return p
}

// planAgreement plans an agreement study: the items needed for the exact
// intervals of the limits of agreement to reach plan.limits_half_width
// (default half the present half-width, the project's choice as for the
// slope) at the present SD of the differences (stats.NForLimitsHalfWidth).
// The r, slope and power figures are NaN and 0: a test of ρ = 0 is
// meaningless for two methods that measure the same thing.
func planAgreement(s *report.Study, pl *manifest.Plan, alpha float64) *report.Plan {
	a := s.Agreement
	if a == nil {
		return nil
	}
	f := func(v float64) report.Float { return report.Float(v) }
	nan := f(math.NaN())
	p := &report.Plan{N: a.N, Alpha: f(alpha), RHalfWidthNow: nan, RHalfWidth: nan, SlopeHalfWidthNow: nan, SlopeHalfWidth: nan,
		DetectR: nan, Power: nan, PowerNow: nan, LimitsHalfWidthFrom: "default"}
	conf := 1 - alpha
	sd, k := float64(a.SD), float64(a.K)
	now := stats.LimitsHalfWidth(sd, k, a.N, conf)
	p.LimitsHalfWidthNow, p.LimitsHalfWidth = f(now), f(now/2)
	if pl.LimitsHalfWidth != nil {
		p.LimitsHalfWidth, p.LimitsHalfWidthFrom = f(*pl.LimitsHalfWidth), "declared"
	}
	p.NForLimits = stats.NForLimitsHalfWidth(sd, k, float64(p.LimitsHalfWidth), conf)
	return p
}

// measureFindings writes the verdicts and statements of the study's
// measurement parts (findings.Measurement) and returns the gate of
// expect.agree, if declared. It runs after the study's own findings.
func measureFindings(s *report.Study, e *manifest.Expect, alpha float64) []report.Expectation {
	findings.Measurement(s, alpha)
	if e == nil || e.Agree == nil {
		return nil
	}
	return []report.Expectation{findings.AgreeExpectation(s, *e.Agree)}
}
