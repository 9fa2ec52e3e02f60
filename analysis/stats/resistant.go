package stats

// This file holds the resistant line (Theil–Sen), compared with least
// squares to show whether a few points drive the slope, and the O(n)
// selection it uses for medians.

import (
	"encoding"
	"fmt"
	"math"
	"math/bits"
	"math/rand/v2"
	"slices"

	"bivar/internal/hugepage"
)

// DefaultMaxExact is the number of points up to which TheilSen uses every
// pair when its maxExact argument is 0 or less: 2000 points, 1 999 000
// pairs.
const DefaultMaxExact = 2000

// TheilSen returns the Theil–Sen resistant line (Theil 1950, "A
// rank-invariant method of linear and polynomial regression analysis",
// Proc. KNAW 53; Sen 1968, "Estimates of the regression coefficient based
// on Kendall's tau", JASA 63:1379–1389):
//
//	slope     = median of (y_j − y_i)/(x_j − x_i) over pairs with x_i ≠ x_j
//	intercept = median of (y_i − slope·x_i)
//
// the same definitions as scipy.stats.theilslopes(y, x, method="joint").
// Pairs with equal x are left out. A median of an even count is the mean of
// the two middle values. Medians are found by selection (Hoare's quickselect
// with an introselect fallback to sorting; from 2¹⁶ values on, over the
// values inside a bracket found from a sample, bracketMedian), so the cost
// is that of building the slopes.
//
// Up to maxExact points (DefaultMaxExact when maxExact ≤ 0) every pair is
// used: n(n−1)/2 slopes, O(n²) time and memory, and method is
// "theil-sen (exact)". Above that the slope is the median of a random
// sample of M = maxExact·(maxExact−1)/2 pairs drawn with replacement from
// the n(n−1)/2 (each draw two distinct indices, uniform; draws with
// x_i = x_j are redrawn, at most 8·M draws in all) from rand.New(src), so
// the cost stays bounded at O(M + n) whatever n is (and the M slopes are
// counted against a bracket as they are drawn instead of stored, where src
// can save and restore its state: streamedSlope); the sampled median is
// within a few multiples of 1/√M in quantile of the exact one. method
// then says "theil-sen (median of M random pairs of n points)". The
// intercept always uses all n points. A nil src means rand.NewPCG(1, 2).
//
// x and y must have equal length (it panics otherwise). slope and
// intercept are NaN when a value is NaN or infinite, or fewer than two
// distinct x values exist.
func TheilSen(x, y []float64, maxExact int, src rand.Source) (slope, intercept float64, method string) {
	f := TheilSenFit(x, y, maxExact, src)
	return f.Slope, f.Intercept, f.Method
}

// ResistantFit is a Theil–Sen line with how it was computed.
type ResistantFit struct {
	Slope, Intercept float64
	Method           string
	Pairs            int // the pairs sampled above maxExact; 0 when every pair was used
}

// TheilSenFit is TheilSen returning the number of sampled pairs as a
// number too, for a caller that states the approximation's error.
func TheilSenFit(x, y []float64, maxExact int, src rand.Source) ResistantFit {
	slope, intercept, method, pairs := theilSen(x, y, maxExact, src)
	return ResistantFit{Slope: slope, Intercept: intercept, Method: method, Pairs: pairs}
}

