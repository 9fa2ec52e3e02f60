package stats

// Tests of planning.go: printed worked examples of the Fisher-z sample
// size, the defining property of each search (the smallest n that meets
// the target), and a seeded simulation of the achieved power.

import (
	"math"
	"math/rand/v2"
	"testing"
)

func TestNForCorrelationPowerPrinted(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		source          string
		r, alpha, power float64
		want            int
	}{
		// Lachin (1981), Controlled Clinical Trials 2:93–113, as worked on
		// https://www2.ccrb.cuhk.edu.hk/stat/other/correlation.htm ("Example"):
		// r = 0.4, two-sided α = 0.05, power 80 % → n = 47.
		{"Lachin 1981 via CUHK", 0.4, 0.05, 0.80, 47},
		// Le, Introductory Biostatistics (Wiley 2003), Example 12.3, p. 455 (a
		// public copy at issuhub.com): ρ_A = 0.6, α = 0.05 (z = 1.96), power
		// 90 % (z = 1.28) → n = 25.
		{"Le 2003 Example 12.3", 0.6, 0.05, 0.90, 25},
	} {
		if got := NForCorrelationPower(tc.r, tc.alpha, tc.power); got != tc.want {
			t.Errorf("%s: NForCorrelationPower(%v, %v, %v) = %d, printed %d", tc.source, tc.r, tc.alpha, tc.power, got, tc.want)
		}
		if got := NForCorrelationPower(-tc.r, tc.alpha, tc.power); got != tc.want {
			t.Errorf("%s: negative r gives %d", tc.source, got)
		}
	}
}

// At the n returned the power reaches the target, one row fewer it does
// not (CorrelationPower includes the far tail the formula neglects, which
// is below 1e-3 here, so the bracket holds to that).
func TestNForCorrelationPowerBracket(t *testing.T) {
	t.Parallel()
	for _, r := range []float64{0.05, 0.1, 0.3, 0.5, 0.8, -0.45} {
		for _, power := range []float64{0.8, 0.9} {
			n := NForCorrelationPower(r, 0.05, power)
			if p := CorrelationPower(r, n, 0.05); p < power {
				t.Errorf("r=%v power %v: n=%d gives %.4f", r, power, n, p)
			}
			if n > 4 {
				if p := CorrelationPower(r, n-1, 0.05); p >= power+1e-3 {
					t.Errorf("r=%v power %v: n−1=%d already gives %.4f", r, power, n-1, p)
				}
			}
		}
	}
}

// A seeded simulation of the achieved power: bivariate normal with ρ =
// 0.3, n = NForCorrelationPower(0.3, 0.05, 0.8) rows, 4000 runs, each
// tested two-sided at 0.05 with the t test of Pearson's r (Pearson(…).P).
// The share of rejections must lie within 4 Monte Carlo SE of
// CorrelationPower(0.3, n, 0.05) (and of the 0.8 aimed at, plus the
// rounding up of n).
func TestCorrelationPowerSimulation(t *testing.T) {
	t.Parallel()
	const rho, alpha, runs = 0.3, 0.05, 4000
	n := NForCorrelationPower(rho, alpha, 0.8)
	want := CorrelationPower(rho, n, alpha)
	rng := rand.New(rand.NewPCG(85, 14))
	x, y := make([]float64, n), make([]float64, n)
	hits := 0
	for range runs {
		for i := range x {
			x[i] = rng.NormFloat64()
			y[i] = rho*x[i] + math.Sqrt(1-rho*rho)*rng.NormFloat64()
		}
		if Pearson(x, y, 0.95).P < alpha {
			hits++
		}
	}
	got := float64(hits) / runs
	se := math.Sqrt(want * (1 - want) / runs)
	if math.Abs(got-want) > 4*se {
		t.Errorf("n=%d: simulated power %.4f, Fisher-z power %.4f ± %.4f", n, got, want, 4*se)
	}
}

