package analysis_test

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"testing"

	"bivar/analysis"
	"bivar/analysis/manifest"
)

// TestAgreesWithReferenceRun compares one study of a generated benchmark
// file (../shared/tools/bench/gen_data.py) with the reference run on the
// same file (../shared/tools/bench/reference.py: pandas, numpy, scipy
// 1.10.1, statsmodels 0.13.5; the versions are in its JSON). It runs only
// when both are given, since the files are large and generated, never
// committed:
//
//	/usr/bin/python3 ../shared/tools/bench/gen_data.py --sizes 1000000 --out /tmp/bench-data
//	/usr/bin/python3 ../shared/tools/bench/reference.py /tmp/bench-data/n1000000.csv /tmp/ref.json --lowess-delta-frac 0.01
//	BIVAR_REF_CSV=/tmp/bench-data/n1000000.csv BIVAR_REF_JSON=/tmp/ref.json go test -run ReferenceRun -v ./analysis/
//
// Exact statistics agree to 1e-9 relative (sums over 10⁶ rows in another
// order leave the last digits; Breusch–Pagan's n·R² of e² on x, a small
// number formed by cancellation, to 1e-7); the LOWESS curve, fitted here to a sample
// of 20 000 rows chosen by value, agrees to its stated error (see
// approx.go: 0.038 SD of y inside the 1st–99th percentiles of x).
func TestAgreesWithReferenceRun(t *testing.T) {
	csvPath, refPath := os.Getenv("BIVAR_REF_CSV"), os.Getenv("BIVAR_REF_JSON")
	if csvPath == "" || refPath == "" {
		t.Skip("set BIVAR_REF_CSV and BIVAR_REF_JSON to a generated benchmark file and its reference run (see the doc comment)")
	}
	raw, err := os.ReadFile(refPath)
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Descriptive struct {
			N    int
			X, Y struct{ Mean, SD, Min, Max float64 }
		}
		Pearson struct {
			R       float64
			Ci95Low float64 `json:"ci95_low"`
			Ci95Hi  float64 `json:"ci95_high"`
		}
		Spearman struct{ Rho float64 }
		Kendall  struct {
			TauB float64 `json:"tau_b"`
		}
		OLS struct {
			ResidualSE   float64 `json:"residual_se"`
			RSquared     float64 `json:"r_squared"`
			Coefficients map[string]struct {
				Estimate, SE float64
			}
		} `json:"ols"`
		Quadratic struct {
			RSquared float64 `json:"r_squared"`
			X2P      float64 `json:"x2_p_value"`
		}
		BreuschPagan struct {
			Koenker struct {
				LM float64 `json:"lm"`
			}
		} `json:"breusch_pagan"`
		DurbinWatson struct{ DW float64 } `json:"durbin_watson"`
		Influence    struct {
			MaxCooks float64 `json:"max_cooks_distance"`
			MaxExt   float64 `json:"max_abs_ext_studentized"`
		}
		Lowess struct {
			X []float64 `json:"x_at_quantiles"`
			Y []float64 `json:"fitted_at_quantiles"`
		}
	}
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	abs, _ := filepath.Abs(csvPath)
	dir := t.TempDir()
	if err := os.Symlink(abs, filepath.Join(dir, "data.csv")); err != nil {
		t.Fatal(err)
	}
	toml := "title = \"reference run (generated benchmark data)\"\n[[dataset]]\nid = \"b\"\nfile = \"data.csv\"\n" +
		"[[study]]\nid = \"s\"\ndataset = \"b\"\nx = \"x\"\ny = \"y\"\norder = \"t\"\n"
	if err := os.WriteFile(filepath.Join(dir, "bivar.toml"), []byte(toml), 0o644); err != nil {
		t.Fatal(err)
	}
	m, err := manifest.Load(filepath.Join(dir, "bivar.toml"))
	if err != nil {
		t.Fatal(err)
	}
	r, err := analysis.Run(m, analysis.Options{Version: "test"})
	if err != nil {
		t.Fatal(err)
	}
	s := r.Studies[0]
	if s.Error != nil {
		t.Fatal(*s.Error)
	}
	check := func(name string, got, want, rel float64) {
		t.Helper()
		if d := math.Abs(got-want) / math.Max(math.Abs(want), 1e-300); !(d <= rel) {
			t.Errorf("%s = %.15g, reference %.15g (relative difference %.2g, allowed %.0g)", name, got, want, d, rel)
		} else {
			t.Logf("%-28s %.15g  reference %.15g  rel %.1e", name, got, want, d)
		}
	}
	const exact = 1e-9
	if s.N != ref.Descriptive.N {
		t.Fatalf("n = %d, reference %d", s.N, ref.Descriptive.N)
	}
	check("mean x", float64(s.Describe.X.Mean), ref.Descriptive.X.Mean, exact)
	check("sd y", float64(s.Describe.Y.SD), ref.Descriptive.Y.SD, exact)
	check("Pearson r", float64(s.Pearson.R), ref.Pearson.R, exact)
	check("r 95% low", float64(s.Pearson.CILow), ref.Pearson.Ci95Low, exact)
	check("r 95% high", float64(s.Pearson.CIHigh), ref.Pearson.Ci95Hi, exact)
	check("Spearman rho", float64(s.Spearman.Rho), ref.Spearman.Rho, exact)
	check("Kendall tau-b", float64(s.Kendall.TauB), ref.Kendall.TauB, exact)
	check("slope", float64(s.Line.Slope.Estimate), ref.OLS.Coefficients["slope"].Estimate, exact)
	check("slope SE", float64(s.Line.Slope.SE), ref.OLS.Coefficients["slope"].SE, exact)
	check("intercept", float64(s.Line.Intercept.Estimate), ref.OLS.Coefficients["intercept"].Estimate, exact)
	check("residual SE", float64(s.Line.ResidualSE), ref.OLS.ResidualSE, exact)
	check("R²", float64(s.Line.R2), ref.OLS.RSquared, exact)
	check("quadratic R²", float64(s.Models[0].R2), ref.Quadratic.RSquared, exact)
	check("Breusch–Pagan (Koenker)", float64(s.Diagnostics.BreuschPagan.Stat), ref.BreuschPagan.Koenker.LM, 1e-7)
	check("Durbin–Watson (run order)", float64(s.Diagnostics.DurbinWatson), ref.DurbinWatson.DW, exact)
	check("max Cook's distance", float64(s.Influence.MaxCooksD), ref.Influence.MaxCooks, exact)
	maxT := 0.0
	for _, p := range s.Influence.Points {
		maxT = math.Max(maxT, math.Abs(float64(p.StudentizedExt)))
	}
	check("max |deleted t| (named rows)", maxT, ref.Influence.MaxExt, exact)

	// LOWESS: our curve (sampled) at the reference's quantiles of x, by
	// linear interpolation between the curve's points.
	curve := s.Plot.Lowess
	at := func(x float64) float64 {
		for i := 1; i < len(curve); i++ {
			if curve[i].X >= x {
				a, b := curve[i-1], curve[i]
				return a.Y + (b.Y-a.Y)*(x-a.X)/(b.X-a.X)
			}
		}
		return math.NaN()
	}
	sd := float64(s.Describe.Y.SD)
	for i, x := range ref.Lowess.X {
		d := math.Abs(at(x)-ref.Lowess.Y[i]) / sd
		if !(d <= 0.038) {
			t.Errorf("LOWESS at x = %g: %g, reference %g: %.3g SD of y, stated error 0.038", x, at(x), ref.Lowess.Y[i], d)
		} else {
			t.Logf("%-28s %.6g  reference %.6g  %.1e SD", fmt.Sprintf("LOWESS at x = %g", x), at(x), ref.Lowess.Y[i], d)
		}
	}
}
