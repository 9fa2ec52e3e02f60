package render

import (
	"strings"
	"testing"

	"bivar/analysis/report"
)

// TestSpreadGlyph places a variable's figures on its own range, 4 to 96
// of the glyph's 100 units: with the range 0 to 10, the middle half 2.5
// to 7.5 is a bar from 27 of width 46, the middle value 5 a stroke at 50
// and an average of 6 a dot at 59.2 (plain proportion).
func TestSpreadGlyph(t *testing.T) {
	g := spreadGlyph(report.Describe{Min: 0, Max: 10, Q1: 2.5, Q3: 7.5, Median: 5, Mean: 6})
	for _, want := range []string{`<rect x="27.0" y="3" width="46.0"`, `<path d="M50.0 1V13"`, `<circle cx="59.2"`} {
		if !strings.Contains(g, want) {
			t.Errorf("glyph lacks %s:\n%s", want, g)
		}
	}
	if g := spreadGlyph(report.Describe{Min: 3, Max: 3, Q1: 3, Q3: 3, Median: 3, Mean: 3}); g != "" {
		t.Errorf("a constant variable has no range to draw, got %s", g)
	}
	if got := trimZeros("9.400") + " " + trimZeros("36.00") + " " + trimZeros("0.07700") + " " + trimZeros("1.5e-05") + " " + trimZeros("400"); got != "9.4 36 0.077 1.5e-05 400" {
		t.Errorf("trimZeros: %s", got)
	}
}
