package stats

// Tests of agreement.go. Groups: (1) the printed figures of Bland &
// Altman (1986); (2) general-purpose libraries on the same data
// (testdata/agreement-reference.json, written by
// testdata/agreement_reference.py with numpy 1.24.2 and scipy 1.10.1 —
// the exact calls are in the script); (3) an exhaustive slow
// Passing–Bablok written here from the paper's steps; (4) identities that
// hold for any data; (5) edges.

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"os"
	"sort"
	"strconv"
	"testing"

	"bivar/internal/reference"
)

// agrPEFR reads Bland & Altman (1986), Table 1, from the shared reference
// folder: columns wright_1, wright_2, mini_1, mini_2 (l/min).
func agrPEFR(t testing.TB) map[string][]float64 {
	t.Helper()
	out := reference.NumericColumns(t, "bland-altman-1986-pefr.csv")
	if len(out["wright_1"]) != 17 {
		t.Fatalf("PEFR table: %d rows, want 17", len(out["wright_1"]))
	}
	return out
}

// agrRef reads testdata/agreement-reference.json.
func agrRef(t testing.TB) map[string]map[string]float64 {
	t.Helper()
	b, err := os.ReadFile("testdata/agreement-reference.json")
	if err != nil {
		t.Fatal(err)
	}
	var raw map[string]map[string]any
	if err := json.Unmarshal(b, &raw); err != nil {
		t.Fatal(err)
	}
	out := map[string]map[string]float64{}
	for k, m := range raw {
		if k == "versions" {
			if m["scipy"] != "1.10.1" || m["numpy"] != "1.24.2" {
				t.Fatalf("reference made with %v, want scipy 1.10.1, numpy 1.24.2", m)
			}
			continue
		}
		out[k] = map[string]float64{}
		for f, v := range m {
			out[k][f] = v.(float64)
		}
	}
	return out
}

func agrCheck(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if !coreClose(got, want, tol) {
		t.Errorf("%s = %.10g, want %.10g ±%g (relative above 1)", what, got, want, tol)
	}
}

// Group 1: the printed figures. Bland & Altman (1986), Lancet 327:307–310,
// first readings of each meter, d = Wright − mini: mean difference −2.1,
// SD 38.8, limits −79.7 to 75.5 l/min (printed to 0.1; the limits were
// worked from the rounded mean and SD, d̄ ± 2s, as SOURCES.md notes).
func TestBlandAltmanPEFRPrinted(t *testing.T) {
	t.Parallel()
	d := agrPEFR(t)
	la := BlandAltman(d["wright_1"], d["mini_1"], 2, 0.95)
	if math.Abs(la.Bias-(-2.1)) > 0.05 {
		t.Errorf("bias = %.4f, printed −2.1", la.Bias)
	}
	if math.Abs(la.SD-38.8) > 0.05 {
		t.Errorf("SD = %.4f, printed 38.8", la.SD)
	}
	rb, rs := math.Round(la.Bias*10)/10, math.Round(la.SD*10)/10
	if lo, hi := rb-la.K*rs, rb+la.K*rs; math.Abs(lo-(-79.7)) > 0.05 || math.Abs(hi-75.5) > 0.05 {
		t.Errorf("limits from rounded figures = %.2f, %.2f; printed −79.7, 75.5", lo, hi)
	}
	// Unrounded, the limits may differ from the printed ones by the rounding
	// of the mean (0.05) and of 2·SD (0.1).
	if math.Abs(la.Lower-(-79.7)) > 0.15 || math.Abs(la.Upper-75.5) > 0.15 {
		t.Errorf("limits = %.3f, %.3f; printed −79.7, 75.5 (±0.15 for the rounding)", la.Lower, la.Upper)
	}
	// The exact intervals are wider than the 1986 paper's approximate
	// limit ± t·√(3s²/n) at n = 17, and lie further out (asymmetric).
	approx := TQuantile(0.975, 16) * math.Sqrt(3*la.SD*la.SD/17)
	if !(la.UpperHi > la.Upper+approx && la.UpperHi-la.UpperLo > 2*approx && la.LowerLo < la.Lower-approx) {
		t.Errorf("upper interval %.2f to %.2f, lower from %.2f; approximate ±%.2f about %.2f and %.2f", la.UpperLo, la.UpperHi, la.LowerLo, approx, la.Upper, la.Lower)
	}
}

