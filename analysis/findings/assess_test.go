package findings

// Unit tests of the verdict rules on hand-built studies. The numbers here
// are chosen to sit on either side of a rule; they are inputs, not check
// values of any statistic. The outside checks (Anscombe 1973 and the
// labelled suite, run through the whole analysis) are in suite_test.go.

import (
	"math"
	"regexp"
	"slices"
	"strings"
	"testing"

	"bivar/analysis/report"
)

func fl(v float64) report.Float { return report.Float(v) }

// study builds a minimal filled study: x from 0 to 10 °C, y in %, a
// straight line with r, its p (adjusted p equal), n = 50, and a quadratic
// adding nothing.
func study(r, p float64) *report.Study {
	n := 50
	s := &report.Study{
		ID: "s", X: report.Variable{Column: "melt", Label: "melt temperature", Unit: "Cel"},
		Y: report.Variable{Column: "shr", Label: "shrinkage", Unit: "%"},
		N: n,
		Describe: &report.DescribePair{
			X: report.Describe{N: n, Min: 0, Max: 10, Mean: 5},
			Y: report.Describe{N: n, Min: 1, Max: 3, Mean: 2},
		},
		Pearson: &report.Pearson{R: fl(r), R2: fl(r * r), CILow: fl(r - 0.2), CIHigh: fl(r + 0.1), P: fl(p), PAdjusted: fl(p), DF: n - 2},
		Line: &report.Fit{Name: "line", R2: fl(r * r),
			Intercept: &report.Coef{Name: "intercept", Estimate: 1, CILow: 0.5, CIHigh: 1.5},
			Slope:     &report.Coef{Name: "x", Estimate: fl(0.1 * r), CILow: fl(0.05 * r), CIHigh: fl(0.15 * r)}},
		Models: []report.Fit{{Name: "quadratic", R2: fl(r*r + 0.01), FP: fl(p), ResidualSE: 0.1, Vertex: 40,
			Coefficients: []report.Coef{{Name: "intercept"}, {Name: "x"}, {Name: "x^2", Estimate: 0.001, P: 0.5}}}},
		Diagnostics: &report.Diagnostics{QuadraticP: 0.5, DurbinWatson: 2, DurbinWatsonX: report.NaN(), SpreadRho: report.NaN(),
			DistanceCorr: &report.DistanceCorr{DCor: fl(math.Abs(r) * 0.9), P: fl(p), Permutations: 199},
			BreuschPagan: &report.ChiTest{Stat: 1, DF: 1, P: 0.4}},
		Influence:   &report.Influence{Points: []report.Point{}},
		Sensitivity: &report.Sensitivity{LooRMin: fl(r - 0.02), LooRMax: fl(r + 0.02), RWithoutFlagged: fl(r), PWithoutFlagged: fl(p), ResistantSlope: fl(0.1 * r)},
	}
	return s
}

var ctx = Context{Alpha: 0.05, Design: Observational, Thresholds: DefaultThresholds()}

func all(f *report.Findings) string {
	return f.Headline + "\n" + strings.Join(f.Statements, "\n") + "\n" + strings.Join(f.Limits, "\n")
}

func TestAssessFailedStudy(t *testing.T) {
	msg := "x column constant"
	if f := Assess(&report.Study{Error: &msg}, ctx); f != nil {
		t.Errorf("Assess(failed study) = %+v, want nil", f)
	}
	if f := Assess(&report.Study{}, ctx); f != nil {
		t.Errorf("Assess(study without Pearson) = %+v, want nil", f)
	}
	if f := Assess(nil, ctx); f != nil {
		t.Errorf("Assess(nil) = %+v, want nil", f)
	}
}

func TestAssessDirectionUsesAdjustedP(t *testing.T) {
	s := study(0.45, 0.01)
	s.Pearson.PAdjusted = 0.08
	s.Diagnostics.DistanceCorr.P = 0.08
	f := Assess(s, ctx)
	if f.Direction != "none" || f.Form != "none" || f.Strength != "none" {
		t.Errorf("p 0.01, adjusted 0.08: direction %q form %q strength %q, want none none none", f.Direction, f.Form, f.Strength)
	}
	s.Pearson.PAdjusted = 0.03
	f = Assess(s, ctx)
	if f.Direction != "positive" || f.Form != "linear" || f.Strength != "moderate" {
		t.Errorf("adjusted 0.03: direction %q form %q strength %q, want positive linear moderate", f.Direction, f.Form, f.Strength)
	}
	if !strings.Contains(all(f), "adjusted for the number of studies, p = 0.030") {
		t.Errorf("statements do not say that p was adjusted:\n%s", all(f))
	}
}

func TestAssessStrengthCutPoints(t *testing.T) {
	for _, tc := range []struct {
		r    float64
		want string
	}{{0.7, "strong"}, {0.6999, "moderate"}, {-0.95, "strong"}, {0.4, "moderate"}, {-0.39, "weak"}, {0.1, "weak"}, {0.09, "none"}} {
		f := Assess(study(tc.r, 1e-6), ctx)
		if f.Strength != tc.want {
			t.Errorf("r = %v: strength %q, want %q", tc.r, f.Strength, tc.want)
		}
	}
	th := DefaultThresholds()
	th.Strong = 0.8
	if f := Assess(study(0.75, 1e-6), Context{Alpha: 0.05, Thresholds: th}); f.Strength != "moderate" {
		t.Errorf("r = 0.75 with strong = 0.8: strength %q, want moderate (override not used)", f.Strength)
	}
}

