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

// canonical returns the (x, y) pairs sorted by x, then y: the order in
// which the study's random procedures see the rows, so that no result
// depends on the order of the file. Above maxN rows it keeps maxN of them,
// chosen by their values (the maxN smallest pairHash values, ties by x
// then y): a sample that is a function of the set of rows and not of a
// seed or of the file's order. For data whose values are not built to
// collide with the hash, it behaves like a simple random sample. The
// sample of a sample is the sample: canonical(canonical(x, y, k), m) is
// canonical(x, y, m) for m ≤ k, so one pass over the rows serves every
// sample a study draws (studySample).
func canonical(x, y []float64, maxN int) (cx, cy []float64) {
	n := len(x)
	var idx []int
	if maxN > 0 && n > maxN {
		idx = smallestHashes(x, y, maxN)
	} else {
		idx = make([]int, n)
		for i := range idx {
			idx[i] = i
		}
	}
	slices.SortFunc(idx, func(a, b int) int { return cmp.Or(cmp.Compare(x[a], x[b]), cmp.Compare(y[a], y[b])) })
	return pick(x, idx), pick(y, idx)
}

// smallestHashes returns the positions of the k rows (0 < k < len(x)) of
// smallest pairHash, ties at the k-th value broken by x then y, in no
// particular order. One pass keeps the rows whose hash lies below a bound
// that about 2k rows pass when the hashes are uniform; in the rare case
// that fewer than k pass (many equal pairs, or values built to collide)
// the bound is doubled and the pass repeated. Memory is O(k), not O(n).
func smallestHashes(x, y []float64, k int) []int {
	n := len(x)
	frac := 2*float64(k)/float64(n) + 64/float64(n)
	var hs []uint64
	var is []int
	for {
		hs, is = hs[:0], is[:0]
		all := frac >= 0.5 // a bound near 2⁶⁴ would overflow; half the rows or more: keep them all
		bound := uint64(frac * (1 << 63) * 2)
		for i := range n {
			if h := pairHash(x[i], y[i]); all || h < bound {
				hs, is = append(hs, h), append(is, i)
			}
		}
		if len(hs) >= k {
			break
		}
		frac *= 2
	}
	cut := nthSmallest(slices.Clone(hs), k-1)
	sel := make([]int, 0, k)
	var tied []int
	for j, h := range hs {
		switch {
		case h < cut:
			sel = append(sel, is[j])
		case h == cut:
			tied = append(tied, is[j])
		}
	}
	slices.SortFunc(tied, func(a, b int) int { return cmp.Or(cmp.Compare(x[a], x[b]), cmp.Compare(y[a], y[b])) })
	return append(sel, tied[:k-len(sel)]...)
}

// studySample returns the rows every figure computed on a sample draws its
// sample from: all of x and y (in their order) up to the largest sample
// any of them takes, else canonical(x, y, k) with k that largest size. A
// sample of it by canonical is the sample of all rows (see canonical), so
// the rows are hashed once per study, not once per figure.
func studySample(x, y []float64, cfg Config) (sx, sy []float64) {
	k := max(cfg.LowessMaxN, cfg.DcorMaxN, DcorStatMaxN, maxXOrderRows)
	if len(x) <= k {
		return x, y
	}
	return canonical(x, y, k)
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
	sx, sy := x, y
	if k := max(maxN, DcorStatMaxN); len(x) > k {
		sx, sy = canonical(x, y, k)
	}
	return dcorTestSample(x, y, sx, sy, alpha, maxPerms, maxN)
}

// dcorTestSample is dcorTest given the study's sample (sx, sy): the rows
// themselves, or canonical(x, y, k) for some k ≥ max(maxN, DcorStatMaxN),
// from which every smaller sample is drawn (see canonical).
func dcorTestSample(x, y, sx, sy []float64, alpha float64, maxPerms, maxN int) (dcor, p, mcse float64, perms, used int, resolved bool, method string) {
	nan := math.NaN()
	statRows := fmt.Sprintf("all %d rows", len(x))
	if len(x) > DcorStatMaxN {
		// The statistic on a sample chosen by the rows' values (see
		// DcorStatMaxN), drawn from the study's sample.
		tx, ty := canonical(sx, sy, DcorStatMaxN)
		dcor = stats.DistanceCorrelation(tx, ty)
		statRows = fmt.Sprintf("%d of the %d rows, chosen by their values", DcorStatMaxN, len(x))
	} else {
		dcor = stats.DistanceCorrelation(x, y)
	}
	used = min(len(x), maxN)
	if math.IsNaN(dcor) || len(x) < 3 {
		return dcor, nan, nan, 0, used, false, "distance correlation, V-statistic; undefined for these data, no permutation test"
	}
	cx, cy := canonical(sx, sy, maxN)
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
