package compare

import (
	"slices"
	"testing"
)

// TestDiffNotesScale: a study whose scale changed between the runs is
// named, and neither r nor the slope is tested across the scales (invented
// runs; an older results.json, without scales, reads as linear).
func TestDiffNotesScale(t *testing.T) {
	t.Parallel()
	x := []float64{1, 2, 3, 4, 5, 6}
	y := []float64{2, 4.1, 5.9, 8.2, 9.8, 12.1}
	f := verdicts("linear", "positive", "strong", false)
	a, b := study("s", x, y, f), study("s", x, y, f)
	b.X.Scale, b.Y.Scale = "log", "log"
	res := Diff(rep("h", a), rep("h", b), Options{})
	sc := res.Studies[0]
	want := "the scales changed (x linear → log, y linear → log): r and the slope are of differently transformed values and are not compared"
	if !slices.Contains(sc.Notes, want) || sc.R != nil || sc.Slope != nil {
		t.Errorf("notes %q, r %+v, slope %+v; want the note %q and no tests", sc.Notes, sc.R, sc.Slope, want)
	}
	c := study("s", x, y, f)
	c.X.Scale, c.Y.Scale = "log", "log"
	if sc := Diff(rep("h", b), rep("h", c), Options{}).Studies[0]; len(sc.Notes) != 0 || sc.R == nil {
		t.Errorf("same scales: notes %q, r %+v; want no note and r compared", sc.Notes, sc.R)
	}
}

// TestScaledUnits: on a transformed scale the diff's figures are of the
// transformed values, so their unit is the scale's name, as the report
// writes it ("ln y per ln x"), never the recorded unit (µm of a log).
func TestScaledUnits(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		xs, ys         string
		slope, xu, yu  string
		xScale, yScale string
	}{
		{"%", "µm", "µm per %", "%", "µm", "", ""},
		{"%", "µm", "ln y per ln x", "ln x", "ln y", "log", "log"},
		{"%", "µm", "µm per log₁₀ x", "log₁₀ x", "µm", "log10", ""},
		{"°C", "HRC", "√y per °C", "°C", "√y", "", "sqrt"},
		{"", "", "ln y per x", "", "ln y", "", "log"},
		{"", "HRC", "HRC per unit of x", "", "HRC", "", ""},
	} {
		sc := StudyChange{XSymbol: c.xs, YSymbol: c.ys, XScale: c.xScale, YScale: c.yScale}
		if got := sc.SlopeUnit(); got != c.slope {
			t.Errorf("%+v: SlopeUnit %q, want %q", c, got, c.slope)
		}
		if got := sc.XFigureUnit(); got != c.xu {
			t.Errorf("%+v: XFigureUnit %q, want %q", c, got, c.xu)
		}
		if got := sc.YFigureUnit(); got != c.yu {
			t.Errorf("%+v: YFigureUnit %q, want %q", c, got, c.yu)
		}
	}
	// Diff carries the new run's scales into the StudyChange.
	x := []float64{1, 2, 3, 4, 5, 6}
	y := []float64{2, 4.1, 5.9, 8.2, 9.8, 12.1}
	f := verdicts("linear", "positive", "strong", false)
	a, b := study("s", x, y, f), study("s", x, y, f)
	a.X.Scale, a.Y.Scale, b.X.Scale, b.Y.Scale = "log", "log", "log", "log"
	if sc := Diff(rep("h", a), rep("h", b), Options{}).Studies[0]; sc.SlopeUnit() != "ln y per ln x" {
		t.Errorf("log-log study: slope unit %q, want \"ln y per ln x\"", sc.SlopeUnit())
	}
}
