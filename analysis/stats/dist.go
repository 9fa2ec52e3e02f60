package stats

// This file holds the distribution functions every test uses — the
// standard normal, Student's t, chi-squared and F: CDF, survival function
// and quantile, each computed one way, to full relative precision far into
// either tail and for degrees of freedom from below 1 to beyond 10⁹.
//
// Everything rests on two special functions, written here rather than
// taken from gonum because gonum's lose digits where bivar needs them
// (distuv.StudentsT.Quantile returned 81.7 for the 1 − 0.05/(2·10⁵)
// quantile at 10⁵ degrees of freedom, whose true value is 5.03, and
// mathext.RegIncBeta forms the log-beta of a large argument as a difference
// of log-gammas):
//
//   - the regularised incomplete gamma P(a, x), Q(a, x): the power series
//     and Legendre's continued fraction (Abramowitz & Stegun 6.5.29, 6.5.31);
//   - the regularised incomplete beta I_x(a, b): the continued fraction of
//     A&S 26.5.8, and for a large first argument the expansion in
//     incomplete gamma functions of DiDonato & Morris (1992), ACM TOMS 18,
//     Algorithm 708, §5 ("BGRAT"), derived in betaIncLargeA.
//
// Both take their power prefactors x^a·e^(−x)/Γ(a) and x^a·y^b/B(a, b) in
// the form of TOMS 708's BRCOMP: Stirling's series for the log-gammas, with
// the large terms cancelled analytically through ln(1+t) − t, so that no
// difference of two huge log-gammas is ever formed. Quantiles start from
// Wichura's normal quantile (AS 241), a Cornish–Fisher or tail expansion, or
// the Wilson–Hilferty cube, and are refined by safeguarded Newton steps on
// the logarithm of the tail probability against the logarithm of the
// quantile, so an upper-tail probability as small as 1e-300 never rounds
// through 1 − q.

import "math"

const (
	lnSqrt2Pi = 0.918938533204672741780329736406 // ln √(2π), https://oeis.org/A075700
	lnPi      = 1.14472988584940017414342735135  // ln π, https://oeis.org/A053510
)

// ---------------------------------------------------------------------------
// Normal

// NormalCDF returns P(Z ≤ z) = erfc(−z/√2)/2 for a standard normal Z.
// math.Erfc keeps relative precision in the far tail (NormalCDF(−37) is
// 5.7e-300); the rounding of z/√2 costs at most about z²·1.1e-16 relative
// error, 1.5e-13 at z = 37.
func NormalCDF(z float64) float64 { return 0.5 * math.Erfc(-z/math.Sqrt2) }

// NormalSurvival returns P(Z > z) = erfc(z/√2)/2, to the same precision as
// NormalCDF.
func NormalSurvival(z float64) float64 { return 0.5 * math.Erfc(z/math.Sqrt2) }

// TwoSidedNormal returns P(|Z| ≥ |z|) = erfc(|z|/√2) for a standard normal
// Z. It keeps relative precision far out (z = 10 gives 1.5e-23), where
// 1 − CDF would give 0.
func TwoSidedNormal(z float64) float64 {
	if math.IsNaN(z) {
		return math.NaN()
	}
	return math.Erfc(math.Abs(z) / math.Sqrt2)
}

// NormalQuantile returns the p-quantile of the standard normal by
// Wichura's algorithm AS 241 (PPND16; Applied Statistics 37:477–484, 1988),
// rational approximations good to about 1e-16 relative. Below p = 0.5 it
// works on p itself, so NormalQuantile(1e-300) = −37.05 keeps its digits;
// above, on 1 − p, which is exact there. It returns −Inf at 0, +Inf at 1
// and NaN outside [0, 1].
func NormalQuantile(p float64) float64 {
	switch {
	case !(p >= 0 && p <= 1):
		return math.NaN()
	case p == 0:
		return math.Inf(-1)
	case p == 1:
		return math.Inf(1)
	}
	q := p - 0.5
	if math.Abs(q) <= 0.425 {
		r := 0.180625 - q*q
		return q * as241Ratio(&as241CentralNum, &as241CentralDen, r)
	}
	r := p
	if q > 0 {
		r = 1 - p
	}
	r = math.Sqrt(-math.Log(r))
	var z float64
	if r <= 5 {
		z = as241Ratio(&as241MidNum, &as241MidDen, r-1.6)
	} else {
		z = as241Ratio(&as241TailNum, &as241TailDen, r-5)
	}
	if q < 0 {
		return -z
	}
	return z
}

// NormalQuantileUpper returns z with P(Z > z) = q, taking the upper-tail
// probability itself so that q = 1e-300 gives 37.05 rather than +Inf.
func NormalQuantileUpper(q float64) float64 { return -NormalQuantile(q) }

// as241Ratio evaluates num(r)/den(r), coefficients in increasing powers.
func as241Ratio(num, den *[8]float64, r float64) float64 {
	var n, d float64
	for i := 7; i >= 0; i-- {
		n = n*r + num[i]
		d = d*r + den[i]
	}
	return n / d
}

