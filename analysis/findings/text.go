package findings

// This file holds the number and unit formatting of the statements.

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// num writes v with three significant digits, without an exponent for
// magnitudes between 0.001 and one million and as people write powers of
// ten beyond: 2.50×10⁻⁵.
func num(v float64) string {
	switch {
	case math.IsNaN(v) || math.IsInf(v, 0):
		return "undefined"
	case v == 0:
		return "0"
	}
	a := math.Abs(v)
	if a < 1e-3 || a >= 1e6 {
		return sci(v)
	}
	d := 2 - int(math.Floor(math.Log10(a)))
	if d < 0 {
		d = 0
	}
	t := strconv.FormatFloat(v, 'f', d, 64)
	if strings.Contains(t, ".") {
		t = strings.TrimRight(strings.TrimRight(t, "0"), ".")
	}
	return minus(t)
}

// sci writes v as m×10ⁿ with three significant digits.
func sci(v float64) string {
	t := strconv.FormatFloat(v, 'e', 2, 64) // "-2.50e-05"
	i := strings.IndexByte(t, 'e')
	e, err := strconv.Atoi(t[i+1:])
	if err != nil {
		return minus(t)
	}
	exp := strconv.Itoa(e)
	exp = strings.NewReplacer("-", "⁻", "0", "⁰", "1", "¹", "2", "²", "3", "³", "4", "⁴",
		"5", "⁵", "6", "⁶", "7", "⁷", "8", "⁸", "9", "⁹").Replace(exp)
	return minus(t[:i]) + "×10" + exp
}

// corr writes a correlation (or R²) with two decimals, more when it is so
// close to ±1 that two would print 1.00: 0.9996 prints as 0.9996.
func corr(r float64) string {
	if math.IsNaN(r) || math.IsInf(r, 0) {
		return "undefined"
	}
	// Add decimals until a value short of ±1 no longer prints as ±1.
	d := 2
	for ; d < 8 && math.Abs(r) < 1; d++ {
		if t := strconv.FormatFloat(math.Abs(r), 'f', d, 64); !strings.HasPrefix(t, "1.") {
			break
		}
	}
	return minus(strconv.FormatFloat(r, 'f', d, 64))
}

// corrPair writes two correlations (or R² values) for a range or a
// comparison: each as corr writes it, with decimals added to both until
// they differ, so two values that differ never print alike ("r ranges from
// −0.982 to −0.981", not "from −0.98 to −0.98"). Equal values print alike.
func corrPair(a, b float64) (string, string) {
	sa, sb := corr(a), corr(b)
	if math.IsNaN(a) || math.IsNaN(b) || math.IsInf(a, 0) || math.IsInf(b, 0) || a == b {
		return sa, sb
	}
	// Both to the decimals of the longer (corr gives −1 two and a value
	// a hair from it eight: "-1.00 to -1.00000000" read as two values
	// printed alike), then more until they differ.
	d0 := max(len(sa)-strings.IndexByte(sa, '.'), len(sb)-strings.IndexByte(sb, '.')) - 1
	for d := d0; d <= 15; d++ {
		sa, sb = strconv.FormatFloat(a, 'f', d, 64), strconv.FormatFloat(b, 'f', d, 64)
		if sa != sb {
			return minus(sa), minus(sb)
		}
	}
	// Alike to 15 decimals (R² of 1 and of 1 − 10⁻¹⁷): as corr's longer.
	sa, sb = strconv.FormatFloat(a, 'f', d0, 64), strconv.FormatFloat(b, 'f', d0, 64)
	return minus(sa), minus(sb)
}

// numPair is corrPair for any two figures: three significant digits, more
// until two values that differ print differently.
func numPair(a, b float64) (string, string) {
	sa, sb := num(a), num(b)
	if math.IsNaN(a) || math.IsNaN(b) || math.IsInf(a, 0) || math.IsInf(b, 0) || a == b || sa != sb {
		return sa, sb
	}
	for p := 4; p <= 15; p++ {
		sa, sb = strconv.FormatFloat(a, 'g', p, 64), strconv.FormatFloat(b, 'g', p, 64)
		if sa != sb {
			break
		}
	}
	return minus(sa), minus(sb)
}

