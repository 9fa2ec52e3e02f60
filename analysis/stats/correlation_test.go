package stats

import (
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"slices"
	"testing"

	"bivar/internal/reference"
)

// Reference values from scipy 1.10.1 (numpy 1.24.2), computed by
// /work/shared/tools/refcheck.py on Anscombe (1973) sets I–IV from
// shared/reference/anscombe.csv and on the ties case below:
//
//	rho, p = scipy.stats.spearmanr(x, y)                     (average ranks; p by t, n−2 df)
//	tau, p = scipy.stats.kendalltau(x, y)                    (variant "b", method "auto": exact p
//	                                                          for sets I–III, n = 11 without ties;
//	                                                          asymptotic with the tie-corrected
//	                                                          variance for IV and "ties")
//	r, p   = scipy.stats.pearsonr(x, y); CI = tanh(atanh(r) ∓ 1.959963984540054/√(n−3))
var rankRef = []struct {
	name               string
	spearman, spearmnP float64
	tau, tauP          float64
}{
	{"I", 0.8181818181818182, 0.0020831448404786904, 0.6363636363636364, 0.005707170915504249},
	{"II", 0.690909090909091, 0.018565033381595004, 0.5636363636363636, 0.016540504248837583},
	{"III", 0.990909090909091, 3.762571807085399e-09, 0.9636363636363636, 5.511463844797178e-07},
	{"IV", 0.5, 0.11730680301423815, 0.42640143271122083, 0.11384629800665805},
	{"ties", 0.9501488095238095, 1.7974520018768076e-08, 0.8495575221238938, 1.1384268182456134e-05},
}

// A hand-made case with ties in both variables (not invented data posing as
// measurements: small integers chosen to make tie groups of 2 and 3).
var (
	tiesX = []float64{1, 2, 2, 3, 3, 3, 4, 5, 5, 6, 7, 7, 8, 9, 9, 10}
	tiesY = []float64{2, 1, 3, 3, 5, 4, 4, 6, 5, 5, 8, 7, 7, 9, 10, 9}
)

func rankRefData(t *testing.T, name string) (x, y []float64) {
	if name == "ties" {
		return tiesX, tiesY
	}
	s := reference.Anscombe(t)[name]
	return s[0], s[1]
}

func TestRankCorrelationsReference(t *testing.T) {
	t.Parallel()
	for _, tc := range rankRef {
		t.Run(tc.name, func(t *testing.T) {
			x, y := rankRefData(t, tc.name)
			// Measured agreement: ρ and τ exact or 1 ulp, p within 3e-15
			// relative; the p tolerance is 1e-13 relative.
			rho, p := Spearman(x, y)
			if !coreClose(rho, tc.spearman, 1e-15) || !coreClose(p, tc.spearmnP, 1e-13*tc.spearmnP) {
				t.Errorf("Spearman = %.16g, p %.16g; scipy %.16g, p %.16g", rho, p, tc.spearman, tc.spearmnP)
			}
			tau, tp := KendallTauB(x, y)
			if !coreClose(tau, tc.tau, 1e-15) || !coreClose(tp, tc.tauP, 1e-13*tc.tauP) {
				t.Errorf("KendallTauB = %.16g, p %.16g; scipy %.16g, p %.16g", tau, tp, tc.tau, tc.tauP)
			}
		})
	}
}

