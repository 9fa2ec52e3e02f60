package stats

// This file holds the influence measures of the straight line and the
// leave-one-out correlation, slope and intercept, all in O(n) total.

import (
	"math"
)

// InfluenceResult holds, per row in input order, the influence of that row
// on the least-squares line y = b0 + b1·x fitted to all rows.
type InfluenceResult struct {
	Leverage       []float64 // hᵢ = 1/n + (xᵢ−x̄)²/Sxx, at most 1 (clamped against rounding)
	Residual       []float64 // eᵢ = yᵢ − b0 − b1·xᵢ
	Studentized    []float64 // internally studentized rᵢ = eᵢ/(s·√(1−hᵢ)), s² = RSS/(n−2)
	StudentizedExt []float64 // externally studentized tᵢ = eᵢ/(s₍ᵢ₎·√(1−hᵢ)), s₍ᵢ₎ without row i
	CooksD         []float64 // Dᵢ = rᵢ²·hᵢ/(2(1−hᵢ))
	DFFITS         []float64 // tᵢ·√(hᵢ/(1−hᵢ))
	LooR           []float64 // Pearson r of the other n−1 rows
	LooSlope       []float64 // slope of the line fitted to the other n−1 rows
	LooIntercept   []float64 // intercept of that line
	SoleSupport    []bool    // hᵢ = 1: every other row has the same x, so row i alone sets the slope
}

