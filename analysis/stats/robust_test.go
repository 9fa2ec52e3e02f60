package stats

import (
	"math"
	"math/rand/v2"
	"path/filepath"
	"sort"
	"testing"

	"bivar/internal/reference"
)

// Reference values: statsmodels 0.13.5 (numpy 1.24.2, scipy 1.10.1) by
// testdata/robustref.py, run as /usr/bin/python3 on the NIST StRD files
// read in place:
//
//	OLS(y, add_constant(x)).fit(cov_type="HC3").bse[1]
//	OLS(y, add_constant(x)).fit(cov_type="HAC",
//	    cov_kwds={"maxlags": L, "kernel": "bartlett", "use_correction": False}).bse[1]
//	statsmodels.tsa.stattools.acf(v, nlags=1, fft=False)[1]
//
// with L = floor(4 (n/100)^(2/9)); statsmodels' HAC default is
// use_correction=False, stated explicitly in the call (with True its SE
// is larger by √(n/(n − 2)): 0.0014445494970139043 for Longley).
var robustRef = []struct {
	file       string
	xcol       int  // predictor column (0-based among x1, x2, …)
	byLastCol  bool // rows in order of the last predictor (Longley's year)
	lags       int
	hc3, hac   float64
	acfX, acfY float64
}{
	{"Longley.dat", 1, true, 2, 0.001561919042948443, 0.0013512523240156642, 0.7937830091106455, 0.7815622158480158},
	{"Norris.dat", 0, false, 3, 0.0005231447809287869, 0.0005514797812028345, 0.14036034843965806, 0.13917043641803964},
}

func TestRobustSlopeSE(t *testing.T) {
	for _, c := range robustRef {
		d := parseStRD(t, filepath.Join(reference.Dir(t), "nist-strd", c.file))
		n := len(d.y)
		idx := make([]int, n)
		for i := range idx {
			idx[i] = i
		}
		if c.byLastCol {
			last := d.x[len(d.x)-1]
			sort.SliceStable(idx, func(a, b int) bool { return last[idx[a]] < last[idx[b]] })
		}
		x, y := make([]float64, n), make([]float64, n)
		for k, i := range idx {
			x[k], y[k] = d.x[c.xcol][i], d.y[i]
		}
		if got := NeweyWestLags(n); got != c.lags {
			t.Errorf("%s: NeweyWestLags(%d) = %d, want %d", c.file, n, got, c.lags)
		}
		_, hc3 := SlopeHC3(x, y)
		_, hac := SlopeHAC(x, y, c.lags)
		ax, ay := Lag1Autocorr(x), Lag1Autocorr(y)
		for _, v := range []struct {
			name      string
			got, want float64
		}{{"HC3 SE", hc3, c.hc3}, {"HAC SE", hac, c.hac}, {"lag-1 acf of x", ax, c.acfX}, {"lag-1 acf of y", ay, c.acfY}} {
			if math.Abs(v.got-v.want) > 1e-9*math.Abs(v.want) {
				t.Errorf("%s: %s = %.17g, statsmodels %.17g", c.file, v.name, v.got, v.want)
			}
		}
	}
}

// TestHACManyLags: Newey–West with more lags than the first two cases, so
// that SlopeHAC's four-lags-at-a-time pass runs once and more often, with
// and without a remainder (7, 9, 13 and 17 lags), against statsmodels
// 0.13.5 (Debian's python3-statsmodels) on NIST's Norris data in file
// order:
//
//	sm.OLS(y, sm.add_constant(x)).fit(cov_type="HAC",
//	    cov_kwds={"maxlags": L, "use_correction": False}).bse[1]
func TestHACManyLags(t *testing.T) {
	d := parseStRD(t, filepath.Join(reference.Dir(t), "nist-strd", "Norris.dat"))
	for _, c := range []struct {
		lags int
		want float64
	}{{7, 0.0006213394456180952}, {9, 0.0006378639353323315}, {13, 0.0006574857043856037}, {17, 0.0006513134007658038}} {
		if _, se := SlopeHAC(d.x[0], d.y, c.lags); math.Abs(se-c.want) > 1e-9*c.want {
			t.Errorf("Norris, %d lags: HAC SE = %.17g, statsmodels %.17g", c.lags, se, c.want)
		}
	}
}