func TestPearsonReference(t *testing.T) {
	t.Parallel()
	// scipy 1.10.1 scipy.stats.pearsonr via refcheck.py; Fisher-z CI at 95 %.
	cases := []struct {
		name         string
		r, p, lo, hi float64
	}{
		{"I", 0.81642051634484, 0.002169628873078783, 0.4243912133932165, 0.9506932537865606},
		{"IV", 0.816521436888503, 0.002164602347197214, 0.4246393822445132, 0.9507223620781419},
		{"ties", 0.9447962479293388, 3.618055267383367e-08, 0.8446965553290496, 0.9810405302678755},
	}
	for _, tc := range cases {
		x, y := rankRefData(t, tc.name)
		c := Pearson(x, y, 0.95)
		if !coreClose(c.R, tc.r, 1e-15) || !coreClose(c.P, tc.p, 1e-13*tc.p) ||
			!coreClose(c.CILow, tc.lo, 1e-12) || !coreClose(c.CIHigh, tc.hi, 1e-12) {
			t.Errorf("%s: Pearson = %+v; scipy r %.16g p %.16g CI [%.16g, %.16g]", tc.name, c, tc.r, tc.p, tc.lo, tc.hi)
		}
		if c.DF != len(x)-2 || !coreClose(c.R2, tc.r*tc.r, 1e-13) {
			t.Errorf("%s: DF %d R2 %g", tc.name, c.DF, c.R2)
		}
	}
}

func TestRanks(t *testing.T) {
	t.Parallel()
	// Hand-checkable: average ranks (Kendall & Gibbons 1990, §3.8).
	got := Ranks([]float64{10, 20, 20, 5, 20, 7})
	want := []float64{3, 5, 5, 1, 5, 2}
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("Ranks = %v, want %v", got, want)
		}
	}
	// Against a naive O(n²) definition on random tied data.
	rng := rand.New(rand.NewPCG(7, 1))
	for trial := 0; trial < 100; trial++ {
		n := 1 + rng.IntN(40)
		x := make([]float64, n)
		for i := range x {
			x[i] = float64(rng.IntN(8))
		}
		r := Ranks(x)
		for i := range x {
			less, eq := 0, 0
			for j := range x {
				if x[j] < x[i] {
					less++
				} else if x[j] == x[i] {
					eq++
				}
			}
			if w := float64(less) + float64(eq+1)/2; r[i] != w {
				t.Fatalf("Ranks(%v)[%d] = %g, want %g", x, i, r[i], w)
			}
		}
	}
}

// naiveTauB is τ-b by the O(n²) definition, with the exact p (untied,
// n ≤ KendallExactMaxN) or the tie-corrected normal p.
func naiveTauB(x, y []float64) (tau, p float64) {
	n := len(x)
	var s, tx, ty float64
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			a := math.Copysign(1, x[i]-x[j])
			b := math.Copysign(1, y[i]-y[j])
			if x[i] == x[j] {
				a = 0
				tx++
			}
			if y[i] == y[j] {
				b = 0
				ty++
			}
			s += a * b
		}
	}
	n0 := float64(n*(n-1)) / 2
	tau = s / math.Sqrt((n0-tx)*(n0-ty))
	groups := func(v []float64) (v0, v1, v2 float64) {
		cnt := map[float64]float64{}
		for _, e := range v {
			cnt[e]++
		}
		for _, t := range cnt {
			v0 += t * (t - 1) * (2*t + 5)
			v1 += t * (t - 1)
			v2 += t * (t - 1) * (t - 2)
		}
		return
	}
	a0, a1, a2 := groups(x)
	b0, b1, b2 := groups(y)
	if tx == 0 && ty == 0 && n <= KendallExactMaxN {
		// Exact: the discordant count D = (n0 − S)/2 is distributed as the
		// inversions of a random permutation; count permutations of n
		// with k inversions exactly (Mahonian numbers, big integers, the
		// plain recursion I_j(k) = Σ_{i<j} I_{j−1}(k−i)).
		d := int((n0 - s) / 2)
		c := min(d, int(n0)-d)
		cnt := []*big.Int{big.NewInt(1)}
		for j := 2; j <= n; j++ {
			next := make([]*big.Int, len(cnt)+j-1)
			for k := range next {
				next[k] = new(big.Int)
				for i := 0; i < j && i <= k; i++ {
					if k-i < len(cnt) {
						next[k].Add(next[k], cnt[k-i])
					}
				}
			}
			cnt = next
		}
		tail, all := new(big.Int), new(big.Int)
		for k, v := range cnt {
			all.Add(all, v)
			if k <= c {
				tail.Add(tail, v)
			}
		}
		pr, _ := new(big.Rat).SetFrac(tail.Mul(tail, big.NewInt(2)), all).Float64()
		if 4*c == n*(n-1) {
			pr = 1
		}
		return tau, math.Min(1, pr)
	}
	nf := float64(n)
	v := (nf*(nf-1)*(2*nf+5)-a0-b0)/18 + a1*b1/(2*nf*(nf-1)) + a2*b2/(9*nf*(nf-1)*(nf-2))
	return tau, math.Erfc(math.Abs(s/math.Sqrt(v)) / math.Sqrt2)
}

