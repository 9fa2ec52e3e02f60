package analysis_test

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"bivar/analysis"
	"bivar/analysis/dataset"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
)

// TestAnalyzeShuffleInvariant: a study's numbers and verdicts are the same
// when its rows come in another order: to the last bit for everything
// computed from the canonical order (moments, summaries, correlations, the
// line and the models), and to 12 significant digits for the diagnostics,
// the findings' figures and the influence counts, whose sums over the rows
// in run order or data order may differ in the last bits; every verdict and
// every sentence is identical. 25 000 rows, so
// every seeded sample is drawn (distance-correlation test above 5000 rows,
// Theil–Sen above 2000, LOWESS above 20 000), with ties in x, in y and in
// the run order. Compared: every section computed from the pairs and the
// order column, and the findings. Not compared: the plot's point arrays and
// the influence figures, which are per row in data order by design, and
// the positions of rows.
func TestAnalyzeShuffleInvariant(t *testing.T) {
	t.Parallel()
	const n = 25000
	rng := rand.New(rand.NewPCG(7, 8))
	x, y, order := make([]float64, n), make([]float64, n), make([]float64, n)
	rows := make([]string, n)
	for i := range x {
		xi := 5 + 2*rng.NormFloat64()
		x[i] = math.Round(xi*100) / 100
		y[i] = math.Round((3+0.5*xi+0.05*(xi-5)*(xi-5)+rng.NormFloat64())*100) / 100
		order[i] = float64(i / 3)
		rows[i] = "r" + strconv.Itoa(i)
	}
	study := func(x, y, order []float64, rows []string) report.Study {
		return analysis.Analyze(analysis.Input{ID: "shuffle", X: report.Variable{Column: "x", Unit: "mm"},
			Y: report.Variable{Column: "y"}, XS: x, YS: y, Rows: dataset.StringsOf(rows), OrderColumn: "run", Order: order,
			PredictAt: []float64{4}, AlsoIn: manifest.AlsoIn{X: []string{"in"}}}, analysis.DefaultConfig())
	}
	a := study(x, y, order, rows)
	perm := rng.Perm(n)
	sx, sy, so, sr := make([]float64, n), make([]float64, n), make([]float64, n), make([]string, n)
	for i, j := range perm {
		sx[i], sy[i], so[i], sr[i] = x[j], y[j], order[j], rows[j]
	}
	b := study(sx, sy, so, sr)
	if a.Error != nil || b.Error != nil {
		t.Fatalf("errors: %v %v", a.Error, b.Error)
	}
	if a.Diagnostics.DistanceCorr.Sampled != 5000 || a.Diagnostics.Lowess.Sampled != 20000 {
		t.Fatalf("samples of %d and %d rows, want 5000 and 20000", a.Diagnostics.DistanceCorr.Sampled, a.Diagnostics.Lowess.Sampled)
	}
	for _, c := range []struct {
		name string
		a, b any
	}{
		{"moments", a.Moments, b.Moments}, {"describe", a.Describe, b.Describe}, {"pearson", a.Pearson, b.Pearson},
		{"spearman", a.Spearman, b.Spearman}, {"kendall", a.Kendall, b.Kendall}, {"line", a.Line, b.Line},
		{"models", a.Models, b.Models},
		{"predictions", a.Predictions, b.Predictions},
		{"lowess curve", a.Plot.Lowess, b.Plot.Lowess}, {"band", a.Plot.Band, b.Plot.Band},
	} {
		ja, _ := json.Marshal(c.a)
		jb, _ := json.Marshal(c.b)
		if string(ja) != string(jb) {
			t.Errorf("%s differs when the rows are shuffled:\n%s\n%s", c.name, ja, jb)
		}
	}
	named := func(s report.Study) []string {
		var out []string
		for _, p := range s.Influence.Points {
			out = append(out, p.Row+" "+strings.Join(p.Flags, "+"))
		}
		return out
	}
	for _, c := range []struct {
		name string
		a, b any
	}{
		{"diagnostics", a.Diagnostics, b.Diagnostics}, {"findings", a.Findings, b.Findings},
		{"influence counts", a.Influence.Counts, b.Influence.Counts}, {"named rows", named(a), named(b)},
		{"robust", a.Robust, b.Robust}, {"sensitivity", a.Sensitivity, b.Sensitivity},
		{"unit invariance", a.UnitInvariance, b.UnitInvariance},
	} {
		ja, jb := rounded(t, c.a), rounded(t, c.b)
		if ja != jb {
			t.Errorf("%s differs when the rows are shuffled:\n%s\n%s", c.name, ja, jb)
		}
	}
}

// rounded is v as JSON with every number rounded to 12 significant digits.
func rounded(t *testing.T, v any) string {
	t.Helper()
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	var tree any
	if err := json.Unmarshal(b, &tree); err != nil {
		t.Fatal(err)
	}
	var walk func(any) any
	walk = func(v any) any {
		switch w := v.(type) {
		case float64:
			f, _ := strconv.ParseFloat(strconv.FormatFloat(w, 'g', 12, 64), 64)
			return f
		case []any:
			for i := range w {
				w[i] = walk(w[i])
			}
		case map[string]any:
			for k := range w {
				w[k] = walk(w[k])
			}
		}
		return v
	}
	out, _ := json.Marshal(walk(tree))
	return string(out)
}
