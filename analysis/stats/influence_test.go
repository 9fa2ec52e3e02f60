package stats

import (
	"math"
	"math/rand/v2"
	"testing"
)

// Influence vectors from statsmodels 0.13.5 (numpy 1.24.2), computed by
// /work/shared/tools/refcheck.py --vectors --external both on Anscombe
// (1973) sets I, III, IV (shared/reference/anscombe.csv) and the ties case
// of correlation_test.go:
//
//	infl = sm.OLS(y, sm.add_constant(x)).fit().get_influence()   # OLSInfluence
//	infl.hat_matrix_diag, infl.resid_studentized_internal,
//	infl.resid_studentized_external (leave-one-out refits), infl.cooks_distance[0], infl.dffits[0]
//
// statsmodels gives NaN where the leverage is 1 (set IV, row 8), as we do.
var influenceRef = []struct {
	name                         string
	lev, stud, ext, cook, dffits []float64
}{
	{name: "I",
		lev:    []float64{0.09999999999999996, 0.09999999999999999, 0.2363636363636365, 0.09090909090909091, 0.12727272727272732, 0.31818181818181823, 0.17272727272727267, 0.3181818181818181, 0.17272727272727273, 0.12727272727272726, 0.2363636363636363},
		stud:   []float64{0.03324397470609492, -0.04331790643521657, -1.7779326621549092, 1.110288241411685, -0.14810074762715963, -0.04050923234041443, 1.101904576649282, -0.7251597745333582, 1.6348730192829908, -1.4548813082523548, 0.1660660109346923},
		ext:    []float64{0.03134464448486084, -0.040844772005131105, -2.0810989067192818, 1.126799931392412, -0.13980118204480108, -0.03819595287009283, 1.116958873902161, -0.7045807877830644, 1.8383304242776302, -1.5684604272985259, 0.15680896900073285},
		cook:   []float64{6.139788079219324e-05, 0.00010424672321834315, 0.48920927577433554, 0.06163699895085261, 0.0015993418763965155, 0.0003828995111222584, 0.12675648475149465, 0.12269989634029653, 0.27902959337588, 0.1543412223720269, 0.004268011426677349},
		dffits: []float64{0.010448214828286943, -0.013614924001710368, -1.1578165470085584, 0.3563254250521487, -0.05338745824705019, -0.02609280323458363, 0.5103795764131202, -0.4813203095369393, 0.840000760253912, -0.598965719386523, 0.08724045668478674},
	},
	{name: "III",
		lev:    []float64{0.09999999999999996, 0.09999999999999999, 0.2363636363636365, 0.09090909090909091, 0.12727272727272732, 0.31818181818181823, 0.17272727272727267, 0.3181818181818181, 0.17272727272727273, 0.12727272727272726, 0.2363636363636363},
		stud:   []float64{-0.4601773642241308, -0.1963330408589738, 2.999991715643557, -0.33085148844300155, -0.5969507585895458, -1.134971637262687, 0.07041630940088515, 0.3806986072418973, -0.7551765167780413, -0.06973870940273427, 0.2118809362725935},
		ext:    []float64{-0.43905544819545433, -0.18550224192511133, 1203.5394638423834, -0.31384418208743964, -0.5742948485077302, -1.1559818474065786, 0.06640742894032278, 0.3618514499519614, -0.7356770250778836, -0.06576805829312449, 0.20026336073707854},
		cook:   []float64{0.01176462258579268, 0.002141481274051748, 1.3928494502510682, 0.00547313537024748, 0.025983869346504592, 0.30057081072450714, 0.000517641076720783, 0.033817333563048085, 0.05953593328773237, 0.0003546293033761783, 0.006947808393151912},
		dffits: []float64{-0.1463518160651514, -0.06183408064170377, 669.5875442129986, -0.09924624457889274, -0.21931246787582256, -0.7896859384478823, 0.03034399586695539, 0.2471915994832561, -0.3361578811978749, -0.025115592119875928, 0.11141624844080997},
	},
	{name: "IV",
		lev:    []float64{0.09999999999999996, 0.09999999999999999, 0.09999999999999999, 0.09999999999999999, 0.09999999999999999, 0.09999999999999999, 0.09999999999999999, 1.0000000000000002, 0.09999999999999999, 0.09999999999999999, 0.09999999999999999},
		stud:   []float64{-0.3591280943559145, -1.0586174942890554, 0.6048024201860962, 1.568732934728107, 1.2531096689046173, 0.033268398289505806, -1.4936657796133255, math.NaN(), -1.2292246650044556, 0.7754095909014965, -0.09468697974704461},
		ext:    []float64{-0.34104165226567007, -1.0666929942989802, 0.5821663631170336, 1.7351450391902945, 1.300313176018672, 0.03136767550528296, -1.6238180681415881, math.NaN(), -1.270469224475467, 0.7567790383987091, -0.08931623925666182},
		cook:   []float64{0.007165166008650587, 0.0622594999563799, 0.02032144263683107, 0.13671794558336994, 0.08723799123901331, 6.148812915273293e-05, 0.12394652562154908, math.NaN(), 0.08394407094751756, 0.0334033352034459, 0.0004980902296454021},
		dffits: []float64{-0.11368055075522333, -0.3555643314329934, 0.19405545437234453, 0.5783816797300981, 0.43343772533955727, 0.010455891835094318, -0.5412726893805293, math.NaN(), -0.4234897414918223, 0.25225967946623634, -0.029772079752220605},
	},
	{name: "ties",
		lev:    []float64{0.2117768595041323, 0.14979338842975223, 0.14979338842975223, 0.10433884297520671, 0.10433884297520671, 0.10433884297520671, 0.07541322314049592, 0.06301652892561985, 0.06301652892561985, 0.06714876033057852, 0.08780991735537191, 0.08780991735537191, 0.125, 0.17871900826446285, 0.17871900826446285, 0.24896694214876047},
		stud:   []float64{0.32264860661436157, -1.95594601833235, 0.4498427310268801, -0.5980940120517406, 1.7458533712117563, 0.573879679580008, -0.45520172532167835, 0.8262354664931301, -0.319603977010238, -1.3358157802794848, 1.1061209640366663, -0.055186078466039616, -1.1048845140544077, 0.22505490992698512, 1.4489490268332965, -0.8964262029011163},
		ext:    []float64{0.31207441364362076, -2.2109392065568643, 0.4366464711990471, -0.5838450393077275, 1.9020976264655534, 0.5596258263012397, -0.44192593735480035, 0.8163320504320486, -0.3091078180152292, -1.3780371052253888, 1.1157538933341715, -0.05318442091411941, -1.114387458585934, 0.21726170242777776, 1.5144025313342167, -0.889729833492057},
		cook:   []float64{0.013984885509035885, 0.3370170716047241, 0.017826233283942724, 0.020835848427028226, 0.17753656480445051, 0.01918288728380631, 0.008450407030008827, 0.02295621158299798, 0.0034349221771589893, 0.06422272808684373, 0.058888904247972454, 0.00014658424507309737, 0.08719784209980319, 0.005510943559388748, 0.22843108040784924, 0.13319309826457984},
		dffits: []float64{0.1617606281629303, -0.9280275830395627, 0.18327956196527995, -0.1992731255651137, 0.6492081179711725, 0.19100682552040904, -0.1262116382994862, 0.21170354084550638, -0.08016250194050122, -0.36972065585530595, 0.3461764516318486, -0.016501124687207637, -0.4211988685125245, 0.10134974620970985, 0.706448999041082, -0.5122706439007356},
	},
}

