// Package analysis turns a manifest into a report: it reads each declared
// dataset (only the columns the studies use), runs every study, adjusts
// Pearson's p across the manifest's studies, assesses the findings after
// that adjustment and evaluates the studies' expectations. The result is
// one *report.Report, the only thing the renderers see.
//
// Run is the whole job; Analyze is one study on columns already in memory
// (tests and benchmarks call it directly).
package analysis

// This file holds Run: datasets in, report out.

import (
	"cmp"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"slices"
	"strings"
	"sync"
	"time"

	"bivar/analysis/dataset"
	"bivar/analysis/findings"
	"bivar/analysis/internal/suggest"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/analysis/units"
)

// Options are the facts about this run that do not come from the manifest.
type Options struct {
	Version   string // the tool's version, written to the report
	Generated string // RFC 3339 time to record, or "" (set only from SOURCE_DATE_EPOCH)
}

// Run reads the manifest's datasets, runs every study and returns the
// report, studies in manifest order. The error is for input that stops
// the whole run (a data file that cannot be read, a non-numeric cell where
// the dataset does not allow it); a study that cannot run (a column the
// file does not have, fewer than 3 complete rows, a constant column) keeps
// its place with its Error set and the other studies still run.
func Run(m *manifest.Manifest, opts Options) (*report.Report, error) {
	cfg := Config{Alpha: m.Alpha, Design: m.Design, Seed: m.Seed, Thresholds: Thresholds(m.Thresholds), NamedRows: m.Output.NamedRows}
	if m.Output.NamedRows == 0 {
		cfg.NamedRows = -1 // the manifest asks that no row be named
	}
	cfg = cfg.withDefaults()
	adjust := m.Adjust
	if adjust == "" {
		adjust = manifest.DefaultAdjust
	}
	r := &report.Report{
		Schema:    report.Schema,
		Tool:      report.Tool{Name: "bivar", Version: opts.Version},
		Generated: opts.Generated,
		Manifest: report.ManifestInfo{File: m.Path, Title: m.Title, Design: cfg.Design, Alpha: cfg.Alpha,
			Adjust: adjust, Seed: m.Seed, Thresholds: cfg.Thresholds, Rules: findings.Rules(cfg.Thresholds, cfg.Alpha)},
		Datasets: []report.Dataset{},
		Studies:  []report.Study{},
		Caution:  report.Caution,
	}
	if m.Path != "" {
		b, err := os.ReadFile(m.Path)
		if err != nil {
			return nil, fmt.Errorf("manifest %s: %w", m.Path, err)
		}
		sum := sha256.Sum256(b)
		r.Manifest.SHA256 = hex.EncodeToString(sum[:])
	}

	loaded := map[string]*loadedSet{}
	for _, ds := range m.Datasets {
		ls, err := load(m, ds)
		if err != nil {
			return nil, err
		}
		if ls.push == nil {
			if _, err := rowFilter(m, manifest.Study{}, ls); err != nil { // the dataset's own entries, even without a study
				return nil, err
			}
		}
		loaded[ds.ID] = ls
		r.Datasets = append(r.Datasets, ls.info)
	}
	selected := make([]rowSelection, len(m.Studies))
	for i, st := range m.Studies {
		if ls := loaded[st.Dataset]; ls != nil && ls.table != nil {
			sel, err := rowFilter(m, st, ls)
			if err != nil {
				return nil, err
			}
			if err := checkScales(m, st, ls, sel.keep); err != nil {
				return nil, err
			}
			selected[i] = sel
		}
	}

	// Studies run concurrently, at most GOMAXPROCS at a time and, beyond
	// the first, only while the studies running hold at most
	// studyRowBudget rows between them (studyGate); each has its own
	// random streams (see source), so the report does not depend on the
	// scheduling.
	r.Studies = make([]report.Study, len(m.Studies))
	var wg sync.WaitGroup
	gate := newStudyGate(max(1, runtime.GOMAXPROCS(0)), studyRowBudget)
	for i, st := range m.Studies {
		if ls := loaded[st.Dataset]; ls != nil && ls.push != nil && !absentAny(st, ls) {
			// The rows stay in the database: it does the work, one study
			// at a time.
			s := pushedStudy(m, st, ls, cfg)
			// Its kind and plan as in memory: pushedStudy refuses the
			// studies that would need more (agreement, gauge SD,
			// replicates).
			measure(&s, st, Input{}, nil, cfg)
			r.Studies[i] = s
			continue
		}
		in, msg := input(st, loaded[st.Dataset])
		if msg != "" {
			s := failed(report.Study{ID: st.ID, Title: st.Title, Dataset: st.Dataset,
				X: report.Variable{Column: st.X, Label: st.X}, Y: report.Variable{Column: st.Y, Label: st.Y},
				Group: st.Group, Order: st.Order, GroupLabel: labelOf(st.Group, ""), OrderLabel: labelOf(st.Order, ""),
				Covariates: slices.Clone(st.Covariates), Notes: st.Notes}, studyAt(m, st, msg))
			if ls := loaded[st.Dataset]; ls != nil {
				s.X, s.Y = variable(ls.decl, st.X), variable(ls.decl, st.Y)
				s.GroupLabel, s.OrderLabel = labelOf(st.Group, ls.decl.Labels[st.Group]), labelOf(st.Order, ls.decl.Labels[st.Order])
			}
			r.Studies[i] = s
			continue
		}
		wg.Add(1)
		rows := len(in.XS)
		gate.enter(rows)
		go func() {
			defer func() { gate.leave(rows); wg.Done() }()
			in.Keep = selected[i].keep
			s := analyze(onScale(st, in), cfg)
			if s.Error != nil { // too few complete rows, x or y constant, …
				msg := studyAt(m, st, *s.Error)
				s.Error = &msg
			}
			scaledModels(&s)
			if in.Keep == nil {
				s.Excluded = splitReasons(s.Excluded, loaded[st.Dataset].table)
			} else {
				s.Excluded = unsplitReasons(s.Excluded, loaded[st.Dataset].table)
			}
			s.LeftOut, s.LeftOutMore, s.Subset = selected[i].leftOut, selected[i].more, selected[i].subset
			measure(&s, st, in, loaded[st.Dataset].table.Numeric, cfg)
			listsAlways(&s)
			r.Studies[i] = s
		}()
	}
	wg.Wait()
	// A dataset left in the database gets its hash and counts from its
	// first study's first pass, or else from a scan of its own.
	for i, ds := range m.Datasets {
		if ls := loaded[ds.ID]; ls.push != nil {
			if err := finishPushed(m, ls); err != nil {
				return nil, err
			}
			r.Datasets[i] = ls.info
		}
	}

	if err := Adjust(r.Studies, adjust); err != nil {
		return nil, fmt.Errorf("manifest %s: %w", m.Path, err)
	}
	slots := make(chan struct{}, max(1, runtime.GOMAXPROCS(0)))
	for i := range r.Studies {
		wg.Add(1)
		slots <- struct{}{}
		go func() {
			defer func() { <-slots; wg.Done() }()
			sc := cfg
			if d := m.Studies[i].Design; d != "" {
				sc.Design = d
			}
			r.Studies[i].Design = sc.Design
			assess(&r.Studies[i], sc)
			r.Studies[i].Expectations = Expectations(&r.Studies[i], m.Studies[i].Expect, cfg.Alpha, adjust)
			r.Studies[i].Expectations = append(r.Studies[i].Expectations, measureFindings(&r.Studies[i], m.Studies[i].Expect, cfg.Alpha)...)
		}()
	}
	wg.Wait()
	return r, nil
}

