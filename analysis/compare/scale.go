package compare

import (
	"fmt"

	"bivar/analysis/report"
)

// scaleNote says when a study's scales (x_scale, y_scale) changed between
// the runs: r and the slope are then figures of other values (logarithms
// rather than the values, say), so neither change is tested. It returns
// "" when both runs used the same scales; a results.json without scales
// (schema v1, or a study on the recorded values) reads as linear.
func scaleNote(prev, cur *report.Study) string {
	if prev.X.Scale == cur.X.Scale && prev.Y.Scale == cur.Y.Scale {
		return ""
	}
	name := func(s string) string {
		if s == "" {
			return "linear"
		}
		return s
	}
	return fmt.Sprintf("the scales changed (x %s → %s, y %s → %s): r and the slope are of differently transformed values and are not compared",
		name(prev.X.Scale), name(cur.X.Scale), name(prev.Y.Scale), name(cur.Y.Scale))
}
