package stats

// This file holds ordinary least squares: the general fit with an
// intercept (LeastSquares), the polynomial (Polynomial), the straight line
// (Line) and its confidence and prediction intervals.

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"

	"bivar/internal/hugepage"
)

// Coef is one coefficient of a least-squares fit with its inference.
type Coef struct {
	Estimate float64 // least-squares estimate
	SE       float64 // standard error, s·√((XᵀX)⁻¹)ⱼⱼ
	T        float64 // Estimate/SE, for H0: coefficient = 0
	P        float64 // two-sided p of T with the residual degrees of freedom
	CILow    float64 // confidence interval Estimate ∓ t_{(1+conf)/2, df}·SE
	CIHigh   float64
}

// Regression is a least-squares fit y = b0 + Σ bⱼ·colⱼ + e.
type Regression struct {
	Coef       []Coef  // intercept first, then one per column in input order
	ResidualSE float64 // s = √(RSS/DFResid)
	RSS        float64 // residual sum of squares Σe²
	TSS        float64 // total sum of squares about the mean, Σ(y−ȳ)²
	R2         float64 // 1 − RSS/TSS; NaN when TSS = 0
	AdjR2      float64 // 1 − (1−R2)(N−1)/DFResid
	F          float64 // (ESS/p)/(RSS/DFResid), ESS = Σ(ŷ−ȳ)², for H0: all slopes 0
	FP         float64 // upper tail of F with (p, DFResid) degrees of freedom
	AIC        float64 // N·ln(RSS/N) + 2k, k = len(Coef) (σ not counted); −Inf for an exact fit. statsmodels' OLS aic is this + N·(1 + ln 2π), the constant of the Gaussian log-likelihood, which cancels when models on the same rows are compared
	N          int     // rows
	DFResid    int     // residual degrees of freedom, N − len(Coef)
	Fitted     []float64
	Residuals  []float64 // y − Fitted
	Leverage   []float64 // diagonal of the hat matrix, 1/N + ‖(xᵢ−x̄)R⁻¹‖²

	means []float64 // column means
	mlo   []float64 // low parts of the column means: deviations are (v − means) − mlo (meanParts)
	ymean float64
	ylo   float64   // low part of the mean of y
	rinv  []float64 // p×p row-major inverse of the centred design's R
	p     int       // number of columns (slopes)
	poly  *polyMap  // set by Polynomial: the columns are powers of (x − c)/s
	b     []float64 // slopes of the fitted columns (Coef holds raw powers under poly)
}

// polyMap records the centring and scaling of x under a Polynomial fit.
type polyMap struct {
	c, s float64 // t = (x − c)/s
}

// rankTol is the relative size below which a diagonal element of R, compared
// with its centred column's norm, means the column is (numerically) a linear
// combination of the columns before it.
const rankTol = 1e-12

// LeastSquares fits y = b0 + b1·cols[0] + … + bp·cols[p−1] + e by ordinary
// least squares.
//
// Algorithm: every column and y are centred on their means (corrected
// two-pass, Chan, Golub & LeVeque 1983), which removes the intercept column
// and its collinearity with the others; the centred n×p design Xc is
// factorised by Householder QR (LAPACK dgeqrf as implemented in gonum
// lapack64, the routine behind gonum's mat.QR, called directly so that R
// and the reflectors stay in one n×p array and the n×n Q is never formed);
// the slopes solve R·b = (Qᵀyc)[:p] by back substitution, followed by one
// step of iterative refinement on the residuals (Golub & Van Loan 2013,
// Matrix Computations, 4th ed., §5.3 and §3.5.3). The intercept is
// ȳ − Σ bⱼ·x̄ⱼ. Standard errors come from (XcᵀXc)⁻¹ = R⁻¹R⁻ᵀ, the
// intercept's from s²(1/n + x̄ᵀR⁻¹R⁻ᵀx̄); leverages from the rows of Xc·R⁻¹.
// Inference assumes independent normal errors with constant variance.
//
// conf is the confidence level of the coefficient intervals (e.g. 0.95);
// outside (0, 1) the intervals are NaN.
// All columns must have len(y) rows (it panics otherwise). It returns an
// error, and no fit, when there are fewer than p+1 rows, a value is NaN or
// infinite, a column is constant, or a column is a linear combination of
// the others (|Rⱼⱼ| < 1e-12·‖colⱼ − x̄ⱼ‖). Constant means every row holds the
// same value: any finite double is data, and a column or y whose largest
// magnitude lies outside 2^±400 (1e-200, 1e300) is fitted after an exact
// power-of-two scaling and the results scaled back (pow2Shift, unscale),
// so the estimates, t, p and R² do not depend on the units; only RSS and
// TSS, squares of the data's scale, can overflow or underflow then.
// With exactly p+1 rows the fit is
// exact: DFResid is 0 and SE, T, P, intervals, ResidualSE, AdjR2, F are NaN.
// With more rows but RSS = 0 (y constant, or exactly on the model) every
// SE is 0: a nonzero estimate then has T = ±Inf and P = 0, a zero one T and
// P NaN (0/0); R² is NaN when y is constant (TSS = 0).
func LeastSquares(cols [][]float64, y []float64, conf float64) (Regression, error) {
	return leastSquaresScaled(cols, y, conf, true)
}