// The coefficients of AS 241 PPND16, as published (Wichura 1988, p. 480),
// in increasing powers.
var (
	as241CentralNum = [8]float64{3.387132872796366608, 133.14166789178437745, 1971.5909503065514427, 13731.693765509461125, 45921.953931549871457, 67265.770927008700853, 33430.575583588128105, 2509.0809287301226727}
	as241CentralDen = [8]float64{1, 42.313330701600911252, 687.1870074920579083, 5394.1960214247511077, 21213.794301586595867, 39307.89580009271061, 28729.085735721942674, 5226.495278852854561}
	as241MidNum     = [8]float64{1.42343711074968357734, 4.6303378461565452959, 5.7694972214606914055, 3.64784832476320460504, 1.27045825245236838258, 0.24178072517745061177, 0.0227238449892691845833, 7.7454501427834140764e-4}
	as241MidDen     = [8]float64{1, 2.05319162663775882187, 1.6763848301838038494, 0.68976733498510000455, 0.14810397642748007459, 0.0151986665636164571966, 5.475938084995344946e-4, 1.05075007164441684324e-9}
	as241TailNum    = [8]float64{6.6579046435011037772, 5.4637849111641143699, 1.7848265399172913358, 0.29656057182850489123, 0.026532189526576123093, 0.0012426609473880784386, 2.71155556874348757815e-5, 2.01033439929228813265e-7}
	as241TailDen    = [8]float64{1, 0.59983220655588793769, 0.13692988092273580531, 0.0148753612908506148525, 7.868691311456132591e-4, 1.8463183175100546818e-5, 1.4215117583164458887e-7, 2.04426310338993978564e-15}
)

// ---------------------------------------------------------------------------
// Student's t

// tArgs returns the arguments of the incomplete beta for Student's t:
// x = ν/(ν+t²), y = t²/(ν+t²) and w = x/2 − ν·y/2 = ν(1−t)(1+t)/(2(ν+t²)),
// each to a few ulps (y is not formed as 1 − x, which would lose every
// digit when t² ≪ ν, nor w from x and y, which would cancel; see brcomp).
func tArgs(t, df float64) (x, y, w float64) {
	t = math.Abs(t)
	if t > math.Sqrt(df) {
		r := df / t / t // ν/t² without overflow
		u := 1 / t
		return r / (1 + r), 1 / (1 + r), df * ((u - 1) * (u + 1)) / (2 * (1 + r))
	}
	r := t / df * t
	return 1 / (1 + r), r / (1 + r), (1 - t) * (1 + t) / (2 * (1 + r))
}

// tTails returns P(|T| ≥ |t|) and P(|T| < |t|) for Student's t, both to
// full relative precision: I_x(ν/2, 1/2) and its complement (A&S 26.7.1),
// x = ν/(ν+t²).
func tTails(t, df float64) (outside, inside float64) {
	if math.IsInf(t, 0) {
		return 0, 1
	}
	t = math.Abs(t)
	if t > 1e50*math.Sqrt(df) {
		// x = ν/(ν+t²) < 1e-100 may underflow: I_x(a, b) = x^a/(a·B(a, b))·(1 + O(x)).
		lnx := math.Log(df) - 2*math.Log(t) - math.Log1p(df/t/t)
		out := betaIncTinyX(df/2, 0.5, lnx)
		return out, 1 - out
	}
	x, y, w := tArgs(t, df)
	return betaInc(df/2, 0.5, x, y, w)
}

// betaIncTinyX returns I_x(a, b) = x^a·y^b/(a·B(a, b))·(1 + O(b·x)) for
// x < 1e-100 given ln x, where x itself may be below the range of a double
// (A&S 26.5.4; y^b = 1 to that precision).
func betaIncTinyX(a, b, lnx float64) float64 {
	return math.Exp(a*lnx - math.Log(a) - lnBeta(a, b))
}

// TwoSidedT returns P(|T| ≥ |t|) for Student's t with df degrees of
// freedom, the regularised incomplete beta I_{ν/(ν+t²)}(ν/2, 1/2)
// (Abramowitz & Stegun 26.7.1), within 2e-13 relative of mpmath for ν
// from 1 to 10⁹ and tails down to 1e-300 (TestDistReferenceTable). It
// returns NaN for df ≤ 0 or a NaN t.
func TwoSidedT(t, df float64) float64 {
	if !(df > 0) || math.IsNaN(t) {
		return math.NaN()
	}
	if math.IsInf(df, 1) {
		return TwoSidedNormal(t)
	}
	out, _ := tTails(t, df)
	return out
}

// TSurvival returns P(T > t) for Student's t with df degrees of freedom,
// to full relative precision in both tails; df = +Inf is the standard
// normal. NaN for df ≤ 0 or a NaN t.
func TSurvival(t, df float64) float64 {
	if !(df > 0) || math.IsNaN(t) {
		return math.NaN()
	}
	if math.IsInf(df, 1) {
		return NormalSurvival(t)
	}
	out, in := tTails(t, df)
	if t >= 0 {
		return out / 2
	}
	return 0.5 + in/2
}

// TCDF returns P(T ≤ t) for Student's t with df degrees of freedom.
func TCDF(t, df float64) float64 { return TSurvival(-t, df) }

// TQuantile returns the p-quantile of Student's t with df degrees of
// freedom: TQuantile(p) = −TQuantileUpper(p), and for p above 1/2,
// TQuantileUpper(1 − p), which is exact there. Within 1e-13 relative of
// mpmath for the double p given (TestDistReferenceTable); but a p near 1
// carries the rounding of 1 − q (1 − 2.5e-9 as a double moves the quantile
// by 1e-9 relative), so for a small upper-tail probability q call
// TQuantileUpper(q), which never forms 1 − q.
func TQuantile(p, df float64) float64 { return -TQuantileUpper(p, df) }