// corrVs writes a correlation as corr does, with decimals added until the
// printed value lies on the same side of every cut point as the value
// itself: |r| = 0.6996 against a cut of 0.7 prints 0.6996, not 0.70.
func corrVs(r float64, cuts ...float64) string {
	t := corr(r)
	if math.IsNaN(r) || math.IsInf(r, 0) {
		return t
	}
	for d := 3; d <= 15 && !sameSide(t, math.Abs(r), cuts); d++ {
		t = minus(strconv.FormatFloat(r, 'f', d, 64))
	}
	return t
}

// cutTol is how near a cut point, relative to it, a figure counts as at
// the cut point (a choice of this tool): the same rows computed by two
// exact methods (in memory and in the database, or summed in another
// order) differ in the last digits, about 10⁻¹⁵ relative, and a figure
// that lies on a cut point in exact arithmetic must get the one verdict
// from both (from a sweep of small tables: a quadratic removing exactly
// 10% of the line's residual sum of squares, the curve_share cut, was
// "curved" in memory and "linear" in the database on 64 rows).
const cutTol = 1e-12

// atLeast reports whether v is at or above the cut point c, counting a v
// within cutTol of c as at it; false for NaN.
func atLeast(v, c float64) bool { return v >= c || math.Abs(v-c) <= cutTol*math.Abs(c) }

// below reports whether v is below the cut point c and not at it
// (atLeast); false for NaN.
func below(v, c float64) bool { return v < c && !(c-v <= cutTol*math.Abs(c)) }

// sameSide reports whether the printed value t (in size) and a lie on the
// same side of each cut point.
func sameSide(t string, a float64, cuts []float64) bool {
	v, err := strconv.ParseFloat(strings.Replace(t, "−", "-", 1), 64)
	if err != nil {
		return true
	}
	v = math.Abs(v)
	for _, c := range cuts {
		if atLeast(v, c) != atLeast(a, c) {
			return false
		}
	}
	return true
}

// pvalVs is pval with PValueVs's digits: "p = 0.0496", not "p = 0.050",
// when alpha is 0.05.
func pvalVs(p, alpha float64) string { return pIs(PValueVs(p, alpha)) }

// pv writes p against the study's alpha (pvalVs).
func (f *facts) pv(p float64) string { return pvalVs(p, f.alpha) }

// rNum writes r with digits enough to sit on the right side of the
// strength cut points.
func (f *facts) rNum() string {
	return corrVs(f.r, f.th.Strong, f.th.Moderate, f.th.Weak)
}

// absNum writes a value of |r| against the strength cut points.
func (f *facts) absNum(a float64) string {
	return corrVs(a, f.th.Strong, f.th.Moderate, f.th.Weak)
}

// pval writes a p-value after "p": "p = 0.012", "p < 0.0001".
func pval(p float64) string { return pIs(PValue(p)) }

// pIs puts "p" before a p-value that PValue wrote: "p = 0.012", "p <
// 0.0001", "p undefined".
func pIs(t string) string {
	switch {
	case t == "undefined":
		return "p undefined"
	case strings.HasPrefix(t, "<"):
		return "p " + t
	}
	return "p = " + t
}

// PValue writes a p-value as every report prints it, in sentences and in
// tables alike, the one formatter of the project: "< 0.0001" below 0.0001
// (results.json keeps the exact value), four decimals below 0.001, three
// below 0.1, two from there up; "undefined" for NaN or an infinity.
func PValue(p float64) string {
	switch {
	case math.IsNaN(p) || math.IsInf(p, 0):
		return "undefined"
	case p < 0.0001:
		return "< 0.0001"
	case p < 0.001:
		return strconv.FormatFloat(p, 'f', 4, 64)
	case p < 0.1:
		return strconv.FormatFloat(p, 'f', 3, 64)
	default:
		return strconv.FormatFloat(p, 'f', 2, 64)
	}
}

