package analysis

// This file holds Analyze: one study, from its columns to a filled
// report.Study (numbers, plot data and findings).

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"sync"

	"bivar/analysis/dataset"
	"bivar/analysis/findings"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/analysis/units"
	"bivar/internal/hugepage"
)

// Input is one study's data, as Run hands it to Analyze. Every per-row
// slice is parallel to XS and holds all data rows of the dataset (before
// complete cases are taken); NaN (or "" in Groups) marks a missing cell.
type Input struct {
	ID      string
	Title   string // optional, for people
	Dataset string // dataset id, recorded in the study
	Notes   string // Markdown, passed through

	X, Y   report.Variable
	XS, YS []float64
	Rows   dataset.Strings // row names: id_column value, else the 1-based data row number; none (the zero value) gives row numbers

	GroupColumn string          // name of the group column; "" when none
	GroupLabel  string          // the group column for people; "" means the column name
	Groups      dataset.Strings // group level per row; none (the zero value) when no group
	OrderColumn string          // name of the run-order column; "" when none
	OrderLabel  string          // the order column for people; "" means the column name
	Order       []float64       // run order per row; nil when no order

	// Covariates maps a covariate column to its values. CovariateNames
	// gives their order in the report; when nil the names are sorted.
	Covariates     map[string][]float64
	CovariateNames []string
	// CovariateLabels maps a covariate column to its label for people;
	// a column without one is shown by its name.
	CovariateLabels map[string]string

	PredictAt []float64
	AlsoIn    manifest.AlsoIn

	// Keep, when not nil, says which rows the study may use: false for a
	// row left out on purpose (exclude, where). Such a row is not a
	// complete case and is not counted as missing.
	Keep []bool
}

// Config holds what is the same for every study of a manifest. Zero fields
// take the defaults of DefaultConfig.
type Config struct {
	Alpha      float64 // significance level; intervals are at confidence 1−Alpha
	Design     string  // observational | designed-experiment | randomized-experiment
	Seed       uint64  // the manifest's seed, recorded; no result depends on it (random streams are seeded by the rows, see rowSource)
	Thresholds report.Thresholds

	LowessFrac       float64 // share of the points in each local fit (default 2/3)
	LowessIter       int     // robustifying iterations (default 3)
	DcorPerms        int     // most permutations for the distance-correlation p; a sequential rule stops early (default 24999, see dcorTest)
	DcorMaxN         int     // rows above which distance correlation is tested on a sample chosen by the rows' values (default stats.DefaultDcorMaxN)
	TheilSenMaxExact int     // largest n for the exact Theil–Sen slope (default stats.DefaultMaxExact)
	BandPoints       int     // grid points of the confidence and prediction bands (default 80)
	CurvePoints      int     // grid points of the quadratic curve (default 80)
	LowessMaxN       int     // rows above which LOWESS is fitted to a sample of this many chosen by the rows' values (default 20000)

	// NamedRows is the most flagged rows a study names (0: the default,
	// manifest.DefaultNamedRows; negative: none).
	NamedRows int
}

// namedMax is the most rows a study names under c.
func (c Config) namedMax() int {
	switch {
	case c.NamedRows < 0:
		return 0
	case c.NamedRows == 0:
		return manifest.DefaultNamedRows
	}
	return c.NamedRows
}

// DefaultConfig returns the defaults: alpha 0.05, observational design,
// manifest.DefaultSeed, findings.DefaultThresholds, and the smoother and
// test settings named in Config.
func DefaultConfig() Config {
	return Config{
		Alpha:            manifest.DefaultAlpha,
		Design:           manifest.DefaultDesign,
		Seed:             manifest.DefaultSeed,
		Thresholds:       findings.DefaultThresholds(),
		LowessFrac:       2.0 / 3.0,
		LowessIter:       3,
		DcorPerms:        24999,
		DcorMaxN:         stats.DefaultDcorMaxN,
		TheilSenMaxExact: stats.DefaultMaxExact,
		BandPoints:       80,
		CurvePoints:      80,
		LowessMaxN:       20000,
	}
}

