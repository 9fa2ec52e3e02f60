package findings

import (
	"math"
	"strings"
	"testing"
)

// TestExactLineLimitAndForm: a line exact to the rounding of the numbers
// (report.Fit.ExactToRounding, set by analysis.compareFits) reads nothing
// from what it leaves. The x² term's p is that rounding's (0.025, as the
// 200 rows of y = 3 − 7·0.1·x gave it; a p below alpha), so neither the
// form's reason nor its statement may print it. The report renders the
// limits, not the statements, so a limit says which checks were left out
// (with a run order, drift too) and that the residual charts show
// rounding: before, the report's only word on it was "Not checked" in
// the summary's table, under charts of distances from the line that
// showed a bow.
func TestExactLineLimitAndForm(t *testing.T) {
	for _, order := range []string{"", "seq"} {
		s := study(-0.99, 1e-12)
		s.Line.ExactToRounding = true
		s.Order = order
		s.Diagnostics.QuadraticP = 0.025
		s.Models[0].Coefficients[2].P = 0.025
		f := Assess(s, ctx)
		if f.Form != "linear" {
			t.Fatalf("order %q: form %q, want linear", order, f.Form)
		}
		text := f.FormWhy + "\n" + strings.Join(f.Statements, "\n")
		if strings.Contains(text, "0.025") {
			t.Errorf("order %q: the x² term's p of rounding is printed:\n%s", order, text)
		}
		var lim string
		for _, l := range f.Limits {
			if strings.HasPrefix(l, "The line fits these rows to the rounding of the numbers") {
				lim = l
			}
		}
		if lim == "" || !strings.Contains(lim, "charts are that rounding") {
			t.Errorf("order %q: no limit says the line fits to rounding and what the charts show:\n%s", order, strings.Join(f.Limits, "\n"))
		}
		if got := strings.Contains(lim, "drift in run order"); got != (order != "") {
			t.Errorf("order %q: the limit names drift %v, want %v: %s", order, got, order != "", lim)
		}
	}
	// A line that is not exact gets no such limit.
	if f := Assess(study(-0.99, 1e-12), ctx); strings.Contains(strings.Join(f.Limits, "\n"), "rounding of the numbers") {
		t.Errorf("a line with scatter is said to fit to rounding:\n%s", strings.Join(f.Limits, "\n"))
	}
}

// TestLeaveOneOutAlike: where r without each row prints alike at both
// ends (the 200 rows of y = 3 − 7·0.1·x gave −1 without row 1 and
// −0.9999999999999999, the next float64 towards 0, without row 3, y
// computed in float64 left to right, 7·0.1 first; corrPair
// prints both −1.00000000), the rows at the ends are picked by
// rounding: the statement names none, where it named rows 1 and 3.
func TestLeaveOneOutAlike(t *testing.T) {
	s := study(-0.99, 1e-12)
	s.Sensitivity.LooRMin, s.Sensitivity.LooRMax = -1, fl(math.Nextafter(-1, 0))
	s.Sensitivity.LooRMinRow, s.Sensitivity.LooRMaxRow = "1", "3"
	all := strings.Join(Assess(s, ctx).Statements, "\n")
	if strings.Contains(all, "without row") || !strings.Contains(all, "r is -1.00000000 whichever row is left out") {
		t.Errorf("r alike at both ends: statements:\n%s", all)
	}
	s.Sensitivity.LooRMax = -0.98
	if all := strings.Join(Assess(s, ctx).Statements, "\n"); !strings.Contains(all, "(without row 1) to -0.98") {
		t.Errorf("r from -1 to -0.98: the rows at the ends are not named:\n%s", all)
	}
}
