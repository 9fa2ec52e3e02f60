package units

import (
	"math"
	"strings"
	"testing"
)

// TestCommonCodes: codes of UCUM that bivar refused before issue 11, with
// values from outside the project. Sources: the UCUM specification, version
// 2.2, §4.3 tables 2 and 4 (a_j = 365.25 d, a = a_j, mo_j = a_j/12,
// wk = 7 d; from memory of the printed tables, and the same values are in
// ucum-essence.xml); the SI Brochure, 9th edition (BIPM 2019), Table 8
// (1° = π/180 rad) and §2.3.1 (the Avogadro constant 6.022 140 76 × 10²³
// per mole, exact), from memory; the Réaumur scale's fixed points (0 °Ré
// and 80 °Ré at the freezing and boiling points of water), common
// knowledge.
func TestCommonCodes(t *testing.T) {
	t.Parallel()
	cases := []struct {
		from, to string
		v, want  float64
		dim      string
	}{
		{"a", "d", 1, 365.25, "time"},
		{"wk", "d", 1, 7, "time"},
		{"mo", "d", 1, 30.4375, "time"},
		{"mol", "1", 1, 6.02214076e23, "a pure number"},
		{"mmol/L", "mol/m3", 1, 1, "number or amount of substance per volume"},
		{"mmol/L", "umol/L", 1, 1000, "number or amount of substance per volume"},
		{"V", "mV", 1, 1000, "electric potential"},
		{"mA", "A", 1, 0.001, "electric current"},
		{"Ohm", "V/A", 1, 1, "electric resistance"},
		{"kOhm", "Ohm", 1, 1000, "electric resistance"},
		{"deg", "rad", 180, math.Pi, "plane angle"},
		{"rad", "deg", math.Pi / 2, 90, "plane angle"},
		{"[ppth]", "%", 1, 0.1, "a pure number"},
		{"[degRe]", "Cel", 80, 100, "temperature"},
		{"[degRe]", "K", 0, 273.15, "temperature"},
		{"dB", "B", 10, 1, "a non-linear scale lg(1 1)"},
		{"[pH]", "[pH]", 7, 7, "a non-linear scale pH(1 mol/l)"},
	}
	for _, c := range cases {
		s, o, err := Affine(c.from, c.to)
		if err != nil {
			t.Errorf("Affine(%q, %q): %v", c.from, c.to, err)
			continue
		}
		if got := s*c.v + o; math.Abs(got-c.want) > 1e-12*math.Abs(c.want) {
			t.Errorf("%v %s = %.17g %s, want %v", c.v, c.from, got, c.to, c.want)
		}
		if d, _ := Dimension(c.from); d != c.dim {
			t.Errorf("Dimension(%q) = %q, want %q", c.from, d, c.dim)
		}
	}
}

// TestGrammar: UCUM's grammar (specification §2: prefixes, exponents, "."
// and "/", parentheses, annotations, 10*n) on the units of its table.
func TestGrammar(t *testing.T) {
	t.Parallel()
	cases := []struct {
		from, to string
		want     float64
	}{
		{"mmol/L", "mol/m3", 1},
		{"10*3/uL", "10*9/L", 1},
		{"10*", "1", 10},
		{"10^", "1", 10},
		{"mg/dL", "g/L", 0.01},
		{"umol/(L.h)", "mol/(m3.s)", 1e-3 / 3600},
		{"kg.m2", "g.cm2", 1e7},
		{"{cells}/uL", "/L", 1e6},
		{"mL{total}/min", "L/h", 0.06},
		{"[IU]/mL", "[iU]/L", 1000},
		{"W/(m.K)", "mW/(cm.K)", 10},
		{"mm[Hg]", "kPa", 0.133322}, // UCUM: m[Hg] = 133.3220 kPa (rounded; BS 350 gives 133.322 387 415 Pa per mm Hg)
	}
	for _, c := range cases {
		s, _, err := Affine(c.from, c.to)
		if err != nil || math.Abs(s-c.want) > 1e-12*c.want {
			t.Errorf("Affine(%q, %q) = %.17g, %v; want %v", c.from, c.to, s, err, c.want)
		}
	}
}