// TestHACIdentities: with no lags the HAC SE is the HC0 SE, Σu²/Sxx²
// (White 1980), and HC3 ≥ HC0; they do not depend on the order of the
// rows, while HAC with lags does.
func TestHACIdentities(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}
	y := []float64{1.2, 1.9, 3.4, 3.8, 5.5, 5.9, 7.4, 7.7, 9.6, 9.8}
	mx, my, sxx, b := lineParts(x, y)
	var s float64
	for i := range x {
		dx := x[i] - mx
		e := y[i] - my - b*dx
		s += dx * dx * e * e
	}
	_, h0 := SlopeHAC(x, y, 0)
	if want := math.Sqrt(s) / sxx; math.Abs(h0-want) > 1e-15*want {
		t.Errorf("HAC with 0 lags %v, HC0 %v", h0, want)
	}
	if _, h3 := SlopeHC3(x, y); !(h3 > h0) {
		t.Errorf("HC3 %v not above HC0 %v", h3, h0)
	}
	if _, se := SlopeHAC(x[:2], y[:2], 1); !math.IsNaN(se) {
		t.Errorf("two rows: %v, want NaN", se)
	}
}

// TestEffectiveN: Bartlett's formula, capped at n, and the t-test and
// Fisher interval with n_eff = n are Pearson's.
func TestEffectiveN(t *testing.T) {
	if got, want := EffectiveN(100, 0.5, 0.6), 100*(1-0.3)/(1+0.3); math.Abs(got-want) > 1e-12 {
		t.Errorf("EffectiveN(100, 0.5, 0.6) = %v, want %v", got, want)
	}
	if got := EffectiveN(100, 0.5, -0.6); got != 100 {
		t.Errorf("EffectiveN with ρxρy < 0 = %v, want the cap 100", got)
	}
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12}
	y := []float64{2, 1, 4, 3, 6, 5, 5, 9, 7, 11, 10, 12}
	c := Pearson(x, y, 0.95)
	p, lo, hi := CorrelationEff(c.R, float64(len(x)), 0.95)
	if math.Abs(p-c.P) > 1e-12*c.P || math.Abs(lo-c.CILow) > 1e-12 || math.Abs(hi-c.CIHigh) > 1e-12 {
		t.Errorf("CorrelationEff with n_eff = n: p %v CI %v to %v; Pearson p %v CI %v to %v", p, lo, hi, c.P, c.CILow, c.CIHigh)
	}
}

// TestSlopeHACRun: the HAC slope and SE with the line summed in one order
// and the scores taken in run order equal those of the rows copied into
// run order (an identity; the sums about the means are taken in another
// order, so to rounding).
func TestSlopeHACRun(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	n := 5000
	x, y := make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64()
		y[i] = 1 + 2*x[i] + rng.NormFloat64()
	}
	order := make([]int32, n)
	for i := range order {
		order[i] = int32(i)
	}
	rng.Shuffle(n, func(i, j int) { order[i], order[j] = order[j], order[i] })
	ox, oy := make([]float64, n), make([]float64, n)
	for t, i := range order {
		ox[t], oy[t] = x[i], y[i]
	}
	b1, se1 := SlopeHAC(ox, oy, NeweyWestLags(n))
	b2, se2 := SlopeHACRun(x, y, ox, oy, NeweyWestLags(n))
	if math.Abs(b1-b2) > 1e-13*math.Abs(b1) || math.Abs(se1-se2) > 1e-12*se1 {
		t.Errorf("copied: %v ± %v; line in the first order: %v ± %v", b1, se1, b2, se2)
	}
}
