package analysis_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"bivar/analysis"
	"bivar/analysis/dataset"
	"bivar/analysis/report"
)

func in(x, y []float64) analysis.Input {
	return analysis.Input{ID: "t", X: report.Variable{Column: "a"}, Y: report.Variable{Column: "b"}, XS: x, YS: y}
}

// TestAnalyzeCannotRun: a study that cannot run says why, in words that
// name the column, and never panics.
func TestAnalyzeCannotRun(t *testing.T) {
	t.Parallel()
	nan := math.NaN()
	cases := []struct {
		name string
		in   analysis.Input
		want []string // substrings of the error
	}{
		{"two-rows", in([]float64{1, 2}, []float64{3, 4}), []string{"only 2 complete", `x "a"`, `y "b"`}},
		{"missing-leaves-two", in([]float64{1, 2, nan, 4}, []float64{3, nan, 5, 6}), []string{"only 2 complete"}},
		{"empty", in(nil, nil), []string{"the dataset has no data rows"}},
		{"constant-x", in([]float64{5, 5, 5, 5}, []float64{1, 2, 3, 4}), []string{`x column "a"`, "constant"}},
		{"constant-y", in([]float64{1, 2, 3, 4}, []float64{7, 7, 7, 7}), []string{`y column "b"`, "constant"}},
		{"length-mismatch", in([]float64{1, 2, 3}, []float64{1, 2}), []string{"y has 2 rows but x has 3"}},
		{"infinite-is-missing", in([]float64{1, math.Inf(1), 3}, []float64{1, 2, 3}), []string{"only 2 complete"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s := analysis.Analyze(c.in, analysis.DefaultConfig())
			if s.Error == nil {
				t.Fatalf("Analyze(%s): no error", c.name)
			}
			for _, w := range c.want {
				if !strings.Contains(*s.Error, w) {
					t.Errorf("Analyze(%s) error %q, want it to contain %q", c.name, *s.Error, w)
				}
			}
			if s.Pearson != nil || s.Findings != nil || s.Plot != nil {
				t.Errorf("Analyze(%s): sections filled for a study that did not run", c.name)
			}
		})
	}
}

// TestAnalyzeCompleteCases: rows missing in x, y, group, order or a
// covariate are dropped and counted per column; row names are the 1-based
// data row numbers when no id column is given.
func TestAnalyzeCompleteCases(t *testing.T) {
	t.Parallel()
	nan := math.NaN()
	x := []float64{1, 2, 3, nan, 5, 6, 7, 8}
	y := []float64{2, 4, 5, 8, nan, 11, 15, 16}
	s := analysis.Analyze(analysis.Input{ID: "cc", X: report.Variable{Column: "x"}, Y: report.Variable{Column: "y"},
		XS: x, YS: y,
		GroupColumn: "g", Groups: dataset.StringsOf([]string{"b", "a", "b", "a", "b", "", "b", "a"}),
		OrderColumn: "o", Order: []float64{8, 7, 6, 5, 4, 3, 2, 1},
		Covariates: map[string][]float64{"z": {1, 0, 1, 0, 1, 0, nan, 1}},
	}, analysis.DefaultConfig())
	if s.Error != nil {
		t.Fatal(*s.Error)
	}
	// Dropped: row 4 (x), row 5 (y), row 6 (group), row 7 (z).
	if s.N != 4 || s.NMissing != 4 {
		t.Errorf("n %d, n_missing %d, want 4, 4", s.N, s.NMissing)
	}
	want := []report.Exclusion{{Column: "x", Rows: 1, Reason: "missing"}, {Column: "y", Rows: 1, Reason: "missing"}, {Column: "g", Rows: 1, Reason: "missing"}, {Column: "z", Rows: 1, Reason: "missing"}}
	if len(s.Excluded) != len(want) {
		t.Fatalf("excluded %+v, want %+v", s.Excluded, want)
	}
	for i := range want {
		if s.Excluded[i] != want[i] {
			t.Errorf("excluded[%d] = %+v, want %+v", i, s.Excluded[i], want[i])
		}
	}
	// Plot points in run order: rows 8, 3, 2, 1 have order 1, 6, 7, 8.
	var xs []string
	for _, p := range s.Plot.Points {
		xs = append(xs, fmt.Sprint(p.X))
	}
	if got, want := strings.Join(xs, ","), fmt.Sprint(x[7], ",", x[2], ",", x[1], ",", x[0]); got != want {
		t.Errorf("plot x in run order %s, want %s", got, want)
	}
	if len(s.Groups) != 2 || s.Groups[0].Group != "a" || s.Groups[0].N != 2 || s.Groups[1].N != 2 {
		t.Errorf("groups %+v, want a (2 rows) then b (2 rows)", s.Groups)
	}
	if s.Groups[0].R.Valid() {
		t.Errorf("group with 2 rows got r = %v, want undefined", s.Groups[0].R)
	}
	if len(s.Partial) != 1 || s.Partial[0].Covariate != "z" || s.Partial[0].N != 4 {
		t.Errorf("partial %+v", s.Partial)
	}
}

