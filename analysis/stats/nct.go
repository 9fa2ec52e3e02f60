package stats

// This file holds the noncentral t distribution, which the exact
// intervals of the limits of agreement need (see agrLimits): its CDF by
// quadrature over the chi distribution and its quantile by a bracketed
// root-finder.

import (
	"math"
	"sync"
)

// NoncentralTCDF returns P(T ≤ t) for the noncentral t with df degrees of
// freedom and noncentrality nc, T = (Z + nc)/√(V/df) with Z standard
// normal and V chi-squared on df, independent. From that definition,
//
//	P(T ≤ t) = ∫₀^∞ g(u)·Φ(t·u − nc) du,   u = √(V/df),
//
// where g is the density of u, proportional to u^(df−1)·e^(−df·u²/2).
// The integral is taken by adaptive 20-point Gauss–Legendre quadrature in
// e = u/u* − 1 about the mode u* = √((df−1)/df), where
// ln g = (df−1)·(ln(1+e) − e − e²/2) + const without cancellation, and
// normalised by the same quadrature of g alone (so no log-gamma of a large
// argument is formed). The result is accurate to about 1e-13 absolute
// (against scipy 1.10.1 stats.nct.cdf over df 1 to 10⁷ and nc to 10⁴,
// TestNoncentralTScipy), not to full relative precision in a far tail.
// It returns NaN for df < 1, a non-finite nc, or a NaN t.
func NoncentralTCDF(t, df, nc float64) float64 {
	p, _ := nctTails(t, df, nc)
	return p
}

// NoncentralTQuantile returns t with P(T ≤ t) = p for the noncentral t
// with df degrees of freedom and noncentrality nc. The root of the CDF (of
// the survival function for p above 1/2, so that neither is formed as a
// difference from 1) is bracketed from a start at nc + z_p·√(1 + nc²/(2 df))
// (the normal approximation), then found by the Illinois variant of
// regula falsi to 1e-13 relative. NaN for p outside (0, 1) or arguments
// NoncentralTCDF refuses.
func NoncentralTQuantile(p, df, nc float64) float64 {
	if !(p > 0 && p < 1) || !(df >= 1) || math.IsNaN(nc) || math.IsInf(nc, 0) || math.IsInf(df, 0) {
		return math.NaN()
	}
	upper := p > 0.5
	target := p
	if upper {
		target = 1 - p
	}
	// f increases with x: the CDF minus p, or (1−p) minus the survival.
	f := func(x float64) float64 {
		lo, hi := nctTails(x, df, nc)
		if upper {
			return target - hi
		}
		return lo - target
	}
	x0 := nc + NormalQuantile(p)*math.Sqrt(1+nc*nc/(2*df))
	step := 0.1 * math.Max(1, math.Abs(x0))
	a, b := x0, x0
	fa, fb := f(a), f(a)
	for range 200 {
		if fa <= 0 {
			break
		}
		b, fb = a, fa
		a -= step
		step *= 2
		fa = f(a)
	}
	for range 200 {
		if fb >= 0 {
			break
		}
		a, fa = b, fb
		b += step
		step *= 2
		fb = f(b)
	}
	if fa == 0 {
		return a
	}
	if fb == 0 {
		return b
	}
	if !(fa < 0 && fb > 0) {
		return math.NaN()
	}
	side := 0
	for range 300 {
		x := (a*fb - b*fa) / (fb - fa)
		if !(x > a && x < b) {
			x = a + (b-a)/2
		}
		fx := f(x)
		switch {
		case fx == 0:
			return x
		case fx < 0:
			a, fa = x, fx
			if side == -1 {
				fb /= 2
			}
			side = -1
		default:
			b, fb = x, fx
			if side == 1 {
				fa /= 2
			}
			side = 1
		}
		if b-a <= 1e-13*math.Max(1, math.Abs(x)) {
			break
		}
	}
	return a + (b-a)/2
}

