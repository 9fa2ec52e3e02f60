package stats

// This file holds the correlation coefficients: Pearson's r with its
// Fisher-z interval and t-test, Spearman's ρ on average ranks, and
// Kendall's τ-b by Knight's O(n log n) algorithm.

import (
	"math"
	"math/bits"
	"slices"

	"bivar/internal/hugepage"
)

// Correlation is Pearson's product-moment correlation with its inference.
type Correlation struct {
	R      float64 // sample correlation Sxy/√(Sxx·Syy)
	R2     float64 // R²
	CILow  float64 // Fisher-z confidence interval for ρ, lower end
	CIHigh float64 // upper end
	T      float64 // t = r·√(DF/(1−r²)) for H0: ρ = 0
	DF     int     // degrees of freedom of T, n−2
	P      float64 // two-sided p of T with DF degrees of freedom
}

// Pearson returns the sample correlation
//
//	r = Sxy / √(Sxx·Syy)
//
// from centred sums (CentredMoments), clamped to [−1, 1] against rounding;
// r², the Fisher-z interval at confidence conf (FisherCI), and the t-test of
// ρ = 0 with n−2 degrees of freedom, t = r·√((n−2)/(1−r²)), p from TwoSidedT
// (exact Student t tail). |r| = 1 gives T = ±Inf and P = 0.
//
// x and y must have equal length (it panics otherwise) and hold no NaN.
// R is NaN when n < 2 or x or y is constant (every value the same; data of
// any finite magnitude, 1e-300 or 1e300, vary); T and P are NaN when n < 3;
// the interval is NaN when n < 4.
func Pearson(x, y []float64, conf float64) Correlation {
	c, _ := pearson(x, y, conf)
	return c
}

// PearsonWithMoments returns Pearson(x, y, conf) and CentredMoments(x, y),
// summing the pairs once where Pearson needs no scaling (the sums it takes
// are then those very moments), twice else.
func PearsonWithMoments(x, y []float64, conf float64) (Correlation, Moments) {
	c, m := pearson(x, y, conf)
	if m == nil {
		mm := CentredMoments(x, y)
		m = &mm
	}
	return c, *m
}

// pearson is Pearson, with the moments of x and y it summed when it
// summed them unscaled (else nil).
func pearson(x, y []float64, conf float64) (Correlation, *Moments) {
	if len(x) != len(y) {
		panic("stats: Pearson: x and y lengths differ")
	}
	n := len(x)
	nan := math.NaN()
	c := Correlation{R: nan, R2: nan, CILow: nan, CIHigh: nan, T: nan, DF: n - 2, P: nan}
	if n < 2 {
		if c.DF < 0 {
			c.DF = 0
		}
		return c, nil
	}
	// r does not depend on the scale of x or y; far from 1 (beyond 2^±400)
	// the sums of squares would underflow or overflow, so such data are
	// scaled by a power of two (exact) first.
	scaled := false
	if k := pow2Shift(x); k != 0 {
		x, scaled = ldexpAll(x, k), true
	}
	if k := pow2Shift(y); k != 0 {
		y, scaled = ldexpAll(y, k), true
	}
	m := CentredMoments(x, y)
	mp := &m
	if scaled {
		mp = nil
	}
	c.R = corrFromSums(m.Sxx, m.Syy, m.Sxy)
	if math.IsNaN(c.R) {
		return c, mp
	}
	c.R2 = c.R * c.R
	c.CILow, c.CIHigh = FisherCI(c.R, n, conf)
	c.T, c.P = corrT(c.R, n)
	return c, mp
}

// corrFromSums returns Sxy/√(Sxx·Syy) clamped to [−1, 1], NaN when either
// sum of squares is not positive.
func corrFromSums(sxx, syy, sxy float64) float64 {
	if !(sxx > 0) || !(syy > 0) {
		return math.NaN()
	}
	d := math.Sqrt(sxx * syy) // one rounding: y = x gives exactly 1
	if math.IsInf(d, 0) || d < 0x1p-1000 {
		d = math.Sqrt(sxx) * math.Sqrt(syy) // product out of range
	}
	r := sxy / d
	return math.Max(-1, math.Min(1, r))
}

// corrT returns the t statistic r·√((n−2)/(1−r²)) and its two-sided p with
// n−2 degrees of freedom; NaN for n < 3.
func corrT(r float64, n int) (t, p float64) {
	if n < 3 || math.IsNaN(r) {
		return math.NaN(), math.NaN()
	}
	df := float64(n - 2)
	if math.Abs(r) == 1 {
		return math.Copysign(math.Inf(1), r), 0
	}
	t = r * math.Sqrt(df/((1-r)*(1+r)))
	return t, TwoSidedT(t, df)
}