func TestInfluenceReference(t *testing.T) {
	t.Parallel()
	for _, tc := range influenceRef {
		t.Run(tc.name, func(t *testing.T) {
			x, y := rankRefData(t, tc.name)
			in := Influence(x, y)
			for _, v := range []struct {
				what      string
				got, want []float64
			}{
				{"leverage", in.Leverage, tc.lev},
				{"studentized", in.Studentized, tc.stud},
				{"studentized_ext", in.StudentizedExt, tc.ext},
				{"cooks_d", in.CooksD, tc.cook},
				{"dffits", in.DFFITS, tc.dffits},
			} {
				for i := range v.want {
					// Both sides are closed forms in double precision
					// (measured agreement ≤ 3e-15) except statsmodels'
					// external residual, which refits without the row: for
					// set III row 3 (0-based 2) s₍ᵢ₎ is nearly 0 and the
					// refit carries 8e-12 relative error into t and DFFITS.
					tol := 1e-13
					if tc.name == "III" && i == 2 && (v.what == "studentized_ext" || v.what == "dffits") {
						tol = 1e-10
					}
					if !coreClose(v.got[i], v.want[i], tol) {
						t.Errorf("%s[%d] = %.15g, statsmodels %.15g", v.what, i, v.got[i], v.want[i])
					}
				}
			}
			for i := range x {
				if want := math.IsNaN(tc.stud[i]); in.SoleSupport[i] != want {
					t.Errorf("SoleSupport[%d] = %v, want %v", i, in.SoleSupport[i], want)
				}
			}
		})
	}
}

