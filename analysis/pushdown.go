package analysis

// This file holds the study of a database dataset that gives more rows
// than its max_rows: the database computes the figures over every row
// (dataset.Prepared: counts, means, centred sums, residual sums, flags,
// per-group sums, density grids), this file solves the fits from those
// sums, and the figures that need the rows themselves (ranks, LOWESS,
// Theil–Sen, distance correlation, quartiles) come from a sample of
// PushdownSample rows the database draws by a hash of each row. The study
// says which figures are which (report.Pushdown, report.Approximation) and
// leaves out, with the reason, what it cannot compute.

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"time"

	"bivar/analysis/dataset"
	"bivar/analysis/findings"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/analysis/units"
)

// PushdownSample is the number of rows the database draws for the figures
// computed on a sample: 20 000, the size at which the in-memory path
// already fits LOWESS and reads the Durbin–Watson statistic in order of x
// above 20 000 rows (Config.LowessMaxN), so that the errors stated for
// those figures hold here too.
const PushdownSample = 20000

// pushdownSuspectMax is the most rows flagged outlier, influential or
// sole support that a study fetches, to refit without them and to list in
// its file of flagged rows (the file's own cap, so that it lists what a
// study in memory lists); with more, the r and line without them come
// from a scan that sums the rows kept (dataset.Prepared.WithoutFlagged).
// A variable only so that a test can lower it.
var pushdownSuspectMax = FlaggedFileMax

// pushed is a database dataset left in the database.
type pushed struct {
	q     dataset.Query
	limit int
	cols  []string // the columns whose NULL cells the dataset reports
	// print is the dataset's hash (dataset.FingerprintMethod), computed by
	// the first pass of its first study that reaches it, or by a scan of
	// its own (ensure); ranAt is when its statement started.
	print *dataset.Print
	ranAt time.Time
}

// ensure computes the dataset's hash by a scan of its own, unless a
// study has computed it already.
func (pu *pushed) ensure() error {
	if pu.print != nil {
		return nil
	}
	sess, err := dataset.Open(context.Background(), pu.q)
	if err != nil {
		return err
	}
	defer sess.Close()
	ranAt := time.Now().UTC()
	pr, err := sess.Fingerprint(pu.cols)
	if err != nil {
		return err
	}
	pu.print, pu.ranAt = pr, ranAt
	return nil
}

// loadPushed describes a database dataset whose rows stay in the
// database: its columns now (the studies that need a column it lacks
// fail as with a file); its row count, an order-free hash of its rows
// (dataset.FingerprintMethod) and the NULL cells of each column the
// studies use, all counted by the server, once the studies have run
// (finishPushed): the first pass of its first study computes them in
// the same scan.
func loadPushed(ds manifest.Dataset, q dataset.Query, limit int, numeric, text []string) (*loadedSet, error) {
	sess, err := dataset.Open(context.Background(), q)
	if err != nil {
		return nil, err
	}
	defer sess.Close()
	timeout := q.Timeout
	if timeout <= 0 {
		timeout = dataset.DefaultStatementTimeout
	}
	cols := append(slices.Clone(numeric), text...)
	if err := q.Twice(sess.Names, cols); err != nil {
		return nil, err
	}
	if err := sess.CheckTypes(numeric, text); err != nil {
		return nil, err
	}
	ls := &loadedSet{decl: ds, absent: map[string]bool{}, columns: sess.Names, push: &pushed{q: q, limit: limit, cols: cols}}
	ls.info = report.Dataset{ID: ds.ID, Missing: []report.ColumnCount{}, NonNumeric: []report.ColumnCount{},
		Source: &report.Source{Kind: report.SourcePostgreSQL, ServerVersion: sess.ServerVersion,
			Connection: ds.Connection, StatementTimeout: timeout.String(), Order: dataset.FingerprintMethod}}
	for _, c := range cols {
		if !slices.Contains(sess.Names, c) {
			ls.absent[c] = true
		}
	}
	return ls, nil
}

// finishPushed completes the description of a dataset left in the
// database, after its studies have run: its hash, row count and NULL
// cells (by a scan of its own when no study computed them).
func finishPushed(m *manifest.Manifest, ls *loadedSet) error {
	pu := ls.push
	if err := pu.ensure(); err != nil {
		at := fmt.Sprintf("line %d", ls.decl.Line)
		if m.Path != "" {
			at = fmt.Sprintf("%s:%d", m.Path, ls.decl.Line)
		}
		return fmt.Errorf("dataset %q (%s): %w", ls.decl.ID, at, err)
	}
	sum := sha256.Sum256([]byte(pu.print.Text))
	ls.info.SHA256, ls.info.Rows = hex.EncodeToString(sum[:]), pu.print.Rows
	ls.info.Source.Query, ls.info.Source.RanAt = pu.print.Statement, pu.ranAt.Format(time.RFC3339)
	ls.info.Missing = []report.ColumnCount{}
	for i, c := range pu.cols {
		if pu.print.Missing[i] < 0 {
			continue
		}
		if !slices.ContainsFunc(ls.info.Missing, func(cc report.ColumnCount) bool { return cc.Column == c }) {
			ls.info.Missing = append(ls.info.Missing, report.ColumnCount{Column: c, Count: pu.print.Missing[i]})
		}
	}
	return nil
}

// absentAny reports whether a study needs a column the dataset lacks (the
// study then fails as in memory, through input).
func absentAny(st manifest.Study, ls *loadedSet) bool {
	cols := append([]string{st.X, st.Y, st.Group, st.Order, ls.decl.IDColumn}, st.Covariates...)
	for _, c := range cols {
		if c != "" && ls.absent[c] {
			return true
		}
	}
	return false
}

// pushedStudy runs one study of a dataset left in the database.
func pushedStudy(m *manifest.Manifest, st manifest.Study, ls *loadedSet, cfg Config) report.Study {
	s := report.Study{ID: st.ID, Title: st.Title, Dataset: st.Dataset, Notes: st.Notes,
		X: variable(ls.decl, st.X), Y: variable(ls.decl, st.Y), Group: st.Group, Order: st.Order,
		GroupLabel: labelOf(st.Group, ls.decl.Labels[st.Group]), OrderLabel: labelOf(st.Order, ls.decl.Labels[st.Order]),
		Covariates: slices.Clone(st.Covariates)}
	fail := func(msg string) report.Study { return failed(s, studyAt(m, st, msg)) }
	// The messages below give the dataset's row count: a scan of its own
	// when no study has counted the rows yet.
	if len(ls.decl.Exclude) > 0 || len(st.Exclude) > 0 || ls.decl.SubsetExpr != nil || st.WhereExpr != nil {
		if err := ls.push.ensure(); err != nil {
			return fail(err.Error())
		}
		return fail(fmt.Sprintf("dataset %q gives %d rows, more than its max_rows = %d, so its rows stay in the database, where exclude, subset and where do not apply: put the filter in the dataset's query (or where = for a table), or raise max_rows", ls.decl.ID, ls.push.print.Rows, ls.push.limit))
	}
	// What the database path does not compute: it would otherwise give a
	// plain study of the recorded values under a study that asked for more.
	var asks []string
	if manifest.Scaled(st.XScale) || manifest.Scaled(st.YScale) {
		asks = append(asks, "x_scale or y_scale")
	}
	if st.Kind == manifest.KindAgreement {
		asks = append(asks, `kind = "agreement"`)
	}
	if st.GaugeSD != nil || len(st.XReplicates) > 0 || len(st.YReplicates) > 0 {
		asks = append(asks, "gauge_sd or replicate columns")
	}
	if len(asks) > 0 {
		if err := ls.push.ensure(); err != nil {
			return fail(err.Error())
		}
		return fail(fmt.Sprintf("dataset %q gives %d rows, more than its max_rows = %d, so its rows stay in the database, where %s cannot be computed: raise max_rows to fetch the rows, or narrow the dataset's query",
			ls.decl.ID, ls.push.print.Rows, ls.push.limit, strings.Join(asks, " and ")))
	}
	missing := ls.decl.Missing
	if missing == nil {
		missing = manifest.DefaultMissing()
	}
	spec := dataset.Spec{X: st.X, Y: st.Y, Covariates: st.Covariates, Group: st.Group, Order: st.Order, ID: ls.decl.IDColumn, Missing: missing}
	maxLevels := dataset.DefaultMaxLevels
	if ls.decl.MaxLevels != nil {
		maxLevels = *ls.decl.MaxLevels
	}
	ps, err := pushdown(ls.push, spec, ls.decl.NonNumeric == "missing", maxLevels, st.AlsoIn, st.PredictAt, s, cfg)
	if err != nil {
		// A message about the data (a column's type, its levels, a
		// number out of range) names the dataset, as when its rows are
		// fetched.
		var de *dataset.Error
		if errors.As(err, &de) {
			return fail(fmt.Sprintf("dataset %q: %v", ls.decl.ID, err))
		}
		return fail(err.Error())
	}
	return ps
}

