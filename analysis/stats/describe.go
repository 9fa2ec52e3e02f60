package stats

// This file holds the one-variable summaries (Describe, Quartiles) and the
// centred second moments of a pair (CentredMoments) that every other
// estimator in the package is built on.

import "math"

// Summary is the location and spread of one variable.
type Summary struct {
	N      int     // number of values
	Mean   float64 // arithmetic mean
	SD     float64 // sample standard deviation, n−1 denominator
	Min    float64 // smallest value
	Q1     float64 // lower quartile, Hyndman & Fan (1996) type 7
	Median float64 // median (type 7 at p = 0.5 is the usual median)
	Q3     float64 // upper quartile, Hyndman & Fan (1996) type 7
	Max    float64 // largest value
}

// Describe returns n, mean, sample SD, min, quartiles and max of x.
//
// The mean and the sum of squares are centred sums by the corrected
// two-pass algorithm (Chan, Golub & LeVeque 1983, "Algorithms for computing
// the sample variance", Am. Stat. 37(3), eq. 1.7):
//
//	m = Σx/n;  m ← m + Σ(x−m)/n;  SS = Σ(x−m)² − (Σ(x−m))²/n;  SD = √(SS/(n−1))
//
// The quartiles follow Hyndman & Fan (1996), "Sample quantiles in
// statistical packages", Am. Stat. 50(4), definition 7 (see Quantile7): the
// median of 1..10 is 5.5 and Q1 is 3.25. x is not modified; a copy is
// sorted by an O(n) radix sort (sortkey.go).
//
// x must hold no NaN (the caller removes missing values first). An empty x
// gives N = 0 and NaN everywhere; one value gives SD NaN; a NaN in x gives
// NaN for every field but N; an infinite value gives NaN Mean and SD (the
// centred sums do not exist) while Min and Max are still the extremes.
func Describe(x []float64) Summary {
	s := Summary{N: len(x)}
	nan := math.NaN()
	s.Mean, s.SD, s.Min, s.Q1, s.Median, s.Q3, s.Max = nan, nan, nan, nan, nan, nan, nan
	if len(x) == 0 {
		return s
	}
	for _, v := range x {
		if math.IsNaN(v) {
			return s
		}
	}
	m, ss := meanSS(x)
	s.Mean = m
	if len(x) > 1 {
		s.SD = math.Sqrt(ss / float64(len(x)-1))
	}
	sorted := sortedCopy(x)
	s.Min, s.Max = sorted[0], sorted[len(sorted)-1]
	s.Q1, s.Median, s.Q3 = Quartiles(sorted)
	return s
}

// Quartiles returns the lower quartile, median and upper quartile of sorted
// (ascending, no NaN) by Hyndman & Fan (1996) definition 7. It returns NaN
// for an empty slice. It does not check that sorted is sorted.
func Quartiles(sorted []float64) (q1, median, q3 float64) {
	return Quantile7(sorted, 0.25), Quantile7(sorted, 0.5), Quantile7(sorted, 0.75)
}

// Quantile7 returns the p-quantile of sorted (ascending, no NaN) by
// Hyndman & Fan (1996), "Sample quantiles in statistical packages",
// Am. Stat. 50(4):361–365, definition 7: with h = (n−1)·p (0-based),
//
//	Q(p) = x[⌊h⌋] + (h − ⌊h⌋)·(x[⌊h⌋+1] − x[⌊h⌋])
//
// the linear interpolation between order statistics at positions
// 1 + (n−1)p, which is the default of R's quantile() and of NumPy. It
// returns NaN for an empty slice or p outside [0, 1].
func Quantile7(sorted []float64, p float64) float64 {
	return quantile7At(len(sorted), func(k int) float64 { return sorted[k] }, p)
}

// quantile7At is Quantile7 of n sorted values, the k-th smallest being at(k).
func quantile7At(n int, at func(int) float64, p float64) float64 {
	if n == 0 || !(p >= 0 && p <= 1) {
		return math.NaN()
	}
	h := float64(n-1) * p
	lo := int(math.Floor(h))
	if lo >= n-1 {
		return at(n - 1)
	}
	frac := h - float64(lo)
	if frac == 0 {
		return at(lo)
	}
	a, b := at(lo), at(lo+1)
	return a + frac*(b-a)
}

// meanSS returns the mean and the centred sum of squares Σ(x−m)² of x by
// the corrected two-pass algorithm (Chan, Golub & LeVeque 1983, eq. 1.7).
// x must be non-empty.
func meanSS(x []float64) (mean, ss float64) {
	hi, lo, ss := meanParts(x)
	return hi + lo, ss
}