func TestAssessLinearStatements(t *testing.T) {
	f := Assess(study(-0.82, 1e-6), ctx)
	if f.Form != "linear" || f.Direction != "negative" || f.Strength != "strong" {
		t.Fatalf("got form %q direction %q strength %q, want linear negative strong", f.Form, f.Direction, f.Strength)
	}
	text := all(f)
	for _, want := range []string{"Shrinkage falls with melt temperature", "r = -0.82", "95% CI", "n = 50",
		"% per °C", "association, not cause", "outside the observed range of melt temperature (0 to 10 °C)",
		"No covariates were declared", "No grouping variable", "No run order was declared", "common practice"} {
		if !strings.Contains(text, want) {
			t.Errorf("findings lack %q:\n%s", want, text)
		}
	}
}

func TestAssessCurved(t *testing.T) {
	s := study(0.55, 1e-4)
	q := &s.Models[0]
	q.R2, q.FP, q.Vertex, q.ResidualSE = 0.9, 1e-10, 7, 0.1
	q.Coefficients[2].Estimate, q.Coefficients[2].P = -0.05, 1e-9
	s.Diagnostics.QuadraticP = 1e-9
	f := Assess(s, ctx)
	if f.Form != "curved" || f.Bend == nil || *f.Bend != "bends-down" || !f.TurnsOver || float64(f.TurnX) != 7 {
		t.Fatalf("got form %q bend %v turns %v at %v, want curved bends-down turning at 7", f.Form, f.Bend, f.TurnsOver, f.TurnX)
	}
	if f.Strength != "moderate" || f.CurveStrength != "strong" {
		t.Errorf("strength %q curve strength %q, want moderate and strong", f.Strength, f.CurveStrength)
	}
	if !strings.Contains(f.Headline, "strong as a curve") || !strings.Contains(f.Headline, "moderate as a straight line") {
		t.Errorf("headline does not give both strengths: %s", f.Headline)
	}
	// The vertex outside the range: bends, does not turn over.
	q.Vertex = 14
	q.Coefficients[2].Estimate = 0.05
	f = Assess(s, ctx)
	if f.Form != "curved" || *f.Bend != "bends-up" || f.TurnsOver || f.TurnX.Valid() {
		t.Errorf("vertex outside: got %q %q turns %v at %v, want curved bends-up, no turn", f.Form, *f.Bend, f.TurnsOver, f.TurnX)
	}
	// A vertex just inside the range where the curve barely turns (a
	// saturating curve): not a turn over.
	q.Vertex, q.Coefficients[2].Estimate = 9.5, -0.05 // fall beyond the vertex 0.05·0.25 < SE 0.1
	if f = Assess(s, ctx); f.TurnsOver {
		t.Errorf("vertex at 9.5 with a fall of 0.0125 < SE: turns over reported")
	}
	// Too small a gain in R² is still a line.
	q.Vertex, q.R2 = 7, fl(0.55*0.55+0.04)
	if f = Assess(s, ctx); f.Form != "linear" {
		t.Errorf("quadratic gain 0.04 < 0.05: form %q, want linear", f.Form)
	}
}

func TestAssessNonlinear(t *testing.T) {
	s := study(0.05, 0.6)
	s.Diagnostics.DistanceCorr = &report.DistanceCorr{DCor: 0.45, P: 0.005, Permutations: 199}
	f := Assess(s, ctx)
	if f.Form != "nonlinear" || f.Direction != "none" {
		t.Errorf("dcor 0.45 p 0.005, r 0.05: form %q direction %q, want nonlinear none", f.Form, f.Direction)
	}
	s.Diagnostics.DistanceCorr.DCor = 0.12
	if f = Assess(s, ctx); f.Form != "none" {
		t.Errorf("dcor 0.12 below 0.15: form %q, want none", f.Form)
	}
	// dcor below |r| is what a straight line gives: not nonlinear.
	s = study(0.35, 1e-6)
	s.Diagnostics.DistanceCorr = &report.DistanceCorr{DCor: 0.33, P: 0.001}
	if f = Assess(s, ctx); f.Form != "linear" {
		t.Errorf("dcor 0.33 < |r| 0.35: form %q, want linear", f.Form)
	}
}

