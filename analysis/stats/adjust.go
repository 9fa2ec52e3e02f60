package stats

// This file holds the multiple-testing adjustments applied across all the
// studies of a manifest: Holm's step-down family-wise error control and the
// Benjamini–Hochberg step-up false discovery rate.

import "math"

// Holm returns Holm's (1979) step-down adjusted p-values, in the order of p.
// With the m non-NaN p-values sorted ascending, p₍₁₎ ≤ … ≤ p₍ₘ₎,
//
//	p̃₍ᵢ₎ = max_{j ≤ i} min(1, (m − j + 1)·p₍ⱼ₎)
//
// so the adjusted values keep the order of the raw ones and never exceed 1.
// NaN entries (studies without a p-value) stay NaN and do not count in m.
// The input is not modified. Ties give equal adjusted values whatever
// their order. Source: Holm, S. (1979), Scand. J. Statist. 6:65–70.
func Holm(p []float64) []float64 {
	out, idx := adjustSetup(p)
	m := float64(len(idx))
	running := 0.0
	for j, i := range idx {
		v := math.Min(1, (m-float64(j))*p[i])
		running = math.Max(running, v)
		out[i] = running
	}
	return out
}

// BenjaminiHochberg returns the Benjamini–Hochberg (1995) step-up adjusted
// p-values ("q-values"), in the order of p. With the m non-NaN p-values
// sorted ascending,
//
//	p̃₍ᵢ₎ = min_{j ≥ i} min(1, m·p₍ⱼ₎ / j)
//
// which is monotone in the raw p and capped at 1. NaN entries stay NaN and
// do not count in m. The input is not modified. Source: Benjamini, Y. &
// Hochberg, Y. (1995), J. R. Statist. Soc. B 57(1):289–300.
func BenjaminiHochberg(p []float64) []float64 {
	out, idx := adjustSetup(p)
	m := float64(len(idx))
	running := 1.0
	for j := len(idx) - 1; j >= 0; j-- {
		i := idx[j]
		// m/(j+1) ≥ 1, but m·p/(j+1) can round an ulp below p (found by
		// FuzzExtrasNoPanic): an adjusted value is never below the raw one.
		v := math.Min(1, math.Max(p[i], m*p[i]/float64(j+1)))
		running = math.Min(running, v)
		out[i] = running
	}
	return out
}

// adjustSetup returns an output slice filled with NaN and the indices of
// the non-NaN entries of p sorted by p ascending (ties by index, so the
// result is deterministic).
func adjustSetup(p []float64) (out []float64, idx []int) {
	out = make([]float64, len(p))
	var keep []int
	for i, v := range p {
		out[i] = math.NaN()
		if !math.IsNaN(v) {
			keep = append(keep, i)
		}
	}
	kp := make([]float64, len(keep))
	for k, i := range keep {
		kp[k] = p[i]
	}
	idx = stableArgsort(kp)
	for k, j := range idx {
		idx[k] = keep[j]
	}
	return out, idx
}
