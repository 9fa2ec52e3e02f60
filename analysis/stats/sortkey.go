package stats

// This file holds the O(n) sort that the rank methods and the quartiles
// use: a least-significant-digit radix sort of float64 values mapped to
// order-preserving unsigned keys. On 10⁶ values it is several times faster
// than a comparison sort; NewSorted (sorted.go) sorts a study's pairs with
// it once for every statistic that needs an order.

import (
	"math"
	"math/bits"
	"runtime"
	"sync"

	"bivar/internal/hugepage"
)

// floatKey maps v (not NaN) to a uint64 whose unsigned order is the numeric
// order of v: flip all bits of a negative number, set the sign bit of a
// positive one. This rests on the IEEE 754 encoding, whose bit patterns of
// non-negative values order like the values (the basis of totalOrder, IEEE
// 754-2008 §5.10). −0 is mapped like +0, so values that compare equal get
// equal keys.
func floatKey(v float64) uint64 {
	if v == 0 {
		v = 0 // −0 → +0
	}
	b := math.Float64bits(v)
	if b>>63 == 1 {
		return ^b
	}
	return b | 1<<63
}

// keyFloat inverts floatKey.
func keyFloat(k uint64) float64 {
	if k>>63 == 1 {
		return math.Float64frombits(k &^ (1 << 63))
	}
	return math.Float64frombits(^k)
}

// orderKeys fills keys (len(v)) with keys whose unsigned order is the
// numeric order of v (no NaN), equal values getting equal keys, as floatKey
// gives them; and, where every value of v is a decimal with at most
// gridMaxDecimals places (as a gauge's readings are), keys that fit in few
// bits, so that radixSort, which sorts only the digits that vary, makes two
// or three passes instead of six. It returns how to read a value back from
// its key (keyReader.at).
//
// The decimal keys: with s = 10^d, each v is read as q = round(v·s) (to
// nearest, ties to even: one instruction on most processors) and
// kept only if q/s, rounded to a double, is v again (and |v·s| < 2⁵²); the
// key is q − min q. Division by s rounded to nearest is monotone in q, so
// v < v' gives q < q' (q ≥ q' would give q/s ≥ q'/s after rounding), and q
// is a function of v, so equal values (−0 and +0 among them) get equal
// keys: the keys order v exactly as floatKey's do, and a stable sort by
// either puts the values in the same order. |q| < 2⁵² keeps the keys below
// 2⁵³ (five digits of the sort at most). One value off the grid falls back
// to floatKey; the places d are found from the first values (gridProbe).
func orderKeys(v []float64, keys []uint64) keyReader {
	for i, e := range v {
		keys[i] = math.Float64bits(e)
	}
	return orderKeysInPlace(keys)
}

// orderKeysInPlace is orderKeys of the values whose bits keys holds
// (math.Float64bits), each replaced by its key.
func orderKeysInPlace(keys []uint64) keyReader {
	if r, ok := gridOf(keys); ok {
		for i, b := range keys {
			keys[i] = uint64(int64(math.RoundToEven(math.Float64frombits(b)*r.scale)) - r.lo)
		}
		return r
	}
	for i, b := range keys {
		keys[i] = floatKey(math.Float64frombits(b))
	}
	return keyReader{}
}

// gridMaxDecimals is the most decimal places orderKeys tries, and
// gridProbe how many of the first values choose the places.
const (
	gridMaxDecimals = 9
	gridProbe       = 32
)

// keyReader reads a value back from an orderKeys key: the decimal grid's
// scale and least q, or floatKey's inverse where scale is 0.
type keyReader struct {
	scale float64
	lo    int64
	span  uint64 // the largest key (decimal keys only)
}

// at returns the value whose key is k (+0 for either zero).
func (r keyReader) at(k uint64) float64 {
	if r.scale == 0 {
		return keyFloat(k)
	}
	return float64(int64(k)+r.lo) / r.scale
}

