package manifest

// This file checks the keys that change how numbers are read or seen: a
// study's x_scale and y_scale, and a dataset's thousands separator.

import (
	"math"
	"slices"
	"strconv"
	"strings"
)

// Scaled says the scale transforms the values (it is not "" or "linear").
func Scaled(scale string) bool { return scale != "" && scale != "linear" }

// InScaleDomain says v can be put on the scale: above 0 for "log" and
// "log10", 0 or above for "sqrt", any finite value otherwise.
func InScaleDomain(scale string, v float64) bool {
	switch scale {
	case "log", "log10":
		return v > 0 && !math.IsInf(v, 0)
	case "sqrt":
		return v >= 0 && !math.IsInf(v, 0)
	}
	return !math.IsNaN(v) && !math.IsInf(v, 0)
}

// ScaleDomain says in words which values a scale takes, for messages.
func ScaleDomain(scale string) string {
	switch scale {
	case "log":
		return "the natural logarithm is defined only above 0"
	case "log10":
		return "the base-10 logarithm is defined only above 0"
	case "sqrt":
		return "the square root is defined only at 0 and above"
	}
	return ""
}

// scales checks x_scale and y_scale and records where they are written.
// Another unit (also_in) on a scaled axis is refused: the unit-invariance
// table converts the recorded values, not their logarithms or roots. The
// values of predict_at are given in x's recorded units and must lie in
// x_scale's domain.
func (p *parser) scales(owner, name string, s *Study) {
	for _, a := range []struct {
		axis, scale string
		at          *Pos
		alsoIn      []string
	}{{"x", s.XScale, &s.XScaleAt, s.AlsoIn.X}, {"y", s.YScale, &s.YScaleAt, s.AlsoIn.Y}} {
		if a.scale == "" {
			continue
		}
		key := "study." + a.axis + "_scale"
		if q, ok := p.ix.lookup(owner, key); ok {
			*a.at = Pos{q.line, q.col}
		}
		if !slices.Contains(Scales(), a.scale) {
			hint := ""
			switch strings.ToLower(a.scale) {
			case "ln", "natural", "loge", "log_e", "logarithm", "logarithmic":
				hint = ` — for the natural logarithm write "log"`
			case "log2":
				hint = ` — base 2 is not offered: "log" and "log10" give the same fit and the same r, with the slope in other words`
			case "square-root", "sqrt()", "root", "square_root":
				hint = ` — for the square root write "sqrt"`
			}
			if hint != "" {
				p.add(owner, key, "%s_scale = %q is not allowed; use one of %s%s", a.axis, a.scale, quoteAll(Scales()), hint)
			} else {
				p.oneOf(owner, key, a.scale, Scales())
			}
			continue
		}
		if !Scaled(a.scale) {
			continue
		}
		if len(a.alsoIn) > 0 {
			p.add(owner, "study.also_in."+a.axis, "study %q: also_in.%s cannot be used with %s_scale = %q: the unit-invariance table converts recorded values, not values on a transformed scale (on a log scale another unit only shifts the values, so r and the slope stay the same); remove one of the two",
				name, a.axis, a.axis, a.scale)
		}
		if a.axis == "x" {
			for _, v := range s.PredictAt {
				if !math.IsNaN(v) && !InScaleDomain(a.scale, v) {
					p.add(owner, "study.predict_at", "study %q: predict_at holds %v, but x_scale = %q and %s: give x values, in x's recorded units, that the scale can take", name, v, a.scale, ScaleDomain(a.scale))
					break
				}
			}
		}
	}
}

// thousands checks a dataset's thousands separator against its decimal
// mark: the one character cannot be both.
func (p *parser) thousands(owner, name string, d *Dataset) {
	if d.Thousands == "" {
		return
	}
	if !slices.Contains(ThousandsSeparators(), d.Thousands) {
		p.add(owner, "dataset.thousands", "dataset %q: thousands = %q is not allowed; use one of %s (comma, point, apostrophe, space, no-break space, narrow no-break space), or leave the key out when the numbers have no separator",
			name, d.Thousands, quoteAll(ThousandsSeparators()))
		return
	}
	if d.Thousands == d.Decimal {
		p.add(owner, "dataset.thousands", "dataset %q: thousands = %q is also the decimal mark (decimal = %q), so 1%s234 could be either; give the file's decimal mark in decimal and the other character in thousands",
			name, d.Thousands, d.Decimal, d.Thousands)
	}
}

func quoteAll(v []string) string {
	q := make([]string, len(v))
	for i, s := range v {
		q[i] = strconv.Quote(s)
	}
	return strings.Join(q, ", ")
}
