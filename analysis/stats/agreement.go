package stats

// This file holds the statistics of method comparison: whether two
// measurements of the same quantity (two gauges, methods, labs or fixtures)
// agree. Bland–Altman limits of agreement, with and without replicates;
// each method's repeatability from replicates; Deming regression with
// jackknife intervals; Passing–Bablok regression; Lin's concordance
// correlation coefficient.

import (
	"encoding/binary"
	"hash/fnv"
	"math"
	"math/rand/v2"
	"slices"

	"bivar/internal/hugepage"
)

// LimitsOfAgreement is the result of BlandAltman and BlandAltmanReplicates.
// Differences are d = a − b, means m = (a + b)/2 (of each method's
// replicate means with replicates). Undefined figures are NaN.
type LimitsOfAgreement struct {
	N int // items (rows) used

	Bias           float64 // mean difference d̄
	BiasLo, BiasHi float64 // its interval: d̄ ∓ t_{n−1} · SDMeans/√n
	SD             float64 // SD of the difference of single measurements (n−1 divisor; corrected with replicates)
	SDMeans        float64 // SD of the differences as observed (of replicate means with replicates; equals SD without)

	K            float64 // the multiplier of SD in the limits (1.96 for 95 %, 2 in the 1986 paper)
	Lower, Upper float64 // limits of agreement d̄ ∓ K·SD
	LowerLo      float64 // exact interval of the lower limit: d̄ − SD·t′_{(1±conf)/2}/√n (see BlandAltman)
	LowerHi      float64
	UpperLo      float64 // exact interval of the upper limit: d̄ + SD·t′_{(1∓conf)/2}/√n
	UpperHi      float64

	// The regression of d on m (least squares), which shows a difference
	// that grows with the magnitude ("proportional difference").
	TrendIntercept float64
	TrendSlope     float64 // change of d per unit of m
	TrendSlopeSE   float64
	TrendP         float64 // two-sided p of TrendSlope = 0, t with n−2 df
}

// BlandAltman returns the bias and the limits of agreement of two methods
// measured once each on the same items, a[i] and b[i] (Bland, J. M. and
// Altman, D. G. (1986), "Statistical methods for assessing agreement
// between two methods of clinical measurement", Lancet 327:307–310; and
// (1999), "Measuring agreement in method comparison studies", Statistical
// Methods in Medical Research 8:135–160):
//
//	d_i = a_i − b_i,  bias d̄,  s = SD(d) (n−1 divisor)
//	limits d̄ ∓ k·s                                 (k = 1.96; 2 in the 1986 paper)
//	interval of d̄:     d̄ ∓ t_{n−1,(1+conf)/2} · s/√n
//	interval of the upper limit: d̄ + s·t′_q/√n,  q = (1−conf)/2 and (1+conf)/2
//	interval of the lower limit: d̄ − s·t′_q/√n,  q = (1+conf)/2 and (1−conf)/2
//
// where t′_q is the q-quantile of the noncentral t with n−1 df and
// noncentrality k·√n (NoncentralTQuantile). This is the exact interval of
// a normal quantile μ + kσ, the two one-sided tolerance limits (Carkeet,
// A. (2015), "Exact parametric confidence intervals for Bland–Altman
// limits of agreement", Optometry and Vision Science 92(3):e71–e80). It
// is asymmetric about the limit and wider at small n than the approximate
// limit ∓ t·s·√(1/n + k²/(2(n−1))) of the 1999 paper, whose outer ends
// cover too seldom there (they would accept agreement too easily). The
// regression of d on the mean m = (a+b)/2 is
// ordinary least squares with centred sums; its slope's p uses t with n−2
// df (Bland & Altman 1999).
//
// a and b must have equal length (it panics otherwise). Every figure is NaN
// when n < 2 or any value is NaN or infinite; the intervals need n ≥ 2, the
// regression n ≥ 3 and a non-constant mean; conf must lie in (0, 1) and k
// be positive, or the figures depending on them are NaN.
func BlandAltman(a, b []float64, k, conf float64) LimitsOfAgreement {
	if len(a) != len(b) {
		panic("stats: BlandAltman: slice length mismatch")
	}
	d := make([]float64, len(a))
	m := make([]float64, len(a))
	for i := range a {
		d[i] = a[i] - b[i]
		m[i] = (a[i] + b[i]) / 2
	}
	bias, sd := agrMeanSD(d)
	return agrLimits(d, m, bias, sd, sd, k, conf)
}

