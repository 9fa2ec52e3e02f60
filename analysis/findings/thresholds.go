package findings

// This file holds the table of cut points the verdicts use and the
// per-point flags of the straight line's influence measures.

import (
	"fmt"
	"math"

	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// DefaultThresholds returns every cut point the findings use. None of them
// is a standard. Some are common practice or come from the literature
// (Strong, Moderate, Weak, LeverageFactor, OutlierZ, CooksD, DriftDW, each
// with its source below); the others (CurveShare, NonlinearDcor,
// ReversalMinGroup, FormDW) are this project's own choices, and the
// sentences that print them say so (OwnChoice). A manifest may override
// any of them in its [thresholds] table.
//
//   - Strong 0.7, Moderate 0.4, Weak 0.1: |r| at or above Strong is
//     "strong", at or above Moderate "moderate", at or above Weak "weak",
//     below Weak "none". Common practice in engineering and the social
//     sciences (cut points of 0.7 and 0.4 are widely taught); they are
//     conventions, not a standard, and the report says so. A relationship
//     whose interval for r includes 0 is "none" whatever |r| is.
//   - LeverageFactor 3: high leverage when h > 3·p/n with p = 2 for the
//     line. Hoaglin & Welsch (1978, "The hat matrix in regression and
//     ANOVA", Am. Stat. 32(1):17–22) proposed 2p/n; but the end points of
//     an evenly spread x have leverage close to 4/n = 2p/n, so that rule
//     flags them at random. 3p/n, also in common use, flags only x values
//     well away from the rest.
//   - OutlierZ 3 and OutlierFamilyAlpha 0.05: an outlier is a row whose
//     externally studentized residual exceeds 3 in size and also exceeds
//     the Bonferroni bound t(1 − a/(2n), n − 3) for a family-wise level
//     a = 0.05. The bound keeps large n from flagging rows by chance alone
//     (at n = 1000, |t| > 3 happens about three times in clean data); at
//     small n the floor of 3 rules. OutlierFamilyAlpha 0 turns the bound
//     off.
//   - CooksD 0.5: influential when Cook's D exceeds the 50th percentile
//     of F(p, n − p), as Cook (1977, Technometrics 19:15–18) suggested
//     comparing D with F percentiles. For the line, F(2, m) with m = n − 2
//     has median (m/2)(2^(2/m) − 1) (its CDF is 1 − (1 + 2F/m)^(−m/2)):
//     1.0 at n = 4, 0.76 at n = 10, 0.72 at n = 20, and towards
//     ln 2 ≈ 0.69 as n grows, so about 0.7 from n ≈ 10 on but higher for
//     the smallest studies. The rule "D > 4/n" flags about one row in
//     twenty of clean data and is not used.
//   - CurveShare 0.1 (project choice, no published source): the form is
//     "curved" when the x² term is significant and the quadratic removes at
//     least a tenth of the straight line's residual sum of squares,
//     (RSS_line − RSS_quad)/RSS_line (the partial R² of x² given x), so a
//     bend too slight to matter beside the scatter is still called a line.
//     The share does not depend on how much the line already explains: an
//     absolute gain in R² (0.05, this tool's earlier rule) called a clear
//     curve straight once the line's R² passed 0.95, as in weekly CO₂
//     against time or food expenditure against income.
//   - NonlinearDcor 0.15 (project choice, tuned on our own generated
//     suite, testdata/suite): the form is "nonlinear" when the distance
//     correlation is significant, at least 0.15 and larger than |r| (for
//     normal data it is never larger: Székely, Rizzo & Bakirov 2007,
//     Ann. Stat. 35:2769–2794, Theorem 7) while r itself is not. The
//     cut point is low because distance correlation runs low for patterns
//     that go up and down: in our generated suite a sine of four cycles
//     with noise a third of its amplitude gives about 0.19. The test's
//     p-value, not this cut point, guards against chance.
//   - ReversalMinGroup 5 (project choice): groups with fewer complete rows
//     take no part in the reversal check.
//   - DriftDW 1.5: with a declared run order, the drift check reads a
//     Durbin–Watson statistic only below 1.5, and then by its p (its
//     large-sample normal approximation, shared with the order trend and
//     the study's other checks; see Assess). 1.5 is a rule of thumb
//     (common practice takes 1.5 to 2.5 as no serial correlation); alone
//     it has no alpha behind it and calls about 40% of clean studies of 10
//     rows drifting, hence the p. The upper side (above 2.5: residuals
//     that alternate) is not drift and is not read.
//   - FormDW 1.5 (project choice): the drift rule of thumb carried over to
//     the line's residuals taken in order of x, where no convention exists;
//     below it (and below the statistic's alpha bound, which
//     rules at small n) they swing together and the form is "nonlinear"
//     (see Assess).
func DefaultThresholds() report.Thresholds {
	return report.Thresholds{
		Strong:             0.7,
		Moderate:           0.4,
		Weak:               0.1,
		LeverageFactor:     3,
		OutlierZ:           3,
		OutlierFamilyAlpha: 0.05,
		CooksD:             0.5,
		CurveShare:         0.1,
		NonlinearDcor:      0.15,
		ReversalMinGroup:   5,
		DriftDW:            1.5,
		FormDW:             1.5,
	}
}

// Flags a row can carry, in the order FlagPoints lists them.
const (
	FlagOutlier      = "outlier"       // externally studentized residual beyond the outlier bound
	FlagHighLeverage = "high-leverage" // leverage above LeverageFactor·p/n
	FlagInfluential  = "influential"   // Cook's D above the F(p, n−p) percentile
	FlagSoleSupport  = "sole-support"  // leverage 1: the row alone sets the fit
)

// params is the number of coefficients of the straight line.
const params = 2

// OutlierBound returns the size of externally studentized residual above
// which a row of n is an outlier under th: the larger of th.OutlierZ and
// the Bonferroni bound (see DefaultThresholds).
func OutlierBound(n int, th report.Thresholds) float64 {
	b := th.OutlierZ
	if a := th.OutlierFamilyAlpha; a > 0 && a < 1 && n > params+1 {
		if t := stats.TQuantileUpper(a/(2*float64(n)), float64(n-params-1)); t > b {
			b = t
		}
	}
	return b
}

// CooksBound returns the Cook's D above which a row of n is influential
// under th: the th.CooksD quantile of F(p, n − p). It is +Inf when n ≤ p.
func CooksBound(n int, th report.Thresholds) float64 {
	if n <= params || !(th.CooksD > 0 && th.CooksD < 1) {
		return math.Inf(1)
	}
	return stats.FQuantile(th.CooksD, params, float64(n-params))
}

// FlagSet is the set of flags one row carries, as bits.
type FlagSet uint8

// The flags as bits of a FlagSet, in the order Names lists them.
const (
	BitOutlier FlagSet = 1 << iota
	BitHighLeverage
	BitInfluential
	BitSoleSupport
)

// Names lists the flags of the set as the Flag constants, in the order
// outlier, high-leverage, influential, sole-support; nil for none.
func (f FlagSet) Names() []string {
	if f == 0 {
		return nil
	}
	var out []string
	for _, b := range []struct {
		bit  FlagSet
		name string
	}{{BitOutlier, FlagOutlier}, {BitHighLeverage, FlagHighLeverage}, {BitInfluential, FlagInfluential}, {BitSoleSupport, FlagSoleSupport}} {
		if f&b.bit != 0 {
			out = append(out, b.name)
		}
	}
	return out
}

// Suspect reports whether the set holds a flag the verdict should not rest
// on (see the function Suspect).
func (f FlagSet) Suspect() bool { return f&(BitOutlier|BitInfluential|BitSoleSupport) != 0 }

// FlagRules are the cut points of the flags for a study of N rows under
// one set of thresholds (FlagRulesFor): computed once, applied to each row by Flag.
type FlagRules struct {
	N        int
	Leverage float64 // high leverage above this (LeverageFactor·2/n); +Inf when the rule is off
	Outlier  float64 // outlier when |externally studentized residual| exceeds this (OutlierBound)
	Cooks    float64 // influential when Cook's distance exceeds this (CooksBound)
}

// FlagRulesFor returns the flag cut points for n rows under th.
func FlagRulesFor(n int, th report.Thresholds) FlagRules {
	r := FlagRules{N: n, Leverage: math.Inf(1), Outlier: OutlierBound(n, th), Cooks: CooksBound(n, th)}
	if th.LeverageFactor > 0 && n > 0 {
		r.Leverage = th.LeverageFactor * params / float64(n)
	}
	return r
}

// Flag returns the flags of one row from its leverage h, externally
// studentized residual t and Cook's distance d (a NaN measure raises no
// flag). A row of sole support (leverage 1) is flagged high-leverage and
// sole-support: its residual is 0 and its Cook's D undefined, yet it alone
// decides the fit through it.
func (r FlagRules) Flag(h, t, d float64, sole bool) FlagSet {
	if sole {
		return BitHighLeverage | BitSoleSupport
	}
	var f FlagSet
	if math.Abs(t) > r.Outlier {
		f |= BitOutlier
	}
	if h > r.Leverage {
		f |= BitHighLeverage
	}
	if d > r.Cooks {
		f |= BitInfluential
	}
	return f
}

// FlagPoints returns, per row, the flags of the straight line's influence
// measures under th (see the Flag constants and DefaultThresholds for the
// rules); nil for a row with none. All four slices are parallel, one entry
// per complete case; a shorter soleSupport counts as false. It applies
// FlagRulesFor(n, th).Flag to each row; a study streams rows through Flag instead.
func FlagPoints(leverage, studentizedExt, cooksD []float64, soleSupport []bool, th report.Thresholds) [][]string {
	n := len(leverage)
	out := make([][]string, n)
	rules := FlagRulesFor(n, th)
	at := func(v []float64, i int) float64 {
		if i < len(v) {
			return v[i]
		}
		return math.NaN()
	}
	for i := 0; i < n; i++ {
		sole := i < len(soleSupport) && soleSupport[i]
		out[i] = rules.Flag(leverage[i], at(studentizedExt, i), at(cooksD, i), sole).Names()
	}
	return out
}

// Suspect reports whether a row with these flags is one the verdict should
// not rest on: an outlier, an influential row or a row of sole support. A
// row that is only far out in x (high leverage) but on the line is good
// data, and dropping it would only shorten the observed range.
func Suspect(flags []string) bool {
	for _, f := range flags {
		if f == FlagOutlier || f == FlagInfluential || f == FlagSoleSupport {
			return true
		}
	}
	return false
}

// Rules states the cut points th (at significance level alpha) as the
// rules of Assess apply them, in one paragraph for people: first those that
// are common practice, then this tool's own choices.
func Rules(th report.Thresholds, alpha float64) string {
	if th == (report.Thresholds{}) {
		th = DefaultThresholds()
	}
	if !(alpha > 0 && alpha < 1) {
		alpha = 0.05
	}
	return fmt.Sprintf("Cut points in force. Common practice, not a standard: |r| is strong from %s, moderate from %s, weak from %s, graded only where r's p is below alpha = %s; "+
		"high leverage above %s·p/n; outlier when the externally studentized residual exceeds %s in size or the Bonferroni bound at family level %s, whichever is larger; "+
		"influential when Cook's distance exceeds the %s quantile of F(p, n − p); with a run order declared, drift when the smaller p of the residuals' trend in run order "+
		"and their Durbin–Watson statistic (read only below %s, a rule of thumb), doubled and Holm-adjusted over the study's checks, is below alpha. "+
		"Choices of this tool, not common practice: a curve needs a significant x² term (Holm within the study) and the quadratic to take at least a share %s off the line's residual sum of squares; "+
		"nonlinear needs either a significant distance correlation of at least %s above |r| while r is not significant, or, with |r| below %s, the line's residuals in order of x "+
		"with a Durbin–Watson statistic below the smaller of %s and its alpha bound; the reversal check compares groups of at least %d rows.",
		num(th.Strong), num(th.Moderate), num(th.Weak), num(alpha), num(th.LeverageFactor), num(th.OutlierZ), num(th.OutlierFamilyAlpha),
		num(th.CooksD), num(th.DriftDW), num(th.CurveShare), num(th.NonlinearDcor), num(th.Moderate), num(th.FormDW), th.ReversalMinGroup)
}
