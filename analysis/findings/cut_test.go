package findings

import (
	"math"
	"strings"
	"testing"

	"bivar/analysis/report"
)

// TestAtCutPoint: a figure that lies on a cut point up to the last digits
// of double precision gets the verdict of the cut point, at or above it,
// whichever side its rounding fell (cutTol, a choice of this tool): |r| a
// few units in the last place below 0.7 is strong, and a quadratic whose
// share of the line's residual sum of squares is a few units below 0.1
// (the curve_share cut) is a curve. The sentences print the figure on
// the verdict's side ("0.70", "10%"), not "0.6999999999999993". A figure
// 10⁻⁹ below the cut stays below it.
func TestAtCutPoint(t *testing.T) {
	curveStudy := func(share float64) *report.Study {
		s := study(0.6, 0.001)
		q := &s.Models[0]
		q.YScale, q.ShareVsLine, q.FP = "y", fl(share), 0.001
		q.Coefficients[2] = report.Coef{Name: "x^2", Estimate: 0.01, T: 5, P: 0.0001}
		s.Diagnostics.QuadraticP = 0.0001
		return s
	}
	for _, c := range []struct {
		name     string
		s        *report.Study
		strength string
		form     string
	}{
		{"|r| 4 ulp below 0.7", study(math.Nextafter(math.Nextafter(math.Nextafter(math.Nextafter(0.7, 0), 0), 0), 0), 1e-6), "strong", "linear"},
		{"|r| 1e-9 below 0.7", study(0.7-1e-9, 1e-6), "moderate", "linear"},
		{"r 2 ulp above -0.4", study(math.Nextafter(math.Nextafter(-0.4, 0), 0), 1e-6), "moderate", "linear"},
		{"share 3 ulp below 0.1", curveStudy(0.1 - 3*0x1p-56), "", "curved"},
		{"share 1e-9 below 0.1", curveStudy(0.1 - 1e-9), "", "linear"},
	} {
		f := Assess(c.s, ctx)
		if c.strength != "" && f.Strength != c.strength || f.Form != c.form {
			t.Errorf("%s: strength %q, form %q; want %q, %q", c.name, f.Strength, f.Form, c.strength, c.form)
		}
		all := f.StrengthWhy + f.FormWhy + strings.Join(f.Statements, " ")
		at := !strings.Contains(c.name, "1e-9")
		if at && (strings.Contains(all, "0.69999") || strings.Contains(all, "9.9999") || strings.Contains(all, "0.39999")) ||
			!at && (strings.Contains(all, "0.10000000 of") || strings.Contains(all, "0.70000000,")) {
			t.Errorf("%s: a figure printed off the verdict's side:\n%s", c.name, all)
		}
	}
}
