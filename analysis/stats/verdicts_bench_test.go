package stats

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

// Benchmarks of the statistics added for order-free and robust verdicts, at
// n = 10³, 10⁵ and 10⁶ (./bench.sh prints medians).
func benchData(n int) (x, y, key []float64, g []int) {
	rng := rand.New(rand.NewPCG(uint64(n), 3))
	x, y, key, g = make([]float64, n), make([]float64, n), make([]float64, n), make([]int, n)
	for i := range x {
		x[i] = rng.Float64()
		y[i] = x[i] + rng.NormFloat64()
		key[i] = float64(rng.IntN(50)) // ties
		g[i] = rng.IntN(11)
	}
	return
}

func BenchmarkVerdictStats(b *testing.B) {
	for _, n := range []int{1_000, 100_000, 1_000_000} {
		x, y, key, g := benchData(n)
		b.Run(fmt.Sprintf("DurbinWatsonTied/n=%d", n), func(b *testing.B) {
			for b.Loop() {
				DurbinWatsonTied(key, y)
			}
		})
		b.Run(fmt.Sprintf("SlopeHAC/n=%d", n), func(b *testing.B) {
			for b.Loop() {
				SlopeHAC(x, y, NeweyWestLags(n))
			}
		})
		b.Run(fmt.Sprintf("SlopeHC3/n=%d", n), func(b *testing.B) {
			for b.Loop() {
				SlopeHC3(x, y)
			}
		})
		b.Run(fmt.Sprintf("CompareGroupLines/n=%d", n), func(b *testing.B) {
			for b.Loop() {
				CompareGroupLines(x, y, g)
			}
		})
	}
}