// Group 2: numpy/scipy on the same data (see the script for each call).
func TestBlandAltmanScipy(t *testing.T) {
	t.Parallel()
	d := agrPEFR(t)
	ref := agrRef(t)
	for _, tc := range []struct {
		key string
		k   float64
	}{{"bland_altman_k196", 1.96}, {"bland_altman_k2", 2}} {
		w := ref[tc.key]
		la := BlandAltman(d["wright_1"], d["mini_1"], tc.k, 0.95)
		const tol = 1e-12 // the same closed forms; t quantile agrees to ~1e-13 at df 16
		agrCheck(t, tc.key+" bias", la.Bias, w["bias"], tol)
		agrCheck(t, tc.key+" sd", la.SD, w["sd"], tol)
		agrCheck(t, tc.key+" bias_lo", la.BiasLo, w["bias_lo"], 1e-10)
		agrCheck(t, tc.key+" bias_hi", la.BiasHi, w["bias_hi"], 1e-10)
		agrCheck(t, tc.key+" lower", la.Lower, w["lower"], tol)
		agrCheck(t, tc.key+" upper", la.Upper, w["upper"], tol)
		// scipy.stats.nct.ppf(q, 16, k·√17) (Carkeet 2015; agreement_reference.py)
		agrCheck(t, tc.key+" lower_lo", la.LowerLo, w["lower_lo"], 1e-10)
		agrCheck(t, tc.key+" lower_hi", la.LowerHi, w["lower_hi"], 1e-10)
		agrCheck(t, tc.key+" upper_lo", la.UpperLo, w["upper_lo"], 1e-10)
		agrCheck(t, tc.key+" upper_hi", la.UpperHi, w["upper_hi"], 1e-10)
		// scipy.stats.linregress(m, d)
		agrCheck(t, tc.key+" trend_slope", la.TrendSlope, w["trend_slope"], 1e-10)
		agrCheck(t, tc.key+" trend_intercept", la.TrendIntercept, w["trend_intercept"], 1e-10)
		agrCheck(t, tc.key+" trend_se", la.TrendSlopeSE, w["trend_se"], 1e-10)
		agrCheck(t, tc.key+" trend_p", la.TrendP, w["trend_p"], 1e-9)
	}
}

func TestRepeatabilityScipy(t *testing.T) {
	t.Parallel()
	d := agrPEFR(t)
	ref := agrRef(t)
	for _, tc := range []struct{ key, a, b string }{
		{"repeatability_wright", "wright_1", "wright_2"},
		{"repeatability_mini", "mini_1", "mini_2"},
	} {
		w := ref[tc.key]
		r := Repeatability([][]float64{d[tc.a], d[tc.b]}, 0.95)
		if float64(r.DF) != w["df"] || r.N != 17 || r.M != 2 {
			t.Errorf("%s: N, M, DF = %d, %d, %d; want 17, 2, %v", tc.key, r.N, r.M, r.DF, w["df"])
		}
		agrCheck(t, tc.key+" sw", r.SW, w["sw"], 1e-12)
		// scipy.stats.chi2.ppf; our quantile is a bisection on UpperChi2.
		agrCheck(t, tc.key+" sw_lo", r.SWLo, w["sw_lo"], 1e-9)
		agrCheck(t, tc.key+" sw_hi", r.SWHi, w["sw_hi"], 1e-9)
		agrCheck(t, tc.key+" coef", r.Coef, 2.7718*r.SW, 2e-5) // Bland & Altman (1999) write 2.77·s_w; 2.7718 = 1.96·√2
	}
}

