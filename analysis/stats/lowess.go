package stats

// This file holds LOWESS, the locally weighted scatterplot smoother drawn
// over the scatter to show the relationship's shape without assuming one.

import (
	"math"

	"bivar/internal/hugepage"
)

// LowessAutoDeltaN is the sample size above which a negative delta
// argument to Lowess or LowessCurve means 0.01·(max x − min x); at or below
// it a negative delta means 0 (a local fit at every distinct x).
const LowessAutoDeltaN = 2000

// LowessCurveMax is the most points LowessCurve returns.
const LowessCurveMax = 1000

// Lowess returns the LOWESS fitted value at each x, in input order
// (Cleveland, W. S. (1979), "Robust locally weighted regression and
// smoothing scatterplots", JASA 74(368):829–836).
//
// With the points sorted by x (stably, so tied x keep their input order),
// the fit at x_i is the weighted least-squares line through the
// k = ⌊frac·n + 1e-10⌋ nearest neighbours of x_i (k at least 2, at most n),
// evaluated at x_i, with tricube weights
//
//	w_j = (1 − (|x_j − x_i| / h_i)³)³
//
// h_i the distance to the farthest of the k. After the first fit, iter
// robustifying iterations refit with each weight multiplied by the bisquare
// of the residual, B(e_j / 6s) with B(u) = (1 − u²)² for |u| < 1 and 0
// otherwise, s the median absolute residual (Cleveland 1979, the robustness
// iterations; when s = 0, points with a nonzero residual get weight 0).
//
// delta saves work on large n: local fits are made only at anchor points,
// the next anchor being the last point within delta of the current one,
// and fitted values between anchors are interpolated linearly (the "delta"
// of Cleveland's program: Cleveland, W. S. (1981), "LOWESS: a program for
// smoothing scatterplots by robust locally weighted regression", Am. Stat.
// 35(1):54). Points tied in x share one fit. Every two anchors advance x by
// more than delta, so there are at most 2·range/delta + 2 of them, and the
// cost is O(n log n) for the sort plus O(anchors·k + n) per iteration: with
// delta a fixed fraction of the range, linear in n. A negative delta
// chooses it: 0 when n ≤ LowessAutoDeltaN (exact, O(n·k)), else
// 0.01·(max x − min x), at most 202 anchors, the choice statsmodels'
// documentation suggests for large n. (Measured: 1.5 s for 10⁶ points with
// frac 2/3 and 3 iterations, see BenchmarkLowess1e6.)
//
// The conventions are those of statsmodels' lowess(y, x, frac, it, delta)
// (statsmodels.nonparametric.smoothers_lowess, version 0.13), whose fitted
// values it matches: the neighbourhood window, the fallback to y_i when
// only one point has nonzero weight, the floor on the weighted variance of
// x in the window (here 1e-12·(max x − min x)², so that a change of units
// does not change the fit; statsmodels floors at the absolute 1e-12), and
// the interpolation. One deliberate difference: where k or more points share
// x_i (so h_i = 0) statsmodels returns y_i of the first of them; here the
// fit is the robustness-weighted mean of all the points at x_i, as in
// Cleveland's own routine, which does not depend on their order.
//
// x and y must have equal length (it panics otherwise). Pairs with a NaN or
// infinite value are left out of the fit and get NaN; all values are NaN
// when fewer than two pairs are finite. iter < 0 counts as 0.
func Lowess(x, y []float64, frac float64, iter int, delta float64) []float64 {
	if len(x) != len(y) {
		panic("stats: Lowess: x and y lengths differ")
	}
	fit := hugepage.Make[float64](len(x))
	for i := range fit {
		fit[i] = math.NaN()
	}
	order, xs, ys := lowessSort(x, y)
	if len(order) < 2 {
		return fit
	}
	f, _ := lowessSorted(xs, ys, frac, iter, delta)
	for k, i := range order {
		fit[i] = f[k]
	}
	return fit
}

