package findings

// This file holds the verdicts and sentences of a study's measurement
// parts: the agreement of two methods (an equivalence statement against a
// declared acceptable difference, not a p-value), r and the slope
// corrected for the gauges' measurement error, and the planning of the
// next run.

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"bivar/analysis/report"
	"bivar/analysis/units"
)

// Measurement fills the verdicts, statements and assumptions of s's
// Agreement, ErrorCorrection and Plan (those that are set), at the
// study's alpha.
func Measurement(s *report.Study, alpha float64) {
	if a := s.Agreement; a != nil {
		agreementVerdict(a, s, alpha)
		// An agreement study answers whether the methods agree: its
		// verdict on that, when it has one, is the study's headline (a
		// high r says nothing about it).
		if f := s.Findings; f != nil && a.Verdict != "" && len(a.Statements) > 0 {
			f.Headline = a.Statements[0]
		}
	}
	if e := s.ErrorCorrection; e != nil {
		errorStatements(e, s, alpha)
	}
	if p := s.Plan; p != nil {
		planStatements(p, s)
	}
}

// AgreementVerdict returns the verdict on agreement within ±acceptable:
// report.AgreeWithin when both limits of agreement and their confidence
// intervals lie inside (−acceptable, +acceptable) — the equivalence
// statement that 95 % of the differences fall inside, made with the
// uncertainty of the limits allowed for; report.NotWithin only when the
// interval of a limit lies wholly outside (its near end beyond
// ±acceptable), so that the disagreement is as sure as an agreement would
// have to be; report.Undecided otherwise — an interval reaches across
// ±acceptable, or an interval is undefined (more items would narrow the
// intervals); "" when no acceptable difference is declared or a limit is
// undefined. An end exactly at ±acceptable counts as inside.
func AgreementVerdict(a *report.Agreement) report.AgreementVerdict {
	acc := float64(a.Acceptable)
	if !a.Acceptable.Valid() || !a.Lower.Valid() || !a.Upper.Valid() {
		return ""
	}
	if (a.UpperLow.Valid() && float64(a.UpperLow) > acc) || (a.LowerHigh.Valid() && float64(a.LowerHigh) < -acc) {
		return report.NotWithin
	}
	if !a.LowerLow.Valid() || !a.UpperHigh.Valid() || float64(a.LowerLow) < -acc || float64(a.UpperHigh) > acc {
		return report.Undecided
	}
	return report.AgreeWithin
}

