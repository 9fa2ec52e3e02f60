package dataset

// This file reads a database dataset that holds more rows than its limit
// without fetching the rows: the database sums, bivar solves. Every
// statement is plain SQL that PostgreSQL runs without an extension or a
// function of ours (aggregates with FILTER, GROUP BY, GROUPING SETS, the
// window function lag(), ORDER BY … LIMIT, md5() of a row's text), so the
// same statements run where a plant's data have outgrown one server.
//
// Numerics. Sums of squares and products are formed in two passes: the
// means first (AVG), then the sums of products of deviations from those
// means, with the sums of the deviations themselves, which correct for
// the rounding of the first pass (the "corrected two-pass algorithm" of
// Chan, Golub & LeVeque, "Algorithms for computing the sample variance",
// The American Statistician 37(3), 1983). Deviations are formed before
// they are multiplied, so no large squares cancel; the error is that of
// adding n terms of one sign. The third and fourth powers the quadratic
// needs have no aggregate of their own in PostgreSQL, which is why the
// two passes are written out rather than read from regr_sxx and its kin.
// The one place a built-in aggregate's numerics matter is the within-block
// sum of squares of the Durbin–Watson statistic with tied run orders,
// var_pop(e)·count: PostgreSQL's float8 variance aggregates update their
// state by the algorithm of Youngs and Cramer (float8_accum in
// src/backend/utils/adt/float.c, "Use the Youngs-Cramer algorithm to
// incorporate the new value into the transition values", since
// PostgreSQL 12), an updating form that is stable against cancellation
// (Chan, Golub & LeVeque 1983, §3).

import (
	"context"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/jackc/pgx/v5"
)

// Session is a read-only, repeatable-read transaction on a database
// dataset: every statement of a push-down study sees the same snapshot of
// the data, however many passes it takes.
type Session struct {
	q       Query
	conn    *pgx.Conn
	tx      pgx.Tx
	ctx     context.Context
	cancel  context.CancelFunc
	timeout time.Duration
	inner   string
	kinds   map[string]pgKind
	// Names are the result's columns, ServerVersion the server's version.
	Names         []string
	ServerVersion string
	// Statements lists every statement run, in order, for the report.
	Statements []string
}

// sessionStatements bounds the statements of a Session (a study runs
// fourteen at most), each under the statement timeout: the session lasts
// at most this many timeouts.
const sessionStatements = 16

// Open starts a Session on q. Each statement runs under q's statement
// timeout; the session as a whole under sessionStatements of them.
func Open(ctx context.Context, q Query) (*Session, error) {
	timeout := q.Timeout
	if timeout <= 0 {
		timeout = DefaultStatementTimeout
	}
	conn, tx, ctx, cancel, err := q.open(ctx, timeout, sessionStatements, pgx.TxOptions{AccessMode: pgx.ReadOnly, IsoLevel: pgx.RepeatableRead})
	if err != nil {
		return nil, err
	}
	s := &Session{q: q, conn: conn, tx: tx, ctx: ctx, cancel: cancel, timeout: timeout, inner: q.inner(), kinds: map[string]pgKind{},
		ServerVersion: conn.PgConn().ParameterStatus("server_version")}
	desc, err := tx.Prepare(ctx, "", "SELECT * FROM ("+s.inner+"\n) AS bivar_q LIMIT 0")
	if err != nil {
		s.Close()
		return nil, q.queryError(s.what(), err, timeout)
	}
	for _, f := range desc.Fields {
		s.Names = append(s.Names, f.Name)
		s.kinds[f.Name] = pgKinds[f.DataTypeOID]
	}
	return s, nil
}

// Close ends the session.
func (s *Session) Close() {
	bg := context.WithoutCancel(s.ctx)
	s.tx.Rollback(bg)
	s.conn.Close(bg)
	s.cancel()
}

func (s *Session) what() string {
	if s.q.SQL == "" {
		return fmt.Sprintf("reading table %s", s.q.Table)
	}
	return "the query"
}

// rows runs one statement in the session and returns its rows' values
// (read them with Num and Text); it is the only way statements reach the
// server, and it records each in Statements.
func (s *Session) rows(stmt string, args ...any) ([][]any, error) {
	s.Statements = append(s.Statements, stmt)
	rs, err := s.tx.Query(s.ctx, stmt, args...)
	if err != nil {
		return nil, s.q.queryError(s.what(), err, s.timeout)
	}
	defer rs.Close()
	var out [][]any
	for rs.Next() {
		v, err := rs.Values()
		if err != nil {
			return nil, s.q.queryError(s.what(), err, s.timeout)
		}
		out = append(out, v)
	}
	if err := rs.Err(); err != nil {
		return nil, s.q.queryError(s.what(), err, s.timeout)
	}
	return out, nil
}

