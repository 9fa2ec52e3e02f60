// Package compare turns two runs' Reports into a change report for
// `bivar diff`: for every study present in both (matched by id) it tests the
// change in Pearson r and in the least-squares slope, lists changed verdicts
// and data hashes, and names the studies added or removed. It reads only the
// Reports (results.json), never the data.
//
// The change tests use the stored centred moments (report.Moments) only.
//
// Change in r: the test for the difference of two independent
// correlations through Fisher's z transform, with a two-sided p from the
// standard normal:
//
//	z = (atanh r_new − atanh r_old) / sqrt(1/(n_old−3) + 1/(n_new−3))
//
// The transform is Fisher's (1921, Metron 1, 3–32); the test is the
// textbook one, e.g. in Zar, Biostatistical Analysis (5th ed., 2010),
// chapter on correlation (both cited from memory, no page checked).
//
// Change in slope: the pooled-variance t test for equal slopes of two
// independent straight-line regressions, with b = Sxy/Sxx and
// RSS = Syy − Sxy²/Sxx in each run:
//
//	s²_p = (RSS_old + RSS_new) / (n_old + n_new − 4)
//	SE   = sqrt(s²_p · (1/Sxx_old + 1/Sxx_new))
//	t    = (b_new − b_old) / SE,  with n_old + n_new − 4 df
//
// as in Zar (2010), chapter on comparing simple linear regression
// equations (cited from memory). It equals the t of the run×x interaction
// in one least-squares fit of y on x, run and x·run, which is how the
// tests check it. It assumes the same residual variance in both runs; the
// Result carries each run's residual SD and their F test, and a study gets
// a note when they differ clearly.
//
// Both tests treat the runs as independent samples: when two runs share
// units (rows), their p-values do not hold.
//
// The change tests of all compared studies form one family (two tests per
// study) adjusted by the method in Options.Adjust: Holm's step-down method
// controls the chance of any false alarm in the diff at alpha, Benjamini–
// Hochberg the expected share of false alarms among those flagged.
package compare