func agreementVerdict(a *report.Agreement, s *report.Study, alpha float64) {
	u := symbol(s.X)
	conf := strconv.FormatFloat(100*(1-alpha), 'f', -1, 64) + "%"
	x, y := label(s.X), label(s.Y)
	a.Verdict = AgreementVerdict(a)
	acc := float64(a.Acceptable)
	lim := func(v float64) string {
		if a.Acceptable.Valid() {
			return numVs(v, acc, -acc)
		}
		return num(v)
	}
	limits := fmt.Sprintf("limits of agreement %s to %s (%s intervals %s to %s and %s to %s)",
		lim(float64(a.Lower)), withUnitText(lim(float64(a.Upper)), u), conf,
		lim(float64(a.LowerLow)), lim(float64(a.LowerHigh)), lim(float64(a.UpperLow)), withUnitText(lim(float64(a.UpperHigh)), u))
	accText := "±" + withUnit(acc, u)
	var st []string
	switch a.Verdict {
	case report.AgreeWithin:
		st = append(st, fmt.Sprintf("%s and %s agree within %s: 95%% of the differences are expected inside the %s, and the intervals of both limits lie inside %s too.",
			capital(x), y, accText, limits, accText))
	case report.NotWithin:
		st = append(st, fmt.Sprintf("%s and %s do not agree within the acceptable %s: of the %s, the interval of %s lies wholly beyond it.",
			capital(x), y, accText, limits, outsideLimit(a)))
	case report.Undecided:
		st = append(st, fmt.Sprintf("Agreement within %s is undecided: of the %s, an interval reaches across %s, so the data show the limits neither inside it nor outside it; more items would narrow the intervals.",
			accText, limits, accText))
	default:
		st = append(st, fmt.Sprintf("The %s; no acceptable difference is declared (agreement.acceptable), so no verdict on agreement is given.", limits))
	}
	st = append(st, fmt.Sprintf("On average %s reads %s than %s (bias %s, %s interval %s to %s, n = %d).",
		y, higherLower(float64(a.Bias), u), x, signed(float64(a.Bias)), conf, num(float64(a.BiasLow)), withUnit(float64(a.BiasHigh), u), a.N))

	// The trend must be significant and material: the change across the
	// observed range of the mean at least a quarter of the acceptable
	// difference, or of the limits' width without one (a choice of this
	// tool).
	change := math.Abs(float64(a.TrendSlope)) * (float64(a.MeanHigh) - float64(a.MeanLow))
	material, of := (float64(a.Upper)-float64(a.Lower))/4, "the width of the limits of agreement"
	if a.Acceptable.Valid() {
		material, of = acc/4, "the acceptable difference "+withUnit(acc, u)
	}
	significant := a.TrendP.Valid() && float64(a.TrendP) < alpha
	a.Trend = significant && change >= material
	rangeText := fmt.Sprintf("%s across the observed range of the mean, %s to %s", withUnit(change, u), num(float64(a.MeanLow)), withUnit(float64(a.MeanHigh), u))
	switch {
	case a.Trend:
		st = append(st, fmt.Sprintf("The difference changes with the magnitude: by %s per unit of the mean (%s interval %s to %s, %s), %s, at least a quarter of %s (the materiality rule is a choice of this tool), so a single bias and pair of limits describe it poorly.",
			signed(float64(a.TrendSlope)), conf, num(float64(a.TrendLow)), num(float64(a.TrendHigh)), pval(float64(a.TrendP)), rangeText, of))
	case significant && !math.IsNaN(change):
		st = append(st, fmt.Sprintf("The difference changes slightly with the magnitude (%s per unit of the mean, %s), but only by %s, less than a quarter of %s (a choice of this tool), so the single bias and limits still describe it.",
			signed(float64(a.TrendSlope)), pval(float64(a.TrendP)), rangeText, of))
	}
	if d := a.Deming; d != nil && d.Slope.Valid() {
		a.ConstantBias = d.InterceptLow.Valid() && (float64(d.InterceptLow) > 0 || float64(d.InterceptHigh) < 0)
		a.ProportionalBias = d.SlopeLow.Valid() && (float64(d.SlopeLow) > 1 || float64(d.SlopeHigh) < 1)
		var bias []string
		if a.ConstantBias {
			bias = append(bias, fmt.Sprintf("a constant bias (intercept %s, %s interval %s to %s, excludes 0)", withUnit(float64(d.Intercept), u), conf, num(float64(d.InterceptLow)), withUnit(float64(d.InterceptHigh), u)))
		}
		if a.ProportionalBias {
			bias = append(bias, fmt.Sprintf("a proportional bias (slope %s, %s interval %s to %s, excludes 1)", num(float64(d.Slope)), conf, num(float64(d.SlopeLow)), num(float64(d.SlopeHigh))))
		}
		if len(bias) > 0 {
			st = append(st, fmt.Sprintf("The Deming line shows %s.", strings.Join(bias, " and ")))
		} else {
			st = append(st, fmt.Sprintf("The Deming line shows neither a constant bias (intercept %s, %s interval %s to %s, includes 0) nor a proportional one (slope %s, interval %s to %s, includes 1).",
				withUnit(float64(d.Intercept), u), conf, num(float64(d.InterceptLow)), withUnit(float64(d.InterceptHigh), u), num(float64(d.Slope)), num(float64(d.SlopeLow)), num(float64(d.SlopeHigh))))
		}
	}
	for _, r := range a.Repeatability {
		who := x
		if r.Method == "y" {
			who = y
		}
		st = append(st, fmt.Sprintf("Repeatability of %s (%d readings per item): within-item SD %s (%s interval %s to %s); two readings of one item differ by less than %s in 95%% of cases.",
			who, r.Readings, withUnit(float64(r.SW), u), conf, num(float64(r.SWLow)), num(float64(r.SWHigh)), withUnit(float64(r.Coef), u)))
	}
	a.Statements = st
	a.Assumptions = []string{
		"The differences are y − x, on the same items; the limits (bias ± 1.96 SD) assume differences of roughly normal distribution with the same spread over the range of the mean (the regression of the difference on the mean checks the latter).",
		"The intervals of the limits are exact for normal differences (quantiles of the noncentral t, as for a tolerance limit; Carkeet 2015), so they are asymmetric about each limit; the Deming intervals are jackknife intervals (Linnet).",
	}
	if d := a.Deming; d != nil {
		note := d.DeltaFrom
		if d.DeltaFrom != "replicates" && a.XReadings != a.YReadings {
			note += fmt.Sprintf(" per single reading, times %d/%d for the means of %d and %d readings", a.XReadings, a.YReadings, a.XReadings, a.YReadings)
		}
		a.Assumptions = append(a.Assumptions, fmt.Sprintf("The Deming line of the items' mean readings takes the ratio of the methods' error variances (y over x) as %s (%s).", num(float64(d.Delta)), note))
	}
	if a.XReadings > 1 || a.YReadings > 1 {
		a.Assumptions = append(a.Assumptions, "With replicates, the figures use each item's mean reading per method; the limits are those of single readings (Bland and Altman 1999, the SD corrected with the within-item variances), and their intervals treat that SD as one of n − 1 degrees of freedom, an approximation.")
	}
}

