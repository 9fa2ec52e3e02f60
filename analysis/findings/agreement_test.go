package findings

import (
	"math"
	"strings"
	"testing"

	"bivar/analysis/report"
)

// The figures here are hand-made: the tests check the rules of the
// verdict and the wording, not a statistic.

func TestAgreementVerdictRules(t *testing.T) {
	t.Parallel()
	nan := math.NaN()
	// mk takes each limit with its interval low, limit, high.
	mk := func(acc, lowerLow, lower, lowerHigh, upperLow, upper, upperHigh float64) *report.Agreement {
		return &report.Agreement{Acceptable: report.Float(acc),
			LowerLow: report.Float(lowerLow), Lower: report.Float(lower), LowerHigh: report.Float(lowerHigh),
			UpperLow: report.Float(upperLow), Upper: report.Float(upper), UpperHigh: report.Float(upperHigh)}
	}
	for _, tc := range []struct {
		name string
		a    *report.Agreement
		want report.AgreementVerdict
	}{
		{"all inside", mk(2, -1.5, -1, -0.5, 0.5, 1, 1.5), report.AgreeWithin},
		{"interval ends exactly at the bounds count as inside", mk(2, -2, -1, -0.5, 0.5, 1, 2), report.AgreeWithin},
		{"upper interval reaches past", mk(2, -1.5, -1, -0.5, 1.5, 1.8, 2.1), report.Undecided},
		{"lower interval reaches past", mk(2, -2.2, -1.9, -1.6, 0.5, 1, 1.5), report.Undecided},
		{"upper limit outside, its interval reaching back inside", mk(2, -1.5, -1, -0.5, 1.7, 2.1, 2.5), report.Undecided},
		{"lower limit outside, its interval reaching back inside", mk(2, -2.5, -2.01, -1.9, 0.5, 1, 1.5), report.Undecided},
		{"upper interval wholly outside", mk(2, -1.5, -1, -0.5, 2.01, 2.3, 2.6), report.NotWithin},
		{"lower interval wholly outside", mk(2, -3, -2.5, -2.01, 0.5, 1, 1.5), report.NotWithin},
		{"an interval ending exactly at the bound is not wholly outside", mk(2, -1.5, -1, -0.5, 2, 2.3, 2.6), report.Undecided},
		{"no acceptable difference", mk(nan, -1.5, -1, -0.5, 0.5, 1, 1.5), ""},
		{"undefined limits", mk(2, nan, nan, nan, nan, nan, nan), ""},
		{"undefined intervals", mk(2, nan, -1, nan, nan, 1, nan), report.Undecided},
		{"undefined intervals, limit outside", mk(2, nan, -1, nan, nan, 2.5, nan), report.Undecided},
	} {
		if got := AgreementVerdict(tc.a); got != tc.want {
			t.Errorf("%s: AgreementVerdict = %q, want %q", tc.name, got, tc.want)
		}
	}
}

func TestAgreementWords(t *testing.T) {
	t.Parallel()
	f := func(v float64) report.Float { return report.Float(v) }
	s := &report.Study{X: report.Variable{Label: "bench tester", Symbol: "HRC"}, Y: report.Variable{Label: "portable tester", Symbol: "HRC"},
		Findings: &report.Findings{Headline: "a correlation headline"},
		Agreement: &report.Agreement{N: 40, Acceptable: f(1.5), Bias: f(0.25), BiasLow: f(0.16), BiasHigh: f(0.34),
			Lower: f(-0.55), LowerLow: f(-0.78), LowerHigh: f(-0.33), Upper: f(1.4996), UpperLow: f(1.27), UpperHigh: f(1.73),
			TrendP: f(0.3), Deming: &report.MethodLine{Intercept: f(0.7), InterceptLow: f(0.1), InterceptHigh: f(1.3), Slope: f(0.99), SlopeLow: f(0.97), SlopeHigh: f(1.01), Delta: f(1), DeltaFrom: "assumed 1"}}}
	Measurement(s, 0.05)
	a := s.Agreement
	if a.Verdict != report.Undecided || !a.ConstantBias || a.ProportionalBias || a.Trend {
		t.Errorf("verdict %q, constant %v, proportional %v, trend %v", a.Verdict, a.ConstantBias, a.ProportionalBias, a.Trend)
	}
	// 1.4996 printed with three digits would read 1.5, on the bound: it
	// gets the digits that keep it inside.
	if !strings.Contains(a.Statements[0], "1.4996") || strings.Contains(a.Statements[0], "NaN") {
		t.Errorf("statement %q", a.Statements[0])
	}
	if s.Findings.Headline != a.Statements[0] {
		t.Errorf("headline %q, want the agreement verdict", s.Findings.Headline)
	}
	if !strings.Contains(a.Statements[1], "portable tester reads 0.25 HRC higher than bench tester") {
		t.Errorf("bias sentence %q", a.Statements[1])
	}
	if !strings.Contains(strings.Join(a.Statements, " "), "a constant bias (intercept 0.7 HRC") {
		t.Errorf("no constant-bias sentence in %q", a.Statements)
	}
	e := AgreeExpectation(s, true)
	if e.OK || !strings.HasPrefix(e.Got, "undecided: limits -0.55 to 1.5, their intervals reaching -0.78 to 1.73 HRC") || e.Title != "the two methods agree within ±1.5 HRC" {
		t.Errorf("expect.agree = true on an undecided study: %+v", e)
	}
	if e := AgreeExpectation(s, false); !e.OK {
		t.Errorf("expect.agree = false on an undecided study: %+v", e)
	}
}