func TestAssessOutlierDriven(t *testing.T) {
	s := study(0.8, 1e-4)
	s.Influence.Points = []report.Point{{Row: "8", X: 19, Y: 12.5, Leverage: 1, CooksD: report.NaN(), StudentizedExt: report.NaN(),
		Flags: []string{FlagHighLeverage, FlagSoleSupport}}}
	s.Sensitivity.NFlagged = 1
	s.Sensitivity.RWithoutFlagged, s.Sensitivity.PWithoutFlagged = report.NaN(), report.NaN()
	f := Assess(s, ctx)
	if !f.OutlierDriven {
		t.Errorf("r undefined without the flagged row: outlier_driven false")
	}
	if !strings.Contains(f.Headline, "comes from row 8 alone") {
		t.Errorf("headline does not name the row: %s", f.Headline)
	}
	// A flagged row whose removal leaves no relationship.
	s.Influence.Points[0].Flags = []string{FlagInfluential}
	s.Influence.Points[0].Leverage, s.Influence.Points[0].CooksD = 0.8, 12
	s.Sensitivity.RWithoutFlagged, s.Sensitivity.PWithoutFlagged = 0.1, 0.4
	if f = Assess(s, ctx); !f.OutlierDriven {
		t.Errorf("p 0.4 without the flagged row: outlier_driven false")
	}
	// The verdict survives.
	s.Sensitivity.RWithoutFlagged, s.Sensitivity.PWithoutFlagged = 0.99, 1e-8
	if f = Assess(s, ctx); f.OutlierDriven {
		t.Errorf("r 0.99 without the flagged row: outlier_driven true")
	}
	if !strings.Contains(all(f), "the verdict stands") {
		t.Errorf("statements do not say the verdict stands:\n%s", all(f))
	}
	// The adjustment applies without the flagged rows too: raw p 0.02,
	// adjusted 0.2 with the study's factor 10.
	s.Pearson.P, s.Pearson.PAdjusted = 1e-5, 1e-4
	s.Sensitivity.PWithoutFlagged = 0.02
	if f = Assess(s, ctx); !f.OutlierDriven {
		t.Errorf("p without flagged 0.02 ×10 adjustment: outlier_driven false")
	}
	// Leaving out one row turns the sign.
	s = study(0.3, 0.01)
	s.Sensitivity.LooRMin = -0.02
	if f = Assess(s, ctx); !f.OutlierDriven {
		t.Errorf("leave-one-out r down to -0.02 with r 0.3: outlier_driven false")
	}
}

func TestAssessReversal(t *testing.T) {
	s := study(0.6, 1e-5)
	s.Group = "lot"
	s.Groups = []report.GroupFit{
		{Group: "A", N: 20, Slope: -1, SlopeLow: -1.4, SlopeHigh: -0.6},
		{Group: "B", N: 20, Slope: -0.9, SlopeLow: -1.3, SlopeHigh: -0.5},
		{Group: "C", N: 3, Slope: 5, SlopeLow: -20, SlopeHigh: 30},
	}
	f := Assess(s, ctx)
	if !f.Reversal {
		t.Fatalf("two large groups with significant negative slopes under a positive pooled r: no reversal")
	}
	if !strings.Contains(all(f), "the direction reverses") {
		t.Errorf("limits do not say the direction reverses:\n%s", all(f))
	}
	// The headline opens with the finding within groups: 2 of the 2
	// groups of at least ReversalMinGroup rows, with their slopes; the
	// pooled verdict follows as such.
	if !strings.HasPrefix(f.Headline, "Within all 2 of 2 groups of lot, ") || !strings.Contains(f.Headline, "(slopes -1 to -0.9 ") ||
		!strings.Contains(f.Headline, " Pooled over them: ") {
		t.Errorf("headline does not open with the reversal within groups: %s", f.Headline)
	}
	s.Groups[1].Slope, s.Groups[1].SlopeLow, s.Groups[1].SlopeHigh = 0.9, 0.5, 1.3
	if f = Assess(s, ctx); f.Reversal {
		t.Errorf("groups disagree (one significant each way): reversal reported")
	}
	// No pooled relationship, but a clear one within the groups.
	s.Pearson.P, s.Pearson.PAdjusted = 0.4, 0.4
	s.Groups[0].Slope, s.Groups[0].SlopeLow, s.Groups[0].SlopeHigh = 0.8, 0.4, 1.2
	if f = Assess(s, ctx); f.Reversal || !strings.Contains(all(f), "differences between the groups hide it") {
		t.Errorf("pooled none, groups rising: reversal %v\n%s", f.Reversal, all(f))
	}
	s.Groups = s.Groups[:1]
	if f = Assess(s, ctx); f.Reversal {
		t.Errorf("one group only: reversal reported")
	}
}

func TestAssessCovariate(t *testing.T) {
	s := study(0.6, 1e-5)
	s.Covariates = []string{"ambient_rh", "line_speed"}
	s.Partial = []report.Partial{
		{Covariate: "ambient_rh", N: 50, R: 0.05, CILow: -0.23, CIHigh: 0.32, P: 0.7},
		{Covariate: "line_speed", N: 50, R: 0.58, CILow: 0.36, CIHigh: 0.74, P: 1e-5},
	}
	f := Assess(s, ctx)
	if !slices.Equal(f.ExplainedBy, []string{"ambient_rh"}) {
		t.Errorf("explained_by %v, want [ambient_rh]", f.ExplainedBy)
	}
	// The headline opens with the covariate, its partial r and p.
	if !strings.HasPrefix(f.Headline, "Holding ambient_rh fixed, no association of ") || !strings.Contains(f.Headline, "(partial r = 0.05, p = 0.70)") ||
		!strings.Contains(f.Headline, " Ignoring it: ") {
		t.Errorf("headline does not open with the covariate: %s", f.Headline)
	}
	// Not significant given the covariate, but the interval still holds
	// the pooled r: too few rows to tell, not explained.
	s.Partial[0].R, s.Partial[0].CILow, s.Partial[0].CIHigh, s.Partial[0].P = 0.45, -0.02, 0.75, 0.06
	if f := Assess(s, ctx); len(f.ExplainedBy) != 0 {
		t.Errorf("partial r 0.45 (-0.02 to 0.75) with r 0.6: explained_by %v, want none", f.ExplainedBy)
	}
	s.Partial[0].R, s.Partial[0].CILow, s.Partial[0].CIHigh, s.Partial[0].P = 0.05, -0.23, 0.32, 0.7
	text := all(f)
	if !strings.Contains(text, "ambient_rh may carry the association") || !strings.Contains(text, "does not come from line_speed alone") {
		t.Errorf("limits do not report both covariates:\n%s", text)
	}
}

