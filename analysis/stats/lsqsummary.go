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
	return lsqSummaryRows(len(y), len(cols), columnRows(cols, y), conf)
}

// columnRows is the fill of lsqSummaryRows for stored columns: row i is
// cols[0][i], cols[1][i], …, y[i]. One column (the straight line) is
// written out.
func columnRows(cols [][]float64, y []float64) func(lo, hi int, buf []float64) {
	if len(cols) == 1 {
		x := cols[0]
		return func(lo, hi int, buf []float64) {
			for i := lo; i < hi; i++ {
				buf[2*(i-lo)], buf[2*(i-lo)+1] = x[i], y[i]
			}
		}
	}
	q := len(cols) + 1
	return func(lo, hi int, buf []float64) {
		for i := lo; i < hi; i++ {
			row := buf[(i-lo)*q : (i-lo+1)*q]
			for j, c := range cols {
				row[j] = c[i]
			}
			row[q-1] = y[i]
		}
	}
}

// lsqSummaryRows is lsqSummary on n rows of p predictors that fill writes
// a block at a time: fill(lo, hi, buf) writes rows lo…hi−1 into buf, row
// by row, each the p predictors and then y (q = p + 1 values a row). A
// design that is a function of the data, such as the powers of a
// polynomial, is never stored whole, and the rows come sumBlock at a time
// (one call per block, not per row).
func lsqSummaryRows(n, p int, fill func(lo, hi int, buf []float64), conf float64) (Regression, error) {
	return lsqSummaryKnown(n, p, fill, conf, nil)
}

// colParts are a column's mean in two parts and its centred sum of
// squares, as lsqSummaryRows's first two passes compute them (the
// figures of meanParts).
type colParts struct{ hi, lo, ss float64 }

