package render

import (
	"fmt"
	"strconv"
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
	pushdownSection,
	planSection,
	limitsSection,
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
			sec.List = append(sec.List, topic+" — "+ascii(reason))
		} else {
			sec.List = append(sec.List, topic+": "+verdict+".")
		}
	}
	form := f.Form
	if f.Bend != nil && *f.Bend != "" {
		form += " (" + strings.ReplaceAll(*f.Bend, "-", " ") + ")"
	}
	why("Form", f.FormWhy, form)
	// A plain direction and strength are what the headline above says,
	// with r and its interval; their reasons (r against alpha and the cut
	// points of the appendix) stay in results.json. A direction or
	// strength that needs its reason (none shown, a curve that turns
	// over, a curve's own strength) keeps it here.
	if (f.Direction != "positive" && f.Direction != "negative") || f.TurnsOver || f.Headline == "" {
		why("Direction", f.DirectionWhy, f.Direction)
	}
	if f.Strength == "none" || f.CurveStrength != "" || f.Headline == "" {
		why("Strength", f.StrengthWhy, f.Strength)
	}
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
	// The findings' longer statements (results.json "statements") repeat
	// the figures of the table below and the rules of the appendix; the
	// report shows the table and the rules once.
	if nc := notChecked(s); nc != "" {
		sec.After = append(sec.After, nc)
	}
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

// yesNo answers a question from a verdict the analysis raised.
func yesNo(b bool) string {
	if b {
		return "Yes"
	}
	return "No"
}

// checkOf is the findings' check of the given name, or nil.
func checkOf(s *report.Study, name string) *report.Check {
	if s.Findings == nil {
		return nil
	}
	for i := range s.Findings.Checks {
		if s.Findings.Checks[i].Name == name {
			return &s.Findings.Checks[i]
		}
	}
	return nil
}

// inY writes v with the unit of y.
func inY(s *report.Study, v report.Float) string { return withSym(num(v), s.Y.Symbol) }

// withSym writes a formatted value and a unit symbol.
func withSym(v, sym string) string {
	if sym == "" || v == na {
		return v
	}
	return v + " " + sym
}