// BlandAltmanReplicates returns the limits of agreement when each method
// was measured more than once on every item: a[j][i] is replicate j of
// method A on item i (len(a) = m_a ≥ 1 columns of n values), likewise b.
// It is the "mean of replicates" method of Bland & Altman (1999):
// the differences of the replicate means d_i = ā_i − b̄_i give the bias
// and its interval; the SD of the difference of single measurements is
// recovered from the SD of those differences and the within-item
// variances of each method (see Repeatability):
//
//	s² = s_d̄² + (1 − 1/m_a)·s_wa² + (1 − 1/m_b)·s_wb²
//
// and the limits are d̄ ∓ k·s. The interval of each limit is the exact
// one of BlandAltman with s in place and n − 1 degrees of freedom — an
// approximation here, stated as such (s is not the SD of n − 1 df
// differences, and the 1999 paper gives no interval for this case). The regression of d on the mean is on the replicate means.
//
// Every column must have the same length (it panics otherwise); figures
// are NaN as for BlandAltman, and when a method's replicates are missing.
func BlandAltmanReplicates(a, b [][]float64, k, conf float64) LimitsOfAgreement {
	n := agrCheckColumns("BlandAltmanReplicates", a, b)
	if len(a) == 0 || len(b) == 0 {
		return agrLimits(nil, nil, math.NaN(), math.NaN(), math.NaN(), k, conf)
	}
	ma, mb := RowMeans(a, n), RowMeans(b, n)
	d := hugepage.Make[float64](n)
	m := hugepage.Make[float64](n)
	for i := range d {
		d[i] = ma[i] - mb[i]
		m[i] = (ma[i] + mb[i]) / 2
	}
	bias, sdm := agrMeanSD(d)
	sa := Repeatability(a, 0).SW // conf 0: no interval needed
	sb := Repeatability(b, 0).SW
	va, vb := 0.0, 0.0
	if len(a) > 1 {
		va = (1 - 1/float64(len(a))) * sa * sa
	}
	if len(b) > 1 {
		vb = (1 - 1/float64(len(b))) * sb * sb
	}
	sd := math.Sqrt(sdm*sdm + va + vb)
	return agrLimits(d, m, bias, sd, sdm, k, conf)
}

func agrLimits(d, m []float64, bias, sd, sdm, k, conf float64) LimitsOfAgreement {
	nan := math.NaN()
	n := len(d)
	r := LimitsOfAgreement{N: n, Bias: bias, SD: sd, SDMeans: sdm, K: k,
		BiasLo: nan, BiasHi: nan, Lower: nan, Upper: nan,
		LowerLo: nan, LowerHi: nan, UpperLo: nan, UpperHi: nan,
		TrendIntercept: nan, TrendSlope: nan, TrendSlopeSE: nan, TrendP: nan}
	if n < 2 || math.IsNaN(bias) || math.IsNaN(sd) || math.IsInf(bias, 0) || math.IsInf(sd, 0) {
		r.Bias, r.SD, r.SDMeans = nan, nan, nan
		return r
	}
	fn := float64(n)
	if k > 0 {
		r.Lower, r.Upper = bias-k*sd, bias+k*sd
	}
	if conf > 0 && conf < 1 {
		t := TQuantile(0.5+conf/2, fn-1)
		r.BiasLo, r.BiasHi = bias-t*sdm/math.Sqrt(fn), bias+t*sdm/math.Sqrt(fn)
		if k > 0 {
			// Carkeet (2015): t′ quantiles of the noncentral t, n−1 df, k√n.
			nc, rn := k*math.Sqrt(fn), math.Sqrt(fn)
			tl := NoncentralTQuantile(0.5-conf/2, fn-1, nc)
			th := NoncentralTQuantile(0.5+conf/2, fn-1, nc)
			r.UpperLo, r.UpperHi = bias+sd*tl/rn, bias+sd*th/rn
			r.LowerLo, r.LowerHi = bias-sd*th/rn, bias-sd*tl/rn
		}
	}
	if n >= 3 {
		r.TrendIntercept, r.TrendSlope, r.TrendSlopeSE, r.TrendP = agrOLS(m, d)
	}
	return r
}

