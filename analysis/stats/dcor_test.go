package stats

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"bivar/internal/reference"
)

// dcorDirect is the O(n²) definition (Székely, Rizzo & Bakirov 2007, eq.
// 2.8) with the double-centred distance matrices formed explicitly: the
// independent route the fast algorithm is checked against.
func dcorDirect(x, y []float64) float64 {
	n := len(x)
	centre := func(v []float64) [][]float64 {
		a := make([][]float64, n)
		row := make([]float64, n)
		var all float64
		for i := range a {
			a[i] = make([]float64, n)
			for j := range a[i] {
				a[i][j] = math.Abs(v[i] - v[j])
				row[i] += a[i][j]
			}
			all += row[i]
			row[i] /= float64(n)
		}
		all /= float64(n * n)
		for i := range a {
			for j := range a[i] {
				a[i][j] += all - row[i] - row[j]
			}
		}
		return a
	}
	A, B := centre(x), centre(y)
	var ab, aa, bb float64
	for i := range A {
		for j := range A[i] {
			ab += A[i][j] * B[i][j]
			aa += A[i][j] * A[i][j]
			bb += B[i][j] * B[i][j]
		}
	}
	r2 := ab / math.Sqrt(aa*bb)
	return math.Sqrt(math.Max(0, r2))
}

// TestDistanceCorrelation checks dCor against a hand-worked case and an
// independent computation.
func TestDistanceCorrelation(t *testing.T) {
	t.Parallel()
	t.Run("by-hand", func(t *testing.T) {
		// x = (−1, 0, 1), y = x² = (1, 0, 1): worked by hand from the
		// definition, Σ A∘B = 8/9, Σ A∘A = 360/81, Σ B∘B = 144/81, so
		// dCor² = 72/√51840 = 1/√10 and dCor = 10^(−1/4), although r = 0.
		got := DistanceCorrelation([]float64{-1, 0, 1}, []float64{1, 0, 1})
		if want := math.Pow(10, -0.25); !extraClose(got, want, 1e-14) {
			t.Errorf("DistanceCorrelation(hump of 3) = %.17g, want 10^(-1/4) = %.17g", got, want)
		}
	})
	t.Run("numpy", func(t *testing.T) {
		// Independent implementation: numpy 1.24.2 from the definition
		// (scipy 1.10 has no distance correlation), one-off command:
		//   a = abs(x[:,None]-x[None,:]); A = a - a.mean(0)[None,:] - a.mean(1)[:,None] + a.mean()
		//   (same for b, B); sqrt((A*B).mean() / sqrt((A*A).mean() * (B*B).mean()))
		// on Anscombe (1973) sets read from shared/reference/anscombe.csv and
		// extraWavy(20261201, 60); printed with repr.
		want := map[string]float64{
			"I":    0.8239139124427381,
			"II":   0.8688329393537616,
			"III":  0.9064762345920996,
			"IV":   0.8067980878610194,
			"wavy": 0.5687230042152595,
		}
		ans := reference.Anscombe(t)
		for name, w := range want {
			var x, y []float64
			if name == "wavy" {
				x, y = extraWavy(20261201, 60)
			} else {
				x, y = ans[name][0], ans[name][1]
			}
			if got := DistanceCorrelation(x, y); !extraClose(got, w, 1e-12) {
				t.Errorf("DistanceCorrelation(%s) = %.17g, want %.17g", name, got, w)
			}
		}
	})
	t.Run("fast-equals-direct", func(t *testing.T) {
		// Ties in x (grid) and in y (rounded), n = 400.
		x, y := extraWavy(5, 400)
		for i := range y {
			y[i] = math.Round(y[i]*4) / 4
		}
		got, want := DistanceCorrelation(x, y), dcorDirect(x, y)
		if !extraClose(got, want, 1e-11) {
			t.Errorf("fast dCor = %.17g, direct O(n²) = %.17g", got, want)
		}
	})
	t.Run("identities", func(t *testing.T) {
		x, y := extraWavy(9, 200)
		base := DistanceCorrelation(x, y)
		xs := make([]float64, len(x))
		ys := make([]float64, len(y))
		for i := range x {
			xs[i] = -1e-3*x[i] + 40
			ys[i] = 1e6 * y[i]
		}
		if got := DistanceCorrelation(xs, ys); !extraClose(got, base, 1e-12) {
			t.Errorf("dCor after a change of units = %v, want %v", got, base)
		}
		if got := DistanceCorrelation(y, x); !extraClose(got, base, 1e-12) {
			t.Errorf("dCor(y, x) = %v, want dCor(x, y) = %v", got, base)
		}
		line := make([]float64, len(x))
		for i := range x {
			line[i] = 3 - 2*x[i]
		}
		if got := DistanceCorrelation(x, line); !extraClose(got, 1, 1e-12) {
			t.Errorf("dCor of an exact line = %v, want 1", got)
		}
		if got := DistanceCorrelation([]float64{1, 2}, []float64{5, 3}); !extraClose(got, 1, 1e-12) {
			t.Errorf("dCor(n=2) = %v, want 1", got)
		}
		if got := DistanceCorrelation([]float64{1, 2, 3}, []float64{4, 4, 4}); !math.IsNaN(got) {
			t.Errorf("dCor(constant y) = %v, want NaN", got)
		}
		if got := DistanceCorrelation([]float64{1}, []float64{4}); !math.IsNaN(got) {
			t.Errorf("dCor(n=1) = %v, want NaN", got)
		}
		if !extraPanics(func() { DistanceCorrelation([]float64{1, 2}, []float64{1}) }) {
			t.Error("DistanceCorrelation: no panic on length mismatch")
		}
	})
}

