package render

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"bivar/analysis/report"
	"bivar/render/chart"
)

// This file turns a Report into the page model both templates read: the
// same words, tables and figures for HTML and Markdown, so the two formats
// cannot drift apart. Nothing here computes a statistic; it selects,
// orders and formats what the analysis put into the Report.

type page struct {
	Title      string
	Caution    string
	Generated  string
	Tool       string
	Level      string // confidence in percent, "95"
	Provenance []kv
	Datasets   table
	Sources    table // datasets read from a workbook or a database: where exactly
	Excluded   table
	LeftOut    table // rows left out on purpose (exclude), each with its reason
	Summary    summary
	Checks     table // the screening questions of every study, answered
	Studies    []*studyView
	Thresholds string
	// RunDate is the run's date and time in UTC, "" when the Report has
	// none; Identity names the manifest and each data file with the start
	// of its SHA-256; Failed lists every failed CI gate for the banner.
	RunDate  string
	Identity string
	Failed   []failedGate
	// Appendix states once what holds for every study it applies to;
	// Glossary defines the terms the tables name after their questions.
	Appendix []string
	Glossary []kv
	// Data says where each study's variables lie.
	Data table
	// Plans is the next-run planning of every study, one row each (the
	// findings' sentences stay in results.json).
	Plans     table
	PlanNotes []string // agreement studies' planning, a sentence each
}

// appendix is said once for the whole report (each study's "Not checked"
// line names which of the checks it lacks).
var appendix = []string{
	"Curvature, lack of fit, changing scatter and drift are screens: their p-values share alpha within each study (Holm), not across studies; the distance correlation and the residuals in order of x are screened at alpha unadjusted. A flag calls for a look at the charts, not a conclusion.",
	"Unusual rows, with each study's cuts for its number of rows: off the line, the row's distance from the line fitted without it, in standard errors (externally studentized residual); pull on the line, how far the line moves without it (Cook's distance); reach in x, how far out in x it lies, 1/n to 1 (leverage). Rows far out in x but close to the line are counted, not named.",
	"Charts: the main fit (the least-squares line in its confidence band, or a curve or the lines within groups where found), LOWESS dash-dot, named rows circled; under it, on its x axis, each row's distance from the fit, beside it the drift strip in run order: a bow, a funnel or long runs on one side say where the fit misses.",
	"Other shapes: the scatter each leaves (residual SD), its squared scatter (residual sum of squares) against the line's, and its AIC against the line's (lower: better, its extra coefficients counted). Fits of ln(y): results.json only.",
	"p below 0.0001 is printed \"< 0.0001\"; results.json holds every exact value and every figure the report leaves out.",
}

// observational is said once for every study whose findings carry the
// observational caution (they are left out of each study's limits).
const observational = "Observational data show association, not cause: not that changing x would change y. No study supports a prediction outside the observed range of x (see Where the data lie)."

// glossary defines the terms the report uses after its plain questions.
var glossary = []kv{
	{"r (Pearson)", "how closely the rows follow a straight line, -1 to 1"},
	{"R²", "the share of y's variation a fit follows"},
	{"Confidence interval", "holds the true value (for a prediction, the mean of many rows) in the stated share of samples"},
	{"Prediction interval", "the range for one new row"},
	{"p", "how often data this far from \"no relationship\" would arise by chance"},
	{"Spearman ρ, Kendall τ-b", "correlations of the ranks"},
	{"Distance correlation", "dependence of any shape, 0 only when there is none"},
	{"Breusch–Pagan", "tests whether the scatter changes with x"},
	{"Durbin–Watson", "2 when neighbouring rows stray independently, well below 2 when together"},
	{"AIC", "closeness of a fit penalised for its coefficients; lower is better"},
	{"Theil–Sen", "the median slope between pairs of rows: a few rows cannot sway it"},
	{"LOWESS", "a smooth curve through the points, fitted piece by piece"},
}

// glossaryHolm and glossaryAgreement are defined where the report uses
// them: Holm's adjustment in every report that adjusts by it, the method
// comparison's terms only with an agreement study.
var (
	glossaryHolm      = kv{"Holm", "raises p-values for the number of tests read together"}
	glossaryAgreement = []kv{
		{"Deming, Passing–Bablok", "lines for two methods that both carry error"},
		{"Lin's concordance", "closeness to exact agreement, -1 to 1"},
	}
)

// failedGate is one failed CI gate, for the banner at the top.
type failedGate struct {
	Study, Gate, Link string
}

type kv struct{ K, V string }

// table is a caption, a header row and body rows; Num marks the columns
// that hold numbers (right-aligned).
type table struct {
	Caption string
	Head    []string
	Num     []bool
	NoWrap  []bool // columns whose cells never wrap (formulas)
	Code    []bool // columns that hold codes (UCUM units): <code> in HTML, a code span in Markdown
	Rows    [][]string
	Classes []string // optional class per row ("bad", "ok"), HTML only
	Links   []string // optional fragment per row: the first cell links to it, HTML only
	// Glyphs, HTML only: a small drawing per row (trusted SVG), shown in
	// a column of its own headed GlyphHead after the second column.
	Glyphs    []string
	GlyphHead string
}

func (t table) Empty() bool { return len(t.Rows) == 0 }

// Long says whether the table is long enough that printing may split it
// across pages (with its header row repeated) rather than push it whole
// to the next page and leave half a page blank.
func (t table) Long() bool { return len(t.Rows) > 10 }