// nctTails returns P(T ≤ t) and P(T > t), each integrated directly.
func nctTails(t, df, nc float64) (lower, upper float64) {
	if !(df >= 1) || math.IsNaN(t) || math.IsNaN(nc) || math.IsInf(nc, 0) || math.IsInf(df, 0) {
		return math.NaN(), math.NaN()
	}
	if math.IsInf(t, 1) {
		return 1, 0
	}
	if math.IsInf(t, -1) {
		return 0, 1
	}
	nu := df - 1
	us := math.Sqrt(nu / df)
	var lnG func(e float64) float64
	var u func(e float64) float64
	var lo, hi float64
	if nu == 0 {
		// df = 1: g ∝ e^(−u²/2) on u ≥ 0; integrate in u itself.
		lnG = func(x float64) float64 { return -x * x / 2 }
		u = func(x float64) float64 { return x }
		lo, hi = 0, 40
	} else {
		lnG = func(e float64) float64 {
			if e <= -1 {
				return math.Inf(-1)
			}
			return nu * (log1pmx(e) - e*e/2)
		}
		u = func(e float64) float64 { return us * (1 + e) }
		const cut = -80 // e^−80 ≈ 1.8e-35 of the mode's density
		s := 1 / math.Sqrt(nu)
		hi = s
		for lnG(hi) > cut {
			hi *= 2
		}
		lo = -math.Min(s, 1)
		for lo > -1 && lnG(lo) > cut {
			lo = math.Max(-1, 2*lo)
		}
	}
	g := func(x float64) float64 { return math.Exp(lnG(x)) }
	// Split where Φ's argument changes sign and about it, at 1, 8 and 64
	// of its width 1/|t·du/dx| either side: the step of Φ may be narrow
	// against the range (large |t|), and a panel must not step over it.
	cuts := []float64{lo}
	if t != 0 {
		x0, w := nc/t, 1/math.Abs(t)
		if nu != 0 {
			x0, w = nc/(t*us)-1, 1/math.Abs(t*us)
		}
		for _, k := range []float64{-64, -8, -1, 0, 1, 8, 64} {
			if c := x0 + k*w; c > cuts[len(cuts)-1] && c < hi {
				cuts = append(cuts, c)
			}
		}
	}
	cuts = append(cuts, hi)
	tol := 1e-16 * glPanel(g, lo, hi) // an absolute tolerance, 1e-16 of the whole
	var z, pl, pu float64
	for i := 0; i+1 < len(cuts); i++ {
		a, b := cuts[i], cuts[i+1]
		z += glAdaptive(g, a, b, glPanel(g, a, b), tol, 0)
		fl := func(x float64) float64 { return g(x) * NormalCDF(t*u(x)-nc) }
		fu := func(x float64) float64 { return g(x) * NormalSurvival(t*u(x)-nc) }
		pl += glAdaptive(fl, a, b, glPanel(fl, a, b), tol, 0)
		pu += glAdaptive(fu, a, b, glPanel(fu, a, b), tol, 0)
	}
	if !(z > 0) {
		return math.NaN(), math.NaN()
	}
	return math.Min(1, pl/z), math.Min(1, pu/z)
}

// glAdaptive integrates f over [a, b] given whole, its 20-point
// Gauss–Legendre value there: the halves are summed and, while they differ
// from whole by more than tol (absolute) and 1e-15 relative, each half is
// refined in turn, to a depth of 40.
func glAdaptive(f func(float64) float64, a, b, whole, tol float64, depth int) float64 {
	m := a + (b-a)/2
	l, r := glPanel(f, a, m), glPanel(f, m, b)
	sum := l + r
	if diff := math.Abs(sum - whole); depth >= 40 || diff <= tol || diff <= 1e-15*math.Abs(sum) {
		return sum
	}
	return glAdaptive(f, a, m, l, tol, depth+1) + glAdaptive(f, m, b, r, tol, depth+1)
}

// glPanel returns the 20-point Gauss–Legendre estimate of ∫_a^b f.
func glPanel(f func(float64) float64, a, b float64) float64 {
	x, w := glNodes()
	c, h := (a+b)/2, (b-a)/2
	var s float64
	for i := range x {
		s += w[i] * f(c+h*x[i])
	}
	return s * h
}

var glOnce = sync.OnceValues(func() ([]float64, []float64) { return gaussLegendre(20) })

func glNodes() ([]float64, []float64) { return glOnce() }

// gaussLegendre returns the n nodes and weights of Gauss–Legendre
// quadrature on [−1, 1]: Newton's method on P_n from the start
// cos(π(i − 1/4)/(n + 1/2)), P_n by its three-term recurrence and
// w_i = 2/((1 − x_i²)·P_n′(x_i)²) (Abramowitz & Stegun 25.4.29; the
// method of Numerical Recipes, 3rd ed., §4.6).
func gaussLegendre(n int) ([]float64, []float64) {
	x := make([]float64, n)
	w := make([]float64, n)
	for i := range (n + 1) / 2 {
		z := math.Cos(math.Pi * (float64(i) + 0.75) / (float64(n) + 0.5))
		var dp float64
		for range 100 {
			p1, p2 := 1.0, 0.0
			for j := 1; j <= n; j++ {
				p1, p2 = ((2*float64(j)-1)*z*p1-(float64(j)-1)*p2)/float64(j), p1
			}
			dp = float64(n) * (z*p1 - p2) / (z*z - 1)
			dz := p1 / dp
			z -= dz
			if math.Abs(dz) < 1e-16 {
				break
			}
		}
		// dp at the converged z (recomputed for the weight)
		p1, p2 := 1.0, 0.0
		for j := 1; j <= n; j++ {
			p1, p2 = ((2*float64(j)-1)*z*p1-(float64(j)-1)*p2)/float64(j), p1
		}
		dp = float64(n) * (z*p1 - p2) / (z*z - 1)
		x[i], x[n-1-i] = -z, z
		w[i] = 2 / ((1 - z*z) * dp * dp)
		w[n-1-i] = w[i]
	}
	return x, w
}
