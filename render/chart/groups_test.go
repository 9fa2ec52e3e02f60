package chart

import (
	"fmt"
	"strings"
	"testing"

	"bivar/analysis/report"
	"bivar/themes"
)

// TestManyGroupsDistinctLooks: with more group levels than the charts can
// draw apart (11, as the firms of a panel), the largest GroupLooks − 1 keep
// their own look, the rest form one grey series whose legend entry says how
// many levels it holds, and in every theme no two series look alike.
func TestManyGroupsDistinctLooks(t *testing.T) {
	p := &report.Plot{}
	var xs []float64
	for g := 0; g < 11; g++ {
		p.Levels = append(p.Levels, fmt.Sprintf("firm %c", 'A'+g))
		p.LevelCounts = append(p.LevelCounts, 5+g)
		for i := 0; i < 5+g; i++ { // level g has 5 + g rows: the largest are J, K, …
			p.Points = append(p.Points, report.PlotPoint{X: float64(i), Y: float64(g), Group: g})
			xs = append(xs, float64(i))
		}
	}
	p.N = len(p.Points)
	s := series(p, pickXY)
	if len(s) != GroupLooks || !s[len(s)-1].Other {
		t.Fatalf("%d series (last other: %v), want %d with the last the other levels", len(s), s[len(s)-1].Other, GroupLooks)
	}
	if want := "6 other levels, alike in grey (n = 45)"; s[len(s)-1].Name != want {
		t.Errorf("other series named %q, want %q", s[len(s)-1].Name, want)
	}
	for i, want := range []string{"firm G", "firm H", "firm I", "firm J", "firm K"} {
		if s[i].Level != want {
			t.Errorf("series %d is %q, want %q (the largest levels, by name)", i, s[i].Level, want)
		}
	}
	total := 0
	for _, x := range s {
		total += len(x.X)
	}
	if total != len(xs) {
		t.Errorf("%d points drawn, want all %d", total, len(xs))
	}
	f := &Figure{Points: s}
	for _, name := range themes.Names() {
		pal, err := themes.ChartPalette(name)
		if err != nil {
			t.Fatal(err)
		}
		d := NewSVG(pal).(*svgDrawer)
		seen := map[string]int{}
		for i := range s {
			shape, paint := d.look(f, i)
			k := fmt.Sprintf("%d|%s", shape%6, paint)
			if j, dup := seen[k]; dup {
				t.Errorf("theme %s: series %d and %d look alike (%s)", name, j, i, strings.TrimSpace(k))
			}
			seen[k] = i
		}
	}
}