// leastSquaresScaled checks and scales the data and fits them by
// leastSquares (perRow: with fitted values, residuals and leverages) or by
// lsqSummary (without).
func leastSquaresScaled(cols [][]float64, y []float64, conf float64, perRow bool) (Regression, error) {
	n, p := len(y), len(cols)
	for j, c := range cols {
		if len(c) != n {
			panic(fmt.Sprintf("stats: LeastSquares: column %d has %d rows, y has %d", j, len(c), n))
		}
	}
	if n < p+1 {
		return Regression{}, fmt.Errorf("least squares: %d rows cannot fit an intercept and %d predictors: need at least %d", n, p, p+1)
	}
	for i, v := range y {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return Regression{}, fmt.Errorf("least squares: response row %d is %v: remove non-finite values first", i+1, v)
		}
	}
	for j, c := range cols {
		for i, v := range c {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return Regression{}, fmt.Errorf("least squares: predictor %d row %d is %v: remove non-finite values first", j+1, i+1, v)
			}
		}
	}
	for j, c := range cols {
		if allEqual(c) {
			return Regression{}, fmt.Errorf("least squares: predictor %d is constant (every row %v): it cannot be fitted", j+1, c[0])
		}
	}
	// Columns or y far from 1 in magnitude are fitted after an exact
	// power-of-two scaling, and the results scaled back (unscale).
	kx := make([]int, p)
	for j, c := range cols {
		kx[j] = pow2Shift(c)
	}
	return fitShifted(cols, y, conf, perRow, kx, pow2Shift(y))
}

// fitShifted is leastSquaresScaled past its checks, given the shifts
// (pow2Shift) of the columns, kx, and of y, ky.
func fitShifted(cols [][]float64, y []float64, conf float64, perRow bool, kx []int, ky int) (Regression, error) {
	fit := leastSquares
	if !perRow {
		fit = lsqSummary
	}
	p := len(cols)
	scaled := ky != 0
	for _, k := range kx {
		scaled = scaled || k != 0
	}
	if !scaled {
		return fit(cols, y, conf)
	}
	sc := make([][]float64, p)
	for j, c := range cols {
		sc[j] = ldexpAll(c, kx[j])
	}
	r, err := fit(sc, ldexpAll(y, ky), conf)
	if err != nil {
		return Regression{}, err
	}
	r.unscale(kx, ky)
	return r, nil
}

// pow2Shift returns the k for which v·2^k has its largest magnitude in
// [1/2, 1), or 0 when that magnitude already lies within 2^±400. Inside
// that range every square, product and sum of n ≤ 2³¹ centred values is a
// normal double (a deviation is at least an ulp of the largest value,
// 2^−452 there); outside it, squares of 1e-200 underflow and of 1e300
// overflow, so a varying column looked constant or gave Inf. Scaling by a
// power of two is exact, so the scaled fit is the same fit (up to values
// below 2^−1022 that lose digits), whatever the units of the data.
func pow2Shift(v []float64) int {
	// A plain comparison, not math.Max (which handles signed zeros and
	// NaN on every call and was a tenth of a study's time at 10⁷ rows); a
	// NaN fails every comparison and is caught apart.
	var m float64
	nan := false
	for _, a := range v {
		if b := math.Abs(a); b > m {
			m = b
		} else if b != b {
			nan = true
		}
	}
	if nan {
		return 0
	}
	return shiftFor(m)
}

// shiftFor is pow2Shift of values whose largest magnitude is m (no NaN).
func shiftFor(m float64) int {
	if m == 0 || math.IsInf(m, 0) {
		return 0
	}
	_, e := math.Frexp(m)
	if e >= -400 && e <= 400 {
		return 0
	}
	return -e
}

// ldexpAll returns v·2^k, element by element.
func ldexpAll(v []float64, k int) []float64 {
	out := hugepage.Make[float64](len(v))
	for i, a := range v {
		out[i] = math.Ldexp(a, k)
	}
	return out
}

// allEqual reports whether every value of v equals the first.
func allEqual(v []float64) bool {
	for _, a := range v[1:] {
		if a != v[0] {
			return false
		}
	}
	return true
}