func TestBlandAltmanReplicatesScipy(t *testing.T) {
	t.Parallel()
	d := agrPEFR(t)
	w := agrRef(t)["replicates"]
	la := BlandAltmanReplicates([][]float64{d["wright_1"], d["wright_2"]},
		[][]float64{d["mini_1"], d["mini_2"]}, 1.96, 0.95)
	agrCheck(t, "bias", la.Bias, w["bias"], 1e-12)
	agrCheck(t, "sd_means", la.SDMeans, w["sd_means"], 1e-12)
	agrCheck(t, "sd", la.SD, w["sd"], 1e-12)
	agrCheck(t, "lower", la.Lower, w["bias"]-1.96*w["sd"], 1e-12)
	// scipy.stats.nct.ppf(q, 16, 1.96·√17) with the corrected SD
	agrCheck(t, "lower_lo", la.LowerLo, w["lower_lo"], 1e-10)
	agrCheck(t, "upper_hi", la.UpperHi, w["upper_hi"], 1e-10)
	// One replicate per method is the single-measurement method.
	one := BlandAltmanReplicates([][]float64{d["wright_1"]}, [][]float64{d["mini_1"]}, 1.96, 0.95)
	plain := BlandAltman(d["wright_1"], d["mini_1"], 1.96, 0.95)
	if one != plain {
		t.Errorf("one replicate each:\n got %+v\nwant %+v", one, plain)
	}
}

// Deming against scipy.odr (explicit ODR, weights 1 on x and 1/δ on y),
// jackknife by refitting scipy.odr without each row.
func TestDemingScipyODR(t *testing.T) {
	t.Parallel()
	d := agrPEFR(t)
	ref := agrRef(t)
	mean := func(a, b []float64) []float64 {
		m := make([]float64, len(a))
		for i := range a {
			m[i] = (a[i] + b[i]) / 2
		}
		return m
	}
	delta := DemingDeltaFromReplicates([][]float64{d["wright_1"], d["wright_2"]}, [][]float64{d["mini_1"], d["mini_2"]})
	agrCheck(t, "delta from replicates", delta, ref["deming_delta_rep"]["delta"], 1e-12)
	for _, tc := range []struct {
		key   string
		x, y  []float64
		delta float64
	}{
		{"deming_delta1", d["wright_1"], d["mini_1"], 1},
		{"deming_delta4", d["wright_1"], d["mini_1"], 4},
		{"deming_delta_rep", mean(d["wright_1"], d["wright_2"]), mean(d["mini_1"], d["mini_2"]), delta},
	} {
		w := ref[tc.key]
		f := Deming(tc.x, tc.y, tc.delta, 0.95)
		// ODR stops (sstol = partol = 1e-15, analytic derivatives) within
		// about 1e-9 of the closed-form slope; the intercept ȳ − b·x̄, with
		// x̄ ≈ 450 l/min against an intercept of 15–35, magnifies that to
		// about 5e-8 relative.
		const tol = 1e-7
		agrCheck(t, tc.key+" slope", f.Slope, w["slope"], tol)
		agrCheck(t, tc.key+" intercept", f.Intercept, w["intercept"], tol)
		agrCheck(t, tc.key+" slope_se", f.SlopeSE, w["slope_se"], tol)
		agrCheck(t, tc.key+" intercept_se", f.InterceptSE, w["intercept_se"], tol)
		agrCheck(t, tc.key+" slope_lo", f.SlopeLo, w["slope_lo"], tol)
		agrCheck(t, tc.key+" slope_hi", f.SlopeHi, w["slope_hi"], tol)
		agrCheck(t, tc.key+" intercept_lo", f.InterceptLo, w["intercept_lo"], tol)
		agrCheck(t, tc.key+" intercept_hi", f.InterceptHi, w["intercept_hi"], tol)
	}
}