// TestInfluenceLeaveOneOut checks every O(n) downdated quantity against a
// refit without the row (common practice identities: Σh = p = 2, h ∈ [1/n, 1],
// leave-one-out slope = refit slope, external studentized residual from the
// refit's residual SD), on many seeded random inputs, some with ties in x.
func TestInfluenceLeaveOneOut(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(42, 2))
	for trial := 0; trial < 150; trial++ {
		n := 4 + rng.IntN(40)
		x, y := make([]float64, n), make([]float64, n)
		for i := range x {
			if trial%4 == 0 {
				x[i] = float64(rng.IntN(5)) // ties in x
			} else {
				x[i] = rng.NormFloat64()*5 + 1e3
			}
			y[i] = 0.7*x[i] + rng.NormFloat64()*math.Exp(rng.NormFloat64())
		}
		if i := rng.IntN(n); trial%5 == 1 {
			x[i] += 40 // one far point: leverage near 1
		}
		m := CentredMoments(x, y)
		if !(m.Sxx > 0) {
			continue
		}
		in := Influence(x, y)
		full, err := Line(x, y, 0.95)
		if err != nil {
			t.Fatal(err)
		}
		var sh float64
		for i := range x {
			h := in.Leverage[i]
			sh += h
			if h < 1/float64(n)-1e-12 || h > 1+1e-12 {
				t.Fatalf("h[%d] = %v outside [1/n, 1]", i, h)
			}
			if !coreClose(h, full.Leverage[i], 1e-12) || !coreClose(in.Residual[i], full.Residuals[i], 1e-9) {
				t.Fatalf("row %d: h %v e %v; LeastSquares h %v e %v", i, h, in.Residual[i], full.Leverage[i], full.Residuals[i])
			}
			if in.SoleSupport[i] {
				continue
			}
			xo, yo := coreWithout(x, i), coreWithout(y, i)
			lo, err := Line(xo, yo, 0.95)
			if err != nil {
				t.Fatalf("refit without row %d: %v", i, err)
			}
			scale := math.Max(1, math.Abs(lo.Slope.Estimate))
			if math.Abs(in.LooSlope[i]-lo.Slope.Estimate) > 1e-9*scale {
				t.Fatalf("trial %d row %d: LooSlope %.15g, refit %.15g", trial, i, in.LooSlope[i], lo.Slope.Estimate)
			}
			if !coreClose(in.LooIntercept[i], lo.Intercept.Estimate, 1e-9) {
				t.Fatalf("trial %d row %d: LooIntercept %.15g, refit %.15g", trial, i, in.LooIntercept[i], lo.Intercept.Estimate)
			}
			if r := Pearson(xo, yo, 0.95).R; !coreClose(in.LooR[i], r, 1e-9) {
				t.Fatalf("trial %d row %d: LooR %.15g, refit %.15g", trial, i, in.LooR[i], r)
			}
			// External studentized residual from the refit's residual SD.
			te := in.Residual[i] / (lo.ResidualSE * math.Sqrt(1-h))
			if !coreClose(in.StudentizedExt[i], te, 1e-7) {
				t.Fatalf("trial %d row %d: StudentizedExt %.15g, from refit %.15g", trial, i, in.StudentizedExt[i], te)
			}
			// Cook's D as the scaled change in all fitted values (Cook 1977).
			var d float64
			for k := range x {
				dk := (lo.Intercept.Estimate + lo.Slope.Estimate*x[k]) - full.Fitted[k]
				d += dk * dk
			}
			d /= 2 * full.ResidualSE * full.ResidualSE
			if !coreClose(in.CooksD[i], d, 1e-7) {
				t.Fatalf("trial %d row %d: CooksD %.15g, from refit %.15g", trial, i, in.CooksD[i], d)
			}
		}
		if !coreClose(sh, 2, 1e-12) {
			t.Fatalf("Σh = %.15g, want 2", sh)
		}
	}
}

