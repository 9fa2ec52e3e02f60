package stats

// This file holds the distance correlation, a dependence measure that is
// zero only under independence and so catches relationships (humps,
// cycles) that Pearson's r misses, with its permutation test.

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"bivar/internal/hugepage"
)

// DefaultDcorMaxN is the number of rows the permutation test of
// DistanceCorrTest works on when its maxN argument is 0 or less.
const DefaultDcorMaxN = 5000

// DistanceCorrelation returns the sample distance correlation of x and y
// (Székely, Rizzo & Bakirov 2007, "Measuring and testing dependence by
// correlation of distances", Ann. Statist. 35(6)), the V-statistic form:
// with a_ij = |x_i − x_j|, b_ij = |y_i − y_j| and A, B their double-centred
// matrices,
//
//	dCov²(x, y) = (1/n²) Σ_ij A_ij B_ij
//	dCor(x, y)  = √( dCov²(x, y) / √(dCov²(x, x)·dCov²(y, y)) )
//
// It lies in [0, 1], is 0 in the population only under independence, and
// is 1 for an exact linear relation. (From memory of their documentation:
// the value R's energy::dcor and Python's dcor.distance_correlation give.)
//
// It is computed in O(n log n) time and O(n) memory without forming the
// matrices (Huo & Székely 2016, "Fast computing for distance covariance",
// Technometrics 58(4); Chaudhuri & Hu 2019, "A fast algorithm for computing
// distance correlation", Comput. Statist. Data Anal.):
//
//	n²·dCov² = Σ_ij a_ij b_ij − (2/n) Σ_i a_i· b_i· + a·· b··/n²
//
// where the row sums a_i· come from prefix sums over x sorted, and
// Σ_{i<j} a_ij b_ij from one pass over x sorted with Fenwick trees indexed
// by the rank of y, accumulating the count and the sums of x, y and x·y of
// the points before. x and y are first centred and scaled to unit standard
// deviation (dCor does not change) so those sums do not lose digits.
//
// x and y must have equal length (it panics otherwise) and hold finite
// values. It returns NaN when n < 2 or x or y is constant (dCor is then
// defined as 0 by Székely et al.; we say "undefined", as for r).
func DistanceCorrelation(x, y []float64) float64 {
	if len(x) != len(y) {
		panic("stats: DistanceCorrelation: x and y lengths differ")
	}
	d := newDcorData(x, y)
	if d == nil {
		return math.NaN()
	}
	return d.dcor(d.crossTerm())
}

// DistanceCorrTest returns the distance correlation of x and y
// (DistanceCorrelation, on all n rows) and the p-value of its permutation
// test of independence: the rows of y are shuffled perms times with
// rand.New(src) (a nil src means rand.NewPCG(1, 2)) and
//
//	p = (1 + #{permutations with dCor ≥ observed}) / (perms + 1)
//
// (Székely, Rizzo & Bakirov 2007; the +1 counts the observed arrangement
// as one of the permutations, Davison & Hinkley 1997, Bootstrap Methods and
// their Application, ch. 4), "≥" allowing a relative rounding tolerance of
// 1e-12. Each permutation is scored by the O(n log n) algorithm, reusing
// the sort of x and the ranks of y. When n exceeds maxN (DefaultDcorMaxN
// when maxN ≤ 0) the test runs on a seeded simple random sample of maxN
// rows drawn from the same source, the observed value of the test then
// being that sample's dCor. The cost is O(n log n + perms·m log m) with
// m = min(n, maxN), so the test's share is bounded whatever n is. used is m,
// and method says what was done. perms ≤ 0 gives p = NaN (no test).
//
// x and y must have equal length (it panics otherwise) and hold finite
// values. dcor and p are NaN when n < 3 or x or y is constant.
func DistanceCorrTest(x, y []float64, perms, maxN int, src rand.Source) (dcor, p float64, used int, method string) {
	if len(x) != len(y) {
		panic("stats: DistanceCorrTest: x and y lengths differ")
	}
	if maxN <= 0 {
		maxN = DefaultDcorMaxN
	}
	if maxN < 3 {
		maxN = 3
	}
	n := len(x)
	nan := math.NaN()
	method = dcorMethod(n)
	if n < 3 {
		return nan, nan, n, method
	}
	full := newDcorData(x, y)
	if full == nil {
		return nan, nan, n, method
	}
	obs := full.crossTerm()
	dcor = full.dcor(obs)
	if perms <= 0 {
		return dcor, nan, n, method + "; no permutation test"
	}
	if src == nil {
		src = rand.NewPCG(1, 2)
	}
	rng := rand.New(src)
	d, used := full, n
	if n > maxN {
		// Partial Fisher–Yates shuffle: the first maxN indices are a simple
		// random sample without replacement.
		idx := hugepage.Make[int](n)
		for i := range idx {
			idx[i] = i
		}
		for i := 0; i < maxN; i++ {
			j := i + rng.IntN(n-i)
			idx[i], idx[j] = idx[j], idx[i]
		}
		xs, ys := make([]float64, maxN), make([]float64, maxN)
		for i, k := range idx[:maxN] {
			xs[i], ys[i] = x[k], y[k]
		}
		d, used = newDcorData(xs, ys), maxN
		if d != nil {
			obs = d.crossTerm()
		}
	}
	p, note := permP(d, obs, used, n, perms, rng)
	return dcor, p, used, method + note
}