func TestKendallMatchesNaive(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(11, 3))
	for trial := 0; trial < 300; trial++ {
		n := 3 + rng.IntN(80)
		levels := 2 + rng.IntN(30) // few levels make many ties
		x, y := make([]float64, n), make([]float64, n)
		for i := range x {
			x[i] = float64(rng.IntN(levels))
			y[i] = float64(rng.IntN(levels)) + 0.3*x[i]*float64(trial%3)
		}
		if trial%50 == 0 {
			// Larger, signed, mostly continuous data with ±0, so that the
			// radix order of negative keys and many merge levels are used.
			n = 1000 + rng.IntN(1000)
			x, y = make([]float64, n), make([]float64, n)
			for i := range x {
				x[i] = math.Round(rng.NormFloat64()*1e3) / 10
				y[i] = -0.2*x[i] + rng.NormFloat64()*20
				if i%97 == 0 {
					x[i], y[i] = math.Copysign(0, -1), 0
				}
			}
		}
		tau, p := KendallTauB(x, y)
		wt, wp := naiveTauB(x, y)
		if !coreClose(tau, wt, 1e-12) || !coreClose(p, wp, 1e-9) {
			t.Fatalf("n=%d: KendallTauB = %.15g, p %.15g; naive %.15g, p %.15g\nx=%v\ny=%v", n, tau, p, wt, wp, x, y)
		}
	}
}

