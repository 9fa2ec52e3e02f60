package stats

// This file holds Sorted: a pair of columns put in one canonical order once,
// with the order of y beside it, so that the statistics that need an order
// (quartiles, ranks, Kendall's τ-b, lack of fit, distance correlation,
// samples for the smoother and the permutation test) share two radix sorts
// instead of sorting on their own, and so that every result computed from it
// depends on the set of pairs only, never on the order the caller held them
// in: sums are taken in the canonical order, and seeded samples are drawn
// from canonical positions.

import (
	"math"
	"math/bits"
	"math/rand/v2"
	"runtime"
	"slices"
	"sync"

	"bivar/internal/hugepage"
)

// Sorted is a set of (x, y) pairs in canonical order: ascending x, pairs of
// equal x ordered by tieKey(y), a bijective scrambling of y's bits. Equal
// pairs are adjacent. Tied x are thus in an order that depends on their y
// values only, and carries no trend in y (as sorting ties by y would): the
// residuals of tied x taken in that order are as good as shuffled, which the
// Durbin–Watson statistic in x order and the smoother's neighbourhoods need.
//
// Build it with NewSorted; do not modify its slices.
type Sorted struct {
	X, Y []float64 // the pairs in canonical order
	Row  []int32   // Row[k]: index in the caller's x and y of canonical pair k
	ByY  []int32   // canonical positions in ascending y; tied y by canonical position (so by x)

	// yNew has bit j set where the j-th smallest y (ByY[j]) differs from
	// the one before it (and bit 0): where the runs of equal y start in
	// ByY's order, read without fetching the values.
	yNew []uint64

	// mom holds CentredMoments(X, Y), summed once on first use (Moments)
	// and read by every figure that needs the means or centred sums.
	mom struct {
		once sync.Once
		m    Moments
	}
}

// Moments returns CentredMoments(s.X, s.Y), summed on the first call
// only. The Sorted fits and summaries take their means and centred sums
// from it (the figures they would otherwise sum again from the same
// values in the same order, so the results are the same to the last bit).
func (s *Sorted) Moments() Moments {
	s.mom.once.Do(func() { s.mom.m = CentredMoments(s.X, s.Y) })
	return s.mom.m
}

// NewSorted returns the pairs (x[i], y[i]) in canonical order. A stable
// LSD radix sort of the positions by x (sortkey.go), then an ordering of
// each run of equal x by tieKey(y) (orderTies), give the canonical order
// (where x is on a decimal grid with many ties, one sort by x and the high
// bits of tieKey(y) does both, see tieBits); a
// second radix sort (by y) gives ByY: O(n) time where runs are short; 24
// bytes per pair are kept and 24 more are scratch while it runs.
//
// x and y must have equal length and fewer than 2³¹ values (it panics
// otherwise) and hold no NaN (the caller removes missing values first; the
// methods' results are meaningless with NaN, as a NaN has no place in an
// order).
func NewSorted(x, y []float64) *Sorted {
	if len(x) != len(y) {
		panic("stats: NewSorted: x and y lengths differ")
	}
	checkIndexable("NewSorted", len(x))
	n := len(x)
	keys, kbuf := hugepage.Make[uint64](n), hugepage.Make[uint64](n)
	row, ibuf := hugepage.Make[int32](n), hugepage.Make[int32](n)
	rd := orderKeys(x, keys)
	// Where x is on a decimal grid of fewer steps than half the pairs, so
	// that runs of equal x are the rule, the high bits of tieKey(y) go
	// below x's key, and one sort orders by both (tieSort).
	tb := tieBits(rd, n)
	if tb > 0 {
		for i, v := range y {
			keys[i] = keys[i]<<tb | tieKey(v)>>(64-tb)
		}
	}
	for i := range row {
		row[i] = int32(i)
	}
	radixSort(keys, row, kbuf, ibuf)
	s := &Sorted{X: hugepage.Make[float64](n), Y: hugepage.Make[float64](n), Row: row, ByY: hugepage.Make[int32](n)}
	// x in order is read back from the sorted keys, in order, rather than
	// gathered from x at random. A zero is read as +0 whatever its sign in
	// x, and y's −0 is stored as +0 too: −0 and +0 are equal and keep the
	// caller's order among equal pairs, so a signed zero would make the
	// sign of a zero in the results (a least value, say) depend on the
	// order of the rows.
	for k, key := range keys {
		s.X[k] = rd.at(key >> tb)
	}
	for k, i := range row {
		s.Y[k] = y[i] + 0 // −0 + 0 is +0
	}
	if tb > 0 {
		s.tieSort(keys, kbuf, ibuf)
	} else {
		s.orderTies(keys, kbuf, ibuf)
	}
	orderKeys(s.Y, keys)
	for k := range s.ByY {
		s.ByY[k] = int32(k)
	}
	radixSort(keys, s.ByY, kbuf, ibuf)
	s.yNew = make([]uint64, (n+63)/64)
	for j, k := range keys {
		if j == 0 || k != keys[j-1] {
			s.yNew[j/64] |= 1 << (j % 64)
		}
	}
	return s
}