// Thresholds returns findings.DefaultThresholds with the manifest's
// [thresholds] overrides applied.
func Thresholds(t manifest.Thresholds) report.Thresholds {
	th := findings.DefaultThresholds()
	set := func(dst *float64, src *float64) {
		if src != nil {
			*dst = *src
		}
	}
	set(&th.Strong, t.Strong)
	set(&th.Moderate, t.Moderate)
	set(&th.Weak, t.Weak)
	set(&th.LeverageFactor, t.LeverageFactor)
	set(&th.OutlierZ, t.OutlierZ)
	set(&th.CooksD, t.CooksD)
	set(&th.CurveShare, t.CurveShare)
	set(&th.NonlinearDcor, t.NonlinearDcor)
	set(&th.OutlierFamilyAlpha, t.OutlierFamilyAlpha)
	set(&th.DriftDW, t.DriftDW)
	set(&th.FormDW, t.FormDW)
	if t.ReversalMinGroup != nil {
		th.ReversalMinGroup = *t.ReversalMinGroup
	}
	return th
}

// loadedSet is one dataset as read: its columns, the columns the file
// lacks, and its provenance for the report.
type loadedSet struct {
	decl    manifest.Dataset
	table   *dataset.Table
	absent  map[string]bool // columns the studies asked for that the file does not have
	columns []string        // the file's header, for "did you mean" and listings
	info    report.Dataset
	push    *pushed // set when the rows stay in the database (more than max_rows); table is then nil
}

