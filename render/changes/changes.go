// Package changes renders a compare.Result — what changed between two
// runs — as diff.html (self-contained: the theme's CSS inline, a
// Content-Security-Policy that forbids every fetch and script, prints
// cleanly), diff.md (for code review) and diff.json (schema
// "bivar.diff/v1", the Result written out). It computes nothing: every
// number comes from the Result.
package changes

import (
	"bytes"
	"context"
	"embed"
	"fmt"
	"html/template"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"

	"bivar/analysis/compare"
	"bivar/analysis/findings"
	"bivar/analysis/report"
	"bivar/internal/cleantext"
	"bivar/internal/publish"
	"bivar/render/chart"
	"bivar/render/internal/mdtext"
	"bivar/themes"
)

//go:embed templates/*.tmpl
var tmplFS embed.FS

var page = template.Must(template.New("diff").Funcs(template.FuncMap{
	"num":              num,
	"signed":           signed,
	"fix2":             fix2,
	"pval":             pval,
	"padj":             padj,
	"short":            report.ShortHash,
	"adjustName":       adjustName,
	"verdictName":      verdictName,
	"verdictNames":     func() string { return compare.VerdictNames },
	"below":            below,
	"slopeUnit":        slopeUnit,
	"wanted":           wanted,
	"slopeGateCaption": slopeGateCaption,
	"outcome":          outcome,
	"yesNo":            yesNo,
	"paren":            paren,
	"statusWords":      statusWords,
	"anchor":           anchor,
	"agreement":        agreementRows,
	"agreementHead":    func() []string { return agreementHead },
}).Option("missingkey=error").ParseFS(tmplFS, "templates/*.tmpl"))

type config struct {
	theme   string
	formats []string
}

// Option configures the renderers.
type Option func(*config)

// WithTheme chooses the HTML theme by name (themes.Names); default
// themes.Default.
func WithTheme(name string) Option { return func(c *config) { c.theme = name } }

// WithFormats chooses which files Write writes: "html", "markdown",
// "json"; default all three.
func WithFormats(formats ...string) Option {
	return func(c *config) { c.formats = slices.Clone(formats) }
}

func newConfig(opts []Option) config {
	c := config{theme: themes.Default, formats: []string{"html", "markdown", "json"}}
	for _, o := range opts {
		o(&c)
	}
	return c
}

// Files maps each format to the file name Write gives it.
var Files = map[string]string{"html": "diff.html", "markdown": "diff.md", "json": "diff.json"}

// DiffFiles renders the chosen formats of res in memory, named as in
// Files, for publish.Target.Publish.
func DiffFiles(res *compare.Result, opts ...Option) ([]publish.File, error) {
	c := newConfig(opts)
	var files []publish.File
	for _, f := range c.formats {
		name, ok := Files[f]
		if !ok {
			return nil, fmt.Errorf("unknown format %q: want html, markdown or json", f)
		}
		var buf bytes.Buffer
		var err error
		switch f {
		case "html":
			err = HTML(&buf, res, opts...)
		case "markdown":
			err = Markdown(&buf, res)
			if err == nil {
				var figs []publish.File
				figs, err = FigureFiles(res, opts...)
				files = append(files, figs...)
			}
		case "json":
			err = compare.Write(&buf, res)
		}
		if err != nil {
			return nil, err
		}
		files = append(files, publish.File{Name: name, Data: buf.Bytes()})
	}
	return files, nil
}

// Write writes DiffFiles into the folder dir as one set, replacing the
// previous diff in one atomic step (see internal/publish): a failure, or
// a process killed at any point, leaves the previous files whole.
func Write(dir string, res *compare.Result, opts ...Option) error {
	files, err := DiffFiles(res, opts...)
	if err != nil {
		return err
	}
	t, err := publish.OpenDir(dir, publish.Options{Command: "bivar diff", Legacy: EarlierFile})
	if err != nil {
		return err
	}
	defer t.Close()
	return t.Publish(context.Background(), files)
}

