package compare

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"bivar/analysis/report"
)

// BenchmarkDiff compares two runs of 1000 studies each.
func BenchmarkDiff(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 1))
	var olds, news []report.Study
	for i := range 1000 {
		id := fmt.Sprintf("s%04d", i)
		x1, y1 := process(rng, 50, 0, 0.5, 1)
		x2, y2 := process(rng, 50, 0, 0.5, 1)
		olds, news = append(olds, study(id, x1, y1, nil)), append(news, study(id, x2, y2, nil))
	}
	old, new := rep("a", olds...), rep("b", news...)
	b.ReportAllocs()
	for b.Loop() {
		Diff(old, new, Options{})
	}
}

// FuzzChangeTests: any moments give p in [0, 1] or NaN, never a panic.
func FuzzChangeTests(f *testing.F) {
	f.Add(10, 4.0, 1.0, 2.0, 12, 3.0, 2.0, 1.0)
	f.Add(4, 1.0, 1.0, 1.0, 4, 1.0, 1.0, -1.0)
	f.Add(0, 0.0, 0.0, 0.0, 3, math.Inf(1), math.NaN(), 0.0)
	f.Fuzz(func(t *testing.T, n1 int, sxx1, syy1, sxy1 float64, n2 int, sxx2, syy2, sxy2 float64) {
		a := report.Moments{N: n1, Sxx: report.Float(sxx1), Syy: report.Float(syy1), Sxy: report.Float(sxy1)}
		b := report.Moments{N: n2, Sxx: report.Float(sxx2), Syy: report.Float(syy2), Sxy: report.Float(sxy2)}
		for _, p := range []report.Float{CorrelationChange(a, b).P, SlopeChangeTest(a, b).P} {
			if v := float64(p); !math.IsNaN(v) && (v < 0 || v > 1) {
				t.Fatalf("p = %v outside [0, 1] for %+v, %+v", v, a, b)
			}
		}
	})
}
