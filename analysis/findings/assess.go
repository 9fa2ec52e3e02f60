package findings

// This file holds Assess: the verdicts of one study, decided from the
// numbers already in the study, and the statements and limits that carry
// them in words.

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"

	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/analysis/units"
)

// Designs named by the manifest's `design`.
const (
	Observational        = "observational"
	DesignedExperiment   = "designed-experiment"
	RandomizedExperiment = "randomized-experiment"
)

// Context is what Assess needs besides the study: the manifest's
// significance level and design, and the cut points in force.
type Context struct {
	Alpha      float64 // significance level; 0 means 0.05
	Design     string  // observational | designed-experiment | randomized-experiment; "" means observational
	Thresholds report.Thresholds
}

// facts are the verdicts and the numbers behind them, gathered before any
// sentence is written.
type facts struct {
	s     *report.Study
	alpha float64
	th    report.Thresholds
	conf  string // "95%"
	dsg   string // the design, as given

	r, p float64 // Pearson r and its adjusted p
	// adj is p_adjusted / p, the factor by which the adjustment across
	// studies raised r's p. Applied to another p (r without the flagged
	// rows) it is exact for Bonferroni but only approximate for Holm and
	// Benjamini–Hochberg, whose factor depends on where a p ranks among
	// the studies' p-values; the sentence says so where it is used.
	adj    float64
	dir    string // the direction verdict
	rdir   string // the direction of r alone: sign of r when its adjusted p is below alpha
	linSig bool
	quad   *report.Fit
	b2     float64
	share  float64 // share of the line's residual sum of squares the quadratic removes
	// exact: the line fits to the rounding of the numbers
	// (report.Fit.ExactToRounding), so its residuals are rounding and no
	// check reads them.
	exact  bool
	curved bool
	nonlin bool
	dcor   *report.DistanceCorr
	lof    bool
	// Residuals in order of x: their Durbin–Watson statistic and the bound
	// below which they hang together; NaN when there is no plot data.
	dwx, dwxBound      float64
	dcorRoute, dwRoute bool // which test found the nonlinear pattern
	xLabel             string
	yLabel             string
	xSym, ySym         string // the units as people write them (report.Variable.Symbol)
	without            string // direction without the suspect rows; "undefined" when r cannot be computed
	// noTurn says why a curve with its vertex known does not turn over:
	// "outside" (the vertex lies outside the observed range), "slight" (the
	// curve changes by less than its residual SE on one side), "smooth"
	// (the LOWESS curve does not turn back); "" when it turns or the
	// vertex is undefined.
	noTurn string
	// weaker: same direction without the flagged rows, a lower strength
	// grade, and r without them outside r's interval; withinCI: the grade
	// is lower but r without them lies inside r's interval.
	weaker, withinCI bool
	// The secondary checks of the study and their p-values, raw and after
	// Holm's adjustment over those the study ran (see screens).
	screenRaw, screenAdj map[string]float64
	screenNames          []string // checks in the family, in screenOrder
}

// Assess returns the verdicts for a study whose statistics are filled, or
// nil for a study that failed (Error set or no Pearson section). It reads
// only numbers in s: the adjusted p of r, the quadratic model and its
// vertex, the diagnostics, partial and per-group fits, the influence
// points and the sensitivity figures. The rules, with their cut points
// from ctx.Thresholds (zero value: DefaultThresholds):
//
//   - direction: positive or negative when r's adjusted p is below alpha
//     (its interval at the adjusted level excludes 0), by the sign of r,
//     unless the curve turns over inside the range (then y does not move
//     one way with x); otherwise none.
//   - form: curved when the x² term's p, after Holm's adjustment within the
//     study (see below), is below alpha, the quadratic as a
//     whole is significant and it removes at least the share CurveShare of
//     the straight line's residual sum of squares (curveShare; a rule that
//     does not depend on how much the line already explains); it bends
//     down when the x² coefficient is negative, up when positive; it turns
//     over when the fitted curve's vertex lies inside the observed x range,
//     the curve changes by at least its residual SE on both sides of the
//     vertex, and the LOWESS curve's extremes (Diagnostics.Lowess, when
//     present) confirm the turn (see smoothTurns). Otherwise nonlinear when either (a)
//     the distance correlation's p is below alpha, dcor ≥ NonlinearDcor
//     and dcor > |r| while r's adjusted p is not below alpha (r misses the
//     dependence), or (b) |r| is below Moderate and the line's residuals,
//     taken in order of x, hang together: their Durbin–Watson statistic
//     (Diagnostics.DurbinWatsonX) is below the smaller of FormDW and its
//     one-sided alpha bound (see xOrderDW). Distance correlation has little power for patterns that
//     go up and down several times; (b) catches those. Otherwise linear
//     when r's direction is not none; otherwise none.
//   - strength: from |r| and the Strong, Moderate and Weak cut points, and
//     none when r's adjusted p is not below alpha; CurveStrength from √R²
//     of the quadratic by the same cut points, where curved.
//   - outlier_driven: r's direction, recomputed without the flagged rows
//     (Sensitivity.RWithoutFlagged and its p, with the same adjustment
//     factor applied: an approximation, see Multiplicity), differs from its direction with them, or its
//     strength grade is lower without them and r without them lies outside
//     r's confidence interval (Pearson.CILow to CIHigh, at 1 − alpha): the
//     flagged rows make the relationship look stronger than the rest
//     support by more than r's own sampling uncertainty, so that a mere
//     crossing of a cut point (0.72 to 0.69) does not count — or r cannot be
//     computed without them, or leaving out a single row turns the sign
//     of r. Flagged rows that hide a stronger relationship do not make it
//     outlier-driven; the statements give r without them.
//   - reversal: at least two groups of ReversalMinGroup rows or more; every
//     group whose slope interval excludes 0 has the sign opposite to the
//     pooled direction, there is at least one such group, and most groups
//     have the opposite sign.
//   - explained_by: covariates given which the partial correlation turns
//     sign, or its p is not below alpha while its interval excludes the
//     pooled r (the association is no longer shown, and not merely for
//     want of rows) — while r's direction is not none.
//   - drift: only with a declared run order: the drift p (driftP: the
//     smaller of the residuals' trend p in run order and the one-sided p
//     of their Durbin–Watson statistic when it is below DriftDW, doubled
//     for the two) is below alpha after Holm's adjustment within the
//     study. Alone, that is a trend p below alpha/2 or a statistic below
//     min(DriftDW, 2 − 2·z(1 − alpha/2)/√n). A statistic above 2
//     (alternation) is not drift.
//   - spread_changes: Breusch–Pagan p below alpha after Holm's adjustment
//     within the study.
//   - lines (with a group): "separate" when the F test that the levels'
//     slopes are equal has p below alpha, else "parallel" when the F test
//     that one line serves all levels has p below alpha, else "one-line"
//     ("untested" with fewer than two levels that can have a line, or
//     where their lines leave no scatter to test against). Read
//     at alpha, outside the Holm family (see lines).
//   - autocorrelated (with a run order): drift, or the one-sided p of the
//     run-order Durbin–Watson statistic below alpha; the statements then
//     give the slope's Newey–West interval and r with an effective n.
//   - rows: what leaving out the suspect rows does (see rowsEffect).
//
// The distance correlation's p comes from a sequential permutation rule
// whose verdict at alpha is a function of the rows (analysis.dcorTest);
// the Durbin–Watson statistics are means over the orders of tied rows.
// Every check with its figures is in Findings.Checks.
//
// Multiplicity. r's p is the one adjusted across studies (p_adjusted, by
// the manifest's `adjust`). The secondary checks — curvature (the x²
// term), lack of fit, Breusch–Pagan and drift — are screens of the study's
// own fit: their p-values are adjusted by Holm's method over the checks
// the study ran (see screens), never across studies, so a study with none
// of these effects raises one of these flags at most about alpha of the
// time (TestDriftFalseAlarmRate measures it). Adjusting within the study
// costs no verdict of the labelled suite; adjusting across studies would
// make one study's curvature verdict depend on how many other studies the
// manifest holds, which is not a property of its data. The distance
// correlation and the x-order Durbin–Watson are read at alpha unadjusted.
// r without the flagged rows is judged with its p multiplied by r's own
// adjustment factor p_adjusted/p: exact for Bonferroni, only approximate
// for Holm and Benjamini–Hochberg, whose factor depends on how a p ranks
// among the studies'; the sensitivity sentence says so. The limits say in
// one sentence which checks are unadjusted screens.
//
// FormWhy, DirectionWhy and StrengthWhy say, for each of the three
// verdicts, which of these rules decided it and the figures it read (see
// why.go); the headline, statements and limits carry the rest.
func Assess(s *report.Study, ctx Context) *report.Findings {
	if s == nil || s.Error != nil || s.Pearson == nil {
		return nil
	}
	f := &facts{s: s, alpha: ctx.Alpha, th: ctx.Thresholds, dsg: ctx.Design}
	if !(f.alpha > 0 && f.alpha < 1) {
		f.alpha = 0.05
	}
	if f.th == (report.Thresholds{}) {
		f.th = DefaultThresholds()
	}
	f.conf = num(100*(1-f.alpha)) + "%"
	f.xLabel, f.yLabel = label(s.X), label(s.Y)
	f.xSym, f.ySym = symbol(s.X), symbol(s.Y)
	f.onScales()

	out := &report.Findings{TurnX: report.NaN(), Statements: []string{}, Limits: []string{}, ExplainedBy: []string{}}
	f.decide(out)
	f.why(out)
	f.write(out)
	return out
}

func label(v report.Variable) string {
	if v.Label != "" {
		return v.Label
	}
	return v.Column
}

