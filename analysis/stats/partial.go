package stats

// This file holds the partial correlation of x and y given one covariate,
// the check for a lurking variable that carries the association.

import (
	"math"

	"bivar/internal/hugepage"
)

// PartialCorrelation returns the partial correlation of x and y given the
// covariate z, its confidence interval at level conf, and the two-sided p
// of H0: ρ_xy·z = 0.
//
// r is the Pearson correlation of the residuals of x and of y after each is
// regressed by least squares on [1, z] (Kendall & Stuart, The Advanced
// Theory of Statistics, vol. 2, partial correlation); that is algebraically
//
//	r = (r_xy − r_xz·r_yz) / √((1 − r_xz²)(1 − r_yz²))
//
// but the residual form keeps its digits when z is nearly collinear with x
// or y. Each residual is (v − v̄) − b·(z − z̄), b = Szv/Szz from centred sums
// (CentredMoments).
//
// Inference uses n − 3 degrees of freedom (one more parameter, z, than for
// r_xy):
//
//	t = r·√((n−3)/(1−r²)),      p = P(|T_{n−3}| ≥ |t|) (TwoSidedT)
//	(lo, hi) = tanh(atanh(r) ∓ z_{(1+conf)/2} / √(n−4))
//
// the Fisher-z interval with its variance 1/(n − k − 3) for k = 1
// controlled variable (Fisher 1924, "The distribution of the partial
// correlation coefficient", Metron 3; Anderson, An Introduction to
// Multivariate Statistical Analysis, 3rd ed., ch. 4).
//
// x, y and z must have equal length (it panics otherwise) and hold no NaN.
// r is NaN when n < 3, z is constant, or x or y is an exact linear function
// of z (nothing is left to correlate); p is NaN when n < 4; the interval is
// NaN when n < 5 or conf is outside (0, 1). |r| = 1 gives p = 0 and
// lo = hi = r.
func PartialCorrelation(x, y, z []float64, conf float64) (r, lo, hi, p float64) {
	if len(x) != len(y) || len(x) != len(z) {
		panic("stats: PartialCorrelation: x, y and z lengths differ")
	}
	nan := math.NaN()
	r, lo, hi, p = nan, nan, nan, nan
	n := len(x)
	if n < 3 {
		return
	}
	ex, ssx, okx := residOnOne(z, x)
	ey, ssy, oky := residOnOne(z, y)
	if !okx || !oky {
		return
	}
	var sxx, syy, sxy float64
	for i := range ex {
		sxx += ex[i] * ex[i]
		syy += ey[i] * ey[i]
		sxy += ex[i] * ey[i]
	}
	// Residual sums at rounding level (relative 1e-24, i.e. residuals ~1e-12
	// of the spread) mean x or y is a linear function of z: nothing is left.
	if !(sxx > 1e-24*ssx) || !(syy > 1e-24*ssy) {
		return
	}
	r = sxy / (math.Sqrt(sxx) * math.Sqrt(syy))
	r = math.Max(-1, math.Min(1, r))
	if n >= 4 {
		df := float64(n - 3)
		if math.Abs(r) == 1 {
			p = 0
		} else {
			t := r * math.Sqrt(df/((1-r)*(1+r)))
			p = TwoSidedT(t, df)
		}
	}
	if n >= 5 && conf > 0 && conf < 1 {
		if math.Abs(r) == 1 {
			lo, hi = r, r
		} else {
			half := NormalQuantile(0.5+conf/2) / math.Sqrt(float64(n-4))
			zr := math.Atanh(r)
			lo, hi = math.Tanh(zr-half), math.Tanh(zr+half)
		}
	}
	return
}

// residOnOne returns the least-squares residuals of v on [1, z],
// (v − v̄) − b·(z − z̄) with b = Szv/Szz from centred sums. ok is false when
// z is constant or not finite. ss is Σ(v − v̄)².
func residOnOne(z, v []float64) (e []float64, ss float64, ok bool) {
	m := CentredMoments(z, v)
	if !(m.Sxx > 0) || math.IsInf(m.Sxx, 0) {
		return nil, 0, false
	}
	b := m.Sxy / m.Sxx
	hz, lz, _ := meanParts(z) // two-part means: no digits lost to an offset
	hv, lv, _ := meanParts(v)
	e = hugepage.Make[float64](len(v))
	for i := range v {
		e[i] = ((v[i] - hv) - lv) - b*((z[i]-hz)-lz)
	}
	return e, m.Syy, true
}