func TestLinCCCNumpy(t *testing.T) {
	t.Parallel()
	d := agrPEFR(t)
	w := agrRef(t)["ccc"]
	c := LinCCC(d["wright_1"], d["mini_1"], 0.95)
	for _, f := range []struct {
		name      string
		got, want float64
	}{{"ccc", c.CCC, w["ccc"]}, {"lo", c.Lo, w["lo"]}, {"hi", c.Hi, w["hi"]}, {"zse", c.ZSE, w["zse"]},
		{"r", c.Pearson, w["r"]}, {"cb", c.Cb, w["cb"]}, {"u", c.U, w["u"]}} {
		agrCheck(t, "LinCCC "+f.name, f.got, f.want, 1e-12)
	}
	// r from Pearson; ρ_c = r·C_b.
	agrCheck(t, "r vs Pearson", c.Pearson, Pearson(d["wright_1"], d["mini_1"], 0.95).R, 1e-14)
	agrCheck(t, "r·Cb", c.Pearson*c.Cb, c.CCC, 1e-14)
}

// Group 3: Passing–Bablok by the paper's steps, written independently:
// every pair, sort.Float64s, explicit counts.
func pbSlow(x, y []float64, conf float64) (b, lo, hi, a float64) {
	var s []float64
	for i := range x {
		for j := range x {
			if j <= i {
				continue
			}
			dx, dy := x[j]-x[i], y[j]-y[i]
			switch {
			case dx == 0 && dy == 0:
			case dx == 0:
				s = append(s, math.Inf(1))
			case dy/dx != -1:
				s = append(s, dy/dx)
			}
		}
	}
	sort.Float64s(s)
	k := 0
	for _, v := range s {
		if v < -1 {
			k++
		}
	}
	n := len(s)
	if n%2 == 1 {
		b = s[(n+1)/2+k-1]
	} else {
		b = (s[n/2+k-1] + s[n/2+k]) / 2
	}
	nn := float64(len(x))
	c := NormalQuantile(0.5+conf/2) * math.Sqrt(nn*(nn-1)*(2*nn+5)/18)
	m1 := int(math.Round((float64(n) - c) / 2))
	m2 := n - m1 + 1
	lo, hi = s[m1+k-1], s[m2+k-1]
	r := make([]float64, len(x))
	for i := range x {
		r[i] = y[i] - b*x[i]
	}
	sort.Float64s(r)
	if len(r)%2 == 1 {
		a = r[len(r)/2]
	} else {
		a = (r[len(r)/2-1] + r[len(r)/2]) / 2
	}
	return b, lo, hi, a
}

func agrGauges(n int, seed uint64) (x, y []float64) {
	rng := rand.New(rand.NewPCG(seed, 7))
	x, y = make([]float64, n), make([]float64, n)
	for i := range x {
		v := 50 + 10*rng.NormFloat64()
		x[i] = math.Round((v+rng.NormFloat64())*10) / 10 // ties from the rounding
		y[i] = math.Round((3+1.05*v+1.5*rng.NormFloat64())*10) / 10
	}
	return x, y
}

func TestPassingBablokExhaustive(t *testing.T) {
	t.Parallel()
	d := agrPEFR(t)
	cases := []struct {
		name string
		x, y []float64
	}{{"pefr", d["wright_1"], d["mini_1"]}}
	for _, n := range []int{5, 8, 30, 101} {
		x, y := agrGauges(n, uint64(n))
		cases = append(cases, struct {
			name string
			x, y []float64
		}{"gauges-" + strconv.Itoa(n), x, y})
	}
	for _, tc := range cases {
		f := PassingBablok(tc.x, tc.y, 0.95)
		b, lo, hi, a := pbSlow(tc.x, tc.y, 0.95)
		if f.Slope != b || f.SlopeLo != lo || f.SlopeHi != hi || f.Intercept != a {
			t.Errorf("%s: slope %v [%v, %v] intercept %v; slow %v [%v, %v] %v",
				tc.name, f.Slope, f.SlopeLo, f.SlopeHi, f.Intercept, b, lo, hi, a)
		}
		if f.Sampled {
			t.Errorf("%s: sampled at n = %d", tc.name, len(tc.x))
		}
		if !(f.InterceptLo <= f.Intercept && f.Intercept <= f.InterceptHi) {
			t.Errorf("%s: intercept %v outside [%v, %v]", tc.name, f.Intercept, f.InterceptLo, f.InterceptHi)
		}
	}
}

