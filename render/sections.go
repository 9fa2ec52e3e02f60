package render

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"bivar/analysis/findings"
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
		if reason != "" && f.Headline != "" && strings.Contains(strings.ToLower(f.Headline), strings.ToLower(strings.TrimSpace(strings.TrimSuffix(reason[strings.Index(reason, ": ")+1:], ".")))) {
			return // the headline says it in the same words
		}
		if reason != "" {
			// Which cut points are the tool's own choice the appendix
			// says once, with the rules.
			sec.List = append(sec.List, topic+" — "+ascii(strings.NewReplacer(" ("+findings.OwnChoice+")", "", ", "+findings.OwnChoice, "").Replace(reason)))
		} else {
			sec.List = append(sec.List, topic+": "+verdict+".")
		}
	}
	form := f.Form
	if f.Bend != nil && *f.Bend != "" {
		form += " (" + strings.ReplaceAll(*f.Bend, "-", " ") + ")"
	}
	// A straight line that no check questioned is what the headline says
	// ("along a straight line"); its figures (the x² term, the share of
	// scatter the quadratic removes) stand in the checks table and the
	// shapes table, its reason in results.json. A form that is not a line,
	// or a line a check raised a doubt about, keeps its reason here.
	raised := false
	for _, c := range f.Checks {
		raised = raised || c.Raised
	}
	if f.Form != "linear" || raised || f.Headline == "" {
		why("Form", f.FormWhy, form)
	}
	// Direction and strength are what the headline says, with r, its
	// interval and p ("no relationship" when r is not shown; "strong as a
	// curve, weak as a line" for a curve); their reasons (r against alpha
	// and the cut points of the appendix) stay in results.json. A curve
	// that turns over keeps its direction's reason: it has none.
	// (A headline that says where the curve turns over says that too:
	// the reason's figures, r and its p, stand in the numbers table.)
	if (f.TurnsOver && !strings.Contains(f.Headline, "turns over")) || f.Headline == "" {
		why("Direction", f.DirectionWhy, f.Direction)
	}
	if f.Headline == "" {
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
	// What the study's declarations left unchecked the appendix says for
	// every study at once (notDeclared).
	if len(sec.Items) == 0 {
		return nil, nil // the headline and the checks table say it all
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

// inY writes v with the unit of y on the study's scale.
func inY(s *report.Study, v report.Float) string { return withSym(num(v), ySym(s)) }

// ySym and xSym are the units of y and x as the study's figures are in
// them: the recorded unit, or on a transformed scale the unit under it
// ("ln µm", "ln y" without a unit), so that no log value is read as a
// recorded one.
func ySym(s *report.Study) string { return scaledSym(s.Y, "y") }
func xSym(s *report.Study) string { return scaledSym(s.X, "x") }

func scaledSym(v report.Variable, word string) string {
	if v.Scale == "" {
		return v.Symbol
	}
	return scaledPrefix[v.Scale] + orWord(v.Symbol, word)
}

// withSym writes a formatted value and a unit symbol.
func withSym(v, sym string) string {
	if sym == "" || v == na {
		return v
	}
	return v + " " + sym
}

// keyFiguresSection gives the figures an engineer asks of a study, one
// row each: what the figure says in plain words with the unit it is in
// first, the term after it; the cells hold bare numbers, so that the
// table pastes into a spreadsheet as numbers.
func keyFiguresSection(s *report.Study, level string, _ report.Thresholds) (*section, error) {
	sec := &section{Key: "keyfigures", Title: "The numbers"}
	t := table{Head: []string{"Figure, unit (term)", "Value", level + "% interval", "p"},
		Num: []bool{false, true, true, true}}
	// The term follows the plain words in brackets (the glossary
	// defines it).
	add := func(q, a, ci, p, how string) { t.Rows = append(t.Rows, []string{q + " (" + how + ")", a, ci, p}) }
	per, ySym := unitPer(s), orWord(ySym(s), "y units")
	if l := s.Line; l != nil && l.Slope != nil {
		// One p for one question: the slope's t test is r's test, whose p
		// (adjusted across studies) the r row gives; results.json keeps both.
		add("Change along the line, "+per, num(l.Slope.Estimate), interval(l.Slope.CILow, l.Slope.CIHigh), "",
			"slope; SE "+num(l.Slope.SE))
		if rb, f := s.Robust, s.Findings; rb != nil && f != nil {
			if rb.HAC != nil && f.Autocorrelated {
				add("… allowing for rows that hang together in run order, "+per, "", interval(rb.HAC.CILow, rb.HAC.CIHigh), pval(rb.HAC.P),
					fmt.Sprintf("Newey–West SE %s, %d lags", num(rb.HAC.SE), rb.HAC.Lags))
			}
			if rb.HC3 != nil && f.SpreadChanges {
				add("… allowing for an uneven scatter, "+per, "", interval(rb.HC3.CILow, rb.HC3.CIHigh), pval(rb.HC3.P), "HC3 SE "+num(rb.HC3.SE))
			}
		}
	}
	if l := s.Line; l != nil && l.Intercept != nil {
		add("Line at x = 0, "+ySym, num(l.Intercept.Estimate), interval(l.Intercept.CILow, l.Intercept.CIHigh), "", "intercept")
	}
	if l := s.Line; l != nil && l.ResidualSE.Valid() {
		add("Scatter about the line, "+ySym, num(l.ResidualSE), "", "", "residual SD")
	}
	if pr := s.Pearson; pr != nil {
		add("Closeness to a line", num(pr.R), interval(pr.CILow, pr.CIHigh), pval(pr.PAdjusted), "r; p across studies")
		if rb, f := s.Robust, s.Findings; rb != nil && f != nil && rb.NEff.Valid() && f.Autocorrelated {
			add("… counting rows that hang together as fewer", num(pr.R), interval(rb.RLow, rb.RHigh), pval(rb.RP), "effective n "+num(rb.NEff))
		}
	}
	// The screening questions (bend, lack of fit, other shapes, scatter,
	// drift) stand once for all studies in the checks table under the
	// summary (checksTable).
	sec.Tables = append(sec.Tables, t)
	// The measures a few rows cannot sway, in one sentence.
	var robust []string
	if rs := s.Diagnostics; rs != nil && rs.Resistant != nil && s.Line != nil && s.Line.Slope != nil {
		robust = append(robust, methodName(rs.Resistant.Method)+" slope "+withSym(num(rs.Resistant.Slope), per))
	}
	if sp, k := s.Spearman, s.Kendall; sp != nil && k != nil {
		robust = append(robust, "Spearman ρ "+num(sp.Rho)+", Kendall τ-b "+num(k.TauB)+" (p "+pIs(sp.P)+")")
	}
	// An agreement study's resistant comparison is its Passing–Bablok
	// line; the rank correlations of y on x stay in results.json there.
	if len(robust) > 0 && s.Agreement == nil {
		sec.After = append(sec.After, "Resistant to a few rows: "+strings.Join(robust, "; ")+".")
	}
	if sh := shapesText(s); sh != "" {
		sec.After = append(sec.After, sh)
	}
	// Where the data lie stands for every study in one table of the
	// appendix (dataTable).
	return sec, nil
}

// dataTable says where each study's variables lie, one row per variable
// and its figures, so that a variable with the same rows in several
// studies stands once, naming them.
func dataTable(studies []report.Study) table {
	t := table{Caption: "Where the data lie: each study's complete rows",
		Head: []string{"Variable", "Range", "Middle half", "Middle value", "Average ± SD", "Studies"},
		Num:  []bool{false, true, true, true, true, false},
		// in HTML, beside the range: the range drawn as a line, the
		// middle half as a bar on it, the middle value a stroke across
		// and the average a dot, each variable on its own range
		GlyphHead: "Bar: middle half; stroke: middle value; dot: average"}
	at := map[string]int{}
	for _, s := range studies {
		d := s.Describe
		if d == nil || s.Error != nil {
			continue
		}
		for _, v := range []struct {
			v report.Variable
			d report.Describe
		}{{s.X, d.X}, {s.Y, d.Y}} {
			// The range holds recorded values: no zeros padded to four
			// digits ("9.4 to 36 s", not "9.400 to 36.00").
			row := []string{withUnit(v.v), trimZeros(num(v.d.Min)) + " to " + trimZeros(num(v.d.Max)), num(v.d.Q1) + " to " + num(v.d.Q3),
				num(v.d.Median), num(v.d.Mean) + " ± " + num(v.d.SD)}
			key := strings.Join(row, "\x00")
			if i, ok := at[key]; ok {
				t.Rows[i][5] += ", " + s.ID
				continue
			}
			at[key] = len(t.Rows)
			t.Rows = append(t.Rows, append(row, s.ID))
			t.Glyphs = append(t.Glyphs, spreadGlyph(v.d))
		}
	}
	return t
}

// trimZeros drops the zeros a fixed number of significant digits pads
// after a decimal point: "9.400" → "9.4", "36.00" → "36".
func trimZeros(s string) string {
	if !strings.Contains(s, ".") || strings.ContainsAny(s, "e") {
		return s
	}
	return strings.TrimSuffix(strings.TrimRight(s, "0"), ".")
}

// spreadGlyph draws one variable's range (min to max) as a thin line, its
// middle half (Q1 to Q3) as a bar, its median as a stroke across the bar
// and its mean as a dot, on its own range: a small picture of where the
// values lie, beside their numbers. It places the report's figures on a
// 0–100 scale and computes nothing else; "" when the range is empty.
func spreadGlyph(d report.Describe) string {
	lo, hi := float64(d.Min), float64(d.Max)
	if !d.Min.Valid() || !d.Max.Valid() || !(hi > lo) {
		return ""
	}
	at := func(v report.Float) string {
		return strconv.FormatFloat(4+92*(float64(v)-lo)/(hi-lo), 'f', 1, 64)
	}
	var b strings.Builder
	b.WriteString(`<svg class="spread" viewBox="0 0 100 14" width="100" height="14" role="img" aria-label="range, middle half, middle value and average">`)
	b.WriteString(`<path d="M4 7H96" stroke="currentColor" stroke-width="1"/>`)
	if d.Q1.Valid() && d.Q3.Valid() {
		fmt.Fprintf(&b, `<rect x="%s" y="3" width="%s" height="8" class="mid"/>`, at(d.Q1),
			strconv.FormatFloat(92*(float64(d.Q3)-float64(d.Q1))/(hi-lo), 'f', 1, 64))
	}
	if d.Median.Valid() {
		fmt.Fprintf(&b, `<path d="M%s 1V13" stroke="currentColor" stroke-width="2"/>`, at(d.Median))
	}
	if d.Mean.Valid() {
		fmt.Fprintf(&b, `<circle cx="%s" cy="7" r="2.2" class="avg"/>`, at(d.Mean))
	}
	b.WriteString(`</svg>`)
	return b.String()
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

// shapeMeaning names each shape by what it would mean for the process,
// the fitted form in brackets after it.
var shapeMeaning = map[string]string{
	"quadratic": "a bend (parabola)",
	"log-x":     "diminishing returns (y on ln x)",
	"log-y":     "the same % change per unit of x (ln y on x)",
	"log-log":   "a power law (ln y on ln x)",
}

// shapesText sets each shape with a physical meaning that the analysis
// fitted to y itself (the analysis marks which) against the straight
// line, in one sentence: the typical scatter it leaves, the share of the
// line's squared scatter it removes (negative: it adds) and its AIC
// against the line. Fits of ln(y) are on another scale, so not compared
// here: results.json keeps them, and the appendix says so once.
func shapesText(s *report.Study) string {
	l := s.Line
	if l == nil || s.Agreement != nil {
		// two methods that measure one thing are compared by their
		// differences, not by other shapes of y on x (results.json keeps them)
		return ""
	}
	var parts []string
	for _, m := range s.Models {
		if m.Name == "line" || m.YScale == "ln(y)" {
			continue
		}
		what := shapeMeaning[m.Name]
		if what == "" {
			what = m.Name
		}
		if l.ExactToRounding {
			// The analysis compares no shape with a line that fits to
			// rounding (share and AIC NaN), and the parabola, the line
			// and one term more, is fitted to that rounding: its turning
			// point and scatter are the rounding's.
			if m.Name != "quadratic" {
				parts = append(parts, fmt.Sprintf("%s leaves %s", what, inY(s, m.ResidualSE)))
			}
			continue
		}
		switch {
		case m.Vertex.Valid() && m.VertexNear:
			what += " turning at x = " + withSym(num(m.Vertex), xSym(s))
		case m.Vertex.Valid():
			what += " turning far outside the data"
		}
		// The squared scatter it takes off the line's (or adds), and its
		// AIC against the line's, in words; the appendix says once how to
		// read both.
		share := pct(m.ShareVsLine) + " less squared scatter"
		switch v := float64(m.ShareVsLine); {
		case !m.ShareVsLine.Valid():
			share = "squared scatter n/a"
		case pct(m.ShareVsLine) == "0.0%" || pct(m.ShareVsLine) == "-0.0%":
			share = "about the same squared scatter"
		case v < 0:
			share = strings.TrimPrefix(pct(m.ShareVsLine), "-") + " more squared scatter"
		}
		// AIC differences to one decimal: finer digits mean nothing.
		aic := "AIC n/a"
		if m.AICVsLine.Valid() {
			d := strings.TrimPrefix(minus(strconv.FormatFloat(float64(m.AICVsLine), 'f', 1, 64)), "-")
			switch {
			case d == "0.0":
				aic = "about the line's AIC"
			case float64(m.AICVsLine) < 0:
				aic = "AIC " + d + " lower"
			default:
				aic = "AIC " + d + " higher"
			}
		}
		parts = append(parts, fmt.Sprintf("%s leaves %s, %s, %s", what, inY(s, m.ResidualSE), share, aic))
	}
	if l.ExactToRounding {
		if len(parts) == 0 {
			return "The line fits to rounding, so no other shape is compared with it."
		}
		return "The line fits to rounding (scatter " + inY(s, l.ResidualSE) + "), so no other shape is compared with it; " + strings.Join(parts, "; ") + "."
	}
	if len(parts) == 0 {
		return ""
	}
	return "Other shapes, against the line's scatter of " + inY(s, l.ResidualSE) + ": " + strings.Join(parts, "; ") + "."
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

// largestCooks writes the largest Cook's distance and its row, or that no
// row has one: where the line fits exactly, no scatter is left to weigh a
// row's pull against (report.Influence.MaxCooksD NaN).
func largestCooks(in *report.Influence) string {
	switch {
	case !in.MaxCooksD.Valid():
		return "Cook's distance is undefined for every row: the line leaves no scatter to weigh a row's pull against"
	case in.MaxCooksRow == "":
		return "largest Cook's distance " + num(in.MaxCooksD)
	}
	return fmt.Sprintf("largest Cook's distance %s, row %s", num(in.MaxCooksD), in.MaxCooksRow)
}

func influenceSection(s *report.Study, _ string, _ report.Thresholds) (*section, error) {
	in := s.Influence
	if in == nil {
		return nil, nil
	}
	sec := &section{Key: "influence", Title: "Unusual rows"}
	c := in.Counts
	if c.Flagged == 0 {
		sec.Paras = append(sec.Paras, "No row is flagged ("+largestCooks(in)+").")
		return sec, nil
	}
	// The rules stand once in the appendix; here each cut for this
	// study's rows, and the flags raised (a flag no row raised is left to
	// results.json's counts).
	var raised []string
	for _, f := range []struct {
		n    int
		flag string
	}{{c.Outlier, "outlier"}, {c.Influential, "influential"}, {c.SoleSupport, "sole support"}, {c.HighLeverage, "high leverage"}, {c.LeverageOnly, "of them high leverage only (counted, not named)"}} {
		if f.flag == "high leverage" && c.HighLeverage == c.LeverageOnly && c.Suspect == 0 {
			// every flagged row is high leverage only: one phrase
			f.flag = "high leverage only (counted, not named)"
		} else if f.flag != "high leverage" && c.HighLeverage == c.LeverageOnly && c.Suspect == 0 {
			continue
		}
		if f.n > 0 {
			raised = append(raised, itoa(f.n)+" "+f.flag)
		}
	}
	sec.Paras = append(sec.Paras, fmt.Sprintf("Cuts for %d rows: off the line beyond ±%s, pull above %s, reach above %s. Flagged: %s.",
		s.N, num(in.Rules.Outlier), num(in.Rules.CooksD), num(in.Rules.Leverage), strings.Join(raised, ", ")))
	if len(in.Points) == 0 {
		sec.Paras = append(sec.Paras, "No row is named ("+largestCooks(in)+").")
	} else {
		caption := "Named rows, largest Cook's distance first"
		if c.Suspect > len(in.Points) {
			caption = fmt.Sprintf("The first %d of %d rows flagged outlier, influential or sole support, largest Cook's distance first", len(in.Points), c.Suspect)
		}
		t := table{Caption: caption,
			Head: []string{"Row", "x" + paren(xSym(s)), "y" + paren(ySym(s)), "Off the line (SEs)", "Pull on the line", "Reach in x (0–1)", "Why flagged"},
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
		if in.FileRows < c.Suspect {
			sec.After = append(sec.After, fmt.Sprintf("The first %d of the %d rows flagged outlier, influential or sole support, with every measure: %s.", in.FileRows, c.Suspect, in.File))
		} else {
			sec.After = append(sec.After, fmt.Sprintf("Rows flagged outlier, influential or sole support (%d), with every measure: %s.", in.FileRows, in.File))
		}
	}
	return sec, nil
}

func sensitivitySection(s *report.Study, level string, _ report.Thresholds) (*section, error) {
	se := s.Sensitivity
	if se == nil {
		return nil, nil
	}
	sec := &section{Key: "sensitivity", Title: "How much the result rests on single rows"}
	t := table{Caption: "The line fitted to different sets of rows", Head: []string{"Rows", "r", "Slope (" + unitPer(s) + ")", "Intercept (" + orWord(ySym(s), "y units") + ")"},
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
		which := fmt.Sprintf("Without all %d flagged rows", se.NFlagged)
		if se.NFlagged == 1 {
			which = "Without the flagged row"
		}
		row := []string{which, rw, num(se.SlopeWithoutFlagged), num(se.InterceptWithout)}
		// One flagged row that is also the one named row: one line
		// says both, with r's interval.
		if last := t.Rows[len(t.Rows)-1]; len(se.WithoutEach) == 1 && se.NFlagged == 1 &&
			last[2] == row[2] && last[3] == row[3] && strings.HasPrefix(rw, last[1]) {
			t.Rows[len(t.Rows)-1] = []string{strings.Replace(last[0], "named row ", "", 1) + ", the one flagged row", rw, row[2], row[3]}
		} else {
			t.Rows = append(t.Rows, row)
		}
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
	// (An agreement study is judged by its differences: the line of y
	// on x without each row stays in results.json.)
	if s.Agreement == nil {
		rLo, rHi := numApart(se.LooRMin, se.LooRMax)
		sLo, sHi := numApart(se.LooSlopeMin, se.LooSlopeMax)
		// Ends that print alike (a line exact to rounding) are one value,
		// and the rows at them are picked by rounding: none is named.
		r := fmt.Sprintf("r %s%s to %s%s", rLo, without(se.LooRMinRow), rHi, without(se.LooRMaxRow))
		if rLo == rHi {
			r = "r " + rLo + " whichever row"
		}
		slope := "slope " + sLo + " to " + withSym(sHi, unitPer(s))
		if sLo == sHi {
			slope = "slope " + withSym(sHi, unitPer(s)) + " whichever row"
		}
		sec.After = append(sec.After, "Leaving out any one row: "+r+"; "+slope+".")
	}
	// An outlier-driven headline that gives r and p without the flagged
	// rows says it already.
	said := s.Findings != nil && s.Findings.OutlierDriven &&
		(strings.Contains(s.Findings.Headline, "without it, r = ") || strings.Contains(s.Findings.Headline, "without them, r = "))
	if se.NFlagged > 0 && se.PWithoutFlagged.Valid() && !said {
		sec.After = append(sec.After, fmt.Sprintf("Without the flagged rows, p for r is %s (%s%% interval shown with r).", pval(se.PWithoutFlagged), level))
	}
	return sec, nil
}

func without(row string) string {
	if row == "" {
		return ""
	}
	return " (without " + row + ")"
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
	var bare [][2]string
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
		// The table's cells carry their units (each row has its own);
		// the sentence below writes them itself.
		bare = append(bare, [2]string{slope, num(u.Intercept)})
		icpt := num(u.Intercept)
		if u.Note == "" {
			ys, xs := symbol(u.YSymbol, u.YUnit), symbol(u.XSymbol, u.XUnit)
			slope, icpt = withSym(slope, ys+" per "+xs), withSym(icpt, ys)
		}
		t.Rows = append(t.Rows, []string{xu, yu, num(u.R), slope, icpt})
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
	switch {
	case same && !other:
		// Only the swapped axes, which change nothing a reviewer reads:
		// results.json keeps them.
		return nil, nil
	case same && len(rs) > 1:
		// r is the same in every row: one sentence gives each row's slope
		// and intercept (the units' codes are in results.json).
		var parts []string
		for i, u := range s.UnitInvariance {
			row := append(t.Rows[i][:3:3], bare[i][0], bare[i][1])
			switch {
			case u.Note != "":
				parts = append(parts, fmt.Sprintf("x in %s, y in %s: %s", row[0], row[1], row[3]))
			case u.Swapped:
				parts = append(parts, fmt.Sprintf("axes swapped: slope %s %s per %s, intercept %s %s", row[3], row[1], symbol(u.XSymbol, u.XUnit), row[4], row[1]))
			case u.XUnit != s.X.Unit || u.YUnit != s.Y.Unit:
				// the slope's unit says which units x and y are in
				parts = append(parts, fmt.Sprintf("slope %s %s per %s, intercept %s %s", row[3], row[1], row[0], row[4], row[1]))
			}
		}
		where := "in every unit"
		if undefined > 0 {
			where = "in every unit it converts to"
		}
		sec.Paras = append(sec.Paras, fmt.Sprintf("Other units: r = %s %s; %s.", rs[0], where, strings.Join(parts, "; ")))
	case same:
		sec.Tables = append(sec.Tables, t)
	default:
		sec.Tables = append(sec.Tables, t)
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
		t := table{Caption: "The line within each level of " + chart.GroupName(s), Head: []string{chart.GroupName(s), "n", "r", "Slope, " + unitPer(s) + " (" + level + "% interval)", "Intercept (" + orWord(ySym(s), "y units") + ")"},
			Num: []bool{false, true, true, true, true}}
		// With many levels, those the findings chose (LevelsShown), in
		// their order; where none has a line, the findings' sentence in
		// place of the table.
		groups := s.Groups
		if f := s.Findings; f != nil && f.LevelsShownWhy != "" {
			groups, t.Caption = nil, f.LevelsShownWhy
			for _, name := range f.LevelsShown {
				if i := slices.IndexFunc(s.Groups, func(g report.GroupFit) bool { return g.Group == name }); i >= 0 {
					groups = append(groups, s.Groups[i])
				}
			}
		}
		for _, g := range groups {
			t.Rows = append(t.Rows, []string{g.Group, itoa(g.N), num(g.R), withCI(g.Slope, g.SlopeLow, g.SlopeHigh), num(g.Intercept)})
		}
		if len(t.Rows) > 0 {
			sec.Tables = append(sec.Tables, t)
		} else {
			sec.Paras = append(sec.Paras, t.Caption+".")
		}
	}
	if len(s.Partial) > 0 {
		t := table{Caption: "With each covariate held fixed (partial correlation of x and y)", Head: []string{"Covariate", "n", "Partial r (" + level + "% interval)", "p"},
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
	sec := &section{Key: "predictions", Title: "Predictions"}
	t := table{Head: []string{"x" + paren(xSym(s)), "Line" + paren(ySym(s)), "Mean of many rows, " + level + "%" + paren(ySym(s)), "One new row, " + level + "%" + paren(ySym(s)), "Inside the data"},
		Num: []bool{true, true, true, true, false}}
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
	// One sample for all (a study left in the database: its sample of
	// rows, whose method is a paragraph): said once, not in every row.
	one := len(s.Approximations) > 1
	for _, a := range s.Approximations[1:] {
		one = one && a.Method == s.Approximations[0].Method
	}
	if one {
		sec.Items = append(sec.Items, kv{K: "How chosen, for every figure below", V: s.Approximations[0].Method})
		t.Head = slices.Delete(t.Head, 2, 3)
		t.Num = slices.Delete(t.Num, 2, 3)
	}
	for _, a := range s.Approximations {
		row := []string{a.Figure, itoa(a.Rows), a.Method, a.Error}
		if one {
			row = slices.Delete(row, 2, 3)
		}
		t.Rows = append(t.Rows, row)
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
	"Drift in run order is not shown", "The p-values and intervals in this report assume independent rows; in run order the residuals do not clearly hang together",
	// the observational caution and the observed range (the appendix says
	// both; each study's data table gives the range, its predictions
	// table marks a prediction outside it)
	"These data are observational", "No prediction is supported outside the observed range", "The prediction at ", "The predictions at "}

// restated are the openings of limits that repeat, in other words, a
// reason the study's "What the data show" already gives under the topic.
var restated = map[string][]string{
	"Groups":     {"The levels of ", "Within groups of ", "One line serves all levels of ", "The slopes differ between the levels of "},
	"Covariates": {"Holding "},
}

func limitsSection(s *report.Study, _ string, _ report.Thresholds) (*section, error) {
	if s.Findings == nil || len(s.Findings.Limits) == 0 {
		return nil, nil
	}
	var list []string
	said := map[string]bool{}
	for _, r := range s.Findings.Reasons {
		said[r.Topic] = true
	}
	for _, l := range s.Findings.Limits {
		generic := false
		for _, o := range statedOnce {
			generic = generic || strings.HasPrefix(l, o)
		}
		for topic, openings := range restated {
			for _, o := range openings {
				generic = generic || (said[topic] && strings.HasPrefix(l, o))
			}
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

// notDeclared says, once for the report, which checks each study's
// declarations left out: a covariate, a group, a run order.
func notDeclared(studies []report.Study) string {
	var ids []string
	var covs, groups, orders []string
	for _, s := range studies {
		if s.Error != nil {
			continue
		}
		ids = append(ids, s.ID)
		if len(s.Covariates) == 0 && len(s.Partial) == 0 {
			covs = append(covs, s.ID)
		}
		if s.Group == "" {
			groups = append(groups, s.ID)
		}
		if s.Order == "" {
			orders = append(orders, s.ID)
		}
	}
	// which names the studies that lack a declaration: "every study",
	// "every study but a", or the list.
	which := func(lack []string) string {
		switch {
		case len(lack) == len(ids):
			return "every study"
		case len(lack) > len(ids)/2:
			var have []string
			for _, id := range ids {
				if !slices.Contains(lack, id) {
					have = append(have, id)
				}
			}
			return "every study but " + strings.Join(have, ", ")
		}
		return strings.Join(lack, ", ")
	}
	var parts []string
	if len(covs) > 0 {
		parts = append(parts, "a covariate (for a lurking variable) in "+which(covs))
	}
	if len(groups) > 0 {
		parts = append(parts, "a group (for a relationship that differs between lots, machines, shifts) in "+which(groups))
	}
	if len(orders) > 0 {
		parts = append(parts, "a run order (for drift, and rows that hang together in time: p-values and intervals assume they do not) in "+which(orders))
	}
	if len(parts) == 0 {
		return ""
	}
	return "Not declared, so not checked: " + strings.Join(parts, "; ") + "."
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

// answer is a screening question's answer in words, then its figures,
// the statistic before its p: "No (p 0.87)", "No (DW 1.89; p 1.00)".
func answer(yes bool, p report.Float, more ...string) string {
	fig := append([]string(nil), more...)
	if p.Valid() {
		fig = append(fig, "p "+pval(p))
	}
	a := yesNo(yes)
	if len(fig) > 0 {
		a += " (" + strings.Join(fig, "; ") + ")"
	}
	return a
}

// checksTable answers the screening questions of every study in one
// table: each column a plain question with the test's name after it, each
// cell the findings' answer in words, then its figures (p, and the
// statistic where it is read against a cut point).
func checksTable(studies []report.Study, anchors []string) table {
	t := table{Caption: "Checks of every study: p Holm-adjusted over the study's checks (tests: glossary)",
		Head: []string{"Study", "Does the line bend? (x² term)", "Do repeated settings stray from it? (lack of fit)", "Does x matter in a way the line misses? (distance correlation, 0 to 1)", "Does the scatter change with x? (Breusch–Pagan)", "Does it drift in run order? (trend; Durbin–Watson, DW)"},
		Num:  []bool{false, false, false, false, false, false}}
	floor := 0 // permutations of a p at its floor, for the caption
	for i := range studies {
		s := &studies[i]
		f, d := s.Findings, s.Diagnostics
		if s.Error != nil || f == nil || d == nil {
			continue
		}
		row := []string{s.ID, "not checked", "none repeated", "not checked", "not checked", "no run order declared"}
		if c := checkOf(s, "curvature"); c != nil {
			row[1] = answer(f.Form == "curved", c.PAdjusted)
			if c.Raised && f.Form != "curved" {
				// The x² term is significant but takes too little of the
				// line's scatter away for the findings to call the form
				// curved (their rule, findings.Thresholds.CurveShare).
				row[1] = "Too slightly to count (p " + pval(c.PAdjusted) + ")"
			}
		} else if d.QuadraticP.Valid() {
			row[1] = answer(f.Form == "curved", d.QuadraticP)
		}
		if f.Form == "nonlinear" {
			row[1] = "Not as a parabola"
		}
		if c := checkOf(s, "lack-of-fit"); c != nil {
			row[2] = answer(c.Raised, c.PAdjusted)
		} else if lf := d.LackOfFit; lf != nil && lf.NoPureError {
			row[2] = "Not tested: every repeat alike"
		}
		if dc := d.DistanceCorr; dc != nil {
			// Yes where the findings read a dependence the line misses:
			// form "nonlinear", or a curve (the bend column's); a strong
			// dependence the line follows is the line's, and says so.
			p := pval(dc.P)
			if atFloor(dc) {
				p = "≤ " + p
				floor = dc.Permutations
			}
			fig := " (" + num(dc.DCor) + "; p " + p + ")"
			switch {
			case f.Form == "curved":
				row[3] = "Yes: the curve" + fig
			case f.Form == "nonlinear":
				row[3] = "Yes" + fig
			case f.Form == "linear":
				row[3] = "No: the line follows it" + fig
			default:
				row[3] = "No" + fig
			}
		}
		if c := checkOf(s, "changing-spread"); c != nil {
			row[4] = answer(f.SpreadChanges, c.PAdjusted)
		}
		if c := checkOf(s, "drift"); c != nil {
			row[5] = answer(f.Drift, c.PAdjusted, "DW "+num(d.DurbinWatson))
		}
		if s.Line != nil && s.Line.ExactToRounding {
			// No check reads residuals that are rounding (the findings
			// say why). Lack of fit too, whatever the diagnostics hold:
			// repeated settings of an exact line have one y each, no pure
			// error, so its test is never there, and "none repeated" would
			// say x does not repeat.
			const not = "Not checked: the line fits to rounding"
			row[1], row[2], row[4] = not, not, not
			if s.Order != "" {
				row[5] = not
			}
		}
		t.Rows = append(t.Rows, row)
		t.Links = append(t.Links, "study-"+anchors[i])
	}
	if floor > 0 {
		t.Caption += fmt.Sprintf("; p ≤ %s is the least %d permutations give", pval(report.Float(1/float64(floor+1))), floor)
	}
	return t
}

// atFloor reports whether the permutation p of the distance correlation
// is the smallest its permutations can give, 1/(B + 1): no permutation
// reached the observed value (the p as the analysis defines it).
func atFloor(dc *report.DistanceCorr) bool {
	return dc.Permutations > 0 && dc.P.Valid() && float64(dc.P)*float64(dc.Permutations+1) <= 1+1e-9
}
