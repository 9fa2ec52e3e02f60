package compare

// This file says whether a change matters: the expectations (CI gates)
// whose outcome changed, the change in slope set against a declared slope
// gate, the change in the line's mean response at the x values the study
// predicts at, and the two runs' lines with their confidence bands for
// the old-against-new chart. Everything here is computed from results.json
// (the stored moments, the expectations and the prediction settings).

import (
	"math"
	"regexp"
	"slices"
	"strconv"

	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// ExpectationChange is one CI gate ([study.expect]) of a study in either
// run, with its outcome in each.
type ExpectationChange struct {
	Name  string `json:"name"`  // the manifest key, as in results.json
	Title string `json:"title"` // the gate in words
	Want  string `json:"want"`  // what the newer run that has it asked for
	// WantChanged: the gate is in both runs but asks for something else
	// in the new one (its limits or value were edited in the manifest);
	// OldWant is then what the old run asked for. An outcome that
	// changed with it may come from the edit alone.
	WantChanged bool   `json:"want_changed"`
	OldWant     string `json:"old_want,omitempty"`
	// OldOK and NewOK are the outcomes; nil where the run has no such gate.
	OldOK  *bool  `json:"old_ok"`
	NewOK  *bool  `json:"new_ok"`
	OldGot string `json:"old_got"`
	NewGot string `json:"new_got"`
	// Changed: the outcome differs (met ↔ failed), or the gate is in one
	// run only. Broken: it fails in the new run and did not fail in the
	// old (held there, or was not declared) — what --fail-on expectation
	// gates on.
	Changed bool `json:"changed"`
	Broken  bool `json:"broken"`
}

// SlopeGate sets the change in slope against the study's declared
// slope_within gate (from the new run; the old run's when only it has one).
type SlopeGate struct {
	Low  report.Float `json:"low"`
	High report.Float `json:"high"`
	// OldLimits are the old run's own limits where they differ from
	// [Low, High] (the gate was edited between the runs); nil otherwise.
	OldLimits *report.Limits `json:"old_limits,omitempty"`
	// OldInside and NewInside say whether each run's slope lies within
	// its own run's limits: the old slope within OldLimits where set.
	OldInside bool `json:"old_inside"`
	NewInside bool `json:"new_inside"`
	// NewOutsideBy is how far the new slope lies outside the gate, in
	// slope units (0 inside).
	NewOutsideBy report.Float `json:"new_outside_by"`
	// ShareOfWidth is |new − old| / (High − Low): the change as a share of
	// the gate's width (1 = the whole allowed range).
	ShareOfWidth report.Float `json:"share_of_width"`
}

// AtX is the change of the straight line's mean response at one x, in y
// units: new fit − old fit, each fit ȳ + b·(x − x̄) from the run's moments.
type AtX struct {
	X     report.Float `json:"x"`
	Old   report.Float `json:"old"`
	New   report.Float `json:"new"`
	Delta report.Float `json:"delta"`
	// SE of Delta: sqrt(se_old² + se_new²) with each run's standard error
	// of the mean response s·sqrt(1/n + (x − x̄)²/Sxx) (the runs are
	// independent samples).
	SE report.Float `json:"se"`
	// InRange: x lies inside both runs' observed x ranges.
	InRange bool `json:"in_range"`
}

// RunLine is one run's straight line over its observed x range, with the
// confidence band for the line at 1 − alpha, for the old-against-new
// chart.
type RunLine struct {
	N      int                `json:"n"`
	Points []report.BandPoint `json:"points"` // ascending x; the prediction-band fields are left at zero
}

// Lines holds the two runs' lines for the chart.
type Lines struct {
	Old RunLine `json:"old"`
	New RunLine `json:"new"`
}

// lineGrid is the number of x values each run's band is given at.
const lineGrid = 21

func boolPtr(b bool) *bool { return &b }

// expectationChanges lists every gate of either run, in the new run's
// order then the old run's gates that the new run lacks.
func expectationChanges(prev, cur *report.Study) []ExpectationChange {
	out := []ExpectationChange{}
	oldBy := map[string]report.Expectation{}
	for _, e := range prev.Expectations {
		oldBy[e.Name] = e
	}
	seen := map[string]bool{}
	for _, e := range cur.Expectations {
		seen[e.Name] = true
		ec := ExpectationChange{Name: e.Name, Title: titleOf(e), Want: e.Want, NewOK: boolPtr(e.OK), NewGot: e.Got}
		if o, ok := oldBy[e.Name]; ok {
			ec.OldOK, ec.OldGot = boolPtr(o.OK), o.Got
			if wantEdited(o, e) {
				ec.WantChanged, ec.OldWant = true, o.Want
			}
			ec.Changed = o.OK != e.OK
			ec.Broken = o.OK && !e.OK
		} else {
			ec.Changed = true
			ec.Broken = !e.OK
		}
		out = append(out, ec)
	}
	for _, o := range prev.Expectations {
		if !seen[o.Name] {
			out = append(out, ExpectationChange{Name: o.Name, Title: titleOf(o), Want: o.Want, OldOK: boolPtr(o.OK), OldGot: o.Got, Changed: true})
		}
	}
	return out
}

// wantEdited says whether a gate asks for something else in the new run
// than in the old: other limits where both runs record them, else other
// numbers in the want ("|r| ≥ 0.9" → "|r| ≥ 0.95"), else another word
// ("positive" → "negative"). The want's wording alone is not compared:
// versions of bivar write it differently ("HRC/°C", "HRC per °C").
func wantEdited(o, n report.Expectation) bool {
	if o.Limits != nil && n.Limits != nil {
		return o.Limits.Low != n.Limits.Low || o.Limits.High != n.Limits.High
	}
	on, nn := wantNumber.FindAllString(o.Want, -1), wantNumber.FindAllString(n.Want, -1)
	if len(on) > 0 || len(nn) > 0 {
		return !slices.EqualFunc(on, nn, func(a, b string) bool {
			x, errA := strconv.ParseFloat(a, 64)
			y, errB := strconv.ParseFloat(b, 64)
			return errA == nil && errB == nil && x == y
		})
	}
	return o.Want != n.Want
}

// wantNumber matches a number in a gate's want.
var wantNumber = regexp.MustCompile(`-?[0-9]+(\.[0-9]+)?([eE][-+]?[0-9]+)?`)

// titleOf is the gate's words, from results.json or, for a file written
// before gates had titles, its key.
func titleOf(e report.Expectation) string {
	if e.Title != "" {
		return e.Title
	}
	return e.Name
}

// slopeLimits is the study's declared slope_within range, or nil.
func slopeLimits(s *report.Study) *report.Limits {
	for _, e := range s.Expectations {
		if e.Name == "slope_within" && e.Limits != nil {
			return e.Limits
		}
	}
	return nil
}

// slopeGate sets the slope change against the declared limits lim; old
// are the old run's limits (nil without a gate there), against which the
// old slope is read where they differ from lim.
func slopeGate(sl *SlopeChange, lim, old *report.Limits) *SlopeGate {
	if sl == nil || lim == nil || !lim.Low.Valid() || !lim.High.Valid() {
		return nil
	}
	lo, hi := float64(lim.Low), float64(lim.High)
	within := func(f report.Float, l report.Limits) bool {
		return f.Valid() && float64(l.Low) <= float64(f) && float64(f) <= float64(l.High)
	}
	g := &SlopeGate{Low: lim.Low, High: lim.High, OldInside: within(sl.Old, *lim), NewInside: within(sl.New, *lim),
		NewOutsideBy: report.NaN(), ShareOfWidth: report.NaN()}
	if old != nil && old.Low.Valid() && old.High.Valid() && (old.Low != lim.Low || old.High != lim.High) {
		g.OldLimits = &report.Limits{Low: old.Low, High: old.High}
		g.OldInside = within(sl.Old, *old)
	}
	if n := float64(sl.New); sl.New.Valid() {
		g.NewOutsideBy = report.Float(math.Max(0, math.Max(lo-n, n-hi)))
	}
	if w := hi - lo; w > 0 && sl.Delta.Valid() {
		g.ShareOfWidth = report.Float(math.Abs(float64(sl.Delta)) / w)
	}
	return g
}

// meanResponse is a run's line at x with the standard error of the mean
// response, from its moments: fit = ȳ + b(x − x̄), se = s·sqrt(1/n + (x −
// x̄)²/Sxx) with s² = RSS/(n − 2) (the textbook formula, e.g. Draper &
// Smith, Applied Regression Analysis, 3rd ed., section 3.1, cited from
// memory). NaN where the line is undefined.
func meanResponse(m report.Moments, x float64) (fit, se float64) {
	b, rss, df := lineFromMoments(m)
	if df == 0 {
		return math.NaN(), math.NaN()
	}
	d := x - float64(m.MeanX)
	fit = float64(m.MeanY) + b*d
	se = math.Sqrt(rss / float64(df) * (1/float64(m.N) + d*d/float64(m.Sxx)))
	return fit, se
}

// xRange is the observed range of x in a study, from its description.
func xRange(s *report.Study) (lo, hi float64, ok bool) {
	if s.Describe == nil || !s.Describe.X.Min.Valid() || !s.Describe.X.Max.Valid() {
		return math.NaN(), math.NaN(), false
	}
	return float64(s.Describe.X.Min), float64(s.Describe.X.Max), true
}

// atXValues are the x values the change is shown at: the new run's
// prediction x values, then the old run's that the new lacks; without any,
// the ends and the middle of the new run's observed x range. The second
// result says which ("predictions" or "range").
func atXValues(prev, cur *report.Study) ([]float64, string) {
	var xs []float64
	for _, p := range append(slices.Clone(cur.Predictions), prev.Predictions...) {
		if p.X.Valid() && !slices.Contains(xs, float64(p.X)) {
			xs = append(xs, float64(p.X))
		}
	}
	if len(xs) > 0 {
		return xs, "predictions"
	}
	lo, hi, ok := xRange(cur)
	if !ok {
		return nil, ""
	}
	if lo == hi {
		return []float64{lo}, "range"
	}
	return []float64{lo, lo + (hi-lo)/2, hi}, "range"
}

// changeAt is the change in mean response at each x of xs.
func changeAt(prev, cur *report.Study, xs []float64) []AtX {
	out := []AtX{}
	olo, ohi, ook := xRange(prev)
	nlo, nhi, nok := xRange(cur)
	for _, x := range xs {
		f1, s1 := meanResponse(*prev.Moments, x)
		f2, s2 := meanResponse(*cur.Moments, x)
		out = append(out, AtX{X: report.Float(x), Old: report.Float(f1), New: report.Float(f2), Delta: report.Float(f2 - f1),
			SE:      report.Float(math.Hypot(s1, s2)),
			InRange: ook && nok && olo <= x && x <= ohi && nlo <= x && x <= nhi})
	}
	return out
}

// runLine is one run's line and its confidence band (1 − alpha, t with
// n − 2 df) at lineGrid x values across its observed range; nil where the
// line or the range is undefined.
func runLine(s *report.Study, alpha float64) *RunLine {
	lo, hi, ok := xRange(s)
	if !ok || s.Moments == nil || !(hi > lo) {
		return nil
	}
	_, _, df := lineFromMoments(*s.Moments)
	if df == 0 {
		return nil
	}
	t := stats.TQuantileUpper(alpha/2, float64(df))
	rl := &RunLine{N: s.Moments.N}
	for i := range lineGrid {
		x := stats.GridX(lo, hi, i, lineGrid)
		fit, se := meanResponse(*s.Moments, x)
		if math.IsNaN(fit) {
			return nil
		}
		rl.Points = append(rl.Points, report.BandPoint{X: x, Fit: fit, ConfLow: fit - t*se, ConfHigh: fit + t*se})
	}
	return rl
}

// matters fills the parts of sc that say whether a change matters.
func matters(sc *StudyChange, prev, cur *report.Study, alpha float64) {
	sc.Expectations = expectationChanges(prev, cur)
	for _, e := range sc.Expectations {
		if e.Changed {
			sc.ExpectationChanged = true
		}
	}
	if sc.Slope != nil {
		lim := slopeLimits(cur)
		if lim == nil {
			lim = slopeLimits(prev)
		}
		sc.SlopeGate = slopeGate(sc.Slope, lim, slopeLimits(prev))
	}
	if prev.Moments == nil || cur.Moments == nil || sc.Slope == nil {
		return
	}
	xs, from := atXValues(prev, cur)
	if len(xs) > 0 {
		sc.AtX, sc.AtXFrom = changeAt(prev, cur, xs), from
	}
	o, n := runLine(prev, alpha), runLine(cur, alpha)
	if o != nil && n != nil {
		sc.Lines = &Lines{Old: *o, New: *n}
	}
}