// EarlierFile says whether rel, relative to a diff folder, is a name
// bivar wrote there before folders were published whole: the three diff
// files and the temporary files of that writer (.NAME.RANDOM.tmp). It is
// for publish.Options.Legacy.
func EarlierFile(rel string, isDir bool) bool {
	if isDir || strings.Contains(rel, "/") {
		return false
	}
	for _, name := range Files {
		if rel == name {
			return true
		}
	}
	return strings.HasPrefix(rel, ".") && strings.HasSuffix(rel, ".tmp")
}

// HTML writes diff.html.
func HTML(w io.Writer, res *compare.Result, opts ...Option) error {
	c := newConfig(opts)
	css, err := themes.CSS(c.theme)
	if err != nil {
		return err
	}
	anyNotes := false
	for _, s := range res.Studies {
		if len(s.Notes) > 0 || s.OldError != nil || s.NewError != nil {
			anyNotes = true
		}
	}
	figs, err := figures(res, c.theme)
	if err != nil {
		return err
	}
	svgs, captions := map[int]template.HTML{}, map[int]string{}
	for i, svg := range figs {
		svgs[i] = template.HTML(svg) // trusted: our own drawer, which escapes every text it writes
		captions[i] = runsFigure(res, i).Caption
	}
	data := struct {
		R                  *compare.Result
		GatesLine          string
		Figures            map[int]template.HTML
		Captions           map[int]string
		CSS                template.CSS // trusted: our own embedded theme files
		OldTitle, NewTitle string
		AnyNotes           bool
		Flagged            []string // ids of the studies with a significant change
		SigR, SigSlope     []string // ids of the studies whose r, or slope, changed beyond chance
	}{res, gatesLine(res), svgs, captions, template.CSS(css), titleOf(res.Old), titleOf(res.New), anyNotes, flagged(res), sigR(res), sigSlope(res)}
	var buf bytes.Buffer
	if err := page.ExecuteTemplate(&buf, "page", data); err != nil {
		return fmt.Errorf("rendering diff.html: %w", err)
	}
	_, err = w.Write(cleantext.Bytes(buf.Bytes()))
	return err
}

// flagged lists the studies with a significant change, in Result order.
func flagged(res *compare.Result) []string {
	var ids []string
	for _, s := range res.Studies {
		if s.Significant {
			ids = append(ids, s.ID)
		}
	}
	return ids
}

// below reports whether p is defined and below alpha (the Result's rule
// for significant).
func below(p report.Float, alpha float64) bool { return p.Valid() && float64(p) < alpha }

// slopeUnit is the slope's unit in written symbols, "y per x", or ""
// when neither side declared one.
func slopeUnit(s compare.StudyChange) string { return s.SlopeUnit() }

// sigR and sigSlope list the studies whose r, or slope, changed beyond
// chance (adjusted p below alpha), in Result order.
func sigR(res *compare.Result) []string {
	var ids []string
	for _, s := range res.Studies {
		if s.R != nil && below(s.R.PAdjusted, res.Alpha) {
			ids = append(ids, s.ID)
		}
	}
	return ids
}

func sigSlope(res *compare.Result) []string {
	var ids []string
	for _, s := range res.Studies {
		if s.Slope != nil && below(s.Slope.PAdjusted, res.Alpha) {
			ids = append(ids, s.ID)
		}
	}
	return ids
}

func titleOf(s compare.Side) string {
	switch {
	case s.Title != "":
		return s.Title
	case s.File != "":
		return s.File
	}
	return "untitled run"
}