// symbol is the variable's unit as people write it: Variable.Symbol, or
// units.Symbol of its code when a study built by hand leaves Symbol empty.
func symbol(v report.Variable) string {
	if v.Symbol != "" || v.Unit == "" {
		return v.Symbol
	}
	return units.Symbol(v.Unit)
}

// sign is +1, −1 or 0.
func sign(v float64) int {
	switch {
	case v > 0:
		return 1
	case v < 0:
		return -1
	}
	return 0
}

func dirOf(r float64) string {
	switch sign(r) {
	case 1:
		return "positive"
	case -1:
		return "negative"
	}
	return "none"
}

// grade orders the strength words.
func grade(s string) int {
	return slices.Index([]string{"none", "weak", "moderate", "strong"}, s)
}

// strengthOf grades |r| by the cut points.
func (f *facts) strengthOf(a float64) string {
	switch {
	case !atLeast(a, f.th.Weak):
		return "none"
	case atLeast(a, f.th.Strong):
		return "strong"
	case atLeast(a, f.th.Moderate):
		return "moderate"
	}
	return "weak"
}

// curveShare is the share of the straight line's residual sum of squares
// that the quadratic removes, (RSS_line − RSS_quad)/RSS_line: the partial
// R² of x² given x. The quadratic's ShareVsLine where the fits were
// compared (its YScale set); else from the two RSS, or from R² where an
// RSS is missing; NaN when the line leaves no residual.
func curveShare(s *report.Study, q *report.Fit) float64 {
	if q.YScale == "y" {
		// analysis.compareFits's: from the x² term's t, NaN where the
		// line is exact to rounding.
		return float64(q.ShareVsLine)
	}
	if s.Line != nil && s.Line.RSS.Valid() && q.RSS.Valid() && s.Line.RSS > 0 {
		return 1 - float64(q.RSS)/float64(s.Line.RSS)
	}
	l := float64(s.Pearson.R2)
	if s.Line != nil && s.Line.R2.Valid() {
		l = float64(s.Line.R2)
	}
	if !(l < 1) {
		return math.NaN()
	}
	return (float64(q.R2) - l) / (1 - l)
}

// quadratic returns the study's quadratic model, or nil.
func quadratic(s *report.Study) *report.Fit {
	for i := range s.Models {
		if s.Models[i].Name == "quadratic" {
			return &s.Models[i]
		}
	}
	return nil
}

func (f *facts) decide(out *report.Findings) {
	s := f.s
	f.r = float64(s.Pearson.R)
	f.p = float64(s.Pearson.PAdjusted)
	raw := float64(s.Pearson.P)
	if math.IsNaN(f.p) {
		f.p = raw
	}
	f.adj = 1
	if raw > 0 && f.p > raw {
		f.adj = f.p / raw
	}
	f.linSig = !math.IsNaN(f.r) && f.p < f.alpha
	f.rdir = "none"
	if f.linSig {
		f.rdir = dirOf(f.r)
	}
	f.dir = f.rdir
	f.exact = s.Line != nil && s.Line.ExactToRounding

	f.screens()

	// Curvature.
	f.quad = quadratic(s)
	if q := f.quad; q != nil && len(q.Coefficients) == 3 {
		f.b2 = float64(q.Coefficients[2].Estimate)
		f.share = curveShare(s, q)
		f.curved = f.screenAdj[checkCurvature] < f.alpha && float64(q.FP) < f.alpha && atLeast(f.share, f.th.CurveShare) && f.b2 != 0
	}
	if s.Diagnostics != nil {
		f.dcor = s.Diagnostics.DistanceCorr
		if s.Diagnostics.LackOfFit != nil && f.screenAdj[checkLackOfFit] < f.alpha {
			f.lof = true
		}
	}
	if !f.curved && f.dcor != nil {
		d := float64(f.dcor.DCor)
		f.dcorRoute = float64(f.dcor.P) < f.alpha && atLeast(d, f.th.NonlinearDcor) && d > math.Abs(f.r) && !f.linSig
	}
	f.dwx, f.dwxBound = f.xOrderDW()
	f.dwRoute = !f.curved && below(f.dwx, f.dwxBound) && !atLeast(math.Abs(f.r), f.th.Moderate)
	f.nonlin = !f.curved && (f.dcorRoute || f.dwRoute)
	switch {
	case f.curved:
		out.Form = "curved"
		bend := "bends-up"
		if f.b2 < 0 {
			bend = "bends-down"
		}
		out.Bend = &bend
		if v := float64(f.quad.Vertex); s.Describe != nil && !math.IsNaN(v) {
			lo, hi := float64(s.Describe.X.Min), float64(s.Describe.X.Max)
			f.noTurn = "outside"
			if v > lo && v < hi {
				se := float64(f.quad.ResidualSE)
				left, right := math.Abs(f.b2)*(v-lo)*(v-lo), math.Abs(f.b2)*(hi-v)*(hi-v)
				switch {
				case left < se || right < se:
					f.noTurn = "slight"
				case !f.smoothTurns(f.b2 < 0, se):
					f.noTurn = "smooth"
				default:
					f.noTurn = ""
					out.TurnsOver = true
					out.TurnX = report.Float(v)
				}
			}
		}
	case f.nonlin:
		out.Form = "nonlinear"
	case f.linSig:
		out.Form = "linear"
	default:
		out.Form = "none"
	}

	// A curve that turns over inside the range has no one direction.
	if out.TurnsOver {
		f.dir = "none"
	}
	out.Direction = f.dir

	// Strength.
	out.Strength = "none"
	if f.linSig {
		out.Strength = f.strengthOf(math.Abs(f.r))
	}
	if f.curved {
		out.CurveStrength = f.strengthOf(math.Sqrt(math.Max(0, float64(f.quad.R2))))
	}

	// Influence: do r's direction and strength survive without the
	// flagged rows?
	f.without = f.rdir
	f.weaker = false
	if se := s.Sensitivity; se != nil {
		if se.NFlagged > 0 {
			rw, pw := float64(se.RWithoutFlagged), float64(se.PWithoutFlagged)
			switch {
			case math.IsNaN(rw):
				f.without = "undefined"
			case pw*f.adj < f.alpha:
				f.without = dirOf(rw)
				lower := f.without == f.rdir && grade(f.strengthOf(math.Abs(rw))) < grade(out.Strength)
				// A lower grade counts only when r without the rows also lies
				// outside r's confidence interval: a move that r's own sampling
				// uncertainty covers (0.72 to 0.69 across the strong cut point)
				// is not a verdict the rows make.
				lo, hi := float64(s.Pearson.CILow), float64(s.Pearson.CIHigh)
				f.weaker = lower && !(rw >= lo && rw <= hi)
				f.withinCI = lower && !f.weaker
			default:
				f.without = "none"
			}
		}
		out.OutlierDriven = (f.without != f.rdir && !(f.rdir == "none" && f.without == "undefined")) || f.weaker
		if f.rdir != "none" && se.LooRMin.Valid() && se.LooRMax.Valid() {
			if sign(float64(se.LooRMin)) != sign(f.r) || sign(float64(se.LooRMax)) != sign(f.r) {
				out.OutlierDriven = true
			}
		}
	}
	if s.Influence != nil && s.Influence.Counts.SoleSupport > 0 && f.rdir != "none" {
		out.OutlierDriven = true
	}

	// Lurking variables.
	out.Reversal = f.reversal()
	out.Lines = f.lines()
	f.shownLevels(out)
	if f.rdir != "none" {
		for _, pc := range s.Partial {
			if !pc.R.Valid() {
				continue
			}
			lo, hi := float64(pc.CILow), float64(pc.CIHigh)
			gone := !(float64(pc.P) < f.alpha) && (f.r > hi || f.r < lo) // no longer shown, and clearly below r
			if gone || sign(float64(pc.R)) != sign(f.r) {
				out.ExplainedBy = append(out.ExplainedBy, pc.Covariate)
			}
		}
	}
	if d := s.Diagnostics; d != nil {
		if s.Order != "" {
			out.Drift = f.screenAdj[checkDrift] < f.alpha
		}
		if d.BreuschPagan != nil && f.screenAdj[checkSpread] < f.alpha {
			out.SpreadChanges = true
		}
	}
	if s.Order != "" {
		_, dwp := f.driftDWP()
		out.Autocorrelated = out.Drift || dwp < f.alpha
	}
	out.CurveShare = report.Float(f.share)
	if f.quad == nil {
		out.CurveShare = report.NaN()
	}
	out.Rows = f.rowsEffect(out)
	out.Checks = f.checks(out)
}

// rowsEffect names what leaving out the suspect rows does to the verdict
// (report.Findings.Rows), from the figures decide has set.
func (f *facts) rowsEffect(out *report.Findings) string {
	se := f.s.Sensitivity
	if se == nil || se.NFlagged == 0 {
		return ""
	}
	rw := float64(se.RWithoutFlagged)
	switch {
	case f.without == "undefined":
		return "undefined"
	case f.rdir == "none" && f.without != "none":
		return "hides-relationship"
	case f.without != f.rdir:
		return "direction-changes"
	case f.weaker:
		return "weaker"
	case f.withinCI:
		return "within-interval"
	case f.rdir != "none" && grade(f.strengthOf(math.Abs(rw))) > grade(out.Strength):
		return "stronger"
	}
	return "stands"
}