type figure struct {
	Kind    string // scatter, residuals, order
	Fig     *chart.Figure
	File    string // path of the SVG beside report.md, slash-separated
	SVG     string // the drawn SVG (trusted: chart escapes every label)
	Alt     string
	Caption string
	Main    bool
	Under   bool // stands under the main figure, as wide, on its x axis
	// UnderSVG and UnderCaption are, on the main figure, the Under
	// figure's: the HTML draws it inside the main figure, right under the
	// chart whose x axis it shares, and their captions after both.
	UnderSVG, UnderCaption string
	// Note is the caption where it says more than Alt, for report.md,
	// which shows both (the HTML shows the caption only).
	Note string
}

// section is one titled part of a study; sections are produced by the
// functions in studySections, in order, and each is skipped when nil.
type section struct {
	Key    string // CSS class and Markdown anchor hint
	Title  string
	Paras  []string
	List   []string
	Items  []kv // bullets with a lead word in bold: "Form — …"
	Tables []table
	After  []string // sentences after the tables
	Box    bool     // drawn as a boxed aside (limits)
	Notes  string   // study notes, Markdown source
	HTML   string   // notes rendered by goldmark (raw HTML disabled)
}

type studyView struct {
	Anchor   string
	ID       string
	Title    string
	Pair     string
	Error    string
	Headline string
	Verdict  []kv
	// Status names what the pooled verdict alone would hide (rests on
	// single rows, reverses within groups, explained by a covariate,
	// curved); Gates are the CI gates' outcomes, one line each (the slope
	// stands in the summary and the study's numbers).
	Status   []string
	Gates    []gateLine
	Top      []*section // the engineer's notes, shown before the detail
	Figures  []figure
	Sections []*section
}

// gateLine is one CI gate's outcome at the top of its study.
type gateLine struct {
	OK   bool
	Text string
}

func name(v report.Variable) string {
	if v.Label != "" {
		return v.Label
	}
	return v.Column
}

func withUnit(v report.Variable) string { return chart.AxisTitle(v) }

// slugs gives each study a distinct, file-name-safe anchor, in order.
func slugs(studies []report.Study) []string {
	seen := map[string]bool{}
	out := make([]string, len(studies))
	for i, s := range studies {
		var b strings.Builder
		for _, r := range strings.ToLower(s.ID) {
			switch {
			case r >= 'a' && r <= 'z', r >= '0' && r <= '9', r == '-', r == '_':
				b.WriteRune(r)
			default:
				if !strings.HasSuffix(b.String(), "-") {
					b.WriteByte('-')
				}
			}
		}
		slug := strings.Trim(b.String(), "-")
		if len(slug) > 60 {
			slug = slug[:60]
		}
		if slug == "" {
			slug = "study"
		}
		base := slug
		for k := 2; seen[slug]; k++ {
			slug = fmt.Sprintf("%s-%d", base, k)
		}
		seen[slug] = true
		out[i] = slug
	}
	return out
}

