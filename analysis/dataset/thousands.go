package dataset

// This file reads numbers written with a separator between groups of
// thousands ("1,234.5"), for a dataset that declares one
// (Options.Thousands). The default path (parseNumber) never comes here.

import (
	"strings"
	"unicode/utf8"
)

// parseThousands reads s as parseNumber does after taking out sep, the
// separator between groups of three digits: "1,234.5" with sep ',' reads
// as 1234.5, "−12 345,25" with sep ' ' and mark ',' as −12345.25. The
// separator may stand only between digits of the integer part, with one
// to three digits before the first and exactly three after each
// ("1,23,456", "1,2345" and "1,234,5" with a decimal comma are not
// numbers); a number without it reads as usual. The value is
// strconv.ParseFloat's of the text without the separators, so it is as
// exact as a number written without them. sep may not be the decimal
// mark: with sep ',' and mark 0 (undecided) the mark is taken to be '.',
// with sep '.' to be ','.
func parseThousands(s string, mark byte, sep rune) (v float64, seen byte, st numStatus) {
	switch {
	case sep == ',' && mark == 0:
		mark = '.'
	case sep == '.' && mark == 0:
		mark = ','
	case sep < utf8.RuneSelf && byte(sep) == mark:
		return 0, 0, numNot
	}
	var sb [4]byte
	sepText := string(sb[:utf8.EncodeRune(sb[:], sep)])
	if !strings.Contains(s, sepText) {
		return parseNumber(s, mark)
	}
	var buf [64]byte
	b := buf[:0]
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		b = append(b, s[i])
		i++
	}
	group, groups := 0, 0 // digits in the current group; groups closed by a separator
	for i < len(s) {
		c := s[i]
		switch {
		case c >= '0' && c <= '9':
			b = append(b, c)
			group++
			i++
			continue
		case strings.HasPrefix(s[i:], sepText):
			if group == 0 || group > 3 || groups > 0 && group != 3 {
				return 0, 0, numNot
			}
			groups++
			group = 0
			i += len(sepText)
			continue
		}
		break
	}
	if groups == 0 || group != 3 { // the last group before the mark or the end has three digits
		return 0, 0, numNot
	}
	rest := s[i:]
	if strings.Contains(rest, sepText) {
		return 0, 0, numNot // a separator after the mark or in the exponent
	}
	b = append(b, rest...)
	return parseNumber(string(b), mark)
}

// ParseGrouped reads one cell as Read reads a number of a dataset with
// the decimal mark (',' with decimalComma, else '.') and the thousands
// separator sep (0 for none); ok is false when it is not such a number.
// It is for cells kept as text and compared with numbers later (a where
// expression's column).
func ParseGrouped(s string, decimalComma bool, sep rune) (v float64, ok bool) {
	mark := byte('.')
	if decimalComma {
		mark = ','
	}
	if sep != 0 {
		v, _, st := parseThousands(s, mark, sep)
		return v, st == numOK
	}
	v, _, st := parseNumber(s, mark)
	return v, st == numOK
}
