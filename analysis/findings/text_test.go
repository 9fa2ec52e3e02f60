package findings

import (
	"math"
	"testing"
)

func TestNumberWords(t *testing.T) {
	for _, tc := range []struct {
		got, want string
	}{
		{num(0.5), "0.5"}, {num(0.0806), "0.0806"}, {num(-0.0806), "-0.0806"}, {num(123.456), "123"},
		{num(10), "10"}, {num(1234.6), "1235"}, {num(2.5e-5), "2.50×10⁻⁵"}, {num(-3e7), "-3.00×10⁷"},
		{num(math.NaN()), "undefined"}, {num(0), "0"},
		{corr(0.8164), "0.82"}, {corr(-0.99), "-0.99"}, {corr(0.9996), "0.9996"}, {corr(0.999997), "0.999997"},
		{corr(1), "1.00"}, {corr(math.NaN()), "undefined"},
		{PValue(0.5), "0.50"}, {PValue(0.0123), "0.012"}, {PValue(0.00094), "0.0009"}, {PValue(0.00004), "< 0.0001"}, {PValue(math.Inf(1)), "undefined"},
		{pval(0.0004), "p = 0.0004"}, {pval(0.00004), "p < 0.0001"}, {pval(0.0123), "p = 0.012"}, {pval(0.5), "p = 0.50"}, {pval(math.NaN()), "p undefined"},
		{withUnit(12.5, "%"), "12.5%"}, {withUnit(240, "°C"), "240 °C"}, {withUnit(3, ""), "3"},
		{perUnit("%", "°C", "melt"), "% per °C"}, {perUnit("", "", "melt"), "per unit of melt"},
		{perUnit("", "°C", "melt"), "per °C"}, {perUnit("HRC", "", "melt"), "HRC per unit of melt"},
		{perUnit("BEF_per_year", "BEF_per_year", "income"), "(a ratio of like units, BEF_per_year)"}, // no "per" doubling
		{listRows([]string{"8"}), "row 8"}, {listRows([]string{"6", "8"}), "rows 6 and 8"},
		{listRows([]string{"1", "2", "3", "4", "5", "6", "7"}), "rows 1, 2, 3, 4, 5 and 2 more"},
		{capital("shrinkage"), "Shrinkage"}, {capital("µm"), "µm"}, {capital("pH of bath"), "pH of bath"}, {capital(""), ""}, {capital("y"), "Y"},
	} {
		if tc.got != tc.want {
			t.Errorf("got %q, want %q", tc.got, tc.want)
		}
	}
}

// TestCorrPair: two values that differ never print alike; equal values
// and values that already differ at two decimals keep corr's digits.
func TestCorrPair(t *testing.T) {
	for _, c := range []struct {
		a, b   float64
		wa, wb string
	}{
		{-0.98191, -0.98149, "-0.982", "-0.981"},
		{0.8312, 0.8309, "0.8312", "0.8309"},
		{-0.34, -0.29, "-0.34", "-0.29"},
		{0.5, 0.5, "0.50", "0.50"},
		{0.99962, 0.99968, "0.9996", "0.9997"},
		{math.NaN(), 0.5, "undefined", "0.50"},
		// r exactly −1 and a hair from it (leaving a row out of rows on a
		// line): the same decimals for both, as many as tell them apart,
		// not "-1.00" against "-1.00000000".
		{-1, -0.99999999999998, "-1.00000000000000", "-0.99999999999998"},
		{0.9999999991, 0.99999999905, "0.99999999910", "0.99999999905"},
		// Alike to 15 decimals: as corr writes the longer, not
		// "1.000000000000000" twice.
		{1, 0.9999999999999999, "1.00000000", "1.00000000"},
	} {
		if a, b := corrPair(c.a, c.b); a != c.wa || b != c.wb {
			t.Errorf("corrPair(%v, %v) = %q, %q; want %q, %q", c.a, c.b, a, b, c.wa, c.wb)
		}
	}
	if a, b := numPair(-0.079312, -0.079348); a != "-0.07931" || b != "-0.07935" {
		t.Errorf("numPair = %q, %q", a, b)
	}
	if a, b := numPair(0.0208, 0.0263); a != "0.0208" || b != "0.0263" {
		t.Errorf("numPair = %q, %q", a, b)
	}
}
