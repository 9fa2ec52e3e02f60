package compare

// This file holds the plain-language statements of a Result: what changed,
// by how much, and whether beyond chance, with the adjustment named.

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"bivar/analysis/findings"
	"bivar/analysis/report"
)

// AdjustName names an adjustment for people.
func AdjustName(a string) string {
	switch a {
	case "holm":
		return "Holm's step-down method"
	case "bh":
		return "the Benjamini–Hochberg method"
	case "none":
		return "no adjustment"
	}
	return a
}

// statements writes the Result's overall sentences (the whole
// comparison; the studies whose change tests could not be done) and sets
// each study's Statement.
func statements(res *Result) []string {
	s := res.Summary
	var out []string
	for i := range res.Studies {
		res.Studies[i].Statement = studyStatement(&res.Studies[i], res.Alpha)
	}
	family := fmt.Sprintf("at alpha = %s after %s across all %d change tests", g(res.Alpha), AdjustName(res.Adjust), s.Tested)
	if res.Adjust == "none" {
		family = fmt.Sprintf("at alpha = %s, with no adjustment across the %d change tests", g(res.Alpha), s.Tested)
	}
	var head string
	switch {
	case s.Compared == 0:
		head = "No study is in both runs, so nothing was compared."
	case s.Significant == 0:
		what := "correlation or slope"
		if res.Tests.Bias != "" {
			what = "correlation, slope, agreement bias or spread of differences"
		}
		head = fmt.Sprintf("No study's %s changed beyond what chance explains (%d compared, %s)", what, s.Compared, family)
	default:
		head = fmt.Sprintf("%d of %d studies changed beyond what chance explains (%s)", s.Significant, s.Compared, family)
	}
	if s.Compared > 0 {
		switch s.VerdictChanged {
		case 0:
			head += "; no verdict changed."
		case 1:
			head += "; 1 study's verdict changed."
		default:
			head += fmt.Sprintf("; %d studies' verdicts changed.", s.VerdictChanged)
		}
	}
	if res.Identical() {
		head = fmt.Sprintf("Nothing changed: both runs read the same manifest and the same data (SHA-256 alike) with the same version of bivar, and the diff found no change in any of the %d studies; only the times the runs were made differ.", s.Compared)
	}
	out = append(out, head)
	if s.ExpectationChanged > 0 {
		out = append(out, gatesHead(res))
	}
	var untested []string
	for _, sc := range res.Studies {
		if (sc.R == nil || !sc.R.P.Valid()) && (sc.Slope == nil || !sc.Slope.P.Valid()) {
			untested = append(untested, sc.ID)
		}
	}
	if len(untested) > 0 {
		out = append(out, fmt.Sprintf("Not tested (see the notes): %s.", strings.Join(untested, ", ")))
	}
	if d := dataFact(res); d != "" {
		out = append(out, d)
	}
	return out
}

// Identical says whether the runs are the same run made twice: the same
// manifest, data and tool, and nothing found changed. Its statements
// (set before) are then all empty.
func (res *Result) Identical() bool {
	s := res.Summary
	if res.Old.SHA256 == "" || res.Old.SHA256 != res.New.SHA256 || res.Old.ToolVersion != res.New.ToolVersion || res.Old.Schema != res.New.Schema ||
		s.Significant+s.VerdictChanged+s.ExpectationChanged+s.DataChanged+s.Added+s.Removed > 0 || s.Compared == 0 {
		return false
	}
	for _, d := range res.Datasets {
		if d.Status != "same" {
			return false
		}
	}
	for _, sc := range res.Studies {
		if sc.Statement != "" {
			return false
		}
	}
	return true
}

