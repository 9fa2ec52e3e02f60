package units

import "testing"

// TestSymbol checks the written symbols against the "print symbol" column
// of the UCUM tables (Regenstrief Institute; from memory: Cel °C, [degF]
// °F, [in_i] in, [lb_av] lb, um μm) and the SI Brochure's rules for
// writing unit symbols (BIPM, 9th edition 2019, section 5.4; from memory:
// products with a half-high dot or space, powers as superscripts). We
// write micro with the micro sign U+00B5, which Unicode maps to the same
// letter as the Greek mu.
func TestSymbol(t *testing.T) {
	cases := []struct{ code, want string }{
		{"", ""},
		{"1", ""},
		{"Cel", "°C"},
		{"[degF]", "°F"},
		{"K", "K"},
		{"{HRC}", "HRC"},
		{"[in_i]", "in"},
		{"[ft_i]", "ft"},
		{"[lb_av]", "lb"},
		{"[lbf_av]", "lbf"},
		{"[psi]", "psi"},
		{"k[psi]", "k[psi]"}, // [psi] takes no prefix in UCUM: not a code, shown as written
		{"um", "µm"},
		{"ug", "µg"},
		{"uL", "µL"},
		{"mm", "mm"},
		{"min", "min"},
		{"%", "%"},
		{"[ppm]", "ppm"},
		{"J", "J"},
		{"kPa", "kPa"},
		{"m3/h", "m³/h"},
		{"g/cm3", "g/cm³"},
		{"N.m", "N·m"},
		{"s-1", "s⁻¹"},
		{"/min", "/min"},
		{"m/s2", "m/s²"},
		{"[in_i]2", "in²"},
		{"10*3", "10³"},
		{"10*-3", "10⁻³"},
		{"{shot}/h", "shot/h"},
		{"g{dry}", "g dry"},
		{"(m/s)2", "(m/s)²"},
		{"kg.m/s2", "kg·m/s²"},
		// Unknown or malformed codes are shown as written.
		{"furlong", "furlong"},
		{"[degX]", "[degX]"},
		{"m/", "m/"},
		{"{HRC", "{HRC"},
	}
	for _, c := range cases {
		if got := Symbol(c.code); got != c.want {
			t.Errorf("Symbol(%q) = %q, want %q", c.code, got, c.want)
		}
	}
}

// FuzzSymbol: any string gives an answer without a panic, and a code that
// does not parse comes back unchanged.
func FuzzSymbol(f *testing.F) {
	for _, s := range []string{"Cel", "m3/h", "{a}b", "10*3", "(m.s)-2", "[in_i]2{x}"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, code string) {
		got := Symbol(code)
		if err := Check(code); err != nil && got != code {
			t.Fatalf("Symbol(%q) = %q for a code that does not parse (%v)", code, got, err)
		}
	})
}

// TestSymbolUCUM: print symbols from the "printSymbol" of ucum-essence.xml
// (UCUM 2.2): Ohm Ω, deg °, [pH] pH, [ppth] ppth, [degRe] °Ré, mm[Hg]
// "mm Hg"; an annotation alone prints as written.
func TestSymbolUCUM(t *testing.T) {
	cases := []struct{ code, want string }{
		{"Ohm", "Ω"},
		{"kOhm", "kΩ"},
		{"deg", "°"},
		{"rad", "rad"},
		{"[pH]", "pH"},
		{"dB", "dB"},
		{"[ppth]", "ppth"},
		{"[degRe]", "°Ré"},
		{"mmol/L", "mmol/L"},
		{"umol/L", "µmol/L"},
		{"mA", "mA"},
		{"a", "a"},
		{"wk", "wk"},
		{"mo", "mo"},
		{"mm[Hg]", "mm Hg"},
		{"{BEF_per_year}", "BEF_per_year"},
		{"10*", "10"},
		{"10*6/L", "10⁶/L"},
	}
	for _, c := range cases {
		if got := Symbol(c.code); got != c.want {
			t.Errorf("Symbol(%q) = %q, want %q", c.code, got, c.want)
		}
	}
}