// wanted lists the columns the studies of dataset id use: numeric (x, y,
// order, covariates) and text (group, id_column), each in first-use order.
func wanted(m *manifest.Manifest, ds manifest.Dataset) (numeric, text []string) {
	addTo := func(list *[]string, c string) {
		if c != "" && !slices.Contains(*list, c) {
			*list = append(*list, c)
		}
	}
	for _, st := range m.Studies {
		if st.Dataset != ds.ID {
			continue
		}
		addTo(&numeric, st.X)
		addTo(&numeric, st.Y)
		addTo(&numeric, st.Order)
		for _, c := range st.Covariates {
			addTo(&numeric, c)
		}
		addTo(&text, st.Group)
		for _, c := range append(slices.Clone(st.XReplicates), st.YReplicates...) {
			addTo(&numeric, c)
		}
	}
	if ds.IDColumn != "" {
		addTo(&text, ds.IDColumn)
	}
	for _, c := range subsetColumns(m, ds) {
		addTo(&text, c)
	}
	return numeric, text
}

// load reads one dataset with only the columns its studies use.
func load(m *manifest.Manifest, ds manifest.Dataset) (*loadedSet, error) {
	numeric, text := wanted(m, ds)
	opts := dataset.Options{Missing: ds.Missing, NonNumericAsMissing: ds.NonNumeric == "missing"}
	if opts.Missing == nil {
		opts.Missing = manifest.DefaultMissing()
	}
	if ds.Delimiter != "" {
		opts.Delimiter = []rune(ds.Delimiter)[0]
	}
	opts.DecimalComma = ds.Decimal == ","
	opts.DecimalPoint = ds.Decimal == "."
	if ds.Thousands != "" { // "," implies a decimal point, "." a decimal comma
		opts.Thousands = []rune(ds.Thousands)[0]
		opts.DecimalComma = opts.DecimalComma || opts.Thousands == '.'
		opts.DecimalPoint = opts.DecimalPoint || opts.Thousands == ','
	}
	for _, st := range m.Studies {
		if st.Dataset == ds.ID && st.Group != "" && !slices.Contains(opts.Groups, st.Group) {
			opts.Groups = append(opts.Groups, st.Group)
		}
	}
	lim := dataset.DefaultLimits()
	if ds.MaxRows != nil {
		lim.MaxRows = *ds.MaxRows
	}
	if ds.MaxBytes != nil {
		lim.MaxBytes = int64(*ds.MaxBytes)
	}
	if ds.MaxLevels != nil {
		lim.MaxLevels = *ds.MaxLevels
	}
	opts.Limits = &lim
	if ds.IsDatabase() {
		return loadQuery(m, ds, opts, numeric, text)
	}
	path := ds.File
	if !filepath.IsAbs(path) && m.Dir != "" {
		path = filepath.Join(m.Dir, path)
	}
	// The header tells which requested columns the file lacks, so the
	// studies that need them keep their place with an error while the
	// others run. When it cannot be read, every column is requested and
	// dataset.Read reports the problem in the file.
	workbook := dataset.IsWorkbook(path)
	sheet := dataset.SheetRef{Name: ds.Sheet.Name, Number: ds.Sheet.Number}
	headerRow := 0
	if ds.HeaderRow != nil {
		headerRow = *ds.HeaderRow
	}
	var header []string
	var herr error
	var wb *dataset.Workbook // opened once for the header and the cells
	if workbook {
		if wb, herr = dataset.OpenWorkbook(path, &lim); herr == nil {
			header, herr = wb.Header(sheet, headerRow)
		}
	} else {
		header, herr = dataset.Header(path, opts.Delimiter)
	}
	ls := &loadedSet{decl: ds, absent: map[string]bool{}, columns: header}
	keep := func(cols []string) []string {
		var out []string
		for _, c := range cols {
			if herr != nil || slices.Contains(header, c) {
				out = append(out, c)
			} else {
				ls.absent[c] = true
			}
		}
		return out
	}
	numeric, text = keep(numeric), keep(text)
	var t *dataset.Table
	var err error
	switch {
	case workbook && wb == nil:
		err = herr // the workbook could not be opened
	case workbook:
		t, err = wb.Read(sheet, headerRow, opts, numeric, text)
	default:
		t, err = dataset.Read(path, opts, numeric, text)
	}
	if err != nil {
		return nil, fmt.Errorf("dataset %q: %w", ds.ID, err)
	}
	ls.table = t
	file := ds.File
	if m.Dir != "" {
		dir, err1 := filepath.Abs(m.Dir)
		abs, err2 := filepath.Abs(path)
		if rel, err := filepath.Rel(dir, abs); err1 == nil && err2 == nil && err == nil {
			file = rel
		}
	}
	ls.info = report.Dataset{ID: ds.ID, File: filepath.ToSlash(file), SHA256: t.SHA256, Rows: t.Rows,
		Delimiter: string(t.Delimiter), DecimalComma: t.DecimalComma,
		Missing: []report.ColumnCount{}, NonNumeric: []report.ColumnCount{}}
	if workbook {
		ls.info.Delimiter = ""
		ls.info.Source = &report.Source{Kind: report.SourceWorkbook, Sheet: t.Sheet, HeaderRow: t.HeaderRow}
	}
	for _, c := range append(slices.Clone(numeric), text...) {
		if !slices.ContainsFunc(ls.info.Missing, func(cc report.ColumnCount) bool { return cc.Column == c }) {
			ls.info.Missing = append(ls.info.Missing, report.ColumnCount{Column: c, Count: t.Missing[c]})
			ls.info.MissingKinds = append(ls.info.MissingKinds, kinds(c, t.CellErrors[c])...)
		}
	}
	for _, c := range numeric {
		if n := t.NonNumeric[c]; n > 0 {
			ls.info.NonNumeric = append(ls.info.NonNumeric, report.ColumnCount{Column: c, Count: n})
		}
	}
	return ls, nil
}