// withDefaults fills the zero fields of c from DefaultConfig.
func (c Config) withDefaults() Config {
	d := DefaultConfig()
	if !(c.Alpha > 0 && c.Alpha < 1) {
		c.Alpha = d.Alpha
	}
	if c.Design == "" {
		c.Design = d.Design
	}
	if c.Thresholds == (report.Thresholds{}) {
		c.Thresholds = d.Thresholds
	}
	if !(c.LowessFrac > 0 && c.LowessFrac <= 1) {
		c.LowessFrac = d.LowessFrac
	}
	if c.LowessIter <= 0 {
		c.LowessIter = d.LowessIter
	}
	if c.DcorPerms <= 0 {
		c.DcorPerms = d.DcorPerms
	}
	if c.DcorMaxN <= 0 {
		c.DcorMaxN = d.DcorMaxN
	}
	if c.TheilSenMaxExact <= 0 {
		c.TheilSenMaxExact = d.TheilSenMaxExact
	}
	if c.BandPoints < 2 {
		c.BandPoints = d.BandPoints
	}
	if c.CurvePoints < 2 {
		c.CurvePoints = d.CurvePoints
	}
	if c.LowessMaxN < 3 {
		c.LowessMaxN = d.LowessMaxN
	}
	return c
}

// Analyze runs one study end to end: complete cases, every statistic of
// the study, the plot data and the findings. Pearson's p_adjusted is set to
// p (Run adjusts across studies first and assesses after that). A study
// that cannot run (length mismatch, fewer than 3 complete rows, a constant
// column) comes back with Error set and the sections it did not reach nil.
func Analyze(in Input, cfg Config) report.Study {
	cfg = cfg.withDefaults()
	s := analyze(in, cfg)
	s.Design = cfg.Design
	assess(&s, cfg)
	return s
}