// outsideLimit names the limit whose interval lies wholly beyond
// ±acceptable ("the upper limit", "the lower limit" or "both limits").
func outsideLimit(a *report.Agreement) string {
	acc := float64(a.Acceptable)
	up := a.UpperLow.Valid() && float64(a.UpperLow) > acc
	low := a.LowerHigh.Valid() && float64(a.LowerHigh) < -acc
	switch {
	case up && low:
		return "each limit"
	case up:
		return "the upper limit"
	default:
		return "the lower limit"
	}
}

// higherLower says "0.4 HRC higher" or "lower".
func higherLower(bias float64, u string) string {
	switch {
	case math.IsNaN(bias):
		return "an undefined amount more or less"
	case bias < 0:
		return withUnit(-bias, u) + " lower"
	}
	return withUnit(bias, u) + " higher"
}

// signed writes v with its sign: "+2.1", "−2.1".
func signed(v float64) string {
	if v > 0 {
		return "+" + num(v)
	}
	return num(v)
}

// withUnitText appends the unit symbol to an already formatted number.
func withUnitText(t, u string) string {
	if u == "" {
		return t
	}
	return t + " " + u
}

// numVs writes v with three significant digits, or more when fewer would
// put the printed value on the other side of (or on) a cut point.
func numVs(v float64, cuts ...float64) string {
	t := num(v)
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return t
	}
	for d := 4; d <= 10; d++ {
		ok := true
		for _, c := range cuts {
			pv, err := strconv.ParseFloat(strings.Replace(t, "−", "-", 1), 64)
			if err != nil || (pv == c) != (v == c) || (pv < c) != (v < c) {
				ok = false
			}
		}
		if ok {
			return t
		}
		t = minus(strconv.FormatFloat(v, 'g', d, 64))
	}
	return t
}

