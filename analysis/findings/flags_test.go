package findings

import (
	"math"
	"slices"
	"testing"

	"bivar/analysis/report"
)

// Influence measures of Anscombe (1973) sets I, III and IV, computed with
// statsmodels 0.13.5 (OLS(y, add_constant(x)).fit().get_influence():
// hat_matrix_diag, resid_studentized_external, cooks_distance[0]), rounded
// as printed; they are the inputs of the flag rules, which are ours.
var anscombeInfluence = []struct {
	set               string
	lev, text, cooksD []float64
	sole              []bool
	flagged           map[int][]string
}{
	{set: "I",
		lev:     []float64{0.1, 0.1, 0.236, 0.091, 0.127, 0.318, 0.173, 0.318, 0.173, 0.127, 0.236},
		text:    []float64{0.03, -0.04, -2.08, 1.13, -0.14, -0.04, 1.12, -0.7, 1.84, -1.57, 0.16},
		cooksD:  []float64{0, 0, 0.489, 0.062, 0.002, 0, 0.127, 0.123, 0.279, 0.154, 0.004},
		flagged: map[int][]string{}},
	{set: "III",
		lev:     []float64{0.1, 0.1, 0.236, 0.091, 0.127, 0.318, 0.173, 0.318, 0.173, 0.127, 0.236},
		text:    []float64{-0.44, -0.19, 1203.54, -0.31, -0.57, -1.16, 0.07, 0.36, -0.74, -0.07, 0.2},
		cooksD:  []float64{0.012, 0.002, 1.393, 0.005, 0.026, 0.301, 0.001, 0.034, 0.06, 0, 0.007},
		flagged: map[int][]string{2: {FlagOutlier, FlagInfluential}}},
	{set: "IV",
		lev:     []float64{0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 1, 0.1, 0.1, 0.1},
		text:    []float64{-0.34, -1.07, 0.58, 1.74, 1.3, 0.03, -1.62, math.NaN(), -1.27, 0.76, -0.09},
		cooksD:  []float64{0.007, 0.062, 0.02, 0.137, 0.087, 0, 0.124, math.NaN(), 0.084, 0.033, 0},
		sole:    []bool{false, false, false, false, false, false, false, true, false, false, false},
		flagged: map[int][]string{7: {FlagHighLeverage, FlagSoleSupport}}},
}

func TestFlagPointsAnscombe(t *testing.T) {
	th := DefaultThresholds()
	for _, tc := range anscombeInfluence {
		got := FlagPoints(tc.lev, tc.text, tc.cooksD, tc.sole, th)
		if len(got) != len(tc.lev) {
			t.Fatalf("set %s: %d flag lists for %d rows", tc.set, len(got), len(tc.lev))
		}
		for i, f := range got {
			if want := tc.flagged[i]; !slices.Equal(f, want) {
				t.Errorf("set %s row %d: flags %v, want %v", tc.set, i+1, f, want)
			}
		}
	}
}

func TestFlagPointsRules(t *testing.T) {
	th := DefaultThresholds()
	n := 100
	lev := make([]float64, n)
	tx := make([]float64, n)
	d := make([]float64, n)
	for i := range lev {
		lev[i] = 0.05
	}
	lev[0] = 0.07                        // above 3·2/100 = 0.06
	tx[1] = 3.5                          // above 3 but under the Bonferroni bound for n = 100 (about 3.6)
	tx[2] = -4.2                         // beyond both
	d[3] = 0.72                          // above the F(2, 98) median, about 0.70
	d[4] = 0.68                          // below it
	tx[5], d[5] = math.NaN(), math.NaN() // undefined measures raise no flag
	got := FlagPoints(lev, tx, d, nil, th)
	want := map[int][]string{0: {FlagHighLeverage}, 2: {FlagOutlier}, 3: {FlagInfluential}}
	for i := range got {
		if !slices.Equal(got[i], want[i]) {
			t.Errorf("row %d: flags %v, want %v", i, got[i], want[i])
		}
	}
	// Bonferroni bound off: |t| 3.5 is an outlier.
	th.OutlierFamilyAlpha = 0
	if got := FlagPoints(lev, tx, d, nil, th); !slices.Equal(got[1], []string{FlagOutlier}) {
		t.Errorf("bound off, t = 3.5: flags %v, want [outlier]", got[1])
	}
	// Bonferroni bound: scipy 1.10.1 scipy.stats.t.ppf(1 - 0.05/200, 97) = 3.6020881788917705.
	if b := OutlierBound(100, DefaultThresholds()); math.Abs(b-3.6020881788917705) > 1e-9 {
		t.Errorf("OutlierBound(100) = %v, want 3.6020881788917705", b)
	}
	// F(2, 98) median: scipy 1.10.1 scipy.stats.f.ppf(0.5, 2, 98) = 0.6980729613990354.
	if b := CooksBound(100, report.Thresholds{CooksD: 0.5}); math.Abs(b-0.6980729613990354) > 1e-9 {
		t.Errorf("CooksBound(100) = %v, want 0.6980729613990354", b)
	}
	if got := FlagPoints(nil, nil, nil, nil, th); len(got) != 0 {
		t.Errorf("FlagPoints on no rows = %v", got)
	}
}

func TestSuspect(t *testing.T) {
	for _, tc := range []struct {
		flags []string
		want  bool
	}{{nil, false}, {[]string{FlagHighLeverage}, false}, {[]string{FlagOutlier}, true},
		{[]string{FlagHighLeverage, FlagInfluential}, true}, {[]string{FlagHighLeverage, FlagSoleSupport}, true}} {
		if got := Suspect(tc.flags); got != tc.want {
			t.Errorf("Suspect(%v) = %v, want %v", tc.flags, got, tc.want)
		}
	}
}