// TestAnalyzePlotAndPredictions checks the plot data's shape and identities
// that hold for any data: fitted + residual = y, the band contains the
// fitted line at its own x, and the prediction interval is wider than the
// confidence interval.
func TestAnalyzePlotAndPredictions(t *testing.T) {
	t.Parallel()
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12}
	y := []float64{1.2, 1.9, 3.2, 3.8, 5.1, 6.3, 6.8, 8.1, 9.2, 9.8, 11.1, 30}
	inp := in(x, y)
	inp.PredictAt = []float64{6.5, 20}
	s := analysis.Analyze(inp, analysis.DefaultConfig())
	if s.Error != nil {
		t.Fatal(*s.Error)
	}
	p := s.Plot
	for i, q := range p.Points {
		if d := math.Abs(q.Fitted + q.Residual - q.Y); d > 1e-9 {
			t.Errorf("point %d: fitted + residual − y = %g", i, d)
		}
	}
	if len(p.Band) != 80 || p.Band[0].X != 1 || p.Band[79].X != 12 {
		t.Errorf("band: %d points from %v to %v, want 80 from 1 to 12", len(p.Band), p.Band[0].X, p.Band[len(p.Band)-1].X)
	}
	for _, b := range p.Band {
		if !(b.PredLow < b.ConfLow && b.ConfLow < b.Fit && b.Fit < b.ConfHigh && b.ConfHigh < b.PredHigh) {
			t.Errorf("band at %v not nested: %+v", b.X, b)
			break
		}
	}
	for i := 1; i < len(p.Lowess); i++ {
		if p.Lowess[i].X <= p.Lowess[i-1].X {
			t.Errorf("LOWESS curve not increasing in x at %d", i)
		}
	}
	if len(s.Predictions) != 2 || !s.Predictions[0].InRange || s.Predictions[1].InRange {
		t.Errorf("predictions %+v, want 6.5 inside and 20 outside the range", s.Predictions)
	}
	// The last row (12, 30) is far off the line of the others.
	if len(p.Marked) == 0 || p.Marked[0].Row != "12" || !p.Marked[0].Label {
		t.Errorf("marked %+v, want row 12 first, labelled", p.Marked)
	}
	if s.Influence.MaxCooksRow != "12" {
		t.Errorf("max Cook's D row %q, want \"12\"", s.Influence.MaxCooksRow)
	}
	// Leave-one-out without row 12 is the line of the first eleven.
	var found bool
	for _, w := range s.Sensitivity.WithoutEach {
		if w.Row == "12" {
			found = true
			ref := analysis.Analyze(in(x[:11], y[:11]), analysis.DefaultConfig())
			if math.Abs(float64(w.Slope-ref.Line.Slope.Estimate)) > 1e-9 || math.Abs(float64(w.R-ref.Pearson.R)) > 1e-9 {
				t.Errorf("without row 12: slope %v r %v, refit gives %v %v", w.Slope, w.R, ref.Line.Slope.Estimate, ref.Pearson.R)
			}
		}
	}
	if !found {
		t.Errorf("without_each has no row 12: %+v", s.Sensitivity.WithoutEach)
	}
	// Models: quadratic, log-x, log-y, log-log (all values positive).
	var names []string
	for _, m := range s.Models {
		names = append(names, m.Name)
	}
	if strings.Join(names, ",") != "quadratic,log-x,log-y,log-log" {
		t.Errorf("models %v", names)
	}
	neg := in([]float64{-1, 0, 1, 2, 3}, []float64{1, 2, 2, 3, 5})
	var negNames []string
	for _, m := range analysis.Analyze(neg, analysis.DefaultConfig()).Models {
		negNames = append(negNames, m.Name)
	}
	if strings.Join(negNames, ",") != "quadratic,log-y" {
		t.Errorf("models with x ≤ 0: %v, want quadratic and log-y only", negNames)
	}
}

