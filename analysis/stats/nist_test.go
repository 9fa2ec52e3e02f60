package stats

// Certified values: NIST/ITL Statistical Reference Datasets, Linear Least
// Squares Regression (itl.nist.gov/div898/strd/lls/), read in place from
// shared/reference/nist-strd/ (provenance in shared/reference/SOURCES.md).
// Both the data and the certified values are parsed from each file: the
// data from the header line "Data (lines A to B)", the certified values
// from the block "Certified Values (lines A to B)".
//
// Accuracy is the log relative error (McCullough 1998, "Assessing the
// reliability of statistical software: Part I", Am. Stat. 52(4), §3):
// LRE = −log10(|q − c|/|c|), or −log10|q| when the certified c is 0, capped
// at 15 (the certified digits).

import (
	"bufio"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"bivar/internal/reference"
)

type strdFile struct {
	y       []float64
	x       [][]float64 // predictor columns x1, x2, … as in the file
	est, sd []float64   // certified B0, B1, … and their standard deviations
	resSD   float64     // certified residual standard deviation
	r2      float64     // certified R-squared
	ssReg   float64     // certified regression sum of squares
	ssRes   float64     // certified residual sum of squares
	f       float64     // certified F statistic (NaN when "Infinity")
}

var strdLines = regexp.MustCompile(`^\s*(Certified Values|Data)\s+\(lines\s+(\d+)\s+to\s+(\d+)\)`)

func parseStRD(t *testing.T, path string) strdFile {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var lines []string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		lines = append(lines, sc.Text())
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	ranges := map[string][2]int{}
	for _, l := range lines[:min(len(lines), 20)] {
		if m := strdLines.FindStringSubmatch(l); m != nil {
			a, _ := strconv.Atoi(m[2])
			b, _ := strconv.Atoi(m[3])
			ranges[m[1]] = [2]int{a, b}
		}
	}
	cv, ok1 := ranges["Certified Values"]
	dv, ok2 := ranges["Data"]
	if !ok1 || !ok2 || dv[1] > len(lines) || cv[1] > len(lines) {
		t.Fatalf("%s: header has no usable \"Certified Values\"/\"Data (lines A to B)\" lines: %v", path, ranges)
	}
	num := func(s string, line int) float64 {
		if s == "Infinity" {
			return math.NaN()
		}
		v, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatalf("%s:%d: %v", path, line, err)
		}
		return v
	}
	var s strdFile
	s.resSD, s.r2, s.ssReg, s.ssRes, s.f = math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN()
	bRe := regexp.MustCompile(`^B(\d+)$`)
	for ln := cv[0]; ln <= cv[1]; ln++ {
		fs := strings.Fields(lines[ln-1])
		switch {
		case len(fs) == 3 && bRe.MatchString(fs[0]):
			if k, _ := strconv.Atoi(fs[0][1:]); k != len(s.est) {
				t.Fatalf("%s:%d: parameter %s out of order", path, ln, fs[0])
			}
			s.est = append(s.est, num(fs[1], ln))
			s.sd = append(s.sd, num(fs[2], ln))
		case len(fs) == 3 && fs[0] == "Standard" && fs[1] == "Deviation":
			s.resSD = num(fs[2], ln)
		case len(fs) == 2 && fs[0] == "R-Squared":
			s.r2 = num(fs[1], ln)
		case len(fs) == 5 && fs[0] == "Regression":
			s.ssReg, s.f = num(fs[2], ln), num(fs[4], ln)
		case len(fs) == 4 && fs[0] == "Residual":
			s.ssRes = num(fs[2], ln)
		}
	}
	for ln := dv[0]; ln <= dv[1]; ln++ {
		fs := strings.Fields(lines[ln-1])
		if len(fs) < 2 {
			t.Fatalf("%s:%d: data line has %d fields", path, ln, len(fs))
		}
		if s.x == nil {
			s.x = make([][]float64, len(fs)-1)
		}
		if len(fs)-1 != len(s.x) {
			t.Fatalf("%s:%d: %d fields, earlier lines had %d", path, ln, len(fs), len(s.x)+1)
		}
		s.y = append(s.y, num(fs[0], ln))
		for j := range s.x {
			s.x[j] = append(s.x[j], num(fs[j+1], ln))
		}
	}
	if len(s.est) == 0 || math.IsNaN(s.resSD) || math.IsNaN(s.r2) {
		t.Fatalf("%s: certified values not found", path)
	}
	return s
}

