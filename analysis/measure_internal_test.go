package analysis

import (
	"strings"
	"testing"

	"bivar/analysis/stats"
)

// The Passing–Bablok sample's error is stated at the study's n
// (stats.PassingBablokSampleError, checked by resampling in analysis/stats).
func TestPassingBablokApproximationText(t *testing.T) {
	t.Parallel()
	a := passingBablokApproximation(100000, 0.95)
	if a.Of != 100000 || a.Rows != stats.PassingBablokSample || !strings.Contains(a.Error, "about 0.1141 of the interval's half-width") || !strings.Contains(a.Error, "n = 100000") {
		t.Errorf("%+v", a)
	}
}
