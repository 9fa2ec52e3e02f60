package stats

import (
	"math"
	"math/rand/v2"
	"testing"
)

// dcorCrossByPerm is n²·dCov²(x, y_perm), y_perm[i] = y[perm[i]], by the
// package's O(n log n) algorithm read through perm (the rows of x visited
// in ascending x, y and its rank fetched at perm of each row): the direct
// form of the permutation that dcorPerm keeps in place. x and y are the
// standardised columns, in row order.
func dcorCrossByPerm(x, y []float64, perm []int) float64 {
	n := len(x)
	xOrder, ax, axx := rowSums(x)
	yOrder, by, byy := rowSums(y)
	rank := make([]int, n)
	r := 0
	for k, i := range yOrder {
		if k == 0 || y[i] != y[yOrder[k-1]] {
			r++
		}
		rank[i] = r
	}
	nRanks := r
	t := make([]float64, 4*(nRanks+1))
	var totC, totX, totY, totXY, sab float64
	for _, i := range xOrder {
		k := perm[i]
		xi, yi, r := x[i], y[k], rank[k]
		var c, sx, sy, sxy float64
		for q := r - 1; q > 0; q &= q - 1 {
			c += t[4*q]
			sx += t[4*q+1]
			sy += t[4*q+2]
			sxy += t[4*q+3]
		}
		sab += xi*yi*(2*c-totC) + (2*sxy - totXY) - xi*(2*sy-totY) - yi*(2*sx-totX)
		for q := r; q <= nRanks; q += q & -q {
			t[4*q]++
			t[4*q+1] += xi
			t[4*q+2] += yi
			t[4*q+3] += xi * yi
		}
		totC++
		totX += xi
		totY += yi
		totXY += xi * yi
	}
	var s2 float64
	for i := range n {
		s2 += ax[i] * by[perm[i]]
	}
	nf := float64(n)
	return 2*sab - 2*s2/nf + axx*byy/(nf*nf)
}

// TestDcorPermInPlace checks, permutation by permutation, that the cross
// term of y permuted in place (dcorPerm, as the permutation test runs it)
// is the one computed through the permutation itself (dcorCrossByPerm) to
// the last bit, and that DistanceCorrTest's p is the count of those, on
// data made to be awkward: x in row order and not, ties in x, in y and in
// both, long constant runs, and n from 3.
func TestDcorPermInPlace(t *testing.T) {
	t.Parallel()
	type data struct {
		name string
		x, y []float64
	}
	rng := rand.New(rand.NewPCG(11, 12))
	gen := func(n, xLevels, yLevels int, sorted bool) (x, y []float64) {
		x, y = make([]float64, n), make([]float64, n)
		for i := range x {
			x[i] = float64(rng.IntN(xLevels))
			y[i] = float64(rng.IntN(yLevels)) + 0.3*x[i]
		}
		if sorted {
			for i := 1; i < n; i++ { // insertion sort of the pairs by x
				for j := i; j > 0 && x[j-1] > x[j]; j-- {
					x[j-1], x[j] = x[j], x[j-1]
					y[j-1], y[j] = y[j], y[j-1]
				}
			}
		}
		return x, y
	}
	var cases []data
	for _, n := range []int{3, 4, 5, 7, 40, 301} {
		for _, sorted := range []bool{false, true} {
			for _, lv := range [][2]int{{1 << 30, 1 << 30}, {3, 1 << 30}, {1 << 30, 2}, {2, 3}, {n, n}} {
				x, y := gen(n, lv[0], lv[1], sorted)
				cases = append(cases, data{"", x, y})
			}
		}
	}
	runs := make([]float64, 60) // long constant runs in both columns
	runsY := make([]float64, 60)
	for i := range runs {
		runs[i] = float64(i / 20)
		runsY[i] = float64((i / 7) % 3)
	}
	cases = append(cases, data{"runs", runs, runsY})
	for _, c := range cases {
		d := newDcorData(c.x, c.y)
		if d == nil {
			continue // a constant column: no test to compare
		}
		xs, _ := standardise(c.x)
		ys, _ := standardise(c.y)
		n := len(c.x)
		perm := make([]int, n)
		for i := range perm {
			perm[i] = i
		}
		obs := dcorCrossByPerm(xs, ys, perm)
		if got := d.crossTerm(); got != obs {
			t.Fatalf("n = %d: cross term %v, through the identity %v", n, got, obs)
		}
		const perms = 39
		yp := d.permuted()
		r1 := rand.New(rand.NewPCG(uint64(n), 3))
		r2 := rand.New(rand.NewPCG(uint64(n), 3))
		ge := 0
		for b := range perms {
			r1.Shuffle(n, yp.swap)
			r2.Shuffle(n, func(i, j int) { perm[i], perm[j] = perm[j], perm[i] })
			want := dcorCrossByPerm(xs, ys, perm)
			if got := yp.cross(); math.Float64bits(got) != math.Float64bits(want) {
				t.Fatalf("n = %d %s, permutation %d: in place %v, through the permutation %v", n, c.name, b, got, want)
			}
			if want >= obs-1e-12*math.Abs(obs) {
				ge++
			}
		}
		_, p, _, _ := DistanceCorrTest(c.x, c.y, perms, n, rand.NewPCG(uint64(n), 3))
		if want := float64(1+ge) / (perms + 1); p != want {
			t.Errorf("n = %d %s: p = %v, want %v from the permutations", n, c.name, p, want)
		}
	}
}
