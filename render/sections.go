package render

import (
	"fmt"
	"strings"

	"bivar/analysis/report"
	"bivar/render/chart"
)

// studySections lists the parts of a study after its figures, in the order
// they appear. A new part is one function here; both formats pick it up.
var studySections = []func(s *report.Study, level string, th report.Thresholds) (*section, error){
	agreementSection,
	wordsSection,
	keyFiguresSection,
	errorCorrectionSection,
	influenceSection,
	sensitivitySection,
	unitsSection,
	groupsSection,
	predictionsSection,
	approximationsSection,
	planSection,
	limitsSection,
	expectationsSection,
	notesSection,
}

func wordsSection(s *report.Study, _ string, _ report.Thresholds) (*section, error) {
	f := s.Findings
	if f == nil {
		return nil, nil
	}
	sec := &section{Key: "words", Title: "What the data show"}
	// The findings say which rule decided each verdict (FormWhy, …,
	// Reasons); that sentence is shown and the renderer adds no reason of
	// its own. A report written before those fields existed shows the bare
	// verdict.
	why := func(topic, reason, verdict string) {
		if reason != "" {
			sec.List = append(sec.List, topic+" — "+reason)
		} else {
			sec.List = append(sec.List, topic+": "+verdict+".")
		}
	}
	form := f.Form
	if f.Bend != nil && *f.Bend != "" {
		form += " (" + strings.ReplaceAll(*f.Bend, "-", " ") + ")"
	}
	why("Form", f.FormWhy, form)
	why("Direction", f.DirectionWhy, f.Direction)
	why("Strength", f.StrengthWhy, f.Strength)
	if f.Reasons != nil {
		for _, r := range f.Reasons {
			why(r.Topic, r.Why, r.Verdict)
		}
	} else {
		if f.OutlierDriven {
			why("Influence", "", "outlier-driven")
		}
		if f.Reversal {
			why("Groups", "", "reversal")
		}
		if len(f.ExplainedBy) > 0 {
			why("Covariates", "", "explained by "+strings.Join(covariateLabels(s, f.ExplainedBy), ", "))
		}
		if f.Drift {
			why("Run order", "", "drift")
		}
		if f.SpreadChanges {
			why("Spread", "", "changes with "+name(s.X))
		}
	}
	// Each bullet leads with the verdict it is about, set in bold.
	for _, it := range sec.List {
		k, v := it, ""
		for _, sep := range []string{" — ", ": "} {
			if i := strings.Index(it, sep); i > 0 && i < 12 {
				k, v = it[:i], it[i+len(sep):]
				break
			}
		}
		sec.Items = append(sec.Items, kv{k, v})
	}
	sec.List = nil
	sec.After = f.Statements
	return sec, nil
}

// capital upper-cases the first letter of a verdict word.
func capital(w string) string {
	if w == "" {
		return w
	}
	r := []rune(w)
	return strings.ToUpper(string(r[0])) + string(r[1:])
}