// TQuantileUpper returns t with P(T > t) = q for Student's t with df degrees
// of freedom. The start is the exact quantile for ν = 1 (cot πq) and ν = 2,
// otherwise the smaller of the Cornish–Fisher expansion about the normal
// quantile (A&S 26.7.5, three terms) and the root of the tail asymptote
// P(T > t) ≈ ν^(ν/2−1)·t^(−ν)/B(ν/2, 1/2), which bounds the quantile from
// above; safeguarded Newton steps on ln P(T > t) against ln t (or, for q
// in [1/4, 1/2), on ln P(0 < T < t) = ln(1/2 − q)) finish it. It returns
// NaN for df ≤ 0 or q outside [0, 1], +Inf at q = 0 and −Inf at q = 1.
func TQuantileUpper(q, df float64) float64 {
	switch {
	case !(df > 0) || !(q >= 0 && q <= 1):
		return math.NaN()
	case q == 0:
		return math.Inf(1)
	case q == 1:
		return math.Inf(-1)
	case q == 0.5:
		return 0
	case q > 0.5:
		return -TQuantileUpper(1-q, df)
	case math.IsInf(df, 1):
		return NormalQuantileUpper(q)
	}
	var t0 float64
	switch df {
	case 1:
		t0 = 1 / math.Tan(math.Pi*q)
	case 2:
		t0 = (1 - 2*q) / math.Sqrt(2*q*(1-q))
	default:
		z := NormalQuantileUpper(q)
		z2 := z * z
		t0 = z * (1 + (z2+1)/(4*df) + ((5*z2+16)*z2+3)/(96*df*df) + (((3*z2+19)*z2+17)*z2-15)/(384*df*df*df))
		lnK := (df/2-1)*math.Log(df) - lnBeta(df/2, 0.5)
		if t1 := math.Exp((lnK - math.Log(q)) / df); t1 < t0 || !(t0 > 0) {
			t0 = t1
		}
	}
	a := df / 2
	if q >= 0.25 {
		// Near the centre solve P(0 < T < t) = 1/2 − q (exact here).
		target := math.Log(0.5 - q)
		return solveLogProb(target, true, t0, func(t float64) (float64, float64) {
			x, y, w := tArgs(t, df)
			_, in := tTails(t, df)
			return math.Log(in / 2), 2 * brcomp(a, 0.5, x, y, w) / in
		})
	}
	return solveLogProb(math.Log(q), false, t0, func(t float64) (float64, float64) {
		out, _ := tTails(t, df)
		if t > 1e50*math.Sqrt(df) {
			return math.Log(out / 2), -df // P(T > t) ∝ t^(−ν) out there
		}
		x, y, w := tArgs(t, df)
		return math.Log(out / 2), -2 * brcomp(a, 0.5, x, y, w) / out
	})
}

// ---------------------------------------------------------------------------
// Chi-squared

// Chi2CDF returns P(X ≤ x) for chi-squared with df degrees of freedom, the
// regularised lower incomplete gamma P(df/2, x/2). NaN for df ≤ 0 or NaN x.
func Chi2CDF(x, df float64) float64 {
	if !(df > 0) || math.IsNaN(x) {
		return math.NaN()
	}
	if x <= 0 {
		return 0
	}
	p, _ := gammaInc(df/2, x/2)
	return p
}

// UpperChi2 returns P(X ≥ x) for chi-squared with df degrees of freedom,
// the regularised upper incomplete gamma Q(df/2, x/2), to full relative
// precision in the far tail. NaN for df ≤ 0 or NaN x.
func UpperChi2(x, df float64) float64 {
	if !(df > 0) || math.IsNaN(x) {
		return math.NaN()
	}
	if x <= 0 {
		return 1
	}
	_, q := gammaInc(df/2, x/2)
	return q
}

// Chi2Quantile returns x with P(X ≤ x) = p for chi-squared with df degrees
// of freedom (for p above 1/2 through Chi2QuantileUpper(1 − p), exact
// there). The start is the Wilson–Hilferty cube (A&S 26.4.17) or, deep in
// the lower tail, the root of P(a, x/2) ≈ (x/2)^a/Γ(a+1); safeguarded Newton
// steps on ln P against ln x finish it. NaN for df ≤ 0 or p outside [0, 1].
func Chi2Quantile(p, df float64) float64 {
	switch {
	case !(df > 0) || !(p >= 0 && p <= 1):
		return math.NaN()
	case p > 0.5:
		return Chi2QuantileUpper(1-p, df)
	}
	return chi2Solve(p, df, true)
}

// Chi2QuantileUpper returns x with P(X > x) = q for chi-squared with df
// degrees of freedom, without forming 1 − q.
func Chi2QuantileUpper(q, df float64) float64 {
	switch {
	case !(df > 0) || !(q >= 0 && q <= 1):
		return math.NaN()
	case q > 0.5:
		return Chi2Quantile(1-q, df)
	}
	return chi2Solve(q, df, false)
}

// chi2Solve inverts the lower (lower = true) or upper tail at prob ≤ 1/2.
func chi2Solve(prob, df float64, lower bool) float64 {
	if prob == 0 {
		if lower {
			return 0
		}
		return math.Inf(1)
	}
	a := df / 2
	z := NormalQuantileUpper(prob)
	if lower {
		z = -z
	}
	c := 2 / (9 * df)
	x0 := df * math.Pow(math.Max(1-c+z*math.Sqrt(c), 0), 3)
	if lower {
		lg, _ := math.Lgamma(a + 1)
		if xs := 2 * math.Exp((math.Log(prob)+lg)/a); !(x0 > xs) {
			x0 = xs
		}
	}
	if !(x0 > 0) || math.IsInf(x0, 0) {
		x0 = df
	}
	return solveLogProb(math.Log(prob), lower, x0, func(x float64) (float64, float64) {
		h := x / 2
		p, q := gammaInc(a, h)
		d := math.Exp(gammaLogPrefactor(a, h)) // h^a e^(−h)/Γ(a) = d P/d ln h
		if lower {
			return math.Log(p), d / p
		}
		return math.Log(q), -d / q
	})
}

// ---------------------------------------------------------------------------
// F