// A corrected r clipped to 1 is said to be, with the value before
// clipping, and the assumptions name Fuller's variance for the slope.
func TestErrorCorrectionClippedWords(t *testing.T) {
	t.Parallel()
	f := func(v float64) report.Float { return report.Float(v) }
	s := &report.Study{X: report.Variable{Label: "x"}, Y: report.Variable{Label: "y"},
		ErrorCorrection: &report.ErrorCorrection{N: 20, SDErrorX: f(1), SDErrorY: f(1), FromX: "declared", FromY: "declared",
			ReliabilityX: f(0.5), ReliabilityY: f(0.6), R: f(0.9), RCorrected: f(1), RCorrectedClipped: true, RUnclipped: f(1.162),
			RCorrectedLow: f(0.95), RCorrectedHigh: f(1), Slope: f(0.5), SlopeCorrected: f(1), SlopeCorrectedLow: f(0.6), SlopeCorrectedHigh: f(1.4)}}
	Measurement(s, 0.05)
	all := strings.Join(s.ErrorCorrection.Statements, " ")
	if !strings.Contains(all, "came out at 1.16, beyond ±1, and is reported as 1") {
		t.Errorf("statements %q", s.ErrorCorrection.Statements)
	}
	if !strings.Contains(strings.Join(s.ErrorCorrection.Assumptions, " "), "Fuller's (1987) variance") {
		t.Errorf("assumptions %q", s.ErrorCorrection.Assumptions)
	}
}

// The trend sentence needs p < alpha and a material change across the
// observed range of the mean: a quarter of the acceptable difference, or
// of the limits' width without one.
func TestAgreementTrendMaterial(t *testing.T) {
	t.Parallel()
	f := func(v float64) report.Float { return report.Float(v) }
	mk := func(acc, slope, p float64) *report.Study {
		return &report.Study{X: report.Variable{Label: "a", Symbol: "HRC"}, Y: report.Variable{Label: "b", Symbol: "HRC"},
			Agreement: &report.Agreement{N: 40, Acceptable: f(acc), Bias: f(0.2), BiasLow: f(0.1), BiasHigh: f(0.3),
				Lower: f(-0.6), LowerLow: f(-0.8), LowerHigh: f(-0.45), Upper: f(1.0), UpperLow: f(0.85), UpperHigh: f(1.2),
				TrendSlope: f(slope), TrendLow: f(slope / 2), TrendHigh: f(slope * 1.5), TrendP: f(p), MeanLow: f(40), MeanHigh: f(60)}}
	}
	for _, c := range []struct {
		name          string
		acc, slope, p float64
		trend         bool
		words         string
	}{
		// range 20: change 0.02·20 = 0.4 ≥ 1.5/4 = 0.375
		{"material against acceptable", 1.5, 0.02, 0.01, true, "describe it poorly"},
		// change 0.3 < 0.375
		{"small against acceptable", 1.5, 0.015, 0.01, false, "still describe it"},
		// no acceptable: quarter of the width 1.6 is 0.4; change 0.3
		{"small against the limits' width", math.NaN(), 0.015, 0.01, false, "quarter of the width of the limits"},
		{"material against the limits' width", math.NaN(), 0.025, 0.01, true, "describe it poorly"},
		{"not significant", 1.5, 0.05, 0.2, false, ""},
	} {
		s := mk(c.acc, c.slope, c.p)
		Measurement(s, 0.05)
		all := strings.Join(s.Agreement.Statements, " ")
		if s.Agreement.Trend != c.trend || (c.words != "" && !strings.Contains(all, c.words)) || (c.words == "" && strings.Contains(all, "magnitude")) {
			t.Errorf("%s: trend %v, statements %q", c.name, s.Agreement.Trend, s.Agreement.Statements)
		}
	}
}

// On a transformed scale the slope's plan names the scaled variables, not
// the recorded units (the slope is of the transformed values).
func TestPlanSlopeUnitScaled(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		xs, ys, want string
	}{
		{"log", "log", "(log income per unit of log size)"},
		{"", "log10", "(log₁₀ income per kg)"},
		{"sqrt", "", "(EUR per unit of √size)"},
	} {
		s := &report.Study{X: report.Variable{Label: "size", Symbol: "kg", Scale: c.xs}, Y: report.Variable{Label: "income", Symbol: "EUR", Scale: c.ys}}
		if got := planSlopeUnit(s); got != c.want {
			t.Errorf("x %q y %q: %q, want %q", c.xs, c.ys, got, c.want)
		}
	}
}