// keyFiguresSection answers, one row per question, what an engineer asks
// of a study: the plain question first, the answer in units, and the
// method's name after it.
func keyFiguresSection(s *report.Study, level string, _ report.Thresholds) (*section, error) {
	sec := &section{Key: "keyfigures", Title: "The numbers behind it"}
	t := table{Caption: fmt.Sprintf("x is %s, y %s; intervals at %s%%", name(s.X), name(s.Y), level),
		Head: []string{"Question", "Answer", level + "% interval", "p", "Measure"},
		Num:  []bool{false, true, true, true, false}}
	add := func(q, a, ci, p, how string) { t.Rows = append(t.Rows, []string{q, a, ci, p, how}) }
	per := unitPer(s)
	if l := s.Line; l != nil && l.Slope != nil {
		add("How much does y change per "+orWord(s.X.Symbol, "unit of x")+"?", withSym(num(l.Slope.Estimate), per), interval(l.Slope.CILow, l.Slope.CIHigh), pval(l.Slope.P),
			"slope (SE "+withSym(num(l.Slope.SE), per)+")")
		if rb, f := s.Robust, s.Findings; rb != nil && f != nil {
			if rb.HAC != nil && f.Autocorrelated {
				add("… allowing for rows that hang together in run order", "", interval(rb.HAC.CILow, rb.HAC.CIHigh), pval(rb.HAC.P),
					fmt.Sprintf("Newey–West SE %s, %d lags", num(rb.HAC.SE), rb.HAC.Lags))
			}
			if rb.HC3 != nil && f.SpreadChanges {
				add("… allowing for an uneven scatter", "", interval(rb.HC3.CILow, rb.HC3.CIHigh), pval(rb.HC3.P), "HC3 SE "+num(rb.HC3.SE))
			}
		}
		if rs := s.Diagnostics; rs != nil && rs.Resistant != nil {
			add("… by a method a few rows barely move", withSym(num(rs.Resistant.Slope), per), "", "", methodName(rs.Resistant.Method))
		}
	}
	if pr := s.Pearson; pr != nil {
		add("How closely do the rows follow a line?", num(pr.R), interval(pr.CILow, pr.CIHigh), pval(pr.PAdjusted), "Pearson r, p adjusted across studies")
		if rb, f := s.Robust, s.Findings; rb != nil && f != nil && rb.NEff.Valid() && f.Autocorrelated {
			add("… counting rows that hang together as fewer", num(pr.R), interval(rb.RLow, rb.RHigh), pval(rb.RP), "effective n "+num(rb.NEff))
		}
	}
	if l := s.Line; l != nil {
		add("How far do rows typically lie from the line?", inY(s, l.ResidualSE), "", "", "residual SD")
		add("What share of y's variation does the line follow?", num(l.R2), "", "", "R²")
		if l.Intercept != nil {
			add("Where is the line at x = 0?", inY(s, l.Intercept.Estimate), interval(l.Intercept.CILow, l.Intercept.CIHigh), "", "intercept")
		}
	}
	if sp, k := s.Spearman, s.Kendall; sp != nil && k != nil {
		add("Do the ranks agree?", num(sp.Rho)+"; "+num(k.TauB), "", pval(sp.P), "Spearman ρ; Kendall τ-b")
	}
	// The screening questions (bend, lack of fit, other shapes, scatter,
	// drift) stand once for all studies in the checks table under the
	// summary (checksTable).
	sec.Tables = append(sec.Tables, t)
	if mt := shapesTable(s); len(mt.Rows) > 0 {
		sec.Tables = append(sec.Tables, mt)
	}
	if d := s.Describe; d != nil {
		dt := table{Caption: "Where the data lie",
			Head: []string{"Variable", "Range", "Middle half", "Middle value", "Average ± SD"},
			Num:  []bool{false, true, true, true, true}}
		for _, v := range []struct {
			v report.Variable
			d report.Describe
		}{{s.X, d.X}, {s.Y, d.Y}} {
			dt.Rows = append(dt.Rows, []string{withUnit(v.v), num(v.d.Min) + " to " + num(v.d.Max), num(v.d.Q1) + " to " + num(v.d.Q3),
				num(v.d.Median), num(v.d.Mean) + " ± " + num(v.d.SD)})
		}
		sec.Tables = append(sec.Tables, dt)
	}
	return sec, nil
}

// paren is " (unit)", or "" without a unit.
func paren(u string) string {
	if u == "" {
		return ""
	}
	return " (" + u + ")"
}

func orWord(sym, word string) string {
	if sym == "" {
		return word
	}
	return sym
}

// shapeMeaning says in a few words what each shape would mean.
var shapeMeaning = map[string]string{
	"line":      "same step per unit of x",
	"quadratic": "bends; may turn over",
	"log-x":     "diminishing returns",
	"log-y":     "same % per unit of x",
	"log-log":   "power law",
}