// fArgs returns the arguments of the incomplete beta for F:
// x = d2/(d2 + d1·f), y = d1·f/(d2 + d1·f) and
// w = (d1/2)·x − (d2/2)·y = d1·d2·(1 − f)/(2(d2 + d1·f)), each to a few ulps
// (1 − f is exact near f = 1, where w from x and y would cancel).
func fArgs(f, d1, d2 float64) (x, y, w float64) {
	if d1*f > d2 {
		r := d2 / d1 / f
		return r / (1 + r), 1 / (1 + r), d2 * ((1 - f) / f) / (2 * (1 + r))
	}
	r := d1 / d2 * f
	return 1 / (1 + r), r / (1 + r), d1 * (1 - f) / (2 * (1 + r))
}

// UpperF returns P(F ≥ f) for the F distribution with (d1, d2) degrees of
// freedom: I_{d2/(d2+d1·f)}(d2/2, d1/2) (Abramowitz & Stegun 26.6.2), to
// full relative precision far into the tail. NaN for d1 or d2 ≤ 0 or NaN f.
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
	if f > 1e100*d2/d1 {
		return betaIncTinyX(d2/2, d1/2, fLnX(f, d1, d2))
	}
	x, y, w := fArgs(f, d1, d2)
	up, _ := betaInc(d2/2, d1/2, x, y, w)
	return up
}

// fLnX returns ln(d2/(d2 + d1·f)) for d1·f ≫ d2 without overflow.
func fLnX(f, d1, d2 float64) float64 {
	return math.Log(d2/d1) - math.Log(f) - math.Log1p(d2/d1/f)
}

// FCDF returns P(F ≤ f) for the F distribution with (d1, d2) degrees of
// freedom, I_{d1·f/(d2+d1·f)}(d1/2, d2/2), to full relative precision in
// the lower tail.
func FCDF(f, d1, d2 float64) float64 {
	if !(d1 > 0) || !(d2 > 0) || math.IsNaN(f) {
		return math.NaN()
	}
	if f <= 0 {
		return 0
	}
	if math.IsInf(f, 1) {
		return 1
	}
	if f > 1e100*d2/d1 {
		return 1 - betaIncTinyX(d2/2, d1/2, fLnX(f, d1, d2))
	}
	x, y, w := fArgs(f, d1, d2)
	_, low := betaInc(d2/2, d1/2, x, y, w)
	return low
}

// FQuantile returns f with P(F ≤ f) = p for F with (d1, d2) degrees of
// freedom (for p above 1/2 through FQuantileUpper(1 − p), exact there).
// The start is the normal approximation to ln F (mean 1/d2 − 1/d1,
// variance 2/d1 + 2/d2); safeguarded Newton steps on ln P against ln f
// finish it. NaN for d1 or d2 ≤ 0 or p outside [0, 1].
func FQuantile(p, d1, d2 float64) float64 {
	switch {
	case !(d1 > 0) || !(d2 > 0) || !(p >= 0 && p <= 1):
		return math.NaN()
	case p > 0.5:
		return FQuantileUpper(1-p, d1, d2)
	}
	return fSolve(p, d1, d2, true)
}

// FQuantileUpper returns f with P(F > f) = q for F with (d1, d2) degrees of
// freedom, without forming 1 − q.
func FQuantileUpper(q, d1, d2 float64) float64 {
	switch {
	case !(d1 > 0) || !(d2 > 0) || !(q >= 0 && q <= 1):
		return math.NaN()
	case q > 0.5:
		return FQuantile(1-q, d1, d2)
	}
	return fSolve(q, d1, d2, false)
}

func fSolve(prob, d1, d2 float64, lower bool) float64 {
	if prob == 0 {
		if lower {
			return 0
		}
		return math.Inf(1)
	}
	z := NormalQuantileUpper(prob)
	if lower {
		z = -z
	}
	f0 := math.Exp(1/d2 - 1/d1 + z*math.Sqrt(2/d1+2/d2))
	a, b := d2/2, d1/2
	return solveLogProb(math.Log(prob), lower, f0, func(f float64) (float64, float64) {
		if !lower && f > 1e100*d2/d1 {
			return math.Log(UpperF(f, d1, d2)), -a // P(F > f) ∝ f^(−d2/2) out there
		}
		x, y, w := fArgs(f, d1, d2)
		up, low := betaInc(a, b, x, y, w)
		d := brcomp(a, b, x, y, w) // −dI_x(a, b)/d ln f
		if lower {
			return math.Log(low), d / low
		}
		return math.Log(up), -d / up
	})
}

// ---------------------------------------------------------------------------
// Root finding

// solveLogProb returns the x > 0 with lnProb(x) = target, where lnProb
// (returned by eval with its derivative against ln x) increases in x when
// increasing is true and decreases otherwise. It works on v = ln x: Newton
// steps from ln x0 are kept inside the bracket found so far and replaced by
// bisection (or, while one side is open, by a doubling step) when they
// leave it, until a Newton step is below 1e-11 in v (convergence is
// quadratic, so the next would be below 1e-16 relative). A last Newton step
// is taken on x itself, x·(1 − g/slope), because e^v for v = ln x rounded
// is off by up to |v| ulps of x. A root beyond the range of a double gives
// +Inf or 0.
func solveLogProb(target float64, increasing bool, x0 float64, eval func(x float64) (lnProb, slope float64)) float64 {
	const vmax = 709.78 // expv(vmax) = 1.7973e308, just below the largest double
	vmin := math.Log(math.SmallestNonzeroFloat64)
	lo, hi := math.Inf(-1), math.Inf(1)
	v, stride := math.Max(vmin, math.Min(vmax, math.Log(x0))), 1.0
	for range 400 {
		lp, slope := eval(expv(v))
		g := lp - target
		if !increasing {
			g, slope = -g, -slope
		}
		switch {
		case g == 0:
			return expv(v)
		case g < 0:
			if v >= vmax {
				return math.Inf(1)
			}
			lo = v
		case g > 0:
			if v <= vmin {
				return 0
			}
			hi = v
		default:
			return math.NaN() // eval gave NaN
		}
		next := v - g/slope
		scale := math.Max(1, math.Abs(v))
		if math.Abs(next-v) <= 1e-11*scale {
			v = next // converged (a step that rounds to nothing included)
			break
		}
		if !(next > lo && next < hi) {
			switch {
			case !math.IsInf(lo, 0) && !math.IsInf(hi, 0):
				next = lo + (hi-lo)/2
			case math.IsInf(hi, 0):
				next = lo + stride
				stride *= 2
			default:
				next = hi - stride
				stride *= 2
			}
		}
		next = math.Max(vmin, math.Min(vmax, next))
		if hi-lo <= 1e-15*scale || next == v {
			v = next
			break
		}
		v = next
	}
	x := expv(v)
	if lp, slope := eval(x); !math.IsInf(x, 0) && x > 0 {
		g := lp - target
		if !increasing {
			g, slope = -g, -slope
		}
		if step := g / slope; math.Abs(step) < 1e-8 {
			x -= x * step
		}
	}
	return x
}