// Num reads a numeric result cell: NaN for NULL.
func Num(v any) float64 {
	switch a := v.(type) {
	case float64:
		return a
	case float32:
		return float64(a)
	case int64:
		return float64(a)
	case int32:
		return float64(a)
	case int16:
		return float64(a)
	case int:
		return float64(a)
	}
	return math.NaN()
}

// Text reads a text result cell: "" for NULL.
func Text(v any) string {
	if v == nil {
		return ""
	}
	if t, ok := v.(string); ok {
		return t
	}
	return fmt.Sprint(v)
}

// OverLimit says whether q gives more than limit rows, reading at most
// limit+1 of them on the server (nothing is fetched).
func OverLimit(ctx context.Context, q Query, limit int) (bool, error) {
	s, err := Open(ctx, q)
	if err != nil {
		return false, err
	}
	defer s.Close()
	r, err := s.rows("SELECT count(*) FROM (SELECT 1 FROM (" + s.inner + "\n) AS bivar_q LIMIT " + strconv.Itoa(limit+1) + ") AS bivar_n")
	if err != nil {
		return false, err
	}
	return int(Num(r[0][0])) > limit, nil
}

// FingerprintMethod says how Fingerprint identifies the rows, for the report.
const FingerprintMethod = "rows left in the database (more than max_rows): the count of rows and the sum, as an exact numeric, of the first 60 bits of the MD5 of each row's text (PostgreSQL's row-to-text output, UTC, ISO dates), computed by the server; the SHA-256 is over the text \"count sum\". Order-free: the same set of rows gives the same hash in any order"

// Fingerprint counts the rows and sums a hash of each, on the server
// (FingerprintMethod), and counts the NULL cells of each column of cols
// that the result has (-1 for one it lacks).
func (s *Session) Fingerprint(cols []string) (rows int, text string, missing []int, err error) {
	sel := []string{"count(*)", "coalesce(sum(('x' || left(md5(CAST(bivar_q AS text)), 15))::bit(60)::bigint::numeric), 0)::text"}
	for _, c := range cols {
		if slices.Contains(s.Names, c) {
			sel = append(sel, "count(*) - count(bivar_q."+pgx.Identifier{c}.Sanitize()+")")
		}
	}
	r, err := s.rows("SELECT " + strings.Join(sel, ", ") + " FROM (" + s.inner + "\n) AS bivar_q")
	if err != nil {
		return 0, "", nil, err
	}
	n := int(Num(r[0][0]))
	k := 2
	for _, c := range cols {
		if !slices.Contains(s.Names, c) {
			missing = append(missing, -1)
			continue
		}
		missing = append(missing, int(Num(r[0][k])))
		k++
	}
	return n, fmt.Sprintf("%d %s", n, Text(r[0][1])), missing, nil
}

// Spec names the columns of one push-down study.
type Spec struct {
	X, Y       string
	Covariates []string
	Group      string // "" when none
	Order      string // "" when none
	ID         string // the dataset's id_column, "" when none
	// Missing are the text cells counted as missing in Group and ID
	// (after trimming spaces), besides NULL.
	Missing []string
}

// numExpr is the SQL of a numeric column as double precision.
func (s *Session) numExpr(col string) (string, error) {
	id := pgx.Identifier{col}.Sanitize()
	switch s.kinds[col] {
	case pgNumber:
		return "CAST(bivar_q." + id + " AS double precision)", nil
	case pgTime:
		return "CAST(EXTRACT(EPOCH FROM bivar_q." + id + ") AS double precision)", nil
	case pgText:
		return "", &Error{File: s.q.err("").File, Column: col, Msg: "the column is text, and a study uses it as a number: choose a numeric column, or cast it in the query (" + id + "::double precision)"}
	}
	if !slices.Contains(s.Names, col) {
		return "", &Error{File: s.q.err("").File, Column: col, Msg: "the result has no such column: correct the study or the query"}
	}
	return "", &Error{File: s.q.err("").File, Column: col, Msg: "the column's type is not one bivar reads: cast it in the query to a number (::double precision), a timestamp or text (::text)"}
}

