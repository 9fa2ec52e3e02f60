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