// expv returns e^v up to the largest double: math.Exp on amd64 returns +Inf
// from about v = 709.6 (Go 1.26), below ln(MaxFloat64) = 709.78.
func expv(v float64) float64 {
	if v > 700 {
		return math.Exp(v-700) * math.Exp(700)
	}
	return math.Exp(v)
}

// ---------------------------------------------------------------------------
// Special functions

// stirlingDelta returns δ(z) = ln Γ(z) − [(z − 1/2)·ln z − z + ln √(2π)],
// the remainder of Stirling's series: for z ≥ 10 from the series
// Σ B₂ₖ/(2k(2k−1)·z^(2k−1)) (A&S 6.1.40) to B₁₆, below that from
// math.Lgamma (whose absolute error is then below 1e-15).
func stirlingDelta(z float64) float64 {
	if z >= 10 {
		r := 1 / z
		r2 := r * r
		return r * (1.0/12 + r2*(-1.0/360+r2*(1.0/1260+r2*(-1.0/1680+r2*(1.0/1188+r2*(-691.0/360360+r2*(1.0/156-r2*3617.0/122400)))))))
	}
	lg, _ := math.Lgamma(z)
	return lg - ((z-0.5)*math.Log(z) - z + lnSqrt2Pi)
}

// log1pmx returns ln(1+t) − t for t > −1 without cancellation: for
// t in [−1/2, 1] as 2·(s³/3 + s⁵/5 + …) − s·t with s = t/(2+t), from
// ln(1+t) = 2·artanh(s) (the device of TOMS 708's RLOG1).
func log1pmx(t float64) float64 {
	if t < -0.5 || t > 1 {
		return math.Log1p(t) - t
	}
	s := t / (2 + t)
	s2 := s * s
	sum, pow := 0.0, s*s2
	for k := 3.0; k < 200; k += 2 {
		c := pow / k
		sum += c
		if math.Abs(c) <= 1e-17*math.Abs(sum) {
			break
		}
		pow *= s2
	}
	return 2*sum - s*t
}

// lnBeta returns ln B(a, b), through Stirling's series where an argument is
// large so that no two large log-gammas are subtracted.
func lnBeta(a, b float64) float64 {
	if a < b {
		a, b = b, a
	}
	if a < 10 {
		la, _ := math.Lgamma(a)
		lb, _ := math.Lgamma(b)
		lab, _ := math.Lgamma(a + b)
		return la + lb - lab
	}
	// ln Γ(a+b) − ln Γ(a) = a·(ln(1+b/a) − b/a) − ln(1+b/a)/2 + b·ln(a+b) + δ(a+b) − δ(a)
	lb, _ := math.Lgamma(b)
	diff := a*log1pmx(b/a) - 0.5*math.Log1p(b/a) + b*math.Log(a+b) + stirlingDelta(a+b) - stirlingDelta(a)
	return lb - diff
}

// gammaLogPrefactor returns ln(x^a·e^(−x)/Γ(a)) as
// a·(ln(1+t) − t) + ln(a)/2 − ln √(2π) − δ(a) with t = (x − a)/a, which is
// exact algebra on Stirling's form of ln Γ(a) and keeps its precision for
// a near 10⁹ (TOMS 708's RCOMP).
func gammaLogPrefactor(a, x float64) float64 {
	t := (x - a) / a
	var phi float64
	if t < -0.5 {
		phi = math.Log(x/a) - t // x/a loses nothing that ln needs; t+1 would
	} else {
		phi = log1pmx(t)
	}
	return a*phi + 0.5*math.Log(a) - lnSqrt2Pi - stirlingDelta(a)
}

// gammaInc returns the regularised incomplete gamma functions P(a, x) and
// Q(a, x) = 1 − P(a, x) for a > 0, x ≥ 0, the smaller one computed directly:
// for x < a + 1 the series P = x^a e^(−x)/Γ(a+1)·Σ xⁿ/((a+1)…(a+n))
// (A&S 6.5.29), otherwise Legendre's continued fraction for Q (A&S 6.5.31)
// by the modified Lentz method (Numerical Recipes, 3rd ed., §6.2 and §5.2).
// Near x = a both need O(√a) terms and lose digits as a grows, so for
// a ≥ 100 and x/a in (0.4, 2.5) Temme's expansion is used instead
// (gammaIncTemme); outside that band the series and fraction converge in a
// few dozen terms.
func gammaInc(a, x float64) (p, q float64) {
	switch {
	case math.IsNaN(x) || math.IsNaN(a):
		return math.NaN(), math.NaN()
	case x <= 0:
		return 0, 1
	case math.IsInf(x, 1):
		return 1, 0
	}
	if a >= 100 {
		if t := (x - a) / a; t > -0.6 && t < 1.5 { // |η| ≤ 1 (λ = 0.45 gives η = −0.96, λ = 2.5 gives 0.99)
			return gammaIncTemme(a, t)
		}
	}
	lnD := gammaLogPrefactor(a, x)
	if x < a+1 {
		sum, term := 1.0, 1.0
		for n := 1.0; n < 1e8; n++ {
			term *= x / (a + n)
			sum += term
			if term <= 1e-17*sum {
				break
			}
		}
		p = math.Exp(lnD-math.Log(a)) * sum
		return p, 1 - p
	}
	const tiny = 1e-300
	bb := x + 1 - a
	c := 1 / tiny
	d := 1 / bb
	h := d
	for i := 1.0; i < 1e8; i++ {
		an := -i * (i - a)
		bb += 2
		d = an*d + bb
		if math.Abs(d) < tiny {
			d = tiny
		}
		c = bb + an/c
		if math.Abs(c) < tiny {
			c = tiny
		}
		d = 1 / d
		del := d * c
		h *= del
		if math.Abs(del-1) <= 1e-16 {
			break
		}
	}
	q = math.Exp(lnD) * h
	return 1 - q, q
}