// gridOf returns the decimal grid of the values whose bits are given, and
// false where they are not all on a grid of at most gridMaxDecimals places.
func gridOf(bits []uint64) (keyReader, bool) {
	if len(bits) == 0 {
		return keyReader{}, false
	}
	on := func(b uint64, s float64) (int64, bool) {
		e := math.Float64frombits(b)
		t := e * s
		if !(math.Abs(t) < 1<<52) {
			return 0, false
		}
		q := math.RoundToEven(t)
		return int64(q), q/s == e
	}
	probe := bits[:min(len(bits), gridProbe)]
	s := 1.0
	for d := 0; ; d++ {
		if d > gridMaxDecimals {
			return keyReader{}, false
		}
		ok := true
		for _, b := range probe {
			if _, ok = on(b, s); !ok {
				break
			}
		}
		if ok {
			break
		}
		s *= 10
	}
	lo, hi := int64(math.MaxInt64), int64(math.MinInt64)
	for _, b := range bits {
		q, ok := on(b, s)
		if !ok {
			return keyReader{}, false
		}
		lo, hi = min(lo, q), max(hi, q)
	}
	return keyReader{scale: s, lo: lo, span: uint64(hi - lo)}, true
}

// The radix sort's digits: six of 11 bits.
const (
	digitBits = 11
	buckets   = 1 << digitBits
	digits    = (64 + digitBits - 1) / digitBits
)

// radixParMin is the number of keys from which radixSort splits its passes
// over goroutines, and radixWorkers the most it uses: one for every two
// processors (radixShare), since a study's other statistics run beside
// its sorts. On two processors the split sort took about 3% more of a
// 10⁶-row study's CPU time (each worker counts its share again in every
// pass) and saved no wall time, the other processor being busy already
// (bench-pair.sh's file, medians of 11 runs: 0.68 against 0.66 s of CPU,
// 0.54 s of wall time both); at 10⁷ rows the wall time did not change
// beyond the machine's noise either (3.6–4.7 s serial, 4.3–5.4 split).
const (
	radixParMin  = 1 << 19
	radixWorkers = 4
	radixShare   = 2
)

// radixSort sorts keys ascending, applying the same permutation to idx
// when idx is not nil (len(idx) = len(keys)). It is a stable LSD radix sort
// (Knuth, TAOCP vol. 3, §5.2.5) with up to six 11-bit digits: the digits
// above the highest bit in which the keys differ are left alone (varying;
// keys from orderKeys' decimal grid leave two or three), one pass builds
// the histograms of the rest, and a digit that is the same for every key
// is skipped.
// kbuf and ibuf are scratch of the same lengths (ibuf may be nil with idx).
// The sorted data end up in keys and idx.
//
// From radixParMin keys on, each pass is split over up to radixWorkers
// goroutines: each counts its contiguous share of the keys, the shares'
// buckets are laid out worker after worker within each bucket, and each
// scatters its share to its own places, so the sort stays stable and its
// result is the serial sort's.
func radixSort(keys []uint64, idx []int32, kbuf []uint64, ibuf []int32) {
	n := len(keys)
	if n < 2 {
		return
	}
	if w := min(runtime.GOMAXPROCS(0)/radixShare, radixWorkers); n >= radixParMin && w > 1 {
		radixSortPar(keys, idx, kbuf, ibuf, w)
		return
	}
	radixSortSerial(keys, idx, kbuf, ibuf)
}

// radixSortSerial is radixSort on one goroutine (n ≥ 2).
func radixSortSerial(keys []uint64, idx []int32, kbuf []uint64, ibuf []int32) {
	n := len(keys)
	nd := varying(keys)
	var count [digits][buckets]int32
	histograms(keys, &count, nd)
	src, dst := keys, kbuf[:n]
	isrc, idst := idx, ibuf
	for d := 0; d < nd; d++ {
		c := &count[d]
		shift := uint(digitBits * d)
		if int(c[(src[0]>>shift)&(buckets-1)]) == n {
			continue // every key has this digit
		}
		var pos [buckets]int32
		var sum int32
		for b := 0; b < buckets; b++ {
			pos[b] = sum
			sum += c[b]
		}
		scatter(src, dst, isrc, idst, 0, n, shift, &pos)
		src, dst = dst, src
		if isrc != nil {
			isrc, idst = idst, isrc
		}
	}
	settle(keys, idx, src, isrc)
}