// agrOLS fits y = a + b·x by least squares with centred sums and returns
// a, b, SE(b) and the two-sided p of b = 0 (t, n−2 df). NaN when x is
// constant or n < 3.
func agrOLS(x, y []float64) (a, b, se, p float64) {
	n := len(x)
	nan := math.NaN()
	if n < 3 {
		return nan, nan, nan, nan
	}
	m := CentredMoments(x, y)
	mx, my, sxx, sxy := m.MeanX, m.MeanY, m.Sxx, m.Sxy
	if !(sxx > 0) {
		return nan, nan, nan, nan
	}
	b = sxy / sxx
	a = my - b*mx
	var rss float64
	for i := range x {
		e := y[i] - a - b*x[i]
		rss += e * e
	}
	df := float64(n - 2)
	se = math.Sqrt(rss / df / sxx)
	if se == 0 {
		return a, b, 0, 0
	}
	return a, b, se, TwoSidedT(b/se, df)
}

// agrMeanSD returns the mean and the SD (n−1 divisor) of x by the
// corrected two-pass method (Chan, Golub & LeVeque 1983, eq. 1.7); the SD
// is NaN for fewer than two values, both are NaN for none or for a NaN.
func agrMeanSD(x []float64) (mean, sd float64) {
	n := len(x)
	if n == 0 {
		return math.NaN(), math.NaN()
	}
	mean, ss := meanSS(x)
	if n < 2 {
		return mean, math.NaN()
	}
	return mean, math.Sqrt(math.Max(ss, 0) / float64(n-1))
}

// agrCheckColumns panics unless every column of every set has the same
// length, and returns that length (0 when there are no columns).
func agrCheckColumns(fn string, sets ...[][]float64) int {
	n := -1
	for _, set := range sets {
		for _, col := range set {
			if n < 0 {
				n = len(col)
			} else if len(col) != n {
				panic("stats: " + fn + ": slice length mismatch")
			}
		}
	}
	return max(n, 0)
}

// RowMeans returns the mean over the columns of each of the n rows (each
// column holds n values).
func RowMeans(cols [][]float64, n int) []float64 {
	out := hugepage.Make[float64](n)
	for _, col := range cols {
		for i, v := range col {
			out[i] += v
		}
	}
	for i := range out {
		out[i] /= float64(len(cols))
	}
	return out
}

// RepeatabilityResult is the result of Repeatability.
type RepeatabilityResult struct {
	N, M   int     // items, replicates per item
	DF     int     // degrees of freedom of SW, N·(M−1)
	SW     float64 // within-item SD s_w (pooled over items)
	SWLo   float64 // interval of the true within-item SD, from χ² with DF
	SWHi   float64
	Coef   float64 // repeatability coefficient z_{0.975}·√2·s_w = 2.77·s_w
	CoefLo float64 // its interval (SWLo, SWHi times the same factor)
	CoefHi float64
}

// RepeatabilityFactor is z_{0.975}·√2 = 2.7718, the factor that turns the
// within-item SD into the repeatability coefficient: the value below which
// the absolute difference of two measurements of the same item lies with
// 95 % probability. ISO 5725-6 (and BS 5497-1) round it to 2.8; Bland &
// Altman (1999) write 2.77.
const RepeatabilityFactor = 1.959963984540054 * math.Sqrt2

// Repeatability returns the within-item SD of one method from its
// replicate columns: reps[j][i] is replicate j on item i, with m = len(reps)
// ≥ 2 columns of n values (one-way analysis of variance; ISO 5725-2;
// Bland & Altman 1999):
//
//	s_w² = Σ_i Σ_j (x_ij − x̄_i)² / (n·(m−1))
//
// with the interval of σ_w from s_w²·df/σ_w² ~ χ²_df (df = n(m−1)), which
// assumes normal errors with the same SD on every item, and the
// repeatability coefficient RepeatabilityFactor·s_w. conf outside (0, 1)
// leaves the intervals NaN (and skips their cost). Columns of unequal
// length panic; fewer than two columns, no items, a NaN or an infinite
// value give NaN figures.
func Repeatability(reps [][]float64, conf float64) RepeatabilityResult {
	n := agrCheckColumns("Repeatability", reps)
	m := len(reps)
	nan := math.NaN()
	r := RepeatabilityResult{N: n, M: m, SW: nan, SWLo: nan, SWHi: nan, Coef: nan, CoefLo: nan, CoefHi: nan}
	if m < 2 || n < 1 {
		return r
	}
	r.DF = n * (m - 1)
	var ss float64
	for i := 0; i < n; i++ {
		var s float64
		for _, col := range reps {
			s += col[i]
		}
		mean := s / float64(m)
		var q, c float64
		for _, col := range reps {
			e := col[i] - mean
			q += e * e
			c += e
		}
		ss += q - c*c/float64(m)
	}
	if math.IsNaN(ss) || math.IsInf(ss, 0) {
		return r
	}
	df := float64(r.DF)
	r.SW = math.Sqrt(math.Max(ss, 0) / df)
	r.Coef = RepeatabilityFactor * r.SW
	if conf > 0 && conf < 1 {
		hi := chi2Quantile(0.5+conf/2, df)
		lo := chi2Quantile(0.5-conf/2, df)
		r.SWLo = r.SW * math.Sqrt(df/hi)
		r.SWHi = r.SW * math.Sqrt(df/lo)
		r.CoefLo, r.CoefHi = RepeatabilityFactor*r.SWLo, RepeatabilityFactor*r.SWHi
	}
	return r
}

