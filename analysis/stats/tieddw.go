package stats

// This file holds the Durbin–Watson statistic of residuals ordered by a
// key that may tie, made free of the order of tied rows, and the
// Clopper–Pearson interval that bounds a Monte Carlo p-value.

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/stat/distuv"
)

// DurbinWatsonTied returns the Durbin–Watson statistic of resid taken in
// order of key, averaged over every order of the rows whose keys tie:
//
//	d̄ = E_π[ Σ_t (e_{π(t)} − e_{π(t−1)})² ] / Σ_t e_t²
//
// where π runs uniformly over the orders that sort key (the denominator
// does not depend on the order). The expectation has a closed form. Inside
// a block of m tied rows with mean ē_b and sum of squares about it SS_b,
// the m − 1 successive pairs are, under a random order, pairs of distinct
// rows drawn at random, each with E(e_i − e_j)² = 2·SS_b/(m − 1): the block
// adds 2·SS_b. Between consecutive blocks A and B the last row of A and the
// first of B are independent random draws, so the step adds
// (ē_A − ē_B)² + SS_A/m_A + SS_B/m_B. Without ties this is the ordinary
// statistic (DurbinWatson); with ties it no longer depends on how a file
// happened to list tied rows, and it is a function of the set of (key,
// resid) pairs. (The derivation is ours; it is plain algebra of the mean of
// a squared difference.)
//
// Averaging lowers the statistic's variance under independence, so a test
// that compares d̄ with the null distribution of d (mean 2, variance about
// 4/n) is conservative where keys tie.
//
// key and resid must have equal length (it panics otherwise). NaN when
// n < 2, every residual is 0, or a value is NaN.
func DurbinWatsonTied(key, resid []float64) float64 {
	if len(key) != len(resid) {
		panic("stats: DurbinWatsonTied: key and resid lengths differ")
	}
	n := len(key)
	if n < 2 || hasNaN(key) || hasNaN(resid) {
		return math.NaN()
	}
	// The rows in order of key: as they are when key never decreases (a
	// run order listed in order, the usual case: no index, no sort), else
	// by the radix argsort (O(n); ties in position order, which the block
	// sums below do not depend on but for rounding).
	var idx []int
	if !slices.IsSorted(key) {
		idx = stableArgsort(key)
	}
	at := func(k int) int { // called directly, so inlined: no call per row
		if idx == nil {
			return k
		}
		return idx[k]
	}
	var num, den float64
	for _, e := range resid {
		den += e * e
	}
	if !(den > 0) {
		return math.NaN()
	}
	prevMean, prevVar := 0.0, 0.0 // of the block before; prevVar = SS/m
	first := true
	for i := 0; i < n; {
		j := i + 1
		for j < n && key[at(j)] == key[at(i)] {
			j++
		}
		m := float64(j - i)
		// Mean and SS of the block by Welford's updates.
		var mean, ss float64
		for k := i; k < j; k++ {
			e := resid[at(k)]
			d := e - mean
			mean += d / float64(k-i+1)
			ss += d * (e - mean)
		}
		num += 2 * ss
		v := ss / m
		if !first {
			d := prevMean - mean
			num += d*d + prevVar + v
		}
		prevMean, prevVar, first = mean, v, false
		i = j
	}
	return num / den
}

// ClopperPearson returns the exact (Clopper & Pearson 1934, Biometrika
// 26:404–413) two-sided interval at confidence conf for a binomial
// probability after k successes in n trials: the conf/2 quantiles of
// Beta(k, n − k + 1) and Beta(k + 1, n − k), with lo = 0 at k = 0 and
// hi = 1 at k = n. NaN for n < 1, k outside 0..n or conf outside (0, 1).
func ClopperPearson(k, n int, conf float64) (lo, hi float64) {
	if n < 1 || k < 0 || k > n || !(conf > 0 && conf < 1) {
		return math.NaN(), math.NaN()
	}
	a := (1 - conf) / 2
	lo, hi = 0, 1
	if k > 0 {
		lo = distuv.Beta{Alpha: float64(k), Beta: float64(n - k + 1)}.Quantile(a)
	}
	if k < n {
		hi = distuv.Beta{Alpha: float64(k + 1), Beta: float64(n - k)}.Quantile(1 - a)
	}
	return lo, hi
}
