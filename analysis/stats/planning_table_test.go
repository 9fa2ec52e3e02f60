package stats

import "testing"

// TestNForCorrelationPowerTable checks NForCorrelationPower against a
// published sample-size table for a correlation coefficient: Hulley, S. B.,
// Cummings, S. R. et al., Designing Clinical Research (Lippincott Williams
// & Wilkins), Appendix 6C, "Sample size for determining whether a
// correlation coefficient differs from zero", column two-sided α = 0.05,
// β = 0.20. The printed values below are FROM MEMORY, not checked against a
// copy of the book. The table uses z values rounded to two decimals (1.96,
// 0.84), so a value may differ from ours (exact quantiles, rounded up) by
// one row; the tolerance is that one row. A value printed by a Fisher-z
// calculator that was checked (r = 0.3 → 85, the calculator at
// clinicaltrials-tools.vercel.app/calculators/correlation) is in
// analysis/measure_test.go.
func TestNForCorrelationPowerTable(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		r       float64
		printed int
	}{{0.10, 782}, {0.20, 194}, {0.30, 85}, {0.40, 47}, {0.50, 29}} {
		got := NForCorrelationPower(tc.r, 0.05, 0.80)
		if d := got - tc.printed; d < -1 || d > 1 {
			t.Errorf("NForCorrelationPower(%v, 0.05, 0.80) = %d, table (from memory) %d ± 1", tc.r, got, tc.printed)
		}
	}
}
