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

// TestExpectationUnits: the slope's unit is shown as people write it
// (units.Symbol), never as UCUM codes such as "{HRC}/Cel".
func TestExpectationUnits(t *testing.T) {
	s := expectStudy()
	e := Expectations(s, &manifest.Expect{SlopeWithin: []float64{-0.095, -0.065}}, 0.05, "holm")
	if len(e) != 1 {
		t.Fatalf("expectations %+v", e)
	}
	for _, text := range []string{e[0].Want, e[0].Got, e[0].Detail} {
		if !strings.Contains(text, "HRC/°C") || strings.Contains(text, "{") || strings.Contains(text, "Cel") {
			t.Errorf("%q: want the unit written HRC/°C", text)
		}
	}
	s.Y.Unit, s.Y.Symbol = "", ""
	if got := Expectations(s, &manifest.Expect{SlopeWithin: []float64{-1, 0}}, 0.05, "holm")[0].Got; !strings.HasSuffix(got, " per °C") {
		t.Errorf("y without a unit: got %q, want the slope per °C", got)
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