// unscale turns a fit of y·2^ky on cols[j]·2^kx[j] into the fit of y on
// cols: slopes by 2^(kx[j]−ky), the intercept, residual scale, fitted
// values and residuals by 2^−ky, sums of squares by 2^−2ky (they overflow to
// +Inf or underflow to 0 when the data's squares do), AIC by −2·ky·N·ln 2,
// column means by 2^−kx[j] and R⁻¹'s row j by 2^kx[j] (R of the scaled
// design is R·diag(2^kx)). R², F, t and p values and leverages do not
// change.
func (r *Regression) unscale(kx []int, ky int) {
	sc := func(c Coef, k int) Coef {
		c.Estimate, c.SE = math.Ldexp(c.Estimate, k), math.Ldexp(c.SE, k)
		c.CILow, c.CIHigh = math.Ldexp(c.CILow, k), math.Ldexp(c.CIHigh, k)
		return c
	}
	r.Coef[0] = sc(r.Coef[0], -ky)
	for j, k := range kx {
		r.Coef[j+1] = sc(r.Coef[j+1], k-ky)
		r.b[j] = math.Ldexp(r.b[j], k-ky)
		r.means[j] = math.Ldexp(r.means[j], -k)
		r.mlo[j] = math.Ldexp(r.mlo[j], -k)
		for c := j; c < r.p; c++ {
			r.rinv[j*r.p+c] = math.Ldexp(r.rinv[j*r.p+c], k)
		}
	}
	r.ResidualSE = math.Ldexp(r.ResidualSE, -ky)
	r.RSS, r.TSS = math.Ldexp(r.RSS, -2*ky), math.Ldexp(r.TSS, -2*ky)
	r.AIC -= 2 * float64(ky) * float64(r.N) * math.Ln2
	r.ymean, r.ylo = math.Ldexp(r.ymean, -ky), math.Ldexp(r.ylo, -ky)
	for i := range r.Fitted {
		r.Fitted[i] = math.Ldexp(r.Fitted[i], -ky)
		r.Residuals[i] = math.Ldexp(r.Residuals[i], -ky)
	}
}

// leastSquares is LeastSquares on checked columns of moderate magnitude.
func leastSquares(cols [][]float64, y []float64, conf float64) (Regression, error) {
	n, p := len(y), len(cols)
	r := Regression{N: n, DFResid: n - p - 1, p: p}
	// Means in two parts (meanParts), so that the centred values keep their
	// digits when a column or y is far from 0.
	yhi, ylo, tss := meanParts(y)
	r.ymean, r.ylo, r.TSS = yhi, ylo, tss
	r.means = make([]float64, p)
	r.mlo = make([]float64, p)
	colSS := make([]float64, p)
	a := make([]float64, n*p) // row-major centred design
	for j, c := range cols {
		hi, lo, ss := meanParts(c)
		r.means[j], r.mlo[j], colSS[j] = hi, lo, ss
		if !(ss > 0) {
			return Regression{}, fmt.Errorf("least squares: predictor %d is constant (every row %v): it cannot be fitted", j+1, c[0])
		}
		for i, v := range c {
			a[i*p+j] = (v - hi) - lo
		}
	}
	yc := hugepage.Make[float64](n)
	for i, v := range y {
		yc[i] = (v - yhi) - ylo
	}
	if p == 0 {
		return r.finish(cols, y, nil, conf), nil
	}

	A := blas64.General{Rows: n, Cols: p, Stride: p, Data: a}
	tau := make([]float64, p)
	work := []float64{0}
	lapack64.Geqrf(A, tau, work, -1)
	work = make([]float64, int(work[0]))
	lapack64.Geqrf(A, tau, work, len(work))

	R := make([]float64, p*p)
	for i := 0; i < p; i++ {
		for j := i; j < p; j++ {
			R[i*p+j] = a[i*p+j]
		}
	}
	for j := 0; j < p; j++ {
		if !(math.Abs(R[j*p+j]) >= rankTol*math.Sqrt(colSS[j])) {
			return Regression{}, fmt.Errorf("least squares: predictor %d is (numerically) a linear combination of the predictors before it: drop it or the one it duplicates", j+1)
		}
	}
	solve := func(rhs []float64) []float64 {
		c := blas64.General{Rows: n, Cols: 1, Stride: 1, Data: rhs}
		w := []float64{0}
		lapack64.Ormqr(blas.Left, blas.Trans, A, tau, c, w, -1)
		if len(work) < int(w[0]) {
			work = make([]float64, int(w[0]))
		}
		lapack64.Ormqr(blas.Left, blas.Trans, A, tau, c, work, len(work))
		b := blas64.General{Rows: p, Cols: 1, Stride: 1, Data: rhs[:p:p]}
		lapack64.Trtrs(blas.NoTrans, blas64.Triangular{N: p, Stride: p, Data: R, Uplo: blas.Upper, Diag: blas.NonUnit}, b)
		return rhs[:p:p]
	}
	b := append([]float64(nil), solve(yc)...)
	// One step of refinement: solve for the correction from the residuals
	// of the centred problem, computed from the original columns.
	res := yc // reused: solve overwrote yc, which is no longer needed
	for i := range res {
		s := (y[i] - yhi) - ylo
		for j, c := range cols {
			s -= b[j] * ((c[i] - r.means[j]) - r.mlo[j])
		}
		res[i] = s
	}
	d := solve(res)
	for j := range b {
		b[j] += d[j]
	}

	var rinv mat.TriDense
	if err := rinv.InverseTri(mat.NewTriDense(p, mat.Upper, R)); err != nil && !errors.As(err, new(mat.Condition)) {
		return Regression{}, fmt.Errorf("least squares: %v", err)
	}
	r.rinv = make([]float64, p*p)
	for i := 0; i < p; i++ {
		for j := i; j < p; j++ {
			r.rinv[i*p+j] = rinv.At(i, j)
		}
	}
	return r.finish(cols, y, b, conf), nil
}

