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
// Durbin–Watson statistic is stats.DurbinWatson of the residuals sorted by
// x, worked here by hand for a small case, with tied x in the canonical
// order of stats.Sorted (set by the y values, so the same for any order of
// the rows), and the sampling rule takes every k-th pair in x order,
// k = ⌈n/20000⌉. The statistic itself is checked against statsmodels in
// analysis/stats.
func TestXOrderFigures(t *testing.T) {
	// x out of order, with a tie (x = 2 at rows 1 and 5): in order of x the
	// residuals are e0, then e1 and e5 in the order Sorted gives the tie,
	// then e3, e2, e4, e6, e7.
	x := []float64{1, 2, 5, 3, 6, 2, 7, 8}
	y := []float64{4, 1, 7, 2, 9, 3, 6, 5}
	e := []float64{1, -1, 2, 0.5, -2, 3, -0.5, 0.25}
	ps := stats.NewSorted(x, y)
	ec := make([]float64, len(e))
	for k, i := range ps.Row {
		ec[k] = e[i]
	}
	var d report.Diagnostics
	xOrderFigures(&d, ps, ec)
	first, second := -1.0, 3.0 // e1 then e5
	if ps.Row[1] == 5 {
		first, second = second, first
	}
	sorted := []float64{1, first, second, 0.5, 2, -2, -0.5, 0.25}
	var num, den float64
	for i, v := range sorted {
		den += v * v
		if i > 0 {
			num += (v - sorted[i-1]) * (v - sorted[i-1])
		}
	}
	if got, want := float64(d.DurbinWatsonX), num/den; math.Abs(got-want) > 1e-12 || d.DurbinWatsonXRows != 8 {
		t.Errorf("DurbinWatsonX %v of %d rows, want %v of 8 (by hand)", got, d.DurbinWatsonXRows, want)
	}
	abs := make([]float64, len(e))
	for i := range e {
		abs[i] = math.Abs(e[i])
	}
	if rho, _ := stats.Spearman(x, abs); math.Abs(float64(d.SpreadRho)-rho) > 1e-15 {
		t.Errorf("SpreadRho %v, want Spearman of |e| on x %v", d.SpreadRho, rho)
	}
	// The same rows in another order give the same figures.
	rev := func(v []float64) []float64 { w := slices.Clone(v); slices.Reverse(w); return w }
	ps2 := stats.NewSorted(rev(x), rev(y))
	er := rev(e)
	for k, i := range ps2.Row {
		ec[k] = er[i]
	}
	var d2 report.Diagnostics
	xOrderFigures(&d2, ps2, ec)
	if d2.DurbinWatsonX != d.DurbinWatsonX || d2.SpreadRho != d.SpreadRho {
		t.Errorf("rows reversed: DW %v ρ %v, want %v %v", d2.DurbinWatsonX, d2.SpreadRho, d.DurbinWatsonX, d.SpreadRho)
	}

	// Fewer than 8 rows: undefined, not a number that could trip the rule.
	xOrderFigures(&d, stats.NewSorted(x[:7], y[:7]), ec[:7])
	if d.DurbinWatsonX.Valid() {
		t.Errorf("7 rows: DurbinWatsonX %v, want undefined", d.DurbinWatsonX)
	}

	// Above 20000 rows: every k-th row.
	for _, c := range []struct{ n, rows int }{{20000, 20000}, {20001, 10001}, {45000, 15000}} {
		bx, be := make([]float64, c.n), make([]float64, c.n)
		for i := range bx {
			bx[i], be[i] = float64(i%97), math.Sin(float64(i))
		}
		xOrderFigures(&d, stats.NewSorted(bx, be), be)
		if d.DurbinWatsonXRows != c.rows || !d.DurbinWatsonX.Valid() {
			t.Errorf("n = %d: %d rows used (DW %v), want %d", c.n, d.DurbinWatsonXRows, d.DurbinWatsonX, c.rows)
		}
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

// BenchmarkXOrderFigures: at most 20000 rows are ranked whatever n is (the
// sort is stats.NewSorted's, shared with the other statistics, not timed).
func BenchmarkXOrderFigures(b *testing.B) {
	for _, n := range []int{1_000, 100_000, 1_000_000} {
		x, e := make([]float64, n), make([]float64, n)
		for i := range x {
			x[i], e[i] = math.Mod(float64(i)*0.618034, 1), math.Sin(float64(i))
		}
		ps := stats.NewSorted(x, e)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			var d report.Diagnostics
			b.ReportAllocs()
			for b.Loop() {
				xOrderFigures(&d, ps, e)
			}
		})
	}
}
