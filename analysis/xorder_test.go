package analysis

import (
	"fmt"
	"math"
	"slices"
	"testing"

	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// TestXOrderFigures checks the wiring of the x-order figures: the
// Durbin–Watson statistic is the mean of stats.DurbinWatson over the two
// orders of the tied rows, worked here by hand for a small case, on all
// rows, and it does not change when the rows are listed in another order.
// The statistic itself is checked against statsmodels in analysis/stats.
func TestXOrderFigures(t *testing.T) {
	// x out of order, with a tie (x = 2 at rows 1 and 5): in order of x the
	// residuals are e0, {e1, e5}, e3, e2, e4, e6, e7.
	x := []float64{1, 2, 5, 3, 6, 2, 7, 8}
	e := []float64{1, -1, 2, 0.5, -2, 3, -0.5, 0.25}
	var d report.Diagnostics
	xOrderFigures(&d, x, e)
	dw := func(sorted []float64) float64 {
		var num, den float64
		for i, v := range sorted {
			den += v * v
			if i > 0 {
				num += (v - sorted[i-1]) * (v - sorted[i-1])
			}
		}
		return num / den
	}
	want := (dw([]float64{1, -1, 3, 0.5, 2, -2, -0.5, 0.25}) + dw([]float64{1, 3, -1, 0.5, 2, -2, -0.5, 0.25})) / 2
	if got := float64(d.DurbinWatsonX); math.Abs(got-want) > 1e-12 || d.DurbinWatsonXRows != 8 {
		t.Errorf("DurbinWatsonX %v of %d rows, want %v of 8 (by hand)", got, d.DurbinWatsonXRows, want)
	}
	abs := make([]float64, len(e))
	for i := range e {
		abs[i] = math.Abs(e[i])
	}
	if rho, _ := stats.Spearman(x, abs); float64(d.SpreadRho) != rho {
		t.Errorf("SpreadRho %v, want Spearman of |e| on x %v", d.SpreadRho, rho)
	}
	// The tied rows listed the other way round: the same figure.
	x2, e2 := slices.Clone(x), slices.Clone(e)
	e2[1], e2[5] = e2[5], e2[1]
	var d2 report.Diagnostics
	xOrderFigures(&d2, x2, e2)
	if math.Abs(float64(d2.DurbinWatsonX-d.DurbinWatsonX)) > 1e-15 {
		t.Errorf("tied rows swapped: DurbinWatsonX %v, want %v", d2.DurbinWatsonX, d.DurbinWatsonX)
	}

	// Fewer than 8 rows: undefined, not a number that could trip the rule.
	xOrderFigures(&d, x[:7], e[:7])
	if d.DurbinWatsonX.Valid() {
		t.Errorf("7 rows: DurbinWatsonX %v, want undefined", d.DurbinWatsonX)
	}

	// Many rows: a study's x-order figures use a sample of 20000 chosen
	// by the rows' values (diagnostics draws it from the study's sample),
	// the same whatever the order of the rows.
	bx, by := make([]float64, 45000), make([]float64, 45000)
	for i := range bx {
		bx[i], by[i] = float64(i%97), math.Sin(float64(i))
	}
	study := func(x, y []float64) *report.Diagnostics {
		s := Analyze(Input{ID: "many", X: report.Variable{Column: "x"}, Y: report.Variable{Column: "y"}, XS: x, YS: y}, DefaultConfig())
		if s.Error != nil {
			t.Fatal(*s.Error)
		}
		return s.Diagnostics
	}
	dm := study(bx, by)
	if dm.DurbinWatsonXRows != maxXOrderRows || !dm.DurbinWatsonX.Valid() {
		t.Errorf("n = 45000: %d rows used (DW %v), want %d", dm.DurbinWatsonXRows, dm.DurbinWatsonX, maxXOrderRows)
	}
	slices.Reverse(bx)
	slices.Reverse(by)
	dr := study(bx, by)
	if dr.DurbinWatsonX != dm.DurbinWatsonX || dr.SpreadRho != dm.SpreadRho {
		t.Errorf("rows reversed: DW %v ρ %v, want %v %v", dr.DurbinWatsonX, dr.SpreadRho, dm.DurbinWatsonX, dm.SpreadRho)
	}
}

// TestLowessExtremes: first, last, highest and lowest points of a curve,
// the first of equal extremes; undefined below 3 points.
func TestLowessExtremes(t *testing.T) {
	var li report.LowessInfo
	lowessExtremes(&li, []report.XY{{X: 1, Y: 5}, {X: 2, Y: 9}, {X: 3, Y: 9}, {X: 4, Y: 1}, {X: 5, Y: 1}, {X: 6, Y: 4}})
	got := []report.Float{li.FirstX, li.FirstY, li.LastX, li.LastY, li.MaxX, li.MaxY, li.MinX, li.MinY}
	if want := []report.Float{1, 5, 6, 4, 2, 9, 4, 1}; !slices.Equal(got, want) {
		t.Errorf("extremes %v, want %v", got, want)
	}
	lowessExtremes(&li, []report.XY{{X: 1, Y: 5}, {X: 2, Y: 9}})
	if li.MaxX.Valid() || li.FirstY.Valid() {
		t.Errorf("two points: %+v, want undefined", li)
	}
}

// BenchmarkXOrderFigures: the figures on the sizes they are given (at most
// maxXOrderRows: diagnostics samples above it).
func BenchmarkXOrderFigures(b *testing.B) {
	for _, n := range []int{1_000, maxXOrderRows} {
		x, e := make([]float64, n), make([]float64, n)
		for i := range x {
			x[i], e[i] = math.Mod(float64(i)*0.618034, 1), math.Sin(float64(i))
		}
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			var d report.Diagnostics
			b.ReportAllocs()
			for b.Loop() {
				xOrderFigures(&d, x, e)
			}
		})
	}
}