// gatesHead is the sentence on the CI gates whose outcome changed, which
// leads the comparison.
func gatesHead(res *Result) string {
	var parts []string
	for _, g := range res.ChangedGates() {
		how := ""
		if !g.Compared {
			how = ", a study in one run only"
		}
		parts = append(parts, fmt.Sprintf("%s: %s %s%s", g.Study, g.Title, outcomeMove(g.ExpectationChange), how))
	}
	n := res.Summary.ExpectationChanged
	head := fmt.Sprintf("%d CI gates changed their outcome", n)
	if n == 1 {
		head = "1 CI gate changed its outcome"
	}
	return head + " (" + strings.Join(parts, "; ") + ")."
}

// outcomeMove says how a gate's outcome went from the old run to the new.
func outcomeMove(e ExpectationChange) string {
	return outcomeWord(e.OldOK) + " → " + outcomeWord(e.NewOK)
}

// outcomeWord is a gate's outcome in one run.
func outcomeWord(ok *bool) string {
	switch {
	case ok == nil:
		return "not declared"
	case *ok:
		return "met"
	}
	return "failed"
}

// dataFact states which data the runs read, as a fact: a new run
// normally reads a new file, or new rows of a database.
func dataFact(res *Result) string {
	var parts []string
	for _, d := range res.Datasets {
		switch d.Status {
		case "changed":
			rows := fmt.Sprintf("%d rows in both", d.NewRows)
			if d.OldRows != d.NewRows {
				rows = fmt.Sprintf("%d rows old, %d new", d.OldRows, d.NewRows)
			}
			if d.OldFrom == d.NewFrom {
				parts = append(parts, fmt.Sprintf("%s changed: the contents of %s differ between the runs (another SHA-256, which any edited, added, removed or reordered row gives; %s)", d.ID, d.NewFrom, rows))
			} else {
				parts = append(parts, fmt.Sprintf("%s changed: the new run read %s, the old %s (another SHA-256; %s)", d.ID, d.NewFrom, d.OldFrom, rows))
			}
		case "rehashed":
			parts = append(parts, fmt.Sprintf("%s was hashed by another method in each run (%d rows old, %d new: rows fetched from the database in one run and left in it in the other, as max_rows or the row count moved), so the hashes cannot say whether its rows changed", d.ID, d.OldRows, d.NewRows))
		case "same":
			if d.Database {
				parts = append(parts, fmt.Sprintf("%s holds the same rows in both runs (%s: the same count and hash of the rows), so only the settings or the tool can explain a change", d.ID, d.NewFrom))
			} else {
				parts = append(parts, fmt.Sprintf("%s is the same file in both runs (%s, SHA-256 alike), so only the settings or the tool can explain a change", d.ID, d.NewFrom))
			}
		}
	}
	if len(parts) == 0 {
		return ""
	}
	return "Data: " + strings.Join(parts, "; ") + "."
}

