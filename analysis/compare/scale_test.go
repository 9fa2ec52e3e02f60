package compare

import (
	"slices"
	"testing"
)

// TestDiffNotesScale: a study whose scale changed between the runs is
// named, and neither r nor the slope is tested across the scales (invented
// runs; an older results.json, without scales, reads as linear).
func TestDiffNotesScale(t *testing.T) {
	t.Parallel()
	x := []float64{1, 2, 3, 4, 5, 6}
	y := []float64{2, 4.1, 5.9, 8.2, 9.8, 12.1}
	f := verdicts("linear", "positive", "strong", false)
	a, b := study("s", x, y, f), study("s", x, y, f)
	b.X.Scale, b.Y.Scale = "log", "log"
	res := Diff(rep("h", a), rep("h", b), Options{})
	sc := res.Studies[0]
	want := "the scales changed (x linear → log, y linear → log): r and the slope are of differently transformed values and are not compared"
	if !slices.Contains(sc.Notes, want) || sc.R != nil || sc.Slope != nil {
		t.Errorf("notes %q, r %+v, slope %+v; want the note %q and no tests", sc.Notes, sc.R, sc.Slope, want)
	}
	c := study("s", x, y, f)
	c.X.Scale, c.Y.Scale = "log", "log"
	if sc := Diff(rep("h", b), rep("h", c), Options{}).Studies[0]; len(sc.Notes) != 0 || sc.R == nil {
		t.Errorf("same scales: notes %q, r %+v; want no note and r compared", sc.Notes, sc.R)
	}
}