// Markdown writes diff.md. Its charts are the files FigureFiles returns,
// named by figureFile.
func Markdown(w io.Writer, res *compare.Result) error {
	var b strings.Builder
	// One title where both runs have it (a production run against the
	// last one), not "T → T".
	if to, tn := titleOf(res.Old), titleOf(res.New); to == tn {
		fmt.Fprintf(&b, "# What changed: %s\n\n", mdtext.Escape(to))
	} else {
		fmt.Fprintf(&b, "# What changed: %s → %s\n\n", mdtext.Escape(to), mdtext.Escape(tn))
	}
	fmt.Fprintf(&b, "Old run: `%s` (bivar %s%s) · New run: `%s` (bivar %s%s)  \n", code(orDash(res.Old.File)), mdtext.Escape(orDash(res.Old.ToolVersion)), generated(res.Old),
		code(orDash(res.New.File)), mdtext.Escape(orDash(res.New.ToolVersion)), generated(res.New))
	fmt.Fprintf(&b, "Significance level %g; change tests adjusted across all compared studies: %s.\n\n", res.Alpha, mdtext.Escape(adjustName(res.Adjust)))
	s := res.Summary
	b.WriteString("## CI gates\n\n")
	b.WriteString(mdtext.Escape(gatesLine(res)) + "\n\n")
	if s.ExpectationChanged > 0 {
		b.WriteString("| Study | Gate | Wanted | Old run | New run |\n|---|---|---|---|---|\n")
		for _, g := range res.ChangedGates() {
			e := g.ExpectationChange
			fmt.Fprintf(&b, "| `%s` | %s | %s | %s | **%s** |\n", code(g.Study), mdtext.Cell(e.Title), mdtext.Cell(wanted(e)), mdtext.Cell(outcome(e.OldOK, e.OldGot)), mdtext.Cell(outcome(e.NewOK, e.NewGot)))
		}
		b.WriteString("\n")
	}
	if len(res.Statements) > 0 {
		b.WriteString("## What changed\n\n")
		fmt.Fprintf(&b, "%s\n\n", mdtext.Escape(res.Statements[0]))
		for _, sc := range res.Studies {
			if sc.Statement != "" {
				fmt.Fprintf(&b, "- **`%s`** — %s against %s: %s\n", code(sc.ID), mdtext.Escape(sc.Y), mdtext.Escape(sc.X), mdtext.Escape(sc.Statement))
			}
		}
		for _, st := range res.Statements[1:] {
			fmt.Fprintf(&b, "- %s\n", mdtext.Escape(st))
		}
		b.WriteString("\n")
	}
	fmt.Fprintf(&b, "## In numbers\n\n- CI gates whose outcome changed: %d (%d now failing that did not fail before)\n- Studies changed beyond chance: %d of %d (adjusted p below %g)\n- Studies with a changed verdict: %d\n- Studies added: %d; removed: %d; that ran before and did not run now: %d\n",
		s.ExpectationChanged, s.ExpectationBroken, s.Significant, s.Compared, res.Alpha, s.VerdictChanged, s.Added, s.Removed, s.StoppedRunning)
	for _, n := range res.Notes {
		fmt.Fprintf(&b, "- %s\n", mdtext.Escape(n))
	}
	b.WriteString("\n")
	for i, sc := range res.Studies {
		if !changed(sc) || (sc.Lines == nil && sc.SlopeGate == nil && len(sc.AtX) == 0) {
			continue
		}
		fmt.Fprintf(&b, "## `%s`: old against new\n\n", code(sc.ID))
		if sc.Lines != nil {
			// The alt text is ours alone: a label inside an image's brackets
			// could end them early.
			fmt.Fprintf(&b, "![Old run against new: the two lines with their confidence bands](%s)\n\n", figureFile(i))
		}
		if g := sc.SlopeGate; g != nil && sc.Slope != nil {
			u := slopeUnit(sc)
			fmt.Fprintf(&b, "%s\n\n| Run | Slope (%s) | Inside the gate |\n|---|--:|---|\n| old | %s | %s |\n| new | %s | %s |\n\n",
				mdtext.Escape(slopeGateCaption(g, u)), mdtext.Cell(u), num(sc.Slope.Old), yesNo(g.OldInside), num(sc.Slope.New), yesNo(g.NewInside))
		}
		if len(sc.AtX) > 0 {
			where := "where the study predicts"
			if sc.AtXFrom == "range" {
				where = "at the ends and middle of the observed range"
			}
			fmt.Fprintf(&b, "The line's value %s (change = new − old, ± its SE):\n\n", where)
			fmt.Fprintf(&b, "| %s | Old%s | New%s | Change%s | ± SE%s | Inside both runs' range |\n|--:|--:|--:|--:|--:|---|\n",
				mdtext.Cell("x"+paren(sc.XFigureUnit())), mdtext.Cell(paren(sc.YFigureUnit())), mdtext.Cell(paren(sc.YFigureUnit())), mdtext.Cell(paren(sc.YFigureUnit())), mdtext.Cell(paren(sc.YFigureUnit())))
			for _, a := range sc.AtX {
				fmt.Fprintf(&b, "| %s | %s | %s | %s | %s | %s |\n", num(a.X), num(a.Old), num(a.New), signed(a.Delta), num(a.SE), yesNo(a.InRange))
			}
			b.WriteString("\n")
		}
	}
	if len(res.Studies) > 0 {
		b.WriteString("## Change in correlation\n\n")
		b.WriteString(sigLine("r", sigR(res), res.Alpha))
		together := "r and slope together"
		if res.Tests.Bias != "" {
			together = "r, slope and the agreement studies' bias and spread together"
		}
		fmt.Fprintf(&b, "Δ is new − old; p two-sided; adjusted p after %s over all %d change tests (%s).\n\n", mdtext.Escape(adjustName(res.Adjust)), s.Tested, together)
		b.WriteString("| Study | n old → new | r old → new | Δr | z | p | adjusted p |\n|---|--:|--:|--:|--:|--:|--:|\n")
		for _, sc := range res.Studies {
			cells := "not tested | | | | "
			if r := sc.R; r != nil {
				cells = fmt.Sprintf("%s → %s | %s | %s | %s | %s", num(r.Old), num(r.New), signed(r.Delta), fix2(r.Z), pval(r.P), mark(r.PAdjusted, res.Alpha))
			}
			fmt.Fprintf(&b, "| `%s` | %d → %d | %s |\n", code(sc.ID), sc.OldN, sc.NewN, cells)
		}
		b.WriteString("\n## Change in slope\n\n")
		b.WriteString(sigLine("slope", sigSlope(res), res.Alpha))
		b.WriteString("Slope in y units per x unit. SE of Δ from the pooled residual variance; t with n_old + n_new − 4 df. The residual SDs (in y units) show whether pooling is reasonable.\n\n")
		b.WriteString("| Study | unit | slope old → new | Δslope ± SE | t (df) | p | adjusted p | residual SD old → new |\n|---|---|--:|--:|--:|--:|--:|--:|\n")
		for _, sc := range res.Studies {
			cells := "not tested | | | | | "
			if sl := sc.Slope; sl != nil {
				cells = fmt.Sprintf("%s → %s | %s ± %s | %s (%d) | %s | %s | %s → %s%s", num(sl.Old), num(sl.New), signed(sl.Delta), num(sl.SE),
					fix2(sl.T), sl.DF, pval(sl.P), mark(sl.PAdjusted, res.Alpha), num(sl.OldResidSD), num(sl.NewResidSD), mdtext.Cell(unitAfter(sc.YFigureUnit())))
			}
			fmt.Fprintf(&b, "| `%s` | %s | %s |\n", code(sc.ID), mdtext.Cell(slopeUnit(sc)), cells)
		}
		b.WriteString("\n")
		b.WriteString(agreementMarkdown(res))
		b.WriteString("## Changed verdicts\n\n")
		if s.VerdictChanged == 0 {
			b.WriteString("No verdict changed (" + compare.VerdictNames + ").\n\n")
		} else {
			b.WriteString("| Study | Verdict | Old | New |\n|---|---|---|---|\n")
			for _, sc := range res.Studies {
				for _, v := range sc.Verdicts {
					fmt.Fprintf(&b, "| `%s` | %s | %s | **%s** |\n", code(sc.ID), mdtext.Cell(verdictName(v.Name)), mdtext.Cell(orDash(v.Old)), mdtext.Cell(orDash(v.New)))
				}
			}
			b.WriteString("\n")
		}
		var notes []string
		for _, sc := range res.Studies {
			for _, n := range sc.Notes {
				notes = append(notes, fmt.Sprintf("- `%s`: %s", code(sc.ID), mdtext.Escape(n)))
			}
			if sc.OldError != nil {
				notes = append(notes, fmt.Sprintf("- `%s`: did not run in the old run: %s", code(sc.ID), mdtext.Escape(*sc.OldError)))
			}
			if sc.NewError != nil {
				notes = append(notes, fmt.Sprintf("- `%s`: did not run in the new run: %s", code(sc.ID), mdtext.Escape(*sc.NewError)))
			}
		}
		if len(notes) > 0 {
			b.WriteString("## Notes per study\n\n" + strings.Join(notes, "\n") + "\n\n")
		}
	}
	b.WriteString("## Studies added and removed\n\n")
	if len(res.Added)+len(res.Removed) == 0 {
		b.WriteString("None: both runs hold the same studies.\n\n")
	} else {
		for _, a := range res.Added {
			fmt.Fprintf(&b, "- added: `%s` — %s vs %s\n", code(a.ID), mdtext.Escape(a.Y), mdtext.Escape(a.X))
		}
		for _, r := range res.Removed {
			fmt.Fprintf(&b, "- removed: `%s` — %s vs %s\n", code(r.ID), mdtext.Escape(r.Y), mdtext.Escape(r.X))
		}
		b.WriteString("\n")
	}
	if len(res.Datasets) > 0 {
		b.WriteString("## Data\n\n| Dataset | Data | Old (rows, SHA-256) | New (rows, SHA-256) |\n|---|---|---|---|\n")
		for _, d := range res.Datasets {
			side := func(from string, rows int, sha string) string {
				if sha == "" {
					return "—"
				}
				return fmt.Sprintf("`%s` (%d, `%s`)", code(from), rows, code(report.ShortHash(sha)))
			}
			fmt.Fprintf(&b, "| `%s` | %s | %s | %s |\n", code(d.ID), mdtext.Cell(statusWords(d.Status, d.Database)), side(d.OldFrom, d.OldRows, d.OldSHA256), side(d.NewFrom, d.NewRows, d.NewSHA256))
		}
		b.WriteString("\n")
	}
	b.WriteString("## How the changes were tested, and what they cannot show\n\n")
	fmt.Fprintf(&b, "- Change in r: %s.\n- Change in slope: %s.\n", mdtext.Escape(res.Tests.Correlation), mdtext.Escape(res.Tests.Slope))
	if res.Tests.Bias != "" {
		fmt.Fprintf(&b, "- Change in an agreement study's bias: %s.\n- Change in its SD of the differences: %s.\n", mdtext.Escape(res.Tests.Bias), mdtext.Escape(res.Tests.Spread))
	}
	for _, l := range res.Limitations {
		fmt.Fprintf(&b, "- %s\n", mdtext.Escape(l))
	}
	fmt.Fprintf(&b, "\n> **Caution.** %s\n", mdtext.Escape(res.Caution))
	_, err := io.WriteString(w, cleantext.Text(b.String()))
	return err
}

