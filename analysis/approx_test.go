package analysis

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"bivar/analysis/stats"
)

// TestLowessSampleError measures what lowessErrCore and lowessErrAll state:
// LOWESS on the 20 000 rows canonical chooses against LOWESS on all rows
// (span 2/3, 3 iterations, delta 1% of the x range for both), on five
// draws of 10⁵ rows of the benchmark generator's shape
// (../shared/tools/bench/gen_data.py: x ~ N(5, 2), y = 3 + 0.5x +
// 0.01(x − 5)² + N(0, 1), both rounded to 3 decimals), compared at the
// sample curve's points, in SDs of y. The stated errors are this tool's
// measurement, so the test keeps them true when the sample or the smoother
// changes.
func TestLowessSampleError(t *testing.T) {
	if testing.Short() {
		t.Skip("LOWESS on 10⁵ rows five times; skipped with -short")
	}
	cfg := DefaultConfig()
	var worstCore, worstAll float64
	for draw := range 5 {
		rng := rand.New(rand.NewPCG(uint64(draw), 2024))
		n := 100_000
		x, y := make([]float64, n), make([]float64, n)
		for i := range x {
			x[i] = math.Round((5+2*rng.NormFloat64())*1000) / 1000
			y[i] = math.Round((3+0.5*x[i]+0.01*(x[i]-5)*(x[i]-5)+rng.NormFloat64())*1000) / 1000
		}
		lo, hi := slices.Min(x), slices.Max(x)
		full := stats.Lowess(x, y, cfg.LowessFrac, cfg.LowessIter, 0.01*(hi-lo))
		at := map[float64]float64{} // the full fit at each x (tied x share one fit)
		for i, v := range x {
			at[v] = full[i]
		}
		sd := stats.Describe(y).SD
		sorted := slices.Sorted(slices.Values(x))
		p01, p99 := sorted[n/100], sorted[n-n/100]
		lx, ly := canonical(x, y, cfg.LowessMaxN)
		for _, pt := range lowessCurve(lx, ly, cfg) {
			d := math.Abs(pt.Y-at[pt.X]) / sd
			worstAll = math.Max(worstAll, d)
			if pt.X >= p01 && pt.X <= p99 {
				worstCore = math.Max(worstCore, d)
			}
		}
	}
	t.Logf("largest difference: %.4f SD within the 1st–99th percentiles of x (stated %g), %.4f SD overall (stated %g)",
		worstCore, lowessErrCore, worstAll, lowessErrAll)
	if worstCore > lowessErrCore || worstAll > lowessErrAll {
		t.Errorf("LOWESS on the sample is %.4f SD (core) and %.4f SD (all) from LOWESS on all rows; the report states %g and %g",
			worstCore, worstAll, lowessErrCore, lowessErrAll)
	}
}