// analyze is Analyze without the findings (Run assesses once, after the
// adjustment). cfg has its defaults filled.
func analyze(in Input, cfg Config) report.Study {
	s := report.Study{
		ID:      in.ID,
		Title:   in.Title,
		Dataset: in.Dataset,
		X:       in.X,
		Y:       in.Y,
		Group:   in.GroupColumn,
		Order:   in.OrderColumn,
		Notes:   in.Notes,
	}
	s.GroupLabel, s.OrderLabel = labelOf(in.GroupColumn, in.GroupLabel), labelOf(in.OrderColumn, in.OrderLabel)
	for _, v := range []*report.Variable{&s.X, &s.Y} {
		if v.Symbol == "" {
			v.Symbol = units.Symbol(v.Unit)
		}
	}
	covNames := in.CovariateNames
	if covNames == nil && len(in.Covariates) > 0 {
		for k := range in.Covariates {
			covNames = append(covNames, k)
		}
		slices.Sort(covNames)
	}
	s.Covariates = slices.Clone(covNames)
	if err := checkLengths(in, covNames); err != "" {
		return failed(s, err)
	}

	cc := completeCases(in, covNames)
	s.N = cc.n
	s.NMissing = len(in.XS) - cc.leftOut - s.N
	s.Excluded = cc.excluded
	if s.N < 3 {
		if len(in.XS) == 0 {
			return failed(s, "the dataset has no data rows (its file holds the column names alone, or its query returned none); a study needs at least 3 complete rows")
		}
		if cc.leftOut > 0 {
			return failed(s, fmt.Sprintf("only %s of %s after the %s left out by exclude or where; at least 3 are needed: check the manifest's exclude and where, and the columns for missing cells",
				count(s.N, "complete row"), completeColumns(in, covNames), count(cc.leftOut, "row")))
		}
		return failed(s, fmt.Sprintf("only %s of %s; at least 3 are needed: check the columns for missing cells",
			count(s.N, "complete row"), completeColumns(in, covNames)))
	}
	x, y := cc.x, cc.y
	if c, v := constant(x); c {
		return failed(s, fmt.Sprintf("x column %q is constant (every one of the %d complete rows is %g): a relationship needs x to vary",
			in.X.Column, s.N, v))
	}
	if c, v := constant(y); c {
		return failed(s, fmt.Sprintf("y column %q is constant (every one of the %d complete rows is %g): a relationship needs y to vary",
			in.Y.Column, s.N, v))
	}
	conf := 1 - cfg.Alpha

	// The pairs in one canonical order (stats.Sorted), shared by every
	// statistic that needs an order: the summaries of x and y, the ranks,
	// Kendall's τ, lack of fit, Theil–Sen and the models read it, so they
	// depend on the set of rows, not on their order in the file. The
	// statistics that read only ps run on other goroutines while this one
	// goes on; each is sequential with its own random source, so the
	// results are those of a sequential run.
	ps := stats.NewSorted(x, y)
	var side sideStats
	var wg sync.WaitGroup
	m := ps.Moments()
	sideStatistics(&wg, &side, ps, conf, cfg)
	defer wg.Wait() // a study that fails below returns after them

	s.Moments = &report.Moments{N: m.N, MeanX: report.Float(m.MeanX), MeanY: report.Float(m.MeanY),
		Sxx: report.Float(m.Sxx), Syy: report.Float(m.Syy), Sxy: report.Float(m.Sxy)}
	dx, dy := ps.Describe()
	s.Describe = &report.DescribePair{X: describe(dx), Y: describe(dy)}

	pc := ps.Pearson(m, conf)
	s.Pearson = &report.Pearson{R: report.Float(pc.R), R2: report.Float(pc.R2), CILow: report.Float(pc.CILow),
		CIHigh: report.Float(pc.CIHigh), T: report.Float(pc.T), DF: pc.DF, P: report.Float(pc.P), PAdjusted: report.Float(pc.P)}

	// The line without per-row outputs (its leverages and fitted values
	// would be two more columns of n), then its residuals in data order,
	// beside x, y and the run order; fitted values are y − residual where
	// needed.
	line, err := ps.LineSummary(conf)
	if err != nil {
		return failed(s, fmt.Sprintf("the straight line could not be fitted: %v", err))
	}
	lf := lineFit(line)
	s.Line = &lf
	line.Residuals = hugepage.Make[float64](len(x))
	line.ResidualsInto(line.Residuals, x, y)

	var order []float64
	if in.Order != nil {
		order = cc.order
	}
	var diag *report.Diagnostics
	var flaggedCSV []byte
	task(&wg)(func() {
		s.Influence, s.Sensitivity, flaggedCSV = influence(x, y, cc.name, cfg.Thresholds, cfg.namedMax(), FlaggedFileMax, conf, m, pc, line)
	})
	smp := studySample(ps, cfg)
	task(&wg)(func() { diag = diagnostics(x, y, smp, ps, line, order, cfg) })
	task(&wg)(func() { s.Robust = robust(x, y, ps, order, pc.R, conf) })
	lx, ly := smp.sub(cfg.LowessMaxN)
	var lowess []report.XY
	task(&wg)(func() { lowess = lowessCurve(lx, ly, cfg) })

	for i, name := range covNames {
		r, lo, hi, p := stats.PartialCorrelation(x, y, cc.cov[i], conf)
		s.Partial = append(s.Partial, report.Partial{Covariate: name, Label: labelOf(name, in.CovariateLabels[name]), N: s.N, R: report.Float(r),
			CILow: report.Float(lo), CIHigh: report.Float(hi), P: report.Float(p)})
	}
	var lv []string // group levels, sorted, and each row's index into them
	var gidx []int32
	if in.Groups.Given() {
		lv, gidx = levels(cc.groups)
		s.Groups = groupFits(x, y, lv, gidx, conf)
		s.GroupLines = groupLines(x, y, gidx)
	}

	wg.Wait()
	s.Diagnostics = diag
	s.Spearman, s.Kendall, s.Models = &side.spearman, &side.kendall, side.models
	compareFits(s.Line, s.Models, s.Describe.X, sumSquaresY(s.Moments))
	s.Diagnostics.Resistant = side.resistant
	if side.quad != nil {
		s.Diagnostics.QuadraticP = report.Float(side.quad.Coef[2].P)
	}
	s.Diagnostics.Lowess = &report.LowessInfo{Frac: cfg.LowessFrac, Iterations: cfg.LowessIter, Delta: lowessDelta(lx), Sampled: len(lx)}
	s.FlaggedCSV = flaggedCSV
	s.Sensitivity.ResistantSlope, s.Sensitivity.ResistantIntercept = side.resistant.Slope, side.resistant.Intercept
	if s.FlaggedCSV != nil {
		s.Influence.File = FlaggedFile(in.ID)
	}

	s.UnitInvariance = unitInvariance(in, x, y, pc.R, line)
	s.Predictions = predictions(line, in.PredictAt, s.Describe.X, conf)
	// The quadratic's residuals are binned for the charts only where the
	// form may come out curved: its x² term significant before any
	// adjustment and its share of the line's residual sum of squares at
	// least the cut (both necessary for the findings' curved verdict), or
	// a hair below it (the findings count a share within 10⁻¹² of the cut
	// as at it, and form the share from the x² term's t, not as here); at
	// 10⁷ rows the two grids cost a third of a second.
	var curve *stats.Regression
	if q := side.quad; q != nil && q.Coef[2].P < cfg.Alpha && line.RSS > 0 && 1-q.RSS/line.RSS >= float64(cfg.Thresholds.CurveShare)*(1-1e-9) {
		curve = q
	}
	s.Plot = plotData(x, y, cc, lv, gidx, line, curve, s.Influence, lowess, conf, cfg)
	lowessExtremes(s.Diagnostics.Lowess, s.Plot.Lowess)
	s.Approximations = approximations(&s, cfg)
	emptyLists(&s)
	return s
}