// PValueVs writes p as PValue does, with significant digits added where
// PValue's rounding would put it on the other side of alpha (0.0496
// prints as 0.0496, not 0.050, when alpha is 0.05). Below 0.0001 it stays
// "< 0.0001" unless alpha lies lower too: then "< alpha" when p is below
// alpha, else p to three significant digits, so that the side of alpha
// shows.
func PValueVs(p, alpha float64) string {
	t := PValue(p)
	switch {
	case math.IsNaN(p) || math.IsInf(p, 0):
		return t
	case p < 0.0001:
		if alpha > 0.0001 {
			return t
		}
		if p < alpha {
			// The level as written, in decimals (0.000001, not 1e-06):
			// a reader and a spreadsheet both read it as a number.
			return "< " + strconv.FormatFloat(alpha, 'f', -1, 64)
		}
		// Three significant digits, in decimals (0.0000612, not 6.12e-05).
		return strconv.FormatFloat(p, 'f', max(0, 2-int(math.Floor(math.Log10(p)))), 64)
	}
	for k := 3; k <= 8; k++ {
		v, err := strconv.ParseFloat(t, 64)
		if err != nil || (v < alpha) == (p < alpha) {
			return t
		}
		t = strconv.FormatFloat(p, 'g', k, 64)
	}
	return t
}

// minus writes a negative number with the ASCII hyphen-minus, the one
// convention of every output (a typographic minus pastes into a
// spreadsheet as text, not as a number).
func minus(s string) string { return s }

// withUnit is a value followed by its unit symbol (units.Symbol), if any.
func withUnit(v float64, u string) string {
	if u == "" {
		return num(v)
	}
	if u == "%" {
		return num(v) + "%"
	}
	return num(v) + " " + u
}

// perUnit names the slope's unit from the two unit symbols: "% per °C",
// "per °C" when y has no unit, "% per unit of melt" when x has none, and
// "per unit of melt" when neither has.
func perUnit(yu, xu, xLabel string) string {
	if yu != "" && yu == xu {
		// Like units: the slope is a ratio ("{BEF_per_year}" on both axes
		// is not "BEF_per_year per BEF_per_year").
		return "(a ratio of like units, " + yu + ")"
	}
	per := "per " + xu
	if xu == "" {
		per = "per unit of " + xLabel
	}
	if yu == "" {
		return per
	}
	return yu + " " + per
}

// span writes a range "4 to 14 °C".
func span(lo, hi float64, u string) string {
	return num(lo) + " to " + withUnit(hi, u)
}

// listRows names rows: "row 8", "rows 6 and 8", and past five names
// "rows 1, 2, 3, 4, 5 and 7 more".
func listRows(rows []string) string {
	const most = 5
	switch {
	case len(rows) == 1:
		return "row " + rows[0]
	case len(rows) <= most:
		return "rows " + joinAnd(rows)
	}
	return "rows " + strings.Join(rows[:most], ", ") + fmt.Sprintf(" and %d more", len(rows)-most)
}

// joinAnd joins with commas and a final "and".
func joinAnd(s []string) string {
	switch len(s) {
	case 0:
		return ""
	case 1:
		return s[0]
	}
	return strings.Join(s[:len(s)-1], ", ") + " and " + s[len(s)-1]
}

// plural returns one or many by n.
func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// capital upper-cases the first letter of a sentence that starts with a
// label, but leaves labels whose case carries meaning ("pH", "µm", "xRMS"):
// only an ASCII lower-case first letter followed by a lower-case letter or
// a space is raised.
func capital(s string) string {
	if len(s) == 0 || s[0] < 'a' || s[0] > 'z' {
		return s
	}
	if len(s) > 1 {
		if c := s[1]; !(c >= 'a' && c <= 'z' || c == ' ') {
			return s
		}
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

// pctVs writes a share as a whole percentage ("97%"), with decimals
// added until the printed value lies on the same side of each cut point
// (shares, not percentages) as the share itself.
func pctVs(share float64, cuts ...float64) string {
	if math.IsNaN(share) || math.IsInf(share, 0) {
		return "undefined"
	}
	for d := 0; d <= 6; d++ {
		t := strconv.FormatFloat(100*share, 'f', d, 64)
		v, _ := strconv.ParseFloat(t, 64)
		ok := true
		for _, c := range cuts {
			if atLeast(v/100, c) != atLeast(share, c) {
				ok = false
			}
		}
		if ok {
			return minus(t) + "%"
		}
	}
	return minus(strconv.FormatFloat(100*share, 'g', -1, 64)) + "%"
}

// pctText writes a cut point given as a share as a percentage: 0.1 → "10%".
func pctText(share float64) string {
	return strconv.FormatFloat(100*share, 'g', -1, 64) + "%"
}
