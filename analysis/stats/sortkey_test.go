package stats

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"
	"strconv"
	"testing"
)

func TestRadixSortMatchesSort(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(8, 8))
	special := []float64{0, math.Copysign(0, -1), math.Inf(1), math.Inf(-1), math.SmallestNonzeroFloat64,
		-math.SmallestNonzeroFloat64, math.MaxFloat64, -math.MaxFloat64, 1, -1}
	for trial := 0; trial < 60; trial++ {
		n := rng.IntN(3000)
		x := make([]float64, n)
		for i := range x {
			switch rng.IntN(4) {
			case 0:
				x[i] = special[rng.IntN(len(special))]
			case 1:
				x[i] = float64(rng.IntN(20) - 10)
			default:
				x[i] = rng.NormFloat64() * math.Pow(10, float64(rng.IntN(40)-20))
			}
		}
		want := slices.Clone(x)
		slices.Sort(want)
		got := sortedCopy(x)
		for i := range want {
			if got[i] != want[i] {
				t.Fatalf("n=%d: sortedCopy[%d] = %v, slices.Sort %v", n, i, got[i], want[i])
			}
		}
		// With an index: stable, and the index permutes x into order.
		keys := make([]uint64, n)
		idx := make([]int32, n)
		for i, v := range x {
			keys[i], idx[i] = floatKey(v), int32(i)
		}
		radixSort(keys, idx, make([]uint64, n), make([]int32, n))
		for i := range idx {
			if x[idx[i]] != want[i] || (i > 0 && keys[i] == keys[i-1] && idx[i] < idx[i-1]) {
				t.Fatalf("n=%d: index sort wrong or unstable at %d", n, i)
			}
		}
	}
}

func TestMergeCountMatchesNaive(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(9, 9))
	for trial := 0; trial < 200; trial++ {
		n := rng.IntN(300)
		a := make([]uint64, n)
		for i := range a {
			a[i] = uint64(rng.IntN(1 + trial))
		}
		var want int64
		for i := range a {
			for j := i + 1; j < n; j++ {
				if a[i] > a[j] {
					want++
				}
			}
		}
		sorted := slices.Clone(a)
		slices.Sort(sorted)
		if got := mergeCount(a, make([]uint64, n)); got != want || !slices.Equal(a, sorted) {
			t.Fatalf("n=%d: mergeCount = %d, naive %d (sorted %v)", n, got, want, slices.Equal(a, sorted))
		}
	}
}

// TestTrieCountMatchesNaive: trieCount gives the naive count of pairs
// i < j with a[i] > a[j], from all values equal to all distinct (d from 1,
// and d a power of two and one past it, where the number of bit levels
// changes), and mergeCount's on the same values.
func TestTrieCountMatchesNaive(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(9, 10))
	for trial := 0; trial < 200; trial++ {
		n := rng.IntN(300)
		d := 1 + trial
		a := make([]int32, n)
		for i := range a {
			a[i] = int32(rng.IntN(d))
		}
		var want int64
		for i := range a {
			for j := i + 1; j < n; j++ {
				if a[i] > a[j] {
					want++
				}
			}
		}
		if got := trieCount(a, d); got != want {
			t.Fatalf("n=%d d=%d: trieCount = %d, naive %d", n, d, got, want)
		}
		if got := mergeCount(slices.Clone(a), make([]int32, n)); got != want {
			t.Fatalf("n=%d d=%d: mergeCount = %d, naive %d", n, d, got, want)
		}
	}
}

func BenchmarkRadixSort(b *testing.B) {
	for _, n := range coreBenchSizes {
		x, _ := coreBenchData(n)
		keys, idx := make([]uint64, n), make([]int32, n)
		kb, ib := make([]uint64, n), make([]int32, n)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				for i, v := range x {
					keys[i], idx[i] = floatKey(v), int32(i)
				}
				radixSort(keys, idx, kb, ib)
			}
		})
	}
}

func BenchmarkMergeCount(b *testing.B) {
	for _, n := range coreBenchSizes {
		x, _ := coreBenchData(n)
		src := make([]uint64, n)
		for i, v := range x {
			src[i] = floatKey(v)
		}
		a, buf := make([]uint64, n), make([]uint64, n)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				copy(a, src)
				mergeCount(a, buf)
			}
		})
	}
}

