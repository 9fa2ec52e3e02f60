package findings

// The cut points that are this project's own choices (CurveShare,
// NonlinearDcor, ReversalMinGroup, FormDW) must be labelled so wherever a
// sentence prints them: they are not common practice.

import (
	"math"
	"regexp"
	"strings"
	"testing"

	"bivar/analysis/report"
)

// sentencesWith returns every sentence of f (headline, reasons,
// statements, limits) that matches the pattern of a printed cut point.
func sentencesWith(f *report.Findings, pattern string) []string {
	re := regexp.MustCompile(pattern)
	var out []string
	for _, s := range append([]string{f.Headline, f.FormWhy, f.DirectionWhy, f.StrengthWhy}, append(f.Statements, f.Limits...)...) {
		if re.MatchString(s) {
			out = append(out, s)
		}
	}
	return out
}

func requireLabelled(t *testing.T, what string, f *report.Findings, sub string) {
	t.Helper()
	got := sentencesWith(f, sub)
	if len(got) == 0 {
		t.Errorf("%s: no sentence contains %q:\n%s", what, sub, all(f))
	}
	for _, s := range got {
		if !strings.Contains(s, OwnChoice) {
			t.Errorf("%s: the sentence prints a cut point of this project's choosing without saying so (%q):\n  %s", what, OwnChoice, s)
		}
	}
}

func TestOwnCutPointsAreLabelled(t *testing.T) {
	// A clear x² term removing less than the share CurveShare of the line's residual sum of squares.
	s := study(0.8, 1e-9)
	s.Diagnostics.QuadraticP = 0.01
	s.Models[0].Coefficients[2].P = 0.01
	s.Models[0].FP = 1e-9
	requireLabelled(t, "curve share", Assess(s, ctx), `the 0\.1 (that|required)`)

	// A significant distance correlation below NonlinearDcor, r not shown.
	s = study(0.05, 0.7)
	s.Diagnostics.DistanceCorr.DCor, s.Diagnostics.DistanceCorr.P = 0.1, 0.01
	requireLabelled(t, "distance correlation", Assess(s, ctx), `(cut point|cut point is|least) 0\.15\b`)

	// Residuals in order of x swinging together (the FormDW route).
	s = study(0.05, 0.7)
	s.Diagnostics.DurbinWatsonX, s.Diagnostics.DurbinWatsonXRows = 0.6, 50
	f := Assess(s, ctx)
	if f.Form != "nonlinear" {
		t.Fatalf("Durbin–Watson 0.6 in order of x with r 0.05: form %q, want nonlinear", f.Form)
	}
	requireLabelled(t, "Durbin–Watson in order of x", f, `Durbin–Watson 0\.6, (not )?below`)

	// Groups too small for the reversal check.
	s = study(0.8, 1e-9)
	s.Group = "lot"
	s.Groups = []report.GroupFit{{Group: "A", N: 3, Slope: 1, SlopeLow: 0, SlopeHigh: 2}, {Group: "B", N: 4, Slope: 1, SlopeLow: 0, SlopeHigh: 2}}
	requireLabelled(t, "smallest group", Assess(s, ctx), "rows or more")
}

// TestCooksBoundSmallN checks the Cook's D cut point against the closed
// form of the F(2, m) median, (m/2)(2^(2/m) − 1), from the F(2, m) CDF
// 1 − (1 + 2F/m)^(−m/2) (a textbook identity, e.g. Johnson, Kotz &
// Balakrishnan, Continuous Univariate Distributions vol. 2, ch. 27, from
// memory): 1.0 at n = 4, not "about 0.7 at any n".
func TestCooksBoundSmallN(t *testing.T) {
	th := DefaultThresholds()
	for _, n := range []int{4, 10, 20, 1000} {
		m := float64(n - 2)
		want := m / 2 * (math.Pow(2, 2/m) - 1)
		if got := CooksBound(n, th); math.Abs(got-want) > 1e-9*want {
			t.Errorf("CooksBound(%d) = %v, want the F(2, %d) median %v", n, got, n-2, want)
		}
	}
	if got := CooksBound(4, th); math.Abs(got-1) > 1e-9 {
		t.Errorf("CooksBound(4) = %v, want 1", got)
	}
}
