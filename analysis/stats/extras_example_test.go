package stats_test

// Small hand-made values chosen so the results can be checked with pencil
// and paper; they are not data.

import (
	"fmt"

	"bivar/analysis/stats"
)

func ExampleTheilSen() {
	// Points on y = 1 + 2x, one of them moved far up: the resistant line
	// ignores it (least squares would not).
	x := []float64{1, 2, 3, 4, 5, 6, 7}
	y := []float64{3, 5, 7, 9, 40, 13, 15}
	slope, intercept, method := stats.TheilSen(x, y, 0, nil)
	fmt.Printf("slope=%g intercept=%g (%s)\n", slope, intercept, method)
	// Output:
	// slope=2 intercept=1 (theil-sen (exact))
}

func ExampleDistanceCorrelation() {
	// y = x² on symmetric x: Pearson's r is 0, the distance correlation is
	// 10^(−1/4) (worked by hand from the definition).
	x := []float64{-1, 0, 1}
	y := []float64{1, 0, 1}
	fmt.Printf("r=%.1f dCor=%.6f\n", stats.Pearson(x, y, 0.95).R, stats.DistanceCorrelation(x, y))
	// Output:
	// r=0.0 dCor=0.562341
}

func ExampleLackOfFit() {
	// Two runs at each x; the means 1, 4, 1 bend away from the flat line.
	x := []float64{1, 1, 2, 2, 3, 3}
	y := []float64{0, 2, 3, 5, 0, 2}
	f, df1, df2, p, ok := stats.LackOfFit(x, y)
	fmt.Printf("F=%g df=(%d, %d) p=%.4f ok=%v\n", f, df1, df2, p, ok)
	// Output:
	// F=6 df=(1, 3) p=0.0917 ok=true
}

func ExampleHolm() {
	p := []float64{0.01, 0.04, 0.03}
	fmt.Printf("%.2f\n", stats.Holm(p))
	fmt.Printf("%.2f\n", stats.BenjaminiHochberg(p))
	// Output:
	// [0.03 0.06 0.06]
	// [0.03 0.04 0.04]
}