// gammaIncTemme returns P(a, x) and Q(a, x) for a ≥ 100 and |η| ≤ 1 by
// Temme's uniform asymptotic expansion (Temme 1979, SIAM J. Math. Anal.
// 10:757–766; DLMF 8.12.3–8.12.8; DiDonato & Morris 1986, ACM TOMS 12,
// Algorithm 654, use the same),
//
//	Q(a, x) = erfc(η·√(a/2))/2 + R,  P(a, x) = erfc(−η·√(a/2))/2 − R,
//	R = e^(−aη²/2)/√(2πa) · Σₖ cₖ(η)·a^(−k),  η²/2 = λ − 1 − ln λ,  λ = x/a = 1 + t,
//
// the smaller of P and Q taken directly. The cₖ, k ≤ 4, are summed from
// their Taylor series in η (temmeC); against mpmath 1.2.1 gammainc the
// truncated expansion is within 3e-14 relative at a = 100 and far closer
// for larger a. Unlike the series and continued fraction, whose length
// grows like √a near x = a, it costs the same for a = 10⁹.
func gammaIncTemme(a, t float64) (p, q float64) {
	h := -log1pmx(t) // η²/2
	eta := math.Sqrt(2 * h)
	if t < 0 {
		eta = -eta
	}
	var sum float64
	ia, pw := 1/a, 1.0
	for k := range temmeC {
		c := &temmeC[k]
		var ck float64
		for n := len(c) - 1; n >= 0; n-- {
			ck = ck*eta + c[n]
		}
		sum += ck * pw
		pw *= ia
	}
	r := math.Exp(-a*h) / math.Sqrt(2*math.Pi*a) * sum
	y := math.Sqrt(a * h) // |η|·√(a/2)
	if t >= 0 {
		q = 0.5*math.Erfc(y) + r
		return 1 - q, q
	}
	p = 0.5*math.Erfc(y) - r
	return p, 1 - p
}

