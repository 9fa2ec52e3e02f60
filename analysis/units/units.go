// Package units knows the units of measure a plant or lab records data in,
// spelt as UCUM codes (The Unified Code for Units of Measure, Regenstrief
// Institute: "Cel", "[degF]", "mm", "[in_i]", "kPa", "[psi]", "g/cm3"), and
// converts between them.
//
// A code is parsed with UCUM's grammar, reduced to what measurement data
// need: atoms (m, g, s, K, Cel, [degF], [in_i], [lb_av], Pa, bar, [psi], N,
// [lbf_av], L, min, h, %, 1, …), the metric prefixes on metric atoms (k, M,
// c, m, u, …), integer exponents ("cm3", "s-1"), products with "." and
// quotients with "/" ("g/cm3", "N.m", "/min"), parentheses, integer factors
// ("10*3") and annotations in braces, which count as 1 ("{shot}/h").
//
// Every unit is reduced to a scale (and, for Celsius and Fahrenheit, an
// offset) against the coherent SI unit of its dimension, a vector of
// exponents of length, mass, time and temperature. Conversion factors are
// the exact definitions (1 [in_i] = 0.0254 m, 1 [lb_av] = 0.453 592 37 kg,
// standard gravity 9.806 65 m/s², 0 Cel = 273.15 K, 1 [degF] = 5/9 K with
// 0 [degF] = 459.67·5/9 K), from which the others are derived by arithmetic,
// so psi is lbf/in² and not a rounded decimal.
package units

import (
	"fmt"
	"math"
	"math/big"
	"slices"
	"strconv"
	"strings"

	"bivar/analysis/internal/suggest"
)

// dim holds the exponents of length, mass, time and temperature.
type dim [4]int

func (d dim) add(e dim, k int) dim {
	for i := range d {
		d[i] += k * e[i]
	}
	return d
}

var (
	none        = dim{}
	length      = dim{1, 0, 0, 0}
	mass        = dim{0, 1, 0, 0}
	duration    = dim{0, 0, 1, 0}
	temperature = dim{0, 0, 0, 1}
	force       = dim{1, 1, -2, 0}
	pressure    = dim{-1, 1, -2, 0}
	energy      = dim{2, 1, -2, 0}
	power       = dim{2, 1, -3, 0}
	volume      = dim{3, 0, 0, 0}
)

// dimNames name the dimensions messages mention most.
var dimNames = map[dim]string{
	none:           "a pure number",
	length:         "length",
	mass:           "mass",
	duration:       "time",
	temperature:    "temperature",
	force:          "force",
	pressure:       "pressure or stress",
	energy:         "energy",
	power:          "power",
	volume:         "volume",
	{2, 0, 0, 0}:   "area",
	{-3, 1, 0, 0}:  "density",
	{1, 0, -1, 0}:  "speed",
	{1, 0, -2, 0}:  "acceleration",
	{0, 0, -1, 0}:  "frequency or rate",
	{0, 0, -1, 1}:  "rate of temperature change",
	{3, 0, -1, 0}:  "volume flow",
	{0, 1, -1, 0}:  "mass flow",
	{-1, 1, -1, 0}: "dynamic viscosity",
	{0, 0, 0, -1}:  "reciprocal temperature",
}

func (d dim) String() string {
	if n, ok := dimNames[d]; ok {
		return n
	}
	var parts []string
	for i, base := range []string{"m", "kg", "s", "K"} {
		if d[i] != 0 {
			parts = append(parts, base+strconv.Itoa(d[i]))
		}
	}
	return "dimension " + strings.Join(parts, ".")
}

// atom is one UCUM unit atom: a value v in it is scale·(v + zero) in the
// coherent SI unit of its dimension (zero is nonzero only for Cel and
// [degF]). Factors are exact rationals, so conversions are exact until the
// last rounding to float64.
type atom struct {
	name    string
	scale   *big.Rat
	zero    *big.Rat // nil but for Cel and [degF]
	dim     dim
	metric  bool // takes a prefix
	special bool // an interval scale: may not be combined with others
}

// r parses an exact decimal or fraction ("0.0254", "5/9").
func r(s string) *big.Rat {
	q, ok := new(big.Rat).SetString(s)
	if !ok {
		panic("units: bad constant " + s)
	}
	return q
}

func mul(a ...*big.Rat) *big.Rat {
	out := big.NewRat(1, 1)
	for _, x := range a {
		out.Mul(out, x)
	}
	return out
}

