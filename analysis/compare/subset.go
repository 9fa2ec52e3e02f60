package compare

import (
	"fmt"
	"slices"
	"strings"

	"bivar/analysis/report"
)

// selectionNotes says when the rows a study left out on purpose (exclude)
// or its subset expression changed between the runs: the statistics are
// then of different rows, which is a note, not a change in the process.
func selectionNotes(prev, cur *report.Study) []string {
	var notes []string
	key := func(l report.LeftOutRow) string { return l.Level + "\x00" + l.Row + "\x00" + l.Reason }
	set := func(s *report.Study) []string {
		var out []string
		for _, l := range s.LeftOut {
			out = append(out, key(l))
		}
		slices.Sort(out)
		return slices.Compact(out)
	}
	a, b := set(prev), set(cur)
	if !slices.Equal(a, b) || prev.LeftOutMore != cur.LeftOutMore {
		var gone, added []string
		for _, k := range a {
			if _, ok := slices.BinarySearch(b, k); !ok {
				gone = append(gone, strings.Split(k, "\x00")[1])
			}
		}
		for _, k := range b {
			if _, ok := slices.BinarySearch(a, k); !ok {
				added = append(added, strings.Split(k, "\x00")[1])
			}
		}
		msg := fmt.Sprintf("the rows left out by exclude changed (%d listed in the old run, %d in the new", len(prev.LeftOut)+prev.LeftOutMore, len(cur.LeftOut)+cur.LeftOutMore)
		if len(added) > 0 {
			msg += "; newly left out or with a new reason: " + short(added)
		}
		if len(gone) > 0 {
			msg += "; no longer left out, or with another reason: " + short(gone)
		}
		notes = append(notes, msg+")")
	}
	expr := func(s *report.Subset) string {
		if s == nil {
			return ""
		}
		return s.Expression
	}
	rows := func(s *report.Subset) int {
		if s == nil {
			return 0
		}
		return s.Rows
	}
	switch {
	case expr(prev.Subset) != expr(cur.Subset):
		notes = append(notes, fmt.Sprintf("the subset changed from %s to %s (rows left out by it: %d, then %d)",
			quoteOrAll(expr(prev.Subset)), quoteOrAll(expr(cur.Subset)), rows(prev.Subset), rows(cur.Subset)))
	case rows(prev.Subset) != rows(cur.Subset):
		notes = append(notes, fmt.Sprintf("the subset %q left out %d rows in the old run and %d in the new", expr(cur.Subset), rows(prev.Subset), rows(cur.Subset)))
	}
	return notes
}

func quoteOrAll(e string) string {
	if e == "" {
		return "every row"
	}
	return fmt.Sprintf("%q", e)
}

// short lists at most 10 row names, then how many more.
func short(names []string) string {
	slices.Sort(names)
	names = slices.Compact(names)
	if len(names) <= 10 {
		return strings.Join(names, ", ")
	}
	return strings.Join(names[:10], ", ") + fmt.Sprintf(" and %d more", len(names)-10)
}
