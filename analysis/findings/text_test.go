package findings

import (
	"math"
	"testing"
)

func TestNumberWords(t *testing.T) {
	for _, tc := range []struct {
		got, want string
	}{
		{num(0.5), "0.5"}, {num(0.0806), "0.0806"}, {num(-0.0806), "−0.0806"}, {num(123.456), "123"},
		{num(10), "10"}, {num(1234.6), "1235"}, {num(2.5e-5), "2.50e-05"}, {num(3e7), "3.00e+07"},
		{num(math.NaN()), "undefined"}, {num(0), "0"},
		{corr(0.8164), "0.82"}, {corr(-0.99), "−0.99"}, {corr(0.9996), "0.9996"}, {corr(0.999997), "0.999997"},
		{corr(1), "1.00"}, {corr(math.NaN()), "undefined"},
		{pval(0.0004), "p < 0.001"}, {pval(0.0123), "p = 0.012"}, {pval(0.5), "p = 0.50"}, {pval(math.NaN()), "p undefined"},
		{withUnit(12.5, "%"), "12.5%"}, {withUnit(240, "°C"), "240 °C"}, {withUnit(3, ""), "3"},
		{perUnit("%", "°C", "melt"), "% per °C"}, {perUnit("", "", "melt"), "units per unit of melt"},
		{listRows([]string{"8"}), "row 8"}, {listRows([]string{"6", "8"}), "rows 6 and 8"},
		{listRows([]string{"1", "2", "3", "4", "5", "6", "7"}), "rows 1, 2, 3, 4, 5 and 2 more"},
		{capital("shrinkage"), "Shrinkage"}, {capital("µm"), "µm"}, {capital("pH of bath"), "pH of bath"}, {capital(""), ""}, {capital("y"), "Y"},
	} {
		if tc.got != tc.want {
			t.Errorf("got %q, want %q", tc.got, tc.want)
		}
	}
}