// studyStatement is the sentence for one study: the change beyond chance
// in the slope and in r, with the change in the other measure for
// context, and the verdicts that changed. "" when nothing changed.
func studyStatement(sc *StudyChange, alpha float64) string {
	ran := runStatus(sc)
	edited := slices.ContainsFunc(sc.Expectations, func(e ExpectationChange) bool { return e.WantChanged })
	if !sc.Significant && !sc.VerdictChanged && !sc.ExpectationChanged && sc.Columns == "" && ran == "" && sc.Flagged == nil && !edited {
		return ""
	}
	var parts []string
	if ran != "" {
		parts = append(parts, ran)
	}
	if sc.Columns != "" {
		parts = append(parts, sc.Columns)
	}
	rSig := sc.R != nil && sc.R.PAdjusted.Valid() && float64(sc.R.PAdjusted) < alpha
	slopeSig := sc.Slope != nil && sc.Slope.PAdjusted.Valid() && float64(sc.Slope.PAdjusted) < alpha
	unit := unitSuffix(sc.SlopeUnit())
	slopeGateSaid := false
	if g := sc.SlopeGate; g != nil && sc.Slope != nil && (slopeSig || g.OldInside != g.NewInside) {
		parts = append(parts, gateSentence(sc, g, unit))
		slopeGateSaid = true
	}
	if sl := sc.Slope; slopeSig {
		parts = append(parts, fmt.Sprintf("The slope changed beyond chance: from %s to %s%s, a change of %s ± %s%s (SE)%s (t = %s, %d df, adjusted p %s).",
			g4(sl.Old), g4(sl.New), unit, signed4(sl.Delta), g4(sl.SE), unit, steepness(sl.Old, sl.New), fix(sl.T), sl.DF, pText(sl.PAdjusted, alpha)))
	}
	if r := sc.R; rSig {
		parts = append(parts, fmt.Sprintf("r changed beyond chance: from %s to %s, a change of %s (z = %s, adjusted p %s).",
			g4(r.Old), g4(r.New), signed4(r.Delta), fix(r.Z), pText(r.PAdjusted, alpha)))
	} else if r != nil && r.P.Valid() && sc.Significant {
		parts = append(parts, fmt.Sprintf("r went from %s to %s, within chance (adjusted p %s).", g4(r.Old), g4(r.New), pText(r.PAdjusted, alpha)))
	}
	if sl := sc.Slope; !slopeSig && sl != nil && sl.P.Valid() && sc.Significant {
		parts = append(parts, fmt.Sprintf("The slope went from %s to %s%s, within chance (adjusted p %s).", g4(sl.Old), g4(sl.New), unit, pText(sl.PAdjusted, alpha)))
	}
	if a := agreementStatement(sc.Agreement, alpha); a != "" {
		parts = append(parts, a)
	}
	// The outcome of a gate can change because the data did, or because
	// the gate did: edited between the runs, or declared in one run only.
	// Only the first calls for a cause in the process, and for the
	// change in y units.
	dataMoved := sc.Significant
	var gates []string
	for _, e := range sc.Expectations {
		if !e.Changed {
			if e.WantChanged {
				gates = append(gates, fmt.Sprintf("The gate %q was edited between the runs (it asked for %s, now %s); it is %s in both.", e.Title, e.OldWant, e.Want, outcomeWord(e.NewOK)))
			}
			continue
		}
		edited := e.WantChanged || e.OldOK == nil || e.NewOK == nil
		if !edited {
			dataMoved = true
		}
		if e.Name == "slope_within" && slopeGateSaid && !edited {
			continue
		}
		switch {
		case e.WantChanged:
			gates = append(gates, fmt.Sprintf("The gate %q was edited between the runs (it asked for %s, now %s) and went %s (%s).", e.Title, e.OldWant, e.Want, outcomeMove(e), gotMove(e)))
		default:
			gates = append(gates, fmt.Sprintf("The gate %q went %s (%s).", e.Title, outcomeMove(e), gotMove(e)))
		}
	}
	if dataMoved && sc.Agreement == nil { // an agreement study's gate is its limits, above
		if a := atXSentence(sc); a != "" {
			parts = append(parts, a)
		}
	}
	parts = append(parts, gates...)
	if f := flaggedSentence(sc.Flagged); f != "" {
		parts = append(parts, f)
	}
	if len(sc.Verdicts) > 0 {
		var v []string
		for _, vc := range sc.Verdicts {
			v = append(v, fmt.Sprintf("%s %s → %s", VerdictName(vc.Name), orDash(vc.Old), orDash(vc.New)))
		}
		parts = append(parts, "The verdict changed: "+strings.Join(v, ", ")+".")
	}
	switch {
	case sc.Columns != "":
	case dataMoved:
		parts = append(parts, "Find the cause (process, material, gauge or the units sampled) before acting on it.")
	case sc.ExpectationChanged:
		parts = append(parts, "The gate itself changed, so its new outcome need not mean that the relationship did.")
	}
	return strings.Join(parts, " ")
}