// textExpr is the SQL of a text column, NULL where missing.
func (s *Session) textExpr(col string, missing []string) (string, error) {
	if !slices.Contains(s.Names, col) {
		return "", &Error{File: s.q.err("").File, Column: col, Msg: "the result has no such column: correct the study or the query"}
	}
	id := "CAST(bivar_q." + pgx.Identifier{col}.Sanitize() + " AS text)"
	if len(missing) == 0 {
		return id, nil
	}
	lits := make([]string, len(missing))
	for i, m := range missing {
		lits[i] = "'" + strings.ReplaceAll(m, "'", "''") + "'"
	}
	return "CASE WHEN btrim(" + id + ") IN (" + strings.Join(lits, ", ") + ") THEN NULL ELSE " + id + " END", nil
}

// fence ends a derived table whose computed columns several expressions
// read: PostgreSQL's planner otherwise merges the subquery into the outer
// query and evaluates a column's expression once for every reference to it
// (OFFSET 0 is standard SQL, and PostgreSQL does not merge a subquery that
// has one). On 10⁶ rows it makes the residual pass three times faster.
const fence = " OFFSET 0"

// finite is the SQL test that a double precision value is a number:
// PostgreSQL sorts NaN above every number and Infinity, so NaN, Infinity
// and −Infinity all fail it, and NULL gives NULL.
func finite(e string) string { return "abs(" + e + ") < 'Infinity'::float8" }

// Prepared is a study's rows as SQL: All reads every row of the query with
// the study's columns named x, y, c0…, g, o, id; Complete only its
// complete cases.
type Prepared struct {
	s        *Session
	spec     Spec
	All      string
	Complete string
	NumCols  []string // SQL names of the numeric columns: x, y, c0…, o
	Names    []string // their column names in the query's result
}

// Prepare builds the study's row sources.
func (s *Session) Prepare(spec Spec) (*Prepared, error) {
	p := &Prepared{s: s, spec: spec}
	var sel []string
	add := func(col, as string) error {
		e, err := s.numExpr(col)
		if err != nil {
			return err
		}
		sel = append(sel, e+" AS "+as)
		p.NumCols = append(p.NumCols, as)
		p.Names = append(p.Names, col)
		return nil
	}
	if err := add(spec.X, "x"); err != nil {
		return nil, err
	}
	if err := add(spec.Y, "y"); err != nil {
		return nil, err
	}
	for i, c := range spec.Covariates {
		if err := add(c, "c"+strconv.Itoa(i)); err != nil {
			return nil, err
		}
	}
	if spec.Order != "" {
		if err := add(spec.Order, "o"); err != nil {
			return nil, err
		}
	}
	var cond []string
	for _, c := range p.NumCols {
		cond = append(cond, finite(c))
	}
	if spec.Group != "" {
		e, err := s.textExpr(spec.Group, spec.Missing)
		if err != nil {
			return nil, err
		}
		sel = append(sel, e+" AS g")
		cond = append(cond, "g IS NOT NULL")
	}
	id := "CAST(NULL AS text)"
	if spec.ID != "" {
		e, err := s.textExpr(spec.ID, spec.Missing)
		if err != nil {
			return nil, err
		}
		id = e
	}
	sel = append(sel, id+" AS id")
	p.All = "(SELECT " + strings.Join(sel, ", ") + " FROM (" + s.inner + "\n) AS bivar_q" + fence + ") AS bivar_r"
	p.Complete = "(SELECT * FROM " + p.All + " WHERE " + strings.Join(cond, " AND ") + ") AS bivar_c"
	return p, nil
}

// Counts are a study's row counts over every row of the query.
type Counts struct {
	Rows, Complete int
	// Missing and NonNumeric count per numeric column (NumCols order) the
	// NULL cells and the cells that are NaN or infinite; GroupMissing the
	// rows whose group is NULL or a missing token.
	Missing, NonNumeric []int
	GroupMissing        int
	// Mean, Min and Max of each numeric column over the complete cases.
	Mean, Min, Max []float64
}