// finish fills fitted values, residuals, leverages, sums of squares and
// inference from the slopes b.
func (r Regression) finish(cols [][]float64, y, b []float64, conf float64) Regression {
	n, p := r.N, r.p
	nf := float64(n)
	r.Fitted = hugepage.Make[float64](n)
	r.Residuals = hugepage.Make[float64](n)
	r.Leverage = hugepage.Make[float64](n)
	xc := make([]float64, p)
	var rss, ess float64
	for i := 0; i < n; i++ {
		var f float64
		for j, c := range cols {
			xc[j] = (c[i] - r.means[j]) - r.mlo[j]
			f += b[j] * xc[j]
		}
		e := ((y[i] - r.ymean) - r.ylo) - f
		r.Residuals[i] = e
		r.Fitted[i] = r.ymean + (r.ylo + f)
		rss += e * e
		ess += f * f
		// u = xcᵀ·R⁻¹ (R⁻¹ upper triangular): uₖ = Σ_{j≤k} xcⱼ·R⁻¹ⱼₖ.
		h := 1 / nf
		for k := 0; k < p; k++ {
			var s float64
			for j := 0; j <= k; j++ {
				s += xc[j] * r.rinv[j*p+k]
			}
			h += s * s
		}
		r.Leverage[i] = math.Min(1, h) // ≤ 1 in exact arithmetic
	}
	return r.infer(rss, ess, b, conf)
}

// infer fills the sums of squares and the inference from the residual and
// regression sums of squares and the slopes b.
func (r Regression) infer(rss, ess float64, b []float64, conf float64) Regression {
	n, p := r.N, r.p
	nf := float64(n)
	r.RSS = rss
	k := p + 1
	df := float64(r.DFResid)
	nan := math.NaN()
	s := nan
	if r.DFResid > 0 {
		s = math.Sqrt(rss / df)
	}
	r.ResidualSE = s
	r.R2, r.AdjR2, r.F, r.FP = nan, nan, nan, nan
	if r.TSS > 0 {
		r.R2 = 1 - rss/r.TSS
		if r.DFResid > 0 {
			r.AdjR2 = 1 - (1-r.R2)*(nf-1)/df
		}
	}
	if p > 0 && r.DFResid > 0 {
		r.F = (ess / float64(p)) / (rss / df)
		r.FP = UpperF(r.F, float64(p), df)
	}
	r.AIC = nf*math.Log(rss/nf) + 2*float64(k)

	tq := nan
	if r.DFResid > 0 && conf > 0 && conf < 1 {
		tq = TQuantile(0.5+conf/2, df)
	}
	coef := func(est, se float64) Coef { return makeCoef(est, se, tq, r.DFResid) }
	r.b = append([]float64(nil), b...)
	r.Coef = make([]Coef, k)
	b0 := r.ymean + r.ylo
	for j := range b {
		b0 -= b[j] * (r.means[j] + r.mlo[j])
	}
	// Var(b0) = s²(1/n + ‖x̄ᵀR⁻¹‖²).
	v0 := 1 / nf
	for kk := 0; kk < p; kk++ {
		var t float64
		for j := 0; j <= kk; j++ {
			t += (r.means[j] + r.mlo[j]) * r.rinv[j*p+kk]
		}
		v0 += t * t
	}
	r.Coef[0] = coef(b0, s*math.Sqrt(v0))
	for j := 0; j < p; j++ {
		// (R⁻¹R⁻ᵀ)ⱼⱼ = Σₖ (R⁻¹ⱼₖ)², row j of R⁻¹.
		var q float64
		for kk := j; kk < p; kk++ {
			q += r.rinv[j*p+kk] * r.rinv[j*p+kk]
		}
		r.Coef[j+1] = coef(b[j], s*math.Sqrt(q))
	}
	return r
}

