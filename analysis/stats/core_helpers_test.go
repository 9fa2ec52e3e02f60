package stats

// Helpers shared by the tests of the core statistics (describe,
// correlation, lsq, influence). Names carry a "core" prefix so that they
// cannot collide with helpers of other test files in this package.

import (
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"
)

// coreRefDir returns the shared reference folder (…/shared/reference),
// found by walking up from the test's directory; it skips the test when the
// folder is absent.
func coreRefDir(t testing.TB) string {
	t.Helper()
	dir, err := os.Getwd()
	if err != nil {
		t.Fatal(err)
	}
	for {
		p := filepath.Join(dir, "shared", "reference")
		if fi, err := os.Stat(p); err == nil && fi.IsDir() {
			return p
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			t.Skip("reference data folder shared/reference not found above the test directory (expected ../../../shared/reference)")
		}
		dir = parent
	}
}

// coreAnscombe reads Anscombe (1973) from shared/reference/anscombe.csv
// (columns set, x, y) in place and returns the four sets by name.
func coreAnscombe(t testing.TB) map[string][2][]float64 {
	t.Helper()
	f, err := os.Open(filepath.Join(coreRefDir(t), "anscombe.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	sets := map[string][2][]float64{}
	for i, r := range recs[1:] {
		x, err1 := strconv.ParseFloat(r[1], 64)
		y, err2 := strconv.ParseFloat(r[2], 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("anscombe.csv line %d: %v %v", i+2, err1, err2)
		}
		s := sets[r[0]]
		s[0], s[1] = append(s[0], x), append(s[1], y)
		sets[r[0]] = s
	}
	if len(sets) != 4 {
		t.Fatalf("anscombe.csv: %d sets, want 4", len(sets))
	}
	return sets
}

// coreClose reports whether got is within tol of want, relatively when
// |want| > 1 and absolutely otherwise; NaN matches only NaN.
func coreClose(got, want, tol float64) bool {
	if math.IsNaN(want) || math.IsNaN(got) {
		return math.IsNaN(want) && math.IsNaN(got)
	}
	if math.IsInf(want, 0) {
		return got == want
	}
	return math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))
}

// corePanics reports whether f panics.
func corePanics(f func()) (panicked bool) {
	defer func() {
		if recover() != nil {
			panicked = true
		}
	}()
	f()
	return false
}

// coreWithout returns x without element i.
func coreWithout(x []float64, i int) []float64 {
	out := make([]float64, 0, len(x)-1)
	out = append(out, x[:i]...)
	return append(out, x[i+1:]...)
}