func quo(a, b *big.Rat) *big.Rat { return new(big.Rat).Quo(a, b) }

// The exact definitions the other factors are derived from.
var (
	inch       = r("0.0254")     // m; international yard and pound agreement (1959)
	pound      = r("0.45359237") // kg; ibid.
	gravity    = r("9.80665")    // m/s²; standard acceleration of gravity, 3rd CGPM (1901)
	zeroCelius = r("273.15")     // K at 0 °C (ITS-90 and the SI definition of the degree Celsius)
	perFahr    = r("5/9")        // K per °F (and per °R)
	zeroFahr   = r("459.67")     // °F from absolute zero to 0 °F
	lbf        = mul(pound, gravity)
)

var atoms = map[string]atom{
	// SI base and coherent derived units, and the metric units UCUM lists.
	"m":   {name: "metre", scale: r("1"), dim: length, metric: true},
	"g":   {name: "gram", scale: r("0.001"), dim: mass, metric: true},
	"s":   {name: "second", scale: r("1"), dim: duration, metric: true},
	"K":   {name: "kelvin", scale: r("1"), dim: temperature, metric: true},
	"N":   {name: "newton", scale: r("1"), dim: force, metric: true},
	"Pa":  {name: "pascal", scale: r("1"), dim: pressure, metric: true},
	"J":   {name: "joule", scale: r("1"), dim: energy, metric: true},
	"W":   {name: "watt", scale: r("1"), dim: power, metric: true},
	"Hz":  {name: "hertz", scale: r("1"), dim: dim{0, 0, -1, 0}, metric: true},
	"L":   {name: "litre", scale: r("0.001"), dim: volume, metric: true},
	"l":   {name: "litre", scale: r("0.001"), dim: volume, metric: true},
	"t":   {name: "tonne", scale: r("1000"), dim: mass, metric: true},
	"bar": {name: "bar", scale: r("100000"), dim: pressure, metric: true},
	"gf":  {name: "gram-force", scale: mul(r("0.001"), gravity), dim: force, metric: true},
	"Cel": {name: "degree Celsius", scale: r("1"), zero: zeroCelius, dim: temperature, special: true},

	// Not metric: no prefixes.
	"min":      {name: "minute", scale: r("60"), dim: duration},
	"h":        {name: "hour", scale: r("3600"), dim: duration},
	"d":        {name: "day", scale: r("86400"), dim: duration},
	"atm":      {name: "standard atmosphere", scale: r("101325"), dim: pressure}, // 10th CGPM (1954)
	"[g]":      {name: "standard acceleration of gravity", scale: gravity, dim: dim{1, 0, -2, 0}},
	"[in_i]":   {name: "inch", scale: inch, dim: length},
	"[ft_i]":   {name: "foot", scale: mul(r("12"), inch), dim: length},
	"[yd_i]":   {name: "yard", scale: mul(r("36"), inch), dim: length},
	"[mil_i]":  {name: "mil (thousandth of an inch)", scale: mul(r("0.001"), inch), dim: length},
	"[lb_av]":  {name: "pound", scale: pound, dim: mass},
	"[oz_av]":  {name: "ounce", scale: quo(pound, r("16")), dim: mass},
	"[lbf_av]": {name: "pound-force", scale: lbf, dim: force},
	"[psi]":    {name: "pound-force per square inch", scale: quo(lbf, mul(inch, inch)), dim: pressure},
	"[degF]":   {name: "degree Fahrenheit", scale: perFahr, zero: zeroFahr, dim: temperature, special: true},
	"[degR]":   {name: "degree Rankine", scale: perFahr, dim: temperature},
	"%":        {name: "percent", scale: r("0.01"), dim: none},
	"[ppm]":    {name: "part per million", scale: r("1e-6"), dim: none},
	"[ppb]":    {name: "part per billion", scale: r("1e-9"), dim: none},
}

// prefixes are UCUM's metric prefixes.
var prefixes = map[string]int{ // power of ten
	"Y": 24, "Z": 21, "E": 18, "P": 15, "T": 12, "G": 9, "M": 6, "k": 3,
	"h": 2, "da": 1, "d": -1, "c": -2, "m": -3, "u": -6, "n": -9, "p": -12,
	"f": -15, "a": -18, "z": -21, "y": -24,
}

func pow10(n int) *big.Rat {
	p := new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(max(n, -n))), nil)
	if n < 0 {
		return new(big.Rat).SetFrac(big.NewInt(1), p)
	}
	return new(big.Rat).SetInt(p)
}