// checks lists the tests the verdicts read, with their figures.
func (f *facts) checks(out *report.Findings) []report.Check {
	nan := report.NaN()
	var c []report.Check
	screen := func(name, key string, stat float64, raised bool) {
		raw, ok := f.screenRaw[key]
		if !ok {
			return
		}
		c = append(c, report.Check{Name: name, Stat: report.Float(stat), P: report.Float(raw),
			PAdjusted: report.Float(math.Min(1, f.screenAdj[key])), Bound: nan, Raised: raised, Adjusted: true})
	}
	s := f.s
	if q := f.quad; q != nil && len(q.Coefficients) == 3 {
		screen("curvature", checkCurvature, float64(q.Coefficients[2].T), f.screenAdj[checkCurvature] < f.alpha)
	}
	if d := s.Diagnostics; d != nil {
		if d.LackOfFit != nil {
			screen("lack-of-fit", checkLackOfFit, float64(d.LackOfFit.F), f.lof)
		}
		if d.BreuschPagan != nil {
			screen("changing-spread", checkSpread, float64(d.BreuschPagan.Stat), out.SpreadChanges)
		}
		if s.Order != "" && !f.exact {
			dw, dwp := f.driftDWP()
			screen("drift", checkDrift, dw, out.Drift)
			if d.OrderTrend != nil {
				p := float64(d.OrderTrend.P)
				c = append(c, report.Check{Name: "drift-trend", Stat: d.OrderTrend.Slope, P: report.Float(p), PAdjusted: report.Float(p), Bound: nan})
			}
			if !math.IsNaN(dw) {
				c = append(c, report.Check{Name: "drift-dw", Stat: report.Float(dw), P: report.Float(dwp), PAdjusted: report.Float(dwp), Bound: report.Float(f.th.DriftDW)})
			}
		}
		if f.dcor != nil {
			c = append(c, report.Check{Name: "distance-correlation", Stat: f.dcor.DCor, P: f.dcor.P, PAdjusted: f.dcor.P,
				Bound: report.Float(f.th.NonlinearDcor), Raised: f.dcorRoute})
		}
		if !math.IsNaN(f.dwx) {
			c = append(c, report.Check{Name: "x-order-dw", Stat: report.Float(f.dwx), P: nan, PAdjusted: nan,
				Bound: report.Float(f.dwxBound), Raised: below(f.dwx, f.dwxBound)})
		}
	}
	if c == nil {
		c = []report.Check{}
	}
	return c
}

// xOrderDW returns the Durbin–Watson statistic of the line's residuals
// taken in order of x (Diagnostics.DurbinWatsonX, computed by the analysis
// on at most 20000 rows, see there) and the bound below which they count
// as hanging together: the smaller of FormDW and the one-sided alpha point
// of DW's large-sample null distribution, about normal with mean 2 and
// variance 4/m for m rows used (Durbin & Watson 1950, Biometrika
// 37:409–428; the approximation is ours to state). Both are NaN when the
// statistic is undefined (fewer than 8 rows), FormDW is off or the line
// fits to the rounding of the numbers (facts.exact).
func (f *facts) xOrderDW() (dw, bound float64) {
	d := f.s.Diagnostics
	if d == nil || !d.DurbinWatsonX.Valid() || d.DurbinWatsonXRows < 8 || !(f.th.FormDW > 0) || f.exact {
		return math.NaN(), math.NaN()
	}
	dw = float64(d.DurbinWatsonX)
	bound = min(f.th.FormDW, 2-2*stats.NormalQuantile(1-f.alpha)/math.Sqrt(float64(d.DurbinWatsonXRows)))
	return dw, bound
}

// driftDWP returns the Durbin–Watson statistic of the residuals in run
// order and its one-sided p for residuals that hang together (a low
// statistic), from DW's large-sample null distribution, about normal with
// mean 2 and variance 4/n (Durbin & Watson 1950, Biometrika 37:409–428;
// the approximation is ours to state, as for xOrderDW). For regression
// residuals the statistic's null mean lies a little above 2 at small n,
// so this p errs on the side of fewer alarms. The p is 1 when the
// statistic is not below DriftDW (the rule of thumb: the drift rule reads
// the statistic only below it). Only the lower side is read: a statistic
// well above 2 means residuals that alternate from run to run, which is
// not drift. Both are NaN when the statistic is undefined, n < 3 or
// DriftDW is off or the line fits to the rounding of the numbers
// (facts.exact).
func (f *facts) driftDWP() (dw, p float64) {
	d := f.s.Diagnostics
	if d == nil || !d.DurbinWatson.Valid() || f.s.N < 3 || !(f.th.DriftDW > 0) || f.exact {
		return math.NaN(), math.NaN()
	}
	dw = float64(d.DurbinWatson)
	if !below(dw, f.th.DriftDW) {
		return dw, 1
	}
	z := (dw - 2) * math.Sqrt(float64(f.s.N)) / 2 // below 0, as DriftDW < 2
	return dw, stats.TwoSidedNormal(z) / 2
}

// driftP returns the p of the drift check (with a declared run order): the
// smaller of the order trend's p and driftDWP's p, doubled when both exist
// (Bonferroni over the two), so clean data are called drifting at most
// about alpha of the time (TestDriftFalseAlarmRate measures it). With
// only this check in the study, drift is called when the trend's p is
// below alpha/2 or DW is below min(DriftDW, 2 − 2·z(1 − alpha/2)/√n).
// NaN when neither exists.
func (f *facts) driftP() float64 {
	d := f.s.Diagnostics
	if d == nil || f.s.Order == "" {
		return math.NaN()
	}
	var ps []float64
	if d.OrderTrend != nil && d.OrderTrend.P.Valid() {
		ps = append(ps, float64(d.OrderTrend.P))
	}
	if _, p := f.driftDWP(); !math.IsNaN(p) {
		ps = append(ps, p)
	}
	if len(ps) == 0 {
		return math.NaN()
	}
	return math.Min(1, float64(len(ps))*slices.Min(ps))
}

// The secondary checks of a study, in the order the sentences list them.
const (
	checkCurvature = "curvature"
	checkLackOfFit = "lack of fit"
	checkSpread    = "changing spread"
	checkDrift     = "drift"
)

var screenOrder = []string{checkCurvature, checkLackOfFit, checkSpread, checkDrift}

// screens gathers the p-values of the study's secondary checks — the
// quadratic's x² term (curvature), lack of fit, Breusch–Pagan (changing
// spread) and, with a run order, drift (driftP) — and adjusts them by
// Holm's step-down method (Holm 1979, Scand. J. Stat. 6:65–70;
// stats.Holm) over those the study ran, so that together they raise a
// false flag at most alpha of the time in a study with no such effect.
// They are not adjusted across studies: each study's checks are screens of
// that study's own fit. A check that did not run is missing from
// screenRaw, and its screenAdj is +Inf (never below alpha).
func (f *facts) screens() {
	s := f.s
	f.screenRaw, f.screenAdj, f.screenNames = map[string]float64{}, map[string]float64{}, nil
	raw := map[string]float64{checkCurvature: f.quadP(), checkDrift: f.driftP()}
	if f.exact {
		// Every one of them reads the line's residuals, which hold only
		// rounding.
		raw = nil
	}
	if d := s.Diagnostics; d != nil && !f.exact {
		if d.LackOfFit != nil {
			raw[checkLackOfFit] = float64(d.LackOfFit.P)
		}
		if d.BreuschPagan != nil {
			raw[checkSpread] = float64(d.BreuschPagan.P)
		}
	}
	var ps []float64
	for _, name := range screenOrder {
		if p, ok := raw[name]; ok && !math.IsNaN(p) {
			f.screenNames = append(f.screenNames, name)
			ps = append(ps, p)
		}
	}
	adj := stats.Holm(ps)
	for _, name := range screenOrder {
		f.screenAdj[name] = math.Inf(1)
	}
	for i, name := range f.screenNames {
		f.screenRaw[name], f.screenAdj[name] = ps[i], adj[i]
	}
}

// screenP writes a secondary check's p: "p = 0.030", and where it is below
// alpha and Holm's adjustment within the study raised it (where the
// adjustment can decide the verdict), "p = 0.030; after Holm's adjustment
// over this study's 2 checks, p = 0.060".
func (f *facts) screenP(name string, raw float64) string {
	return f.pv(raw) + f.holmSuffix(name, raw)
}

func (f *facts) holmSuffix(name string, raw float64) string {
	if a, ok := f.screenRaw[name]; ok && a == raw && raw < f.alpha && f.screenAdj[name] > raw {
		adj := f.pv(math.Min(1, f.screenAdj[name]))
		if adj == f.pv(raw) { // both "p < 0.0001": one figure says it
			return ", adjusted or not"
		}
		return fmt.Sprintf("; after Holm's adjustment over this study's %d checks, %s", len(f.screenNames), adj)
	}
	return ""
}

// OwnChoice labels, in the sentences, a cut point that is this project's
// own choice rather than common practice (see DefaultThresholds).
const OwnChoice = "a choice of this tool, not common practice"

// dwxBoundText writes the bound of xOrderDW: the cut point FormDW (a
// project choice, stated with the rules), or where the bound at alpha is
// smaller, that bound and why.
func (f *facts) dwxBoundText() string {
	if f.dwxBound < f.th.FormDW {
		return fmt.Sprintf("%s, the bound at alpha for %d rows (the cut point %s, %s, is higher)", num(f.dwxBound), f.s.Diagnostics.DurbinWatsonXRows, num(f.th.FormDW), OwnChoice)
	}
	return num(f.dwxBound) + " (" + OwnChoice + ")"
}

