package analysis

import (
	"math"
	"strings"
	"testing"

	"bivar/analysis/manifest"
	"bivar/analysis/report"
)

// expectStudy is a hand-built finished study; its numbers are inputs to
// the wording, not check values.
func expectStudy() *report.Study {
	return &report.Study{
		ID: "s", N: 119, NMissing: 1,
		X:           report.Variable{Column: "t", Unit: "Cel", Symbol: "°C"},
		Y:           report.Variable{Column: "h", Unit: "{HRC}"}, // Symbol left empty: taken from the code
		Pearson:     &report.Pearson{R: -0.98, CILow: -0.99, CIHigh: -0.97, P: 1e-9, PAdjusted: 2e-9},
		Line:        &report.Fit{Slope: &report.Coef{Estimate: -0.07956, CILow: -0.0824, CIHigh: -0.0767}},
		Findings:    &report.Findings{Direction: "negative", Form: "linear"},
		Sensitivity: &report.Sensitivity{NFlagged: 1, RWithoutFlagged: -0.97},
	}
}

// TestExpectationUnits: the slope's unit is shown as the report writes it
// (units.Symbol, "y per x": "HRC per °C"), never as UCUM codes such as
// "{HRC}/Cel" nor as "HRC/°C"; the gate's limits carry it too.
func TestExpectationUnits(t *testing.T) {
	s := expectStudy()
	e := Expectations(s, &manifest.Expect{SlopeWithin: []float64{-0.095, -0.065}}, 0.05, "holm")
	if len(e) != 1 {
		t.Fatalf("expectations %+v", e)
	}
	for _, text := range []string{e[0].Want, e[0].Got, e[0].Detail} {
		if !strings.Contains(text, "HRC per °C") || strings.Contains(text, "/") || strings.Contains(text, "{") || strings.Contains(text, "Cel") {
			t.Errorf("%q: want the unit written HRC per °C", text)
		}
	}
	if want := "slope lies inside [-0.095, -0.065] HRC per °C; "; !strings.HasPrefix(e[0].Detail, want) {
		t.Errorf("detail %q, want it to start %q", e[0].Detail, want)
	}
	for _, c := range []struct {
		name   string
		change func(s *report.Study)
		want   string // the end of Got
	}{
		{"y without a unit", func(s *report.Study) { s.Y.Unit, s.Y.Symbol = "", "" }, " per °C"},
		{"x without a unit", func(s *report.Study) { s.X.Unit, s.X.Symbol, s.X.Label = "", "", "Tempering temperature" }, " HRC per unit of Tempering temperature"},
		{"like units", func(s *report.Study) { s.X.Unit, s.X.Symbol = "{HRC}", "" }, " HRC per HRC"},
		{"neither has a unit", func(s *report.Study) { s.X.Unit, s.X.Symbol, s.Y.Unit = "", "", "" }, "= -0.07956"},
		{"log-log", func(s *report.Study) { s.X.Scale, s.Y.Scale = "log", "log" }, " ln y per ln x"},
		{"log10 x only", func(s *report.Study) { s.X.Scale = "log10" }, " HRC per log₁₀ x"},
	} {
		s := expectStudy()
		c.change(s)
		if got := Expectations(s, &manifest.Expect{SlopeWithin: []float64{-1, 0}}, 0.05, "holm")[0].Got; !strings.HasSuffix(got, c.want) {
			t.Errorf("%s: got %q, want it to end %q", c.name, got, c.want)
		}
	}
}