func errorStatements(e *report.ErrorCorrection, s *report.Study, alpha float64) {
	conf := strconv.FormatFloat(100*(1-alpha), 'f', -1, 64) + "%"
	from := func(what, f string, sd report.Float, sym string) string {
		switch f {
		case "declared":
			return fmt.Sprintf("%s's gauge repeatability SD %s (declared)", what, withUnit(float64(sd), sym))
		case "replicates":
			return fmt.Sprintf("%s's gauge repeatability SD %s (from the replicate readings)", what, withUnit(float64(sd), sym))
		}
		return what + " taken as measured without error"
	}
	var st []string
	st = append(st, fmt.Sprintf("Corrected for measurement error (%s; %s): r between the true values is %s (%s interval %s to %s) against the observed %s; reliability of x %s, of y %s.",
		from("x", e.FromX, e.SDErrorX, symbol(s.X)), from("y", e.FromY, e.SDErrorY, symbol(s.Y)),
		corr(float64(e.RCorrected)), conf, corr(float64(e.RCorrectedLow)), corr(float64(e.RCorrectedHigh)), corr(float64(e.R)),
		corr(float64(e.ReliabilityX)), corr(float64(e.ReliabilityY))))
	if e.FromX != "none" {
		st = append(st, fmt.Sprintf("The slope corrected for regression dilution is %s (%s interval %s to %s) against the observed %s; error in y does not bias the slope.",
			num(float64(e.SlopeCorrected)), conf, num(float64(e.SlopeCorrectedLow)), num(float64(e.SlopeCorrectedHigh)), num(float64(e.Slope))))
	} else {
		st = append(st, "The slope needs no correction: x is taken as measured without error, and error in y does not bias the slope.")
	}
	if e.RCorrectedClipped {
		st = append(st, fmt.Sprintf("The corrected r came out at %s, beyond ±1, and is reported as %s, the end of its interval: the declared repeatability SDs are larger than these data allow, or the errors are not independent of the true values.",
			num(float64(e.RUnclipped)), corr(float64(e.RCorrected))))
	}
	if !e.RCorrected.Valid() {
		st = append(st, "The corrected r is undefined: a declared repeatability SD is as large as the observed spread of its variable.")
	}
	e.Statements = st
	e.Assumptions = []string{
		"Classical errors: each reading is the true value plus an error of constant SD, independent of the true value and of the other variable's error (Spearman's correction for attenuation; the regression-dilution correction divides the slope by x's reliability).",
		"The repeatability SDs are taken as known: r's interval is the raw Fisher-z interval divided by the same factor, and the corrected slope's interval uses Fuller's (1987) variance, which allows for x's measurement error; neither includes the uncertainty of the SDs themselves, so both are too narrow when the SDs come from a small repeatability study.",
	}
}

func planStatements(p *report.Plan, s *report.Study) {
	conf := strconv.FormatFloat(100*(1-float64(p.Alpha)), 'f', -1, 64) + "%"
	need := func(n int) string {
		if n <= 0 {
			return "an undefined number of rows"
		}
		return fmt.Sprintf("%d %s", n, plural(n, "row", "rows"))
	}
	if p.LimitsHalfWidthFrom != "" {
		p.Statements = planAgreementStatements(p, s, conf, need)
		return
	}
	var st []string
	hw := "the target ±" + corr(float64(p.RHalfWidth))
	if p.RHalfWidthFrom == "default" {
		hw += " (the default; set plan.r_half_width)"
	}
	if p.NForR > 0 && p.NForR <= p.N {
		st = append(st, fmt.Sprintf("r's %s interval, ±%s with n = %d, already meets %s (%s would do, if r stays near %s).",
			conf, corr(float64(p.RHalfWidthNow)), p.N, hw, need(p.NForR), corr(float64(s.Pearson.R))))
	} else {
		st = append(st, fmt.Sprintf("For r's %s interval to narrow from ±%s (n = %d) to %s, the next run needs %s, if r stays near %s.",
			conf, corr(float64(p.RHalfWidthNow)), p.N, hw, need(p.NForR), corr(float64(s.Pearson.R))))
	}
	if p.SlopeHalfWidth.Valid() {
		su := planSlopeUnit(s)
		if !strings.HasPrefix(su, "(") {
			su = "(" + su + ")"
		}
		tgt := "±" + num(float64(p.SlopeHalfWidth))
		if p.SlopeHalfWidthFrom == "default" {
			tgt += " (half the present; set plan.slope_half_width)"
		}
		st = append(st, fmt.Sprintf("For the slope's %s interval %s to narrow from ±%s to %s, a run needs %s, with the same scatter about the line and the same spread of x.",
			conf, su, num(float64(p.SlopeHalfWidthNow)), tgt, need(p.NForSlope)))
	}
	what := "the observed |r| = " + corr(float64(p.DetectR))
	if p.DetectRFrom == "declared" {
		what = "|r| = " + corr(float64(p.DetectR)) + " (plan.smallest_r)"
	}
	detect := fmt.Sprintf("To detect %s with power %s by the two-sided test at alpha %s (Fisher z), a run needs %s",
		what, num(float64(p.Power)), num(float64(p.Alpha)), need(p.NForPower))
	if p.PowerNow.Valid() {
		// Only for a declared r: at the observed r it would restate p.
		detect += fmt.Sprintf("; this run's %d rows give power %s", p.N, corr(float64(p.PowerNow)))
	}
	st = append(st, detect+".")
	p.Statements = st
}

