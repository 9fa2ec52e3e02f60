package stats

// This file holds the diagnostics of the straight-line fit: the pure-error
// lack-of-fit F test where x repeats, Breusch–Pagan for spread that changes
// with x, and Durbin–Watson and the residual trend in run order.

import (
	"math"

	"bivar/internal/hugepage"
)

// LackOfFit returns the pure-error lack-of-fit F test of the straight line
// (Draper & Smith 1998, Applied Regression Analysis, 3rd ed., lack of fit
// and pure error; Montgomery, Peck & Vining 2012, Introduction to Linear
// Regression Analysis, 5th ed.). With m distinct x values, the
// line's residual sum of squares splits into pure error (scatter of y about
// the mean at each repeated x) and lack of fit (the group means about the
// line):
//
//	SS_PE  = Σ_g Σ_{i∈g} (y_i − ȳ_g)²,       df2 = n − m
//	SS_LOF = Σ_g n_g (ȳ_g − ŷ(x_g))²,         df1 = m − 2
//	F      = (SS_LOF/df1) / (SS_PE/df2),    p = P(F_{df1,df2} ≥ F) (UpperF)
//
// SS_LOF is summed directly from the group means rather than as RSS − SS_PE,
// so it does not lose digits to cancellation, and it works on the data
// centred on their means, where the line is b1·(x − x̄), so an offset in x
// or y costs no digits.
// Groups are runs of exactly equal x (no rounding). The line is Line's
// least-squares fit.
//
// ok is false, and the other results are zero or NaN, when the test does
// not exist: x has no replicates (m = n, df2 = 0), fewer than three distinct
// x (df1 ≤ 0), x constant, a value not finite, or no pure error at all
// (SS_PE = 0, every replicate identical, so F is undefined; then alone df1
// and df2 are returned, both positive, with f and p NaN). x and y must
// have equal length (it panics otherwise).
func LackOfFit(x, y []float64) (f float64, df1, df2 int, p float64, ok bool) {
	if len(x) != len(y) {
		panic("stats: LackOfFit: x and y lengths differ")
	}
	nan := math.NaN()
	n := len(x)
	if n < 4 {
		return nan, 0, 0, nan, false
	}
	line, err := Line(x, y, 0.95)
	if err != nil {
		return nan, 0, 0, nan, false
	}
	// Everything on the centred data (lackOfFitSorted), where the line is
	// b1·(x − x̄): b0 + b1·x would cancel when x is far from 0 (x = 10⁹ +
	// small lost 8 digits of F), and deviations are formed from two-part
	// means (meanParts) so that y far from 0 costs none either.
	idx := stableArgsort(x)
	xs, ys := hugepage.Make[float64](n), hugepage.Make[float64](n)
	for k, i := range idx {
		xs[k], ys[k] = x[i], y[i]
	}
	return lackOfFitSorted(xs, ys, line.Slope.Estimate, nil)
}

// lackOfFitSorted is LackOfFit of pairs sorted by x, b1 the line's slope;
// mp, when not nil, holds the two-part means of x and y (meanParts's
// figures for these pairs in this order), taken instead of summing again.
func lackOfFitSorted(x, y []float64, b1 float64, mp *meanPair) (f float64, df1, df2 int, p float64, ok bool) {
	nan := math.NaN()
	n := len(x)
	if n < 4 || math.IsNaN(b1) {
		return nan, 0, 0, nan, false
	}
	var hx, lx, hy, ly float64
	if mp != nil {
		hx, lx, hy, ly = mp.xhi, mp.xlo, mp.yhi, mp.ylo
	} else {
		hx, lx, _ = meanParts(x)
		hy, ly, _ = meanParts(y)
	}
	var ssPE, ssLOF float64
	m := 0
	for lo := 0; lo < n; {
		hi := lo + 1
		for hi < n && x[hi] == x[lo] {
			hi++
		}
		m++
		// Mean of the group by the corrected two-pass method.
		ng := float64(hi - lo)
		var s float64
		for _, v := range y[lo:hi] {
			s += (v - hy) - ly
		}
		mean := s / ng
		var c, q float64
		for _, v := range y[lo:hi] {
			d := ((v - hy) - ly) - mean
			c += d
			q += d * d
		}
		mean += c / ng
		ssPE += q - c*c/ng
		d := mean - b1*((x[lo]-hx)-lx)
		ssLOF += ng * d * d
		lo = hi
	}
	df1, df2 = m-2, n-m
	if df1 <= 0 || df2 <= 0 {
		return nan, 0, 0, nan, false
	}
	if !(ssPE > 0) {
		return nan, df1, df2, nan, false
	}
	f = (ssLOF / float64(df1)) / (ssPE / float64(df2))
	return f, df1, df2, UpperF(f, float64(df1), float64(df2)), true
}

