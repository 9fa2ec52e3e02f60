package chart

// This file labels an axis whose data are on a transformed scale (a
// study's x_scale or y_scale): the points are placed by their transformed
// values, and the ticks sit at round values in the recorded units.

import (
	"math"
	"strconv"
	"strings"
)

// scaleNames are the words an axis title adds for a scale.
var scaleNames = map[string]string{"log": "natural-log scale", "log10": "log₁₀ scale", "sqrt": "square-root scale"}

// scaledAxis relabels a, an axis over transformed values, with ticks at
// round values of the recorded units, placed at their transformed values:
// on a log scale the values 1, 2 and 5 (or 1 and 3, or 1 alone) times
// powers of ten, in whichever set lands closest to target ticks (the
// usual labelling of a logarithmic axis, as on log-ruled graph paper),
// falling back to evenly stepped values when the range spans less than a
// factor of about three; on a square-root scale the values at a's own
// evenly spaced ticks, rounded to two significant digits. An unknown
// scale leaves a as it is.
func scaledAxis(a Axis, scale string, target int) Axis {
	var fwd, inv func(float64) float64
	switch scale {
	case "log":
		fwd, inv = math.Log, math.Exp
	case "log10":
		fwd, inv = math.Log10, func(v float64) float64 { return math.Pow(10, v) }
	case "sqrt":
		fwd, inv = math.Sqrt, func(v float64) float64 { return v * v }
	default:
		return a
	}
	var vals []float64
	if scale == "sqrt" {
		for _, t := range a.Ticks {
			if t < 0 {
				continue
			}
			v := round2(inv(t))
			if p := fwd(v); p >= a.Lo && p <= a.Hi && (len(vals) == 0 || v > vals[len(vals)-1]) {
				vals = append(vals, v)
			}
		}
	} else {
		vals = logTicks(inv(a.Lo), inv(a.Hi), target)
	}
	if len(vals) < 2 {
		return a // too narrow a range for round values: the transformed values' own ticks
	}
	out := Axis{Lo: a.Lo, Hi: a.Hi, Step: a.Step}
	for _, v := range vals {
		out.Ticks = append(out.Ticks, fwd(v))
		out.Labels = append(out.Labels, recordedLabel(v)) // ASCII minus, as every axis
	}
	return out
}

// logTicks picks round values in [lo, hi] (lo > 0) for a log axis: the
// mantissa sets {1}, {1, 3}, {1, 2, 5}, {1, 2, 3, 5, 7}, every power of
// ten, or {1} every second, fifth or tenth power, whichever gives a count
// closest to target (ties: the sparser set) and at least 2; with none,
// evenly stepped values (tickStep) inside the range.
func logTicks(lo, hi float64, target int) []float64 {
	if !(lo > 0) || !(hi > lo) || math.IsInf(hi, 0) {
		return nil
	}
	sets := []struct {
		mant   []int
		stride int
	}{
		{[]int{1}, 10}, {[]int{1}, 5}, {[]int{1}, 2}, {[]int{1}, 1},
		{[]int{1, 3}, 1}, {[]int{1, 2, 5}, 1}, {[]int{1, 2, 3, 5, 7}, 1},
	}
	var best []float64
	bestD := math.Inf(1)
	k0, k1 := int(math.Floor(math.Log10(lo)))-1, int(math.Ceil(math.Log10(hi)))+1
	for _, s := range sets {
		var vals []float64
		for k := k0; k <= k1; k++ {
			if ((k%s.stride)+s.stride)%s.stride != 0 {
				continue
			}
			for _, m := range s.mant {
				v, _ := strconv.ParseFloat(strconv.Itoa(m)+"e"+strconv.Itoa(k), 64)
				if v >= lo && v <= hi {
					vals = append(vals, v)
				}
			}
		}
		if len(vals) < 2 || len(vals) > 12 {
			continue
		}
		if d := math.Abs(float64(len(vals) - target)); d < bestD {
			best, bestD = vals, d
		}
	}
	if len(best) >= 3 || best != nil && hi/lo > 3 {
		return best
	}
	// A narrow range: evenly stepped values, as on a linear axis.
	step := tickStep(lo, hi, target)
	var vals []float64
	for k := math.Ceil(lo/step - 1e-9); k <= math.Floor(hi/step+1e-9); k++ {
		v, _ := strconv.ParseFloat(strconv.FormatFloat(k*step, 'g', 12, 64), 64)
		if v > 0 {
			vals = append(vals, v)
		}
	}
	return vals
}

// round2 rounds v to two significant digits (0 stays 0).
func round2(v float64) float64 {
	if v == 0 {
		return 0
	}
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 2, 64), 64)
	return r
}

// recordedLabel writes a tick value in the recorded units: plainly
// between 0.001 and a million, else as mantissa and power of ten ("2e-5",
// "1e6"), as the linear axes do.
func recordedLabel(v float64) string {
	a := math.Abs(v)
	if a == 0 || a >= 1e-3 && a < 1e6 {
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	t := strconv.FormatFloat(v, 'e', -1, 64) // "2e-05", "1.5e+06"
	m, e, _ := strings.Cut(t, "e")
	n, _ := strconv.Atoi(e)
	return m + "e" + strconv.Itoa(n)
}