import (
	"fmt"
	"math"
	"reflect"
	"slices"
	"strings"
	"time"

	"bivar/analysis/findings"
	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// Schema names the diff.json format. Change it only with a new version.
const Schema = "bivar.diff/v1"

// varianceWarn is the F test's p below which a study carries a note that
// the residual variances differ (a warning level of our choosing, not a
// standard).
const varianceWarn = 0.01

// Test names written into Result, so a reader of diff.json knows which.
const (
	CorrelationTest = "difference of two independent correlations, Fisher z, two-sided normal p"
	SlopeTest       = "equal slopes, pooled-variance t with n_old+n_new-4 df, two-sided"
)

// Options configure Diff. Zero values take their default from the new
// report's manifest.
type Options struct {
	// Alpha is the significance level for `significant`; 0 means the new
	// report's manifest alpha (0.05 when that is unset too).
	Alpha float64
	// Adjust is "holm", "bh" or "none"; "" means the new report's
	// manifest adjust ("holm" when that is unset too).
	Adjust string
	// Tool is written into the Result's tool field.
	Tool report.Tool
}

// Adjustments lists the valid values of Options.Adjust.
var adjustments = []string{"holm", "bh", "none"}

// ValidAdjust reports whether a is a known adjustment ("" is valid: the
// default).
func ValidAdjust(a string) bool { return a == "" || slices.Contains(adjustments, a) }

// Result is the change report: the model behind diff.json, diff.html and
// diff.md. Studies follow the new report's order; removed ones follow,
// in the old report's order.
type Result struct {
	Schema  string      `json:"schema"`
	Tool    report.Tool `json:"tool"`
	Old     Side        `json:"old"`
	New     Side        `json:"new"`
	Alpha   float64     `json:"alpha"`
	Adjust  string      `json:"adjust"`
	Tests   Tests       `json:"tests"`
	Summary Summary     `json:"summary"`
	// Statements say in plain words what changed: one sentence for the
	// whole comparison, then one per study with a change beyond chance or
	// a changed verdict, each with the figures behind it.
	Statements  []string        `json:"statements"`
	Studies     []StudyChange   `json:"studies"` // present in both
	Added       []StudyRef      `json:"added"`   // only in the new run
	Removed     []StudyRef      `json:"removed"` // only in the old run
	Datasets    []DatasetChange `json:"datasets"`
	Notes       []string        `json:"notes"` // run-level remarks (tool versions differ, settings differ)
	Caution     string          `json:"caution"`
	Limitations []string        `json:"limitations"`
}

// Side describes one of the two runs.
type Side struct {
	File        string  `json:"file"` // the results.json read, as given
	Title       string  `json:"title"`
	Manifest    string  `json:"manifest"`
	SHA256      string  `json:"manifest_sha256"`
	ToolVersion string  `json:"tool_version"`
	Schema      string  `json:"schema,omitempty"` // of the results.json read
	Generated   string  `json:"generated,omitempty"`
	Alpha       float64 `json:"alpha"`
	Adjust      string  `json:"adjust"`
}

// Tests names the change tests used.
type Tests struct {
	Correlation string `json:"correlation"`
	Slope       string `json:"slope"`
	// Bias and Spread name the agreement studies' change tests, when a
	// compared study has them (agreement.go).
	Bias   string `json:"bias,omitempty"`
	Spread string `json:"spread,omitempty"`
}

// Summary counts what changed.
type Summary struct {
	// ExpectationChanged counts the CI gates whose outcome changed (met ↔
	// failed, or a gate in one run only); ExpectationBroken those that
	// fail in the new run and did not in the old. They come first: a gate
	// is what the project declared must hold.
	ExpectationChanged int `json:"expectation_changed"`
	ExpectationBroken  int `json:"expectation_broken"`
	Compared           int `json:"compared"`        // studies in both runs
	Tested             int `json:"tested"`          // change tests done (two per study where both ran)
	Significant        int `json:"significant"`     // studies with a change significant after adjustment
	VerdictChanged     int `json:"verdict_changed"` // studies with a changed verdict (VerdictNames)
	DataChanged        int `json:"data_changed"`    // studies whose dataset hash changed
	// StoppedRunning counts the studies that ran in the old run and did
	// not run in the new one: their verdicts are lost.
	StoppedRunning int `json:"stopped_running"`
	Added          int `json:"added"`
	Removed        int `json:"removed"`
}

// StudyRef names a study found in one run only.
type StudyRef struct {
	ID    string `json:"id"`
	Title string `json:"title"`
	X     string `json:"x"`
	Y     string `json:"y"`
	// Expectations are the study's CI gates in the one run that has it:
	// for an added study each is new (and broken where it fails), for a
	// removed one each is no longer declared.
	Expectations []ExpectationChange `json:"expectations,omitempty"`
}

// GateRow is one CI gate whose outcome changed, with its study.
type GateRow struct {
	Study string // the study's id
	// Compared: the study is in both runs (in Studies); else it was
	// added or removed.
	Compared bool
	ExpectationChange
}

// ChangedGates lists the CI gates whose outcome changed: those of the
// compared studies, in their order, then those of the added studies and
// of the removed ones.
func (r *Result) ChangedGates() []GateRow {
	var out []GateRow
	for _, sc := range r.Studies {
		for _, e := range sc.Expectations {
			if e.Changed {
				out = append(out, GateRow{sc.ID, true, e})
			}
		}
	}
	for _, refs := range [][]StudyRef{r.Added, r.Removed} {
		for _, s := range refs {
			for _, e := range s.Expectations {
				if e.Changed {
					out = append(out, GateRow{s.ID, false, e})
				}
			}
		}
	}
	return out
}

// StudyChange is the comparison of one study present in both runs.
type StudyChange struct {
	ID    string `json:"id"`
	Title string `json:"title"`
	X     string `json:"x"` // label of x in the new run
	Y     string `json:"y"`
	XUnit string `json:"x_unit"`
	YUnit string `json:"y_unit"`
	// XSymbol and YSymbol are the units as people write them ("°C" for
	// "Cel"), from the new run's report; the code when it has none.
	XSymbol string `json:"x_symbol"`
	YSymbol string `json:"y_symbol"`
	// XScale and YScale are the scales the new run put x and y on
	// (report.Variable.Scale: "log", "log10", "sqrt"; "" for the values
	// as recorded). The change tests need the same scales in both runs,
	// and on a transformed scale every figure is of the transformed
	// values: its unit is then the scale's name ("ln y"), not the symbol.
	XScale  string `json:"x_scale,omitempty"`
	YScale  string `json:"y_scale,omitempty"`
	Dataset string `json:"dataset"`
	OldN    int    `json:"old_n"`
	NewN    int    `json:"new_n"`

	OldSHA256   string `json:"old_sha256"` // of the study's dataset file
	NewSHA256   string `json:"new_sha256"`
	DataChanged bool   `json:"data_changed"`

	R     *RChange     `json:"r"`     // nil when either run has no moments or the scales differ
	Slope *SlopeChange `json:"slope"` // nil when either run has no moments, the scales differ or the units differ
	// Agreement compares an agreement study's bias and limits (agreement.go);
	// nil unless both runs have them.
	Agreement *AgreementChange `json:"agreement,omitempty"`

	// Columns says, when x or y is another column than in the old run
	// (the study's id kept, its variables changed or swapped), that the
	// runs' figures are of different relationships; "" otherwise.
	Columns string `json:"columns,omitempty"`

	// Flagged compares the rows flagged outlier, influential or sole
	// support; nil when each flag marks as many rows in both runs, or a
	// run has no influence figures.
	Flagged *FlaggedChange `json:"flagged,omitempty"`

	Verdicts       []VerdictChange `json:"verdicts"` // changed verdicts only
	VerdictChanged bool            `json:"verdict_changed"`
	// Expectations are the study's CI gates in either run with their
	// outcomes; ExpectationChanged is set when any outcome changed.
	Expectations       []ExpectationChange `json:"expectations"`
	ExpectationChanged bool                `json:"expectation_changed"`
	// SlopeGate sets the slope change against the declared slope_within
	// limits; nil without such a gate or a slope test.
	SlopeGate *SlopeGate `json:"slope_gate"`
	// AtX is the change of the line's mean response, in y units, at the x
	// values the study predicts at (AtXFrom "predictions") or, without
	// any, at the ends and middle of the new run's x range ("range").
	AtX     []AtX  `json:"at_x"`
	AtXFrom string `json:"at_x_from"`
	// Lines are both runs' lines with confidence bands, for the
	// old-against-new chart; nil where either is undefined.
	Lines       *Lines `json:"lines"`
	Significant bool   `json:"significant"` // r or slope change significant after adjustment
	// Statement says in plain words what changed in this study, by how
	// much and whether beyond chance; "" when nothing did.
	Statement string   `json:"statement"`
	Notes     []string `json:"notes"` // why a test was not done; a column or unit that changed
	OldError  *string  `json:"old_error"`
	NewError  *string  `json:"new_error"`
}

// RChange is the change in Pearson r.
type RChange struct {
	Old       report.Float `json:"old"`
	New       report.Float `json:"new"`
	Delta     report.Float `json:"delta"` // new − old
	Z         report.Float `json:"z"`
	P         report.Float `json:"p"`
	PAdjusted report.Float `json:"p_adjusted"`
}

// SlopeChange is the change in the least-squares slope (y units per x unit).
type SlopeChange struct {
	Old        report.Float `json:"old"`
	New        report.Float `json:"new"`
	Delta      report.Float `json:"delta"` // new − old
	OldSE      report.Float `json:"old_se"`
	NewSE      report.Float `json:"new_se"`
	SE         report.Float `json:"se"` // of the difference, pooled residual variance
	OldResidSD report.Float `json:"old_residual_sd"`
	NewResidSD report.Float `json:"new_residual_sd"`
	// VarianceRatio is s²_new / s²_old, the residual variances' ratio,
	// and VarianceP its two-sided F test with (n_new−2, n_old−2) df. A
	// small VarianceP says the pooled test's equal-variance assumption is
	// doubtful; below 0.01 (a warning level of our choosing, not a
	// standard) the study carries a note.
	VarianceRatio report.Float `json:"variance_ratio"`
	VarianceP     report.Float `json:"variance_p"`
	T             report.Float `json:"t"`
	DF            int          `json:"df"`
	P             report.Float `json:"p"`
	PAdjusted     report.Float `json:"p_adjusted"`
}

// FlaggedChange is the change in a study's flagged rows: how many rows
// each flag marks in each run, and the rows the new run names that the
// old one did not (by id_column value or row number), in the new run's
// ranking.
type FlaggedChange struct {
	Old        report.FlagCounts `json:"old"`
	New        report.FlagCounts `json:"new"`
	NewlyNamed []string          `json:"newly_named"`
	// Gone are the rows the old run named that the new one does not.
	Gone []string `json:"gone"`
}

// flaggedChange compares the flagged rows of two runs of a study; nil when
// nothing changed or either run lacks the figures.
func flaggedChange(prev, cur *report.Study) *FlaggedChange {
	if prev.Influence == nil || cur.Influence == nil {
		return nil
	}
	rows := func(in *report.Influence) []string {
		var r []string
		for _, p := range in.Points {
			r = append(r, p.Row)
		}
		return r
	}
	or, nr := rows(prev.Influence), rows(cur.Influence)
	fc := &FlaggedChange{Old: prev.Influence.Counts, New: cur.Influence.Counts, NewlyNamed: []string{}, Gone: []string{}}
	for _, r := range nr {
		if !slices.Contains(or, r) {
			fc.NewlyNamed = append(fc.NewlyNamed, r)
		}
	}
	for _, r := range or {
		if !slices.Contains(nr, r) {
			fc.Gone = append(fc.Gone, r)
		}
	}
	o, n := fc.Old, fc.New
	// Only a change in how many rows each flag marks is reported: between
	// production runs the rows are other units, so the rows named differ
	// whenever any is flagged.
	if o.Outlier == n.Outlier && o.Influential == n.Influential && o.SoleSupport == n.SoleSupport {
		return nil
	}
	return fc
}

// VerdictChange is one verdict that differs between the runs.
type VerdictChange struct {
	Name string `json:"name"` // form, direction, strength, outlier_driven, reversal, drift, spread_changes, explained_by, lines
	Old  string `json:"old"`
	New  string `json:"new"`
}

// DatasetChange compares one dataset id across the runs.
type DatasetChange struct {
	ID        string `json:"id"`
	Status    string `json:"status"` // same | changed | rehashed (hashed by another method in each run) | added | removed
	OldFile   string `json:"old_file"`
	NewFile   string `json:"new_file"`
	OldSHA256 string `json:"old_sha256"`
	NewSHA256 string `json:"new_sha256"`
	OldRows   int    `json:"old_rows"`
	NewRows   int    `json:"new_rows"`
	// OldFrom and NewFrom say where the rows came from, for people: the
	// file (with the sheet of a workbook), or the database and the name
	// of its connection's variable. Database is set when the new run read
	// a database, whose hash is over the rows, not over a file.
	OldFrom  string `json:"old_from"`
	NewFrom  string `json:"new_from"`
	Database bool   `json:"database,omitempty"`
}

// fromDatabase says whether a dataset's rows came from (or stayed in) a
// database.
func fromDatabase(d report.Dataset) bool {
	return d.Source != nil && d.Source.Kind == report.SourcePostgreSQL
}

// from says where a dataset's rows came from (DatasetChange.NewFrom).
func from(d report.Dataset) string {
	switch {
	case fromDatabase(d):
		return "PostgreSQL, connection " + d.Source.Connection
	case d.Source != nil && d.Source.Kind == report.SourceWorkbook && d.Source.Sheet != "":
		return d.File + ", sheet " + d.Source.Sheet
	}
	return d.File
}

// Limitations are stated on every diff.
var limitations = []string{
	"The change tests treat the two runs as independent samples; runs that share units are not independent.",
	"The equal-slopes test assumes the same residual variance in both runs; compare the residual SDs shown.",
	"A change that is not significant is not shown to be absent: with few points only large changes can be detected.",
	"A significant change says the relationship differs between the runs, not why; a change in the process, the gauge or the population sampled can each cause it.",
}

// Diff compares old with new. It never fails: a study that could not run
// in either report is listed with its error and without change tests.
func Diff(old, new *report.Report, opts Options) *Result {
	alpha := opts.Alpha
	if !(alpha > 0 && alpha < 1) {
		alpha = new.Manifest.Alpha
	}
	if !(alpha > 0 && alpha < 1) {
		alpha = 0.05
	}
	res := &Result{
		Schema:      Schema,
		Tool:        opts.Tool,
		Old:         side(old),
		New:         side(new),
		Alpha:       alpha,
		Tests:       Tests{Correlation: CorrelationTest, Slope: SlopeTest},
		Caution:     report.Caution,
		Limitations: slices.Clone(limitations),
		Studies:     []StudyChange{},
		Added:       []StudyRef{},
		Removed:     []StudyRef{},
		Notes:       []string{},
	}
	res.Adjust = opts.Adjust
	if res.Adjust == "" {
		res.Adjust = new.Manifest.Adjust
	}
	if res.Adjust == "" {
		res.Adjust = "holm"
	}
	if !slices.Contains(adjustments, res.Adjust) {
		res.Notes = append(res.Notes, fmt.Sprintf("adjustment %q is unknown (want holm, bh or none); holm was used", res.Adjust))
		res.Adjust = "holm"
	}
	if to, err1 := time.Parse(time.RFC3339, old.Generated); err1 == nil {
		if tn, err2 := time.Parse(time.RFC3339, new.Generated); err2 == nil && to.After(tn) {
			res.Notes = append(res.Notes, fmt.Sprintf("the old run is the later one (written %s, the new run %s): if the two were given the wrong way round, every change reads backwards; the previous run comes first", old.Generated, new.Generated))
		}
	}
	if o, n := old.Manifest, new.Manifest; o.SHA256 != "" && n.SHA256 != "" && o.SHA256 != n.SHA256 && o.File == n.File {
		res.Notes = append(res.Notes, fmt.Sprintf("the manifest %s was edited between the runs (SHA-256 %s → %s): a setting, a study or a gate may differ", n.File, report.ShortHash(o.SHA256), report.ShortHash(n.SHA256)))
	}
	if old.Schema != new.Schema && old.Schema != "" && new.Schema != "" {
		res.Notes = append(res.Notes, fmt.Sprintf("the runs were written by different builds of bivar, in results.json schemas %s and %s: figures and verdicts added since the older one are missing from it and are not compared", old.Schema, new.Schema))
	}
	if old.Tool.Version != new.Tool.Version {
		res.Notes = append(res.Notes, fmt.Sprintf("the runs were made by different versions of bivar (%s, %s)", orDash(old.Tool.Version), orDash(new.Tool.Version)))
	}
	if old.Manifest.Alpha != new.Manifest.Alpha || old.Manifest.Adjust != new.Manifest.Adjust {
		res.Notes = append(res.Notes, fmt.Sprintf("the manifests' settings differ (alpha %g, adjust %s in the old run; alpha %g, adjust %s in the new); the new run's apply",
			old.Manifest.Alpha, orDash(old.Manifest.Adjust), new.Manifest.Alpha, orDash(new.Manifest.Adjust)))
	}
	if old.Manifest.Thresholds != new.Manifest.Thresholds {
		res.Notes = append(res.Notes, fmt.Sprintf("the verdict thresholds differ between the runs (%s), so a changed verdict may come from the thresholds rather than the data",
			strings.Join(thresholdChanges(old.Manifest.Thresholds, new.Manifest.Thresholds), ", ")))
	}

	oldByID := map[string]*report.Study{}
	for i := range old.Studies {
		oldByID[old.Studies[i].ID] = &old.Studies[i]
	}
	newIDs := map[string]bool{}
	for i := range new.Studies {
		cur := &new.Studies[i]
		newIDs[cur.ID] = true
		prev, ok := oldByID[cur.ID]
		if !ok {
			a := ref(cur)
			if len(cur.Expectations) > 0 {
				a.Expectations = expectationChanges(&report.Study{}, cur)
			}
			res.Added = append(res.Added, a)
			continue
		}
		res.Studies = append(res.Studies, compareStudy(prev, cur, old, new, alpha))
	}
	for i := range old.Studies {
		if prev := &old.Studies[i]; !newIDs[prev.ID] {
			r := ref(prev)
			if len(prev.Expectations) > 0 {
				r.Expectations = expectationChanges(prev, &report.Study{})
			}
			res.Removed = append(res.Removed, r)
		}
	}
	res.Notes = append(res.Notes, renamedNotes(old, new, res)...)
	res.Datasets = compareDatasets(old.Datasets, new.Datasets)
	for _, sc := range res.Studies {
		if sc.Agreement != nil {
			res.Tests.Bias, res.Tests.Spread = BiasTest, SpreadTest
		}
	}
	adjust(res)
	if res.Adjust == "none" && len(res.Studies) > 0 {
		res.Notes = append(res.Notes, "no adjustment: each compared study has two change tests and each can raise a false alarm, so the chance of at least one is above alpha (about 1.6 × alpha for a single study, measured by simulation in compare's tests)")
	}

	s := &res.Summary
	s.Compared, s.Added, s.Removed = len(res.Studies), len(res.Added), len(res.Removed)
	for i := range res.Studies {
		sc := &res.Studies[i]
		if sc.R != nil && sc.R.PAdjusted.Valid() && float64(sc.R.PAdjusted) < alpha {
			sc.Significant = true
		}
		if sc.Slope != nil && sc.Slope.PAdjusted.Valid() && float64(sc.Slope.PAdjusted) < alpha {
			sc.Significant = true
		}
		if sc.R != nil && sc.R.P.Valid() {
			s.Tested++
		}
		if sc.Slope != nil && sc.Slope.P.Valid() {
			s.Tested++
		}
		if a := sc.Agreement; a != nil {
			for _, q := range []struct{ p, adj report.Float }{{a.BiasP, a.BiasPAdj}, {a.SDP, a.SDPAdj}} {
				if q.p.Valid() {
					s.Tested++
				}
				if q.adj.Valid() && float64(q.adj) < alpha {
					sc.Significant = true
				}
			}
		}
		if sc.Significant {
			s.Significant++
		}
		if sc.VerdictChanged {
			s.VerdictChanged++
		}
		if sc.DataChanged {
			s.DataChanged++
		}
		if sc.OldError == nil && sc.NewError != nil {
			s.StoppedRunning++
		}
		for _, e := range sc.Expectations {
			if e.Changed {
				s.ExpectationChanged++
			}
			if e.Broken {
				s.ExpectationBroken++
			}
		}
	}
	for _, refs := range [][]StudyRef{res.Added, res.Removed} {
		for _, r := range refs {
			for _, e := range r.Expectations {
				if e.Changed {
					s.ExpectationChanged++
				}
				if e.Broken {
					s.ExpectationBroken++
				}
			}
		}
	}
	res.Statements = statements(res)
	return res
}

// AnyVerdictChanged reports whether a compared study's verdict changed,
// or a study that ran in the old run did not run in the new one (its
// verdicts lost).
func (r *Result) AnyVerdictChanged() bool {
	return r.Summary.VerdictChanged > 0 || r.Summary.StoppedRunning > 0
}

// AnyExpectationBroken reports whether a CI gate fails in the new run that
// did not fail in the old one (held there, or was not declared).
func (r *Result) AnyExpectationBroken() bool { return r.Summary.ExpectationBroken > 0 }

// AnySignificant reports whether a compared study's r or slope changed
// significantly after adjustment.
func (r *Result) AnySignificant() bool { return r.Summary.Significant > 0 }

func side(r *report.Report) Side {
	return Side{
		Title:       r.Manifest.Title,
		Manifest:    r.Manifest.File,
		SHA256:      r.Manifest.SHA256,
		ToolVersion: r.Tool.Version,
		Schema:      r.Schema,
		Generated:   r.Generated,
		Alpha:       r.Manifest.Alpha,
		Adjust:      r.Manifest.Adjust,
	}
}

func ref(s *report.Study) StudyRef {
	return StudyRef{ID: s.ID, Title: s.Title, X: label(s.X), Y: label(s.Y)}
}

func label(v report.Variable) string {
	if v.Label != "" {
		return v.Label
	}
	return v.Column
}

// symbol is the variable's unit as people write it, or its code when the
// report carries no symbol (a results.json from before symbols).
func symbol(v report.Variable) string {
	if v.Symbol != "" || v.Unit == "" || v.Unit == "1" {
		return v.Symbol
	}
	return v.Unit
}

// SlopeUnit is the slope's unit as the report writes it, "y per x" in
// written symbols ("HRC per °C"), or "" when neither variable has a unit.
// On a transformed scale the transformed variable is named instead of its
// unit, as the report does: "ln y per ln x", "µm per ln x".
func (sc StudyChange) SlopeUnit() string {
	if sc.XScale != "" || sc.YScale != "" {
		name := func(scale, sym, axis string) string {
			if scale != "" || sym == "" {
				return scaledName(scale, axis)
			}
			return sym
		}
		return name(sc.YScale, sc.YSymbol, "y") + " per " + name(sc.XScale, sc.XSymbol, "x")
	}
	x, y := sc.XSymbol, sc.YSymbol
	switch {
	case x == "" && y == "":
		return ""
	case x == "":
		return y + " per unit of x"
	case y == "":
		return "per " + x
	}
	return y + " per " + x
}

// XFigureUnit and YFigureUnit are the units of the x and y figures the
// diff prints (the x values the line is read at, its values there,
// residual SDs): the written symbol, or on a transformed scale the
// scale's name ("ln x"), since those figures are of the transformed
// values.
func (sc StudyChange) XFigureUnit() string { return figureUnit(sc.XScale, sc.XSymbol, "x") }

// YFigureUnit: see XFigureUnit.
func (sc StudyChange) YFigureUnit() string { return figureUnit(sc.YScale, sc.YSymbol, "y") }

func figureUnit(scale, sym, axis string) string {
	if scale != "" {
		return scaledName(scale, axis)
	}
	return sym
}

// scaledName names a variable on its scale as the report does: "ln y",
// "log₁₀ x", "√y"; the bare axis letter on the recorded scale.
func scaledName(scale, axis string) string {
	switch scale {
	case "log":
		return "ln " + axis
	case "log10":
		return "log₁₀ " + axis
	case "sqrt":
		return "√" + axis
	}
	return axis
}

// thresholdChanges names each threshold that differs, by its manifest
// key: "strong 0.7 → 0.8".
func thresholdChanges(o, n report.Thresholds) []string {
	var out []string
	ov, nv := reflect.ValueOf(o), reflect.ValueOf(n)
	for i := range ov.NumField() {
		a, b := ov.Field(i).Interface(), nv.Field(i).Interface()
		if a != b {
			key, _, _ := strings.Cut(ov.Type().Field(i).Tag.Get("json"), ",")
			out = append(out, fmt.Sprintf("%s %v → %v", key, a, b))
		}
	}
	return out
}

func orDash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

func datasetHash(r *report.Report, id string) string {
	for _, d := range r.Datasets {
		if d.ID == id {
			return d.SHA256
		}
	}
	return ""
}

func compareStudy(prev, cur *report.Study, old, new *report.Report, alpha float64) StudyChange {
	sc := StudyChange{
		ID:        cur.ID,
		Title:     cur.Title,
		X:         label(cur.X),
		Y:         label(cur.Y),
		XUnit:     cur.X.Unit,
		YUnit:     cur.Y.Unit,
		XSymbol:   symbol(cur.X),
		YSymbol:   symbol(cur.Y),
		XScale:    cur.X.Scale,
		YScale:    cur.Y.Scale,
		Dataset:   cur.Dataset,
		OldN:      prev.N,
		NewN:      cur.N,
		OldSHA256: datasetHash(old, prev.Dataset),
		NewSHA256: datasetHash(new, cur.Dataset),
		Verdicts:  []VerdictChange{},
		Notes:     []string{},
		AtX:       []AtX{},
		OldError:  prev.Error,
		NewError:  cur.Error,
	}
	sc.DataChanged = sc.OldSHA256 != sc.NewSHA256
	if prev.Dataset != cur.Dataset {
		sc.Notes = append(sc.Notes, fmt.Sprintf("the study reads dataset %q in the new run and %q in the old; its data are compared by those datasets' hashes", cur.Dataset, prev.Dataset))
	}
	if prev.X.Column != cur.X.Column {
		sc.Notes = append(sc.Notes, fmt.Sprintf("x column changed from %q to %q", prev.X.Column, cur.X.Column))
	}
	if prev.Y.Column != cur.Y.Column {
		sc.Notes = append(sc.Notes, fmt.Sprintf("y column changed from %q to %q", prev.Y.Column, cur.Y.Column))
	}
	swapped := prev.X.Column == cur.Y.Column && prev.Y.Column == cur.X.Column && prev.X.Column != prev.Y.Column
	switch {
	case swapped:
		sc.Columns = fmt.Sprintf("x and y were swapped (x %q, y %q in the old run): the two runs' slopes, lines and verdicts are of different questions and are not alike; r is symmetric and is compared.", prev.X.Column, prev.Y.Column)
	case prev.X.Column != cur.X.Column || prev.Y.Column != cur.Y.Column:
		var moved []string
		if prev.X.Column != cur.X.Column {
			moved = append(moved, fmt.Sprintf("x %q → %q", prev.X.Column, cur.X.Column))
		}
		if prev.Y.Column != cur.Y.Column {
			moved = append(moved, fmt.Sprintf("y %q → %q", prev.Y.Column, cur.Y.Column))
		}
		sc.Columns = fmt.Sprintf("The study reads other columns than in the old run (%s): the two runs' figures are of different relationships; give a changed study a new id.", strings.Join(moved, ", "))
	}
	sc.Notes = append(sc.Notes, selectionNotes(prev, cur)...)
	unitsSame := prev.X.Unit == cur.X.Unit && prev.Y.Unit == cur.Y.Unit
	// The slope of y on x is not that of x on y: with swapped or other
	// columns only r, symmetric, is compared, and only when swapped.
	slopeAlike := unitsSame && sc.Columns == ""
	if !unitsSame {
		sc.Notes = append(sc.Notes, fmt.Sprintf("units changed (x %s → %s, y %s → %s): the slopes are in different units and are not compared",
			orDash(prev.X.Unit), orDash(cur.X.Unit), orDash(prev.Y.Unit), orDash(cur.Y.Unit)))
	}
	scaleChange := scaleNote(prev, cur)
	switch {
	case scaleChange != "":
		sc.Notes = append(sc.Notes, scaleChange)
	case sc.Columns != "" && !swapped:
		sc.Notes = append(sc.Notes, "the study reads other columns in each run; no change test")
	case prev.Error != nil || cur.Error != nil:
		sc.Notes = append(sc.Notes, "the study did not run in both runs; no change test")
	case prev.Moments == nil || cur.Moments == nil:
		sc.Notes = append(sc.Notes, "moments missing from a results file; no change test")
	default:
		om, nm := *prev.Moments, *cur.Moments
		sc.R = CorrelationChange(om, nm)
		if !sc.R.P.Valid() {
			sc.Notes = append(sc.Notes, "the change in r cannot be tested (fewer than 4 points, or a constant column, in a run)")
		}
		if slopeAlike {
			sc.Slope = SlopeChangeTest(om, nm)
			if !sc.Slope.P.Valid() {
				sc.Notes = append(sc.Notes, "the change in slope cannot be tested (fewer than 3 points, or a constant x, in a run; or no residual variance)")
			}
			if vp := sc.Slope.VarianceP; vp.Valid() && float64(vp) < varianceWarn {
				sc.Notes = append(sc.Notes, fmt.Sprintf("the residual variance differs between the runs (ratio new/old %.3g, F test p %s): the pooled equal-slopes test assumes it does not, so read its p with care",
					float64(sc.Slope.VarianceRatio), pIs(findings.PValueVs(float64(vp), varianceWarn))))
			}
		}
	}
	sc.Verdicts = verdictChanges(prev.Findings, cur.Findings)
	if (prev.Findings == nil) != (cur.Findings == nil) {
		sc.Notes = append(sc.Notes, "verdicts not compared: one run has no findings for this study")
	}
	if sc.Columns == "" {
		sc.Flagged = flaggedChange(prev, cur)
	}
	sc.Agreement = compareAgreement(prev, cur)
	sc.Verdicts = append(sc.Verdicts, agreementVerdict(prev, cur)...)
	sc.VerdictChanged = len(sc.Verdicts) > 0
	matters(&sc, prev, cur, alpha)
	return sc
}

// renamedNotes names the added studies that read the same dataset, x and
// y as a removed one: most likely one study whose id was edited, which the
// diff, matching by id, cannot compare.
func renamedNotes(old, new *report.Report, res *Result) []string {
	var out []string
	for _, a := range res.Added {
		cur := findStudy(new, a.ID)
		for _, r := range res.Removed {
			prev := findStudy(old, r.ID)
			if cur != nil && prev != nil && cur.Dataset == prev.Dataset && cur.X.Column == prev.X.Column && cur.Y.Column == prev.Y.Column {
				out = append(out, fmt.Sprintf("study %q of the new run reads the same dataset, x and y as %q of the old run: if its id was changed, the two are not compared (studies are matched by id); give it its old id back to compare them", a.ID, r.ID))
				break
			}
		}
	}
	return out
}

func findStudy(r *report.Report, id string) *report.Study {
	for i := range r.Studies {
		if r.Studies[i].ID == id {
			return &r.Studies[i]
		}
	}
	return nil
}

// VerdictNames are the verdicts a diff compares, in words, in the
// order VerdictChange lists them.
const VerdictNames = "form, direction, strength, outlier-driven, reversal, drift, changing spread, explained by, groups' lines, agreement"

// VerdictName is a VerdictChange's Name in words.
func VerdictName(n string) string {
	switch n {
	case "outlier_driven":
		return "outlier-driven"
	case "spread_changes":
		return "changing spread"
	case "explained_by":
		return "explained by"
	case "lines":
		return "groups' lines"
	}
	return n
}

func verdictChanges(of, nf *report.Findings) []VerdictChange {
	out := []VerdictChange{}
	if of == nil || nf == nil {
		return out // a run without findings (the study failed there) has no verdict to compare
	}
	// The secondary verdicts (a reversal within groups, drift in run
	// order, a changing spread, a covariate that explains the
	// association) are verdicts the report raises with their reasons, as
	// outlier-driven is: one that appears or goes is a changed verdict.
	for _, v := range []VerdictChange{
		{"form", of.Form, nf.Form},
		{"direction", of.Direction, nf.Direction},
		{"strength", of.Strength, nf.Strength},
		{"outlier_driven", fmt.Sprint(of.OutlierDriven), fmt.Sprint(nf.OutlierDriven)},
		{"reversal", fmt.Sprint(of.Reversal), fmt.Sprint(nf.Reversal)},
		{"drift", fmt.Sprint(of.Drift), fmt.Sprint(nf.Drift)},
		{"spread_changes", fmt.Sprint(of.SpreadChanges), fmt.Sprint(nf.SpreadChanges)},
		{"explained_by", strings.Join(of.ExplainedBy, ", "), strings.Join(nf.ExplainedBy, ", ")},
	} {
		if v.Old != v.New {
			out = append(out, v)
		}
	}
	// Whether one line serves every group: compared where both runs
	// decided it (a v1 results.json has no such verdict, and a study
	// without groups says "untested" or nothing).
	decided := func(s string) bool { return s != "" && s != "untested" }
	if decided(of.Lines) && decided(nf.Lines) && of.Lines != nf.Lines {
		out = append(out, VerdictChange{"lines", of.Lines, nf.Lines})
	}
	return out
}

func compareDatasets(old, new []report.Dataset) []DatasetChange {
	out := []DatasetChange{}
	oldByID := map[string]report.Dataset{}
	for _, d := range old {
		oldByID[d.ID] = d
	}
	seen := map[string]bool{}
	for _, d := range new {
		seen[d.ID] = true
		dc := DatasetChange{ID: d.ID, NewFile: d.File, NewSHA256: d.SHA256, NewRows: d.Rows, NewFrom: from(d),
			Database: fromDatabase(d)}
		if o, ok := oldByID[d.ID]; ok {
			dc.OldFile, dc.OldSHA256, dc.OldRows, dc.OldFrom = o.File, o.SHA256, o.Rows, from(o)
			dc.Status = "same"
			switch {
			case o.SHA256 == d.SHA256:
			case fromDatabase(o) && fromDatabase(d) && o.Source.Order != d.Source.Order:
				// Rows fetched are hashed in one way, rows left in the
				// database in another (report.Source.Order says how): the
				// two hashes of the same rows differ.
				dc.Status = "rehashed"
			default:
				dc.Status = "changed"
			}
		} else {
			dc.Status = "added"
		}
		out = append(out, dc)
	}
	for _, d := range old {
		if !seen[d.ID] {
			out = append(out, DatasetChange{ID: d.ID, Status: "removed", OldFile: d.File, OldSHA256: d.SHA256, OldRows: d.Rows, OldFrom: from(d)})
		}
	}
	return out
}

// adjust fills PAdjusted for every defined change test, all studies' r and
// slope tests together as one family, in a fixed order (study order, r
// before slope) so the result does not depend on map iteration.
func adjust(res *Result) {
	var ps []float64
	var dst []*report.Float
	for i := range res.Studies {
		sc := &res.Studies[i]
		if sc.R != nil {
			sc.R.PAdjusted = report.NaN()
			if sc.R.P.Valid() {
				ps = append(ps, float64(sc.R.P))
				dst = append(dst, &sc.R.PAdjusted)
			}
		}
		if sc.Slope != nil {
			sc.Slope.PAdjusted = report.NaN()
			if sc.Slope.P.Valid() {
				ps = append(ps, float64(sc.Slope.P))
				dst = append(dst, &sc.Slope.PAdjusted)
			}
		}
		if a := sc.Agreement; a != nil {
			for _, q := range []struct{ p, adj *report.Float }{{&a.BiasP, &a.BiasPAdj}, {&a.SDP, &a.SDPAdj}} {
				*q.adj = report.NaN()
				if q.p.Valid() {
					ps = append(ps, float64(*q.p))
					dst = append(dst, q.adj)
				}
			}
		}
	}
	if len(ps) == 0 {
		return
	}
	var adj []float64
	switch res.Adjust {
	case "none":
		adj = ps
	case "bh":
		adj = stats.BenjaminiHochberg(ps)
	default:
		adj = stats.Holm(ps)
	}
	for i, p := range adj {
		*dst[i] = report.Float(p)
	}
}

// CorrelationChange tests the change in Pearson r from old to new by
// Fisher's z (see the package comment). r is Sxy/sqrt(Sxx·Syy) from the
// moments. Z and P are NaN when either run has n < 4 or a constant column;
// |r| = 1 in a run gives an infinite z and p = 0 only when the other run
// differs, NaN when both are ±1 alike.
func CorrelationChange(old, new report.Moments) *RChange {
	r1, r2 := corr(old), corr(new)
	c := &RChange{Old: report.Float(r1), New: report.Float(r2), Delta: report.Float(r2 - r1),
		Z: report.NaN(), P: report.NaN(), PAdjusted: report.NaN()}
	z, p := FisherZDiff(r1, old.N, r2, new.N)
	c.Z, c.P = report.Float(z), report.Float(p)
	return c
}

// FisherZDiff is the test for the difference of two independent
// correlations: z = (atanh r2 − atanh r1)/sqrt(1/(n1−3) + 1/(n2−3)),
// with the two-sided normal p. It returns NaN for n ≤ 3 or an undefined r.
func FisherZDiff(r1 float64, n1 int, r2 float64, n2 int) (z, p float64) {
	if n1 <= 3 || n2 <= 3 || math.IsNaN(r1) || math.IsNaN(r2) || math.Abs(r1) > 1 || math.Abs(r2) > 1 {
		return math.NaN(), math.NaN()
	}
	se := math.Sqrt(1/float64(n1-3) + 1/float64(n2-3))
	z = (math.Atanh(r2) - math.Atanh(r1)) / se // ±Inf at |r| = 1; NaN when both are the same ±1
	return z, stats.TwoSidedNormal(z)
}

func corr(m report.Moments) float64 {
	sxx, syy, sxy := float64(m.Sxx), float64(m.Syy), float64(m.Sxy)
	if !(sxx > 0) || !(syy > 0) || math.IsNaN(sxy) {
		return math.NaN()
	}
	r := sxy / math.Sqrt(sxx*syy)
	return math.Max(-1, math.Min(1, r)) // rounding can push |r| a hair past 1
}

// lineFromMoments returns the slope, the residual sum of squares
// RSS = Syy − Sxy²/Sxx (clamped at 0 against rounding) and its degrees of
// freedom n − 2, or NaN when Sxx is not positive or n < 3.
func lineFromMoments(m report.Moments) (slope, rss float64, df int) {
	sxx, syy, sxy := float64(m.Sxx), float64(m.Syy), float64(m.Sxy)
	if !(sxx > 0) || m.N < 3 || math.IsNaN(syy) || math.IsNaN(sxy) {
		return math.NaN(), math.NaN(), 0
	}
	slope = sxy / sxx
	rss = math.Max(0, syy-sxy*slope)
	return slope, rss, m.N - 2
}

// SlopeChangeTest tests the change in slope from old to new by the
// pooled-variance t test for equal slopes (see the package comment).
// Undefined parts are NaN.
func SlopeChangeTest(old, new report.Moments) *SlopeChange {
	b1, rss1, df1 := lineFromMoments(old)
	b2, rss2, df2 := lineFromMoments(new)
	c := &SlopeChange{Old: report.Float(b1), New: report.Float(b2), Delta: report.Float(b2 - b1),
		OldSE: report.NaN(), NewSE: report.NaN(), SE: report.NaN(), OldResidSD: report.NaN(), NewResidSD: report.NaN(),
		T: report.NaN(), P: report.NaN(), PAdjusted: report.NaN()}
	if df1 > 0 {
		s2 := rss1 / float64(df1)
		c.OldResidSD, c.OldSE = report.Float(math.Sqrt(s2)), report.Float(math.Sqrt(s2/float64(old.Sxx)))
	}
	if df2 > 0 {
		s2 := rss2 / float64(df2)
		c.NewResidSD, c.NewSE = report.Float(math.Sqrt(s2)), report.Float(math.Sqrt(s2/float64(new.Sxx)))
	}
	c.VarianceRatio, c.VarianceP = report.NaN(), report.NaN()
	if df1 > 0 && df2 > 0 && rss1 > 0 {
		f := (rss2 / float64(df2)) / (rss1 / float64(df1))
		upper := stats.UpperF(f, float64(df2), float64(df1))
		c.VarianceRatio = report.Float(f)
		c.VarianceP = report.Float(math.Min(1, 2*math.Min(upper, 1-upper)))
	}
	t, df, p := EqualSlopes(old, new)
	c.T, c.DF, c.P = report.Float(t), df, report.Float(p)
	if df > 0 {
		s2p := (rss1 + rss2) / float64(df)
		c.SE = report.Float(math.Sqrt(s2p * (1/float64(old.Sxx) + 1/float64(new.Sxx))))
	}
	return c
}

// EqualSlopes is the pooled-variance t test for equal slopes of two
// independent straight-line fits given by their centred moments: t of
// (b_new − b_old) with n_old + n_new − 4 degrees of freedom and its
// two-sided p (stats.TwoSidedT). It returns NaN (and df 0) when either fit
// is undefined or the pooled residual variance is zero.
func EqualSlopes(old, new report.Moments) (t float64, df int, p float64) {
	b1, rss1, df1 := lineFromMoments(old)
	b2, rss2, df2 := lineFromMoments(new)
	if df1 == 0 || df2 == 0 {
		return math.NaN(), 0, math.NaN()
	}
	df = df1 + df2
	s2p := (rss1 + rss2) / float64(df)
	se := math.Sqrt(s2p * (1/float64(old.Sxx) + 1/float64(new.Sxx)))
	if !(se > 0) {
		return math.NaN(), df, math.NaN()
	}
	t = (b2 - b1) / se
	return t, df, stats.TwoSidedT(t, float64(df))
}