// LowessCurve returns the LOWESS curve of Lowess(x, y, frac, iter, delta)
// for plotting: points (xs[k], ys[k]) in increasing x, one per distinct x at
// which a local fit was made (every distinct x when delta is 0; the anchors
// and the last point otherwise, which represent the interpolated fit
// exactly). Beyond LowessCurveMax points, evenly spaced ones (by position,
// first and last kept) are returned. Both are nil when fewer than two pairs
// are finite.
func LowessCurve(x, y []float64, frac float64, iter int, delta float64) (xs, ys []float64) {
	if len(x) != len(y) {
		panic("stats: LowessCurve: x and y lengths differ")
	}
	order, sx, sy := lowessSort(x, y)
	if len(order) < 2 {
		return nil, nil
	}
	f, anchors := lowessSorted(sx, sy, frac, iter, delta)
	// The last point is always fitted or tied to the last anchor; the check
	// keeps x strictly increasing either way.
	if last := len(sx) - 1; sx[anchors[len(anchors)-1]] != sx[last] {
		anchors = append(anchors, last)
	}
	if m := len(anchors); m > LowessCurveMax {
		thin := make([]int, LowessCurveMax)
		for k := range thin {
			thin[k] = anchors[k*(m-1)/(LowessCurveMax-1)]
		}
		anchors = thin
	}
	xs = make([]float64, len(anchors))
	ys = make([]float64, len(anchors))
	for k, i := range anchors {
		xs[k], ys[k] = sx[i], f[i]
	}
	return xs, ys
}

// lowessSort returns the indices of the finite pairs ordered stably by x and
// the sorted x and y.
func lowessSort(x, y []float64) (order []int, xs, ys []float64) {
	keep := hugepage.Empty[int](len(x))
	for i := range x {
		if !math.IsNaN(x[i]) && !math.IsInf(x[i], 0) && !math.IsNaN(y[i]) && !math.IsInf(y[i], 0) {
			keep = append(keep, i)
		}
	}
	kx := make([]float64, len(keep))
	for k, i := range keep {
		kx[k] = x[i]
	}
	order = stableArgsort(kx)
	for k, j := range order {
		order[k] = keep[j]
	}
	xs = make([]float64, len(order))
	ys = make([]float64, len(order))
	for k, i := range order {
		xs[k], ys[k] = x[i], y[i]
	}
	return order, xs, ys
}

// lowessSorted runs LOWESS on x sorted ascending (n ≥ 2) and returns the
// fitted values and the indices where a local fit was made, ascending.
func lowessSorted(x, y []float64, frac float64, iter int, delta float64) (fit []float64, anchors []int) {
	n := len(x)
	k := int(frac*float64(n) + 1e-10)
	k = max(2, min(k, n))
	if iter < 0 {
		iter = 0
	}
	xRange := x[n-1] - x[0]
	if delta < 0 || math.IsNaN(delta) {
		delta = 0
		if n > LowessAutoDeltaN {
			delta = 0.01 * xRange
		}
	}
	varFloor := 1e-12 * xRange * xRange
	fit = hugepage.Make[float64](n)
	var robust []float64 // nil on the first pass
	w := make([]float64, k)
	absRes := hugepage.Make[float64](n)
	for it := 0; it <= iter; it++ {
		anchors = anchors[:0]
		left, right := 0, k // window [left, right)
		last := -1          // last index with a fitted value
		i := 0
		for {
			// Slide the window right while x_right is closer to x_i than
			// x_left (statsmodels' update_neighborhood).
			for right < n && x[i] > (x[left]+x[right])/2 {
				left++
				right++
			}
			fit[i] = lowessLocal(x, y, robust, w, i, left, right, varFloor)
			anchors = append(anchors, i)
			// Interpolate the points skipped since the last fit.
			if last < i-1 {
				xl, yl := x[last], fit[last]
				den := x[i] - xl
				for j := last + 1; j < i; j++ {
					a := (x[j] - xl) / den
					fit[j] = a*fit[i] + (1-a)*yl
				}
			}
			// Next anchor: copy the fit to ties of x_i, then jump to the last
			// point within delta (statsmodels' update_indices).
			last = i
			cut := x[i] + delta
			j := last + 1
			for ; j < n; j++ {
				if x[j] > cut {
					break
				}
				if x[j] == x[last] {
					fit[j] = fit[last]
					last = j
				}
			}
			if j == n {
				j = n - 1 // the loop variable's last value, as in the reference
			}
			i = max(j-1, last+1)
			if last >= n-1 {
				break
			}
		}
		if it == iter {
			break
		}
		// Bisquare robustness weights from the residuals.
		for j := range absRes {
			absRes[j] = math.Abs(y[j] - fit[j])
		}
		if robust == nil {
			robust = hugepage.Make[float64](n)
		}
		for j := range absRes {
			robust[j] = absRes[j]
		}
		s := medianInPlace(absRes)
		for j := range robust {
			u := robust[j]
			if s == 0 {
				if u > 0 {
					u = 1
				}
			} else {
				u /= 6 * s
			}
			if u >= 1 {
				robust[j] = 0
			} else {
				robust[j] = (1 - u*u) * (1 - u*u)
			}
		}
	}
	return fit, anchors
}