// emptyLists writes an empty list, not null, for each list of a study that
// ran and has nothing in it (no covariates, no groups, no predict_at, …),
// so a reader of results.json finds a list wherever DESIGN.md shows one.
// A study that failed keeps null for the sections it did not reach, but
// its excluded rows and expectations are lists too (see listsAlways).
func emptyLists(s *report.Study) {
	listsAlways(s)
	if s.Error != nil {
		return
	}
	if s.Models == nil {
		s.Models = []report.Fit{}
	}
	if s.Partial == nil {
		s.Partial = []report.Partial{}
	}
	if s.Groups == nil {
		s.Groups = []report.GroupFit{}
	}
	if s.UnitInvariance == nil {
		s.UnitInvariance = []report.UnitRow{}
	}
	if s.Predictions == nil {
		s.Predictions = []report.Prediction{}
	}
	if s.Influence != nil && s.Influence.Points == nil {
		s.Influence.Points = []report.Point{}
	}
	if s.Sensitivity != nil && s.Sensitivity.WithoutEach == nil {
		s.Sensitivity.WithoutEach = []report.Without{}
	}
}

// listsAlways sets the lists that every study has, run or not: the rows
// excluded and the expectations.
func listsAlways(s *report.Study) {
	if s.Excluded == nil {
		s.Excluded = []report.Exclusion{}
	}
	if s.Expectations == nil {
		s.Expectations = []report.Expectation{}
	}
	if s.LeftOut == nil {
		s.LeftOut = []report.LeftOutRow{}
	}
}

// assess sets the findings (and the curve in the plot data, which is drawn
// only when the form is curved). Run calls it after the adjustment.
func assess(s *report.Study, cfg Config) {
	if s.Error != nil {
		s.Findings = nil
		return
	}
	s.Findings = findings.Assess(s, findings.Context{Alpha: cfg.Alpha, Design: cfg.Design, Thresholds: cfg.Thresholds})
	if p := s.Plot; p != nil {
		p.Curve = nil
		if s.Findings != nil && s.Findings.Form == "curved" {
			p.Curve = quadraticCurve(s, cfg.CurvePoints)
			// The curve is the main fit: the residual charts show the
			// distance from it, not from the straight line.
			haveCurve := p.CurveResidX != nil || len(p.Points) > 0 && !math.IsNaN(p.Points[0].CFitted)
			if p.ResidualsOf == "line" && haveCurve {
				for i := range p.Points {
					q := &p.Points[i]
					q.Fitted, q.Residual = q.CFitted, q.CResidual
				}
				for i := range p.Marked {
					m := &p.Marked[i]
					m.Fitted, m.Residual = m.CFitted, m.CResidual
				}
				if p.Points == nil {
					p.ResidX, p.ResidOrder = p.CurveResidX, p.CurveResidOrder
				}
				p.ResidualsOf = "curve"
			}
		}
	}
}

