package analysis_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"bivar/analysis"
	"bivar/analysis/manifest"
)

// runText writes csv and the manifest text to a temporary folder, loads
// the manifest and runs it. The data are invented, for the error paths only.
func runText(t *testing.T, csv, toml string) (string, error) {
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
		return "", err
	}
	var errs []string
	for _, s := range r.Studies {
		if s.Error != nil {
			errs = append(errs, s.ID+": "+*s.Error)
		}
	}
	return strings.Join(errs, "\n"), nil
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
		_, err := runText(t, "a,b\n1,2\n2,x7\n3,5\n4,4\n", `[[dataset]]
id = "d"
file = "d.csv"
`+studies)
		t.Logf("Run error: %v", err)
		if err == nil || !strings.Contains(err.Error(), "d.csv") || !strings.Contains(err.Error(), "x7") || !strings.Contains(err.Error(), `"b"`) {
			t.Errorf("Run error %v, want it to name the file, column \"b\" and the cell \"x7\"", err)
		}
	})
	t.Run("non-numeric-as-missing", func(t *testing.T) {
		msg, err := runText(t, "a,b\n1,2\n2,x7\n3,5\n4,4\n", `[[dataset]]
id = "d"
file = "d.csv"
non_numeric = "missing"
`+studies)
		if err != nil || msg != "" {
			t.Errorf("Run: err %v, study errors %q; want the study to run on 3 rows", err, msg)
		}
	})
	t.Run("missing-id-column", func(t *testing.T) {
		msg, err := runText(t, "a,b\n1,2\n2,3\n3,5\n4,4\n", `[[dataset]]
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
		msg, err := runText(t, "a;b\n1,5;2\n2,5;3,1\n3,5;5\n4,5;4,2\n", `[[dataset]]
id = "d"
file = "d.csv"
`+studies)
		if err != nil || msg != "" {
			t.Errorf("Run: err %v, study errors %q; want a run (header read with the detected delimiter)", err, msg)
		}
	})
}
