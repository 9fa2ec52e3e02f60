package render_test

import (
	"math"
	"strings"
	"testing"

	"bivar/analysis/report"
	"bivar/render/internal/fixture"
)

// TestPushdownSection: a study whose rows stayed in the database shows, in
// both formats, what the database computed over every row, what comes
// from its sample, and what was not computed and why, as results.json
// holds them (report.Pushdown); a study of rows read into memory shows no
// such section.
func TestPushdownSection(t *testing.T) {
	r := fixture.Report(fixture.Options{N: 40})
	r.Studies[0].Pushdown = &report.Pushdown{Rows: 12_000_000, Limit: 5_000_000, Sample: 20000,
		Method: "the 20000 rows of smallest md5 of their values", Exact: []string{"Pearson r", "the line"},
		Sampled: []string{"Spearman's rho", "LOWESS"}, Omitted: []report.Omission{{Figure: "log models", Why: "no logarithm is taken in the database"}},
		Statements: []string{"SELECT 1", "SELECT 2"}}
	md, page := renderBoth(t, r)
	for name, out := range map[string]string{"markdown": md.String(), "html": page.String()} {
		for _, want := range []string{"Computed in the database", "12000000 rows", "max_rows = 5000000", "Pearson r; the line", "Spearman", "log models", "no logarithm is taken in the database", "The 2 SQL statements"} {
			if !strings.Contains(out, want) {
				t.Errorf("%s lacks %q", name, want)
			}
		}
		if strings.Count(out, "Computed in the database") != 1 {
			t.Errorf("%s: the section appears %d times, want once (one study pushed down)", name, strings.Count(out, "Computed in the database"))
		}
	}
}

// TestApproximationsOneMethod: where every sampled figure comes from the
// one sample (a study left in the database), its method, a paragraph, is
// said once above the table and not in each of its rows (the report of a
// 10⁷-row study repeated 500 characters six times); where the methods
// differ, each row keeps its own.
func TestApproximationsOneMethod(t *testing.T) {
	const method = "drawn by the database: the rows of smallest row hash"
	r := fixture.Report(fixture.Options{N: 40})
	s := &r.Studies[0]
	s.Approximations = []report.Approximation{{Figure: "LOWESS curve", Rows: 20000, Of: 40, Method: method, Error: "e1"},
		{Figure: "Theil–Sen line", Rows: 20000, Of: 40, Method: method, Error: "e2"},
		{Figure: "distance correlation", Rows: 20000, Of: 40, Method: method, Error: "e3"}}
	md, page := renderBoth(t, r)
	for name, out := range map[string]string{"markdown": md.String(), "html": page.String()} {
		if n := strings.Count(out, method); n != 1 {
			t.Errorf("%s: one sample's method written %d times, want once", name, n)
		}
		if strings.Count(out, "How chosen") != 1 || !strings.Contains(out, "How chosen, for every figure below") {
			t.Errorf("%s: want how the figures were chosen once, for all, and no column of it", name)
		}
	}
	s.Approximations[1].Method = "every pair of rows"
	md, page = renderBoth(t, r)
	for name, out := range map[string]string{"markdown": md.String(), "html": page.String()} {
		if strings.Count(out, method) != 2 || !strings.Contains(out, "every pair of rows") || !strings.Contains(out, "How chosen") || strings.Contains(out, "for every figure below") {
			t.Errorf("%s: two methods, want each in its row under How chosen", name)
		}
	}
}

// TestLevelsShown: where the findings chose the levels to show
// (Findings.LevelsShown), the table of the lines within levels holds
// those, in that order, under the findings' caption, in both formats.
func TestLevelsShown(t *testing.T) {
	r, s := levelsFixture(t)
	s.Findings.LevelsShown = []string{"lot C", "lot B"}
	s.Findings.LevelsShownWhy = "The line within 2 of the 3 levels of lot, chosen for this test"
	md, page := renderBoth(t, r)
	for name, out := range map[string]string{"markdown": md.String(), "html": page.String()} {
		c, b := strings.Index(out, "| lot C"), strings.Index(out, "| lot B")
		if name == "html" {
			c, b = strings.Index(out, "<td>lot C</td>"), strings.Index(out, "<td>lot B</td>")
		}
		if !strings.Contains(out, "chosen for this test") || c < 0 || b < c || strings.Contains(out, "<td>lot A") || strings.Contains(out, "| lot A") {
			t.Errorf("%s: want the caption, lot C then lot B, and no row of lot A", name)
		}
	}
}