// pushdown computes the study s on the rows of q that spec names.
func pushdown(pu *pushed, spec dataset.Spec, nonNumericMissing bool, maxLevels int, alsoIn manifest.AlsoIn, predictAt []float64, s report.Study, cfg Config) (report.Study, error) {
	sess, err := dataset.Open(context.Background(), pu.q)
	if err != nil {
		return s, err
	}
	defer sess.Close()
	// For the sessions that run beside this one (the sample, the parts of
	// the third pass, the Durbin–Watson grouping), below.
	if err := sess.Share(); err != nil {
		return s, err
	}
	p, err := sess.Prepare(spec)
	if err != nil {
		return s, err
	}
	info := &report.Pushdown{Limit: pu.limit, Method: dataset.SampleMethod}
	omit := func(fig, why string) { info.Omitted = append(info.Omitted, report.Omission{Figure: fig, Why: why}) }
	exact := func(figs ...string) { info.Exact = append(info.Exact, figs...) }
	defer func() { info.Statements = sess.Statements }()

	// A second session, sharing this one's snapshot, runs beside this
	// one: the dataset's hash while this one runs the first pass, the
	// sample (it needs only the row count) while this one runs the
	// second, then, in a study without a run order, the upper part of the
	// third pass (dataset.Prepared.Part) beside this one's lower part.
	// Where the server cannot share its snapshot, this session runs all
	// of it, one statement after the other (the hash in its first pass),
	// with the same results.
	var aux *beside
	if secondSession {
		aux = forkBeside(sess)
	}
	if aux != nil {
		defer func() {
			aux.stop()
			sess.Statements = append(sess.Statements, aux.s.Statements...)
		}()
	}

	// Pass 1: counts, ranges, the levels' means and centred sums; and the
	// dataset's hash when no study has computed it yet.
	var print []string
	var fp struct {
		pr  *dataset.Print
		err error
	}
	if pu.print == nil {
		if aux != nil {
			aux.run(func(a *dataset.Session) { fp.pr, fp.err = a.Fingerprint(pu.cols) })
		} else {
			print = pu.cols
		}
	}
	ranAt := time.Now().UTC()
	c, gs, err := p.First(maxLevels, print)
	if err != nil {
		return s, err // the deferred stop cancels the hash's scan
	}
	aux.wait()
	if fp.err != nil {
		return s, fp.err
	}
	if fp.pr != nil {
		pu.print, pu.ranAt = fp.pr, ranAt
	}
	if c.Print != nil {
		pu.print, pu.ranAt = c.Print, ranAt
	}
	info.Rows = c.Rows
	ix := map[string]int{} // numeric column → index in p.NumCols
	for i, name := range p.Names {
		if _, ok := ix[name]; !ok {
			ix[name] = i
		}
	}
	for i, name := range p.Names {
		if c.NonNumeric[i] > 0 && !nonNumericMissing {
			what := fmt.Sprintf("%d values that are not finite numbers", c.NonNumeric[i])
			if c.NonNumeric[i] == 1 {
				what = "1 value that is not a finite number"
			}
			return s, &dataset.Error{File: "PostgreSQL (" + pu.q.Env + ")", Column: name,
				Msg: fmt.Sprintf("it holds %s (NaN or infinite): filter such rows in the query, or set non_numeric = \"missing\" to count them as missing", what)}
		}
	}
	s.N = c.Complete
	s.NMissing = c.Rows - c.Complete
	// Excluded: x, y, group, order, covariates, each column once.
	seen := map[string]bool{}
	addEx := func(col string, miss, nonNum int) {
		if seen[col] {
			return
		}
		seen[col] = true
		if miss > 0 {
			s.Excluded = append(s.Excluded, report.Exclusion{Column: col, Rows: miss, Reason: "missing"})
		}
		if nonNum > 0 {
			s.Excluded = append(s.Excluded, report.Exclusion{Column: col, Rows: nonNum, Reason: "non-numeric"})
		}
	}
	num := func(col string) { i := ix[col]; addEx(col, c.Missing[i], c.NonNumeric[i]) }
	num(spec.X)
	num(spec.Y)
	if spec.Group != "" {
		addEx(spec.Group, c.GroupMissing, 0)
	}
	if spec.Order != "" {
		num(spec.Order)
	}
	for _, cv := range spec.Covariates {
		num(cv)
	}
	exact("n", "rows left out as missing")
	if s.N < 3 {
		return failed(s, fmt.Sprintf("only %s of %s (of %d rows); at least 3 are needed: check the columns for missing cells",
			count(s.N, "complete row"), columnList(spec.X, spec.Y, spec.Group, spec.Order, spec.Covariates), c.Rows)), nil
	}
	if c.Min[0] == c.Max[0] {
		return failed(s, fmt.Sprintf("x column %q is constant (every one of the %d complete rows is %g): a relationship needs x to vary", spec.X, s.N, c.Min[0])), nil
	}
	if c.Min[1] == c.Max[1] {
		return failed(s, fmt.Sprintf("y column %q is constant (every one of the %d complete rows is %g): a relationship needs y to vary", spec.Y, s.N, c.Min[1])), nil
	}
	conf := 1 - cfg.Alpha
	n := s.N
	nf := float64(n)

	var sample struct {
		rows []dataset.SampleRow
		err  error
	}
	if aux != nil {
		aux.run(func(a *dataset.Session) { sample.rows, sample.err = p.On(a).Sample(PushdownSample, n) })
	}

	// Pass 2: centred sums about the first pass's means, corrected by the
	// sums of the deviations, and sums of the first pass's line's
	// residuals e = d_y − b1·d_x.
	// x may take only two values, one of them in a single row, which then
	// has leverage 1 (sole support, flagged as in memory): the second pass
	// counts the rows at the two ends of x to tell. (A gate on the first
	// pass's Sxx = (n − 1)/n·(max − min)² missed such rows where x is far
	// from 0 and not whole: the regression aggregates' Sxx was then off by
	// far more than any tolerance, 99% at 10⁶ rows near 10⁹, found by an
	// independent review; the two counts cost the pass little.)
	b1 := c.Sxy / c.Sxx
	if math.IsNaN(b1) || math.IsInf(b1, 0) {
		b1 = 0 // Sxx rounded to 0: the second pass refines from a flat line
	}
	ends := [2]float64{c.Min[0], c.Max[0]}
	// The means the second pass's deviations are taken from, in two
	// parts (base + baseLo; baseLo nil for the first pass's means).
	base := c.Mean
	var baseLo []float64
	sums, err := p.Second(base, nil, b1, ends, gs)
	if err != nil {
		return s, err
	}
	if sums.Groups != nil {
		gs = sums.Groups // the levels' sums by the corrected two-pass algorithm
	}
	// The second pass again, once, about the corrected means and the
	// refined slope, where the first pass's line was so far off that its
	// residuals e are mostly its own error: the RSS below is Σe² less that
	// error's share, and Breusch–Pagan's fourth powers of the residuals
	// come from e's by an expansion in the slope's error, so both cancel
	// the digits the error takes. The first pass's regression aggregates
	// lose those digits where x is far from 0 against its spread: with x
	// a bigint near 2⁵³ (9007199254740000 + 2i, 40 rows, y = 1000i plus
	// a cosine) its Sxx was 24% off and Breusch–Pagan came out 0.718
	// against 1.411; with x across 2⁵³, a 150th of its value or NaN, and
	// the RSS 1.1e-7 off (found by a sweep of small tables;
	// TestPushdownNear2To53). The test: the error's share,
	// Σe² − RSS = n·ē² + (b − b1)²·Sxx, above redoShare of the RSS. An
	// exact fit (Σe² at or below the exact-fit floor, below) is left alone.
	if step, again := rerunSecond(sums, nf, base[1]); again {
		// The means in two parts, as the third pass takes them: where the
		// mean is no float64 (x a bigint near 2⁵³ with an odd mean), one
		// part alone leaves every deviation its rounding, n times its
		// square in Σe².
		baseLo = make([]float64, len(base))
		for i := range base {
			if !math.IsNaN(sums.D[i]) {
				baseLo[i] = sums.D[i] / nf
			}
		}
		b1 += step
		if sums, err = p.Second(base, baseLo, b1, ends, gs); err != nil {
			return s, err
		}
		if sums.Groups != nil {
			gs = sums.Groups
		}
	}
	var sole *float64
	if sums.AtEnds[0]+sums.AtEnds[1] == n {
		switch {
		case sums.AtEnds[0] == 1:
			sole = &ends[0]
		case sums.AtEnds[1] == 1:
			sole = &ends[1]
		}
	}
	k := len(p.NumCols)
	// Each mean in two parts, the first pass's and the correction: the
	// line's deviations and intercept keep the digits that x̄ and ȳ far
	// from 0 would cost (as stats' meanParts does in memory).
	mean, lo := make([]float64, k), make([]float64, k)
	for i := range k {
		mean[i] = base[i]
		if baseLo != nil {
			lo[i] = baseLo[i]
		}
		if !math.IsNaN(sums.D[i]) {
			lo[i] += sums.D[i] / nf
		}
		mean[i] += lo[i]
	}
	cs := func(i, j int) float64 { return sums.P[i][j] - sums.D[i]*sums.D[j]/nf }
	mom := stats.Moments{N: n, MeanX: mean[0], MeanY: mean[1], Sxx: cs(0, 0), Syy: cs(1, 1), Sxy: cs(0, 1)}
	s.Moments = &report.Moments{N: n, MeanX: report.Float(mom.MeanX), MeanY: report.Float(mom.MeanY),
		Sxx: report.Float(mom.Sxx), Syy: report.Float(mom.Syy), Sxy: report.Float(mom.Sxy)}
	pc := stats.PearsonMoments(mom, conf)
	s.Pearson = &report.Pearson{R: report.Float(pc.R), R2: report.Float(pc.R2), CILow: report.Float(pc.CILow),
		CIHigh: report.Float(pc.CIHigh), T: report.Float(pc.T), DF: pc.DF, P: report.Float(pc.P), PAdjusted: report.Float(pc.P)}
	exact("means, SDs, minimum and maximum of x and y", "centred sums (moments)", "Pearson's r with its interval and p")

	// The slope refined once by the residuals' sum of products with x
	// (b1 + Σ(d_x − d̄_x)(e − ē)/Sxx: one step of iterative refinement, as
	// stats.Line refines its own), b0 = ȳ − b·x̄ with both means in two
	// parts, and the refined line's RSS from the same sums: the residuals
	// of the refined line are e − ē − (b − b1)·(d_x − d̄_x), so
	// RSS = Σ(e − ē)² − (Σ(d_x − d̄_x)(e − ē))²/Sxx exactly, and both
	// terms subtracted are of second order in b − b1 and ē.
	sue := sums.SXE - sums.D[0]*sums.SE/nf
	b := b1 + sue/mom.Sxx
	rss := math.Max(0, (sums.SE2-sums.SE*sums.SE/nf)-sue*sue/mom.Sxx)
	a := (base[1] - b*base[0]) + (lo[1] - b*lo[0])
	lf := lineFromSums(mom, rss, conf)
	for _, cf := range []struct {
		c *report.Coef
		v float64
	}{{lf.Slope, b}, {lf.Intercept, a}} {
		h := (cf.c.CIHigh - cf.c.CILow) / 2
		cf.c.Estimate, cf.c.T = report.Float(cf.v), report.Float(cf.v/float64(cf.c.SE))
		cf.c.CILow, cf.c.CIHigh = report.Float(cf.v)-h, report.Float(cf.v)+h
	}
	lf.Coefficients = []report.Coef{*lf.Intercept, *lf.Slope}
	s.Line = &lf
	exact("straight line: coefficients, SEs, intervals, residual SD, R², F, AIC", "predictions")

	// The quadratic from the second pass's sums in t = (x − m₁)/QS, QS
	// the SD of x (a well-scaled basis); its residual sum is the third
	// pass's.
	rules := findings.FlagRulesFor(n, cfg.Thresholds)
	// An exact fit leaves only rounding in the residuals: as in memory
	// (stats.NewLineInfluence), an RSS at or below (16ε)²·Σy² leaves the
	// residual SD undefined for the row-wise measures, so that no rounding
	// noise is studentized into a Cook's distance.
	sres := math.NaN()
	if sumY2 := mom.Syy + nf*mom.MeanY*mom.MeanY; n > 2 && !stats.ExactFit(rss, sumY2) {
		sres = math.Sqrt(rss / (nf - 2))
	}
	fit := dataset.Fit{N: n, MX: base[0], MY: base[1], MXLo: lo[0], MYLo: lo[1], B: b,
		Sxx: mom.Sxx, Syy: mom.Syy, Sxy: mom.Sxy, RSS: rss, S: sres, Outlier: rules.Outlier, Cooks: rules.Cooks, Leverage: rules.Leverage, Sole: sole}
	var quad *quadSolve
	if n >= 4 {
		qm, qmy := base[0], base[1] // the raw coefficients' centre, in one part
		if baseLo != nil {
			qm, qmy = qm+baseLo[0], qmy+baseLo[1]
		}
		if quad = solveQuadratic(nf, qm, qmy, b1, sums); quad != nil {
			fit.Quad, fit.QX, fit.QY, fit.Q0, fit.Q1, fit.Q2, fit.QS = true, base[0], base[1], quad.c[0], quad.c[1], quad.c[2], quad.qs
			if baseLo != nil {
				fit.QXLo, fit.QYLo = baseLo[0], baseLo[1]
			}
		}
	}

	// With a run order, the Durbin–Watson grouping (it needs only the
	// refined line) runs alongside the third pass on one more session that
	// shares this one's snapshot (dataset.Session.Fork), or after it on
	// this one when the server cannot share its snapshot.
	var dw struct {
		num  float64
		err  error
		side *beside // nil: on this session, after the third pass
	}
	if spec.Order != "" && aux != nil { // aux nil: one session for all
		dw.side = forkBeside(sess)
	}
	if dw.side != nil {
		defer dw.side.stop()
		dw.side.run(func(o *dataset.Session) { dw.num, dw.err = p.On(o).DurbinWatsonNumerator(fit) })
	}

	// The sample, drawn beside the second pass (or now, on this session).
	aux.wait()
	if aux == nil {
		sample.rows, sample.err = p.Sample(PushdownSample, n)
	}
	if sample.err != nil {
		return s, sample.err
	}
	// Without a run order the second session would idle through the
	// third pass: the pass runs in two parts, one on each. With one, the
	// run-order grouping already keeps a second server process busy beside
	// the third pass, and on 2 cores a split only added a scan: the
	// benchmark study of scripts/pushdown-bench.sh took a median 18.0 s and
	// 28.7 s of the server's CPU with it, 15.4 s and 22.3 s without (three
	// runs each, PostgreSQL 15, 10⁷ rows). The fetch of the extremes
	// runs whole: each part would scan every row for a test that passes
	// few, and the two parts took as long as the whole (0.98 and 1.33 s
	// against 1.2 s in the same benchmark; 0.74 and 0.83 s against 0.86 s
	// for a study of x and y alone).
	var parts []*dataset.Prepared
	if spec.Order == "" {
		parts = splitAtMedian(p, sess, aux.session(), sample.rows)
	}

	// Pass 3: flags, extremes, Breusch–Pagan, trend, the quadratic's
	// residuals and the density grids, with the refined line.
	grids := pushdownGrids(c, mom, sums, spec, len(p.NumCols))
	th, err := p.ThirdPass(fit, grids, max(cfg.namedMax(), pushdownSuspectMax), parts...)
	if err != nil {
		return s, err
	}
	s.Models = []report.Fit{}
	d := &report.Diagnostics{QuadraticP: report.NaN(), DurbinWatson: report.NaN(), DurbinWatsonX: report.NaN(), SpreadRho: report.NaN()}
	if quad != nil && n > 3 {
		qf := quad.fit(th.SQ2, mom.Syy, conf)
		s.Models = append(s.Models, qf)
		d.QuadraticP = qf.Coefficients[2].P
		exact("quadratic: coefficients, SEs, intervals, R², F, AIC, vertex; the curvature test")
	}
	omit("log-x, log-y and log-log models", "not fitted when the rows stay in the database (the straight line and the quadratic are)")
	// Breusch–Pagan (Koenker): n·r² of x with r², r the refined line's
	// residuals, from the second pass's sums of its line's residuals e:
	// with w = e − ē, u = d_x − d̄_x and δ = b − b1, r = w − δ·u exactly,
	// so Σr² = Σw² − 2δΣuw + δ²Σu², Σu·r² = Σu·w² − 2δΣu²w + δ²Σu³ and
	// Σr⁴ = Σw⁴ − 4δΣu·w³ + 6δ²Σu²w² − 4δ³Σu³w + δ⁴Σu⁴ (our algebra), each
	// centred sum from the pass's raw ones. δ is the first pass's error in
	// the slope: where x̄ is far from 0 it moved BP by parts in 10⁸ (x near
	// 10⁹ with a spread of 1, TestPushdownAdversarial), and with x =
	// 10¹² + 0.01·i, where the first pass's slope is off by 5·10⁻⁴, Σr⁴
	// without its terms in δ² and above put BP 9.4·10⁻⁶ off the exact
	// value (found by a sweep of small tables; TestPushdownFarBreuschPagan).
	ebar := sums.SE / nf
	ubar := sums.D[0] / nf
	delta := b - b1
	sw2 := sums.SE2 - sums.SE*ebar
	suw2 := (sums.SXE2 - 2*ebar*sums.SXE + ebar*ebar*sums.D[0]) - ubar*sw2
	sw4 := sums.SE4 - 4*ebar*sums.SE3 + 6*ebar*ebar*sums.SE2 - 4*ebar*ebar*ebar*sums.SE + nf*ebar*ebar*ebar*ebar
	suuw := sums.SX2E - ebar*sums.P[0][0] - 2*ubar*(sums.SXE-ebar*sums.D[0])
	suuu := sums.X3 - 3*ubar*sums.P[0][0] + 3*ubar*ubar*sums.D[0] - nf*ubar*ubar*ubar
	sw3 := sums.SE3 - 3*ebar*sums.SE2 + 3*ebar*ebar*sums.SE - nf*ebar*ebar*ebar
	suw3 := (sums.SXE3 - 3*ebar*sums.SXE2 + 3*ebar*ebar*sums.SXE - ebar*ebar*ebar*sums.D[0]) - ubar*sw3
	sr2 := sw2 - 2*delta*sue + delta*delta*mom.Sxx
	sur2 := suw2 - 2*delta*suuw + delta*delta*suuu
	// Σu²w², Σu³w and Σu⁴ about the means, from the raw sums.
	suuww := (sums.SX2E2 - 2*ubar*sums.SXE2 + ubar*ubar*sums.SE2) - 2*ebar*(sums.SX2E-2*ubar*sums.SXE+ubar*ubar*sums.SE) +
		ebar*ebar*(sums.P[0][0]-2*ubar*sums.D[0]+nf*ubar*ubar)
	suuuw := (sums.SX3E - 3*ubar*sums.SX2E + 3*ubar*ubar*sums.SXE - ubar*ubar*ubar*sums.SE) - ebar*suuu
	suuuu := sums.X4 - 4*ubar*sums.X3 + 6*ubar*ubar*sums.P[0][0] - 4*ubar*ubar*ubar*sums.D[0] + nf*ubar*ubar*ubar*ubar
	sr4 := sw4 - 4*delta*suw3 + 6*delta*delta*suuww - 4*delta*delta*delta*suuuw + delta*delta*delta*delta*suuuu
	se4 := sr4 - sr2*sr2/nf
	suu := mom.Sxx
	if se4 > 0 && suu > 0 {
		r := sur2 / (math.Sqrt(suu) * math.Sqrt(se4)) // apart: the product under- or overflows for values beyond about 1e±50
		stat := nf * r * r
		d.BreuschPagan = &report.ChiTest{Stat: report.Float(stat), DF: 1, P: report.Float(stats.UpperChi2(stat, 1))}
	} else {
		d.BreuschPagan = &report.ChiTest{Stat: report.NaN(), DF: 1, P: report.NaN()}
	}
	exact("Breusch–Pagan test (Koenker's form)")
	if spec.Order != "" {
		if dw.side == nil { // no session beside this one: on this one
			dw.num, dw.err = p.DurbinWatsonNumerator(fit)
		} else {
			dw.side.wait()
			sess.Statements = append(sess.Statements, dw.side.s.Statements...)
		}
		if dw.err != nil {
			return s, dw.err
		}
		if rss > 0 {
			d.DurbinWatson = report.Float(dw.num / rss)
		}
		// The trend of the refined line's residuals on the order, exactly
		// from the second pass's sums: Σ(d_o − d̄_o)·e_refined =
		// Σ(d_o − d̄_o)(e − ē) − (b − b1)·Σ(d_o − d̄_o)(d_x − d̄_x), and
		// their sum of squares is the RSS.
		soo := sums.SOO - sums.SO*sums.SO/nf
		soe := (sums.SOE - sums.SO*sums.SE/nf) - (b-b1)*(sums.SOX-sums.SO*sums.D[0]/nf)
		see := rss
		oc := stats.PearsonMoments(stats.Moments{N: n, Sxx: soo, Syy: see, Sxy: soe}, 0.95)
		d.OrderTrend = &report.OrderTrend{Slope: report.Float(soe / soo), P: report.Float(oc.P), R: report.Float(oc.R)}
		exact("Durbin–Watson in run order (averaged over tied orders)", "residual trend in run order")
	} else {
		omit("Durbin–Watson in file order", "rows in the database have no file order; give the study an order column")
	}
	s.Diagnostics = d

	// Partial correlations from the centred sums.
	for i, cv := range spec.Covariates {
		z := 2 + i
		r, lo, hi, pp, unresolved := partialFromSums(n, cs(0, 0), cs(1, 1), cs(0, 1), cs(z, z), cs(0, z), cs(1, z), conf)
		s.Partial = append(s.Partial, report.Partial{Covariate: cv, Label: labelOf(cv, ""), N: n, R: report.Float(r),
			CILow: report.Float(lo), CIHigh: report.Float(hi), P: report.Float(pp)})
		if unresolved {
			omit("partial correlation with "+cv, fmt.Sprintf("%s carries all but less than %g of the spread of x or of y, and what is left is below what the database's sums resolve; raise max_rows to study the rows in memory", cv, partialFloor))
		}
	}
	if len(spec.Covariates) > 0 {
		exact("partial correlations")
	}

	// Groups, from the first pass.
	if spec.Group != "" {
		s.Groups, s.GroupLines = groupsFromSums(gs, conf)
		exact("per-group lines", "comparison of the group lines")
	}

	// The flagged rows, from the third pass: all of them, when there are
	// few enough to refit without them, else the named ones.
	sus := th.Suspects
	if th.Suspect > len(sus) {
		sus = sus[:min(len(sus), cfg.namedMax())]
	}
	// The rows at the leave-one-out extremes and of the largest Cook's
	// distance.
	fetched := &dataset.Fetched{Sample: sample.rows}
	if err := p.Extremes(fit, th, fetched); err != nil {
		return s, err
	}
	if err := pushedLackOfFit(p, fit, fetched.Sample, n, d, exact, omit); err != nil {
		return s, err
	}
	var sumKept bool
	s.Influence, s.Sensitivity, sumKept = influenceFromSums(mom, fit, pc, lf, rules, th, sus, fetched, cfg, conf)
	if sumKept {
		kept, err := p.WithoutFlagged(fit)
		if err != nil {
			return s, err
		}
		withoutFromKept(s.Sensitivity, kept, conf)
	}
	exact("influence: flag counts, named rows and their measures, the largest Cook's distance", "sensitivity: leave-one-out extremes, the line without each named row",
		"r and line without the flagged rows")
	// The file of the flagged rows: the first FlaggedFileMax by the
	// ranking (the third pass returns them in that order), each row's
	// measures from the line's sums, its flags the third pass's.
	if n := min(len(th.Suspects), FlaggedFileMax); n > 0 {
		rows := th.Suspects[:n]
		s.FlaggedCSV = flaggedCSV(n, func(k int) flaggedRow {
			r := rows[k]
			return flaggedRow{name: pushedRowName(r), x: r.X, y: r.Y, flags: findings.FlagSet(r.Flags), r: rowInfluence(mom, fit, r.X, r.Y)}
		})
		s.Influence.File, s.Influence.FileRows = FlaggedFile(s.ID), n
	}
	omit("robust intervals of the slope and r (HC3, HAC, effective n)", "not computed when the rows stay in the database")

	// The sample, for the figures that need the rows themselves.
	info.Sample = len(fetched.Sample)
	sn := make([][]float64, k)
	var sg, sid []string
	for _, r := range fetched.Sample {
		for i := range k {
			sn[i] = append(sn[i], r.Num[i])
		}
		sg = append(sg, r.Group)
		sid = append(sid, r.ID)
	}
	sin := Input{ID: s.ID, X: s.X, Y: s.Y, XS: sn[0], YS: sn[1], Rows: dataset.StringsOf(sid), GroupColumn: spec.Group, OrderColumn: spec.Order}
	if spec.Group != "" {
		sin.Groups = dataset.StringsOf(sg)
	}
	if spec.Order != "" {
		sin.Order = sn[ix[spec.Order]]
	}
	ss := analyze(sin, cfg)
	if ss.Error != nil {
		return s, fmt.Errorf("the sample of %d rows the database drew could not be studied: %s", info.Sample, *ss.Error)
	}
	dx := report.Describe{N: n, Mean: report.Float(mom.MeanX), SD: report.Float(math.Sqrt(mom.Sxx / (nf - 1))), Min: report.Float(c.Min[0]), Max: report.Float(c.Max[0]),
		Q1: ss.Describe.X.Q1, Median: ss.Describe.X.Median, Q3: ss.Describe.X.Q3}
	dy := report.Describe{N: n, Mean: report.Float(mom.MeanY), SD: report.Float(math.Sqrt(mom.Syy / (nf - 1))), Min: report.Float(c.Min[1]), Max: report.Float(c.Max[1]),
		Q1: ss.Describe.Y.Q1, Median: ss.Describe.Y.Median, Q3: ss.Describe.Y.Q3}
	s.Describe = &report.DescribePair{X: dx, Y: dy}
	compareFits(s.Line, s.Models, s.Describe.X, sumSquaresY(s.Moments))
	s.Spearman, s.Kendall = ss.Spearman, ss.Kendall
	d.DistanceCorr, d.Resistant, d.Lowess = ss.Diagnostics.DistanceCorr, ss.Diagnostics.Resistant, ss.Diagnostics.Lowess
	d.DurbinWatsonX, d.DurbinWatsonXRows, d.SpreadRho = ss.Diagnostics.DurbinWatsonX, ss.Diagnostics.DurbinWatsonXRows, ss.Diagnostics.SpreadRho
	if s.Sensitivity != nil && d.Resistant != nil {
		s.Sensitivity.ResistantSlope, s.Sensitivity.ResistantIntercept = d.Resistant.Slope, d.Resistant.Intercept
	}
	sampled := []string{"quartiles and medians of x and y", "Spearman's ρ", "Kendall's τ-b", "distance correlation and its p",
		"Theil–Sen line", "LOWESS curve", "Durbin–Watson and spread ρ in order of x"}
	if info.Sample < n {
		info.Sampled = sampled
		s.Approximations = pushdownApproximations(info.Sample, n, cfg)
	} else {
		// The sample is every complete case: these figures are those of
		// the rows in memory, with the approximations the in-memory path
		// states at this n.
		exact(sampled...)
		info.Sampled = []string{}
		s.Approximations = ss.Approximations
	}

	// Units and predictions from the exact line.
	s.UnitInvariance = unitsFromMoments(s.X, s.Y, alsoIn, mom, pc.R, lf)
	s.Predictions = predictFromSums(mom, rss, predictAt, s.Describe.X, conf)
	exact("unit table")

	// Plot: density grids from the database, the band of the exact line,
	// LOWESS from the sample, the named rows marked.
	s.Plot = pushdownPlot(th, mom, rss, c, gs, spec, s.Influence, ss.Plot, cfg, conf)
	exact("density grids of the charts")
	s.Pushdown = info
	emptyLists(&s)
	return s, nil
}