// smoothTurns reports whether the LOWESS curve confirms a turn, from the
// curve's extremes in Diagnostics.Lowess: its highest point (lowest, for a
// curve bending up) lies strictly inside the curve's x range and the
// smooth falls back from it by at least se at both ends. The quadratic
// alone cannot tell a curve that levels off near the end of the range
// (saturation) from one that turns back. Without the curve's figures it
// does not object.
func (f *facts) smoothTurns(down bool, se float64) bool {
	d := f.s.Diagnostics
	if d == nil || d.Lowess == nil {
		return true
	}
	li := d.Lowess
	px, py := li.MaxX, li.MaxY
	if !down {
		px, py = li.MinX, li.MinY
	}
	if !px.Valid() || !py.Valid() || !li.FirstX.Valid() || !li.LastX.Valid() {
		return true
	}
	if !(px > li.FirstX && px < li.LastX) {
		return false
	}
	return math.Abs(float64(py-li.FirstY)) >= se && math.Abs(float64(py-li.LastY)) >= se
}

// qualifying returns the groups large enough for the reversal check.
func (f *facts) qualifying() []report.GroupFit {
	var g []report.GroupFit
	for _, gf := range f.s.Groups {
		if gf.N >= f.th.ReversalMinGroup && gf.Slope.Valid() {
			g = append(g, gf)
		}
	}
	return g
}

// LevelsShownMax is the most levels of a group whose lines the report's
// table shows (a choice of this tool, not common practice: a reviewer
// reads a table of twenty rows, not of a thousand); with more,
// shownLevels chooses levelsShownEnds at each end of the slopes.
const (
	LevelsShownMax  = 20
	levelsShownEnds = 5
)

// shownLevels sets Findings.LevelsShown and LevelsShownWhy where the
// study has more than LevelsShownMax levels: the levels with the
// levelsShownEnds lowest and highest slopes (ties by level), the ones
// where a level's line departs most from the others', from the lowest
// slope up. Where no more than twice levelsShownEnds levels have a line
// of their own (at least 3 rows, x varying), it shows all of those, and
// where none has, none (LevelsShown empty, LevelsShownWhy saying so): a
// table of levels without a line says nothing a sentence does not. The
// choice depends on the set of levels, not their order.
func (f *facts) shownLevels(out *report.Findings) {
	gs := f.s.Groups
	if len(gs) <= LevelsShownMax {
		return
	}
	var valid []int
	for i, g := range gs {
		if g.Slope.Valid() {
			valid = append(valid, i)
		}
	}
	slices.SortFunc(valid, func(a, b int) int {
		return cmp.Or(cmp.Compare(gs[a].Slope, gs[b].Slope), strings.Compare(gs[a].Group, gs[b].Group))
	})
	none := ""
	if m := len(gs) - len(valid); m > 0 {
		none = fmt.Sprintf("; %d %s no line of %s own (at least 3 rows, with x varying)", m, plural(m, "level has", "levels have"), plural(m, "its", "their"))
	}
	switch k := levelsShownEnds; {
	case len(valid) == 0:
		out.LevelsShown = []string{}
		out.LevelsShownWhy = fmt.Sprintf("None of the %d levels of %s has a line of its own (at least 3 rows, with x varying); every level is in results.json (groups)", len(gs), f.groupLabel())
		return
	case len(valid) <= 2*k:
		for _, i := range valid {
			out.LevelsShown = append(out.LevelsShown, gs[i].Group)
		}
		out.LevelsShownWhy = fmt.Sprintf("The line within each of the %d levels of %s that have one, from the lowest slope up%s; every level is in results.json (groups)",
			len(valid), f.groupLabel(), none)
	default:
		for _, i := range append(valid[:k:k], valid[len(valid)-k:]...) {
			out.LevelsShown = append(out.LevelsShown, gs[i].Group)
		}
		out.LevelsShownWhy = fmt.Sprintf("The line within %d of the %d levels of %s, from the lowest slope up: the %d with the lowest slope and the %d with the highest (the table shows at most %d levels, a choice of this tool)%s; every level's line is in results.json (groups)",
			len(out.LevelsShown), len(gs), f.groupLabel(), k, k, LevelsShownMax, none)
	}
}

// lines decides whether one line serves all levels of the group
// (report.Findings.Lines), from GroupLines' two F tests read at alpha.
// They are not part of the study's Holm family of screens (see screens):
// a study with a group would otherwise hold its curvature and spread
// checks to a stricter level than the same data without one.
func (f *facts) lines() string {
	s := f.s
	switch {
	case s.Group == "":
		return ""
	case s.GroupLines == nil || s.GroupLines.Groups < 2 || !s.GroupLines.LinesP.Valid():
		return "untested"
	case !(float64(s.GroupLines.LinesP) < f.alpha):
		return "one-line"
	case float64(s.GroupLines.SlopesP) < f.alpha:
		return "separate"
	}
	return "parallel"
}

// linesText writes the figures of the lines verdict.
func (f *facts) linesText() string {
	gl := f.s.GroupLines
	// The F statistics and their degrees of freedom stay in results.json.
	return fmt.Sprintf("one line for all %d levels against a line per level: %s; equal slopes: %s (F tests); r within levels = %s (%s)",
		gl.Groups, f.pv(float64(gl.LinesP)), f.pv(float64(gl.SlopesP)), corr(float64(gl.RWithin)), f.pv(float64(gl.RWithinP)))
}

// reversalCount writes the figures of the reversal rule: "of the 3 groups
// compared, 3 have a slope of the opposite sign, 2 of them clearly
// (interval excluding 0), and none clearly has the pooled sign".
func (f *facts) reversalCount() string {
	g := f.qualifying()
	pooled := sign(f.r)
	opposite, sigOpp := 0, 0
	for _, gf := range g {
		if sign(float64(gf.Slope)) == -pooled {
			opposite++
		}
		if lo, hi := float64(gf.SlopeLow), float64(gf.SlopeHigh); lo > 0 && pooled < 0 || hi < 0 && pooled > 0 {
			sigOpp++
		}
	}
	return fmt.Sprintf("of the %d groups compared, %d %s a slope of the opposite sign, %d clearly (interval excluding 0), none clearly the pooled sign",
		len(g), opposite, plural(opposite, "has", "have"), sigOpp)
}

// reversalLead is the headline's opening for a reversal within groups:
// how many of the groups compared run against the pooled direction, and
// the range of their slopes with its unit. "Within all 3 of 3 groups of
// Quench tank, Total runout falls with Quench oil temperature (slopes
// −0.00376 to −0.00292 mm per °C): the pooled trend comes from
// differences between the groups."
func (f *facts) reversalLead() string {
	g := f.qualifying()
	pooled := sign(f.r)
	n := 0
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, gf := range g {
		if b := float64(gf.Slope); sign(b) == -pooled {
			n++
			lo, hi = math.Min(lo, b), math.Max(hi, b)
		}
	}
	count := fmt.Sprintf("%d of %d", n, len(g))
	if n == len(g) {
		count = "all " + count
	}
	verb := "falls"
	if pooled < 0 {
		verb = "rises"
	}
	slopes := "slope " + num(lo)
	if n > 1 {
		slopes = "slopes " + num(lo) + " to " + num(hi)
	}
	return fmt.Sprintf("Within %s groups of %s, %s %s with %s (%s %s): the pooled trend comes from differences between the groups.",
		count, f.groupLabel(), f.yLabel, verb, f.xLabel, slopes, perUnit(f.ySym, f.xSym, f.xLabel))
}

// explainedLead is the headline's opening for a study whose association
// is no longer shown with a covariate held fixed, with each such
// covariate's partial correlation.
func (f *facts) explainedLead(names []string) string {
	var parts []string
	turns := false // a partial r shown at alpha, of the other sign
	for _, n := range names {
		for _, pc := range f.s.Partial {
			if pc.Covariate == n {
				parts = append(parts, fmt.Sprintf("partial r = %s, %s", corr(float64(pc.R)), f.pv(float64(pc.P))))
				turns = turns || float64(pc.P) < f.alpha
			}
		}
	}
	fig := ""
	if len(parts) > 0 {
		fig = " (" + strings.Join(parts, "; ") + ")"
	}
	what := fmt.Sprintf("no association of %s with %s is shown", f.yLabel, f.xLabel)
	if turns {
		what = fmt.Sprintf("the association of %s with %s turns sign", f.yLabel, f.xLabel)
	}
	return fmt.Sprintf("%s, %s%s: %s may carry the association.", f.heldFixed(names), what, fig,
		plural(len(names), "the covariate", "the covariates"))
}

func (f *facts) reversal() bool {
	if f.rdir == "none" {
		return false
	}
	g := f.qualifying()
	if len(g) < 2 {
		return false
	}
	pooled := sign(f.r)
	opposite, sigOpp, sigSame := 0, 0, 0
	for _, gf := range g {
		if sign(float64(gf.Slope)) == -pooled {
			opposite++
		}
		lo, hi := float64(gf.SlopeLow), float64(gf.SlopeHigh)
		switch {
		case lo > 0 && pooled < 0, hi < 0 && pooled > 0:
			sigOpp++
		case lo > 0 && pooled > 0, hi < 0 && pooled < 0:
			sigSame++
		}
	}
	return sigOpp > 0 && sigSame == 0 && 2*opposite > len(g)
}

// spreadGrows reports whether the scatter about the line grows (+1) or
// shrinks (−1) with x, by the sign of Diagnostics.SpreadRho (Spearman's ρ
// of |residual| on x); 0 when it cannot tell.
func (f *facts) spreadGrows() int {
	if d := f.s.Diagnostics; d != nil && d.SpreadRho.Valid() {
		return sign(float64(d.SpreadRho))
	}
	return 0
}

