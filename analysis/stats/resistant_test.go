package stats

import (
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"bivar/internal/reference"
)

// TestTheilSenScipy checks the exact Theil–Sen line against scipy.
//
// Independent implementation: scipy 1.10.1, scipy.stats.theilslopes(y, x,
// method="joint") (slope, intercept), on the Anscombe (1973) sets read from
// shared/reference/anscombe.csv and on extraWavy(20261201, 60); printed
// with repr.
func TestTheilSenScipy(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name             string
		slope, intercept float64
	}{
		{"I", 0.5016666666666668, 2.9366666666666656},
		{"II", 0.5, 3.130000000000001},
		{"III", 0.3455555555555555, 4.004444444444445},
		{"IV", 0.5031818181818182, 2.9395454545454545},
		{"wavy", 0.1307700809523847, 4.578523846021385},
	}
	ans := reference.Anscombe(t)
	for _, tc := range cases {
		var x, y []float64
		if tc.name == "wavy" {
			x, y = extraWavy(20261201, 60)
		} else {
			x, y = ans[tc.name][0], ans[tc.name][1]
		}
		s, b, m := TheilSen(x, y, 0, nil)
		if !extraClose(s, tc.slope, 1e-12) || !extraClose(b, tc.intercept, 1e-12) {
			t.Errorf("TheilSen(%s) = %.17g, %.17g, want %.17g, %.17g", tc.name, s, b, tc.slope, tc.intercept)
		}
		if m != "theil-sen (exact)" {
			t.Errorf("TheilSen(%s) method %q", tc.name, m)
		}
	}
}

// TestTheilSen checks properties that hold for any data.
func TestTheilSen(t *testing.T) {
	t.Parallel()
	t.Run("resists-outliers", func(t *testing.T) {
		// Points on y = 1 + 2x with 10 of 60 moved far: more than half the
		// pairwise slopes are exactly 2 (50·49/2 of 1770), so the median is 2,
		// and the median of y − 2x is 1 (50 of 60 residuals are exactly 1).
		x := make([]float64, 60)
		y := make([]float64, 60)
		for i := range x {
			x[i] = float64(i)
			y[i] = 1 + 2*x[i]
			if i%6 == 0 {
				y[i] += 500
			}
		}
		s, b, _ := TheilSen(x, y, 0, nil)
		if s != 2 || b != 1 {
			t.Errorf("TheilSen(line with 10 outliers) = %v, %v, want 2, 1", s, b)
		}
	})
	t.Run("sampled", func(t *testing.T) {
		x, y := extraWavy(21, 1000)
		exact, _, m1 := TheilSen(x, y, 1000, nil)
		s, _, m := TheilSen(x, y, 300, rand.NewPCG(8, 9))
		if m1 != "theil-sen (exact)" {
			t.Errorf("n = maxExact: method %q, want exact", m1)
		}
		if !strings.Contains(m, "median of 44850 random pairs of 1000 points") {
			t.Errorf("sampled method %q", m)
		}
		// 44 850 sampled pairs: the sampled median's quantile among all
		// slopes has standard error 0.5/√M = 0.0024; check it within 0.02.
		var all []float64
		for i := range x {
			for j := i + 1; j < len(x); j++ {
				if x[j] != x[i] {
					all = append(all, (y[j]-y[i])/(x[j]-x[i]))
				}
			}
		}
		slices.Sort(all)
		lo := all[int(0.48*float64(len(all)))]
		hi := all[int(0.52*float64(len(all)))]
		if !(s >= lo && s <= hi) || !(exact >= lo && exact <= hi) {
			t.Errorf("sampled slope %v, exact %v, want both in the 48–52%% band [%v, %v]", s, exact, lo, hi)
		}
		s2, _, _ := TheilSen(x, y, 300, rand.NewPCG(8, 9))
		if s2 != s {
			t.Errorf("same seed, different slope: %v vs %v", s2, s)
		}
	})
	t.Run("edges", func(t *testing.T) {
		if s, b, _ := TheilSen([]float64{3, 3, 3}, []float64{1, 2, 3}, 0, nil); !math.IsNaN(s) || !math.IsNaN(b) {
			t.Errorf("TheilSen(constant x) = %v, %v, want NaN", s, b)
		}
		// One slope, (2−1)/(3−1) = 0.5; y − 0.5x = 0.5 and 0.5.
		if s, b, _ := TheilSen([]float64{1, 3}, []float64{1, 2}, 0, nil); s != 0.5 || b != 0.5 {
			t.Errorf("TheilSen(2 points) = %v, %v, want 0.5, 0.5", s, b)
		}
		if s, _, _ := TheilSen(nil, nil, 0, nil); !math.IsNaN(s) {
			t.Errorf("TheilSen(empty) = %v, want NaN", s)
		}
		// Sampled with all x equal: bounded redraws, then NaN.
		xc := make([]float64, 50)
		if s, _, _ := TheilSen(xc, xc, 5, nil); !math.IsNaN(s) {
			t.Errorf("TheilSen(constant x, sampled) = %v, want NaN", s)
		}
		if !extraPanics(func() { TheilSen([]float64{1, 2}, []float64{1}, 0, nil) }) {
			t.Error("TheilSen: no panic on length mismatch")
		}
	})
}

// plainSource hides a source's saved state, so TheilSen stores every
// sampled slope instead of streaming them.
type plainSource struct{ src rand.Source }

func (p plainSource) Uint64() uint64 { return p.src.Uint64() }

