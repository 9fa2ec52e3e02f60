package analysis_test

import (
	"math"
	"strconv"
	"testing"

	"bivar/analysis"
	"bivar/analysis/report"
	"bivar/internal/reference"
)

// TestAnalyzeScaled runs Anscombe (1973) set I (shared/reference/
// anscombe.csv; the unscaled study is checked against the published values
// in TestAnalyzeAnscombe) with x and y multiplied by 1e-300, 1e-200 and
// 1e300. Any finite double is data: the study must run, with the same r
// and slope (both variables carry the same factor) and the same verdicts
// and headline as at ordinary scale. r and the slope are compared to
// 1e-13 relative, since x·s rounds (an identity, not a reference value).
func TestAnalyzeScaled(t *testing.T) {
	t.Parallel()
	xy := reference.Anscombe(t)["I"]
	run := func(s float64) report.Study {
		x, y := make([]float64, len(xy[0])), make([]float64, len(xy[1]))
		for i := range x {
			x[i], y[i] = xy[0][i]*s, xy[1][i]*s
		}
		return analysis.Analyze(analysis.Input{ID: "scaled", X: report.Variable{Column: "x"}, Y: report.Variable{Column: "y"},
			XS: x, YS: y}, analysis.DefaultConfig())
	}
	base := run(1)
	if base.Error != nil || base.Findings == nil {
		t.Fatalf("unscaled study failed: %v", base.Error)
	}
	for _, s := range []float64{1e-300, 1e-200, 1e300} {
		name := strconv.FormatFloat(s, 'g', -1, 64)
		st := run(s)
		if st.Error != nil {
			t.Errorf("scaled by %s: study refused: %s", name, *st.Error)
			continue
		}
		for _, c := range []struct {
			what      string
			got, want report.Float
		}{
			{"r", st.Pearson.R, base.Pearson.R},
			{"p of r", st.Pearson.P, base.Pearson.P},
			{"slope", st.Line.Slope.Estimate, base.Line.Slope.Estimate},
			{"t of slope", st.Line.Slope.T, base.Line.Slope.T},
			{"R²", st.Line.R2, base.Line.R2},
		} {
			if !c.got.Valid() || math.Abs(float64(c.got-c.want)) > 1e-13*math.Abs(float64(c.want)) {
				t.Errorf("scaled by %s: %s = %v, unscaled %v", name, c.what, c.got, c.want)
			}
		}
		f, b := st.Findings, base.Findings
		if f == nil {
			t.Errorf("scaled by %s: no findings", name)
			continue
		}
		if f.Form != b.Form || f.Direction != b.Direction || f.Strength != b.Strength || f.CurveStrength != b.CurveStrength ||
			f.OutlierDriven != b.OutlierDriven || f.Headline != b.Headline {
			t.Errorf("scaled by %s: verdict %s/%s/%s %q, unscaled %s/%s/%s %q", name, f.Form, f.Direction, f.Strength, f.Headline,
				b.Form, b.Direction, b.Strength, b.Headline)
		}
		if len(st.Influence.Points) != len(base.Influence.Points) {
			t.Errorf("scaled by %s: %d flagged rows, unscaled %d", name, len(st.Influence.Points), len(base.Influence.Points))
		}
	}
}