// flaggedSentence says how the flagged rows changed: the counts per
// flag that moved, and the rows named in one run only (at most five of
// each, then how many more).
func flaggedSentence(f *FlaggedChange) string {
	if f == nil {
		return ""
	}
	var counts []string
	for _, c := range []struct {
		name     string
		old, new int
	}{{"outlier", f.Old.Outlier, f.New.Outlier}, {"influential", f.Old.Influential, f.New.Influential}, {"sole support", f.Old.SoleSupport, f.New.SoleSupport}} {
		if c.old != c.new {
			counts = append(counts, fmt.Sprintf("%s %d → %d", c.name, c.old, c.new))
		}
	}
	list := func(rows []string) string {
		const most = 5
		if len(rows) > most {
			return strings.Join(rows[:most], ", ") + fmt.Sprintf(" and %d more", len(rows)-most)
		}
		return strings.Join(rows, ", ")
	}
	s := "The flagged rows changed"
	if len(counts) > 0 {
		s += " (" + strings.Join(counts, ", ") + ")"
	}
	var named []string
	if len(f.NewlyNamed) > 0 {
		named = append(named, "flagged in the new run only: "+list(f.NewlyNamed))
	}
	if len(f.Gone) > 0 {
		named = append(named, "flagged in the old run only: "+list(f.Gone))
	}
	if len(named) > 0 {
		s += "; " + strings.Join(named, "; ")
	}
	return s + "."
}

// runStatus says which run a study did not run in, with the reason, or
// "" when it ran in both: a study that stops running is the first thing
// a comparison of runs must say.
func runStatus(sc *StudyChange) string {
	o, n := sc.OldError, sc.NewError
	switch {
	case o == nil && n == nil:
		return ""
	case o == nil:
		return fmt.Sprintf("The study ran in the old run but did not run in the new one: %s.", strings.TrimSuffix(*n, "."))
	case n == nil:
		return fmt.Sprintf("The study did not run in the old run (%s) and runs in the new one.", strings.TrimSuffix(*o, "."))
	case *o == *n:
		return fmt.Sprintf("The study did not run in either run: %s.", strings.TrimSuffix(*n, "."))
	}
	return fmt.Sprintf("The study did not run in either run: in the new one %s (in the old one %s).", strings.TrimSuffix(*n, "."), strings.TrimSuffix(*o, "."))
}

// gotMove is what a gate found in each run.
func gotMove(e ExpectationChange) string {
	switch {
	case e.OldOK == nil:
		return "new run: " + e.NewGot
	case e.NewOK == nil:
		return "old run: " + e.OldGot
	}
	return e.OldGot + " → " + e.NewGot
}

// gateSentence sets the slope change against the declared slope gate.
func gateSentence(sc *StudyChange, g *SlopeGate, unit string) string {
	where := func(in bool) string {
		if in {
			return "inside"
		}
		return "outside"
	}
	s := fmt.Sprintf("Against the slope gate (%s to %s%s): the old slope lay %s it, the new one lies %s it",
		g4(g.Low), g4(g.High), unit, where(g.OldInside), where(g.NewInside))
	if o := g.OldLimits; o != nil {
		s = fmt.Sprintf("Against the slope gate (%s to %s%s in the new run; %s to %s%s in the old): the old slope lay %s the old gate, the new one lies %s the new",
			g4(g.Low), g4(g.High), unit, g4(o.Low), g4(o.High), unit, where(g.OldInside), where(g.NewInside))
	}
	if !g.NewInside && g.NewOutsideBy.Valid() {
		end := "upper"
		if float64(sc.Slope.New) < float64(g.Low) {
			end = "lower"
		}
		s += fmt.Sprintf(", %s%s beyond its %s end", g4(g.NewOutsideBy), unit, end)
	}
	if g.ShareOfWidth.Valid() {
		s += fmt.Sprintf("; the change is %s%% of the gate's width", strconv.FormatFloat(100*float64(g.ShareOfWidth), 'f', 0, 64))
	}
	return s + "."
}