// BreuschPagan returns Koenker's (1981) studentized form of the
// Breusch–Pagan (1979) test for residual variance that changes with x:
// the auxiliary regression of the squared residuals e² on [1, x], and
//
//	LM = n·R²_aux,  df = 1,  p = P(χ²_1 ≥ LM) (UpperChi2)
//
// (Koenker, R. (1981), J. Econometrics 17:107–112; the same statistic as
// statsmodels' het_breuschpagan with robust=True). Unlike the original
// ESS/2 form it does not assume normal errors. With one regressor R²_aux is
// the squared Pearson correlation of x and e², taken from centred sums.
//
// resid and x must have equal length (it panics otherwise). stat and p are
// NaN when n < 3, x is constant, or the squared residuals are all equal
// (for instance an exact fit).
func BreuschPagan(resid, x []float64) (stat float64, df int, p float64) {
	if len(resid) != len(x) {
		panic("stats: BreuschPagan: resid and x lengths differ")
	}
	n := len(resid)
	if n < 3 {
		return math.NaN(), 1, math.NaN()
	}
	e2 := hugepage.Make[float64](n)
	for i, e := range resid {
		e2[i] = e * e
	}
	r2 := Pearson(x, e2, 0.95).R2
	if math.IsNaN(r2) {
		return math.NaN(), 1, math.NaN()
	}
	stat = float64(n) * r2
	return stat, 1, UpperChi2(stat, 1)
}

// DurbinWatson returns the Durbin–Watson (1950, 1951) statistic of
// residuals taken in run order:
//
//	d = Σ_{t=2..n} (e_t − e_{t−1})² / Σ_{t=1..n} e_t²
//
// Near 2 means no first-order autocorrelation; toward 0 positive (runs of
// same-sign residuals, drift), toward 4 negative. d ≈ 2(1 − r₁) with r₁
// the lag-one autocorrelation. It is NaN when n < 2 or every residual is 0.
func DurbinWatson(resid []float64) float64 {
	n := len(resid)
	if n < 2 {
		return math.NaN()
	}
	var num, den float64
	for t, e := range resid {
		den += e * e
		if t > 0 {
			d := e - resid[t-1]
			num += d * d
		}
	}
	if !(den > 0) {
		return math.NaN()
	}
	return num / den
}

// OrderTrend returns the least-squares slope of the residuals on run order
// (residual units per unit of order), the correlation r of residuals with
// order, and the two-sided p of the t-test of that slope (equal to
// Pearson's t-test of r with n−2 degrees of freedom, TwoSidedT). A small p
// says the residuals drift with run order, a possible lurking variable
// (tool wear, ambient conditions, operator).
//
// order and resid must have equal length (it panics otherwise). All three
// are NaN when n < 3 or order or resid is constant.
func OrderTrend(order, resid []float64) (slope, p, r float64) {
	if len(order) != len(resid) {
		panic("stats: OrderTrend: order and resid lengths differ")
	}
	nan := math.NaN()
	if len(order) < 3 {
		return nan, nan, nan
	}
	c, m := PearsonWithMoments(order, resid, 0.95)
	if math.IsNaN(c.R) {
		return nan, nan, nan
	}
	return m.Sxy / m.Sxx, c.P, c.R
}