// Group 4: properties the paper designs the method to have.
func TestPassingBablokProperties(t *testing.T) {
	t.Parallel()
	// Swapping the methods inverts the slope exactly when the number of
	// slopes is odd (no averaging of two middle slopes): 30 distinct
	// continuous rows give 435 slopes.
	rng := rand.New(rand.NewPCG(3, 3))
	x, y := make([]float64, 30), make([]float64, 30)
	for i := range x {
		v := 10 + 3*rng.NormFloat64()
		x[i], y[i] = v+0.3*rng.NormFloat64(), 1+1.2*v+0.4*rng.NormFloat64()
	}
	f, g := PassingBablok(x, y, 0.95), PassingBablok(y, x, 0.95)
	if f.Slopes%2 != 1 {
		t.Fatalf("want an odd number of slopes, got %d", f.Slopes)
	}
	if math.Abs(f.Slope*g.Slope-1) > 1e-14 {
		t.Errorf("swap: b = %v, b' = %v, b·b' = %v, want 1", f.Slope, g.Slope, f.Slope*g.Slope)
	}
	if math.Abs(f.SlopeLo*g.SlopeHi-1) > 1e-14 || math.Abs(f.SlopeHi*g.SlopeLo-1) > 1e-14 {
		t.Errorf("swap: interval [%v, %v] vs [%v, %v], want reciprocals", f.SlopeLo, f.SlopeHi, g.SlopeLo, g.SlopeHi)
	}
	// Row order does not matter (exact and sampled paths).
	for _, n := range []int{200, PassingBablokExactMax + 1} {
		if n > 1000 && testing.Short() {
			continue
		}
		x, y := agrGauges(n, 11)
		f := PassingBablok(x, y, 0.95)
		p := rand.New(rand.NewPCG(5, 5)).Perm(n)
		xs, ys := make([]float64, n), make([]float64, n)
		for i, j := range p {
			xs[i], ys[i] = x[j], y[j]
		}
		if g := PassingBablok(xs, ys, 0.95); f != g {
			t.Errorf("n=%d: row order changed the fit:\n%+v\n%+v", n, f, g)
		}
		if n > PassingBablokExactMax {
			// The sample of pairs: the slope within a fifth of the exact
			// interval's half-width of the exact slope.
			if !f.Sampled {
				t.Errorf("n=%d: not sampled", n)
			}
			b, lo, hi, _ := pbSlow(x, y, 0.95)
			if math.Abs(f.Slope-b) > (hi-lo)/10 || math.Abs(f.SlopeLo-lo) > (hi-lo)/5 || math.Abs(f.SlopeHi-hi) > (hi-lo)/5 {
				t.Errorf("sampled slope %v [%v, %v], all pairs %v [%v, %v]", f.Slope, f.SlopeLo, f.SlopeHi, b, lo, hi)
			}
		}
	}
	// Identity data: slope 1, intercept 0.
	id := []float64{1, 2, 3, 5, 8, 13}
	if f := PassingBablok(id, id, 0.95); f.Slope != 1 || f.Intercept != 0 {
		t.Errorf("identity: slope %v intercept %v", f.Slope, f.Intercept)
	}
}