func keyFiguresSection(s *report.Study, level string, _ report.Thresholds) (*section, error) {
	sec := &section{Key: "keyfigures", Title: "Key figures"}
	t := table{Caption: "Association and the least-squares line", Head: []string{"Measure", "Value", level + "% interval", "p"},
		Num: []bool{false, true, true, true}}
	add := func(m, v, ci, p string) { t.Rows = append(t.Rows, []string{m, v, ci, p}) }
	add("Rows used (n)", itoa(s.N), "", "")
	if pr := s.Pearson; pr != nil {
		add("Pearson r", num(pr.R), interval(pr.CILow, pr.CIHigh), pval(pr.P))
		add("p adjusted across studies", "", "", pval(pr.PAdjusted))
		add("r²", num(pr.R2), "", "")
		add(fmt.Sprintf("t (df %d)", pr.DF), num(pr.T), "", "")
	}
	if sp := s.Spearman; sp != nil {
		add("Spearman ρ", num(sp.Rho), "", pval(sp.P))
	}
	if k := s.Kendall; k != nil {
		add("Kendall τ-b", num(k.TauB), "", pval(k.P))
	}
	if l := s.Line; l != nil {
		if l.Slope != nil {
			add("Slope ("+unitPer(s)+")", num(l.Slope.Estimate), interval(l.Slope.CILow, l.Slope.CIHigh), pval(l.Slope.P))
			add("Slope standard error", num(l.Slope.SE), "", "")
			// The slope's intervals that allow for what the findings found:
			// residuals that hang together in run order, a changing scatter.
			if rb, f := s.Robust, s.Findings; rb != nil && f != nil {
				if rb.HAC != nil && f.Autocorrelated {
					add(fmt.Sprintf("Slope, Newey–West standard error (%d lags)", rb.HAC.Lags), num(rb.HAC.SE), interval(rb.HAC.CILow, rb.HAC.CIHigh), pval(rb.HAC.P))
				}
				if rb.HC3 != nil && f.SpreadChanges {
					add("Slope, HC3 standard error", num(rb.HC3.SE), interval(rb.HC3.CILow, rb.HC3.CIHigh), pval(rb.HC3.P))
				}
				if rb.NEff.Valid() && f.Autocorrelated && s.Pearson != nil {
					add("Pearson r, effective n "+num(rb.NEff), num(s.Pearson.R), interval(rb.RLow, rb.RHigh), pval(rb.RP))
				}
			}
		}
		if l.Intercept != nil {
			add("Intercept", num(l.Intercept.Estimate), interval(l.Intercept.CILow, l.Intercept.CIHigh), pval(l.Intercept.P))
		}
		add("Residual standard error", num(l.ResidualSE), "", "")
		add("R² / adjusted R²", num(l.R2)+" / "+num(l.AdjR2), "", "")
	}
	if d := s.Diagnostics; d != nil {
		add("Quadratic term", "", "", pval(d.QuadraticP))
		if lf := d.LackOfFit; lf != nil {
			add(fmt.Sprintf("Lack of fit F (%d, %d)", lf.DF1, lf.DF2), num(lf.F), "", pval(lf.P))
		}
		if dc := d.DistanceCorr; dc != nil {
			dcp := pval(dc.P)
			if dc.MCError.Valid() {
				dcp += " ± " + sig(float64(dc.MCError), 2)
			}
			add(fmt.Sprintf("Distance correlation (%d permutations)", dc.Permutations), num(dc.DCor), "", dcp)
		}
		if bp := d.BreuschPagan; bp != nil {
			add(fmt.Sprintf("Breusch–Pagan χ² (df %d)", bp.DF), num(bp.Stat), "", pval(bp.P))
		}
		dwOrder := "in data order"
		if s.Order != "" {
			dwOrder = "in order of " + chart.OrderName(s)
		}
		add("Durbin–Watson, residuals "+dwOrder, num(d.DurbinWatson), "", "")
		if d.DurbinWatsonX.Valid() {
			add("Durbin–Watson, residuals in order of "+name(s.X), num(d.DurbinWatsonX), "", "")
		}
		if ot := d.OrderTrend; ot != nil {
			add("Residual trend in run order (per unit of "+chart.OrderName(s)+")", num(ot.Slope), "", pval(ot.P))
		}
		if rs := d.Resistant; rs != nil {
			add("Resistant slope, "+methodName(rs.Method), num(rs.Slope), "", "")
		}
		if lw := d.Lowess; lw != nil {
			add("LOWESS settings", fmt.Sprintf("span %s, %d iterations", sig(lw.Frac, 3), lw.Iterations), "", "")
		}
	}
	sec.Tables = append(sec.Tables, t)
	mt := table{Caption: "Other fits of y on x (R² of log-y fits is on the log scale)", Head: []string{"Fit", "Formula", "R²", "Adjusted R²", "AIC", "Coefficients (" + level + "% interval)"},
		Num: []bool{false, false, true, true, true, false}, NoWrap: []bool{true, true}}
	for _, m := range s.Models {
		if m.Name == "line" {
			continue
		}
		var cs []string
		for _, c := range m.Coefficients {
			cs = append(cs, strings.NewReplacer("^2", "²", "^3", "³").Replace(c.Name)+" "+withCI(c.Estimate, c.CILow, c.CIHigh))
		}
		if m.Vertex.Valid() {
			cs = append(cs, "turning point at x = "+num(m.Vertex))
		}
		mt.Rows = append(mt.Rows, []string{m.Name, m.Formula, num(m.R2), num(m.AdjR2), num(m.AIC), strings.Join(cs, "; ")})
	}
	if len(mt.Rows) > 0 {
		sec.Tables = append(sec.Tables, mt)
	}
	if d := s.Describe; d != nil {
		dt := table{Caption: "The two variables over the rows used", Head: []string{"", "n", "Mean", "SD", "Min", "Q1", "Median", "Q3", "Max"},
			Num: []bool{false, true, true, true, true, true, true, true, true}}
		for _, v := range []struct {
			n string
			d report.Describe
		}{{withUnit(s.X), d.X}, {withUnit(s.Y), d.Y}} {
			dt.Rows = append(dt.Rows, []string{v.n, itoa(v.d.N), num(v.d.Mean), num(v.d.SD), num(v.d.Min), num(v.d.Q1), num(v.d.Median), num(v.d.Q3), num(v.d.Max)})
		}
		sec.Tables = append(sec.Tables, dt)
	}
	return sec, nil
}