func TestCorrelationProperties(t *testing.T) {
	t.Parallel()
	// Facts of the trade (common practice): r ∈ [−1, 1]; r is unchanged by a
	// positive affine change of either variable and changes sign under a
	// negative scale; r is symmetric in x and y while the slope is not, and
	// slope(y on x)·slope(x on y) = r².
	rng := rand.New(rand.NewPCG(2026, 12))
	for trial := 0; trial < 500; trial++ {
		n := 3 + rng.IntN(200)
		beta := rng.NormFloat64() * 3
		x, y := make([]float64, n), make([]float64, n)
		for i := range x {
			x[i] = rng.NormFloat64()*math.Exp(rng.NormFloat64()) + 50*rng.NormFloat64()
			y[i] = beta*x[i] + rng.NormFloat64()*10
		}
		c := Pearson(x, y, 0.95)
		if !(c.R >= -1 && c.R <= 1) {
			t.Fatalf("r = %v outside [−1, 1]", c.R)
		}
		if !(c.CILow <= c.R && c.R <= c.CIHigh) && n > 3 {
			t.Fatalf("r = %v outside its CI [%v, %v]", c.R, c.CILow, c.CIHigh)
		}
		a := math.Exp(rng.NormFloat64() * 4) // positive scale 1e-3..1e3-ish
		b := rng.NormFloat64() * 1e4
		xs, ys, xn := make([]float64, n), make([]float64, n), make([]float64, n)
		for i := range x {
			xs[i] = a*x[i] + b
			ys[i] = a*y[i] - b
			xn[i] = -a*x[i] + b
		}
		for _, v := range []struct {
			name string
			r    float64
			want float64
		}{
			{"a·x+b", Pearson(xs, y, 0.95).R, c.R},
			{"a·y−b", Pearson(x, ys, 0.95).R, c.R},
			{"−a·x+b", Pearson(xn, y, 0.95).R, -c.R},
			{"swap", Pearson(y, x, 0.95).R, c.R},
		} {
			if math.Abs(v.r-v.want) > 1e-10 {
				t.Fatalf("trial %d: r(%s) = %.15g, want %.15g", trial, v.name, v.r, v.want)
			}
		}
		rs, _ := Spearman(xs, y)
		r0, _ := Spearman(x, y)
		tb, _ := KendallTauB(xn, y)
		t0, _ := KendallTauB(x, y)
		if rs != r0 || !coreClose(tb, -t0, 1e-14) {
			t.Fatalf("rank correlations not invariant: ρ %v vs %v, τ %v vs −%v", rs, r0, tb, t0)
		}
		lyx, err1 := Line(x, y, 0.95)
		lxy, err2 := Line(y, x, 0.95)
		if err1 != nil || err2 != nil {
			t.Fatal(err1, err2)
		}
		// The slopes are b_yx = Sxy/Sxx and b_xy = Sxy/Syy: not symmetric.
		m := CentredMoments(x, y)
		if math.Abs(m.Sxx-m.Syy) > 1e-6*(m.Sxx+m.Syy) && coreClose(lyx.Slope.Estimate, lxy.Slope.Estimate, 1e-9) {
			t.Fatalf("slope of y on x %v equals slope of x on y %v although Sxx ≠ Syy", lyx.Slope.Estimate, lxy.Slope.Estimate)
		}
		if prod := lyx.Slope.Estimate * lxy.Slope.Estimate; !coreClose(prod, c.R2, 1e-10) {
			t.Fatalf("slope_yx·slope_xy = %.15g, want r² = %.15g", prod, c.R2)
		}
		if !coreClose(lyx.R2, c.R2, 1e-10) {
			t.Fatalf("line R² %.15g ≠ r² %.15g", lyx.R2, c.R2)
		}
		if !coreClose(lyx.Slope.T, c.T, 1e-8) || !coreClose(lyx.Slope.P, c.P, 1e-8) {
			t.Fatalf("slope t %v p %v ≠ r's t %v p %v", lyx.Slope.T, lyx.Slope.P, c.T, c.P)
		}
	}
}

func TestCorrelationEdges(t *testing.T) {
	t.Parallel()
	nan := math.IsNaN
	// n = 2: r = ±1, no t-test, no interval.
	c := Pearson([]float64{1, 2}, []float64{5, 3}, 0.95)
	if c.R != -1 || !nan(c.T) || !nan(c.P) || !nan(c.CILow) || c.DF != 0 {
		t.Errorf("n=2: %+v", c)
	}
	// Constant column: NaN, no panic.
	k := []float64{3, 3, 3, 3, 3}
	v := []float64{1, 2, 3, 4, 6}
	if c := Pearson(k, v, 0.95); !nan(c.R) || !nan(c.P) || !nan(c.CILow) {
		t.Errorf("constant x: %+v", c)
	}
	if r, p := Spearman(v, k); !nan(r) || !nan(p) {
		t.Errorf("constant y: Spearman %v %v", r, p)
	}
	if r, p := KendallTauB(k, v); !nan(r) || !nan(p) {
		t.Errorf("constant x: Kendall %v %v", r, p)
	}
	// Perfect correlation: |r| = 1, T infinite, P = 0, CI collapses.
	if c := Pearson(v, v, 0.95); c.R != 1 || !math.IsInf(c.T, 1) || c.P != 0 || c.CILow != 1 {
		t.Errorf("y = x: %+v", c)
	}
	if r, _ := KendallTauB(v, []float64{6, 4, 3, 2, 1}); r != -1 {
		t.Errorf("reversed: τ-b = %v, want −1", r)
	}
	// Empty and single inputs.
	for _, n := range []int{0, 1} {
		x := make([]float64, n)
		if c := Pearson(x, x, 0.95); !nan(c.R) {
			t.Errorf("n=%d: r = %v", n, c.R)
		}
		if r, _ := KendallTauB(x, x); !nan(r) {
			t.Errorf("n=%d: τ = %v", n, r)
		}
		if r, _ := Spearman(x, x); !nan(r) {
			t.Errorf("n=%d: ρ = %v", n, r)
		}
	}
	if lo, hi := FisherCI(0.5, 3, 0.95); !nan(lo) || !nan(hi) {
		t.Errorf("FisherCI n=3: %v %v", lo, hi)
	}
	if lo, hi := FisherCI(0.5, 10, 1.5); !nan(lo) || !nan(hi) {
		t.Errorf("FisherCI conf 1.5: %v %v", lo, hi)
	}
	// Length mismatch is a programmer error: panic.
	a, b := []float64{1, 2, 3}, []float64{1, 2}
	for name, f := range map[string]func(){
		"Pearson":        func() { Pearson(a, b, 0.95) },
		"Spearman":       func() { Spearman(a, b) },
		"KendallTauB":    func() { KendallTauB(a, b) },
		"CentredMoments": func() { CentredMoments(a, b) },
		"Line":           func() { Line(a, b, 0.95) },
		"Polynomial":     func() { Polynomial(a, b, 2, 0.95) },
		"LeastSquares":   func() { LeastSquares([][]float64{a}, b, 0.95) },
		"Influence":      func() { Influence(a, b) },
	} {
		if !corePanics(f) {
			t.Errorf("%s: no panic on length mismatch", name)
		}
	}
}

