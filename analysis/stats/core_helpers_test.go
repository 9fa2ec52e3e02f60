package stats

// Helpers shared by the tests of the core statistics (describe,
// correlation, lsq, influence). Names carry a "core" prefix so that they
// cannot collide with helpers of other test files in this package.

import (
	"math"
)

// coreClose reports whether got is within tol of want, relatively when
// |want| > 1 and absolutely otherwise; NaN matches only NaN.
func coreClose(got, want, tol float64) bool {
	if math.IsNaN(want) || math.IsNaN(got) {
		return math.IsNaN(want) && math.IsNaN(got)
	}
	if math.IsInf(want, 0) {
		return got == want
	}
	return math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))
}

// corePanics reports whether f panics.
func corePanics(f func()) (panicked bool) {
	defer func() {
		if recover() != nil {
			panicked = true
		}
	}()
	f()
	return false
}

// coreWithout returns x without element i.
func coreWithout(x []float64, i int) []float64 {
	out := make([]float64, 0, len(x)-1)
	out = append(out, x[:i]...)
	return append(out, x[i+1:]...)
}
