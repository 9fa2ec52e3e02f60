package analysis

// This file evaluates a study's [study.expect] gates.

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"bivar/analysis/findings"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/analysis/units"
)

// Expectations evaluates the gates of e on the finished study s (after
// adjustment and findings), in a fixed order: direction, form, min_abs_r,
// r_within, slope_within, max_p, min_n, not_outlier_driven. Each gate gives
// one Expectation saying what was wanted, what was found and whether it
// held. A study that did not run fails every gate, with its error as the
// detail. alpha gives the intervals' confidence 1 − alpha and adjust
// names the adjustment, both for the wording. It returns an empty list
// (written [] in results.json, not null) when e is nil.
func Expectations(s *report.Study, e *manifest.Expect, alpha float64, adjust string) []report.Expectation {
	out := []report.Expectation{}
	if e == nil {
		return out
	}
	add := func(name, want string, eval func() (got string, ok bool, detail string)) {
		if s.Error != nil {
			out = append(out, report.Expectation{Name: name, Title: ExpectationTitle(name), Want: want, Got: "not computed", OK: false,
				Detail: "the study did not run: " + *s.Error})
			return
		}
		got, ok, detail := eval()
		out = append(out, report.Expectation{Name: name, Title: ExpectationTitle(name), Want: want, Got: got, OK: ok, Detail: detail})
	}
	limits := func(w []float64) {
		if len(w) == 2 && len(out) > 0 {
			out[len(out)-1].Limits = &report.Limits{Low: report.Float(w[0]), High: report.Float(w[1])}
		}
	}
	rText := func() string {
		p := s.Pearson
		return fmt.Sprintf("r = %s (%s%% CI %s to %s, n = %d)", num(p.R), confPct(alpha), num(p.CILow), num(p.CIHigh), s.N)
	}
	if e.Direction != "" {
		add("direction", e.Direction, func() (string, bool, string) {
			got := s.Findings.Direction
			why := s.Findings.DirectionWhy
			if why == "" {
				why = rText()
			}
			if got == e.Direction {
				return got, true, fmt.Sprintf("%s, as expected. %s", directionWords(got), why)
			}
			return got, false, fmt.Sprintf("expected %s but found %s. %s", directionWords(e.Direction), directionWords(got), why)
		})
	}
	if e.Form != "" {
		add("form", e.Form, func() (string, bool, string) {
			got := s.Findings.Form
			why := ""
			if w := s.Findings.FormWhy; w != "" {
				why = " " + w
			}
			if got == e.Form {
				return got, true, fmt.Sprintf("the form is %s, as expected.%s", got, why)
			}
			return got, false, fmt.Sprintf("expected the form %s but found %s.%s", e.Form, got, why)
		})
	}
	if e.MinAbsR != nil {
		want := *e.MinAbsR
		add("min_abs_r", "|r| ≥ "+num(report.Float(want)), func() (string, bool, string) {
			r := float64(s.Pearson.R)
			got := "|r| = " + num(report.Float(math.Abs(r)))
			if math.Abs(r) >= want {
				return got, true, fmt.Sprintf("|r| is at least %s; %s", num(report.Float(want)), rText())
			}
			return got, false, fmt.Sprintf("|r| is below the required %s; %s", num(report.Float(want)), rText())
		})
	}
	if e.RWithin != nil {
		add("r_within", interval("r", e.RWithin, ""), func() (string, bool, string) {
			return within("r", float64(s.Pearson.R), e.RWithin, "", rText())
		})
		limits(e.RWithin)
	}
	if e.SlopeWithin != nil {
		u := slopeUnit(s)
		add("slope_within", interval("slope", e.SlopeWithin, u), func() (string, bool, string) {
			sl := s.Line.Slope
			ctx := fmt.Sprintf("slope = %s%s (%s%% CI %s to %s)", num(sl.Estimate), u, confPct(alpha), num(sl.CILow), num(sl.CIHigh))
			return within("slope", float64(sl.Estimate), e.SlopeWithin, u, ctx)
		})
		limits(e.SlopeWithin)
	}
	if e.MaxP != nil {
		want := *e.MaxP
		add("max_p", "adjusted p ≤ "+strconv.FormatFloat(want, 'f', -1, 64), func() (string, bool, string) {
			pa := s.Pearson.PAdjusted
			// findings.PValueVs against the gate's bound: "< 0.0001" below
			// 0.0001 unless the bound lies lower (then "< bound" or the
			// value), with digits enough that the printed p stays on its
			// side of "p < bound". The gate holds at p ≤ bound, so a p
			// just above the bound that prints as the bound ("0.050" for
			// 0.0504) is written again against the next number above the
			// bound, which adds the digits that show it.
			pg := func(p report.Float) string {
				t := findings.PValueVs(float64(p), want)
				if v, err := strconv.ParseFloat(t, 64); err == nil && (v <= want) != (float64(p) <= want) {
					t = findings.PValueVs(float64(p), math.Nextafter(want, 1))
				}
				return pIs(t)
			}
			got := "adjusted p " + pg(pa)
			how := fmt.Sprintf("Pearson's p %s; adjusted across the manifest's studies by %s: %s", pg(s.Pearson.P), adjustName(adjust), pg(pa))
			if adjust == "none" {
				how = fmt.Sprintf("Pearson's p %s (the manifest adjusts nothing across studies)", pg(pa))
			}
			if pa.Valid() && float64(pa) <= want {
				return got, true, fmt.Sprintf("%s, at or below %s", how, num(report.Float(want)))
			}
			return got, false, fmt.Sprintf("%s, above the allowed %s", how, num(report.Float(want)))
		})
	}
	if e.MinN != nil {
		want := *e.MinN
		add("min_n", fmt.Sprintf("n ≥ %d", want), func() (string, bool, string) {
			got := fmt.Sprintf("n = %d", s.N)
			if s.N >= want {
				return got, true, fmt.Sprintf("%s, at least the %d required (%s dropped for missing cells)", count(s.N, "complete row"), want, count(s.NMissing, "row"))
			}
			return got, false, fmt.Sprintf("only %s, fewer than the %d required (%s dropped for missing cells)", count(s.N, "complete row"), want, count(s.NMissing, "row"))
		})
	}
	if e.NotOutlierDriven != nil && *e.NotOutlierDriven {
		add("not_outlier_driven", "not outlier-driven", func() (string, bool, string) {
			se := s.Sensitivity
			ctx := fmt.Sprintf("%s left out (outlier, influential or sole support); r = %s with all rows, %s without %s",
				count(se.NFlagged, "row"), num(s.Pearson.R), num(se.RWithoutFlagged), itThem(se.NFlagged))
			if se.NFlagged == 0 {
				ctx = fmt.Sprintf("no row is an outlier, influential or the sole support of the line; r = %s", num(s.Pearson.R))
			}
			if s.Findings.OutlierDriven {
				return "outlier-driven", false, "the verdict does not survive without the flagged rows: " + ctx
			}
			return "not outlier-driven", true, "the verdict survives without the flagged rows: " + ctx
		})
	}
	return out
}