// dcorMethod is the method text of DistanceCorrTest for n rows.
func dcorMethod(n int) string {
	return fmt.Sprintf("distance correlation, V-statistic, on all %d rows by the O(n log n) algorithm", n)
}

// dcorPermP returns the p of the permutation test of DistanceCorrTest on
// d, the used pairs of n (all, or a sample; d nil when a column of the
// sample is constant), the permutations drawn from rng, and the note that
// the method text gets.
func dcorPermP(d *dcorData, used, n, perms int, rng *rand.Rand) (p float64, note string) {
	var obs float64
	if d != nil {
		obs = d.crossTerm()
	}
	return permP(d, obs, used, n, perms, rng)
}

// permP is dcorPermP given d's cross term obs (d.crossTerm()).
//
// Each permutation is the previous one shuffled by rng.Shuffle, y_perm[i] =
// y[perm[i]], kept as dcorPerm.
func permP(d *dcorData, obs float64, used, n, perms int, rng *rand.Rand) (p float64, note string) {
	sample := ""
	if used < n {
		sample = fmt.Sprintf(" of a seeded random sample of %d rows", used)
	}
	if d == nil {
		return math.NaN(), fmt.Sprintf("; the random sample of %d rows has a constant column, no permutation test", used)
	}
	tol := 1e-12 * math.Abs(obs)
	yp := d.permuted()
	ge := 0
	for b := 0; b < perms; b++ {
		rng.Shuffle(used, yp.swap)
		if yp.cross() >= obs-tol {
			ge++
		}
	}
	return float64(1+ge) / float64(perms+1), fmt.Sprintf("; p from %d permutations%s", perms, sample)
}

