package stats

// This file answers "how many rows does the next run need": for the
// interval of r or of the slope to reach a declared half-width, and for a
// declared power to detect a correlation.

import "math"

// planMaxN bounds the sample sizes the planning functions search; a
// requirement beyond it is reported as 0 (not reachable in practice).
const planMaxN = 1 << 40

// FisherHalfWidth returns the half-width (hi − lo)/2 of the Fisher-z
// interval of r at n rows (FisherCI), the figure NForCorrelationHalfWidth
// aims at. NaN where FisherCI is.
func FisherHalfWidth(r float64, n int, conf float64) float64 {
	lo, hi := FisherCI(r, n, conf)
	return (hi - lo) / 2
}

// NForCorrelationHalfWidth returns the smallest n ≥ 4 at which the
// Fisher-z interval of a correlation r (FisherCI: tanh(atanh r ∓
// z_{(1+conf)/2}/√(n−3))) has a half-width (hi − lo)/2 of at most
// halfWidth, planning at the given r (the observed one, or a declared
// guess): the width shrinks as r moves away from 0, so the answer holds
// for the true correlation only as far as r is near it. The half-width
// falls monotonically with n, so a bisection finds the exact smallest n.
// It returns 0 when r is NaN or |r| ≥ 1, halfWidth is not positive, conf
// lies outside (0, 1), or the n needed exceeds 2⁴⁰.
func NForCorrelationHalfWidth(r, halfWidth, conf float64) int {
	if math.IsNaN(r) || math.Abs(r) >= 1 || !(halfWidth > 0) || !(conf > 0 && conf < 1) {
		return 0
	}
	return planSearch(4, func(n int) bool { return FisherHalfWidth(r, n, conf) <= halfWidth })
}

// SlopeHalfWidth returns the half-width of the t interval of a
// least-squares slope at n rows, t_{n−2,(1+conf)/2}·residSD/(sdX·√(n−1)),
// with residSD the residual SD and sdX the SD of x (n−1 divisor). NaN for
// n < 3 or non-positive SDs.
func SlopeHalfWidth(residSD, sdX float64, n int, conf float64) float64 {
	if n < 3 || !(residSD > 0) || !(sdX > 0) || !(conf > 0 && conf < 1) {
		return math.NaN()
	}
	return TQuantile(0.5+conf/2, float64(n-2)) * residSD / (sdX * math.Sqrt(float64(n-1)))
}

// NForSlopeHalfWidth returns the smallest n ≥ 3 at which the interval of
// the slope (SlopeHalfWidth) is at most halfWidth, assuming the next run
// has the same residual SD and the same spread of x (a designed run with a
// wider x range needs fewer rows). The t quantile changes with n, so the
// n is found by bisection on the exact half-width (it falls monotonically
// with n), not by a normal approximation. It returns 0 when an input is
// not positive and finite, conf lies outside (0, 1), or n would exceed
// 2⁴⁰.
func NForSlopeHalfWidth(residSD, sdX, halfWidth, conf float64) int {
	if !(residSD > 0) || !(sdX > 0) || !(halfWidth > 0) || math.IsInf(residSD, 0) ||
		math.IsInf(sdX, 0) || !(conf > 0 && conf < 1) {
		return 0
	}
	// Start at the normal-quantile answer 1 + (z·s/(s_x·h))²: below it the
	// t quantile, larger than z, cannot meet the target.
	z := NormalQuantile(0.5+conf/2) * residSD / (sdX * halfWidth)
	start := 3
	if nz := 1 + z*z; nz > 3 && nz < planMaxN {
		start = int(nz)
	}
	return planSearch(start, func(n int) bool { return SlopeHalfWidth(residSD, sdX, n, conf) <= halfWidth })
}

// CorrelationPower returns the approximate power of the two-sided test of
// ρ = 0 at level alpha with n rows when the true correlation is r, by
// Fisher's z (atanh r is about normal with SD 1/√(n−3); Cohen 1988,
// Statistical Power Analysis for the Behavioral Sciences, 2nd ed., ch. 3):
//
//	power = Φ(|atanh r|·√(n−3) − z_{1−α/2}) + Φ(−|atanh r|·√(n−3) − z_{1−α/2})
//
// NaN for n < 4, |r| ≥ 1 or alpha outside (0, 1).
func CorrelationPower(r float64, n int, alpha float64) float64 {
	if n < 4 || math.IsNaN(r) || math.Abs(r) >= 1 || !(alpha > 0 && alpha < 1) {
		return math.NaN()
	}
	d := math.Abs(math.Atanh(r)) * math.Sqrt(float64(n-3))
	z := NormalQuantile(1 - alpha/2)
	phi := func(v float64) float64 { return math.Erfc(-v/math.Sqrt2) / 2 }
	return phi(d-z) + phi(-d-z)
}

