package findings

import "testing"

// BenchmarkAssess measures Assess on a filled study. Its cost does not
// grow with n: every figure it judges is already in the study (the
// x-order figures are computed by the analysis, see
// analysis.BenchmarkXOrderFigures).
func BenchmarkAssess(b *testing.B) {
	s := study(0.6, 1e-9)
	s.Diagnostics.BreuschPagan.P = 0.001
	s.Diagnostics.SpreadRho = 0.3
	b.ReportAllocs()
	for range b.N {
		Assess(s, ctx)
	}
}