// write sets the headline, statements and limits.
func (f *facts) write(out *report.Findings) {
	s := f.s
	x, y := f.xLabel, f.yLabel
	pr := s.Pearson
	rText := fmt.Sprintf("r = %s, %s, n = %d", f.rNum(), f.interval(pr.CILow, pr.CIHigh), s.N)

	// Headline.
	var h string
	switch out.Form {
	case "linear":
		verb := "rises"
		if f.dir == "negative" {
			verb = "falls"
		}
		h = fmt.Sprintf("%s %s with %s along a straight line: %s (%s).", capital(y), verb, x, f.strengthPhrase(out.Strength), rText)
	case "curved":
		h = fmt.Sprintf("%s follows a curve in %s that bends %s", capital(y), x, strings.TrimPrefix(*out.Bend, "bends-"))
		if out.TurnsOver {
			h += fmt.Sprintf(" and turns over near %s = %s", x, withUnit(float64(out.TurnX), f.xSym))
		}
		h += fmt.Sprintf(": %s as a curve (R² = %s), %s as a straight line (%s).", out.CurveStrength, corr(float64(f.quad.R2)),
			strengthWord(out.Strength), rText)
	case "nonlinear":
		why := ""
		if f.dcorRoute {
			why = fmt.Sprintf("distance correlation %s, %s; ", num(float64(f.dcor.DCor)), f.pv(float64(f.dcor.P)))
		}
		if f.dwRoute {
			why += fmt.Sprintf("residuals in order of %s: Durbin–Watson %s; ", x, num(f.dwx))
		}
		h = fmt.Sprintf("%s depends on %s in a way a straight line misses (%s%s).", capital(y), x, why, rText)
	default:
		h = fmt.Sprintf("No relationship between %s and %s shows in these data (%s, %s).", x, y, rText, f.pv(f.p))
	}
	if out.OutlierDriven {
		h = f.drivenHeadline() + " With all rows: " + h
	} else if rows := f.suspectRows(); len(rows) > 0 && s.Sensitivity != nil && s.Sensitivity.RWithoutFlagged.Valid() {
		rw := float64(s.Sensitivity.RWithoutFlagged)
		h += fmt.Sprintf(" %s %s flagged; without %s r = %s", capital(listRows(rows)), plural(len(rows), "is", "are"),
			plural(len(rows), "it", "them"), f.absNumSigned(rw))
		switch out.Rows {
		case "stronger":
			h += fmt.Sprintf(", %s rather than %s: the flagged rows weaken the relationship, they do not make it.",
				strengthWord(f.strengthOf(math.Abs(rw))), strengthWord(out.Strength))
		case "within-interval":
			h += fmt.Sprintf(", which would grade %s, but lies inside r's %s interval: the verdict stands.",
				strengthWord(f.strengthOf(math.Abs(rw))), f.conf)
		default:
			h += " and the verdict stands."
		}
	}
	// A reversal within groups, or a covariate that carries the
	// association, is what a reader must take away: it opens the
	// headline, and the pooled verdict follows it as such.
	if out.Reversal && !out.OutlierDriven {
		h = f.reversalLead() + " Pooled over them: " + h
	} else if out.Reversal {
		h += " " + f.reversalLead()
	}
	if len(out.ExplainedBy) > 0 && !out.OutlierDriven && !out.Reversal {
		h = f.explainedLead(out.ExplainedBy) + " " + plural(len(out.ExplainedBy), "Ignoring it", "Ignoring them") + ": " + h
	} else if len(out.ExplainedBy) > 0 {
		h += " " + f.explainedLead(out.ExplainedBy)
	}
	if way := f.hiddenWay(); way != "" {
		h += fmt.Sprintf(" Within groups of %s, %s %s with %s.", f.groupLabel(), y, way, x)
	}
	if out.Drift {
		h += " The residuals drift in run order."
	}
	if sc := scaleSentence(s); sc != "" {
		h = sc + " " + h
		if lead := f.scaleLead(out); lead != "" {
			h = lead + " " + h
		}
	}
	out.Headline = h

	st := &out.Statements
	add := func(format string, a ...any) { *st = append(*st, fmt.Sprintf(format, a...)) }

	// Correlation and line.
	pText := f.pv(float64(pr.P))
	if f.adj != 1 {
		pText += "; adjusted for the number of studies, " + f.pv(math.Min(1, f.p))
	}
	add("Pearson correlation %s; %s.", rText, pText)
	if l := s.Line; l != nil && l.Slope != nil && l.Intercept != nil {
		ci := "no " + f.conf + " CI (too few rows)"
		if l.Slope.CILow.Valid() && l.Slope.CIHigh.Valid() {
			ci = fmt.Sprintf("%s CI %s to %s", f.conf, num(float64(l.Slope.CILow)), num(float64(l.Slope.CIHigh)))
		}
		avg := ""
		if out.Form == "curved" {
			avg = ", an average over the curve"
		}
		icpt := fmt.Sprintf("at %s = 0 the line gives %s", x, withUnit(float64(l.Intercept.Estimate), f.ySym))
		if d := s.Describe; d != nil && !(float64(d.X.Min) <= 0 && 0 <= float64(d.X.Max)) {
			icpt = fmt.Sprintf("its intercept, %s, is the line's value at %s = 0, which lies outside the observed range: it is not a prediction", withUnit(float64(l.Intercept.Estimate), f.ySym), x)
		}
		add("The least-squares line: %s changes by %s %s (%s%s); %s.",
			y, num(float64(l.Slope.Estimate)), perUnit(f.ySym, f.xSym, x), ci, avg, icpt)
	}
	if m := f.slopeMeaning(); m != "" {
		add("%s", m)
	}
	if s.Spearman != nil && s.Kendall != nil {
		add("Rank correlations, which use only the order of the values: Spearman ρ = %s (%s), Kendall τ-b = %s (%s).",
			corr(float64(s.Spearman.Rho)), f.pv(float64(s.Spearman.P)), corr(float64(s.Kendall.TauB)), f.pv(float64(s.Kendall.P)))
	}

	// Form.
	f.formStatements(out, add)

	// Strength convention.
	grading := fmt.Sprintf("Strength is graded from |r|: strong at %s or more, moderate at %s or more, weak at %s or more, and only where r differs clearly from 0 (p below %s)",
		num(f.th.Strong), num(f.th.Moderate), num(f.th.Weak), num(f.alpha))
	if out.CurveStrength != "" {
		grading += "; the curve's strength by the same cut points from the square root of the quadratic's R²"
	}
	add("%s. These cut points are common practice, not a standard.", grading)

	// Influence and sensitivity.
	f.influenceStatements(out, add)

	// Spread.
	if f.exact {
		order := ""
		if s.Order != "" {
			order = " or in run order"
		}
		add("The line fits these rows to the rounding of the numbers (its residual sum of squares, %s, is at most (16ε)²·Σy², ε = 2⁻⁵², the floor taken for an exact fit): what it leaves is rounding, so no bend, lack of fit, change of scatter, or pattern of the residuals in order of %s%s is read from it.",
			num(float64(s.Line.RSS)), x, order)
	} else if d := s.Diagnostics; d != nil && d.BreuschPagan != nil {
		bp := d.BreuschPagan
		if out.SpreadChanges {
			how, rho := "changes", ""
			switch f.spreadGrows() {
			case 1:
				how = "grows"
			case -1:
				how = "shrinks"
			}
			if how != "changes" {
				rho = fmt.Sprintf("; Spearman ρ of the residuals' size with %s = %s", x, corr(float64(d.SpreadRho)))
			}
			add("The scatter about the line %s with %s (Breusch–Pagan %s%s): the bands, which assume an even scatter, are too narrow in some places and too wide in others.",
				how, x, f.screenP(checkSpread, float64(bp.P)), rho)
			if rb := s.Robust; rb != nil && rb.HC3 != nil && rb.HC3.CILow.Valid() && s.Line != nil && s.Line.Slope != nil {
				add("Allowing for the changing scatter, the slope's %s interval from HC3 standard errors (heteroscedasticity-consistent; normal quantiles) is %s to %s %s, against %s to %s from the ordinary ones.",
					f.conf, num(float64(rb.HC3.CILow)), num(float64(rb.HC3.CIHigh)), perUnit(f.ySym, f.xSym, x),
					num(float64(s.Line.Slope.CILow)), num(float64(s.Line.Slope.CIHigh)))
			}
		} else {
			add("The scatter about the line shows no clear change with %s (Breusch–Pagan %s).", x, f.screenP(checkSpread, float64(bp.P)))
		}
	}

	f.limits(out)
}

// interval writes "95% CI 0.42 to 0.95", or says there is none.
func (f *facts) interval(lo, hi report.Float) string {
	if !lo.Valid() || !hi.Valid() {
		return "no " + f.conf + " CI (too few rows)"
	}
	return fmt.Sprintf("%s CI %s to %s", f.conf, corr(float64(lo)), corr(float64(hi)))
}

func strengthWord(s string) string {
	if s == "none" {
		return "not shown"
	}
	return s
}