func TestDemingIdentities(t *testing.T) {
	t.Parallel()
	x, y := agrGauges(60, 21)
	// Swapping x and y with 1/δ inverts the line.
	for _, delta := range []float64{0.25, 1, 3} {
		f, g := Deming(x, y, delta, 0.95), Deming(y, x, 1/delta, 0.95)
		if math.Abs(f.Slope*g.Slope-1) > 1e-12 {
			t.Errorf("δ=%v: b·b' = %v, want 1", delta, f.Slope*g.Slope)
		}
	}
	// δ → ∞: least squares of y on x; δ → 0: of x on y, inverted.
	ols := func(x, y []float64) float64 { _, b, _, _ := agrOLS(x, y); return b }
	agrCheck(t, "δ=1e12 vs OLS y|x", Deming(x, y, 1e12, 0.95).Slope, ols(x, y), 1e-9)
	agrCheck(t, "δ=1e-12 vs 1/OLS x|y", Deming(x, y, 1e-12, 0.95).Slope, 1/ols(y, x), 1e-9)
	// The O(1) downdated jackknife equals refitting without each row.
	f := Deming(x, y, 2, 0.95)
	n := float64(len(x))
	var bs []float64
	for i := range x {
		bs = append(bs, Deming(coreWithout(x, i), coreWithout(y, i), 2, 0.95).Slope)
	}
	mb, _ := agrMeanSD(bs)
	var v float64
	for _, b := range bs {
		v += (b - mb) * (b - mb)
	}
	agrCheck(t, "jackknife SE vs refits", f.SlopeSE, math.Sqrt(v*(n-1)/n), 1e-9)
}

func TestBlandAltmanIdentities(t *testing.T) {
	t.Parallel()
	a, b := agrGauges(40, 4)
	f, g := BlandAltman(a, b, 1.96, 0.95), BlandAltman(b, a, 1.96, 0.95)
	if f.Bias != -g.Bias || math.Abs(f.Lower+g.Upper) > 1e-12 || f.SD != g.SD {
		t.Errorf("swap: %+v vs %+v", f, g)
	}
	if !(f.LowerLo < f.Lower && f.Lower < f.LowerHi && f.UpperLo < f.Upper && f.Upper < f.UpperHi && f.BiasLo < f.Bias) {
		t.Errorf("intervals do not bracket: %+v", f)
	}
}

func TestLinCCCIdentities(t *testing.T) {
	t.Parallel()
	x, y := agrGauges(50, 9)
	if c := LinCCC(x, x, 0.95); c.CCC != 1 || !math.IsNaN(c.Lo) {
		t.Errorf("x with itself: %+v, want ρ_c = 1 and no interval", c)
	}
	c := LinCCC(x, y, 0.95)
	if !(math.Abs(c.CCC) <= math.Abs(c.Pearson)) || !(c.Lo < c.CCC && c.CCC < c.Hi) {
		t.Errorf("ρ_c = %v, r = %v, interval [%v, %v]", c.CCC, c.Pearson, c.Lo, c.Hi)
	}
	// Shifting y lowers ρ_c but not r.
	ys := make([]float64, len(y))
	for i := range y {
		ys[i] = y[i] + 5
	}
	if s := LinCCC(x, ys, 0.95); !(s.CCC < c.CCC) || math.Abs(s.Pearson-c.Pearson) > 1e-12 {
		t.Errorf("shift: ρ_c %v → %v, r %v → %v", c.CCC, s.CCC, c.Pearson, s.Pearson)
	}
}