// ExpectationTitle names a gate of [study.expect] in words, for reviewers
// who do not read the manifest's keys.
func ExpectationTitle(key string) string {
	switch key {
	case "direction":
		return "direction as expected"
	case "form":
		return "shape as expected"
	case "min_abs_r":
		return "correlation at least as strong as required"
	case "r_within":
		return "correlation within its limits"
	case "slope_within":
		return "slope within its limits"
	case "max_p":
		return "evidence strong enough (adjusted p small enough)"
	case "min_n":
		return "enough complete rows"
	case "not_outlier_driven":
		return "not resting on a few unusual rows"
	}
	return key
}

// count writes n with the noun, plural by n: "1 row", "2 rows", "0 rows".
func count(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return strconv.Itoa(n) + " " + noun + "s"
}

// itThem is the pronoun for n rows.
func itThem(n int) string {
	if n == 1 {
		return "it"
	}
	return "them"
}

// directionWords names a direction verdict in a sentence.
func directionWords(d string) string {
	switch d {
	case "positive", "negative":
		return "a " + d + " direction"
	case "none":
		return "no direction"
	}
	return "direction " + d
}

// within checks lo ≤ v ≤ hi for the two-element range w.
func within(what string, v float64, w []float64, unit, ctx string) (string, bool, string) {
	got := fmt.Sprintf("%s = %s%s", what, num(report.Float(v)), unit)
	if len(w) != 2 {
		return got, false, fmt.Sprintf("%s_within needs two numbers [low, high], the manifest gives %d", what, len(w))
	}
	if !(w[0] <= v && v <= w[1]) {
		return got, false, fmt.Sprintf("%s lies outside [%s, %s]%s; %s", what, num(report.Float(w[0])), num(report.Float(w[1])), unit, ctx)
	}
	return got, true, fmt.Sprintf("%s lies inside [%s, %s]%s; %s", what, num(report.Float(w[0])), num(report.Float(w[1])), unit, ctx)
}