// Counts runs the first pass.
func (p *Prepared) Counts() (*Counts, error) {
	var sel []string
	sel = append(sel, "count(*)", "count(*) FILTER (WHERE bivar_ok)")
	for _, c := range p.NumCols {
		sel = append(sel, "count(*) FILTER (WHERE "+c+" IS NULL)", "count(*) FILTER (WHERE "+c+" IS NOT NULL AND NOT "+finite(c)+")")
	}
	if p.spec.Group != "" {
		sel = append(sel, "count(*) FILTER (WHERE g IS NULL)")
	}
	for _, c := range p.NumCols {
		f := " FILTER (WHERE bivar_ok)"
		sel = append(sel, "avg("+c+")"+f, "min("+c+")"+f, "max("+c+")"+f)
	}
	r, err := p.s.rows("SELECT " + strings.Join(sel, ", ") + " FROM (SELECT *, " + p.completeCond() + " AS bivar_ok FROM " + p.All + fence + ") AS bivar_k")
	if err != nil {
		return nil, err
	}
	v := r[0]
	c := &Counts{Rows: int(Num(v[0])), Complete: int(Num(v[1]))}
	k := 2
	for range p.NumCols {
		c.Missing = append(c.Missing, int(Num(v[k])))
		c.NonNumeric = append(c.NonNumeric, int(Num(v[k+1])))
		k += 2
	}
	if p.spec.Group != "" {
		c.GroupMissing = int(Num(v[k]))
		k++
	}
	for range p.NumCols {
		c.Mean = append(c.Mean, Num(v[k]))
		c.Min = append(c.Min, Num(v[k+1]))
		c.Max = append(c.Max, Num(v[k+2]))
		k += 3
	}
	return c, nil
}

func (p *Prepared) completeCond() string {
	var cond []string
	for _, c := range p.NumCols {
		cond = append(cond, finite(c))
	}
	if p.spec.Group != "" {
		cond = append(cond, "g IS NOT NULL")
	}
	return strings.Join(cond, " AND ")
}

// lit writes a float64 as an SQL double precision literal that reads back
// to the same value.
func lit(v float64) string {
	return "CAST('" + strconv.FormatFloat(v, 'g', -1, 64) + "' AS double precision)"
}

// Sums are the second pass: sums of products of deviations from the
// first pass's means, d_c = c − mean_c, over the complete cases.
type Sums struct {
	// D[i] = Σ d_i; P[i][j] = Σ d_i·d_j (NumCols order).
	D []float64
	P [][]float64
	// X3 = Σ d_x³, X4 = Σ d_x⁴, X2Y = Σ d_x²·d_y.
	X3, X4, X2Y float64
}

// Sums runs the second pass with the means of c.
func (p *Prepared) Sums(mean []float64) (*Sums, error) {
	k := len(p.NumCols)
	dev := make([]string, k)
	var devSel []string
	for i, c := range p.NumCols {
		dev[i] = "d" + strconv.Itoa(i)
		devSel = append(devSel, "("+c+" - "+lit(mean[i])+") AS "+dev[i])
	}
	var sel []string
	for i := range k {
		sel = append(sel, "sum("+dev[i]+")")
	}
	for i := range k {
		for j := i; j < k; j++ {
			sel = append(sel, "sum("+dev[i]+" * "+dev[j]+")")
		}
	}
	sel = append(sel, "sum("+dev[0]+" * "+dev[0]+" * "+dev[0]+")", "sum(("+dev[0]+" * "+dev[0]+") * ("+dev[0]+" * "+dev[0]+"))",
		"sum("+dev[0]+" * "+dev[0]+" * "+dev[1]+")")
	r, err := p.s.rows("SELECT " + strings.Join(sel, ", ") + " FROM (SELECT " + strings.Join(devSel, ", ") + " FROM " + p.Complete + fence + ") AS bivar_d")
	if err != nil {
		return nil, err
	}
	v := r[0]
	s := &Sums{D: make([]float64, k), P: make([][]float64, k)}
	n := 0
	for i := range k {
		s.D[i] = Num(v[n])
		n++
		s.P[i] = make([]float64, k)
	}
	for i := range k {
		for j := i; j < k; j++ {
			s.P[i][j] = Num(v[n])
			s.P[j][i] = s.P[i][j]
			n++
		}
	}
	s.X3, s.X4, s.X2Y = Num(v[n]), Num(v[n+1]), Num(v[n+2])
	return s, nil
}

// Fit is a fitted line and quadratic as SQL can evaluate them: the line's
// residual e = (y − MY) − B·(x − MX); the quadratic's residual
// (y − QY) − (Q0 + Q1·t + Q2·t²) with t = (x − QX)/QS.
type Fit struct {
	MX, MY, B  float64
	MXLo, MYLo float64 // low parts of the means: deviations are (x − MX) − MXLo

	QX, QY, Q0, Q1, Q2, QS float64
	Quad                   bool
	MO                     float64 // mean of the run order, when the study has one
}

