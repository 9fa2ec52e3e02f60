package compare

// This file holds the plain-language statements of a Result: what changed,
// by how much, and whether beyond chance, with the adjustment named.

import (
	"fmt"
	"math"
	"strconv"
	"strings"

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
	out = append(out, head)
	for i := range res.Studies {
		res.Studies[i].Statement = studyStatement(&res.Studies[i], res.Alpha)
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
	return out
}

// studyStatement is the sentence for one study: the change beyond chance
// in the slope and in r, with the change in the other measure for
// context, and the verdicts that changed. "" when nothing changed.
func studyStatement(sc *StudyChange, alpha float64) string {
	if !sc.Significant && !sc.VerdictChanged {
		return ""
	}
	var parts []string
	rSig := sc.R != nil && sc.R.PAdjusted.Valid() && float64(sc.R.PAdjusted) < alpha
	slopeSig := sc.Slope != nil && sc.Slope.PAdjusted.Valid() && float64(sc.Slope.PAdjusted) < alpha
	unit := unitSuffix(sc.SlopeUnit())
	if sl := sc.Slope; slopeSig {
		parts = append(parts, fmt.Sprintf("The slope changed beyond chance: from %s to %s%s, a change of %s ± %s (SE)%s (t = %s, %d df, adjusted p %s).",
			g4(sl.Old), g4(sl.New), unit, signed4(sl.Delta), g4(sl.SE), steepness(sl.Old, sl.New), fix(sl.T), sl.DF, pText(sl.PAdjusted)))
	}
	if r := sc.R; rSig {
		parts = append(parts, fmt.Sprintf("r changed beyond chance: from %s to %s, a change of %s (z = %s, adjusted p %s).",
			g4(r.Old), g4(r.New), signed4(r.Delta), fix(r.Z), pText(r.PAdjusted)))
	} else if r != nil && r.P.Valid() && sc.Significant {
		parts = append(parts, fmt.Sprintf("r went from %s to %s, within chance (adjusted p %s).", g4(r.Old), g4(r.New), pText(r.PAdjusted)))
	}
	if sl := sc.Slope; !slopeSig && sl != nil && sl.P.Valid() && sc.Significant {
		parts = append(parts, fmt.Sprintf("The slope went from %s to %s%s, within chance (adjusted p %s).", g4(sl.Old), g4(sl.New), unit, pText(sl.PAdjusted)))
	}
	if a := agreementStatement(sc.Agreement, alpha); a != "" {
		parts = append(parts, a)
	}
	if len(sc.Verdicts) > 0 {
		var v []string
		for _, vc := range sc.Verdicts {
			name := vc.Name
			if name == "outlier_driven" {
				name = "outlier-driven"
			}
			v = append(v, fmt.Sprintf("%s %s → %s", name, orDash(vc.Old), orDash(vc.New)))
		}
		parts = append(parts, "The verdict changed: "+strings.Join(v, ", ")+".")
	}
	if sc.Significant {
		parts = append(parts, "Find the cause (process, material, gauge or the units sampled) before acting on it.")
	}
	return strings.Join(parts, " ")
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

// pText writes a p-value for a sentence: "< 0.0001" or "= 0.0521".
func pText(f report.Float) string {
	if !f.Valid() {
		return "undefined"
	}
	if float64(f) < 1e-4 {
		return "< 0.0001"
	}
	return "= " + strconv.FormatFloat(float64(f), 'g', 3, 64)
}

// minus puts the true minus sign in a formatted number, and writes large
// and small numbers without the e notation where Go would use it.
func minus(s string) string {
	if i := strings.IndexByte(s, 'e'); i >= 0 {
		exp, _ := strconv.Atoi(s[i+1:])
		s = s[:i] + " × 10^" + strconv.Itoa(exp)
	}
	return strings.ReplaceAll(s, "-", "−")
}