// TestKendallExact checks the exact p-value of τ-b without ties against
// scipy 1.10.1 scipy.stats.kendalltau(x, y) (default method "auto", which
// is exact here), printed with repr, and against the full enumeration of
// all permutations of y for n ≤ 7 (p = share of the n! orderings with
// |S| at least the observed, the definition of the exact two-sided test).
func TestKendallExact(t *testing.T) {
	t.Parallel()
	seq := func(n, mul int) (x, y []float64) {
		x, y = make([]float64, n), make([]float64, n)
		for i := range x {
			x[i], y[i] = float64(i), float64((mul*i)%n)
		}
		return x, y
	}
	x33, y33 := seq(33, 7)
	x34, y34 := seq(34, 7)
	for _, tc := range []struct {
		name   string
		x, y   []float64
		tau, p float64
	}{
		{"n=5 τ=1", []float64{1, 2, 3, 4, 5}, []float64{1, 2, 3, 4, 5}, 1, 0.016666666666666666},
		{"n=5", []float64{1, 2, 3, 4, 5}, []float64{2, 1, 4, 3, 5}, 0.6, 0.23333333333333334},
		{"n=33 exact", x33, y33, 0.14772727272727273, 0.2348656206939674},
		{"n=34 normal", x34, y34, 0.251336898395722, 0.03659566165329499},
	} {
		tau, p := KendallTauB(tc.x, tc.y)
		if !coreClose(tau, tc.tau, 1e-15) || !coreClose(p, tc.p, 1e-13*tc.p) {
			t.Errorf("%s: τ-b %.17g p %.17g; scipy %.17g p %.17g", tc.name, tau, p, tc.tau, tc.p)
		}
	}
	// Enumeration: every permutation y of 0..n−1 against x = 0..n−1.
	for n := 2; n <= 7; n++ {
		var all [][]float64
		var perm func(a []float64, k int)
		perm = func(a []float64, k int) {
			if k == len(a) {
				all = append(all, append([]float64(nil), a...))
				return
			}
			for i := k; i < len(a); i++ {
				a[k], a[i] = a[i], a[k]
				perm(a, k+1)
				a[k], a[i] = a[i], a[k]
			}
		}
		x := make([]float64, n)
		for i := range x {
			x[i] = float64(i)
		}
		perm(append([]float64(nil), x...), 0)
		taus := make([]float64, len(all))
		for k, y := range all {
			taus[k], _ = KendallTauB(x, y)
		}
		for k, y := range all {
			ge := 0
			for _, u := range taus {
				if math.Abs(u) >= math.Abs(taus[k])-1e-12 {
					ge++
				}
			}
			want := float64(ge) / float64(len(all))
			if _, p := KendallTauB(x, y); !coreClose(p, want, 1e-13) {
				t.Fatalf("n=%d y=%v: p %.17g, enumeration %.17g", n, y, p, want)
			}
		}
	}
}

