package findings

import (
	"fmt"
	"math"
	"testing"

	"bivar/analysis/report"
)

// BenchmarkAssess measures Assess on a study with plot data of n points:
// the only part that grows with n is sorting the residuals by x and the
// Spearman ρ of |residual| on x for the spread's direction (both n log n).
func BenchmarkAssess(b *testing.B) {
	for _, n := range []int{1e3, 1e5, 1e6} {
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			s := study(0.6, 1e-9)
			s.Diagnostics.BreuschPagan.P = 0.001
			pl := &report.Plot{X: make([]float64, n), Residuals: make([]float64, n)}
			for i := range pl.X {
				pl.X[i] = math.Mod(float64(i)*0.618034, 1)
				pl.Residuals[i] = math.Sin(float64(i)) * pl.X[i]
			}
			s.Plot = pl
			b.ReportAllocs()
			b.ResetTimer()
			for range b.N {
				Assess(s, ctx)
			}
		})
	}
}