// changed says whether a study gets a section of its own: a CI gate's
// outcome, a verdict, or r or the slope beyond chance changed.
func changed(sc compare.StudyChange) bool {
	return sc.ExpectationChanged || sc.VerdictChanged || sc.Significant
}

// gatesLine is the sentence over the CI gates.
func gatesLine(res *compare.Result) string {
	total := 0
	for _, sc := range res.Studies {
		total += len(sc.Expectations)
	}
	for _, refs := range [][]compare.StudyRef{res.Added, res.Removed} {
		for _, r := range refs {
			total += len(r.Expectations)
		}
	}
	s := res.Summary
	switch {
	case total == 0:
		return "Neither run declares a CI gate ([study.expect]) on a study in both."
	case s.ExpectationChanged == 0:
		return fmt.Sprintf("No CI gate changed its outcome (%d compared).", total)
	case s.ExpectationChanged == 1:
		return fmt.Sprintf("1 of %d CI gates changed its outcome; %d now fails that did not fail before.", total, s.ExpectationBroken)
	}
	return fmt.Sprintf("%d of %d CI gates changed their outcome; %d now fail that did not fail before.", s.ExpectationChanged, total, s.ExpectationBroken)
}

// outcome is a gate's outcome in one run, with what it found.
func outcome(ok *bool, got string) string {
	switch {
	case ok == nil:
		return "not declared"
	case *ok:
		return "met (" + got + ")"
	}
	return "failed (" + got + ")"
}

func yesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}

// paren is " (unit)" or "".
func paren(u string) string {
	if u == "" {
		return ""
	}
	return " (" + u + ")"
}

// unitAfter is " unit" or "".
func unitAfter(u string) string {
	if u == "" {
		return ""
	}
	return " " + u
}

// statusWords says what happened to a dataset's file, as a fact.
func statusWords(status string, database bool) string {
	switch {
	case status == "same" && database:
		return "same rows"
	case status == "changed" && database:
		return "other rows (expected for a new run)"
	}
	switch status {
	case "rehashed":
		return "hashed another way (rows fetched in one run, left in the database in the other)"
	case "same":
		return "same file"
	case "changed":
		return "new file (expected for a new run)"
	case "added":
		return "only in the new run"
	case "removed":
		return "only in the old run"
	}
	return status
}

// generated is ", DATE" when the run records its date.
func generated(s compare.Side) string {
	if s.Generated == "" {
		return ""
	}
	return ", " + mdtext.Escape(s.Generated)
}

// figureFile is the file of the i-th compared study's chart, relative to
// the diff folder.
func figureFile(i int) string { return fmt.Sprintf("figures/s%d-runs.svg", i+1) }

// runsFigure is the old-against-new chart of the i-th compared study, or
// nil when it has no lines.
func runsFigure(res *compare.Result, i int) *chart.Figure {
	sc := res.Studies[i]
	if sc.Lines == nil {
		return nil
	}
	level := strconv.FormatFloat(100*(1-res.Alpha), 'g', 4, 64)
	x := report.Variable{Label: sc.X, Symbol: sc.XSymbol, Scale: sc.XScale}
	y := report.Variable{Label: sc.Y, Symbol: sc.YSymbol, Scale: sc.YScale}
	f := chart.Runs(fmt.Sprintf("s%d-runs", i+1), x, y, level,
		chart.RunLine{Name: fmt.Sprintf("old run (n = %d)", sc.Lines.Old.N), Points: sc.Lines.Old.Points},
		chart.RunLine{Name: fmt.Sprintf("new run (n = %d)", sc.Lines.New.N), Points: sc.Lines.New.Points})
	if f != nil {
		// The lines are of the transformed values; the ticks are labelled
		// in recorded units, as in the report's charts.
		f.XScale, f.YScale = sc.XScale, sc.YScale
	}
	return f
}

