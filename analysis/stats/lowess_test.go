package stats

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"bivar/internal/reference"
)

// TestLowessStatsmodels checks the fitted values against statsmodels.
//
// Independent implementation: statsmodels 0.13.5 (Debian 0.13.5+dfsg,
// Python 3.11, numpy 1.24.2), via /work/shared/tools/refcheck.py --vectors,
// which calls statsmodels.nonparametric.smoothers_lowess.lowess(y, x,
// frac=2/3, it=3, delta=deltaFrac*(max x - min x), return_sorted=False).
// Inputs: the Anscombe (1973) sets I-III read from shared/reference/
// anscombe.csv, and extraWavy(20261201, 60) (seeded, generator in
// extras_helpers_test.go; x has ties, row 7 an outlier). Values in input
// order, printed with repr (17 significant digits).
func TestLowessStatsmodels(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name      string
		set       string // Anscombe set, "" for extraWavy
		deltaFrac float64
		want      []float64
	}{
		{name: "anscombe-I", set: "I", deltaFrac: 0, want: []float64{
			8.286721225607943, 7.183938482554113, 9.254979185026311, 7.719766063630436, 8.549842875883778,
			9.625563739878043, 6.039836096931216, 4.72477694701479, 8.86499375066067, 6.714785023807136,
			5.389536385492182,
		}},
		{name: "anscombe-II", set: "II", deltaFrac: 0, want: []float64{
			8.977346262818932, 7.977346262818932, 8.627531191925023, 8.601283823870801, 9.09303280934174,
			8.34698543465023, 5.878858724248085, 3.3469854346502337, 8.878858724248087, 7.09303280934174,
			4.627531191925024,
		}},
		{name: "anscombe-III", set: "III", deltaFrac: 0, want: []float64{
			7.460093253782191, 6.7674892110081135, 8.49585926754714, 7.113622332978315, 7.806490436636709,
			8.840358047998343, 6.077696394610877, 5.388475125650607, 8.151212241628135, 6.422592640289209,
			5.733088672458893,
		}},
		{name: "wavy", set: "", deltaFrac: 0, want: []float64{
			5.956100321992206, 5.359136334943569, 6.067142228866662, 8.174419485775356, 6.067142228866662,
			5.773796275515245, 4.947534599051999, 5.087984770843899, 6.067142228866662, 5.4940616873033346,
			5.589378669454802, 8.686581757967563, 6.067142228866662, 5.633831771953752, 4.494493031489672,
			7.208953836125824, 5.558441268511936, 5.993303099747706, 6.254785268708063, 5.525649205642968,
			4.331701576268849, 5.660711480873137, 5.874579537003766, 8.427978151067572, 4.947534599051999,
			5.993303099747706, 8.427978151067572, 4.651345143512987, 7.444082056703514, 5.525649205642968,
			8.427978151067572, 5.525649205642968, 5.970421090772143, 4.331701576268849, 5.589378669454802,
			4.651345143512987, 5.672689098662539, 5.525649205642968, 5.993303099747706, 5.22463736498983,
			5.773796275515245, 6.743192945438545, 5.660711480873137, 5.531636795780894, 4.494493031489672,
			5.589378669454802, 8.427978151067572, 5.773796275515245, 5.087984770843899, 4.651345143512987,
			5.531636795780894, 7.926084678903528, 5.531636795780894, 5.22463736498983, 5.525649205642968,
			5.359136334943569, 6.254785268708063, 7.682820373265491, 6.976070102447674, 4.163271667204725,
		}},
		{name: "wavy-delta", set: "", deltaFrac: 0.12, want: []float64{
			5.956155732882581, 5.360691127123818, 6.06808610429733, 8.177117889863, 6.06808610429733,
			5.776643586045903, 4.937359432523679, 5.080774356976367, 6.06808610429733, 5.497192972818581,
			5.669800744352452, 8.684529403268858, 6.06808610429733, 5.633694818513344, 4.487753786694146,
			7.210589915302512, 5.562957902659001, 5.922364845171616, 6.201213677271603, 5.587547541742037,
			4.324977989769987, 5.661316458991144, 5.84950421560876, 8.42564236726802, 4.937359432523679,
			5.922364845171616, 8.42564236726802, 4.650529583618304, 7.445329425177736, 5.587547541742037,
			8.42564236726802, 5.587547541742037, 5.931265068131373, 4.324977989769987, 5.669800744352452,
			4.650529583618304, 5.723222165199178, 5.587547541742037, 5.922364845171616, 5.224189281429054,
			5.776643586045903, 6.741110895552063, 5.661316458991144, 5.616379323505726, 4.487753786694146,
			5.669800744352452, 8.42564236726802, 5.776643586045903, 5.080774356976367, 4.650529583618304,
			5.616379323505726, 7.928593412457982, 5.616379323505726, 5.224189281429054, 5.587547541742037,
			5.360691127123818, 6.201213677271603, 7.680068935052961, 6.975850405427288, 4.16220219284583,
		}},
	}
	var ans map[string][2][]float64
	for _, tc := range cases {
		var x, y []float64
		if tc.set != "" {
			if ans == nil {
				ans = reference.Anscombe(t)
			}
			x, y = ans[tc.set][0], ans[tc.set][1]
		} else {
			x, y = extraWavy(20261201, 60)
		}
		delta := tc.deltaFrac * (slices.Max(x) - slices.Min(x))
		got := Lowess(x, y, 2.0/3, 3, delta)
		for i := range got {
			// The reference printed 17 digits; both sides round the same
			// sums in a different order: 1e-12 relative.
			if !extraClose(got[i], tc.want[i], 1e-12) {
				t.Errorf("Lowess(%s)[%d] (x = %g) = %.17g, want %.17g", tc.name, i, x[i], got[i], tc.want[i])
			}
		}
	}
}

