package units

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

// nist lists conversion factors of NIST Special Publication 811 (2008
// edition), "Guide for the Use of the International System of Units (SI)",
// Appendix B.8 ("Factors for units listed alphabetically"), as printed
// there: "from" → "to", multiply by factor. Entries SP 811 prints in bold
// are exact; the others are rounded to the digits shown. The factors were
// entered from memory of that table (the document is not in
// shared/reference); each exact one also follows from the definitions
// named in the comment, which is how a wrong memory would be caught.
var nist = []struct {
	entry    string // the table's wording
	from, to string
	factor   string // as printed
	exact    bool
}{
	{"inch (in) → meter (m)", "[in_i]", "m", "2.54E-02", true},        // 1959 yard and pound agreement
	{"inch (in) → centimeter (cm)", "[in_i]", "cm", "2.54E+00", true}, // the same, in cm
	{"foot (ft) → meter (m)", "[ft_i]", "m", "3.048E-01", true},       // 12 in
	{"yard (yd) → meter (m)", "[yd_i]", "m", "9.144E-01", true},       // 36 in
	{"mil (0.001 in) → meter (m)", "[mil_i]", "m", "2.54E-05", true},  // 0.001 in
	{"square foot (ft²) → square meter (m²)", "[ft_i]2", "m2", "9.290304E-02", true},
	{"cubic inch (in³) → cubic meter (m³)", "[in_i]3", "m3", "1.6387064E-05", true},
	{"foot per second (ft/s) → meter per second (m/s)", "[ft_i]/s", "m/s", "3.048E-01", true},
	{"pound (avoirdupois) (lb) → kilogram (kg)", "[lb_av]", "kg", "4.5359237E-01", true}, // 1959 agreement
	{"ounce (avoirdupois) (oz) → kilogram (kg)", "[oz_av]", "kg", "2.834952E-02", false},
	{"pound-force (lbf) → newton (N)", "[lbf_av]", "N", "4.448222E+00", false},
	{"kilogram-force (kgf) → newton (N)", "kgf", "N", "9.80665E+00", true}, // standard gravity, 3rd CGPM 1901
	{"pound-force per square inch (psi) → pascal (Pa)", "[psi]", "Pa", "6.894757E+03", false},
	{"pound-force per square inch (psi) → kilopascal (kPa)", "[psi]", "kPa", "6.894757E+00", false},
	{"foot pound-force (ft·lbf) → joule (J)", "[ft_i].[lbf_av]", "J", "1.355818E+00", false},
	{"bar (bar) → pascal (Pa)", "bar", "Pa", "1.0E+05", true},
	{"atmosphere, standard (atm) → pascal (Pa)", "atm", "Pa", "1.01325E+05", true},
	{"minute (min) → second (s)", "min", "s", "6.0E+01", true},
	{"hour (h) → second (s)", "h", "s", "3.6E+03", true},
	{"day (d) → second (s)", "d", "s", "8.64E+04", true},
	{"liter (L) → cubic meter (m³)", "L", "m3", "1.0E-03", true},
	{"gram per cubic centimeter (g/cm³) → kilogram per cubic meter (kg/m³)", "g/cm3", "kg/m3", "1.0E+03", true},
	{"pound per cubic inch (lb/in³) → kilogram per cubic meter (kg/m³)", "[lb_av]/[in_i]3", "kg/m3", "2.767990E+04", false},
	{"pound per cubic foot (lb/ft³) → kilogram per cubic meter (kg/m³)", "[lb_av]/[ft_i]3", "kg/m3", "1.601846E+01", false},
	{"degree Rankine (°R) → kelvin (K): T/K = (T/°R)/1.8", "[degR]", "K", "5.555555555555556E-01", false},
}

