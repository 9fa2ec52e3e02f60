package chart

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"bivar/analysis/report"
)

// TestScaledAxis: an axis over transformed values is labelled at round
// recorded values placed at their transformed positions (invented ranges;
// the Engel-like one spans the incomes 377 to 4958 of Engel's data).
func TestScaledAxis(t *testing.T) {
	cases := []struct {
		name, scale string
		lo, hi      float64 // recorded values
		target      int
		want        string
	}{
		{"log, a decade and a bit", "log", 377, 4958, 7, "500 700 1000 2000 3000 5000"},
		{"log10, six decades", "log10", 0.002, 3000, 7, "0.01 0.1 1 10 100 1000"},
		{"log, many decades", "log", 1e-9, 1e9, 7, "1e-8 1e-6 1e-4 0.01 1 100 10000 1e6 1e8"},
		{"log, narrow", "log10", 40, 60, 6, "40 45 50 55 60"},
		{"sqrt", "sqrt", 0, 4900, 7, "0 100 400 900 1600 2500 3600 4900"},
		{"sqrt, away from zero", "sqrt", 240, 2033, 6, "220 400 620 900 1200 1600 2000"},
	}
	for _, tc := range cases {
		var fwd func(float64) float64
		switch tc.scale {
		case "log":
			fwd = math.Log
		case "log10":
			fwd = math.Log10
		default:
			fwd = math.Sqrt
		}
		var e extent
		e.add(fwd(tc.lo), fwd(tc.hi))
		a := scaledAxis(newAxis(e, tc.target), tc.scale, tc.target)
		got := strings.ReplaceAll(strings.Join(a.Labels, " "), "−", "-")
		if got != tc.want {
			t.Errorf("%s: labels %q, want %q", tc.name, got, tc.want)
		}
		// Every tick is at the transformed position of its label, inside
		// the axis, in increasing order.
		for i, l := range a.Labels {
			v := parseLabel(t, l)
			if p := fwd(v); math.Abs(p-a.Ticks[i]) > 1e-12*math.Max(1, math.Abs(p)) || p < a.Lo || p > a.Hi || i > 0 && a.Ticks[i] <= a.Ticks[i-1] {
				t.Errorf("%s: tick %q at %v; want at %v inside [%v, %v], increasing", tc.name, l, a.Ticks[i], p, a.Lo, a.Hi)
			}
		}
	}
}

func parseLabel(t *testing.T, l string) float64 {
	t.Helper()
	var v float64
	if _, err := fmt.Sscan(strings.ReplaceAll(l, "−", "-"), &v); err != nil {
		t.Fatalf("label %q: %v", l, err)
	}
	return v
}

// TestScaledFigure: a study on a log–log scale draws its scatter with the
// axis titles naming the scale and tick labels in recorded units.
func TestScaledFigure(t *testing.T) {
	f := &Figure{ID: "e", Width: ScatterW, Height: ScatterH, XLabel: "Income (BEF), natural-log scale", YLabel: "Food (BEF), natural-log scale",
		XScale: "log", YScale: "log",
		Points: []Series{{Name: "rows", X: []float64{math.Log(400), math.Log(1000), math.Log(4900)}, Y: []float64{math.Log(250), math.Log(600), math.Log(2000)}}}}
	svg := draw(t, f)
	for _, want := range []string{">500</text>", ">1000</text>", ">2000</text>", "natural-log scale"} {
		if !strings.Contains(svg, want) {
			t.Errorf("scaled scatter lacks %q", want)
		}
	}
	if strings.Contains(svg, ">6.5</text>") || strings.Contains(svg, ">7.0</text>") {
		t.Error("scaled scatter labels a tick with a logarithm")
	}
}

// TestScaledTitles: titles and phrases name the scale of a transformed
// variable, after its recorded unit.
func TestScaledTitles(t *testing.T) {
	v := report.Variable{Column: "income", Label: "Income", Unit: "{BEF}", Symbol: "BEF", Scale: "log"}
	if got, want := AxisTitle(v), "Income (BEF), natural-log scale"; got != want {
		t.Errorf("AxisTitle = %q, want %q", got, want)
	}
	if got, want := InUnit(v), "Income in BEF, on the natural-log scale"; got != want {
		t.Errorf("InUnit = %q, want %q", got, want)
	}
	v.Scale, v.Symbol, v.Label = "sqrt", "", "Yield (%)"
	if got, want := AxisTitle(v), "Yield (%), square-root scale"; got != want {
		t.Errorf("AxisTitle = %q, want %q", got, want)
	}
}
