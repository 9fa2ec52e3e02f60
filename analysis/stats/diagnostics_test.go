package stats

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"bivar/internal/reference"
)

// extraSets returns the named test sets: Anscombe (1973) I–IV read from
// shared/reference/anscombe.csv and extraWavy(20261201, 60).
func extraSets(t *testing.T) map[string][2][]float64 {
	t.Helper()
	sets := reference.Anscombe(t)
	x, y := extraWavy(20261201, 60)
	sets["wavy"] = [2][]float64{x, y}
	return sets
}

// extraResiduals returns the least-squares residuals of the straight line.
func extraResiduals(t *testing.T, x, y []float64) []float64 {
	t.Helper()
	l, err := Line(x, y, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	return l.Residuals
}

// TestBreuschPaganDurbinWatson checks both against statsmodels.
//
// Independent implementation: statsmodels 0.13.5 via
// /work/shared/tools/refcheck.py (Python 3.11, numpy 1.24.2): Koenker's
// form is statsmodels.stats.diagnostic.het_breuschpagan(res.resid, [1, x],
// robust=True) -> (lm, lm_p_value), and
// statsmodels.stats.stattools.durbin_watson(res.resid) in file order, res
// the OLS fit of y on [1, x]. Printed with repr.
func TestBreuschPaganDurbinWatson(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name       string
		lm, p, dw  float64
		lmTol, pTo float64
	}{
		{"I", 0.6553075561484141, 0.41822145680189327, 3.2122899593630643, 1e-13, 1e-13},
		// Set II: e² is symmetric in x, so the reference LM, 2.4e-15, is
		// rounding noise about 0 (p 1 − 3.9e-8): compare absolutely.
		{"II", 2.4424906541753444e-15, 0.9999999605672998, 2.1875699488977105, 1e-12, 1e-6},
		{"III", 2.7234169729360636, 0.09888612104791372, 2.143577785777381, 1e-13, 1e-13},
		{"IV", 1.182091037067802, 0.27693071277393966, 1.662222930487851, 1e-13, 1e-13},
		{"wavy", 0.4119288751193362, 0.5209921046237345, 1.7384437043706644, 1e-13, 1e-13},
	}
	sets := extraSets(t)
	for _, tc := range cases {
		// Measured agreement: 2e-14 or better (set II: see above).
		x, y := sets[tc.name][0], sets[tc.name][1]
		e := extraResiduals(t, x, y)
		lm, df, p := BreuschPagan(e, x)
		if !extraClose(lm, tc.lm, tc.lmTol) || !extraClose(p, tc.p, tc.pTo) || df != 1 {
			t.Errorf("BreuschPagan(%s) = %.17g, %d, %.17g; want %.17g, 1, %.17g", tc.name, lm, df, p, tc.lm, tc.p)
		}
		if dw := DurbinWatson(e); !extraClose(dw, tc.dw, 1e-12) {
			t.Errorf("DurbinWatson(%s) = %.17g, want %.17g", tc.name, dw, tc.dw)
		}
	}
}

// TestBreuschPaganDurbinWatsonByHand checks cases worked from the
// definitions.
func TestBreuschPaganDurbinWatsonByHand(t *testing.T) {
	t.Parallel()
	// Alternating signs: Σ(Δe)² = 3·4 = 12, Σe² = 4, d = 3.
	if d := DurbinWatson([]float64{1, -1, 1, -1}); d != 3 {
		t.Errorf("DurbinWatson(±1) = %v, want 3", d)
	}
	// One run of equal residuals: no change, d = 0.
	if d := DurbinWatson([]float64{2, 2, 2}); d != 0 {
		t.Errorf("DurbinWatson(constant) = %v, want 0", d)
	}
	if d := DurbinWatson([]float64{0, 0}); !math.IsNaN(d) {
		t.Errorf("DurbinWatson(zeros) = %v, want NaN", d)
	}
	if d := DurbinWatson([]float64{1}); !math.IsNaN(d) {
		t.Errorf("DurbinWatson(n=1) = %v, want NaN", d)
	}
	// e² exactly linear in x (e_i = ±√x_i): R²_aux = 1, LM = n.
	x := []float64{1, 2, 3, 4, 5, 6}
	e := make([]float64, len(x))
	for i, v := range x {
		e[i] = math.Sqrt(v) * float64(1-2*(i%2))
	}
	if lm, _, p := BreuschPagan(e, x); !extraClose(lm, 6, 1e-12) || !extraClose(p, UpperChi2(6, 1), 1e-12) {
		t.Errorf("BreuschPagan(e² = x) = %v, p %v, want 6, %v", lm, p, UpperChi2(6, 1))
	}
	if lm, _, _ := BreuschPagan([]float64{1, -1, 1}, x[:3]); !math.IsNaN(lm) {
		t.Errorf("BreuschPagan(equal e²) = %v, want NaN", lm)
	}
	if !extraPanics(func() { BreuschPagan([]float64{1, 2}, []float64{1}) }) {
		t.Error("BreuschPagan: no panic on length mismatch")
	}
}