func TestAssessDriftAndSpread(t *testing.T) {
	s := study(0.8, 1e-6)
	s.Diagnostics.DurbinWatson = 0.9
	if f := Assess(s, ctx); f.Drift {
		t.Errorf("Durbin–Watson 0.9 without a declared order: drift reported (file order is not run order)")
	}
	s.Order = "shot"
	if f := Assess(s, ctx); !f.Drift {
		t.Errorf("Durbin–Watson 0.9 with order: no drift")
	}
	s.Diagnostics.DurbinWatson = 2.1
	s.Diagnostics.OrderTrend = &report.OrderTrend{Slope: 0.01, P: 0.001, R: 0.4}
	if f := Assess(s, ctx); !f.Drift {
		t.Errorf("order trend p 0.001: no drift")
	}
	s.Diagnostics.OrderTrend.P = 0.3
	f := Assess(s, ctx)
	if f.Drift {
		t.Errorf("trend p 0.3, DW 2.1: drift reported")
	}
	if c := checkNamed(f, "drift"); c == nil || c.Raised || math.Abs(float64(c.P)-0.6) > 1e-12 || !c.Adjusted {
		t.Errorf("trend p 0.3, DW 2.1: drift check %+v, want p 0.6 (0.3 doubled), not raised, adjusted", c)
	}
	s.Diagnostics.BreuschPagan.P = 0.001
	s.Diagnostics.SpreadRho = 0.6 // |residual| rises with x
	f = Assess(s, ctx)
	if !f.SpreadChanges || !strings.Contains(all(f), "grows with melt temperature") {
		t.Errorf("Breusch–Pagan p 0.001 and residuals growing: spread %v\n%s", f.SpreadChanges, all(f))
	}
}

func TestAssessDesign(t *testing.T) {
	for _, tc := range []struct{ design, want, not string }{
		{Observational, "association, not cause", "causal reading"},
		{"", "association, not cause", "causal reading"},
		{DesignedExperiment, "causal reading", "association, not cause"},
		{RandomizedExperiment, "causal reading", "association, not cause"},
	} {
		f := Assess(study(0.8, 1e-6), Context{Alpha: 0.05, Design: tc.design})
		text := strings.Join(f.Limits, "\n")
		if !strings.Contains(text, tc.want) || strings.Contains(text, tc.not) {
			t.Errorf("design %q: limits want %q, not %q:\n%s", tc.design, tc.want, tc.not, text)
		}
	}
}

func TestAssessPredictionOutsideRange(t *testing.T) {
	s := study(0.8, 1e-6)
	s.Predictions = []report.Prediction{{X: 5, InRange: true}, {X: 12, InRange: false}}
	text := strings.Join(Assess(s, ctx).Limits, "\n")
	if !strings.Contains(text, "12 °C lies outside that range") {
		t.Errorf("limits do not reject the prediction at 12 °C:\n%s", text)
	}
}

// TestAssessAgreesWithCaution checks that no statement claims what the
// report's caution says statistics cannot give: approval, proof, safety.
func TestAssessAgreesWithCaution(t *testing.T) {
	banned := regexp.MustCompile(`\b(prove[sn]?|proof|guarantee[sd]?|safe to|approved?|certif\w*|compliant|validated)\b`)
	studies := []*report.Study{study(0.9, 1e-9), study(0.05, 0.7), study(-0.5, 1e-3)}
	for _, d := range []string{Observational, DesignedExperiment, RandomizedExperiment} {
		for _, s := range studies {
			text := strings.ToLower(all(Assess(s, Context{Alpha: 0.05, Design: d})))
			if b := banned.FindString(text); b != "" {
				t.Errorf("design %q: findings say %q, which the caution rules out:\n%s", d, b, text)
			}
		}
	}
}

