package stats

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"bivar/internal/reference"
)

// TestAnscombe checks the straight line and r on Anscombe (1973), "Graphs
// in Statistical Analysis", Am. Stat. 27(1):17–21, read in place from
// shared/reference/anscombe.csv. The four sets share r = 0.816, slope
// 0.500 and intercept 3.00 (the figures issue 2 gives as published; our
// values from memory, not re-read from the printed page), checked for every
// set to half a unit in the last printed digit. Also quoted (from memory of
// the paper's table, as in STYLE.md): mean of x 9.0, mean of y 7.50,
// SE(slope) 0.118.
//
// Finding: the three-decimal r does not hold for every set. Set IV has
// r = 0.81652 (scipy.stats.pearsonr gives 0.816521436888503, see
// TestPearsonReference), which rounds to 0.817, so there the figure 0.816
// holds to 0.001 rather than to half a unit (0.0005). The test checks set IV
// at that tolerance and pins that it rounds to 0.817 rather than hiding it.
func TestAnscombe(t *testing.T) {
	t.Parallel()
	sets := reference.Anscombe(t)
	for _, name := range []string{"I", "II", "III", "IV"} {
		t.Run(name, func(t *testing.T) {
			x, y := sets[name][0], sets[name][1]
			if len(x) != 11 {
				t.Fatalf("set %s: %d points, want 11", name, len(x))
			}
			c := Pearson(x, y, 0.95)
			l, err := Line(x, y, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			m := CentredMoments(x, y)
			rTol := 5e-4
			if name == "IV" {
				rTol = 1e-3
				if math.Round(c.R*1000) != 817 {
					t.Errorf("Anscombe IV: r = %.6f, expected it to round to 0.817", c.R)
				}
			}
			for _, v := range []struct {
				what      string
				got, want float64
				tol       float64
			}{
				{"r", c.R, 0.816, rTol},
				{"slope", l.Slope.Estimate, 0.500, 5e-4},
				{"intercept", l.Intercept.Estimate, 3.00, 5e-3},
				{"mean x", m.MeanX, 9.0, 5e-2},
				{"mean y", m.MeanY, 7.50, 5e-3},
				{"SE(slope)", l.Slope.SE, 0.118, 5e-4},
			} {
				if math.Abs(v.got-v.want) > v.tol {
					t.Errorf("Anscombe %s: %s = %.6g, published %g ± %g", name, v.what, v.got, v.want, v.tol)
				}
			}
		})
	}
}

// TestLineIntervalsReference compares the line's confidence and prediction
// intervals, and the quadratic fit, with statsmodels 0.13.5 (numpy 1.24.2):
//
//	m = sm.OLS(y, sm.add_constant(x)).fit()
//	m.get_prediction([[1, x0]]).summary_frame(alpha=0.05)   # mean, mean_ci_*, obs_ci_*
//	q = sm.OLS(y, np.column_stack([ones, x, x**2])).fit()   # params, bse, rsquared, fvalue, ssr
//
// on Anscombe (1973) set I (line) and set II (quadratic) from
// shared/reference/anscombe.csv.
func TestLineIntervalsReference(t *testing.T) {
	t.Parallel()
	sets := reference.Anscombe(t)
	l, err := Line(sets["I"][0], sets["I"][1], 0.95)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		x0   float64
		want [5]float64
	}{
		{10, [5]float64{8.001000000000001, 7.116387273163831, 8.885612726836172, 5.0670715003112665, 10.934928499688736}},
		{20, [5]float64{13.001909090909093, 9.949150314461603, 16.054667867356585, 8.86128922040873, 17.142528961409454}},
	} {
		f, cl, ch, pl, ph := l.Interval(tc.x0, 0.95)
		got := [5]float64{f, cl, ch, pl, ph}
		for k := range got {
			// statsmodels takes t_{0.975, 9} from scipy 1.10.1
			// scipy.stats.t.ppf, which is 2.5e-11 relative off the
			// 40-digit value (mpmath 1.2.1; TQuantile agrees with mpmath,
			// TestDistQuantilesMpmath); measured agreement 1.5e-11.
			if !coreClose(got[k], tc.want[k], 5e-11) {
				t.Errorf("Interval(%g)[%d] = %.15g, statsmodels %.15g", tc.x0, k, got[k], tc.want[k])
			}
		}
		pf, pcl, pch, ppl, pph := l.Predict([]float64{tc.x0}, 0.95)
		if !coreClose(pf, f, 1e-13) || !coreClose(pcl, cl, 1e-12) || !coreClose(pch, ch, 1e-12) ||
			!coreClose(ppl, pl, 1e-12) || !coreClose(pph, ph, 1e-12) {
			t.Errorf("Predict(%g) = %v %v %v %v %v, Interval %v %v %v %v %v", tc.x0, pf, pcl, pch, ppl, pph, f, cl, ch, pl, ph)
		}
	}

	q, err := Polynomial(sets["II"][0], sets["II"][1], 2, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	est := []float64{-5.995734265734321, 2.7808391608391574, -0.12671328671328724}
	se := []float64{0.004329945849097401, 0.0010400555212629011, 5.709766300192712e-05}
	for j := range est {
		// Measured agreement: estimates 9e-15, SEs 1e-13 relative.
		if !coreClose(q.Coef[j].Estimate, est[j], 1e-13) || !coreClose(q.Coef[j].SE/se[j], 1, 1e-12) {
			t.Errorf("quadratic b%d = %.15g (SE %.15g), statsmodels %.15g (%.15g)", j, q.Coef[j].Estimate, q.Coef[j].SE, est[j], se[j])
		}
	}
	// RSS is 5e-7 of TSS here, so rounding in either fit is magnified
	// ~2e6 times in RSS and F (ε·TSS/RSS ≈ 4e-10 at worst); measured 2e-13.
	if !coreClose(q.R2, 0.999999457857722, 1e-15) || !coreClose(q.F, 7378133.000003038, 1e-10) || !coreClose(q.RSS/2.2377622377613164e-05, 1, 1e-10) {
		t.Errorf("quadratic R² %.15g F %.15g RSS %.15g", q.R2, q.F, q.RSS)
	}
	// AIC: statsmodels' q.aic = -106.94214036408378 and line m.aic (set I)
	// = 37.68137411315293 carry the log-likelihood constant N·(1 + ln 2π),
	// which ours leaves out (see Regression.AIC).
	if got := q.AIC + 11*(1+math.Log(2*math.Pi)); !coreClose(got, -106.94214036408378, 1e-12) {
		t.Errorf("quadratic AIC + N(1+ln 2π) = %.15g, statsmodels -106.94214036408378", got)
	}
	if got := l.AIC + 11*(1+math.Log(2*math.Pi)); !coreClose(got, 37.68137411315293, 1e-13) {
		t.Errorf("line AIC + N(1+ln 2π) = %.15g, statsmodels 37.68137411315293", got)
	}
	want := []float64{9.141328671328528, 9.139628172105342, 9.143029170551715, 9.137113667503307, 9.14554367515375}
	f, cl, ch, pl, ph := q.Predict(PowerRow(10, 2), 0.95)
	for k, g := range []float64{f, cl, ch, pl, ph} {
		// The half-widths are small beside the fit, so scipy's t.ppf
		// error (7e-11 at df 8) hardly shows; measured 5e-14.
		if !coreClose(g, want[k], 1e-12) {
			t.Errorf("quadratic Predict(10)[%d] = %.15g, statsmodels %.15g", k, g, want[k])
		}
	}
}

// TestLineFarFromOrigin: the trap, x = 10⁶ + 0..20. The data are
// constructed so the exact answer is known: y = 7 + 0.25·x + d with
// d = 21(i−10)² − 770 orthogonal to 1 and x (all values exact in float64),
// so the least-squares intercept is exactly 7 and the slope 0.25.
func TestLineFarFromOrigin(t *testing.T) {
	t.Parallel()
	x, y := make([]float64, 21), make([]float64, 21)
	for i := range x {
		x[i] = 1e6 + float64(i)
		d := 21*float64((i-10)*(i-10)) - 770
		y[i] = 7 + 0.25*x[i] + d
	}
	l, err := Line(x, y, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	li, ls := lre(l.Intercept.Estimate, 7), lre(l.Slope.Estimate, 0.25)
	t.Logf("x = 1e6+0..20: intercept LRE %.2f, slope LRE %.2f", li, ls)
	if li < 9 || ls < 12 {
		t.Errorf("intercept %.15g (LRE %.2f), slope %.15g (LRE %.2f)", l.Intercept.Estimate, li, l.Slope.Estimate, ls)
	}
}

func TestLeastSquaresIdentities(t *testing.T) {
	t.Parallel()
	// Identities of least squares (common practice): residuals sum to 0 and
	// are orthogonal to every column; leverages sum to p+1 and lie in
	// [1/n, 1]; TSS = ESS + RSS; fitted + residual = y.
	rng := rand.New(rand.NewPCG(5, 9))
	for trial := 0; trial < 200; trial++ {
		n := 5 + rng.IntN(100)
		p := 1 + rng.IntN(min(4, n-3))
		cols := make([][]float64, p)
		y := make([]float64, n)
		for j := range cols {
			cols[j] = make([]float64, n)
			for i := range cols[j] {
				cols[j][i] = rng.NormFloat64()*10 + 100*float64(j)
			}
		}
		for i := range y {
			y[i] = rng.NormFloat64()
			for j := range cols {
				y[i] += float64(j+1) * cols[j][i]
			}
		}
		r, err := LeastSquares(cols, y, 0.95)
		if err != nil {
			t.Fatal(err)
		}
		var se, sh float64
		for i := range y {
			se += r.Residuals[i]
			sh += r.Leverage[i]
			if h := r.Leverage[i]; h < 1/float64(n)-1e-12 || h > 1+1e-12 {
				t.Fatalf("leverage %v outside [1/n, 1]", h)
			}
			if !coreClose(r.Fitted[i]+r.Residuals[i], y[i], 1e-12) {
				t.Fatalf("fitted + residual ≠ y at row %d", i)
			}
		}
		if math.Abs(se) > 1e-9*math.Sqrt(r.RSS+1) {
			t.Fatalf("Σe = %g", se)
		}
		if !coreClose(sh, float64(p+1), 1e-12) {
			t.Fatalf("Σh = %.15g, want %d", sh, p+1)
		}
		for j, c := range cols {
			var dot float64
			for i := range c {
				dot += c[i] * r.Residuals[i]
			}
			if math.Abs(dot) > 1e-8*math.Sqrt(r.RSS)*math.Sqrt(float64(n))*1e3 {
				t.Fatalf("column %d not orthogonal to residuals: %g", j, dot)
			}
		}
		if r.DFResid != n-p-1 || !coreClose(r.AdjR2, 1-(1-r.R2)*float64(n-1)/float64(n-p-1), 1e-12) {
			t.Fatalf("DFResid %d AdjR2 %v", r.DFResid, r.AdjR2)
		}
		if want := float64(n)*math.Log(r.RSS/float64(n)) + 2*float64(p+1); !coreClose(r.AIC, want, 1e-12) {
			t.Fatalf("AIC %v, want %v", r.AIC, want)
		}
		for j := range r.Coef {
			c := r.Coef[j]
			if !(c.CILow < c.Estimate && c.Estimate < c.CIHigh) || !coreClose(c.T, c.Estimate/c.SE, 1e-12) {
				t.Fatalf("coef %d: %+v", j, c)
			}
		}
	}
}

func TestLeastSquaresErrors(t *testing.T) {
	t.Parallel()
	x := []float64{1, 2, 3, 4, 5}
	y := []float64{2, 4, 5, 4, 5}
	for _, tc := range []struct {
		name string
		cols [][]float64
		y    []float64
		want string
	}{
		{"too few rows", [][]float64{x[:2], x[:2]}, y[:2], "need at least 3"},
		{"constant column", [][]float64{{4, 4, 4, 4, 4}}, y, "constant"},
		{"collinear", [][]float64{x, {2, 4, 6, 8, 10}}, y, "linear combination"},
		{"NaN in y", [][]float64{x}, []float64{1, 2, math.NaN(), 4, 5}, "response row 3"},
		{"Inf in x", [][]float64{{1, 2, 3, math.Inf(1), 5}}, y, "predictor 1 row 4"},
	} {
		_, err := LeastSquares(tc.cols, tc.y, 0.95)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want one containing %q", tc.name, err, tc.want)
		}
	}
	if _, err := Line([]float64{3}, []float64{1}, 0.95); err == nil {
		t.Error("Line with one point: no error")
	}
	if _, err := Line([]float64{3, 3, 3}, []float64{1, 2, 3}, 0.95); err == nil {
		t.Error("Line with constant x: no error")
	}
	if _, err := Polynomial(x, y, 0, 0.95); err == nil {
		t.Error("Polynomial degree 0: no error")
	}
	if _, err := Polynomial([]float64{1, 1, 2, 2, 2}, y, 2, 0.95); err == nil {
		t.Error("quadratic on two distinct x: no error")
	}
}

func TestLineEdges(t *testing.T) {
	t.Parallel()
	// n = 2: the line is exact; inference is undefined (NaN), not a panic.
	l, err := Line([]float64{1, 3}, []float64{2, 6}, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if l.Slope.Estimate != 2 || l.Intercept.Estimate != 0 || l.DFResid != 0 ||
		!math.IsNaN(l.Slope.SE) || !math.IsNaN(l.ResidualSE) || !math.IsNaN(l.F) {
		t.Errorf("n=2: %+v", l)
	}
	if f, lo, _, _, _ := l.Interval(2, 0.95); f != 4 || !math.IsNaN(lo) {
		t.Errorf("n=2 Interval(2) = %v, %v", f, lo)
	}
	// Constant y: slope 0, R² undefined.
	l, err = Line([]float64{1, 2, 3, 4}, []float64{5, 5, 5, 5}, 0.95)
	if err != nil || l.Slope.Estimate != 0 || !math.IsNaN(l.R2) {
		t.Errorf("constant y: %v %+v", err, l)
	}
	// Hand-checkable: x = 1..5, y = 2,4,5,4,5 gives y = 2.2 + 0.6x,
	// RSS = 2.4, s² = 0.8, SE(slope) = √(0.8/10).
	l, err = Line([]float64{1, 2, 3, 4, 5}, []float64{2, 4, 5, 4, 5}, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if !coreClose(l.Slope.Estimate, 0.6, 1e-15) || !coreClose(l.Intercept.Estimate, 2.2, 1e-15) ||
		!coreClose(l.RSS, 2.4, 1e-14) || !coreClose(l.Slope.SE, math.Sqrt(0.08), 1e-14) || l.Sxx != 10 || l.MeanX != 3 {
		t.Errorf("hand case: %+v", l)
	}
	// At x0 = x̄ the mean-response half-width is t·s/√n.
	f, lo, hi, _, _ := l.Interval(3, 0.95)
	if hw := TQuantile(0.975, 3) * math.Sqrt(0.8/5); !coreClose(f, 4, 1e-15) || !coreClose(hi-f, hw, 1e-13) || !coreClose(f-lo, hw, 1e-13) {
		t.Errorf("Interval(x̄) = %v [%v, %v], half-width want %v", f, lo, hi, hw)
	}
}

// TestLineReference compares the whole straight-line fit with statsmodels
// 0.13.5 (scipy 1.10.1), via /work/shared/tools/refcheck.py on Anscombe
// (1973) sets I and III: sm.OLS(y, sm.add_constant(x)).fit() — scale**0.5,
// ssr, rsquared, rsquared_adj, fvalue, f_pvalue, and per coefficient
// params, bse, tvalues, pvalues, conf_int(0.05).
func TestLineReference(t *testing.T) {
	t.Parallel()
	type co [6]float64 // estimate, SE, t, p, CI low, CI high
	sets := reference.Anscombe(t)
	for _, tc := range []struct {
		set                    string
		s, rss, r2, adj, f, fp float64
		intercept, slope       co
	}{
		{"I", 1.236603322726321, 13.76269, 0.666542459508775, 0.6294916216764166, 17.989942967676978, 0.002169628873078794, co{3.0000909090909076, 1.1247467908086437, 2.667347827624361, 0.02573405139916249, 0.45573689999319056, 5.544444918188624}, co{0.5000909090909093, 0.1179055005956341, 4.2414552888928325, 0.002169628873078792, 0.23337013639193332, 0.7668116817898851}},
		{"III", 1.2363113513899955, 13.756191818181813, 0.6663240410665594, 0.6292489345183994, 17.972275823429214, 0.002176305279228019, co{3.0024545454545444, 1.1244812296399933, 2.6700797366051106, 0.025619108839500818, 0.4587012774566359, 5.546207813452453}, co{0.4997272727272729, 0.11787766222100225, 4.239372102496927, 0.002176305279228019, 0.23306947480686946, 0.7663850706476764}},
	} {
		l, err := Line(sets[tc.set][0], sets[tc.set][1], 0.95)
		if err != nil {
			t.Fatal(err)
		}
		for _, v := range []struct {
			what      string
			got, want float64
		}{
			{"ResidualSE", l.ResidualSE, tc.s}, {"RSS", l.RSS, tc.rss}, {"R2", l.R2, tc.r2},
			{"AdjR2", l.AdjR2, tc.adj}, {"F", l.F, tc.f}, {"FP", l.FP / tc.fp, 1},
		} {
			if !coreClose(v.got, v.want, 1e-12) {
				t.Errorf("set %s: %s = %.16g, statsmodels %.16g", tc.set, v.what, v.got, v.want)
			}
		}
		for name, pair := range map[string]struct {
			got  Coef
			want co
		}{"intercept": {l.Intercept, tc.intercept}, "slope": {l.Slope, tc.slope}} {
			g := [6]float64{pair.got.Estimate, pair.got.SE, pair.got.T, pair.got.P / pair.want[3], pair.got.CILow, pair.got.CIHigh}
			w := pair.want
			w[3] = 1 // p compared relatively
			for k := range g {
				// CIs use t_{0.975, 9}: statsmodels takes it from scipy
				// 1.10.1 t.ppf, 2.5e-11 relative off mpmath's value
				// (TestDistQuantilesMpmath).
				tol := 1e-12
				if k >= 4 {
					tol = 1e-10
				}
				if !coreClose(g[k], w[k], tol) {
					t.Errorf("set %s %s[%d] = %.16g, statsmodels %.16g", tc.set, name, k, g[k], w[k])
				}
			}
		}
	}
}

// TestPolynomialFarFromOrigin: the quadratic with x = 10⁹ + k/4, k = 0..40
// (every value exact in float64), y = 3 + u/2 − u²/8 + ((7k mod 5) − 2)/4
// with u = k/4 (exact too). Reference: the exact rational least-squares
// solution, Python 3.11 fractions.Fraction on the normal equations (exact
// arithmetic, so their conditioning does not matter), square roots and
// quotients with mpmath 1.2.1 at 40 digits, printed to 17 digits. On raw
// powers of x the columns x and x² are collinear to working precision
// (condition number ~10¹⁶) and the fit was noise (R² 0, p of x² 0.75);
// on the centred and scaled powers it keeps about 14 digits.
func TestPolynomialFarFromOrigin(t *testing.T) {
	t.Parallel()
	x, y := make([]float64, 41), make([]float64, 41)
	for k := range x {
		u := float64(k) / 4
		x[k] = 1e9 + u
		y[k] = 3 + u/2 - u*u/8 + float64((7*k)%5-2)/4
	}
	q, err := Polynomial(x, y, 2, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	est := []float64{-1.2873987948998335e+17, 257479758.44256793, -0.12873987895258457}
	se := []float64{7394722725007942.6, 14789445.376068658, 0.007394722651060716}
	for j := range est {
		le, ls := lre(q.Coef[j].Estimate, est[j]), lre(q.Coef[j].SE, se[j])
		t.Logf("b%d LRE %.2f, SE LRE %.2f", j, le, ls)
		if le < 10 || ls < 10 {
			t.Errorf("b%d = %.17g (SE %.17g), exact %.17g (%.17g)", j, q.Coef[j].Estimate, q.Coef[j].SE, est[j], se[j])
		}
	}
	if l := lre(q.Coef[2].T, -17.409696756391239); l < 10 {
		t.Errorf("t of x² = %.17g, exact −17.409696756391239", q.Coef[2].T)
	}
	if l1, l2 := lre(q.RSS, 5.2088410738439099), lre(q.R2, 0.97904331665410105); l1 < 10 || l2 < 10 {
		t.Errorf("RSS %.17g (LRE %.1f), R² %.17g (LRE %.1f); exact 5.2088410738439099, 0.97904331665410105", q.RSS, l1, q.R2, l2)
	}
	if v := -q.Coef[1].Estimate / (2 * q.Coef[2].Estimate); math.Abs(v-1000000002.0871496614) > 1e-5 {
		t.Errorf("vertex %.12g, exact 1000000002.0871496614", v)
	}
	// Mean response at x0 = 10⁹ + 3: 3.3805693030735572, SE 0.078137107660661927.
	f, lo, hi, _, _ := q.Predict(PowerRow(1e9+3, 2), 0.95)
	hw := TQuantile(0.975, 38) * 0.078137107660661927
	if lre(f, 3.3805693030735572) < 10 || lre(hi-f, hw) < 10 || lre(f-lo, hw) < 10 {
		t.Errorf("Predict(1e9+3) = %.17g [%.17g, %.17g], exact 3.3805693030735572 ± %.17g", f, lo, hi, hw)
	}
}

// TestPolynomialEdges: documented errors, not NaN fits or panics.
func TestPolynomialEdges(t *testing.T) {
	t.Parallel()
	y := []float64{1, 3, 2, 5, 4}
	for name, x := range map[string][]float64{
		"two distinct x": {1, 1, 2, 2, 2},
		"constant x":     {3, 3, 3, 3, 3},
		"NaN in x":       {1, 2, math.NaN(), 4, 5},
	} {
		if q, err := Polynomial(x, y, 2, 0.95); err == nil {
			t.Errorf("%s: no error, coefficients %+v", name, q.Coef)
		}
	}
	// Any finite x is data: where x² overflows or underflows the raw
	// quadratic coefficient does too, but t and p are those of x = 1..5.
	q1, err := Polynomial([]float64{1, 2, 3, 4, 5}, y, 2, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range []float64{1e200, 1e-200} {
		x := []float64{1 * s, 2 * s, 3 * s, 4 * s, 5 * s}
		q, err := Polynomial(x, y, 2, 0.95)
		if err != nil {
			t.Errorf("x·%g: %v", s, err)
			continue
		}
		for j := range q.Coef {
			if !coreClose(q.Coef[j].T, q1.Coef[j].T, 1e-12) || !coreClose(q.Coef[j].P, q1.Coef[j].P, 1e-12) {
				t.Errorf("x·%g: coefficient %d t, p = %v, %v; on x = 1..5 %v, %v", s, j, q.Coef[j].T, q.Coef[j].P, q1.Coef[j].T, q1.Coef[j].P)
			}
		}
	}
	if _, err := Polynomial([]float64{1, 2}, []float64{1, 2}, 2, 0.95); err == nil || !strings.Contains(err.Error(), "need at least 3") {
		t.Errorf("two rows, degree 2: error %v", err)
	}
	// Exactly degree+1 rows: exact fit, no inference. y = x² on 1, 2, 3.
	q, err := Polynomial([]float64{1, 2, 3}, []float64{1, 4, 9}, 2, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if !coreClose(q.Coef[2].Estimate, 1, 1e-14) || math.Abs(q.Coef[1].Estimate) > 1e-13 || math.Abs(q.Coef[0].Estimate) > 1e-13 ||
		!math.IsNaN(q.Coef[2].P) || q.DFResid != 0 {
		t.Errorf("exact quadratic: %+v", q.Coef)
	}
}

// TestLineResidual: LineFit.Residual of a row of the fit is that row's
// residual, bit for bit (the same centred formula; an identity that holds
// for any data that need no scaling).
func TestLineResidual(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	x, y := make([]float64, 500), make([]float64, 500)
	for i := range x {
		x[i] = 1e6 + 10*rng.NormFloat64()
		y[i] = 3 + 0.5*x[i] + rng.NormFloat64()
	}
	l, err := Line(x, y, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	out := make([]float64, len(x))
	l.ResidualsInto(out, x, y)
	for i := range x {
		if got := l.Residual(x[i], y[i]); got != l.Residuals[i] || math.Float64bits(out[i]) != math.Float64bits(got) {
			t.Fatalf("row %d: Residual %v, ResidualsInto %v, fit's residual %v", i, got, out[i], l.Residuals[i])
		}
	}
}

// TestLeastSquaresSummary: the fit without per-row outputs agrees with
// LeastSquares (Householder QR of the whole design) on every summary field,
// on 10⁴ rows far from 0 and in every block alignment (n not a multiple of
// the block), and has no per-row vectors. The certified-value checks of
// both are in TestNISTStRD.
func TestLeastSquaresSummary(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for _, n := range []int{5, 255, 256, 257, 10007} {
		x1, x2, y := make([]float64, n), make([]float64, n), make([]float64, n)
		for i := range y {
			x1[i] = 1e4 + rng.NormFloat64()
			x2[i] = x1[i]*x1[i]/1e4 + rng.NormFloat64()
			y[i] = 2 - 0.5*x1[i] + 0.25*x2[i] + rng.NormFloat64()
		}
		full, err1 := LeastSquares([][]float64{x1, x2}, y, 0.95)
		sum, err2 := LeastSquaresSummary([][]float64{x1, x2}, y, 0.95)
		if err1 != nil || err2 != nil {
			t.Fatalf("n %d: %v, %v", n, err1, err2)
		}
		if sum.Fitted != nil || sum.Residuals != nil || sum.Leverage != nil {
			t.Errorf("n %d: summary kept per-row vectors", n)
		}
		near := func(name string, a, b float64) {
			t.Helper()
			if !(math.Abs(a-b) <= 1e-9*math.Max(math.Abs(b), 1e-300)) && !(math.IsNaN(a) && math.IsNaN(b)) {
				t.Errorf("n %d %s: summary %.17g, full %.17g", n, name, a, b)
			}
		}
		for j := range full.Coef {
			near("estimate", sum.Coef[j].Estimate, full.Coef[j].Estimate)
			near("SE", sum.Coef[j].SE, full.Coef[j].SE)
		}
		near("RSS", sum.RSS, full.RSS)
		near("R2", sum.R2, full.R2)
		near("F", sum.F, full.F)
		near("AIC", sum.AIC, full.AIC)
	}
}

// TestPolynomialSummary: the quadratic without per-row outputs (powers made
// row by row) agrees with Polynomial on every summary field, for y near 1
// and for y near 1e300 (scaled by a power of two inside), and refuses the
// same bad input. An identity; the certified check is Wampler1 in
// TestNISTStRD.
func TestPolynomialSummary(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	n := 3001
	x, y := make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = 50 + 3*rng.NormFloat64()
		y[i] = 1 + 0.2*x[i] - 0.01*x[i]*x[i] + 0.1*rng.NormFloat64()
	}
	for _, scale := range []float64{1, 1e300} {
		ys := make([]float64, n)
		for i := range y {
			ys[i] = y[i] * scale
		}
		full, err1 := Polynomial(x, ys, 2, 0.95)
		sum, err2 := PolynomialSummary(x, ys, 2, 0.95)
		if err1 != nil || err2 != nil {
			t.Fatalf("scale %g: %v, %v", scale, err1, err2)
		}
		for j := range full.Coef {
			for _, pair := range [][2]float64{{sum.Coef[j].Estimate, full.Coef[j].Estimate}, {sum.Coef[j].SE, full.Coef[j].SE}, {sum.Coef[j].P, full.Coef[j].P}} {
				if math.Abs(pair[0]-pair[1]) > 1e-9*math.Abs(pair[1]) {
					t.Errorf("scale %g coef %d: summary %v, full %v", scale, j, pair[0], pair[1])
				}
			}
		}
		if math.Abs(sum.R2-full.R2) > 1e-12 || math.Abs(sum.RSS-full.RSS) > 1e-9*full.RSS {
			t.Errorf("scale %g: R² %v / %v, RSS %v / %v", scale, sum.R2, full.R2, sum.RSS, full.RSS)
		}
	}
	bad := append([]float64(nil), y...)
	bad[7] = math.NaN()
	if _, err := PolynomialSummary(x, bad, 2, 0.95); err == nil {
		t.Error("NaN in y accepted")
	}
}
