package stats

// Helpers for the tests of the additional statistics (LOWESS, Theil–Sen,
// distance correlation, diagnostics, partial correlation, adjustment).

import (
	"math"
	"math/rand/v2"
	"testing"
)

// extraUniform returns the next uniform value in [0, 1) from src, built from
// its raw 64-bit output (53 bits), so the sequence depends only on the PCG
// generator, whose output Go specifies, not on method implementations.
func extraUniform(src rand.Source) float64 {
	return float64(src.Uint64()>>11) / (1 << 53)
}

// extraWavy is the generator of the seeded test set whose reference values
// were computed with statsmodels: n points, x on a grid of 0.5 over [0, 20]
// (so x has ties), y = 3 + 2·sin(x/3) + 0.3·x + noise, noise the sum of
// four uniforms, centred, times 0.8, and row 7 pushed up by 6 (an outlier
// for the robustifying iterations). Written to CSV with
// strconv.FormatFloat(v, 'g', -1, 64) for the reference run.
func extraWavy(seed uint64, n int) (x, y []float64) {
	src := rand.NewPCG(seed, 0)
	x = make([]float64, n)
	y = make([]float64, n)
	for i := range x {
		x[i] = math.Round(extraUniform(src)*40) / 2
		var s float64
		for range 4 {
			s += extraUniform(src)
		}
		y[i] = 3 + 2*math.Sin(x[i]/3) + 0.3*x[i] + 0.8*(s-2)
	}
	if n > 7 {
		y[7] += 6
	}
	return x, y
}

// extraClose reports whether got is within tol of want, absolutely or
// relatively to |want| (whichever is looser); NaN matches only NaN.
func extraClose(got, want, tol float64) bool {
	if math.IsNaN(want) {
		return math.IsNaN(got)
	}
	d := math.Abs(got - want)
	return d <= tol || d <= tol*math.Abs(want)
}

// extraPanics reports whether f panics.
func extraPanics(f func()) (panicked bool) {
	defer func() { panicked = recover() != nil }()
	f()
	return false
}

// extraLurk is the generator of the seeded three-column test set for the
// partial correlation: z uniform on [0, 10), x = z + e₁, y = 0.5·z + 0.2·x +
// e₂, e₁ and e₂ sums of three uniforms, centred (so z carries most of the
// association of x and y). Written to CSV with FormatFloat 'g', -1 for the
// reference run.
func extraLurk(seed uint64, n int) (x, y, z []float64) {
	src := rand.NewPCG(seed, 0)
	x, y, z = make([]float64, n), make([]float64, n), make([]float64, n)
	noise := func() float64 {
		return extraUniform(src) + extraUniform(src) + extraUniform(src) - 1.5
	}
	for i := range x {
		z[i] = 10 * extraUniform(src)
		x[i] = z[i] + noise()
		y[i] = 0.5*z[i] + 0.2*x[i] + noise()
	}
	return x, y, z
}

// extraBenchXY is the benchmark data: x uniform on [0, 20) (no ties),
// y = 3 + 2·sin(x/3) + 0.3·x + uniform noise on [−0.5, 0.5).
func extraBenchXY(n int) (x, y []float64) {
	src := rand.NewPCG(3, 0)
	x, y = make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = 20 * extraUniform(src)
		y[i] = 3 + 2*math.Sin(x[i]/3) + 0.3*x[i] + extraUniform(src) - 0.5
	}
	return x, y
}

// TestExtrasOddInput runs every additional statistic on empty, tiny,
// constant and non-finite inputs: none may panic (bad data never panic;
// only a length mismatch does).
func TestExtrasOddInput(t *testing.T) {
	t.Parallel()
	nan, inf := math.NaN(), math.Inf(1)
	inputs := [][]float64{
		{}, {1}, {1, 2}, {3, 3, 3}, {1, nan, 3, 4}, {1, inf, 3, 4, 5}, {-inf, 0, 0, 1},
		{0, -0.0, 0, 1e308, -1e308}, {1e-300, 2e-300, 3e-300, 4e-300, 5e-300},
	}
	for _, a := range inputs {
		for _, b := range inputs {
			if len(a) != len(b) {
				continue
			}
			Lowess(a, b, 2.0/3, 3, 0)
			Lowess(a, b, math.NaN(), -1, -1)
			LowessCurve(a, b, 0.1, 1, 1)
			TheilSen(a, b, 0, nil)
			TheilSen(a, b, 2, rand.NewPCG(1, 1))
			DistanceCorrelation(a, b)
			DistanceCorrTest(a, b, 5, 3, nil)
			LackOfFit(a, b)
			BreuschPagan(a, b)
			DurbinWatson(a)
			OrderTrend(a, b)
			PartialCorrelation(a, b, a, 0.95)
			PartialCorrelation(a, b, b, 2)
			Holm(a)
			BenjaminiHochberg(a)
		}
	}
}
