package stats

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestAdjustStatsmodels checks Holm and Benjamini–Hochberg against
// statsmodels.
//
// Independent implementation: statsmodels 0.13.5,
// statsmodels.stats.multitest.multipletests(p, method="holm")[1] and
// (p, method="fdr_bh")[1], p as below (ties, a value capped at 1);
// printed with repr. statsmodels does not accept NaN: the NaN case is
// checked by identity below.
func TestAdjustStatsmodels(t *testing.T) {
	t.Parallel()
	p := []float64{0.01, 0.04, 0.03, 0.005, 0.2, 0.04, 0.5, 0.9, 0.0001, 0.04}
	holm := []float64{0.08, 0.24, 0.21, 0.045, 0.6000000000000001, 0.24, 1.0, 1.0, 0.001, 0.24}
	bh := []float64{0.03333333333333333, 0.05714285714285715, 0.05714285714285715, 0.024999999999999998,
		0.25, 0.05714285714285715, 0.5555555555555556, 0.9, 0.001, 0.05714285714285715}
	in := slices.Clone(p)
	gh, gb := Holm(p), BenjaminiHochberg(p)
	if !slices.Equal(in, p) {
		t.Fatal("adjustment modified its input")
	}
	for i := range p {
		if !extraClose(gh[i], holm[i], 1e-15) {
			t.Errorf("Holm[%d] = %.17g, want %.17g", i, gh[i], holm[i])
		}
		if !extraClose(gb[i], bh[i], 1e-15) {
			t.Errorf("BenjaminiHochberg[%d] = %.17g, want %.17g", i, gb[i], bh[i])
		}
	}

	t.Run("nan-kept-out", func(t *testing.T) {
		// NaN entries stay NaN and do not count: the others are adjusted as
		// if the NaN were absent.
		withNaN := []float64{math.NaN(), p[0], p[1], math.NaN(), p[2], p[3], p[4], p[5], p[6], p[7], p[8], p[9], math.NaN()}
		for name, f := range map[string]func([]float64) []float64{"Holm": Holm, "BenjaminiHochberg": BenjaminiHochberg} {
			got := f(withNaN)
			want := f(p)
			k := 0
			for i, v := range withNaN {
				if math.IsNaN(v) {
					if !math.IsNaN(got[i]) {
						t.Errorf("%s: NaN at %d became %v", name, i, got[i])
					}
					continue
				}
				if got[i] != want[k] {
					t.Errorf("%s with NaN [%d] = %v, want %v", name, i, got[i], want[k])
				}
				k++
			}
		}
	})
	t.Run("properties", func(t *testing.T) {
		// For any p: adjusted ≥ raw, ≤ 1, same order as raw, BH ≤ Holm.
		src := rand.NewPCG(6, 6)
		q := make([]float64, 500)
		for i := range q {
			u := extraUniform(src)
			q[i] = u * u * u
		}
		h, b := Holm(q), BenjaminiHochberg(q)
		for i := range q {
			if h[i] < q[i] || h[i] > 1 || b[i] < q[i] || b[i] > 1 || b[i] > h[i] {
				t.Fatalf("p %v: Holm %v, BH %v out of order", q[i], h[i], b[i])
			}
			for j := range q {
				if q[i] < q[j] && (h[i] > h[j] || b[i] > b[j]) {
					t.Fatalf("not monotone: p %v < %v but Holm %v, %v; BH %v, %v", q[i], q[j], h[i], h[j], b[i], b[j])
				}
			}
		}
		// A single test is not adjusted.
		if h := Holm([]float64{0.03}); h[0] != 0.03 {
			t.Errorf("Holm(one) = %v", h)
		}
		if b := BenjaminiHochberg([]float64{0.03}); b[0] != 0.03 {
			t.Errorf("BH(one) = %v", b)
		}
		if h := Holm(nil); len(h) != 0 {
			t.Errorf("Holm(nil) = %v", h)
		}
	})
}

func benchmarkAdjust(b *testing.B, n int, f func([]float64) []float64) {
	src := rand.NewPCG(6, 6)
	p := make([]float64, n)
	for i := range p {
		p[i] = extraUniform(src)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		f(p)
	}
}

func BenchmarkHolm1e3(b *testing.B)              { benchmarkAdjust(b, 1e3, Holm) }
func BenchmarkHolm1e5(b *testing.B)              { benchmarkAdjust(b, 1e5, Holm) }
func BenchmarkHolm1e6(b *testing.B)              { benchmarkAdjust(b, 1e6, Holm) }
func BenchmarkBenjaminiHochberg1e3(b *testing.B) { benchmarkAdjust(b, 1e3, BenjaminiHochberg) }
func BenchmarkBenjaminiHochberg1e5(b *testing.B) { benchmarkAdjust(b, 1e5, BenjaminiHochberg) }
func BenchmarkBenjaminiHochberg1e6(b *testing.B) { benchmarkAdjust(b, 1e6, BenjaminiHochberg) }
