package stats

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sync"
	"testing"
)

// sortedFigures is every figure a Sorted takes from its cached Moments
// (Sorted.Moments), written out to the last bit (%#v shows the unexported
// two-part means too; the polynomial's map by value, not its address).
func sortedFigures(s *Sorted) string {
	show := func(r Regression, err error) string {
		pm := r.poly
		r.poly = nil
		return fmt.Sprintf("%#v %#v %v", r, pm, err)
	}
	out := fmt.Sprintf("%#v\n", s.Moments())
	dx, dy := s.Describe()
	out += fmt.Sprintf("%#v %#v\n", dx, dy)
	l, err := s.LineSummary(0.95)
	out += fmt.Sprintf("%#v %v\n", l, err)
	if err == nil {
		f, a, b, p, ok := s.LackOfFit(l.Slope.Estimate)
		out += fmt.Sprint(f, a, b, p, ok, "\n")
	}
	for d := 1; d <= 3; d++ {
		out += show(s.PolynomialSummary(d, 0.95)) + "\n"
	}
	return out
}

// plainFigures is sortedFigures by the functions that sum their own
// means on every call (CentredMoments, Describe, LineSummary,
// lackOfFitSorted without known means, PolynomialSummary) on the sorted
// pairs: what the Sorted methods gave before they shared Moments.
func plainFigures(x, y []float64) string {
	show := func(r Regression, err error) string {
		pm := r.poly
		r.poly = nil
		return fmt.Sprintf("%#v %#v %v", r, pm, err)
	}
	out := fmt.Sprintf("%#v\n", CentredMoments(x, y))
	out += fmt.Sprintf("%#v %#v\n", Describe(x), Describe(y))
	l, err := LineSummary(x, y, 0.95)
	out += fmt.Sprintf("%#v %v\n", l, err)
	if err == nil {
		f, a, b, p, ok := lackOfFitSorted(x, y, l.Slope.Estimate, nil)
		out += fmt.Sprint(f, a, b, p, ok, "\n")
	}
	for d := 1; d <= 3; d++ {
		out += show(PolynomialSummary(x, y, d, 0.95)) + "\n"
	}
	return out
}

// TestSortedMomentsShared is a consistency check (no outside number: the
// reference is the unchanged plain path). It holds the Sorted figures that
// reuse the cached Moments to the plain functions bit for bit on data
// where a reused figure could differ: n = 2 to 5, x with two or three
// distinct values, signed zeros, means far larger than the spread (x or y
// near 10⁹ and 10¹⁵), scales that need a power-of-two shift (1e−300,
// 1e300), so that the known-means path and the shifted path both run;
// and it calls the methods from eight goroutines at once on one fresh
// Sorted (run with -race: the cache is filled once, under sync.Once) and
// checks that no method writes to the pairs the cache was summed from.
func TestSortedMomentsShared(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(21, 22))
	type data struct {
		name string
		x, y []float64
	}
	var cases []data
	gen := func(name string, n, levels int, xs, ys, xoff, yoff float64) {
		x, y := make([]float64, n), make([]float64, n)
		for i := range x {
			u := math.Round(rng.NormFloat64()*100) / 100
			if levels > 0 {
				u = float64(i % levels)
			}
			x[i] = (5+u)*xs + xoff
			y[i] = (1+0.4*u+0.05*u*u+rng.NormFloat64())*ys + yoff
		}
		cases = append(cases, data{name, x, y})
	}
	for _, n := range []int{2, 3, 4, 5, 40} {
		for _, lv := range []int{0, 2, 3} {
			for _, sc := range []struct {
				tag                string
				xs, ys, xoff, yoff float64
			}{{"plain", 1, 1, 0, 0}, {"x+1e9", 1, 1, 1e9, 0}, {"y+1e9", 1, 1, 0, 1e9}, {"xy+1e15", 1, 1, 1e15, -1e15},
				{"x1e-300", 1e-300, 1, 0, 0}, {"y1e300", 1, 1e300, 0, 0}, {"x2^-405", 0x1p-405, 1, 0, 0}} {
				gen(fmt.Sprintf("n%d-levels%d-%s", n, lv, sc.tag), n, lv, sc.xs, sc.ys, sc.xoff, sc.yoff)
			}
		}
	}
	negZero := math.Copysign(0, -1)
	cases = append(cases,
		data{"signed-zeros", []float64{negZero, 0, 1, negZero, 2, 0, 3}, []float64{0, negZero, 1, 2, negZero, 5, 3}},
		data{"signed-zero-y-constant-bits", []float64{1, 2, 3, 4}, []float64{negZero, 0, negZero, 1}},
		data{"two-rows-equal-x", []float64{1, 1}, []float64{1, 2}})
	for _, c := range cases {
		want := plainFigures(NewSorted(c.x, c.y).X, NewSorted(c.x, c.y).Y)
		s := NewSorted(c.x, c.y)
		x0, y0 := slices.Clone(s.X), slices.Clone(s.Y)
		got := make([]string, 8)
		var wg sync.WaitGroup
		for g := range got {
			wg.Go(func() { got[g] = sortedFigures(s) })
		}
		wg.Wait()
		for g, f := range got {
			if f != want {
				t.Errorf("%s: goroutine %d: Sorted figures\n%s\nplain functions\n%s", c.name, g, f, want)
				break
			}
		}
		if !slices.Equal(s.X, x0) || !slices.Equal(s.Y, y0) {
			t.Errorf("%s: the Sorted methods changed the pairs their cached Moments were summed from", c.name)
		}
	}
}

