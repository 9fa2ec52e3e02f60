package suggest

import "testing"

func TestDistance(t *testing.T) {
	t.Parallel()
	// Classic textbook pairs (Levenshtein distance, hand-checked).
	cases := []struct {
		a, b string
		want int
	}{
		{"", "", 0},
		{"", "abc", 3},
		{"kitten", "sitting", 3},
		{"flaw", "lawn", 2},
		{"yy", "y", 1},
		{"Cel", "cel", 1},
		{"µm", "um", 1},   // counted in runes, not bytes
		{"nvo", "nov", 1}, // a swap of neighbours costs 1
		{"ca", "abc", 3},  // optimal string alignment, not full Damerau (which gives 2)
	}
	for _, c := range cases {
		if got := Distance(c.a, c.b); got != c.want {
			t.Errorf("Distance(%q, %q) = %d, want %d", c.a, c.b, got, c.want)
		}
		if got := Distance(c.b, c.a); got != c.want {
			t.Errorf("Distance(%q, %q) = %d, want %d (symmetry)", c.b, c.a, got, c.want)
		}
	}
}

func TestNearest(t *testing.T) {
	t.Parallel()
	keys := []string{"id", "title", "dataset", "x", "y", "group", "order"}
	cases := []struct{ name, want string }{
		{"yy", "y"},
		{"datset", "dataset"},
		{"Title", "title"}, // case wins even over closer candidates
		{"grp", ""},        // distance 2 > limit 1 for a 3-letter name
		{"z", ""},          // one rune: only a case difference is suggested
		{"X", "x"},
		{"grop", "group"},
		{"ordre", "order"},
		{"zzzzzzzz", ""},
		{"x", ""}, // exact match is not a suggestion
	}
	for _, c := range cases {
		if got := Nearest(c.name, keys); got != c.want {
			t.Errorf("Nearest(%q) = %q, want %q", c.name, got, c.want)
		}
	}
}