// meanParts returns the mean of x as an unevaluated sum hi + lo, hi = Σx/n
// rounded and lo = Σ(x − hi)/n (the correction of Chan, Golub & LeVeque
// 1983, eq. 1.7), and the centred sum of squares Σ(x − x̄)². The deviation
// (x − hi) − lo is accurate to the rounding of the deviation itself even
// when |x̄| is far larger than the spread (x = 10⁹ + small), where folding
// lo into hi would round it away and leave every deviation off by up to
// half an ulp of x̄. x must be non-empty.
func meanParts(x []float64) (hi, lo, ss float64) {
	n := float64(len(x))
	var sum float64
	for _, v := range x {
		sum += v
	}
	hi = sum / n
	var c, q ksum
	for lo := 0; lo < len(x); lo += sumBlock {
		var bc, bq float64
		for _, v := range x[lo:min(lo+sumBlock, len(x))] {
			d := v - hi
			bc += d
			bq += d * d
		}
		c.add(bc)
		q.add(bq)
	}
	cs := c.value()
	return hi, cs / n, q.value() - cs*cs/n
}

// sumBlock is the length of the blocks whose plain sums the second passes
// add into compensated totals (ksum): the rounding error of a sum of n
// terms is then about (sumBlock + 2)·ε instead of up to n·ε, which at
// n = 10⁶ took Spearman's ρ 2.4e-12 away from its exact value.
const sumBlock = 256

// ksum is a compensated sum (Neumaier 1974, "Rundungsfehleranalyse einiger
// Verfahren zur Summation endlicher Summen", ZAMM 54; the improved Kahan
// summation, Higham 2002, Accuracy and Stability of Numerical Algorithms,
// 2nd ed., §4.3).
type ksum struct{ s, c float64 }

func (k *ksum) add(v float64) {
	t := k.s + v
	if math.Abs(k.s) >= math.Abs(v) {
		k.c += (k.s - t) + v
	} else {
		k.c += (v - t) + k.s
	}
	k.s = t
}

func (k *ksum) value() float64 { return k.s + k.c }

// Moments are the means and centred sums of squares and products of a pair.
type Moments struct {
	N            int     // number of pairs
	MeanX, MeanY float64 // means of x and y
	Sxx, Syy     float64 // Σ(x−x̄)², Σ(y−ȳ)²
	Sxy          float64 // Σ(x−x̄)(y−ȳ)

	// parts, set by CentredMoments only: each mean in the two parts of
	// meanParts (hi the plain mean, lo its correction), which the Sorted
	// fits and summaries of the same pairs reuse (Sorted.Moments) instead
	// of summing the columns again.
	parts meanPair
}

// meanPair holds the means of x and y in two parts each, as meanParts
// returns them.
type meanPair struct{ xhi, xlo, yhi, ylo float64 }

// CentredMoments returns n, the means and the centred sums Sxx, Syy, Sxy of
// the pairs (x[i], y[i]) by the corrected two-pass algorithm (Chan, Golub &
// LeVeque 1983, eq. 1.7, extended to the cross product): the first pass
// gives the means, the second sums deviations from them (in blocks of
// sumBlock added into compensated totals), and the sum of the deviations
// (zero in exact arithmetic) corrects both means and sums.
//
// x and y must have equal length (it panics otherwise). An empty input
// gives N = 0 and NaN means and sums; NaN in the input propagates.
func CentredMoments(x, y []float64) Moments {
	if len(x) != len(y) {
		panic("stats: CentredMoments: x and y lengths differ")
	}
	m := Moments{N: len(x)}
	if len(x) == 0 {
		nan := math.NaN()
		m.MeanX, m.MeanY, m.Sxx, m.Syy, m.Sxy = nan, nan, nan, nan, nan
		return m
	}
	n := float64(len(x))
	var sx, sy float64
	for i := range x {
		sx += x[i]
		sy += y[i]
	}
	mx, my := sx/n, sy/n
	var kcx, kcy, kxx, kyy, kxy ksum
	for lo := 0; lo < len(x); lo += sumBlock {
		hi := min(lo+sumBlock, len(x))
		var cx, cy, qxx, qyy, qxy float64
		for i := lo; i < hi; i++ {
			dx, dy := x[i]-mx, y[i]-my
			cx += dx
			cy += dy
			qxx += dx * dx
			qyy += dy * dy
			qxy += dx * dy
		}
		kcx.add(cx)
		kcy.add(cy)
		kxx.add(qxx)
		kyy.add(qyy)
		kxy.add(qxy)
	}
	cx, cy := kcx.value(), kcy.value()
	m.MeanX, m.MeanY = mx+cx/n, my+cy/n
	m.parts = meanPair{xhi: mx, xlo: cx / n, yhi: my, ylo: cy / n}
	m.Sxx = kxx.value() - cx*cx/n
	m.Syy = kyy.value() - cy*cy/n
	m.Sxy = kxy.value() - cx*cy/n
	return m
}

// GridX is the i-th (0-based) of k ≥ 2 evenly spaced values from lo to hi,
// the last exactly hi: the x at which a curve or band is drawn.
func GridX(lo, hi float64, i, k int) float64 {
	if i == k-1 {
		return hi
	}
	return lo + (hi-lo)*float64(i)/float64(k-1)
}
