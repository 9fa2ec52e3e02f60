package stats

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"bivar/internal/reference"
)

func TestDescribeHand(t *testing.T) {
	t.Parallel()
	// Hyndman & Fan (1996) definition 7 on 1..10: h = 9p, so Q1 = x[2.25] =
	// 3.25, median 5.5, Q3 7.75 (also R's quantile(1:10), from memory).
	x := []float64{7, 1, 10, 3, 2, 9, 4, 8, 6, 5}
	s := Describe(x)
	want := Summary{N: 10, Mean: 5.5, SD: math.Sqrt(55.0 / 6), Min: 1, Q1: 3.25, Median: 5.5, Q3: 7.75, Max: 10}
	if s.N != want.N || !coreClose(s.Mean, want.Mean, 1e-15) || !coreClose(s.SD, want.SD, 1e-15) ||
		s.Min != want.Min || s.Q1 != want.Q1 || s.Median != want.Median || s.Q3 != want.Q3 || s.Max != want.Max {
		t.Errorf("Describe(1..10) = %+v, want %+v", s, want)
	}
	if x[0] != 7 {
		t.Error("Describe modified its input")
	}
	// Odd n: quartiles fall on order statistics (h = 0.25·4 = 1, 3).
	if q1, m, q3 := Quartiles([]float64{1, 2, 4, 8, 16}); q1 != 2 || m != 4 || q3 != 8 {
		t.Errorf("Quartiles(1,2,4,8,16) = %v %v %v", q1, m, q3)
	}
	if v := Quantile7([]float64{3}, 0.3); v != 3 {
		t.Errorf("Quantile7 of one value = %v", v)
	}
	if v := Quantile7([]float64{1, 2}, 1.5); !math.IsNaN(v) {
		t.Errorf("Quantile7(p=1.5) = %v, want NaN", v)
	}
	// Stability (Chan, Golub & LeVeque 1983): a large offset must not
	// change the SD. 1e9 + {4, 7, 13, 16} has variance exactly 30.
	s = Describe([]float64{1e9 + 4, 1e9 + 7, 1e9 + 13, 1e9 + 16})
	if s.Mean != 1e9+10 || !coreClose(s.SD, math.Sqrt(30), 1e-14) {
		t.Errorf("offset data: mean %v SD %.15g, want 1e9+10, √30", s.Mean, s.SD)
	}
	m := CentredMoments([]float64{1e9 + 4, 1e9 + 7, 1e9 + 13, 1e9 + 16}, []float64{1, 2, 3, 4})
	if m.Sxx != 90 || m.Sxy != 21 || m.Syy != 5 {
		t.Errorf("CentredMoments offset: %+v, want Sxx 90 Sxy 21 Syy 5", m)
	}
}

func TestDescribeReference(t *testing.T) {
	t.Parallel()
	// pandas 1.5.3 Series.mean() / Series.std(ddof=1), via refcheck.py on
	// Anscombe (1973) sets I and III (shared/reference/anscombe.csv).
	sets := reference.Anscombe(t)
	for _, tc := range []struct {
		set                  string
		my, sdy, sdx, lo, hi float64
	}{
		{"I", 7.500909090909093, 2.031568135925815, 3.3166247903554, 4.26, 10.84},
		{"III", 7.5, 2.030423601123667, 3.3166247903554, 5.39, 12.74},
	} {
		sx, sy := Describe(sets[tc.set][0]), Describe(sets[tc.set][1])
		if !coreClose(sy.Mean, tc.my, 1e-15) || !coreClose(sy.SD, tc.sdy, 1e-14) || !coreClose(sx.SD, tc.sdx, 1e-14) ||
			sx.Mean != 9 || sy.Min != tc.lo || sy.Max != tc.hi || sy.N != 11 {
			t.Errorf("set %s: x %+v y %+v", tc.set, sx, sy)
		}
	}
}

func TestDescribeEdges(t *testing.T) {
	t.Parallel()
	if s := Describe(nil); s.N != 0 || !math.IsNaN(s.Mean) || !math.IsNaN(s.Median) {
		t.Errorf("empty: %+v", s)
	}
	if s := Describe([]float64{4}); s.Mean != 4 || !math.IsNaN(s.SD) || s.Q1 != 4 || s.Max != 4 {
		t.Errorf("one value: %+v", s)
	}
	if s := Describe([]float64{1, math.NaN(), 3}); s.N != 3 || !math.IsNaN(s.Mean) || !math.IsNaN(s.Min) {
		t.Errorf("NaN input: %+v", s)
	}
	if s := Describe([]float64{2, 2, 2}); s.SD != 0 || s.Median != 2 {
		t.Errorf("constant: %+v", s)
	}
	if m := CentredMoments(nil, nil); m.N != 0 || !math.IsNaN(m.Sxx) {
		t.Errorf("empty moments: %+v", m)
	}
}

func TestQuantile7Properties(t *testing.T) {
	t.Parallel()
	// Definition 7 is the linear interpolation of the points
	// ((k−1)/(n−1), x_(k)): check that, monotonicity in p, and the ends.
	rng := rand.New(rand.NewPCG(3, 3))
	for trial := 0; trial < 200; trial++ {
		n := 2 + rng.IntN(30)
		x := make([]float64, n)
		for i := range x {
			x[i] = math.Round(rng.NormFloat64() * 10)
		}
		slices.Sort(x)
		if Quantile7(x, 0) != x[0] || Quantile7(x, 1) != x[n-1] {
			t.Fatal("ends")
		}
		for k := range x {
			if q := Quantile7(x, float64(k)/float64(n-1)); !coreClose(q, x[k], 1e-12) {
				t.Fatalf("Q(%d/%d) = %v, want x_(%d) = %v", k, n-1, q, k+1, x[k])
			}
		}
		prev := math.Inf(-1)
		for p := 0.0; p <= 1; p += 0.01 {
			q := Quantile7(x, p)
			if q < prev {
				t.Fatalf("not monotone at p = %v", p)
			}
			prev = q
		}
	}
}