// yRunEnd returns the end of the run of equal y that starts at lo in
// ByY's order (lo < Len()).
func (s *Sorted) yRunEnd(lo int) int {
	n := s.Len()
	j := lo + 1
	if j >= n {
		return n
	}
	w := j / 64
	if word := s.yNew[w] >> (j % 64); word != 0 {
		return j + bits.TrailingZeros64(word)
	}
	for w++; w < len(s.yNew); w++ {
		if s.yNew[w] != 0 {
			return w*64 + bits.TrailingZeros64(s.yNew[w])
		}
	}
	return n
}

// tieBits is how many high bits of tieKey(y) NewSorted puts below the
// decimal keys of x (rd), 0 for none: where x takes at most n/2 steps of
// its grid, each run of equal x holds n/steps pairs or more on average;
// enough bits of tieKey to split a run of that length into groups of
// about one pair (the length's bits and four more) let the radix sort
// order the runs, leaving tieSort only the rare pairs whose bits agree.
// Not where the keys would need more than four digits of the sort (x
// with more than 2⁴⁴ steps, or runs too long): orderTies then orders the
// runs after the sort by x.
func tieBits(rd keyReader, n int) uint {
	if rd.scale == 0 || rd.span >= uint64(n/2) {
		return 0
	}
	steps := rd.span + 1
	tb := uint(bits.Len64(uint64(n)/steps)) + 4
	if uint(bits.Len64(rd.span))+tb > 4*digitBits {
		return 0
	}
	return tb
}

// tieSort puts right the pairs NewSorted's sort by x and the high bits of
// tieKey(y) left in one group (keys, in canonical order, equal): each such
// group, which holds one x, is ordered by the whole tieKey(y), stably: by
// insertion up to tieInsertMax pairs (the groups hold a pair or two on
// average), as orderTies orders a run beyond (a long group: x taking a
// few values, and y few or one within them). The order is then
// orderTies': x, then tieKey(y), then the caller's order. kbuf and ibuf
// are scratch of length Len(); keys is scratch too within each group once
// the group is found.
func (s *Sorted) tieSort(keys, kbuf []uint64, ibuf []int32) {
	n := len(keys)
	for lo := 0; lo < n; {
		hi := lo + 1
		for hi < n && keys[hi] == keys[lo] {
			hi++
		}
		switch m := hi - lo; {
		case m == 1:
		case m > tieInsertMax:
			s.orderTiesIn(lo, hi, keys, kbuf, ibuf)
		default:
			ys, rs := s.Y[lo:hi], s.Row[lo:hi]
			for j := 1; j < m; j++ {
				v, r, k := ys[j], rs[j], tieKey(ys[j])
				i := j
				for ; i > 0 && tieKey(ys[i-1]) > k; i-- {
					ys[i], rs[i] = ys[i-1], rs[i-1]
				}
				ys[i], rs[i] = v, r
			}
		}
		lo = hi
	}
}