// TestDistanceCorrTest checks the permutation test.
func TestDistanceCorrTest(t *testing.T) {
	t.Parallel()
	t.Run("same-as-direct-permutations", func(t *testing.T) {
		// The p-value equals that of the same permutations scored by the
		// direct O(n²) definition. Weak dependence, so p is not at an end.
		x, y := extraWavy(13, 60)
		src := rand.NewPCG(5, 0)
		for i := range y {
			y[i] = extraUniform(src) + 0.01*x[i]
		}
		const perms = 99
		_, p, used, _ := DistanceCorrTest(x, y, perms, 0, rand.NewPCG(4, 4))
		rng := rand.New(rand.NewPCG(4, 4))
		obs := dcorDirect(x, y)
		perm := make([]int, len(x))
		for i := range perm {
			perm[i] = i
		}
		yp := make([]float64, len(y))
		ge := 0
		for range perms {
			rng.Shuffle(len(perm), func(i, j int) { perm[i], perm[j] = perm[j], perm[i] })
			for i := range yp {
				yp[i] = y[perm[i]]
			}
			if dcorDirect(x, yp) >= obs*(1-1e-12) {
				ge++
			}
		}
		want := float64(1+ge) / (perms + 1)
		if !(want > 0.05 && want < 0.95) {
			t.Fatalf("test data give p = %v from the direct permutations; want one away from the ends", want)
		}
		if p != want || used != len(x) {
			t.Errorf("DistanceCorrTest p = %v (used %d), want %v from direct permutations (used %d)", p, used, want, len(x))
		}
	})
	t.Run("hump", func(t *testing.T) {
		// y = x² on symmetric x: r = 0 but clear dependence; no permutation
		// of 100 points reaches it, so p is the smallest possible, 1/(B+1).
		x := make([]float64, 100)
		y := make([]float64, 100)
		for i := range x {
			x[i] = float64(i-50) / 10
			y[i] = x[i] * x[i]
		}
		d, p, _, method := DistanceCorrTest(x, y, 199, 0, rand.NewPCG(1, 1))
		if p != 1.0/200 || !(d > 0.4) {
			t.Errorf("hump: dCor = %v, p = %v, want p = 1/200", d, p)
		}
		if !strings.Contains(method, "199 permutations") {
			t.Errorf("method %q does not say how many permutations", method)
		}
	})
	t.Run("sampled", func(t *testing.T) {
		x, y := extraWavy(17, 3000)
		d, p, used, method := DistanceCorrTest(x, y, 49, 500, rand.NewPCG(2, 3))
		if used != 500 || !strings.Contains(method, "random sample of 500 rows") {
			t.Errorf("n = 3000, maxN = 500: used %d, method %q", used, method)
		}
		if want := DistanceCorrelation(x, y); d != want {
			t.Errorf("sampled test: dCor = %v, want the full-data %v", d, want)
		}
		if !(p >= 1.0/50 && p <= 1) {
			t.Errorf("p = %v outside [1/50, 1]", p)
		}
		d2, p2, _, _ := DistanceCorrTest(x, y, 49, 500, rand.NewPCG(2, 3))
		if d2 != d || p2 != p {
			t.Errorf("same seed, different result: %v %v vs %v %v", d2, p2, d, p)
		}
	})
	t.Run("independent", func(t *testing.T) {
		// Independent columns: over 40 seeded data sets the p-values are
		// roughly uniform; fewer than 12 below 0.1 (expected 4; the
		// binomial(40, 0.1) tail beyond 11 is about 1e-3).
		src := rand.NewPCG(99, 0)
		low := 0
		for k := range 40 {
			x, y := make([]float64, 50), make([]float64, 50)
			for i := range x {
				x[i], y[i] = extraUniform(src), extraUniform(src)
			}
			_, p, _, _ := DistanceCorrTest(x, y, 99, 0, rand.NewPCG(uint64(k), 7))
			if p < 0.1 {
				low++
			}
		}
		if low >= 12 {
			t.Errorf("%d of 40 independent sets have p < 0.1", low)
		}
	})
	t.Run("edges", func(t *testing.T) {
		x, y := extraWavy(1, 20)
		if _, p, _, m := DistanceCorrTest(x, y, 0, 0, nil); !math.IsNaN(p) || !strings.Contains(m, "no permutation test") {
			t.Errorf("perms = 0: p = %v, method %q", p, m)
		}
		if d, p, _, _ := DistanceCorrTest([]float64{1, 2}, []float64{3, 4}, 9, 0, nil); !math.IsNaN(d) || !math.IsNaN(p) {
			t.Errorf("n = 2: %v, %v, want NaN", d, p)
		}
		if !extraPanics(func() { DistanceCorrTest([]float64{1, 2}, []float64{1}, 9, 0, nil) }) {
			t.Error("DistanceCorrTest: no panic on length mismatch")
		}
	})
}

func benchmarkDcor(b *testing.B, n int) {
	x, y := extraBenchXY(n)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		DistanceCorrelation(x, y)
	}
}

func BenchmarkDistanceCorrelation1e3(b *testing.B) { benchmarkDcor(b, 1e3) }
func BenchmarkDistanceCorrelation1e5(b *testing.B) { benchmarkDcor(b, 1e5) }
func BenchmarkDistanceCorrelation1e6(b *testing.B) { benchmarkDcor(b, 1e6) }

func benchmarkDcorTest(b *testing.B, n int) {
	x, y := extraBenchXY(n)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		DistanceCorrTest(x, y, 999, 0, rand.NewPCG(1, 2))
	}
}

func BenchmarkDistanceCorrTest1e3(b *testing.B) { benchmarkDcorTest(b, 1e3) }
func BenchmarkDistanceCorrTest1e5(b *testing.B) { benchmarkDcorTest(b, 1e5) }
func BenchmarkDistanceCorrTest1e6(b *testing.B) { benchmarkDcorTest(b, 1e6) }