func buildPage(r *report.Report, cfg *config) (*page, error) {
	p := &page{
		Title:     r.Manifest.Title,
		Caution:   r.Caution,
		Generated: r.Generated,
		Tool:      strings.TrimSpace(r.Tool.Name + " " + r.Tool.Version),
		Level:     percent(r.Manifest.Alpha),
	}
	if p.Title == "" {
		p.Title = "bivar report"
	}
	if p.Caution == "" {
		p.Caution = report.Caution
	}
	m := r.Manifest
	th := m.Thresholds
	// The tool stands in the header and the footer.
	p.Provenance = []kv{
		{"Manifest", m.File},
		{"Manifest SHA-256", m.SHA256},
		{"Design", m.Design},
		{"Significance level", fmt.Sprintf("alpha = %s; intervals at %s%%", short(m.Alpha), p.Level)},
		{"Adjustment across studies", adjustName(m.Adjust)},
		{"Random seed", fmt.Sprint(m.Seed)},
	}
	if r.Generated != "" {
		p.Provenance = append(p.Provenance, kv{"Generated", r.Generated})
	}
	// The findings state the cut points as the rules apply them; a report
	// written before that field existed shows its table of cut points only.
	p.Thresholds = ascii(m.Rules)

	p.Datasets = table{Caption: "Data files read",
		Head: []string{"Dataset", "File", "SHA-256", "Rows read", "Missing cells", "Non-numeric cells"},
		Num:  []bool{false, false, false, true, false, false}}
	p.Sources = table{Caption: "Where the rows of workbooks and databases came from",
		Head: []string{"Dataset", "Source", "Details"}, Num: []bool{false, false, false}}
	for _, d := range r.Datasets {
		file := d.File
		if file == "" && d.Source != nil {
			file = d.Source.Kind
		}
		p.Datasets.Rows = append(p.Datasets.Rows, []string{d.ID, file, d.SHA256, itoa(d.Rows), counts(d.Missing), counts(d.NonNumeric)})
		if src := d.Source; src != nil {
			var det []string
			add := func(k, v string) {
				if v != "" {
					det = append(det, k+": "+v)
				}
			}
			add("sheet", src.Sheet)
			if src.HeaderRow > 0 {
				add("header row", itoa(src.HeaderRow))
			}
			add("server", src.ServerVersion)
			add("statement", src.Query)
			add("ran at (UTC)", src.RanAt)
			add("connection from the environment variable", src.Connection)
			add("statement timeout", src.StatementTimeout)
			add("rows hashed in", src.Order)
			for _, k := range d.MissingKinds {
				det = append(det, fmt.Sprintf("%d %s in %s", k.Count, k.Kind, k.Column))
			}
			p.Sources.Rows = append(p.Sources.Rows, []string{d.ID, src.Kind, strings.Join(det, "; ")})
		}
	}
	// A column that says "none" for every file says it once, in the caption.
	{
		for col := len(p.Datasets.Head) - 1; col >= 4; col-- {
			all := len(p.Datasets.Rows) > 0
			for _, row := range p.Datasets.Rows {
				all = all && row[col] == "none"
			}
			if !all {
				continue
			}
			p.Datasets.Caption += "; " + strings.ToLower(p.Datasets.Head[col][:1]) + p.Datasets.Head[col][1:] + ": none"
			p.Datasets.Head = slices.Delete(p.Datasets.Head, col, col+1)
			p.Datasets.Num = slices.Delete(p.Datasets.Num, col, col+1)
			for i := range p.Datasets.Rows {
				p.Datasets.Rows[i] = slices.Delete(p.Datasets.Rows[i], col, col+1)
			}
		}
	}
	p.Excluded = table{Caption: "Rows left out, and why (the other studies used every row)",
		Head: []string{"Study", "Rows used", "Rows left out", "Why"},
		Num:  []bool{false, true, true, false}}
	for _, s := range r.Studies {
		why := make([]string, 0, len(s.Excluded))
		for _, e := range s.Excluded {
			why = append(why, fmt.Sprintf("%d %s in %s", e.Rows, e.Reason, e.Column))
		}
		if k := len(s.LeftOut) + s.LeftOutMore; k > 0 {
			why = append(why, fmt.Sprintf("%s left out by exclude (listed below)", nRows(k)))
		}
		if sub := s.Subset; sub != nil {
			w := fmt.Sprintf("%s outside the subset %s", nRows(sub.Rows), sub.Expression)
			var miss []string
			for _, c := range sub.Missing {
				miss = append(miss, fmt.Sprintf("%d missing in %s", c.Count, c.Column))
			}
			if len(miss) > 0 {
				w += " (" + strings.Join(miss, ", ") + ")"
			}
			why = append(why, w)
		}
		// A study that used every row has no line here (its n stands in
		// its headline and results.json).
		if len(why) == 0 && s.NMissing == 0 {
			continue
		}
		w := strings.Join(why, "; ")
		if w == "" {
			w = "none"
		}
		p.Excluded.Rows = append(p.Excluded.Rows, []string{s.ID, itoa(s.N), itoa(s.NMissing), w})
	}
	p.LeftOut = table{Caption: "Rows left out on purpose (exclude in the manifest), and why",
		Head: []string{"Study", "Row", "Set in", "Reason"}, Num: []bool{false, false, false, false}}
	for _, s := range r.Studies {
		for _, l := range s.LeftOut {
			row := l.Row
			if l.Shared > 1 {
				row = fmt.Sprintf("%s (one of %d rows with this id)", l.Row, l.Shared)
			}
			p.LeftOut.Rows = append(p.LeftOut.Rows, []string{s.ID, row, l.Level, l.Reason})
		}
		if s.LeftOutMore > 0 {
			p.LeftOut.Rows = append(p.LeftOut.Rows, []string{s.ID, "and " + itoa(s.LeftOutMore) + " more", "", "counted, not named: a study names at most " + itoa(report.MaxLeftOut)})
		}
	}

	p.Summary = summary{Level: p.Level, PHead: pHead(m.Adjust), Caption: summaryCaption(p.Level)}
	p.RunDate = runDate(r.Generated)
	p.Appendix, p.Glossary = append([]string(nil), appendix...), append([]kv(nil), glossary...)
	if m.Adjust == "holm" || slices.ContainsFunc(r.Studies, func(s report.Study) bool { return s.Findings != nil && len(s.Findings.Checks) > 1 }) {
		p.Glossary = append(p.Glossary, glossaryHolm)
	}
	if slices.ContainsFunc(r.Studies, func(s report.Study) bool { return s.Agreement != nil }) {
		p.Glossary = append(p.Glossary, glossaryAgreement...)
	}
	for i := range r.Studies {
		if f := r.Studies[i].Findings; f != nil && slices.ContainsFunc(f.Limits, func(l string) bool { return strings.HasPrefix(l, "These data are observational") }) {
			p.Appendix = append([]string{observational}, p.Appendix...)
			break
		}
	}
	if nd := notDeclared(r.Studies); nd != "" {
		p.Appendix = append([]string{nd}, p.Appendix...)
	}
	// The methods behind each agreement study's figures, said once here.
	for _, s := range r.Studies {
		if a := s.Agreement; a != nil && len(a.Assumptions) > 0 {
			var said []string
			for _, as := range a.Assumptions {
				// the error-variance ratio stands in the study's lines table
				if !strings.HasPrefix(as, "The Deming line takes the ratio") && !strings.HasPrefix(as, "The Deming line of the items' mean readings takes the ratio") {
					said = append(said, as)
				}
			}
			p.Appendix = append(p.Appendix, "Agreement ("+s.ID+"): "+ascii(strings.Join(said, " ")))
		}
	}
	p.Plans, p.PlanNotes = plansTable(r.Studies, p.Level)
	p.Data = dataTable(r.Studies)
	ids := []string{"manifest " + m.File + " (SHA-256 " + report.ShortHash(m.SHA256) + ")"}
	for _, d := range r.Datasets {
		file := d.File
		if file == "" && d.Source != nil {
			file = d.Source.Kind
		}
		ids = append(ids, fmt.Sprintf("%s: %s, %s (SHA-256 %s)", d.ID, file, nRows(d.Rows), report.ShortHash(d.SHA256)))
	}
	p.Identity = strings.Join(ids, " · ")
	anchors := slugs(r.Studies)
	for i := range r.Studies {
		s := &r.Studies[i]
		for _, e := range s.Expectations {
			if !e.OK {
				p.Failed = append(p.Failed, failedGate{Study: s.ID, Gate: gateTitle(e), Link: "study-" + anchors[i] + "-gates"})
			}
		}
		p.Summary.Rows = append(p.Summary.Rows, summaryLine(s, "study-"+anchors[i]))
		if i == len(r.Studies)-1 {
			p.Checks = checksTable(r.Studies, anchors)
		}
		sv, err := buildStudy(s, anchors[i], i, p.Level, m.Design, cfg, th)
		if err != nil {
			return nil, err
		}
		p.Studies = append(p.Studies, sv)
	}
	return p, nil
}