// TestLowessTiedWindow checks the one deliberate difference from
// statsmodels: where k or more points share x_i the fit is the mean of all
// of them (Cleveland 1979's own routine), not y_i of the first.
// Anscombe (1973) set IV: ten points at x = 8 with y summing to 70.01 (by
// hand from the published table), one at x = 19 with y = 12.50.
func TestLowessTiedWindow(t *testing.T) {
	t.Parallel()
	s := reference.Anscombe(t)["IV"]
	x, y := s[0], s[1]
	got := Lowess(x, y, 2.0/3, 0, 0)
	for i := range x {
		want := 7.001 // 70.01 / 10
		if x[i] == 19 {
			// Only the point itself has nonzero weight: the fit is y_i, as in
			// statsmodels (12.5 there too).
			want = 12.5
		}
		if !extraClose(got[i], want, 1e-12) {
			t.Errorf("Lowess(anscombe-IV, it=0)[%d] = %.15g, want %.15g", i, got[i], want)
		}
	}
	// With robustifying iterations all ten tied points still share one fit.
	got = Lowess(x, y, 2.0/3, 3, 0)
	for i := range x {
		if x[i] == 8 && got[i] != got[0] {
			t.Errorf("Lowess(anscombe-IV)[%d] = %v, want the shared tie value %v", i, got[i], got[0])
		}
	}
}

// TestLowessIdentities checks properties that hold for any data.
func TestLowessIdentities(t *testing.T) {
	t.Parallel()
	x, y := extraWavy(7, 300)
	base := Lowess(x, y, 0.4, 2, 0)

	t.Run("exact-line", func(t *testing.T) {
		// A local line through points on a line is that line.
		yl := make([]float64, len(x))
		for i := range x {
			yl[i] = 2.5 - 0.75*x[i]
		}
		for _, delta := range []float64{0, 1.3} {
			f := Lowess(x, yl, 0.3, 3, delta)
			for i := range f {
				if !extraClose(f[i], yl[i], 1e-11) {
					t.Fatalf("Lowess(line, delta=%g)[%d] = %v, want %v", delta, i, f[i], yl[i])
				}
			}
		}
	})
	t.Run("input-order", func(t *testing.T) {
		// Reversing the rows reverses the fit (ties in x have radius > 0 here,
		// so their order does not matter).
		n := len(x)
		xr, yr := make([]float64, n), make([]float64, n)
		for i := range x {
			xr[n-1-i], yr[n-1-i] = x[i], y[i]
		}
		fr := Lowess(xr, yr, 0.4, 2, 0)
		for i := range base {
			if !extraClose(fr[n-1-i], base[i], 1e-12) {
				t.Fatalf("reversed rows: fit[%d] = %v, want %v", i, fr[n-1-i], base[i])
			}
		}
	})
	t.Run("units", func(t *testing.T) {
		// x in other units (scale and offset) and y scaled: the fit follows.
		xs, ys := make([]float64, len(x)), make([]float64, len(x))
		for i := range x {
			xs[i] = 1e-6*x[i] + 3e-4
			ys[i] = 1000 * y[i]
		}
		f := Lowess(xs, ys, 0.4, 2, 0)
		for i := range f {
			if !extraClose(f[i], 1000*base[i], 1e-9) {
				t.Fatalf("rescaled: fit[%d] = %v, want %v", i, f[i], 1000*base[i])
			}
		}
	})
	t.Run("ties-share", func(t *testing.T) {
		for i := range x {
			for j := i + 1; j < len(x); j++ {
				if x[i] == x[j] && base[i] != base[j] {
					t.Fatalf("tied x[%d] = x[%d] = %g: fits %v and %v differ", i, j, x[i], base[i], base[j])
				}
			}
		}
	})
	t.Run("nan-rows", func(t *testing.T) {
		xn := append(slices.Clone(x), math.NaN(), 4)
		yn := append(slices.Clone(y), 1, math.Inf(1))
		f := Lowess(xn, yn, 0.4, 2, 0)
		if !math.IsNaN(f[len(x)]) || !math.IsNaN(f[len(x)+1]) {
			t.Errorf("non-finite rows: fit = %v, %v, want NaN, NaN", f[len(x)], f[len(x)+1])
		}
		for i := range base {
			if f[i] != base[i] {
				t.Fatalf("non-finite rows changed the fit at %d: %v, want %v", i, f[i], base[i])
			}
		}
	})
	t.Run("too-few", func(t *testing.T) {
		if f := Lowess([]float64{1}, []float64{2}, 0.5, 1, 0); len(f) != 1 || !math.IsNaN(f[0]) {
			t.Errorf("Lowess(n=1) = %v, want [NaN]", f)
		}
		if f := Lowess(nil, nil, 0.5, 1, 0); len(f) != 0 {
			t.Errorf("Lowess(empty) = %v, want []", f)
		}
		if xs, ys := LowessCurve([]float64{1}, []float64{2}, 0.5, 1, 0); xs != nil || ys != nil {
			t.Errorf("LowessCurve(n=1) = %v, %v, want nil", xs, ys)
		}
	})
	t.Run("panics", func(t *testing.T) {
		if !extraPanics(func() { Lowess([]float64{1, 2}, []float64{1}, 0.5, 0, 0) }) {
			t.Error("Lowess: no panic on length mismatch")
		}
	})
}