// beside is a session that shares a study's snapshot (dataset.Session.Fork)
// and runs statements beside the study's own, one job at a time, each on a
// goroutine of its own. A nil *beside stands for none: wait does nothing
// and session is nil.
type beside struct {
	s    *dataset.Session
	done chan struct{} // closed when the current job ends; nil before the first
}

// forkBeside is a beside on sess's snapshot, nil where the server cannot
// share it.
func forkBeside(sess *dataset.Session) *beside {
	f, err := sess.Fork()
	if err != nil {
		return nil
	}
	return &beside{s: f}
}

// run starts job on b's session once the job before it has ended.
func (b *beside) run(job func(s *dataset.Session)) {
	b.wait()
	done := make(chan struct{})
	b.done = done
	go func() {
		defer close(done)
		job(b.s)
	}()
}

// wait waits for the current job to end.
func (b *beside) wait() {
	if b != nil && b.done != nil {
		<-b.done
	}
}

// session is b's session, nil for none.
func (b *beside) session() *dataset.Session {
	if b == nil {
		return nil
	}
	return b.s
}

// stop cancels the statement b runs, if any (a study that stops early
// does not wait for one it no longer needs), waits for its job and ends
// the session.
func (b *beside) stop() {
	b.s.Cancel()
	b.wait()
	b.s.Close()
}