// makeCoef returns the coefficient with its t, p and interval from the
// estimate, its standard error, the t quantile tq and the residual degrees
// of freedom (NaN inference when there are none).
func makeCoef(est, se, tq float64, dfResid int) Coef {
	nan := math.NaN()
	c := Coef{Estimate: est, SE: se, T: est / se}
	c.P = TwoSidedT(c.T, float64(dfResid))
	c.CILow, c.CIHigh = est-tq*se, est+tq*se
	if dfResid <= 0 {
		c.T, c.P, c.CILow, c.CIHigh = nan, nan, nan, nan
	}
	return c
}

// Predict returns the fitted mean response at the predictor values z (one
// per column, in the order of the fit), and the confidence interval for
// the mean response and the prediction interval for a new observation at
// level conf:
//
//	ŷ ± t_{(1+conf)/2, df}·s·√(1/n + ‖(z−x̄)ᵀR⁻¹‖²)        (mean response)
//	ŷ ± t_{(1+conf)/2, df}·s·√(1 + 1/n + ‖(z−x̄)ᵀR⁻¹‖²)    (new observation)
//
// (e.g. Montgomery, Peck & Vining 2012, Introduction to Linear Regression
// Analysis, 5th ed., §3.4–3.5). The intervals are NaN when DFResid is 0.
// It panics if len(z) differs from the number of columns. For a fit made
// by Polynomial, z is PowerRow(x0, degree) and only z[0] = x0 is read (the
// fit's own columns are powers of the centred x). Predicting outside
// the observed range of the columns is extrapolation: the interval does
// not cover the error of the model's form there.
func (r Regression) Predict(z []float64, conf float64) (fit, confLow, confHigh, predLow, predHigh float64) {
	p := r.p
	if len(z) != p {
		panic(fmt.Sprintf("stats: Regression.Predict: %d values for %d columns", len(z), p))
	}
	if r.poly != nil && p > 0 {
		z = PowerRow((z[0]-r.poly.c)/r.poly.s, p)
	}
	f := r.ylo
	q := 1 / float64(r.N)
	for k := 0; k < p; k++ {
		f += r.b[k] * ((z[k] - r.means[k]) - r.mlo[k])
		var t float64
		for j := 0; j <= k; j++ {
			t += ((z[j] - r.means[j]) - r.mlo[j]) * r.rinv[j*p+k]
		}
		q += t * t
	}
	fit = r.ymean + f
	nan := math.NaN()
	if r.DFResid <= 0 || !(conf > 0 && conf < 1) {
		return fit, nan, nan, nan, nan
	}
	tq := TQuantile(0.5+conf/2, float64(r.DFResid))
	hc := tq * r.ResidualSE * math.Sqrt(q)
	hp := tq * r.ResidualSE * math.Sqrt(1+q)
	return fit, fit - hc, fit + hc, fit - hp, fit + hp
}

// FittedAt returns the fitted value of a Polynomial fit at x (Predict's
// fit, without the intervals): computed in the centred and scaled powers
// of t = (x − c)/s the fit was made in, so it keeps its digits where x is
// far from 0. It panics for a fit that Polynomial did not make.
func (r Regression) FittedAt(x float64) float64 {
	if r.poly == nil {
		panic("stats: Regression.FittedAt: not a Polynomial fit")
	}
	t := (x - r.poly.c) / r.poly.s
	f, v := r.ylo, 1.0
	for k := 0; k < r.p; k++ {
		v *= t
		f += r.b[k] * ((v - r.means[k]) - r.mlo[k])
	}
	return r.ymean + f
}