// lsqSummaryKnown is lsqSummaryRows given, in known (nil, or one per
// column of [A | y]), the figures its first two passes would compute from
// the same rows, summed in the same order: the result is the same to the
// last bit, two passes sooner.
func lsqSummaryKnown(n, p int, fill func(lo, hi int, buf []float64), conf float64, known []colParts) (Regression, error) {
	r := Regression{N: n, DFResid: n - p - 1, p: p}
	q := p + 1 // columns of the augmented matrix [A | y]
	buf := make([]float64, sumBlock*q)
	block := func(b int) []float64 {
		hi := min(b+sumBlock, n)
		fill(b, hi, buf[:(hi-b)*q])
		return buf[:(hi-b)*q]
	}
	// Means in two parts and centred sums of squares, column by column as
	// meanParts takes them (plain sum, then compensated block sums of the
	// deviations).
	// Each sum runs down one column of a block (stride q) with its
	// accumulator in a register, adding the rows in their order.
	hi, lo, ss := make([]float64, q), make([]float64, q), make([]float64, q)
	if known != nil {
		for j, k := range known {
			hi[j], lo[j], ss[j] = k.hi, k.lo, k.ss
		}
	} else {
		for b := 0; b < n; b += sumBlock {
			rows := block(b)
			for j := range q {
				s := hi[j]
				for k := j; k < len(rows); k += q {
					s += rows[k]
				}
				hi[j] = s
			}
		}
		for j := range hi {
			hi[j] /= float64(n)
		}
		cs, qs := make([]ksum, q), make([]ksum, q)
		for b := 0; b < n; b += sumBlock {
			rows := block(b)
			for j := range q {
				var bc, bq float64
				m := hi[j]
				for k := j; k < len(rows); k += q {
					d := rows[k] - m
					bc += d
					bq += d * d
				}
				cs[j].add(bc)
				qs[j].add(bq)
			}
		}
		for j := range q {
			c := cs[j].value()
			lo[j], ss[j] = c/float64(n), qs[j].value()-c*c/float64(n)
		}
	}
	r.ymean, r.ylo, r.TSS = hi[p], lo[p], ss[p]
	r.means, r.mlo = hi[:p:p], lo[:p:p]
	for j := range p {
		if !(ss[j] > 0) {
			return Regression{}, fmt.Errorf("least squares: predictor %d is constant (every row %v): it cannot be fitted", j+1, block(0)[j])
		}
	}
	if p == 0 {
		return r.summariseRows(block, nil, conf), nil
	}
	// m: the stack, row-major, q rows of R over up to summaryBlock rows.
	m := make([]float64, (q+summaryBlock)*q)
	held := 0 // rows of the stack holding R (at most q)
	for b := 0; b < n; b += summaryBlock {
		k := min(b+summaryBlock, n) - b
		fill(b, b+k, m[held*q:(held+k)*q])
		centreRows(m[held*q:(held+k)*q], q, hi, lo)
		householderR(m[:(held+k)*q], held+k, q)
		held = min(held+k, q)
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
		if !(math.Abs(R[j*p+j]) >= rankTol*math.Sqrt(ss[j])) {
			return Regression{}, fmt.Errorf("least squares: predictor %d is (numerically) a linear combination of the predictors before it: drop it or the one it duplicates", j+1)
		}
	}
	r.rinv = invUpper(R, p)
	coef := upperMul(r.rinv, z, p) // R⁻¹·Qᵀy
	// Refinement: Aᵀr from the data, then R⁻¹R⁻ᵀ(Aᵀr).
	// Each row's residual goes in place of its y, then each column's
	// block sum runs down the column as above.
	parts := make([]ksum, p)
	for b := 0; b < n; b += sumBlock {
		rows := block(b)
		switch p {
		case 1:
			// The line, written out (the general loop below kept its
			// counters in memory); the same operations in the same order.
			h0, l0, hy, ly, c0 := hi[0], lo[0], hi[1], lo[1], coef[0]
			var blk float64
			for k := 0; k+2 <= len(rows); k += 2 {
				row := rows[k : k+2 : k+2]
				s := (row[1] - hy) - ly
				d0 := (row[0] - h0) - l0
				s -= c0 * d0
				row[0], row[1] = d0, s
				blk += d0 * s
			}
			parts[0].add(blk)
		case 2:
			// The quadratic, likewise.
			h0, l0, h1, l1, hy, ly, c0, c1 := hi[0], lo[0], hi[1], lo[1], hi[2], lo[2], coef[0], coef[1]
			var blk0, blk1 float64
			for k := 0; k+3 <= len(rows); k += 3 {
				row := rows[k : k+3 : k+3]
				s := (row[2] - hy) - ly
				d0 := (row[0] - h0) - l0
				s -= c0 * d0
				d1 := (row[1] - h1) - l1
				s -= c1 * d1
				row[0], row[1], row[2] = d0, d1, s
				blk0 += d0 * s
				blk1 += d1 * s
			}
			parts[0].add(blk0)
			parts[1].add(blk1)
		default:
			for k := 0; k+q <= len(rows); k += q {
				row := rows[k : k+q]
				s := (row[p] - hi[p]) - lo[p]
				for j := range p {
					row[j] = (row[j] - hi[j]) - lo[j]
					s -= coef[j] * row[j]
				}
				row[p] = s
			}
			for j := range p {
				var blk float64
				for k := 0; k < len(rows); k += q {
					blk += rows[k+j] * rows[k+p]
				}
				parts[j].add(blk)
			}
		}
	}
	atr := make([]float64, p)
	for j := range atr {
		atr[j] = parts[j].value()
	}
	d := upperMul(r.rinv, upperTMul(r.rinv, atr, p), p)
	for j := range coef {
		coef[j] += d[j]
	}
	return r.summariseRows(block, coef, conf), nil
}

// summariseRows is summarise for a design given block by block: block(b)
// returns rows b… of the sumBlock-row block that starts there.
func (r Regression) summariseRows(block func(b int) []float64, b []float64, conf float64) Regression {
	var rss, ess float64
	q := r.p + 1
	for lo := 0; lo < r.N; lo += sumBlock {
		rows := block(lo)
		switch r.p {
		case 1: // the line, written out as in lsqSummaryKnown
			m0, l0, b0 := r.means[0], r.mlo[0], b[0]
			for k := 0; k+2 <= len(rows); k += 2 {
				row := rows[k : k+2 : k+2]
				var f float64
				f += b0 * ((row[0] - m0) - l0)
				e := ((row[1] - r.ymean) - r.ylo) - f
				rss += e * e
				ess += f * f
			}
		case 2: // the quadratic
			m0, l0, b0, m1, l1, b1 := r.means[0], r.mlo[0], b[0], r.means[1], r.mlo[1], b[1]
			for k := 0; k+3 <= len(rows); k += 3 {
				row := rows[k : k+3 : k+3]
				var f float64
				f += b0 * ((row[0] - m0) - l0)
				f += b1 * ((row[1] - m1) - l1)
				e := ((row[2] - r.ymean) - r.ylo) - f
				rss += e * e
				ess += f * f
			}
		default:
			for k := 0; k < len(rows); k += q {
				row := rows[k : k+q]
				var f float64
				for j := range r.p {
					f += b[j] * ((row[j] - r.means[j]) - r.mlo[j])
				}
				e := ((row[r.p] - r.ymean) - r.ylo) - f
				rss += e * e
				ess += f * f
			}
		}
	}
	return r.infer(rss, ess, b, conf)
}