func unitPer(s *report.Study) string {
	y, x := s.Y.Symbol, s.X.Symbol
	if y == "" || s.Y.Scale != "" {
		y = scaledPrefix[s.Y.Scale] + "y" // a log or root has no unit: "ln y per ln x"
	}
	if x == "" || s.X.Scale != "" {
		x = scaledPrefix[s.X.Scale] + "x"
	}
	return y + " per " + x
}

// scaledPrefix names a variable on its scale (report.Variable.Scale).
var scaledPrefix = map[string]string{"log": "ln ", "log10": "log₁₀ ", "sqrt": "√"}

func influenceSection(s *report.Study, _ string, _ report.Thresholds) (*section, error) {
	in := s.Influence
	if in == nil {
		return nil, nil
	}
	sec := &section{Key: "influence", Title: "Unusual rows"}
	c := in.Counts
	if c.Flagged == 0 {
		sec.Paras = append(sec.Paras, fmt.Sprintf("No row is flagged. The largest Cook's distance is %s (row %s).", num(in.MaxCooksD), in.MaxCooksRow))
		return sec, nil
	}
	counts := table{Caption: "Rows by flag, of all " + itoa(s.N), Head: []string{"Flag", "Rule (this study's cut point)", "Rows"},
		Num: []bool{false, false, true}}
	counts.Rows = [][]string{
		{"outlier", "|externally studentized residual| above " + num(in.Rules.Outlier), itoa(c.Outlier)},
		{"influential", "Cook's distance above " + num(in.Rules.CooksD), itoa(c.Influential)},
		{"sole support", "leverage 1: the row alone sets the slope", itoa(c.SoleSupport)},
		{"high leverage", "leverage above " + num(in.Rules.Leverage), itoa(c.HighLeverage)},
		{"high leverage only", "far out in x, close to the line: counted, not named", itoa(c.LeverageOnly)},
	}
	sec.Tables = append(sec.Tables, counts)
	if len(in.Points) == 0 {
		sec.Paras = append(sec.Paras, fmt.Sprintf("No row is named. The largest Cook's distance is %s (row %s).", num(in.MaxCooksD), in.MaxCooksRow))
	} else {
		caption := "Named rows, largest Cook's distance first"
		if c.Suspect > len(in.Points) {
			caption = fmt.Sprintf("The first %d of %d rows flagged outlier, influential or sole support, largest Cook's distance first", len(in.Points), c.Suspect)
		}
		t := table{Caption: caption,
			Head: []string{"Row", "x", "y", "Leverage", "Studentized residual", "Deleted residual", "Cook's distance", "DFFITS", "Why flagged"},
			Num:  []bool{false, true, true, true, true, true, true, true, false}}
		for _, pt := range in.Points {
			t.Rows = append(t.Rows, []string{pt.Row, num(pt.X), num(pt.Y), num(pt.Leverage), num(pt.Studentized), num(pt.StudentizedExt),
				num(pt.CooksD), num(pt.DFFITS), strings.Join(pt.Flags, ", ")})
		}
		sec.Tables = append(sec.Tables, t)
	}
	if len(in.Points) > 1 {
		sec.After = append(sec.After, "Order of the named rows: "+in.Ranking+".")
	}
	if in.File != "" {
		sec.After = append(sec.After, fmt.Sprintf("Every flagged row (%d), with all its measures, is listed in %s beside this report.", in.FileRows, in.File))
	}
	sec.After = append(sec.After, "The flag rules in force for this study, with their cut points, are stated under \"What the data show\".")
	return sec, nil
}

