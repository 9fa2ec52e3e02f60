package compare

import (
	"slices"
	"strings"
	"testing"

	"bivar/analysis/report"
)

// The runs are invented; the check is that a changed selection of rows is
// named and an unchanged one is not.
func TestDiffNotesSelection(t *testing.T) {
	t.Parallel()
	x := []float64{1, 2, 3, 4, 5, 6}
	y := []float64{2, 4.1, 5.9, 8.2, 9.8, 12.1}
	f := verdicts("linear", "positive", "strong", false)
	mk := func(expr string, rows int, left ...string) report.Study {
		s := study("s", x, y, f)
		if expr != "" {
			s.Subset = &report.Subset{Expression: expr, Rows: rows}
		}
		for _, r := range left {
			s.LeftOut = append(s.LeftOut, report.LeftOutRow{Row: r, Reason: "bad", Level: "study"})
		}
		return s
	}
	notes := func(a, b report.Study) []string {
		res := Diff(rep("h", a), rep("h", b), Options{})
		return res.Studies[0].Notes
	}
	if n := notes(mk(`shift == "night"`, 4, "S-1"), mk(`shift == "night"`, 4, "S-1")); len(n) != 0 {
		t.Errorf("same selection: notes %q, want none", n)
	}
	n := notes(mk(`shift == "night"`, 4), mk(`shift == "day"`, 5))
	if !slices.ContainsFunc(n, func(s string) bool {
		return s == `the subset changed from "shift == \"night\"" to "shift == \"day\"" (rows left out by it: 4, then 5)`
	}) {
		t.Errorf("changed subset: notes %q", n)
	}
	n = notes(mk("", 0), mk(`temp > 1`, 2))
	if len(n) != 1 || !strings.Contains(n[0], `from every row to "temp > 1"`) {
		t.Errorf("new subset: notes %q", n)
	}
	n = notes(mk("", 0, "S-1"), mk("", 0, "S-2"))
	if len(n) != 1 || !strings.Contains(n[0], "newly left out or with a new reason: S-2") || !strings.Contains(n[0], "no longer left out, or with another reason: S-1") {
		t.Errorf("changed exclusions: notes %q", n)
	}
	if res := Diff(rep("h", mk("", 0)), rep("h", mk(`a == 1`, 1)), Options{}); len(res.Studies[0].Verdicts) != 0 {
		t.Errorf("a changed subset alone gave verdict changes %+v", res.Studies[0].Verdicts)
	}
}