// loadQuery reads a dataset from PostgreSQL: the URL from the environment
// variable the manifest names, the statement timeout and row limit from
// the manifest (or dataset.DefaultStatementTimeout, DefaultDBMaxRows).
func loadQuery(m *manifest.Manifest, ds manifest.Dataset, opts dataset.Options, numeric, text []string) (*loadedSet, error) {
	q := dataset.Query{SQL: ds.Query, Table: ds.Table, Where: ds.Where, Env: ds.Connection, URL: os.Getenv(ds.Connection), SkipAbsent: true}
	if ds.StatementTimeout != "" {
		q.Timeout, _ = time.ParseDuration(ds.StatementTimeout) // checked by manifest.Load
	}
	if ds.MaxRows == nil {
		opts.Limits.MaxRows = dataset.DefaultDBMaxRows
	}
	at := fmt.Sprintf("line %d", ds.Line)
	if m.Path != "" {
		at = fmt.Sprintf("%s:%d", m.Path, ds.Line)
	}
	over, err := dataset.OverLimit(context.Background(), q, opts.Limits.MaxRows)
	if err != nil {
		return nil, fmt.Errorf("dataset %q (%s): %w", ds.ID, at, err)
	}
	if over {
		ls, err := loadPushed(ds, q, opts.Limits.MaxRows, numeric, text)
		if err != nil {
			return nil, fmt.Errorf("dataset %q (%s): %w", ds.ID, at, err)
		}
		return ls, nil
	}
	t, qi, err := dataset.ReadQuery(context.Background(), q, opts, numeric, text)
	if err != nil {
		return nil, fmt.Errorf("dataset %q (%s): %w", ds.ID, at, err)
	}
	timeout := q.Timeout
	if timeout <= 0 {
		timeout = dataset.DefaultStatementTimeout
	}
	// A study whose column the result lacks keeps its place with an error,
	// as with a file.
	ls := &loadedSet{decl: ds, table: t, absent: map[string]bool{}, columns: qi.Names}
	for _, c := range append(slices.Clone(numeric), text...) {
		if !slices.Contains(qi.Names, c) {
			ls.absent[c] = true
		}
	}
	numeric = slices.DeleteFunc(slices.Clone(numeric), func(c string) bool { return ls.absent[c] })
	text = slices.DeleteFunc(slices.Clone(text), func(c string) bool { return ls.absent[c] })
	ls.info = report.Dataset{ID: ds.ID, SHA256: t.SHA256, Rows: t.Rows,
		Missing: []report.ColumnCount{}, NonNumeric: []report.ColumnCount{},
		Source: &report.Source{Kind: report.SourcePostgreSQL, ServerVersion: qi.ServerVersion, Query: qi.Statement,
			RanAt: qi.RanAt.Format(time.RFC3339), Connection: ds.Connection, StatementTimeout: timeout.String(), Order: dataset.Order}}
	for _, c := range append(slices.Clone(numeric), text...) {
		if !slices.ContainsFunc(ls.info.Missing, func(cc report.ColumnCount) bool { return cc.Column == c }) {
			ls.info.Missing = append(ls.info.Missing, report.ColumnCount{Column: c, Count: t.Missing[c]})
		}
	}
	for _, c := range numeric {
		if n := t.NonNumeric[c]; n > 0 {
			ls.info.NonNumeric = append(ls.info.NonNumeric, report.ColumnCount{Column: c, Count: n})
		}
	}
	return ls, nil
}