func TestNISTFactors(t *testing.T) {
	t.Parallel()
	for _, c := range nist {
		scale, offset, err := Affine(c.from, c.to)
		if err != nil {
			t.Errorf("%s: Affine(%q, %q): %v", c.entry, c.from, c.to, err)
			continue
		}
		if offset != 0 {
			t.Errorf("%s: offset = %v, want 0", c.entry, offset)
		}
		want, err := strconv.ParseFloat(c.factor, 64)
		if err != nil {
			t.Fatal(err)
		}
		if c.exact {
			// Exact factors: bivar computes in rationals and rounds once, so
			// the result is the float64 nearest the printed decimal.
			if scale != want {
				t.Errorf("%s: scale = %.17g, want %s exactly (NIST SP 811 B.8)", c.entry, scale, c.factor)
			}
			continue
		}
		// Rounded factors: the scale rounded to the printed digits is the
		// printed factor.
		mant := strings.Split(strings.ToLower(c.factor), "e")[0]
		digits := len(strings.ReplaceAll(mant, ".", "")) - 1
		if got := fmt.Sprintf("%.*E", digits, scale); normalise(got) != normalise(c.factor) {
			t.Errorf("%s: scale = %.17g (%s), want %s (NIST SP 811 B.8)", c.entry, scale, got, c.factor)
		}
	}
}

// normalise writes an exponent without leading zeros: E+03 → E+3.
func normalise(s string) string {
	mant, exp, _ := strings.Cut(strings.ToUpper(s), "E")
	e, _ := strconv.Atoi(exp)
	return fmt.Sprintf("%sE%+d", mant, e)
}

// TestDerivedExact checks longer values that follow exactly from the
// definitions: 1 lbf = 0.453 592 37 kg × 9.806 65 m/s² = 4.448 221 615 260 5 N
// exactly (a product of two exact definitions; SP 811 B.8 prints it rounded
// to 4.448 222); 1 psi = 1 lbf / (0.0254 m)² = 6 894.757 293 168 361… Pa, a
// non-terminating decimal, checked here to the 13 digits 6.894 757 293 168 kPa.
func TestDerivedExact(t *testing.T) {
	t.Parallel()
	if s, _, _ := Affine("[lbf_av]", "N"); s != 4.4482216152605 {
		t.Errorf("lbf → N = %.17g, want 4.4482216152605 exactly", s)
	}
	if s, _, _ := Affine("[psi]", "kPa"); fmt.Sprintf("%.12f", s) != "6.894757293168" {
		t.Errorf("psi → kPa = %.17g, want 6.894 757 293 168 to 13 digits", s)
	}
	if s, _, _ := Affine("[lb_av]", "[oz_av]"); s != 16 {
		t.Errorf("lb → oz = %v, want 16 (avoirdupois definition)", s)
	}
	if s, _, _ := Affine("[ft_i]", "[in_i]"); s != 12 {
		t.Errorf("ft → in = %v, want 12", s)
	}
}

// TestTemperature checks the temperature formulas NIST SP 811 (2008)
// Appendix B.8 gives in place of factors (from memory, as above), all exact
// by definition:
// T/K = t/°C + 273.15; t/°C = (t/°F − 32)/1.8; T/K = (t/°F + 459.67)/1.8.
func TestTemperature(t *testing.T) {
	t.Parallel()
	cases := []struct {
		from, to string
		v, want  float64
		tol      float64 // absolute; 0 means exact
	}{
		{"Cel", "K", 0, 273.15, 0},
		{"Cel", "K", -273.15, 0, 0},
		{"K", "Cel", 373.15, 100, 1e-13},
		{"[degF]", "Cel", 32, 0, 0},
		{"[degF]", "Cel", 212, 100, 0},
		{"[degF]", "Cel", -40, -40, 1e-13},
		{"Cel", "[degF]", 100, 212, 0},
		{"Cel", "[degF]", -40, -40, 0},
		{"Cel", "[degF]", 37, 98.6, 1e-13},
		{"[degF]", "K", -459.67, 0, 1e-13},
		{"[degF]", "K", 32, 273.15, 1e-13},
		{"[degR]", "K", 491.67, 273.15, 1e-13},
		{"Cel", "Cel", 21.5, 21.5, 0},
	}
	for _, c := range cases {
		s, o, err := Affine(c.from, c.to)
		if err != nil {
			t.Errorf("Affine(%q, %q): %v", c.from, c.to, err)
			continue
		}
		if got := s*c.v + o; math.Abs(got-c.want) > c.tol {
			t.Errorf("%v %s = %.17g %s, want %v (NIST SP 811 B.8 formula)", c.v, c.from, got, c.to, c.want)
		}
	}
	s, o, _ := Affine("Cel", "[degF]")
	if s != 1.8 || o != 32 {
		t.Errorf("Cel → degF = %.17g·t + %.17g, want 1.8·t + 32 exactly", s, o)
	}
}

