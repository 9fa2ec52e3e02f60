package stats

// This file holds the distribution tails and quantiles every test uses,
// so that each is computed one way, accurately far into the tail.

import (
	"math"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"
)

// TwoSidedT returns P(|T| ≥ |t|) for Student's t with df degrees of
// freedom, from the regularised incomplete beta function:
//
//	P = I_{df/(df+t²)}(df/2, 1/2)
//
// (Abramowitz & Stegun 26.5.27 and 26.7.1), which keeps full relative
// precision in the far tail where 1 − CDF would cancel. It returns NaN for
// df ≤ 0 or a NaN t.
func TwoSidedT(t, df float64) float64 {
	if !(df > 0) || math.IsNaN(t) {
		return math.NaN()
	}
	if math.IsInf(t, 0) {
		return 0
	}
	return mathext.RegIncBeta(df/2, 0.5, df/(df+t*t))
}

// UpperF returns P(F ≥ f) for the F distribution with (d1, d2) degrees of
// freedom: I_{d2/(d2+d1·f)}(d2/2, d1/2) (Abramowitz & Stegun 26.6.2). Unlike
// distuv.F.Survival it does not floor near 1e-16.
func UpperF(f, d1, d2 float64) float64 {
	if !(d1 > 0) || !(d2 > 0) || math.IsNaN(f) {
		return math.NaN()
	}
	if f <= 0 {
		return 1
	}
	if math.IsInf(f, 1) {
		return 0
	}
	return mathext.RegIncBeta(d2/2, d1/2, d2/(d2+d1*f))
}

// TwoSidedNormal returns P(|Z| ≥ |z|) = erfc(|z|/√2) for a standard normal
// Z. math.Erfc keeps relative precision far out (z = 10 gives 1.5e-23),
// where distuv.Normal.Survival underflows to 0.
func TwoSidedNormal(z float64) float64 {
	if math.IsNaN(z) {
		return math.NaN()
	}
	return math.Erfc(math.Abs(z) / math.Sqrt2)
}

// UpperChi2 returns P(X ≥ x) for chi-squared with df degrees of freedom,
// the regularised upper incomplete gamma Q(df/2, x/2).
func UpperChi2(x, df float64) float64 {
	if !(df > 0) || math.IsNaN(x) {
		return math.NaN()
	}
	if x <= 0 {
		return 1
	}
	return mathext.GammaIncRegComp(df/2, x/2)
}

// TQuantile returns the p-quantile of Student's t with df degrees of
// freedom. Sigma must be set to 1: distuv.StudentsT with Sigma 0 returns 0
// for every quantile.
func TQuantile(p, df float64) float64 {
	if !(df > 0) {
		return math.NaN()
	}
	return distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}.Quantile(p)
}

// NormalQuantile returns the p-quantile of the standard normal.
func NormalQuantile(p float64) float64 {
	return distuv.UnitNormal.Quantile(p)
}

// FQuantile returns the p-quantile of F with (d1, d2) degrees of freedom.
func FQuantile(p, d1, d2 float64) float64 {
	if !(d1 > 0) || !(d2 > 0) {
		return math.NaN()
	}
	return distuv.F{D1: d1, D2: d2}.Quantile(p)
}