// secondSession lets a push-down study run statements on a second
// session beside its first (dataset.Session.Fork); a test turns it off to
// check that one session gives the same study.
var secondSession = true

// splitAtMedian is the two parts of p's rows (dataset.Prepared.Part) cut
// at the median x of the sample: the lower on the session sess, the upper
// on aux (on sess too when aux is nil, the server not sharing its
// snapshot). The sample is a random half-and-half guide only: any cut
// gives the same figures up to the order of a few additions, and an
// uneven one only costs time. None with an empty sample.
func splitAtMedian(p *dataset.Prepared, sess, aux *dataset.Session, sample []dataset.SampleRow) []*dataset.Prepared {
	if len(sample) == 0 {
		return nil
	}
	xs := make([]float64, len(sample))
	for i, r := range sample {
		xs[i] = r.Num[0]
	}
	slices.Sort(xs)
	cut := xs[len(xs)/2]
	if aux == nil {
		aux = sess
	}
	return []*dataset.Prepared{p.Part(sess, cut, false), p.Part(aux, cut, true)}
}

// quadSolve is the quadratic fitted from power sums in t = (x − m)/qs,
// v = y − my: v = c0 + c1·t + c2·t².
type quadSolve struct {
	c      [3]float64
	ainv   [3][3]float64 // (TᵀT)⁻¹
	m, my  float64
	qs     float64
	n      float64
	raw    [3]float64 // coefficients of 1, x, x²
	rawCov [3][3]float64
}

