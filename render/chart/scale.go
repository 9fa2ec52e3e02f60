package chart

import (
	"math"
	"strconv"
	"strings"
)

// niceNum returns a "nice" number close to x: 1, 2 or 5 times a power of
// ten, rounded when round is set and otherwise the next one up.
// Heckbert, P. S. (1990), "Nice numbers for graph labels", Graphics Gems,
// Academic Press, pp. 61-63.
func niceNum(x float64, round bool) float64 {
	exp := math.Floor(math.Log10(x))
	f := x / math.Pow(10, exp)
	var nf float64
	if round {
		switch {
		case f < 1.5:
			nf = 1
		case f < 3:
			nf = 2
		case f < 7:
			nf = 5
		default:
			nf = 10
		}
	} else {
		switch {
		case f <= 1:
			nf = 1
		case f <= 2:
			nf = 2
		case f <= 5:
			nf = 5
		default:
			nf = 10
		}
	}
	return nf * math.Pow(10, exp)
}

// Axis is a linear scale from a data interval to a pixel interval, with its
// tick values and labels.
type Axis struct {
	Lo, Hi float64 // data range shown
	Step   float64 // tick step
	Ticks  []float64
	Labels []string
}

// extent is the range of finite values seen so far.
type extent struct {
	lo, hi float64
	n      int
}

func (e *extent) add(vs ...float64) {
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			continue
		}
		if e.n == 0 || v < e.lo {
			e.lo = v
		}
		if e.n == 0 || v > e.hi {
			e.hi = v
		}
		e.n++
	}
}

// newAxis makes the axis for data in [lo, hi] with about target ticks.
// The range is padded by 4% on each side; ticks are multiples of a nice
// step inside it. A constant (or nearly constant) range is widened around
// its value so the labels still differ; no finite data gives [0, 1].
func newAxis(e extent, target int) Axis {
	lo, hi := e.lo, e.hi
	if e.n == 0 {
		lo, hi = 0, 1
	}
	span := hi - lo
	mag := math.Max(math.Abs(lo), math.Abs(hi))
	if span <= mag*1e-9 || span == 0 {
		// Constant data: centre the value in a range of ±5% of it (±0.5 at zero).
		mid := (lo + hi) / 2
		half := math.Abs(mid) * 0.05
		if half == 0 {
			half = 0.5
		}
		lo, hi = mid-half, mid+half
	} else {
		lo -= span * 0.04
		hi += span * 0.04
	}
	step := tickStep(lo, hi, target)
	k0, k1 := math.Ceil(lo/step-1e-9), math.Floor(hi/step+1e-9)
	a := Axis{Lo: lo, Hi: hi, Step: step}
	for k := k0; k <= k1; k++ {
		v := k * step
		if math.Abs(v) < step*1e-9 {
			v = 0
		}
		a.Ticks = append(a.Ticks, v)
	}
	a.Labels = tickLabels(a.Ticks, step)
	// Negative ticks keep the hyphen-minus, as every number of the reports
	// (render/format.go states the rule).
	return a
}

// tickLabels formats tick values with just enough decimals for the step,
// or as mantissa and power of ten for very large or very small values.
func tickLabels(ticks []float64, step float64) []string {
	maxAbs := 0.0
	for _, t := range ticks {
		maxAbs = math.Max(maxAbs, math.Abs(t))
	}
	out := make([]string, len(ticks))
	if maxAbs >= 1e6 || (maxAbs > 0 && maxAbs < 1e-3) {
		for i, t := range ticks {
			out[i] = sci(t, step)
		}
		return out
	}
	dec := max(0, int(-math.Floor(math.Log10(step)+1e-9)))
	for i, t := range ticks {
		out[i] = trimNegZero(strconv.FormatFloat(t, 'f', dec, 64))
	}
	return out
}

// sci writes v as "1.5e6" with the digits the step needs.
func sci(v, step float64) string {
	if v == 0 {
		return "0"
	}
	exp := math.Floor(math.Log10(math.Abs(v)))
	sexp := math.Floor(math.Log10(step))
	digits := max(0, int(exp-sexp))
	m := v / math.Pow(10, exp)
	return trimNegZero(strconv.FormatFloat(m, 'f', digits, 64)) + "e" + strconv.Itoa(int(exp))
}

func trimNegZero(s string) string {
	if strings.HasPrefix(s, "-") && strings.Trim(s, "-0.") == "" {
		return s[1:]
	}
	return s
}

// tickStep picks, among the steps 1, 2 and 5 times a power of ten near
// (hi−lo)/target, the one whose tick count inside [lo, hi] is closest to
// target (ties: the larger step), never giving more than 12 ticks.
func tickStep(lo, hi float64, target int) float64 {
	base := niceNum((hi-lo)/float64(target), true)
	best, bestD := 0.0, math.Inf(1)
	for _, m := range []float64{0.2, 0.4, 0.5, 1, 2, 2.5, 5} {
		step := niceNum(base*m, true)
		k := math.Floor(hi/step+1e-9) - math.Ceil(lo/step-1e-9) + 1
		if k > 12 || k < 2 {
			continue
		}
		if d := math.Abs(k - float64(target)); d < bestD || (d == bestD && step > best) {
			best, bestD = step, d
		}
	}
	if best == 0 {
		best = niceNum(hi-lo, true)
	}
	return best
}

// pos maps a data value to pixels between p0 (at Lo) and p1 (at Hi).
func (a Axis) pos(v, p0, p1 float64) float64 {
	return p0 + (v-a.Lo)/(a.Hi-a.Lo)*(p1-p0)
}

// coord writes a pixel coordinate with two decimals, no trailing zeros.
func coord(v float64) string {
	v = math.Round(v*100) / 100
	if v == 0 {
		v = 0 // no "-0"
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}