// Polynomial fits y = b0 + b1·x + b2·x² + … + b_d·x^d by least squares and
// reports the coefficients of the raw powers of x.
//
// Algorithm: x is first centred and scaled, t = (x − c)/s with c = x̄ and
// s = max|x − x̄|, and LeastSquares fits y on t, t², …, t^d (each centred
// again inside it). Raw powers of x far from 0 are nearly collinear: on
// x = 10⁹ + 0..10 the columns x and x² have a condition number near 10¹⁶,
// and a fit on them is noise; powers of t ∈ [−1, 1] are well conditioned
// whatever the offset or scale of x (Forsythe 1957, "Generation and use of
// orthogonal polynomials for data-fitting with a digital computer",
// J. SIAM 5(2); Seber & Lee 2003, Linear Regression Analysis, 2nd ed.,
// §7.1). The coefficients a of t are mapped to those of x exactly,
//
//	b_j = Σ_{k≥j} a_k·C(k, j)·(−c)^{k−j} / s^k,     Cov(b) = T·Cov(a)·Tᵀ
//
// with T that upper-triangular map, so the SE, t, p and intervals are
// those of the raw-power coefficients (the leading one, b_d = a_d/s^d, has
// the same t and p as a_d). Fitted values, residuals, leverages, sums of
// squares, R², F and AIC are those of the t fit, which equal the raw fit's
// in exact arithmetic. Predict at PowerRow(x0, degree).
//
// Any finite x is accepted: where a raw-power coefficient b_j leaves the
// range of float64 (x near 1e300 or 1e-200 and j ≥ 2) its estimate, SE
// and interval overflow to ±Inf or underflow to 0, but its t and p are
// computed on the scale of t and stay right (rawPowerCoef).
//
// It returns an error for degree < 1, a non-finite x, x with fewer than
// degree+1 distinct values, or whatever LeastSquares rejects.
func Polynomial(x, y []float64, degree int, conf float64) (Regression, error) {
	return polynomial(x, y, degree, conf, true)
}

// PolynomialSummary is Polynomial without the per-row outputs (fitted
// values, residuals and leverages are nil), fitted by LeastSquaresSummary.
func PolynomialSummary(x, y []float64, degree int, conf float64) (Regression, error) {
	return polynomial(x, y, degree, conf, false)
}

func polynomial(x, y []float64, degree int, conf float64, perRow bool) (Regression, error) {
	if len(x) != len(y) {
		panic("stats: Polynomial: x and y lengths differ")
	}
	if degree < 1 {
		return Regression{}, fmt.Errorf("polynomial: degree %d: want 1 or more", degree)
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return Regression{}, fmt.Errorf("polynomial: x row %d is %v: remove non-finite values first", i+1, v)
		}
	}
	if len(x) < degree+1 {
		return Regression{}, fmt.Errorf("polynomial: %d rows cannot fit a degree-%d polynomial: need at least %d", len(x), degree, degree+1)
	}
	c, _ := meanSS(x)
	var s float64
	for _, v := range x {
		if d := math.Abs(v - c); d > s { // x is finite (checked above)
			s = d
		}
	}
	if d := distinctAtMost(x, degree+1); d < degree+1 {
		return Regression{}, fmt.Errorf("polynomial: x takes %d distinct value(s): a degree-%d polynomial needs at least %d", d, degree, degree+1)
	}
	if !perRow {
		// The powers of t are made row by row, never stored (degree
		// columns of n). t lies in [−1, 1]; y is checked and, far from 1
		// in magnitude, scaled as LeastSquares does.
		for i, v := range y {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return Regression{}, fmt.Errorf("least squares: response row %d is %v: remove non-finite values first", i+1, v)
			}
		}
		return polySummary(x, y, degree, conf, c, s, pow2Shift(y))
	}
	cols := make([][]float64, degree)
	for d := range cols {
		col := hugepage.Make[float64](len(x))
		for i, v := range x {
			if d == 0 {
				col[i] = (v - c) / s
			} else {
				col[i] = cols[d-1][i] * cols[0][i]
			}
		}
		cols[d] = col
	}
	r, err := leastSquaresScaled(cols, y, conf, perRow)
	if err != nil {
		return Regression{}, err
	}
	r.poly = &polyMap{c: c, s: s}
	r.Coef = r.rawPowerCoef(conf)
	return r, nil
}

// polySummary is PolynomialSummary past its checks: x and y finite, x
// with at least degree+1 distinct values, c its mean and s the largest
// |x − c|, ky the shift (pow2Shift) of y.
func polySummary(x, y []float64, degree int, conf, c, s float64, ky int) (Regression, error) {
	q := degree + 1
	r, err := lsqSummaryRows(len(x), degree, func(lo, hi int, buf []float64) {
		if degree == 2 {
			// The quadratic, the study's, written out: the general loop
			// below kept its counters in memory (the same values).
			xs, ys := x[lo:hi], y[lo:hi]
			buf = buf[:3*len(xs)]
			for i, v := range xs {
				t := (v - c) / s
				row := buf[3*i : 3*i+3 : 3*i+3]
				row[0], row[1], row[2] = t, t*t, ys[i]
			}
		} else {
			for i := lo; i < hi; i++ {
				row := buf[(i-lo)*q : (i-lo+1)*q]
				t := (x[i] - c) / s
				v := t
				for d := range degree {
					row[d] = v
					v *= t
				}
				row[degree] = y[i]
			}
		}
		if ky != 0 {
			for k := degree; k < len(buf); k += q {
				buf[k] = math.Ldexp(buf[k], ky)
			}
		}
	}, conf)
	if err != nil {
		return Regression{}, err
	}
	if ky != 0 {
		r.unscale(make([]int, degree), ky)
	}
	r.poly = &polyMap{c: c, s: s}
	r.Coef = r.rawPowerCoef(conf)
	return r, nil
}

