package stats

// This file holds the influence measures of the straight line and the
// leave-one-out correlation, slope and intercept, all in O(n) total.

import (
	"math"

	"bivar/internal/hugepage"
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
		Leverage:       hugepage.Make[float64](n),
		Residual:       hugepage.Make[float64](n),
		Studentized:    hugepage.Make[float64](n),
		StudentizedExt: hugepage.Make[float64](n),
		CooksD:         hugepage.Make[float64](n),
		DFFITS:         hugepage.Make[float64](n),
		LooR:           hugepage.Make[float64](n),
		LooSlope:       hugepage.Make[float64](n),
		LooIntercept:   hugepage.Make[float64](n),
		SoleSupport:    hugepage.Make[bool](n),
	}
	li := NewLineInfluence(x, y)
	for i := range x {
		r := li.At(i)
		res.Leverage[i], res.Residual[i], res.Studentized[i], res.StudentizedExt[i] = r.Leverage, r.Residual, r.Studentized, r.StudentizedExt
		res.CooksD[i], res.DFFITS[i], res.LooR[i], res.LooSlope[i], res.LooIntercept[i] = r.CooksD, r.DFFITS, r.LooR, r.LooSlope, r.LooIntercept
		res.SoleSupport[i] = r.SoleSupport
	}
	return res
}

// InfluenceRow is the influence of one row on the least-squares line: the
// fields of InfluenceResult for that row.
type InfluenceRow struct {
	Leverage, Residual, Studentized, StudentizedExt, CooksD, DFFITS float64
	LooR, LooSlope, LooIntercept                                    float64
	SoleSupport                                                     bool
}

// LineInfluence computes the influence measures of Influence one row at a
// time, in O(1) per row after an O(n) set-up that keeps no per-row vector:
// a study of 10⁷ rows streams its flags and leave-one-out figures through
// At instead of holding ten vectors of n values. The formulas and the
// undefined cases are those of Influence, which is built on it.
type LineInfluence struct {
	x, y   []float64
	n      int
	valid  bool // n ≥ 2 and Sxx > 0
	m      Moments
	b1     float64
	hx, lx float64 // x̄ in two parts (meanParts)
	hy, ly float64
	rss    float64
	s      float64 // residual SD, NaN when undefined
	sole   [2]int
	nf, c  float64
	invN   float64 // 1/n
	omInvN float64 // (n−1)/n
	nan    float64
}

// NewLineInfluence prepares the row-wise influence of the line fitted to
// x and y. x and y must have equal length (it panics otherwise) and hold
// no NaN or Inf.
func NewLineInfluence(x, y []float64) *LineInfluence {
	if len(x) != len(y) {
		panic("stats: NewLineInfluence: x and y lengths differ")
	}
	n := len(x)
	li := &LineInfluence{x: x, y: y, n: n, nan: math.NaN(), sole: [2]int{-1, -1}}
	li.m = CentredMoments(x, y)
	if n < 2 || !(li.m.Sxx > 0) {
		return li
	}
	li.valid = true
	li.sole = soleSupportRow(x)
	li.nf = float64(n)
	li.b1 = li.m.Sxy / li.m.Sxx
	// Deviations from means held in two parts (meanParts's figures, which
	// CentredMoments has just summed in the same order): exact to
	// rounding even when x or y is far from 0.
	li.hx, li.lx, li.hy, li.ly = li.m.parts.xhi, li.m.parts.xlo, li.m.parts.yhi, li.m.parts.ylo
	var rss, sumY2 float64
	for i := range x {
		e := ((y[i] - li.hy) - li.ly) - li.b1*((x[i]-li.hx)-li.lx)
		rss += e * e
		sumY2 += y[i] * y[i]
	}
	li.rss = rss
	// An exact fit leaves only rounding in the residuals; studentizing that
	// noise would make arbitrary "outliers" (ExactFit).
	li.s = li.nan
	if n > 2 && !ExactFit(rss, sumY2) {
		li.s = math.Sqrt(rss / (li.nf - 2))
	}
	li.c = li.nf / (li.nf - 1)
	li.invN, li.omInvN = 1/li.nf, (li.nf-1)/li.nf
	return li
}

