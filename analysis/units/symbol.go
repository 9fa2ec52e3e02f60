package units

// This file holds Symbol: a UCUM code as people write it.

import "strings"

// superscript maps exponent characters to their superscript forms.
var superscript = strings.NewReplacer(
	"-", "⁻", "+", "", "0", "⁰", "1", "¹", "2", "²", "3", "³", "4", "⁴",
	"5", "⁵", "6", "⁶", "7", "⁷", "8", "⁸", "9", "⁹")

// Symbol returns a UCUM code as people write it, for reports and
// sentences: "Cel" → "°C", "[degF]" → "°F", "[in_i]" → "in", "um" → "µm"
// (micro sign), "m3/h" → "m³/h", "N.m" → "N·m", "s-1" → "s⁻¹",
// "10*3" → "10³". Annotations lose their braces ("{HRC}" → "HRC",
// "{shot}/h" → "shot/h"; after a unit, "g{dry}" → "g dry"). The code "1"
// (a pure number) and "" give "". A code bivar does not know, or one that
// is not well formed, is returned as written, so nothing is hidden.
//
// Symbol is the only mapping from codes to written symbols: the findings,
// the expectation details and the renderers all show its result (the
// analysis stores it as report.Variable.Symbol).
func Symbol(code string) string {
	if code == "" || code == "1" {
		return ""
	}
	if _, err := parse1(code); err != nil {
		return code
	}
	var b strings.Builder
	s := code
	i := 0
	afterUnit := false // the last thing written was a unit symbol (not an operator)
	for i < len(s) {
		c := s[i]
		switch {
		case c == '{':
			end := i + strings.IndexByte(s[i:], '}')
			if afterUnit {
				b.WriteByte(' ')
			}
			b.WriteString(s[i+1 : end])
			i = end + 1
			afterUnit = true
		case c == '.':
			b.WriteString("·")
			i++
			afterUnit = false
		case c == '/' || c == '(':
			b.WriteByte(c)
			i++
			afterUnit = false
		case c == ')':
			b.WriteByte(c)
			i++
			i = writeExponent(&b, s, i)
			afterUnit = true
		case c >= '0' && c <= '9':
			j := i
			for j < len(s) && s[j] >= '0' && s[j] <= '9' {
				j++
			}
			b.WriteString(s[i:j])
			if j < len(s) && (s[j] == '*' || s[j] == '^') {
				j = writeExponent(&b, s, j+1)
			}
			i = j
			afterUnit = true
		default:
			j := i
			for j < len(s) {
				d := s[j]
				if d == '[' {
					j += strings.IndexByte(s[j:], ']') + 1
					continue
				}
				if d == '.' || d == '/' || d == '(' || d == ')' || d == '{' || d == '}' || d == '+' || d == '-' || d >= '0' && d <= '9' {
					break
				}
				j++
			}
			b.WriteString(atomSymbol(s[i:j]))
			i = writeExponent(&b, s, j)
			afterUnit = true
		}
	}
	return b.String()
}

// writeExponent writes the exponent (an optional sign and digits) that
// starts at s[i], if any, in superscript, and returns the index after it.
func writeExponent(b *strings.Builder, s string, i int) int {
	j := i
	if j < len(s) && (s[j] == '+' || s[j] == '-') {
		j++
	}
	k := j
	for k < len(s) && s[k] >= '0' && s[k] <= '9' {
		k++
	}
	if k == j {
		return i
	}
	b.WriteString(superscript.Replace(s[i:k]))
	return k
}

// atomSymbol writes one atom, with its prefix if any, in the print symbols
// of UCUM's table (ucum-essence.xml; the code itself where the table gives
// none). Micro is written with the micro sign U+00B5, where the table has
// the Greek mu U+03BC: Unicode maps the one to the other (NFKC), and the
// micro sign is what keyboards and the SI Brochure's fonts give.
func atomSymbol(sym string) string {
	if a, ok := allAtoms()[sym]; ok {
		return printOf(sym, a)
	}
	for _, n := range []int{2, 1} { // "da" before "d", as the parser does
		if len(sym) <= n {
			continue
		}
		pre, ok := prefixes[sym[:n]]
		if !ok {
			continue
		}
		a, ok := allAtoms()[sym[n:]]
		if !ok {
			continue
		}
		ps := pre.Print
		if pre.Code == "u" {
			ps = "µ"
		}
		return ps + printOf(sym[n:], a)
	}
	return sym
}

func printOf(code string, a atom) string {
	if a.print == "" {
		return code
	}
	return a.print
}