func TestNForCorrelationHalfWidth(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ r, h, conf float64 }{
		{0, 0.1, 0.95}, {0.5, 0.1, 0.95}, {0.9, 0.02, 0.95}, {-0.7, 0.05, 0.9}, {0.3, 0.5, 0.95},
	} {
		n := NForCorrelationHalfWidth(tc.r, tc.h, tc.conf)
		if hw := FisherHalfWidth(tc.r, n, tc.conf); !(hw <= tc.h) {
			t.Errorf("%+v: n=%d gives half-width %v", tc, n, hw)
		}
		if n > 4 {
			if hw := FisherHalfWidth(tc.r, n-1, tc.conf); hw <= tc.h {
				t.Errorf("%+v: n−1=%d already gives %v", tc, n-1, hw)
			}
		}
	}
	// At r = 0 the half-width is tanh(z/√(n−3)); solve for n by hand:
	// n = 3 + (z_{0.975}/atanh 0.1)² = 3 + 379.7 → 383.
	z := NormalQuantile(0.975)
	want := int(math.Ceil(3 + math.Pow(z/math.Atanh(0.1), 2)))
	if got := NForCorrelationHalfWidth(0, 0.1, 0.95); got != want {
		t.Errorf("r=0, ±0.1: n = %d, closed form %d", got, want)
	}
}

func TestNForSlopeHalfWidth(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ s, sx, h, conf float64 }{
		{1, 1, 0.1, 0.95}, {2, 0.5, 3, 0.95}, {0.3, 10, 0.001, 0.99}, {1, 1, 100, 0.95},
	} {
		n := NForSlopeHalfWidth(tc.s, tc.sx, tc.h, tc.conf)
		if hw := SlopeHalfWidth(tc.s, tc.sx, n, tc.conf); !(hw <= tc.h) {
			t.Errorf("%+v: n=%d gives half-width %v", tc, n, hw)
		}
		if n > 3 {
			if hw := SlopeHalfWidth(tc.s, tc.sx, n-1, tc.conf); hw <= tc.h {
				t.Errorf("%+v: n−1=%d already gives %v", tc, n-1, hw)
			}
		}
	}
	// The half-width at a given n agrees with the interval of a fitted
	// slope: with x having SD sx and residual SD s exactly as fitted,
	// CorrectForError's raw slope interval (scipy-checked) has the same width.
	x, y := agrGauges(40, 8)
	e := CorrectForError(x, y, 0, 0, 0.95)
	_, b, se, _ := agrOLS(x, y)
	_, sx := agrMeanSD(x)
	s := se * sx * math.Sqrt(39)
	agrCheck(t, "slope", e.Slope, b, 1e-13)
	agrCheck(t, "SlopeHalfWidth vs fitted interval", SlopeHalfWidth(s, sx, 40, 0.95), (e.SlopeHi-e.SlopeLo)/2, 1e-12)
}

func TestPlanningEdges(t *testing.T) {
	t.Parallel()
	for name, n := range map[string]int{
		"power r=0":     NForCorrelationPower(0, 0.05, 0.8),
		"power r=1":     NForCorrelationPower(1, 0.05, 0.8),
		"power alpha=0": NForCorrelationPower(0.3, 0, 0.8),
		"power NaN":     NForCorrelationPower(math.NaN(), 0.05, 0.8),
		"power 1e-9":    NForCorrelationPower(1e-9, 0.05, 0.8), // n ≈ 8e18, beyond 2⁴⁰
		"hw r=1":        NForCorrelationHalfWidth(1, 0.1, 0.95),
		"hw h=0":        NForCorrelationHalfWidth(0.3, 0, 0.95),
		"hw tiny":       NForCorrelationHalfWidth(0.3, 1e-9, 0.95),
		"slope s=0":     NForSlopeHalfWidth(0, 1, 0.1, 0.95),
		"slope conf=1":  NForSlopeHalfWidth(1, 1, 0.1, 1),
		"slope sx=Inf":  NForSlopeHalfWidth(1, math.Inf(1), 0.1, 0.95),
	} {
		if n != 0 {
			t.Errorf("%s: n = %d, want 0 (undefined)", name, n)
		}
	}
	if p := CorrelationPower(0.3, 3, 0.05); !math.IsNaN(p) {
		t.Errorf("CorrelationPower n=3: %v", p)
	}
	// At ρ = 0 the "power" is the size of the test.
	agrCheck(t, "power at r=0", CorrelationPower(0, 50, 0.05), 0.05, 1e-14)
}