// TestExactLineRendered: a line exact to rounding (report.Fit's
// ExactToRounding; Cook's distance then NaN for every row) shows its
// checks of the residuals as not checked in the summary's table, not the
// x² term's p read from rounding, and says that no row has a Cook's
// distance instead of "largest Cook's distance n/a, row )".
func TestExactLineRendered(t *testing.T) {
	r := fixture.Report(fixture.Options{N: 60})
	s := &r.Studies[0]
	if s.Line == nil || s.Influence == nil || s.Diagnostics == nil {
		t.Fatal("the fixture's first study lacks its line, influence or diagnostics")
	}
	s.Line.ExactToRounding = true
	s.Influence.Counts = report.FlagCounts{}
	s.Influence.Points = nil
	s.Influence.MaxCooksD, s.Influence.MaxCooksRow = report.NaN(), ""
	// Repeated settings of an exact line have no pure error, so no
	// lack-of-fit test (stats.LackOfFit needs it above 0): 200 rows of
	// y = 0.25 + 0.35·x on 40 settings of x said "none repeated".
	s.Diagnostics.LackOfFit = nil
	md, page := renderBoth(t, r)
	for _, l := range strings.Split(md.String(), "\n") {
		if c := strings.Split(l, "|"); len(c) > 3 && strings.Contains(l, "Not checked: the line fits to rounding") && !strings.Contains(c[3], "Not checked") {
			t.Errorf("markdown: the lack-of-fit cell of an exact line reads %q", strings.TrimSpace(c[3]))
		}
	}
	for name, out := range map[string]string{"markdown": md.String(), "html": page.String()} {
		// The parabola fitted to the rounding the line leaves: its
		// turning point and scatter were printed ("a bend (parabola)
		// turning far outside the data leaves 1.126e-14, squared scatter
		// n/a, AIC n/a" on 200 rows of y = 3 − 7·0.1·x).
		if strings.Contains(out, "a bend (parabola)") || strings.Contains(out, "AIC n/a") || !strings.Contains(out, "so no other shape is compared with it") {
			t.Errorf("%s: the other shapes of an exact line are compared with it, or the parabola of its rounding is described", name)
		}
		if strings.Count(out, "Not checked: the line fits to rounding") < 2 {
			t.Errorf("%s: the bend and spread checks are not marked as not checked", name)
		}
		if !strings.Contains(out, "distance is undefined for every row") || strings.Contains(out, "row )") {
			t.Errorf("%s: the largest Cook's distance of an exact line is not said to be undefined", name)
		}
	}
}

// TestLevelsShownNone: where the findings chose no level to show (none
// has a line of its own: LevelsShown empty, LevelsShownWhy set), the
// report says the findings' sentence in place of the table of the lines
// within levels; a table of n/a rows (30 of them for 30 lots with x
// constant within each) said nothing more.
func TestLevelsShownNone(t *testing.T) {
	r, s := levelsFixture(t)
	for i := range s.Groups {
		s.Groups[i].Slope, s.Groups[i].SlopeLow, s.Groups[i].SlopeHigh = report.NaN(), report.NaN(), report.NaN()
	}
	s.Findings.LevelsShown = []string{}
	s.Findings.LevelsShownWhy = "None of the 3 levels of lot has a line of its own, said for this test"
	md, page := renderBoth(t, r)
	for name, out := range map[string]string{"markdown": md.String(), "html": page.String()} {
		if !strings.Contains(out, "said for this test.") || strings.Contains(out, "<td>lot A") || strings.Contains(out, "| lot A") {
			t.Errorf("%s: want the findings' sentence and no row of the levels", name)
		}
	}
}

// TestLeaveOneOutAlikeRendered: where r and the slope without each row
// print alike at both ends (a line exact to rounding: the 200 rows of
// y = 3 − 7·0.1·x, computed in float64 left to right, gave r −1 without
// row 1 and −0.9999999999999999 without
// row 3, the slope −0.7 at both ends), the rows at the ends are picked by
// rounding: the sentence names none and gives each figure once, where it
// said "r -1.000000000 (without 1) to -1.000000000 (without 3); slope
// -0.7000 to -0.7000".
func TestLeaveOneOutAlikeRendered(t *testing.T) {
	r := fixture.Report(fixture.Options{N: 60})
	s := &r.Studies[0]
	if s.Sensitivity == nil || s.Agreement != nil {
		t.Fatal("the fixture's first study lacks its sensitivity or is an agreement study")
	}
	se := s.Sensitivity
	se.LooRMin, se.LooRMax, se.LooRMinRow, se.LooRMaxRow = -1, report.Float(math.Nextafter(-1, 0)), "1", "3"
	se.LooSlopeMin, se.LooSlopeMax = -0.7, -0.7
	md, page := renderBoth(t, r)
	for name, out := range map[string]string{"markdown": md.String(), "html": page.String()} {
		i := strings.Index(out, "Leaving out any one row:")
		if i < 0 {
			t.Fatalf("%s: no sentence on leaving out one row", name)
		}
		line := out[i:min(len(out), i+200)]
		if strings.Contains(line, "(without") || !strings.Contains(line, "whichever row; slope") || strings.Contains(line, " to ") {
			t.Errorf("%s: %q; want each figure once and no row named", name, line)
		}
	}
}

// TestLackOfFitNoPureErrorRendered: where every repeat of a setting gave
// the same y (report.LackOfFit.NoPureError), the summary's lack-of-fit
// column says the test was not made and why, not "none repeated".
func TestLackOfFitNoPureErrorRendered(t *testing.T) {
	r := fixture.Report(fixture.Options{N: 60})
	s := &r.Studies[0]
	s.Diagnostics.LackOfFit = &report.LackOfFit{F: report.NaN(), DF1: 6, DF2: 16, P: report.NaN(), NoPureError: true}
	var kept []report.Check
	for _, c := range s.Findings.Checks {
		if c.Name != "lack-of-fit" {
			kept = append(kept, c)
		}
	}
	s.Findings.Checks = kept
	md, page := renderBoth(t, r)
	for name, out := range map[string]string{"markdown": md.String(), "html": page.String()} {
		if !strings.Contains(out, "Not tested: every repeat alike") {
			t.Errorf("%s: the lack-of-fit column does not say the repeats were alike", name)
		}
	}
}

// levelsFixture is the fixture's report and its first study, which has
// three levels of lot and findings.
func levelsFixture(t *testing.T) (*report.Report, *report.Study) {
	t.Helper()
	r := fixture.Report(fixture.Options{N: 60})
	s := &r.Studies[0]
	if len(s.Groups) != 3 || s.Findings == nil {
		t.Fatal("the fixture's first study no longer has three levels and findings")
	}
	return r, s
}