// runDate writes an RFC 3339 time as "2026-12-05 04:40 UTC"; a time it
// cannot read is shown as written.
func runDate(t string) string {
	if t == "" {
		return ""
	}
	if len(t) >= 16 && t[10] == 'T' && strings.HasSuffix(t, "Z") {
		return t[:10] + " " + t[11:16] + " UTC"
	}
	return t
}

// nRows writes "1 row" or "n rows".
func nRows(n int) string {
	if n == 1 {
		return "1 row"
	}
	return itoa(n) + " rows"
}

func counts(cc []report.ColumnCount) string {
	if len(cc) == 0 {
		return "none"
	}
	var parts []string
	for _, c := range cc {
		if c.Count > 0 {
			parts = append(parts, fmt.Sprintf("%s: %d", c.Column, c.Count))
		}
	}
	if len(parts) == 0 {
		return "none"
	}
	return strings.Join(parts, "; ")
}

func expectationsMet(s *report.Study) bool {
	for _, e := range s.Expectations {
		if !e.OK {
			return false
		}
	}
	return true
}

// summary is the table of all studies at the top of the report. It has
// its own type, not a table, so the HTML can keep each verdict word whole
// and put the interval and the flag note on a second line inside the cell;
// Markdown gets the same cells as one plain table (Table).
type summary struct {
	Caption string
	Level   string // confidence in percent
	PHead   string // "p (Holm)"
	Rows    []summaryRow
}

type summaryRow struct {
	ID, Title, Link, Class string
	Finding                string // the findings' headline
	Status                 string // what the pooled verdict would hide, in words
	Slope, SlopeCI         string // the line's slope with its unit; its interval, "(lo to hi)"
	N                      string
	R, RCI                 string // "−0.982", "−0.987 to −0.974"
	P                      string
	Form, Bend             string // "curved", "bends down"
	Direction, Strength    string
	DirNote, StrengthNote  string // "reverses within Quench tank", "as a curve: strong"
	Flags, FlagNote        string // "1", "outlier-driven"
	Expect, ExpectNote     string // "6 of 7 met", "1 failed": said in words, not by colour alone
	// GateFailed gives each failed gate with the figures it judged, under
	// the finding: "Failed: slope within its limits: found …, wanted …."
	GateFailed string
	Failed     bool
}

// adjustName names the manifest's adjustment method for people.
func adjustName(adjust string) string {
	switch adjust {
	case "holm":
		return "Holm's method (holm)"
	case "bh":
		return "Benjamini–Hochberg (bh)"
	case "", "none":
		return "none"
	}
	return adjust
}

func pHead(adjust string) string {
	switch adjust {
	case "holm":
		return "p (Holm)"
	case "bh":
		return "p (BH)"
	case "", "none":
		return "p"
	}
	return "p (" + adjust + ")"
}

func summaryCaption(level string) string {
	// The table shows no p of its own: where the findings quote one, the
	// study's numbers give it with its adjustment.
	return fmt.Sprintf("Each study's finding and status, slope (%s%% interval) and CI gates.", level)
}

// Table is the summary as a plain table (the Markdown report).
func (s summary) Table() table {
	t := table{Caption: s.Caption,
		Head: []string{"Study", "Finding", "Slope (" + s.Level + "% interval)", "CI gates"},
		Num:  []bool{false, false, true, false}}
	for _, r := range s.Rows {
		finding := r.Finding
		if r.Status != "" {
			finding += " Status: " + r.Status + "."
		}
		if r.GateFailed != "" {
			finding += " " + r.GateFailed
		}
		if finding == "" {
			finding = r.Form
		}
		exp := r.Expect
		if r.ExpectNote != "" {
			exp += ", " + r.ExpectNote
		}
		slope := orDash(r.Slope)
		if r.SlopeCI != "" {
			slope += " " + r.SlopeCI
		}
		t.Rows = append(t.Rows, []string{r.ID, finding, slope, exp})
		t.Classes = append(t.Classes, r.Class)
		t.Links = append(t.Links, r.Link)
	}
	return t
}

