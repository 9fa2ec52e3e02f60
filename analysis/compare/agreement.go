package compare

// This file compares an agreement study's bias and limits of agreement
// between two runs.

import (
	"fmt"
	"math"

	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// Tests of the agreement changes, written into Tests.
const (
	BiasTest   = "difference of two independent mean differences, Welch t with Welch–Satterthwaite df, two-sided"
	SpreadTest = "ratio of the variances of the differences, F with (n_new−1, n_old−1) df, two-sided"
)

// AgreementChange compares the bias and the limits of agreement of an
// agreement study between the runs (both runs must have the figures).
//
// Change in bias: Welch's t for two independent means (Welch 1947,
// Biometrika 34:28–35), with each run's standard error of the bias,
// t = (bias_new − bias_old)/√(SE_old² + SE_new²) and the Welch–
// Satterthwaite degrees of freedom. Change in the limits: the limits move
// with the bias and with the SD of the differences; the SD's change is
// tested by the F ratio of the variances with (n_new − 1, n_old − 1) df
// (exact for normal differences of single readings; approximate with
// replicates, whose SD combines the within-item variances). Both p-values
// join the diff's family of change tests and are adjusted with them.
type AgreementChange struct {
	OldBias       report.Float `json:"old_bias"`
	NewBias       report.Float `json:"new_bias"`
	DeltaBias     report.Float `json:"delta_bias"` // new − old
	BiasSE        report.Float `json:"bias_se"`    // of the difference
	BiasDF        report.Float `json:"bias_df"`
	BiasP         report.Float `json:"bias_p"`
	BiasPAdj      report.Float `json:"bias_p_adjusted"`
	OldSD         report.Float `json:"old_sd"`
	NewSD         report.Float `json:"new_sd"`
	VarianceRatio report.Float `json:"variance_ratio"` // (new SD / old SD)²
	SDP           report.Float `json:"sd_p"`
	SDPAdj        report.Float `json:"sd_p_adjusted"`
	OldLower      report.Float `json:"old_lower"`
	NewLower      report.Float `json:"new_lower"`
	OldUpper      report.Float `json:"old_upper"`
	NewUpper      report.Float `json:"new_upper"`
	Unit          string       `json:"unit"` // the methods' unit symbol
	// Acceptable is the new run's acceptable difference ±Acceptable (NaN
	// when none is declared); OldVerdict and NewVerdict the agreement
	// verdicts against it, and NewLowerLow and NewUpperHigh the outer ends
	// of the new limits' intervals, which the verdict reads.
	Acceptable   report.Float `json:"acceptable"`
	OldVerdict   string       `json:"old_verdict"`
	NewVerdict   string       `json:"new_verdict"`
	NewLowerLow  report.Float `json:"new_lower_low"`
	NewUpperHigh report.Float `json:"new_upper_high"`
}

// compareAgreement compares prev and cur's agreement figures, or returns
// nil when either run has none (or the study did not run there).
func compareAgreement(prev, cur *report.Study) *AgreementChange {
	o, n := prev.Agreement, cur.Agreement
	if o == nil || n == nil || prev.Error != nil || cur.Error != nil {
		return nil
	}
	nan := report.NaN()
	c := &AgreementChange{OldBias: o.Bias, NewBias: n.Bias, DeltaBias: n.Bias - o.Bias, BiasSE: nan, BiasDF: nan, BiasP: nan,
		BiasPAdj: nan, OldSD: o.SD, NewSD: n.SD, VarianceRatio: nan, SDP: nan, SDPAdj: nan,
		OldLower: o.Lower, NewLower: n.Lower, OldUpper: o.Upper, NewUpper: n.Upper, Unit: symbol(cur.X),
		Acceptable: n.Acceptable, OldVerdict: string(o.Verdict), NewVerdict: string(n.Verdict), NewLowerLow: n.LowerLow, NewUpperHigh: n.UpperHigh}
	t, df, p := WelchT(float64(o.Bias), float64(o.BiasSE), o.N, float64(n.Bias), float64(n.BiasSE), n.N)
	if !math.IsNaN(p) {
		c.BiasSE = report.Float(float64(c.DeltaBias) / t)
		if t == 0 {
			c.BiasSE = report.Float(math.Hypot(float64(o.BiasSE), float64(n.BiasSE)))
		}
		c.BiasDF, c.BiasP = report.Float(df), report.Float(p)
	}
	if o.N > 1 && n.N > 1 && o.SD > 0 && n.SD.Valid() && o.SD.Valid() {
		f := float64(n.SD*n.SD) / float64(o.SD*o.SD)
		upper := stats.UpperF(f, float64(n.N-1), float64(o.N-1))
		c.VarianceRatio = report.Float(f)
		c.SDP = report.Float(math.Min(1, 2*math.Min(upper, 1-upper)))
	}
	return c
}

// WelchT is Welch's t test for the difference of two independent means m2
// − m1 with standard errors se1, se2 from n1 and n2 values: t, the
// Welch–Satterthwaite df (se1² + se2²)² / (se1⁴/(n1−1) + se2⁴/(n2−1)) and
// the two-sided p. NaN when a run has fewer than 2 values or both
// standard errors are zero or undefined.
func WelchT(m1, se1 float64, n1 int, m2, se2 float64, n2 int) (t, df, p float64) {
	nan := math.NaN()
	v1, v2 := se1*se1, se2*se2
	if n1 < 2 || n2 < 2 || !(v1+v2 > 0) || math.IsInf(v1+v2, 0) || math.IsNaN(m1+m2) {
		return nan, nan, nan
	}
	t = (m2 - m1) / math.Sqrt(v1+v2)
	df = (v1 + v2) * (v1 + v2) / (v1*v1/float64(n1-1) + v2*v2/float64(n2-1))
	return t, df, stats.TwoSidedT(t, df)
}

// agreementVerdict is the change of the agreement verdict, if any.
func agreementVerdict(prev, cur *report.Study) []VerdictChange {
	if prev.Agreement == nil || cur.Agreement == nil || prev.Agreement.Verdict == cur.Agreement.Verdict {
		return nil
	}
	return []VerdictChange{{"agreement", string(prev.Agreement.Verdict), string(cur.Agreement.Verdict)}}
}

// agreementStatement says how the bias and the limits changed, when the
// change in either is beyond chance after adjustment; "" otherwise.
func agreementStatement(a *AgreementChange, alpha float64) string {
	if a == nil {
		return ""
	}
	biasSig := a.BiasPAdj.Valid() && float64(a.BiasPAdj) < alpha
	sdSig := a.SDPAdj.Valid() && float64(a.SDPAdj) < alpha
	u := unitSuffix(a.Unit)
	// Against the acceptable difference first: that is the gate.
	var gate string
	if a.Acceptable.Valid() && a.NewVerdict != "" && a.OldVerdict != "" && a.NewVerdict != a.OldVerdict {
		gate = fmt.Sprintf("Against the acceptable ±%s%s the methods went from %q to %q: the limits of agreement moved from %s and %s%s to %s and %s%s, and their intervals now reach %s to %s%s.",
			g4(a.Acceptable), u, report.AgreementVerdict(a.OldVerdict).Words(), report.AgreementVerdict(a.NewVerdict).Words(), g4(a.OldLower), g4(a.OldUpper), u, g4(a.NewLower), g4(a.NewUpper), u,
			g4(a.NewLowerLow), g4(a.NewUpperHigh), u)
	}
	if !biasSig && !sdSig {
		return gate
	}
	s := fmt.Sprintf("The limits of agreement moved from %s and %s%s to %s and %s%s", g4(a.OldLower), g4(a.OldUpper), u, g4(a.NewLower), g4(a.NewUpper), u)
	if gate != "" {
		s = gate + " The change in the limits is beyond chance"
	}
	var why []string
	if biasSig {
		why = append(why, fmt.Sprintf("the bias changed beyond chance from %s to %s%s (Welch t = %s, adjusted p %s)", g4(a.OldBias), g4(a.NewBias), u, fix(report.Float(float64(a.DeltaBias)/float64(a.BiasSE))), pText(a.BiasPAdj, alpha)))
	}
	if sdSig {
		why = append(why, fmt.Sprintf("the SD of the differences changed beyond chance from %s to %s%s (F = %s, adjusted p %s)", g4(a.OldSD), g4(a.NewSD), u, fix(a.VarianceRatio), pText(a.SDPAdj, alpha)))
	}
	s += ": " + why[0]
	if len(why) > 1 {
		s += "; " + why[1]
	}
	return s + "."
}