// FisherCI returns the approximate confidence interval for a correlation
// coefficient from Fisher's z-transformation (Fisher 1921; e.g. Sheskin,
// Handbook of Parametric and Nonparametric Statistical Procedures, Test 28):
//
//	z = atanh(r);  (lo, hi) = tanh(z ∓ z_{(1+conf)/2} / √(n−3))
//
// with z_q the standard normal quantile. It returns NaN for n < 4, NaN r,
// or conf outside (0, 1); |r| = 1 gives lo = hi = r.
func FisherCI(r float64, n int, conf float64) (lo, hi float64) {
	if n < 4 || math.IsNaN(r) || !(conf > 0 && conf < 1) {
		return math.NaN(), math.NaN()
	}
	if math.Abs(r) >= 1 {
		return r, r
	}
	z := math.Atanh(r)
	half := NormalQuantile(0.5+conf/2) / math.Sqrt(float64(n-3))
	return math.Tanh(z - half), math.Tanh(z + half)
}

// Ranks returns the 1-based ranks of x, tied values sharing the mean of
// the ranks they occupy ("average" or "fractional" ranking; Kendall &
// Gibbons 1990, Rank Correlation Methods, §3.8). The order comes from an
// O(n) radix sort (sortkey.go). x must hold no NaN and fewer than 2³¹
// values (it panics otherwise).
func Ranks(x []float64) []float64 {
	checkIndexable("Ranks", len(x))
	r := hugepage.Make[float64](len(x))
	ranksInto(r, x, newRankScratch(len(x)))
	return r
}

// checkIndexable panics when n rows cannot be indexed by int32 (about 2·10⁹,
// far beyond any data set that fits in memory with its sort buffers).
func checkIndexable(fn string, n int) {
	if n > math.MaxInt32 {
		panic("stats: " + fn + ": more than 2³¹−1 values")
	}
}

// rankScratch holds the buffers of ranksInto, reused between calls.
type rankScratch struct {
	keys, kbuf []uint64
	idx, ibuf  []int32
}

func newRankScratch(n int) *rankScratch {
	return &rankScratch{hugepage.Make[uint64](n), hugepage.Make[uint64](n), hugepage.Make[int32](n), hugepage.Make[int32](n)}
}

// ranksInto writes the average ranks of x into r (len(r) = len(x)).
func ranksInto(r, x []float64, s *rankScratch) {
	n := len(x)
	keys, idx := s.keys[:n], s.idx[:n]
	orderKeys(x, keys)
	for i := range idx {
		idx[i] = int32(i)
	}
	radixSort(keys, idx, s.kbuf, s.ibuf)
	for lo := 0; lo < n; {
		hi := lo + 1
		for hi < n && keys[hi] == keys[lo] {
			hi++
		}
		// positions lo..hi-1 (0-based) hold ranks lo+1..hi; their mean:
		avg := float64(lo+1+hi) / 2
		for k := lo; k < hi; k++ {
			r[idx[k]] = avg
		}
		lo = hi
	}
}

// Spearman returns Spearman's rank correlation ρ, Pearson's r of the
// average ranks (Ranks), so ties are handled exactly rather than by the
// 1 − 6Σd²/(n(n²−1)) shortcut, which holds only without ties. p is the
// two-sided p of t = ρ·√((n−2)/(1−ρ²)) with n−2 degrees of freedom, the
// usual large-sample approximation (as scipy.stats.spearmanr).
//
// x and y must have equal length (it panics otherwise). ρ and p are NaN
// when a value is NaN (±Inf are ranked like any other value), n < 2 or
// either variable is constant; p is NaN when n < 3.
func Spearman(x, y []float64) (rho, p float64) {
	if len(x) != len(y) {
		panic("stats: Spearman: x and y lengths differ")
	}
	if len(x) < 2 || hasNaN(x) || hasNaN(y) {
		return math.NaN(), math.NaN()
	}
	checkIndexable("Spearman", len(x))
	sc := newRankScratch(len(x))
	rx, ry := hugepage.Make[float64](len(x)), hugepage.Make[float64](len(x))
	ranksInto(rx, x, sc)
	ranksInto(ry, y, sc)
	m := CentredMoments(rx, ry)
	rho = corrFromSums(m.Sxx, m.Syy, m.Sxy)
	_, p = corrT(rho, len(x))
	return rho, p
}