// temmeC[k][n] is the coefficient of ηⁿ in Temme's cₖ(η), from
// testdata/gen_temme_coef.py (mpmath 1.2.1, power series at 60 digits;
// the script reports: g_k found: -0.0833333333333, 0.00347222222222, 0.00268132716049, -0.000229472093621; largest relative error against mpmath.gammainc for a >= 100, |eta| <= 1: 3.0e-14),
// printed to 20 digits. c₀ = −1/3 + η/12 − …, c₁ = −1/540 − …
var temmeC = [5][30]float64{
	{-3.3333333333333333333e-1, 8.3333333333333333333e-2, -1.4814814814814814815e-2, 1.1574074074074074074e-3, 3.5273368606701940035e-4, -1.787551440329218107e-4, 3.9192631785224377817e-5, -2.1854485106799921615e-6, -1.8540622107151599607e-6, 8.296711340953086005e-7, -1.7665952736826079304e-7, 6.7078535434014985804e-9, 1.0261809784240308043e-8, -4.3820360184533531866e-9, 9.1476995822367902342e-10, -2.5514193994946249767e-11, -5.8307721325504250675e-11, 2.4361948020667416244e-11, -5.0276692801141755891e-12, 1.1004392031956134771e-13, 3.3717632624009853788e-13, -1.3923887224181620659e-13, 2.8534893807047443204e-14, -5.139111834242572619e-16, -1.9752288294349442835e-15, 8.0995211567045613341e-16, -1.6522531216398161819e-16, 2.5305430097478884233e-18, 1.1686939738559576589e-17, -4.7700370498204847582e-18},
	{-1.8518518518518518519e-3, -3.4722222222222222222e-3, 2.6455026455026455026e-3, -9.9022633744855967078e-4, 2.0576131687242798354e-4, -4.0187757201646090535e-7, -1.8098550334489977837e-5, 7.6491609160811100846e-6, -1.6120900894563446004e-6, 4.6471278028074343423e-9, 1.3786334469157209593e-7, -5.752545603517704964e-8, 1.1951628599778147324e-8, -1.7543241719747647624e-11, -1.0091543710600412627e-9, 4.1627929918425826362e-10, -8.5639070264929806381e-11, 6.0672151016047586151e-14, 7.1624989648114853901e-12, -2.9331866437714371174e-12, 5.9966963656836887233e-13, -2.1671786527323314102e-16, -4.9783399723692616405e-14, 2.0291628823713424774e-14, -4.1312557138106100494e-15, 8.2865162398830964438e-19, 3.4100308869333327934e-16, -1.3854195302893971536e-16, 2.8123466532288746657e-17, -3.4064441941430288053e-21},
	{4.1335978835978835979e-3, -2.6813271604938271605e-3, 7.7160493827160493827e-4, 2.0093878600823045267e-6, -1.0736653226365160522e-4, 5.2923448829120125416e-5, -1.2760635188618727713e-5, 3.4235787340961380742e-8, 1.3721957309062933206e-6, -6.2989921383800550229e-7, 1.4280614206064241792e-7, -2.0477098421990866015e-10, -1.4092529910867521053e-8, 6.2289740849220220336e-9, -1.3670488396617113499e-9, 9.4283561590146781955e-13, 1.287225240008931806e-10, -5.5645956134363321147e-11, 1.1975935546366981004e-11, -4.168978225183863504e-15, -1.094064042788459441e-12, 4.6622399463901357463e-13, -9.9051057639069059784e-14, 1.8931876768373514506e-17, 8.8592218725911272618e-15, -3.7378203980464054531e-15, 7.8688336390351552577e-16, -9.0000273957412111661e-20, -6.9288812293476717204e-17, 2.9020384270164783353e-17},
	{6.4943415637860082305e-4, 2.2947209362139917695e-4, -4.6918949439525571213e-4, 2.6772063206283885296e-4, -7.5618016718839764107e-5, -2.3965051138672966519e-7, 1.1082654115347302361e-5, -5.6749528269915965675e-6, 1.4230900732435883915e-6, -2.7861080291528142241e-11, -1.695840409193027729e-7, 8.0994649053880823634e-8, -1.9111168485973654061e-8, 2.3928620439808117969e-12, 2.0620131815488798437e-9, -9.4604966618551321738e-10, 2.1541049775774907838e-10, -1.388823336813903046e-14, -2.1894761681963939406e-11, 9.7909989511716851257e-12, -2.1782191880180962115e-12, 6.2088195734079014258e-17, 2.126978363279736977e-13, -9.3446887915174333313e-14, 2.0453671226782849325e-14, -2.5826079040349502133e-19, -1.9405297673344544368e-15, 8.4159792904848155204e-16, -1.8200430439538225214e-16, 1.0735443641247309963e-21},
	{-8.618882909167116986e-4, 7.8403922172006662747e-4, -2.9907248030319017973e-4, -1.4638452578843418178e-6, 6.6414982154651221867e-5, -3.9683650471794346644e-5, 1.1375726970678419098e-5, 2.5074972262375328017e-10, -1.6954149536558306015e-6, 8.9075075322053096888e-7, -2.2929348340008048706e-7, 2.956794137544049047e-11, 2.886582974270878363e-8, -1.4189739437803219389e-8, 3.4463580499464897066e-9, -2.3024517174528067132e-13, -3.9409233028046405275e-10, 1.8602338968504501913e-10, -4.3563230050566180438e-11, 1.2786001016296231266e-15, 4.679275026657919462e-12, -2.1492464706134828541e-12, 4.9088156148096521632e-13, -6.338591484891560326e-18, -5.0453320690800943573e-14, 2.2722958222901285924e-14, -5.0960826084724015419e-15, 3.0552097557171354189e-20, 5.069021676310551565e-16, -2.2493836956481809763e-16},
}

// brcomp returns x^a·y^b/B(a, b) for x + y = 1, given x, y and
// w = b·x − a·y each to full precision (near the mean w is a small
// difference of large terms; the callers form it from their own arguments
// without that cancellation, which would otherwise cost up to 1e-11 at
// 10⁶ degrees of freedom), in TOMS 708's BRCOMP form:
//
//	ln = a·φ(w/a) + b·φ(−w/b) + ln √(ab/(a+b)) − ln √(2π) + δ(a+b) − δ(a) − δ(b),
//
// φ(t) = ln(1+t) − t, which is exact algebra on Stirling's series and has
// no large cancelling terms.
func brcomp(a, b, x, y, w float64) float64 {
	if x <= 0 || y <= 0 {
		return 0
	}
	lnab := math.Log(a + b)
	ln := a*phiRatio(w/a, x, math.Log(a)-lnab) + b*phiRatio(-w/b, y, math.Log(b)-lnab) +
		0.5*(math.Log(a)+math.Log(b)-lnab) - lnSqrt2Pi + stirlingDelta(a+b) - stirlingDelta(a) - stirlingDelta(b)
	return math.Exp(ln)
}

// phiRatio returns ln(z/z₀) − (z/z₀ − 1) given t = z/z₀ − 1 and ln z₀: by
// log1pmx(t) near t = 0, and from the logarithms themselves where
// z/z₀ is small (t + 1 would have lost z/z₀).
func phiRatio(t, z, lnz0 float64) float64 {
	if t < -0.5 {
		return math.Log(z) - lnz0 - t
	}
	return log1pmx(t)
}

// betaInc returns the regularised incomplete beta I_x(a, b) and its
// complement 1 − I_x(a, b) = I_y(b, a), for a, b > 0 and x + y = 1 with
// x, y and w = b·x − a·y given to full precision (see brcomp). The side below the mean
// (x < (a+1)/(a+b+2), where I ≤ about 1/2) is computed directly and the
// other as its complement, so both results keep their relative precision.
func betaInc(a, b, x, y, w float64) (lower, upper float64) {
	switch {
	case math.IsNaN(x) || math.IsNaN(y):
		return math.NaN(), math.NaN()
	case x <= 0:
		return 0, 1
	case y <= 0:
		return 1, 0
	}
	swap := x*(a+b+2) > a+1
	if swap {
		a, b, x, y, w = b, a, y, x, -w
	}
	i := betaIncLower(a, b, x, y, w)
	if swap {
		return 1 - i, i
	}
	return i, 1 - i
}

// betaIncLower returns I_x(a, b) on the lower side of the mean.
func betaIncLower(a, b, x, y, w float64) float64 {
	if a >= 15 && y <= 0.5 {
		if i, ok := betaIncLargeA(a, b, y); ok {
			return i
		}
	}
	return betaIncFrac(a, b, x, y, w)
}

