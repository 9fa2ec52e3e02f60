package findings

// This file holds the reasons for the three verdicts: one sentence each,
// naming the rule that decided the verdict and the figures it read, so a
// reader (and every renderer) states the reason the rule gave, not one of
// its own.

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"bivar/analysis/report"
)

// why sets out.FormWhy, out.DirectionWhy and out.StrengthWhy. It follows
// the branches of decide exactly; each sentence starts with the verdict.
func (f *facts) why(out *report.Findings) {
	out.FormWhy = f.formWhy(out)
	out.DirectionWhy = f.directionWhy(out)
	out.StrengthWhy = f.strengthWhy(out)
	out.Reasons = f.reasons(out)
}

// reasons writes, for each secondary verdict that is raised, the rule that
// raised it with its figures (report.Reason).
func (f *facts) reasons(out *report.Findings) []report.Reason {
	rs := []report.Reason{}
	add := func(verdict, topic, why string) {
		rs = append(rs, report.Reason{Verdict: verdict, Topic: topic, Why: why})
	}
	s := f.s
	if out.OutlierDriven {
		h := f.drivenHeadline()
		add("outlier_driven", "Influence", "Outlier-driven: "+strings.ToLower(h[:1])+h[1:])
	}
	if out.Reversal {
		add("reversal", "Groups", fmt.Sprintf("Reversal: pooled, r = %s; within groups of %s (at least %d rows, %s), %s.",
			f.rNum(), f.groupLabel(), f.th.ReversalMinGroup, OwnChoice, f.reversalCount()))
	}
	switch out.Lines {
	case "parallel":
		add("groups_differ", "Groups", fmt.Sprintf("Parallel lines: the levels of %s are shifted but share a slope (%s; alpha = %s).", f.groupLabel(), f.linesText(), f.alphaText()))
	case "separate":
		add("groups_differ", "Groups", fmt.Sprintf("Separate lines: the slopes differ between the levels of %s (%s; alpha = %s).", f.groupLabel(), f.linesText(), f.alphaText()))
	}
	if len(out.ExplainedBy) > 0 {
		var parts []string
		for _, pc := range s.Partial {
			if !slices.Contains(out.ExplainedBy, pc.Covariate) {
				continue
			}
			why := "its sign differs from r's"
			if sign(float64(pc.R)) == sign(f.r) {
				why = fmt.Sprintf("%s is not below %s, and its interval excludes r = %s", f.pv(float64(pc.P)), f.alphaText(), f.rNum())
			}
			parts = append(parts, fmt.Sprintf("holding %s fixed, partial r = %s (%s, %s): %s",
				f.covariateLabels([]string{pc.Covariate})[0], corr(float64(pc.R)), f.interval(pc.CILow, pc.CIHigh), f.pv(float64(pc.P)), why))
		}
		each := ""
		if len(parts) > 1 {
			each = " (each partial correlation holds one covariate fixed)"
		}
		add("explained_by", "Covariates", "Explained by "+joinAnd(f.covariateLabels(out.ExplainedBy))+": "+strings.Join(parts, "; ")+each+".")
	}
	if out.Drift {
		add("drift", "Run order", fmt.Sprintf("Drift: the residuals drift in run order (by %s; %s), below alpha = %s.", f.orderLabel(), f.orderFigures(), f.alphaText()))
	}
	if out.SpreadChanges && s.Diagnostics != nil && s.Diagnostics.BreuschPagan != nil {
		add("spread_changes", "Spread", fmt.Sprintf("Spread changes: Breusch–Pagan %s, below alpha = %s: the scatter about the line changes with %s.",
			f.screenP(checkSpread, float64(s.Diagnostics.BreuschPagan.P)), f.alphaText(), f.xLabel))
	}
	return rs
}

// rShown is "r = 0.83 (95% CI 0.76 to 0.88) with p = 0.004", with the p
// the verdict reads: adjusted for the number of studies where the manifest
// adjusts.
func (f *facts) rShown() string {
	pr := f.s.Pearson
	return fmt.Sprintf("r = %s (%s) with %s", f.rNum(), f.interval(pr.CILow, pr.CIHigh), f.pBoth())
}

// pBoth is the p the verdicts read: "p = 0.004", or "adjusted p = 0.012
// (unadjusted p = 0.004)" where the adjustment changed it, or "p < 0.001,
// adjusted or not" where the two print alike.
func (f *facts) pBoth() string {
	if f.adj != 1 {
		adj, raw := f.pv(math.Min(1, f.p)), f.pv(float64(f.s.Pearson.P))
		if adj == raw { // e.g. both "p < 0.001": one figure says it
			return adj + ", adjusted or not"
		}
		return fmt.Sprintf("adjusted %s (unadjusted %s)", adj, raw)
	}
	return f.pv(float64(f.s.Pearson.P))
}

// sharePct writes the share of the line's residual sum of squares that
// the quadratic removes as a percentage, "31%", with digits enough to
// stay on the right side of CurveShare.
func (f *facts) sharePct() string {
	return pctVs(f.share, f.th.CurveShare)
}