func TestPrefixesAndProducts(t *testing.T) {
	t.Parallel()
	// UCUM prefixes and the grammar; the factors are SI definitions.
	cases := []struct {
		from, to string
		want     float64
	}{
		{"mm", "m", 1e-3},
		{"um", "mm", 1e-3},
		{"kg", "g", 1e3},
		{"mg", "kg", 1e-6},
		{"MPa", "kPa", 1e3},
		{"kPa", "bar", 1e-2},
		{"kN", "N", 1e3},
		{"mL", "cm3", 1},
		{"daL", "L", 10},
		{"N.m", "J", 1},
		{"kg.m/s2", "N", 1},
		{"kg/(m.s2)", "Pa", 1},
		{"/min", "Hz", 1.0 / 60},
		{"{shot}/h", "/s", 1.0 / 3600},
		{"10*3.g", "kg", 1},
		{"10^-3.m", "mm", 1},
		{"%", "1", 0.01},
		{"[ppm]", "%", 1e-4},
		{"K/h", "K/min", 1.0 / 60},
		{"s-1", "Hz", 1},
		{"m3/h", "L/min", 1000.0 / 60},
	}
	for _, c := range cases {
		s, o, err := Affine(c.from, c.to)
		if err != nil {
			t.Errorf("Affine(%q, %q): %v", c.from, c.to, err)
			continue
		}
		if s != c.want || o != 0 {
			t.Errorf("Affine(%q, %q) = %.17g, %v; want %.17g, 0", c.from, c.to, s, o, c.want)
		}
	}
}

// TestErrors pins whole messages: they are the interface.
func TestErrors(t *testing.T) {
	t.Parallel()
	cases := []struct{ from, to, want string }{
		{"degC", "K", `unknown unit "degC" — the UCUM code is "Cel"`},
		{"psi", "kPa", `unknown unit "psi" — the UCUM code is "[psi]"`},
		{"mmm", "m", `unknown unit "mmm" — did you mean "mm"?`},
		{"mm/hr", "m/s", `unknown unit "mm/hr" ("hr" is not a unit atom bivar knows) — did you mean "mm/h"?`},
		{"m/s", "furlong/s", `unknown unit "furlong/s" ("furlong" is not a unit atom bivar knows); write a UCUM code such as Cel, [degF], mm, [in_i], kg, kPa, [psi], s, h, %`},
		{"mm", "kg", `cannot convert "mm" (length) to "kg" (mass): they measure different quantities`},
		{"[psi]", "N", `cannot convert "[psi]" (pressure or stress) to "N" (force): they measure different quantities`},
		{"m2.s", "K", `cannot convert "m2.s" (dimension m2.s1) to "K" (temperature): they measure different quantities`},
		{"Cel/h", "K/h", `unit "Cel/h": Cel and [degF] are points on a scale and cannot be multiplied, divided, raised to a power or prefixed; use K for differences and rates (K/h)`},
		{"mCel", "K", `unit "mCel": Cel and [degF] are points on a scale and cannot be multiplied, divided, raised to a power or prefixed; use K for differences and rates (K/h)`},
		{"kmin", "s", `unit "kmin": min (minute) takes no prefix`},
		{"m(", "m", `unit "m(": unexpected "(" at character 2`},
		{"(m", "m", `unit "(m": a ( is not closed`},
		{"m.", "m", `unit "m.": a unit is missing at the end`},
		{"m99", "m", `unit "m99": exponent 99 is out of range (at most 24)`},
		{"", "m", `no unit code given`},
		{"((km24)24)24", "m", `unit "((km24)24)24": exponents multiply to more than 24`},
		{"((10*24)24)24", "1", `unit "((10*24)24)24": the unit's factor is too large`},
		{"(10*24)24", "1", `converting "(10*24)24" to "1" needs a factor outside the range of float64`},
	}
	for _, c := range cases {
		_, _, err := Affine(c.from, c.to)
		if err == nil || err.Error() != c.want {
			t.Errorf("Affine(%q, %q) error\ngot  %v\nwant %s", c.from, c.to, err, c.want)
		}
	}
	if err := Check("[in_i]"); err != nil {
		t.Errorf("Check([in_i]) = %v", err)
	}
	if d, err := Dimension("g/cm3"); err != nil || d != "density" {
		t.Errorf("Dimension(g/cm3) = %q, %v; want density", d, err)
	}
}

