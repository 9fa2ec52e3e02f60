package compare

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/internal/reference"
)

// anscombe returns set s of Anscombe (1973), read from shared/reference.
func anscombe(t *testing.T, set string) (x, y []float64) {
	t.Helper()
	xy := reference.Anscombe(t)[set]
	return xy[0], xy[1]
}

var dataLines = regexp.MustCompile(`Data\s+\(lines (\d+) to (\d+)\)`)

// nist returns columns y and x1 of a NIST StRD .dat file, the data found
// by its "Data (lines A to B)" header.
func nist(t *testing.T, name string) (x, y []float64) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(reference.Dir(t), "nist-strd", name))
	if err != nil {
		t.Fatal(err)
	}
	var lines []string
	sc := bufio.NewScanner(bytes.NewReader(b))
	for sc.Scan() {
		lines = append(lines, sc.Text())
	}
	var from, to int
	for _, l := range lines {
		if m := dataLines.FindStringSubmatch(l); m != nil {
			from, _ = strconv.Atoi(m[1])
			to, _ = strconv.Atoi(m[2])
			break
		}
	}
	for _, l := range lines[from-1 : to] {
		f := strings.Fields(l)
		y = append(y, mustFloat(t, f[0]))
		x = append(x, mustFloat(t, f[1]))
	}
	return x, y
}