// ExactFit reports whether a line's residual sum of squares rss is at or
// below the rounding floor (16ε)²·Σy² (ε = 2⁻⁵², sumY2 = Σy²): what the
// line leaves is then only the rounding of the numbers, and is taken as
// exactly 0 (true for a NaN rss). The one rule of an exact fit, for the
// row-wise measures here and for the checks of the line's residuals
// (analysis's compareFits, and the push-down's).
func ExactFit(rss, sumY2 float64) bool {
	const eps16 = 16 * 0x1p-52
	return !(rss > eps16*eps16*sumY2)
}

// Len is the number of rows.
func (li *LineInfluence) Len() int { return li.n }

// At returns the influence of row i.
func (li *LineInfluence) At(i int) InfluenceRow {
	var r InfluenceRow
	li.into(i, true, &r)
	return r
}

// ScreenInto writes into *r row i's figures as At gives them, without
// DFFITS and the leave-one-out intercept (NaN in their place): the figures
// a pass over every row reads to flag rows and find the extremes, at two
// divisions and a square root less a row. Every other field is At's, bit
// for bit. It writes in place because a pass over every row that took
// each row's 80 bytes back by value (and the moments copied at every
// call) spent a third of its time copying.
func (li *LineInfluence) ScreenInto(i int, r *InfluenceRow) { li.into(i, false, r) }

// into writes At's figures of row i into *r, DFFITS and LooIntercept only
// when full.
func (li *LineInfluence) into(i int, full bool, r *InfluenceRow) {
	nan := li.nan
	if !li.valid {
		*r = InfluenceRow{nan, nan, nan, nan, nan, nan, nan, nan, nan, false}
		return
	}
	if li.sole[0] == i || li.sole[1] == i {
		*r = InfluenceRow{Leverage: 1, Residual: 0, Studentized: nan, StudentizedExt: nan, CooksD: nan, DFFITS: nan,
			LooR: nan, LooSlope: nan, LooIntercept: nan, SoleSupport: true}
		return
	}
	m, nf := &li.m, li.nf
	dx, dy := (li.x[i]-li.hx)-li.lx, (li.y[i]-li.hy)-li.ly
	e := dy - li.b1*dx
	q := dx * dx / m.Sxx
	// Plain comparisons, not math.Min and math.Max (a call each per row);
	// no value here is NaN or a signed zero that they would treat apart.
	h := li.invN + q
	if h > 1 {
		h = 1
	}
	omh := li.omInvN - q // 1 − h, formed without adding 1/n first
	if omh < 0 {
		omh = 0
	}
	r.Leverage, r.Residual, r.SoleSupport = h, e, false
	ri := e / (li.s * math.Sqrt(omh))
	r.Studentized = ri
	r.CooksD = ri * ri * h / (2 * omh)
	ti := nan
	if li.n > 3 {
		s2 := (li.rss - e*e/omh) / (nf - 3)
		if s2 < 0 {
			s2 = 0
		}
		ti = e / (math.Sqrt(s2) * math.Sqrt(omh))
	}
	r.StudentizedExt = ti

	sxx := li.c * m.Sxx * omh
	bi := li.b1 - dx*e/(m.Sxx*omh)
	r.LooSlope = bi
	r.DFFITS, r.LooIntercept = nan, nan
	if full {
		r.DFFITS = ti * math.Sqrt(h/omh)
		r.LooIntercept = (m.MeanY - dy/(nf-1)) - bi*(m.MeanX-dx/(nf-1))
	}
	r.LooR = nan
	if li.n > 2 {
		r.LooR = corrFromSums(sxx, m.Syy-li.c*dy*dy, m.Sxy-li.c*dx*dy)
	}
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