// KendallTauB returns Kendall's τ-b and its two-sided p-value.
//
//	τ-b = (C − D) / √((n0 − n1)(n0 − n2))
//
// with C and D the concordant and discordant pairs, n0 = n(n−1)/2, and n1,
// n2 the pairs tied in x and in y. The count is Knight's algorithm (Knight
// 1966, "A computer method for calculating Kendall's tau with ungrouped
// data", JASA 61(314):436–439): sort the pairs by (x, y), then merge-sort y
// counting the exchanges, which are the discordant pairs; O(n log n) time,
// O(n) memory. The initial sort is a radix sort by x (sortkey.go) with each
// run of tied x then sorted by y, and the merge sort starts from
// insertion-sorted runs of 16. (gonum's stat.Kendall
// is τ-a, O(n²), and counts ties as concordant, so it is not used.)
//
// p is from the normal approximation to S = C − D with the variance
// corrected for ties in both variables (Kendall 1970, Rank Correlation
// Methods, 4th ed., ch. 4):
//
//	Var S = [n(n−1)(2n+5) − Σt(t−1)(2t+5) − Σu(u−1)(2u+5)]/18
//	      + [Σt(t−1)]·[Σu(u−1)] / (2n(n−1))
//	      + [Σt(t−1)(t−2)]·[Σu(u−1)(u−2)] / (9n(n−1)(n−2))
//
// over the tie groups t of x and u of y; this is scipy.stats.kendalltau's
// asymptotic p for variant "b". Without ties and with n ≤ KendallExactMaxN
// the p-value is instead exact: twice the lower tail of the number of
// discordant pairs, whose null distribution is that of the inversions of a
// random permutation (Kendall 1970, ch. 4; computed by the recursion
// P_j(k) = (1/j)·Σ_{i<j} P_{j−1}(k−i) over the first j ranks), capped at 1 —
// the rule and the value of scipy.stats.kendalltau's default
// method="auto", where the normal approximation is poor (n = 5 without
// ties: exact 0.0167, normal 0.0275 for τ = 1).
//
// x and y must have equal length and fewer than 2³¹ values (it panics
// otherwise). τ-b and p are NaN when a value is NaN (±Inf are ranked like
// any other value), n < 2 or either variable is constant.
func KendallTauB(x, y []float64) (tau, p float64) {
	if len(x) != len(y) {
		panic("stats: KendallTauB: x and y lengths differ")
	}
	n := len(x)
	if n < 2 || hasNaN(x) || hasNaN(y) {
		return math.NaN(), math.NaN()
	}
	checkIndexable("KendallTauB", n)
	// Order the rows by (x, y): a radix sort by x, then each run of tied x
	// sorted by y. Only the y keys in that order are needed afterwards.
	kx := hugepage.Make[uint64](n)
	ys := hugepage.Make[uint64](n)
	kbuf := hugepage.Make[uint64](n)
	idx := hugepage.Make[int32](n)
	for i, v := range x {
		kx[i] = floatKey(v)
		idx[i] = int32(i)
	}
	radixSort(kx, idx, kbuf, hugepage.Make[int32](n))
	for i, j := range idx {
		ys[i] = floatKey(y[j])
	}
	idx = nil
	for lo := 0; lo < n; {
		hi := lo + 1
		for hi < n && kx[hi] == kx[lo] {
			hi++
		}
		if hi-lo > 1 {
			slices.Sort(ys[lo:hi])
		}
		lo = hi
	}
	var tx, txy tieSums // ties in x; joint ties in (x, y)
	for lo := 0; lo < n; {
		hi := lo + 1
		for hi < n && kx[hi] == kx[lo] {
			hi++
		}
		tx.add(hi - lo)
		for a := lo; a < hi; {
			b := a + 1
			for b < hi && ys[b] == ys[a] {
				b++
			}
			txy.add(b - a)
			a = b
		}
		lo = hi
	}
	swaps := mergeCount(ys, kbuf)
	var ty tieSums
	for lo := 0; lo < n; {
		hi := lo + 1
		for hi < n && ys[hi] == ys[lo] {
			hi++
		}
		ty.add(hi - lo)
		lo = hi
	}
	return kendallFromCounts(n, swaps, tx, ty, txy)
}