func TestAssessOutlierInflatesStrength(t *testing.T) {
	s := study(0.9, 1e-9)
	s.Influence.Points = []report.Point{{Row: "31", X: 12, Y: 12, Leverage: 0.8, CooksD: 30, StudentizedExt: 5,
		Flags: []string{FlagOutlier, FlagHighLeverage, FlagInfluential}}}
	s.Sensitivity.NFlagged = 1
	s.Sensitivity.RWithoutFlagged, s.Sensitivity.PWithoutFlagged = 0.45, 0.01
	f := Assess(s, ctx)
	if !f.OutlierDriven || !strings.Contains(f.Headline, "strength of the relationship rests on row 31") {
		t.Errorf("strong with the row, moderate without: outlier_driven %v, headline %s", f.OutlierDriven, f.Headline)
	}
	// A flagged row that hides a stronger relationship does not drive it.
	s = study(0.6, 1e-6)
	s.Influence.Points = []report.Point{{Row: "40", X: 5, Y: 21, Leverage: 0.03, CooksD: 0.8, StudentizedExt: 10.8,
		Flags: []string{FlagOutlier, FlagInfluential}}}
	s.Sensitivity.NFlagged = 1
	s.Sensitivity.RWithoutFlagged, s.Sensitivity.PWithoutFlagged = 0.95, 1e-20
	if f = Assess(s, ctx); f.OutlierDriven || !strings.Contains(f.Headline, "Row 40 is flagged; without it r =") {
		t.Errorf("moderate with the row, strong without: outlier_driven %v, headline %s", f.OutlierDriven, f.Headline)
	}
}

// TestAssessUndefinedNumbers feeds a study whose every number is
// undefined (NaN) or whose sections are missing: Assess must still return
// findings with words, not panic or print "NaN".
func TestAssessUndefinedNumbers(t *testing.T) {
	nan := report.NaN()
	s := study(0.5, 0.01)
	s.Pearson = &report.Pearson{R: nan, R2: nan, CILow: nan, CIHigh: nan, T: nan, P: nan, PAdjusted: nan}
	s.Line.R2, s.Line.Slope.Estimate, s.Line.Slope.CILow, s.Line.Slope.CIHigh = nan, nan, nan, nan
	s.Models[0].R2, s.Models[0].Vertex, s.Models[0].FP = nan, nan, nan
	s.Models[0].Coefficients[2].Estimate, s.Models[0].Coefficients[2].P = nan, nan
	s.Diagnostics.QuadraticP, s.Diagnostics.DurbinWatson = nan, nan
	s.Diagnostics.DistanceCorr.DCor, s.Diagnostics.DistanceCorr.P = nan, nan
	s.Diagnostics.BreuschPagan.P = nan
	s.Sensitivity = &report.Sensitivity{LooRMin: nan, LooRMax: nan, RWithoutFlagged: nan, PWithoutFlagged: nan, ResistantSlope: nan, NFlagged: 1}
	s.Order, s.Group = "run", "lot"
	s.Groups = []report.GroupFit{{Group: "A", N: 10, Slope: nan, SlopeLow: nan, SlopeHigh: nan}}
	s.Partial = []report.Partial{{Covariate: "z", R: nan, CILow: nan, CIHigh: nan, P: nan}}
	s.Diagnostics.DurbinWatsonX, s.Diagnostics.DurbinWatsonXRows, s.Diagnostics.SpreadRho = nan, 50, nan
	s.Diagnostics.Lowess = &report.LowessInfo{FirstX: nan, FirstY: nan, LastX: nan, LastY: nan, MaxX: 1, MaxY: nan, MinX: nan, MinY: nan}
	f := Assess(s, ctx)
	if f == nil || f.Form != "none" || f.Direction != "none" || f.Strength != "none" {
		t.Fatalf("all undefined: %+v, want form, direction and strength none", f)
	}
	if text := all(f); strings.Contains(text, "NaN") {
		t.Errorf("findings print NaN:\n%s", text)
	}
	// Sections absent.
	bare := &report.Study{N: 3, X: report.Variable{Column: "x"}, Y: report.Variable{Column: "y"},
		Pearson: &report.Pearson{R: 0.9, P: 0.3, PAdjusted: 0.3, CILow: -0.8, CIHigh: 1}}
	if f := Assess(bare, ctx); f == nil || f.Form != "none" || f.Headline == "" {
		t.Errorf("bare study: %+v", f)
	}
}

// TestAssessUnitSymbols: sentences show units as people write them, by
// units.Symbol (report.Variable.Symbol, or the code's symbol when a study
// built by hand leaves it empty), never a raw UCUM code.
func TestAssessUnitSymbols(t *testing.T) {
	s := study(-0.82, 1e-6)
	s.X = report.Variable{Column: "gas", Label: "gas flow", Unit: "m3/h"} // Symbol left empty
	s.Y = report.Variable{Column: "hrc", Label: "hardness", Unit: "{HRC}", Symbol: "HRC"}
	text := all(Assess(s, ctx))
	for _, want := range []string{"HRC per m³/h", "0 to 10 m³/h"} {
		if !strings.Contains(text, want) {
			t.Errorf("findings lack %q:\n%s", want, text)
		}
	}
	for _, raw := range []string{"{", "m3/h"} {
		if strings.Contains(text, raw) {
			t.Errorf("findings show the raw code %q:\n%s", raw, text)
		}
	}
}