func (f Fit) resid() string {
	return "(((y - " + lit(f.MY) + ") - " + lit(f.MYLo) + ") - " + lit(f.B) + " * ((x - " + lit(f.MX) + ") - " + lit(f.MXLo) + "))"
}

// Residuals are the third pass: sums over the line's residuals e.
type Residuals struct {
	SE, SE2, SE4 float64 // Σe, Σe², Σe⁴
	SUE2         float64 // Σ(x − MX)·e²
	SU           float64 // Σ(x − MX)
	SUE          float64 // Σ(x − MX)·e: the slope's refinement (b + SUE/Sxx)
	SQ2          float64 // Σ of the quadratic's squared residuals
	SOE, SO, SOO float64 // Σ(o − MO)·e, Σ(o − MO), Σ(o − MO)² (run order)
	EMin, EMax   float64
}

// Residuals runs the third pass.
func (p *Prepared) Residuals(f Fit) (*Residuals, error) {
	e := f.resid()
	u := "u"
	sel := []string{"sum(e)", "sum(e * e)", "sum((e * e) * (e * e))", "sum(" + u + " * (e * e))", "sum(" + u + ")", "min(e)", "max(e)", "sum(" + u + " * e)"}
	if f.Quad {
		t := "((x - " + lit(f.QX) + ") / " + lit(f.QS) + ")"
		q := "((y - " + lit(f.QY) + ") - (" + lit(f.Q0) + " + " + lit(f.Q1) + " * " + t + " + " + lit(f.Q2) + " * (" + t + " * " + t + ")))"
		sel = append(sel, "sum("+q+" * "+q+")")
	} else {
		sel = append(sel, "CAST(NULL AS double precision)")
	}
	if p.spec.Order != "" {
		o := "(o - " + lit(f.MO) + ")"
		sel = append(sel, "sum("+o+" * e)", "sum("+o+")", "sum("+o+" * "+o+")")
	}
	r, err := p.s.rows("SELECT " + strings.Join(sel, ", ") + " FROM (SELECT *, " + e + " AS e, ((x - " + lit(f.MX) + ") - " + lit(f.MXLo) + ") AS u FROM " + p.Complete + fence + ") AS bivar_e")
	if err != nil {
		return nil, err
	}
	v := r[0]
	out := &Residuals{SE: Num(v[0]), SE2: Num(v[1]), SE4: Num(v[2]), SUE2: Num(v[3]), SU: Num(v[4]), EMin: Num(v[5]), EMax: Num(v[6]), SUE: Num(v[7]), SQ2: Num(v[8])}
	if p.spec.Order != "" {
		out.SOE, out.SO, out.SOO = Num(v[9]), Num(v[10]), Num(v[11])
	}
	return out, nil
}

// DurbinWatsonNumerator is the numerator of the Durbin–Watson statistic
// of the line's residuals in run order, averaged over the orders of rows
// whose run order ties (the closed form of stats.DurbinWatsonTied: 2·SS
// within each block of tied orders, (ē_A − ē_B)² + SS_A/m_A + SS_B/m_B
// between consecutive blocks), by GROUP BY on the order and lag() over the
// blocks.
func (p *Prepared) DurbinWatsonNumerator(f Fit) (float64, error) {
	stmt := "SELECT sum(2 * ss) + coalesce(sum((me - pme) * (me - pme) + ss / m + pss / pm) FILTER (WHERE pm IS NOT NULL), 0) FROM (" +
		"SELECT m, me, ss, lag(m) OVER w AS pm, lag(me) OVER w AS pme, lag(ss) OVER w AS pss FROM (" +
		"SELECT o, CAST(count(*) AS double precision) AS m, avg(e) AS me, var_pop(e) * count(*) AS ss FROM (SELECT o, " + f.resid() + " AS e FROM " + p.Complete + fence + ") AS bivar_e GROUP BY o" +
		") AS bivar_b WINDOW w AS (ORDER BY o)) AS bivar_l"
	r, err := p.s.rows(stmt)
	if err != nil {
		return 0, err
	}
	return Num(r[0][0]), nil
}

// Influence holds the SQL of the straight line's row-wise measures, with
// the constants they need (see stats.LineInfluence.At for the formulas):
// leverage h = 1/n + d²/Sxx, 1 − h, the internally and externally
// studentized residuals, Cook's distance and the leave-one-out r and slope.
type Influence struct {
	N              int
	MX, MY, B      float64
	MXLo, MYLo     float64 // low parts of the means
	Sxx, Syy, Sxy  float64
	RSS, S         float64 // S = √(RSS/(n − 2))
	Outlier, Cooks float64 // the cut points (+Inf: off)
	Leverage       float64
}

