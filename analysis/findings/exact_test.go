package findings

import (
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