// dcorCanonical returns DistanceCorrelation of pairs sorted by x, byY the
// positions in ascending y, by the algorithm of DistanceCorrelation without
// its copies: the values are standardised as they are read, the row sums of
// y are the one per-pair array of floats (with the int32 ranks of y), and
// the row sums of x are formed in the same pass as the cross term.
func dcorCanonical(x, y []float64, byY []int32) float64 {
	n := len(x)
	if n < 2 {
		return math.NaN()
	}
	nf := float64(n)
	mx, ssx := meanSS(x)
	my, ssy := meanSS(y)
	sdx, sdy := math.Sqrt(ssx/nf), math.Sqrt(ssy/nf)
	if !(sdx > 0) || !(sdy > 0) || math.IsInf(sdx, 0) || math.IsInf(sdy, 0) || math.IsNaN(mx) || math.IsNaN(my) {
		return math.NaN()
	}
	// Standardised values (v − mean)/sd are formed where they are read.
	// Σ(v_i − v̄)² of the standardised values, for the self terms:
	ssStd := func(v []float64, m, sd float64) float64 {
		var sum float64
		for _, e := range v {
			sum += (e - m) / sd
		}
		hi := sum / nf
		var c, q ksum
		for lo := 0; lo < n; lo += sumBlock {
			var bc, bq float64
			for _, e := range v[lo:min(lo+sumBlock, n)] {
				d := (e-m)/sd - hi
				bc += d
				bq += d * d
			}
			c.add(bc)
			q.add(bq)
		}
		cs := c.value()
		return q.value() - cs*cs/nf
	}

	// Row sums of y and the dense ranks of y, in y order.
	var allY float64
	for _, v := range y {
		allY += (v - my) / sdy
	}
	by := hugepage.Make[float64](n)
	rank := hugepage.Make[int32](n)
	var before float64
	r := int32(0)
	for j, k := range byY {
		v := (y[k] - my) / sdy
		if j == 0 || y[k] != y[byY[j-1]] {
			r++
		}
		rank[k] = r
		after := allY - before - v
		by[k] = (float64(j)*v - before) + (after - float64(n-j-1)*v)
		before += v
	}
	var byy, s2y float64
	for _, e := range by {
		byy += e
		s2y += e * e
	}
	nRanks := int(r)

	// One pass in x order: the row sums of x, Σ a_i·b_i·, and the Fenwick
	// sweep of crossTerm.
	var allX float64
	for _, v := range x {
		allX += (v - mx) / sdx
	}
	t := make([]float64, 4*(nRanks+1))
	var totC, totX, totY, totXY float64
	var sab, axx, s2x, s2 float64
	before = 0
	for k := range x {
		xi, yi := (x[k]-mx)/sdx, (y[k]-my)/sdy
		after := allX - before - xi
		ax := (float64(k)*xi - before) + (after - float64(n-k-1)*xi)
		before += xi
		axx += ax
		s2x += ax * ax
		s2 += ax * by[k]
		q0 := int(rank[k])
		var c, cx, cy, cxy float64
		for q := q0 - 1; q > 0; q &= q - 1 {
			c += t[4*q]
			cx += t[4*q+1]
			cy += t[4*q+2]
			cxy += t[4*q+3]
		}
		sab += xi*yi*(2*c-totC) + (2*cxy - totXY) - xi*(2*cy-totY) - yi*(2*cx-totX)
		for q := q0; q <= nRanks; q += q & -q {
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
	vx := 2*nf*ssStd(x, mx, sdx) - 2*s2x/nf + axx*axx/(nf*nf)
	vy := 2*nf*ssStd(y, my, sdy) - 2*s2y/nf + byy*byy/(nf*nf)
	if !(vx > 0) || !(vy > 0) {
		return math.NaN()
	}
	cross := 2*sab - 2*s2/nf + axx*byy/(nf*nf)
	d := dcorData{vx: vx, vy: vy}
	return d.dcor(cross)
}

// dcorData holds what the distance covariance of one (x, y) sample needs
// that does not change when y is permuted against x, and y itself in the
// form crossTerm reads it.
type dcorData struct {
	n      int
	xs     []float64    // standardised x in ascending order
	ys     []dcorY      // standardised y and its rank, at the x-order position of its row
	pos    []int32      // pos[i]: the x-order position of row i; nil when it is i
	nRanks int          // distinct y values
	ax, by []float64    // row sums a_i·, b_i·, in row order
	axx    float64      // a··
	byy    float64      // b··
	vx, vy float64      // n²·dVar²(x), n²·dVar²(y)
	tree   [][4]float64 // Fenwick workspace, 4 interleaved trees
}

// dcorY is one standardised y value and its dense 1-based rank among the
// distinct y values.
type dcorY struct {
	y float64
	r int
}

// newDcorData standardises x and y and precomputes the row sums and the
// distance variances; nil when n < 2 or a column is constant.
func newDcorData(x, y []float64) *dcorData {
	n := len(x)
	if n < 2 {
		return nil
	}
	xs, okx := standardise(x)
	ys, oky := standardise(y)
	if !okx || !oky {
		return nil
	}
	d := &dcorData{n: n}
	xOrder, ax, axx := rowSums(xs)
	yOrder, by, byy := rowSums(ys)
	d.ax, d.axx, d.by, d.byy = ax, axx, by, byy
	rank := hugepage.Make[int](n)
	r := 0
	for k, i := range yOrder {
		if k == 0 || ys[i] != ys[yOrder[k-1]] {
			r++
		}
		rank[i] = r
	}
	d.nRanks = r
	d.tree = make([][4]float64, r+1)
	d.vx = d.selfTerm(xs, ax, axx)
	d.vy = d.selfTerm(ys, by, byy)
	if !(d.vx > 0) || !(d.vy > 0) {
		return nil
	}
	d.xs, d.ys = xs, hugepage.Make[dcorY](n)
	inOrder := true
	for t, i := range xOrder {
		inOrder = inOrder && t == i
	}
	if inOrder {
		for i := range d.ys {
			d.ys[i] = dcorY{ys[i], rank[i]}
		}
		return d
	}
	d.xs = hugepage.Make[float64](n)
	d.pos = hugepage.Make[int32](n)
	for t, i := range xOrder {
		d.xs[t] = xs[i]
		d.ys[t] = dcorY{ys[i], rank[i]}
		d.pos[i] = int32(t)
	}
	return d
}

// standardise returns (v − mean)/sd; ok is false for a constant or
// non-finite v.
func standardise(v []float64) ([]float64, bool) {
	mean, ss := meanSS(v)
	sd := math.Sqrt(ss / float64(len(v)))
	if !(sd > 0) || math.IsInf(sd, 0) || math.IsNaN(mean) {
		return nil, false
	}
	out := hugepage.Make[float64](len(v))
	for i, e := range v {
		out[i] = (e - mean) / sd
	}
	return out, true
}

// rowSums returns the indices of v in ascending order, the row sums
// s_i = Σ_j |v_i − v_j| by prefix sums over the sorted values, and their
// total.
func rowSums(v []float64) (order []int, s []float64, total float64) {
	n := len(v)
	order = stableArgsort(v)
	var all float64
	for _, e := range v {
		all += e
	}
	s = hugepage.Make[float64](n)
	var before float64 // sum of the values sorted before position k
	for k, i := range order {
		vi := v[i]
		after := all - before - vi
		// k values ≤ vi before, n−k−1 values ≥ vi after.
		s[i] = (float64(k)*vi - before) + (after - float64(n-k-1)*vi)
		before += vi
	}
	for _, e := range s {
		total += e
	}
	return order, s, total
}

// selfTerm returns n²·dVar²(v) = Σ_ij a_ij² − (2/n) Σ_i a_i·² + a··²/n²,
// with Σ_ij (v_i − v_j)² = 2n·Σ(v_i − v̄)².
func (d *dcorData) selfTerm(v, rs []float64, tot float64) float64 {
	n := float64(d.n)
	_, ss := meanSS(v)
	var s2 float64
	for _, e := range rs {
		s2 += e * e
	}
	return 2*n*ss - 2*s2/n + tot*tot/(n*n)
}

// dcorPerm is y permuted against x, y_perm[i] = y[perm[i]], held as what
// the cross term reads: y_perm's values and ranks at the x-order positions
// of their rows, and its row sums in row order. perm itself is not kept:
// swap exchanges y_perm[i] and y_perm[j] in those arrays, as rng.Shuffle's
// swap would exchange perm[i] and perm[j], so the cross term reads them in
// sequence instead of through perm (a quarter less time for 199
// permutations of 5000 rows), and sums the same terms in the same order.
type dcorPerm struct {
	d   *dcorData
	ys  []dcorY   // y_perm and its rank at the x-order position of its row
	by  []float64 // b_perm(i)· at row i
	pos []int32   // d.pos
}

// permuted returns y against x unpermuted as a dcorPerm.
func (d *dcorData) permuted() *dcorPerm {
	return &dcorPerm{d: d, ys: slices.Clone(d.ys), by: slices.Clone(d.by), pos: d.pos}
}

// swap exchanges rows i and j of y_perm.
func (p *dcorPerm) swap(i, j int) {
	p.by[i], p.by[j] = p.by[j], p.by[i]
	a, b := i, j
	if p.pos != nil {
		a, b = int(p.pos[i]), int(p.pos[j])
	}
	p.ys[a], p.ys[b] = p.ys[b], p.ys[a]
}

// cross returns n²·dCov²(x, y_perm).
func (p *dcorPerm) cross() float64 {
	return p.d.cross(p.ys, p.by)
}

// crossTerm returns n²·dCov²(x, y).
func (d *dcorData) crossTerm() float64 {
	return d.cross(d.ys, d.by)
}

// cross returns n²·dCov²(x, y_perm) for a permutation perm of the rows,
// given as ys[t] = d.ys[pos[perm[i]]] at the x-order position t of row i
// and by[i] = d.by[perm[i]].
func (d *dcorData) cross(ys []dcorY, by []float64) float64 {
	n := d.n
	// Σ_{i<j} |x_i − x_j|·|y_i − y_j| over x sorted: for each j, the points
	// i before it with smaller y contribute +(x_j − x_i)(y_j − y_i), the rest
	// −(x_j − x_i)(y_j − y_i) (ties in x or y contribute 0 either way).
	t := d.tree
	clear(t)
	nRanks := d.nRanks
	var totC, totX, totY, totXY float64
	var sab float64
	xs := d.xs[:len(ys)]
	for k, e := range ys {
		xi, yi, r := xs[k], e.y, e.r
		// Prefix sums over ranks < r.
		var c, sx, sy, sxy float64
		for q := r - 1; q > 0; q &= q - 1 {
			node := &t[q]
			c += node[0]
			sx += node[1]
			sy += node[2]
			sxy += node[3]
		}
		// Points below (+) minus points at or above (−).
		dc := 2*c - totC
		dx := 2*sx - totX
		dy := 2*sy - totY
		dxy := 2*sxy - totXY
		sab += xi*yi*dc + dxy - xi*dy - yi*dx
		for q := r; q <= nRanks; q += q & -q {
			node := &t[q]
			node[0]++
			node[1] += xi
			node[2] += yi
			node[3] += xi * yi
		}
		totC++
		totX += xi
		totY += yi
		totXY += xi * yi
	}
	var s2 float64
	by = by[:len(d.ax)]
	for i, a := range d.ax {
		s2 += a * by[i]
	}
	nf := float64(n)
	return 2*sab - 2*s2/nf + d.axx*d.byy/(nf*nf)
}

// dcor turns n²·dCov²(x, y) into dCor, clamping rounding below 0 to 0.
func (d *dcorData) dcor(cross float64) float64 {
	r2 := cross / math.Sqrt(d.vx*d.vy)
	if r2 <= 0 {
		return 0
	}
	if r2 > 1 {
		r2 = 1
	}
	return math.Sqrt(r2)
}