// TestRoundTrip: converting there and back is the identity, and converting
// through a third unit equals converting directly (common practice: the
// group property of affine maps).
func TestRoundTrip(t *testing.T) {
	t.Parallel()
	groups := [][]string{
		{"Cel", "[degF]", "K", "[degR]"},
		{"m", "mm", "um", "[in_i]", "[ft_i]", "[mil_i]", "cm"},
		{"kg", "g", "mg", "[lb_av]", "[oz_av]", "t"},
		{"Pa", "kPa", "MPa", "bar", "[psi]", "atm"},
		{"s", "min", "h", "d", "ms"},
		{"N", "kN", "[lbf_av]", "kgf"},
		{"%", "1", "[ppm]"},
		{"mL", "L", "m3", "[in_i]3"},
		{"g/cm3", "kg/m3", "[lb_av]/[in_i]3"},
	}
	rng := rand.New(rand.NewPCG(1, 2))
	for _, g := range groups {
		for _, a := range g {
			for _, b := range g {
				s1, o1, err1 := Affine(a, b)
				s2, o2, err2 := Affine(b, a)
				if err1 != nil || err2 != nil {
					t.Fatalf("Affine(%q, %q): %v %v", a, b, err1, err2)
				}
				for _, c := range g {
					s3, o3, _ := Affine(b, c)
					s4, o4, _ := Affine(a, c)
					for range 5 {
						v := (rng.Float64() - 0.5) * 1000
						back := s2*(s1*v+o1) + o2
						via := s3*(s1*v+o1) + o3
						direct := s4*v + o4
						if !close(back, v) || !close(via, direct) {
							t.Errorf("%v %s: via %s back = %.17g; via %s to %s = %.17g, direct %.17g", v, a, b, back, b, c, via, direct)
						}
					}
				}
			}
		}
	}
}

func close(a, b float64) bool {
	return math.Abs(a-b) <= 1e-12*math.Max(1, math.Max(math.Abs(a), math.Abs(b)))
}

func FuzzUnits(f *testing.F) {
	for _, s := range []string{"Cel", "[degF]", "kg/(m.s2)", "10*3.g", "{shot}/h", "m(", "mm99", "((((m))))", "[in_i]3"} {
		f.Add(s, "m")
	}
	f.Fuzz(func(t *testing.T, a, b string) {
		s, o, err := Affine(a, b)
		if err == nil && (math.IsNaN(s) || math.IsNaN(o) || math.IsInf(s, 0) || math.IsInf(o, 0) || s == 0) {
			t.Errorf("Affine(%q, %q) = %v, %v", a, b, s, o)
		}
	})
}
