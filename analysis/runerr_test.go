package analysis_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"bivar/analysis"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
)

// runText writes csv and the manifest text to a temporary folder, loads
// the manifest and runs it. The data are invented, for the error paths only.
func runText(t *testing.T, csv, toml string) (*report.Report, string, error) {
	t.Helper()
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "d.csv"), []byte(csv), 0o644); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "m.toml")
	if err := os.WriteFile(path, []byte(toml), 0o644); err != nil {
		t.Fatal(err)
	}
	m, err := manifest.Load(path)
	if err != nil {
		t.Fatalf("manifest.Load: %v", err)
	}
	r, err := analysis.Run(m, analysis.Options{})
	if err != nil {
		return nil, "", err
	}
	var errs []string
	for _, s := range r.Studies {
		if s.Error != nil {
			errs = append(errs, s.ID+": "+*s.Error)
		}
	}
	return r, strings.Join(errs, "\n"), nil
}

func TestRunBadInput(t *testing.T) {
	t.Parallel()
	const studies = `
[[study]]
id = "ab"
dataset = "d"
x = "a"
y = "b"
`
	t.Run("non-numeric-cell-stops-the-run", func(t *testing.T) {
		_, _, err := runText(t, "a,b\n1,2\n2,x7\n3,5\n4,4\n", `[[dataset]]
id = "d"
file = "d.csv"
`+studies)
		t.Logf("Run error: %v", err)
		if err == nil || !strings.Contains(err.Error(), "d.csv") || !strings.Contains(err.Error(), "x7") || !strings.Contains(err.Error(), `"b"`) {
			t.Errorf("Run error %v, want it to name the file, column \"b\" and the cell \"x7\"", err)
		}
	})
	t.Run("non-numeric-as-missing", func(t *testing.T) {
		r, msg, err := runText(t, "a,b\n1,2\n2,x7\n3,NA\n4,4\n5,6\n", `[[dataset]]
id = "d"
file = "d.csv"
non_numeric = "missing"
`+studies)
		if err != nil || msg != "" {
			t.Fatalf("Run: err %v, study errors %q; want the study to run on 3 rows", err, msg)
		}
		s := r.Studies[0]
		want := []report.Exclusion{{Column: "b", Rows: 1, Reason: "missing"}, {Column: "b", Rows: 1, Reason: "non-numeric"}}
		if s.N != 3 || len(s.Excluded) != 2 || s.Excluded[0] != want[0] || s.Excluded[1] != want[1] {
			t.Errorf("n %d, excluded %+v; want 3 and %+v", s.N, s.Excluded, want)
		}
		if d := r.Datasets[0]; len(d.NonNumeric) != 1 || d.NonNumeric[0].Count != 1 {
			t.Errorf("dataset non_numeric %+v, want b: 1", d.NonNumeric)
		}
	})
	t.Run("missing-id-column", func(t *testing.T) {
		_, msg, err := runText(t, "a,b\n1,2\n2,3\n3,5\n4,4\n", `[[dataset]]
id = "d"
file = "d.csv"
id_column = "serial"
`+studies)
		t.Logf("study error: %s", msg)
		if err != nil || !strings.Contains(msg, `the dataset's id_column "serial" is not in dataset "d"`) {
			t.Errorf("Run: err %v, study errors %q; want the study to name the absent id_column", err, msg)
		}
	})
	t.Run("semicolon-decimal-comma", func(t *testing.T) {
		_, msg, err := runText(t, "a;b\n1,5;2\n2,5;3,1\n3,5;5\n4,5;4,2\n", `[[dataset]]
id = "d"
file = "d.csv"
`+studies)
		if err != nil || msg != "" {
			t.Errorf("Run: err %v, study errors %q; want a run (header read with the detected delimiter)", err, msg)
		}
	})
}

// TestRunFindingsAfterAdjustment: the findings and the max_p gate read the
// adjusted p. Three studies of the same invented pair share one raw p near
// 0.02; Holm multiplies the smallest of three by 3, which crosses alpha =
// 0.05, so with adjust = "none" the direction is found and with "holm" it
// is not.
func TestRunFindingsAfterAdjustment(t *testing.T) {
	t.Parallel()
	const csv = "x,y\n1,2\n2,1\n3,4\n4,1\n5,5\n6,9\n7,2\n8,6\n9,5\n10,6\n11,5\n12,9\n"
	var studies string
	for _, id := range []string{"s1", "s2", "s3"} {
		studies += "\n[[study]]\nid = \"" + id + "\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n[study.expect]\nmax_p = 0.05\n"
	}
	for _, c := range []struct {
		adjust string
		found  bool
	}{{"none", true}, {"holm", false}} {
		r, msg, err := runText(t, csv, "adjust = \""+c.adjust+"\"\n[[dataset]]\nid = \"d\"\nfile = \"d.csv\"\n"+studies)
		if err != nil || msg != "" {
			t.Fatalf("Run: %v %s", err, msg)
		}
		for _, s := range r.Studies {
			p, pa := float64(s.Pearson.P), float64(s.Pearson.PAdjusted)
			if !(p < 0.05) || (c.adjust == "holm" && !(pa > 0.05)) {
				t.Fatalf("test data no longer straddle alpha: p %v, adjusted %v", p, pa)
			}
			if got := s.Findings.Direction != "none"; got != c.found {
				t.Errorf("adjust %s: %s direction %q (adjusted p %v), want found = %v", c.adjust, s.ID, s.Findings.Direction, pa, c.found)
			}
			if e := s.Expectations[0]; e.OK != c.found {
				t.Errorf("adjust %s: %s max_p ok = %v, want %v (%s)", c.adjust, s.ID, e.OK, c.found, e.Detail)
			}
		}
	}
}
