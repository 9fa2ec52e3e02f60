package stats

import (
	"math"
	"math/rand/v2"
	"syscall"
	"testing"
)

// studyBenchData returns n seeded pairs like analysis's BenchmarkAnalyze:
// x ~ N(5, 2), y = 3 + 0.5·x + 0.01·(x − 5)² + N(0, 1), rounded to 3
// decimals.
func studyBenchData(n int) (x, y []float64) {
	rng := rand.New(rand.NewPCG(1, 2))
	x, y = make([]float64, n), make([]float64, n)
	for i := range x {
		xi := 5 + 2*rng.NormFloat64()
		x[i] = math.Round(xi*1000) / 1000
		y[i] = math.Round((3+0.5*xi+0.01*(xi-5)*(xi-5)+rng.NormFloat64())*1000) / 1000
	}
	return x, y
}

// benchCPUTime returns the process's user plus system CPU time in ns (on a
// machine shared with other jobs the wall time varies with their load, the
// CPU time much less).
func benchCPUTime() int64 {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return ru.Utime.Nano() + ru.Stime.Nano()
}

// BenchmarkStudyStats1e6 times, at 10⁶ pairs, each order-based statistic
// of a study as the functions on unsorted columns compute it ("columns/…",
// each sorting on its own) and from one Sorted ("sorted/…", whose own cost
// is "sorted/NewSorted"), in wall and CPU time. The Sorted's Moments are
// summed once, at the first call that needs them, and read by every later
// one, as in a study: "sorted/Describe", "…/LackOfFit", "…/LineSummary"
// and "…/PolynomialSummary" time the figures after that sum.
func BenchmarkStudyStats1e6(b *testing.B) {
	x, y := studyBenchData(1_000_000)
	s := NewSorted(x, y)
	line, _ := Line(s.X, s.Y, 0.95)
	src := func() rand.Source { return rand.NewPCG(1, 2) }
	for _, c := range []struct {
		name string
		f    func()
	}{
		{"columns/Describe", func() { Describe(x); Describe(y) }},
		{"columns/Spearman", func() { Spearman(x, y) }},
		{"columns/KendallTauB", func() { KendallTauB(x, y) }},
		{"columns/LackOfFit", func() { LackOfFit(x, y) }},
		{"columns/DistanceCorrTest", func() { DistanceCorrTest(x, y, 199, 0, src()) }},
		{"columns/TheilSen", func() { TheilSen(x, y, 0, src()) }},
		{"sorted/NewSorted", func() { NewSorted(x, y) }},
		{"sorted/Describe", func() { s.Describe() }},
		{"sorted/Spearman", func() { s.Spearman() }},
		{"sorted/KendallTauB", func() { s.KendallTauB() }},
		{"sorted/LackOfFit", func() { s.LackOfFit(line.Slope.Estimate) }},
		{"sorted/DistanceCorrTest", func() { s.DistanceCorrTest(199, 0, src()) }},
		{"sorted/TheilSen", func() { TheilSen(s.X, s.Y, 0, src()) }},
		{"sorted/LineSummary", func() { s.LineSummary(0.95) }},
		{"sorted/PolynomialSummary", func() { s.PolynomialSummary(2, 0.95) }},
		{"sorted/SlopeHACRun", func() { SlopeHACRun(s.X, s.Y, x, y, NeweyWestLags(len(x))) }},
		{"sorted/Sample", func() { s.Sample(20000, src()) }},
		{"sorted/ToRows", func() { s.ToRows(s.X) }},
	} {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			cpu0 := benchCPUTime()
			for b.Loop() {
				c.f()
			}
			b.ReportMetric(float64(benchCPUTime()-cpu0)/float64(b.N), "cpu-ns/op")
		})
	}
}

// BenchmarkNewSorted times NewSorted at 10⁶ pairs for three shapes of x:
// continuous (no ties), read to 3 decimals (runs of about 60 equal x, the
// benchmark generator's files) and a setting with 5 levels (runs of 2·10⁵).
func BenchmarkNewSorted(b *testing.B) {
	x, y := studyBenchData(1_000_000)
	rng := rand.New(rand.NewPCG(3, 4))
	cont, levels := make([]float64, len(x)), make([]float64, len(x))
	for i := range x {
		cont[i] = x[i] + rng.Float64()*1e-3
		levels[i] = float64(rng.IntN(5))
	}
	for _, c := range []struct {
		name string
		x    []float64
	}{{"continuous", cont}, {"3-decimals", x}, {"5-levels", levels}} {
		b.Run(c.name, func(b *testing.B) {
			cpu0 := benchCPUTime()
			for b.Loop() {
				NewSorted(c.x, y)
			}
			b.ReportMetric(float64(benchCPUTime()-cpu0)/float64(b.N), "cpu-ns/op")
		})
	}
}
