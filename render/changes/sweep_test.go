package changes

// Cases found by a sweep of realistic and hostile uses of `bivar diff`;
// the reference for what the diff must show is the two inputs.

import (
	"bytes"
	"strings"
	"testing"

	"bivar/analysis/compare"
	"bivar/analysis/report"
)

// editedGate is a diff of two runs with the same moments whose only
// difference is the slope gate's limits: [-0.2, -0.1] in the old run
// (met), [-0.3, -0.25] in the new (failed). No study's r or slope
// changed.
func editedGate() *compare.Result {
	mk := func(lo, hi report.Float, want string, ok bool) *report.Report {
		s := report.Study{ID: "shrink-vs-melt", Dataset: "d", N: 40,
			X: report.Variable{Column: "melt", Unit: "Cel", Symbol: "°C"}, Y: report.Variable{Column: "shrink", Unit: "%", Symbol: "%"},
			Moments:  &report.Moments{N: 40, MeanX: 50, MeanY: 10, Sxx: 1000, Syy: 50, Sxy: -180},
			Describe: &report.DescribePair{X: report.Describe{N: 40, Min: 40, Max: 60}},
			Findings: &report.Findings{Form: "linear", Direction: "negative", Strength: "strong"},
			Expectations: []report.Expectation{{Name: "slope_within", Title: "slope within its limits", Want: want,
				Got: "slope = -0.18 % per °C", OK: ok, Limits: &report.Limits{Low: lo, High: hi}}}}
		return &report.Report{Schema: report.Schema, Manifest: report.ManifestInfo{Alpha: 0.05, Adjust: "holm"},
			Datasets: []report.Dataset{{ID: "d", File: "a.csv", SHA256: "aa", Rows: 40}}, Studies: []report.Study{s}}
	}
	return compare.Diff(mk(-0.2, -0.1, "slope in [-0.2, -0.1] % per °C", true), mk(-0.3, -0.25, "slope in [-0.3, -0.25] % per °C", false), compare.Options{})
}

// TestEditedGateRendered: the gates table gives both runs' wants, and the
// slope gate's table names both runs' limits, against which the old slope
// lay inside (the gate table said only the new limits, and "inside the
// gate: no" for the old slope that met its gate).
func TestEditedGateRendered(t *testing.T) {
	res := editedGate()
	var md, html bytes.Buffer
	if err := Markdown(&md, res); err != nil {
		t.Fatal(err)
	}
	if err := HTML(&html, res); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{
		"| `shrink-vs-melt` | slope within its limits | old run: slope in [-0.2, -0.1] % per °C; new run: slope in [-0.3, -0.25] % per °C | met (slope = -0.18 % per °C) | **failed (slope = -0.18 % per °C)** |",
		"Slope gate: -0.3 to -0.25 % per °C in the new run, -0.2 to -0.1 % per °C in the old (each slope is read against its own run's gate).",
		"| old | -0.18 | yes |\n| new | -0.18 | no |",
	} {
		if !strings.Contains(md.String(), want) {
			t.Errorf("diff.md lacks %q:\n%s", want, md.String())
		}
	}
	for _, want := range []string{
		"<td>old run: slope in [-0.2, -0.1] % per °C; new run: slope in [-0.3, -0.25] % per °C</td>",
		"<caption>Slope gate: -0.3 to -0.25 % per °C in the new run, -0.2 to -0.1 % per °C in the old (each slope is read against its own run&#39;s gate).</caption>",
	} {
		if !strings.Contains(html.String(), want) {
			t.Errorf("diff.html lacks %q", want)
		}
	}
	// Nothing changed beyond chance: the sentence reads as English.
	if want := "No study's slope changed beyond chance"; !strings.Contains(md.String(), want) {
		t.Errorf("diff.md lacks %q (it read \"No study's the slope\")", want)
	}
}