// redoShare is the share of the RSS above which the first pass's line's
// error in the second pass's residuals (Σe² − RSS) has the second pass
// run again about the refined line (rerunSecond). Below it, e differs
// from the refined line's residuals r by at most √redoShare of their
// norm, so the RSS formed from Σe² loses no digit, and the terms Σr⁴
// (Breusch–Pagan) is formed from differ from it by about
// n^¼·√redoShare of its size (our bound: Σ(e − r)⁴ ≤ (Σ(e − r)²)² and
// Σr⁴ ≥ RSS²/n). In the PostgreSQL tests it reruns the pass only for x
// near 2⁵³ and for x = 10¹² + 0.01·i (TestPushdownFarBreuschPagan).
const redoShare = 1e-6

// rerunSecond says whether the second pass's sums s (n rows, about the
// y mean my) leave the first pass's line's error in e above redoShare of
// the RSS (again), where Σe² is above the exact-fit floor (16ε)²·Σy²
// (stats.ExactFit, which stats.NewLineInfluence applies to the RSS): an
// RSS cancelled to 0 or below by that error reruns the pass too. step is
// the slope's refinement from the same sums, Σ(x − x̄)e/Sxx, for the
// rerun's line.
func rerunSecond(s *dataset.Sums, n, my float64) (step float64, again bool) {
	sxx := s.P[0][0] - s.D[0]*s.D[0]/n
	syy := s.P[1][1] - s.D[1]*s.D[1]/n
	ybar := my + s.D[1]/n
	if !(sxx > 0) || stats.ExactFit(s.SE2, syy+n*ybar*ybar) {
		return 0, false
	}
	sue := s.SXE - s.D[0]*s.SE/n
	rss := (s.SE2 - s.SE*s.SE/n) - sue*sue/sxx
	return sue / sxx, s.SE2-rss > redoShare*rss
}

// solveQuadratic solves the normal equations of the quadratic from the
// second pass's sums about the first pass's means m, my, for the first
// pass's line's residuals e = (y − my) − b1·(x − m): the quadratic of
// y − my is that of e plus b1·(x − m), and e's right-hand side is small
// (e is nearly orthogonal to 1 and x), so the solve adds little rounding
// to the line's part. In the scaled basis 1, t, t² (t = (x − m)/qs) the
// matrix has entries of order n, so Gauss–Jordan elimination with partial
// pivoting loses few digits; nil when it is singular (x takes fewer than
// three values).
func solveQuadratic(n, m, my, b1 float64, s *dataset.Sums) *quadSolve {
	qs := math.Sqrt(s.P[0][0] / n)
	if !(qs > 0) {
		return nil
	}
	st := []float64{n, s.D[0] / qs, s.P[0][0] / (qs * qs), s.X3 / (qs * qs * qs), s.X4 / (qs * qs * qs * qs)}
	a := [3][3]float64{{st[0], st[1], st[2]}, {st[1], st[2], st[3]}, {st[2], st[3], st[4]}}
	rhs := [3]float64{s.SE, s.SXE / qs, s.SX2E / (qs * qs)}
	inv, ok := invert3(a)
	if !ok {
		return nil
	}
	q := &quadSolve{ainv: inv, m: m, my: my, qs: qs, n: n}
	for i := range 3 {
		for j := range 3 {
			q.c[i] += inv[i][j] * rhs[j]
		}
	}
	q.c[1] += b1 * qs
	// Raw coefficients: y = my + c0 + c1(x − m)/qs + c2(x − m)²/qs².
	tm := [3][3]float64{
		{1, -m / qs, m * m / (qs * qs)},
		{0, 1 / qs, -2 * m / (qs * qs)},
		{0, 0, 1 / (qs * qs)},
	}
	for i := range 3 {
		for j := range 3 {
			q.raw[i] += tm[i][j] * q.c[j]
		}
	}
	q.raw[0] += my
	for i := range 3 {
		for j := range 3 {
			var v float64
			for a := range 3 {
				for b := range 3 {
					v += tm[i][a] * inv[a][b] * tm[j][b]
				}
			}
			q.rawCov[i][j] = v
		}
	}
	return q
}

// invert3 inverts a symmetric positive definite 3×3 matrix by Gauss–Jordan
// elimination with partial pivoting; ok is false when a pivot vanishes
// against the matrix's scale.
func invert3(a [3][3]float64) ([3][3]float64, bool) {
	var m [3][6]float64
	scale := 0.0
	for i := range 3 {
		for j := range 3 {
			m[i][j] = a[i][j]
			scale = max(scale, math.Abs(a[i][j]))
		}
		m[i][3+i] = 1
	}
	for col := range 3 {
		piv := col
		for r := col + 1; r < 3; r++ {
			if math.Abs(m[r][col]) > math.Abs(m[piv][col]) {
				piv = r
			}
		}
		if !(math.Abs(m[piv][col]) > 1e-13*scale) {
			return [3][3]float64{}, false
		}
		m[col], m[piv] = m[piv], m[col]
		pv := m[col][col]
		for j := range 6 {
			m[col][j] /= pv
		}
		for r := range 3 {
			if r == col {
				continue
			}
			f := m[r][col]
			for j := range 6 {
				m[r][j] -= f * m[col][j]
			}
		}
	}
	var out [3][3]float64
	for i := range 3 {
		for j := range 3 {
			out[i][j] = m[i][3+j]
		}
	}
	return out, true
}

// coefOf is one coefficient with its t-test and interval on df degrees of freedom.
func coefOf(name string, est, se float64, df int, conf float64) report.Coef {
	c := report.Coef{Name: name, Estimate: report.Float(est), SE: report.NaN(), T: report.NaN(), P: report.NaN(), CILow: report.NaN(), CIHigh: report.NaN()}
	if df <= 0 || math.IsNaN(se) {
		return c
	}
	t := est / se
	tq := stats.TQuantile(0.5+conf/2, float64(df))
	c.SE, c.T, c.P = report.Float(se), report.Float(t), report.Float(stats.TwoSidedT(t, float64(df)))
	c.CILow, c.CIHigh = report.Float(est-tq*se), report.Float(est+tq*se)
	return c
}

// fitStats fills a Fit's residual SE, R², adjusted R², F, its p and AIC
// (as stats.Regression defines them) from RSS, Σ(y − ȳ)² and the number
// of coefficients p+1.
func fitStats(f *report.Fit, n int, rss, tss float64, p int) {
	nf := float64(n)
	df := n - p - 1
	f.DFResid, f.RSS = df, report.Float(rss)
	f.ResidualSE, f.R2, f.AdjR2, f.F, f.FP = report.NaN(), report.NaN(), report.NaN(), report.NaN(), report.NaN()
	if df > 0 {
		f.ResidualSE = report.Float(math.Sqrt(rss / float64(df)))
	}
	if tss > 0 {
		r2 := 1 - rss/tss
		f.R2 = report.Float(r2)
		if df > 0 {
			f.AdjR2 = report.Float(1 - (1-r2)*(nf-1)/float64(df))
		}
	}
	if df > 0 { // an exact fit (RSS = 0) has F = +Inf, as stats.Regression gives
		fv := ((tss - rss) / float64(p)) / (rss / float64(df))
		f.F, f.FP = report.Float(fv), report.Float(stats.UpperF(fv, float64(p), float64(df)))
	}
	f.AIC = report.Float(nf*math.Log(rss/nf) + 2*float64(p+1))
	f.Vertex = report.NaN()
}