// tieInsertMax is the longest group tieSort orders by insertion.
const tieInsertMax = 32

// orderTies puts each run of equal x, which the stable sort by x left in
// the caller's order, in ascending tieKey(y), equal pairs still in the
// caller's order: the order a stable sort by tieKey(y) and then a stable
// sort by x would give, at the cost of the tied runs only (nothing where
// every x differs). Runs are contiguous here, so each is sorted in place,
// by sortRun up to 2048 pairs and by the radix sort beyond; from
// radixParMin pairs the runs are split at a run's boundary over two
// goroutines. keys, kbuf and ibuf are scratch of length Len().
func (s *Sorted) orderTies(keys, kbuf []uint64, ibuf []int32) {
	n := s.Len()
	if n < radixParMin || runtime.GOMAXPROCS(0) < 2 {
		s.orderTiesIn(0, n, keys, kbuf, ibuf)
		return
	}
	mid := n / 2
	for mid < n && s.X[mid] == s.X[mid-1] {
		mid++
	}
	var wg sync.WaitGroup
	wg.Go(func() { s.orderTiesIn(0, mid, keys, kbuf, ibuf) })
	s.orderTiesIn(mid, n, keys, kbuf, ibuf)
	wg.Wait()
}

// orderTiesIn is orderTies over the runs in [from, to), which start and end
// there; it writes keys, kbuf and ibuf only within [from, to).
func (s *Sorted) orderTiesIn(from, to int, keys, kbuf []uint64, ibuf []int32) {
	var packed []uint64
	var ys []float64
	var rs []int32
	for lo := from; lo < to; {
		hi := lo + 1
		for hi < to && s.X[hi] == s.X[lo] {
			hi++
		}
		switch m := hi - lo; {
		case m == 1:
		case m <= runSortMax:
			packed, ys, rs = sortRun(s.Y[lo:hi], s.Row[lo:hi], packed, ys, rs, keys[lo:hi])
		default:
			// The run's positions sorted by tieKey(y), stably, then y and
			// Row gathered through them (kbuf's bits hold y meanwhile).
			ks, pos := keys[lo:hi], ibuf[lo:hi]
			for j := range m {
				ks[j], pos[j] = tieKey(s.Y[lo+j]), int32(j)
			}
			radixSort(ks, pos, kbuf[lo:hi], make([]int32, m))
			yb := kbuf[lo:hi]
			for j, p := range pos {
				yb[j] = math.Float64bits(s.Y[lo+int(p)])
			}
			rs := s.Row[lo:hi]
			for j, p := range pos {
				ks[j] = uint64(rs[p])
			}
			for j := range m {
				s.Y[lo+j], rs[j] = math.Float64frombits(yb[j]), int32(ks[j])
			}
		}
		lo = hi
	}
}

// runSortMax is the longest run sortRun sorts: its place in the run must
// fit the low runBits bits of a key.
const (
	runBits    = 11
	runSortMax = 1 << runBits
)

// sortRun orders y and row (one run of equal x, at most runSortMax long)
// by tieKey(y), stably. Each pair's key is its tieKey with the low runBits
// bits replaced by its place, so one sort of plain integers (sortSpread)
// orders by the key's high bits and then by place; pairs whose high bits
// agree but whose full tieKeys differ are then put right by insertion.
// packed, ys and rs are scratch, returned for reuse; scratch is scratch of
// len(y).
func sortRun(y []float64, row []int32, packed []uint64, ys []float64, rs []int32, scratch []uint64) ([]uint64, []float64, []int32) {
	const low = 1<<runBits - 1
	m := len(y)
	packed = packed[:0]
	for j, v := range y {
		packed = append(packed, tieKey(v)&^low|uint64(j))
	}
	sortSpread(packed, scratch)
	for j := 1; j < m; j++ {
		if packed[j]&^low != packed[j-1]&^low {
			continue
		}
		// Equal high bits: insertion by the full key, places ascending
		// among equal keys.
		p := packed[j]
		k := tieKey(y[p&low])
		i := j
		for ; i > 0 && packed[i-1]&^low == p&^low && tieKey(y[packed[i-1]&low]) > k; i-- {
			packed[i] = packed[i-1]
		}
		packed[i] = p
	}
	ys, rs = append(ys[:0], y...), append(rs[:0], row...)
	for j, p := range packed {
		y[j], row[j] = ys[p&low], rs[p&low]
	}
	return packed, ys, rs
}