// shareText writes the share of the line's residual sum of squares that
// the quadratic removes, "0.31", with digits enough to stay on the right
// side of CurveShare.
func (f *facts) shareText() string {
	return corrVs(f.share, f.th.CurveShare)
}

// alphaText is "0.05".
func (f *facts) alphaText() string { return num(f.alpha) }

func (f *facts) directionWhy(out *report.Findings) string {
	switch {
	case math.IsNaN(f.r):
		return "None: r cannot be computed from these data."
	case out.TurnsOver:
		first, then := "rises", "falls"
		if out.Bend != nil && *out.Bend == "bends-up" {
			first, then = "falls", "rises"
		}
		w := fmt.Sprintf("None: the curve turns over inside the observed range, so %s has no single direction: it %s with %s up to about %s and %s beyond it.",
			f.yLabel, first, f.xLabel, withUnit(float64(out.TurnX), f.xSym), then)
		if f.linSig {
			w += fmt.Sprintf(" The straight line's %s averages over both sides of the turn and describes neither.", f.rShown())
		}
		return w
	case !f.linSig:
		w := fmt.Sprintf("None shown: %s; r does not differ clearly from 0, which needs p below %s", f.rShown(), f.alphaText())
		if lo, hi := float64(f.s.Pearson.CILow), float64(f.s.Pearson.CIHigh); lo > 0 || hi < 0 {
			if f.adj != 1 {
				w += " (the interval is not adjusted for the number of studies, so it can exclude 0 when the adjusted p does not)"
			} else {
				w += " (the interval, from Fisher's approximation, just excludes 0; the t-test of r rules)"
			}
		}
		return w + "."
	case f.dir == "positive":
		return fmt.Sprintf("Positive: %s, below %s: %s tends to be higher where %s is higher.", f.rShown(), f.alphaText(), f.yLabel, f.xLabel)
	default:
		return fmt.Sprintf("Negative: %s, below %s: %s tends to be lower where %s is higher.", f.rShown(), f.alphaText(), f.yLabel, f.xLabel)
	}
}

// gradeText says where a value lies among the cut points: "at or above
// 0.7", "at or above 0.4 and below 0.7", "below 0.1".
func (f *facts) gradeText(g string) string {
	th := f.th
	switch g {
	case "strong":
		return "at or above " + num(th.Strong)
	case "moderate":
		return fmt.Sprintf("at or above %s and below %s", num(th.Moderate), num(th.Strong))
	case "weak":
		return fmt.Sprintf("at or above %s and below %s", num(th.Weak), num(th.Moderate))
	}
	return "below " + num(th.Weak)
}

func (f *facts) strengthWhy(out *report.Findings) string {
	var w string
	a := math.Abs(f.r)
	switch {
	case math.IsNaN(f.r):
		w = "None: r cannot be computed from these data."
	case !f.linSig:
		w = fmt.Sprintf("None: strength is graded only where r differs clearly from 0 (p below %s), and here it does not (%s).", f.alphaText(), f.pBoth())
	default:
		w = fmt.Sprintf("%s: |r| = %s, %s.", capital(out.Strength), f.absNum(a), f.gradeText(out.Strength))
	}
	if out.CurveStrength != "" && f.quad != nil {
		r2 := math.Max(0, float64(f.quad.R2))
		w += fmt.Sprintf(" As a curve: %s, from the quadratic's R² = %s, whose square root %s is %s.",
			out.CurveStrength, corr(r2), corrVs(math.Sqrt(r2), f.th.Strong, f.th.Moderate, f.th.Weak), f.gradeText(out.CurveStrength))
	}
	// The cut points and that they are common practice, not a standard,
	// are stated once with the rules (report.ManifestInfo.Rules).
	return w
}