// lineFromSums is the straight line from the centred sums and its RSS
// summed by the database: b1 = Sxy/Sxx, b0 = ȳ − b1·x̄,
// SE(b1) = s/√Sxx, SE(b0) = s·√(1/n + x̄²/Sxx), s² = RSS/(n − 2).
func lineFromSums(m stats.Moments, rss, conf float64) report.Fit {
	nf := float64(m.N)
	b := m.Sxy / m.Sxx
	a := m.MeanY - b*m.MeanX
	df := m.N - 2
	s := math.NaN()
	if df > 0 {
		s = math.Sqrt(rss / float64(df))
	}
	f := report.Fit{Name: "line", Formula: "y = b0 + b1·x"}
	ic := coefOf("intercept", a, s*math.Sqrt(1/nf+m.MeanX*m.MeanX/m.Sxx), df, conf)
	sl := coefOf("x", b, s/math.Sqrt(m.Sxx), df, conf)
	f.Intercept, f.Slope = &ic, &sl
	f.Coefficients = []report.Coef{ic, sl}
	fitStats(&f, m.N, rss, m.Syy, 1)
	return f
}

// fit is the quadratic as a report.Fit, with its RSS from the database.
func (q *quadSolve) fit(rss, tss, conf float64) report.Fit {
	n := int(q.n)
	df := n - 3
	s2 := rss / float64(df)
	f := report.Fit{Name: "quadratic", Formula: "y = b0 + b1·x + b2·x²"}
	for i, name := range []string{"intercept", "x", "x^2"} {
		f.Coefficients = append(f.Coefficients, coefOf(name, q.raw[i], math.Sqrt(s2*q.rawCov[i][i]), df, conf))
	}
	// The t of x² is that of c2 in the scaled basis (the same hypothesis),
	// taken there to avoid the raw basis's rounding.
	t2 := q.c[2] / math.Sqrt(s2*q.ainv[2][2])
	f.Coefficients[2].T = report.Float(t2)
	f.Coefficients[2].P = report.Float(stats.TwoSidedT(t2, float64(df)))
	fitStats(&f, n, rss, tss, 2)
	if q.raw[2] != 0 {
		f.Vertex = report.Float(-q.raw[1] / (2 * q.raw[2]))
	}
	return f
}

// partialFloor is the least share of x's (and y's) centred sum of
// squares that z must leave for a pushed-down partial correlation. The
// residual sums are differences of centred sums, each rounded to about
// 10⁻¹⁶ of Sxx, so what is left below a share of 10⁻⁶ carries a relative
// error above 10⁻¹⁰: with z = 2x + 1 the rounding (about 10⁻¹⁶ of Sxx)
// passed a floor of 10⁻²⁴ and gave r = 0, "explained by z", where the
// rows in memory give no r; with z = x + 10⁻⁷·sin(i) the partial r came
// out 0.0184 against 0.0176 (exact rational arithmetic, and in memory;
// both found by a sweep of small tables). In memory each row's residual
// is formed before it is squared, and stats.PartialCorrelation's floor
// of 10⁻²⁴ stands.
const partialFloor = 1e-6

// partialFromSums is stats.PartialCorrelation from centred sums: the
// residual sums of x and y on z are Sxx − Sxz²/Szz, Syy − Syz²/Szz and
// Sxy − Sxz·Syz/Szz, with the same inference (t on n − 3 df, Fisher z
// with variance 1/(n − 4)). Where z leaves less than partialFloor of x's
// or y's sum of squares, everything is NaN and unresolved is set.
func partialFromSums(n int, sxx, syy, sxy, szz, sxz, syz, conf float64) (r, lo, hi, p float64, unresolved bool) {
	nan := math.NaN()
	r, lo, hi, p = nan, nan, nan, nan
	if n < 3 || !(szz > 0) {
		return
	}
	ex := sxx - sxz*sxz/szz
	ey := syy - syz*syz/szz
	exy := sxy - sxz*syz/szz
	if !(ex > partialFloor*sxx) || !(ey > partialFloor*syy) {
		unresolved = sxx > 0 && syy > 0
		return
	}
	r = math.Max(-1, math.Min(1, exy/(math.Sqrt(ex)*math.Sqrt(ey))))
	if n >= 4 {
		df := float64(n - 3)
		if math.Abs(r) == 1 {
			p = 0
		} else {
			p = stats.TwoSidedT(r*math.Sqrt(df/((1-r)*(1+r))), df)
		}
	}
	if n >= 5 && conf > 0 && conf < 1 {
		if math.Abs(r) == 1 {
			lo, hi = r, r
		} else {
			half := stats.NormalQuantile(0.5+conf/2) / math.Sqrt(float64(n-4))
			z := math.Atanh(r)
			lo, hi = math.Tanh(z-half), math.Tanh(z+half)
		}
	}
	return
}

// groupsFromSums is groupFits and groupLines from each level's centred
// sums (stats.GroupLinesFromMoments, as stats.CompareGroupLines).
func groupsFromSums(gs []dataset.GroupSums, conf float64) ([]report.GroupFit, *report.GroupLines) {
	out := make([]report.GroupFit, 0, len(gs))
	ms := make([]stats.Moments, len(gs)) // the levels' means as offsets from the dataset's (GroupSums.OX, OY)
	for i, g := range gs {
		f := report.GroupFit{Group: g.Level, N: g.N, R: report.NaN(), Slope: report.NaN(), Intercept: report.NaN(), SlopeLow: report.NaN(), SlopeHigh: report.NaN()}
		if g.N >= 3 && g.Sxx > 0 {
			b := g.Sxy / g.Sxx
			f.Slope, f.Intercept = report.Float(b), report.Float(g.MY-b*g.MX)
			rss := g.RSS // from the level's residuals (dataset.GroupSums.RSS)
			if math.IsNaN(rss) {
				rss = math.Max(0, g.Syy-g.Sxy*g.Sxy/g.Sxx)
			}
			se := math.Sqrt(rss / float64(g.N-2) / g.Sxx)
			tq := stats.TQuantile(0.5+conf/2, float64(g.N-2))
			f.SlopeLow, f.SlopeHigh = report.Float(b-tq*se), report.Float(b+tq*se)
			f.R = report.Float(stats.PearsonMoments(stats.Moments{N: g.N, Sxx: g.Sxx, Syy: g.Syy, Sxy: g.Sxy}, conf).R)
		}
		ms[i] = stats.Moments{N: g.N, MeanX: g.OX, MeanY: g.OY, Sxx: g.Sxx, Syy: g.Syy, Sxy: g.Sxy}
		out = append(out, f)
	}
	return out, reportGroupLines(stats.GroupLinesFromMoments(ms))
}

// pushedLackOfFit runs the lack-of-fit test of the rows left in the
// database where x takes few values. In memory the test is reported where
// x takes at most half as many values as there are rows (diagnostics);
// grouping 10⁷ rows by a continuous x would cost the server a hash table
// of 10⁷ entries for a test that is then not reported, so the sample
// decides first: the test runs, exactly over every row and with the
// in-memory rule, unless x takes more than half as many values in the
// sample as the sample has rows (when the sample is every row, that is
// the in-memory rule itself) and nine in ten of the sample's rows hold a
// value no other of them holds (x continuous, or on some 190 000 or more
// equally frequent values: e^(−20 000/m) ≥ 0.9); then it is left out with
// the sample's counts as the reason. The second condition came from an
// independent review: with the first alone, x on 25 000 values of 60 000
// rows was taken as continuous.
func pushedLackOfFit(p *dataset.Prepared, fit dataset.Fit, sample []dataset.SampleRow, n int, d *report.Diagnostics, exact func(...string), omit func(fig, why string)) error {
	xs := make([]float64, len(sample))
	for i, r := range sample {
		xs[i] = r.Num[0]
	}
	slices.Sort(xs)
	levels, singles := 0, 0 // values in the sample, and those one row holds
	for i := 0; i < len(xs); {
		j := i + 1
		for j < len(xs) && xs[j] == xs[i] {
			j++
		}
		levels++
		if j == i+1 {
			singles++
		}
		i = j
	}
	if 2*levels > len(sample) && 10*singles >= 9*len(sample) {
		omit("lack-of-fit test", fmt.Sprintf("in the sample of %d rows x takes %d values, %d of them held by one row: taken as continuous, where the test is not reported (in memory it is reported where x takes at most half as many values as there are rows)", len(sample), levels, singles))
		return nil
	}
	m, pe, lof, err := p.LackOfFit(fit)
	if err != nil {
		return err
	}
	exact("lack-of-fit test")
	df1, df2 := m-2, n-m
	switch {
	case df1 <= 0 || df2 <= 0 || 2*m > n:
	case pe > 0:
		f := (lof / float64(df1)) / (pe / float64(df2))
		d.LackOfFit = &report.LackOfFit{F: report.Float(f), DF1: df1, DF2: df2, P: report.Float(stats.UpperF(f, float64(df1), float64(df2)))}
	default: // every repeat alike, as stats.LackOfFit
		d.LackOfFit = &report.LackOfFit{F: report.NaN(), DF1: df1, DF2: df2, P: report.NaN(), NoPureError: true}
	}
	return nil
}