// TestRadixSortParMatchesSerial: the sort split over 2, 3 and 4 goroutines
// gives the serial sort's keys and index, stable, on 1.5·radixParMin keys
// with many ties and digits that do not vary (and nil index).
func TestRadixSortParMatchesSerial(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(10, 10))
	n := radixParMin + radixParMin/2 + 7
	base := make([]uint64, n)
	for i := range base {
		switch i % 3 {
		case 0:
			base[i] = floatKey(math.Round(rng.NormFloat64()*1000) / 1000)
		case 1:
			base[i] = uint64(rng.IntN(50)) << 22 // the low two digits never vary
		default:
			base[i] = rng.Uint64()
		}
	}
	serial := func() ([]uint64, []int32) {
		k, ix := slices.Clone(base), make([]int32, n)
		for i := range ix {
			ix[i] = int32(i)
		}
		// the serial path, forced: one worker
		radixSortSerial(k, ix, make([]uint64, n), make([]int32, n))
		return k, ix
	}
	wk, wi := serial()
	for w := 2; w <= 4; w++ {
		k, ix := slices.Clone(base), make([]int32, n)
		for i := range ix {
			ix[i] = int32(i)
		}
		radixSortPar(k, ix, make([]uint64, n), make([]int32, n), w)
		if !slices.Equal(k, wk) || !slices.Equal(ix, wi) {
			t.Errorf("%d workers: differs from the serial sort", w)
		}
		k2 := slices.Clone(base)
		radixSortPar(k2, nil, make([]uint64, n), nil, w)
		if !slices.Equal(k2, wk) {
			t.Errorf("%d workers, no index: differs from the serial sort", w)
		}
	}
}

// TestStableArgsort: the indices in ascending order of value, ties (−0 and
// +0 among them) in index order, as a stable comparison sort gives them,
// for values in order already (no sort made), reversed and shuffled.
func TestStableArgsort(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(17, 18))
	base := []float64{-2, -1, -1, math.Copysign(0, -1), 0, math.Copysign(0, -1), 0.5, 0.5, 3}
	for _, kind := range []string{"ascending", "descending", "shuffled"} {
		for _, n := range []int{0, 1, len(base), 3000} {
			v := make([]float64, n)
			for i := range v {
				if n == len(base) {
					v[i] = base[i]
				} else {
					v[i] = math.Round(rng.NormFloat64()*10) / 10
				}
			}
			switch kind {
			case "ascending":
				slices.SortStableFunc(v, func(a, b float64) int { return cmp.Compare(a+0, b+0) })
			case "descending":
				slices.SortStableFunc(v, func(a, b float64) int { return cmp.Compare(b+0, a+0) })
			default:
				rng.Shuffle(n, func(i, j int) { v[i], v[j] = v[j], v[i] })
			}
			want := make([]int, n)
			for i := range want {
				want[i] = i
			}
			slices.SortStableFunc(want, func(a, b int) int { return cmp.Compare(v[a]+0, v[b]+0) })
			if got := stableArgsort(v); !slices.Equal(got, want) {
				t.Errorf("%s, n=%d: stableArgsort %v, want %v", kind, n, got[:min(n, 12)], want[:min(n, 12)])
			}
		}
	}
}

// TestOrderKeysOrderLikeFloatKey checks orderKeys' decimal-grid keys
// against floatKey, whose order is the IEEE 754 numeric order: for every
// pair of values the two keys compare alike, and every value reads back
// from its key. The columns are decimals of 0–9 places (as strconv reads
// them), with zeros of both signs, a column whose first values are on a
// coarser grid than the rest, columns off any grid, and magnitudes near the
// grid's limit of 2⁵² steps.
func TestOrderKeysOrderLikeFloatKey(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(10, 10))
	decimal := func(places, scale int) float64 {
		q := rng.Int64N(2*int64(scale)+1) - int64(scale)
		v, err := strconv.ParseFloat(strconv.FormatInt(q, 10)+"e-"+strconv.Itoa(places), 64)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	var cols [][]float64
	for places := 0; places <= 11; places++ {
		for _, scale := range []int{3, 1000, 1 << 40, 1 << 51, 1 << 53} {
			v := make([]float64, 200)
			for i := range v {
				v[i] = decimal(places, scale)
			}
			cols = append(cols, v)
		}
	}
	late := make([]float64, 100) // the probe sees whole numbers, then tenths
	for i := range late {
		late[i] = float64(rng.IntN(50))
		if i >= gridProbe+5 {
			late[i] += 0.1 * float64(rng.IntN(10))
		}
	}
	cols = append(cols, late,
		[]float64{0, math.Copysign(0, -1), 1.5, -2.25, 0, math.Copysign(0, -1)},
		[]float64{1e-300, 1, 2}, []float64{math.Inf(1), 1, 2}, []float64{0.1, 0.2, 1.0 / 3})
	for c, v := range cols {
		keys := make([]uint64, len(v))
		rd := orderKeys(v, keys)
		for i := range v {
			if got := rd.at(keys[i]); got != v[i] {
				t.Fatalf("column %d: value %v reads back as %v", c, v[i], got)
			}
			for j := range v {
				if cmp.Compare(keys[i], keys[j]) != cmp.Compare(floatKey(v[i]), floatKey(v[j])) {
					t.Fatalf("column %d: keys order %v and %v unlike their values", c, v[i], v[j])
				}
			}
		}
	}
}