func mustFloat(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func moments(x, y []float64) report.Moments {
	m := stats.CentredMoments(x, y)
	return report.Moments{N: m.N, MeanX: report.Float(m.MeanX), MeanY: report.Float(m.MeanY),
		Sxx: report.Float(m.Sxx), Syy: report.Float(m.Syy), Sxy: report.Float(m.Sxy)}
}

func within(got, want, rel, abs float64) bool {
	d := math.Abs(got - want)
	return d <= abs || d <= rel*math.Abs(want)
}

// TestChangeTestsReference checks both change tests against a general-
// purpose reference library on published data (two samples each).
//
// Reference values: scipy 1.10.1 and statsmodels 0.13.5 (Debian
// python3-scipy, python3-statsmodels), computed as
//
//	r1, r2 = scipy.stats.pearsonr(x1, y1)[0], scipy.stats.pearsonr(x2, y2)[0]
//	z = (numpy.arctanh(r2) - numpy.arctanh(r1)) / sqrt(1/(n1-3) + 1/(n2-3))
//	p = 2 * scipy.stats.norm.sf(abs(z))
//
// the residual variance ratio and its two-sided F test,
//
//	f = fit2.mse_resid / fit1.mse_resid   # each statsmodels OLS(y, add_constant(x)).fit()
//	p = min(1, 2 * min(scipy.stats.f.sf(f, d2, d1), scipy.stats.f.cdf(f, d2, d1)))
//
// and for the slopes the interaction t of one fit,
//
//	statsmodels.api.OLS(y, column_stack([1, x, g, x*g])).fit()   # g = 0 old, 1 new
//	.params[3], .bse[3], .tvalues[3], .pvalues[3], .df_resid
//
// printed with %.17g. Data: Anscombe (1973) sets from anscombe.csv; NIST
// StRD Norris.dat (y, x) and Longley.dat (y, x1), split by data row.
func TestChangeTestsReference(t *testing.T) {
	type sample struct{ x, y []float64 }
	aI, aII, aIV := sample{}, sample{}, sample{}
	aI.x, aI.y = anscombe(t, "I")
	aII.x, aII.y = anscombe(t, "II")
	aIV.x, aIV.y = anscombe(t, "IV")
	nx, ny := nist(t, "Norris.dat")
	lx, ly := nist(t, "Longley.dat")
	cases := []struct {
		name               string
		old, new           sample
		r1, r2, z, pz      float64
		dslope, se, tt, pt float64
		df                 int
		vf, vp             float64 // residual variance ratio new/old and its two-sided F p
	}{
		{"anscombe I vs II", aI, aII,
			0.81642051634484003, 0.81623650600024278, -0.0011031539408459246, 0.99911981068093436,
			-9.0909090909530033e-05, 0.16678474880343544, -0.00054506836843140345, 0.99957109388109422, 18, 1.0009882449645315, 0.99885014786090243},
		{"anscombe I vs IV", aI, aIV,
			0.81642051634484003, 0.81652143688850298, 0.00060544733275769147, 0.99951692295032668,
			-0.0001818181818184772, 0.16668236289724839, -0.0010908063616218309, 0.99914166097932533, 18, 0.99853226367810421, 0.99829014747906075},
		{"norris rows 1-18 vs 19-36", sample{nx[:18], ny[:18]}, sample{nx[18:], ny[18:]},
			0.99999869100838112, 0.99999798135376938, -0.593142963377851, 0.55308547981715739,
			-0.0021099365373647427, 0.0006538589460920722, -3.2268986300106919, 0.0028855251020007506, 32, 1.8046706754311894, 0.24837084064970627},
		{"longley y~x1 rows 1-8 vs 9-16", sample{lx[:8], ly[:8]}, sample{lx[8:], ly[8:]},
			0.94302796299343661, 0.82550058348250532, -0.93425868667545087, 0.35017046960989606,
			-42.3655923496176, 73.591604095911421, -0.57568513242900399, 0.57546510674836326, 12, 2.0521591772599002, 0.40302023400771919},
		{"anscombe I vs norris all", aI, sample{nx, ny},
			0.81642051634484003, 0.9999968729369666, 14.053548137638142, 7.326915440344875e-45,
			0.50202590892956234, 0.092397176290754418, 5.4333468736078334, 2.422725875921217e-06, 43, 0.51194802496247582, 0.15413735859657235},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			om, nm := moments(tc.old.x, tc.old.y), moments(tc.new.x, tc.new.y)
			rc := CorrelationChange(om, nm)
			// r, z: relative 1e-9 (the references are full float64; the
			// moments are summed in another order). A z near 0 is checked
			// absolutely: it is a difference of nearly equal numbers.
			if !within(float64(rc.Old), tc.r1, 1e-12, 0) || !within(float64(rc.New), tc.r2, 1e-12, 0) {
				t.Errorf("r old, new = %.17g, %.17g, want %.17g, %.17g", rc.Old, rc.New, tc.r1, tc.r2)
			}
			if !within(float64(rc.Z), tc.z, 1e-9, 1e-12) {
				t.Errorf("z = %.17g, want %.17g", rc.Z, tc.z)
			}
			if !within(float64(rc.P), tc.pz, 1e-8, 1e-15) {
				t.Errorf("p(z) = %.17g, want %.17g", rc.P, tc.pz)
			}
			sc := SlopeChangeTest(om, nm)
			if !within(float64(sc.Delta), tc.dslope, 1e-9, 1e-14) {
				t.Errorf("Δslope = %.17g, want %.17g", sc.Delta, tc.dslope)
			}
			if !within(float64(sc.SE), tc.se, 1e-9, 0) {
				t.Errorf("SE = %.17g, want %.17g", sc.SE, tc.se)
			}
			if !within(float64(sc.T), tc.tt, 1e-8, 1e-12) {
				t.Errorf("t = %.17g, want %.17g", sc.T, tc.tt)
			}
			if !within(float64(sc.P), tc.pt, 1e-8, 1e-15) {
				t.Errorf("p(t) = %.17g, want %.17g", sc.P, tc.pt)
			}
			if !within(float64(sc.VarianceRatio), tc.vf, 1e-9, 0) || !within(float64(sc.VarianceP), tc.vp, 1e-8, 0) {
				t.Errorf("variance ratio, p = %.17g, %.17g, want %.17g, %.17g", sc.VarianceRatio, sc.VarianceP, tc.vf, tc.vp)
			}
			if sc.DF != tc.df {
				t.Errorf("df = %d, want %d", sc.DF, tc.df)
			}
		})
	}
}