// Group 5: edges.
func TestAgreementEdges(t *testing.T) {
	t.Parallel()
	for name, f := range map[string]func(){
		"BlandAltman":   func() { BlandAltman([]float64{1}, nil, 2, 0.95) },
		"Deming":        func() { Deming([]float64{1}, nil, 1, 0.95) },
		"PassingBablok": func() { PassingBablok([]float64{1}, nil, 0.95) },
		"LinCCC":        func() { LinCCC([]float64{1}, nil, 0.95) },
		"Repeatability": func() { Repeatability([][]float64{{1, 2}, {1}}, 0.95) },
		"Replicates":    func() { BlandAltmanReplicates([][]float64{{1, 2}}, [][]float64{{1}}, 2, 0.95) },
	} {
		if !corePanics(f) {
			t.Errorf("%s: no panic on length mismatch", name)
		}
	}
	one := []float64{1}
	if la := BlandAltman(one, one, 2, 0.95); !math.IsNaN(la.Bias) || !math.IsNaN(la.Lower) {
		t.Errorf("n=1: %+v", la)
	}
	if la := BlandAltman([]float64{1, math.NaN(), 3}, []float64{1, 2, 3}, 2, 0.95); !math.IsNaN(la.Bias) {
		t.Errorf("NaN input: bias %v", la.Bias)
	}
	// Constant means: no trend regression, limits still defined.
	if la := BlandAltman([]float64{1, 2, 3}, []float64{3, 2, 1}, 2, 0.95); !math.IsNaN(la.TrendSlope) || math.IsNaN(la.Lower) {
		t.Errorf("constant means: %+v", la)
	}
	x3 := []float64{1, 2, 3}
	if f := Deming(x3, []float64{5, 5, 5}, 1, 0.95); !math.IsNaN(f.Slope) {
		t.Errorf("Deming with constant y: slope %v", f.Slope)
	}
	if f := Deming(x3, x3, 0, 0.95); !math.IsNaN(f.Slope) {
		t.Errorf("Deming δ=0: slope %v", f.Slope)
	}
	if f := Deming([]float64{1, 2}, []float64{1, 2}, 1, 0.95); !math.IsNaN(f.Slope) {
		t.Errorf("Deming n=2: slope %v", f.Slope)
	}
	if f := PassingBablok([]float64{1, 1, 1}, []float64{2, 2, 2}, 0.95); !math.IsNaN(f.Slope) || f.Slopes != 0 {
		t.Errorf("PassingBablok, one point thrice: %+v", f)
	}
	if f := PassingBablok([]float64{1, math.Inf(1)}, []float64{1, 2}, 0.95); !math.IsNaN(f.Slope) {
		t.Errorf("PassingBablok with Inf: %+v", f)
	}
	if c := LinCCC([]float64{2, 2}, []float64{2, 2}, 0.95); !math.IsNaN(c.CCC) {
		t.Errorf("LinCCC of equal constants: %v", c.CCC)
	}
	if r := Repeatability([][]float64{{1, 2}}, 0.95); !math.IsNaN(r.SW) {
		t.Errorf("Repeatability with one replicate: %v", r.SW)
	}
	if v := DemingDeltaFromReplicates([][]float64{{1, 2}, {1, 2}}, [][]float64{{1, 2}, {1, 3}}); !math.IsNaN(v) {
		t.Errorf("δ with exact x replicates: %v", v)
	}
}

func BenchmarkAgreement(b *testing.B) {
	for _, n := range []int{1_000, 100_000} {
		x, y := agrGauges(n, 1)
		x2, y2 := agrGauges(n, 2)
		name := strconv.Itoa(n)
		b.Run("BlandAltman/"+name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				BlandAltman(x, y, 1.96, 0.95)
			}
		})
		b.Run("BlandAltmanReplicates/"+name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				BlandAltmanReplicates([][]float64{x, x2}, [][]float64{y, y2}, 1.96, 0.95)
			}
		})
		b.Run("Repeatability/"+name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				Repeatability([][]float64{x, x2}, 0.95)
			}
		})
		b.Run("Deming/"+name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				Deming(x, y, 1, 0.95)
			}
		})
		b.Run("PassingBablok/"+name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				PassingBablok(x, y, 0.95)
			}
		})
		b.Run("LinCCC/"+name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				LinCCC(x, y, 0.95)
			}
		})
	}
}
