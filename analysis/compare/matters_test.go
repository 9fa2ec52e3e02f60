package compare

import (
	"math"
	"testing"

	"bivar/analysis/report"
	"bivar/internal/reference"
)

// ansStudy builds a study from one Anscombe (1973) set: its moments,
// the x range, predictions at xs and the given gates.
func ansStudy(t *testing.T, set string, xs []float64, gates []report.Expectation) report.Study {
	t.Helper()
	d := reference.Anscombe(t)[set]
	x, y := d[0], d[1]
	n := float64(len(x))
	var mx, my float64
	for i := range x {
		mx += x[i] / n
		my += y[i] / n
	}
	var sxx, syy, sxy float64
	lo, hi := math.Inf(1), math.Inf(-1)
	for i := range x {
		sxx += (x[i] - mx) * (x[i] - mx)
		syy += (y[i] - my) * (y[i] - my)
		sxy += (x[i] - mx) * (y[i] - my)
		lo, hi = math.Min(lo, x[i]), math.Max(hi, x[i])
	}
	s := report.Study{ID: "ans", N: len(x),
		X: report.Variable{Column: "x", Unit: "Cel", Symbol: "°C"}, Y: report.Variable{Column: "y", Unit: "[HRC]", Symbol: "HRC"},
		Moments:      &report.Moments{N: len(x), MeanX: report.Float(mx), MeanY: report.Float(my), Sxx: report.Float(sxx), Syy: report.Float(syy), Sxy: report.Float(sxy)},
		Describe:     &report.DescribePair{X: report.Describe{N: len(x), Min: report.Float(lo), Max: report.Float(hi)}},
		Findings:     &report.Findings{Form: "linear", Direction: "positive", Strength: "strong"},
		Expectations: gates,
	}
	for _, v := range xs {
		s.Predictions = append(s.Predictions, report.Prediction{X: report.Float(v)})
	}
	return s
}

// TestChangeAtXStatsmodels checks the change of the line's mean response
// between two runs (Anscombe's sets I and III, published data) against
// statsmodels 0.13.5: OLS(y, add_constant(x)).fit().get_prediction(
// [[1, X]]).summary_frame(alpha=0.05), columns mean, mean_se and
// mean_ci_lower. The SE of the change is sqrt(se_I² + se_III²).
func TestChangeAtXStatsmodels(t *testing.T) {
	want := []struct{ x, meanI, seI, meanIII, seIII float64 }{
		{5, 5.500545454545454, 0.6012024482970637, 5.501090909090907, 0.6010604998815892},
		{10, 8.001, 0.39104830619474334, 7.99972727272727, 0.39095597675131577},
		{16, 11.001545454545454, 0.9056493345504745, 10.998090909090907, 0.9054355039375436},
	}
	xs := []float64{5, 10, 16}
	old, cur := ansStudy(t, "I", xs, nil), ansStudy(t, "III", xs, nil)
	oldR := &report.Report{Studies: []report.Study{old}}
	newR := &report.Report{Studies: []report.Study{cur}}
	res := Diff(oldR, newR, Options{})
	sc := res.Studies[0]
	if sc.AtXFrom != "predictions" || len(sc.AtX) != 3 {
		t.Fatalf("AtXFrom %q, %d values; want predictions, 3", sc.AtXFrom, len(sc.AtX))
	}
	close := func(what string, got report.Float, want float64) {
		t.Helper()
		if math.Abs(float64(got)-want) > 1e-9*math.Max(1, math.Abs(want)) {
			t.Errorf("%s = %.15g, want %.15g", what, float64(got), want)
		}
	}
	for i, w := range want {
		a := sc.AtX[i]
		close("old", a.Old, w.meanI)
		close("new", a.New, w.meanIII)
		close("delta", a.Delta, w.meanIII-w.meanI)
		close("se", a.SE, math.Hypot(w.seI, w.seIII))
		if a.InRange != (w.x >= 4 && w.x <= 14) {
			t.Errorf("x = %g: in range %v", w.x, a.InRange)
		}
	}
	// The chart's band: 21 points from 4 to 14, so x = 10 is the 13th;
	// its lower end is statsmodels' mean_ci_lower there (7.116387273163828).
	if sc.Lines == nil || len(sc.Lines.Old.Points) != lineGrid {
		t.Fatalf("lines %+v", sc.Lines)
	}
	p := sc.Lines.Old.Points[12]
	close("band x", report.Float(p.X), 10)
	close("band low", report.Float(p.ConfLow), 7.116387273163828)
}

// TestExpectationChanges checks the gates' comparison on hand-made
// outcomes: a slope gate met in the old run and failed in the new, a gate
// declared only in the new run and failing, one held in both.
func TestExpectationChanges(t *testing.T) {
	old := ansStudy(t, "I", nil, []report.Expectation{
		{Name: "slope_within", Title: "slope within its limits", OK: true, Got: "slope = 0.5", Limits: &report.Limits{Low: 0.45, High: 0.55}},
		{Name: "min_n", OK: true},
	})
	// The new run: set I's y scaled so its slope is 0.5001·1.2 ≈ 0.6.
	cur := ansStudy(t, "I", nil, []report.Expectation{
		{Name: "slope_within", Title: "slope within its limits", OK: false, Got: "slope = 0.6", Limits: &report.Limits{Low: 0.45, High: 0.55}},
		{Name: "min_n", OK: true},
		{Name: "max_p", OK: false},
	})
	m := *cur.Moments
	m.Sxy, m.Syy = m.Sxy*1.2, m.Syy*1.44
	cur.Moments = &m
	res := Diff(&report.Report{Studies: []report.Study{old}}, &report.Report{Studies: []report.Study{cur}}, Options{})
	s := res.Summary
	if s.ExpectationChanged != 2 || s.ExpectationBroken != 2 || !res.AnyExpectationBroken() {
		t.Fatalf("summary %+v: want 2 changed, 2 broken", s)
	}
	sc := res.Studies[0]
	if len(sc.Expectations) != 3 || !sc.Expectations[0].Broken || sc.Expectations[1].Changed || sc.Expectations[2].OldOK != nil {
		t.Errorf("expectations %+v", sc.Expectations)
	}
	g := sc.SlopeGate
	if g == nil || !g.OldInside || g.NewInside {
		t.Fatalf("gate %+v", g)
	}
	// Anscombe I's slope is 0.5000909…; the new one is 1.2 times it.
	b := float64(sc.Slope.Old)
	if d := float64(g.NewOutsideBy) - (1.2*b - 0.55); math.Abs(d) > 1e-12 {
		t.Errorf("outside by %g, want %g", float64(g.NewOutsideBy), 1.2*b-0.55)
	}
	if d := float64(g.ShareOfWidth) - 0.2*b/0.1; math.Abs(d) > 1e-12 {
		t.Errorf("share of width %g, want %g", float64(g.ShareOfWidth), 0.2*b/0.1)
	}
	if sc.Statement == "" {
		t.Error("a study whose gate changed has no statement")
	}
	// Same runs both sides: nothing changed, nothing broken.
	same := Diff(&report.Report{Studies: []report.Study{old}}, &report.Report{Studies: []report.Study{old}}, Options{})
	if same.Summary.ExpectationChanged != 0 || same.AnyExpectationBroken() {
		t.Errorf("same run: %+v", same.Summary)
	}
}