// distinctAtMost returns the number of distinct values in x, counting no
// further than limit.
func distinctAtMost(x []float64, limit int) int {
	var seen []float64
	for _, v := range x {
		found := false
		for _, u := range seen {
			if u == v {
				found = true
				break
			}
		}
		if !found {
			seen = append(seen, v)
			if len(seen) >= limit {
				break
			}
		}
	}
	return len(seen)
}

// rawPowerCoef maps the coefficients of the powers of t = (x − c)/s to
// those of the powers of x, with their covariance (see Polynomial).
func (r Regression) rawPowerCoef(conf float64) []Coef {
	d := r.p
	c, s := r.poly.c, r.poly.s
	a := make([]float64, d+1)
	for k := range a {
		a[k] = r.Coef[k].Estimate
	}
	// Cov(a)/σ²: slopes G = R⁻¹R⁻ᵀ; a0 = ȳ − mᵀa_s with ȳ uncorrelated
	// with the slopes (centred design), so Var(a0) = 1/n + mᵀGm and
	// Cov(a0, a_s) = −Gm.
	g := make([][]float64, d+1)
	for i := range g {
		g[i] = make([]float64, d+1)
	}
	for j := 0; j < d; j++ {
		for k := j; k < d; k++ {
			var v float64
			for l := k; l < d; l++ {
				v += r.rinv[j*d+l] * r.rinv[k*d+l]
			}
			g[j+1][k+1], g[k+1][j+1] = v, v
		}
	}
	gm := make([]float64, d)
	var mgm float64
	for j := 0; j < d; j++ {
		for k := 0; k < d; k++ {
			gm[j] += g[j+1][k+1] * (r.means[k] + r.mlo[k])
		}
		mgm += (r.means[j] + r.mlo[j]) * gm[j]
	}
	g[0][0] = 1/float64(r.N) + mgm
	for j := 0; j < d; j++ {
		g[0][j+1], g[j+1][0] = -gm[j], -gm[j]
	}
	// T[j][k] = C(k, j)·(−c)^{k−j}/s^k for k ≥ j, taken as s^−j·U[j][k] with
	// U[j][k] = C(k, j)·(−c/s)^{k−j}: the coefficient of x^j, its SE and
	// interval are those of U's row times s^−j, and its t and p those of
	// U's row, so they stay right when s^−j leaves the range of a double
	// (x near 1e300 or 1e-200, where b_j itself may overflow or underflow).
	t := make([][]float64, d+1)
	for j := range t {
		t[j] = make([]float64, d+1)
		for k := j; k <= d; k++ {
			t[j][k] = binom(k, j) * math.Pow(-c/s, float64(k-j))
		}
	}
	tq := math.NaN()
	if r.DFResid > 0 && conf > 0 && conf < 1 {
		tq = TQuantile(0.5+conf/2, float64(r.DFResid))
	}
	out := make([]Coef, d+1)
	for j := 0; j <= d; j++ {
		var b, v float64
		for k := j; k <= d; k++ {
			b += t[j][k] * a[k]
			for l := j; l <= d; l++ {
				v += t[j][k] * g[k][l] * t[j][l]
			}
		}
		cf := makeCoef(b, r.ResidualSE*math.Sqrt(math.Max(v, 0)), tq, r.DFResid)
		for range j {
			cf.Estimate, cf.SE, cf.CILow, cf.CIHigh = cf.Estimate/s, cf.SE/s, cf.CILow/s, cf.CIHigh/s
		}
		out[j] = cf
	}
	return out
}

// binom returns the binomial coefficient C(n, k) for small n.
func binom(n, k int) float64 {
	v := 1.0
	for i := 1; i <= k; i++ {
		v = v * float64(n-k+i) / float64(i)
	}
	return v
}

// PowerRow returns x0, x0², …, x0^degree, the predictor row of Polynomial.
func PowerRow(x0 float64, degree int) []float64 {
	z := make([]float64, degree)
	v := 1.0
	for d := range z {
		v *= x0
		z[d] = v
	}
	return z
}

// LineFit is the straight line y = Intercept + Slope·x by least squares.
type LineFit struct {
	Regression
	Intercept Coef    // = Coef[0]
	Slope     Coef    // = Coef[1]
	MeanX     float64 // x̄
	Sxx       float64 // Σ(x−x̄)²
}