// figures draws the old-against-new chart of every study with a section
// of its own, keyed by its index in res.Studies.
func figures(res *compare.Result, theme string) (map[int]string, error) {
	pal, err := themes.ChartPalette(theme)
	if err != nil {
		return nil, err
	}
	d := chart.NewSVG(pal)
	out := map[int]string{}
	for i, sc := range res.Studies {
		if !changed(sc) {
			continue
		}
		f := runsFigure(res, i)
		if f == nil {
			continue
		}
		var b strings.Builder
		if err := d.Draw(&b, f); err != nil {
			return nil, fmt.Errorf("study %q: drawing the old-against-new chart: %w", sc.ID, err)
		}
		out[i] = b.String()
	}
	return out, nil
}

// FigureFiles are the charts diff.md links to, drawn in the theme's
// colours.
func FigureFiles(res *compare.Result, opts ...Option) ([]publish.File, error) {
	c := newConfig(opts)
	figs, err := figures(res, c.theme)
	if err != nil {
		return nil, err
	}
	var files []publish.File
	for i := range res.Studies {
		if svg, ok := figs[i]; ok {
			files = append(files, publish.File{Name: figureFile(i), Data: []byte(svg)})
		}
	}
	return files, nil
}

// wanted is what a changed gate asked for: both runs' wants where the
// gate was edited between them.
func wanted(e compare.ExpectationChange) string {
	if e.WantChanged {
		return "old run: " + e.OldWant + "; new run: " + e.Want
	}
	return e.Want
}