func theilSen(x, y []float64, maxExact int, src rand.Source) (slope, intercept float64, method string, pairs int) {
	if len(x) != len(y) {
		panic("stats: TheilSen: x and y lengths differ")
	}
	if maxExact <= 0 {
		maxExact = DefaultMaxExact
	}
	if maxExact < 2 {
		maxExact = 2
	}
	n := len(x)
	nan := math.NaN()
	method = "theil-sen (exact)"
	for i := range x {
		if math.IsNaN(x[i]) || math.IsInf(x[i], 0) || math.IsNaN(y[i]) || math.IsInf(y[i], 0) {
			return nan, nan, method, pairs
		}
	}
	var slopes []float64
	if n <= maxExact {
		slopes = make([]float64, 0, n*(n-1)/2)
		for i := 0; i < n; i++ {
			xi, yi := x[i], y[i]
			for j := i + 1; j < n; j++ {
				if dx := x[j] - xi; dx != 0 {
					slopes = append(slopes, (y[j]-yi)/dx)
				}
			}
		}
	} else {
		if src == nil {
			src = rand.NewPCG(1, 2)
		}
		m := maxExact * (maxExact - 1) / 2
		checkIndexable("TheilSen", n)
		// The median without storing the slopes where the stream can be
		// drawn again should the bracket miss (streamedSlope); else, or
		// then, every slope is stored and selected over.
		if st, ok := src.(rewindable); ok && m >= bracketMinN {
			state, err := st.MarshalBinary()
			if err == nil {
				if slope, ok := streamedSlope(x, y, m, newPairDraw(n, m, src)); ok {
					return slope, theilSenIntercept(x, y, slope), sampledMethod(m, n), m
				}
				if st.UnmarshalBinary(state) != nil {
					panic("stats: TheilSen: the random source did not take back its own state")
				}
			}
		}
		slopes = hugepage.Make[float64](m)
		slopes = slopes[:newPairDraw(n, m, src).slopes(x, y, slopes)]
		pairs = len(slopes)
		method = sampledMethod(pairs, n)
	}
	if len(slopes) == 0 {
		return nan, nan, method, pairs
	}
	slope = medianInPlace(slopes)
	return slope, theilSenIntercept(x, y, slope), method, pairs
}

// sampledMethod names Theil–Sen on pairs sampled from n points.
func sampledMethod(pairs, n int) string {
	return fmt.Sprintf("theil-sen (median of %d random pairs of %d points)", pairs, n)
}

// theilSenIntercept is the median of y_i − slope·x_i.
func theilSenIntercept(x, y []float64, slope float64) float64 {
	if mid, ok := bracketMedian(y, x, slope); ok {
		return mid
	}
	resid := hugepage.Make[float64](len(x))
	for i := range x {
		resid[i] = y[i] - slope*x[i]
	}
	return medianInPlace(resid)
}

// rewindable is a random source whose state can be saved and restored
// (math/rand/v2's PCG and ChaCha8 are).
type rewindable interface {
	rand.Source
	encoding.BinaryMarshaler
	encoding.BinaryUnmarshaler
}

// pairDraw draws Theil–Sen's random pairs. One 64-bit draw gives both
// positions: i from its low half in [0, n), j from its high half in
// [0, n−1) (then shifted past i), each by Lemire's multiply-and-reject
// (Lemire 2019, "Fast random integer generation in an interval", ACM
// TOMACS 29(1)), exactly uniform; a draw with a rejected half is drawn
// again. At most 8·M draws are made in all, rejected ones included.
//
// The pairs are drawn a batch ahead of their use: reading the values of a
// batch of known positions lets the processor fetch many of them from
// memory at once, where drawing each pair before reading it left one
// fetch at a time in flight (half the time at 10⁶ rows). The pairs are
// used in the order drawn either way.
type pairDraw struct {
	src            rand.Source
	un, um, tn, tm uint32
	draws, max     int
	ii, jj         [256]int32 // the batch drawn ahead
	at, nb         int        // its next pair and its length
}

// newPairDraw returns the draws of pairs of n < 2³¹ points, at most 8m.
func newPairDraw(n, m int, src rand.Source) *pairDraw {
	un, um := uint32(n), uint32(n-1)
	return &pairDraw{src: src, un: un, um: um, tn: -un % un, tm: -um % um, max: 8 * m}
}