// TestAssessReadsXOrderFromDiagnostics: the x-order Durbin–Watson and the
// spread's direction are read from the study's Diagnostics (in
// results.json), not from the plot data, which results.json lacks.
func TestAssessReadsXOrderFromDiagnostics(t *testing.T) {
	s := study(0.2, 0.3) // r not shown: the residuals' pattern can make the form nonlinear
	s.Diagnostics.DistanceCorr.P = 0.5
	s.Diagnostics.DurbinWatsonX, s.Diagnostics.DurbinWatsonXRows = 0.6, 50
	s.Plot = nil
	f := Assess(s, ctx)
	if f.Form != "nonlinear" || !strings.Contains(all(f), "Durbin–Watson 0.6") {
		t.Errorf("DurbinWatsonX 0.6 of 50 rows: form %q, want nonlinear with the figure:\n%s", f.Form, all(f))
	}
	s.Diagnostics.DurbinWatsonX = 1.9
	if f := Assess(s, ctx); f.Form != "none" {
		t.Errorf("DurbinWatsonX 1.9: form %q, want none", f.Form)
	}
	s.Diagnostics.BreuschPagan.P = 0.001
	s.Diagnostics.SpreadRho = -0.5
	if f := Assess(s, ctx); !strings.Contains(all(f), "shrinks with melt temperature") {
		t.Errorf("SpreadRho -0.5: the spread should shrink:\n%s", all(f))
	}
}

// TestAssessLeaveOneOutDigits: the leave-one-out range of r shows enough
// digits that its two ends differ when they differ.
func TestAssessLeaveOneOutDigits(t *testing.T) {
	s := study(-0.98, 1e-9)
	s.Sensitivity.LooRMin, s.Sensitivity.LooRMinRow = -0.98191, "52"
	s.Sensitivity.LooRMax, s.Sensitivity.LooRMaxRow = -0.98149, "83"
	if text := all(Assess(s, ctx)); !strings.Contains(text, "r ranges from -0.982 (without row 52) to -0.981 (without row 83)") {
		t.Errorf("leave-one-out range not separated:\n%s", text)
	}
}

// TestAssessVerdictReasons: each verdict carries the reason of the rule
// that decided it. A curve that turns over has no direction because it
// turns, even though the line's r and slope are clear; a direction of none
// from r says r is not shown, by its p; each strength names where |r| lies
// among the cut points.
func TestAssessVerdictReasons(t *testing.T) {
	s := study(0.55, 1e-4)
	q := &s.Models[0]
	q.R2, q.FP, q.Vertex, q.ResidualSE = 0.9, 1e-10, 7, 0.1
	q.Coefficients[2].Estimate, q.Coefficients[2].P = -0.05, 1e-9
	s.Diagnostics.QuadraticP = 1e-9
	f := Assess(s, ctx)
	if f.Direction != "none" || !f.TurnsOver {
		t.Fatalf("direction %q, turns over %v; want none and a turn", f.Direction, f.TurnsOver)
	}
	for _, c := range []struct{ got, want string }{
		{f.DirectionWhy, "turns over inside the observed range"},
		{f.DirectionWhy, "rises with melt temperature up to about 7 °C and falls beyond it"},
		{f.FormWhy, "Curved: "},
		{f.FormWhy, "turns over at about melt temperature = 7 °C"},
		{f.StrengthWhy, "Moderate: |r| = 0.55, at or above 0.4 and below 0.7"},
		{f.StrengthWhy, "As a curve: strong"},
	} {
		if !strings.Contains(c.got, c.want) {
			t.Errorf("%q lacks %q", c.got, c.want)
		}
	}
	for _, why := range []string{f.DirectionWhy, f.FormWhy} {
		if strings.Contains(why, "includes 0") || strings.Contains(why, "includes zero") {
			t.Errorf("reason for a clear r says its interval includes 0: %s", why)
		}
	}

	// r not shown: the reason is r's p, not the curve.
	f = Assess(study(0.1, 0.4), ctx)
	if f.Direction != "none" || !strings.HasPrefix(f.DirectionWhy, "None shown: r = 0.10") || !strings.Contains(f.DirectionWhy, "p = 0.40") ||
		!strings.Contains(f.StrengthWhy, "only where r differs clearly from 0 (p below 0.05)") || !strings.HasPrefix(f.FormWhy, "None: ") {
		t.Errorf("r not shown: direction %q\n%s\n%s\n%s", f.Direction, f.DirectionWhy, f.StrengthWhy, f.FormWhy)
	}

	// Clear negative r.
	f = Assess(study(-0.82, 1e-6), ctx)
	if !strings.HasPrefix(f.DirectionWhy, "Negative: r = -0.82") || !strings.HasPrefix(f.StrengthWhy, "Strong: |r| = 0.82, at or above 0.7") ||
		!strings.HasPrefix(f.FormWhy, "Linear: ") {
		t.Errorf("negative line:\n%s\n%s\n%s", f.DirectionWhy, f.StrengthWhy, f.FormWhy)
	}
	// |r| just below a cut point prints on its own side of it.
	f = Assess(study(0.6996, 1e-6), ctx)
	if f.Strength != "moderate" || !strings.Contains(f.StrengthWhy, "|r| = 0.6996") || !strings.Contains(f.Headline, "r = 0.6996") {
		t.Errorf("r = 0.6996: %q\n%s\n%s", f.Strength, f.StrengthWhy, f.Headline)
	}
}

