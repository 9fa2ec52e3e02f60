package stats

// This file holds the O(n) sort that the rank methods and the quartiles
// use: a least-significant-digit radix sort of float64 values mapped to
// order-preserving unsigned keys. On 10⁶ values it is several times faster
// than a comparison sort; NewSorted (sorted.go) sorts a study's pairs with
// it once for every statistic that needs an order.

import "math"

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

// radixSort sorts keys ascending, applying the same permutation to idx
// when idx is not nil (len(idx) = len(keys)). It is a stable LSD radix sort
// (Knuth, TAOCP vol. 3, §5.2.5) with six 11-bit digits: one pass builds all
// the histograms, and a digit that is the same for every key is skipped.
// kbuf and ibuf are scratch of the same lengths (ibuf may be nil with idx).
// The sorted data end up in keys and idx.
func radixSort(keys []uint64, idx []int32, kbuf []uint64, ibuf []int32) {
	const (
		bits    = 11
		buckets = 1 << bits
		mask    = buckets - 1
		digits  = (64 + bits - 1) / bits
	)
	n := len(keys)
	if n < 2 {
		return
	}
	var count [digits][buckets]int32
	for _, k := range keys {
		for d := 0; d < digits; d++ {
			count[d][(k>>(bits*d))&mask]++
		}
	}
	src, dst := keys, kbuf[:n]
	isrc, idst := idx, ibuf
	for d := 0; d < digits; d++ {
		c := &count[d]
		shift := uint(bits * d)
		if int(c[(src[0]>>shift)&mask]) == n {
			continue // every key has this digit
		}
		var pos [buckets]int32
		var sum int32
		for b := 0; b < buckets; b++ {
			pos[b] = sum
			sum += c[b]
		}
		if isrc == nil {
			for _, k := range src {
				b := (k >> shift) & mask
				dst[pos[b]] = k
				pos[b]++
			}
		} else {
			for i, k := range src {
				b := (k >> shift) & mask
				p := pos[b]
				dst[p] = k
				idst[p] = isrc[i]
				pos[b]++
			}
			isrc, idst = idst, isrc
		}
		src, dst = dst, src
	}
	if &src[0] != &keys[0] {
		copy(keys, src)
		if idx != nil {
			copy(idx, isrc)
		}
	}
}

// sortedCopy returns the values of x sorted ascending (x holds no NaN).
func sortedCopy(x []float64) []float64 {
	keys := make([]uint64, len(x))
	for i, v := range x {
		keys[i] = floatKey(v)
	}
	radixSort(keys, nil, make([]uint64, len(x)), nil)
	out := make([]float64, len(x))
	for i, k := range keys {
		out[i] = keyFloat(k)
	}
	return out
}