// refill draws the next batch (empty when the draws are spent).
func (d *pairDraw) refill() {
	d.at, d.nb = 0, 0
	for d.nb < len(d.ii) && d.draws < d.max {
		d.draws++
		w := d.src.Uint64()
		pi, pj := uint64(uint32(w))*uint64(d.un), uint64(uint32(w>>32))*uint64(d.um)
		if uint32(pi) < d.tn || uint32(pj) < d.tm {
			continue
		}
		i, j := uint32(pi>>32), uint32(pj>>32)
		if j >= i {
			j++
		}
		d.ii[d.nb], d.jj[d.nb] = int32(i), int32(j)
		d.nb++
	}
}

// slopes writes into v the slopes (y_j − y_i)/(x_j − x_i) of the next
// pairs with x_i ≠ x_j, in the order drawn, and returns how many: fewer
// than len(v) only when the draws are spent.
func (d *pairDraw) slopes(x, y, v []float64) int {
	k := 0
	for k < len(v) {
		if d.at == d.nb {
			if d.refill(); d.nb == 0 {
				break
			}
		}
		ii, jj := d.ii[d.at:d.nb], d.jj[d.at:d.nb]
		t := 0
		for ; t < len(ii) && k < len(v); t++ {
			i, j := ii[t], jj[t]
			if dx := x[j] - x[i]; dx != 0 {
				v[k] = (y[j] - y[i]) / dx
				k++
			}
		}
		d.at += t
	}
	return k
}

// streamedSlope returns the median of the slopes of the first m pairs
// with x_i ≠ x_j that d draws, the value the stored slopes' median has,
// without storing them: the first bracketSample(m) slopes, themselves a
// random sample of the m, bracket the middle (bracketOf), and every slope
// is counted against the bracket as it is drawn. It returns false when the
// draws run out before m slopes or the bracket misses the middle; the
// caller then draws the same pairs again and stores them.
func streamedSlope(x, y []float64, m int, d *pairDraw) (float64, bool) {
	var buf [1024]float64
	first := make([]float64, bracketSample(m))
	if d.slopes(x, y, first) < len(first) {
		return 0, false
	}
	br := bracketOf(slices.Clone(first), m)
	if !br.count(first) {
		return 0, false
	}
	for got := len(first); got < m; {
		k := d.slopes(x, y, buf[:min(len(buf), m-got)])
		if k == 0 || !br.count(buf[:k]) {
			return 0, false
		}
		got += k
	}
	return br.middle()
}

// stableArgsort returns the indices of v in ascending order of value, ties
// in index order, by the package's O(n) radix sort (radixSort on
// orderKeys' keys; −0 and +0 count as equal). v must hold no NaN. Values already in
// ascending order (samples drawn in canonical order, say) give 0, 1, …
// without a sort.
func stableArgsort(v []float64) []int {
	n := len(v)
	if slices.IsSorted(v) {
		out := hugepage.Make[int](n)
		for i := range out {
			out[i] = i
		}
		return out
	}
	keys := hugepage.Make[uint64](n)
	idx := hugepage.Make[int32](n)
	orderKeys(v, keys)
	for i := range idx {
		idx[i] = int32(i)
	}
	radixSort(keys, idx, hugepage.Make[uint64](n), hugepage.Make[int32](n))
	out := hugepage.Make[int](n)
	for i, k := range idx {
		out[i] = int(k)
	}
	return out
}

// medianInPlace returns the median of a (mean of the two middle values for
// an even length; a zero as +0), reordering a (or, where bracketMedian
// answers, not). It returns NaN for an empty a. a must hold no NaN.
func medianInPlace(a []float64) float64 {
	n := len(a)
	if n == 0 {
		return math.NaN()
	}
	if mid, ok := bracketMedian(a, nil, 0); ok {
		return mid
	}
	k := n / 2
	hi := selectInPlace(a, k)
	if n%2 == 1 {
		return hi + 0 // a zero median is +0, whichever zero selection met
	}
	// After selection a[:k] holds the k smallest values: the lower middle
	// is their maximum.
	lo := slices.Max(a[:k])
	return lo + (hi-lo)/2 + 0
}