// kinds lists a column's counts by kind, most frequent first, ties by name.
func kinds(col string, m map[string]int) []report.KindCount {
	var out []report.KindCount
	for k, n := range m {
		out = append(out, report.KindCount{Column: col, Kind: k, Count: n})
	}
	slices.SortFunc(out, func(a, b report.KindCount) int {
		return cmp.Or(cmp.Compare(b.Count, a.Count), cmp.Compare(a.Kind, b.Kind))
	})
	return out
}

// splitReasons splits each column's excluded rows into those whose cell
// was missing and those whose cell was not a number (counted as missing
// because the dataset says non_numeric = "missing"). Analyze sees both as
// NaN; the table's counts tell them apart exactly, since a column's
// exclusion count covers every data row where that column is NaN.
func splitReasons(ex []report.Exclusion, t *dataset.Table) []report.Exclusion {
	var out []report.Exclusion
	for _, e := range ex {
		nn := t.NonNumeric[e.Column]
		if nn <= 0 || nn > e.Rows {
			out = append(out, e)
			continue
		}
		if e.Rows > nn {
			out = append(out, report.Exclusion{Column: e.Column, Rows: e.Rows - nn, Reason: "missing"})
		}
		out = append(out, report.Exclusion{Column: e.Column, Rows: nn, Reason: "non-numeric"})
	}
	return out
}

// unsplitReasons is splitReasons for a study that leaves rows out on
// purpose: the table counts non-numeric cells over every data row, not over
// the study's, so a column with any says "missing or non-numeric".
func unsplitReasons(ex []report.Exclusion, t *dataset.Table) []report.Exclusion {
	for i, e := range ex {
		if t.NonNumeric[e.Column] > 0 {
			ex[i].Reason = "missing or non-numeric"
		}
	}
	return ex
}

// variable describes one column: its label and unit from the dataset.
func variable(ds manifest.Dataset, col string) report.Variable {
	v := report.Variable{Column: col, Label: col, Unit: ds.Units[col], Symbol: units.Symbol(ds.Units[col])}
	if l := ds.Labels[col]; l != "" {
		v.Label = l
	}
	return v
}

