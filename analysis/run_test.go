package analysis_test

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"bivar/analysis"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// The manifest and data in testdata/ are invented (see testdata/README.md);
// these tests check structure and wiring, never a number from them.

func runTestManifest(t *testing.T, adjust string) *report.Report {
	t.Helper()
	m, err := manifest.Load("testdata/run.toml")
	if err != nil {
		t.Fatalf("manifest.Load: %v", err)
	}
	if adjust != "" {
		m.Adjust = adjust
	}
	r, err := analysis.Run(m, analysis.Options{Version: "test"})
	if err != nil {
		t.Fatalf("Run: %v", err)
	}
	return r
}

func study(t *testing.T, r *report.Report, id string) *report.Study {
	t.Helper()
	for i := range r.Studies {
		if r.Studies[i].ID == id {
			return &r.Studies[i]
		}
	}
	t.Fatalf("study %q not in the report", id)
	return nil
}

func TestRunStructure(t *testing.T) {
	t.Parallel()
	r := runTestManifest(t, "")
	wantIDs := []string{"length-vs-temp", "missing-column", "constant-column", "noise-vs-temp", "humidity-vs-temp"}
	if len(r.Studies) != len(wantIDs) {
		t.Fatalf("%d studies, want %d", len(r.Studies), len(wantIDs))
	}
	for i, id := range wantIDs {
		if r.Studies[i].ID != id {
			t.Errorf("study %d is %q, want %q (manifest order)", i, r.Studies[i].ID, id)
		}
	}
	if r.Schema != report.Schema || r.Caution != report.Caution || r.Manifest.Seed != 7 || r.Manifest.SHA256 == "" {
		t.Errorf("report header: schema %q, caution %q, seed %d, sha %q", r.Schema, r.Caution, r.Manifest.Seed, r.Manifest.SHA256)
	}
	if len(r.Datasets) != 1 || r.Datasets[0].Rows != 24 || r.Datasets[0].File != "invented.csv" || len(r.Datasets[0].SHA256) != 64 {
		t.Errorf("dataset provenance: %+v", r.Datasets)
	}

	miss := study(t, r, "missing-column")
	if miss.Error == nil || !strings.Contains(*miss.Error, `"lenght_mm"`) || !strings.Contains(*miss.Error, `"length_mm"`) {
		t.Errorf("missing column: error %v, want it to name \"lenght_mm\" and suggest \"length_mm\"", miss.Error)
	}
	if miss.Pearson != nil || miss.Findings != nil {
		t.Errorf("missing column: sections filled for a study that did not run")
	}
	cst := study(t, r, "constant-column")
	if cst.Error == nil || !strings.Contains(*cst.Error, `"flat"`) || !strings.Contains(*cst.Error, "constant") {
		t.Errorf("constant column: error %v, want it to name \"flat\" as constant", cst.Error)
	}
	if len(cst.Expectations) != 1 || cst.Expectations[0].OK {
		t.Errorf("constant column: expectations %+v, want one failed gate", cst.Expectations)
	}

	s := study(t, r, "length-vs-temp")
	if s.Error != nil {
		t.Fatalf("length-vs-temp failed: %s", *s.Error)
	}
	// One NA in length_mm (row 5) and one empty temp_c (row 9).
	if s.N != 22 || s.NMissing != 2 || len(s.Excluded) != 2 {
		t.Errorf("complete cases: n %d, n_missing %d, excluded %+v; want 22, 2, two columns", s.N, s.NMissing, s.Excluded)
	}
	if s.X.Label != "Barrel temperature" || s.X.Unit != "Cel" || s.Y.Label != "length_mm" || s.Y.Unit != "mm" {
		t.Errorf("variables: %+v %+v", s.X, s.Y)
	}
	// Units as people write them (units.Symbol), and the group and order
	// columns' labels: the dataset's label, else the column name.
	if s.X.Symbol != "°C" || s.Y.Symbol != "mm" {
		t.Errorf("symbols: x %q, y %q; want °C and mm", s.X.Symbol, s.Y.Symbol)
	}
	if s.GroupLabel != "Production line" || s.OrderLabel != "run_no" {
		t.Errorf("group label %q, order label %q; want \"Production line\" and \"run_no\"", s.GroupLabel, s.OrderLabel)
	}
	if s.Influence == nil || s.Sensitivity == nil || s.Diagnostics == nil || s.Diagnostics.OrderTrend == nil {
		t.Fatalf("sections missing")
	}
	if len(s.Groups) != 2 || s.Groups[0].Group != "L1" || s.Groups[1].Group != "L2" {
		t.Errorf("groups: %+v, want L1 then L2", s.Groups)
	}
	if len(s.Partial) != 1 || s.Partial[0].Covariate != "humidity" || s.Partial[0].Label != "Relative humidity" {
		t.Errorf("partial: %+v, want humidity labelled Relative humidity", s.Partial)
	}
	if lim := strings.Join(s.Findings.Limits, "\n"); !strings.Contains(lim, "Holding Relative humidity fixed") {
		t.Errorf("limits do not name the covariate by its label:\n%s", lim)
	}
	if len(s.Predictions) != 2 || !s.Predictions[0].InRange || s.Predictions[1].InRange {
		t.Errorf("predictions: %+v, want 200 in range and 260 outside", s.Predictions)
	}
	for _, p := range s.Influence.Points {
		if !strings.HasPrefix(p.Row, "U") {
			t.Errorf("row name %q, want the id_column value", p.Row)
			break
		}
	}
	if len(s.Plot.Points) != s.N || len(s.Plot.Levels) != 2 || math.IsNaN(s.Plot.Points[0].Order) {
		t.Errorf("plot data incomplete")
	}
}