// selectInPlace reorders a so that a[k] is the value a sorted copy would
// hold there, every a[i ≤ k] ≤ a[k] and every a[i ≥ k] ≥ a[k], and returns
// a[k]. Quickselect (Hoare 1961, Algorithm 65 FIND) with a median-of-three
// pivot and three-way partitioning, falling back to sorting the remaining
// range after 2·log₂n rounds so the worst case stays O(n log n) (Musser
// 1997, introselect). Expected cost O(n).
func selectInPlace(a []float64, k int) float64 {
	lo, hi := 0, len(a) // active range [lo, hi)
	budget := 2 * bits.Len(uint(len(a)))
	for hi-lo > 16 {
		if budget == 0 {
			slices.Sort(a[lo:hi])
			return a[k]
		}
		budget--
		mid := lo + (hi-lo)/2
		p := median3(a[lo], a[mid], a[hi-1])
		// Dutch-flag partition of [lo, hi): < p, == p, > p.
		lt, i, gt := lo, lo, hi
		for i < gt {
			switch v := a[i]; {
			case v < p:
				a[lt], a[i] = a[i], a[lt]
				lt++
				i++
			case v > p:
				gt--
				a[gt], a[i] = a[i], a[gt]
			default:
				i++
			}
		}
		switch {
		case k < lt:
			hi = lt
		case k >= gt:
			lo = gt
		default:
			return p
		}
	}
	slices.Sort(a[lo:hi])
	return a[k]
}

// bracketMinN is the least count bracketMedian works on; below it a
// selection over the whole slice costs less than the sample's sort.
const bracketMinN = 1 << 16

// bracketMedian returns the median of the n values v_i = a_i − b·c_i (a_i
// when c is nil; none NaN, n = len(a) = len(c); the mean of the two middle
// values for an even n) without storing or reordering them, and false
// where it cannot tell (n below bracketMinN, or values so placed that the
// bracket missed the middle): then the caller selects over all n as
// before. It is exact either way.
//
// Method: the sampling step of Floyd & Rivest (1975, "Expected time bounds
// for selection", Commun. ACM 18(3):165–172, Algorithm 489 SELECT). A
// sample of s ≈ n^(2/3) values, taken at evenly spaced positions, is
// sorted and brackets the middle (bracketOf); one pass counts the values
// below the bracket and at its ends and keeps those inside it
// (bracket.count); a selection over the kept values gives the middle when
// the bracket held it (bracket.middle). A bracket that misses — possible only for values placed
// in a pattern that fools the evenly spaced sample — is detected by the
// counts.
func bracketMedian(a, c []float64, b float64) (float64, bool) {
	n := len(a)
	if n < bracketMinN {
		return 0, false
	}
	at := func(i int) float64 {
		if c == nil {
			return a[i]
		}
		return a[i] - b*c[i]
	}
	sample := make([]float64, bracketSample(n))
	for t := range sample {
		sample[t] = at(int((2*uint64(t) + 1) * uint64(n) / (2 * uint64(len(sample)))))
	}
	br := bracketOf(sample, n)
	if c == nil {
		if !br.count(a) {
			return 0, false
		}
		return br.middle()
	}
	var chunk [1024]float64
	for lo := 0; lo < n; lo += len(chunk) {
		v := chunk[:min(len(chunk), n-lo)]
		for k := range v {
			v[k] = a[lo+k] - b*c[lo+k]
		}
		if !br.count(v) {
			return 0, false
		}
	}
	return br.middle()
}

// bracketSample is the sample size bracketMedian takes from n values:
// n^(2/3), at least 4096 and at most n/8.
func bracketSample(n int) int {
	s := int(math.Cbrt(float64(n)) * math.Cbrt(float64(n)))
	return min(max(s, 4096), n/8)
}