// TestSortedOffsetReference holds the fits that take their two-part means
// from Sorted.Moments to statsmodels on x far from 0: x + 10⁹ (exact in a
// double) gives the slope, R², s and lack of fit of x itself, whose values
// come from statsmodels 0.13.5 / scipy 1.10.1 (/usr/bin/python3):
//
//	x = [1,1,2,2,3,3,4,4,5,5]; y = [1.2,0.8,2.9,3.3,5.2,4.6,6.1,6.9,10.2,9.4]
//	r = sm.OLS(y, sm.add_constant(x)).fit()   # params[1], bse[1], rsquared, sqrt(scale), ssr
//	anova_lm(ols('y~x', d).fit(), ols('y~C(x)', d).fit())   # F, Pr(>F) of lack of fit
//	q = sm.OLS(y, column_stack([ones, x, x*x])).fit()   # rsquared, ssr, pvalues[2]
//	np.std(x, ddof=1), np.std(y, ddof=1)
func TestSortedOffsetReference(t *testing.T) {
	t.Parallel()
	x := []float64{1, 1, 2, 2, 3, 3, 4, 4, 5, 5}
	y := []float64{1.2, 0.8, 2.9, 3.3, 5.2, 4.6, 6.1, 6.9, 10.2, 9.4}
	near := func(name string, got, want, tol float64) {
		t.Helper()
		if !(math.Abs(got-want) <= tol*math.Abs(want)) {
			t.Errorf("%s = %.17g, statsmodels %.17g (relative tolerance %g)", name, got, want, tol)
		}
	}
	for _, off := range []float64{0, 1e9} {
		xs := make([]float64, len(x))
		for i, v := range x {
			xs[i] = v + off
		}
		// The rows reversed, so the Sorted has to reorder them.
		slices.Reverse(xs)
		ys := slices.Clone(y)
		slices.Reverse(ys)
		s := NewSorted(xs, ys)
		l, err := s.LineSummary(0.95)
		if err != nil {
			t.Fatalf("offset %g: %v", off, err)
		}
		tol := 1e-12
		near("slope", l.Slope.Estimate, 2.1, tol)
		near("slope SE", l.Slope.SE, 0.12658988901172158, tol)
		near("R²", l.R2, 0.9717509144594774, tol)
		near("s", l.ResidualSE, 0.5661271941887264, tol)
		near("RSS", l.RSS, 2.563999999999999, tol)
		f, df1, df2, p, ok := s.LackOfFit(l.Slope.Estimate)
		if !ok || df1 != 3 || df2 != 5 {
			t.Errorf("offset %g: lack of fit df %d, %d (ok %v), statsmodels 3, 5", off, df1, df2, ok)
		}
		near("lack-of-fit F", f, 2.6938775510204063, 1e-11)
		near("lack-of-fit p", p, 0.15664065119740606, 1e-9)
		q, err := s.PolynomialSummary(2, 0.95)
		if err != nil {
			t.Fatalf("offset %g: quadratic: %v", off, err)
		}
		near("quadratic R²", q.R2, 0.9793687868695581, 1e-11)
		near("quadratic RSS", q.RSS, 1.8725714285714286, 1e-10)
		near("quadratic p of x²", q.Coef[2].P, 0.15193746140014797, 1e-9)
		dx, dy := s.Describe()
		near("mean of x", dx.Mean, 3+off, 1e-16)
		near("SD of x", dx.SD, 1.4907119849998598, 1e-12)
		near("SD of y", dy.SD, 3.1756714075749226, 1e-12)
	}
}