// TestPvalVs: a p-value never prints on the other side of alpha.
func TestPvalVs(t *testing.T) {
	for _, c := range []struct {
		p, alpha float64
		want     string
	}{
		{0.0496, 0.05, "p = 0.0496"},
		{0.0504, 0.05, "p = 0.050"}, // not below 0.05, and does not print below it
		{0.012, 0.05, "p = 0.012"},
		{0.0996, 0.1, "p = 0.0996"},
		{0.0004, 0.05, "p = 0.0004"},
		{0.00004, 0.05, "p < 0.0001"},
		{0.0004, 0.0001, "p = 0.0004"}, // above alpha, and prints so
		{0.00004, 0.0001, "p < 0.0001"},
		{0.00004, 0.00005, "p < 0.00005"},
		{0.00006, 0.00005, "p = 0.0000600"},
		{0.0000612345, 0.00005, "p = 0.0000612"},
		{0.00049, 0.0005, "p = 0.00049"},
		{0.5, 0.05, "p = 0.50"},
	} {
		if got := pvalVs(c.p, c.alpha); got != c.want {
			t.Errorf("pvalVs(%v, %v) = %q, want %q", c.p, c.alpha, got, c.want)
		}
	}
}

// TestAssessLeaveOneOutUndefined: when leaving out a row makes r
// undefined, the leave-one-out range says so rather than hiding it.
func TestAssessLeaveOneOutUndefined(t *testing.T) {
	s := study(0.8, 1e-4)
	s.Sensitivity.NFlagged = 1
	s.Sensitivity.WithoutEach = []report.Without{{Row: "8", R: report.NaN(), Slope: report.NaN(), Intercept: report.NaN()}}
	if text := all(Assess(s, ctx)); !strings.Contains(text, "without row 8 alone, r cannot be computed") {
		t.Errorf("leave-one-out range hides the undefined r:\n%s", text)
	}
}

// TestAssessCutPointCrossingIsNotOutlierDriven: a strength grade lost
// without the flagged rows makes the study outlier-driven only when r
// without them also lies outside r's confidence interval; r 0.72 → 0.69
// crosses the strong cut point but moves far less than r's own
// uncertainty.
func TestAssessCutPointCrossingIsNotOutlierDriven(t *testing.T) {
	s := study(0.72, 1e-9)
	s.Pearson.CILow, s.Pearson.CIHigh = 0.55, 0.83
	s.Influence.Points = []report.Point{{Row: "7", X: 9, Y: 3, Leverage: 0.1, CooksD: 0.9, StudentizedExt: 3.5,
		Flags: []string{FlagOutlier, FlagInfluential}}}
	s.Sensitivity.NFlagged = 1
	s.Sensitivity.RWithoutFlagged, s.Sensitivity.PWithoutFlagged = 0.69, 1e-8
	s.Sensitivity.RWithoutLow, s.Sensitivity.RWithoutHigh = 0.51, 0.81
	f := Assess(s, ctx)
	if f.OutlierDriven || f.Strength != "strong" {
		t.Errorf("r 0.72 (CI 0.55 to 0.83), 0.69 without row 7: outlier_driven %v strength %q, want false strong\n%s", f.OutlierDriven, f.Strength, all(f))
	}
	if !strings.Contains(all(f), "inside the 95% CI of r with all rows") {
		t.Errorf("the sensitivity statement does not say why the lower grade does not count:\n%s", all(f))
	}
	// Outside the interval the lost grade counts.
	s.Sensitivity.RWithoutFlagged = 0.5
	if f := Assess(s, ctx); !f.OutlierDriven {
		t.Errorf("r 0.72 (CI 0.55 to 0.83), 0.50 without row 7: not outlier-driven")
	}
}

// checkNamed returns the check of that name in f, or nil.
func checkNamed(f *report.Findings, name string) *report.Check {
	for i := range f.Checks {
		if f.Checks[i].Name == name {
			return &f.Checks[i]
		}
	}
	return nil
}

// TestAssessDriftParts: a trend p and a Durbin–Watson p each just below
// alpha on their own (as in stack loss against air flow: trend p 0.048,
// DW 1.26 at n = 21) do not make drift, whose p is the smaller doubled;
// the checks carry the three figures, so a sentence can say which decided.
func TestAssessDriftParts(t *testing.T) {
	s := study(0.9, 1e-6)
	s.N = 21
	s.Order = "run"
	s.Diagnostics.DurbinWatson = 1.26
	s.Diagnostics.OrderTrend = &report.OrderTrend{Slope: 0.1, P: 0.048, R: 0.4}
	f := Assess(s, ctx)
	dwp := 0.5 * math.Erfc(-(1.26-2)*math.Sqrt(21)/2/math.Sqrt2) // lower-tail normal p, mean 2, variance 4/n: Φ(-1.696)
	trend, dw, drift := checkNamed(f, "drift-trend"), checkNamed(f, "drift-dw"), checkNamed(f, "drift")
	switch {
	case f.Drift:
		t.Errorf("trend p 0.048, DW 1.26: drift raised")
	case trend == nil || float64(trend.P) != 0.048 || trend.Raised:
		t.Errorf("drift-trend check %+v, want p 0.048, not raised", trend)
	case dw == nil || math.Abs(float64(dw.P)-dwp) > 1e-9 || !(float64(dw.P) < 0.05):
		t.Errorf("drift-dw check %+v, want one-sided p %v", dw, dwp)
	case drift == nil || math.Abs(float64(drift.P)-2*math.Min(0.048, dwp)) > 1e-12 || drift.Raised:
		t.Errorf("drift check %+v, want p %v, not raised", drift, 2*math.Min(0.048, dwp))
	}
}