// lowessLocal returns the weighted local-line fit at x[i] over the window
// [left, right); robust (nil on the first pass) multiplies the tricube
// weights; w is workspace of length ≥ right−left.
func lowessLocal(x, y, robust, w []float64, i, left, right int, varFloor float64) float64 {
	xi := x[i]
	h := math.Max(xi-x[left], x[right-1]-xi)
	if h == 0 {
		// k or more points at x_i: the weighted mean of all of them.
		var sw, swy float64
		for j := i; j >= 0 && x[j] == xi; j-- {
			rw := 1.0
			if robust != nil {
				rw = robust[j]
			}
			sw += rw
			swy += rw * y[j]
		}
		for j := i + 1; j < len(x) && x[j] == xi; j++ {
			rw := 1.0
			if robust != nil {
				rw = robust[j]
			}
			sw += rw
			swy += rw * y[j]
		}
		if !(sw > 0) {
			return y[i]
		}
		return swy / sw
	}
	// Pass 1: tricube × robustness weights and their sums.
	var sw, swx, swy float64
	nonzero := 0
	w = w[:right-left]
	invH := 1 / h
	for j := left; j < right; j++ {
		d := math.Abs(x[j]-xi) * invH
		v := 0.0
		if d < 1 {
			t := 1 - d*d*d
			v = t * t * t
		}
		if robust != nil {
			v *= robust[j]
		}
		w[j-left] = v
		sw += v
		swx += v * x[j]
		swy += v * y[j]
		if v != 0 {
			nonzero++
		}
	}
	if !(sw > 0) || nonzero == 1 {
		return y[i]
	}
	// Pass 2: about the weighted means, the weighted line at x_i,
	// ȳ_w + (x_i − x̄_w)·Σw(x−x̄_w)(y−ȳ_w) / Σw(x−x̄_w)², which is
	// statsmodels' Σ_j w_j(1 + (x_i − x̄_w)(x_j − x̄_w)/S)·y_j with normalised
	// weights. Centring y too keeps the digits when y is far from 0:
	// Σw(x−x̄_w) is only zero up to rounding, and times an uncentred
	// y = 10⁹ + small that rounding moved the fit by tens of units.
	mx, my := swx/sw, swy/sw
	var sxx, sxy float64
	for j := left; j < right; j++ {
		v := w[j-left]
		d := x[j] - mx
		sxx += v * d * d
		sxy += v * d * (y[j] - my)
	}
	sxx = math.Max(sxx/sw, varFloor)
	return my + (xi-mx)*(sxy/sw)/sxx
}
