package analysis

// This file holds Analyze: one study, from its columns to a filled
// report.Study (numbers, plot data and findings).

import (
	"cmp"
	"fmt"
	"hash/fnv"
	"math"
	"math/rand/v2"
	"slices"
	"strconv"
	"strings"

	"bivar/analysis/findings"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/analysis/units"
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
	Rows   []string // row names: id_column value, else the 1-based data row number; nil gives row numbers

	GroupColumn string    // name of the group column; "" when none
	Groups      []string  // group level per row; nil when no group
	OrderColumn string    // name of the run-order column; "" when none
	Order       []float64 // run order per row; nil when no order

	// Covariates maps a covariate column to its values. CovariateNames
	// gives their order in the report; when nil the names are sorted.
	Covariates     map[string][]float64
	CovariateNames []string

	PredictAt []float64
	AlsoIn    manifest.AlsoIn
}

// Config holds what is the same for every study of a manifest. Zero fields
// take the defaults of DefaultConfig.
type Config struct {
	Alpha      float64 // significance level; intervals are at confidence 1−Alpha
	Design     string  // observational | designed-experiment | randomized-experiment
	Seed       uint64  // seed of every random source (permutation test, samples)
	Thresholds report.Thresholds

	LowessFrac       float64 // share of the points in each local fit (default 2/3)
	LowessIter       int     // robustifying iterations (default 3)
	DcorPerms        int     // permutations for the distance-correlation p (default 199)
	DcorMaxN         int     // rows above which distance correlation is tested on a seeded sample (default stats.DefaultDcorMaxN)
	TheilSenMaxExact int     // largest n for the exact Theil–Sen slope (default stats.DefaultMaxExact)
	BandPoints       int     // grid points of the confidence and prediction bands (default 80)
	CurvePoints      int     // grid points of the quadratic curve (default 80)
	LowessMaxN       int     // rows above which LOWESS is fitted to a seeded sample of this many (default 20000)
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
		DcorPerms:        199,
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

// source returns the random source for one study and one use: a PCG
// generator seeded with the manifest seed, on a stream chosen by the study
// id and the use, so a study's numbers do not depend on which other
// studies the manifest holds or in which order.
func source(seed uint64, studyID, use string) rand.Source {
	h := fnv.New64a()
	h.Write([]byte(studyID))
	h.Write([]byte{0})
	h.Write([]byte(use))
	return rand.NewPCG(seed, h.Sum64())
}

// Analyze runs one study end to end: complete cases, every statistic of
// the study, the plot data and the findings. Pearson's p_adjusted is set to
// p (Run adjusts across studies first and assesses after that). A study
// that cannot run (length mismatch, fewer than 3 complete rows, a constant
// column) comes back with Error set and the sections it did not reach nil.
func Analyze(in Input, cfg Config) report.Study {
	cfg = cfg.withDefaults()
	s := analyze(in, cfg)
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
	s.N = len(cc.idx)
	s.NMissing = len(in.XS) - s.N
	s.Excluded = cc.excluded
	if s.N < 3 {
		return failed(s, fmt.Sprintf("only %d complete row(s) of %s; at least 3 are needed: check the columns for missing cells",
			s.N, completeColumns(in, covNames)))
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

	m := stats.CentredMoments(x, y)
	s.Moments = &report.Moments{N: m.N, MeanX: report.Float(m.MeanX), MeanY: report.Float(m.MeanY),
		Sxx: report.Float(m.Sxx), Syy: report.Float(m.Syy), Sxy: report.Float(m.Sxy)}
	s.Describe = &report.DescribePair{X: describe(x), Y: describe(y)}

	pc := stats.Pearson(x, y, conf)
	s.Pearson = &report.Pearson{R: report.Float(pc.R), R2: report.Float(pc.R2), CILow: report.Float(pc.CILow),
		CIHigh: report.Float(pc.CIHigh), T: report.Float(pc.T), DF: pc.DF, P: report.Float(pc.P), PAdjusted: report.Float(pc.P)}
	rho, prho := stats.Spearman(x, y)
	s.Spearman = &report.Spearman{Rho: report.Float(rho), P: report.Float(prho)}
	tau, ptau := stats.KendallTauB(x, y)
	s.Kendall = &report.Kendall{TauB: report.Float(tau), P: report.Float(ptau)}

	line, err := stats.Line(x, y, conf)
	if err != nil {
		return failed(s, fmt.Sprintf("the straight line could not be fitted: %v", err))
	}
	lf := lineFit(line)
	s.Line = &lf

	var quad *stats.Regression
	if s.N >= 4 {
		if q, err := stats.Polynomial(x, y, 2, conf); err == nil && len(q.Coef) == 3 {
			quad = &q
			f := regFit("quadratic", "y = b0 + b1·x + b2·x²", []string{"intercept", "x", "x^2"}, q)
			if b2 := q.Coef[2].Estimate; b2 != 0 {
				f.Vertex = report.Float(-q.Coef[1].Estimate / (2 * b2))
			}
			s.Models = append(s.Models, f)
		}
	}
	s.Models = append(s.Models, logModels(x, y, conf)...)

	// Run order: residuals and order values arranged by order (ties in
	// data order), for Durbin–Watson and the trend.
	var order []float64
	if in.Order != nil {
		order = cc.order
	}
	s.Diagnostics = diagnostics(in.ID, x, y, line, quad, order, cfg)
	lx, ly := sample(x, y, cfg.LowessMaxN, source(cfg.Seed, in.ID, "lowess"))
	s.Diagnostics.Lowess = &report.LowessInfo{Frac: cfg.LowessFrac, Iterations: cfg.LowessIter, Delta: lowessDelta(lx), Sampled: len(lx)}

	for i, name := range covNames {
		r, lo, hi, p := stats.PartialCorrelation(x, y, cc.cov[i], conf)
		s.Partial = append(s.Partial, report.Partial{Covariate: name, N: s.N, R: report.Float(r),
			CILow: report.Float(lo), CIHigh: report.Float(hi), P: report.Float(p)})
	}
	if in.Groups != nil {
		s.Groups = groupFits(x, y, cc.groups, conf)
	}

	inf := stats.Influence(x, y)
	flags := findings.FlagPoints(inf.Leverage, inf.StudentizedExt, inf.CooksD, inf.SoleSupport, cfg.Thresholds)
	s.Influence, s.Sensitivity = influence(x, y, cc.rows, inf, flags, conf, s.Diagnostics.Resistant, pc, line)

	s.UnitInvariance = unitInvariance(in, x, y, pc.R, line)
	s.Predictions = predictions(line, in.PredictAt, s.Describe.X, conf)
	s.Plot = plotData(x, y, cc, line, s.Influence, lx, ly, conf, cfg)
	return s
}

// assess sets the findings (and the curve in the plot data, which is drawn
// only when the form is curved). Run calls it after the adjustment.
func assess(s *report.Study, cfg Config) {
	if s.Error != nil {
		s.Findings = nil
		return
	}
	s.Findings = findings.Assess(s, findings.Context{Alpha: cfg.Alpha, Design: cfg.Design, Thresholds: cfg.Thresholds})
	if s.Plot != nil {
		s.Plot.Curve = nil
		if s.Findings != nil && s.Findings.Form == "curved" {
			s.Plot.Curve = quadraticCurve(s, cfg.CurvePoints)
		}
	}
}

// failed sets the study's error and returns it.
func failed(s report.Study, msg string) report.Study {
	s.Error = &msg
	s.Moments, s.Describe, s.Pearson, s.Spearman, s.Kendall, s.Line = nil, nil, nil, nil, nil, nil
	s.Models, s.Diagnostics, s.Partial, s.Groups, s.Influence, s.Sensitivity = nil, nil, nil, nil, nil, nil
	s.UnitInvariance, s.Predictions, s.Findings, s.Plot = nil, nil, nil, nil
	return s
}

// checkLengths returns a message when a per-row slice does not match XS.
func checkLengths(in Input, covNames []string) string {
	n := len(in.XS)
	bad := func(what string, m int) string {
		return fmt.Sprintf("internal: %s has %d rows but x has %d", what, m, n)
	}
	if len(in.YS) != n {
		return bad("y", len(in.YS))
	}
	if in.Rows != nil && len(in.Rows) != n {
		return bad("the row names", len(in.Rows))
	}
	if in.Groups != nil && len(in.Groups) != n {
		return bad("group", len(in.Groups))
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
	idx      []int // data row (0-based) of each complete case
	x, y     []float64
	rows     []string
	groups   []string
	order    []float64
	cov      [][]float64 // per covariate, in covariate order
	excluded []report.Exclusion
}

func missing(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }

// completeCases keeps the rows where every column the study uses is
// present, and counts per column the rows missing there (a row missing in
// two columns is counted under both; NMissing counts it once).
func completeCases(in Input, covNames []string) cases {
	n := len(in.XS)
	type col struct {
		name string
		miss func(i int) bool
		rows int
	}
	cols := []col{
		{name: in.X.Column, miss: func(i int) bool { return missing(in.XS[i]) }},
		{name: in.Y.Column, miss: func(i int) bool { return missing(in.YS[i]) }},
	}
	if in.Groups != nil {
		cols = append(cols, col{name: in.GroupColumn, miss: func(i int) bool { return in.Groups[i] == "" }})
	}
	if in.Order != nil {
		cols = append(cols, col{name: in.OrderColumn, miss: func(i int) bool { return missing(in.Order[i]) }})
	}
	for _, c := range covNames {
		v := in.Covariates[c]
		cols = append(cols, col{name: c, miss: func(i int) bool { return missing(v[i]) }})
	}
	cc := cases{idx: make([]int, 0, n)}
	for i := 0; i < n; i++ {
		ok := true
		for j := range cols {
			if cols[j].miss(i) {
				cols[j].rows++
				ok = false
			}
		}
		if ok {
			cc.idx = append(cc.idx, i)
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
	k := len(cc.idx)
	cc.x, cc.y = make([]float64, k), make([]float64, k)
	for j, i := range cc.idx {
		cc.x[j], cc.y[j] = in.XS[i], in.YS[i]
	}
	cc.rows = rowNames(in.Rows, cc.idx)
	if in.Groups != nil {
		cc.groups = make([]string, k)
		for j, i := range cc.idx {
			cc.groups[j] = in.Groups[i]
		}
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

// rowNames names the data rows idx (0-based): each by its id_column value,
// else by its 1-based data row number. The numbers are written into one
// string and sliced from it, so a million rows cost one allocation.
func rowNames(rows []string, idx []int) []string {
	out := make([]string, len(idx))
	var buf []byte
	ends := make([]int, len(idx))
	for j, i := range idx {
		if rows == nil || rows[i] == "" {
			buf = strconv.AppendInt(buf, int64(i+1), 10)
		}
		ends[j] = len(buf)
	}
	all := string(buf)
	start := 0
	for j, i := range idx {
		if rows != nil && rows[i] != "" {
			out[j] = rows[i]
			continue
		}
		out[j] = all[start:ends[j]]
		start = ends[j]
	}
	return out
}

// completeColumns lists the columns a complete case needs, for messages.
func completeColumns(in Input, covNames []string) string {
	cols := []string{fmt.Sprintf("x %q", in.X.Column), fmt.Sprintf("y %q", in.Y.Column)}
	if in.Groups != nil {
		cols = append(cols, fmt.Sprintf("group %q", in.GroupColumn))
	}
	if in.Order != nil {
		cols = append(cols, fmt.Sprintf("order %q", in.OrderColumn))
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

func describe(v []float64) report.Describe {
	d := stats.Describe(v)
	return report.Describe{N: d.N, Mean: report.Float(d.Mean), SD: report.Float(d.SD), Min: report.Float(d.Min),
		Q1: report.Float(d.Q1), Median: report.Float(d.Median), Q3: report.Float(d.Q3), Max: report.Float(d.Max)}
}

func coef(name string, c stats.Coef) report.Coef {
	return report.Coef{Name: name, Estimate: report.Float(c.Estimate), SE: report.Float(c.SE), T: report.Float(c.T),
		P: report.Float(c.P), CILow: report.Float(c.CILow), CIHigh: report.Float(c.CIHigh)}
}

// regFit turns a least-squares fit into the report's Fit.
func regFit(name, formula string, coefNames []string, r stats.Regression) report.Fit {
	f := report.Fit{Name: name, Formula: formula, ResidualSE: report.Float(r.ResidualSE), RSS: report.Float(r.RSS),
		R2: report.Float(r.R2), AdjR2: report.Float(r.AdjR2), F: report.Float(r.F), FP: report.Float(r.FP),
		DFResid: r.DFResid, AIC: report.Float(r.AIC), Vertex: report.NaN()}
	for i, c := range r.Coef {
		name := fmt.Sprintf("b%d", i)
		if i < len(coefNames) {
			name = coefNames[i]
		}
		f.Coefficients = append(f.Coefficients, coef(name, c))
	}
	return f
}

func lineFit(l stats.LineFit) report.Fit {
	f := regFit("line", "y = b0 + b1·x", []string{"intercept", "x"}, l.Regression)
	ic, sl := coef("intercept", l.Intercept), coef("x", l.Slope)
	f.Intercept, f.Slope = &ic, &sl
	f.Coefficients = []report.Coef{ic, sl}
	return f
}

// logModels fits the linearising transforms the data allow: log-x where
// every x is positive, log-y where every y is positive, log-log where both
// are. Natural logarithms.
func logModels(x, y []float64, conf float64) []report.Fit {
	pos := func(v []float64) bool {
		for _, a := range v {
			if !(a > 0) {
				return false
			}
		}
		return true
	}
	logs := func(v []float64) []float64 {
		out := make([]float64, len(v))
		for i, a := range v {
			out[i] = math.Log(a)
		}
		return out
	}
	xp, yp := pos(x), pos(y)
	var lx, ly []float64
	if xp {
		lx = logs(x)
	}
	if yp {
		ly = logs(y)
	}
	var out []report.Fit
	add := func(name, formula, xname string, u, v []float64) {
		if c, _ := constant(u); c {
			return
		}
		l, err := stats.Line(u, v, conf)
		if err != nil {
			return
		}
		f := regFit(name, formula, []string{"intercept", xname}, l.Regression)
		ic, sl := coef("intercept", l.Intercept), coef(xname, l.Slope)
		f.Coefficients = []report.Coef{ic, sl}
		out = append(out, f)
	}
	if xp {
		add("log-x", "y = b0 + b1·ln(x)", "ln(x)", lx, y)
	}
	if yp {
		add("log-y", "ln(y) = b0 + b1·x", "x", x, ly)
	}
	if xp && yp {
		add("log-log", "ln(y) = b0 + b1·ln(x)", "ln(x)", lx, ly)
	}
	return out
}

// diagnostics runs the tests of form, spread and order. order holds the
// run order of each complete case, or nil.
func diagnostics(id string, x, y []float64, line stats.LineFit, quad *stats.Regression, order []float64, cfg Config) *report.Diagnostics {
	d := &report.Diagnostics{QuadraticP: report.NaN(), DurbinWatson: report.NaN()}
	if quad != nil {
		d.QuadraticP = report.Float(quad.Coef[2].P)
	}
	if f, df1, df2, p, ok := stats.LackOfFit(x, y); ok {
		d.LackOfFit = &report.LackOfFit{F: report.Float(f), DF1: df1, DF2: df2, P: report.Float(p)}
	}
	dc, p, used, method := stats.DistanceCorrTest(x, y, cfg.DcorPerms, cfg.DcorMaxN, source(cfg.Seed, id, "dcor"))
	d.DistanceCorr = &report.DistanceCorr{DCor: report.Float(dc), P: report.Float(p), Permutations: cfg.DcorPerms,
		Sampled: used, Method: method}
	bp, df, pbp := stats.BreuschPagan(line.Residuals, x)
	d.BreuschPagan = &report.ChiTest{Stat: report.Float(bp), DF: df, P: report.Float(pbp)}

	resid := line.Residuals
	if order != nil {
		perm := make([]int, len(order))
		for i := range perm {
			perm[i] = i
		}
		if !slices.IsSorted(order) {
			slices.SortFunc(perm, func(a, b int) int { return cmp.Or(cmp.Compare(order[a], order[b]), cmp.Compare(a, b)) })
		}
		ro, oo := make([]float64, len(perm)), make([]float64, len(perm))
		for k, i := range perm {
			ro[k], oo[k] = resid[i], order[i]
		}
		d.DurbinWatson = report.Float(stats.DurbinWatson(ro))
		slope, p, r := stats.OrderTrend(oo, ro)
		t := &report.OrderTrend{Slope: report.Float(slope), P: report.Float(p), R: report.Float(r)}
		d.OrderTrend = t
	} else {
		d.DurbinWatson = report.Float(stats.DurbinWatson(resid))
	}

	slope, icpt, method := stats.TheilSen(x, y, cfg.TheilSenMaxExact, source(cfg.Seed, id, "theil-sen"))
	d.Resistant = &report.Resistant{Method: method, Slope: report.Float(slope), Intercept: report.Float(icpt)}
	return d
}

// lowessDelta is the smoother's interpolation distance: 0 (a local fit at
// every distinct x) up to stats.LowessAutoDeltaN points, 1% of the x range
// beyond (Cleveland 1979, sec. 4, suggests a small fraction of the range;
// 0.01 is common practice and the rule of stats.Lowess for a negative
// delta, written out here so the report can state it).
func lowessDelta(x []float64) float64 {
	if len(x) <= stats.LowessAutoDeltaN {
		return 0
	}
	lo, hi := x[0], x[0]
	for _, v := range x {
		lo, hi = min(lo, v), max(hi, v)
	}
	return 0.01 * (hi - lo)
}

// sample returns x and y, or above maxN rows a simple random sample of
// maxN rows without replacement (a partial Fisher–Yates shuffle, Knuth
// TAOCP vol. 2, Algorithm P, stopped after maxN steps) from the seeded
// source, kept in data order. LOWESS is drawn, not tested, so a bounded
// sample keeps its cost fixed at any n; the report states its size.
func sample(x, y []float64, maxN int, src rand.Source) (sx, sy []float64) {
	n := len(x)
	if n <= maxN {
		return x, y
	}
	rng := rand.New(src)
	perm := make([]int, n)
	for i := range perm {
		perm[i] = i
	}
	for i := 0; i < maxN; i++ {
		j := i + rng.IntN(n-i)
		perm[i], perm[j] = perm[j], perm[i]
	}
	idx := perm[:maxN]
	slices.Sort(idx)
	return pick(x, idx), pick(y, idx)
}

// groupFits fits the straight line within each level of the group, levels
// in sorted order. A level with fewer than 3 rows or a constant x gets NaN.
func groupFits(x, y []float64, groups []string, conf float64) []report.GroupFit {
	byLevel := map[string][]int{}
	for i, g := range groups {
		byLevel[g] = append(byLevel[g], i)
	}
	levels := make([]string, 0, len(byLevel))
	for g := range byLevel {
		levels = append(levels, g)
	}
	slices.Sort(levels)
	out := make([]report.GroupFit, 0, len(levels))
	for _, g := range levels {
		idx := byLevel[g]
		gf := report.GroupFit{Group: g, N: len(idx), R: report.NaN(), Slope: report.NaN(), Intercept: report.NaN(),
			SlopeLow: report.NaN(), SlopeHigh: report.NaN()}
		gx, gy := pick(x, idx), pick(y, idx)
		if len(idx) >= 3 {
			if cx, _ := constant(gx); !cx {
				if l, err := stats.Line(gx, gy, conf); err == nil {
					gf.Slope, gf.Intercept = report.Float(l.Slope.Estimate), report.Float(l.Intercept.Estimate)
					gf.SlopeLow, gf.SlopeHigh = report.Float(l.Slope.CILow), report.Float(l.Slope.CIHigh)
				}
				gf.R = report.Float(stats.Pearson(gx, gy, conf).R)
			}
		}
		out = append(out, gf)
	}
	return out
}

func pick(v []float64, idx []int) []float64 {
	out := make([]float64, len(idx))
	for j, i := range idx {
		out[j] = v[i]
	}
	return out
}

// influence fills the influence summary (flagged points only, largest
// Cook's D first, then data order) and the sensitivity figures. "Without
// the flagged rows" leaves out the rows findings.Suspect names (outliers,
// influential rows, rows of sole support) and NFlagged counts them: a row
// that is only far out in x but on the line is good data, and leaving it
// out would only shorten the observed range. WithoutEach has one row per
// flagged point, from the O(n) leave-one-out figures of stats.Influence.
func influence(x, y []float64, rows []string, inf stats.InfluenceResult, flags [][]string, conf float64,
	res *report.Resistant, all stats.Correlation, line stats.LineFit) (*report.Influence, *report.Sensitivity) {
	n := len(x)
	in := &report.Influence{MaxCooksD: report.NaN()}
	best := -1
	for i := 0; i < n; i++ {
		d := inf.CooksD[i]
		if math.IsNaN(d) {
			continue
		}
		if best < 0 || d > inf.CooksD[best] {
			best = i
		}
	}
	if best >= 0 {
		in.MaxCooksD, in.MaxCooksRow = report.Float(inf.CooksD[best]), rows[best]
	}
	var flagged []int
	for i := 0; i < n; i++ {
		if i < len(flags) && len(flags[i]) > 0 {
			flagged = append(flagged, i)
		}
	}
	// Largest Cook's D first; an undefined D (a row that alone sets the
	// fit) ranks first; ties in data order.
	key := func(i int) float64 {
		if d := inf.CooksD[i]; !math.IsNaN(d) {
			return d
		}
		return math.Inf(1)
	}
	slices.SortStableFunc(flagged, func(a, b int) int { return cmp.Or(cmp.Compare(key(b), key(a)), cmp.Compare(a, b)) })
	in.Points = []report.Point{}
	for _, i := range flagged {
		in.Points = append(in.Points, report.Point{Row: rows[i], Index: i, X: report.Float(x[i]), Y: report.Float(y[i]),
			Leverage: report.Float(inf.Leverage[i]), Studentized: report.Float(inf.Studentized[i]),
			StudentizedExt: report.Float(inf.StudentizedExt[i]), CooksD: report.Float(inf.CooksD[i]),
			DFFITS: report.Float(inf.DFFITS[i]), Flags: slices.Clone(flags[i])})
	}

	se := &report.Sensitivity{LooRMin: report.NaN(), LooRMax: report.NaN(), LooSlopeMin: report.NaN(), LooSlopeMax: report.NaN(),
		RWithoutFlagged: report.NaN(), RWithoutLow: report.NaN(), RWithoutHigh: report.NaN(),
		PWithoutFlagged: report.NaN(), SlopeWithoutFlagged: report.NaN(), InterceptWithout: report.NaN(),
		ResistantSlope: res.Slope, ResistantIntercept: res.Intercept, WithoutEach: []report.Without{}}
	rmin, rmax := extremes(inf.LooR)
	if rmin >= 0 {
		se.LooRMin, se.LooRMinRow = report.Float(inf.LooR[rmin]), rows[rmin]
		se.LooRMax, se.LooRMaxRow = report.Float(inf.LooR[rmax]), rows[rmax]
	}
	if smin, smax := extremes(inf.LooSlope); smin >= 0 {
		se.LooSlopeMin, se.LooSlopeMax = report.Float(inf.LooSlope[smin]), report.Float(inf.LooSlope[smax])
	}
	for _, i := range flagged {
		if findings.Suspect(flags[i]) {
			se.NFlagged++
		}
	}
	if se.NFlagged == 0 {
		// Nothing to leave out: the line without the flagged rows is the line.
		se.RWithoutFlagged, se.RWithoutLow, se.RWithoutHigh, se.PWithoutFlagged = report.Float(all.R),
			report.Float(all.CILow), report.Float(all.CIHigh), report.Float(all.P)
		se.SlopeWithoutFlagged, se.InterceptWithout = report.Float(line.Slope.Estimate), report.Float(line.Intercept.Estimate)
	} else {
		drop := make([]bool, n)
		for _, i := range flagged {
			drop[i] = findings.Suspect(flags[i])
		}
		var kx, ky []float64
		for i := 0; i < n; i++ {
			if !drop[i] {
				kx, ky = append(kx, x[i]), append(ky, y[i])
			}
		}
		if len(kx) >= 3 {
			cx, _ := constant(kx)
			cy, _ := constant(ky)
			if !cx && !cy {
				p := stats.Pearson(kx, ky, conf)
				se.RWithoutFlagged, se.RWithoutLow, se.RWithoutHigh, se.PWithoutFlagged = report.Float(p.R),
					report.Float(p.CILow), report.Float(p.CIHigh), report.Float(p.P)
			}
			if !cx {
				if l, err := stats.Line(kx, ky, conf); err == nil {
					se.SlopeWithoutFlagged, se.InterceptWithout = report.Float(l.Slope.Estimate), report.Float(l.Intercept.Estimate)
				}
			}
		}
	}
	for _, i := range flagged {
		se.WithoutEach = append(se.WithoutEach, report.Without{Row: rows[i], R: report.Float(inf.LooR[i]),
			Slope: report.Float(inf.LooSlope[i]), Intercept: report.Float(inf.LooIntercept[i])})
	}
	return in, se
}

// extremes returns the indices of the smallest and largest non-NaN values
// (first occurrence), or -1, -1.
func extremes(v []float64) (lo, hi int) {
	lo, hi = -1, -1
	for i, a := range v {
		if math.IsNaN(a) {
			continue
		}
		if lo < 0 || a < v[lo] {
			lo = i
		}
		if hi < 0 || a > v[hi] {
			hi = i
		}
	}
	return lo, hi
}

// unitInvariance recomputes r, slope and intercept with x and y converted
// to each also_in unit (one side at a time), and with x and y swapped. The
// first row is in the recorded units. A unit that cannot be converted gives
// a row with undefined numbers and a note saying why.
func unitInvariance(in Input, x, y []float64, r float64, line stats.LineFit) []report.UnitRow {
	rows := []report.UnitRow{{XUnit: in.X.Unit, YUnit: in.Y.Unit, R: report.Float(r),
		Slope: report.Float(line.Slope.Estimate), Intercept: report.Float(line.Intercept.Estimate)}}
	conv := func(v []float64, from, to string) ([]float64, error) {
		if from == "" {
			return nil, fmt.Errorf("no unit is declared for this column in [dataset.units], so it cannot be converted to %q", to)
		}
		scale, offset, err := units.Affine(from, to)
		if err != nil {
			return nil, err
		}
		out := make([]float64, len(v))
		for i, a := range v {
			out[i] = scale*a + offset
		}
		return out, nil
	}
	// Recomputed from the converted values (centred sums, as the line's
	// estimates are: slope = Sxy/Sxx, intercept = ȳ − slope·x̄), not
	// derived from the recorded-unit numbers, so the table shows the
	// invariance rather than assuming it.
	fit := func(xu, yu string, u, v []float64) report.UnitRow {
		m := stats.CentredMoments(u, v)
		slope := m.Sxy / m.Sxx
		return report.UnitRow{XUnit: xu, YUnit: yu, R: report.Float(stats.Pearson(u, v, 0.95).R),
			Slope: report.Float(slope), Intercept: report.Float(m.MeanY - slope*m.MeanX)}
	}
	for _, u := range in.AlsoIn.X {
		cx, err := conv(x, in.X.Unit, u)
		if err != nil {
			rows = append(rows, report.UnitRow{XUnit: u, YUnit: in.Y.Unit, R: report.NaN(), Slope: report.NaN(),
				Intercept: report.NaN(), Note: fmt.Sprintf("x not converted: %v", err)})
			continue
		}
		rows = append(rows, fit(u, in.Y.Unit, cx, y))
	}
	for _, u := range in.AlsoIn.Y {
		cy, err := conv(y, in.Y.Unit, u)
		if err != nil {
			rows = append(rows, report.UnitRow{XUnit: in.X.Unit, YUnit: u, R: report.NaN(), Slope: report.NaN(),
				Intercept: report.NaN(), Note: fmt.Sprintf("y not converted: %v", err)})
			continue
		}
		rows = append(rows, fit(in.X.Unit, u, x, cy))
	}
	sw := fit(in.Y.Unit, in.X.Unit, y, x)
	sw.Swapped = true
	return append(rows, sw)
}

// predictions evaluates the line's mean response and prediction interval
// at each requested x; InRange says whether x lies in the observed range.
func predictions(line stats.LineFit, at []float64, dx report.Describe, conf float64) []report.Prediction {
	var out []report.Prediction
	for _, x0 := range at {
		fit, cl, ch, pl, ph := line.Interval(x0, conf)
		out = append(out, report.Prediction{X: report.Float(x0), Fit: report.Float(fit), ConfLow: report.Float(cl),
			ConfHigh: report.Float(ch), PredLow: report.Float(pl), PredHigh: report.Float(ph),
			InRange: x0 >= float64(dx.Min) && x0 <= float64(dx.Max)})
	}
	return out
}

// plotData gathers what the charts draw.
func plotData(x, y []float64, cc cases, line stats.LineFit, inf *report.Influence, lx, ly []float64, conf float64, cfg Config) *report.Plot {
	p := &report.Plot{X: x, Y: y, Rows: cc.rows, Groups: cc.groups, Order: cc.order,
		Fitted: line.Fitted, Residuals: line.Residuals}
	lo, hi := slices.Min(x), slices.Max(x)
	k := cfg.BandPoints
	p.Band = make([]report.BandPoint, k)
	for i := range k {
		x0 := lo + (hi-lo)*float64(i)/float64(k-1)
		if i == k-1 {
			x0 = hi
		}
		f, cl, ch, pl, ph := line.Interval(x0, conf)
		p.Band[i] = report.BandPoint{X: x0, Fit: f, ConfLow: cl, ConfHigh: ch, PredLow: pl, PredHigh: ph}
	}
	p.Lowess = lowessCurve(lx, ly, cfg)
	for _, pt := range inf.Points {
		p.Flagged = append(p.Flagged, pt.Index)
	}
	slices.Sort(p.Flagged)
	return p
}

// lowessCurve is the LOWESS fit as a curve sorted by x (stats.LowessCurve:
// the points at which local fits were made, at most stats.LowessCurveMax),
// on the rows given (all rows, or the sample that sample drew).
func lowessCurve(x, y []float64, cfg Config) []report.XY {
	xs, ys := stats.LowessCurve(x, y, cfg.LowessFrac, cfg.LowessIter, lowessDelta(x))
	curve := make([]report.XY, len(xs))
	for i := range xs {
		curve[i] = report.XY{X: xs[i], Y: ys[i]}
	}
	return curve
}

// quadraticCurve is the quadratic model on a grid over the observed x.
func quadraticCurve(s *report.Study, k int) []report.XY {
	var q *report.Fit
	for i := range s.Models {
		if s.Models[i].Name == "quadratic" {
			q = &s.Models[i]
		}
	}
	if q == nil || len(q.Coefficients) != 3 || s.Describe == nil {
		return nil
	}
	b0, b1, b2 := float64(q.Coefficients[0].Estimate), float64(q.Coefficients[1].Estimate), float64(q.Coefficients[2].Estimate)
	lo, hi := float64(s.Describe.X.Min), float64(s.Describe.X.Max)
	out := make([]report.XY, k)
	for i := range k {
		x0 := lo + (hi-lo)*float64(i)/float64(k-1)
		if i == k-1 {
			x0 = hi
		}
		out[i] = report.XY{X: x0, Y: b0 + x0*(b1+b2*x0)}
	}
	return out
}