// chi2Quantile returns the p-quantile of χ² with df degrees of freedom by
// bisection on UpperChi2 (to the last bits of a double), NaN for p outside
// (0, 1) or df ≤ 0.
func chi2Quantile(p, df float64) float64 {
	if !(p > 0 && p < 1) || !(df > 0) {
		return math.NaN()
	}
	lo, hi := 0.0, math.Max(df, 1)
	for UpperChi2(hi, df) > 1-p {
		hi *= 2
	}
	for range 200 {
		mid := (lo + hi) / 2
		if mid == lo || mid == hi {
			break
		}
		if UpperChi2(mid, df) > 1-p {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// DemingDeltaFromReplicates returns the error-variance ratio δ = var(error
// of y)/var(error of x) for Deming regression of the replicate means of y
// on those of x, estimated from the replicates: (s_wy²/m_y)/(s_wx²/m_x),
// with s_w from Repeatability (Linnet 1993). NaN when either method has
// fewer than two replicates or a zero within-item SD for x.
func DemingDeltaFromReplicates(x, y [][]float64) float64 {
	agrCheckColumns("DemingDeltaFromReplicates", x, y)
	sx := Repeatability(x, 0).SW
	sy := Repeatability(y, 0).SW
	vx := sx * sx / float64(len(x))
	vy := sy * sy / float64(len(y))
	if !(vx > 0) || math.IsNaN(vy) {
		return math.NaN()
	}
	return vy / vx
}

// DemingFit is the result of Deming.
type DemingFit struct {
	N     int
	Delta float64 // error-variance ratio δ = var(error of y)/var(error of x), as given

	Intercept, Slope     float64 // the fitted line y = Intercept + Slope·x
	InterceptSE, SlopeSE float64 // jackknife standard errors
	DF                   float64 // degrees of freedom of the t quantile, n − 2
	InterceptLo          float64 // Intercept ∓ t_{n−2}·InterceptSE
	InterceptHi          float64
	SlopeLo, SlopeHi     float64 // Slope ∓ t_{n−2}·SlopeSE
}

// Deming returns the Deming regression of y on x, the straight line for
// two variables that both carry measurement error, with δ = var(error of
// y)/var(error of x) declared (δ = 1: orthogonal regression). With
// centred sums Sxx, Syy, Sxy (Deming 1943; Linnet 1990, "Estimation of the
// linear relationship between the measurements of two methods with
// proportional errors", Statistics in Medicine 9:1463–1473; Cornbleet &
// Gochman 1979, Clin. Chem. 25:432–438):
//
//	A = Syy − δ·Sxx,  R = √(A² + 4δ·Sxy²)
//	slope = (A + R)/(2·Sxy),  intercept = ȳ − slope·x̄
//
// (evaluated as 2δ·Sxy/(R − A) when A < 0, which avoids cancellation). It
// equals the maximum-likelihood line for normal errors and orthogonal
// distance regression with weights 1 on x and 1/δ on y.
//
// The standard errors are the jackknife's (Linnet 1990; Linnet 1993,
// "Evaluation of regression procedures for methods comparison studies",
// Clin. Chem. 39:424–432): SE² = (n−1)/n · Σ(θ₋ᵢ − θ̄₋)², with each
// leave-one-out fit θ₋ᵢ from sums downdated in O(1), so the whole costs
// O(n). The intervals are estimate ∓ t_{n−2,(1+conf)/2}·SE; n − 2 counts the
// two fitted parameters (our choice of degrees of freedom, stated).
//
// x and y must have equal length (it panics otherwise). Every figure is
// NaN when n < 3, δ is not positive and finite, a value is NaN or
// infinite, or Sxy = 0 (no direction); the intervals are NaN when a
// leave-one-out fit is undefined.
func Deming(x, y []float64, delta, conf float64) DemingFit {
	if len(x) != len(y) {
		panic("stats: Deming: slice length mismatch")
	}
	n := len(x)
	nan := math.NaN()
	f := DemingFit{N: n, Delta: delta, Intercept: nan, Slope: nan, InterceptSE: nan, SlopeSE: nan,
		DF: float64(n - 2), InterceptLo: nan, InterceptHi: nan, SlopeLo: nan, SlopeHi: nan}
	if n < 3 || !(delta > 0) || math.IsInf(delta, 1) {
		return f
	}
	m := CentredMoments(x, y)
	mx, my, sxx, syy, sxy := m.MeanX, m.MeanY, m.Sxx, m.Syy, m.Sxy
	b := demingSlope(sxx, syy, sxy, delta)
	if math.IsNaN(b) || math.IsInf(b, 0) || math.IsNaN(mx) || math.IsNaN(my) {
		return f
	}
	f.Slope, f.Intercept = b, my-b*mx

	// Jackknife: remove row i from the centred sums (the mean moves by
	// −dx/(n−1), each sum loses n/(n−1)·dx·dy).
	fn := float64(n)
	g := fn / (fn - 1)
	var sb, sa float64
	bs := hugepage.Make[float64](n)
	as := hugepage.Make[float64](n)
	for i := range x {
		dx, dy := x[i]-mx, y[i]-my
		bi := demingSlope(sxx-g*dx*dx, syy-g*dy*dy, sxy-g*dx*dy, delta)
		ai := (my - dy/(fn-1)) - bi*(mx-dx/(fn-1))
		bs[i], as[i] = bi, ai
		sb += bi
		sa += ai
	}
	sb /= fn
	sa /= fn
	var vb, va float64
	for i := range bs {
		vb += (bs[i] - sb) * (bs[i] - sb)
		va += (as[i] - sa) * (as[i] - sa)
	}
	f.SlopeSE = math.Sqrt(vb * (fn - 1) / fn)
	f.InterceptSE = math.Sqrt(va * (fn - 1) / fn)
	if conf > 0 && conf < 1 && !math.IsNaN(f.SlopeSE) && !math.IsInf(f.SlopeSE, 0) {
		t := TQuantile(0.5+conf/2, fn-2)
		f.SlopeLo, f.SlopeHi = b-t*f.SlopeSE, b+t*f.SlopeSE
		f.InterceptLo, f.InterceptHi = f.Intercept-t*f.InterceptSE, f.Intercept+t*f.InterceptSE
	} else {
		f.SlopeSE, f.InterceptSE = nan, nan
	}
	return f
}

func demingSlope(sxx, syy, sxy, delta float64) float64 {
	if sxy == 0 || math.IsNaN(sxy) {
		return math.NaN()
	}
	a := syy - delta*sxx
	r := math.Sqrt(a*a + 4*delta*sxy*sxy)
	if a >= 0 {
		return (a + r) / (2 * sxy)
	}
	return 2 * delta * sxy / (r - a)
}

// PassingBablokExactMax is the largest n for which PassingBablok uses every
// pair of rows; above it, it uses a sample of pairs (see PassingBablok).
const PassingBablokExactMax = 3000

// PassingBablokSample is the number of pairs drawn above
// PassingBablokExactMax: as many as there are pairs at that n.
const PassingBablokSample = PassingBablokExactMax * (PassingBablokExactMax - 1) / 2

const passingBablokSample = PassingBablokSample

// PassingBablokSampleError returns the standard deviation of the rank
// fraction of a Passing–Bablok order statistic taken from the sample of
// PassingBablokSample pairs, in units of the half-width of the slope's
// interval in rank fractions, at n rows and confidence conf: the sample
// quantile's fraction has SD √(p(1−p)/M) = 1/(2√M) at p ≈ 1/2 (binomial),
// and the interval's ends lie C/(2N) ≈ z·(n^{3/2}/3)/n² = z/(3√n) from the
// median in fraction (C of PassingBablok, N = n(n−1)/2 ≈ n²/2), so
//
//	error ≈ (1/(2√M)) / (z/(3√n)) = 1.5·√(n/M)/z,   z = z_{(1+conf)/2}
//
// — derived, and checked by resampling at n = 6000
// (TestPassingBablokSampleError: 0.024 against 0.028). Where the pairwise slopes' density is about
// constant across the interval it is also the error of the slope and of
// the interval's ends as a share of the half-width: 0.11 at n = 10⁵, 0.36
// at 10⁶, 1.1 at 10⁷ (95 %). NaN for n ≤ PassingBablokExactMax (nothing
// is sampled) or conf outside (0, 1).
func PassingBablokSampleError(n int, conf float64) float64 {
	if n <= PassingBablokExactMax || !(conf > 0 && conf < 1) {
		return math.NaN()
	}
	return 1.5 * math.Sqrt(float64(n)/PassingBablokSample) / NormalQuantile(0.5+conf/2)
}

// PassingBablokFit is the result of PassingBablok.
type PassingBablokFit struct {
	N       int
	Slopes  int  // pairwise slopes used (after the exclusions), sampled or not
	K       int  // how many of them are below −1 (the offset of the median)
	Sampled bool // true when the slopes come from a sample of pairs (n > PassingBablokExactMax)

	Intercept, Slope float64
	SlopeLo          float64 // rank-based interval of the slope
	SlopeHi          float64
	InterceptLo      float64 // median of y − SlopeHi·x
	InterceptHi      float64 // median of y − SlopeLo·x
}

// PassingBablok returns the Passing–Bablok regression of y on x (Passing,
// H. and Bablok, W. (1983), "A new biometrical procedure for testing the
// equality of measurements from two different analytical methods", J.
// Clin. Chem. Clin. Biochem. 21:709–720), a line for two methods whose
// errors may have any (but the same) distribution, resistant to outliers:
//
//  1. the slopes S_ij = (y_j − y_i)/(x_j − x_i) of all pairs i < j, leaving
//     out pairs with x_i = x_j and y_i = y_j and slopes of exactly −1; a
//     pair with x_i = x_j (only) has slope +∞;
//  2. K = #{S_ij < −1}; with the N slopes sorted (1-based), the slope is the
//     median shifted by K: S_((N+1)/2+K) for odd N, the mean of S_(N/2+K)
//     and S_(N/2+1+K) for even N — the shift makes the estimate equivariant
//     to swapping the methods (slope ↔ 1/slope);
//  3. its interval: C = z_{(1+conf)/2}·√(n(n−1)(2n+5)/18), M1 = round((N −
//     C)/2), M2 = N − M1 + 1, interval S_(M1+K) to S_(M2+K);
//  4. the intercept is the median of y_i − slope·x_i, its interval the
//     medians of y_i − SlopeHi·x_i and y_i − SlopeLo·x_i (as ordered).
//
// The paper assumes a positive slope (as two methods of one quantity
// have); with a negative one the shift rule is not meaningful.
//
// Cost: O(n²) time (the order statistics by quickselect, not a sort) and
// O(n²) memory for n ≤ PassingBablokExactMax.
// Above it, the N slopes are a uniform sample (with replacement) of
// passingBablokSample = 4 498 500 pairs, drawn by index into the rows sorted
// by (x, y) from a generator seeded by a hash of those sorted rows — so the result depends on the set
// of rows, not on their order — and the ranks of steps 2 and 3 are taken
// at the same fractions of the sample (C scaled by sample/all pairs). The
// sample adds an error to the rank fractions that grows against the
// interval as √n: PassingBablokSampleError, about 0.11 of the interval's
// half-width (1 SD) at n = 10⁵ and 1.1 at 10⁷.
//
// x and y must have equal length (it panics otherwise). Every figure is
// NaN when n < 2, a value is NaN or infinite, or no slope is left; the
// interval ends are NaN when their ranks fall outside 1..N.
func PassingBablok(x, y []float64, conf float64) PassingBablokFit {
	if len(x) != len(y) {
		panic("stats: PassingBablok: slice length mismatch")
	}
	n := len(x)
	nan := math.NaN()
	f := PassingBablokFit{N: n, Intercept: nan, Slope: nan, SlopeLo: nan, SlopeHi: nan,
		InterceptLo: nan, InterceptHi: nan}
	if n < 2 {
		return f
	}
	for i := range x {
		if math.IsNaN(x[i]) || math.IsInf(x[i], 0) || math.IsNaN(y[i]) || math.IsInf(y[i], 0) {
			return f
		}
	}
	var s []float64
	total := float64(n) * float64(n-1) / 2
	scale := 1.0
	if n <= PassingBablokExactMax {
		s = make([]float64, 0, n*(n-1)/2)
		for i := 0; i < n; i++ {
			for j := i + 1; j < n; j++ {
				if v, ok := pbSlope(x[i], y[i], x[j], y[j]); ok {
					s = append(s, v)
				}
			}
		}
	} else {
		f.Sampled = true
		xs, ys, s1, s2 := pbSortedSeed(x, y)
		rng := rand.New(rand.NewPCG(s1, s2))
		s = hugepage.Empty[float64](passingBablokSample)
		for range passingBablokSample {
			i := rng.IntN(n)
			j := rng.IntN(n - 1)
			if j >= i {
				j++
			}
			if v, ok := pbSlope(xs[i], ys[i], xs[j], ys[j]); ok {
				s = append(s, v)
			}
		}
		scale = passingBablokSample / total
	}
	N := len(s)
	f.Slopes = N
	if N == 0 {
		return f
	}
	// Order statistics by selection (selectInPlace, expected O(N)) rather
	// than a full sort: the shifted median and the two interval ranks.
	K := 0
	for _, v := range s {
		if v < -1 { // −1 itself was left out
			K++
		}
	}
	f.K = K
	lower, upper := -1, -1 // 1-based interval ranks, when asked for
	if conf > 0 && conf < 1 {
		fn := float64(n)
		c := NormalQuantile(0.5+conf/2) * math.Sqrt(fn*(fn-1)*(2*fn+5)/18) * scale
		m1 := int(math.Round((float64(N) - c) / 2))
		lower, upper = m1+K, N-m1+1+K
	}
	mid := (N+1)/2 + K // 1-based; for even N the mean of N/2+K and N/2+1+K
	if N%2 == 0 {
		mid = N/2 + K
	}
	if mid < 1 || mid > N || (N%2 == 0 && mid+1 > N) {
		return f
	}
	k := mid - 1
	med := selectInPlace(s, k)
	if N%2 == 0 {
		med = (med + slices.Min(s[k+1:])) / 2
	}
	f.Slope = med
	if math.IsNaN(f.Slope) || math.IsInf(f.Slope, 0) {
		f.Slope = nan
		return f
	}
	if lower >= 1 && lower <= N && upper >= 1 && upper <= N {
		switch {
		case lower-1 < k:
			f.SlopeLo = selectInPlace(s[:k], lower-1)
		case lower-1 == k:
			f.SlopeLo = s[k]
		default:
			f.SlopeLo = selectInPlace(s[k+1:], lower-1-k-1)
		}
		switch {
		case upper-1 > k:
			f.SlopeHi = selectInPlace(s[k+1:], upper-1-k-1)
		case upper-1 == k:
			f.SlopeHi = s[k]
		default:
			f.SlopeHi = selectInPlace(s[:k], upper-1)
		}
	}
	f.Intercept = pbMedianResidual(x, y, f.Slope)
	if !math.IsNaN(f.SlopeLo) && !math.IsInf(f.SlopeLo, 0) && !math.IsNaN(f.SlopeHi) && !math.IsInf(f.SlopeHi, 0) {
		a1, a2 := pbMedianResidual(x, y, f.SlopeHi), pbMedianResidual(x, y, f.SlopeLo)
		f.InterceptLo, f.InterceptHi = min(a1, a2), max(a1, a2)
	}
	return f
}

// pbSlope returns the slope of the pair and whether it counts.
func pbSlope(x1, y1, x2, y2 float64) (float64, bool) {
	dx, dy := x2-x1, y2-y1
	if dx == 0 {
		if dy == 0 {
			return 0, false
		}
		return math.Inf(1), true
	}
	v := dy / dx
	if v == -1 {
		return 0, false
	}
	return v, true
}

func pbMedianResidual(x, y []float64, b float64) float64 {
	r := hugepage.Make[float64](len(x))
	for i := range x {
		r[i] = y[i] - b*x[i]
	}
	return medianInPlace(r)
}

// pbSortedSeed returns the rows sorted by (x, y) and a hash of them
// (FNV-1a, 128 bits) as the two words of a PCG seed, so that the sample of
// pairs, drawn by index into the sorted rows, depends only on the set of
// rows.
func pbSortedSeed(x, y []float64) (xs, ys []float64, s1, s2 uint64) {
	// Two stable radix sorts (sortkey.go): by y, then by x.
	n := len(x)
	keys, kbuf := hugepage.Make[uint64](n), hugepage.Make[uint64](n)
	idx, ibuf := hugepage.Make[int32](n), hugepage.Make[int32](n)
	for i, v := range y {
		keys[i], idx[i] = floatKey(v), int32(i)
	}
	radixSort(keys, idx, kbuf, ibuf)
	for k, i := range idx {
		keys[k] = floatKey(x[i])
	}
	radixSort(keys, idx, kbuf, ibuf)
	h := fnv.New128a()
	var buf [16]byte
	xs, ys = hugepage.Make[float64](len(x)), hugepage.Make[float64](len(y))
	for k, i := range idx {
		xs[k], ys[k] = x[i], y[i]
		binary.LittleEndian.PutUint64(buf[:8], math.Float64bits(x[i]+0)) // +0 folds −0 into 0
		binary.LittleEndian.PutUint64(buf[8:], math.Float64bits(y[i]+0))
		h.Write(buf[:])
	}
	sum := h.Sum(nil)
	return xs, ys, binary.LittleEndian.Uint64(sum[:8]), binary.LittleEndian.Uint64(sum[8:])
}

// Concordance is the result of LinCCC.
type Concordance struct {
	N       int
	CCC     float64 // Lin's concordance correlation coefficient ρ_c
	Lo, Hi  float64 // its interval, back-transformed from Fisher's z
	ZSE     float64 // standard error of atanh(ρ_c), Lin's formula
	Pearson float64 // r, the precision component
	Cb      float64 // bias-correction factor ρ_c/r, the accuracy component
	U       float64 // location shift (x̄ − ȳ)/√(s_x·s_y)
	V       float64 // scale shift s_x/s_y
}

// LinCCC returns Lin's concordance correlation coefficient of x and y, the
// agreement of the pairs with the identity line y = x (Lin, L. I.-K.
// (1989), "A concordance correlation coefficient to evaluate
// reproducibility", Biometrics 45:255–268; the variance as corrected in
// Lin (2000), Biometrics 56:324–325). With moments of divisor n,
//
//	ρ_c = 2·s_xy / (s_x² + s_y² + (x̄ − ȳ)²) = r·C_b
//	u = (x̄ − ȳ)/√(s_x s_y)
//	var(atanh ρ_c) = 1/(n−2) · [ (1−r²)ρ_c² / ((1−ρ_c²) r²)
//	                 + 2ρ_c³(1−ρ_c)u² / (r(1−ρ_c²)²) − ρ_c⁴u⁴ / (2r²(1−ρ_c²)²) ]
//
// and the interval tanh(atanh ρ_c ∓ z_{(1+conf)/2}·SE). x and y must have
// equal length (it panics otherwise). ρ_c is NaN when n < 2, a value is NaN
// or infinite, or both columns are constant and equal; the interval is
// NaN when n < 3, r = 0 or |ρ_c| = 1.
func LinCCC(x, y []float64, conf float64) Concordance {
	if len(x) != len(y) {
		panic("stats: LinCCC: slice length mismatch")
	}
	n := len(x)
	nan := math.NaN()
	c := Concordance{N: n, CCC: nan, Lo: nan, Hi: nan, ZSE: nan, Pearson: nan, Cb: nan, U: nan, V: nan}
	if n < 2 {
		return c
	}
	m := CentredMoments(x, y)
	mx, my, sxx, syy, sxy := m.MeanX, m.MeanY, m.Sxx, m.Syy, m.Sxy
	fn := float64(n)
	sxx, syy, sxy = sxx/fn, syy/fn, sxy/fn
	if math.IsNaN(sxx+syy+sxy) || math.IsInf(sxx+syy+sxy, 0) {
		return c
	}
	den := sxx + syy + (mx-my)*(mx-my)
	if !(den > 0) {
		return c
	}
	c.CCC = 2 * sxy / den
	if sxx > 0 && syy > 0 {
		c.Pearson = sxy / math.Sqrt(sxx*syy)
		c.Cb = c.CCC / c.Pearson
		c.U = (mx - my) / math.Sqrt(math.Sqrt(sxx)*math.Sqrt(syy))
		c.V = math.Sqrt(sxx) / math.Sqrt(syy)
	}
	if n < 3 || !(conf > 0 && conf < 1) || math.IsNaN(c.Pearson) || c.Pearson == 0 || math.Abs(c.CCC) >= 1 {
		return c
	}
	r, p, u2 := c.Pearson, c.CCC, c.U*c.U
	q := 1 - p*p
	v := ((1-r*r)*p*p/(q*r*r) + 2*p*p*p*(1-p)*u2/(r*q*q) - p*p*p*p*u2*u2/(2*r*r*q*q)) / (fn - 2)
	if !(v > 0) {
		return c
	}
	c.ZSE = math.Sqrt(v)
	z := math.Atanh(p)
	h := NormalQuantile(0.5+conf/2) * c.ZSE
	c.Lo, c.Hi = math.Tanh(z-h), math.Tanh(z+h)
	return c
}