// shapesTable compares the shapes the analysis fitted with the straight
// line, by how much of the line's scatter each removes and by AIC, both
// only where the shape was fitted to y itself (the analysis marks which).
func shapesTable(s *report.Study) table {
	t := table{Caption: "Shapes tried against the straight line: scatter removed is the share of the line's residual sum of squares the shape removes (negative: it scatters more); a lower AIC fits better for its coefficients. Fits of ln(y) are on another scale and not compared; every coefficient is in results.json",
		Head: []string{"Shape", "Meaning", "Scatter about it", "Scatter removed", "AIC against line"},
		Num:  []bool{false, false, true, true, true}}
	if l := s.Line; l != nil && len(s.Models) > 0 {
		t.Rows = append(t.Rows, []string{"line (baseline)", shapeMeaning["line"], inY(s, l.ResidualSE), "—", "—"})
	}
	for _, m := range s.Models {
		if m.Name == "line" {
			continue
		}
		scatter, share, aic := inY(s, m.ResidualSE), pct(m.ShareVsLine), signedNum(m.AICVsLine)
		if m.YScale == "ln(y)" {
			scatter, share, aic = num(m.ResidualSE)+" in ln(y)", "—", "—"
		}
		meaning := shapeMeaning[m.Name]
		switch {
		case m.Vertex.Valid() && m.VertexNear:
			meaning = "bends; turns at x = " + withSym(num(m.Vertex), s.X.Symbol)
		case m.Vertex.Valid():
			meaning = "bends; turns far outside the data"
		}
		t.Rows = append(t.Rows, []string{m.Name, meaning, scatter, share, aic})
	}
	if len(t.Rows) < 2 {
		t.Rows = nil
	}
	return t
}

// pct writes a share as a percentage with one decimal, n/a when undefined.
func pct(v report.Float) string {
	if !v.Valid() {
		return na
	}
	return minus(strconv.FormatFloat(100*float64(v), 'f', 1, 64)) + "%"
}

// signedNum is num with "+" on a positive value; a negative AIC
// difference means the shape fits better than the line for its extra
// coefficient.
func signedNum(v report.Float) string {
	if v.Valid() && float64(v) > 0 {
		return "+" + num(v)
	}
	return num(v)
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
		t := table{Caption: fmt.Sprintf("%s. Off the line: externally studentized residual, flagged beyond ±%s; pull on the line: Cook's distance, flagged above %s; reach in x: leverage, flagged above %s",
			caption, num(in.Rules.Outlier), num(in.Rules.CooksD), num(in.Rules.Leverage)),
			Head: []string{"Row", "x" + paren(s.X.Symbol), "y" + paren(s.Y.Symbol), "Off the line", "Pull on the line", "Reach in x", "Why flagged"},
			Num:  []bool{false, true, true, true, true, true, false}}
		for _, pt := range in.Points {
			t.Rows = append(t.Rows, []string{pt.Row, num(pt.X), num(pt.Y), num(pt.StudentizedExt),
				num(pt.CooksD), num(pt.Leverage), strings.Join(pt.Flags, ", ")})
		}
		sec.Tables = append(sec.Tables, t)
	}
	if len(in.Points) > 1 {
		sec.After = append(sec.After, "Order of the named rows: "+in.Ranking+".")
	}
	if in.File != "" {
		sec.After = append(sec.After, fmt.Sprintf("Every flagged row (%d), with all its measures, is listed in %s beside this report.", in.FileRows, in.File))
	}
	return sec, nil
}