// measures is the SELECT list of the row-wise measures over bivar_c.
func (in Influence) measures() string {
	nf := float64(in.N)
	dx := "((x - " + lit(in.MX) + ") - " + lit(in.MXLo) + ")"
	dy := "((y - " + lit(in.MY) + ") - " + lit(in.MYLo) + ")"
	e := "(" + dy + " - " + lit(in.B) + " * " + dx + ")"
	q := "(" + dx + " * " + dx + " / " + lit(in.Sxx) + ")"
	h := "least(1, " + lit(1/nf) + " + " + q + ")"
	omh := "greatest(0, " + lit((nf-1)/nf) + " - " + q + ")"
	c := lit(nf / (nf - 1))
	return "x, y, id, " + e + " AS e, " + h + " AS h, " + omh + " AS omh, " +
		// leave-one-out r from downdated sums, as stats.corrFromSums
		"(" + lit(in.Sxy) + " - " + c + " * " + dx + " * " + dy + ") / nullif(sqrt(greatest(0, " + c + " * " + lit(in.Sxx) + " * " + omh + ")) * sqrt(greatest(0, " + lit(in.Syy) + " - " + c + " * " + dy + " * " + dy + ")), 0) AS loor, " +
		"(" + lit(in.B) + " - " + dx + " * " + e + " / nullif(" + lit(in.Sxx) + " * " + omh + ", 0)) AS loos"
}

// derived adds t (externally studentized) and d (Cook's distance).
func (in Influence) derived() string {
	nf := float64(in.N)
	ri := "(e / nullif(" + lit(in.S) + " * sqrt(omh), 0))"
	s2 := "greatest(0, (" + lit(in.RSS) + " - e * e / nullif(omh, 0)) / " + lit(nf-3) + ")"
	return "*, " + ri + " * " + ri + " * h / nullif(2 * omh, 0) AS d, e / nullif(sqrt(" + s2 + ") * sqrt(omh), 0) AS t"
}

func (in Influence) source(p *Prepared) string {
	return "(SELECT " + in.derived() + " FROM (SELECT " + in.measures() + " FROM " + p.Complete + fence + ") AS bivar_m" + fence + ") AS bivar_i"
}

// FlagCounts are the counts of the fourth pass.
type FlagCounts struct {
	Outlier, HighLeverage, Influential, Flagged, Suspect int
	MaxD                                                 float64
	LooRMin, LooRMax, LooSMin, LooSMax                   float64
}

func cutLit(v float64) string {
	if math.IsInf(v, 1) || math.IsNaN(v) {
		return "CAST('Infinity' AS double precision)"
	}
	return lit(v)
}

func (in Influence) conds() (out, lev, infl string) {
	return "abs(t) > " + cutLit(in.Outlier), "h > " + cutLit(in.Leverage), "d > " + cutLit(in.Cooks)
}

// Flags runs the fourth pass: the rows per flag, the largest Cook's
// distance and the extremes of the leave-one-out r and slope.
func (p *Prepared) Flags(in Influence) (*FlagCounts, error) {
	o, l, d := in.conds()
	sel := []string{
		"count(*) FILTER (WHERE " + o + ")", "count(*) FILTER (WHERE " + l + ")", "count(*) FILTER (WHERE " + d + ")",
		"count(*) FILTER (WHERE " + o + " OR " + l + " OR " + d + ")", "count(*) FILTER (WHERE " + o + " OR " + d + ")",
		"max(d)", "min(loor)", "max(loor)", "min(loos)", "max(loos)",
	}
	r, err := p.s.rows("SELECT " + strings.Join(sel, ", ") + " FROM " + in.source(p))
	if err != nil {
		return nil, err
	}
	v := r[0]
	return &FlagCounts{Outlier: int(Num(v[0])), HighLeverage: int(Num(v[1])), Influential: int(Num(v[2])), Flagged: int(Num(v[3])),
		Suspect: int(Num(v[4])), MaxD: Num(v[5]), LooRMin: Num(v[6]), LooRMax: Num(v[7]), LooSMin: Num(v[8]), LooSMax: Num(v[9])}, nil
}

// Row is one row fetched by a push-down query.
type Row struct {
	X, Y float64
	ID   string // "" when the dataset has no id_column or it is missing
}