// settle leaves the sorted keys (and idx) in keys and idx: the passes
// end in src and isrc, which are either those or the scratch buffers.
func settle(keys []uint64, idx []int32, src []uint64, isrc []int32) {
	if &src[0] != &keys[0] {
		copy(keys, src)
		if idx != nil {
			copy(idx, isrc)
		}
	}
}

// histograms adds to c the histogram of each of the low nd digits of keys.
func histograms(keys []uint64, c *[digits][buckets]int32, nd int) {
	const mask = buckets - 1
	for _, k := range keys {
		for d := 0; d < nd; d++ {
			c[d][(k>>(digitBits*d))&mask]++
		}
	}
}

// varying returns how many low digits can differ between keys: those up
// to the highest bit in which some key differs from the first. The digits
// above are the same in every key and need neither a histogram nor a pass.
func varying(keys []uint64) int {
	var diff uint64
	k0 := keys[0]
	for _, k := range keys {
		diff |= k ^ k0
	}
	return (bits.Len64(diff) + digitBits - 1) / digitBits
}

// scatter moves src[lo:hi] (and isrc[lo:hi] when isrc is not nil) to dst
// (idst) at the places pos gives each key's digit at shift, in order, and
// advances pos: one stable pass of the radix sort over one share.
func scatter(src, dst []uint64, isrc, idst []int32, lo, hi int, shift uint, pos *[buckets]int32) {
	const mask = buckets - 1
	if isrc == nil {
		for _, key := range src[lo:hi] {
			b := (key >> shift) & mask
			dst[pos[b]] = key
			pos[b]++
		}
		return
	}
	for i := lo; i < hi; i++ {
		key := src[i]
		b := (key >> shift) & mask
		p := pos[b]
		dst[p] = key
		idst[p] = isrc[i]
		pos[b]++
	}
}

// sortedCopy returns the values of x sorted ascending (x holds no NaN).
func sortedCopy(x []float64) []float64 {
	keys := hugepage.Make[uint64](len(x))
	rd := orderKeys(x, keys)
	radixSort(keys, nil, hugepage.Make[uint64](len(x)), nil)
	out := hugepage.Make[float64](len(x))
	for i, k := range keys {
		out[i] = rd.at(k)
	}
	return out
}

// radixSortPar is radixSort over w goroutines (see radixSort).
func radixSortPar(keys []uint64, idx []int32, kbuf []uint64, ibuf []int32, w int) {
	const mask = buckets - 1
	n := len(keys)
	share := func(k int) (lo, hi int) { return k * n / w, (k + 1) * n / w }
	// Which digits vary (the same for any order of the keys): every
	// worker's histograms of each digit below the highest that varies
	// (varying), summed.
	nd := varying(keys)
	all := make([][digits][buckets]int32, w)
	var wg sync.WaitGroup
	for k := range w {
		wg.Go(func() {
			lo, hi := share(k)
			histograms(keys[lo:hi], &all[k], nd)
		})
	}
	wg.Wait()
	src, dst := keys, kbuf[:n]
	isrc, idst := idx, ibuf
	cnt := make([][buckets]int32, w)
	for d := 0; d < nd; d++ {
		shift := uint(digitBits * d)
		b0 := (src[0] >> shift) & mask
		var total int32
		for k := range w {
			total += all[k][d][b0]
		}
		if int(total) == n {
			continue // every key has this digit
		}
		// Each worker's histogram of this digit over its current share.
		for k := range w {
			wg.Go(func() {
				lo, hi := share(k)
				c := &cnt[k]
				*c = [buckets]int32{}
				for _, key := range src[lo:hi] {
					c[(key>>shift)&mask]++
				}
			})
		}
		wg.Wait()
		// Places: bucket by bucket, worker after worker within a bucket.
		var sum int32
		for b := 0; b < buckets; b++ {
			for k := range w {
				c := cnt[k][b]
				cnt[k][b] = sum
				sum += c
			}
		}
		for k := range w {
			wg.Go(func() {
				lo, hi := share(k)
				scatter(src, dst, isrc, idst, lo, hi, shift, &cnt[k])
			})
		}
		wg.Wait()
		src, dst = dst, src
		if isrc != nil {
			isrc, idst = idst, isrc
		}
	}
	settle(keys, idx, src, isrc)
}