func BenchmarkPlanning(b *testing.B) {
	b.Run("NForCorrelationHalfWidth", func(b *testing.B) {
		for b.Loop() {
			NForCorrelationHalfWidth(0.3, 0.01, 0.95)
		}
	})
	b.Run("NForSlopeHalfWidth", func(b *testing.B) {
		for b.Loop() {
			NForSlopeHalfWidth(1, 1, 0.001, 0.95)
		}
	})
	b.Run("NForCorrelationPower", func(b *testing.B) {
		for b.Loop() {
			NForCorrelationPower(0.1, 0.05, 0.8)
		}
	})
}

// The half-width of the limits' exact interval and the n that brings it to
// a target, against scipy 1.10.1: hw = sd·(stats.nct.ppf((1+c)/2, n−1,
// k·√n) − stats.nct.ppf((1−c)/2, n−1, k·√n))/(2√n), and the n found by
// stepping n = 2, 3, … until hw ≤ target (a loop in Python over the same
// calls; values printed with repr).
func TestLimitsHalfWidthScipy(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		sd, k float64
		n     int
		conf  float64
		want  float64
	}{
		{38.76, 1.96, 17, 0.95, 35.528681088875324},
		{1, 1.96, 2, 0.95, 31.018081956576918},
		{2.5, 2, 100, 0.9, 0.7236780419478217},
		{1, 1.96, 5000, 0.95, 0.047388955036395716},
	} {
		if got := LimitsHalfWidth(c.sd, c.k, c.n, c.conf); math.Abs(got/c.want-1) > 1e-10 {
			t.Errorf("LimitsHalfWidth(%v, %v, %d, %v) = %.15g, scipy %.15g", c.sd, c.k, c.n, c.conf, got, c.want)
		}
	}
	for _, c := range []struct {
		sd, k, hw, conf float64
		want            int
	}{
		{38.76, 1.96, 15, 0.95, 79},
		{1, 1.96, 0.5, 0.95, 49},
		{1, 1.96, 0.1, 0.95, 1126},
		{2.5, 2, 1, 0.9, 54},
	} {
		if got := NForLimitsHalfWidth(c.sd, c.k, c.hw, c.conf); got != c.want {
			t.Errorf("NForLimitsHalfWidth(%v, %v, %v, %v) = %d, scipy search %d", c.sd, c.k, c.hw, c.conf, got, c.want)
		}
	}
	// At 10⁵ and 10⁶ items (where the answer comes from two steps of the
	// 1/√n law and a check): the smallest n whose half-width passes, the
	// answer of the plain search from 2 (the half-width falls with n).
	for _, hw := range []float64{0.01, 0.002} {
		ok := func(n int) bool { return LimitsHalfWidth(1, 1.96, n, 0.95) <= hw }
		got := NForLimitsHalfWidth(1, 1.96, hw, 0.95)
		if want := planSearch(2, ok); got != want || !ok(got) || ok(got-1) {
			t.Errorf("NForLimitsHalfWidth(1, 1.96, %v, 0.95) = %d, the search from 2 %d", hw, got, want)
		}
	}
	if NForLimitsHalfWidth(0, 1.96, 1, 0.95) != 0 || NForLimitsHalfWidth(1, 1.96, -1, 0.95) != 0 || !math.IsNaN(LimitsHalfWidth(1, 1.96, 1, 0.95)) {
		t.Error("undefined inputs should give 0 / NaN")
	}
}