// lre is the log relative error of q against the certified value c.
func lre(q, c float64) float64 {
	if q == c {
		return 15
	}
	if math.IsNaN(q) || math.IsInf(q, 0) {
		return 0
	}
	var v float64
	if c == 0 {
		v = -math.Log10(math.Abs(q))
	} else {
		v = -math.Log10(math.Abs(q-c) / math.Abs(c))
	}
	return math.Max(0, math.Min(15, v))
}

func TestNISTStRD(t *testing.T) {
	t.Parallel()
	dir := filepath.Join(reference.Dir(t), "nist-strd")
	cases := []struct {
		file   string
		minLRE float64 // required by issue 2 ("Checks")
		fit    func(s strdFile) (Regression, error)
	}{
		{"Norris.dat", 11, func(s strdFile) (Regression, error) {
			l, err := Line(s.x[0], s.y, 0.95)
			return l.Regression, err
		}},
		{"Longley.dat", 10, func(s strdFile) (Regression, error) {
			return LeastSquares(s.x, s.y, 0.95)
		}},
		{"Wampler1.dat", 8, func(s strdFile) (Regression, error) {
			return Polynomial(s.x[0], s.y, len(s.est)-1, 0.95)
		}},
		// The same fits without per-row outputs (LeastSquaresSummary's
		// blocked QR with seminormal refinement), held to the same LREs.
		{"Norris.dat", 11, func(s strdFile) (Regression, error) {
			l, err := LineSummary(s.x[0], s.y, 0.95)
			return l.Regression, err
		}},
		{"Longley.dat", 10, func(s strdFile) (Regression, error) {
			return LeastSquaresSummary(s.x, s.y, 0.95)
		}},
		{"Wampler1.dat", 8, func(s strdFile) (Regression, error) {
			return PolynomialSummary(s.x[0], s.y, len(s.est)-1, 0.95)
		}},
		// The same on the pairs in canonical order, the means and centred
		// sums taken from Sorted.Moments (as a study fits them).
		{"Norris.dat", 11, func(s strdFile) (Regression, error) {
			l, err := NewSorted(s.x[0], s.y).LineSummary(0.95)
			return l.Regression, err
		}},
		{"Wampler1.dat", 8, func(s strdFile) (Regression, error) {
			return NewSorted(s.x[0], s.y).PolynomialSummary(len(s.est)-1, 0.95)
		}},
	}
	for k, tc := range cases {
		name := strings.TrimSuffix(tc.file, ".dat")
		switch {
		case k >= 6:
			name += "/sorted-summary"
		case k >= 3:
			name += "/summary"
		}
		t.Run(name, func(t *testing.T) {
			s := parseStRD(t, filepath.Join(dir, tc.file))
			reg, err := tc.fit(s)
			if err != nil {
				t.Fatalf("fit: %v", err)
			}
			if len(reg.Coef) != len(s.est) {
				t.Fatalf("%d coefficients, certified %d", len(reg.Coef), len(s.est))
			}
			minLRE, count := math.Inf(1), 0
			defer func() {
				t.Logf("minimum LRE %.2f over %d certified values (required %g)", minLRE, count, tc.minLRE)
			}()
			check := func(name string, got, cert float64) {
				t.Helper()
				l := lre(got, cert)
				minLRE, count = math.Min(minLRE, l), count+1
				t.Logf("%-10s LRE %5.2f  (got %.15g, certified %.15g)", name, l, got, cert)
				if l < tc.minLRE {
					t.Errorf("%s: LRE %.2f < %g (got %.15g, certified %.15g)", name, l, tc.minLRE, got, cert)
				}
			}
			for j := range s.est {
				check("B"+strconv.Itoa(j), reg.Coef[j].Estimate, s.est[j])
				check("SD(B"+strconv.Itoa(j)+")", reg.Coef[j].SE, s.sd[j])
			}
			check("ResidSD", reg.ResidualSE, s.resSD)
			check("R2", reg.R2, s.r2)
			check("SSreg", reg.TSS-reg.RSS, s.ssReg)
			check("SSres", reg.RSS, s.ssRes)
			if !math.IsNaN(s.f) {
				check("F", reg.F, s.f)
			} else if !(reg.F > 1e20) {
				// Certified "Infinity" (an exact fit): no LRE, but F must be
				// enormous or +Inf.
				t.Errorf("F = %v, certified Infinity", reg.F)
			}
		})
	}
}