// corr3 writes a correlation with three decimals, more when it is so close
// to ±1 that three would print 1.000.
func corr3(v report.Float) string {
	r := float64(v)
	if !v.Valid() {
		return na
	}
	d := 3
	for ; d < 8 && math.Abs(r) < 1; d++ {
		if t := strconv.FormatFloat(math.Abs(r), 'f', d, 64); !strings.HasPrefix(t, "1.") {
			break
		}
	}
	return minus(negZero(strconv.FormatFloat(r, 'f', d, 64)))
}

func summaryLine(s *report.Study, link string) summaryRow {
	row := summaryRow{ID: s.ID, Title: s.Title, Link: link, N: itoa(s.N)}
	if s.Error != nil {
		row.Failed, row.Class = true, "bad"
		row.R, row.P, row.Form, row.Expect = na, na, "failed", "study did not run"
		return row
	}
	if !expectationsMet(s) {
		row.Class = "bad"
	}
	row.R, row.P = na, na
	if pr := s.Pearson; pr != nil {
		row.R, row.P = corr3(pr.R), pval(pr.PAdjusted)
		if pr.CILow.Valid() && pr.CIHigh.Valid() {
			row.RCI = corr3(pr.CILow) + " to " + corr3(pr.CIHigh)
		}
	}
	row.Form, row.Direction, row.Strength = na, na, na
	if f := s.Findings; f != nil {
		row.Form, row.Direction, row.Strength = f.Form, f.Direction, f.Strength
		if f.Bend != nil && *f.Bend != "" {
			row.Bend = strings.ReplaceAll(*f.Bend, "-", " ")
		}
		// What the pooled verdict alone would hide: a reversal within
		// groups, a covariate that carries the association, a curve
		// stronger than its straight line.
		var notes []string
		if f.Reversal {
			notes = append(notes, "reverses within "+chart.GroupName(s))
		}
		if len(f.ExplainedBy) > 0 {
			// Each covariate was held fixed on its own (one partial
			// correlation each), so several are "or", not "and".
			notes = append(notes, "gone given "+strings.Join(covariateLabels(s, f.ExplainedBy), " or ")+map[bool]string{true: " (each alone)", false: ""}[len(f.ExplainedBy) > 1])
		}
		row.DirNote = strings.Join(notes, "; ")
		// The headline's first sentence; what it adds after that (a
		// reversal, a covariate, the line with all rows) the status names,
		// and the study gives in full.
		row.Finding = firstSentence(ascii(f.Headline))
		// An agreement verdict's figures (the limits) stand in the
		// summary's figures column: the verdict's words are enough here.
		if i := strings.Index(row.Finding, ": "); s.Agreement != nil && i > 0 {
			row.Finding = row.Finding[:i] + "."
		}
		// Its closing figures (r, its interval, n) stand in the study's
		// headline: the summary keeps the words and the slope.
		if i := strings.LastIndex(row.Finding, " ("); i > 0 && strings.HasSuffix(row.Finding, ").") && strings.HasPrefix(row.Finding[i:], " (r = ") {
			row.Finding = row.Finding[:i] + "."
		}
		// The status names what the finding's opening sentence does not
		// already lead with (a reversal, a covariate, single rows).
		var status []string
		for _, st := range statusOf(s) {
			if !(f.Reversal && strings.HasPrefix(st, "reverses within ")) && !(len(f.ExplainedBy) > 0 && strings.HasPrefix(st, "explained by ")) &&
				!(f.OutlierDriven && st == "rests on single rows") && !(f.Form == "curved" && strings.Contains(row.Finding, "follows a curve")) {
				status = append(status, st)
			}
		}
		row.Status = strings.Join(status, "; ")
		if f.CurveStrength != "" && f.CurveStrength != f.Strength {
			row.StrengthNote = "as a curve: " + f.CurveStrength
		}
	}
	row.Slope = slopeText(s, "")
	if i := strings.Index(row.Slope, " (CI "); i > 0 {
		row.Slope, row.SlopeCI = row.Slope[:i], "("+row.Slope[i+len(" (CI "):]
	} else if i := strings.Index(row.Slope, "; CI "); i > 0 { // "… (Deming; CI lo to hi)"
		row.Slope, row.SlopeCI = row.Slope[:i]+")", "("+row.Slope[i+len("; CI "):]
	}
	if s.Findings != nil && s.Findings.TurnsOver {
		row.Slope, row.SlopeCI = "none: the curve turns over", ""
	}
	summarySlope(s, &row)
	row.Flags = "none"
	if s.Influence != nil && s.Influence.Counts.Suspect > 0 {
		row.Flags = itoa(s.Influence.Counts.Suspect)
	}
	if s.Findings != nil && s.Findings.OutlierDriven {
		row.FlagNote = "outlier-driven"
	}
	row.Expect = "none"
	if len(s.Expectations) > 0 {
		ok := 0
		for _, e := range s.Expectations {
			if e.OK {
				ok++
			}
		}
		row.Expect = fmt.Sprintf("%d of %d met", ok, len(s.Expectations))
		// A failed gate shows what it judged: the figure found against
		// the declared limit, both the analysis's words with their units.
		var failed []string
		for _, e := range s.Expectations {
			switch {
			case e.OK:
			case e.Name == "agree":
				// its figures are the finding's: the title alone
				failed = append(failed, gateTitle(e))
			default:
				failed = append(failed, fmt.Sprintf("%s: found %s, wanted %s", gateTitle(e), ascii(e.Got), ascii(e.Want)))
			}
		}
		if len(failed) > 0 {
			row.ExpectNote = fmt.Sprintf("%d failed", len(failed))
			row.GateFailed = "Failed: " + strings.Join(failed, "; ") + "."
		}
	}
	return row
}