func sensitivitySection(s *report.Study, level string, _ report.Thresholds) (*section, error) {
	se := s.Sensitivity
	if se == nil {
		return nil, nil
	}
	sec := &section{Key: "sensitivity", Title: "How much the result rests on single rows"}
	t := table{Caption: "The line fitted to different sets of rows", Head: []string{"Rows", "r", "Slope", "Intercept"},
		Num: []bool{false, true, true, true}}
	r, slope, icpt := report.NaN(), report.NaN(), report.NaN()
	if s.Pearson != nil {
		r = s.Pearson.R
	}
	if s.Line != nil && s.Line.Slope != nil && s.Line.Intercept != nil {
		slope, icpt = s.Line.Slope.Estimate, s.Line.Intercept.Estimate
	}
	t.Rows = append(t.Rows, []string{fmt.Sprintf("All %d rows", s.N), num(r), num(slope), num(icpt)})
	for _, w := range se.WithoutEach {
		t.Rows = append(t.Rows, []string{"Without named row " + w.Row, num(w.R), num(w.Slope), num(w.Intercept)})
	}
	if se.NFlagged > 0 {
		rw := num(se.RWithoutFlagged)
		if se.RWithoutLow.Valid() {
			rw = withCI(se.RWithoutFlagged, se.RWithoutLow, se.RWithoutHigh)
		}
		t.Rows = append(t.Rows, []string{fmt.Sprintf("Without all %d flagged rows", se.NFlagged), rw, num(se.SlopeWithoutFlagged), num(se.InterceptWithout)})
	}
	method := "resistant line"
	if s.Diagnostics != nil && s.Diagnostics.Resistant != nil {
		method = "Resistant line, " + methodName(s.Diagnostics.Resistant.Method)
	}
	t.Rows = append(t.Rows, []string{method, na, num(se.ResistantSlope), num(se.ResistantIntercept)})
	sec.Tables = append(sec.Tables, t)
	sec.After = append(sec.After, fmt.Sprintf("Leaving out one row at a time, r ranges from %s%s to %s%s and the slope from %s to %s.",
		num(se.LooRMin), without(se.LooRMinRow), num(se.LooRMax), without(se.LooRMaxRow), num(se.LooSlopeMin), num(se.LooSlopeMax)))
	if se.NFlagged > 0 && se.PWithoutFlagged.Valid() {
		sec.After = append(sec.After, fmt.Sprintf("Without the flagged rows, p for r is %s (%s%% interval shown with r).", pval(se.PWithoutFlagged), level))
	}
	return sec, nil
}