// betaIncFrac returns I_x(a, b) = x^a y^b/(a·B(a, b))·(1/(1+ d₁/(1+ d₂/(1+ …))))
// by the continued fraction of A&S 26.5.8, evaluated by the modified Lentz
// method (Numerical Recipes, 3rd ed., §6.4). It converges fast below the
// mean; within O(√(a+b)) terms when x is near it.
func betaIncFrac(a, b, x, y, w float64) float64 {
	const tiny = 1e-300
	pre := brcomp(a, b, x, y, w) / a
	if pre == 0 {
		return 0
	}
	c := 1.0
	d := (1 - w) / (a + 1) // 1 − (a+b)x/(a+1) = (1 + a·y − b·x)/(a+1), without cancellation
	if math.Abs(d) < tiny {
		d = tiny
	}
	d = 1 / d
	h := d
	for m := 1.0; m < 1e8; m++ {
		m2 := 2 * m
		aa := m * (b - m) * x / ((a + m2 - 1) * (a + m2))
		d = 1 + aa*d
		if math.Abs(d) < tiny {
			d = tiny
		}
		c = 1 + aa/c
		if math.Abs(c) < tiny {
			c = tiny
		}
		d = 1 / d
		h *= d * c
		aa = -(a + m) * (a + b + m) * x / ((a + m2) * (a + m2 + 1))
		d = 1 + aa*d
		if math.Abs(d) < tiny {
			d = tiny
		}
		c = 1 + aa/c
		if math.Abs(c) < tiny {
			c = tiny
		}
		d = 1 / d
		del := d * c
		h *= del
		if math.Abs(del-1) <= 1e-16 {
			break
		}
	}
	return pre * h
}

// bgratL holds ℓₖ = B₂ₖ/(2k·(2k)!), the coefficients of
// ln(sinh(s/2)/(s/2)) = Σ ℓₖ s^(2k) (A&S 4.5.64 with 23.1.2), from mpmath
// 1.2.1: bernoulli(2k)/(2k·factorial(2k)), printed to 20 digits.
var bgratL = [...]float64{
	0.041666666666666666667, -0.00034722222222222222222, 5.5114638447971781305e-6,
	-1.0333994708994708995e-7, 2.0876756987868098979e-9, -4.403491782239577654e-11,
	9.5589546647747705949e-13, -2.1185501852016142918e-14, 4.7700344757099136467e-16,
	-1.0874343492790309365e-17, 2.5040921947091952342e-19, -5.8143602857552180586e-21,
	1.3595027075497951814e-22, -3.1976847953705524466e-24, 7.5598415077922768677e-26,
	-1.7952470840225632641e-27, 4.2799190459260732408e-29, -1.0238874835181417162e-30,
	2.45703533081448544e-32, -5.9125560392515748364e-34,
}

// betaIncLargeA returns I_x(a, b) for large a by the expansion in
// incomplete gamma functions of DiDonato & Morris (1992, TOMS 708, BGRAT;
// Temme 1996, "Special Functions", §11.3.3). With t = e^(−s) and
// T = a + (b−1)/2,
//
//	I_x(a, b) = 1/B(a,b) ∫_{−ln x}^∞ e^(−Ts) s^(b−1) (sinh(s/2)/(s/2))^(b−1) ds,
//
// and expanding (sinh(s/2)/(s/2))^(b−1) = Σ pₙ s^(2n) (pₙ from ℓₖ above by
// the exponential recurrence n·pₙ = Σ k·(b−1)ℓₖ·pₙ₋ₖ) gives
//
//	I_x(a, b) = Γ(a+b)/(Γ(a)·T^b) · Σₙ pₙ · Γ(b+2n)/(Γ(b)·T^(2n)) · Q(b+2n, u),  u = −T·ln x,
//
// with Q(s+1, u) = Q(s, u) + u^s e^(−u)/Γ(s+1). The prefactor is formed
// from Stirling's series as a·φ(b/a) − ln(1+b/a)/2 + b·ln(1+(b+1)/(2T)) +
// δ(a+b) − δ(a), φ(t) = ln(1+t) − t. The series is asymptotic; ok is false
// unless a term falls below 1e-17 of the sum within len(bgratL) terms.
func betaIncLargeA(a, b, y float64) (w float64, ok bool) {
	T := a + (b-1)/2
	u := -T * math.Log1p(-y)
	if !(u > 0) {
		return 1, true
	}
	lnM := a*log1pmx(b/a) - 0.5*math.Log1p(b/a) + b*math.Log1p((b+1)/(2*T)) + stirlingDelta(a+b) - stirlingDelta(a)
	_, qn := gammaInc(b, u)
	lgb1, _ := math.Lgamma(b + 1)
	e := math.Exp(b*math.Log(u) - u - lgb1) // u^b e^(−u)/Γ(b+1)
	const n = len(bgratL)
	var g, p [n + 1]float64
	for k := 1; k <= n; k++ {
		g[k] = (b - 1) * bgratL[k-1]
	}
	p[0] = 1
	sum, r := qn, 1.0
	s := b
	for i := 1; i <= n; i++ {
		var acc float64
		for k := 1; k <= i; k++ {
			acc += float64(k) * g[k] * p[i-k]
		}
		p[i] = acc / float64(i)
		// Q(s+2, u) = Q(s, u) + e_s + e_{s+1}
		qn += e
		e *= u / (s + 1)
		qn += e
		e *= u / (s + 2)
		r *= s * (s + 1) / (T * T)
		s += 2
		term := p[i] * r * qn
		sum += term
		if math.Abs(term) <= 1e-17*math.Abs(sum) {
			return math.Exp(lnM) * sum, true
		}
	}
	return 0, false
}