// summarySlope puts in the summary the slope a reader may copy: where the
// findings say the pooled line misleads, the slope they point to instead,
// from the figures the analysis already gives, with the pooled one after
// it. A study on like log scales gives its slope as what it is there, an
// elasticity. An agreement study gives its bias and limits of agreement, the
// figures its gate reads.
func summarySlope(s *report.Study, row *summaryRow) {
	f := s.Findings
	per := unitPer(s)
	pooled := ""
	if l := s.Line; l != nil && l.Slope != nil && l.Slope.Estimate.Valid() {
		pooled = num(l.Slope.Estimate)
	}
	switch {
	case s.Agreement != nil && s.Agreement.Bias.Valid():
		a := s.Agreement
		u := s.Y.Symbol
		// three significant digits, as the finding gives the limits
		row.Slope = "bias " + withSym(map[bool]string{true: "+", false: ""}[float64(a.Bias) > 0]+sig3(a.Bias), u)
		row.SlopeCI = "(limits " + sig3(a.Lower) + " to " + withSym(sig3(a.Upper), u)
		if a.Acceptable.Valid() {
			row.SlopeCI += "; accepted ±" + withSym(declared(a.Acceptable), u)
		}
		row.SlopeCI += ")"
	case f == nil:
	case s.X.Scale == s.Y.Scale && (s.X.Scale == "log" || s.X.Scale == "log10") && pooled != "" && !f.OutlierDriven && !f.Reversal && len(f.ExplainedBy) == 0:
		// on like log scales the slope is an elasticity: % per %
		row.Slope = pooled + " % per % (elasticity)"
	case f.OutlierDriven && s.Sensitivity != nil && s.Sensitivity.SlopeWithoutFlagged.Valid():
		se := s.Sensitivity
		without := "without the " + itoa(se.NFlagged) + " flagged rows"
		if se.NFlagged == 1 && s.Influence != nil && len(s.Influence.Points) == 1 {
			without = "without " + s.Influence.Points[0].Row
		}
		row.Slope = withSym(num(se.SlopeWithoutFlagged), per)
		row.SlopeCI = "(" + without + "; all rows " + pooled + ")"
	case f.Reversal && len(s.Groups) > 0 && len(s.Groups) <= 4:
		// three significant digits, as the finding's range of them
		var parts []string
		for _, g := range s.Groups {
			parts = append(parts, g.Group+" "+sig3(g.Slope))
		}
		row.Slope = strings.Join(parts, ", ")
		row.SlopeCI = "(" + per + " within " + chart.GroupName(s) + "; pooled " + pooled + ")"
	case f.Reversal:
		row.Slope, row.SlopeCI = "within "+chart.GroupName(s)+": see finding", "(pooled "+withSym(pooled, per)+")"
	case len(f.ExplainedBy) > 0:
		row.Slope, row.SlopeCI = "see finding", "(pooled "+withSym(pooled, per)+")"
	}
}

// firstSentence is s up to the end of its first sentence: a full stop
// followed by a space and a capital letter (a decimal point never is).
func firstSentence(s string) string {
	for i := 0; i+2 < len(s); i++ {
		if s[i] == '.' && s[i+1] == ' ' && s[i+2] >= 'A' && s[i+2] <= 'Z' {
			return s[:i+1]
		}
	}
	return s
}

// statusOf names, from the findings, what a reader of the pooled verdict
// alone would miss: a result resting on single rows, a reversal within
// groups, a covariate that carries it, a curve.
func statusOf(s *report.Study) []string {
	f := s.Findings
	if f == nil {
		return nil
	}
	var out []string
	if f.OutlierDriven {
		out = append(out, "rests on single rows")
	}
	if f.Reversal {
		out = append(out, "reverses within "+chart.GroupName(s))
	}
	if len(f.ExplainedBy) > 0 {
		out = append(out, "explained by "+strings.Join(covariateLabels(s, f.ExplainedBy), " or "))
	}
	if f.Form == "curved" {
		w := "curved"
		if f.TurnsOver {
			w += ", turns over inside the data"
		}
		out = append(out, w)
	}
	if f.Form == "nonlinear" {
		out = append(out, "a dependence that is not a line")
	}
	if f.Drift {
		out = append(out, "drifts in run order")
	}
	if f.SpreadChanges {
		out = append(out, "uneven scatter")
	}
	return out
}

// slopeText is the line's slope with its unit and interval, or "" when
// there is none.
func slopeText(s *report.Study, level string) string {
	// An agreement study's slope is Deming's: both methods carry error, so
	// the least-squares slope is biased towards 0.
	if a := s.Agreement; a != nil && a.Deming != nil && a.Deming.Slope.Valid() {
		t := withSym(num(a.Deming.Slope), unitPer(s)) + " (Deming"
		if a.Deming.SlopeLow.Valid() && a.Deming.SlopeHigh.Valid() {
			ci := "CI"
			if level != "" {
				ci = level + "% CI"
			}
			t += "; " + ci + " " + interval(a.Deming.SlopeLow, a.Deming.SlopeHigh)
		}
		return t + ")"
	}
	l := s.Line
	if l == nil || l.Slope == nil || !l.Slope.Estimate.Valid() {
		return ""
	}
	t := withSym(num(l.Slope.Estimate), unitPer(s))
	if l.Slope.CILow.Valid() && l.Slope.CIHigh.Valid() {
		ci := "CI"
		if level != "" {
			ci = level + "% CI"
		}
		t += " (" + ci + " " + interval(l.Slope.CILow, l.Slope.CIHigh) + ")"
	}
	return t
}

