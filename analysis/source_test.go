package analysis_test

import (
	"encoding/json"
	"fmt"
	"path/filepath"
	"strings"
	"testing"

	"bivar/analysis"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
)

// studyJSON is a study's results in JSON.
func studyJSON(t *testing.T, s report.Study) string {
	t.Helper()
	b, err := json.Marshal(s)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// runWith runs the studies a (melt_temp, hardness (2)) and b (hardness,
// hardness (2)) on a dataset "d" declared by decl, in dir.
func runWith(t *testing.T, dir, decl string) *report.Report {
	t.Helper()
	src := "title = \"sources\"\n[[dataset]]\nid = \"d\"\n" + decl + `
[[study]]
id = "a"
dataset = "d"
x = "melt_temp"
y = "hardness (2)"
[[study]]
id = "b"
dataset = "d"
x = "hardness"
y = "hardness (2)"
`
	m, err := manifest.Parse("sources.toml", []byte(src), dir)
	if err != nil {
		t.Fatal(err)
	}
	m.Path = "" // parsed from memory
	r, err := analysis.Run(m, analysis.Options{Version: "test"})
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range r.Studies {
		if s.Error != nil {
			t.Fatalf("study %s: %v", s.ID, *s.Error)
		}
	}
	return r
}

// The workbook written by openpyxl and the CSV file of the values it was
// given (analysis/dataset/testdata/make-workbooks.py) give the same
// studies, byte for byte in JSON; only the dataset's provenance differs.
func TestRunWorkbookSameAsCSV(t *testing.T) {
	dir, err := filepath.Abs(filepath.Join("dataset", "testdata"))
	if err != nil {
		t.Fatal(err)
	}
	fromCSV := runWith(t, dir, `file = "openpyxl-line7.csv"`)
	fromBook := runWith(t, dir, "file = \"openpyxl-line7.xlsx\"\nsheet = \"October\"\nheader_row = 2")
	for i := range fromCSV.Studies {
		if cj, bj := studyJSON(t, fromCSV.Studies[i]), studyJSON(t, fromBook.Studies[i]); cj != bj {
			t.Errorf("study %s differs:\n%s\n%s", fromCSV.Studies[i].ID, cj, bj)
		}
	}
	d := fromBook.Datasets[0]
	if d.Source == nil || d.Source.Kind != report.SourceWorkbook || d.Source.Sheet != "October" || d.Source.HeaderRow != 2 {
		t.Errorf("workbook source = %+v", d.Source)
	}
	var kinds []string
	for _, k := range d.MissingKinds {
		kinds = append(kinds, fmt.Sprintf("%s %s %d", k.Column, k.Kind, k.Count))
	}
	if got := strings.Join(kinds, ", "); got != "melt_temp #DIV/0! 1, hardness #N/A 2" {
		t.Errorf("missing kinds = %q, want melt_temp #DIV/0! 1, hardness #N/A 2", got)
	}
	if fromCSV.Datasets[0].Source != nil {
		t.Errorf("a CSV dataset has a source block: %+v", fromCSV.Datasets[0].Source)
	}
}