// TestExpectationMaxP: the max_p gate writes p by the project's one
// formatter, findings.PValueVs against the gate's bound: "< 0.0001" below
// 0.0001 (never the e notation) unless the bound lies lower, and digits
// enough to stay on the bound's side. The cases are that formatter's
// rules (the project's convention, not a standard).
func TestExpectationMaxP(t *testing.T) {
	for _, c := range []struct {
		p, bound float64
		want     string // Got
		ok       bool
	}{
		{5.2e-05, 0.05, "adjusted p < 0.0001", true},
		{0.0496, 0.05, "adjusted p = 0.0496", true}, // PValue alone: 0.050
		{0.0504, 0.05, "adjusted p = 0.0504", false},
		{0.2, 0.05, "adjusted p = 0.20", false},
		{1e-9, 1e-6, "adjusted p < 0.000001", true},
		{3.2e-6, 1e-6, "adjusted p = 0.00000320", false},
		{math.NaN(), 0.05, "adjusted p undefined", false},
	} {
		s := expectStudy()
		s.Pearson.P, s.Pearson.PAdjusted = report.Float(c.p), report.Float(c.p)
		bound := c.bound
		e := Expectations(s, &manifest.Expect{MaxP: &bound}, 0.05, "holm")[0]
		if e.Got != c.want || e.OK != c.ok {
			t.Errorf("p %g, bound %g: got %q (ok %v), want %q (ok %v)", c.p, c.bound, e.Got, e.OK, c.want, c.ok)
		}
		if strings.Contains(e.Detail, "e-05") || strings.Contains(e.Detail, "= <") {
			t.Errorf("p %g: detail %q", c.p, e.Detail)
		}
	}
}

// TestExpectationGrammar: counts agree with their nouns ("1 row", "2 rows").
func TestExpectationGrammar(t *testing.T) {
	s := expectStudy() // 1 row missing, 1 flagged
	yes := true
	min := 100
	e := Expectations(s, &manifest.Expect{MinN: &min, NotOutlierDriven: &yes}, 0.05, "holm")
	text := e[0].Detail + "\n" + e[1].Detail
	for _, want := range []string{"119 complete rows", "(1 row dropped for missing cells)", "1 row left out", "without it"} {
		if !strings.Contains(text, want) {
			t.Errorf("details lack %q:\n%s", want, text)
		}
	}
	if strings.Contains(text, "1 rows") || strings.Contains(text, "(s)") {
		t.Errorf("details: a count disagrees with its noun:\n%s", text)
	}
	s.NMissing, s.Sensitivity.NFlagged = 2, 2
	e = Expectations(s, &manifest.Expect{MinN: &min, NotOutlierDriven: &yes}, 0.05, "holm")
	if text := e[0].Detail + "\n" + e[1].Detail; !strings.Contains(text, "(2 rows dropped") || !strings.Contains(text, "2 rows left out") || !strings.Contains(text, "without them") {
		t.Errorf("two rows:\n%s", text)
	}
}

// TestTooFewRowsGrammar: the error for a study with too few complete rows
// counts them in good English.
func TestTooFewRowsGrammar(t *testing.T) {
	nan := math.NaN()
	for _, c := range []struct {
		x    []float64
		want string
	}{
		{[]float64{1, nan, nan}, "only 1 complete row of"},
		{[]float64{1, 2, nan}, "only 2 complete rows of"},
	} {
		s := Analyze(Input{ID: "s", X: report.Variable{Column: "x"}, Y: report.Variable{Column: "y"},
			XS: c.x, YS: []float64{1, 2, 3}}, Config{})
		if s.Error == nil || !strings.Contains(*s.Error, c.want) {
			t.Errorf("error %v, want it to say %q", s.Error, c.want)
		}
	}
}

// TestExpectationDirectionReason: a direction gate gives the findings'
// reason for the direction found, so a curve that turns over is not
// reported with only an r whose interval excludes 0.
func TestExpectationDirectionReason(t *testing.T) {
	s := expectStudy()
	s.Findings.Direction = "none"
	s.Findings.DirectionWhy = "None: the curve turns over inside the observed range."
	e := Expectations(s, &manifest.Expect{Direction: "negative"}, 0.05, "holm")
	if e[0].OK || e[0].Detail != "expected a negative direction but found no direction. None: the curve turns over inside the observed range." {
		t.Errorf("direction gate: %+v", e[0])
	}
}