func without(row string) string {
	if row == "" {
		return ""
	}
	return " (without row " + row + ")"
}

func orDash(s string) string {
	if s == "" {
		return na
	}
	return s
}

// symbol is a unit as people write it; a dimensionless code such as "1"
// has no symbol and shows as "none", an undeclared unit as n/a.
func symbol(sym, code string) string {
	switch {
	case sym != "":
		return sym
	case code != "":
		return "none"
	}
	return na
}

func unitsSection(s *report.Study, _ string, _ report.Thresholds) (*section, error) {
	if len(s.UnitInvariance) == 0 {
		return nil, nil
	}
	sec := &section{Key: "units", Title: "Units of measure"}
	t := table{Caption: "r, slope and intercept in other units", Head: []string{"x unit", "x UCUM", "y unit", "y UCUM", "r", "Slope", "Intercept", "Note"},
		Num: []bool{false, false, false, false, true, true, true, false}, Code: []bool{false, true, false, true}}
	var rs []string
	undefined := 0
	for _, u := range s.UnitInvariance {
		note := u.Note
		if u.Swapped {
			note = strings.TrimSpace("x and y swapped. " + note)
		}
		t.Rows = append(t.Rows, []string{symbol(u.XSymbol, u.XUnit), orDash(u.XUnit), symbol(u.YSymbol, u.YUnit), orDash(u.YUnit), num(u.R), num(u.Slope), num(u.Intercept), note})
		if u.R.Valid() {
			rs = append(rs, num(u.R))
		} else {
			undefined++
		}
	}
	sec.Tables = append(sec.Tables, t)
	same := len(rs) > 0
	for _, r := range rs {
		same = same && r == rs[0]
	}
	switch {
	case same && len(rs) > 1:
		where := "in every row of the table"
		if undefined > 0 {
			where = "in every row where it could be computed"
		}
		sec.After = append(sec.After, fmt.Sprintf("r reads %s %s: the strength of the association does not depend on the units the data were recorded in, nor on which variable is put on which axis. Slope and intercept change with the units, as they must, because they are measured in units of y per unit of x.", rs[0], where))
	case same:
		sec.After = append(sec.After, "Only one row could be computed, so the table shows no comparison of units.")
	default:
		sec.After = append(sec.After, "r differs between the rows of this table at the digits shown. A linear change of units cannot change r, so check the unit declarations and conversions of this study.")
	}
	return sec, nil
}

func groupsSection(s *report.Study, level string, _ report.Thresholds) (*section, error) {
	if len(s.Groups) == 0 && len(s.Partial) == 0 {
		return nil, nil
	}
	sec := &section{Key: "groups", Title: "Groups and other variables"}
	if len(s.Groups) > 0 {
		t := table{Caption: "The line within each level of " + chart.GroupName(s), Head: []string{chart.GroupName(s), "n", "r", "Slope (" + level + "% interval)", "Intercept"},
			Num: []bool{false, true, true, true, true}}
		for _, g := range s.Groups {
			t.Rows = append(t.Rows, []string{g.Group, itoa(g.N), num(g.R), withCI(g.Slope, g.SlopeLow, g.SlopeHigh), num(g.Intercept)})
		}
		sec.Tables = append(sec.Tables, t)
	}
	if len(s.Partial) > 0 {
		t := table{Caption: "Correlation of " + name(s.X) + " and " + name(s.Y) + " with each covariate held fixed (partial correlation)", Head: []string{"Covariate", "n", "Partial r (" + level + "% interval)", "p"},
			Num: []bool{false, true, true, true}}
		for _, pc := range s.Partial {
			label := pc.Label
			if label == "" {
				label = pc.Covariate
			}
			t.Rows = append(t.Rows, []string{label, itoa(pc.N), withCI(pc.R, pc.CILow, pc.CIHigh), pval(pc.P)})
		}
		sec.Tables = append(sec.Tables, t)
	}
	return sec, nil
}

