package analysis_test

import (
	"os"
	"reflect"
	"testing"

	"bivar/analysis"
	"bivar/analysis/findings"
	"bivar/analysis/manifest"
)

// TestThresholdsFromManifest: every cut point of report.Thresholds can be
// set from the manifest's [thresholds] table and reaches the analysis. The
// values are arbitrary, each different from its default; a field added to
// report.Thresholds without a manifest key fails here.
func TestThresholdsFromManifest(t *testing.T) {
	src, err := os.ReadFile("testdata/run.toml")
	if err != nil {
		t.Fatal(err)
	}
	table := `[thresholds]
strong = 0.8
moderate = 0.5
weak = 0.2
leverage_factor = 2
outlier_z = 3.5
cooks_d = 0.4
curve_share = 0.2
nonlinear_dcor = 0.2
reversal_min_group = 6
outlier_family_alpha = 0.01
drift_dw = 1.2
form_dw = 1.3
`
	m, err := manifest.Parse("thresholds.toml", append(append(src, '\n'), table...), "testdata")
	if err != nil {
		t.Fatalf("manifest.Parse: %v", err)
	}
	got, def := analysis.Thresholds(m.Thresholds), findings.DefaultThresholds()
	gv, dv := reflect.ValueOf(got), reflect.ValueOf(def)
	for i := range gv.NumField() {
		if gv.Field(i).Interface() == dv.Field(i).Interface() {
			t.Errorf("threshold %s = %v, the default: the manifest's value did not arrive", gv.Type().Field(i).Name, gv.Field(i))
		}
	}
	if got.OutlierFamilyAlpha != 0.01 || got.DriftDW != 1.2 || got.FormDW != 1.3 {
		t.Errorf("outlier_family_alpha, drift_dw, form_dw = %v, %v, %v; want 0.01, 1.2, 1.3", got.OutlierFamilyAlpha, got.DriftDW, got.FormDW)
	}
	// An empty table keeps every default.
	if th := analysis.Thresholds(manifest.Thresholds{}); th != def {
		t.Errorf("no overrides: %+v, want the defaults %+v", th, def)
	}
}