// TestAssessRowsStronger: flagged rows whose removal raises the strength
// grade do not leave "the verdict stands": Rows says "stronger".
func TestAssessRowsStronger(t *testing.T) {
	s := study(-0.6, 1e-5)
	s.Influence.Points = []report.Point{{Row: "DC", X: 9, Y: 1, Flags: []string{FlagOutlier, FlagInfluential}}}
	s.Sensitivity.NFlagged = 1
	s.Sensitivity.RWithoutFlagged, s.Sensitivity.PWithoutFlagged = -0.71, 1e-8
	f := Assess(s, ctx)
	if f.OutlierDriven || f.Strength != "moderate" || f.Rows != "stronger" {
		t.Errorf("r -0.6, -0.71 without the flagged row: outlier-driven %v strength %q rows %q, want false moderate stronger", f.OutlierDriven, f.Strength, f.Rows)
	}
	s.Sensitivity.RWithoutFlagged = -0.62
	if f := Assess(s, ctx); f.Rows != "stands" {
		t.Errorf("r -0.6, -0.62 without the flagged row: rows %q, want stands", f.Rows)
	}
}

// TestAssessReasons: every raised secondary verdict has its reason, under
// its own verdict name, and none is given for a verdict not raised.
func TestAssessReasons(t *testing.T) {
	s := study(0.8, 1e-9)
	s.Order = "run"
	s.Diagnostics.DurbinWatson = 0.5
	s.Diagnostics.BreuschPagan.P = 1e-6
	s.Partial = []report.Partial{{Covariate: "z", N: 50, R: 0.05, CILow: -0.2, CIHigh: 0.3, P: 0.7}, {Covariate: "w", N: 50, R: 0.75, CILow: 0.6, CIHigh: 0.85, P: 1e-8}}
	f := Assess(s, ctx)
	got := map[string]bool{}
	for _, r := range f.Reasons {
		got[r.Verdict] = r.Why != "" && r.Topic != ""
	}
	want := map[string]bool{"drift": f.Drift, "spread_changes": f.SpreadChanges, "explained_by": len(f.ExplainedBy) > 0,
		"outlier_driven": f.OutlierDriven, "reversal": f.Reversal}
	if !f.Drift || !f.SpreadChanges || !slices.Equal(f.ExplainedBy, []string{"z"}) {
		t.Fatalf("drift %v spread %v explained by %v; want true true [z]", f.Drift, f.SpreadChanges, f.ExplainedBy)
	}
	for v, raised := range want {
		if got[v] != raised {
			t.Errorf("verdict %s raised %v, reason given %v", v, raised, got[v])
		}
	}
}

// TestAssessLines: whether one line serves all levels of the group, from
// the two F tests of GroupLines read at alpha; a reason where it does not.
func TestAssessLines(t *testing.T) {
	s := study(0.8, 1e-9)
	if f := Assess(s, ctx); f.Lines != "" {
		t.Errorf("no group: lines %q, want empty", f.Lines)
	}
	s.Group = "firm"
	if f := Assess(s, ctx); f.Lines != "untested" {
		t.Errorf("group without a comparison: lines %q, want untested", f.Lines)
	}
	for _, c := range []struct {
		linesP, slopesP float64
		want            string
	}{{0.3, 0.5, "one-line"}, {1e-5, 0.2, "parallel"}, {1e-5, 0.01, "separate"}, {0.06, 0.01, "one-line"}} {
		s.GroupLines = &report.GroupLines{Groups: 11, N: 220, SlopesF: 2, SlopesDF1: 10, SlopesP: fl(c.slopesP), LinesF: 9, LinesDF1: 20,
			LinesP: fl(c.linesP), DF2: 198, RWithin: 0.6, RWithinDF: 208, RWithinP: 1e-20}
		f := Assess(s, ctx)
		reason := false
		for _, r := range f.Reasons {
			reason = reason || r.Verdict == "groups_differ"
		}
		if f.Lines != c.want || reason != (c.want == "parallel" || c.want == "separate") {
			t.Errorf("lines p %v, slopes p %v: lines %q (reason %v), want %q", c.linesP, c.slopesP, f.Lines, reason, c.want)
		}
	}
}

// TestScaleLead: a straight line on the log–log scale opens its headline
// with the elasticity in words and the scatter as a factor. Expected
// values are plain algebra: the slope 1.332 on ln–ln is the elasticity
// (about 1.33% per 1%), and a residual SD of 0.1836 in ln units is a
// factor e^0.1836 = 1.2015 (math.Exp), printed 1.20.
func TestScaleLead(t *testing.T) {
	s := study(0.84, 1e-10)
	s.X.Scale, s.Y.Scale = "log", "log"
	s.Line.Slope = &report.Coef{Name: "x", Estimate: 1.332, CILow: 1.175, CIHigh: 1.488}
	s.Line.ResidualSE = 0.1836
	f := Assess(s, ctx)
	want := "Shrinkage rises with melt temperature: 1% more melt temperature goes with about 1.33% more shrinkage (95% CI 1.18% to 1.49%), with a typical scatter of ×1.20 about the line"
	if !strings.HasPrefix(f.Headline, want) {
		t.Errorf("headline\n%s\nwant it to open with\n%s", f.Headline, want)
	}
}