func predictionsSection(s *report.Study, level string, _ report.Thresholds) (*section, error) {
	if len(s.Predictions) == 0 {
		return nil, nil
	}
	sec := &section{Key: "predictions", Title: "Predictions from the line"}
	t := table{Caption: fmt.Sprintf("%s at chosen values of %s", chart.InUnit(s.Y), chart.InUnit(s.X)),
		Head: []string{"x", "Fitted", "Mean response (" + level + "% confidence)", "One new row (" + level + "% prediction)", "Within observed range"},
		Num:  []bool{true, true, true, true, false}}
	for _, p := range s.Predictions {
		in := "yes"
		cls := ""
		if !p.InRange {
			in = "no — not supported"
			cls = "bad"
		}
		t.Rows = append(t.Rows, []string{num(p.X), num(p.Fit), interval(p.ConfLow, p.ConfHigh), interval(p.PredLow, p.PredHigh), in})
		t.Classes = append(t.Classes, cls)
	}
	sec.Tables = append(sec.Tables, t)
	sec.After = append(sec.After, "The confidence interval is for the mean of "+name(s.Y)+" at that x; the prediction interval is for one new row and is always wider. Outside the observed range of "+name(s.X)+" the line has no support in these data.")
	return sec, nil
}

func approximationsSection(s *report.Study, _ string, _ report.Thresholds) (*section, error) {
	if len(s.Approximations) == 0 {
		return nil, nil
	}
	sec := &section{Key: "approximations", Title: "Figures computed on a sample"}
	t := table{Caption: fmt.Sprintf("At %d rows these figures come from a sample; every other figure uses all rows", s.N),
		Head: []string{"Figure", "Computed on", "How chosen", "Error against the exact method"}, Num: []bool{false, true, false, false}}
	for _, a := range s.Approximations {
		t.Rows = append(t.Rows, []string{a.Figure, itoa(a.Rows), a.Method, a.Error})
	}
	sec.Tables = append(sec.Tables, t)
	return sec, nil
}

func limitsSection(s *report.Study, _ string, _ report.Thresholds) (*section, error) {
	if s.Findings == nil || len(s.Findings.Limits) == 0 {
		return nil, nil
	}
	return &section{Key: "limits", Title: "What may not be concluded", List: s.Findings.Limits, Box: true}, nil
}

func expectationsSection(s *report.Study, _ string, _ report.Thresholds) (*section, error) {
	if len(s.Expectations) == 0 {
		return nil, nil
	}
	sec := &section{Key: "expectations", Title: "Declared expectations"}
	t := table{Caption: "Expectations from the manifest", Head: []string{"Expectation", "Wanted", "Found", "Met", "Detail"},
		Num: []bool{false, false, false, false, false}}
	for _, e := range s.Expectations {
		ok, cls := "yes", "ok"
		if !e.OK {
			ok, cls = "NO", "bad"
		}
		t.Rows = append(t.Rows, []string{e.Name, e.Want, e.Got, ok, e.Detail})
		t.Classes = append(t.Classes, cls)
	}
	sec.Tables = append(sec.Tables, t)
	return sec, nil
}

func notesSection(s *report.Study, _ string, _ report.Thresholds) (*section, error) {
	if strings.TrimSpace(s.Notes) == "" {
		return nil, nil
	}
	html, err := notesHTML(s.Notes)
	if err != nil {
		return nil, fmt.Errorf("rendering the notes: %w", err)
	}
	return &section{Key: "notes", Title: "Notes", Notes: s.Notes, HTML: html}, nil
}

// methodName writes a method string from the analysis as people read it:
// "theil-sen (exact)" becomes "Theil–Sen (exact)", as the prose has it.
func methodName(m string) string {
	return strings.Replace(m, "theil-sen", "Theil–Sen", 1)
}