// NForCorrelationPower returns the n needed to detect a correlation r with
// the given power by the two-sided test at level alpha, by Fisher's z
// (Lachin 1981, "Introduction to sample size determination and power
// analysis for clinical trials", Controlled Clinical Trials 2:93–113;
// Hulley et al., Designing Clinical Research, app. 6C):
//
//	n = ⌈((z_{1−α/2} + z_power)/atanh|r|)² + 3⌉
//
// (the term Φ(−d − z) of CorrelationPower, the other tail, is neglected
// as the formula does; it is below alpha/2). The common default power is
// 0.8. It returns 0 when r is NaN, 0 or |r| ≥ 1, alpha or power lies
// outside (0, 1), or n would exceed 2⁴⁰.
func NForCorrelationPower(r, alpha, power float64) int {
	if math.IsNaN(r) || r == 0 || math.Abs(r) >= 1 || !(alpha > 0 && alpha < 1) || !(power > 0 && power < 1) {
		return 0
	}
	q := (NormalQuantile(1-alpha/2) + NormalQuantile(power)) / math.Atanh(math.Abs(r))
	n := math.Ceil(q*q + 3)
	if !(n <= planMaxN) {
		return 0
	}
	return max(int(n), 4)
}

// planSearch returns the smallest n ≥ lo with ok(n), for ok monotone
// (false … false true … true), or 0 when ok(planMaxN) is false: steps of
// doubling length from lo, then bisection of the last step, so the cost is
// O(log(answer − lo)) calls of ok.
func planSearch(lo int, ok func(int) bool) int {
	if ok(lo) {
		return lo
	}
	hi := lo
	for step := 1; !ok(hi); step *= 2 {
		if hi >= planMaxN {
			return 0
		}
		lo, hi = hi, min(hi+step, planMaxN)
	}
	for hi-lo > 1 { // ok(hi), !ok(lo)
		mid := lo + (hi-lo)/2
		if ok(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// LimitsHalfWidth returns the half-width (hi − lo)/2 of the exact interval
// of a limit of agreement d̄ ± k·s at n items (see BlandAltman: the
// interval ends are d̄ + s·t′_q/√n with t′_q the q-quantiles, q =
// (1 ∓ conf)/2, of the noncentral t with n − 1 df and noncentrality
// k·√n), s·(t′_{(1+conf)/2} − t′_{(1−conf)/2})/(2√n). It does not depend on
// d̄, and is the same for either limit. NaN for n < 2, sd not positive and
// finite, k not positive or conf outside (0, 1).
func LimitsHalfWidth(sd, k float64, n int, conf float64) float64 {
	if n < 2 || !(sd > 0) || math.IsInf(sd, 0) || !(k > 0) || math.IsInf(k, 0) || !(conf > 0 && conf < 1) {
		return math.NaN()
	}
	fn := float64(n)
	nc := k * math.Sqrt(fn)
	lo := NoncentralTQuantile(0.5-conf/2, fn-1, nc)
	hi := NoncentralTQuantile(0.5+conf/2, fn-1, nc)
	return sd * (hi - lo) / (2 * math.Sqrt(fn))
}

// NForLimitsHalfWidth returns the smallest n ≥ 2 at which the exact
// interval of a limit of agreement (LimitsHalfWidth) has a half-width of
// at most halfWidth, if the next run's differences have the SD sd. The
// half-width falls monotonically with n, so the search (planSearch) finds
// the exact smallest n; it starts from below the large-n answer
// z²·(sd/halfWidth)²·(1 + k²/2), the approximate standard error of Bland
// & Altman (1999), sd·√(1/n + k²/(2(n−1))), solved for n, when that is
// above 100 (the exact interval is the wider, so the exact n is not
// smaller; the start is checked). It returns 0 when an input is not
// positive and finite, conf lies outside (0, 1), or n would exceed 2⁴⁰.
func NForLimitsHalfWidth(sd, k, halfWidth, conf float64) int {
	if !(sd > 0) || math.IsInf(sd, 0) || !(k > 0) || math.IsInf(k, 0) || !(halfWidth > 0) || !(conf > 0 && conf < 1) {
		return 0
	}
	ok := func(n int) bool { return LimitsHalfWidth(sd, k, n, conf) <= halfWidth }
	z := NormalQuantile(0.5+conf/2) * sd / halfWidth
	if approx := z * z * (1 + k*k/2); approx > 100 && approx < planMaxN {
		// Two steps of the half-width's large-n law, ∝ 1/√n, from the
		// approximate answer, then a check that the count found passes and
		// the one below it does not: the answer in about six evaluations
		// of the exact half-width where the search takes some forty at
		// 10⁶ items (each two noncentral t quantiles). Where the check
		// fails, the search below finds the answer.
		n := approx
		for range 2 {
			c := math.Ceil(n)
			h := LimitsHalfWidth(sd, k, int(c), conf)
			if !(h > 0) || math.IsInf(h, 0) {
				break
			}
			n = c * (h / halfWidth) * (h / halfWidth)
		}
		if c := math.Ceil(n); c > 2 && c < planMaxN && ok(int(c)) && !ok(int(c)-1) {
			return int(c)
		}
		if start := int(0.9 * approx); !ok(start) {
			return planSearch(start, ok)
		}
	}
	return planSearch(2, ok)
}