func formWord(f *report.Findings) string {
	w := f.Form
	if f.Bend != nil && *f.Bend != "" {
		w += ", " + strings.ReplaceAll(*f.Bend, "-", " ")
	}
	return w
}

func buildStudy(s *report.Study, anchor string, index int, level, design string, cfg *config, th report.Thresholds) (*studyView, error) {
	sv := &studyView{Anchor: anchor, ID: s.ID, Title: s.Title}
	if sv.Title == "" {
		sv.Title = s.ID
	}
	sv.Pair = fmt.Sprintf("%s against %s · dataset %s · study %s", chart.InUnit(s.Y), chart.InUnit(s.X), s.Dataset, s.ID)
	// The manifest's design stands once in the appendix; a study of
	// another design says so.
	if s.Design != "" && s.Design != design {
		sv.Pair += " · " + strings.ReplaceAll(s.Design, "-", " ")
	}
	if s.Error != nil {
		sv.Error = *s.Error
		return sv, nil
	}
	sv.Status = statusOf(s)
	for _, e := range s.Expectations {
		// What the gate wanted and what it found are the verdict's own
		// figures: both stay beside the outcome.
		text := fmt.Sprintf("%s: found %s, wanted %s", gateTitle(e), ascii(e.Got), ascii(e.Want))
		switch {
		case !e.OK && s.Findings != nil && strings.TrimSpace(e.Detail) == strings.TrimSpace(s.Findings.Headline):
			text += "." // its detail is the study's headline, just above
		case !e.OK && e.Got != "" && strings.Contains(e.Detail, e.Got):
			text += "." // its detail restates the figure found (its interval stands in the numbers)
		case !e.OK:
			text += ". " + capital(strings.TrimSuffix(ascii(e.Detail), ".")) + "."
		case e.Want == e.Got:
			text = gateTitle(e) + ": " + ascii(e.Got) // "direction as expected: negative"
		}
		sv.Gates = append(sv.Gates, gateLine{OK: e.OK, Text: text})
	}
	if sec, err := notesSection(s, level, th); err != nil {
		return nil, fmt.Errorf("study %q: %w", s.ID, err)
	} else if sec != nil {
		sv.Top = append(sv.Top, sec)
	}
	if f := s.Findings; f != nil {
		sv.Headline = ascii(f.Headline)
		sv.Verdict = []kv{{"Form", formWord(f)}, {"Direction", f.Direction}, {"Strength", f.Strength}}
		if f.CurveStrength != "" {
			sv.Verdict = append(sv.Verdict, kv{"Curve strength", f.CurveStrength})
		}
		if f.OutlierDriven {
			sv.Verdict = append(sv.Verdict, kv{"Influence", "outlier-driven"})
		}
	}
	prefix := fmt.Sprintf("s%d-", index+1)
	type kindFig struct {
		kind string
		fig  *chart.Figure
	}
	// The scatterplot with the distances from its fit under it, on the
	// same x axis, and the drift strip; an agreement study opens with its
	// differences against the mean, the figure its verdict reads.
	figs := []kindFig{
		{"scatter", chart.Scatter(s, prefix+"scatter", level)},
		{"residuals", chart.ResidualsX(s, prefix+"residuals")},
		{"order", chart.ResidualsOrder(s, prefix+"order")},
	}
	main := "scatter"
	if s.Agreement != nil {
		// The methods chart draws y against x with the Deming line and the
		// identity: the least-squares scatterplot and its distances would
		// show the same rows again.
		main = "agreement"
		figs = append([]kindFig{{"agreement", chart.DifferenceMean(s, prefix+"agreement", level)}, {"methods", chart.MethodPair(s, prefix+"methods")}}, figs[2:]...)
	}
	for _, fc := range figs {
		if fc.fig == nil {
			continue
		}
		var b strings.Builder
		if err := cfg.drawer.Draw(&b, fc.fig); err != nil {
			return nil, fmt.Errorf("study %q: drawing the %s chart: %w", s.ID, fc.kind, err)
		}
		// The appendix says once how the usual scatter chart is drawn.
		note := fc.fig.Caption
		if strings.TrimSuffix(note, ".") == fc.fig.Title || note == chart.LineCaption(level) {
			note = ""
		}
		sv.Figures = append(sv.Figures, figure{
			Kind: fc.kind, Fig: fc.fig, SVG: b.String(), Alt: fc.fig.Title, Caption: fc.fig.Caption, Note: note,
			File: cfg.figureDir + "/" + anchor + "-" + fc.kind + ".svg", Main: fc.kind == main,
			Under: fc.kind == "residuals" && main == "scatter",
		})
	}
	if m := slices.IndexFunc(sv.Figures, func(f figure) bool { return f.Main }); m >= 0 {
		if u := slices.IndexFunc(sv.Figures, func(f figure) bool { return f.Under }); u >= 0 {
			sv.Figures[m].UnderSVG, sv.Figures[m].UnderCaption = sv.Figures[u].SVG, sv.Figures[u].Caption
		}
	}
	for _, fn := range studySections {
		sec, err := fn(s, level, th)
		if err != nil {
			return nil, fmt.Errorf("study %q: %w", s.ID, err)
		}
		if sec == nil {
			continue
		}
		// What single rows do to the line follows the unusual rows under
		// their heading: one part, not two.
		if n := len(sv.Sections); n > 0 && sec.Key == "sensitivity" && sv.Sections[n-1].Key == "influence" {
			in := sv.Sections[n-1]
			in.Tables = append(in.Tables, sec.Tables...)
			in.After = append(in.After, sec.After...)
			continue
		}
		// r and the line in other units, when one sentence says them,
		// belong with the numbers.
		if sec.Key == "units" && len(sec.Tables) == 0 {
			if i := slices.IndexFunc(sv.Sections, func(k *section) bool { return k.Key == "keyfigures" }); i >= 0 {
				sv.Sections[i].After = append(sv.Sections[i].After, sec.Paras...)
				continue
			}
		}
		sv.Sections = append(sv.Sections, sec)
	}
	return sv, nil
}