// pushedRowName names a row fetched from the database: its id_column value
// as stored (as the study of the rows fetched names it), else its values,
// since rows left in the database have no row number.
func pushedRowName(r dataset.Row) string {
	if r.ID != "" {
		return r.ID
	}
	return fmt.Sprintf("(x = %g, y = %g)", r.X, r.Y)
}

// rowInfluence is stats.LineInfluence.At for one row given the line's
// sums m and f (its RSS, the x of the row of sole support, and the means
// in two parts, so that the row's deviations keep the digits that x̄ and ȳ
// far from 0 would cost, as in memory).
func rowInfluence(m stats.Moments, f dataset.Fit, x, y float64) stats.InfluenceRow {
	rss := f.RSS
	if f.Sole != nil && x == *f.Sole {
		nan := math.NaN()
		return stats.InfluenceRow{Leverage: 1, Residual: 0, Studentized: nan, StudentizedExt: nan, CooksD: nan, DFFITS: nan,
			LooR: nan, LooSlope: nan, LooIntercept: nan, SoleSupport: true}
	}
	nf := float64(m.N)
	b1 := m.Sxy / m.Sxx
	dx, dy := (x-f.MX)-f.MXLo, (y-f.MY)-f.MYLo
	e := dy - b1*dx
	q := dx * dx / m.Sxx
	h := math.Min(1, 1/nf+q)
	omh := math.Max(0, (nf-1)/nf-q)
	s := f.S // NaN for an exact fit, as in memory
	r := stats.InfluenceRow{Leverage: h, Residual: e}
	ri := e / (s * math.Sqrt(omh))
	r.Studentized = ri
	r.CooksD = ri * ri * h / (2 * omh)
	r.StudentizedExt = math.NaN()
	if m.N > 3 {
		s2 := (rss - e*e/omh) / (nf - 3)
		r.StudentizedExt = e / (math.Sqrt(math.Max(s2, 0)) * math.Sqrt(omh))
	}
	r.DFFITS = r.StudentizedExt * math.Sqrt(h/omh)
	c := nf / (nf - 1)
	bi := b1 - dx*e/(m.Sxx*omh)
	r.LooSlope = bi
	r.LooIntercept = (m.MeanY - dy/(nf-1)) - bi*(m.MeanX-dx/(nf-1))
	sxx, syy, sxy := c*m.Sxx*omh, m.Syy-c*dy*dy, m.Sxy-c*dx*dy
	r.LooR = math.NaN()
	if m.N > 2 && sxx > 0 && syy > 0 {
		r.LooR = math.Max(-1, math.Min(1, sxy/math.Sqrt(sxx*syy)))
	}
	return r
}

// influenceFromSums fills the influence summary and the sensitivity
// figures from the database's counts and the rows it returned.
func influenceFromSums(m stats.Moments, f dataset.Fit, all stats.Correlation, line report.Fit, rules findings.FlagRules, fc *dataset.Third,
	sus []dataset.Row, ext *dataset.Fetched, cfg Config, conf float64) (in *report.Influence, se *report.Sensitivity, sumKept bool) {
	namedMax := cfg.namedMax()
	in = &report.Influence{MaxCooksD: report.NaN(), NamedMax: namedMax, Ranking: ranking,
		Rules: report.FlagCuts{Leverage: report.Float(rules.Leverage), Outlier: report.Float(rules.Outlier), CooksD: report.Float(rules.Cooks)}}
	if math.IsInf(rules.Leverage, 1) {
		in.Rules.Leverage = report.NaN()
	}
	if math.IsInf(rules.Cooks, 1) {
		in.Rules.CooksD = report.NaN()
	}
	in.Counts = report.FlagCounts{Flagged: fc.Flagged, Outlier: fc.Outlier, HighLeverage: fc.HighLeverage, Influential: fc.Influential,
		SoleSupport: fc.SoleSupport, Suspect: fc.Suspect, LeverageOnly: fc.Flagged - fc.Suspect}
	se = &report.Sensitivity{LooRMin: report.Float(fc.LooRMin), LooRMax: report.Float(fc.LooRMax), LooSlopeMin: report.Float(fc.LooSMin), LooSlopeMax: report.Float(fc.LooSMax),
		RWithoutFlagged: report.NaN(), RWithoutLow: report.NaN(), RWithoutHigh: report.NaN(), PWithoutFlagged: report.NaN(),
		SlopeWithoutFlagged: report.NaN(), InterceptWithout: report.NaN(), ResistantSlope: report.NaN(), ResistantIntercept: report.NaN(),
		WithoutEach: []report.Without{}, NFlagged: fc.Suspect}
	if !math.IsNaN(fc.MaxD) {
		in.MaxCooksD = report.Float(fc.MaxD)
	}
	// The rows at the extremes, told by the leave-one-out r the server
	// computed for them (the one the third pass's extremes are), not by
	// one computed again here, which may differ in the last digit.
	for i, r := range ext.Extremes {
		loo := ext.ExtLoo[i]
		if se.LooRMinRow == "" && loo == fc.LooRMin {
			se.LooRMinRow = pushedRowName(r)
		}
		if se.LooRMaxRow == "" && loo == fc.LooRMax {
			se.LooRMaxRow = pushedRowName(r)
		}
	}
	if ext.Cook != nil {
		in.MaxCooksRow = pushedRowName(*ext.Cook)
	}
	in.Points = []report.Point{}
	for _, r := range sus {
		ri := rowInfluence(m, f, r.X, r.Y)
		if len(in.Points) == namedMax {
			break
		}
		f := findings.FlagSet(r.Flags) // the third pass's, which its counts add up
		in.Points = append(in.Points, report.Point{Row: pushedRowName(r), Index: -1, X: report.Float(r.X), Y: report.Float(r.Y),
			Leverage: report.Float(ri.Leverage), Studentized: report.Float(ri.Studentized), StudentizedExt: report.Float(ri.StudentizedExt),
			CooksD: report.Float(ri.CooksD), DFFITS: report.Float(ri.DFFITS), Flags: f.Names()})
		se.WithoutEach = append(se.WithoutEach, report.Without{Row: pushedRowName(r), R: report.Float(ri.LooR), Slope: report.Float(ri.LooSlope), Intercept: report.Float(ri.LooIntercept)})
	}
	in.Counts.Named = len(in.Points)
	if fc.Suspect == 0 {
		se.RWithoutFlagged, se.RWithoutLow, se.RWithoutHigh, se.PWithoutFlagged = report.Float(all.R), report.Float(all.CILow), report.Float(all.CIHigh), report.Float(all.P)
		se.SlopeWithoutFlagged, se.InterceptWithout = line.Slope.Estimate, line.Intercept.Estimate
	} else if fc.Suspect == len(sus) {
		dx, dy := make([]float64, len(sus)), make([]float64, len(sus))
		for i, r := range sus {
			dx[i], dy[i] = r.X, r.Y
		}
		if kept, ok := stats.WithoutRows(m, dx, dy); ok && kept.N >= 3 {
			p := stats.PearsonMoments(kept, conf)
			se.RWithoutFlagged, se.RWithoutLow, se.RWithoutHigh, se.PWithoutFlagged = report.Float(p.R), report.Float(p.CILow), report.Float(p.CIHigh), report.Float(p.P)
			b := kept.Sxy / kept.Sxx
			se.SlopeWithoutFlagged, se.InterceptWithout = report.Float(b), report.Float(kept.MeanY-b*kept.MeanX)
		} else {
			sumKept = true // the caller sums the kept rows (withoutFromKept)
		}
	} else {
		sumKept = true // more flagged rows than were fetched: likewise
	}
	return in, se, sumKept
}

// withoutFromKept fills the r and line without the flagged rows from the
// kept rows' own sums (dataset.Prepared.WithoutFlagged), as the study in
// memory does when the kept rows are summed: r undefined when x or y is
// constant over them, the line when x is.
func withoutFromKept(se *report.Sensitivity, k *dataset.Kept, conf float64) {
	if k.N < 3 {
		return
	}
	m := stats.Moments{N: k.N, MeanX: k.MX, MeanY: k.MY, Sxx: k.Sxx, Syy: k.Syy, Sxy: k.Sxy}
	if !k.XConst && !k.YConst {
		p := stats.PearsonMoments(m, conf)
		se.RWithoutFlagged, se.RWithoutLow, se.RWithoutHigh, se.PWithoutFlagged = report.Float(p.R), report.Float(p.CILow), report.Float(p.CIHigh), report.Float(p.P)
	}
	if !k.XConst {
		b := m.Sxy / m.Sxx
		se.SlopeWithoutFlagged, se.InterceptWithout = report.Float(b), report.Float(m.MeanY-b*m.MeanX)
	}
}