// Suspect fetches the rows flagged outlier or influential, ranked as a
// study ranks them (largest Cook's distance, then largest |t|, then
// smallest x, y and name), at most limit of them.
func (p *Prepared) Suspect(in Influence, limit int) ([]Row, error) {
	o, _, d := in.conds()
	return p.fetch("SELECT x, y, id FROM " + in.source(p) + " WHERE " + o + " OR " + d +
		" ORDER BY d DESC NULLS LAST, abs(t) DESC NULLS LAST, x, y, id COLLATE \"C\" LIMIT " + strconv.Itoa(limit))
}

// Extremes fetches the rows whose leave-one-out r is the smallest or the
// largest (a few rows: those that tie).
func (p *Prepared) Extremes(in Influence, lo, hi float64) ([]Row, []float64, error) {
	r, err := p.s.rows("SELECT x, y, id, loor FROM " + in.source(p) + " WHERE loor = " + lit(lo) + " OR loor = " + lit(hi) + " ORDER BY x, y, id COLLATE \"C\" LIMIT 1000")
	if err != nil {
		return nil, nil, err
	}
	var rows []Row
	var loo []float64
	for _, v := range r {
		rows = append(rows, Row{X: Num(v[0]), Y: Num(v[1]), ID: Text(v[2])})
		loo = append(loo, Num(v[3]))
	}
	return rows, loo, nil
}

// fetch runs a statement whose columns are x, y and id.
func (p *Prepared) fetch(stmt string) ([]Row, error) {
	r, err := p.s.rows(stmt)
	if err != nil {
		return nil, err
	}
	out := make([]Row, len(r))
	for i, v := range r {
		out[i] = Row{X: Num(v[0]), Y: Num(v[1]), ID: Text(v[2])}
	}
	return out, nil
}

// GroupSums are one group level's count, means, x range and centred sums.
type GroupSums struct {
	Level         string
	N             int
	MX, MY        float64
	XMin, XMax    float64
	Sxx, Syy, Sxy float64
}

// Groups runs the per-level passes: GROUP BY the group for counts and
// means, then GROUP BY again for the centred sums about each level's means
// (joined as a VALUES list), levels in sorted order (byte order).
func (p *Prepared) Groups(maxLevels int) ([]GroupSums, error) {
	r, err := p.s.rows("SELECT g, count(*), avg(x), avg(y), min(x), max(x) FROM " + p.Complete + " GROUP BY g ORDER BY g COLLATE \"C\" LIMIT " + strconv.Itoa(maxLevels+1))
	if err != nil {
		return nil, err
	}
	if len(r) > maxLevels {
		return nil, &Error{File: p.s.q.err("").File, Column: p.spec.Group, Msg: fmt.Sprintf("a group column may hold at most %d distinct values, and this one holds more: group by another column, or raise max_levels for the dataset", maxLevels)}
	}
	out := make([]GroupSums, len(r))
	var vals []string
	for i, v := range r {
		out[i] = GroupSums{Level: Text(v[0]), N: int(Num(v[1])), MX: Num(v[2]), MY: Num(v[3]), XMin: Num(v[4]), XMax: Num(v[5])}
		vals = append(vals, "("+strconv.Itoa(i)+", '"+strings.ReplaceAll(out[i].Level, "'", "''")+"', "+lit(out[i].MX)+", "+lit(out[i].MY)+")")
	}
	if len(out) == 0 {
		return out, nil
	}
	stmt := "SELECT k, sum(x - mx), sum(y - my), sum((x - mx) * (x - mx)), sum((y - my) * (y - my)), sum((x - mx) * (y - my)) FROM " + p.Complete +
		" JOIN (VALUES " + strings.Join(vals, ", ") + ") AS bivar_g(k, lv, mx, my) ON bivar_c.g = bivar_g.lv GROUP BY k"
	r, err = p.s.rows(stmt)
	if err != nil {
		return nil, err
	}
	for _, v := range r {
		g := &out[int(Num(v[0]))]
		dx, dy := Num(v[1]), Num(v[2])
		nf := float64(g.N)
		g.Sxx = Num(v[3]) - dx*dx/nf
		g.Syy = Num(v[4]) - dy*dy/nf
		g.Sxy = Num(v[5]) - dx*dy/nf
		g.MX += dx / nf
		g.MY += dy / nf
	}
	return out, nil
}

// Grid is a density grid's counts: Counts[j*NX+i] rows in cell (i, j).
type Grid struct {
	XLo, XHi, YLo, YHi float64
	NX, NY             int
	Counts             []int
}

