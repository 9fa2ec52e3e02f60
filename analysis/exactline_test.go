package analysis_test

import (
	"math"
	"strconv"
	"strings"
	"testing"
)

// Twenty rows exactly on a line, y = a + s·x up to the rounding of
// double precision (a, s and x as written below, y = a + s·x computed in
// float64 and written with the shortest digits that read back): the
// line leaves nothing but rounding, about 10⁻¹⁵ of y, so no quadratic
// term can be told from it. The study must not be called curved, and
// the quadratic's share of the line's residual sum of squares
// (share_vs_line, the findings' curve share) must not be a number read
// from that rounding (stats.NewLineInfluence's own rule takes an RSS at
// or below (16ε)²·Σy² for an exact fit). Before ff35921 the second case
// was called curved (share 0.497 from 1 − RSS_quad/RSS_line); since, the
// first two are (0.298 and 0.220 from the x² term's t; found by an
// independent review). The share and the AIC against the line are NaN,
// and the form's reason says why.
func TestExactLineNotCurved(t *testing.T) {
	for _, c := range []struct{ a, s float64 }{{0.25, 0.35000000000000003}, {0.75, 1.6500000000000001}, {1.565, 1.415}} {
		var b strings.Builder
		b.WriteString("x,y\n")
		for i := 1; i <= 20; i++ {
			x := float64(i) * 0.37
			b.WriteString(strconv.FormatFloat(x, 'g', -1, 64) + "," + strconv.FormatFloat(c.a+c.s*x, 'g', -1, 64) + "\n")
		}
		s := studyCSV(t, b.String())
		share := float64(s.Findings.CurveShare)
		if s.Findings.Form == "curved" || !math.IsNaN(share) && share >= 0.1 {
			t.Errorf("y = %v + %v·x exactly: form %q, curve share %v (line RSS %v)", c.a, c.s, s.Findings.Form, share, s.Line.RSS)
		}
		if q := s.Models[0]; q.Name == "quadratic" && (q.ShareVsLine.Valid() || q.AICVsLine.Valid()) {
			t.Errorf("y = %v + %v·x exactly: the quadratic's share %v and AIC %v against the line, read from rounding", c.a, c.s, q.ShareVsLine, q.AICVsLine)
		}
		if !math.IsNaN(share) || !strings.Contains(s.Findings.FormWhy, "rounding") {
			t.Errorf("y = %v + %v·x exactly: curve share %v, form's reason %q; want NaN and the rounding named", c.a, c.s, share, s.Findings.FormWhy)
		}
	}
}

// Rows exactly on the line y = 3 − 0.7·x in decimal arithmetic, each y
// computed in float64 as 3 − 7·0.1·x (so it carries the rounding of
// 7·0.1 and of the product, a few units in the last place): what the
// least-squares line leaves is that rounding, and it is not noise drawn
// at random, so the residuals' order in x and in run order and their
// spread read patterns of the arithmetic. Before the line's exactness
// was carried to the findings (report.Fit.ExactToRounding), 200 such rows
// were said to have residuals that "swing together" in order of x
// (Durbin–Watson 0.363) and "the line misses some pattern" (found by a
// sweep of small tables). Now no check that reads the residuals runs,
// and one statement says why.
func TestExactLineNoResidualChecks(t *testing.T) {
	for _, n := range []int{64, 200} {
		var b strings.Builder
		b.WriteString("x,y,o\n")
		for i := 1; i <= n; i++ {
			// Run order: the rows in a fixed scrambled order (i·37 mod
			// n+1 is a permutation for n+1 prime or coprime to 37).
			b.WriteString(strconv.Itoa(i) + "," + strconv.FormatFloat(3-7*0.1*float64(i), 'g', -1, 64) + "," + strconv.Itoa(i*37%(n+1)) + "\n")
		}
		for _, keys := range []string{"", "order = \"o\"\n"} {
			s := studyCSVWith(t, b.String(), keys)
			if !s.Line.ExactToRounding {
				t.Errorf("n = %d %q: the line (RSS %v) is not marked exact to rounding", n, keys, s.Line.RSS)
				continue
			}
			f := s.Findings
			if f.Form != "linear" || f.SpreadChanges || f.Drift || f.Autocorrelated {
				t.Errorf("n = %d %q: form %q, spread changes %v, drift %v, autocorrelated %v; want linear and none read from rounding",
					n, keys, f.Form, f.SpreadChanges, f.Drift, f.Autocorrelated)
			}
			for _, c := range f.Checks {
				switch c.Name {
				case "curvature", "lack-of-fit", "changing-spread", "drift", "drift-dw", "drift-trend", "x-order-dw":
					t.Errorf("n = %d %q: check %s ran on residuals that are rounding (stat %v)", n, keys, c.Name, c.Stat)
				}
			}
			all := strings.Join(f.Statements, "\n")
			if strings.Contains(all, "swing together") || strings.Contains(all, "hang together") || strings.Contains(all, "Breusch") {
				t.Errorf("n = %d %q: a statement reads the rounding:\n%s", n, keys, all)
			}
			// Nor is the next run planned from that rounding (the slope's
			// interval planned from ±2.9e-17 to ±1.4e-17 with 790 rows).
			if pl := s.Plan; pl == nil || pl.SlopeHalfWidthNow.Valid() || pl.SlopeHalfWidth.Valid() || pl.NForSlope != 0 {
				t.Errorf("n = %d %q: the slope's plan read from rounding: %+v", n, keys, pl)
			}
			if !strings.Contains(all, "fits these rows to the rounding of the numbers") {
				t.Errorf("n = %d %q: no statement says the line is exact to rounding:\n%s", n, keys, all)
			}
		}
	}
}

// Eight settings of x, each run three times, and y the same in every
// repeat of a setting (y = s² mod 7 + 2s, off any line): no scatter
// among repeats is left for the lack-of-fit test's pure error (its
// definition: the repeats' sum of squares about their own means, e.g.
// Draper & Smith, Applied Regression Analysis, 3rd ed. 1998, §2.1, from
// memory), so the test is not made. The report said "none repeated"
// though x repeats; results.json now says why (no_pure_error) and the
// summary's table says "Not tested: every repeat alike".
func TestLackOfFitNoPureError(t *testing.T) {
	var b strings.Builder
	b.WriteString("x,y\n")
	for s := 1; s <= 8; s++ {
		for range 3 {
			b.WriteString(strconv.Itoa(s) + "," + strconv.Itoa(s*s%7+2*s) + "\n")
		}
	}
	st := studyCSV(t, b.String())
	lf := st.Diagnostics.LackOfFit
	if lf == nil || !lf.NoPureError || lf.DF1 != 6 || lf.DF2 != 16 || lf.P.Valid() {
		t.Fatalf("lack of fit %+v; want no pure error on 6 and 16 df, no p", lf)
	}
	for _, c := range st.Findings.Checks {
		if c.Name == "lack-of-fit" {
			t.Errorf("a lack-of-fit check ran without pure error: %+v", c)
		}
	}
	if !strings.Contains(strings.Join(st.Findings.Statements, "\n"), "lack of fit is not tested") {
		t.Errorf("no statement says why lack of fit was not tested:\n%s", strings.Join(st.Findings.Statements, "\n"))
	}
}
