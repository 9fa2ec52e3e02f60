package compare

// The Fisher z test of `bivar diff` against published worked examples of
// the test for the difference between two independent correlations
// (shared/reference/two-correlations-worked-examples.csv; SOURCES.md names
// the texts). Each printed figure is checked to half a unit in its last
// printed digit, widened where the text rounded an intermediate figure
// (SOURCES.md: Lane converts r to z' with a printed three-decimal table).

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/internal/reference"
)

// halfUnit is half a unit in the last digit of a printed number: 0.0005
// for "0.016".
func halfUnit(printed string) float64 {
	i := strings.IndexByte(printed, '.')
	if i < 0 {
		return 0.5
	}
	return 0.5 * math.Pow(10, -float64(len(printed)-i-1))
}

func TestFisherZWorkedExamples(t *testing.T) {
	path := reference.File(t, "two-correlations-worked-examples.csv")
	rows := reference.ReadCSV(t, path)
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	checked := 0
	for _, row := range rows[1:] {
		get := func(name string) string { return row[col[name]] }
		num := func(name string) float64 {
			v, err := strconv.ParseFloat(get(name), 64)
			if err != nil {
				t.Fatalf("%s: %s %q: %v", get("source"), name, get(name), err)
			}
			return v
		}
		src := get("source")
		r1, r2 := num("r1"), num("r2")
		n1, n2 := int(num("n1")), int(num("n2"))
		// Through the path `bivar diff` takes: moments with Sxx = Syy = 1,
		// Sxy = r (CorrelationChange reads r as Sxy/√(Sxx·Syy)).
		c := CorrelationChange(report.Moments{N: n1, Sxx: 1, Syy: 1, Sxy: report.Float(r1)},
			report.Moments{N: n2, Sxx: 1, Syy: 1, Sxy: report.Float(r2)})
		z, p := float64(c.Z), float64(c.P)
		zd, pd := FisherZDiff(r1, n1, r2, n2)
		if zd != z || pd != p {
			t.Errorf("%s: CorrelationChange z %v p %v, FisherZDiff z %v p %v", src, z, p, zd, pd)
		}
		se := math.Sqrt(1/float64(n1-3) + 1/float64(n2-3))
		if s := get("printed_z1"); s != "" {
			checked++
			if d := math.Abs(math.Atanh(r1) - num("printed_z1")); d > halfUnit(s) {
				t.Errorf("%s: z'1 = %.6f, printed %s", src, math.Atanh(r1), s)
			}
		}
		if s := get("printed_z2"); s != "" {
			checked++
			if d := math.Abs(math.Atanh(r2) - num("printed_z2")); d > halfUnit(s) {
				t.Errorf("%s: z'2 = %.6f, printed %s", src, math.Atanh(r2), s)
			}
		}
		if s := get("printed_se"); s != "" {
			checked++
			// The standard error the test divides by, recovered from its z.
			seOurs := (math.Atanh(r2) - math.Atanh(r1)) / z
			if math.Abs(seOurs-se) > 1e-12 || math.Abs(seOurs-num("printed_se")) > halfUnit(s) {
				t.Errorf("%s: SE of the difference %.6f, printed %s", src, seOurs, s)
			}
			// z from the printed intermediates, with their rounding carried
			// through, must bracket ours.
			if a, b := get("printed_z1"), get("printed_z2"); a != "" && b != "" {
				diff := num("printed_z2") - num("printed_z1")
				dd := halfUnit(a) + halfUnit(b)
				hs := halfUnit(s)
				lo := (math.Abs(diff) - dd) / (num("printed_se") + hs)
				hi := (math.Abs(diff) + dd) / (num("printed_se") - hs)
				if !(math.Abs(z) >= lo && math.Abs(z) <= hi) {
					t.Errorf("%s: |z| = %.4f, outside [%.4f, %.4f] from the printed z' and SE", src, math.Abs(z), lo, hi)
				}
			}
		}
		if s := get("printed_z"); s != "" {
			checked++
			// Lane's z' come from a three-decimal table: each off by up to
			// 0.0005, so the difference by up to 0.001, and z by 0.001/se.
			tol := halfUnit(s) + 0.001/se
			if math.Abs(math.Abs(z)-num("printed_z")) > tol {
				t.Errorf("%s: |z| = %.4f, printed %s (tolerance %.4f)", src, math.Abs(z), s, tol)
			}
			if ps := get("printed_p"); ps != "" {
				checked++
				// The printed p is the two-sided normal p of the printed z,
				// to its printed digits …
				if d := math.Abs(stats.TwoSidedNormal(num("printed_z")) - num("printed_p")); d > halfUnit(ps) {
					t.Errorf("%s: two-sided normal p of the printed z = %.5f, printed p %s", src, stats.TwoSidedNormal(num("printed_z")), ps)
				}
				// … and ours lies within the printed p plus what z's
				// tolerance moves it (|dp/dz| = 2φ(z) at most 2φ(|z| − tol)).
				phi := math.Exp(-0.5*(num("printed_z")-tol)*(num("printed_z")-tol)) / math.Sqrt(2*math.Pi)
				if d := math.Abs(p - num("printed_p")); d > halfUnit(ps)+2*phi*tol {
					t.Errorf("%s: p = %.5f, printed %s (tolerance %.5f)", src, p, ps, halfUnit(ps)+2*phi*tol)
				}
			}
		}
	}
	if checked < 5 {
		t.Errorf("checked %d printed figures, want the 5 the file holds", checked)
	}
}