// TestChangeTestsIdentities checks what must hold for any data.
func TestChangeTestsIdentities(t *testing.T) {
	x, y := anscombe(t, "III")
	m := moments(x, y)
	// The same run on both sides: no change, p = 1.
	if rc := CorrelationChange(m, m); rc.Z != 0 || rc.P != 1 {
		t.Errorf("same run: z = %v, p = %v; want 0, 1", rc.Z, rc.P)
	}
	if sc := SlopeChangeTest(m, m); sc.T != 0 || sc.P != 1 || sc.DF != 18 {
		t.Errorf("same run: t = %v, p = %v, df = %d; want 0, 1, 18", sc.T, sc.P, sc.DF)
	}
	// Swapping the runs flips the signs and keeps p.
	x2, y2 := anscombe(t, "II")
	m2 := moments(x2, y2)
	a, b := CorrelationChange(m, m2), CorrelationChange(m2, m)
	if a.Z != -b.Z || a.P != b.P {
		t.Errorf("swap: z %v vs %v, p %v vs %v", a.Z, b.Z, a.P, b.P)
	}
	// The slope and its SE from the moments equal the least-squares fit's
	// (stats.Line, QR), so the diff and the report agree.
	lf, err := stats.Line(x, y, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	sc := SlopeChangeTest(m, m2)
	if !within(float64(sc.Old), lf.Slope.Estimate, 1e-12, 0) || !within(float64(sc.OldSE), lf.Slope.SE, 1e-10, 0) {
		t.Errorf("slope, SE from moments = %v, %v; stats.Line = %v, %v", sc.Old, sc.OldSE, lf.Slope.Estimate, lf.Slope.SE)
	}
	// Undefined cases are NaN, never a panic.
	tiny := report.Moments{N: 3, Sxx: 2, Syy: 2, Sxy: 1}
	if rc := CorrelationChange(tiny, m); !math.IsNaN(float64(rc.Z)) || !math.IsNaN(float64(rc.P)) {
		t.Errorf("n = 3: z = %v, p = %v; want NaN", rc.Z, rc.P)
	}
	flat := report.Moments{N: 10, Sxx: 0, Syy: 2, Sxy: 0}
	if sc := SlopeChangeTest(flat, m); !math.IsNaN(float64(sc.T)) || sc.DF != 0 {
		t.Errorf("constant x: t = %v, df = %d; want NaN, 0", sc.T, sc.DF)
	}
	perfect := report.Moments{N: 10, Sxx: 4, Syy: 1, Sxy: 2} // r = 1, no residual
	if sc := SlopeChangeTest(perfect, perfect); !math.IsNaN(float64(sc.P)) {
		t.Errorf("two exact lines: p = %v, want NaN (no residual variance)", sc.P)
	}
	if rc := CorrelationChange(perfect, m); !math.IsInf(float64(rc.Z), -1) || rc.P != 0 {
		t.Errorf("r = 1 against r < 1: z = %v, p = %v; want -Inf, 0", rc.Z, rc.P)
	}
	nan := report.Moments{N: 10, Sxx: report.NaN(), Syy: report.NaN(), Sxy: report.NaN()}
	if rc := CorrelationChange(nan, m); !math.IsNaN(float64(rc.P)) {
		t.Errorf("null moments: p = %v, want NaN", rc.P)
	}
}

// TestReadNamesBadNumber: a number written as a string ("NaN" is written
// as null) is refused with its path, array indices included, and offset.
func TestReadNamesBadNumber(t *testing.T) {
	in := "{\"schema\": \"bivar.diff/v1\",\n \"studies\": [{\"id\": \"a\"}, {\"id\": \"b\", \"r\": {\"old\": \"NaN\"}}]}"
	_, err := Read(strings.NewReader(in))
	var te *json.UnmarshalTypeError
	if !errors.As(err, &te) {
		t.Fatalf("Read error %v, want a type error", err)
	}
	if te.Field != "studies[1].r.old" || te.Offset != int64(strings.Index(in, `"NaN"`))+1 {
		t.Errorf("Field %q, Offset %d; want %q, %d", te.Field, te.Offset, "studies[1].r.old", strings.Index(in, `"NaN"`)+1)
	}
}

// TestVerdictChangesLines: whether one line serves every group is a
// verdict the diff compares, but only where both runs decided it (a v1
// results.json has none; "untested" decides nothing).
func TestVerdictChangesLines(t *testing.T) {
	for _, tc := range []struct {
		old, new string
		want     bool
	}{{"one-line", "separate", true}, {"parallel", "parallel", false}, {"", "separate", false}, {"untested", "one-line", false}} {
		got := verdictChanges(&report.Findings{Lines: tc.old}, &report.Findings{Lines: tc.new})
		found := len(got) == 1 && got[0].Name == "lines"
		if found != tc.want {
			t.Errorf("lines %q → %q: changes %+v, want a lines change %v", tc.old, tc.new, got, tc.want)
		}
	}
}