// TestSpecialErrors pins the messages for the special units of UCUM that
// do not convert and for arbitrary units.
func TestSpecialErrors(t *testing.T) {
	t.Parallel()
	nl := " is a special unit of UCUM, a non-linear scale (a logarithm or the like): it cannot be multiplied, divided or raised to a power, and converts to no other unit"
	cases := []struct{ from, to, want string }{
		{"[pH]", "mol/L", `cannot convert "[pH]" to "mol/L": [pH]` + nl},
		{"dB", "1", `cannot convert "dB" to "1": dB` + nl},
		{"dB/s", "1", `unit "dB/s": dB` + nl},
		{"[pH]2", "1", `unit "[pH]2": [pH]` + nl},
		{"[IU]", "mg", `cannot convert "[IU]" (arbitrary units [iU]) to "mg" (mass): they measure different quantities`},
		{"C", "Cel", `cannot convert "C" (electric charge) to "Cel" (temperature): they measure different quantities (in UCUM "C" is the coulomb; for degree Celsius write "Cel")`},
		{"mmole/L", "mol/L", `unknown unit "mmole/L" ("mmole" is not a unit atom bivar knows) — did you mean "mmol/L"?`},
		{"Mol", "mol", `unknown unit "Mol" — did you mean "mol"?`},
		{"mmHg", "kPa", `unknown unit "mmHg" — the UCUM code is "mm[Hg]"`},
		{"kgs", "kg", `unknown unit "kgs" — did you mean "kg"?`},
	}
	for _, c := range cases {
		_, _, err := Affine(c.from, c.to)
		if err == nil || err.Error() != c.want {
			t.Errorf("Affine(%q, %q) error\ngot  %v\nwant %s", c.from, c.to, err, c.want)
		}
	}
}

// TestSuggestionsParse: every code a message suggests is itself valid.
func TestSuggestionsParse(t *testing.T) {
	t.Parallel()
	for _, bad := range []string{"mmole/L", "kgs", "Mol", "mmm", "mm/hr", "Ohms/m", "degs", "mV/sec", "umol/l/hr", "[ppt]"} {
		err := Check(bad)
		if err == nil {
			t.Errorf("Check(%q) = nil", bad)
			continue
		}
		_, offer, ok := strings.Cut(err.Error(), "—")
		if !ok {
			t.Errorf("Check(%q) = %v: no suggestion", bad, err)
		}
		for _, q := range quoted(offer) {
			if e := Check(q); e != nil {
				t.Errorf("Check(%q): suggests %q, which is not valid: %v", bad, q, e)
			}
		}
	}
}

// quoted returns the double-quoted strings of a message.
func quoted(s string) []string {
	var out []string
	for {
		i := indexByte(s, '"')
		if i < 0 {
			return out
		}
		j := indexByte(s[i+1:], '"')
		if j < 0 {
			return out
		}
		out = append(out, s[i+1:i+1+j])
		s = s[i+j+2:]
	}
}

func indexByte(s string, c byte) int {
	for i := range len(s) {
		if s[i] == c {
			return i
		}
	}
	return -1
}

// TestPer: the unit of a slope, with no "per" doubling for two columns in
// the same unit (issue 11: "{BEF_per_year}" gave "BEF_per_year per
// BEF_per_year").
func TestPer(t *testing.T) {
	t.Parallel()
	cases := []struct{ y, x, want string }{
		{"%", "Cel", "% per °C"},
		{"", "Cel", "per °C"},
		{"1", "Cel", "per °C"},
		{"mm", "", ""},
		{"{BEF_per_year}", "{BEF_per_year}", ""},
		{"{BEF_per_year}", "a", "BEF_per_year per a"},
		{"mmol/L", "h", "mmol/L per h"},
	}
	for _, c := range cases {
		if got := Per(c.y, c.x); got != c.want {
			t.Errorf("Per(%q, %q) = %q, want %q", c.y, c.x, got, c.want)
		}
	}
}
