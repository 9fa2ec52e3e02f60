package render

import (
	"math"
	"strconv"
	"strings"

	"bivar/analysis/findings"
	"bivar/analysis/report"
)

// This file holds the number formatting every format shares. Formatting is
// fixed (no locale, no shortest-representation surprises), so the same
// Report always gives the same text.
//
// The minus rule: every number the reports show to people, in prose, in
// tables and on chart axes, in HTML and in Markdown, writes its sign with
// the ASCII hyphen-minus "-", so that a table pasted into a spreadsheet
// reads as numbers; the findings' sentences, which results.json keeps
// with the typographic minus U+2212, are written with the same
// hyphen-minus (ascii). One output, one convention. results.json keeps
// JSON numbers.

const na = "n/a" // an undefined number, as printed

// num writes v with four significant digits: plain decimals between 1e-4
// and 1e7, else "1.234e−05". NaN and ±Inf are "n/a"; −0 prints as 0.
func num(v report.Float) string { return sig(float64(v), 4) }

// numApart writes a range's two ends as num does, with more significant
// digits (at most 10) where they would read the same and are not: on 10⁶
// rows, leaving out any one row moves r in its sixth digit, and "r 0.9806
// to 0.9806" hid by how much.
func numApart(lo, hi report.Float) (string, string) {
	for d := 4; ; d++ {
		a, b := sig(float64(lo), d), sig(float64(hi), d)
		if a != b || lo == hi || d == 10 || !lo.Valid() || !hi.Valid() {
			return a, b
		}
	}
}

func sig(v float64, digits int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return na
	}
	if v == 0 {
		return "0"
	}
	a := math.Abs(v)
	if a < 1e-4 || a >= 1e7 {
		return minus(negZero(strconv.FormatFloat(v, 'e', digits-1, 64)))
	}
	dec := max(0, digits-1-int(math.Floor(math.Log10(a))))
	s := strconv.FormatFloat(v, 'f', dec, 64)
	// Rounding may carry into a new digit (9.9996 -> 10.000): drop one decimal.
	if dec > 0 && len(strings.TrimLeft(strings.ReplaceAll(s, ".", ""), "-0")) > digits {
		s = strconv.FormatFloat(v, 'f', dec-1, 64)
	}
	return minus(negZero(s))
}

// minus keeps the hyphen-minus of a formatted number (the minus rule
// above); it is the one place to change the rule.
func minus(s string) string { return s }

// ascii writes the typographic minus U+2212 of a sentence from the
// analysis as the hyphen-minus, by the minus rule above.
func ascii(s string) string { return strings.ReplaceAll(s, "−", "-") }

// asciiAll is ascii over a list.
func asciiAll(ss []string) []string {
	out := make([]string, len(ss))
	for i, s := range ss {
		out[i] = ascii(s)
	}
	return out
}

func negZero(s string) string {
	if strings.HasPrefix(s, "-") && strings.Trim(s[1:], "0.") == "" {
		return s[1:]
	}
	return s
}

// pval writes a p-value with the project's one formatter,
// findings.PValue ("< 0.0001" below 0.0001; the exact value stays in
// results.json), n/a when undefined.
func pval(p report.Float) string {
	if !p.Valid() {
		return na
	}
	return findings.PValue(float64(p))
}

// pIs writes a p-value after "p": "= 0.87" or "< 0.0001".
func pIs(p report.Float) string {
	s := pval(p)
	if strings.HasPrefix(s, "<") || s == na {
		return s
	}
	return "= " + s
}

// interval writes "lo to hi", or n/a when either end is undefined.
func interval(lo, hi report.Float) string {
	if !lo.Valid() || !hi.Valid() {
		return na
	}
	return num(lo) + " to " + num(hi)
}

// withCI writes "v (lo to hi)".
func withCI(v, lo, hi report.Float) string {
	if !lo.Valid() || !hi.Valid() {
		return num(v)
	}
	return num(v) + " (" + interval(lo, hi) + ")"
}

// percent writes the confidence level of alpha, "95" for 0.05.
func percent(alpha float64) string {
	if alpha <= 0 || alpha >= 1 || math.IsNaN(alpha) {
		return "95"
	}
	return strconv.FormatFloat(math.Round((1-alpha)*1e4)/100, 'f', -1, 64)
}

func itoa(n int) string { return strconv.Itoa(n) }

// short writes a setting from the manifest (alpha, a threshold) as the
// shortest decimal that reads back to it: 0.05, 0.7, 3.
func short(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return na
	}
	return minus(negZero(strconv.FormatFloat(v, 'f', -1, 64)))
}

// sig3 writes v with three significant digits, as the findings' sentences
// give the limits of agreement, so that the summary and the finding
// print the same figure.
func sig3(v report.Float) string { return sig(float64(v), 3) }

// declared writes a value the manifest declared as it was written (the
// shortest form that reads back the same), without padding zeros.
func declared(v report.Float) string {
	if !v.Valid() {
		return na
	}
	return minus(strconv.FormatFloat(float64(v), 'g', -1, 64))
}
