package compare

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// TestWelchTScipy checks WelchT against scipy 1.10.1:
// scipy.stats.ttest_ind_from_stats(-2.12, 38.77, 17, 10.5, 25.0, 30,
// equal_var=False) → statistic −1.2073833295568015 (sign: first minus
// second), pvalue 0.23919556077168364; the Welch–Satterthwaite df
// computed beside it with numpy 1.24.2 is 23.70218304108325.
func TestWelchTScipy(t *testing.T) {
	t.Parallel()
	se1, se2 := 38.77/math.Sqrt(17), 25.0/math.Sqrt(30)
	tt, df, p := WelchT(-2.12, se1, 17, 10.5, se2, 30)
	if math.Abs(tt-1.2073833295568015) > 1e-12 || math.Abs(df-23.70218304108325) > 1e-10 || math.Abs(p-0.23919556077168364) > 1e-9 {
		t.Errorf("WelchT = %.15g, %.15g, %.15g; want 1.20738332955680, 23.7021830410833, 0.239195560771684", tt, df, p)
	}
	if _, _, p := WelchT(1, 0, 10, 2, 0, 10); !math.IsNaN(p) {
		t.Errorf("WelchT with zero SEs: p = %v, want NaN", p)
	}
}

// agreementOf is an invented agreement study of y against x.
func agreementOf(id string, x, y []float64, verdict report.AgreementVerdict) report.Study {
	s := study(id, x, y, verdicts("linear", "positive", "strong", false))
	l := stats.BlandAltman(y, x, 1.96, 0.95)
	f := func(v float64) report.Float { return report.Float(v) }
	s.Agreement = &report.Agreement{N: l.N, Bias: f(l.Bias), BiasSE: f(l.SDMeans / math.Sqrt(float64(l.N))), SD: f(l.SD),
		Lower: f(l.Lower), Upper: f(l.Upper), Verdict: verdict, Acceptable: 2, LowerLow: f(l.Lower - 0.5), UpperHigh: f(l.Upper + 0.5)}
	return s
}

// gauges draws n items read by two gauges, y reading bias higher with an
// extra error of SD sd.
func gauges(rng *rand.Rand, n int, bias, sd float64) (x, y []float64) {
	for range n {
		v := 50 + 5*rng.NormFloat64()
		x = append(x, v+0.5*rng.NormFloat64())
		y = append(y, v+bias+sd*rng.NormFloat64())
	}
	return x, y
}

// TestDiffAgreement: a shifted bias, and a wider spread of the
// differences, are changes `bivar diff` reports; the same gauges are not.
func TestDiffAgreement(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(14, 1))
	x0, y0 := gauges(rng, 60, 0, 0.5)
	x1, y1 := gauges(rng, 60, 0, 0.5)
	x2, y2 := gauges(rng, 60, 1.5, 0.5)
	x3, y3 := gauges(rng, 60, 0, 1.5)
	old := rep("a", agreementOf("same", x0, y0, report.AgreeWithin), agreementOf("shift", x0, y0, report.AgreeWithin), agreementOf("wider", x0, y0, report.AgreeWithin))
	cur := rep("b", agreementOf("same", x1, y1, report.AgreeWithin), agreementOf("shift", x2, y2, report.NotWithin), agreementOf("wider", x3, y3, report.AgreeWithin))
	res := Diff(old, cur, Options{})
	by := map[string]StudyChange{}
	for _, sc := range res.Studies {
		by[sc.ID] = sc
	}
	if a := by["same"].Agreement; a == nil || by["same"].Significant || !(float64(a.BiasPAdj) >= 0.05) || !(float64(a.SDPAdj) >= 0.05) {
		t.Errorf("same gauges: %+v, significant %v", a, by["same"].Significant)
	}
	sh := by["shift"]
	if !sh.Significant || !(float64(sh.Agreement.BiasPAdj) < 0.05) || !strings.Contains(sh.Statement, "bias changed beyond chance") ||
		!strings.Contains(sh.Statement, "limits of agreement moved") {
		t.Errorf("shifted bias not reported: p adj %v, statement %q", sh.Agreement.BiasPAdj, sh.Statement)
	}
	// The verdict against the acceptable difference comes first, with the
	// new intervals' outer ends it rests on.
	for _, want := range []string{`Against the acceptable ±2 Cel the methods went from "agree" to "do not agree"`,
		fmt.Sprintf("their intervals now reach %s to %s Cel.", g4(sh.Agreement.NewLowerLow), g4(sh.Agreement.NewUpperHigh))} {
		if !strings.Contains(sh.Statement, want) {
			t.Errorf("statement %q lacks %q", sh.Statement, want)
		}
	}
	if strings.Contains(sh.Statement, "the line gives") {
		t.Errorf("an agreement study's statement reads the line at x: %q", sh.Statement)
	}
	found := false
	for _, v := range sh.Verdicts {
		if v.Name == "agreement" && v.Old == string(report.AgreeWithin) && v.New == string(report.NotWithin) {
			found = true
		}
	}
	if !found {
		t.Errorf("agreement verdict change not listed: %+v", sh.Verdicts)
	}
	if w := by["wider"]; !w.Significant || !(float64(w.Agreement.SDPAdj) < 0.05) || !strings.Contains(w.Statement, "SD of the differences changed") {
		t.Errorf("wider spread not reported: %+v, statement %q", w.Agreement, w.Statement)
	}
	// Four agreement tests per study join the family: 3 studies × (r, slope, bias, SD).
	if res.Summary.Tested != 12 || res.Tests.Bias == "" {
		t.Errorf("tested %d, want 12; tests %+v", res.Summary.Tested, res.Tests)
	}
}