// TestLackOfFit checks the pure-error F test.
func TestLackOfFit(t *testing.T) {
	t.Parallel()
	sets := extraSets(t)
	t.Run("statsmodels", func(t *testing.T) {
		// Independent implementation: statsmodels 0.13.5,
		// anova_lm(ols("y ~ x").fit(), ols("y ~ C(x)").fit()) (the line
		// against one mean per distinct x), row 1: F, df_diff, df_resid,
		// Pr(>F); on extraWavy(20261201, 60), which has 32 distinct x.
		x, y := sets["wavy"][0], sets["wavy"][1]
		f, df1, df2, p, ok := LackOfFit(x, y)
		if !ok || df1 != 30 || df2 != 28 || !extraClose(f, 3.047299978235512, 1e-13) || !extraClose(p, 0.0019885901234434032, 1e-13) {
			t.Errorf("LackOfFit(wavy) = %.17g, %d, %d, %.17g, %v; want 3.047299978235512, 30, 28, 0.0019885901234434032, true", f, df1, df2, p, ok)
		}
	})
	t.Run("offset", func(t *testing.T) {
		// The same data with x moved by 10⁹ (exact: x is on a grid of 0.5):
		// the test is unchanged, so the same statsmodels value holds. The
		// uncentred line b0 + b1·x gave F off by 3e-9 relative here.
		x, y := sets["wavy"][0], sets["wavy"][1]
		xo := make([]float64, len(x))
		for i := range x {
			xo[i] = x[i] + 1e9
		}
		f, df1, df2, p, ok := LackOfFit(xo, y)
		if !ok || df1 != 30 || df2 != 28 || !extraClose(f, 3.047299978235512, 1e-13) || !extraClose(p, 0.0019885901234434032, 1e-13) {
			t.Errorf("LackOfFit(wavy, x + 1e9) = %.17g, %d, %d, %.17g, %v; want 3.047299978235512, 30, 28, 0.0019885901234434032", f, df1, df2, p, ok)
		}
	})
	t.Run("no-test", func(t *testing.T) {
		// Anscombe I–III: no replicated x. IV: two distinct x, df1 = 0
		// (statsmodels' anova_lm gives F = −inf, p = nan there).
		for _, name := range []string{"I", "II", "III", "IV"} {
			if f, _, _, _, ok := LackOfFit(sets[name][0], sets[name][1]); ok || !math.IsNaN(f) {
				t.Errorf("LackOfFit(%s) = %v, ok %v; want NaN, false", name, f, ok)
			}
		}
		// Replicates identical: no pure error. The degrees of freedom are
		// still given (m − 2 = 1, n − m = 3), so that a caller can say the
		// test was not made for that reason and not for want of repeats.
		if f, df1, df2, p, ok := LackOfFit([]float64{1, 1, 2, 2, 3, 3}, []float64{1, 1, 4, 4, 9, 9}); ok || df1 != 1 || df2 != 3 || !math.IsNaN(f) || !math.IsNaN(p) {
			t.Errorf("LackOfFit(no pure error) = %v, %d, %d, %v, %v; want NaN, 1, 3, NaN, false", f, df1, df2, p, ok)
		}
		if !extraPanics(func() { LackOfFit([]float64{1, 2}, []float64{1}) }) {
			t.Error("LackOfFit: no panic on length mismatch")
		}
	})
	t.Run("by-hand", func(t *testing.T) {
		// x = 1,1,2,2,3,3; y = 0,2, 3,5, 0,2 (means 1, 4, 1): the line is
		// flat at 2 (slope 0 by symmetry), SS_PE = 3·2 = 6 (df 3),
		// SS_LOF = 2·(1 + 4 + 1) = 12 (df 1), F = 12/(6/3) = 6.
		f, df1, df2, p, ok := LackOfFit([]float64{1, 1, 2, 2, 3, 3}, []float64{0, 2, 3, 5, 0, 2})
		if !ok || df1 != 1 || df2 != 3 || !extraClose(f, 6, 1e-12) || !extraClose(p, UpperF(6, 1, 3), 1e-12) {
			t.Errorf("LackOfFit(hump) = %v, %d, %d, %v, %v; want 6, 1, 3, %v", f, df1, df2, p, ok, UpperF(6, 1, 3))
		}
	})
}

