package stats_test

// The numbers in these examples are small hand-made values chosen so that
// the results can be checked with pencil and paper; they are not data.

import (
	"fmt"

	"bivar/analysis/stats"
)

func ExampleDescribe() {
	s := stats.Describe([]float64{7, 1, 10, 3, 2, 9, 4, 8, 6, 5})
	fmt.Printf("n=%d mean=%.2f sd=%.4f\n", s.N, s.Mean, s.SD)
	fmt.Printf("min=%g q1=%g median=%g q3=%g max=%g\n", s.Min, s.Q1, s.Median, s.Q3, s.Max)
	// Output:
	// n=10 mean=5.50 sd=3.0277
	// min=1 q1=3.25 median=5.5 q3=7.75 max=10
}

func ExamplePearson() {
	x := []float64{1, 2, 3, 4, 5}
	y := []float64{2, 4, 5, 4, 5}
	c := stats.Pearson(x, y, 0.95)
	fmt.Printf("r = %.4f (r² = %.2f), t = %.3f on %d df, p = %.3f\n", c.R, c.R2, c.T, c.DF, c.P)
	fmt.Printf("95%% CI [%.3f, %.3f]\n", c.CILow, c.CIHigh)
	// Output:
	// r = 0.7746 (r² = 0.60), t = 2.121 on 3 df, p = 0.124
	// 95% CI [-0.340, 0.984]
}

func ExampleKendallTauB() {
	// Of the 10 pairs, 7 are concordant, 1 discordant and 2 tied in y, so
	// τ-b = (7 − 1)/√(10·8); with two tie groups of 2 in y,
	// Var S = (5·4·15 − 2·(2·1·9))/18 = 264/18 and z = 6/√(264/18) = 1.567.
	tau, p := stats.KendallTauB([]float64{1, 2, 3, 4, 5}, []float64{2, 4, 5, 4, 5})
	rho, _ := stats.Spearman([]float64{1, 2, 3, 4, 5}, []float64{2, 4, 5, 4, 5})
	fmt.Printf("tau-b = %.4f (p = %.3f), rho = %.4f\n", tau, p, rho)
	// Output:
	// tau-b = 0.6708 (p = 0.117), rho = 0.7379
}

func ExampleLine() {
	l, err := stats.Line([]float64{1, 2, 3, 4, 5}, []float64{2, 4, 5, 4, 5}, 0.95)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("y = %.1f + %.1f·x, s = %.4f, R² = %.2f\n", l.Intercept.Estimate, l.Slope.Estimate, l.ResidualSE, l.R2)
	fit, lo, hi, plo, phi := l.Interval(3, 0.95)
	fmt.Printf("at x = 3: %.1f, mean in [%.3f, %.3f], new value in [%.3f, %.3f]\n", fit, lo, hi, plo, phi)
	// Output:
	// y = 2.2 + 0.6·x, s = 0.8944, R² = 0.60
	// at x = 3: 4.0, mean in [2.727, 5.273], new value in [0.882, 7.118]
}

func ExampleInfluence() {
	// Four rows share x = 2; the row at x = 9 alone sets the slope. Without
	// row 0 (y = 1) the other three at x = 2 average 3, so the slope is
	// (10 − 3)/(9 − 2) = 1.
	in := stats.Influence([]float64{2, 2, 2, 2, 9}, []float64{1, 3, 2, 4, 10})
	for i, sole := range in.SoleSupport {
		fmt.Printf("row %d: h = %.3f sole support %v, leave-one-out slope %.3f\n", i, in.Leverage[i], sole, in.LooSlope[i])
	}
	// Output:
	// row 0: h = 0.250 sole support false, leave-one-out slope 1.000
	// row 1: h = 0.250 sole support false, leave-one-out slope 1.095
	// row 2: h = 0.250 sole support false, leave-one-out slope 1.048
	// row 3: h = 0.250 sole support false, leave-one-out slope 1.143
	// row 4: h = 1.000 sole support true, leave-one-out slope NaN
}