// TestWithoutRows: moments downdated by a few rows equal the moments of the
// rows kept, summed directly (CentredMoments, itself checked against NIST
// StRD), and Pearson from them equals Pearson on the kept rows; where the
// rows taken out hold most of the spread (Anscombe's set IV shape: one
// row alone gives x its spread) the downdate declines.
func TestWithoutRows(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	n := 10000
	x, y := make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = 1000 + rng.NormFloat64()
		y[i] = 5 + 2*x[i] + rng.NormFloat64()
	}
	drop := []int{7, 500, 9999}
	x[500], y[500] = 1004, 3000 // far off the line
	var dx, dy, kx, ky []float64
	for i := range x {
		if slices.Contains(drop, i) {
			dx, dy = append(dx, x[i]), append(dy, y[i])
		} else {
			kx, ky = append(kx, x[i]), append(ky, y[i])
		}
	}
	got, ok := WithoutRows(CentredMoments(x, y), dx, dy)
	want := CentredMoments(kx, ky)
	if ok {
		t.Errorf("a row holding most of Syy taken out: ok, want the downdate declined")
	}
	// Without the far-off row the downdate applies.
	x[500], y[500] = 1000.5, 2006
	dx[1], dy[1] = 1000.5, 2006
	kx, ky = kx[:0], ky[:0]
	for i := range x {
		if !slices.Contains(drop, i) {
			kx, ky = append(kx, x[i]), append(ky, y[i])
		}
	}
	want = CentredMoments(kx, ky)
	got, ok = WithoutRows(CentredMoments(x, y), dx, dy)
	if !ok || got.N != want.N {
		t.Fatalf("ok %v, n %d, want %d", ok, got.N, want.N)
	}
	for _, c := range []struct {
		name      string
		got, want float64
	}{{"mean x", got.MeanX, want.MeanX}, {"mean y", got.MeanY, want.MeanY}, {"Sxx", got.Sxx, want.Sxx}, {"Syy", got.Syy, want.Syy}, {"Sxy", got.Sxy, want.Sxy}} {
		if d := math.Abs(c.got-c.want) / math.Abs(c.want); d > 1e-11 {
			t.Errorf("%s: downdated %.17g, summed %.17g (relative %.1g)", c.name, c.got, c.want, d)
		}
	}
	pm, pk := PearsonMoments(got, 0.95), Pearson(kx, ky, 0.95)
	if d := math.Abs(pm.R - pk.R); d > 1e-12 || math.Abs(pm.CILow-pk.CILow) > 1e-12 || pm.DF != pk.DF {
		t.Errorf("PearsonMoments %+v, Pearson on the kept rows %+v", pm, pk)
	}
	if _, ok := WithoutRows(CentredMoments(x[:3], y[:3]), x[:2], y[:2]); ok {
		t.Error("one row left: ok, want declined")
	}
}

// TestPearsonWithMoments: PearsonWithMoments is Pearson and CentredMoments
// bit for bit, on data Pearson scales by a power of two first and on data
// it does not (an identity, for any data).
func TestPearsonWithMoments(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(15, 16))
	for _, scale := range []float64{1, 1e300, 1e-300} {
		x, y := make([]float64, 1000), make([]float64, 1000)
		for i := range x {
			x[i] = rng.NormFloat64()
			y[i] = (2 - 0.5*x[i] + rng.NormFloat64()) * scale
		}
		c, m := PearsonWithMoments(x, y, 0.95)
		wc, wm := Pearson(x, y, 0.95), CentredMoments(x, y)
		if fmt.Sprintf("%#v %#v", c, m) != fmt.Sprintf("%#v %#v", wc, wm) {
			t.Errorf("scale %g: PearsonWithMoments %+v %+v, want %+v %+v", scale, c, m, wc, wm)
		}
	}
}
