package render

// This file shows a study's measurement parts: the agreement of two
// methods, r and the slope corrected for measurement error, and the
// planning figures (see plansTable). It selects and formats what the analysis and the
// findings put into the Report; the sentences are the findings'.

import (
	"strings"

	"bivar/analysis/report"
)

func agreementSection(s *report.Study, level string, _ report.Thresholds) (*section, error) {
	a := s.Agreement
	if a == nil {
		return nil, nil
	}
	// The first statement is the study's headline, shown above; those on
	// repeatability restate the repeatability table below.
	sec := &section{Key: "agreement", Title: "Agreement"}
	for i, st := range a.Statements {
		if (i == 0 && s.Findings != nil && st == s.Findings.Headline) || (len(a.Repeatability) > 0 && strings.HasPrefix(st, "Repeatability of ")) {
			continue
		}
		sec.Paras = append(sec.Paras, st)
	}
	sym := s.X.Symbol
	u := func(v report.Float) string {
		if sym == "" || !v.Valid() {
			return num(v)
		}
		return num(v) + " " + sym
	}
	t := table{Caption: "Differences " + name(s.Y) + " - " + name(s.X) + " (" + itoa(a.N) + " items)",
		Head: []string{"Measure", "Value", level + "% interval"}, Num: []bool{false, true, true}}
	add := func(m, v, ci string) { t.Rows = append(t.Rows, []string{m, v, ci}) }
	ui := func(lo, hi report.Float) string {
		if sym == "" || !lo.Valid() || !hi.Valid() {
			return interval(lo, hi)
		}
		return interval(lo, hi) + " " + sym
	}
	add("Bias (mean difference)", u(a.Bias), ui(a.BiasLow, a.BiasHigh))
	add("SD of the differences", u(a.SD), "")
	add("Lower limit of agreement (bias - "+num(a.K)+" SD)", u(a.Lower), ui(a.LowerLow, a.LowerHigh))
	add("Upper limit of agreement (bias + "+num(a.K)+" SD)", u(a.Upper), ui(a.UpperLow, a.UpperHigh))
	if a.Acceptable.Valid() {
		add("Acceptable difference", "±"+u(a.Acceptable), "")
	}
	// The difference per unit of the mean: y's unit per x's (both the
	// same unit for two methods of one quantity).
	add("Slope of the difference on the mean (p "+pval(a.TrendP)+")", withSym(num(a.TrendSlope), unitPer(s)), withSym(interval(a.TrendLow, a.TrendHigh), unitPer(s)))
	sec.Tables = append(sec.Tables, t)

	lines := table{Caption: "Lines of " + name(s.Y) + " on " + name(s.X),
		Head: []string{"Line", "Intercept" + paren(orWord(s.Y.Symbol, "y units")), level + "% interval" + paren(orWord(s.Y.Symbol, "y units")), "Slope" + paren(unitPer(s)), level + "% interval"},
		Num:  []bool{false, true, true, true, true}}
	if d := a.Deming; d != nil {
		lines.Rows = append(lines.Rows, []string{"Deming (error-variance ratio " + num(d.Delta) + ", " + d.DeltaFrom + "; jackknife intervals)",
			num(d.Intercept), interval(d.InterceptLow, d.InterceptHigh), num(d.Slope), interval(d.SlopeLow, d.SlopeHigh)})
	}
	if pb := a.PassingBablok; pb != nil {
		what := "Passing–Bablok"
		if pb.Sampled {
			what += " (on a sample of the pairs)"
		}
		lines.Rows = append(lines.Rows, []string{what, num(pb.Intercept), interval(pb.InterceptLow, pb.InterceptHigh), num(pb.Slope), interval(pb.SlopeLow, pb.SlopeHigh)})
	}
	if !lines.Empty() {
		sec.Tables = append(sec.Tables, lines)
	}
	if c := a.Concordance; c != nil {
		ct := table{Caption: "Concordance with the identity line", Head: []string{"Measure", "Value", level + "% interval"}, Num: []bool{false, true, true}}
		ct.Rows = append(ct.Rows, []string{"Lin's concordance coefficient", num(c.CCC), interval(c.Low, c.High)},
			[]string{"Precision (Pearson r)", num(c.Pearson), ""}, []string{"Accuracy (bias correction factor)", num(c.Cb), ""})
		sec.Tables = append(sec.Tables, ct)
	}
	if len(a.Repeatability) > 0 {
		rt := table{Caption: "Repeatability of each method", Head: []string{"Method", "Readings per item", "Within-item SD", level + "% interval", "Repeatability coefficient", level + "% interval"},
			Num: []bool{false, true, true, true, true, true}}
		for _, r := range a.Repeatability {
			who := name(s.X)
			if r.Method == "y" {
				who = name(s.Y)
			}
			rt.Rows = append(rt.Rows, []string{who, itoa(r.Readings), u(r.SW), ui(r.SWLow, r.SWHigh), u(r.Coef), ui(r.CoefLow, r.CoefHigh)})
		}
		sec.Tables = append(sec.Tables, rt)
	}
	// The methods' assumptions are said once in the appendix.
	return sec, nil
}

func errorCorrectionSection(s *report.Study, level string, _ report.Thresholds) (*section, error) {
	e := s.ErrorCorrection
	if e == nil {
		return nil, nil
	}
	sec := &section{Key: "measurement-error", Title: "Corrected for measurement error", Paras: e.Statements}
	t := table{Caption: "Observed and corrected (" + itoa(e.N) + " rows)", Head: []string{"Measure", "Observed", "Corrected", level + "% interval"},
		Num: []bool{false, true, true, true}}
	t.Rows = append(t.Rows,
		[]string{"Pearson r", num(e.R), num(e.RCorrected), interval(e.RCorrectedLow, e.RCorrectedHigh)},
		[]string{"Slope (" + unitPer(s) + ")", num(e.Slope), num(e.SlopeCorrected), interval(e.SlopeCorrectedLow, e.SlopeCorrectedHigh)},
		[]string{"Reliability of x / of y", "", num(e.ReliabilityX) + " / " + num(e.ReliabilityY), ""})
	sec.Tables = append(sec.Tables, t)
	sec.After = e.Assumptions
	return sec, nil
}
