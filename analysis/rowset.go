package analysis

// This file holds what makes the random parts of a study a function of its
// set of rows: a canonical order of the rows, a sample chosen by the
// rows' values, a random stream seeded by the rows, and the distance
// correlation's sequential permutation test built on them.

import (
	"cmp"
	"fmt"
	"hash/fnv"
	"math"
	"math/rand/v2"
	"slices"

	"bivar/analysis/stats"
	"bivar/internal/hugepage"
)

// mix64 is the finaliser of SplitMix64 (Steele, Lea & Flood 2014, "Fast
// splittable pseudorandom number generators", OOPSLA): a bijection of
// 64-bit words whose every output bit depends on every input bit.
func mix64(z uint64) uint64 {
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// pairHash is a 64-bit hash of one (x, y) pair's bits, mix64(mix64(x) ⊕ y),
// with −0 read as 0 so equal values hash alike. Two multiplications per
// value (FNV-1a, used before, takes sixteen in a chain and was a tenth of
// a study's time at 10⁷ rows).
func pairHash(x, y float64) uint64 {
	return mix64(mix64(math.Float64bits(x+0)) ^ math.Float64bits(y+0))
}

// rowHash is the hash that chooses a row for a value-chosen sample:
// pairHash of (x, y) mixed with k, the row's place among the rows that
// hold the same pair (0 for the first, 1 for the second, …). Equal pairs
// cannot be told apart, so which copy gets which k changes nothing: the
// set of (x, y, hash) triples is a function of the set of rows. With k,
// each copy of a repeated pair has a hash of its own and a sample takes
// about its share of the copies; with the pair alone every copy shared one
// hash, and a sample of quantized data (a gauge that reads to 0.01) took
// whole clusters of copies and few distinct pairs, on which a test of
// independence rejected almost always.
func rowHash(x, y float64, k int) uint64 {
	return mix64(pairHash(x, y) ^ uint64(k)*0x9e3779b97f4a7c15)
}

// rowSample is a value-chosen sample of a study's rows: the pairs in
// canonical order (x, then y, then hash) with each row's rowHash.
type rowSample struct {
	x, y []float64
	h    []uint64
}

// valueSample returns the m rows of smallest rowHash, ties broken by x
// then y (all rows when m ≤ 0 or m ≥ n), from pairs given in an order in
// which equal pairs are adjacent (stats.Sorted's canonical order, or any
// sort by x then y), so that each copy's k is its place in its run. It is
// a function of the set of rows, not of a seed or of the file's order; for
// data whose values are not built to collide with the hash it behaves like
// a simple random sample. One pass keeps the rows whose hash lies below a
// bound that about m + 6√m + 64 rows pass when the hashes are uniform (six
// standard deviations of that count above m: fewer than m pass about once
// in 10⁹ studies); in that case the bound is doubled and the pass
// repeated. Which rows come out does not depend on the bound. Memory is
// O(m), not O(n).
func valueSample(xs, ys []float64, m int) rowSample {
	n := len(xs)
	keepAll := m <= 0 || m >= n
	frac := (float64(m) + 6*math.Sqrt(float64(m)) + 64) / float64(n)
	room := n // the rows expected to pass the bound, with some to spare
	if !keepAll {
		room = min(n, int(1.25*frac*float64(n))+64)
	}
	hs := make([]uint64, 0, room)
	is := make([]int, 0, cap(hs))
	var inOrder bool // xs ascending, as every caller gives it
	for {
		all := keepAll || frac >= 0.5 // a bound near 2⁶⁴ would overflow; half the rows or more: keep them all
		hs, is, inOrder = belowBound(xs, ys, uint64(frac*(1<<63)*2), all, hs[:0], is[:0])
		if keepAll || len(hs) >= m {
			break
		}
		frac *= 2
	}
	type row struct {
		x, y float64
		h    uint64
	}
	// The chosen positions into hs and is, in the input's order.
	var chosen []int
	if keepAll {
		chosen = make([]int, len(is))
		for j := range chosen {
			chosen[j] = j
		}
	} else {
		js := make([]int, len(is))
		for j := range js {
			js[j] = j
		}
		chosen = smallestOf(hs, js, m, func(a, b int) int {
			return cmp.Or(cmp.Compare(xs[is[a]], xs[is[b]]), cmp.Compare(ys[is[a]], ys[is[b]]))
		})
		slices.Sort(chosen)
	}
	rows := make([]row, 0, len(chosen))
	for _, j := range chosen {
		rows = append(rows, row{xs[is[j]], ys[is[j]], hs[j]})
	}
	// Canonical order: x, then y, then hash. Rows taken in the order of an
	// input sorted by x need only their runs of equal x ordered.
	if !inOrder {
		slices.SortFunc(rows, func(a, b row) int { return cmp.Or(cmp.Compare(a.x, b.x), cmp.Compare(a.y, b.y), cmp.Compare(a.h, b.h)) })
	} else {
		for lo := 0; lo < len(rows); {
			hi := lo + 1
			for hi < len(rows) && rows[hi].x == rows[lo].x {
				hi++
			}
			switch run := rows[lo:hi]; {
			case len(run) <= 32:
				// The common short run, by insertion (no call per
				// comparison); the same order, as (y, h) orders a run's
				// distinct rows totally.
				for i := 1; i < len(run); i++ {
					for j := i; j > 0 && (run[j].y < run[j-1].y || run[j].y == run[j-1].y && run[j].h < run[j-1].h); j-- {
						run[j], run[j-1] = run[j-1], run[j]
					}
				}
			default:
				slices.SortFunc(run, func(a, b row) int { return cmp.Or(cmp.Compare(a.y, b.y), cmp.Compare(a.h, b.h)) })
			}
			lo = hi
		}
	}
	out := rowSample{x: make([]float64, len(rows)), y: make([]float64, len(rows)), h: make([]uint64, len(rows))}
	for j, r := range rows {
		out.x[j], out.y[j], out.h[j] = r.x, r.y, r.h
	}
	return out
}

// belowBound appends to hs and is the rowHash and the index of each row
// whose rowHash lies below bound (every row when all), k counted as
// valueSample says, and reports whether xs ascends. (A function of its
// own: inside valueSample the loop's variables lived on the stack.)
func belowBound(xs, ys []float64, bound uint64, all bool, hs []uint64, is []int) ([]uint64, []int, bool) {
	inOrder := true
	ys = ys[:len(xs)]
	k := 0
	for i, x := range xs {
		y := ys[i]
		if i > 0 {
			px, py := xs[i-1], ys[i-1]
			if x == px && y == py {
				k++
			} else {
				k = 0
			}
			if x < px {
				inOrder = false
			}
		}
		h := rowHash(x, y, k)
		if all || h < bound {
			hs, is = append(hs, h), append(is, i)
		}
	}
	return hs, is, inOrder
}

// smallestOf returns, from the items is with hashes hs, the m (< len(is))
// of smallest hash, the ties at the m-th hash broken by tie, in no
// particular order.
func smallestOf(hs []uint64, is []int, m int, tie func(a, b int) int) []int {
	cut := nthSmallest(slices.Clone(hs), m-1)
	sel := hugepage.Empty[int](m)
	var tied []int
	for j, h := range hs {
		switch {
		case h < cut:
			sel = append(sel, is[j])
		case h == cut:
			tied = append(tied, is[j])
		}
	}
	slices.SortFunc(tied, tie)
	return append(sel, tied[:m-len(sel)]...)
}

// sub returns the m rows of the sample with the smallest hashes (ties by x
// then y: the sample's order), in canonical order; all of it when m ≤ 0 or
// m ≥ its size. It is the sample valueSample would draw from all rows, as
// the sample holds the rows of smallest hash of all rows, each with its
// hash: one pass over the rows serves every sample a study draws.
func (s rowSample) sub(m int) (x, y []float64) {
	if m <= 0 || m >= len(s.x) {
		return s.x, s.y
	}
	is := make([]int, len(s.h))
	for i := range is {
		is[i] = i
	}
	sel := smallestOf(s.h, is, m, cmp.Compare[int]) // positions: ties in the sample's order
	slices.Sort(sel)
	return pick(s.x, sel), pick(s.y, sel)
}

// canonical returns the (x, y) pairs sorted by x, then y: the order in
// which the study's random procedures see the rows, so that no result
// depends on the order of the file. Above maxN rows it keeps the maxN that
// valueSample chooses. It sorts all rows (O(n log n)); a study draws its
// samples from studySample instead.
func canonical(x, y []float64, maxN int) (cx, cy []float64) {
	return sortedSample(x, y, maxN).sub(0)
}

// sortedSample is valueSample of the rows of x and y put in order of x,
// then y (a comparison sort of all rows).
func sortedSample(x, y []float64, m int) rowSample {
	idx := hugepage.Make[int](len(x))
	for i := range idx {
		idx[i] = i
	}
	slices.SortFunc(idx, func(a, b int) int { return cmp.Or(cmp.Compare(x[a], x[b]), cmp.Compare(y[a], y[b])) })
	return valueSample(pick(x, idx), pick(y, idx), m)
}

// sampleMax is the largest sample any figure of a study draws.
func sampleMax(cfg Config) int {
	return max(cfg.LowessMaxN, cfg.DcorMaxN, DcorStatMaxN, maxXOrderRows)
}

// studySample returns the study's value-chosen sample (valueSample) of the
// largest size any figure draws (all rows when there are fewer), from the
// pairs in stats.Sorted's order, where equal pairs are adjacent. Every
// figure computed on a sample takes its rows from it (rowSample.sub).
func studySample(ps *stats.Sorted, cfg Config) rowSample {
	return valueSample(ps.X, ps.Y, sampleMax(cfg))
}

// nthSmallest returns the k-th smallest (0-based) of v, reordering v
// (Hoare's selection with the middle element as pivot; O(n) expected).
func nthSmallest(v []uint64, k int) uint64 {
	lo, hi := 0, len(v)-1
	for lo < hi {
		p := v[lo+(hi-lo)/2]
		i, j := lo, hi
		for i <= j {
			for v[i] < p {
				i++
			}
			for v[j] > p {
				j--
			}
			if i <= j {
				v[i], v[j] = v[j], v[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return v[k]
		}
	}
	return v[k]
}

// rowSource returns a random source seeded by the canonical rows: the same
// set of rows gives the same stream whatever the file's order and the
// manifest's seed. use separates the streams of different procedures.
func rowSource(cx, cy []float64, use string) rand.Source {
	h := uint64(len(cx))
	for i := range cx {
		h = mix64(h ^ math.Float64bits(cx[i]+0))
		h = mix64(h ^ math.Float64bits(cy[i]+0))
	}
	h2 := fnv.New64a()
	h2.Write([]byte(use))
	return rand.NewPCG(h, h2.Sum64())
}

// DcorStatMaxN is the number of rows above which the distance-correlation
// statistic is computed on that many rows chosen by their values (see
// canonical) rather than on all: the statistic costs O(n log n) time and
// about 70 bytes of working memory per row, and on 10⁵ rows its sampling
// error (of order 1/√n ≈ 0.003) is already far below the nonlinear cut
// point of 0.15 that reads it.
const DcorStatMaxN = 100_000

// dcorFlipRisk is the chance, at most, that the sequential permutation
// test of distance correlation settles on the wrong side of alpha, that
// is, that another random stream would give the other verdict (this
// tool's choice).
const dcorFlipRisk = 1e-3

// dcorFirstLook is the number of permutations at the first look.
const dcorFirstLook = 199

// dcorLooks returns the cumulative permutation counts at which the
// sequential test looks: 199, then five times as many plus 4 (999, 4999,
// 24999, …), up to max (the last look is max itself).
func dcorLooks(max int) []int {
	var looks []int
	for b := dcorFirstLook; b < max; b = 5*b + 4 {
		looks = append(looks, b)
	}
	return append(looks, max)
}

// dcorTest is the distance correlation of x and y (on all rows) with a
// sequential Monte Carlo permutation test whose verdict at alpha is a
// function of the set of rows.
//
// The test runs on canonical(x, y, maxN) with the permutations drawn from
// rowSource, so neither the file's order nor the manifest's seed enters.
// It permutes in batches (stats.DistanceCorrTest, continuing one stream)
// and looks after 199, 999, 4999, … permutations, up to maxPerms. At each
// look, with k permutations of N at least as extreme as the data, it forms
// the Clopper–Pearson interval (stats.ClopperPearson) for the exact
// permutation p at confidence 1 − dcorFlipRisk/L (Bonferroni over the L
// looks), and stops once the interval lies wholly below or above alpha:
// then the chance that the Monte Carlo put p̂ on the wrong side of alpha,
// and so that another stream would change the verdict, is below
// dcorFlipRisk. This is a sequential stopping rule in the spirit of Besag &
// Clifford (1991, "Sequential Monte Carlo p-values", Biometrika
// 78:301–304), who stop after a fixed number of exceedances; ours stops on
// the interval, which bounds the error of the decision at alpha. Data far
// from alpha stop at the first look; only p-values near alpha pay for more
// permutations. When the last look does not settle it, resolved is false
// and p̂ is within Monte Carlo error of alpha.
//
// p̂ = (1 + k)/(N + 1) (the observed arrangement counted as one of the
// permutations, as stats.DistanceCorrTest does) and mcse = √(p̂(1 − p̂)/N)
// is its Monte Carlo standard error.
func dcorTest(x, y []float64, alpha float64, maxPerms, maxN int) (dcor, p, mcse float64, perms, used int, resolved bool, method string) {
	return dcorTestSample(x, y, sortedSample(x, y, max(maxN, DcorStatMaxN)), alpha, maxPerms, maxN)
}

// dcorTestSample is dcorTest given the study's sample smp (studySample, or
// any valueSample of at least max(maxN, DcorStatMaxN) rows), from which
// its samples are drawn (rowSample.sub).
func dcorTestSample(x, y []float64, smp rowSample, alpha float64, maxPerms, maxN int) (dcor, p, mcse float64, perms, used int, resolved bool, method string) {
	nan := math.NaN()
	statRows := fmt.Sprintf("all %d rows", len(x))
	if len(x) > DcorStatMaxN {
		// The statistic on a sample chosen by the rows' values (see
		// DcorStatMaxN), drawn from the study's sample.
		tx, ty := smp.sub(DcorStatMaxN)
		dcor = stats.DistanceCorrelation(tx, ty)
		statRows = fmt.Sprintf("%d of the %d rows, chosen by their values", DcorStatMaxN, len(x))
	} else {
		dcor = stats.DistanceCorrelation(x, y)
	}
	used = min(len(x), maxN)
	if math.IsNaN(dcor) || len(x) < 3 {
		return dcor, nan, nan, 0, used, false, "distance correlation, V-statistic; undefined for these data, no permutation test"
	}
	cx, cy := smp.sub(maxN)
	src := rowSource(cx, cy, "dcor")
	looks := dcorLooks(max(maxPerms, 1))
	conf := 1 - dcorFlipRisk/float64(len(looks))
	k := 0
	for _, look := range looks {
		batch := look - perms
		_, pb, _, _ := stats.DistanceCorrTest(cx, cy, batch, len(cx), src)
		if math.IsNaN(pb) {
			return dcor, nan, nan, 0, used, false, fmt.Sprintf("distance correlation, V-statistic, on all %d rows; the rows tested have a constant column, no permutation test", len(x))
		}
		k += int(math.Round(pb*float64(batch+1))) - 1
		perms = look
		lo, hi := stats.ClopperPearson(k, perms, conf)
		if hi < alpha || lo > alpha {
			resolved = true
			break
		}
	}
	p = float64(1+k) / float64(perms+1)
	mcse = math.Sqrt(p * (1 - p) / float64(perms))
	rows := fmt.Sprintf("all %d rows", len(x))
	if used < len(x) {
		rows = fmt.Sprintf("%d of the %d rows, chosen by their values", used, len(x))
	}
	method = fmt.Sprintf("distance correlation, V-statistic, on %s by the O(n log n) algorithm; p from %d permutations of %s, stopped by a sequential rule (at most %d)",
		statRows, perms, rows, looks[len(looks)-1])
	return dcor, p, mcse, perms, used, resolved, method
}