// sortSpread sorts a (distinct values, at most runSortMax of them) in
// ascending order, fastest where their high bits are spread evenly, as
// tieKey's are: a counting sort by the top bits into about len(a)/2
// buckets (scratch, len(a), receives them), then a pass of insertion that
// puts each bucket's few values right (Knuth, TAOCP vol. 3, 5.2.5,
// distribution sorting; expected O(len(a)) for evenly spread keys, where
// pdqsort takes O(len(a) log len(a))). Keys bunched in their high bits (y
// values built to collide) would make the insertion long: past 8·len(a)
// moves it stops and a plain sort finishes. Slices shorter than 64 take
// the plain sort (on random keys the two took the same time at 48 values,
// and this one 420 ns against pdqsort's 780 at 73).
func sortSpread(a, scratch []uint64) {
	m := len(a)
	if m < 64 {
		slices.Sort(a)
		return
	}
	b := uint(bits.Len(uint(m))) - 2 // 2^b buckets: m/4 < 2^b ≤ m/2
	shift := 64 - b
	var count [runSortMax/2 + 1]int32
	cnt := count[:1<<b+1]
	for _, v := range a {
		cnt[v>>shift+1]++
	}
	for k := 1; k < len(cnt); k++ {
		cnt[k] += cnt[k-1]
	}
	for _, v := range a {
		scratch[cnt[v>>shift]] = v
		cnt[v>>shift]++
	}
	copy(a, scratch[:m])
	moves := 0
	for j := 1; j < m; j++ {
		v := a[j]
		i := j
		for ; i > 0 && a[i-1] > v; i-- {
			a[i] = a[i-1]
		}
		a[i] = v
		if moves += j - i; moves > 8*m {
			slices.Sort(a)
			return
		}
	}
}