// Line fits the straight line y = b0 + b1·x by LeastSquares (centred
// Householder QR; with one column this is b1 = Sxy/Sxx from centred sums,
// refined once). It returns an error when there are fewer than 2 points, x
// is constant, or a value is not finite. With 2 points the line is exact
// and its inference NaN.
func Line(x, y []float64, conf float64) (LineFit, error) {
	if len(x) != len(y) {
		panic("stats: Line: x and y lengths differ")
	}
	if len(x) < 2 {
		return LineFit{}, fmt.Errorf("straight line: %d points: need at least 2", len(x))
	}
	reg, err := LeastSquares([][]float64{x}, y, conf)
	if err != nil {
		return LineFit{}, err
	}
	mx, sxx := meanSS(x)
	return lineFrom(reg, mx, sxx), nil
}

// LineSummary is Line without the per-row outputs (fitted values,
// residuals and leverages are nil), fitted by LeastSquaresSummary.
func LineSummary(x, y []float64, conf float64) (LineFit, error) {
	if len(x) != len(y) {
		panic("stats: LineSummary: x and y lengths differ")
	}
	if len(x) < 2 {
		return LineFit{}, fmt.Errorf("straight line: %d points: need at least 2", len(x))
	}
	reg, err := LeastSquaresSummary([][]float64{x}, y, conf)
	if err != nil {
		return LineFit{}, err
	}
	mx, sxx := meanSS(x)
	return lineFrom(reg, mx, sxx), nil
}

// lineFrom is the LineFit of reg, the straight line fitted to an x of
// mean mx and centred sum of squares sxx (meanSS).
func lineFrom(reg Regression, mx, sxx float64) LineFit {
	return LineFit{Regression: reg, Intercept: reg.Coef[0], Slope: reg.Coef[1], MeanX: mx, Sxx: sxx}
}

// FittedAt returns the line's fitted value ŷ(x) = ȳ + b·(x − x̄) by the
// centred formula its own fitted values use (means in two parts).
func (l LineFit) FittedAt(x float64) float64 {
	return l.ymean + (l.ylo + l.b[0]*((x-l.means[0])-l.mlo[0]))
}

// Residual returns y − ŷ(x) for the pair (x, y), by the centred formula
// the fit's own residuals use, ((y − ȳ) − b·(x − x̄)) with the means in two
// parts: for a row of the fit it is that row's residual (bit for bit when
// the data needed no scaling, see LeastSquares), so a caller that needs
// the residuals of a few rows does not keep all of them.
func (l LineFit) Residual(x, y float64) float64 {
	return ((y - l.ymean) - l.ylo) - l.b[0]*((x-l.means[0])-l.mlo[0])
}

// ResidualsInto writes Residual(x[i], y[i]) into out[i] for every i <
// len(out) (x and y at least as long), bit for bit, with the fit's figures
// read once rather than once a row.
func (l *LineFit) ResidualsInto(out, x, y []float64) {
	ym, yl, b, mx, ml := l.ymean, l.ylo, l.b[0], l.means[0], l.mlo[0]
	x, y = x[:len(out)], y[:len(out)]
	for i := range out {
		out[i] = ((y[i] - ym) - yl) - b*((x[i]-mx)-ml)
	}
}

// Interval returns the line's mean response at x0 with its confidence
// interval, and the prediction interval for a new observation at x0, both
// at level conf (e.g. Montgomery, Peck & Vining 2012, §2.4.2 and §2.5):
//
//	ŷ ± t_{(1+conf)/2, n−2}·s·√(1/n + (x0−x̄)²/Sxx)
//	ŷ ± t_{(1+conf)/2, n−2}·s·√(1 + 1/n + (x0−x̄)²/Sxx)
//
// The intervals are NaN when n = 2. An x0 outside the observed range is
// extrapolation; the intervals then say nothing about the form of the
// relationship there.
func (l LineFit) Interval(x0, conf float64) (fit, confLow, confHigh, predLow, predHigh float64) {
	// Centred form of the fit, ȳ + b1·(x0 − x̄): less cancellation than
	// b0 + b1·x0 when x is far from 0.
	fit = l.FittedAt(x0)
	nan := math.NaN()
	if l.DFResid <= 0 || !(conf > 0 && conf < 1) {
		return fit, nan, nan, nan, nan
	}
	// (x0 − x̄)²/Sxx as ((x0 − x̄)·R⁻¹)², which stays in range whatever the
	// scale of x (Sxx underflows for x near 1e-200).
	d := ((x0 - l.means[0]) - l.mlo[0]) * l.rinv[0]
	q := 1/float64(l.N) + d*d
	tq := TQuantile(0.5+conf/2, float64(l.DFResid))
	hc := tq * l.ResidualSE * math.Sqrt(q)
	hp := tq * l.ResidualSE * math.Sqrt(1+q)
	return fit, fit - hc, fit + hc, fit - hp, fit + hp
}
