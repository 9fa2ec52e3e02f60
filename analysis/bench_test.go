package analysis_test

import (
	"fmt"
	"math/rand/v2"
	"testing"

	"bivar/analysis"
	"bivar/analysis/report"
)

// BenchmarkAnalyze times one whole study (every statistic, plot data and
// findings) on simulated data: x uniform on [0, 100), y = 2 + 0.5·x plus
// normal noise (SD 5), with a run order. Seeded, so every run times the
// same data.
func BenchmarkAnalyze(b *testing.B) {
	for _, n := range []int{1_000, 100_000, 1_000_000} {
		rng := rand.New(rand.NewPCG(1, 2))
		x, y, order := make([]float64, n), make([]float64, n), make([]float64, n)
		for i := range x {
			x[i] = 100 * rng.Float64()
			y[i] = 2 + 0.5*x[i] + 5*rng.NormFloat64()
			order[i] = float64(i + 1)
		}
		in := analysis.Input{ID: "bench", X: report.Variable{Column: "x"}, Y: report.Variable{Column: "y"},
			XS: x, YS: y, OrderColumn: "run", Order: order}
		cfg := analysis.DefaultConfig()
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				s := analysis.Analyze(in, cfg)
				if s.Error != nil {
					b.Fatal(*s.Error)
				}
			}
		})
	}
}
