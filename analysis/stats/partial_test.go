package stats

import (
	"math"
	"testing"
)

// TestPartialCorrelation checks r, p and the interval against numpy/scipy
// and pandas.
//
// Independent implementation (pingouin is not installed, so from the
// residual definition): numpy 1.24.2 / scipy 1.10.1 on extraLurk(42, 40),
// one-off command:
//
//	Z = column_stack([ones, z]); ex = x - Z @ lstsq(Z, x)[0]; ey likewise
//	r = corrcoef(ex, ey)[0, 1]; t = r*sqrt((n-3)/(1-r*r)); p = 2*t.sf(|t|, n-3)
//	h = norm.ppf(0.975)/sqrt(n-4); lo, hi = tanh(arctanh(r) -+ h)
//
// and, as a second route, pandas 1.5.3 DataFrame.corr() put into
// (r_xy − r_xz·r_yz)/√((1−r_xz²)(1−r_yz²)) = 0.24653834298641622.
// Printed with repr.
func TestPartialCorrelation(t *testing.T) {
	t.Parallel()
	x, y, z := extraLurk(42, 40)
	r, lo, hi, p := PartialCorrelation(x, y, z, 0.95)
	const (
		wantR  = 0.2465383429864287
		wantP  = 0.13027912718905096
		wantLo = -0.07479694173027178
		wantHi = 0.5214902087281218
		pandas = 0.24653834298641622
	)
	if !extraClose(r, wantR, 1e-12) || !extraClose(r, pandas, 1e-12) {
		t.Errorf("PartialCorrelation r = %.17g, want %.17g (numpy), %.17g (pandas)", r, wantR, pandas)
	}
	// Measured agreement: 1e-15 for p and both ends of the interval.
	if !extraClose(p, wantP, 1e-13) || !extraClose(lo, wantLo, 1e-13) || !extraClose(hi, wantHi, 1e-13) {
		t.Errorf("PartialCorrelation p, CI = %.17g, [%.17g, %.17g]; want %.17g, [%.17g, %.17g]", p, lo, hi, wantP, wantLo, wantHi)
	}
	// The raw r_xy is 0.96 (pandas): the covariate carries the association.
	if c := Pearson(x, y, 0.95); !extraClose(c.R, 0.9597645807668056, 1e-12) {
		t.Errorf("Pearson(lurk) = %.17g, want 0.9597645807668056 (pandas)", c.R)
	}

	t.Run("identities", func(t *testing.T) {
		// Symmetric in x and y; unchanged by a change of units of any column.
		if r2, _, _, _ := PartialCorrelation(y, x, z, 0.95); !extraClose(r2, r, 1e-13) {
			t.Errorf("r(y, x | z) = %v, want r(x, y | z) = %v", r2, r)
		}
		xs, ys, zs := make([]float64, len(x)), make([]float64, len(x)), make([]float64, len(x))
		for i := range x {
			xs[i] = 1000*x[i] - 7
			ys[i] = -0.01 * y[i]
			zs[i] = 1.8*z[i] + 32
		}
		if r2, _, _, _ := PartialCorrelation(xs, ys, zs, 0.95); !extraClose(r2, -r, 1e-12) {
			t.Errorf("after a change of units r = %v, want %v (sign follows the y scale)", r2, -r)
		}
	})
	t.Run("edges", func(t *testing.T) {
		c := []float64{1, 1, 1, 1, 1}
		v := []float64{1, 2, 3, 4, 5}
		w := []float64{2, 1, 4, 3, 6}
		if r, _, _, _ := PartialCorrelation(v, w, c, 0.95); !math.IsNaN(r) {
			t.Errorf("constant z: r = %v, want NaN", r)
		}
		// x an exact linear function of z: nothing left to correlate.
		zl := []float64{0.1, 0.2, 0.3, 0.4, 0.5}
		if r, _, _, _ := PartialCorrelation(v, w, zl, 0.95); !math.IsNaN(r) {
			t.Errorf("x linear in z: r = %v, want NaN", r)
		}
		// n = 4: p defined (df 1), interval not (n−4 = 0).
		r, lo, _, p := PartialCorrelation(v[:4], w[:4], []float64{1, 3, 2, 5}, 0.95)
		if math.IsNaN(r) || math.IsNaN(p) || !math.IsNaN(lo) {
			t.Errorf("n = 4: r %v, p %v, lo %v; want r and p defined, lo NaN", r, p, lo)
		}
		if !extraPanics(func() { PartialCorrelation(v, w, v[:3], 0.95) }) {
			t.Error("PartialCorrelation: no panic on length mismatch")
		}
	})
}

func benchmarkPartial(b *testing.B, n int) {
	x, y, z := extraLurk(42, n)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		PartialCorrelation(x, y, z, 0.95)
	}
}

func BenchmarkPartialCorrelation1e3(b *testing.B) { benchmarkPartial(b, 1e3) }
func BenchmarkPartialCorrelation1e5(b *testing.B) { benchmarkPartial(b, 1e5) }
func BenchmarkPartialCorrelation1e6(b *testing.B) { benchmarkPartial(b, 1e6) }
