package stats

// Benchmarks of the core statistics at n = 10³, 10⁵, 10⁶, and of the whole
// core set of issue 2 at 10⁶ rows. Run:
//
//	go test -run XXX -bench . -benchtime 3x ./analysis/stats/

import (
	"math/rand/v2"
	"strconv"
	"testing"
)

var coreBenchSizes = []int{1_000, 100_000, 1_000_000}

// coreBenchData returns seeded x, y with a linear relationship, noise and
// some ties (x rounded to 0.01).
func coreBenchData(n int) (x, y []float64) {
	rng := rand.New(rand.NewPCG(uint64(n), 1))
	x, y = make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = float64(int(rng.NormFloat64()*1000)) / 100
		y[i] = 3 + 0.5*x[i] + rng.NormFloat64()
	}
	return x, y
}

func coreBench(b *testing.B, f func(x, y []float64)) {
	for _, n := range coreBenchSizes {
		x, y := coreBenchData(n)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				f(x, y)
			}
		})
	}
}

func BenchmarkDescribe(b *testing.B) { coreBench(b, func(x, _ []float64) { Describe(x) }) }
func BenchmarkCentredMoments(b *testing.B) {
	coreBench(b, func(x, y []float64) { CentredMoments(x, y) })
}
func BenchmarkPearson(b *testing.B)     { coreBench(b, func(x, y []float64) { Pearson(x, y, 0.95) }) }
func BenchmarkSpearman(b *testing.B)    { coreBench(b, func(x, y []float64) { Spearman(x, y) }) }
func BenchmarkKendallTauB(b *testing.B) { coreBench(b, func(x, y []float64) { KendallTauB(x, y) }) }
func BenchmarkLine(b *testing.B) {
	coreBench(b, func(x, y []float64) {
		l, _ := Line(x, y, 0.95)
		l.Interval(1, 0.95)
	})
}
func BenchmarkQuadratic(b *testing.B) {
	coreBench(b, func(x, y []float64) { Polynomial(x, y, 2, 0.95) })
}
func BenchmarkInfluence(b *testing.B) { coreBench(b, func(x, y []float64) { Influence(x, y) }) }

// BenchmarkCoreSet runs everything issue 2 item 4 computes for one study,
// at 10⁶ rows: describe of x and y, Pearson, Spearman, Kendall τ-b, the
// line with an interval, the quadratic, and influence with leave-one-out.
func BenchmarkCoreSet(b *testing.B) {
	x, y := coreBenchData(1_000_000)
	b.ReportAllocs()
	for b.Loop() {
		Describe(x)
		Describe(y)
		Pearson(x, y, 0.95)
		Spearman(x, y)
		KendallTauB(x, y)
		l, _ := Line(x, y, 0.95)
		l.Interval(2, 0.95)
		Polynomial(x, y, 2, 0.95)
		Influence(x, y)
	}
}
