package stats

import (
	"math"
	"math/rand/v2"
	"testing"
)

// hotspotData returns n seeded pairs shaped like the generated benchmark
// files: x ~ N(5, 2), y = 3 + 0.5·x + N(0, 1), both rounded to 3 decimals,
// in canonical order.
func hotspotData(n int) *Sorted {
	rng := rand.New(rand.NewPCG(7, 8))
	x, y := make([]float64, n), make([]float64, n)
	for i := range x {
		xi := 5 + 2*rng.NormFloat64()
		x[i] = math.Round(xi*1000) / 1000
		y[i] = math.Round((3+0.5*xi+rng.NormFloat64())*1000) / 1000
	}
	return NewSorted(x, y)
}

// BenchmarkHotspots times, at 10⁶ pairs, the three statistics a study
// spends most of its own CPU on besides the sorts, as the study calls them:
// the permutation test of dCor on a sample of 5000 rows in canonical order
// (199 permutations), dCor on 10⁵ such rows, Kendall's τ-b and Theil–Sen
// from the canonical order.
func BenchmarkHotspots(b *testing.B) {
	s := hotspotData(1_000_000)
	x5, y5 := s.Sample(DefaultDcorMaxN, rand.NewPCG(3, 4))
	x100, y100 := s.Sample(100_000, rand.NewPCG(5, 6))
	for _, c := range []struct {
		name string
		f    func()
	}{
		{"DcorPerm5000", func() { DistanceCorrTest(x5, y5, 199, len(x5), rand.NewPCG(1, 2)) }},
		{"Dcor1e5", func() { DistanceCorrelation(x100, y100) }},
		{"KendallTauB", func() { s.KendallTauB() }},
		{"TheilSen", func() { TheilSen(s.X, s.Y, 0, rand.NewPCG(1, 2)) }},
	} {
		b.Run(c.name, func(b *testing.B) {
			cpu0 := benchCPUTime()
			for b.Loop() {
				c.f()
			}
			b.ReportMetric(float64(benchCPUTime()-cpu0)/float64(b.N), "cpu-ns/op")
		})
	}
}
