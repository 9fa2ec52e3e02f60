package findings

// This file holds the words for a study on a transformed scale (x_scale,
// y_scale): the variables' names on the scale, the sentence that opens
// the headline, and what the slope means in the recorded units.

import (
	"fmt"
	"math"
	"strconv"

	"bivar/analysis/report"
)

// scaleBase is the logarithm's base of a scale (e or 10), 0 for any other.
func scaleBase(scale string) float64 {
	switch scale {
	case "log":
		return math.E
	case "log10":
		return 10
	}
	return 0
}

// scaledName is a variable's label on its scale, for sentences: "log
// income" (natural logarithm, the key's word), "log₁₀ income", "√income";
// the label itself when it is not transformed.
func scaledName(scale, label string) string {
	switch scale {
	case "log":
		return "log " + label
	case "log10":
		return "log₁₀ " + label
	case "sqrt":
		return "√" + label
	}
	return label
}

// scaleWords names a scale for people.
func scaleWords(scale string) string {
	switch scale {
	case "log":
		return "the natural-log scale"
	case "log10":
		return "the base-10 log scale"
	case "sqrt":
		return "the square-root scale"
	}
	return ""
}

// onScales renames the variables of a study on a transformed scale: its
// figures are of the transformed values, so they are named as such and
// carry no unit (the logarithm of 25 kg is not in kilograms).
func (f *facts) onScales() {
	if f.s.X.Scale != "" {
		f.xLabel, f.xSym = scaledName(f.s.X.Scale, f.xLabel), ""
	}
	if f.s.Y.Scale != "" {
		f.yLabel, f.ySym = scaledName(f.s.Y.Scale, f.yLabel), ""
	}
}

// scaleSentence opens the headline of a study on a transformed scale:
// "Studied on the log–log scale (natural logarithms of food expenditure
// and income)." It is "" for a study on the recorded values.
func scaleSentence(s *report.Study) string {
	xs, ys := s.X.Scale, s.Y.Scale
	xl, yl := label(s.X), label(s.Y)
	switch {
	case xs == "" && ys == "":
		return ""
	case xs == ys && scaleBase(xs) != 0:
		base := "natural"
		if xs == "log10" {
			base = "base-10"
		}
		return fmt.Sprintf("Studied on the log–log scale (%s logarithms of %s and %s).", base, yl, xl)
	case xs == ys:
		return fmt.Sprintf("Studied with %s and %s on %s.", yl, xl, scaleWords(xs))
	case xs == "":
		return fmt.Sprintf("Studied with %s on %s and %s as recorded.", yl, scaleWords(ys), xl)
	case ys == "":
		return fmt.Sprintf("Studied with %s on %s and %s as recorded.", xl, scaleWords(xs), yl)
	}
	return fmt.Sprintf("Studied with %s on %s and %s on %s.", yl, scaleWords(ys), xl, scaleWords(xs))
}

// slopeMeaning says what the slope b (and its interval lo to hi) on the
// study's scales means for the recorded values; "" on the recorded scale.
// With logarithms to bases Bx of x and By of y:
//
//   - both logs: log y = a + b·log x is y = A·x^(b·ln By/ln Bx), so the
//     slope is an elasticity, e = b·ln By/ln Bx: 1% more x multiplies y by
//     1.01^e, about e% more (the percentage is exact only in the limit);
//   - log y only: y is multiplied by By^b, 100·(By^b − 1)% more, per unit
//     of x (or of √x);
//   - log x only: y (or √y) changes by b·ln 1.01/ln Bx per 1% more x, and
//     by b·ln 2/ln Bx per doubling of x;
//   - square roots without logs: the slope is a change of √y (or y) per
//     unit of √x (or x): no constant rate in the recorded units.
//
// Each is a monotone function of b, so the interval maps end to end.
// Any textbook of applied regression gives these readings (for example
// Wooldridge, Introductory Econometrics, the section on logarithmic
// functional forms); the exact factors are plain algebra.
func (f *facts) slopeMeaning() string {
	s := f.s
	l := s.Line
	if l == nil || l.Slope == nil || (s.X.Scale == "" && s.Y.Scale == "") {
		return ""
	}
	b, lo, hi := float64(l.Slope.Estimate), float64(l.Slope.CILow), float64(l.Slope.CIHigh)
	xl, yl := label(s.X), label(s.Y)
	bx, by := scaleBase(s.X.Scale), scaleBase(s.Y.Scale)
	ci := func(g func(float64) float64, unit string) string {
		if math.IsNaN(lo) || math.IsNaN(hi) {
			return ""
		}
		if unit == "%" { // "0.816% to 0.896%"
			return fmt.Sprintf(" (%s CI %s%% to %s%%)", f.conf, num(g(lo)), num(g(hi)))
		}
		return fmt.Sprintf(" (%s CI %s to %s%s)", f.conf, num(g(lo)), num(g(hi)), unit)
	}
	more := func(v float64) string {
		if v < 0 {
			return "less"
		}
		return "more"
	}
	switch {
	case bx != 0 && by != 0:
		k := math.Log(by) / math.Log(bx)
		e := func(v float64) float64 { return v * k }
		conv := ""
		if k != 1 {
			conv = fmt.Sprintf(" (the slope times ln %s/ln %s, as the logarithms' bases differ)", baseName(by), baseName(bx))
		}
		rel := ""
		if symbol(s.X) == "%" || symbol(s.Y) == "%" {
			rel = " (percentages of the values themselves, not percentage points)"
		}
		return fmt.Sprintf("On the log–log scale the slope is an elasticity%s: 1%% more %s goes with about %s%% %s %s%s, whatever the level of %s (exactly: a factor of 1.01 to the power %s)%s.",
			conv, xl, num(math.Abs(e(b))), more(e(b)), yl, ci(e, "%"), xl, num(e(b)), rel)
	case by != 0:
		pct := func(v float64) float64 { return 100 * (math.Pow(by, v) - 1) }
		per := "per " + unitOf(symbol(s.X), xl)
		if s.X.Scale == "sqrt" {
			per = "per unit of √" + xl
		}
		return fmt.Sprintf("With %s on a log scale the slope is a rate of relative change: %s is %s%% %s %s%s, the same share at every level (exactly: a factor of %s to the power of the slope).",
			yl, yl, num(math.Abs(pct(b))), more(pct(b)), per, ci(pct, "%"), baseName(by))
	case bx != 0:
		what, unit := yl, symbol(s.Y)
		if s.Y.Scale == "sqrt" {
			what, unit = "√"+yl, ""
		}
		d1 := func(v float64) float64 { return v * math.Log(1.01) / math.Log(bx) }
		d2 := v2(b, bx)
		u := ""
		if unit != "" {
			u = " " + unit
		}
		return fmt.Sprintf("With %s on a log scale the slope is a change per relative change of %s: 1%% more %s goes with %s changing by %s%s%s, and a doubling of %s by %s%s.",
			xl, xl, xl, what, num(d1(b)), u, ci(d1, u), xl, num(d2), u)
	}
	return fmt.Sprintf("On %s the slope is the change in %s per unit of %s; in the recorded units the line is a curve, so it has no single rate of change there.",
		scaleWordsPair(s), scaledName(s.Y.Scale, yl), scaledName(s.X.Scale, xl))
}