func (f *facts) formStatements(out *report.Findings, add func(string, ...any)) {
	s := f.s
	x := f.xLabel
	q := f.quad
	switch out.Form {
	case "curved":
		c, l := corrPair(float64(q.R2), float64(s.Pearson.R2))
		add("A quadratic curve explains R² = %s of the variation against %s for the straight line (x² term %s).", c, l, f.screenP(checkCurvature, f.quadP()))
		if out.TurnsOver {
			first, then := "rises", "falls"
			if *out.Bend == "bends-up" {
				first, then = "falls", "rises"
			}
			add("The curve turns over inside the observed range: %s %s with %s up to about %s and %s beyond it, so it has no single direction.",
				f.yLabel, first, x, withUnit(float64(out.TurnX), f.xSym), then)
		} else if v := float64(q.Vertex); !math.IsNaN(v) && s.Describe != nil {
			add("The curve does not turn over inside the observed range (%s): its fitted turning point, %s = %s, is not reached by the data.",
				span(float64(s.Describe.X.Min), float64(s.Describe.X.Max), f.xSym), x, withUnit(v, f.xSym))
		}
	case "nonlinear":
		if f.dcor != nil {
			add("The distance correlation, which detects dependence of any shape, is %s (%s), against |r| = %s.",
				num(float64(f.dcor.DCor)), f.dcorP(), corr(math.Abs(f.r)))
		}
		if f.dwRoute {
			add("Taken in order of %s, the residuals from the line swing together (Durbin–Watson %s, below %s): %s goes up and down with %s in a way neither the straight line nor the quadratic follows. Look at the scatterplot.",
				x, num(f.dwx), f.dwxBoundText(), f.yLabel, x)
		} else {
			add("Neither the straight line nor the quadratic follows this pattern. Look at the scatterplot.")
		}
	case "linear":
		if below(f.dwx, f.dwxBound) {
			add("Taken in order of %s, the residuals from the line swing together (Durbin–Watson %s, below %s): the line misses some pattern; look at the residual plot.",
				x, num(f.dwx), f.dwxBoundText())
		}
		if q != nil && f.exact {
			// The x² term's p and the two R² read the rounding the line
			// leaves.
			add("The line fits to the rounding of the numbers, so no bend can be told from it: the form is taken as a straight line.")
		} else if q != nil && !math.IsNaN(f.quadP()) {
			c, l := corrPair(float64(q.R2), float64(s.Pearson.R2))
			why := "its x² term is not clear"
			if f.screenAdj[checkCurvature] < f.alpha {
				why = fmt.Sprintf("it removes a share %s of the line's residual sum of squares, less than the %s that would count as a curve (%s)", f.shareText(), num(f.th.CurveShare), OwnChoice)
			}
			add("A quadratic curve gives R² = %s against %s for the straight line (x² term %s): %s, so the form is taken as a straight line.",
				c, l, f.screenP(checkCurvature, f.quadP()), why)
		}
	case "none":
		if f.dcor != nil {
			if float64(f.dcor.P) < f.alpha {
				add("The distance correlation, which detects dependence of any shape, is %s (%s): too small a dependence to call a relationship (the cut point is %s, %s).",
					num(float64(f.dcor.DCor)), f.pv(float64(f.dcor.P)), num(f.th.NonlinearDcor), OwnChoice)
			} else {
				add("The distance correlation, which detects dependence of any shape, finds none either (%s, %s).",
					num(float64(f.dcor.DCor)), f.dcorP())
			}
		}
	}
	if f.lof {
		lf := s.Diagnostics.LackOfFit
		add("Where %s repeats, the means of the repeated settings scatter about the line more than repeat runs scatter about their own mean (lack-of-fit F = %s on %d and %d df, %s): the line summarises the trend but does not pass through every setting's mean.",
			x, num(float64(lf.F)), lf.DF1, lf.DF2, f.screenP(checkLackOfFit, float64(lf.P)))
	}
	if d := s.Diagnostics; d != nil && d.LackOfFit != nil && d.LackOfFit.NoPureError && !f.exact {
		add("Where %s repeats (%d settings), %s takes one value in every repeat, so no scatter among repeats is left to weigh the settings' means against: lack of fit is not tested.",
			x, d.LackOfFit.DF1+2, f.yLabel)
	}
}

// dcorP writes the distance correlation's permutation p with its Monte
// Carlo error and what the sequential rule settled: "p = 0.012 ± 0.003
// from 999 permutations".
func (f *facts) dcorP() string {
	d := f.dcor
	// The Monte Carlo error stays in results.json; the sentence says
	// only when it leaves the side of alpha unsettled.
	t := f.pv(float64(d.P))
	if d.Permutations > 0 && d.MCError.Valid() && !d.Resolved {
		t += fmt.Sprintf(" ± %s from %d reshufflings, too close to alpha to settle", num(float64(d.MCError)), d.Permutations)
	}
	return t
}

func (f *facts) quadP() float64 {
	if f.s.Diagnostics != nil && f.s.Diagnostics.QuadraticP.Valid() {
		return float64(f.s.Diagnostics.QuadraticP)
	}
	if f.quad != nil && len(f.quad.Coefficients) == 3 {
		return float64(f.quad.Coefficients[2].P)
	}
	return math.NaN()
}

// suspectWords names the flags that Suspect counts.
const suspectWords = "outlier, influential or sole support"

// suspectRows returns the names of the rows flagged as outliers,
// influential or of sole support (not those only of high leverage), in the
// order of Influence.Points (largest Cook's D first). A study names only
// such rows; the filter keeps a hand-built or older report honest.
func (f *facts) suspectRows() []string {
	var rows []string
	if f.s.Influence != nil {
		for _, p := range f.s.Influence.Points {
			if Suspect(p.Flags) {
				rows = append(rows, p.Row)
			}
		}
	}
	return rows
}

func (f *facts) drivenHeadline() string {
	rows := f.suspectRows()
	se := f.s.Sensitivity
	switch {
	case f.without == "undefined":
		return fmt.Sprintf("The apparent relationship comes from %s alone: without %s, too little variation is left to compute r.",
			listRows(rows), plural(len(rows), "it", "them"))
	case f.rdir == "none" && f.without != "none":
		return fmt.Sprintf("The flagged %s hide a relationship: without %s, r = %s (%s).",
			listRows(rows), plural(len(rows), "it", "them"), corr(float64(se.RWithoutFlagged)), f.pv(float64(se.PWithoutFlagged)))
	case len(rows) > 0 && f.weaker:
		return fmt.Sprintf("The strength of the relationship rests on %s: without %s, r = %s (%s), only %s.",
			listRows(rows), plural(len(rows), "it", "them"), f.absNumSigned(float64(se.RWithoutFlagged)), f.pv(float64(se.PWithoutFlagged)),
			f.strengthPhrase(f.strengthOf(math.Abs(float64(se.RWithoutFlagged)))))
	case len(rows) > 0 && f.without != f.rdir:
		return fmt.Sprintf("The apparent relationship rests on %s: without %s, r = %s (%s) and no relationship is shown.",
			listRows(rows), plural(len(rows), "it", "them"), corr(float64(se.RWithoutFlagged)), f.pv(float64(se.PWithoutFlagged)))
	default:
		lo, hi := corrPair(float64(se.LooRMin), float64(se.LooRMax))
		return fmt.Sprintf("The direction of the relationship depends on single rows: leaving out one row at a time, r ranges from %s to %s.", lo, hi)
	}
}