func (f *facts) formWhy(out *report.Findings) string {
	s := f.s
	lineR2 := float64(s.Pearson.R2)
	switch out.Form {
	case "curved":
		q := f.quad
		l, c := corrPair(lineR2, float64(q.R2))
		w := fmt.Sprintf("Curved: a parabola fits clearly better than the line (x² term %s; the parabola as a whole, F test %s): R² %s for the line, %s for the parabola, which leaves %s less squared scatter (residual sum of squares), at least the %s required (%s).",
			f.screenP(checkCurvature, f.quadP()), f.pv(float64(q.FP)), l, c, f.sharePct(), pctText(f.th.CurveShare), OwnChoice)
		bend := "up (the x² coefficient is positive)"
		if f.b2 < 0 {
			bend = "down (the x² coefficient is negative)"
		}
		w += " It bends " + bend
		v := float64(q.Vertex)
		rng := ""
		if s.Describe != nil {
			rng = span(float64(s.Describe.X.Min), float64(s.Describe.X.Max), f.xSym)
		}
		switch {
		case out.TurnsOver:
			w += fmt.Sprintf(" and turns over at about %s = %s, inside the observed range (%s), where the smooth (LOWESS) curve turns back too.",
				f.xLabel, withUnit(v, f.xSym), rng)
		case f.noTurn == "outside":
			w += fmt.Sprintf("; its turning point, %s = %s, lies outside the observed range (%s).", f.xLabel, withUnit(v, f.xSym), rng)
		case f.noTurn == "slight":
			w += fmt.Sprintf("; its turning point, %s = %s, lies inside the range but so near one end that the curve changes there by less than its residual SE (%s): it is not counted as turning over.",
				f.xLabel, withUnit(v, f.xSym), withUnit(float64(q.ResidualSE), f.ySym))
		case f.noTurn == "smooth":
			w += fmt.Sprintf("; its turning point, %s = %s, lies inside the range, but the smooth (LOWESS) curve does not turn back: it levels off, so it is not counted as turning over.",
				f.xLabel, withUnit(v, f.xSym))
		default:
			w += "."
		}
		return w
	case "nonlinear":
		var parts []string
		if f.dcorRoute {
			parts = append(parts, fmt.Sprintf("the distance correlation, which detects dependence of any shape, is %s (%s), at least %s (%s) and above |r| = %s, while r itself does not differ clearly from 0 (%s)",
				num(float64(f.dcor.DCor)), f.dcorP(), num(f.th.NonlinearDcor), OwnChoice, corr(math.Abs(f.r)), f.pBoth()))
		}
		if f.dwRoute {
			parts = append(parts, fmt.Sprintf("taken in order of %s, the line's residuals swing together (Durbin–Watson %s, below %s) while |r| = %s is below %s",
				f.xLabel, num(f.dwx), f.dwxBoundText(), f.absNum(math.Abs(f.r)), num(f.th.Moderate)))
		}
		return "Nonlinear: " + joinAnd(parts) + "; neither the line nor the quadratic describes the pattern."
	case "linear":
		w := fmt.Sprintf("Linear: r differs clearly from 0 (%s) and the quadratic does not qualify as a curve", f.pBoth())
		if f.quad == nil {
			w += " (no quadratic could be fitted: too few rows or distinct values of x)"
		}
		if q := f.quad; q != nil && q.R2.Valid() && f.exact {
			// The line exact to rounding (analysis.compareFits): the x²
			// term's t and p read that rounding, so neither is given.
			w += " (the line fits to the rounding of the numbers, so no bend can be told from it)"
		} else if q != nil && q.R2.Valid() {
			l, c := corrPair(lineR2, float64(q.R2))
			// What a curve needs is stated once with the rules.
			w += fmt.Sprintf(" (x² term %s; R² %s for the line, %s for the parabola: %s less squared scatter, %s needed)",
				f.screenP(checkCurvature, f.quadP()), l, c, f.sharePct(), pctText(f.th.CurveShare))
		}
		if below(f.dwx, f.dwxBound) {
			w += fmt.Sprintf(". The residuals in order of %s swing together (Durbin–Watson %s, below %s), but with |r| = %s at or above %s that does not overturn the line; look at the residual plot",
				f.xLabel, num(f.dwx), f.dwxBoundText(), f.absNum(math.Abs(f.r)), num(f.th.Moderate))
		}
		return w + "."
	}
	w := fmt.Sprintf("None: r does not differ clearly from 0 (%s)", f.pBoth())
	if f.dcor != nil && f.dcor.DCor.Valid() {
		d := float64(f.dcor.DCor)
		switch {
		case !(float64(f.dcor.P) < f.alpha):
			w += fmt.Sprintf("; the distance correlation finds no dependence of any shape (%s, %s)", num(d), f.dcorP())
		case below(d, f.th.NonlinearDcor):
			w += fmt.Sprintf("; the distance correlation, %s (%s), is below the cut point %s (%s)", num(d), f.pv(float64(f.dcor.P)), num(f.th.NonlinearDcor), OwnChoice)
		default:
			w += fmt.Sprintf("; the distance correlation, %s (%s), is not above |r|", num(d), f.pv(float64(f.dcor.P)))
		}
	}
	switch {
	case math.IsNaN(f.dwx):
	case below(f.dwx, f.dwxBound):
		w += fmt.Sprintf("; the residuals in order of %s swing together (Durbin–Watson %s, below %s), but with |r| = %s at or above %s that rule does not apply",
			f.xLabel, num(f.dwx), f.dwxBoundText(), f.absNum(math.Abs(f.r)), num(f.th.Moderate))
	default:
		w += fmt.Sprintf("; the residuals in order of %s do not swing together (Durbin–Watson %s, not below %s)", f.xLabel, num(f.dwx), f.dwxBoundText())
	}
	if f.quad != nil && !math.IsNaN(f.quadP()) && !f.curved {
		w += fmt.Sprintf("; no curve qualifies (x² term %s)", f.screenP(checkCurvature, f.quadP()))
	}
	return w + "."
}