// aliases are common non-UCUM spellings, for messages only: bivar does not
// accept them, it names the code to write instead.
var aliases = map[string]string{
	"degC": "Cel", "°C": "Cel", "deg C": "Cel", "C": "Cel", "celsius": "Cel", "Celsius": "Cel",
	"degF": "[degF]", "°F": "[degF]", "deg F": "[degF]", "F": "[degF]", "fahrenheit": "[degF]", "Fahrenheit": "[degF]",
	"degK": "K", "°K": "K", "degR": "[degR]", "°R": "[degR]",
	"in": "[in_i]", "inch": "[in_i]", "inches": "[in_i]", "\"": "[in_i]",
	"ft": "[ft_i]", "foot": "[ft_i]", "feet": "[ft_i]", "yd": "[yd_i]", "mil": "[mil_i]", "thou": "[mil_i]",
	"lb": "[lb_av]", "lbs": "[lb_av]", "pound": "[lb_av]", "oz": "[oz_av]",
	"lbf": "[lbf_av]", "psi": "[psi]", "PSI": "[psi]", "ksi": "k[psi]",
	"sec": "s", "secs": "s", "hr": "h", "hrs": "h", "hour": "h", "hours": "h", "mins": "min", "minute": "min", "minutes": "min",
	"µm": "um", "μm": "um", "micron": "um", "microns": "um", "µs": "us", "μs": "us",
	"ml": "mL", "ltr": "L", "percent": "%", "pct": "%", "ppm": "[ppm]", "ppb": "[ppb]",
	"g/cc": "g/cm3", "g/ml": "g/mL", "rpm": "/min", "1/min": "/min",
}

// unit is a parsed code: a value v in it is scale·(v + zero) in SI.
type unit struct {
	scale   *big.Rat
	zero    *big.Rat // nil unless special
	dim     dim
	special bool
}

func one() unit { return unit{scale: big.NewRat(1, 1)} }

// syntaxError is a code that is not well formed; atomError one that names
// an atom bivar does not know (only those get a "did you mean").
type syntaxError struct{ msg string }
type atomError struct{ msg, atom string }

func (e syntaxError) Error() string { return e.msg }
func (e atomError) Error() string   { return e.msg }

func syntax(format string, args ...any) error { return syntaxError{fmt.Sprintf(format, args...)} }

const errSpecial = "Cel and [degF] are points on a scale and cannot be multiplied, divided, raised to a power or prefixed; use K for differences and rates (K/h)"

// maxExponent bounds exponents and factors: no measurement needs more.
const maxExponent = 24

// parse reads one code.
func parse(code string) (unit, error) {
	if code == "" {
		return unit{}, fmt.Errorf("no unit code given")
	}
	if len(code) > 200 {
		return unit{}, fmt.Errorf("unit code of %d characters is too long", len(code))
	}
	p := &parser{s: code}
	u, err := p.term()
	if err == nil && p.i < len(p.s) {
		err = syntax("unexpected %q at character %d", p.s[p.i:p.i+1], p.i+1)
	}
	if err != nil {
		return unit{}, explain(code, err)
	}
	return u, nil
}

func explain(code string, err error) error {
	if to, ok := aliases[code]; ok {
		return fmt.Errorf("unknown unit %q — the UCUM code is %q", code, to)
	}
	if ae, ok := err.(atomError); ok {
		near, ok := aliases[ae.atom]
		if !ok {
			near = suggest.Nearest(ae.atom, Known())
		}
		why := ""
		if ae.atom != code {
			why = " (" + ae.msg + ")"
			if near != "" {
				near = strings.Replace(code, ae.atom, near, 1)
			}
		}
		if near != "" {
			return fmt.Errorf("unknown unit %q%s — did you mean %q?", code, why, near)
		}
		return fmt.Errorf("unknown unit %q%s; write a UCUM code such as Cel, [degF], mm, [in_i], kg, kPa, [psi], s, h, %%", code, why)
	}
	return fmt.Errorf("unit %q: %v", code, err)
}

type parser struct {
	s     string
	i     int
	depth int
}