func (f *facts) influenceStatements(out *report.Findings, add func(string, ...any)) {
	s := f.s
	if in := s.Influence; in != nil && len(in.Points) > 0 {
		var parts []string
		for i, p := range in.Points {
			if i == 5 {
				break
			}
			parts = append(parts, fmt.Sprintf("row %s at %s = %s, %s = %s: %s", p.Row, f.xLabel, withUnit(float64(p.X), f.xSym),
				f.yLabel, withUnit(float64(p.Y), f.ySym), f.pointWhy(p)))
		}
		if more := in.Counts.Suspect - len(parts); more > 0 {
			parts = append(parts, fmt.Sprintf("and %d more", more))
		}
		add("Flagged: %s.", strings.Join(parts, "; "))
	} else if in != nil && in.Counts.Suspect > 0 {
		add("%s flagged as %s; the report names none (output.named_rows = 0).", plural(in.Counts.Suspect, "One row is", fmt.Sprintf("%d rows are", in.Counts.Suspect)), suspectWords)
	} else if in != nil {
		add("No row is flagged as an outlier, influential or of sole support.")
	}
	if in := s.Influence; in != nil && in.Counts.LeverageOnly > 0 {
		add("%s far out in x but close to the line (high leverage only): good data that extend the observed range, counted and not named.",
			plural(in.Counts.LeverageOnly, "One row lies", fmt.Sprintf("%d rows lie", in.Counts.LeverageOnly)))
	}
	if in := s.Influence; in != nil && in.Counts.Suspect > len(in.Points) && len(in.Points) > 0 {
		listed := "each of them, with all its measures, is listed in"
		if in.FileRows < in.Counts.Suspect {
			listed = fmt.Sprintf("the first %d, with all their measures, are listed in", in.FileRows)
		}
		add("The report names the first %d of the %d rows flagged as %s (%s); %s %s.",
			len(in.Points), in.Counts.Suspect, suspectWords, in.Ranking, listed, in.File)
	}
	if s.Influence != nil && s.N > params+1 {
		add("Flag rules for these %d rows: outlier when the externally studentized residual exceeds %s in size (the larger of %s and the Bonferroni bound); high leverage above %s (%s·2/n); influential when Cook's distance exceeds %s (the %s quantile of F(2, %d)).",
			s.N, num(OutlierBound(s.N, f.th)), num(f.th.OutlierZ), num(f.th.LeverageFactor*params/float64(s.N)), num(f.th.LeverageFactor),
			num(CooksBound(s.N, f.th)), num(f.th.CooksD), s.N-params)
	}
	se := s.Sensitivity
	if se == nil {
		return
	}
	if se.NFlagged > 0 {
		verdict := "the verdict stands"
		if out.Rows == "stronger" {
			verdict = fmt.Sprintf("the direction stands and the strength rises to %s: the flagged rows weaken the relationship, they do not make it (so it is not outlier-driven)",
				strengthWord(f.strengthOf(math.Abs(float64(se.RWithoutFlagged)))))
		}
		if f.without != f.rdir {
			verdict = "the verdict does not stand without " + plural(se.NFlagged, "it", "them")
		} else if f.weaker {
			verdict = "the direction stands, but the strength falls to " + strengthWord(f.strengthOf(math.Abs(float64(se.RWithoutFlagged))))
		} else if f.withinCI {
			verdict = fmt.Sprintf("the verdict stands: r without %s would grade %s, but lies inside the %s of r with all rows (%s to %s), so the change is within r's own uncertainty",
				plural(se.NFlagged, "it", "them"), strengthWord(f.strengthOf(math.Abs(float64(se.RWithoutFlagged)))), f.conf+" CI",
				corr(float64(s.Pearson.CILow)), corr(float64(s.Pearson.CIHigh)))
		}
		if math.IsNaN(float64(se.RWithoutFlagged)) {
			add("Leaving out the %s flagged as %s, r cannot be computed (too little variation is left): %s.",
				plural(se.NFlagged, "row", "rows"), suspectWords, verdict)
		} else {
			scaled := ""
			if f.adj != 1 {
				scaled = fmt.Sprintf(", judged as %s after multiplying by %s, the factor by which the adjustment across studies raised r's p (exact for a fixed factor, only approximate for Holm and Benjamini–Hochberg, whose factor depends on how a p ranks among the studies')",
					f.pv(math.Min(1, f.adj*float64(se.PWithoutFlagged))), num(f.adj))
			}
			add("Leaving out the %s flagged as %s: r = %s (%s, %s%s), slope %s %s; %s.",
				plural(se.NFlagged, "row", "rows"), suspectWords, f.absNumSigned(float64(se.RWithoutFlagged)), f.interval(se.RWithoutLow, se.RWithoutHigh),
				f.pv(float64(se.PWithoutFlagged)), scaled, num(float64(se.SlopeWithoutFlagged)),
				perUnit(f.ySym, f.xSym, f.xLabel), verdict)
		}
	}
	if se.LooRMin.Valid() && se.LooRMax.Valid() {
		without := func(row string) string {
			if row == "" {
				return ""
			}
			return " (without row " + row + ")"
		}
		lo, hi := corrPair(float64(se.LooRMin), float64(se.LooRMax))
		var undefined []string
		for _, w := range se.WithoutEach {
			if !w.R.Valid() {
				undefined = append(undefined, w.Row)
			}
		}
		extra := ""
		if len(undefined) > 0 {
			extra = fmt.Sprintf(" among the rows whose removal leaves r defined; without %s alone, r cannot be computed", listRows(undefined))
		}
		if lo == hi {
			// Alike to 15 decimals (a line exact to rounding): the rows
			// at the two ends are picked by rounding, so none is named.
			add("Leaving out one row at a time, r is %s whichever row is left out%s.", lo, extra)
		} else {
			add("Leaving out one row at a time, r ranges from %s%s to %s%s%s.", lo, without(se.LooRMinRow), hi, without(se.LooRMaxRow), extra)
		}
	}
	if se.ResistantSlope.Valid() && s.Line != nil && s.Line.Slope != nil {
		method := ""
		if s.Diagnostics != nil && s.Diagnostics.Resistant != nil && s.Diagnostics.Resistant.Method != "" {
			method = " by " + strings.Replace(s.Diagnostics.Resistant.Method, "theil-sen", "Theil–Sen", 1)
		}
		rs, ls := numPair(float64(se.ResistantSlope), float64(s.Line.Slope.Estimate))
		add("The resistant slope%s, the median of the slopes between pairs of rows, which a few unusual rows barely move, is %s %s against %s by least squares.",
			method, rs, perUnit(f.ySym, f.xSym, f.xLabel), ls)
	}
}

// pointWhy names a point's flags with the figure behind each.
func (f *facts) pointWhy(p report.Point) string {
	var w []string
	for _, fl := range p.Flags {
		switch fl {
		case FlagOutlier:
			w = append(w, fmt.Sprintf("outlier (studentized residual %s)", num(float64(p.StudentizedExt))))
		case FlagHighLeverage:
			if !slices.Contains(p.Flags, FlagSoleSupport) {
				w = append(w, fmt.Sprintf("high leverage (%s)", num(float64(p.Leverage))))
			}
		case FlagInfluential:
			w = append(w, fmt.Sprintf("influential (Cook's distance %s)", num(float64(p.CooksD))))
		case FlagSoleSupport:
			w = append(w, "sole support (leverage 1: it alone sets the slope)")
		default:
			w = append(w, fl)
		}
	}
	return strings.Join(w, ", ")
}

// limits writes what may not be concluded and what was checked.
func (f *facts) limits(out *report.Findings) {
	s := f.s
	x, y := f.xLabel, f.yLabel
	lim := &out.Limits
	add := func(format string, a ...any) { *lim = append(*lim, fmt.Sprintf(format, a...)) }

	rangeText := ""
	if s.Describe != nil {
		rangeText = " (" + span(float64(s.Describe.X.Min), float64(s.Describe.X.Max), f.xSym) + ")"
	}
	if s.Kind == "agreement" {
		// Two readings of the same items: no cause to read and no x to
		// predict from; what may not be concluded is said of the limits.
		add("The agreement holds for items like these, over the observed range of %s%s; it says nothing of items or readings outside it.", x, rangeText)
		return
	}
	switch f.designName() {
	case RandomizedExperiment:
		add("The runs were randomised: within the tested range of %s%s, the data support a causal reading of the effect of %s on %s.", x, rangeText, x, y)
	case DesignedExperiment:
		add("%s was set by design: within the tested range%s the data support a causal reading of its effect on %s, provided the other factors were held fixed or randomised.", capital(x), rangeText, y)
	default:
		add("These data are observational: they show association, not cause. They do not show that changing %s would change %s.", x, y)
	}
	add("No prediction is supported outside the observed range of %s%s.", x, rangeText)
	var outside []string
	for _, p := range s.Predictions {
		if !p.InRange {
			outside = append(outside, withUnit(float64(p.X), f.xSym))
		}
	}
	if len(outside) > 0 {
		add("The %s at %s = %s %s outside that range and %s not supported by these data.",
			plural(len(outside), "prediction", "predictions"), x, joinAnd(outside), plural(len(outside), "lies", "lie"),
			plural(len(outside), "is", "are"))
	}

	// Lurking variables: covariates.
	if len(s.Partial) == 0 {
		add("No covariates were declared, so no other measured quantity was checked as a lurking variable.")
	}
	for _, pc := range s.Partial {
		cov := pc.Label
		if cov == "" {
			cov = pc.Covariate
		}
		pt := fmt.Sprintf("r = %s (%s, %s)", corr(float64(pc.R)), f.interval(pc.CILow, pc.CIHigh), f.pv(float64(pc.P)))
		switch {
		case slices.Contains(out.ExplainedBy, pc.Covariate):
			add("Holding %s fixed, the correlation of %s and %s is %s: %s may carry the association (a lurking variable).", cov, x, y, pt, cov)
		case f.rdir == "none":
			add("Holding %s fixed, the correlation of %s and %s is %s.", cov, x, y, pt)
		case !(float64(pc.P) < f.alpha):
			add("Holding %s fixed, the correlation of %s and %s is %s: no longer shown, but the interval is too wide to tell whether %s carries the association.", cov, x, y, pt, cov)
		default:
			add("Holding %s fixed, the correlation of %s and %s is %s: the association remains, so it does not come from %s alone (as far as a straight-line adjustment for it can tell).", cov, x, y, pt, cov)
		}
	}

	// Groups.
	switch {
	case s.Group == "":
		add("No grouping variable (lot, machine, shift) was declared, so a relationship that differs between groups was not checked.")
	default:
		f.groupLimit(out, add)
	}

	// What the line leaves, where it fits to rounding: the report shows
	// the limits, not the statements, so the checks it left out and the
	// residual charts it still draws are explained here.
	if f.exact {
		order := ""
		if s.Order != "" {
			order = ", nor drift in run order"
		}
		add("The line fits these rows to the rounding of the numbers, so what it leaves is rounding and nothing is read from it: not whether the line bends, misses repeated settings of %s or has a scatter that changes with %s%s. The distances from the line on the charts are that rounding, not a pattern in the data.", x, x, order)
	}

	// Run order.
	d := s.Diagnostics
	switch {
	case s.Order == "":
		add("No run order was declared, so drift over time, and dependence between rows taken one after another, were not checked: the p-values and intervals in this report assume independent rows.")
	case d == nil:
	case f.exact: // said in the limit above
	case out.Drift:
		add("The residuals drift in run order (by %s; %s): time, or something changing with it, may act on %s besides %s.", f.orderLabel(), f.orderFigures(), y, x)
	default:
		add("Drift in run order is not shown at alpha = %s (by %s; %s)%s.", num(f.alpha), f.orderLabel(), f.orderFigures(), f.driftPartsNote())
	}

	// Independence.
	if s.Order != "" && d != nil && !f.exact {
		f.independence(out, add)
	}

	// Multiplicity of the secondary checks.
	if len(f.screenNames) > 0 {
		add("The checks of %s are screens: their p-values share alpha = %s within this study (Holm's adjustment over its %d %s), but are not adjusted across studies, and the distance correlation and the residuals in order of %s are screened at alpha without adjustment; a flag from any of them calls for a look at the plots, not a conclusion.",
			joinAnd(f.screenNames), num(f.alpha), len(f.screenNames), plural(len(f.screenNames), "check", "checks"), x)
	}
}

// heldFixed is "Holding A fixed", or for several covariates, each of which
// the rule held fixed on its own, "Holding A fixed, or holding B fixed (one
// at a time)".
func (f *facts) heldFixed(names []string) string {
	labels := f.covariateLabels(names)
	if len(labels) == 1 {
		return "Holding " + labels[0] + " fixed"
	}
	parts := make([]string, len(labels))
	for i, l := range labels {
		parts[i] = "holding " + l + " fixed"
	}
	return capital(strings.Join(parts[:len(parts)-1], ", ")+", or "+parts[len(parts)-1]) + " (one at a time)"
}

