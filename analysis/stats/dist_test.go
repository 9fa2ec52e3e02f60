package stats

import (
	"math"
	"testing"
)

// distRelErr is |got − want|/|want|.
func distRelErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// TestDistTailsReference checks the tails every test uses against
// 40-digit values from mpmath 1.2.1 (mp.dps = 40), printed to 17 digits:
//
//	TwoSidedT(t, ν) = mpmath.betainc(ν/2, 1/2, 0, ν/(ν+t²), regularized=True)
//	UpperF(f, d1, d2) = mpmath.betainc(d2/2, d1/2, 0, d2/(d2+d1·f), regularized=True)
//	UpperChi2(x, ν) = mpmath.gammainc(ν/2, x/2, inf, regularized=True)
//
// The tolerances are the accuracy measured and stated in dist.go: full
// double precision (a few 1e-14) for moderate degrees of freedom, less for
// ν ≥ 10⁴ where mathext.RegIncBeta's log-beta loses digits (scipy 1.10.1
// scipy.stats.f.sf(2, 5, 1e6) has the same 5e-11 error as ours).
func TestDistTailsReference(t *testing.T) {
	t.Parallel()
	tTol := func(df float64) float64 {
		switch {
		case df <= 100:
			return 2e-13
		case df <= 1e4:
			return 2e-12
		}
		return 5e-10
	}
	for _, c := range []struct{ t, df, want float64 }{
		{0.5, 1.0, 0.70483276469913345},
		{2.0, 1.0, 0.29516723530086655},
		{5.0, 1.0, 0.12566591637800237},
		{20.0, 1.0, 0.03180450251235275},
		{100.0, 1.0, 0.0063659855298165103},
		{0.5, 3.0, 0.65144796484815099},
		{2.0, 3.0, 0.13932596855884318},
		{5.0, 3.0, 0.015392438073302301},
		{20.0, 3.0, 0.00027320325024731172},
		{100.0, 3.0, 2.2045219231849111e-6},
		{0.5, 10.0, 0.62789360574297294},
		{2.0, 10.0, 0.073388034770740366},
		{5.0, 10.0, 0.00053733360275645262},
		{20.0, 10.0, 2.1460623172042518e-9},
		{100.0, 10.0, 2.4496895554198299e-16},
		{0.5, 100.0, 0.61817356583088657},
		{2.0, 100.0, 0.04821217873113368},
		{5.0, 100.0, 2.4501734135038004e-6},
		{20.0, 100.0, 9.9942678613369559e-37},
		{100.0, 100.0, 4.8629944445394793e-102},
		{0.5, 10000.0, 0.61708607932323341},
		{2.0, 10000.0, 0.045527260661435443},
		{5.0, 10000.0, 5.8303266136626473e-7},
		{20.0, 10000.0, 2.7646525865407733e-87},
		{0.5, 1000000.0, 0.61707518747237139},
		{2.0, 1000000.0, 0.045500533851319208},
		{5.0, 1000000.0, 5.7339978708907416e-7},
		{20.0, 1000000.0, 5.7330870473903718e-89},
	} {
		if got := TwoSidedT(c.t, c.df); distRelErr(got, c.want) > tTol(c.df) {
			t.Errorf("TwoSidedT(%g, %g) = %.17g, mpmath %.17g (rel. err. %.1e)", c.t, c.df, got, c.want, distRelErr(got, c.want))
		}
		if got := TwoSidedT(-c.t, c.df); distRelErr(got, c.want) > tTol(c.df) {
			t.Errorf("TwoSidedT(%g, %g) = %.17g, want the same as for +t", -c.t, c.df, got)
		}
	}
	for _, c := range []struct{ f, d1, d2, want float64 }{
		{3.0, 1.0, 10.0, 0.11393741215192041},
		{5.0, 2.0, 20.0, 0.017341529915832614},
		{3.05, 30.0, 28.0, 0.0019749141718617635},
		{60.0, 1.0, 3.0, 0.0044748782993540116},
		{2.0, 5.0, 1000000.0, 0.0752362378553057},
		{50.0, 2.0, 100000.0, 1.9775434481944136e-22},
		{40.0, 3.0, 12.0, 1.589553175596412e-6},
	} {
		tol := 1e-13
		if c.d2 >= 1e4 {
			tol = 1e-9
		}
		if got := UpperF(c.f, c.d1, c.d2); distRelErr(got, c.want) > tol {
			t.Errorf("UpperF(%g, %g, %g) = %.17g, mpmath %.17g (rel. err. %.1e)", c.f, c.d1, c.d2, got, c.want, distRelErr(got, c.want))
		}
	}
	for _, c := range []struct{ x, df, want float64 }{
		{0.1, 1.0, 0.75182963404584928},
		{3.84, 1.0, 0.050043521248705103},
		{50.0, 1.0, 1.5374597944280349e-12},
		{200.0, 1.0, 2.0884875837625448e-45},
		{7.0, 3.0, 0.071897772496465127},
	} {
		if got := UpperChi2(c.x, c.df); distRelErr(got, c.want) > 1e-13 {
			t.Errorf("UpperChi2(%g, %g) = %.17g, mpmath %.17g (rel. err. %.1e)", c.x, c.df, got, c.want, distRelErr(got, c.want))
		}
	}
	// Far tails keep relative precision (issue 2, "Known traps"): the normal
	// at z = 10 is 1.5239706048320934e-23 two-sided (mpmath 1.2.1,
	// erfc(10/√2)), where 1 − CDF would give 0.
	if got := TwoSidedNormal(10); distRelErr(got, 1.5239706048320934e-23) > 1e-13 {
		t.Errorf("TwoSidedNormal(10) = %.17g, mpmath 1.5239706048320934e-23", got)
	}
	for name, v := range map[string]float64{
		"TwoSidedT(NaN)": TwoSidedT(math.NaN(), 3), "TwoSidedT(df 0)": TwoSidedT(1, 0),
		"UpperF(d1 0)": UpperF(1, 0, 3), "UpperChi2(df −1)": UpperChi2(1, -1), "TQuantile(df 0)": TQuantile(0.9, 0),
	} {
		if !math.IsNaN(v) {
			t.Errorf("%s = %v, want NaN", name, v)
		}
	}
	if TwoSidedT(math.Inf(1), 3) != 0 || UpperF(0, 1, 3) != 1 || UpperF(math.Inf(1), 1, 3) != 0 || UpperChi2(0, 1) != 1 {
		t.Error("tail end points wrong")
	}
}

