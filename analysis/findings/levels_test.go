package findings

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
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

// TestShownLevelsWithoutLines: levels without a line of their own (NaN
// slope: fewer than 3 rows, or x constant within the level, as where x
// is set once per lot) are never among those chosen, and the choice
// still holds the table to LevelsShownMax rows. 30 lots with x constant
// within each (no lot has a line) showed all 30 rows of n/a, with a
// levels_shown_why of "the 0 with the lowest slope and the 0 with the
// highest" in results.json; 25 lots of which 3 have a line showed 2 of
// those 3.
func TestShownLevelsWithoutLines(t *testing.T) {
	build := func(n int, slope func(i int) float64) *report.Study {
		s := study(0.6, 0.001)
		s.Group = "lot"
		for i := range n {
			b := slope(i)
			s.Groups = append(s.Groups, report.GroupFit{Group: fmt.Sprintf("L%02d", i), N: 20, R: fl(b), Slope: fl(b), SlopeLow: fl(b - 0.1), SlopeHigh: fl(b + 0.1), Intercept: 1})
		}
		return s
	}
	nan := math.NaN()
	// No level has a line: none shown, and the sentence says so.
	f := Assess(build(30, func(int) float64 { return nan }), ctx)
	if f.LevelsShown == nil || len(f.LevelsShown) != 0 || !strings.HasPrefix(f.LevelsShownWhy, "None of the 30 levels of lot has a line") {
		t.Errorf("no level with a line: levels shown %v, why %q; want an empty choice and a sentence saying none has one", f.LevelsShown, f.LevelsShownWhy)
	}
	// 3 of 25 have one (slopes 0.3, 0.1, 0.2 at L07, L11, L19): all 3,
	// from the lowest slope up.
	lines := map[int]float64{7: 0.3, 11: 0.1, 19: 0.2}
	f = Assess(build(25, func(i int) float64 {
		if b, ok := lines[i]; ok {
			return b
		}
		return nan
	}), ctx)
	if want := []string{"L11", "L19", "L07"}; !slices.Equal(f.LevelsShown, want) || !strings.Contains(f.LevelsShownWhy, "22 levels have no line") {
		t.Errorf("3 of 25 levels with a line: levels shown %v (%q), want %v and the 22 without one counted", f.LevelsShown, f.LevelsShownWhy, want)
	}
	// 12 of 30 have one: the 5 lowest and 5 highest of those 12.
	f = Assess(build(30, func(i int) float64 {
		if i%5 == 0 || i%5 == 1 {
			return float64(i)
		}
		return nan
	}), ctx)
	if want := []string{"L00", "L01", "L05", "L06", "L10", "L16", "L20", "L21", "L25", "L26"}; !slices.Equal(f.LevelsShown, want) {
		t.Errorf("12 of 30 levels with a line: levels shown %v, want %v", f.LevelsShown, want)
	}
}

// TestLinesUntestedExact: where two or more levels have a line but the
// lines leave no scatter about them (each level's rows exactly on its
// line, as 24 lots of y = 10·lot + 2·x with integer x, 20 rows each,
// gave: stats.GroupLinesFromMoments's F tests then undefined), the
// lines are untested, and the limit says why; it said "Fewer than two
// levels of lot can have a line of their own", false of 24 levels with
// one each.
func TestLinesUntestedExact(t *testing.T) {
	s := study(0.6, 0.001)
	s.Group = "lot"
	for i := range 24 {
		s.Groups = append(s.Groups, report.GroupFit{Group: fmt.Sprintf("T%02d", i), N: 20, R: 1, Slope: 2, SlopeLow: 2, SlopeHigh: 2, Intercept: fl(10 * float64(i))})
	}
	nan := report.NaN()
	s.GroupLines = &report.GroupLines{Groups: 24, N: 480, SlopesF: nan, SlopesDF1: 23, SlopesP: nan, LinesF: nan, LinesDF1: 46, LinesP: nan, DF2: 432,
		RWithin: 1, RWithinDF: 455, RWithinP: nan}
	f := Assess(s, ctx)
	all := strings.Join(f.Limits, "\n")
	if f.Lines != "untested" || strings.Contains(all, "Fewer than two levels") || !strings.Contains(all, "The lines within the 24 levels of lot that have one leave no scatter") {
		t.Errorf("24 levels of exact lines: lines %q, limits:\n%s", f.Lines, all)
	}
	// Too few levels with a line keeps its own sentence; 24 levels of 20
	// rows each where x is constant within each (no slope) are not said
	// to be too small to compare.
	for i := range s.Groups {
		s.Groups[i].Slope = nan
	}
	s.GroupLines = &report.GroupLines{Groups: 1, N: 20, SlopesF: nan, SlopesP: nan, LinesF: nan, LinesP: nan, DF2: 18, RWithin: nan, RWithinP: nan}
	if f := Assess(s, ctx); !strings.Contains(strings.Join(f.Limits, "\n"), "Fewer than two levels of lot can have a line") {
		t.Errorf("one level with a line: limits:\n%s", strings.Join(f.Limits, "\n"))
	} else if l := strings.Join(f.Limits, "\n"); !strings.Contains(l, "rows or more (the smallest size compared, a choice of this tool, not common practice) and a line of their own") {
		t.Errorf("24 levels of 20 rows without a slope are said to be too small:\n%s", l)
	}
}
