package render

import (
	"math"
	"testing"

	"bivar/analysis/report"
)

func TestNum(t *testing.T) {
	cases := []struct {
		in   float64
		want string
	}{
		{0, "0"}, {math.Copysign(0, -1), "0"}, {1, "1.000"}, {0.9123456, "0.9123"}, {-0.62, "-0.6200"},
		{12345.6, "12346"}, {9.99996, "10.00"}, {0.00012, "0.0001200"}, {0.0000123, "1.230e-05"},
		{1.5e9, "1.500e+09"}, {-0.00004, "-4.000e-05"}, {math.NaN(), "n/a"}, {math.Inf(1), "n/a"},
		{-0.00000, "0"},
	}
	for _, tc := range cases {
		if got := num(report.Float(tc.in)); got != tc.want {
			t.Errorf("num(%v) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// A range's ends read apart where they differ: more digits, at most 10,
// only when four would print the same number twice.
func TestNumApart(t *testing.T) {
	for _, tc := range []struct {
		lo, hi float64
		a, b   string
	}{
		{0.980623, 0.980627, "0.98062", "0.98063"}, {0.5, 0.6, "0.5000", "0.6000"}, {0.7, 0.7, "0.7000", "0.7000"},
		{1, 1 + 1e-15, "1.000000000", "1.000000000"}, {math.NaN(), 0.5, "n/a", "0.5000"}, {-2.5e-6, -2.5001e-6, "-2.5000e-06", "-2.5001e-06"},
	} {
		if a, b := numApart(report.Float(tc.lo), report.Float(tc.hi)); a != tc.a || b != tc.b {
			t.Errorf("numApart(%v, %v) = %q, %q; want %q, %q", tc.lo, tc.hi, a, b, tc.a, tc.b)
		}
	}
}

// TestPval: the report prints p-values with the project's one formatter,
// findings.PValue (two decimals from 0.1, three below, four below 0.001,
// "< 0.0001" below 0.0001).
func TestPval(t *testing.T) {
	cases := []struct {
		in   float64
		want string
	}{
		{0.5, "0.50"}, {0.001, "0.001"}, {0.00094, "0.0009"}, {0.0001, "0.0001"}, {0.0000999, "< 0.0001"},
		{1e-300, "< 0.0001"}, {0, "< 0.0001"}, {1, "1.00"}, {math.NaN(), "n/a"},
	}
	for _, tc := range cases {
		if got := pval(report.Float(tc.in)); got != tc.want {
			t.Errorf("pval(%v) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

func TestPercent(t *testing.T) {
	for alpha, want := range map[float64]string{0.05: "95", 0.01: "99", 0.1: "90", 0.005: "99.5", 0: "95"} {
		if got := percent(alpha); got != want {
			t.Errorf("percent(%v) = %q, want %q", alpha, got, want)
		}
	}
}

// The running header's CSS string: a hex escape swallows one following
// space (CSS Syntax 3, §4.3.7), so each escape carries its own and the
// title's spaces survive ("demo: line" printed as "demo:line" otherwise).
func TestCSSString(t *testing.T) {
	for in, want := range map[string]string{
		"demo: line":      `"demo\3a  line"`,
		"a,b":             `"a\2c b"`,
		`</style>"x`:      `"\3c \2f style\3e \22 x"`,
		"Q3 & Q1":         `"Q3 \26  Q1"`,
		"plain 2026 text": `"plain 2026 text"`,
	} {
		if got := cssString(in); got != want {
			t.Errorf("cssString(%q) = %s, want %s", in, got, want)
		}
	}
}

func TestCorr3(t *testing.T) {
	for in, want := range map[float64]string{0.9819: "0.982", -0.05147: "-0.051", 0.9996: "0.9996", -0.99994: "-0.9999", 0.99996: "0.99996", 1: "1.000", -0.0004: "0.000", 0: "0.000"} {
		if got := corr3(report.Float(in)); got != want {
			t.Errorf("corr3(%v) = %q, want %q", in, got, want)
		}
	}
	if got := corr3(report.NaN()); got != na {
		t.Errorf("corr3(NaN) = %q", got)
	}
}