// scaleLead is the plain claim that opens the headline of a straight-line
// study with a direction on a log scale, in the recorded units: for both
// logs the elasticity ("Surface decarburization depth rises with Shop
// relative humidity: 1% more Shop relative humidity goes with about 1.33%
// more Surface decarburization depth (95% CI 1.18% to 1.49%)."), for a log
// of y alone the percentage change per unit of x, for a log of x alone the
// change per 1% more x; "" otherwise. The factors are slopeMeaning's.
func (f *facts) scaleLead(out *report.Findings) string {
	s := f.s
	l := s.Line
	if l == nil || l.Slope == nil || out.Form != "linear" || f.dir == "none" {
		return ""
	}
	bx, by := scaleBase(s.X.Scale), scaleBase(s.Y.Scale)
	if bx == 0 && by == 0 {
		return ""
	}
	xl, yl := label(s.X), label(s.Y)
	b, lo, hi := float64(l.Slope.Estimate), float64(l.Slope.CILow), float64(l.Slope.CIHigh)
	verb := "rises"
	if b < 0 {
		verb = "falls"
	}
	ci := func(g func(float64) float64, u string) string {
		if math.IsNaN(lo) || math.IsNaN(hi) {
			return ""
		}
		a, c := g(lo), g(hi)
		if a > c {
			a, c = c, a
		}
		return fmt.Sprintf(" (%s CI %s%s to %s%s)", f.conf, num(a), u, num(c), u)
	}
	more := "more"
	if b < 0 {
		more = "less"
	}
	switch {
	case bx != 0 && by != 0:
		k := math.Log(by) / math.Log(bx)
		e := func(v float64) float64 { return math.Abs(v * k) }
		return fmt.Sprintf("%s %s with %s: 1%% more %s goes with about %s%% %s %s%s%s.", capital(yl), verb, xl, xl, num(e(b)), more, yl, ci(e, "%"), f.scatterFactor())
	case by != 0 && s.X.Scale == "":
		p := func(v float64) float64 { return math.Abs(100 * (math.Pow(by, v) - 1)) }
		return fmt.Sprintf("%s %s with %s: about %s%% %s per %s%s%s.", capital(yl), verb, xl, num(p(b)), more, unitOf(symbol(s.X), xl), ci(p, "%"), f.scatterFactor())
	case bx != 0 && s.Y.Scale == "":
		d := func(v float64) float64 { return math.Abs(v * math.Log(1.01) / math.Log(bx)) }
		u := ""
		if sym := symbol(s.Y); sym != "" {
			u = " " + sym
		}
		return fmt.Sprintf("%s %s with %s: by about %s%s per 1%% more %s%s.", capital(yl), verb, xl, num(d(b)), u, xl, ci(d, u))
	}
	return ""
}

// scatterFactor is, for y on a log scale, the line's residual SD in the
// recorded units: a factor, since a difference of logarithms to base B
// is the logarithm of a ratio (B^SD): ", with a typical scatter of ×1.20
// about the line"; "" otherwise.
func (f *facts) scatterFactor() string {
	s := f.s
	by := scaleBase(s.Y.Scale)
	if by == 0 || s.Line == nil || !s.Line.ResidualSE.Valid() {
		return ""
	}
	return fmt.Sprintf(", with a typical scatter of ×%s about the line (residual SD %s on %s)",
		strconv.FormatFloat(math.Pow(by, float64(s.Line.ResidualSE)), 'f', 2, 64), num(float64(s.Line.ResidualSE)), scaleWords(s.Y.Scale))
}

// v2 is the change per doubling of x for slope b on a log scale of base bx.
func v2(b, bx float64) float64 { return b * math.Ln2 / math.Log(bx) }

func baseName(b float64) string {
	if b == 10 {
		return "10"
	}
	return "e"
}

// unitOf is "°C" for a variable with a unit, else "unit of <label>".
func unitOf(sym, label string) string {
	if sym != "" {
		return sym
	}
	return "unit of " + label
}

func scaleWordsPair(s *report.Study) string {
	switch {
	case s.X.Scale != "" && s.Y.Scale != "":
		return "these scales"
	case s.X.Scale != "":
		return scaleWords(s.X.Scale)
	}
	return scaleWords(s.Y.Scale)
}
