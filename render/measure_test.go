package render_test

import (
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"bivar/analysis"
	"bivar/analysis/manifest"
	"bivar/internal/reference"
)

// TestMeasurementSections renders a relationship study with replicate
// readings (the correction for measurement error and the planning
// statement) and an agreement study, on Bland & Altman (1986), Table 1,
// read in place: the sections and both agreement charts appear in both
// formats, and the renderer shows the findings' sentences as written.
func TestMeasurementSections(t *testing.T) {
	file := reference.File(t, "bland-altman-1986-pefr.csv")
	src := `[[dataset]]
id = "pefr"
file = ` + strconv.Quote(file) + `
units = { wright_1 = "L/min", wright_2 = "L/min", mini_1 = "L/min", mini_2 = "L/min" }

[[study]]
id = "rel"
dataset = "pefr"
x = "mini_1"
y = "wright_1"
x_replicates = ["mini_2"]
y_replicates = ["wright_2"]

[[study]]
id = "agr"
dataset = "pefr"
kind = "agreement"
x = "mini_1"
y = "wright_1"
agreement = { acceptable = 60 }
`
	m, err := manifest.Parse("pefr.toml", []byte(src), filepath.Dir(file))
	if err != nil {
		t.Fatal(err)
	}
	m.Path = ""
	r, err := analysis.Run(m, analysis.Options{Version: "test"})
	if err != nil {
		t.Fatal(err)
	}
	md, page := renderBoth(t, r)
	ec, ag := r.Studies[0].ErrorCorrection, r.Studies[1].Agreement
	for _, want := range []string{"### Corrected for measurement error", ec.Statements[0], ec.Assumptions[0],
		// the planning in the appendix: a table row for a study of a
		// relationship, a sentence for an agreement study
		"*Planning the next run", "| " + r.Studies[0].ID + " ", "Planning " + r.Studies[1].ID + ", an agreement study",
		// the agreement headline opens the study (minus signs as ASCII in Markdown)
		"### Agreement", strings.ReplaceAll(ag.Statements[0], "−", "-"), "agr-agreement.svg", "agr-methods.svg"} {
		if !strings.Contains(md.String(), want) {
			t.Errorf("Markdown lacks %q", want)
		}
	}
	html := page.String()
	for _, want := range []string{`class="measurement-error"`, "Planning the next run", `class="agreement"`, "Difference against mean", "Deming line"} {
		if !strings.Contains(html, want) {
			t.Errorf("HTML lacks %q", want)
		}
	}
}
