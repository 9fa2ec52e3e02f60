// Package reference finds the published reference data that the tests read
// in place: the folder shared/reference beside the checkout (NIST StRD
// linear-regression files, Anscombe 1973; its SOURCES.md says where each
// came from). The data are never copied into the project.
//
// It is a test helper: every function takes the running test and skips it,
// naming the folder, where the data are absent (CI always has them).
package reference

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"strconv"
	"testing"
)

// Dir returns the shared/reference folder, found by walking up from the
// test's working directory (its package folder). It skips t when no
// ancestor holds one.
func Dir(t testing.TB) string {
	t.Helper()
	dir, err := os.Getwd()
	if err != nil {
		t.Fatal(err)
	}
	for {
		p := filepath.Join(dir, "shared", "reference")
		if st, err := os.Stat(p); err == nil && st.IsDir() {
			return p
		}
		up := filepath.Dir(dir)
		if up == dir {
			t.Skip("reference data folder shared/reference not found above the test's folder " +
				"(expected beside the checkout, as ../shared/reference); these checks need it")
		}
		dir = up
	}
}

// File returns the path of name inside the reference folder, skipping t
// when the folder is absent and failing it when the folder lacks the file.
func File(t testing.TB, name string) string {
	t.Helper()
	p := filepath.Join(Dir(t), filepath.FromSlash(name))
	if _, err := os.Stat(p); err != nil {
		t.Fatalf("reference file missing: %v", err)
	}
	return p
}

// ReadCSV reads the CSV file at path whole (RFC 4180, as encoding/csv
// reads it), failing t, with the path, when it cannot.
func ReadCSV(t testing.TB, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return recs
}

// Anscombe reads Anscombe (1973), "Graphs in Statistical Analysis", The
// American Statistician 27(1), from anscombe.csv (columns set, x, y) and
// returns the four sets by name ("I" to "IV"), each as x and y in file
// order. It fails t unless there are four sets of 11 points.
func Anscombe(t testing.TB) map[string][2][]float64 {
	t.Helper()
	recs := ReadCSV(t, File(t, "anscombe.csv"))
	sets := map[string][2][]float64{}
	for i, r := range recs[1:] {
		if len(r) < 3 {
			t.Fatalf("anscombe.csv line %d: %d fields, want set, x, y", i+2, len(r))
		}
		x, err1 := strconv.ParseFloat(r[1], 64)
		y, err2 := strconv.ParseFloat(r[2], 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("anscombe.csv line %d: %v %v", i+2, err1, err2)
		}
		s := sets[r[0]]
		s[0], s[1] = append(s[0], x), append(s[1], y)
		sets[r[0]] = s
	}
	for _, name := range []string{"I", "II", "III", "IV"} {
		if len(sets[name][0]) != 11 {
			t.Fatalf("anscombe.csv: set %s has %d points, want 11", name, len(sets[name][0]))
		}
	}
	if len(sets) != 4 {
		t.Fatalf("anscombe.csv: %d sets, want 4", len(sets))
	}
	return sets
}

// NumericColumns reads the reference CSV file name (a header line, then
// numbers only) and returns its columns by header name, in file order. It
// fails t on a cell that is not a number, naming the line and column.
func NumericColumns(t testing.TB, name string) map[string][]float64 {
	t.Helper()
	recs := ReadCSV(t, File(t, name))
	if len(recs) < 2 {
		t.Fatalf("%s: no data lines", name)
	}
	out := map[string][]float64{}
	for i, r := range recs[1:] {
		for j, col := range recs[0] {
			v, err := strconv.ParseFloat(r[j], 64)
			if err != nil {
				t.Fatalf("%s line %d, column %s: %v", name, i+2, col, err)
			}
			out[col] = append(out[col], v)
		}
	}
	return out
}
