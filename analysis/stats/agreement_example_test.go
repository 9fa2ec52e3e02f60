package stats_test

import (
	"fmt"

	"bivar/analysis/stats"
)

// Two hardness testers on the same eight shafts (invented readings, HRC).
// By hand: d = 0.5 −0.2 0.9 0.3 0.8 0.3 0.8 0.2, d̄ = 0.45, s = √(0.98/7) =
// 0.374; t₇ = 2.365 gives 0.45 ∓ 0.313; limits 0.45 ∓ 1.96·0.374.
func ExampleBlandAltman() {
	a := []float64{52.1, 48.7, 55.0, 50.3, 47.9, 53.6, 51.2, 49.4}
	b := []float64{51.6, 48.9, 54.1, 50.0, 47.1, 53.3, 50.4, 49.2}
	la := stats.BlandAltman(a, b, 1.96, 0.95)
	fmt.Printf("bias %.3f HRC (95%% CI %.3f to %.3f)\n", la.Bias, la.BiasLo, la.BiasHi)
	fmt.Printf("limits of agreement %.3f to %.3f HRC\n", la.Lower, la.Upper)
	// Output:
	// bias 0.450 HRC (95% CI 0.137 to 0.763)
	// limits of agreement -0.283 to 1.183 HRC
}

func ExampleNForCorrelationPower() {
	// Rows needed to detect r = 0.3 with power 0.8, two-sided α = 0.05.
	fmt.Println(stats.NForCorrelationPower(0.3, 0.05, 0.8))
	// Output: 85
}