// TestRunUnitInvariance: r does not change under a positive affine change
// of units (common practice, a fact of the trade), and the slope scales by
// the conversion factor; swapped x and y give the same r.
func TestRunUnitInvariance(t *testing.T) {
	t.Parallel()
	r := runTestManifest(t, "")
	s := study(t, r, "length-vs-temp")
	// recorded, [degF], K, [in_i], swapped
	if len(s.UnitInvariance) != 5 {
		t.Fatalf("unit rows: %+v, want 5", s.UnitInvariance)
	}
	r0 := float64(s.UnitInvariance[0].R)
	for _, u := range s.UnitInvariance {
		if u.Note != "" || math.Abs(float64(u.R)-r0) > 1e-12 {
			t.Errorf("unit row %+v: r differs from %v by more than 1e-12", u, r0)
		}
	}
	if u := s.UnitInvariance[1]; u.XSymbol != "°F" || u.YSymbol != "mm" {
		t.Errorf("unit row 1 symbols %q, %q; want °F and mm", u.XSymbol, u.YSymbol)
	}
	if !s.UnitInvariance[4].Swapped {
		t.Errorf("last row not the swapped one: %+v", s.UnitInvariance[4])
	}
	// Slope per °F is 5/9 of the slope per °C (exact definition of the
	// Fahrenheit degree), per K equal; length in inches is mm/25.4.
	b := float64(s.UnitInvariance[0].Slope)
	for i, want := range []float64{b * 5 / 9, b, b / 25.4} {
		if got := float64(s.UnitInvariance[i+1].Slope); math.Abs(got-want) > 1e-9*math.Abs(want) {
			t.Errorf("unit row %d slope %v, want %v", i+1, got, want)
		}
	}
}

// TestRunAdjust: p_adjusted equals stats.Holm / stats.BenjaminiHochberg on
// the raw p of the studies that ran, in manifest order.
func TestRunAdjust(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		method string
		adj    func([]float64) []float64
	}{
		{"holm", stats.Holm},
		{"bh", stats.BenjaminiHochberg},
		{"none", func(p []float64) []float64 { return p }},
	} {
		t.Run(c.method, func(t *testing.T) {
			r := runTestManifest(t, c.method)
			var raw, got []float64
			for _, s := range r.Studies {
				if s.Error != nil {
					continue
				}
				raw = append(raw, float64(s.Pearson.P))
				got = append(got, float64(s.Pearson.PAdjusted))
			}
			if len(raw) != 3 {
				t.Fatalf("%d studies ran, want 3", len(raw))
			}
			want := c.adj(raw)
			for i := range want {
				if got[i] != want[i] {
					t.Errorf("%s: study %d p_adjusted %v, want %v (raw %v)", c.method, i, got[i], want[i], raw)
				}
			}
			if r.Manifest.Adjust != c.method {
				t.Errorf("manifest adjust recorded %q", r.Manifest.Adjust)
			}
		})
	}
}

func TestRunExpectations(t *testing.T) {
	t.Parallel()
	r := runTestManifest(t, "")
	pass := study(t, r, "length-vs-temp")
	names := []string{"direction", "min_abs_r", "max_p", "min_n", "not_outlier_driven"}
	if len(pass.Expectations) != len(names) {
		t.Fatalf("length-vs-temp expectations %+v", pass.Expectations)
	}
	for i, e := range pass.Expectations {
		if e.Name != names[i] || e.Want == "" || e.Got == "" || e.Detail == "" {
			t.Errorf("expectation %d: %+v, want name %q with want, got and detail", i, e, names[i])
		}
	}
	// The wiring, not the data: each gate's outcome must agree with the
	// numbers it reads.
	for _, e := range pass.Expectations {
		var ok bool
		switch e.Name {
		case "direction":
			ok = pass.Findings.Direction == "positive"
		case "min_abs_r":
			ok = math.Abs(float64(pass.Pearson.R)) >= 0.5
		case "max_p":
			ok = float64(pass.Pearson.PAdjusted) <= 0.05
		case "min_n":
			ok = pass.N >= 10
		case "not_outlier_driven":
			ok = !pass.Findings.OutlierDriven
		}
		if e.OK != ok {
			t.Errorf("%s: ok %v, but the study's numbers say %v (%s)", e.Name, e.OK, ok, e.Detail)
		}
	}
	fail := study(t, r, "noise-vs-temp")
	if len(fail.Expectations) != 4 {
		t.Fatalf("noise-vs-temp expectations %+v", fail.Expectations)
	}
	rr, sl := float64(fail.Pearson.R), float64(fail.Line.Slope.Estimate)
	want := map[string]bool{
		"direction":    fail.Findings.Direction == "negative",
		"min_abs_r":    math.Abs(rr) >= 0.9,
		"r_within":     rr >= 0.5 && rr <= 1,
		"slope_within": sl >= 0 && sl <= 0.01,
	}
	for _, e := range fail.Expectations {
		if e.OK != want[e.Name] {
			t.Errorf("%s: ok %v, want %v (%s)", e.Name, e.OK, want[e.Name], e.Detail)
		}
	}
	if want["min_abs_r"] {
		t.Errorf("invented noise column should not reach |r| 0.9; the test data changed")
	}
}