// kendallFromCounts returns τ-b and its p (see KendallTauB) of n pairs with
// swaps discordant pairs and the tie sums of x, of y and of joint ties.
func kendallFromCounts(n int, swaps int64, tx, ty, txy tieSums) (tau, p float64) {
	n0 := int64(n) * int64(n-1) / 2
	s := n0 - tx.pairs - ty.pairs + txy.pairs - 2*swaps
	den := math.Sqrt(float64(n0-tx.pairs) * float64(n0-ty.pairs))
	if den == 0 {
		return math.NaN(), math.NaN()
	}
	tau = float64(s) / den
	tau = math.Max(-1, math.Min(1, tau))

	nf := float64(n)
	v := (nf*(nf-1)*(2*nf+5) - tx.v0 - ty.v0) / 18
	v += tx.v1 * ty.v1 / (2 * nf * (nf - 1))
	if n > 2 {
		v += tx.v2 * ty.v2 / (9 * nf * (nf - 1) * (nf - 2))
	}
	if tx.pairs == 0 && ty.pairs == 0 && n <= KendallExactMaxN {
		return tau, kendallExactP(n, swaps)
	}
	if !(v > 0) {
		return tau, math.NaN()
	}
	return tau, TwoSidedNormal(float64(s) / math.Sqrt(v))
}

// KendallExactMaxN is the largest n for which KendallTauB gives the exact
// p-value when neither variable has ties (scipy 1.10's rule for
// method="auto").
const KendallExactMaxN = 33

// kendallExactP returns the exact two-sided p-value of Kendall's test for n
// untied pairs with d discordant pairs: 2·P(D ≤ min(d, n0 − d)) under
// independence, capped at 1 (see KendallTauB).
func kendallExactP(n int, d int64) float64 {
	n0 := int64(n) * int64(n-1) / 2
	c := int(min(d, n0-d))
	if 4*int64(c) == int64(n)*int64(n-1) {
		return 1
	}
	prob := make([]float64, c+1) // P_j(k) for k = 0..c
	prob[0] = 1
	next := make([]float64, c+1)
	for j := 2; j <= n; j++ {
		// next[k] = (1/j)·Σ_{i=0}^{j−1} prob[k−i], a sliding window sum.
		var win float64
		for k := 0; k <= c; k++ {
			win += prob[k]
			if k-j >= 0 {
				win -= prob[k-j]
			}
			next[k] = win / float64(j)
		}
		prob, next = next, prob
	}
	var tail float64
	for _, v := range prob {
		tail += v
	}
	return math.Min(1, 2*tail)
}

// hasNaN reports whether v holds a NaN.
func hasNaN(v []float64) bool {
	for _, e := range v {
		if e != e {
			return true
		}
	}
	return false
}

// tieSums accumulates, over tie groups of size t, the sums that τ-b and
// its variance need.
type tieSums struct {
	pairs int64   // Σ t(t−1)/2
	v0    float64 // Σ t(t−1)(2t+5)
	v1    float64 // Σ t(t−1)
	v2    float64 // Σ t(t−1)(t−2)
}

func (s *tieSums) add(t int) {
	if t < 2 {
		return
	}
	tf := float64(t)
	s.pairs += int64(t) * int64(t-1) / 2
	s.v0 += tf * (tf - 1) * (2*tf + 5)
	s.v1 += tf * (tf - 1)
	s.v2 += tf * (tf - 1) * (tf - 2)
}

// mergeCount sorts a ascending by a bottom-up, stable merge sort and
// returns the number of pairs i < j with a[i] > a[j] (equal values are not
// counted), using buf (len(buf) ≥ len(a)) as scratch: Knight (1966). Runs
// of mergeRun elements are first sorted by insertion, whose number of
// element moves is exactly their count of such pairs.
func mergeCount[T uint64 | int32](a, buf []T) int64 {
	n := len(a)
	if n < 2 {
		return 0
	}
	var swaps int64
	for lo := 0; lo < n; lo += mergeRun {
		hi := min(lo+mergeRun, n)
		for i := lo + 1; i < hi; i++ {
			v := a[i]
			j := i
			for j > lo && a[j-1] > v {
				a[j] = a[j-1]
				j--
			}
			a[j] = v
			swaps += int64(i - j)
		}
	}
	src, dst := a, buf[:n]
	for width := mergeRun; width < n; width *= 2 {
		for lo := 0; lo < n; lo += 2 * width {
			mid := min(lo+width, n)
			hi := min(lo+2*width, n)
			i, j, k := lo, mid, lo
			// Branch-free merge step (the comparison is unpredictable on
			// noisy data): take the right element only when it is smaller.
			for i < mid && j < hi {
				vi, vj := src[i], src[j]
				v, right := vi, 0
				if vj < vi {
					v, right = vj, 1
				}
				dst[k] = v
				swaps += int64(right * (mid - i))
				i += 1 - right
				j += right
				k++
			}
			k += copy(dst[k:], src[i:mid])
			copy(dst[k:], src[j:hi])
		}
		src, dst = dst, src
	}
	if &src[0] != &a[0] {
		copy(a, src)
	}
	return swaps
}

// mergeRun is the length of the runs mergeCount sorts by insertion.
const mergeRun = 16

