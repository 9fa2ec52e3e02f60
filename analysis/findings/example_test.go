package findings_test

import (
	"fmt"

	"bivar/analysis/findings"
)

// Anscombe's (1973) set III: ten points on a line and one far off it at
// x = 13 (row 3). Leverage, externally studentized residuals and Cook's
// distances as statsmodels 0.13.5 gives them (rounded).
func ExampleFlagPoints() {
	lev := []float64{0.1, 0.1, 0.236, 0.091, 0.127, 0.318, 0.173, 0.318, 0.173, 0.127, 0.236}
	t := []float64{-0.44, -0.19, 1203.54, -0.31, -0.57, -1.16, 0.07, 0.36, -0.74, -0.07, 0.2}
	d := []float64{0.012, 0.002, 1.393, 0.005, 0.026, 0.301, 0.001, 0.034, 0.06, 0, 0.007}
	for i, f := range findings.FlagPoints(lev, t, d, nil, findings.DefaultThresholds()) {
		if f != nil {
			fmt.Printf("row %d: %v\n", i+1, f)
		}
	}
	// Output: row 3: [outlier influential]
}