// TestInfluenceSoleSupport: a row with leverage 1 (every other row shares
// one x) is reported, not crashed on; documented NaNs only where the
// quantity is undefined, finite values elsewhere.
func TestInfluenceSoleSupport(t *testing.T) {
	t.Parallel()
	x := []float64{2, 2, 2, 2, 9, 2}
	y := []float64{1, 3, 2, 4, 10, 2.5}
	in := Influence(x, y)
	for i := range x {
		sole := i == 4
		if in.SoleSupport[i] != sole {
			t.Fatalf("SoleSupport = %v", in.SoleSupport)
		}
		if sole {
			if in.Leverage[i] != 1 || in.Residual[i] != 0 || !math.IsNaN(in.CooksD[i]) ||
				!math.IsNaN(in.StudentizedExt[i]) || !math.IsNaN(in.LooSlope[i]) {
				t.Errorf("sole row: h %v e %v D %v t %v slope %v", in.Leverage[i], in.Residual[i], in.CooksD[i], in.StudentizedExt[i], in.LooSlope[i])
			}
			continue
		}
		for name, v := range map[string]float64{"h": in.Leverage[i], "r": in.Studentized[i], "t": in.StudentizedExt[i],
			"D": in.CooksD[i], "DFFITS": in.DFFITS[i], "LooR": in.LooR[i], "LooSlope": in.LooSlope[i], "LooIntercept": in.LooIntercept[i]} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Errorf("row %d: %s = %v, want finite", i, name, v)
			}
		}
	}
	// n = 2: both rows alone set the line.
	in = Influence([]float64{1, 2}, []float64{3, 5})
	if !in.SoleSupport[0] || !in.SoleSupport[1] || in.Leverage[0] != 1 {
		t.Errorf("n=2: %+v", in)
	}
	// Constant x: nothing is defined; nothing panics.
	in = Influence([]float64{1, 1, 1}, []float64{1, 2, 3})
	if !math.IsNaN(in.Leverage[0]) || in.SoleSupport[0] {
		t.Errorf("constant x: %+v", in)
	}
	// n = 3: the external residual needs n ≥ 4.
	in = Influence([]float64{1, 2, 4}, []float64{1, 3, 2})
	if !math.IsNaN(in.StudentizedExt[0]) || math.IsNaN(in.Studentized[0]) || math.IsNaN(in.LooSlope[0]) {
		t.Errorf("n=3: %+v", in)
	}
	// An exact line (up to rounding): no residual scatter to studentize, so
	// no row may look like an outlier; leverage and LOO fits stay defined.
	ex, ey := make([]float64, 30), make([]float64, 30)
	for i := range ex {
		ex[i] = 0.1 * float64(i)
		ey[i] = 1.3 + 0.7*ex[i]
	}
	in = Influence(ex, ey)
	for i := range ex {
		if !math.IsNaN(in.Studentized[i]) || !math.IsNaN(in.CooksD[i]) || math.IsNaN(in.Leverage[i]) ||
			!coreClose(in.LooSlope[i], 0.7, 1e-12) {
			t.Fatalf("exact line row %d: r %v D %v h %v slope %v", i, in.Studentized[i], in.CooksD[i], in.Leverage[i], in.LooSlope[i])
		}
	}
	if in := Influence(nil, nil); len(in.Leverage) != 0 {
		t.Errorf("empty: %+v", in)
	}
}

// TestLineInfluenceScreen: ScreenInto is At, field for field and bit for bit,
// but for DFFITS and the leave-one-out intercept (NaN), on rows with ties,
// a sole-support case and n = 3 (an identity, for any data).
func TestLineInfluenceScreen(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(5, 6))
	x, y := make([]float64, 500), make([]float64, 500)
	for i := range x {
		x[i] = math.Round(rng.NormFloat64()*100) / 100
		y[i] = 2 - 0.3*x[i] + rng.NormFloat64()
	}
	for _, c := range []struct{ x, y []float64 }{{x, y}, {[]float64{2, 2, 2, 2, 9, 2}, []float64{1, 3, 2, 4, 10, 2.5}},
		{[]float64{1, 2, 4}, []float64{1, 3, 2}}, {[]float64{1, 1, 1}, []float64{1, 2, 3}}} {
		li := NewLineInfluence(c.x, c.y)
		var s InfluenceRow // one row written over and over, as influence's pass does
		for i := range c.x {
			a := li.At(i)
			li.ScreenInto(i, &s)
			if !math.IsNaN(s.DFFITS) || !math.IsNaN(s.LooIntercept) {
				t.Fatalf("n=%d row %d: ScreenInto gives DFFITS %v, LooIntercept %v, want NaN", len(c.x), i, s.DFFITS, s.LooIntercept)
			}
			s.DFFITS, s.LooIntercept = a.DFFITS, a.LooIntercept
			same := func(u, v float64) bool {
				return math.Float64bits(u) == math.Float64bits(v) || math.IsNaN(u) && math.IsNaN(v)
			}
			if !same(a.Leverage, s.Leverage) || !same(a.Residual, s.Residual) || !same(a.Studentized, s.Studentized) ||
				!same(a.StudentizedExt, s.StudentizedExt) || !same(a.CooksD, s.CooksD) || !same(a.LooR, s.LooR) ||
				!same(a.LooSlope, s.LooSlope) || a.SoleSupport != s.SoleSupport {
				t.Fatalf("n=%d row %d: ScreenInto %+v, At %+v", len(c.x), i, s, a)
			}
		}
	}
}