// TestAnalyzeDeterministic: the same input and seed give the same numbers,
// including the permutation p; another seed may change only the random
// parts.
func TestAnalyzeDeterministic(t *testing.T) {
	t.Parallel()
	x := make([]float64, 300)
	y := make([]float64, 300)
	for i := range x {
		x[i] = float64(i%37) + 0.01*float64(i)
		y[i] = math.Sin(x[i]/5) + 0.001*float64(i%7)
	}
	cfg := analysis.DefaultConfig()
	a := analysis.Analyze(in(x, y), cfg)
	b := analysis.Analyze(in(x, y), cfg)
	if a.Diagnostics.DistanceCorr.P != b.Diagnostics.DistanceCorr.P || a.Pearson.R != b.Pearson.R {
		t.Errorf("two runs differ: %v %v", a.Diagnostics.DistanceCorr, b.Diagnostics.DistanceCorr)
	}
}

// TestAnalyzeUnitNotes: a unit that cannot be converted keeps its row,
// with undefined numbers and a note saying why; r of the recorded row and
// of the swapped row agree (r is symmetric in x and y, common practice).
func TestAnalyzeUnitNotes(t *testing.T) {
	t.Parallel()
	inp := in([]float64{1, 2, 3, 4, 5}, []float64{2, 4, 5, 4, 6})
	inp.Y.Unit = "mm"
	inp.AlsoIn.X = []string{"K"}      // x has no declared unit
	inp.AlsoIn.Y = []string{"[degF]"} // length to temperature
	s := analysis.Analyze(inp, analysis.DefaultConfig())
	if s.Error != nil {
		t.Fatal(*s.Error)
	}
	u := s.UnitInvariance
	if len(u) != 4 {
		t.Fatalf("unit rows %+v, want recorded, K, [degF], swapped", u)
	}
	if !strings.Contains(u[1].Note, "no unit is declared") || u[1].R.Valid() {
		t.Errorf("x to K without a declared unit: %+v", u[1])
	}
	if u[2].Note == "" || u[2].R.Valid() {
		t.Errorf("mm to [degF]: %+v, want a note and no numbers", u[2])
	}
	if !u[3].Swapped || math.Abs(float64(u[3].R-u[0].R)) > 1e-15 || u[3].XUnit != "mm" {
		t.Errorf("swapped row %+v vs recorded %+v", u[3], u[0])
	}
}

// TestLackOfFitNeedsRepeatedSettings: the lack-of-fit test is reported for
// a design with repeated settings, and not where x is continuous and only
// a few values repeat (its pure-error degrees of freedom would be a
// handful against dozens of levels).
func TestLackOfFitNeedsRepeatedSettings(t *testing.T) {
	t.Parallel()
	var xr, yr, xc, yc []float64
	for i := range 40 {
		level := float64(i % 5) // five settings, eight rows each
		xr = append(xr, level)
		yr = append(yr, level*level+0.1*float64(i%3))
		v := float64(i) * 1.37 // continuous: all distinct but two
		if i == 39 {
			v = 1.37
		}
		xc = append(xc, v)
		yc = append(yc, 0.5*v+float64(i%4))
	}
	if s := analysis.Analyze(in(xr, yr), analysis.DefaultConfig()); s.Diagnostics == nil || s.Diagnostics.LackOfFit == nil {
		t.Error("five settings repeated eight times: want the lack-of-fit test reported")
	} else if lf := s.Diagnostics.LackOfFit; lf.DF1 != 3 || lf.DF2 != 35 {
		t.Errorf("lack of fit df = (%d, %d), want (3, 35): 5 levels − 2, 40 rows − 5 levels", lf.DF1, lf.DF2)
	}
	if s := analysis.Analyze(in(xc, yc), analysis.DefaultConfig()); s.Diagnostics != nil && s.Diagnostics.LackOfFit != nil {
		t.Errorf("39 distinct x among 40 rows: want no lack-of-fit test, got %+v", *s.Diagnostics.LackOfFit)
	}
}