// TestNewSortedMatchesStableSort checks NewSorted's order against the
// standard library's stable sort by x then tieKey(y), on decimal columns
// (orderKeys' grid keys) and on continuous ones, with −0 among x.
func TestNewSortedMatchesStableSort(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(11, 11))
	for trial := 0; trial < 40; trial++ {
		n := 1 + rng.IntN(5000)
		if trial < 3 {
			n = radixParMin + 1000 // the split radix sort, given four processors or more
		}
		x, y := make([]float64, n), make([]float64, n)
		for i := range x {
			switch trial % 4 {
			case 0: // tieBits' path: x on a grid of fewer steps than n/2 …
				x[i], y[i] = math.Round(rng.NormFloat64()*2000)/1000, math.Round(rng.NormFloat64()*100)/100
			case 1:
				x[i], y[i] = float64(rng.IntN(7)-3), rng.NormFloat64()
			case 2: // … with long groups of equal pairs for tieSort
				x[i], y[i] = float64(rng.IntN(5)), float64(rng.IntN(3))
			default: // orderTies' path
				x[i], y[i] = rng.NormFloat64(), float64(rng.IntN(4))
			}
		}
		if trial%4 == 1 {
			x[rng.IntN(n)] = math.Copysign(0, -1)
		}
		idx := make([]int, n)
		for i := range idx {
			idx[i] = i
		}
		slices.SortStableFunc(idx, func(a, b int) int {
			return cmp.Or(cmp.Compare(x[a], x[b]), cmp.Compare(tieKey(y[a]), tieKey(y[b])))
		})
		s := NewSorted(x, y)
		for k, i := range idx {
			// Zeros are stored as +0 (TestNewSortedZeroSigns).
			if int(s.Row[k]) != i || math.Float64bits(s.X[k]) != math.Float64bits(x[i]+0) || math.Float64bits(s.Y[k]) != math.Float64bits(y[i]+0) {
				t.Fatalf("trial %d (n=%d): canonical position %d holds row %d (%v, %v), want row %d (%v, %v)",
					trial, n, k, s.Row[k], s.X[k], s.Y[k], i, x[i], y[i])
			}
		}
		for j := 1; j < n; j++ {
			a, b := s.ByY[j-1], s.ByY[j]
			if s.Y[a] > s.Y[b] || s.Y[a] == s.Y[b] && a > b {
				t.Fatalf("trial %d: ByY out of order at %d", trial, j)
			}
			if lo := rng.IntN(j); rng.IntN(64) == 0 { // yRunEnd against a plain scan
				want := lo + 1
				for want < n && s.Y[s.ByY[want]] == s.Y[s.ByY[lo]] {
					want++
				}
				if got := s.yRunEnd(lo); got != want {
					t.Fatalf("trial %d: yRunEnd(%d) = %d, want %d", trial, lo, got, want)
				}
			}
			if s.Y[a] != s.Y[b] != (s.yNew[j/64]>>(j%64)&1 == 1) {
				t.Fatalf("trial %d: a run of equal y starts at %d: %v, values %v and %v", trial, j, s.yNew[j/64]>>(j%64)&1 == 1, s.Y[a], s.Y[b])
			}
		}
	}
}

// TestNewSortedZeroSigns checks that the canonical pairs hold no −0: −0
// and +0 are equal, so pairs that differ only in a zero's sign keep the
// caller's order, and the sign of a zero in the results (the least x, say)
// would follow the order of the rows. The same set of pairs in two row
// orders must give the same bits.
func TestNewSortedZeroSigns(t *testing.T) {
	t.Parallel()
	negZero := math.Copysign(0, -1)
	for _, c := range []struct{ x, y []float64 }{
		{[]float64{negZero, 0, 1, 1, 2, 2, 3, 3, 1, 2}, []float64{5, 5, 1, 2, 3, 4, 5, 6, 7, 8}},
		{[]float64{1, 1, 2, 3, 4, 5, 6}, []float64{negZero, 0, 1, 2, 3, 4, 5}},
		{[]float64{negZero, 0.5, negZero, 0}, []float64{negZero, 0, 0, negZero}}, // continuous x: orderTies
	} {
		a := NewSorted(c.x, c.y)
		x2, y2 := slices.Clone(c.x), slices.Clone(c.y)
		slices.Reverse(x2)
		slices.Reverse(y2)
		b := NewSorted(x2, y2)
		for k := range a.X {
			if math.Signbit(a.X[k]) || math.Signbit(a.Y[k]) ||
				math.Float64bits(a.X[k]) != math.Float64bits(b.X[k]) || math.Float64bits(a.Y[k]) != math.Float64bits(b.Y[k]) {
				t.Fatalf("x %v, y %v: canonical pair %d is (%v, %v) and, rows reversed, (%v, %v)", c.x, c.y, k, a.X[k], a.Y[k], b.X[k], b.Y[k])
			}
		}
		ax, ay := a.Describe()
		bx, by := b.Describe()
		if math.Signbit(ax.Min) || math.Signbit(ay.Min) || math.Signbit(bx.Min) || math.Signbit(by.Min) {
			t.Fatalf("x %v, y %v: least values %v, %v and, rows reversed, %v, %v", c.x, c.y, ax.Min, ay.Min, bx.Min, by.Min)
		}
	}
}