// TestRunJSONRoundTrip: report.Write, report.Read, report.Write gives the
// same bytes, and two runs give the same bytes (determinism).
func TestRunJSONRoundTrip(t *testing.T) {
	t.Parallel()
	r := runTestManifest(t, "")
	var a, b, c bytes.Buffer
	if err := report.Write(&a, r); err != nil {
		t.Fatal(err)
	}
	back, err := report.Read(bytes.NewReader(a.Bytes()))
	if err != nil {
		t.Fatalf("report.Read: %v", err)
	}
	if err := report.Write(&b, back); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Errorf("results.json changed on a round trip:\n%s", firstDiff(a.String(), b.String()))
	}
	if err := report.Write(&c, runTestManifest(t, "")); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a.Bytes(), c.Bytes()) {
		t.Errorf("two runs of the same manifest differ:\n%s", firstDiff(a.String(), c.String()))
	}
}

func firstDiff(a, b string) string {
	la, lb := strings.Split(a, "\n"), strings.Split(b, "\n")
	for i := range min(len(la), len(lb)) {
		if la[i] != lb[i] {
			return "line " + la[i] + "\n  vs " + lb[i]
		}
	}
	return "lengths differ"
}

// TestRunEmptyListsAreLists: in results.json a list that is empty is
// written [] (DESIGN.md shows these keys as lists), never null; a study
// that failed keeps null for the sections it did not reach, but its
// excluded rows and expectations are lists.
func TestRunEmptyListsAreLists(t *testing.T) {
	t.Parallel()
	r := runTestManifest(t, "")
	var buf bytes.Buffer
	if err := report.Write(&buf, r); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Studies []map[string]json.RawMessage `json:"studies"`
	}
	if err := json.Unmarshal(buf.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	isList := func(raw json.RawMessage) bool { return len(raw) > 0 && raw[0] == '[' }
	for _, s := range doc.Studies {
		id := string(s["id"])
		for _, k := range []string{"excluded", "expectations"} {
			if !isList(s[k]) {
				t.Errorf("study %s: %s = %s, want a list", id, k, s[k])
			}
		}
		if string(s["error"]) != "null" {
			continue
		}
		for _, k := range []string{"models", "partial", "groups", "unit_invariance", "predictions"} {
			if !isList(s[k]) {
				t.Errorf("study %s: %s = %s, want a list", id, k, s[k])
			}
		}
		var inf struct {
			Points json.RawMessage `json:"points"`
		}
		var sens struct {
			WithoutEach json.RawMessage `json:"without_each"`
		}
		json.Unmarshal(s["influence"], &inf)
		json.Unmarshal(s["sensitivity"], &sens)
		if !isList(inf.Points) || !isList(sens.WithoutEach) {
			t.Errorf("study %s: influence.points %s, sensitivity.without_each %s, want lists", id, inf.Points, sens.WithoutEach)
		}
	}
}

// TestRunStudyDesign: a study's own design overrides the manifest's, and
// what the report says about cause follows each study's design.
func TestRunStudyDesign(t *testing.T) {
	m, err := manifest.Load("testdata/run.toml")
	if err != nil {
		t.Fatal(err)
	}
	m.Studies[0].Design = "randomized-experiment" // as `design = "randomized-experiment"` in its [[study]]
	r, err := analysis.Run(m, analysis.Options{Version: "test"})
	if err != nil {
		t.Fatal(err)
	}
	first, other := &r.Studies[0], &r.Studies[1]
	if first.Design != "randomized-experiment" || other.Design != "observational" {
		t.Fatalf("designs %q and %q, want the study's own and the manifest's", first.Design, other.Design)
	}
	has := func(s *report.Study, word string) bool {
		return s.Findings != nil && strings.Contains(strings.Join(s.Findings.Limits, " "), word)
	}
	if !has(first, "randomised") || has(first, "observational") {
		t.Errorf("randomized study's limits: %q", first.Findings.Limits)
	}
	if other.Findings != nil && !has(other, "observational") {
		t.Errorf("observational study's limits: %q", other.Findings.Limits)
	}
}