// TestOrderTrend checks the residual trend in run order against scipy.
//
// Independent implementation: scipy 1.10.1, scipy.stats.linregress(order,
// resid) (slope, pvalue, rvalue), order = 1..n in file order and resid the
// statsmodels 0.13.5 OLS residuals of y on [1, x]; printed with repr.
func TestOrderTrend(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name     string
		slope, p float64
		r        float64
	}{
		{"I", 0.025220661157024905, 0.8349751064797282, 0.07130190711944556},
		{"II", -0.13927272727272724, 0.23111782687954333, -0.39354669558372013},
		{"III", -0.050025619834710586, 0.6782216360314788, -0.1414619725008355},
		{"IV", -0.029072727272727323, 0.8100027015883574, -0.0822525559017765},
		{"wavy", -0.029100119690208537, 0.004844929980241294, -0.35903540845367143},
	}
	sets := extraSets(t)
	for _, tc := range cases {
		x, y := sets[tc.name][0], sets[tc.name][1]
		e := extraResiduals(t, x, y)
		order := make([]float64, len(e))
		for i := range order {
			order[i] = float64(i + 1)
		}
		s, p, r := OrderTrend(order, e)
		// Measured agreement: 7e-15 or better.
		if !extraClose(s, tc.slope, 1e-13) || !extraClose(p, tc.p, 1e-13) || !extraClose(r, tc.r, 1e-13) {
			t.Errorf("OrderTrend(%s) = %.17g, %.17g, %.17g; want %.17g, %.17g, %.17g", tc.name, s, p, r, tc.slope, tc.p, tc.r)
		}
	}
	if s, p, r := OrderTrend([]float64{1, 1, 1}, []float64{1, 2, 3}); !math.IsNaN(s) || !math.IsNaN(p) || !math.IsNaN(r) {
		t.Errorf("OrderTrend(constant order) = %v, %v, %v, want NaN", s, p, r)
	}
}

func extraBenchData(n int) (x, y, e []float64) {
	x, y = extraWavy(3, n)
	l, err := Line(x, y, 0.95)
	if err != nil {
		panic(err)
	}
	return x, y, l.Residuals
}

func benchmarkLackOfFit(b *testing.B, n int) {
	x, y, _ := extraBenchData(n)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		LackOfFit(x, y)
	}
}

func BenchmarkLackOfFit1e3(b *testing.B) { benchmarkLackOfFit(b, 1e3) }
func BenchmarkLackOfFit1e5(b *testing.B) { benchmarkLackOfFit(b, 1e5) }
func BenchmarkLackOfFit1e6(b *testing.B) { benchmarkLackOfFit(b, 1e6) }

func benchmarkBreuschPagan(b *testing.B, n int) {
	x, _, e := extraBenchData(n)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		BreuschPagan(e, x)
	}
}

func BenchmarkBreuschPagan1e3(b *testing.B) { benchmarkBreuschPagan(b, 1e3) }
func BenchmarkBreuschPagan1e5(b *testing.B) { benchmarkBreuschPagan(b, 1e5) }
func BenchmarkBreuschPagan1e6(b *testing.B) { benchmarkBreuschPagan(b, 1e6) }

func benchmarkDurbinWatson(b *testing.B, n int) {
	_, _, e := extraBenchData(n)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		DurbinWatson(e)
	}
}

func BenchmarkDurbinWatson1e3(b *testing.B) { benchmarkDurbinWatson(b, 1e3) }
func BenchmarkDurbinWatson1e5(b *testing.B) { benchmarkDurbinWatson(b, 1e5) }
func BenchmarkDurbinWatson1e6(b *testing.B) { benchmarkDurbinWatson(b, 1e6) }

// BenchmarkDurbinWatsonTied1e6: the study's form, keyed by a run order
// that increases down the rows, first without ties and then in blocks of
// ten tied rows.
func BenchmarkDurbinWatsonTied1e6(b *testing.B) {
	_, _, e := extraBenchData(1_000_000)
	for _, block := range []int{1, 10} {
		key := make([]float64, len(e))
		for i := range key {
			key[i] = float64(i / block)
		}
		b.Run(fmt.Sprintf("block=%d", block), func(b *testing.B) {
			for b.Loop() {
				DurbinWatsonTied(key, e)
			}
		})
	}
}

func benchmarkOrderTrend(b *testing.B, n int) {
	_, _, e := extraBenchData(n)
	order := make([]float64, n)
	src := rand.NewPCG(5, 5)
	for i := range order {
		order[i] = float64(i) + extraUniform(src)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		OrderTrend(order, e)
	}
}

func BenchmarkOrderTrend1e3(b *testing.B) { benchmarkOrderTrend(b, 1e3) }
func BenchmarkOrderTrend1e5(b *testing.B) { benchmarkOrderTrend(b, 1e5) }
func BenchmarkOrderTrend1e6(b *testing.B) { benchmarkOrderTrend(b, 1e6) }