// Grids bins the rows in one pass with GROUPING SETS: y on x, the line's
// residual on its fitted value and, with a run order, the residual on the
// order. The cell of a value a in [lo, hi] split into k cells is
// floor((a − lo)·k/(hi − lo)), clamped to 0…k−1, as analysis.grid bins.
func (p *Prepared) Grids(f Fit, g [3]Grid) ([3]*Grid, error) {
	var out [3]*Grid
	cell := func(e string, lo, hi float64, k int) string {
		return "least(greatest(CAST(floor((" + e + " - " + lit(lo) + ") * " + lit(float64(k)/(hi-lo)) + ") AS bigint), 0), " + strconv.Itoa(k-1) + ")"
	}
	fitted := "(" + lit(f.MY) + " + " + lit(f.B) + " * ((x - " + lit(f.MX) + ") - " + lit(f.MXLo) + "))"
	e := "e"
	sel := []string{
		cell("x", g[0].XLo, g[0].XHi, g[0].NX) + " AS a0", cell("y", g[0].YLo, g[0].YHi, g[0].NY) + " AS b0",
		cell(fitted, g[1].XLo, g[1].XHi, g[1].NX) + " AS a1", cell(e, g[1].YLo, g[1].YHi, g[1].NY) + " AS b1",
	}
	sets := "(a0, b0), (a1, b1)"
	if p.spec.Order != "" {
		sel = append(sel, cell("o", g[2].XLo, g[2].XHi, g[2].NX)+" AS a2", cell(e, g[2].YLo, g[2].YHi, g[2].NY)+" AS b2")
		sets += ", (a2, b2)"
	}
	last := "a2, b2"
	if p.spec.Order == "" {
		last = "0, 0"
	}
	stmt := "SELECT GROUPING(a0, b0), GROUPING(a1, b1), a0, b0, a1, b1, " + last + ", count(*) FROM (SELECT " + strings.Join(sel, ", ") + " FROM (SELECT *, " + f.resid() + " AS e FROM " + p.Complete + fence + ") AS bivar_ce" + fence +
		") AS bivar_cells GROUP BY GROUPING SETS (" + sets + ")"
	r, err := p.s.rows(stmt)
	if err != nil {
		return out, err
	}
	for k := range 3 {
		if k == 2 && p.spec.Order == "" {
			continue
		}
		gg := g[k]
		gg.Counts = make([]int, gg.NX*gg.NY)
		out[k] = &gg
	}
	for _, v := range r {
		k := 2
		switch {
		case Num(v[0]) == 0:
			k = 0
		case Num(v[1]) == 0:
			k = 1
		}
		i, j := int(Num(v[2+2*k])), int(Num(v[3+2*k]))
		out[k].Counts[j*out[k].NX+i] += int(Num(v[8]))
	}
	return out, nil
}

// sampleKey is the sample's order: the first 60 bits of the MD5 of x and
// y's text as a number, so that no collation of the server's enters (a
// text comparison would follow the database's locale).
const sampleKey = "CAST(CAST('x' || left(md5(CAST(x AS text) || ' ' || CAST(y AS text)), 15) AS bit(60)) AS bigint)"

// SampleMethod says how Sample draws its rows, for the report.
const SampleMethod = "drawn by the database: the complete cases with the smallest MD5 (its first 60 bits, as a number) of the text of x and y as PostgreSQL writes them (shortest exact form), ties by the values of the study's columns, the group and the id (bytewise); the same set of rows gives the same sample in any order, on any run"

// Sample fetches k complete cases chosen by SampleMethod: every numeric
// column (NumCols order), the group and the id.
func (p *Prepared) Sample(k int) (num [][]float64, group, id []string, err error) {
	cols := strings.Join(p.NumCols, ", ")
	extra := ", g"
	if p.spec.Group == "" {
		extra = ", CAST(NULL AS text) AS g"
	}
	stmt := "SELECT " + cols + extra + ", id FROM (SELECT " + cols + extra + ", id FROM " + p.Complete + ") AS bivar_s ORDER BY " + sampleKey + ", " + cols + ", g COLLATE \"C\", id COLLATE \"C\" LIMIT " + strconv.Itoa(k)
	r, err := p.s.rows(stmt)
	if err != nil {
		return nil, nil, nil, err
	}
	num = make([][]float64, len(p.NumCols))
	for _, v := range r {
		for i := range p.NumCols {
			num[i] = append(num[i], Num(v[i]))
		}
		group = append(group, Text(v[len(p.NumCols)]))
		id = append(id, Text(v[len(p.NumCols)+1]))
	}
	return num, group, id, nil
}
