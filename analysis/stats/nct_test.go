package stats

// Tests of nct.go against testdata/nct_reference.csv, written by
// testdata/gen_nct_reference.py: scipy 1.10.1 stats.nct.cdf(t, df, nc)
// and stats.nct.ppf(p, df, nc) over df 2 to 10⁴ and nc 0 to 196, and one
// mpmath 1.2.1 quadrature at df = 10⁷ (the calls are in the script).

import (
	"bufio"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
)

func TestNoncentralTScipy(t *testing.T) {
	t.Parallel()
	f, err := os.Open("testdata/nct_reference.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	rows, worstCDF, worstPPF := 0, 0.0, 0.0
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") || strings.HasPrefix(line, "func,") {
			continue
		}
		c := strings.Split(line, ",")
		v := make([]float64, 4)
		for i := range v {
			if v[i], err = strconv.ParseFloat(c[i+1], 64); err != nil {
				t.Fatalf("%q: %v", line, err)
			}
		}
		df, nc, arg, want := v[0], v[1], v[2], v[3]
		rows++
		switch c[0] {
		case "cdf":
			got := NoncentralTCDF(arg, df, nc)
			e := math.Abs(got - want)
			worstCDF = max(worstCDF, e)
			if e > 1e-12 {
				t.Errorf("NoncentralTCDF(%g, %g, %g) = %.15g, %s gives %.15g", arg, df, nc, got, c[4], want)
			}
		case "ppf":
			got := NoncentralTQuantile(arg, df, nc)
			e := math.Abs(got-want) / math.Max(1, math.Abs(want))
			worstPPF = max(worstPPF, e)
			if e > 1e-9 {
				t.Errorf("NoncentralTQuantile(%g, %g, %g) = %.15g, %s gives %.15g", arg, df, nc, got, c[4], want)
			}
		}
	}
	if rows < 800 {
		t.Fatalf("%d reference rows, want the 883 the script writes", rows)
	}
	t.Logf("%d rows; largest CDF error %.2g absolute, quantile %.2g relative", rows, worstCDF, worstPPF)
}

// The quantile inverts the CDF, and the CDF rises with t, for any
// arguments (identities, no reference needed).
func TestNoncentralTInverse(t *testing.T) {
	t.Parallel()
	for _, df := range []float64{1, 2, 7.5, 40, 3e5} {
		for _, nc := range []float64{-5, 0, 1.3, 30} {
			prev := -1.0
			for _, p := range []float64{0.0001, 0.025, 0.5, 0.975, 0.9999} {
				x := NoncentralTQuantile(p, df, nc)
				if c := NoncentralTCDF(x, df, nc); math.Abs(c-p) > 1e-12 {
					t.Errorf("CDF(Quantile(%g)) = %.15g at df %g nc %g", p, c, df, nc)
				}
				if !(x > prev) && prev != -1 {
					t.Errorf("quantile not increasing at p %g df %g nc %g", p, df, nc)
				}
				prev = x
			}
		}
	}
	if !math.IsNaN(NoncentralTCDF(1, 0.5, 0)) || !math.IsNaN(NoncentralTQuantile(1, 5, 0)) {
		t.Error("df < 1 or p = 1 should give NaN")
	}
}

// BenchmarkNoncentralTQuantile: the cost of one limit's interval end at a
// small and at a large n (the limits of agreement take four per study).
func BenchmarkNoncentralTQuantile(b *testing.B) {
	for _, df := range []float64{16, 1e7} {
		b.Run(strconv.FormatFloat(df, 'g', -1, 64), func(b *testing.B) {
			nc := 1.96 * math.Sqrt(df+1)
			for b.Loop() {
				NoncentralTQuantile(0.975, df, nc)
			}
		})
	}
}
