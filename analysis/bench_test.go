package analysis_test

import (
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"syscall"
	"testing"

	"bivar/analysis"
	"bivar/analysis/report"
)

// benchInput returns one study's input on simulated data: x ~ N(5, 2),
// y = 3 + 0.5·x + 0.01·(x − 5)² + N(0, 1), both rounded to 3 decimals (as a
// CSV file would hold them, so values tie), with a run order 1..n. Seeded,
// so every run times the same data.
func benchInput(n int) analysis.Input {
	rng := rand.New(rand.NewPCG(1, 2))
	x, y, order := make([]float64, n), make([]float64, n), make([]float64, n)
	r3 := func(v float64) float64 { return math.Round(v*1000) / 1000 }
	for i := range x {
		xi := 5 + 2*rng.NormFloat64()
		x[i] = r3(xi)
		y[i] = r3(3 + 0.5*xi + 0.01*(xi-5)*(xi-5) + rng.NormFloat64())
		order[i] = float64(i + 1)
	}
	return analysis.Input{ID: "bench", X: report.Variable{Column: "x"}, Y: report.Variable{Column: "y"},
		XS: x, YS: y, OrderColumn: "run", Order: order}
}

// cpuTime returns the process's user plus system CPU time in ns: on a
// machine shared with other jobs the wall time per op varies with their
// load, the CPU time much less.
func cpuTime() int64 {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return ru.Utime.Nano() + ru.Stime.Nano()
}

// BenchmarkAnalyze times one whole study (every statistic, plot data and
// findings) at 10⁵ and 10⁶ rows (benchInput), wall time (ns/op) and CPU
// time of all goroutines, the garbage collector's included (cpu-ns/op). The 10⁷ case runs only when
// the pattern names it, e.g. -bench 'Analyze/n=10000000' (./bench.sh
// 'Analyze/n=10000000').
func BenchmarkAnalyze(b *testing.B) {
	sizes := []int{100_000, 1_000_000}
	if f := flag.Lookup("test.bench"); f != nil && strings.Contains(f.Value.String(), "10000000") {
		sizes = append(sizes, 10_000_000)
	}
	cfg := analysis.DefaultConfig()
	for _, n := range sizes {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			in := benchInput(n)
			b.ReportAllocs()
			cpu0 := cpuTime()
			for b.Loop() {
				s := analysis.Analyze(in, cfg)
				if s.Error != nil {
					b.Fatal(*s.Error)
				}
			}
			b.ReportMetric(float64(cpuTime()-cpu0)/float64(b.N), "cpu-ns/op")
		})
	}
}
