package stats

// This file holds the least-squares fit that keeps nothing per row: the
// summary of a model (coefficients with their inference, sums of squares,
// R², F, AIC) for the alternative models a study compares with its line,
// at O(p²) memory instead of the O(n·p) of a Householder QR of the whole
// design and the O(n) of fitted values, residuals and leverages.

import (
	"fmt"
	"math"
)

// summaryBlock is the number of rows stacked under R at each step of the
// blocked QR (lsqSummary).
const summaryBlock = 256

// LeastSquaresSummary is LeastSquares without the per-row outputs: Fitted,
// Residuals and Leverage are nil; every other field is filled the same way
// and agrees with LeastSquares to rounding (TestLeastSquaresSummary).
//
// Algorithm: the centred columns and y (means in two parts, as in
// LeastSquares) are reduced block by block: R of the augmented matrix
// [A | y] so far is stacked on the next summaryBlock rows and the stack is
// brought back to upper-triangular form by Householder reflections
// (Golub & Van Loan 2013, Matrix Computations, 4th ed., Alg. 5.2.1). Each
// step is an orthogonal transformation, so the result is the R of a
// Householder QR of the whole matrix, with the same backward stability;
// this is the sequential form of the tall-skinny QR (Demmel, Grigori,
// Hoemmen & Langou 2012, "Communication-optimal parallel and sequential QR
// and LU factorizations", SIAM J. Sci. Comput. 34(1)). The slopes solve
// R·b = Qᵀy; one step of refinement follows, by the corrected seminormal
// equations d = R⁻¹R⁻ᵀAᵀr with r the residuals from the original columns
// (Björck 1987, "Stability analysis of the method of seminormal equations
// for linear least squares problems", Linear Algebra Appl. 88/89:31–48),
// and the residual and regression sums of squares are taken in a last pass
// with the refined slopes. Four streaming passes in all.
func LeastSquaresSummary(cols [][]float64, y []float64, conf float64) (Regression, error) {
	return leastSquaresScaled(cols, y, conf, false)
}

// lsqSummary is LeastSquaresSummary on checked columns of moderate
// magnitude (see leastSquares).
func lsqSummary(cols [][]float64, y []float64, conf float64) (Regression, error) {
	n, p := len(y), len(cols)
	r := Regression{N: n, DFResid: n - p - 1, p: p}
	yhi, ylo, tss := meanParts(y)
	r.ymean, r.ylo, r.TSS = yhi, ylo, tss
	r.means = make([]float64, p)
	r.mlo = make([]float64, p)
	colSS := make([]float64, p)
	for j, c := range cols {
		hi, lo, ss := meanParts(c)
		r.means[j], r.mlo[j], colSS[j] = hi, lo, ss
		if !(ss > 0) {
			return Regression{}, fmt.Errorf("least squares: predictor %d is constant (every row %v): it cannot be fitted", j+1, c[0])
		}
	}
	if p == 0 {
		return r.summarise(cols, y, nil, conf), nil
	}
	q := p + 1 // columns of the augmented matrix [A | y]
	// m: the stack, row-major, q rows of R over up to summaryBlock rows.
	m := make([]float64, (q+summaryBlock)*q)
	rows := 0 // rows of the stack holding R (at most q)
	for lo := 0; lo < n; lo += summaryBlock {
		hi := min(lo+summaryBlock, n)
		k := rows
		for i := lo; i < hi; i++ {
			row := m[k*q : (k+1)*q]
			for j, c := range cols {
				row[j] = (c[i] - r.means[j]) - r.mlo[j]
			}
			row[p] = (y[i] - yhi) - ylo
			k++
		}
		householderR(m[:k*q], k, q)
		rows = min(k, q)
	}
	R := make([]float64, p*p)
	z := make([]float64, p)
	for i := 0; i < p; i++ {
		for j := i; j < p; j++ {
			R[i*p+j] = m[i*q+j]
		}
		z[i] = m[i*q+p]
	}
	for j := 0; j < p; j++ {
		if !(math.Abs(R[j*p+j]) >= rankTol*math.Sqrt(colSS[j])) {
			return Regression{}, fmt.Errorf("least squares: predictor %d is (numerically) a linear combination of the predictors before it: drop it or the one it duplicates", j+1)
		}
	}
	r.rinv = invUpper(R, p)
	b := upperMul(r.rinv, z, p) // R⁻¹·Qᵀy
	// Refinement: Aᵀr from the original columns, then R⁻¹R⁻ᵀ(Aᵀr).
	atr := make([]float64, p)
	parts := make([]ksum, p)
	xc, blk := make([]float64, p), make([]float64, p)
	for lo := 0; lo < n; lo += sumBlock {
		clear(blk)
		for i := lo; i < min(lo+sumBlock, n); i++ {
			s := (y[i] - yhi) - ylo
			for j, c := range cols {
				xc[j] = (c[i] - r.means[j]) - r.mlo[j]
				s -= b[j] * xc[j]
			}
			for j := range blk {
				blk[j] += xc[j] * s
			}
		}
		for j := range blk {
			parts[j].add(blk[j])
		}
	}
	for j := range atr {
		atr[j] = parts[j].value()
	}
	d := upperMul(r.rinv, upperTMul(r.rinv, atr, p), p)
	for j := range b {
		b[j] += d[j]
	}
	return r.summarise(cols, y, b, conf), nil
}

