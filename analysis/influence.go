package analysis

// This file holds the influence summary and the sensitivity figures.

import (
	"cmp"
	"math"
	"slices"

	"bivar/analysis/findings"
	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// influence fills the influence summary (flagged points only, largest
// Cook's D first, then data order) and the sensitivity figures. "Without
// the flagged rows" leaves out the rows findings.Suspect names (outliers,
// influential rows, rows of sole support) and NFlagged counts them: a row
// that is only far out in x but on the line is good data, and leaving it
// out would only shorten the observed range. WithoutEach has one row per
// flagged point, from the O(n) leave-one-out figures of stats.Influence.
func influence(x, y []float64, rows []string, inf stats.InfluenceResult, flags [][]string, conf float64,
	res *report.Resistant, all stats.Correlation, line stats.LineFit) (*report.Influence, *report.Sensitivity) {
	n := len(x)
	in := &report.Influence{MaxCooksD: report.NaN()}
	best := -1
	for i := 0; i < n; i++ {
		d := inf.CooksD[i]
		if math.IsNaN(d) {
			continue
		}
		if best < 0 || d > inf.CooksD[best] {
			best = i
		}
	}
	if best >= 0 {
		in.MaxCooksD, in.MaxCooksRow = report.Float(inf.CooksD[best]), rows[best]
	}
	var flagged []int
	for i := 0; i < n; i++ {
		if i < len(flags) && len(flags[i]) > 0 {
			flagged = append(flagged, i)
		}
	}
	// Largest Cook's D first; an undefined D (a row that alone sets the
	// fit) ranks first; ties in data order.
	key := func(i int) float64 {
		if d := inf.CooksD[i]; !math.IsNaN(d) {
			return d
		}
		return math.Inf(1)
	}
	slices.SortStableFunc(flagged, func(a, b int) int { return cmp.Or(cmp.Compare(key(b), key(a)), cmp.Compare(a, b)) })
	in.Points = []report.Point{}
	for _, i := range flagged {
		in.Points = append(in.Points, report.Point{Row: rows[i], Index: i, X: report.Float(x[i]), Y: report.Float(y[i]),
			Leverage: report.Float(inf.Leverage[i]), Studentized: report.Float(inf.Studentized[i]),
			StudentizedExt: report.Float(inf.StudentizedExt[i]), CooksD: report.Float(inf.CooksD[i]),
			DFFITS: report.Float(inf.DFFITS[i]), Flags: slices.Clone(flags[i])})
	}

	se := &report.Sensitivity{LooRMin: report.NaN(), LooRMax: report.NaN(), LooSlopeMin: report.NaN(), LooSlopeMax: report.NaN(),
		RWithoutFlagged: report.NaN(), RWithoutLow: report.NaN(), RWithoutHigh: report.NaN(),
		PWithoutFlagged: report.NaN(), SlopeWithoutFlagged: report.NaN(), InterceptWithout: report.NaN(),
		ResistantSlope: res.Slope, ResistantIntercept: res.Intercept, WithoutEach: []report.Without{}}
	rmin, rmax := extremes(inf.LooR)
	if rmin >= 0 {
		se.LooRMin, se.LooRMinRow = report.Float(inf.LooR[rmin]), rows[rmin]
		se.LooRMax, se.LooRMaxRow = report.Float(inf.LooR[rmax]), rows[rmax]
	}
	if smin, smax := extremes(inf.LooSlope); smin >= 0 {
		se.LooSlopeMin, se.LooSlopeMax = report.Float(inf.LooSlope[smin]), report.Float(inf.LooSlope[smax])
	}
	for _, i := range flagged {
		if findings.Suspect(flags[i]) {
			se.NFlagged++
		}
	}
	if se.NFlagged == 0 {
		// Nothing to leave out: the line without the flagged rows is the line.
		se.RWithoutFlagged, se.RWithoutLow, se.RWithoutHigh, se.PWithoutFlagged = report.Float(all.R),
			report.Float(all.CILow), report.Float(all.CIHigh), report.Float(all.P)
		se.SlopeWithoutFlagged, se.InterceptWithout = report.Float(line.Slope.Estimate), report.Float(line.Intercept.Estimate)
	} else {
		drop := make([]bool, n)
		for _, i := range flagged {
			drop[i] = findings.Suspect(flags[i])
		}
		var kx, ky []float64
		for i := 0; i < n; i++ {
			if !drop[i] {
				kx, ky = append(kx, x[i]), append(ky, y[i])
			}
		}
		if len(kx) >= 3 {
			cx, _ := constant(kx)
			cy, _ := constant(ky)
			if !cx && !cy {
				p := stats.Pearson(kx, ky, conf)
				se.RWithoutFlagged, se.RWithoutLow, se.RWithoutHigh, se.PWithoutFlagged = report.Float(p.R),
					report.Float(p.CILow), report.Float(p.CIHigh), report.Float(p.P)
			}
			if !cx {
				if l, err := stats.Line(kx, ky, conf); err == nil {
					se.SlopeWithoutFlagged, se.InterceptWithout = report.Float(l.Slope.Estimate), report.Float(l.Intercept.Estimate)
				}
			}
		}
	}
	for _, i := range flagged {
		se.WithoutEach = append(se.WithoutEach, report.Without{Row: rows[i], R: report.Float(inf.LooR[i]),
			Slope: report.Float(inf.LooSlope[i]), Intercept: report.Float(inf.LooIntercept[i])})
	}
	return in, se
}

// extremes returns the indices of the smallest and largest non-NaN values
// (first occurrence), or -1, -1.
func extremes(v []float64) (lo, hi int) {
	lo, hi = -1, -1
	for i, a := range v {
		if math.IsNaN(a) {
			continue
		}
		if lo < 0 || a < v[lo] {
			lo = i
		}
		if hi < 0 || a > v[hi] {
			hi = i
		}
	}
	return lo, hi
}
