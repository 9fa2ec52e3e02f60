package stats

// This file holds standard errors of the straight line's slope that do not
// assume independent rows with an even scatter (HC3; Newey–West HAC), the
// lag-1 autocorrelation, and Bartlett's effective sample size for r.

import (
	"math"

	"bivar/internal/hugepage"
)

// lineParts returns the means of x and y, Sxx and the least-squares
// slope (two passes about the means); the residual of row i is then
// y_i − ȳ − slope·(x_i − x̄). No column is allocated: at 10⁷ rows the
// centred x and the residuals were 160 MB per call.
func lineParts(x, y []float64) (mx, my, sxx, slope float64) {
	n := len(x)
	for i := range x {
		mx += x[i]
		my += y[i]
	}
	mx /= float64(n)
	my /= float64(n)
	var sxy float64
	for i := range x {
		dx := x[i] - mx
		sxx += dx * dx
		sxy += dx * (y[i] - my)
	}
	return mx, my, sxx, sxy / sxx
}

// SlopeHC3 returns the least-squares slope of y on x and its
// heteroscedasticity-consistent standard error of type HC3 (MacKinnon &
// White 1985, J. Econometrics 29:305–325; Long & Ervin 2000, Am. Stat.
// 54:217–224, who recommend it for small samples): the slope element of
// (XᵀX)⁻¹ Xᵀ diag(e_i²/(1 − h_i)²) X (XᵀX)⁻¹, which for the straight line is
//
//	Var(b1) = Σ (x_i − x̄)² e_i² / (1 − h_i)² / Sxx²,  h_i = 1/n + (x_i − x̄)²/Sxx.
//
// It equals statsmodels' OLS(...).fit(cov_type="HC3").bse[1]. It does not
// assume an even scatter about the line; it does assume independent rows.
// x and y must have equal length (it panics otherwise); NaN when n < 3,
// x is constant, or a leverage is 1.
func SlopeHC3(x, y []float64) (slope, se float64) {
	if len(x) != len(y) {
		panic("stats: SlopeHC3: x and y lengths differ")
	}
	n := len(x)
	if n < 3 {
		return math.NaN(), math.NaN()
	}
	mx, my, sxx, b := lineParts(x, y)
	if !(sxx > 0) {
		return math.NaN(), math.NaN()
	}
	var s float64
	for i := range x {
		dx := x[i] - mx
		e := y[i] - my - b*dx
		h := 1/float64(n) + dx*dx/sxx
		if !(h < 1) {
			return b, math.NaN()
		}
		u := dx * e / (1 - h)
		s += u * u
	}
	return b, math.Sqrt(s) / sxx
}

// NeweyWestLags returns the number of lags floor(4·(n/100)^(2/9)), the
// rule of Newey & West (1994, "Automatic lag selection in covariance
// matrix estimation", Rev. Econ. Stud. 61:631–653) for the Bartlett kernel
// without data-driven selection; 0 for n < 1.
func NeweyWestLags(n int) int {
	if n < 1 {
		return 0
	}
	return int(math.Floor(4 * math.Pow(float64(n)/100, 2.0/9.0)))
}

// SlopeHAC returns the least-squares slope of y on x and its
// heteroscedasticity-and-autocorrelation-consistent standard error (Newey
// & West 1987, Econometrica 55:703–708), the rows taken in the order given
// (run order), with the Bartlett kernel over lags lags and no small-sample
// factor: with u_t = (x_t − x̄) e_t,
//
//	Var(b1) = [ Σ_t u_t² + 2 Σ_{l=1..L} (1 − l/(L+1)) Σ_{t>l} u_t u_{t−l} ] / Sxx²,
//
// the slope element of the sandwich (XᵀX)⁻¹ S (XᵀX)⁻¹. It equals
// statsmodels' OLS(y, add_constant(x)).fit(cov_type="HAC",
// cov_kwds={"maxlags": L}).bse[1], whose use_correction is False by
// default (no n/(n − k) factor). x and y must have equal length (it panics
// otherwise); NaN when n < 3, x is constant or lags < 0.
func SlopeHAC(x, y []float64, lags int) (slope, se float64) {
	if len(x) != len(y) {
		panic("stats: SlopeHAC: x and y lengths differ")
	}
	return slopeHAC(x, y, x, y, lags)
}

// SlopeHACRun is SlopeHAC with the line (means, Sxx and slope) taken from
// x and y as given, and the scores u_t from rx and ry: the same pairs in
// run order. Summing the line in one fixed order keeps its last bits
// those of the caller's other figures whatever the run order; one column
// of n (u) is its working memory. The four columns must have equal length
// (it panics otherwise).
func SlopeHACRun(x, y, rx, ry []float64, lags int) (slope, se float64) {
	if len(x) != len(y) || len(rx) != len(x) || len(ry) != len(x) {
		panic("stats: SlopeHACRun: lengths differ")
	}
	return slopeHAC(x, y, rx, ry, lags)
}