// covariateLabels returns the labels of the named covariates (from
// Partial), each its name when it has none.
func (f *facts) covariateLabels(names []string) []string {
	out := make([]string, len(names))
	for i, n := range names {
		out[i] = n
		for _, pc := range f.s.Partial {
			if pc.Covariate == n && pc.Label != "" {
				out[i] = pc.Label
			}
		}
	}
	return out
}

// orderLabel names the run-order column for people.
func (f *facts) orderLabel() string {
	if f.s.OrderLabel != "" {
		return f.s.OrderLabel
	}
	return f.s.Order
}

// groupLabel names the group column for people: Study.GroupLabel, else
// the column name.
func (f *facts) groupLabel() string {
	if f.s.GroupLabel != "" {
		return f.s.GroupLabel
	}
	return f.s.Group
}

// strengthPhrase is "a strong relationship", or for a relationship shown
// at alpha whose |r| is below the weak cut point, words that say so.
func (f *facts) strengthPhrase(g string) string {
	if g == "none" {
		return fmt.Sprintf("a relationship too weak to grade (|r| below %s)", num(f.th.Weak))
	}
	return "a " + g + " relationship"
}

// absNumSigned writes a signed r with the digits that put |r| on the right
// side of the strength cut points.
func (f *facts) absNumSigned(r float64) string {
	return corrVs(r, f.th.Strong, f.th.Moderate, f.th.Weak)
}

func (f *facts) designName() string {
	switch f.dsg {
	case RandomizedExperiment, DesignedExperiment:
		return f.dsg
	}
	return Observational
}

func (f *facts) orderFigures() string {
	d := f.s.Diagnostics
	var p []string
	if d.OrderTrend != nil {
		p = append(p, fmt.Sprintf("trend %s", f.pv(float64(d.OrderTrend.P))))
	}
	if dw, dp := f.driftDWP(); !math.IsNaN(dw) {
		if below(dw, f.th.DriftDW) {
			p = append(p, fmt.Sprintf("Durbin–Watson %s, one-sided %s", num(dw), f.pv(dp)))
		} else {
			p = append(p, fmt.Sprintf("Durbin–Watson %s, not below %s, where the rule starts to read it", num(dw), num(f.th.DriftDW)))
		}
	} else if d.DurbinWatson.Valid() {
		p = append(p, fmt.Sprintf("Durbin–Watson %s", num(float64(d.DurbinWatson))))
	}
	t := strings.Join(p, "; ")
	if raw, ok := f.screenRaw[checkDrift]; ok && len(p) == 2 {
		t += fmt.Sprintf("; drift %s (the smaller of the two, doubled)%s", f.pv(raw), f.holmSuffix(checkDrift, raw))
	} else if ok {
		t += f.holmSuffix(checkDrift, raw)
	}
	return t
}

// independence states, with a run order, whether the p-values and
// intervals' assumption of independent rows holds up, and where the
// residuals hang together in run order, the slope's Newey–West interval
// and r with Bartlett's effective sample size.
func (f *facts) independence(out *report.Findings, add func(string, ...any)) {
	s := f.s
	if !out.Autocorrelated {
		add("The p-values and intervals in this report assume independent rows; in run order the residuals do not clearly hang together (figures above).")
		return
	}
	dw, dwp := f.driftDWP()
	t := fmt.Sprintf("The residuals hang together in run order (Durbin–Watson %s, one-sided %s%s), so the p-values and intervals above, which assume independent rows, are too optimistic.",
		num(dw), f.pv(dwp), map[bool]string{true: "; drift is called", false: ""}[out.Drift])
	rb := s.Robust
	if rb != nil && rb.HAC != nil && rb.HAC.CILow.Valid() && s.Line != nil && s.Line.Slope != nil {
		t += fmt.Sprintf(" Allowing for it, the slope's %s interval from Newey–West standard errors (Bartlett kernel, %d %s, floor(4(n/100)^(2/9)); normal quantiles) is %s to %s %s, against %s to %s from the ordinary ones.",
			f.conf, rb.HAC.Lags, plural(rb.HAC.Lags, "lag", "lags"), num(float64(rb.HAC.CILow)), num(float64(rb.HAC.CIHigh)), perUnit(f.ySym, f.xSym, f.xLabel),
			num(float64(s.Line.Slope.CILow)), num(float64(s.Line.Slope.CIHigh)))
	}
	if rb != nil && rb.NEff.Valid() {
		t += fmt.Sprintf(" For r, Bartlett's effective sample size n(1 − ρx·ρe)/(1 + ρx·ρe), from the lag-1 autocorrelations in run order of %s (%s) and of the line's residuals (%s), is %s of %d rows",
			f.xLabel, corr(float64(rb.Rho1X)), corr(float64(rb.Rho1E)), num(float64(rb.NEff)), s.N)
		if rb.RP.Valid() {
			t += fmt.Sprintf(", giving r's %s and %s", f.interval(rb.RLow, rb.RHigh), f.pv(float64(rb.RP)))
		} else {
			t += ", too few for r to be tested"
		}
		t += "."
	}
	add("%s", t)
}

// driftPartsNote says, where drift is not called but one of its two parts
// is below alpha on its own, that the rule's adjusted figure decided and
// that the residuals may still hang together in run order.
func (f *facts) driftPartsNote() string {
	d := f.s.Diagnostics
	var parts []string
	if d.OrderTrend != nil && float64(d.OrderTrend.P) < f.alpha {
		parts = append(parts, "the trend alone")
	}
	if _, p := f.driftDWP(); p < f.alpha {
		parts = append(parts, "the Durbin–Watson statistic alone")
	}
	if len(parts) == 0 {
		return ""
	}
	return fmt.Sprintf(": %s would be below alpha, but the check reads the smaller p of its two parts doubled%s",
		joinAnd(parts), map[bool]string{true: " and adjusted by Holm's method over the study's checks", false: ""}[len(f.screenNames) > 1])
}

// hiddenWay returns "rises" or "falls" when r shows no direction but, of
// two or more groups large enough to compare, most have a slope interval
// on one side of 0 and none on the other (one group of many can do that
// by chance); "" otherwise.
func (f *facts) hiddenWay() string {
	g := f.qualifying()
	if f.rdir != "none" || len(g) < 2 {
		return ""
	}
	up, down := 0, 0
	for _, gf := range g {
		switch {
		case float64(gf.SlopeLow) > 0:
			up++
		case float64(gf.SlopeHigh) < 0:
			down++
		}
	}
	switch {
	case 2*up > len(g) && down == 0:
		return "rises"
	case 2*down > len(g) && up == 0:
		return "falls"
	}
	return ""
}

func (f *facts) groupLimit(out *report.Findings, add func(string, ...any)) {
	switch out.Lines {
	case "untested":
		if gl := f.s.GroupLines; gl != nil && gl.Groups >= 2 && gl.DF2 >= 1 {
			// Levels enough, but the lines within them leave no scatter
			// to test against (stats.GroupLinesFromMoments: F undefined).
			add("The lines within the %d levels of %s that have one leave no scatter about them (each fits its rows exactly), so no F test compares them with one line: compare the levels' lines in the table.", gl.Groups, f.groupLabel())
			break
		}
		add("Fewer than two levels of %s can have a line of their own (at least 3 rows, with x varying), so whether one line serves all of them was not tested.", f.groupLabel())
	case "one-line":
		add("One line serves all levels of %s: a line per level does not fit clearly better (%s; alpha = %s).", f.groupLabel(), f.linesText(), num(f.alpha))
	case "parallel":
		add("The levels of %s are shifted from each other but share a slope: a line per level fits better than one line, but the slopes do not differ clearly (%s; alpha = %s).", f.groupLabel(), f.linesText(), num(f.alpha))
	case "separate":
		add("The slopes differ between the levels of %s, so one line does not serve them all (%s; alpha = %s).", f.groupLabel(), f.linesText(), num(f.alpha))
	}

	g := f.qualifying()
	var parts []string
	for i, gf := range g {
		unit := ""
		if i == 0 {
			unit = " " + perUnit(f.ySym, f.xSym, f.xLabel)
		}
		parts = append(parts, fmt.Sprintf("%s: slope %s%s (%s CI %s to %s, n = %d)", gf.Group, num(float64(gf.Slope)), unit,
			f.conf, num(float64(gf.SlopeLow)), num(float64(gf.SlopeHigh)), gf.N))
	}
	detail := strings.Join(parts, "; ")
	switch {
	case f.hiddenWay() != "":
		add("Within groups of %s, %s %s with %s (%s), though the pooled data show no relationship: differences between the groups hide it.",
			f.groupLabel(), f.yLabel, f.hiddenWay(), f.xLabel, detail)
	case len(g) < 2:
		add("Fewer than two groups of %s have %d rows or more (the smallest size compared, %s) and a line of their own (x varying), so the groups were not compared.", f.groupLabel(), f.th.ReversalMinGroup, OwnChoice)
	case out.Reversal:
		add("Within groups of %s the direction reverses: pooled, %s %s with %s, but %s (%s). The pooled relationship comes from differences between the groups.",
			f.groupLabel(), f.yLabel, map[bool]string{true: "rises", false: "falls"}[f.rdir == "positive"], f.xLabel, f.reversalCount(), detail)
	case f.rdir == "none":
		add("Within each %s a line was fitted (%s); the pooled data show no direction, so there is none to reverse, and most groups do not agree on one.", f.groupLabel(), detail)
	default:
		add("Within each %s the lines were checked for a reversal of direction and none was found (%s).", f.groupLabel(), detail)
	}
}