// centreRows takes each column's mean in two parts (hi[j] + lo[j]) from
// every row of rows, q values a row: v − hi − lo in that order. The line's
// and the quadratic's rows are written out (a loop over the columns kept
// its counters in memory).
func centreRows(rows []float64, q int, hi, lo []float64) {
	switch q {
	case 2:
		h0, h1, l0, l1 := hi[0], hi[1], lo[0], lo[1]
		for t := 0; t+2 <= len(rows); t += 2 {
			r := rows[t : t+2 : t+2]
			r[0] = (r[0] - h0) - l0
			r[1] = (r[1] - h1) - l1
		}
	case 3:
		h0, h1, h2, l0, l1, l2 := hi[0], hi[1], hi[2], lo[0], lo[1], lo[2]
		for t := 0; t+3 <= len(rows); t += 3 {
			r := rows[t : t+3 : t+3]
			r[0] = (r[0] - h0) - l0
			r[1] = (r[1] - h1) - l1
			r[2] = (r[2] - h2) - l2
		}
	default:
		for t := 0; t+q <= len(rows); t += q {
			r := rows[t : t+q]
			for j := range q {
				r[j] = (r[j] - hi[j]) - lo[j]
			}
		}
	}
}

// householderR reduces the k×q row-major matrix a to upper-triangular form
// in place by Householder reflections from the left; its first min(k, q)
// rows then hold R (below them, zeros and reflector debris). The sign of
// each diagonal element is that of LAPACK's dgeqrf: the reflection maps a
// column to −sign(a_jj)·‖column‖.
func householderR(a []float64, k, q int) {
	for j := 0; j < q && j < k-1; j++ {
		// Norm of column j from row j down. Its largest magnitude m
		// decides whether the squares need scaling: for m within
		// [2⁻⁴⁰⁰, 2⁴⁰⁰] the sum of k squares can neither overflow nor
		// lose anything but terms below 2⁻¹⁰⁷⁴ against m² ≥ 2⁻⁸⁰⁰, so it is
		// taken directly (the safe range of Blue 1978, "A portable Fortran
		// program to find the Euclidean norm of a vector", ACM TOMS 4(1));
		// outside it each value is divided by m first. The largest
		// magnitude and the direct sum come from one pass. (A plain
		// comparison for the largest magnitude: math.Max, which handles
		// signed zeros and NaN, is a call per value.)
		col := a[j*q+j : (k-1)*q+j+1] // column j from row j down, stride q
		var scale, ss float64
		for i := 0; i < len(col); i += q {
			v := col[i]
			if m := math.Abs(v); m > scale {
				scale = m
			}
			ss += v * v
		}
		if scale == 0 {
			continue
		}
		var norm float64
		if scale >= 0x1p-400 && scale <= 0x1p400 {
			norm = math.Sqrt(ss)
		} else {
			ss = 0
			for i := 0; i < len(col); i += q {
				v := col[i] / scale
				ss += v * v
			}
			norm = scale * math.Sqrt(ss)
		}
		ajj := col[0]
		alpha := -math.Copysign(norm, ajj)
		// v = x − alpha·e1, stored in column j (v_j = ajj − alpha);
		// H = I − 2vvᵀ/(vᵀv), vᵀv = 2·norm·(norm + |ajj|).
		vj := ajj - alpha
		vtv := 2 * norm * (norm + math.Abs(ajj))
		for c := j + 1; c < q; c++ {
			// Column c beside column j: cc[i] is on col[i]'s row.
			cc := a[j*q+c : (k-1)*q+c+1]
			s := vj * cc[0]
			for i := q; i < len(col) && i < len(cc); i += q {
				s += col[i] * cc[i]
			}
			f := 2 * s / vtv
			cc[0] -= f * vj
			for i := q; i < len(col) && i < len(cc); i += q {
				cc[i] -= f * col[i]
			}
		}
		col[0] = alpha
		for i := q; i < len(col); i += q {
			col[i] = 0
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