// householderR reduces the k×q row-major matrix a to upper-triangular form
// in place by Householder reflections from the left; its first min(k, q)
// rows then hold R (below them, zeros and reflector debris). The sign of
// each diagonal element is that of LAPACK's dgeqrf: the reflection maps a
// column to −sign(a_jj)·‖column‖.
func householderR(a []float64, k, q int) {
	for j := 0; j < q && j < k-1; j++ {
		// Norm of column j from row j down, scaled against overflow.
		var scale float64
		for i := j; i < k; i++ {
			scale = math.Max(scale, math.Abs(a[i*q+j]))
		}
		if scale == 0 {
			continue
		}
		var ss float64
		for i := j; i < k; i++ {
			v := a[i*q+j] / scale
			ss += v * v
		}
		norm := scale * math.Sqrt(ss)
		ajj := a[j*q+j]
		alpha := -math.Copysign(norm, ajj)
		// v = x − alpha·e1, stored in column j (v_j = ajj − alpha);
		// H = I − 2vvᵀ/(vᵀv), vᵀv = 2·norm·(norm + |ajj|).
		vj := ajj - alpha
		vtv := 2 * norm * (norm + math.Abs(ajj))
		for c := j + 1; c < q; c++ {
			s := vj * a[j*q+c]
			for i := j + 1; i < k; i++ {
				s += a[i*q+j] * a[i*q+c]
			}
			f := 2 * s / vtv
			a[j*q+c] -= f * vj
			for i := j + 1; i < k; i++ {
				a[i*q+c] -= f * a[i*q+j]
			}
		}
		a[j*q+j] = alpha
		for i := j + 1; i < k; i++ {
			a[i*q+j] = 0
		}
	}
}

// invUpper returns the inverse of the p×p row-major upper-triangular R
// (nonsingular), by back substitution column by column.
func invUpper(R []float64, p int) []float64 {
	inv := make([]float64, p*p)
	for c := 0; c < p; c++ {
		for i := c; i >= 0; i-- {
			s := 0.0
			if i == c {
				s = 1
			}
			for k := i + 1; k <= c; k++ {
				s -= R[i*p+k] * inv[k*p+c]
			}
			inv[i*p+c] = s / R[i*p+i]
		}
	}
	return inv
}

// upperMul returns U·v for the p×p row-major upper-triangular U.
func upperMul(U, v []float64, p int) []float64 {
	out := make([]float64, p)
	for i := 0; i < p; i++ {
		var s float64
		for k := i; k < p; k++ {
			s += U[i*p+k] * v[k]
		}
		out[i] = s
	}
	return out
}

// upperTMul returns Uᵀ·v for the p×p row-major upper-triangular U.
func upperTMul(U, v []float64, p int) []float64 {
	out := make([]float64, p)
	for i := 0; i < p; i++ {
		var s float64
		for k := 0; k <= i; k++ {
			s += U[k*p+i] * v[k]
		}
		out[i] = s
	}
	return out
}