// tieKey maps y to a 64-bit key by a bijection of floatKey(y), the
// finaliser of SplitMix64 (Steele, Lea & Flood 2014, "Fast splittable
// pseudorandom number generators", OOPSLA; each step, an xor-shift or a
// multiplication by an odd constant, is invertible): equal y give equal
// keys, different y different keys, in an order unrelated to y's.
func tieKey(y float64) uint64 {
	z := floatKey(y)
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// Len returns the number of pairs.
func (s *Sorted) Len() int { return len(s.X) }

// ToRows returns v, given in canonical order (len(v) = Len()), in the
// caller's row order: out[Row[k]] = v[k].
func (s *Sorted) ToRows(v []float64) []float64 {
	if len(v) != len(s.Row) {
		panic("stats: Sorted.ToRows: length differs")
	}
	out := hugepage.Make[float64](len(v))
	for k, i := range s.Row {
		out[i] = v[k]
	}
	return out
}

// Describe returns the summaries of x and y as Describe gives them: the
// mean and SD by the corrected two-pass sums taken in canonical order, the
// quartiles (Quantile7) read from the sorted values without a copy.
func (s *Sorted) Describe() (x, y Summary) {
	yAt := func(k int) float64 { return s.Y[s.ByY[k]] }
	m := s.Moments() // the means and centred sums of squares meanSS gives
	return summarySorted(s.Len(), m.MeanX, m.Sxx, func(k int) float64 { return s.X[k] }), summarySorted(s.Len(), m.MeanY, m.Syy, yAt)
}

// summarySorted is Describe of n values (no NaN) of mean m and centred
// sum of squares ss (meanSS) whose k-th smallest value is at(k).
func summarySorted(n int, m, ss float64, at func(int) float64) Summary {
	nan := math.NaN()
	sm := Summary{N: n, Mean: nan, SD: nan, Min: nan, Q1: nan, Median: nan, Q3: nan, Max: nan}
	if n == 0 {
		return sm
	}
	sm.Mean = m
	if n > 1 {
		sm.SD = math.Sqrt(ss / float64(n-1))
	}
	sm.Min, sm.Max = at(0), at(n-1)
	sm.Q1, sm.Median, sm.Q3 = quantile7At(n, at, 0.25), quantile7At(n, at, 0.5), quantile7At(n, at, 0.75)
	return sm
}

// Pearson returns Pearson(s.X, s.Y, conf) given m = CentredMoments(s.X,
// s.Y): where neither column needs Pearson's scaling by a power of two
// (pow2Shift, which depends only on the largest magnitude, read off the
// sorted ends) it is PearsonMoments(m, conf), the same figures without
// another pass over the pairs; else Pearson's.
func (s *Sorted) Pearson(m Moments, conf float64) Correlation {
	if n := s.Len(); n >= 2 && m.N == n {
		x0, x1, y0, y1 := s.ends()
		if endsShift(x0, x1) == 0 && endsShift(y0, y1) == 0 {
			return PearsonMoments(m, conf)
		}
	}
	return Pearson(s.X, s.Y, conf)
}

// ends returns the smallest and the largest x and y (n ≥ 1).
func (s *Sorted) ends() (x0, x1, y0, y1 float64) {
	n := s.Len()
	return s.X[0], s.X[n-1], s.Y[s.ByY[0]], s.Y[s.ByY[n-1]]
}

// endsShift is pow2Shift of a column whose least and largest values are
// lo and hi: its scaling depends only on the largest magnitude.
func endsShift(lo, hi float64) int { return shiftFor(max(math.Abs(lo), math.Abs(hi))) }

// finite reports whether every value is neither NaN nor ±Inf.
func finite(v ...float64) bool {
	for _, a := range v {
		if math.IsNaN(a) || math.IsInf(a, 0) {
			return false
		}
	}
	return true
}

// LineSummary returns LineSummary(s.X, s.Y, conf). What that checks in
// passes over the pairs (every value finite, x not constant) and the
// scaling it takes from their largest magnitudes (pow2Shift) are read off
// the sorted ends instead: five passes less. Data that fail a check go
// the general way, which says what is wrong.
func (s *Sorted) LineSummary(conf float64) (LineFit, error) {
	if s.Len() >= 2 {
		x0, x1, y0, y1 := s.ends()
		if finite(x0, x1, y0, y1) && x0 != x1 {
			kx, ky := endsShift(x0, x1), endsShift(y0, y1)
			if kx == 0 && ky == 0 {
				// The fit's first two passes, and lineFrom's x̄ and Sxx,
				// are the figures of Moments: taken from it.
				m := s.Moments()
				known := []colParts{{m.parts.xhi, m.parts.xlo, m.Sxx}, {m.parts.yhi, m.parts.ylo, m.Syy}}
				reg, err := lsqSummaryKnown(s.Len(), 1, columnRows([][]float64{s.X}, s.Y), conf, known)
				if err != nil {
					return LineFit{}, err
				}
				return lineFrom(reg, m.MeanX, m.Sxx), nil
			}
			reg, err := fitShifted([][]float64{s.X}, s.Y, conf, false, []int{kx}, ky)
			if err != nil {
				return LineFit{}, err
			}
			mx, sxx := meanSS(s.X)
			return lineFrom(reg, mx, sxx), nil
		}
	}
	return LineSummary(s.X, s.Y, conf)
}

// PolynomialSummary returns PolynomialSummary(s.X, s.Y, degree, conf),
// its checks and y's scaling read off the sorted ends as LineSummary's
// are, and the largest |x − x̄| too: x − x̄ (rounded) grows with x, so it
// is largest in magnitude at an end.
func (s *Sorted) PolynomialSummary(degree int, conf float64) (Regression, error) {
	if n := s.Len(); degree >= 1 && n >= degree+1 && n >= 2 {
		x0, x1, y0, y1 := s.ends()
		if finite(x0, x1, y0, y1) && distinctAtMost(s.X, degree+1) == degree+1 {
			c := s.Moments().MeanX // meanSS(s.X)'s figure
			return polySummary(s.X, s.Y, degree, conf, c, max(math.Abs(x0-c), math.Abs(x1-c)), endsShift(y0, y1))
		}
	}
	return PolynomialSummary(s.X, s.Y, degree, conf)
}

// ranks returns the average ranks (as Ranks) of X and of Y, both in
// canonical order.
func (s *Sorted) ranks() (rx, ry []float64) {
	n := s.Len()
	rx, ry = hugepage.Make[float64](n), hugepage.Make[float64](n)
	for lo := 0; lo < n; {
		hi := lo + 1
		for hi < n && s.X[hi] == s.X[lo] {
			hi++
		}
		avg := float64(lo+1+hi) / 2
		for k := lo; k < hi; k++ {
			rx[k] = avg
		}
		lo = hi
	}
	for lo := 0; lo < n; {
		hi := s.yRunEnd(lo)
		avg := float64(lo+1+hi) / 2
		for _, k := range s.ByY[lo:hi] {
			ry[k] = avg
		}
		lo = hi
	}
	return rx, ry
}

// Spearman returns Spearman's ρ and its p as Spearman does, from the ranks
// in canonical order.
func (s *Sorted) Spearman() (rho, p float64) {
	if s.Len() < 2 {
		return math.NaN(), math.NaN()
	}
	rx, ry := s.ranks()
	m := CentredMoments(rx, ry)
	rho = corrFromSums(m.Sxx, m.Syy, m.Sxy)
	_, p = corrT(rho, s.Len())
	return rho, p
}

// KendallTauB returns Kendall's τ-b and its p as KendallTauB does. Knight's
// count is run with the roles of x and y exchanged (τ-b is symmetric): ByY
// orders the pairs by (y, x), and the inversions of the x values in that
// order are the discordant pairs. They are counted over the runs of equal
// x by counts per bit level where there are at most trieMax runs
// (trieCount; a third of the time of the merge sort at 10⁶ pairs), else
// by the exchanges of a merge sort (mergeCount). Every count is an
// integer, so the result is the same as KendallTauB's to the last bit.
func (s *Sorted) KendallTauB() (tau, p float64) {
	n := s.Len()
	if n < 2 {
		return math.NaN(), math.NaN()
	}
	// Each pair's x as the number of its run of equal x in canonical
	// order (equal x, equal keys; order kept), listed in ascending y.
	run := hugepage.Make[int32](n)
	runs := 0
	var tx, ty, txy tieSums
	for lo := 0; lo < n; {
		hi := lo + 1
		for hi < n && s.X[hi] == s.X[lo] {
			hi++
		}
		tx.add(hi - lo)
		for k := lo; k < hi; k++ {
			run[k] = int32(runs)
		}
		runs++
		lo = hi
	}
	xs := hugepage.Make[int32](n)
	for j, k := range s.ByY {
		xs[j] = run[k]
	}
	for lo := 0; lo < n; {
		hi := s.yRunEnd(lo)
		ty.add(hi - lo)
		for a := lo; a < hi; {
			b := a + 1
			for b < hi && xs[b] == xs[a] {
				b++
			}
			txy.add(b - a)
			a = b
		}
		lo = hi
	}
	var swaps int64
	if runs <= trieMax {
		swaps = trieCount(xs, runs)
	} else {
		swaps = mergeCount(xs, run)
	}
	return kendallFromCounts(n, swaps, tx, ty, txy)
}

// LackOfFit returns the pure-error lack-of-fit test as LackOfFit does, with
// the groups of equal x read off the canonical order. slope is the
// least-squares slope of the pairs (Line(s.X, s.Y, ·).Slope.Estimate), which
// the caller has fitted already.
func (s *Sorted) LackOfFit(slope float64) (f float64, df1, df2 int, p float64, ok bool) {
	mp := s.Moments().parts
	return lackOfFitSorted(s.X, s.Y, slope, &mp)
}

// DistanceCorrTest returns the distance correlation of the pairs on all n
// of them and the p of its permutation test, as DistanceCorrTest does, with
// two differences that make the result depend on the set of pairs only:
// the observed dCor is computed in canonical order (with the canonical
// order of x as its sort, and ByY as the order of y), and where n > maxN
// the sample is drawn from canonical positions by Sample's rule. The
// permutations are drawn from the same source after the sample. The
// full-data statistic keeps no standardised copy: it needs 12 bytes per
// pair plus 32 per distinct y value.
func (s *Sorted) DistanceCorrTest(perms, maxN int, src rand.Source) (dcor, p float64, used int, method string) {
	n := s.Len()
	if maxN <= 0 {
		maxN = DefaultDcorMaxN
	}
	maxN = max(maxN, 3)
	nan := math.NaN()
	method = dcorMethod(n)
	if n < 3 {
		return nan, nan, n, method
	}
	dcor = dcorCanonical(s.X, s.Y, s.ByY)
	if math.IsNaN(dcor) {
		return nan, nan, n, method
	}
	if perms <= 0 {
		return dcor, nan, n, method + "; no permutation test"
	}
	if src == nil {
		src = rand.NewPCG(1, 2)
	}
	rng := rand.New(src)
	x, y := s.X, s.Y
	if n > maxN {
		x, y = s.sample(maxN, rng)
	}
	p, note := dcorPermP(newDcorData(x, y), len(x), n, perms, rng)
	return dcor, p, len(x), method + note
}

// Sample returns a simple random sample of m pairs without replacement,
// drawn from the canonical positions with rand.New(src) (a nil src means
// rand.NewPCG(1, 2)), in canonical order (so ascending x), or all pairs
// when m ≥ n. The positions are chosen by Floyd's algorithm (Bentley &
// Floyd 1987, "Programming pearls: a sample of brilliance", Commun. ACM
// 30(9):754–757): m draws, a bitmap of n bits, whatever n is.
func (s *Sorted) Sample(m int, src rand.Source) (x, y []float64) {
	if m >= s.Len() {
		return s.X, s.Y
	}
	if src == nil {
		src = rand.NewPCG(1, 2)
	}
	return s.sample(m, rand.New(src))
}

func (s *Sorted) sample(m int, rng *rand.Rand) (x, y []float64) {
	n := s.Len()
	set := make([]uint64, (n+63)/64)
	for j := n - m; j < n; j++ {
		t := rng.IntN(j + 1)
		if set[t/64]&(1<<(t%64)) != 0 {
			t = j
		}
		set[t/64] |= 1 << (t % 64)
	}
	x, y = hugepage.Empty[float64](m), hugepage.Empty[float64](m)
	for w, bitsw := range set {
		for bitsw != 0 {
			k := w*64 + bits.TrailingZeros64(bitsw)
			bitsw &= bitsw - 1
			x, y = append(x, s.X[k]), append(y, s.Y[k])
		}
	}
	return x, y
}

// OrderOf returns the canonical positions in ascending v[Row[k]], ties by
// canonical position, where v is a third column in the caller's row order
// (len(v) = Len(), no NaN): the run order in which residuals are taken,
// say; by a stable radix sort. (A caller whose v strictly increases in its
// own order has its rows in that order already and reads them directly, as
// analysis' run-order figures do.)
func (s *Sorted) OrderOf(v []float64) []int32 {
	n := s.Len()
	if len(v) != n {
		panic("stats: Sorted.OrderOf: length differs")
	}
	pos := hugepage.Make[int32](n)
	keys := hugepage.Make[uint64](n)
	for k, i := range s.Row {
		keys[k] = math.Float64bits(v[i])
		pos[k] = int32(k)
	}
	orderKeysInPlace(keys)
	radixSort(keys, pos, hugepage.Make[uint64](n), hugepage.Make[int32](n))
	return pos
}
