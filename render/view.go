package render

import (
	"fmt"
	"math"
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
	Studies    []*studyView
	Thresholds string
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
	Figures  []figure
	Sections []*section
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
	p.Provenance = []kv{
		{"Written by", p.Tool},
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
	p.Thresholds = m.Rules

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
	p.Excluded = table{Caption: "Rows left out of each study, and why",
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

	p.Summary = summary{Level: p.Level, PHead: pHead(m.Adjust), Caption: summaryCaption(len(r.Studies), m.Adjust, p.Level)}
	anchors := slugs(r.Studies)
	for i := range r.Studies {
		s := &r.Studies[i]
		p.Summary.Rows = append(p.Summary.Rows, summaryLine(s, "study-"+anchors[i]))
		sv, err := buildStudy(s, anchors[i], i, p.Level, cfg, th)
		if err != nil {
			return nil, err
		}
		p.Studies = append(p.Studies, sv)
	}
	return p, nil
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
	N                      string
	R, RCI                 string // "−0.982", "−0.987 to −0.974"
	P                      string
	Form, Bend             string // "curved", "bends down"
	Direction, Strength    string
	DirNote, StrengthNote  string // "reverses within Quench tank", "as a curve: strong"
	Flags, FlagNote        string // "1", "outlier-driven"
	Expect, ExpectNote     string // "6 of 7 met", "1 failed": said in words, not by colour alone
	Failed                 bool
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

func summaryCaption(n int, adjust, level string) string {
	c := fmt.Sprintf("All studies at a glance: Pearson r with its %s%% interval", level)
	switch adjust {
	case "holm":
		c += fmt.Sprintf("; p adjusted across the %d studies by Holm's method", n)
	case "bh":
		c += fmt.Sprintf("; p adjusted across the %d studies by the Benjamini–Hochberg method", n)
	case "", "none":
		c += "; p not adjusted across studies"
	default:
		c += "; p adjusted across studies (" + adjust + ")"
	}
	return c + "."
}

// Table is the summary as a plain table (the Markdown report).
func (s summary) Table() table {
	t := table{Caption: s.Caption,
		Head: []string{"Study", "n", "r (" + s.Level + "% interval)", s.PHead, "Form", "Direction", "Strength", "Flagged rows", "Expectations"},
		Num:  []bool{false, true, true, true, false, false, false, false, false}}
	for _, r := range s.Rows {
		rv := r.R
		if r.RCI != "" {
			rv += " (" + r.RCI + ")"
		}
		form := r.Form
		if r.Bend != "" {
			form += ", " + r.Bend
		}
		dir, strength := r.Direction, r.Strength
		if r.DirNote != "" {
			dir += ", " + r.DirNote
		}
		if r.StrengthNote != "" {
			strength += ", " + r.StrengthNote
		}
		flags := r.Flags
		if r.FlagNote != "" {
			flags += ", " + r.FlagNote
		}
		exp := r.Expect
		if r.ExpectNote != "" {
			exp += ", " + r.ExpectNote
		}
		t.Rows = append(t.Rows, []string{r.ID, r.N, rv, r.P, form, dir, strength, flags, exp})
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
		if f.CurveStrength != "" && f.CurveStrength != f.Strength {
			row.StrengthNote = "as a curve: " + f.CurveStrength
		}
	}
	row.Flags = "none"
	if s.Influence != nil && s.Influence.Counts.Suspect > 0 {
		row.Flags = itoa(s.Influence.Counts.Suspect)
	}
	if s.Findings != nil && s.Findings.OutlierDriven {
		row.FlagNote = "outlier-driven"
	}
	row.Expect = "none declared"
	if len(s.Expectations) > 0 {
		ok := 0
		for _, e := range s.Expectations {
			if e.OK {
				ok++
			}
		}
		row.Expect = fmt.Sprintf("%d of %d met", ok, len(s.Expectations))
		if bad := len(s.Expectations) - ok; bad > 0 {
			row.ExpectNote = fmt.Sprintf("%d failed", bad)
		}
	}
	return row
}

func formWord(f *report.Findings) string {
	w := f.Form
	if f.Bend != nil && *f.Bend != "" {
		w += ", " + strings.ReplaceAll(*f.Bend, "-", " ")
	}
	return w
}

func buildStudy(s *report.Study, anchor string, index int, level string, cfg *config, th report.Thresholds) (*studyView, error) {
	sv := &studyView{Anchor: anchor, ID: s.ID, Title: s.Title}
	if sv.Title == "" {
		sv.Title = s.ID
	}
	sv.Pair = fmt.Sprintf("%s against %s · dataset %s · study %s", chart.InUnit(s.Y), chart.InUnit(s.X), s.Dataset, s.ID)
	if s.Design != "" {
		sv.Pair += " · " + strings.ReplaceAll(s.Design, "-", " ")
	}
	if s.Error != nil {
		sv.Error = *s.Error
		return sv, nil
	}
	if f := s.Findings; f != nil {
		sv.Headline = f.Headline
		sv.Verdict = []kv{{"Form", formWord(f)}, {"Direction", f.Direction}, {"Strength", f.Strength}}
		if f.CurveStrength != "" {
			sv.Verdict = append(sv.Verdict, kv{"Curve strength", f.CurveStrength})
		}
		if f.OutlierDriven {
			sv.Verdict = append(sv.Verdict, kv{"Influence", "outlier-driven"})
		}
	}
	prefix := fmt.Sprintf("s%d-", index+1)
	for _, fc := range []struct {
		kind string
		fig  *chart.Figure
	}{
		{"scatter", chart.Scatter(s, prefix+"scatter", level)},
		{"residuals", chart.ResidualsFitted(s, prefix+"residuals")},
		{"order", chart.ResidualsOrder(s, prefix+"order")},
		{"agreement", chart.DifferenceMean(s, prefix+"agreement", level)},
		{"methods", chart.MethodPair(s, prefix+"methods")},
	} {
		if fc.fig == nil {
			continue
		}
		var b strings.Builder
		if err := cfg.drawer.Draw(&b, fc.fig); err != nil {
			return nil, fmt.Errorf("study %q: drawing the %s chart: %w", s.ID, fc.kind, err)
		}
		sv.Figures = append(sv.Figures, figure{
			Kind: fc.kind, Fig: fc.fig, SVG: b.String(), Alt: fc.fig.Title, Caption: fc.fig.Caption,
			File: cfg.figureDir + "/" + anchor + "-" + fc.kind + ".svg", Main: fc.kind == "scatter",
		})
	}
	for _, fn := range studySections {
		sec, err := fn(s, level, th)
		if err != nil {
			return nil, fmt.Errorf("study %q: %w", s.ID, err)
		}
		if sec != nil {
			sv.Sections = append(sv.Sections, sec)
		}
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
