package stats

// Test of PassingBablokSampleError: the spread of the sampled
// Passing–Bablok figures over samples drawn for the same data.

import (
	"math"
	"math/rand/v2"
	"testing"
)

// The same 6000 rows, each time with one value moved by 1e-9 of its size
// (which changes the sample's seed, a hash of the rows, and moves the exact
// figures by far less than the sampling error): the SD of the sampled slope
// and interval ends over 16 samples, in half-widths of the interval, must
// agree with PassingBablokSampleError within the error of an SD from 16
// draws (a factor 0.55 to 1.6 holds with probability above 99 %,
// chi-squared with 15 df: scipy.stats.chi2.ppf(0.005, 15) = 4.60,
// chi2.ppf(0.995, 15) = 32.8, √(4.60/15) = 0.55, √(32.8/15) = 1.48).
func TestPassingBablokSampleError(t *testing.T) {
	if testing.Short() {
		t.Skip("16 sampled fits of 6000 rows")
	}
	const n, runs, conf = 6000, 16, 0.95
	rng := rand.New(rand.NewPCG(9, 9))
	x, y := make([]float64, n), make([]float64, n)
	for i := range x {
		tv := 10 + rng.NormFloat64()*3
		x[i], y[i] = tv+rng.NormFloat64(), 1.1*tv+rng.NormFloat64()
	}
	var s, s2 [3]float64
	var hw float64
	for r := range runs {
		x[0] = x[0] * (1 + 1e-9*float64(r))
		f := PassingBablok(x, y, conf)
		if !f.Sampled {
			t.Fatal("not sampled")
		}
		hw += (f.SlopeHi - f.SlopeLo) / 2 / runs
		for k, v := range []float64{f.Slope, f.SlopeLo, f.SlopeHi} {
			s[k] += v
			s2[k] += v * v
		}
	}
	want := PassingBablokSampleError(n, conf)
	for k, name := range []string{"slope", "lower end", "upper end"} {
		sd := math.Sqrt((s2[k] - s[k]*s[k]/runs) / (runs - 1))
		got := sd / hw
		t.Logf("%s: SD %.3g of the half-width, stated %.3g", name, got, want)
		if got < 0.55*want || got > 1.6*want {
			t.Errorf("%s: sampled SD %.3g of the half-width, stated %.3g", name, got, want)
		}
	}
}