// term := ['/'] component {('.' | '/') component}
func (p *parser) term() (unit, error) {
	u := one()
	n := 0
	op := byte('.')
	if p.i < len(p.s) && p.s[p.i] == '/' {
		op = '/'
		p.i++
	}
	for {
		c, err := p.component()
		if err != nil {
			return unit{}, err
		}
		n++
		more := p.i < len(p.s) && (p.s[p.i] == '.' || p.s[p.i] == '/')
		if c.special && (n > 1 || op == '/' || more) {
			return unit{}, syntax(errSpecial)
		}
		if op == '/' {
			u.scale.Quo(u.scale, c.scale)
			u.dim = u.dim.add(c.dim, -1)
		} else {
			u.scale.Mul(u.scale, c.scale)
			u.dim = u.dim.add(c.dim, 1)
		}
		u.zero, u.special = c.zero, c.special
		if !more {
			return u, nil
		}
		op = p.s[p.i]
		p.i++
	}
}

// component := '(' term ')' [exponent] | annotation | factor | symbol [exponent] [annotation]
func (p *parser) component() (unit, error) {
	if p.i >= len(p.s) {
		return unit{}, syntax("a unit is missing at the end")
	}
	switch c := p.s[p.i]; {
	case c == '(':
		if p.depth >= 8 {
			return unit{}, syntax("parentheses nested too deeply")
		}
		p.i++
		p.depth++
		u, err := p.term()
		p.depth--
		if err != nil {
			return unit{}, err
		}
		if p.i >= len(p.s) || p.s[p.i] != ')' {
			return unit{}, syntax("a ( is not closed")
		}
		p.i++
		return p.power(u)
	case c == '{':
		if err := p.annotation(); err != nil {
			return unit{}, err
		}
		return one(), nil
	case c >= '0' && c <= '9':
		return p.factor()
	}
	start := p.i
	for p.i < len(p.s) {
		c := p.s[p.i]
		if c == '[' {
			end := strings.IndexByte(p.s[p.i:], ']')
			if end < 0 {
				return unit{}, syntax("a [ is not closed")
			}
			p.i += end + 1
			continue
		}
		if c == '.' || c == '/' || c == '(' || c == ')' || c == '{' || c == '}' || c == '+' || c == '-' || c >= '0' && c <= '9' {
			break
		}
		p.i++
	}
	u, err := lookup(p.s[start:p.i])
	if err != nil {
		return unit{}, err
	}
	if u, err = p.power(u); err != nil {
		return unit{}, err
	}
	if p.i < len(p.s) && p.s[p.i] == '{' {
		if err := p.annotation(); err != nil {
			return unit{}, err
		}
	}
	return u, nil
}

func (p *parser) annotation() error {
	end := strings.IndexByte(p.s[p.i:], '}')
	if end < 0 {
		return syntax("a { is not closed")
	}
	p.i += end + 1
	return nil
}

// factor reads a positive integer, or 10*n (also 10^n), as a pure number.
func (p *parser) factor() (unit, error) {
	start := p.i
	for p.i < len(p.s) && p.s[p.i] >= '0' && p.s[p.i] <= '9' {
		p.i++
	}
	if p.i-start > 9 {
		return unit{}, syntax("factor %q is too long", p.s[start:p.i])
	}
	v, _ := new(big.Int).SetString(p.s[start:p.i], 10)
	if v.Sign() == 0 {
		return unit{}, syntax("a factor of 0 is not a unit")
	}
	u := unit{scale: new(big.Rat).SetInt(v)}
	if p.i < len(p.s) && (p.s[p.i] == '*' || p.s[p.i] == '^') {
		p.i++
		e, ok, err := p.exponent()
		if err != nil {
			return unit{}, err
		}
		if !ok {
			return unit{}, syntax("an exponent must follow %q", p.s[start:p.i])
		}
		if u.scale, err = ratPow(u.scale, e); err != nil {
			return unit{}, err
		}
	}
	return u, nil
}

// exponent reads an optional sign and digits.
func (p *parser) exponent() (e int, ok bool, err error) {
	start := p.i
	if p.i < len(p.s) && (p.s[p.i] == '+' || p.s[p.i] == '-') {
		p.i++
	}
	digits := p.i
	for p.i < len(p.s) && p.s[p.i] >= '0' && p.s[p.i] <= '9' {
		p.i++
	}
	if p.i == digits {
		p.i = start
		return 0, false, nil
	}
	e, convErr := strconv.Atoi(p.s[start:p.i])
	if convErr != nil || e > maxExponent || e < -maxExponent {
		return 0, false, syntax("exponent %s is out of range (at most %d)", p.s[start:p.i], maxExponent)
	}
	return e, true, nil
}

