package stats

import (
	"math"
	"math/rand/v2"
	"testing"
)

// kendallDirect is τ-b by its definition (Kendall 1970, Rank Correlation
// Methods, ch. 3), O(n²): S = Σ_{i<j} sign(x_j − x_i)·sign(y_j − y_i)
// over all pairs, and the pairs tied in x and in y counted directly.
func kendallDirect(x, y []float64) float64 {
	var s, tiedX, tiedY, pairs int64
	for i := range x {
		for j := i + 1; j < len(x); j++ {
			pairs++
			dx, dy := x[j]-x[i], y[j]-y[i]
			if dx == 0 {
				tiedX++
			}
			if dy == 0 {
				tiedY++
			}
			switch {
			case dx*dy > 0:
				s++
			case dx*dy < 0:
				s--
			}
		}
	}
	return float64(s) / math.Sqrt(float64(pairs-tiedX)*float64(pairs-tiedY))
}

// TestSortedKendallTies: Sorted.KendallTauB, whose discordant pairs are
// counted by trieCount over the runs of x, gives τ-b of the O(n²)
// definition and KendallTauB's τ-b and p to the last bit, on data with
// ties in x, in y and in both, all-tied columns, one distinct value in
// either, and n from 2.
func TestSortedKendallTies(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(21, 22))
	for trial := range 400 {
		n := 2 + rng.IntN(60)
		if trial%50 == 0 {
			n = 2 + trial/50 // 2 … 9
		}
		xl, yl := 1+rng.IntN(n+1), 1+rng.IntN(n+1)
		if trial%7 == 0 {
			yl = 1 << 30
		}
		x, y := make([]float64, n), make([]float64, n)
		for i := range x {
			x[i] = float64(rng.IntN(xl))
			y[i] = float64(rng.IntN(yl))
			if trial%3 == 0 { // a trend, so τ is not near 0
				y[i] = math.Floor(x[i]/2) + float64(rng.IntN(2))
			}
		}
		tau, p := NewSorted(x, y).KendallTauB()
		wt, wp := KendallTauB(x, y)
		if math.Float64bits(tau) != math.Float64bits(wt) || math.Float64bits(p) != math.Float64bits(wp) {
			t.Fatalf("trial %d (n = %d): Sorted τ-b %v p %v, KendallTauB %v %v", trial, n, tau, p, wt, wp)
		}
		d := kendallDirect(x, y)
		if math.IsNaN(d) != math.IsNaN(tau) || !math.IsNaN(d) && math.Abs(tau-d) > 1e-15 {
			t.Fatalf("trial %d (n = %d): τ-b %v, by the definition %v", trial, n, tau, d)
		}
	}
}