// unitsFromMoments is the unit table from the moments: a unit change
// v' = a·v + c maps the means and centred sums exactly (x̄' = a·x̄ + c,
// Sxx' = a²·Sxx, Sxy' = a·Sxy), so the rows need not be converted. The
// row in the recorded units is the line's own (lf: its refined slope and
// its intercept from the means in two parts), as in memory.
func unitsFromMoments(xv, yv report.Variable, also manifest.AlsoIn, m stats.Moments, r float64, lf report.Fit) []report.UnitRow {
	line := func(xu, yu string, mm stats.Moments) report.UnitRow {
		b := mm.Sxy / mm.Sxx
		return report.UnitRow{XUnit: xu, YUnit: yu, R: report.Float(stats.PearsonMoments(mm, 0.95).R), Slope: report.Float(b), Intercept: report.Float(mm.MeanY - b*mm.MeanX)}
	}
	rows := []report.UnitRow{line(xv.Unit, yv.Unit, m)}
	rows[0].R = report.Float(r)
	rows[0].Slope, rows[0].Intercept = lf.Slope.Estimate, lf.Intercept.Estimate
	conv := func(from, to string) (float64, float64, error) {
		if from == "" {
			return 0, 0, fmt.Errorf("no unit is declared for this column in [dataset.units], so it cannot be converted to %q", to)
		}
		return units.Affine(from, to)
	}
	for _, u := range also.X {
		a, c, err := conv(xv.Unit, u)
		if err != nil {
			rows = append(rows, report.UnitRow{XUnit: u, YUnit: yv.Unit, R: report.NaN(), Slope: report.NaN(), Intercept: report.NaN(), Note: fmt.Sprintf("x not converted: %v", err)})
			continue
		}
		rows = append(rows, line(u, yv.Unit, stats.Moments{N: m.N, MeanX: a*m.MeanX + c, MeanY: m.MeanY, Sxx: a * a * m.Sxx, Syy: m.Syy, Sxy: a * m.Sxy}))
	}
	for _, u := range also.Y {
		a, c, err := conv(yv.Unit, u)
		if err != nil {
			rows = append(rows, report.UnitRow{XUnit: xv.Unit, YUnit: u, R: report.NaN(), Slope: report.NaN(), Intercept: report.NaN(), Note: fmt.Sprintf("y not converted: %v", err)})
			continue
		}
		rows = append(rows, line(xv.Unit, u, stats.Moments{N: m.N, MeanX: m.MeanX, MeanY: a*m.MeanY + c, Sxx: m.Sxx, Syy: a * a * m.Syy, Sxy: a * m.Sxy}))
	}
	sw := line(yv.Unit, xv.Unit, stats.Moments{N: m.N, MeanX: m.MeanY, MeanY: m.MeanX, Sxx: m.Syy, Syy: m.Sxx, Sxy: m.Sxy})
	sw.Swapped = true
	rows = append(rows, sw)
	for i := range rows {
		rows[i].XSymbol, rows[i].YSymbol = units.Symbol(rows[i].XUnit), units.Symbol(rows[i].YUnit)
	}
	return rows
}

// lineInterval is stats.LineFit.Interval from the sums.
func lineInterval(m stats.Moments, rss, x0, conf float64) (fit, cl, ch, pl, ph float64) {
	b := m.Sxy / m.Sxx
	fit = m.MeanY + b*(x0-m.MeanX)
	nan := math.NaN()
	df := m.N - 2
	if df <= 0 {
		return fit, nan, nan, nan, nan
	}
	s := math.Sqrt(rss / float64(df))
	d := x0 - m.MeanX
	q := 1/float64(m.N) + d*d/m.Sxx
	tq := stats.TQuantile(0.5+conf/2, float64(df))
	hc, hp := tq*s*math.Sqrt(q), tq*s*math.Sqrt(1+q)
	return fit, fit - hc, fit + hc, fit - hp, fit + hp
}

// predictFromSums is predictions from the sums.
func predictFromSums(m stats.Moments, rss float64, at []float64, dx report.Describe, conf float64) []report.Prediction {
	var out []report.Prediction
	for _, x0 := range at {
		fit, cl, ch, pl, ph := lineInterval(m, rss, x0, conf)
		out = append(out, report.Prediction{X: report.Float(x0), Fit: report.Float(fit), ConfLow: report.Float(cl),
			ConfHigh: report.Float(ch), PredLow: report.Float(pl), PredHigh: report.Float(ph),
			InRange: x0 >= float64(dx.Min) && x0 <= float64(dx.Max)})
	}
	return out
}

// pushdownApproximations lists the sampled figures with their errors.
func pushdownApproximations(k, n int, cfg Config) []report.Approximation {
	method := dataset.SampleMethod
	se := 1 / math.Sqrt(float64(k))
	return []report.Approximation{
		{Figure: "quartiles and medians of x and y", Rows: k, Of: n, Method: method,
			Error: fmt.Sprintf("the sample quartile lies between the population's %s and %s quantiles (for the median) with about 95%% probability (binomial: 0.5 ± 1.96·√(0.25/%d))", num(report.Float(0.5-1.96*0.5*se)), num(report.Float(0.5+1.96*0.5*se)), k)},
		{Figure: "Spearman's ρ and Kendall's τ-b with their p", Rows: k, Of: n, Method: method,
			Error: fmt.Sprintf("sampling SD of order 1/√%d ≈ %s; their p-values are those of %d rows, not of %d", k, num(report.Float(se)), k, n)},
		{Figure: "distance correlation and its permutation p", Rows: k, Of: n, Method: method,
			Error: fmt.Sprintf("sampling error of order 1/√%d ≈ %s, against the nonlinear cut point of %s", k, num(report.Float(se)), num(report.Float(cfg.Thresholds.NonlinearDcor)))},
		{Figure: "Theil–Sen line", Rows: k, Of: n, Method: method, Error: fmt.Sprintf("sampling SD of order 1/√%d of the slope's spread", k)},
		{Figure: "LOWESS curve", Rows: k, Of: n, Method: method,
			Error: fmt.Sprintf("largest difference from LOWESS on all rows %s SD of y for x between its 1st and 99th percentiles, %s SD at the ends (measured by this tool on generated data of 10⁵ rows with normal x, for a sample of 20 000)",
				num(report.Float(lowessErrCore)), num(report.Float(lowessErrAll)))},
		{Figure: "Durbin–Watson and spread ρ in order of x", Rows: k, Of: n, Method: method,
			Error: fmt.Sprintf("a screen read against a fixed cut point; its sampling SD is about 2/√%d ≈ %s", k, num(report.Float(2*se)))},
	}
}

// pushdownGrids are the density grids' cells: y on x over the ranges of x
// and y, the residual on the fitted value over the second pass's residual
// range and, with a run order (the last numeric column), the residual on
// the order.
func pushdownGrids(c *dataset.Counts, m stats.Moments, sums *dataset.Sums, spec dataset.Spec, k int) [3]dataset.Grid {
	widen := func(lo, hi float64) (float64, float64) {
		if !(hi > lo) {
			return lo - 0.5, lo + 0.5
		}
		return lo, hi
	}
	var g [3]dataset.Grid
	g[0] = dataset.Grid{NX: gridNX, NY: gridNY}
	g[0].XLo, g[0].XHi = widen(c.Min[0], c.Max[0])
	g[0].YLo, g[0].YHi = widen(c.Min[1], c.Max[1])
	g[1] = dataset.Grid{NX: gridNX, NY: gridNY}
	g[1].XLo, g[1].XHi = g[0].XLo, g[0].XHi
	g[1].YLo, g[1].YHi = widen(sums.EMin, sums.EMax)
	if spec.Order != "" {
		g[2] = dataset.Grid{NX: gridNX, NY: gridNY}
		g[2].XLo, g[2].XHi = widen(c.Min[k-1], c.Max[k-1])
		g[2].YLo, g[2].YHi = g[1].YLo, g[1].YHi
	}
	return g
}

// pushdownPlot is plotData from the database: density grids at every n.
func pushdownPlot(th *dataset.Third, m stats.Moments, rss float64, c *dataset.Counts, gs []dataset.GroupSums,
	spec dataset.Spec, inf *report.Influence, sp *report.Plot, cfg Config, conf float64) *report.Plot {
	pl := &report.Plot{N: m.N}
	if spec.Group != "" {
		for _, g := range gs {
			pl.Levels = append(pl.Levels, g.Level)
			pl.LevelCounts = append(pl.LevelCounts, g.N)
			pl.LevelXMin, pl.LevelXMax = append(pl.LevelXMin, g.XMin), append(pl.LevelXMax, g.XMax)
		}
	}
	b := m.Sxy / m.Sxx
	conv := func(d *dataset.Grid) *report.Grid {
		if d == nil {
			return nil
		}
		return &report.Grid{XLo: d.XLo, XHi: d.XHi, YLo: d.YLo, YHi: d.YHi, NX: d.NX, NY: d.NY, Counts: d.Counts}
	}
	pl.Scatter, pl.ResidX, pl.ResidOrder = conv(th.Grids[0]), conv(th.Grids[1]), conv(th.Grids[2])
	pl.Band = lineBand(c.Min[0], c.Max[0], cfg.BandPoints, func(x0 float64) (f, cl, ch, pl, ph float64) {
		return lineInterval(m, rss, x0, conf)
	})
	if sp != nil {
		pl.Lowess = sp.Lowess
	}
	for i, pt := range inf.Points {
		x, y := float64(pt.X), float64(pt.Y)
		f := m.MeanY + b*(x-m.MeanX)
		pl.Marked = append(pl.Marked, report.Marked{Row: pt.Row, X: x, Y: y, Fitted: f, Residual: y - f, Order: math.NaN(), Label: i < report.LabelMax})
	}
	return pl
}