// planSlopeUnit is the unit of the slope for the plan: y's unit per x's,
// or on a transformed scale the scaled names, which carry no unit ("log
// income per unit of log₁₀ size").
func planSlopeUnit(s *report.Study) string {
	if s.X.Scale == "" && s.Y.Scale == "" {
		return perUnit(symbol(s.Y), symbol(s.X), label(s.X))
	}
	xu := unitOf(symbol(s.X), label(s.X))
	if s.X.Scale != "" {
		xu = "unit of " + scaledName(s.X.Scale, label(s.X))
	}
	yu := symbol(s.Y)
	if s.Y.Scale != "" || yu == "" {
		yu = scaledName(s.Y.Scale, label(s.Y))
	}
	return "(" + yu + " per " + xu + ")"
}

// planAgreementStatements words the plan of an agreement study: the items
// for the limits' intervals to reach the target, and why r and power are
// not planned.
func planAgreementStatements(p *report.Plan, s *report.Study, conf string, need func(int) string) []string {
	u := symbol(s.X)
	tgt := "±" + withUnit(float64(p.LimitsHalfWidth), u)
	if p.LimitsHalfWidthFrom == "default" {
		tgt += " (half the present; set plan.limits_half_width)"
	}
	return []string{
		fmt.Sprintf("For the %s intervals of the limits of agreement to narrow from about ±%s (n = %d) to %s, the next run needs %s, if the SD of the differences stays near %s (exact intervals, noncentral t).",
			conf, withUnit(float64(p.LimitsHalfWidthNow), u), p.N, tgt, strings.Replace(need(p.NForLimits), "row", "item", 1), withUnit(float64(s.Agreement.SD), u)),
		"No plan for r or for the power to detect a correlation is given: two methods measuring the same items are correlated by design, so a test of ρ = 0 says nothing about their agreement (plan.r_half_width, plan.slope_half_width, plan.smallest_r and plan.power are not used here).",
	}
}

// AgreeExpectation evaluates expect.agree on the finished study: want =
// true holds when the verdict is report.AgreeWithin; want = false holds
// when it is not (the methods are expected to differ).
func AgreeExpectation(s *report.Study, want bool) report.Expectation {
	e := report.Expectation{Name: "agree", Want: strconv.FormatBool(want), Title: "the two methods agree within the acceptable difference"}
	a := s.Agreement
	sym := s.X.Symbol
	if a != nil && a.Unit != "" {
		sym = units.Symbol(a.Unit)
	}
	if a != nil && a.Acceptable.Valid() {
		e.Title = "the two methods agree within ±" + withUnit(float64(a.Acceptable), sym)
		if !want {
			e.Title = "the two methods are not shown to agree within ±" + withUnit(float64(a.Acceptable), sym)
		}
	}
	switch {
	case s.Error != nil:
		e.Got, e.Detail = "not computed", "the study did not run: "+*s.Error
		return e
	case a == nil:
		e.Got, e.Detail = "not computed", "the study has no agreement figures"
		return e
	}
	verdict := a.Verdict.Words()
	if a.Verdict == report.AgreeWithin || a.Verdict == report.NotWithin {
		verdict = "they " + verdict
	}
	u := sym
	e.Got = verdict
	if a.Lower.Valid() && a.Upper.Valid() {
		e.Got = fmt.Sprintf("%s: limits %s to %s, their intervals reaching %s to %s", verdict, num(float64(a.Lower)), num(float64(a.Upper)),
			num(float64(a.LowerLow)), withUnit(float64(a.UpperHigh), u))
	}
	if want {
		e.Want = "both limits of agreement, with their intervals, inside the acceptable difference"
	} else {
		e.Want = "not both limits of agreement, with their intervals, inside the acceptable difference"
	}
	e.OK = (a.Verdict == report.AgreeWithin) == want
	if len(a.Statements) > 0 {
		e.Detail = a.Statements[0]
	}
	return e
}