// atXSentence gives the change in y units at the x values the study
// predicts at (or across its range).
func atXSentence(sc *StudyChange) string {
	if len(sc.AtX) == 0 {
		return ""
	}
	xu, yu := unitSuffix(sc.XFigureUnit()), unitSuffix(sc.YFigureUnit())
	var parts []string
	for _, a := range sc.AtX {
		p := fmt.Sprintf("at %s%s the line gives %s%s instead of %s%s (%s%s ± %s%s)", g4(a.X), xu, g4(a.New), yu, g4(a.Old), yu, signed4(a.Delta), yu, g4(a.SE), yu)
		if !a.InRange {
			p += ", outside the observed range"
		}
		parts = append(parts, p)
	}
	lead := "In y units, where the study predicts: "
	if sc.AtXFrom == "range" {
		lead = "In y units, across the observed range: "
	}
	return lead + strings.Join(parts, "; ") + " (new − old ± SE)."
}

// steepness says how the slope's size changed, when both slopes have the
// same sign: ", 29% less steep" or ", 40% steeper"; ", the direction
// reversed" when the signs differ.
func steepness(old, new report.Float) string {
	o, n := float64(old), float64(new)
	if !old.Valid() || !new.Valid() || o == 0 || n == 0 {
		return ""
	}
	if (o < 0) != (n < 0) {
		return ", the direction reversed"
	}
	pct := 100 * (math.Abs(n)/math.Abs(o) - 1)
	switch {
	case math.Abs(pct) < 0.5 || math.Abs(pct) > 1000:
		return ""
	case pct < 0:
		return fmt.Sprintf(", %s%% less steep", strconv.FormatFloat(-pct, 'f', 0, 64))
	}
	return fmt.Sprintf(", %s%% steeper", strconv.FormatFloat(pct, 'f', 0, 64))
}

func unitSuffix(u string) string {
	if u == "" {
		return ""
	}
	return " " + u
}

// g4 writes a number with 4 significant digits and a true minus sign.
func g4(f report.Float) string {
	if !f.Valid() {
		return "undefined"
	}
	return minus(strconv.FormatFloat(float64(f), 'g', 4, 64))
}

func signed4(f report.Float) string {
	if !f.Valid() {
		return "undefined"
	}
	return signedFmt(float64(f), 4)
}

func signedFmt(v float64, digits int) string {
	s := minus(strconv.FormatFloat(v, 'g', digits, 64))
	if v > 0 {
		s = "+" + s
	}
	return s
}

func fix(f report.Float) string {
	if math.IsInf(float64(f), 0) || !f.Valid() {
		return g4(f)
	}
	return minus(strconv.FormatFloat(float64(f), 'f', 2, 64))
}

func g(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// pText writes an adjusted p-value for a sentence after "p", by the
// project's one p formatter (findings.PValueVs against alpha, so that the
// printed value never lands on the other side of it): "< 0.0001",
// "= 0.0496", "= 0.066" or "undefined". results.json keeps the exact value.
func pText(f report.Float, alpha float64) string {
	if !f.Valid() {
		return "undefined"
	}
	return pIs(findings.PValueVs(float64(f), alpha))
}

// pIs puts "=" before a p-value that findings.PValue or PValueVs wrote,
// unless it already reads "< …" or "undefined".
func pIs(t string) string {
	if strings.HasPrefix(t, "<") || t == "undefined" {
		return t
	}
	return "= " + t
}

// minus writes large and small numbers without the e notation where Go
// would use it. Negative numbers keep the ASCII hyphen-minus: the diff's
// tables use it so that they paste into a spreadsheet as numbers, and one
// output uses one convention.
func minus(s string) string {
	if i := strings.IndexByte(s, 'e'); i >= 0 {
		exp, _ := strconv.Atoi(s[i+1:])
		s = s[:i] + " × 10^" + strconv.Itoa(exp)
	}
	return s
}