// TestLowessCurve checks the plotting curve against the fitted values.
func TestLowessCurve(t *testing.T) {
	t.Parallel()
	// Continuous x, n above LowessAutoDeltaN, so delta is chosen.
	src := rand.NewPCG(11, 0)
	x, y := make([]float64, 5000), make([]float64, 5000)
	for i := range x {
		x[i] = 20 * extraUniform(src)
		y[i] = math.Sin(x[i]/2) + extraUniform(src)
	}
	fit := Lowess(x, y, 0.3, 2, -1)
	xs, ys := LowessCurve(x, y, 0.3, 2, -1)
	if len(xs) < 3 || len(xs) > LowessCurveMax || len(xs) != len(ys) {
		t.Fatalf("LowessCurve: %d, %d points", len(xs), len(ys))
	}
	if xs[0] != slices.Min(x) || xs[len(xs)-1] != slices.Max(x) {
		t.Errorf("LowessCurve spans [%v, %v], want [%v, %v]", xs[0], xs[len(xs)-1], slices.Min(x), slices.Max(x))
	}
	strictly := func(v []float64) bool {
		for k := 1; k < len(v); k++ {
			if !(v[k] > v[k-1]) {
				return false
			}
		}
		return true
	}
	if !strictly(xs) {
		t.Error("LowessCurve: x not strictly increasing")
	}
	// Ties in x, the last x repeated: one curve point per distinct x.
	xw, yw := extraWavy(20261201, 60)
	cx, cy := LowessCurve(xw, yw, 2.0/3, 3, 0)
	distinct := slices.Compact(slices.Sorted(slices.Values(xw)))
	if !slices.Equal(cx, distinct) || len(cy) != len(cx) {
		t.Errorf("LowessCurve(wavy) x = %v, want the distinct x %v", cx, distinct)
	}
	// Each curve point is the fitted value of the points at that x.
	for k := range xs {
		for i := range x {
			if x[i] == xs[k] && !extraClose(fit[i], ys[k], 1e-12) {
				t.Fatalf("curve (%v, %v) but Lowess gives %v at x[%d]", xs[k], ys[k], fit[i], i)
			}
		}
	}
	// The fit at every point lies on the curve's linear interpolation (the
	// delta rule interpolates between anchors).
	for i := range x {
		k, _ := slices.BinarySearch(xs, x[i])
		var c float64
		if xs[k] == x[i] {
			c = ys[k]
		} else {
			a := (x[i] - xs[k-1]) / (xs[k] - xs[k-1])
			c = a*ys[k] + (1-a)*ys[k-1]
		}
		if !extraClose(fit[i], c, 1e-9) {
			t.Fatalf("fit[%d] = %v off the curve (%v)", i, fit[i], c)
		}
	}
}

func benchmarkLowess(b *testing.B, n int) {
	x, y := extraBenchXY(n)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		Lowess(x, y, 2.0/3, 3, -1)
	}
}

func BenchmarkLowess1e3(b *testing.B) { benchmarkLowess(b, 1e3) }
func BenchmarkLowess1e5(b *testing.B) { benchmarkLowess(b, 1e5) }
func BenchmarkLowess1e6(b *testing.B) { benchmarkLowess(b, 1e6) }
