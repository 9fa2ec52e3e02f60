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
	"slices"
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

// TestEdgeMillionRows runs every estimator on 10⁶ rows (skipped with
// -short). The data are closed-form, so a reference library can rebuild
// them exactly: with i = 0..n−1, x = ((7919·i) mod 1000003)/1000003,
// xt = round(200·x)/200 (ties), y = 3 + 2x + ((104729·i) mod 1000)/1000 −
// 0.5 + 0.3x². Reference: numpy 1.24.2, scipy 1.10.1, statsmodels 0.13.5,
// one-off commands (printed with repr):
//
//	scipy.stats.pearsonr(x, y); scipy.stats.spearmanr(xt, y); scipy.stats.kendalltau(xt, y)
//	m = sm.OLS(y, sm.add_constant(x)).fit(): params, bse, rsquared, sqrt(scale)
//	sm.OLS(y, column_stack([ones, x, x*x])).fit(): params, bse
//	het_breuschpagan(m.resid, sm.add_constant(x), robust=True)[:2]; durbin_watson(m.resid)
//
// (their p-values are 0.0 in double precision; ours are below 1e-300), and
// where those are less accurate than ours, values in exact or extended
// arithmetic, named at the check.
// The rest must run with bounded cost and say how (Theil–Sen samples
// pairs, the permutation test a subsample).
func TestEdgeMillionRows(t *testing.T) {
	if testing.Short() {
		t.Skip("10⁶ rows: skipped with -short")
	}
	t.Parallel()
	const n = 1_000_000
	x, xt, y := make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = float64((7919*i)%1000003) / 1000003
		xt[i] = math.Round(x[i]*200) / 200
		y[i] = 3 + 2*x[i] + float64((104729*i)%1000)/1000 - 0.5 + 0.3*x[i]*x[i]
	}
	check := func(what string, got, want, tol float64) {
		t.Helper()
		if !(math.Abs(got-want) <= tol*math.Abs(want)) {
			t.Errorf("%s = %.17g, reference %.17g (rel. diff %.1e)", what, got, want, math.Abs(got-want)/math.Abs(want))
		}
	}
	c := Pearson(x, y, 0.95)
	check("Pearson r", c.R, 0.916635051065634, 1e-13)
	if !(c.P < 1e-300) {
		t.Errorf("Pearson p = %v, want below 1e-300", c.P)
	}
	rho, _ := Spearman(xt, y)
	// Exact: Python integers on the doubled ranks, 40-digit decimal square
	// root (scipy's 0.921449296746122 is 3e-15 off it).
	check("Spearman ρ (ties in x)", rho, 0.92144929674611896, 2e-15)
	tau, _ := KendallTauB(xt, y)
	check("Kendall τ-b (ties in x)", tau, 0.742946178720718, 1e-13)
	l, err := Line(x, y, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	check("intercept", l.Intercept.Estimate, 2.949481223427741, 1e-12)
	check("slope", l.Slope.Estimate, 2.300037281271742, 1e-12)
	check("SE(intercept)", l.Intercept.SE, 0.0005790793955279633, 1e-11)
	check("SE(slope)", l.Slope.SE, 0.0010029985542734374, 1e-11)
	check("R²", l.R2, 0.8402198168420967, 1e-13)
	check("residual SE", l.ResidualSE, 0.2895399550416396, 1e-12)
	q, err := Polynomial(x, y, 2, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	for j, w := range [][2]float64{{2.99947944902676, 0.0008660242386804774}, {2.0000465624779658, 0.004000008582270123}, {0.2999918094163939, 0.003873005329912613}} {
		check("quadratic b"+string(rune('0'+j)), q.Coef[j].Estimate, w[0], 1e-11)
		check("quadratic SE(b"+string(rune('0'+j))+")", q.Coef[j].SE, w[1], 1e-10)
	}
	bp, _, bpp := BreuschPagan(l.Residuals, x)
	// LM = n·R² with R² = 2e-9: few relative digits survive any double
	// computation. statsmodels' value, 0.002196939630216832, is 1.2e-7 off
	// the one computed in numpy longdouble (64-bit significand: centred
	// least-squares residuals, then n·corr(x, e²)², one-off command),
	// 0.0021969398972425377; p from scipy.stats.chi2.sf of it.
	check("Breusch–Pagan LM", bp, 0.0021969398972425377, 1e-10)
	check("Breusch–Pagan p", bpp, 0.9626156225480181, 1e-13)
	check("Durbin–Watson", DurbinWatson(l.Residuals), 2.3565929702699915, 1e-12)

	in := Influence(x, y)
	var sh float64
	for _, h := range in.Leverage {
		sh += h
	}
	check("Σ leverage", sh, 2, 1e-9)
	if f := Lowess(x, y, 2.0/3, 3, -1); math.IsNaN(f[0]) || math.IsNaN(f[n-1]) {
		t.Error("Lowess at 10⁶ rows: NaN")
	}
	if s, _, m := TheilSen(x, y, 0, nil); !strings.Contains(m, "random pairs") || !(math.Abs(s-2.3) < 0.05) {
		t.Errorf("TheilSen at 10⁶ rows: slope %v, method %q", s, m)
	}
	if d, p, used, m := DistanceCorrTest(x, y, 19, 0, nil); used != DefaultDcorMaxN || !(d > 0.8 && d <= 1) || p != 1.0/20 || !strings.Contains(m, "random sample") {
		t.Errorf("DistanceCorrTest at 10⁶ rows: dCor %v p %v used %d %q", d, p, used, m)
	}
	if f, _, _, _, ok := LackOfFit(xt, y); !ok || !(f > 0) {
		t.Errorf("LackOfFit at 10⁶ rows (201 distinct x): F %v ok %v", f, ok)
	}
	if r, _, _, _ := PartialCorrelation(x, y, xt, 0.95); math.IsNaN(r) {
		t.Error("PartialCorrelation at 10⁶ rows: NaN")
	}
}

// TestEdgeDegenerate pins the documented result of every estimator on the
// smallest and most degenerate inputs: NaN (or an error, for the fits)
// where the quantity does not exist, a number where it does. No case may
// panic.
func TestEdgeDegenerate(t *testing.T) {
	t.Parallel()
	nan, inf := math.NaN(), math.Inf(1)
	isNaN := math.IsNaN
	ok := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	type want struct {
		pearsonR, pearsonP, pearsonCI, spearman, kendall, line, quad bool // true: defined / fits
		extT, lof, partialR, partialP, theilSen, dcor                bool
	}
	order := func(n int) []float64 {
		z := make([]float64, n)
		for i := range z {
			z[i] = float64(i*i%7) + 0.5*float64(i)
		}
		return z
	}
	for _, tc := range []struct {
		name string
		x, y []float64
		w    want
	}{
		{"n = 3", []float64{1, 2, 4}, []float64{2, 1, 5},
			want{pearsonR: true, pearsonP: true, spearman: true, kendall: true, line: true, quad: true, partialR: true, theilSen: true, dcor: true}},
		{"all x tied", []float64{2, 2, 2, 2, 2}, []float64{1, 2, 3, 5, 4}, want{}},
		{"all y tied", []float64{1, 2, 3, 4, 5}, []float64{7, 7, 7, 7, 7}, want{line: true, quad: true, theilSen: true}},
		{"one x apart from the rest", []float64{2, 2, 2, 2, 9}, []float64{1, 3, 2, 4, 8},
			want{pearsonR: true, pearsonP: true, pearsonCI: true, spearman: true, kendall: true, line: true, extT: true, partialR: true, partialP: true, theilSen: true, dcor: true}},
		{"NaN in x", []float64{1, 2, nan, 4, 5}, []float64{1, 3, 2, 4, 8}, want{}},
		{"+Inf in x (ranked like a value)", []float64{1, 2, inf, 4, 5}, []float64{1, 3, 2, 4, 8}, want{spearman: true, kendall: true}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			x, y, w := tc.x, tc.y, tc.w
			n := len(x)
			c := Pearson(x, y, 0.95)
			rho, _ := Spearman(x, y)
			tau, _ := KendallTauB(x, y)
			_, errL := Line(x, y, 0.95)
			_, errQ := Polynomial(x, y, 2, 0.95)
			in := Influence(x, y)
			_, _, _, _, lofOK := LackOfFit(x, y)
			pr, _, _, pp := PartialCorrelation(x, y, order(n), 0.95)
			ts, _, _ := TheilSen(x, y, 0, nil)
			d := DistanceCorrelation(x, y)
			for _, g := range []struct {
				what string
				got  bool
				want bool
			}{
				{"Pearson r", ok(c.R), w.pearsonR}, {"Pearson p", ok(c.P), w.pearsonP}, {"Pearson CI", ok(c.CILow), w.pearsonCI},
				{"Spearman ρ", ok(rho), w.spearman}, {"Kendall τ-b", ok(tau), w.kendall},
				{"Line fits", errL == nil, w.line}, {"quadratic fits", errQ == nil, w.quad},
				{"some external studentized residual", slices.ContainsFunc(in.StudentizedExt, ok), w.extT},
				{"lack-of-fit test exists", lofOK, w.lof},
				{"partial r", ok(pr), w.partialR}, {"partial p", ok(pp), w.partialP},
				{"Theil–Sen slope", ok(ts), w.theilSen}, {"distance correlation", ok(d), w.dcor},
			} {
				if g.got != g.want {
					t.Errorf("%s: defined = %v, documented %v", g.what, g.got, g.want)
				}
			}
			// Lowess: NaN exactly at the rows with a non-finite value.
			for i, f := range Lowess(x, y, 2.0/3, 3, 0) {
				if ok(x[i]) && ok(y[i]) != ok(f) {
					t.Errorf("Lowess[%d] = %v for finite (%v, %v)", i, f, x[i], y[i])
				}
			}
			if errL == nil {
				l, _ := Line(x, y, 0.95)
				bp, _, _ := BreuschPagan(l.Residuals, x)
				if ok(bp) != (n >= 3 && ok(c.R)) {
					t.Errorf("Breusch–Pagan %v (n %d, r %v)", bp, n, c.R)
				}
				if dw := DurbinWatson(l.Residuals); isNaN(dw) != !ok(c.R) {
					t.Errorf("Durbin–Watson %v with r %v", dw, c.R)
				}
			}
		})
	}
	// Constant y: every coefficient is exact, so its SE is 0; a nonzero
	// estimate then has t = ±Inf and p = 0, a zero one t and p NaN (0/0),
	// as documented on LeastSquares.
	l, _ := Line([]float64{1, 2, 3, 4, 5}, []float64{7, 7, 7, 7, 7}, 0.95)
	if l.Intercept.SE != 0 || !math.IsInf(l.Intercept.T, 1) || l.Intercept.P != 0 || !isNaN(l.Slope.T) || !isNaN(l.R2) {
		t.Errorf("constant y: intercept %+v slope %+v R² %v", l.Intercept, l.Slope, l.R2)
	}
}
