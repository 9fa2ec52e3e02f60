package stats

// Edge cases across every estimator: tiny samples, tied and constant
// columns, a row that alone sets the slope, non-finite values, a huge
// offset, a tiny scale and a million rows. The expectations are the
// documented NaN-or-error conventions and the facts of the trade (common
// practice) that correlation, the tests and the shape of a fit do not
// depend on the units; the transformed data are exact in float64 (scales
// are powers of 2, offsets land on the data's grid), so any difference is
// the code's rounding.

import (
	"math"
	"strings"
	"testing"
)

// edgeProfile returns every statistic of the package on (x, y) under a key
// whose suffix says how a change of units x → a·x + b, y → c·y + d acts on
// it: "/slope" scales by c/a, "/abs" by |c/a|, "/y" by |c|, "/fit" maps as
// c·v + d, "/c" scales by c, "/sy" changes sign with c, "/sxy" with a·c;
// no suffix: unchanged.
func edgeProfile(t *testing.T, x, y []float64) map[string]float64 {
	t.Helper()
	out := map[string]float64{}
	c := Pearson(x, y, 0.95)
	out["pearson.r/sxy"], out["pearson.p"] = c.R, c.P
	out["pearson.ci-mid/sxy"], out["pearson.ci-width"] = (c.CILow+c.CIHigh)/2, c.CIHigh-c.CILow
	out["spearman.rho/sxy"], out["spearman.p"] = Spearman(x, y)
	out["kendall.tau/sxy"], out["kendall.p"] = KendallTauB(x, y)
	l, err := Line(x, y, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	out["line.b1/slope"], out["line.se1/abs"], out["line.p1"], out["line.r2"] = l.Slope.Estimate, l.Slope.SE, l.Slope.P, l.R2
	out["line.s/y"], out["line.F"] = l.ResidualSE, l.F
	f3, lo, hi, plo, phi := l.Interval(x[3], 0.95)
	out["line.fit3/fit"], out["line.ci3-half/y"], out["line.pi3-half/y"] = f3, (hi-lo)/2, (phi-plo)/2
	q, err := Polynomial(x, y, 2, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	out["quad.p2"], out["quad.r2"], out["quad.F"] = q.Coef[2].P, q.R2, q.F
	fq, _, _, _, _ := q.Predict(PowerRow(x[5], 2), 0.95)
	out["quad.fit5/fit"] = fq
	in := Influence(x, y)
	for _, k := range []int{0, 7, len(x) - 1} {
		s := string(rune('a' + k%26))
		out["infl.h"+s], out["infl.t"+s+"/sy"], out["infl.d"+s] = in.Leverage[k], in.StudentizedExt[k], in.CooksD[k]
		out["infl.loor"+s+"/sxy"], out["infl.loob"+s+"/slope"] = in.LooR[k], in.LooSlope[k]
	}
	f := Lowess(x, y, 2.0/3, 3, 0)
	out["lowess.0/fit"], out["lowess.7/fit"] = f[0], f[7]
	out["theilsen/slope"], _, _ = TheilSen(x, y, 0, nil)
	out["dcor"] = DistanceCorrelation(x, y)
	out["lof.F"], _, _, out["lof.p"], _ = LackOfFit(x, y)
	out["bp"], _, _ = BreuschPagan(l.Residuals, x)
	out["dw"] = DurbinWatson(l.Residuals)
	order := make([]float64, len(x))
	for i := range order {
		order[i] = float64(i)
	}
	out["partial.r/sy"], _, _, out["partial.p"] = PartialCorrelation(x, y, order, 0.95) // order is not transformed
	slope, p, r := OrderTrend(order, l.Residuals)
	out["order.slope/c"], out["order.p"], out["order.r/sy"] = slope, p, r
	return out
}

// edgeGridData is the seeded test set of these checks: extraWavy(20261201,
// 60) (x on a grid of 0.5 with ties, row 7 an outlier) with y rounded to a
// grid of 1/64, so that adding 2³⁰ to either column is exact.
func edgeGridData() (x, y []float64) {
	x, y = extraWavy(20261201, 60)
	for i := range y {
		y[i] = math.Round(y[i]*64) / 64
	}
	return x, y
}

func TestEdgeUnitsOffsetScale(t *testing.T) {
	t.Parallel()
	x, y := edgeGridData()
	base := edgeProfile(t, x, y)
	for _, tc := range []struct {
		name       string
		a, b, c, d float64
		tol        float64
	}{
		{"offset 2^30 in x and y", 1, 1 << 30, 1, 1 << 30, 1e-11},
		{"scale 2^-40 (about 1e-12)", 0x1p-40, 0, 0x1p-40, 0, 1e-13},
		{"scale 2^40, negative y", 0x1p40, 0, -0x1p40, 0, 1e-13},
	} {
		t.Run(tc.name, func(t *testing.T) {
			xs, ys := make([]float64, len(x)), make([]float64, len(y))
			for i := range x {
				xs[i], ys[i] = tc.a*x[i]+tc.b, tc.c*y[i]+tc.d
			}
			got := edgeProfile(t, xs, ys)
			for k, v := range base {
				want, scale := v, math.Abs(v)
				switch {
				case strings.HasSuffix(k, "/slope"):
					want = v * tc.c / tc.a
				case strings.HasSuffix(k, "/abs"):
					want = v * math.Abs(tc.c/tc.a)
				case strings.HasSuffix(k, "/c"):
					want = v * tc.c
				case strings.HasSuffix(k, "/y"):
					want = v * math.Abs(tc.c)
				case strings.HasSuffix(k, "/fit"):
					want = tc.c*v + tc.d
				case strings.HasSuffix(k, "/sy"):
					want = math.Copysign(1, tc.c) * v
				case strings.HasSuffix(k, "/sxy"):
					want = math.Copysign(1, tc.a*tc.c) * v
				}
				scale = math.Abs(want) * scale / math.Max(math.Abs(v), 1e-300)
				if strings.HasSuffix(k, "/fit") || strings.HasSuffix(k, "/y") {
					// In y's own units, plus a few ulps of the offset: a
					// fitted value near d (or a half-width taken as the
					// difference of two) is only representable to those.
					ulp := math.Nextafter(math.Abs(tc.d), math.Inf(1)) - math.Abs(tc.d)
					scale = math.Abs(tc.c*v) + 4*ulp/tc.tol
				}
				if math.IsNaN(want) {
					t.Errorf("%s: NaN on the base data", k)
				}
				if e := math.Abs(got[k] - want); !(e <= tc.tol*scale) {
					t.Errorf("%s: %.17g, want %.17g (rel. diff %.1e)", k, got[k], want, e/scale)
				}
			}
		})
	}
}