// TestTheilSenStreamed: the slope found while the sampled pairs stream past
// a bracket (a rewindable source) is the one found by storing them all and
// selecting (a source that cannot rewind), bit for bit; and where the draws
// run out before M slopes (x nearly constant), the source is rewound and
// the stored path gives the same line and count of pairs.
func TestTheilSenStreamed(t *testing.T) {
	t.Parallel()
	x, y := extraBenchXY(100_000)
	a := TheilSenFit(x, y, 0, rand.NewPCG(5, 6))
	b := TheilSenFit(x, y, 0, plainSource{rand.NewPCG(5, 6)})
	if a != b || a.Pairs != DefaultMaxExact*(DefaultMaxExact-1)/2 {
		t.Errorf("streamed %+v, stored %+v", a, b)
	}
	// Quantized values (a gauge reading to whole units): most slopes tie
	// at a few values, the median among them.
	qx, qy := make([]float64, len(x)), make([]float64, len(x))
	for i := range qx {
		qx[i], qy[i] = math.Floor(x[i]/4), math.Floor(y[i])
	}
	a = TheilSenFit(qx, qy, 0, rand.NewPCG(5, 6))
	b = TheilSenFit(qx, qy, 0, plainSource{rand.NewPCG(5, 6)})
	if a != b {
		t.Errorf("quantized: streamed %+v, stored %+v", a, b)
	}
	few := slices.Clone(x)
	for i := range few {
		if i%5000 != 0 {
			few[i] = 1 // 20 distinct values among 10⁵: most pairs tie in x
		}
	}
	a = TheilSenFit(few, y, 0, rand.NewPCG(5, 6))
	b = TheilSenFit(few, y, 0, plainSource{rand.NewPCG(5, 6)})
	if a != b || a.Pairs >= DefaultMaxExact*(DefaultMaxExact-1)/2 || a.Pairs == 0 {
		t.Errorf("draws run out: rewound %+v, stored %+v", a, b)
	}
}

// TestMedianInPlace checks the selection against sorting.
func TestMedianInPlace(t *testing.T) {
	t.Parallel()
	src := rand.NewPCG(3, 3)
	// Sizes from bracketMinN up take bracketMedian's path; "sample-fooled"
	// puts the smallest values exactly where its evenly spaced sample
	// looks, so that the bracket misses and the selection over all values
	// answers.
	for _, n := range []int{1, 2, 3, 16, 17, 100, 1001, 5000, bracketMinN, bracketMinN + 1, 200_001, 1 << 20} {
		for _, kind := range []string{"uniform", "few-values", "sorted", "reversed", "sample-fooled", "signed-zeros"} {
			a := make([]float64, n)
			for i := range a {
				switch kind {
				case "uniform":
					a[i] = extraUniform(src)
				case "few-values":
					a[i] = math.Floor(extraUniform(src) * 3)
				case "sorted":
					a[i] = float64(i)
				case "reversed":
					a[i] = float64(n - i)
				case "sample-fooled":
					a[i] = 1 + extraUniform(src)
				case "signed-zeros":
					a[i] = math.Copysign(0, extraUniform(src)-0.5)
				}
			}
			if kind == "few-values" && n >= bracketMinN {
				// A third of the values tie at the median: the bracket
				// closes on them and counts them instead of keeping them.
				if _, ok := bracketMedian(slices.Clone(a), nil, 0); !ok {
					t.Errorf("n=%d: values tied at the median made the bracket give up", n)
				}
			}
			if kind == "sample-fooled" && n >= bracketMinN {
				s := min(max(int(math.Cbrt(float64(n))*math.Cbrt(float64(n))), 4096), n/8)
				for t := range s {
					a[(2*t+1)*n/(2*s)] = -extraUniform(src)
				}
				if _, ok := bracketMedian(a, nil, 0); ok {
					t.Errorf("n=%d: the bracket of a sample of the smallest values claimed the median", n)
				}
			}
			s := slices.Clone(a)
			slices.Sort(s)
			want := s[n/2]
			if n%2 == 0 {
				want = s[n/2-1] + (s[n/2]-s[n/2-1])/2
			}
			if n >= bracketMinN && kind == "uniform" {
				// The residual form a − b·c, as Theil–Sen's intercept takes it.
				c := make([]float64, n)
				r := make([]float64, n)
				for i := range c {
					c[i] = extraUniform(src)
					r[i] = a[i] - 0.7*c[i]
				}
				slices.Sort(r)
				wantR := r[n/2]
				if n%2 == 0 {
					wantR = r[n/2-1] + (r[n/2]-r[n/2-1])/2
				}
				if got, ok := bracketMedian(a, c, 0.7); !ok || got != wantR {
					t.Errorf("median of a − 0.7c (n=%d) = %v (%v), want %v", n, got, ok, wantR)
				}
			}
			if got := medianInPlace(a); got != want || math.Signbit(got) {
				t.Errorf("median(%s, n=%d) = %v, want %v (a zero as +0)", kind, n, got, want)
			}
		}
	}
}

func benchmarkTheilSen(b *testing.B, n int) {
	x, y := extraBenchXY(n)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		TheilSen(x, y, 0, rand.NewPCG(1, 2))
	}
}

func BenchmarkTheilSen1e3(b *testing.B) { benchmarkTheilSen(b, 1e3) }
func BenchmarkTheilSen1e5(b *testing.B) { benchmarkTheilSen(b, 1e5) }
func BenchmarkTheilSen1e6(b *testing.B) { benchmarkTheilSen(b, 1e6) }