// covariateLabels names covariate columns as people read them: the label
// the partial-correlation rows carry, else the column name.
func covariateLabels(s *report.Study, columns []string) []string {
	out := make([]string, 0, len(columns))
	for _, c := range columns {
		label := c
		for _, p := range s.Partial {
			if p.Covariate == c && p.Label != "" {
				label = p.Label
			}
		}
		out = append(out, label)
	}
	return out
}

// plansTable gives every study's planning figures in one table: each
// interval's half-width now and its target with the rows a next run
// needs to reach it, and the power to detect r (the findings' sentences
// are in results.json, "plan.statements"). An agreement study plans the
// intervals of its limits of agreement instead: a sentence each (plans).
func plansTable(studies []report.Study, level string) (table, []string) {
	t := table{Caption: "Planning the next run, at this run's r, scatter and spread of x: rows for the " + level + "% intervals of r and the slope to reach their targets (set: from the manifest), and to detect r",
		Head: []string{"Study", "r: ± now → target", "Rows", "Slope: ± now → target", "Rows", "Rows to detect r (power)"},
		Num:  []bool{false, true, true, true, true, true}}
	var notes []string
	// A power every study plans for stands once, in the header.
	samePower := ""
	for _, s := range studies {
		if p := s.Plan; p != nil && s.Error == nil && p.NForPower > 0 {
			switch pw := short(float64(p.Power)); {
			case samePower == "":
				samePower = pw
			case samePower != pw:
				samePower = "mixed"
			}
		}
	}
	// So does a target for r's interval every study shares.
	sameR := ""
	for _, s := range studies {
		if p := s.Plan; p != nil && s.Error == nil && p.RHalfWidth.Valid() {
			// a set target (declared, or the default) as written: ±0.1,
			// not ±0.1000
			hw := trimZeros(num(p.RHalfWidth))
			switch t := hw + map[bool]string{true: " (set)"}[p.RHalfWidthFrom == "declared"]; {
			case sameR == "":
				sameR = t
			case sameR != t:
				sameR = "mixed"
			}
		}
	}
	if sameR != "" && sameR != "mixed" {
		t.Head[1] = "r: ± now → ±" + sameR
	}
	if samePower != "" && samePower != "mixed" {
		t.Head[5] = "Rows to detect r, power " + samePower
	}
	rows := func(n int) string {
		if n <= 0 {
			return na
		}
		return itoa(n)
	}
	set := func(from string) string {
		if from == "declared" {
			return " (set)"
		}
		return ""
	}
	for _, s := range studies {
		p := s.Plan
		if p == nil || s.Error != nil {
			continue
		}
		if p.LimitsHalfWidth.Valid() {
			notes = append(notes, fmt.Sprintf("Planning %s, an agreement study: %s items for the %s%% intervals of its limits of agreement to shrink from ±%s to ±%s (%sexact, noncentral t).",
				s.ID, rows(p.NForLimits), level, num(p.LimitsHalfWidthNow), withSym(num(p.LimitsHalfWidth), s.X.Symbol), strings.TrimPrefix(strings.TrimSuffix(set(p.LimitsHalfWidthFrom), ")")+"; ", " (")))
		}
		r, nR := na, na
		if p.RHalfWidth.Valid() {
			r, nR = "±"+num(p.RHalfWidthNow), rows(p.NForR)
			if target := num(p.RHalfWidth) + set(p.RHalfWidthFrom); target != sameR {
				r += " → ±" + target
			}
		}
		slope, nSlope := na, na
		if p.SlopeHalfWidth.Valid() {
			slope, nSlope = "±"+num(p.SlopeHalfWidthNow)+" → ±"+withSym(num(p.SlopeHalfWidth), unitPer(&s))+set(p.SlopeHalfWidthFrom), rows(p.NForSlope)
		}
		detect := na
		if p.NForPower > 0 {
			detect = rows(p.NForPower)
			if power := short(float64(p.Power)); power != samePower {
				detect += " for " + power
			}
			if p.DetectRFrom == "declared" {
				detect = "r = " + num(p.DetectR) + " (set): " + detect
				if p.PowerNow.Valid() {
					detect += "; power now " + num(p.PowerNow)
				}
			}
		}
		if r == na && slope == na && detect == na {
			continue
		}
		t.Rows = append(t.Rows, []string{s.ID, r, nR, slope, nSlope, detect})
	}
	return t, notes
}