func sensitivitySection(s *report.Study, level string, _ report.Thresholds) (*section, error) {
	se := s.Sensitivity
	if se == nil {
		return nil, nil
	}
	sec := &section{Key: "sensitivity", Title: "How much the result rests on single rows"}
	t := table{Caption: "The line fitted to different sets of rows", Head: []string{"Rows", "r", "Slope (" + unitPer(s) + ")", "Intercept (" + orWord(s.Y.Symbol, "y units") + ")"},
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
	// With no row named or flagged the table would repeat the line (and
	// the resistant slope stands in the numbers above): only the sentence.
	if len(t.Rows) > 1 {
		method := "resistant line"
		if s.Diagnostics != nil && s.Diagnostics.Resistant != nil {
			method = "Resistant line, " + methodName(s.Diagnostics.Resistant.Method)
		}
		t.Rows = append(t.Rows, []string{method, na, num(se.ResistantSlope), num(se.ResistantIntercept)})
		sec.Tables = append(sec.Tables, t)
	}
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
	sec := &section{Key: "units", Title: "In other units"}
	t := table{Caption: "r, slope and intercept with x and y in other units (UCUM codes in results.json)", Head: []string{"x in", "y in", "r", "Slope", "Intercept"},
		Num: []bool{false, false, true, true, true}}
	var rs []string
	undefined := 0
	for _, u := range s.UnitInvariance {
		xu, yu := symbol(u.XSymbol, u.XUnit), symbol(u.YSymbol, u.YUnit)
		if u.Swapped {
			xu += " (x and y swapped)"
		}
		slope := num(u.Slope)
		if u.Note != "" {
			slope = ascii(u.Note)
		}
		t.Rows = append(t.Rows, []string{xu, yu, num(u.R), slope, num(u.Intercept)})
		if u.R.Valid() {
			rs = append(rs, num(u.R))
		} else {
			undefined++
		}
	}
	// Without other units declared the table holds only the declared
	// units and the swapped axes: one sentence says what it would.
	other := false
	for _, u := range s.UnitInvariance {
		other = other || (!u.Swapped && (u.XUnit != s.X.Unit || u.YUnit != s.Y.Unit))
	}
	same := len(rs) > 0
	for _, r := range rs {
		same = same && r == rs[0]
	}
	if other || !same {
		sec.Tables = append(sec.Tables, t)
	}
	switch {
	case same && !other:
		// Only the swapped axes, which change nothing a reviewer reads:
		// results.json keeps them.
		return nil, nil
	case same && len(rs) > 1:
		sec.After = append(sec.After, fmt.Sprintf("r is %s in every unit and with the axes swapped; slope and intercept change with the units, as they must.", rs[0]))
	case same:
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
		t := table{Caption: "The line within each level of " + chart.GroupName(s), Head: []string{chart.GroupName(s), "n", "r", "Slope, " + unitPer(s) + " (" + level + "% interval)", "Intercept (" + orWord(s.Y.Symbol, "y units") + ")"},
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
		Head: []string{"x" + paren(s.X.Symbol), "Line" + paren(s.Y.Symbol), "Mean of many rows, " + level + "%", "One new row, " + level + "%", "Inside the data"},
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

// pushdownSection says, for a study whose rows stayed in the database,
// which figures the database computed over every row, which come from its
// sample and which the study does not have, and why (report.Pushdown).
func pushdownSection(s *report.Study, _ string, _ report.Thresholds) (*section, error) {
	p := s.Pushdown
	if p == nil {
		return nil, nil
	}
	sec := &section{Key: "pushdown", Title: "Computed in the database"}
	sec.Paras = append(sec.Paras, fmt.Sprintf("The dataset's query gives %s rows, more than its max_rows = %s, so the rows stayed in the database: it summed them, and bivar fetched only the sums, the named rows and a sample of %s rows (%s). The %d SQL statements run are listed in results.json.",
		itoa(p.Rows), itoa(p.Limit), itoa(p.Sample), p.Method, len(p.Statements)))
	if len(p.Exact) > 0 {
		sec.Items = append(sec.Items, kv{K: "Over every row", V: strings.Join(p.Exact, "; ")})
	}
	if len(p.Sampled) > 0 {
		sec.Items = append(sec.Items, kv{K: "From the sample", V: strings.Join(p.Sampled, "; ")})
	}
	if len(p.Omitted) > 0 {
		t := table{Caption: "Not computed for rows left in the database", Head: []string{"Figure", "Why"}, Num: []bool{false, false}}
		for _, o := range p.Omitted {
			t.Rows = append(t.Rows, []string{o.Figure, o.Why})
		}
		sec.Tables = append(sec.Tables, t)
	}
	return sec, nil
}

// statedOnce are the openings of the findings' limits that say the same
// for every study they apply to; the appendix states them once and each
// study's "Not checked" line names which apply.
var statedOnce = []string{"No covariates were declared", "No grouping variable", "No run order was declared", "The checks of ",
	// and those that only say a check found nothing, as the numbers table does
	"Drift in run order is not shown", "The p-values and intervals in this report assume independent rows; in run order the residuals do not clearly hang together"}

func limitsSection(s *report.Study, _ string, _ report.Thresholds) (*section, error) {
	if s.Findings == nil || len(s.Findings.Limits) == 0 {
		return nil, nil
	}
	var list []string
	for _, l := range s.Findings.Limits {
		generic := false
		for _, o := range statedOnce {
			generic = generic || strings.HasPrefix(l, o)
		}
		if !generic {
			list = append(list, ascii(l))
		}
	}
	if len(list) == 0 {
		return nil, nil
	}
	return &section{Key: "limits", Title: "What may not be concluded", List: list, Box: true}, nil
}

// notChecked names the checks the study's declarations left out.
func notChecked(s *report.Study) string {
	var n []string
	if len(s.Covariates) == 0 && len(s.Partial) == 0 {
		n = append(n, "lurking variables (no covariates declared)")
	}
	if s.Group == "" {
		n = append(n, "differences between groups (no group declared)")
	}
	if s.Order == "" {
		n = append(n, "drift and dependence in run order (no order declared)")
	}
	if len(n) == 0 {
		return ""
	}
	return "Not checked: " + strings.Join(n, "; ") + "."
}

// gateTitle names a gate in words: the analysis's title, or for a report
// written before gates had titles, its manifest key.
func gateTitle(e report.Expectation) string {
	if e.Title != "" {
		return e.Title
	}
	return e.Name
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

// answer is a screening question's answer with its p: "No (p 0.873)".
func answer(yes bool, p report.Float) string {
	a := yesNo(yes)
	if p.Valid() {
		a += " (p " + pval(p) + ")"
	}
	return a
}

// checksTable answers the screening questions of every study in one
// table: the verdicts are the findings', the p-values the analysis's.
func checksTable(studies []report.Study, anchors []string) table {
	t := table{Caption: "The checks of every study, each a plain question; the term after it names the test (see the glossary). Each check's p is after Holm's adjustment over the study's checks, where it takes part in it",
		Head: []string{"Study", "Does the line bend? (x² term)", "Do repeated settings' means stray from it? (lack of fit)", "How strong is the dependence of any shape? (distance correlation, 0 to 1)", "Does the scatter change with x? (Breusch–Pagan)", "Drift in run order? (Durbin–Watson, trend)"},
		Num:  []bool{false, false, false, false, false, false}}
	for i := range studies {
		s := &studies[i]
		f, d := s.Findings, s.Diagnostics
		if s.Error != nil || f == nil || d == nil {
			continue
		}
		row := []string{s.ID, "not checked", "no repeated settings", "not checked", "not checked", "no run order declared"}
		if c := checkOf(s, "curvature"); c != nil {
			row[1] = answer(f.Form == "curved", c.PAdjusted)
		} else if d.QuadraticP.Valid() {
			row[1] = answer(f.Form == "curved", d.QuadraticP)
		}
		if f.Form == "nonlinear" {
			row[1] = "Not as a parabola"
		}
		if c := checkOf(s, "lack-of-fit"); c != nil {
			row[2] = answer(c.Raised, c.PAdjusted)
		}
		if dc := d.DistanceCorr; dc != nil {
			row[3] = num(dc.DCor) + " (p " + pval(dc.P) + ")"
			if f.Form == "nonlinear" {
				row[3] += ": a shape the line misses"
			}
		}
		if c := checkOf(s, "changing-spread"); c != nil {
			row[4] = answer(f.SpreadChanges, c.PAdjusted)
		}
		if c := checkOf(s, "drift"); c != nil {
			row[5] = answer(f.Drift, c.PAdjusted) + ", DW " + num(d.DurbinWatson)
		}
		t.Rows = append(t.Rows, row)
		t.Links = append(t.Links, "study-"+anchors[i])
	}
	return t
}