// TestDistQuantilesMpmath checks TQuantile against the root, found by
// mpmath 1.2.1 findroot at mp.dps = 40, of
// betainc(ν/2, 1/2, 0, ν/(ν+t²), regularized=True)/2 = 1 − p, printed to 17
// digits. scipy 1.10.1 scipy.stats.t.ppf is off by up to 2e-9 on this grid
// (df = 5, p = 0.9995: 6.868826639865215), so it is not the reference here.
func TestDistQuantilesMpmath(t *testing.T) {
	t.Parallel()
	for _, c := range []struct{ p, df, want float64 }{
		{0.975, 1.0, 12.706204736174693},
		{0.995, 1.0, 63.656741162871524},
		{0.9995, 1.0, 636.61924876878973},
		{0.975, 2.0, 4.3026527297494618},
		{0.995, 2.0, 9.9248432009182886},
		{0.9995, 2.0, 31.599054576445363},
		{0.975, 5.0, 2.5705818356363148},
		{0.995, 5.0, 4.0321429835552272},
		{0.9995, 5.0, 6.8688266258812751},
		{0.975, 10.0, 2.2281388519862742},
		{0.995, 10.0, 3.1692726726169507},
		{0.9995, 10.0, 4.5868938587027077},
		{0.975, 30.0, 2.0422724563012379},
		{0.995, 30.0, 2.749995653567225},
		{0.9995, 30.0, 3.6459586350420628},
		{0.975, 100.0, 1.9839715185235519},
		{0.995, 100.0, 2.6258905214380176},
		{0.9995, 100.0, 3.3904913111642636},
		{0.975, 1000.0, 1.9623390808264081},
		{0.995, 1000.0, 2.5807546980659508},
		{0.9995, 1000.0, 3.3002826484239442},
		{0.975, 1000000.0, 1.9599663568141067},
		{0.995, 1000000.0, 2.5758342201053338},
		{0.9995, 1000000.0, 3.2905364612487221},
	} {
		tol := 2e-14
		switch {
		case c.df >= 1e5:
			tol = 1e-10
		case c.df >= 1e3:
			tol = 2e-13
		}
		if got := TQuantile(c.p, c.df); distRelErr(got, c.want) > tol {
			t.Errorf("TQuantile(%g, %g) = %.17g, mpmath %.17g (rel. err. %.1e)", c.p, c.df, got, c.want, distRelErr(got, c.want))
		}
		if got := TQuantile(1-c.p, c.df); distRelErr(got, -c.want) > tol*10 {
			t.Errorf("TQuantile(%g, %g) = %.17g, want %.17g by symmetry", 1-c.p, c.df, got, -c.want)
		}
	}
}