// trieCount returns the number of pairs i < j with a[i] > a[j] (equal
// values are not counted) for values in [0, d), without moving them. It
// keeps, for each bit level l of the values, the count of the values seen
// so far whose top bits (v >> l) equal each prefix: a value u seen later
// is below a value v seen before exactly when, at the highest bit where
// they differ, u has a 0 and v a 1, so the values before u and above it
// number Σ over the levels l where bit l of u is 0 of the count at prefix
// (u >> l) | 1 (a binary trie of the values, counted per node). Each value
// costs one read and one increment per level, the same work for every
// value and no branch on it, where a Fenwick tree (Fenwick 1994, "A new
// data structure for cumulative frequency tables", Software: Practice and
// Experience 24(3):327–336), which took this count before, walks paths
// whose length varies with the value. At 10⁶ values with 13 624 distinct
// (x ~ N(5, 2) read to 3 decimals): 15.9 ms against the Fenwick tree's
// 19.9 ms and mergeCount's 50 ms (CPU time, medians). O(n log d) time,
// about 8d bytes.
func trieCount(a []int32, d int) int64 {
	levels := bits.Len(uint(max(d-1, 0)))
	cnt := make([][]int32, levels)
	for l := range cnt {
		cnt[l] = make([]int32, (d-1)>>l+2)
	}
	var inv int64
	for _, v := range a {
		u := int(v)
		var above int64
		for l := 0; l < levels; l++ {
			p := u >> l
			c := cnt[l]
			// c[p|1] when bit l of u is 0, else nothing.
			above += int64(c[p|1]) * int64(1-p&1)
			c[p]++
		}
		inv += above
	}
	return inv
}

// trieMax is the most distinct values for which Sorted.KendallTauB
// counts by trieCount: counts of 8 MiB. (At 10⁶ distinct values among
// 10⁶, Fenwick's tree, which trieCount replaced, still took four fifths of
// mergeCount's time.)
const trieMax = 1 << 20

// PearsonMoments is Pearson for data given by their centred moments (see
// CentredMoments): r = Sxy/√(Sxx·Syy) with the same Fisher-z interval, t
// and p as Pearson. It returns NaN figures where Pearson would.
func PearsonMoments(m Moments, conf float64) Correlation {
	nan := math.NaN()
	c := Correlation{R: nan, R2: nan, CILow: nan, CIHigh: nan, T: nan, DF: max(m.N-2, 0), P: nan}
	if m.N < 2 {
		return c
	}
	c.R = corrFromSums(m.Sxx, m.Syy, m.Sxy)
	if math.IsNaN(c.R) {
		return c
	}
	c.R2 = c.R * c.R
	c.CILow, c.CIHigh = FisherCI(c.R, m.N, conf)
	c.T, c.P = corrT(c.R, m.N)
	return c
}

// WithoutRows returns the centred moments of the pairs left when the rows
// drop are taken out of data whose moments are all, by the exact identity
// for two groups (Chan, Golub & LeVeque 1983, eq. 2.1, read backwards):
//
//	S_all = S_kept + S_drop + (n_kept·n_drop/n)·(mean_kept − mean_drop)²
//
// and the same with cross products for Sxy. ok is false, and the moments
// are not to be used, when too little is left (fewer than 2 rows) or when
// the rows taken out hold more than half of Sxx or Syy: the subtraction
// would then cancel digits, and the caller should sum the kept rows
// instead.
func WithoutRows(all Moments, dropX, dropY []float64) (kept Moments, ok bool) {
	if len(dropX) != len(dropY) {
		panic("stats: WithoutRows: x and y lengths differ")
	}
	d := CentredMoments(dropX, dropY)
	if len(dropX) == 0 {
		return all, true
	}
	n, nd := float64(all.N), float64(d.N)
	nk := n - nd
	if all.N-d.N < 2 {
		return Moments{}, false
	}
	kept.N = all.N - d.N
	kept.MeanX = (n*all.MeanX - nd*d.MeanX) / nk
	kept.MeanY = (n*all.MeanY - nd*d.MeanY) / nk
	f := nk * nd / n
	dx, dy := kept.MeanX-d.MeanX, kept.MeanY-d.MeanY
	kept.Sxx = all.Sxx - d.Sxx - f*dx*dx
	kept.Syy = all.Syy - d.Syy - f*dy*dy
	kept.Sxy = all.Sxy - d.Sxy - f*dx*dy
	if !(kept.Sxx >= 0.5*all.Sxx) || !(kept.Syy >= 0.5*all.Syy) {
		return Moments{}, false
	}
	return kept, true
}
