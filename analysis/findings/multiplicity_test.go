package findings

// The secondary checks of a study (curvature, lack of fit, changing
// spread, drift) share alpha by Holm's step-down adjustment within the
// study; none is adjusted across studies, and the limits say so.

import (
	"strings"
	"testing"

	"bivar/analysis/report"
)

func TestSecondaryChecksShareAlphaWithinStudy(t *testing.T) {
	// A clear bend by its own p (0.03) and R² gain, with a second check
	// (Breusch–Pagan, p 0.4): Holm's smallest step needs p below 0.05/2.
	s := study(0.8, 1e-9)
	s.Diagnostics.QuadraticP = 0.03
	s.Models[0].Coefficients[2].P, s.Models[0].Coefficients[2].Estimate = 0.03, -0.01
	s.Models[0].FP, s.Models[0].R2 = 1e-9, 0.74
	f := Assess(s, ctx)
	if f.Form != "linear" {
		t.Errorf("x² term p 0.03 with two checks in the study: form %q, want linear (Holm: 0.03·2 = 0.06)", f.Form)
	}
	if !strings.Contains(all(f), "x² term p = 0.030; after Holm's adjustment over this study's 2 checks, p = 0.060") {
		t.Errorf("the curvature sentence does not give the adjusted p:\n%s", all(f))
	}
	s.Diagnostics.QuadraticP, s.Models[0].Coefficients[2].P = 0.02, 0.02
	if f := Assess(s, ctx); f.Form != "curved" {
		t.Errorf("x² term p 0.02 with two checks: form %q, want curved (0.02·2 = 0.04)", f.Form)
	}
	// The limits name the screens and say how far they are adjusted.
	lim := strings.Join(f.Limits, "\n")
	if !strings.Contains(lim, "curvature and changing spread") || !strings.Contains(lim, "not adjusted across studies") {
		t.Errorf("the limits do not list the secondary checks as screens unadjusted across studies:\n%s", lim)
	}
}

// TestAdjustmentFactorSaysApproximate: r without the flagged rows is
// judged with its p scaled by r's adjustment factor, which is exact only
// for a fixed factor; the sentence must say so where the factor applies.
func TestAdjustmentFactorSaysApproximate(t *testing.T) {
	s := study(0.9, 1e-6)
	s.Pearson.PAdjusted = 4e-6
	s.Influence.Points = []report.Point{{Row: "12", X: 9, Y: 3, Leverage: 0.1, CooksD: 0.9, StudentizedExt: 3.5,
		Flags: []string{FlagOutlier, FlagInfluential}}}
	s.Sensitivity.NFlagged = 1
	s.Sensitivity.RWithoutFlagged, s.Sensitivity.PWithoutFlagged = 0.88, 2e-6
	s.Sensitivity.RWithoutLow, s.Sensitivity.RWithoutHigh = 0.8, 0.93
	f := Assess(s, ctx)
	if !strings.Contains(all(f), "only approximate for Holm and Benjamini–Hochberg") {
		t.Errorf("the sensitivity sentence does not say the scaled p is approximate:\n%s", all(f))
	}
	s.Pearson.PAdjusted = s.Pearson.P
	if f := Assess(s, ctx); strings.Contains(all(f), "approximate for Holm") {
		t.Errorf("no adjustment across studies, yet the sentence speaks of it:\n%s", all(f))
	}
}

// TestPBothOneFigureWhenAlike: where the adjusted and the unadjusted p
// print alike ("p < 0.0001"), the sentence gives the figure once; where the
// adjustment changes it, both are shown.
func TestPBothOneFigureWhenAlike(t *testing.T) {
	s := study(0.9, 1e-9)
	s.Pearson.PAdjusted = 6e-9
	f := Assess(s, ctx)
	if txt := f.DirectionWhy; !strings.Contains(txt, "p < 0.0001, adjusted or not") || strings.Contains(txt, "unadjusted") {
		t.Errorf("both p below 0.0001: want the figure once, got:\n%s", txt)
	}
	s = study(0.5, 0.004)
	s.Pearson.PAdjusted = 0.012
	f = Assess(s, ctx)
	if txt := f.DirectionWhy; !strings.Contains(txt, "adjusted p = 0.012 (unadjusted p = 0.004)") {
		t.Errorf("adjustment changes p: want both figures, got:\n%s", txt)
	}
}