// Influence returns the leverage, residual, internally and externally
// studentized residual, Cook's distance and DFFITS of every row for the
// least-squares line, and the correlation, slope and intercept of the data
// without each row in turn, in O(n) total time.
//
// Formulas (Belsley, Kuh & Welsch 1980, Regression Diagnostics, ch. 2;
// Cook & Weisberg 1982, Residuals and Influence in Regression, §2.2, 3.4),
// with p = 2 coefficients, dxᵢ = xᵢ−x̄, dyᵢ = yᵢ−ȳ and centred sums from
// CentredMoments:
//
//	hᵢ = 1/n + dxᵢ²/Sxx
//	s₍ᵢ₎² = (RSS − eᵢ²/(1−hᵢ)) / (n−3)
//	Dᵢ = rᵢ²·hᵢ / (2(1−hᵢ)),   DFFITSᵢ = tᵢ·√(hᵢ/(1−hᵢ))
//
// Leave-one-out uses the downdating identities of the centred sums
// (removing row i, with c = n/(n−1)):
//
//	Sxx₍ᵢ₎ = Sxx − c·dxᵢ² = c·Sxx·(1−hᵢ),  Syy₍ᵢ₎ = Syy − c·dyᵢ²,  Sxy₍ᵢ₎ = Sxy − c·dxᵢ·dyᵢ
//	b1₍ᵢ₎ = b1 − dxᵢ·eᵢ / (Sxx·(1−hᵢ))                   (DFBETA form)
//	b0₍ᵢ₎ = (ȳ − dyᵢ/(n−1)) − b1₍ᵢ₎·(x̄ − dxᵢ/(n−1))
//	r₍ᵢ₎ = Sxy₍ᵢ₎ / √(Sxx₍ᵢ₎·Syy₍ᵢ₎)
//
// Sole support: a row has leverage exactly 1 when every other row shares
// one x value (so n = 2 gives two such rows). That is detected from the
// data, not from a rounded hᵢ, and such a row gets Leverage 1, Residual 0,
// SoleSupport true, and NaN for Studentized, StudentizedExt, CooksD,
// DFFITS (0/0: the line passes through the row whatever its y), and for
// LooR, LooSlope, LooIntercept (without the row x is constant and no line
// exists). Other rows keep finite values. Nothing panics.
//
// Other undefined cases give NaN, never a panic: every value when n < 2 or
// x is constant (SoleSupport all false); Studentized, StudentizedExt,
// CooksD, DFFITS when n < 3 or the fit is exact (RSS at most the rounding
// floor (16ε)²·Σy², ε = 2⁻⁵²); StudentizedExt, DFFITS when n < 4; LooR when
// the remaining y are constant or n < 3. A rounding-negative s₍ᵢ₎² is taken
// as 0. x and y must have equal length (it panics otherwise) and hold no
// NaN or Inf.
func Influence(x, y []float64) InfluenceResult {
	if len(x) != len(y) {
		panic("stats: Influence: x and y lengths differ")
	}
	n := len(x)
	res := InfluenceResult{
		Leverage:       make([]float64, n),
		Residual:       make([]float64, n),
		Studentized:    make([]float64, n),
		StudentizedExt: make([]float64, n),
		CooksD:         make([]float64, n),
		DFFITS:         make([]float64, n),
		LooR:           make([]float64, n),
		LooSlope:       make([]float64, n),
		LooIntercept:   make([]float64, n),
		SoleSupport:    make([]bool, n),
	}
	nan := math.NaN()
	m := CentredMoments(x, y)
	if n < 2 || !(m.Sxx > 0) {
		for _, v := range [][]float64{res.Leverage, res.Residual, res.Studentized, res.StudentizedExt,
			res.CooksD, res.DFFITS, res.LooR, res.LooSlope, res.LooIntercept} {
			for i := range v {
				v[i] = nan
			}
		}
		return res
	}
	sole := soleSupportRow(x)
	nf := float64(n)
	b1 := m.Sxy / m.Sxx
	// Deviations from means held in two parts (meanParts): exact to
	// rounding even when x or y is far from 0.
	hx, lx, _ := meanParts(x)
	hy, ly, _ := meanParts(y)
	var rss float64
	for i := range x {
		e := ((y[i] - hy) - ly) - b1*((x[i]-hx)-lx)
		res.Residual[i] = e
		rss += e * e
	}
	// An exact fit leaves only rounding in the residuals; studentizing that
	// noise would make arbitrary "outliers". Treat RSS at or below the
	// rounding floor, (16ε)²·Σy², as exactly 0.
	var sumY2 float64
	for _, v := range y {
		sumY2 += v * v
	}
	const eps16 = 16 * 0x1p-52
	s := nan
	if n > 2 && rss > eps16*eps16*sumY2 {
		s = math.Sqrt(rss / (nf - 2))
	}
	c := nf / (nf - 1)
	for i := range x {
		dx, dy := (x[i]-hx)-lx, (y[i]-hy)-ly
		if sole[0] == i || sole[1] == i {
			res.SoleSupport[i] = true
			res.Leverage[i] = 1
			res.Residual[i] = 0
			res.Studentized[i], res.StudentizedExt[i], res.CooksD[i], res.DFFITS[i] = nan, nan, nan, nan
			res.LooR[i], res.LooSlope[i], res.LooIntercept[i] = nan, nan, nan
			continue
		}
		q := dx * dx / m.Sxx
		h := math.Min(1, 1/nf+q)
		omh := math.Max(0, (nf-1)/nf-q) // 1 − h, formed without adding 1/n first
		e := res.Residual[i]
		res.Leverage[i] = h
		ri := e / (s * math.Sqrt(omh))
		res.Studentized[i] = ri
		res.CooksD[i] = ri * ri * h / (2 * omh)
		ti := nan
		if n > 3 {
			s2 := (rss - e*e/omh) / (nf - 3)
			ti = e / (math.Sqrt(math.Max(s2, 0)) * math.Sqrt(omh))
		}
		res.StudentizedExt[i] = ti
		res.DFFITS[i] = ti * math.Sqrt(h/omh)

		sxx := c * m.Sxx * omh
		bi := b1 - dx*e/(m.Sxx*omh)
		res.LooSlope[i] = bi
		res.LooIntercept[i] = (m.MeanY - dy/(nf-1)) - bi*(m.MeanX-dx/(nf-1))
		if n > 2 {
			res.LooR[i] = corrFromSums(sxx, m.Syy-c*dy*dy, m.Sxy-c*dx*dy)
		} else {
			res.LooR[i] = nan
		}
	}
	return res
}

// soleSupportRow returns the indices of the rows whose leverage for the
// straight line is exactly 1: the rows that hold a value of x shared with
// no other row when x takes exactly two distinct values one of which
// occurs once. Unused slots are −1. With n = 2 and distinct x both rows
// qualify.
func soleSupportRow(x []float64) [2]int {
	none := [2]int{-1, -1}
	if len(x) < 2 {
		return none
	}
	a := x[0]
	b, bi := 0.0, -1
	na, nb := 0, 0
	lastA := 0
	for i, v := range x {
		switch {
		case v == a:
			na++
			lastA = i
		case bi < 0:
			b, bi = v, i
			nb++
		case v == b:
			nb++
		default:
			return none // three or more distinct values
		}
	}
	switch {
	case bi < 0:
		return none // constant x
	case na == 1 && nb == 1:
		return [2]int{lastA, bi}
	case na == 1:
		return [2]int{lastA, -1}
	case nb == 1:
		return [2]int{bi, -1}
	}
	return none
}