func interval(what string, w []float64, unit string) string {
	if len(w) != 2 {
		return fmt.Sprintf("%s in %v", what, w)
	}
	return fmt.Sprintf("%s in [%s, %s]%s", what, num(report.Float(w[0])), num(report.Float(w[1])), unit)
}

// slopeUnit is the slope's unit as the report writes it, with a leading
// space: " HRC per °C", " per °C" when y has no unit (or is a pure
// number), " HRC per unit of Transfer time" when x has none, "" when
// neither has. On a transformed scale the transformed variable is named
// instead of its unit, as the report does: " ln y per ln x".
func slopeUnit(s *report.Study) string {
	xs, ys := symbolOf(s.X), symbolOf(s.Y)
	if s.X.Scale != "" || s.Y.Scale != "" {
		name := func(v report.Variable, sym, axis string) string {
			if v.Scale == "" && sym != "" {
				return sym
			}
			return scaledPrefix[v.Scale] + axis
		}
		return " " + name(s.Y, ys, "y") + " per " + name(s.X, xs, "x")
	}
	switch {
	case xs == "" && ys == "":
		return ""
	case xs == "":
		return " " + ys + " per unit of " + labelOf(s.X.Column, s.X.Label)
	case ys == "":
		return " per " + xs
	}
	return " " + ys + " per " + xs
}

// scaledPrefix names a variable on its scale (report.Variable.Scale) as
// the report does: "ln y", "log₁₀ x", "√y".
var scaledPrefix = map[string]string{"log": "ln ", "log10": "log₁₀ ", "sqrt": "√"}

// symbolOf is the variable's unit symbol: Variable.Symbol, or units.Symbol
// of its code when a study built by hand leaves Symbol empty.
func symbolOf(v report.Variable) string {
	if v.Symbol != "" || v.Unit == "" {
		return v.Symbol
	}
	return units.Symbol(v.Unit)
}

func adjustName(a string) string {
	switch a {
	case "holm":
		return "Holm's method"
	case "bh":
		return "Benjamini–Hochberg"
	}
	return "no adjustment"
}

// confPct gives the confidence level 1 − alpha in percent.
func confPct(alpha float64) string {
	return strconv.FormatFloat(100*(1-alpha), 'g', 4, 64)
}

// num formats a number with four significant digits, "undefined" for NaN.
func num(f report.Float) string {
	if !f.Valid() {
		return "undefined"
	}
	return strconv.FormatFloat(float64(f), 'g', 4, 64)
}

// pIs is a p-value that findings.PValue or PValueVs wrote, after "p":
// "= 0.012", "< 0.0001", "undefined".
func pIs(t string) string {
	if strings.HasPrefix(t, "<") || t == "undefined" {
		return t
	}
	return "= " + t
}