// slopeHAC is SlopeHAC with the line from x, y and the scores from rx, ry
// in run order.
func slopeHAC(x, y, rx, ry []float64, lags int) (slope, se float64) {
	n := len(x)
	if n < 3 || lags < 0 {
		return math.NaN(), math.NaN()
	}
	mx, my, sxx, b := lineParts(x, y)
	if !(sxx > 0) {
		return math.NaN(), math.NaN()
	}
	u := hugepage.Make[float64](n)
	var s float64
	for t := range u {
		dx := rx[t] - mx
		u[t] = dx * (ry[t] - my - b*dx)
		s += u[t] * u[t]
	}
	// The lagged products in blocks of t, every lag per block, so a block
	// is read from cache L times instead of u from memory L times (each
	// lag's sum is taken block by block, in ascending t). Four lags share
	// one pass over the block: their four sums are independent chains of
	// additions, which the processor overlaps, where one lag at a time
	// waited on each addition; each lag's sum is the same sequence of
	// operations either way.
	L := min(lags, n-1)
	c := make([]float64, L+1)
	const block = 2048
	for lo := 1; lo < n; lo += block {
		hi := min(lo+block, n)
		l := 1
		for ; l+3 <= L; l += 4 {
			// Rows below t0 lack a lagged partner for some of the four
			// lags: each lag starts at its own first row.
			t0 := max(lo, l+3)
			var a0, a1, a2, a3 float64
			for t := max(lo, l); t < t0 && t < hi; t++ {
				a0 += u[t] * u[t-l]
				if t >= l+1 {
					a1 += u[t] * u[t-l-1]
				}
				if t >= l+2 {
					a2 += u[t] * u[t-l-2]
				}
			}
			for t := t0; t < hi; t++ {
				v := u[t]
				a0 += v * u[t-l]
				a1 += v * u[t-l-1]
				a2 += v * u[t-l-2]
				a3 += v * u[t-l-3]
			}
			c[l] += a0
			c[l+1] += a1
			c[l+2] += a2
			c[l+3] += a3
		}
		for ; l <= L; l++ {
			var acc float64
			for t := max(lo, l); t < hi; t++ {
				acc += u[t] * u[t-l]
			}
			c[l] += acc
		}
	}
	for l := 1; l <= L; l++ {
		s += 2 * (1 - float64(l)/float64(lags+1)) * c[l]
	}
	if s < 0 { // cannot happen with the Bartlett kernel, which keeps S positive semi-definite
		return b, math.NaN()
	}
	return b, math.Sqrt(s) / sxx
}

// Lag1Autocorr returns the lag-1 autocorrelation of v in the order given,
// Σ_t (v_t − v̄)(v_{t+1} − v̄) / Σ_t (v_t − v̄)² (the usual estimator, as
// statsmodels.tsa.stattools.acf(v, nlags=1)[1]); NaN for n < 3 or
// constant v.
func Lag1Autocorr(v []float64) float64 {
	n := len(v)
	if n < 3 {
		return math.NaN()
	}
	var m float64
	for _, a := range v {
		m += a
	}
	m /= float64(n)
	var num, den float64
	for t, a := range v {
		d := a - m
		den += d * d
		if t+1 < n {
			num += d * (v[t+1] - m)
		}
	}
	if !(den > 0) {
		return math.NaN()
	}
	return num / den
}

// EffectiveN returns Bartlett's effective sample size for the correlation
// of two series observed in the same order, each taken as first-order
// autoregressive with lag-1 autocorrelations rhoX and rhoY:
//
//	n_eff = n (1 − ρx ρy) / (1 + ρx ρy)
//
// (Bartlett 1935, "Some aspects of the time-correlation problem in regard
// to tests of significance", J. R. Stat. Soc. 98:536–543; in this form
// eq. 31 of Bretherton, Widmann, Dymnikov, Wallace & Bladé 1999, "The
// effective number of spatial degrees of freedom of a time-varying
// field", J. Climate 12:1990–2009 — cited from memory). It is capped at n
// (negative ρx ρy would give more than n, a gain the approximation does
// not support) and NaN when either ρ is NaN.
func EffectiveN(n int, rhoX, rhoY float64) float64 {
	if math.IsNaN(rhoX) || math.IsNaN(rhoY) {
		return math.NaN()
	}
	p := rhoX * rhoY
	return math.Min(float64(n), float64(n)*(1-p)/(1+p))
}

// CorrelationEff returns the two-sided p of the t-test of r and its
// Fisher-z interval at confidence conf with an effective sample size neff
// in place of n: t = r √(neff − 2)/√(1 − r²) on neff − 2 degrees of
// freedom, and tanh(atanh r ± z_{(1+conf)/2}/√(neff − 3)). NaN when neff ≤ 3
// or |r| ≥ 1.
func CorrelationEff(r, neff, conf float64) (p, lo, hi float64) {
	if !(neff > 3) || !(math.Abs(r) < 1) {
		return math.NaN(), math.NaN(), math.NaN()
	}
	t := r * math.Sqrt(neff-2) / math.Sqrt(1-r*r)
	p = TwoSidedT(t, neff-2)
	z := math.Atanh(r)
	h := NormalQuantile((1+conf)/2) / math.Sqrt(neff-3)
	return p, math.Tanh(z - h), math.Tanh(z + h)
}