// labelOf is a column's label for people: label, or the column name when
// label is empty; "" when there is no column.
func labelOf(column, label string) string {
	if column == "" {
		return ""
	}
	if label != "" {
		return label
	}
	return column
}

// studyAt is msg, why study st did not run, led by where to fix it: the
// manifest's file and the line of the study's [[study]] header.
func studyAt(m *manifest.Manifest, st manifest.Study, msg string) string {
	if st.Line > 0 {
		return fmt.Sprintf("%s:%d: in this [[study]]: %s", m.Path, st.Line, msg)
	}
	return msg
}

// failed sets the study's error and returns it.
func failed(s report.Study, msg string) report.Study {
	s.Error = &msg
	s.Moments, s.Describe, s.Pearson, s.Spearman, s.Kendall, s.Line = nil, nil, nil, nil, nil, nil
	s.Models, s.Diagnostics, s.Partial, s.Groups, s.Influence, s.Sensitivity = nil, nil, nil, nil, nil, nil
	s.UnitInvariance, s.Predictions, s.Findings, s.Plot, s.Robust, s.GroupLines = nil, nil, nil, nil, nil, nil
	listsAlways(&s)
	return s
}

// checkLengths returns a message when a per-row slice does not match XS.
func checkLengths(in Input, covNames []string) string {
	n := len(in.XS)
	bad := func(what string, m int) string {
		return fmt.Sprintf("internal: %s has %s but x has %d", what, count(m, "row"), n)
	}
	if len(in.YS) != n {
		return bad("y", len(in.YS))
	}
	if in.Rows.Given() && in.Rows.Len() != n {
		return bad("the row names", in.Rows.Len())
	}
	if in.Keep != nil && len(in.Keep) != n {
		return bad("keep", len(in.Keep))
	}
	if in.Groups.Given() && in.Groups.Len() != n {
		return bad("group", in.Groups.Len())
	}
	if in.Order != nil && len(in.Order) != n {
		return bad("order", len(in.Order))
	}
	for _, c := range covNames {
		v, ok := in.Covariates[c]
		if !ok {
			return fmt.Sprintf("internal: covariate %q has no values", c)
		}
		if len(v) != n {
			return bad(fmt.Sprintf("covariate %q", c), len(v))
		}
	}
	return ""
}

// cases are a study's complete cases: the rows where x, y and every
// declared group, order and covariate are present.
type cases struct {
	n        int   // complete cases
	idx      []int // data row (0-based) of each complete case; nil when every row is one
	x, y     []float64
	names    dataset.Strings // the dataset's row names (id_column), all rows; none when none
	groups   dataset.Strings
	order    []float64
	cov      [][]float64 // per covariate, in covariate order
	excluded []report.Exclusion
	leftOut  int // rows Input.Keep left out
}

func missing(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }

// completeCases keeps the rows where every column the study uses is
// present, and counts per column the rows missing there (a row missing in
// two columns is counted under both; NMissing counts it once).
func completeCases(in Input, covNames []string) cases {
	n := len(in.XS)
	type col struct {
		name string
		vals []float64        // a numeric column: missing where NaN or ±Inf
		miss func(i int) bool // the group column: missing where empty
		rows int
	}
	cols := []col{{name: in.X.Column, vals: in.XS}, {name: in.Y.Column, vals: in.YS}}
	if in.Groups.Given() {
		cols = append(cols, col{name: in.GroupColumn, miss: func(i int) bool { return in.Groups.At(i) == "" }})
	}
	if in.Order != nil {
		cols = append(cols, col{name: in.OrderColumn, vals: in.Order})
	}
	for _, c := range covNames {
		cols = append(cols, col{name: c, vals: in.Covariates[c]})
	}
	// The common case, every row kept and no numeric cell missing (nor a
	// group column), is told by one tight pass down each column; else the
	// rows are gone through one by one.
	clean := in.Keep == nil
	for j := 0; j < len(cols) && clean; j++ {
		clean = cols[j].miss == nil && !slices.ContainsFunc(cols[j].vals, missing)
	}
	var cc cases
	var drop []int // data rows that are not complete cases
	for i := 0; i < n && !clean; i++ {
		if in.Keep != nil && !in.Keep[i] {
			cc.leftOut++
			drop = append(drop, i)
			continue
		}
		ok := true
		for j := range cols {
			c := &cols[j]
			if c.miss == nil && missing(c.vals[i]) || c.miss != nil && c.miss(i) {
				c.rows++
				ok = false
			}
		}
		if !ok {
			drop = append(drop, i)
		}
	}
	// Report each column once, in the study's column order, even when the
	// same column plays two parts.
	seen := map[string]int{}
	for _, c := range cols {
		if c.rows == 0 {
			continue
		}
		if k, dup := seen[c.name]; dup {
			cc.excluded[k].Rows = max(cc.excluded[k].Rows, c.rows)
			continue
		}
		seen[c.name] = len(cc.excluded)
		cc.excluded = append(cc.excluded, report.Exclusion{Column: c.name, Rows: c.rows, Reason: "missing"})
	}
	cc.n = n - len(drop)
	cc.names = in.Rows
	if len(drop) == 0 {
		// Every row is complete: the study reads the columns as they are
		// (a study of 10⁷ rows copies nothing).
		cc.x, cc.y, cc.groups, cc.order = in.XS, in.YS, in.Groups, in.Order
		for _, c := range covNames {
			cc.cov = append(cc.cov, in.Covariates[c])
		}
		return cc
	}
	cc.idx = make([]int, 0, cc.n)
	for i, d := 0, 0; i < n; i++ {
		if d < len(drop) && drop[d] == i {
			d++
			continue
		}
		cc.idx = append(cc.idx, i)
	}
	k := cc.n
	cc.x, cc.y = make([]float64, k), make([]float64, k)
	for j, i := range cc.idx {
		cc.x[j], cc.y[j] = in.XS[i], in.YS[i]
	}
	if in.Groups.Given() {
		cc.groups = in.Groups.Pick(cc.idx)
	}
	if in.Order != nil {
		cc.order = make([]float64, k)
		for j, i := range cc.idx {
			cc.order[j] = in.Order[i]
		}
	}
	for _, c := range covNames {
		v := in.Covariates[c]
		z := make([]float64, k)
		for j, i := range cc.idx {
			z[j] = v[i]
		}
		cc.cov = append(cc.cov, z)
	}
	return cc
}

// name is the name of complete case j, for people: the row's id_column
// value, else its 1-based data row number. Names are made only for the
// rows a report names, never for every row.
func (cc *cases) name(j int) string {
	i := j
	if cc.idx != nil {
		i = cc.idx[j]
	}
	if cc.names.Given() && cc.names.At(i) != "" {
		return cc.names.At(i)
	}
	return strconv.Itoa(i + 1)
}

// FlaggedFile is the name of the CSV file, beside the report, that lists
// the rows of the study with the given id flagged outlier, influential or
// sole support.
func FlaggedFile(studyID string) string { return studyID + "-flagged.csv" }

// completeColumns lists the columns a complete case needs, for messages.
func completeColumns(in Input, covNames []string) string {
	group, order := "", ""
	if in.Groups.Given() {
		group = in.GroupColumn
	}
	if in.Order != nil {
		order = in.OrderColumn
	}
	return columnList(in.X.Column, in.Y.Column, group, order, covNames)
}

// columnList names a study's columns for a message: x "…", y "…" and,
// where given ("" for none), the group, the order and the covariates.
func columnList(x, y, group, order string, covNames []string) string {
	cols := []string{fmt.Sprintf("x %q", x), fmt.Sprintf("y %q", y)}
	if group != "" {
		cols = append(cols, fmt.Sprintf("group %q", group))
	}
	if order != "" {
		cols = append(cols, fmt.Sprintf("order %q", order))
	}
	for _, c := range covNames {
		cols = append(cols, fmt.Sprintf("covariate %q", c))
	}
	if len(cols) == 2 {
		return cols[0] + " and " + cols[1]
	}
	return strings.Join(cols[:len(cols)-1], ", ") + " and " + cols[len(cols)-1]
}

// constant reports whether every value of v is the same.
func constant(v []float64) (bool, float64) {
	for _, a := range v[1:] {
		if a != v[0] {
			return false, 0
		}
	}
	return true, v[0]
}