// slopeGateCaption names the slope gate's limits above the table that
// says whether each run's slope lies inside its own run's gate.
func slopeGateCaption(g *compare.SlopeGate, unit string) string {
	if o := g.OldLimits; o != nil {
		return fmt.Sprintf("Slope gate: %s to %s %s in the new run, %s to %s %s in the old (each slope is read against its own run's gate).", num(g.Low), num(g.High), unit, num(o.Low), num(o.High), unit)
	}
	return fmt.Sprintf("Slope gate: %s to %s %s.", num(g.Low), num(g.High), unit)
}

// sigLine is the Markdown sentence above a table of change tests.
func sigLine(what string, ids []string, alpha float64) string {
	if len(ids) == 0 {
		return fmt.Sprintf("No study's %s changed beyond chance (every adjusted p is %g or above).\n\n", what, alpha)
	}
	q := make([]string, len(ids))
	for i, id := range ids {
		q[i] = "`" + code(id) + "`"
	}
	return fmt.Sprintf("**Changed beyond chance** (adjusted p below %g): %s.\n\n", alpha, strings.Join(q, ", "))
}

func orDash(s string) string {
	if s == "" {
		return "—"
	}
	return s
}

// mark writes an adjusted p, in bold when below alpha.
func mark(p report.Float, alpha float64) string {
	if below(p, alpha) {
		return "**" + padj(p, alpha) + "**"
	}
	return padj(p, alpha)
}

// num writes a number with 4 significant digits, "—" when undefined.
func num(f report.Float) string {
	if !f.Valid() {
		return "—"
	}
	v := float64(f)
	if v == 0 {
		return "0"
	}
	a := math.Abs(v)
	if a >= 1e6 || a < 1e-4 {
		return strconv.FormatFloat(v, 'e', 3, 64)
	}
	return strconv.FormatFloat(v, 'g', 4, 64)
}

// signed is num with an explicit + on positive values.
func signed(f report.Float) string {
	s := num(f)
	if f.Valid() && float64(f) > 0 {
		return "+" + s
	}
	return s
}

// fix2 writes a test statistic with two decimals.
func fix2(f report.Float) string {
	if !f.Valid() {
		if math.IsInf(float64(f), 0) {
			return strconv.FormatFloat(float64(f), 'f', 0, 64)
		}
		return "—"
	}
	return strconv.FormatFloat(float64(f), 'f', 2, 64)
}

// pval writes a p-value with the project's one formatter,
// findings.PValue ("< 0.0001" below 0.0001), "—" when undefined.
func pval(f report.Float) string {
	if !f.Valid() {
		return "—"
	}
	return findings.PValue(float64(f))
}

// padj writes a p-value that is compared with alpha (an adjusted p):
// findings.PValueVs, which adds digits where PValue's rounding would put
// it on the other side of alpha (0.0496 prints as 0.0496, not 0.050).
func padj(f report.Float, alpha float64) string {
	if !f.Valid() {
		return "—"
	}
	return findings.PValueVs(float64(f), alpha)
}

func adjustName(a string) string {
	switch a {
	case "holm":
		return "Holm's step-down method"
	case "bh":
		return "Benjamini–Hochberg"
	case "none":
		return "no adjustment"
	}
	return a
}

func verdictName(n string) string { return compare.VerdictName(n) }

// anchor is the id of a study's section in diff.html: "study-" and the
// study id with every character outside [A-Za-z0-9_-] replaced by "-".
func anchor(id string) string {
	return "study-" + strings.Map(func(r rune) rune {
		if r == '-' || r == '_' || ('a' <= r && r <= 'z') || ('A' <= r && r <= 'Z') || ('0' <= r && r <= '9') {
			return r
		}
		return '-'
	}, id)
}

// code makes s safe inside a one-backtick code span (and a table cell).
func code(s string) string {
	return strings.NewReplacer("`", "'", "\n", " ", "\r", " ", "|", "\\|").Replace(s)
}