// bracket is a range [lo, hi] meant to hold the middle of n values, with
// the count of values seen below it and the values seen inside it.
type bracket struct {
	lo, hi float64
	n      int
	below  int       // values below lo
	atLo   int       // values equal to lo
	atHi   int       // values equal to hi, when hi ≠ lo
	kept   []float64 // len limit+1: every value is written to kept[m]
	m      int       // values strictly between lo and hi so far
	limit  int
}

// bracketOf returns the bracket of the middle of n values from a sample of
// them (sorted in place): the values δ = 3√s sample ranks either side of
// the middle's place in the sample. The middle's sample rank has a
// standard deviation of at most √s/2 for values in random order, so δ is
// six of them. It keeps at most four times the expected count inside,
// about 6n/√s.
func bracketOf(sample []float64, n int) *bracket {
	slices.Sort(sample)
	s := len(sample)
	k0, k1 := (n-1)/2, n/2 // the middle ranks, 0-based
	delta := int(3 * math.Sqrt(float64(s)))
	br := &bracket{lo: math.Inf(-1), hi: math.Inf(1), n: n}
	if r := int(uint64(k0)*uint64(s)/uint64(n)) - delta; r >= 0 {
		br.lo = sample[r]
	}
	if r := int(uint64(k1)*uint64(s)/uint64(n)) + delta; r < s {
		br.hi = sample[r]
	}
	br.limit = 4*(2*delta+1)*(n/s+1) + 1024
	br.kept = make([]float64, br.limit+1)
	return br
}

// count takes the values vs and reports false once the bracket has kept
// limit values (the caller then gives up on it). Values equal to an end of
// the bracket are counted, not kept, so that many values tied at the
// middle (quantized data) do not fill it. The loop has no data-dependent
// branch: the comparisons become flags, and every value is written to the
// next free slot, which only a value strictly inside the bracket keeps.
func (br *bracket) count(vs []float64) bool {
	lo, hi, kept, m, limit := br.lo, br.hi, br.kept, br.m, br.limit
	below, atLo, atHi := br.below, br.atLo, br.atHi
	apart := 0 // 1 when hi ≠ lo: then a value equal to hi is not one equal to lo
	if hi != lo {
		apart = 1
	}
	for _, v := range vs {
		kept[m] = v
		var under, over, eqLo, eqHi int
		if v < lo {
			under = 1
		}
		if v > hi {
			over = 1
		}
		if v == lo {
			eqLo = 1
		}
		if v == hi {
			eqHi = apart
		}
		below += under
		atLo += eqLo
		atHi += eqHi
		m += 1 - under - over - eqLo - eqHi
		if m == limit {
			return false
		}
	}
	br.below, br.atLo, br.atHi, br.m = below, atLo, atHi, m
	return true
}

// rank returns the value of rank r (0-based) among the values counted, and
// false when it lies outside the bracket.
func (br *bracket) rank(r int) (float64, bool) {
	switch r -= br.below; {
	case r < 0:
		return 0, false
	case r < br.atLo:
		return br.lo, true
	case r < br.atLo+br.m:
		return selectInPlace(br.kept[:br.m], r-br.atLo), true
	case r < br.atLo+br.m+br.atHi:
		return br.hi, true
	}
	return 0, false
}

// middle returns the median of the n values counted (a zero as +0), and
// false when the bracket missed a middle rank.
func (br *bracket) middle() (float64, bool) {
	k0, k1 := (br.n-1)/2, br.n/2
	upper, ok := br.rank(k1)
	if !ok {
		return 0, false
	}
	if k0 == k1 {
		return upper + 0, true
	}
	lower, ok := br.rank(k0)
	if !ok {
		return 0, false
	}
	return lower + (upper-lower)/2 + 0, true
}

func median3(a, b, c float64) float64 {
	if a > b {
		a, b = b, a
	}
	if b > c {
		b = c
	}
	if a > b {
		return a
	}
	return b
}