// maxBits bounds the size of a unit's exact factor, so that a code such as
// "((km24)24)24" fails at once instead of computing 10^41472.
const maxBits = 4096

func ratPow(x *big.Rat, e int) (*big.Rat, error) {
	if (x.Num().BitLen()+x.Denom().BitLen())*max(e, -e) > maxBits {
		return nil, syntax("the unit's factor is too large")
	}
	out := big.NewRat(1, 1)
	for range max(e, -e) {
		out.Mul(out, x)
	}
	if e < 0 {
		out.Inv(out)
	}
	return out, nil
}

func (p *parser) power(u unit) (unit, error) {
	e, ok, err := p.exponent()
	if err != nil || !ok {
		return u, err
	}
	if u.special {
		return unit{}, syntax(errSpecial)
	}
	if e == 0 {
		return unit{}, syntax("an exponent of 0 is not allowed")
	}
	d := none.add(u.dim, e)
	for _, k := range d {
		if k > maxExponent || k < -maxExponent {
			return unit{}, syntax("exponents multiply to more than %d", maxExponent)
		}
	}
	scale, err := ratPow(u.scale, e)
	if err != nil {
		return unit{}, err
	}
	return unit{scale: scale, dim: d}, nil
}

// lookup resolves an atom, with a metric prefix where the atom allows one.
// An exact atom wins over a prefixed reading ("min" is minutes, "h" hours).
func lookup(sym string) (unit, error) {
	if sym == "" {
		return unit{}, syntax("a unit is missing")
	}
	if a, ok := atoms[sym]; ok {
		return unit{scale: new(big.Rat).Set(a.scale), zero: a.zero, dim: a.dim, special: a.special}, nil
	}
	for _, n := range []int{2, 1} { // "da" before "d"
		if len(sym) <= n {
			continue
		}
		e, ok := prefixes[sym[:n]]
		a, ok2 := atoms[sym[n:]]
		if ok && ok2 {
			if a.special {
				return unit{}, syntax(errSpecial)
			}
			if !a.metric {
				return unit{}, syntax("%s (%s) takes no prefix", sym[n:], a.name)
			}
			return unit{scale: mul(pow10(e), a.scale), dim: a.dim}, nil
		}
	}
	return unit{}, atomError{fmt.Sprintf("%q is not a unit atom bivar knows", sym), sym}
}

// Affine returns the conversion from unit from to unit to, both UCUM codes:
// a value v in from is scale·v + offset in to. It fails for an unknown code
// (naming the nearest known one) and for units of different dimensions.
func Affine(from, to string) (scale, offset float64, err error) {
	a, err := parse(from)
	if err != nil {
		return 0, 0, err
	}
	b, err := parse(to)
	if err != nil {
		return 0, 0, err
	}
	if a.dim != b.dim {
		return 0, 0, fmt.Errorf("cannot convert %q (%s) to %q (%s): they measure different quantities", from, a.dim, to, b.dim)
	}
	// SI value a.scale·(v + a.zero) = b.scale·(w + b.zero), solved for w in
	// exact rationals, then rounded once to float64.
	s := quo(a.scale, b.scale)
	off := new(big.Rat)
	if a.zero != nil {
		off.Add(off, mul(s, a.zero))
	}
	if b.zero != nil {
		off.Sub(off, b.zero)
	}
	scale, _ = s.Float64()
	offset, _ = off.Float64()
	if scale == 0 || math.IsInf(scale, 0) || math.IsInf(offset, 0) {
		return 0, 0, fmt.Errorf("converting %q to %q needs a factor outside the range of float64", from, to)
	}
	return scale, offset, nil
}

// Check reports whether code is a unit code bivar can convert, with the
// same messages as Affine.
func Check(code string) error {
	_, err := parse(code)
	return err
}

// Dimension names what code measures ("length", "pressure or stress", …).
func Dimension(code string) (string, error) {
	u, err := parse(code)
	if err != nil {
		return "", err
	}
	return u.dim.String(), nil
}

// Known returns the unit atoms and some common prefixed codes, sorted, for
// help texts and suggestions.
func Known() []string {
	out := []string{"1", "mm", "cm", "um", "km", "kg", "mg", "kPa", "MPa", "GPa", "kN", "mL", "ms", "g/cm3", "kg/m3", "m/s", "/min", "K/h"}
	for a := range atoms {
		out = append(out, a)
	}
	slices.Sort(out)
	return slices.Compact(out)
}