// input gathers one study's columns, or says why it cannot run.
func input(st manifest.Study, ls *loadedSet) (Input, string) {
	if ls == nil {
		return Input{}, fmt.Sprintf("dataset %q is not declared in the manifest: add a [[dataset]] with id = %q or correct the study's dataset", st.Dataset, st.Dataset)
	}
	var absent []string
	check := func(role, col string) {
		if col != "" && ls.absent[col] {
			absent = append(absent, noColumn(role, col, ls))
		}
	}
	check("x column", st.X)
	check("y column", st.Y)
	check("group column", st.Group)
	check("order column", st.Order)
	for _, c := range st.Covariates {
		check("covariate column", c)
	}
	for _, c := range append(slices.Clone(st.XReplicates), st.YReplicates...) {
		check("replicate column", c)
	}
	check("the dataset's id_column", ls.decl.IDColumn)
	if len(absent) > 0 {
		return Input{}, strings.Join(absent, "; ")
	}
	t := ls.table
	in := Input{
		ID: st.ID, Title: st.Title, Dataset: st.Dataset, Notes: st.Notes,
		X: variable(ls.decl, st.X), Y: variable(ls.decl, st.Y),
		XS: t.Numeric[st.X], YS: t.Numeric[st.Y],
		GroupColumn: st.Group, GroupLabel: ls.decl.Labels[st.Group],
		OrderColumn: st.Order, OrderLabel: ls.decl.Labels[st.Order],
		PredictAt: st.PredictAt, AlsoIn: st.AlsoIn,
	}
	missing := ls.decl.Missing
	if missing == nil {
		missing = manifest.DefaultMissing()
	}
	// blankMissing returns the column with its missing markers blanked:
	// the dataset's own column where none is (nothing is copied), a copy
	// where one is.
	blankMissing := func(col string) dataset.Strings {
		return t.Text[col].Blank(func(v string) bool { return slices.Contains(missing, strings.TrimSpace(v)) })
	}
	if ls.decl.IDColumn != "" {
		in.Rows = blankMissing(ls.decl.IDColumn) // a missing name falls back to the row number
	}
	if st.Group != "" {
		in.Groups = blankMissing(st.Group) // "" is a missing group
	}
	if st.Order != "" {
		in.Order = t.Numeric[st.Order]
	}
	if len(st.Covariates) > 0 {
		in.Covariates = map[string][]float64{}
		for _, c := range st.Covariates {
			in.Covariates[c] = t.Numeric[c]
			if l := ls.decl.Labels[c]; l != "" {
				if in.CovariateLabels == nil {
					in.CovariateLabels = map[string]string{}
				}
				in.CovariateLabels[c] = l
			}
			if !slices.Contains(in.CovariateNames, c) {
				in.CovariateNames = append(in.CovariateNames, c)
			}
		}
	}
	return in, ""
}

// noColumn says that a column is not in the file, with the nearest name.
func noColumn(role, col string, ls *loadedSet) string {
	from := ls.info.File
	if from == "" && ls.info.Source != nil && ls.info.Source.Kind == report.SourcePostgreSQL {
		from = "the result of its query"
	}
	msg := fmt.Sprintf("%s %q is not in dataset %q (%s)", role, col, ls.decl.ID, from)
	if near := suggest.Nearest(col, ls.columns); near != "" {
		return msg + fmt.Sprintf(": did you mean %q?", near)
	}
	msg += ": its columns are " + quoteList(ls.columns)
	if src := ls.info.Source; src != nil && src.Kind == report.SourceWorkbook && ls.decl.HeaderRow == nil {
		// A title or a blank-looking row above the names (a report's
		// heading in A1) is taken for the header by default.
		msg += fmt.Sprintf(", read from sheet %q row %d, the first non-empty one: if the names are on another row, set header_row", src.Sheet, src.HeaderRow)
	}
	return msg
}

func quoteList(cols []string) string {
	q := make([]string, len(cols))
	for i, c := range cols {
		q[i] = fmt.Sprintf("%q", c)
	}
	return strings.Join(q, ", ")
}

// studyRowBudget is the number of rows the studies running at once may hold
// between them before another has to wait: a study's working memory is
// about 45 bytes a row (its sorted pairs, their order and a column or two
// of scratch), so two studies of 10⁷ rows side by side would take the heap
// past the soft limit main sets, where the collector runs without pause,
// while one at a time still keeps both processors busy with its tasks.
const studyRowBudget = 4_000_000

// studyGate admits studies in manifest order while fewer than slots run
// and the rows of those running stay within a budget; a study is always
// admitted when none runs.
type studyGate struct {
	mu      sync.Mutex
	cond    *sync.Cond
	slots   int
	budget  int
	running int
	rows    int
}

func newStudyGate(slots, budget int) *studyGate {
	g := &studyGate{slots: slots, budget: budget}
	g.cond = sync.NewCond(&g.mu)
	return g
}

// enter waits until a study of n rows may start, and counts it.
func (g *studyGate) enter(n int) {
	g.mu.Lock()
	for g.running > 0 && (g.running >= g.slots || g.rows+n > g.budget) {
		g.cond.Wait()
	}
	g.running++
	g.rows += n
	g.mu.Unlock()
}

// leave counts a study of n rows out.
func (g *studyGate) leave(n int) {
	g.mu.Lock()
	g.running--
	g.rows -= n
	g.mu.Unlock()
	g.cond.Broadcast()
}
