package findings

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"testing"

	"bivar/analysis/report"
)

// TestShownLevels: a study with more than LevelsShownMax levels has its
// table of the lines within levels cut to the levelsShownEnds levels of
// lowest slope and the levelsShownEnds of highest (a choice of this
// tool, stated in the caption), from the lowest slope up; the choice is
// the same in any order of the levels, ties go by level; with at most
// LevelsShownMax levels every one is shown and nothing is set. The
// expected levels follow from the slopes as built (level i has slope
// (i·7 mod 31)/10, so the 31 levels hold 0 to 3.0 once each).
func TestShownLevels(t *testing.T) {
	build := func(n int, perm []int) *report.Study {
		s := study(0.6, 0.001)
		s.Group = "lot"
		for _, i := range perm {
			b := float64(i*7%n) / 10
			s.Groups = append(s.Groups, report.GroupFit{Group: fmt.Sprintf("L%02d", i), N: 40, R: 0.5, Slope: fl(b), SlopeLow: fl(b - 0.1), SlopeHigh: fl(b + 0.1), Intercept: 1})
		}
		return s
	}
	// The levels holding slopes 0.0–0.4 and 2.6–3.0: i·7 ≡ v (mod 31).
	var want []string
	for _, v := range []int{0, 1, 2, 3, 4, 26, 27, 28, 29, 30} {
		for i := range 31 {
			if i*7%31 == v {
				want = append(want, fmt.Sprintf("L%02d", i))
			}
		}
	}
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := range 3 {
		perm := rng.Perm(31)
		if trial == 0 {
			slices.Sort(perm)
		}
		f := Assess(build(31, perm), ctx)
		if !slices.Equal(f.LevelsShown, want) {
			t.Errorf("order %d: levels shown %v, want %v", trial, f.LevelsShown, want)
		}
		if f.LevelsShownWhy == "" {
			t.Errorf("order %d: no caption says which levels are shown", trial)
		}
	}
	// Ties: two levels share the lowest slope; the lower-named one first.
	s := build(31, slices.Sorted(slices.Values(rand.New(rand.NewPCG(3, 4)).Perm(31))))
	s.Groups[5].Slope = 0 // L05 (slope 0.4) now ties L00 at 0
	f := Assess(s, ctx)
	if f.LevelsShown[0] != "L00" || f.LevelsShown[1] != "L05" {
		t.Errorf("tied lowest slopes: levels shown %v, want L00 then L05 first", f.LevelsShown)
	}
	if f := Assess(build(LevelsShownMax, slices.Sorted(slices.Values(rng.Perm(LevelsShownMax)))), ctx); f.LevelsShown != nil || f.LevelsShownWhy != "" {
		t.Errorf("%d levels: levels shown %v (%q), want every level and nothing set", LevelsShownMax, f.LevelsShown, f.LevelsShownWhy)
	}
}
