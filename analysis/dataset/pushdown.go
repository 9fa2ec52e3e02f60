package dataset

// This file reads a database dataset that holds more rows than its limit
// without fetching the rows: the database sums, bivar solves. Every
// statement is plain SQL that PostgreSQL runs without an extension or a
// function of ours (aggregates with FILTER, GROUP BY, GROUPING SETS, the
// window function lag(), built-in hash functions), so the same statements
// run where a plant's data have outgrown one server.
//
// A study takes these statements, each one scan of the query's rows, on a
// Session and a Fork of it that shares its snapshot, two at a time (see
// analysis's pushdown):
//
//  1. First: per group level, the counts, minima and maxima, and the
//     means and centred sums of x and y by PostgreSQL's own float8
//     regression aggregates (regr_avgx, regr_sxx, regr_sxy and kin);
//     beside it, in the dataset's first study, the dataset's hash
//     (Fingerprint; in First itself when there is no second session);
//  2. Second: sums of deviations from the first pass's means, of their
//     products and powers, and of the line's residuals e and their
//     powers (the refined line, its RSS, the quadratic, Breusch–Pagan and
//     the trend in run order follow from them), and the rows at the
//     least and the largest x (a row of sole support); beside it, Sample
//     (by a hash of each row), which needs only the row count. Where the
//     first pass's line was so far off that its residuals are mostly its
//     own error (x far from 0 against its spread, as a bigint near 2⁵³),
//     the second pass runs once more, about the means it corrected (in
//     two parts) and the slope it refined (analysis's rerunSecond);
//  3. ThirdPass: the flags and the flagged rows, the largest Cook's
//     distance, the leave-one-out extremes, the quadratic's residual sum
//     and the density grids, with the refined line; without a run order in
//     two Parts (cut at the sample's median x) run at once;
//  4. Extremes: the rows of the leave-one-out extremes (their
//     leave-one-out r computed only in the cells where the third pass
//     found them);
//  5. with a run order, the Durbin–Watson numerator: the rows grouped by
//     run order, the blocks sorted (DurbinWatsonNumerator), on a third
//     session alongside the third pass.
//
// Numerics. The regression aggregates update their state by the algorithm
// of Youngs and Cramer (float8_regr_accum in
// src/backend/utils/adt/float.c, "Use the Youngs-Cramer algorithm to
// incorporate the new value into the transition values", since PostgreSQL
// 12; parallel partial states are merged by float8_regr_combine with the
// pairwise formulas of Chan, Golub & LeVeque, "Algorithms for computing
// the sample variance", The American Statistician 37(3), 1983): an
// updating form whose error grows with n·κ·u rather than the n·κ²·u of
// the textbook one-pass sums (Chan et al. 1983, §3). They give the
// first pass's means and slope, from which the second pass forms
// deviations and residuals before it multiplies them, so no large
// squares cancel; the second pass's sums of the deviations themselves
// correct for the rounding of the first pass's means (the "corrected
// two-pass algorithm", Chan et al. 1983), and its sums of x's deviations
// times the residuals refine the slope (one step of iterative
// refinement). The within-block sums of squares of the Durbin–Watson
// statistic are Σe² − (Σe)²/m over each block of the refined line's
// residuals (see DurbinWatsonNumerator).

import (
	"cmp"
	"context"
	"errors"
	"fmt"
	"math"
	"math/big"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgconn"
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
	shared  string // the snapshot Share exported, "" before or when refused
	kinds   map[string]pgKind
	oids    []uint32 // type of each result column, Names order
	// Names are the result's columns, ServerVersion the server's version.
	Names         []string
	ServerVersion string
	// Statements lists every statement run, in order, for the report.
	Statements []string
}

// sessionStatements bounds the statements of a Session, each under the
// statement timeout: the session lasts at most this many timeouts. A
// study runs at most twelve on one session (where the server cannot share
// its snapshot: the two passes and the second's rare rerun, the sample,
// the third pass and the fetch of the extremes in two parts each, lack of
// fit, the sums without the flagged rows, the run-order grouping, the
// snapshot's export), and the sample's rare second draw; the settings
// around the second pass (hashJoined) take moments, not timeouts.
const sessionStatements = 16

// sessionSettings are the settings of a push-down session, for this
// transaction only:
//   - no parallel workers: PostgreSQL plans the derived tables of the
//     passes (each ends in OFFSET 0, see fence) with a Gather right above
//     the table scan, so every row crosses from a worker to the leader,
//     which then computes and sums alone: on 10⁶ rows that took longer
//     than one process doing all (measured by scripts/pushdown-bench.sh on
//     PostgreSQL 15). One process also sums the rows in one order, so a
//     rerun gives the same figures to the last digit. Where a study gains
//     from a second process, it runs a whole statement on a second
//     session (Fork), itself one process and one order;
//   - work_mem of 256 MB, so that the run-order pass groups and sorts the
//     blocks of tied orders in memory up to about 10⁶ distinct orders
//     (180 MB of hash table, 95 MB to sort, measured on PostgreSQL 15);
//     PostgreSQL's default, 4 MB, spills to disk at 10⁵, and 64 MB at
//     10⁶ took twice as long. The other passes group into a few thousand
//     cells and use little of it;
//   - no synchronized scans: PostgreSQL starts a scan of a table larger
//     than a quarter of shared_buffers where another scan of it has got
//     to, so two scans at once (the second session's, or another
//     client's) would each sum the rows from another starting row, and
//     the last digits of the figures would change from run to run (found
//     by an independent review on 10⁶ rows: the Durbin–Watson statistic
//     2.1759436819274667 and …4627 in two runs).
//   - no sort where hashing will do (enable_sort off, which only weighs
//     against a sort: the run-order pass still sorts its blocks). The
//     planner otherwise groups by sorting or by hashing as its statistics
//     say, and an ANALYZE between two runs on the same rows (autovacuum
//     runs one of its own) turned the second pass's grouping by level
//     from one into the other, so the rows were summed in another order
//     and the last digits changed (TestPushdownRerun, with an ANALYZE
//     between its runs, fails without);
//   - standard conforming strings (on by default since PostgreSQL 9.1):
//     the statements write text, a group level among them, as '…' with
//     quotes doubled (textLit), which a server set otherwise would read
//     with backslash escapes (from an independent review).
var sessionSettings = []string{"SET LOCAL max_parallel_workers_per_gather = 0", "SET LOCAL work_mem = '256MB'", "SET LOCAL synchronize_seqscans = off",
	"SET LOCAL standard_conforming_strings = on", "SET LOCAL enable_sort = off"}

// jitSettings, on PostgreSQL 11 and later (the servers that have JIT
// compilation): a statement whose estimated cost passes 200 000 is, when
// the server compiles it at all (jit on, its cost above jit_above_cost),
// also optimized and has the operators' functions inlined. PostgreSQL's
// default for both is 500 000, and the passes of a 10⁷-row study fall
// either side of it: the second pass, all products and sums (cost about
// 450 000), took a median of 2.2 s of the server's CPU against 3.9 s
// without (three runs alternating, PostgreSQL 15, measured by
// scripts/pushdown-bench.sh). At 10⁶ rows the passes cost 40 000 to
// 150 000, and compiling them so added a few hundred milliseconds a
// statement for little gain, so they are left as the server's settings
// have them. A server without JIT is not affected.
var jitSettings = []string{"SET LOCAL jit_optimize_above_cost = 200000", "SET LOCAL jit_inline_above_cost = 200000"}

// majorVersion is the major version in a server_version string ("15.4
// (Debian …)" → 15; "9.6.24" → 9), 0 when it does not start with one.
func majorVersion(v string) int {
	end := 0
	for end < len(v) && v[end] >= '0' && v[end] <= '9' {
		end++
	}
	n, _ := strconv.Atoi(v[:end])
	return n
}

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
	if err := s.settings(); err != nil {
		s.Close()
		return nil, err
	}
	desc, err := tx.Prepare(ctx, "", "SELECT * FROM ("+s.inner+"\n) AS bivar_q LIMIT 0")
	if err != nil {
		s.Close()
		return nil, q.queryError(s.what(), err, timeout)
	}
	for _, f := range desc.Fields {
		s.Names = append(s.Names, f.Name)
		s.oids = append(s.oids, f.DataTypeOID)
		s.kinds[f.Name] = pgKinds[f.DataTypeOID]
	}
	return s, nil
}

// settings applies sessionSettings (and jitSettings) to s's transaction.
func (s *Session) settings() error {
	settings := sessionSettings
	if majorVersion(s.ServerVersion) >= 11 {
		settings = append(slices.Clone(settings), jitSettings...)
	}
	for _, set := range settings {
		if _, err := s.tx.Exec(s.ctx, set); err != nil {
			return s.q.err("setting up the session (%s): %v", set, unwrapAll(err))
		}
	}
	return nil
}

// exportSnapshot is Share's statement (a test replaces it with one that
// fails).
var exportSnapshot = "SELECT pg_export_snapshot()"

// Share exports s's snapshot (pg_export_snapshot, built into PostgreSQL
// since 9.2) for Fork, before any statement of a study has run. A server
// that refuses (a standby of an old version, a connection pooler, …)
// aborts the transaction: s then starts a new one, with the same
// settings, and Fork says it cannot; the error is only one that leaves
// s unusable.
func (s *Session) Share() error {
	err := s.tx.QueryRow(s.ctx, exportSnapshot).Scan(&s.shared)
	if err == nil {
		return nil
	}
	s.shared = ""
	if err := s.tx.Rollback(s.ctx); err != nil {
		return s.q.queryError(s.what(), err, s.timeout)
	}
	tx, err := s.conn.BeginTx(s.ctx, pgx.TxOptions{AccessMode: pgx.ReadOnly, IsoLevel: pgx.RepeatableRead})
	if err != nil { // s.tx stays the ended one, which Close may still roll back
		return s.q.err("cannot start a read-only transaction: %v", unwrapAll(err))
	}
	s.tx = tx
	for _, set := range txSettings(s.timeout) {
		if _, err := s.tx.Exec(s.ctx, set); err != nil {
			return s.q.err("setting up the session (%s): %v", set, unwrapAll(err))
		}
	}
	return s.settings()
}

// Fork opens a second session on the snapshot s shared (Share; SET
// TRANSACTION SNAPSHOT, since PostgreSQL 9.2), with s's settings, so
// that a statement runs alongside s's on a second server process and
// sees the same rows: the Durbin–Watson grouping needs only the refined
// line and runs beside the third pass, in one process and one order of
// rows of its own, so its sums are those it gives alone. Close it after
// use.
func (s *Session) Fork() (*Session, error) {
	if s.shared == "" {
		return nil, s.q.err("the session's snapshot is not shared")
	}
	conn, tx, ctx, cancel, err := s.q.open(s.ctx, s.timeout, sessionStatements, pgx.TxOptions{AccessMode: pgx.ReadOnly, IsoLevel: pgx.RepeatableRead})
	if err != nil {
		return nil, err
	}
	f := &Session{q: s.q, conn: conn, tx: tx, ctx: ctx, cancel: cancel, timeout: s.timeout, inner: s.inner, kinds: s.kinds, oids: s.oids,
		Names: s.Names, ServerVersion: s.ServerVersion}
	if _, err := tx.Exec(ctx, "SET TRANSACTION SNAPSHOT "+textLit(s.shared)); err != nil {
		f.Close()
		return nil, s.q.err("setting up a second session: %v", unwrapAll(err))
	}
	if err := f.settings(); err != nil {
		f.Close()
		return nil, err
	}
	return f, nil
}

// Cancel stops the statement the session is running, if any (from
// another goroutine); the session is then good only for Close.
func (s *Session) Cancel() { s.cancel() }

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

// each runs one statement in the session and hands each row's values to
// fn as they arrive (read them with Num and Text; fn must not keep the
// slice); it is the only way a study's statements reach the server, and
// it records each in Statements. The settings of the session
// (sessionSettings, jitSettings) and of one statement (hashJoined) are
// sent on their own and not recorded: they choose plans, not figures.
func (s *Session) each(stmt string, fn func(v []any) error) error {
	s.Statements = append(s.Statements, stmt)
	rs, err := s.tx.Query(s.ctx, stmt)
	if err != nil {
		return s.error(err)
	}
	defer rs.Close()
	for rs.Next() {
		v, err := rs.Values()
		if err != nil {
			return s.error(err)
		}
		if err := fn(v); err != nil {
			return err
		}
	}
	if err := rs.Err(); err != nil {
		return s.error(err)
	}
	return nil
}

// error explains a failed statement of the session. A number out of
// range (SQLSTATE 22003) is most likely in bivar's own sums, which form
// fourth powers of the values' deviations (beyond double precision's
// range where those reach about 10⁷⁷, or fall below 10⁻⁷⁷), though the
// study in memory does not; the message says so, and what to do, rather
// than to correct a query that runs in psql.
func (s *Session) error(err error) error {
	var pe *pgconn.PgError
	if errors.As(err, &pe) && pe.Code == "22003" {
		return s.q.err("a number went out of range in the database (%s): unless the query itself fails so in psql, the study's values are too large or too small for the database's sums of their fourth powers in double precision; rescale the columns in the query (for example y / 1e100 AS y), or raise max_rows above the row count to study the rows in memory", shortDigits(pe.Message))
	}
	return s.q.queryError(s.what(), err, s.timeout)
}

// hashJoined runs rows(stmt) with nested-loop joins off for that
// statement only (SET LOCAL enable_nestloop, put back after): the second
// pass joins each row to its level's means, a list of VALUES, and with
// up to five levels PostgreSQL 15 joins them by a nested loop, comparing
// each row's level with every level in turn, where from six on it hashes
// them. On the 10⁷-row benchmark study with four levels
// (scripts/pushdown-bench.sh's statement in psql, five alternating
// runs, medians) the pass took 6.5 s by the nested loop and 5.2 s by the
// hash join. The setting only weighs against a nested loop, so a join
// that has no other plan keeps it; a join in the dataset's own query is
// planned under it too, in this statement only.
func (s *Session) hashJoined(stmt string) ([][]any, error) {
	var was string
	if err := s.tx.QueryRow(s.ctx, "SHOW enable_nestloop").Scan(&was); err != nil {
		return nil, s.error(err)
	}
	if _, err := s.tx.Exec(s.ctx, "SET LOCAL enable_nestloop = off"); err != nil {
		return nil, s.error(err)
	}
	r, err := s.rows(stmt)
	if err != nil {
		return nil, err
	}
	if _, err := s.tx.Exec(s.ctx, "SET LOCAL enable_nestloop = "+textLit(was)); err != nil {
		return nil, s.error(err)
	}
	return r, nil
}

// rows runs one statement and returns all its rows' values.
func (s *Session) rows(stmt string) ([][]any, error) {
	var out [][]any
	err := s.each(stmt, func(v []any) error {
		out = append(out, slices.Clone(v))
		return nil
	})
	return out, err
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

// int64Of reads a bigint result cell.
func int64Of(v any) int64 {
	if a, ok := v.(int64); ok {
		return a
	}
	return int64(Num(v))
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
const FingerprintMethod = "rows left in the database (more than max_rows): the count of rows and the exact sum of a 64-bit hash of each row, computed by the server; the SHA-256 is over the text \"count sum\". A row's hash is the exclusive or of its cells' hashes by PostgreSQL's built-in hash functions (hashfloat8extended, hashint8extended, hash_numeric_extended, timestamp_hash_extended, hashtextextended on text in the C collation, …), each seeded by the column's position, a NULL cell hashing to that position. Order-free: the same set of rows gives the same hash in any order; the hash functions are those PostgreSQL's hash partitioning relies on, the same from PostgreSQL 11 on and on every little-endian server"

// colHash is the SQL of the 64-bit hash of cell c, of the type oid, seeded
// by seed: the built-in hash function of the type's hash operator class
// (pg_amproc), after a cast where the function is declared on another
// type; text in the C collation, so that no collation of the server
// enters; a type without one of these hashes its text.
func colHash(oid uint32, c, seed string) string {
	switch oid {
	case 701: // float8
		return "hashfloat8extended(" + c + ", " + seed + ")"
	case 700: // float4
		return "hashfloat4extended(" + c + ", " + seed + ")"
	case 20: // int8
		return "hashint8extended(" + c + ", " + seed + ")"
	case 23: // int4
		return "hashint4extended(" + c + ", " + seed + ")"
	case 21: // int2
		return "hashint2extended(" + c + ", " + seed + ")"
	case 26: // oid
		return "hashoidextended(" + c + ", " + seed + ")"
	case 1700: // numeric
		return "hash_numeric_extended(" + c + ", " + seed + ")"
	case 16: // bool
		return "hashint4extended(CAST(" + c + " AS integer), " + seed + ")"
	case 1082:
		// date: days since 2000-01-01, as the type stores it, and its
		// infinities as it stores them (DATEVAL_NOEND and DATEVAL_NOBEGIN,
		// the largest and least int4, src/include/utils/date.h): the
		// difference alone fails, "cannot subtract infinite dates", and a
		// date column holding 'infinity' failed the dataset that in memory
		// reads (found by a sweep of column types). NULL stays NULL.
		return "hashint4extended(CASE WHEN " + c + " = DATE 'infinity' THEN 2147483647 WHEN " + c + " = DATE '-infinity' THEN -2147483648 ELSE " +
			c + " - DATE '2000-01-01' END, " + seed + ")"
	case 1114: // timestamp
		return "timestamp_hash_extended(" + c + ", " + seed + ")"
	case 1184: // timestamptz, as a UTC timestamp (the session's time zone)
		return "timestamp_hash_extended(CAST(" + c + " AS timestamp), " + seed + ")"
	}
	return "hashtextextended(CAST(" + c + " AS text) COLLATE \"C\", " + seed + ")"
}

// rowHash is the SQL of a row's 64-bit hash (FingerprintMethod) over the
// result's columns in bivar_q; with two result columns of one name, which
// SQL cannot tell apart, the hash of the row's text.
func (s *Session) rowHash() string {
	seen := map[string]bool{}
	for _, n := range s.Names {
		if seen[n] {
			return "hashtextextended(CAST(bivar_q AS text), 0)"
		}
		seen[n] = true
	}
	if len(s.Names) == 0 {
		return "CAST(0 AS bigint)"
	}
	parts := make([]string, len(s.Names))
	for i, n := range s.Names {
		seed := strconv.Itoa(i + 1)
		parts[i] = "coalesce(" + colHash(s.oids[i], "bivar_q."+pgx.Identifier{n}.Sanitize(), seed) + ", " + seed + ")"
	}
	return "(" + strings.Join(parts, " # ") + ")"
}

// Print is a dataset's hash (FingerprintMethod) with its row count and
// the NULL cells of each column asked for (-1 for one the result lacks).
type Print struct {
	Rows    int
	Text    string // "count sum", the text the SHA-256 is taken over
	Missing []int
	// Statement is the statement that computed it.
	Statement string
}

// Fingerprint counts the rows and sums a hash of each, on the server
// (FingerprintMethod), and counts the NULL cells of each column of cols
// that the result has (-1 for one it lacks): a scan of its own, for a
// dataset none of whose studies computed the same in its first pass
// (Prepared.First).
func (s *Session) Fingerprint(cols []string) (*Print, error) {
	sel := []string{"count(*)", "coalesce(sum(" + s.rowHash() + "), 0)::text"}
	for _, c := range cols {
		if slices.Contains(s.Names, c) {
			sel = append(sel, "count(*) - count(bivar_q."+pgx.Identifier{c}.Sanitize()+")")
		}
	}
	r, err := s.rows("SELECT " + strings.Join(sel, ", ") + " FROM (" + s.inner + "\n) AS bivar_q")
	if err != nil {
		return nil, err
	}
	n := int(Num(r[0][0]))
	pr := &Print{Rows: n, Text: fmt.Sprintf("%d %s", n, Text(r[0][1])), Statement: s.Statements[len(s.Statements)-1]}
	k := 2
	for _, c := range cols {
		if !slices.Contains(s.Names, c) {
			pr.Missing = append(pr.Missing, -1)
			continue
		}
		pr.Missing = append(pr.Missing, int(Num(r[0][k])))
		k++
	}
	return pr, nil
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
		if i := slices.Index(s.Names, col); i >= 0 && s.oids[i] == 700 {
			// real: through its text, the digits the rows fetched below
			// max_rows are read from (pgNumberOf), not the binary value
			// widened (3.1956139 would be 3.1956138610839844).
			return "CAST(CAST(bivar_q." + id + " AS text) AS double precision)", nil
		}
		if i := slices.Index(s.Names, col); i >= 0 && s.oids[i] == 1700 {
			return numericAsFloat("bivar_q." + id), nil
		}
		if i := slices.Index(s.Names, col); i >= 0 && s.oids[i] == 26 {
			// oid: PostgreSQL has no cast to double precision ("cannot
			// cast type oid to double precision" failed the study that
			// reads the same rows in memory; found by a sweep of column
			// types), but one to bigint, exact for its 32 bits.
			return "CAST(CAST(bivar_q." + id + " AS bigint) AS double precision)", nil
		}
		return "CAST(bivar_q." + id + " AS double precision)", nil
	case pgTime:
		return "CAST(EXTRACT(EPOCH FROM bivar_q." + id + ") AS double precision)", nil
	case pgText:
		return "", &Error{File: s.q.err("").File, Column: col, Msg: textAsNumber(s.typeName(col), col)}
	}
	if !slices.Contains(s.Names, col) {
		return "", &Error{File: s.q.err("").File, Column: col, Msg: "the result has no such column: correct the study or the query"}
	}
	return "", &Error{File: s.q.err("").File, Column: col, Msg: notRead(s.typeName(col), col)}
}

// CheckTypes is an error naming the first column of numeric (used as
// numbers) or text (used as a group or an id) that the result has and
// that bivar cannot read so, with the message ReadQuery gives when the
// rows are fetched: a dataset whose studies use such a column fails in
// both paths alike, not only the study that uses it (found by a sweep of
// column types). Columns the result lacks are the studies' to report.
func (s *Session) CheckTypes(numeric, text []string) error {
	for _, c := range numeric {
		if slices.Contains(s.Names, c) {
			if _, err := s.numExpr(c); err != nil {
				return err
			}
		}
	}
	for _, c := range text {
		if slices.Contains(s.Names, c) {
			if _, err := s.textExpr(c); err != nil {
				return err
			}
		}
	}
	return nil
}

// typeName is the type of the result column col as PostgreSQL names it
// (format_type), for a message.
func (s *Session) typeName(col string) string {
	oid := s.oids[slices.Index(s.Names, col)]
	var n string
	if err := s.tx.QueryRow(s.ctx, "SELECT format_type($1, NULL)", oid).Scan(&n); err != nil {
		return "oid " + strconv.Itoa(int(oid))
	}
	return n
}

// numericAsFloat is the SQL of a numeric (PostgreSQL's decimal type)
// value c as double precision, as the rows fetched below max_rows read
// its text (pgNumberOf, by strconv.ParseFloat, correctly rounded as the
// cast is): a value at or beyond the overflow bound, 2¹⁰²⁴ − 2⁹⁷⁰ (half a
// unit in the last place above the largest float64, where ParseFloat
// gives ±Inf), is ±Infinity, not a finite number, and counted as
// Infinity is (non_numeric); NaN, which PostgreSQL sorts above every
// number, stays NaN; a value of magnitude at or below 2⁻¹⁰⁷⁵ (half the
// least subnormal, where ParseFloat rounds to 0) is 0 with c's sign. The cast alone fails the statement on both ("value out
// of range: overflow", "underflow": PostgreSQL's float8in, which the
// cast calls, refuses a value strtod rounds to ±HUGE_VAL or to 0), so a
// cell of 1e400 failed the study that in memory counts it as not finite
// (TestPushdownNumericOutOfRange). Only numeric columns take the test.
func numericAsFloat(c string) string {
	return "(CASE WHEN abs(" + c + ") >= " + numericOverflow + " THEN CASE WHEN " + c + " < 0 THEN CAST('-Infinity' AS double precision) " +
		"WHEN " + c + " = CAST('NaN' AS numeric) THEN CAST('NaN' AS double precision) ELSE CAST('Infinity' AS double precision) END " +
		"WHEN abs(" + c + ") <= " + numericUnderflow + " THEN CASE WHEN " + c + " < 0 THEN CAST('-0' AS double precision) ELSE CAST(0 AS double precision) END " +
		"ELSE CAST(" + c + " AS double precision) END)"
}

// numericOverflow and numericUnderflow are 2¹⁰²⁴ − 2⁹⁷⁰ and 2⁻¹⁰⁷⁵ as
// exact numeric literals (numericAsFloat).
var numericOverflow, numericUnderflow = func() (string, string) {
	hi := new(big.Int).Sub(new(big.Int).Lsh(big.NewInt(1), 1024), new(big.Int).Lsh(big.NewInt(1), 970))
	lo := new(big.Float).SetMantExp(big.NewFloat(1), -1075)
	return "CAST('" + hi.String() + "' AS numeric)", "CAST('" + lo.Text('f', 1075) + "' AS numeric)"
}()

// textExpr is the SQL of a text column as it is stored (missing cells are
// told in Go, by isMissing).
func (s *Session) textExpr(col string) (string, error) {
	if !slices.Contains(s.Names, col) {
		return "", &Error{File: s.q.err("").File, Column: col, Msg: "the result has no such column: correct the study or the query"}
	}
	if s.kinds[col] == pgOther {
		// Refused as when the rows are fetched (ReadQuery): a cast to
		// text grouped by a money, uuid, enum or json column's text where
		// the same rows below max_rows failed (found by a sweep of column
		// types).
		return "", &Error{File: s.q.err("").File, Column: col, Msg: notRead(s.typeName(col), col)}
	}
	c := "bivar_q." + pgx.Identifier{col}.Sanitize()
	// The text the rows fetched below max_rows are read in (the type's
	// output function): a cast to text writes a boolean true/false where
	// its output is t/f, and drops a character(n)'s padding.
	switch s.oids[slices.Index(s.Names, col)] {
	case 16: // boolean
		return "CAST(boolout(" + c + ") AS text)", nil
	case 1042: // character(n)
		return "CAST(bpcharout(" + c + ") AS text)", nil
	}
	return "CAST(" + c + " AS text)", nil
}

// isMissing says whether a text cell is missing: NULL, or one of the
// missing tokens after trimming spaces (as PostgreSQL's btrim does).
func isMissing(v any, missing []string) bool {
	if v == nil {
		return true
	}
	return slices.Contains(missing, strings.Trim(Text(v), " "))
}

// fence ends a derived table whose computed columns several expressions
// read: PostgreSQL's planner otherwise merges the subquery into the outer
// query and evaluates a column's expression once for every reference to it
// (OFFSET 0 is standard SQL, and PostgreSQL does not merge a subquery that
// has one; a zero offset does not keep the planner from parallel plans).
const fence = " OFFSET 0"

// finite is the SQL test that a double precision value is a number:
// PostgreSQL sorts NaN above every number and Infinity, so NaN, Infinity
// and −Infinity all fail it, and NULL gives NULL.
func finite(e string) string { return "abs(" + e + ") < 'Infinity'::float8" }

// lit writes a float64 as an SQL double precision literal that reads back
// to the same value.
func lit(v float64) string {
	return "CAST('" + strconv.FormatFloat(v, 'g', -1, 64) + "' AS double precision)"
}

// textLit writes an SQL string literal.
func textLit(v string) string { return "'" + strings.ReplaceAll(v, "'", "''") + "'" }

// Prepared is a study's rows as SQL. Its numeric columns are named x, y,
// c0… (the covariates) and o (the run order) in NumCols order; the group
// is g and the id is id, both as stored, text.
type Prepared struct {
	s       *Session
	spec    Spec
	num     []string // SQL of each numeric column over bivar_q, NumCols order
	group   string   // SQL of the group over bivar_q, "" without one
	id      string   // SQL of the id over bivar_q, "" without one
	NumCols []string // SQL names of the numeric columns: x, y, c0…, o
	Names   []string // their column names in the query's result
	// gNot lists the stored group values that are missing tokens (after
	// trimming), found by First: the later passes leave their rows out.
	gNot []string
	// part, when not "", restricts p's rows to a part of them (Part).
	part string
}

// Prepare builds the study's row sources.
func (s *Session) Prepare(spec Spec) (*Prepared, error) {
	p := &Prepared{s: s, spec: spec}
	add := func(col, as string) error {
		e, err := s.numExpr(col)
		if err != nil {
			return err
		}
		p.num = append(p.num, e)
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
	if spec.Group != "" {
		e, err := s.textExpr(spec.Group)
		if err != nil {
			return nil, err
		}
		p.group = e
	}
	if spec.ID != "" {
		e, err := s.textExpr(spec.ID)
		if err != nil {
			return nil, err
		}
		p.id = e
	}
	return p, nil
}

// On is p on the session s (a Fork of p's).
func (p *Prepared) On(s *Session) *Prepared {
	c := *p
	c.s = s
	return &c
}

// Part is p on the session s (p's own or a Fork of it) restricted to the
// complete cases whose x lies below cut (upper false) or not below it
// (upper true): the two parts hold every complete case once, so a pass
// run on both, each on its own server process and each summing its rows
// in one order, gives in Go what it gives on all the rows (see
// runParts). The cut comes from the values, never from where rows lie in
// the table, so the same rows give the same parts and the same sums on
// any run. The test calls float8lt, the function of the operator <,
// which no index matches: written x < cut, it let the planner read a part
// through an index on x, in order of x once an ANALYZE showed x to follow
// the table's order, and in the table's order before, so the cells' sums
// changed in their last digits between two runs on the same rows
// (TestPushdownRerunIndexedX; found by an independent review). The
// complete cases' x are finite, so the two parts hold each once.
func (p *Prepared) Part(s *Session, cut float64, upper bool) *Prepared {
	c := p.On(s)
	c.part = "float8lt(" + p.num[0] + ", " + lit(cut) + ")"
	if upper {
		c.part = "NOT (" + c.part + ")"
	}
	return c
}

// runParts runs the statement build gives for each of parts (Part; p
// alone when there are none) and hands every row of the results to
// handle as it arrives. Parts on different sessions run at once, each on
// its own server process, and their rows reach handle one at a time, in
// the order they arrive; parts on one session (when the server could not
// share its snapshot) run one after the other, with the same statements.
// So handle must give the same result in any order of the rows, as it
// must for one statement already: the server returns groups in the order
// of its hash table, which depends on its plan.
func (p *Prepared) runParts(parts []*Prepared, build func(q *Prepared) string, handle func(v []any) error) error {
	if len(parts) == 0 {
		return p.s.each(build(p), handle)
	}
	apart := true // every part on a session of its own
	for i, q := range parts {
		for _, o := range parts[:i] {
			apart = apart && o.s != q.s
		}
	}
	if !apart {
		for _, q := range parts {
			if err := q.s.each(build(q), handle); err != nil {
				return err
			}
		}
		return nil
	}
	var mu sync.Mutex
	one := func(v []any) error {
		mu.Lock()
		defer mu.Unlock()
		return handle(v)
	}
	errs := make([]error, len(parts))
	var wg sync.WaitGroup
	for i, q := range parts {
		wg.Go(func() { errs[i] = q.s.each(build(q), one) })
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return err // the first part's error, whichever failed first
		}
	}
	return nil
}

// from is the FROM clause of the query's rows.
func (p *Prepared) from() string { return " FROM (" + p.s.inner + "\n) AS bivar_q" }

// cols is the SELECT list of the study's columns under their SQL names
// (the id only when withID).
func (p *Prepared) cols(withID bool) string {
	var sel []string
	for i, c := range p.num {
		sel = append(sel, c+" AS "+p.NumCols[i])
	}
	if p.group != "" {
		sel = append(sel, p.group+" AS g")
	}
	if withID && p.id != "" {
		sel = append(sel, p.id+" AS id")
	}
	return strings.Join(sel, ", ")
}

// complete is the SQL condition, over bivar_q, that a row is a complete
// case: every numeric column finite, the group neither NULL nor missing.
func (p *Prepared) complete() string {
	var cond []string
	for _, c := range p.num {
		cond = append(cond, finite(c))
	}
	if p.part != "" {
		cond = append(cond, p.part)
	}
	if p.group != "" {
		// num_nonnulls, not IS NOT NULL: no index serves it (see Part on
		// why a scan in an index's order would move the sums' last digits).
		cond = append(cond, "num_nonnulls("+p.group+") = 1")
		if len(p.gNot) > 0 {
			lits := make([]string, len(p.gNot))
			for i, v := range p.gNot {
				lits[i] = textLit(v)
			}
			cond = append(cond, p.group+" NOT IN ("+strings.Join(lits, ", ")+")")
		}
	}
	return strings.Join(cond, " AND ")
}

// numericOK is the SQL condition that every numeric column is finite.
func (p *Prepared) numericOK() string {
	var cond []string
	for _, c := range p.num {
		cond = append(cond, finite(c))
	}
	return strings.Join(cond, " AND ")
}

// Counts are a study's row counts over every row of the query.
type Counts struct {
	Rows, Complete int
	// Missing and NonNumeric count per numeric column (NumCols order) the
	// NULL cells and the cells that are NaN or infinite; GroupMissing the
	// rows whose group is NULL or a missing token.
	Missing, NonNumeric []int
	GroupMissing        int
	// Mean, Min and Max of each numeric column over the complete cases:
	// the means are the first pass's (see Moments for the corrected ones).
	Mean, Min, Max []float64
	// Sxx, Syy and Sxy are the centred sums of x and y over the complete
	// cases by the regression aggregates, pooled over the group levels.
	Sxx, Syy, Sxy float64
	// Print is the dataset's hash, when First was asked for it.
	Print *Print
}

// GroupSums are one group level's count, means, x range and centred sums.
type GroupSums struct {
	Level         string
	N             int
	MX, MY        float64
	XMin, XMax    float64
	Sxx, Syy, Sxy float64
	// RSS is the residual sum of squares of the level's own line, from
	// the second pass's sums of the residuals of the level's first-pass
	// line (NaN before it): Syy − Sxy²/Sxx from the centred sums cancels
	// all but the rounding of Syy where the level's rows lie on a line,
	// and put a slope interval of ±2.7e-7 about 1 where in memory the
	// residuals, summed row by row, give ±7e-15 (x = 0.1, 0.2, 0.4 and
	// y = 2 + x; TestPushdownGroupExactLine).
	RSS float64
	// OX and OY are the level's means less the dataset's first-pass
	// means, from the second pass's deviations (Sums.Groups): the levels'
	// means differ from each other in digits that MX and MY, far from 0,
	// lose.
	OX, OY float64
}

// slope is the level's slope Sxy/Sxx, 0 where that is not a number
// (Sxx rounded to 0).
func (g GroupSums) slope() float64 {
	b := g.Sxy / g.Sxx
	if math.IsNaN(b) || math.IsInf(b, 0) {
		return 0
	}
	return b
}

// First runs the first pass: per stored group value (one row without a
// group), the counts of all rows and, over the rows whose numeric columns
// are finite, the minima, maxima and means of each numeric column and the
// regression aggregates of y on x; Go tells the missing group values,
// pools the levels (Chan et al. 1983, eq. 2.1) and checks maxLevels. The
// levels are in sorted order (byte order).
//
// With print (the columns whose NULL cells the dataset reports; nil for
// none), the same scan computes the dataset's hash as Fingerprint does,
// the sum of the row hashes per group added up exactly in Go, into
// Counts.Print: the dataset then needs no scan of its own for it. On
// 10⁷ rows (scripts/pushdown-bench.sh, medians of three alternating runs)
// that scan took 1.65 s of the server's CPU and this pass 2.61 s; this
// pass with the hash (and sum for avg, below) took 3.18 s.
func (p *Prepared) First(maxLevels int, print []string) (*Counts, []GroupSums, error) {
	k := len(p.NumCols)
	sel := []string{}
	if p.group != "" {
		sel = append(sel, "g")
	} else {
		sel = append(sel, "CAST(NULL AS text)")
	}
	sel = append(sel, "count(*)", "count(*) FILTER (WHERE bivar_ok)")
	for _, c := range p.NumCols {
		sel = append(sel, "count(*) - count("+c+")", "count(*) FILTER (WHERE NOT "+finite(c)+")")
	}
	f := " FILTER (WHERE bivar_ok)"
	for _, c := range p.NumCols {
		sel = append(sel, "min("+c+")"+f, "max("+c+")"+f)
	}
	sel = append(sel, "regr_avgx(y, x)"+f, "regr_avgy(y, x)"+f, "regr_sxx(y, x)"+f, "regr_syy(y, x)"+f, "regr_sxy(y, x)"+f)
	// The covariates' and the order's means as Σ/n in Go: avg(float8)
	// keeps the same plain sum Σ (float8_accum, with a sum of squares this
	// pass does not need, in an array), so the mean is the same to the
	// last digit, for less of the server's time.
	for _, c := range p.NumCols[2:] {
		sel = append(sel, "sum("+c+")"+f)
	}
	inner := p.cols(false) + ", " + p.numericOK() + " AS bivar_ok"
	// Where each of the print's columns gets its NULL count: absent from
	// the result; the group (the NULL group's rows); numeric column i
	// (Missing[i]); or an aggregate of its own, column at of the result.
	type printCol struct {
		absent, group bool
		i, at         int
	}
	printAt := len(sel)
	var pcs []printCol
	if print != nil {
		sel = append(sel, "sum(bivar_h)::text")
		inner += ", " + p.s.rowHash() + " AS bivar_h"
		for _, name := range print {
			pc := printCol{i: slices.Index(p.Names, name)}
			switch {
			case !slices.Contains(p.s.Names, name):
				pc.absent = true
			case pc.i >= 0:
			case p.group != "" && name == p.spec.Group:
				pc.group = true
			default:
				pc.at = len(sel)
				m := "bivar_m" + strconv.Itoa(pc.at)
				inner += ", bivar_q." + pgx.Identifier{name}.Sanitize() + " AS " + m
				sel = append(sel, "count(*) - count("+m+")")
			}
			pcs = append(pcs, pc)
		}
	}
	stmt := "SELECT " + strings.Join(sel, ", ") + " FROM (SELECT " + inner + p.from() + fence + ") AS bivar_k"
	limit := maxLevels + len(p.spec.Missing) + 2
	if p.group != "" {
		stmt += " GROUP BY g LIMIT " + strconv.Itoa(limit)
	}
	r, err := p.s.rows(stmt)
	if err != nil {
		return nil, nil, err
	}
	c := &Counts{Missing: make([]int, k), NonNumeric: make([]int, k), Mean: make([]float64, k), Min: make([]float64, k), Max: make([]float64, k)}
	for i := range k {
		c.Min[i], c.Max[i] = math.Inf(1), math.Inf(-1)
	}
	var levels []GroupSums
	var pooled struct{ n, mx, my, sxx, syy, sxy float64 }
	sumMean := make([]float64, k) // Σ n·mean of the covariates and the order
	var hashSum big.Int
	extra := make([]int, len(sel)) // the print's own NULL counts, by result column
	nullGroup := 0
	// The levels pooled in order of their stored value (NULL first), not
	// in the order the server returns them, which depends on its plan and
	// so on the table's statistics (TestPushdownRerun).
	slices.SortStableFunc(r, func(a, b []any) int {
		switch {
		case a[0] == nil && b[0] == nil:
			return 0
		case a[0] == nil:
			return -1
		case b[0] == nil:
			return 1
		}
		return strings.Compare(Text(a[0]), Text(b[0]))
	})
	for _, v := range r {
		rows, ok := int(Num(v[1])), int(Num(v[2]))
		c.Rows += rows
		if print != nil {
			if t := Text(v[printAt]); t != "" {
				var h big.Int
				if _, ok := h.SetString(t, 10); !ok {
					return nil, nil, p.s.q.err("the server's sum of the row hashes, %q, is not an integer", t)
				}
				hashSum.Add(&hashSum, &h)
			}
			for i := printAt + 1; i < len(sel); i++ {
				extra[i] += int(Num(v[i]))
			}
			if v[0] == nil {
				nullGroup += rows
			}
		}
		j := 3
		for i := range k {
			c.Missing[i] += int(Num(v[j]))
			c.NonNumeric[i] += int(Num(v[j+1]))
			j += 2
		}
		if p.group != "" && isMissing(v[0], p.spec.Missing) {
			c.GroupMissing += rows
			if v[0] != nil {
				p.gNot = append(p.gNot, Text(v[0]))
			}
			continue
		}
		if ok == 0 {
			continue
		}
		c.Complete += ok
		for i := range k {
			c.Min[i] = math.Min(c.Min[i], Num(v[j]))
			c.Max[i] = math.Max(c.Max[i], Num(v[j+1]))
			j += 2
		}
		g := GroupSums{Level: Text(v[0]), N: ok, MX: Num(v[j]), MY: Num(v[j+1]), XMin: Num(v[3+2*k]), XMax: Num(v[4+2*k]),
			Sxx: Num(v[j+2]), Syy: Num(v[j+3]), Sxy: Num(v[j+4]), RSS: math.NaN()}
		j += 5
		for i := 2; i < k; i++ {
			sumMean[i] += float64(ok) * (Num(v[j]) / float64(ok))
			j++
		}
		levels = append(levels, g)
		// Chan et al.'s pairwise update of the pooled moments.
		nb := float64(ok)
		n := pooled.n + nb
		dx, dy := g.MX-pooled.mx, g.MY-pooled.my
		w := pooled.n * nb / n
		pooled.sxx += g.Sxx + w*dx*dx
		pooled.syy += g.Syy + w*dy*dy
		pooled.sxy += g.Sxy + w*dx*dy
		pooled.mx += dx * nb / n
		pooled.my += dy * nb / n
		pooled.n = n
	}
	if p.group != "" && (len(r) >= limit || len(levels) > maxLevels) {
		return nil, nil, &Error{File: p.s.q.err("").File, Column: p.spec.Group, Msg: fmt.Sprintf("a group column may hold at most %d distinct values, and this one holds more: group by another column, or raise max_levels for the dataset", maxLevels)}
	}
	c.Mean[0], c.Mean[1] = pooled.mx, pooled.my
	c.Sxx, c.Syy, c.Sxy = pooled.sxx, pooled.syy, pooled.sxy
	for i := 2; i < k; i++ {
		c.Mean[i] = sumMean[i] / float64(c.Complete)
	}
	slices.SortFunc(levels, func(a, b GroupSums) int { return strings.Compare(a.Level, b.Level) })
	if p.group == "" {
		levels = nil
	}
	if print != nil {
		c.Print = &Print{Rows: c.Rows, Text: fmt.Sprintf("%d %s", c.Rows, hashSum.String()), Statement: stmt}
		for _, pc := range pcs {
			switch {
			case pc.absent:
				c.Print.Missing = append(c.Print.Missing, -1)
			case pc.group:
				c.Print.Missing = append(c.Print.Missing, nullGroup)
			case pc.i >= 0:
				c.Print.Missing = append(c.Print.Missing, c.Missing[pc.i])
			default:
				c.Print.Missing = append(c.Print.Missing, extra[pc.at])
			}
		}
	}
	return c, levels, nil
}

// Sums are the second pass: over the complete cases, sums of the
// deviations d_c = c − m_c from the first pass's means m, of their
// products and powers, and of the residuals e = d_y − B·d_x of the
// first pass's line.
type Sums struct {
	// D[i] = Σ d_i; P[i][j] = Σ d_i·d_j for the pairs the study uses (x
	// and y with each other and with each covariate, each covariate with
	// itself), NaN for the others (NumCols order).
	D []float64
	P [][]float64
	// X3 = Σ d_x³, X4 = Σ d_x⁴.
	X3, X4 float64
	// SE = Σe, SE2 = Σe², SXE = Σ d_x·e, SX2E = Σ d_x²·e.
	SE, SE2, SXE, SX2E float64
	// SE3 = Σe³, SE4 = Σe⁴, SXE2 = Σ d_x·e², SXE3 = Σ d_x·e³
	// (Breusch–Pagan).
	SE3, SE4, SXE2, SXE3 float64
	// SX2E2 = Σ d_x²·e², SX3E = Σ d_x³·e (Breusch–Pagan's fourth powers
	// of the refined line's residuals, exactly).
	SX2E2, SX3E float64
	// With a run order, d_o its deviation from the first pass's mean:
	// SO = Σ d_o, SOO = Σ d_o², SOE = Σ d_o·e, SOX = Σ d_o·d_x.
	SO, SOO, SOE, SOX float64
	EMin, EMax        float64
	// AtEnds counts the rows whose x is the least and the largest x (the
	// ends Second was given).
	AtEnds [2]int
	// Groups are the levels' means and centred sums of x and y by the
	// same corrected two-pass algorithm about each level's first-pass
	// means (Second's levels, in their order; nil without them).
	Groups []GroupSums
}

// Second runs the second pass with the first pass's means and slope b.
// It also counts the rows at each of the ends, the least and the largest
// x (Sums.AtEnds): x takes only those two values when the counts
// add up to the complete cases, and a value held by one row gives that
// row leverage 1 (sole support; see Fit.Sole).
//
// With levels (the first pass's, with a group), the same scan sums each
// level's deviations from its own first-pass means, grouped by the level
// (the overall sums are then added up over the levels in Go), into
// Sums.Groups: the first pass's regression aggregates lose digits where
// x̄ or ȳ is far from 0 (with x near 10⁹ and a spread of 1, a level's
// slope by parts in 10⁸ and the F of the slopes' comparison by 2.5·10⁻⁶,
// TestPushdownAdversarial).
//
// With lo (nil for none), each mean is in two parts, mean[i] + lo[i], and
// a deviation is (c − mean[i]) − lo[i], as the third pass's (Fit.MXLo):
// where the mean falls between two float64 (x a bigint near 2⁵³), the
// deviations otherwise share its rounding, and Σe² holds n times its
// square.
func (p *Prepared) Second(mean, lo []float64, b float64, ends [2]float64, levels []GroupSums) (*Sums, error) {
	k := len(p.NumCols)
	nc := k
	if p.spec.Order != "" {
		nc-- // the order's sums are the third pass's
	}
	devOf := func(i int) string {
		if lo == nil {
			return deviation(p.num[i], mean[i], 0)
		}
		return deviation(p.num[i], mean[i], lo[i])
	}
	var dev []string
	for i := range nc {
		dev = append(dev, devOf(i)+" AS d"+strconv.Itoa(i))
	}
	dev = append(dev, "("+devOf(1)+" - "+lit(b)+" * "+devOf(0)+") AS e")
	if p.spec.Order != "" {
		dev = append(dev, devOf(k-1)+" AS dord")
	}
	dev = append(dev, p.num[0]+" AS xv")
	d := func(i int) string { return "d" + strconv.Itoa(i) }
	var sel []string
	var pairs []sumPair
	for i := range nc {
		sel = append(sel, "sum("+d(i)+")")
	}
	for i := range nc {
		for j := i; j < nc; j++ {
			if i <= 1 || i == j {
				sel = append(sel, "sum("+d(i)+" * "+d(j)+")")
				pairs = append(pairs, sumPair{i, j})
			}
		}
	}
	sel = append(sel, "sum((d0 * d0) * d0)", "sum((d0 * d0) * (d0 * d0))", "sum(e)", "sum(e * e)", "sum(d0 * e)", "sum((d0 * d0) * e)", "min(e)", "max(e)",
		"sum((e * e) * e)", "sum((e * e) * (e * e))", "sum(d0 * (e * e))", "sum(d0 * ((e * e) * e))", "sum((d0 * d0) * (e * e))", "sum(((d0 * d0) * d0) * e)")
	if p.spec.Order != "" {
		sel = append(sel, "sum(dord)", "sum(dord * dord)", "sum(dord * e)", "sum(dord * d0)")
	} else {
		sel = append(sel, "0", "0", "0", "0")
	}
	sel = append(sel, "count(*) FILTER (WHERE xv = "+lit(ends[0])+")", "count(*) FILTER (WHERE xv = "+lit(ends[1])+")")
	from, group := p.from(), ""
	grouped := p.group != "" && len(levels) > 0
	if grouped {
		vals := make([]string, len(levels))
		for i, l := range levels {
			vals[i] = "(" + textLit(l.Level) + ", " + lit(l.MX) + ", " + lit(l.MY) + ", " + lit(l.slope()) + ")"
		}
		from += " JOIN (VALUES " + strings.Join(vals, ", ") + ") AS bivar_gm(lv, mx, my, b) ON " + p.group + " = bivar_gm.lv"
		gx, gy := "("+p.num[0]+" - bivar_gm.mx)", "("+p.num[1]+" - bivar_gm.my)"
		dev = append(dev, "bivar_gm.lv AS g", gx+" AS gx", gy+" AS gy", "("+gy+" - bivar_gm.b * "+gx+") AS ge")
		sel = append(sel, "g", "count(*)", "sum(gx)", "sum(gy)", "sum(gx * gx)", "sum(gy * gy)", "sum(gx * gy)", "sum(ge * ge)")
		group = " GROUP BY g"
	}
	stmt := "SELECT " + strings.Join(sel, ", ") + " FROM (SELECT " + strings.Join(dev, ", ") + from + " WHERE " + p.complete() + fence + ") AS bivar_d" + group
	var r [][]any
	var err error
	if grouped {
		r, err = p.s.hashJoined(stmt)
	} else {
		r, err = p.s.rows(stmt)
	}
	if err != nil {
		return nil, err
	}
	if !grouped {
		return p.secondSums(r[0], k, nc, pairs)
	}
	// The overall sums added up over the levels in their order (so that
	// the figures do not depend on the order the server returns them), the
	// extremes and the counts at the ends combined.
	at := map[string]int{}
	for i, l := range levels {
		at[l.Level] = i
	}
	g := len(sel) - 8
	byLevel := make([][]any, len(levels))
	for _, v := range r {
		i, ok := at[Text(v[g])]
		if !ok || byLevel[i] != nil {
			return nil, p.s.q.err("the second pass returned group level %q, which the first did not", Text(v[g]))
		}
		byLevel[i] = v
	}
	var s *Sums
	groups := slices.Clone(levels)
	for i, v := range byLevel {
		if v == nil {
			return nil, p.s.q.err("the second pass returned no rows of group level %q", levels[i].Level)
		}
		o, err := p.secondSums(v, k, nc, pairs)
		if err != nil {
			return nil, err
		}
		if s == nil {
			s = o
		} else {
			for i := range k {
				s.D[i] += o.D[i]
				for j := range k {
					s.P[i][j] += o.P[i][j]
				}
			}
			s.X3, s.X4, s.SE, s.SE2, s.SXE, s.SX2E = s.X3+o.X3, s.X4+o.X4, s.SE+o.SE, s.SE2+o.SE2, s.SXE+o.SXE, s.SX2E+o.SX2E
			s.SE3, s.SE4, s.SXE2, s.SXE3 = s.SE3+o.SE3, s.SE4+o.SE4, s.SXE2+o.SXE2, s.SXE3+o.SXE3
			s.SX2E2, s.SX3E = s.SX2E2+o.SX2E2, s.SX3E+o.SX3E
			s.SO, s.SOO, s.SOE, s.SOX = s.SO+o.SO, s.SOO+o.SOO, s.SOE+o.SOE, s.SOX+o.SOX
			s.EMin, s.EMax = math.Min(s.EMin, o.EMin), math.Max(s.EMax, o.EMax)
			s.AtEnds[0], s.AtEnds[1] = s.AtEnds[0]+o.AtEnds[0], s.AtEnds[1]+o.AtEnds[1]
		}
		// The level's sums about its own first-pass means, and its means'
		// offsets from the dataset's (Σ d_x, Σ d_y over the level).
		l := &groups[i]
		nf := Num(v[g+1])
		l.OX, l.OY = o.D[0]/nf, o.D[1]/nf
		sx, sy := Num(v[g+2]), Num(v[g+3])
		l.MX, l.MY = l.MX+sx/nf, l.MY+sy/nf
		l.Sxx, l.Syy, l.Sxy = Num(v[g+4])-sx*sx/nf, Num(v[g+5])-sy*sy/nf, Num(v[g+6])-sx*sy/nf
		// The level's RSS from the residuals ge = gy − bl·gx of its
		// first-pass line (slope bl), as the dataset's (see analysis's
		// pushdown): RSS = Σ(ge − ḡe)² − (Σ(gx − ḡx)(ge − ḡe))²/Sxx. Of
		// ge only Σge² is summed: Σge = Σgy − bl·Σgx and Σgx·ge = Σgx·gy −
		// bl·Σgx² are near 0 where bl is near the level's slope, and their
		// rounding, some ε·√(Sxx·Syy), enters squared (ε²·Syy). With the
		// one sum more the pass took 898 ms against 887 ms (least of ten
		// alternating runs in psql; medians 1114 and 1027 ms on a shared
		// machine) on the 10⁶ rows of scripts/pushdown-bench.sh with its
		// group; with all three sums of ge, 857 ms of CPU against 701 ms.
		bl := levels[i].slope()
		se := sy - bl*sx
		sue := (Num(v[g+6]) - bl*Num(v[g+4])) - sx*se/nf
		l.RSS = math.Max(0, (Num(v[g+7])-se*se/nf)-sue*sue/l.Sxx)
	}
	s.Groups = groups
	return s, nil
}

// sumPair is a pair of numeric columns (NumCols indices) whose sum of
// products the second pass returns.
type sumPair struct{ i, j int }

// secondSums reads one row of the second pass's sums.
func (p *Prepared) secondSums(v []any, k, nc int, pairs []sumPair) (*Sums, error) {
	s := &Sums{D: make([]float64, k), P: make([][]float64, k)}
	for i := range k {
		s.P[i] = make([]float64, k)
		for j := range k {
			s.P[i][j] = math.NaN()
		}
		s.D[i] = math.NaN()
	}
	n := 0
	for i := range nc {
		s.D[i] = Num(v[n])
		n++
	}
	for _, pr := range pairs {
		s.P[pr.i][pr.j] = Num(v[n])
		s.P[pr.j][pr.i] = s.P[pr.i][pr.j]
		n++
	}
	s.X3, s.X4, s.SE, s.SE2, s.SXE, s.SX2E, s.EMin, s.EMax = Num(v[n]), Num(v[n+1]), Num(v[n+2]), Num(v[n+3]), Num(v[n+4]), Num(v[n+5]), Num(v[n+6]), Num(v[n+7])
	s.SE3, s.SE4, s.SXE2, s.SXE3 = Num(v[n+8]), Num(v[n+9]), Num(v[n+10]), Num(v[n+11])
	s.SX2E2, s.SX3E = Num(v[n+12]), Num(v[n+13])
	s.SO, s.SOO, s.SOE, s.SOX = Num(v[n+14]), Num(v[n+15]), Num(v[n+16]), Num(v[n+17])
	s.AtEnds = [2]int{int(Num(v[n+18])), int(Num(v[n+19]))}
	return s, nil
}

// Fit is the refined straight line and the quadratic as SQL evaluates
// them, with the constants of the row-wise influence measures (see
// stats.LineInfluence.At for the formulas): the line's deviations are
// dx = (x − MX) − MXLo, dy = (y − MY) − MYLo, its residual e = dy − B·dx;
// the quadratic's residual ((y − QY) − QYLo) − (Q0 + Q1·t + Q2·t²) with
// t = ((x − QX) − QXLo)/QS.
type Fit struct {
	N          int
	MX, MY, B  float64
	MXLo, MYLo float64 // low parts of the means

	QX, QY, Q0, Q1, Q2, QS float64
	QXLo, QYLo             float64 // low parts of QX and QY
	Quad                   bool

	Sxx, Syy, Sxy  float64
	RSS, S         float64 // S = √(RSS/(n − 2))
	Outlier, Cooks float64 // the cut points (+Inf: off)
	Leverage       float64
	// Sole, when set, is the x held by one row only while every other
	// row holds one other x: that row has leverage exactly 1 (sole
	// support), found from the counts and not from a rounded h, as
	// stats.LineInfluence finds it in memory. The third pass gives it
	// h = 1 and 1 − h = 0 (so no residual measure and no leave-one-out
	// figure), flags it high leverage and sole support, and returns it.
	Sole *float64
}

// dx and dy are the line's deviations over bivar_q's columns.
func (p *Prepared) dx(f Fit) string { return deviation(p.num[0], f.MX, f.MXLo) }

func (p *Prepared) dy(f Fit) string { return deviation(p.num[1], f.MY, f.MYLo) }

// deviation is the SQL of e's deviation from a value held in two parts,
// hi + lo: (e − hi) − lo, the second step left out where lo is 0 (it
// would change no digit). The passes' deviations from the means, the
// line's and the quadratic's, are all written by it.
func deviation(e string, hi, lo float64) string {
	d := "(" + e + " - " + lit(hi) + ")"
	if lo != 0 {
		d = "(" + d + " - " + lit(lo) + ")"
	}
	return d
}

// rowsLine is the derived table of the complete cases with the study's
// columns (the id when asked), the line's dx, dy and
// e, and the leverage h and 1 − h (omh) (see stats.LineInfluence.At for
// the formulas), each computed once per row.
func (p *Prepared) rowsLine(f Fit, withID bool) string {
	sel := p.cols(withID)
	dx, dy := p.dx(f), p.dy(f)
	h, omh := p.leverage(f)
	return "(SELECT " + sel + ", " + dx + " AS dx, " + dy + " AS dy, " + f.resid(dx, dy) + " AS e, " +
		h + " AS h, " + omh + " AS omh" + p.from() + " WHERE " + p.complete() + fence + ") AS bivar_e"
}

// The row-wise measures as SQL over the SQL of their inputs, written in
// one place so that the third pass (over its derived table's columns)
// and the fetch of the extremes (over the expressions themselves) compute
// them by the same operations and agree to the last digit: resid is the
// line's residual e = dy − B·dx, studentized its studentized residual
// e/(s·√(1 − h)), and cooks Cook's distance from it, ri²·h/(2·(1 − h)).
func (f Fit) resid(dx, dy string) string {
	return "((" + dy + ") - " + lit(f.B) + " * (" + dx + "))"
}

func (f Fit) studentized(e, omh string) string {
	return "((" + e + ") / nullif(" + lit(f.S) + " * sqrt(" + omh + "), 0))"
}

func cooks(ri, h, omh string) string {
	return "((" + ri + ") * (" + ri + ") * (" + h + ") / nullif(2 * (" + omh + "), 0))"
}

// leverage is the SQL of a row's leverage h and of 1 − h over bivar_q's
// columns, 1 − h formed without adding 1/n first; a row of sole support
// (Fit.Sole) has h = 1 and 1 − h = 0 exactly.
func (p *Prepared) leverage(f Fit) (h, omh string) {
	nf := float64(f.N)
	dx := p.dx(f)
	q := "(" + dx + " * " + dx + " / " + lit(f.Sxx) + ")"
	h = "least(1, " + lit(1/nf) + " + " + q + ")"
	omh = "greatest(0, " + lit((nf-1)/nf) + " - " + q + ")"
	if f.Sole != nil {
		sole := p.num[0] + " = " + lit(*f.Sole)
		h = "CASE WHEN " + sole + " THEN 1 ELSE " + h + " END"
		omh = "CASE WHEN " + sole + " THEN 0 ELSE " + omh + " END"
	}
	return h, omh
}

// loor is the SQL of the leave-one-out r over the line's deviations dx,
// dy and 1 − h (omh), from downdated sums as stats.corrFromSums.
func (f Fit) loor(dx, dy, omh string) string {
	nf := float64(f.N)
	c := lit(nf / (nf - 1))
	// Unclamped (the caller clamps to [−1, 1] as stats.corrFromSums does:
	// clampR, clampedIs).
	return "(" + lit(f.Sxy) + " - " + c + " * " + dx + " * " + dy + ") / nullif(sqrt(greatest(0, " + c + " * " + lit(f.Sxx) + " * " + omh + ") * greatest(0, " +
		lit(f.Syy) + " - " + c + " * " + dy + " * " + dy + ")), 0)"
}

// clampR is a correlation clamped to [−1, 1], as stats.corrFromSums
// clamps it (rounding can carry |r| past 1); NaN stays NaN.
func clampR(r float64) float64 {
	switch {
	case r > 1:
		return 1
	case r < -1:
		return -1
	}
	return r
}

// clampedIs is the SQL test that the correlation e, clamped (clampR), is v.
func clampedIs(e string, v float64) string {
	switch v {
	case 1:
		return e + " >= 1"
	case -1:
		return e + " <= -1"
	}
	return e + " = " + lit(v)
}

func cutLit(v float64) string {
	if math.IsInf(v, 1) || math.IsNaN(v) {
		return "CAST('Infinity' AS double precision)"
	}
	return lit(v)
}

// Third are the sums and counts of the third pass, over the complete
// cases with the refined line's residual e.
type Third struct {
	Outlier, HighLeverage, Influential, SoleSupport, Flagged, Suspect int
	MaxD                                                              float64
	LooRMin, LooRMax, LooSMin, LooSMax                                float64
	SQ2                                                               float64 // Σ of the quadratic's squared residuals
	Grids                                                             [3]*Grid
	// Suspects are the rows flagged outlier, influential or sole
	// support, ranked, at most ThirdPass's keep of them.
	Suspects []Row
	// ExtBoxes hold every row whose leave-one-out r is LooRMin or
	// LooRMax: the cells of y on x where those extremes fall, each half a
	// cell wider on every side (open at the grid's edges), so that the
	// rounding of the binning cannot leave a row out; nil when more than
	// extBoxesMax cells hold them.
	ExtBoxes []Box
	// CookBoxes hold, in the same way, every row whose Cook's distance
	// is MaxD (Extremes names one of them).
	CookBoxes []Box
}

// Box is a range of x and y (bounds included; ±Inf for none).
type Box struct{ XLo, XHi, YLo, YHi float64 }

// extBoxesMax bounds the boxes the fetch of the extremes (Extremes)
// tests before it computes a row's leave-one-out r; with more, every
// row's is computed.
const extBoxesMax = 16

// boxOf is the cell (i, j) of the grid g as a Box, half a cell wider on
// every side and open at the grid's edges.
func boxOf(g *Grid, i, j int) Box {
	wx, wy := (g.XHi-g.XLo)/float64(g.NX), (g.YHi-g.YLo)/float64(g.NY)
	b := Box{XLo: g.XLo + (float64(i)-0.5)*wx, XHi: g.XLo + (float64(i)+1.5)*wx, YLo: g.YLo + (float64(j)-0.5)*wy, YHi: g.YLo + (float64(j)+1.5)*wy}
	if i == 0 {
		b.XLo = math.Inf(-1)
	}
	if i == g.NX-1 {
		b.XHi = math.Inf(1)
	}
	if j == 0 {
		b.YLo = math.Inf(-1)
	}
	if j == g.NY-1 {
		b.YHi = math.Inf(1)
	}
	return b
}

// boxesSQL is the SQL condition that the point (x, y) lies in one of bs.
func boxesSQL(x, y string, bs []Box) string {
	var ors []string
	for _, b := range bs {
		var all []string
		for _, c := range []struct {
			e, op string
			v     float64
		}{{x, " >= ", b.XLo}, {x, " <= ", b.XHi}, {y, " >= ", b.YLo}, {y, " <= ", b.YHi}} {
			if !math.IsInf(c.v, 0) {
				all = append(all, c.e+c.op+lit(c.v))
			}
		}
		if len(all) == 0 {
			return "true"
		}
		ors = append(ors, "("+strings.Join(all, " AND ")+")")
	}
	return "(" + strings.Join(ors, " OR ") + ")"
}

// Grid is a density grid's counts: Counts[j*NX+i] rows in cell (i, j).
type Grid struct {
	XLo, XHi, YLo, YHi float64
	NX, NY             int
	Counts             []int
}

// cell is the SQL of the cell of a value e in [lo, hi] split into k
// cells, as analysis.grid bins, before the clamping to 0…k−1 (cellAt,
// in Go): floor((e − lo)·k/(hi − lo)) in double precision. Clamped in
// SQL, by least and greatest, and cast to bigint, the three cells of a
// row took a fifth of the third pass's time on 10⁷ rows (psql, four
// alternating runs each on PostgreSQL 15: 5.1–5.3 s against 4.2–4.4 s
// unclamped, in the grouping of cellKey).
func cell(e string, lo, hi float64, k int) string {
	return "floor((" + e + " - " + lit(lo) + ") * " + lit(float64(k)/(hi-lo)) + ")"
}

// cellAt is the cell of cell's number v among k: v clamped to 0…k−1, as
// analysis.grid clamps (NaN, for NULL, gives 0).
func cellAt(v float64, k int) int {
	switch {
	case !(v > 0):
		return 0
	case v >= float64(k-1):
		return k - 1
	}
	return int(v)
}

// flaggedSQL is the derived table of the complete cases with the
// refined line's row-wise measures (flaggedSQL's columns: those of
// rowsLine, ri the studentized residual, loor and loos the leave-one-out
// r and slope, fo and fd the outlier and influential tests, qr the
// quadratic's residual), the SQL of a row's flags fl (the bits of
// findings.FlagSet) and of the test that a row is flagged outlier,
// influential or sole support, and s2, a row's deleted residual variance.
func (p *Prepared) flaggedSQL(f Fit) (src, fl, isSuspect, s2 string) {
	// The flags without a square root or a division by a row's values:
	// |t| > c ⟺ e² > K₁·(1 − h) with K₁ = c²·RSS/(n − 3 + c²) (from
	// t² = e²/(s₍ᵢ₎²·(1 − h)), s₍ᵢ₎² = (RSS − e²/(1 − h))/(n − 3)), and
	// d > D ⟺ e²·h > K₂·(1 − h)² with K₂ = 2·s²·D (from
	// d = e²·h/(2·s²·(1 − h)²)); a row of leverage 1 (1 − h = 0) is neither.
	nf := float64(f.N)
	k1, k2 := math.Inf(1), math.Inf(1)
	// With n ≤ 3 the deleted residual's SD has no degree of freedom: t is
	// undefined (NULL here, NaN in memory) and flags no row an outlier.
	// A line exact to rounding (S NaN, as stats.NewLineInfluence leaves
	// it in memory) leaves residuals that are rounding: no row is an
	// outlier by them (from an independent review: 13 rows of y = 3 −
	// 7·0.1·x were flagged with t of −7.6).
	if c := f.Outlier; !math.IsInf(c, 1) && !math.IsNaN(c) && f.N > 3 && !math.IsNaN(f.S) {
		k1 = c * c * f.RSS / (nf - 3 + c*c)
	}
	if c := f.Cooks; !math.IsInf(c, 1) && !math.IsNaN(c) {
		k2 = 2 * f.S * f.S * c
	}
	o := "(omh > 0 AND e * e > " + cutLit(k1) + " * omh)"
	d := "(omh > 0 AND (e * e) * h > " + cutLit(k2) + " * (omh * omh))"
	ri := f.studentized("e", "omh")
	s2 = "CAST(NULL AS double precision)"
	if f.N > 3 && !math.IsNaN(f.S) {
		s2 = "greatest(0, (" + lit(f.RSS) + " - e * e / nullif(omh, 0)) / " + lit(nf-3) + ")"
	}
	// The row-wise measures each row needs, once per row (see fence),
	// with the quadratic's residual qr: squared in its sum, it was
	// evaluated twice a row when written out there (computed here, the
	// pass took a median 1.2 s less of the server's CPU on 10⁷ rows in
	// three alternating runs of the statement alone, the figures the same
	// to the last digit).
	var qr string
	if f.Quad {
		dqx, dqy := deviation("x", f.QX, f.QXLo), deviation("y", f.QY, f.QYLo)
		t := "(" + dqx + " / " + lit(f.QS) + ")"
		qr = ", (" + dqy + " - (" + lit(f.Q0) + " + " + lit(f.Q1) + " * " + t + " + " + lit(f.Q2) + " * (" + t + " * " + t + "))) AS qr"
	}
	src = "(SELECT *, " + ri + " AS ri, " + f.loor("dx", "dy", "omh") + " AS loor, " +
		"(" + lit(f.B) + " - dx * e / nullif(" + lit(f.Sxx) + " * omh, 0)) AS loos, " + o + " AS fo, " + d + " AS fd" + qr + " FROM " + p.rowsLine(f, p.id != "") + fence + ") AS bivar_i"
	fl = "(CAST(fo AS integer) + 2 * CAST(h > " + cutLit(f.Leverage) + " AS integer) + 4 * CAST(fd AS integer))"
	isSuspect = "fo OR fd"
	if f.Sole != nil {
		// A row of sole support is flagged high leverage and sole support
		// (8) whatever the cut points, as findings.FlagRules.Flag flags it.
		sole := "x = " + lit(*f.Sole)
		fl = "(CASE WHEN " + sole + " THEN 10 ELSE " + fl + " END)"
		isSuspect += " OR " + sole
	}
	return src, fl, isSuspect, s2
}

// ThirdPass runs the third pass: the rows per flag, the largest Cook's
// distance, the extremes of the leave-one-out r and slope, the quadratic's
// residual sum, the density grids g (y on x, the residual on x and, with
// a run order, the residual on the order) and the rows flagged outlier,
// influential or sole support, all in one scan. Without a run order the
// rows are grouped by one key for the cells of both grids and the flags
// (cellKey), and each group returns its flagged rows' x, y, id, d and t as
// arrays. With one, GROUPING SETS over the grids' cells in two levels
// (twoLevel): the sums and counts are added up over the cells of the first
// set (y on x with the residual on x), which holds every row once, and
// there a flagged row is a group of its own (keyed by its x, y, id, d and
// t), so that the server returns it. Of the flagged rows the keep highest
// ranked are kept (a row of sole support first, then largest Cook's
// distance, then largest |t|, then smallest x, y and id). The cells are
// cell's. With parts (Part), the statement runs on each and their groups
// add up (runParts): a cell the cut divides comes back once from each
// part, its counts added, its extremes the extremes of both, and its two
// sums of squared residuals added with the others in ascending order
// (finish).
func (p *Prepared) ThirdPass(f Fit, g [3]Grid, keep int, parts ...*Prepared) (*Third, error) {
	_, fl, isSuspect, s2 := p.flaggedSQL(f)
	suspect := func(c string) string { return "CASE WHEN " + isSuspect + " THEN " + c + " END" }
	id := "CAST(NULL AS text)"
	if p.id != "" {
		id = "id"
	}
	// Cook's distance from the studentized residual ri (computed once a
	// row above, where it was written out twice): in max() and, for a
	// flagged row only, in its key.
	dist := cooks("ri", "h", "omh")
	keys := []string{suspect("x"), suspect("y"), suspect(id), suspect(dist), suspect("e / nullif(sqrt(" + s2 + ") * sqrt(omh), 0)")}
	a0, b0 := cell("x", g[0].XLo, g[0].XHi, g[0].NX), cell("y", g[0].YLo, g[0].YHi, g[0].NY)
	a1, b1 := cell("x", g[1].XLo, g[1].XHi, g[1].NX), cell("e", g[1].YLo, g[1].YHi, g[1].NY)
	// Both grids are binned on x, so a cell of y on x meets few cells of
	// the residual on x: one set holds both grids.
	set0 := a0 + ", " + b0 + ", " + a1 + ", " + b1 + ", " + fl + ", " + strings.Join(keys, ", ")
	sets := "(" + set0 + ")"
	last := "0, 0"
	var a2, b2 string
	if p.spec.Order != "" {
		a2, b2 = cell("o", g[2].XLo, g[2].XHi, g[2].NX), cell("e", g[2].YLo, g[2].YHi, g[2].NY)
		sets += ", (" + a2 + ", " + b2 + ")"
		last = a2 + ", " + b2
	}
	sel := []string{"GROUPING(" + set0 + ")", "0", a0, b0, a1, b1, last, fl, "count(*)",
		"max(" + dist + ")", "min(loor)", "max(loor)", "min(loos)", "max(loos)"}
	if f.Quad {
		sel = append(sel, "sum(qr * qr)")
	} else {
		sel = append(sel, "CAST(NULL AS double precision)")
	}
	sel = append(sel, keys...)
	// The statement over the rows of q (p or one of parts).
	build := func(q *Prepared) string {
		src, _, _, _ := q.flaggedSQL(f)
		if p.spec.Order != "" {
			return twoLevel(append([]string{a0, b0, a1, b1, fl}, keys...), []string{a2, b2}, dist, sel[len(sel)-len(keys)-1], src)
		}
		// Without a run order: one grouping by a single key (the two
		// grids' cells and the flags), the flagged rows as arrays of
		// their measures (cellKey).
		filter := " FILTER (WHERE " + isSuspect + ")"
		one := []string{cellKey(a0, b0, a1, fl, g), b1, "count(*)", "max(" + dist + ")", "min(loor)", "max(loor)", "min(loos)", "max(loos)", sel[14],
			"array_agg(x)" + filter, "array_agg(y)" + filter, "array_agg(" + id + ")" + filter, "array_agg(" + dist + ")" + filter,
			"array_agg(e / nullif(sqrt(" + s2 + ") * sqrt(omh), 0))" + filter}
		return "SELECT " + strings.Join(one, ", ") + " FROM " + src + " GROUP BY 1, 2"
	}
	th := &Third{MaxD: math.NaN(), LooRMin: math.NaN(), LooRMax: math.NaN(), LooSMin: math.NaN(), LooSMax: math.NaN()}
	for k := range 3 {
		if k == 2 && p.spec.Order == "" {
			continue
		}
		gg := g[k]
		gg.Counts = make([]int, gg.NX*gg.NY)
		th.Grids[k] = &gg
	}
	var sus []ranked
	var sq []float64 // the cells' sums of the quadratic's squared residuals
	var cells []extCell
	// The handler of a group: without a run order, of cellKey's grouping;
	// with one, of twoLevel's.
	var handle func(v []any) error
	if p.spec.Order == "" {
		handle = func(v []any) error {
			i0, j0, i1, j1, fl := splitCellKey(Num(v[0]), Num(v[1]), a0 == a1, g)
			v = v[1:] // the rest as with one grouping column
			n := int(Num(v[1]))
			for k := range 2 {
				i, j := [2]int{i0, i1}[k], [2]int{j0, j1}[k]
				th.Grids[k].Counts[j*th.Grids[k].NX+i] += n
			}
			cells = append(cells, extCell{i0, j0, clampR(Num(v[3])), clampR(Num(v[4])), Num(v[2])})
			th.addFlags(fl, n)
			xs, ys, ids, ds, ts := anys(v[8]), anys(v[9]), anys(v[10]), anys(v[11]), anys(v[12])
			for k := range xs {
				sus = keepRanked(append(sus, p.suspect(xs[k], ys[k], ids[k], ds[k], ts[k], fl)), keep)
			}
			th.addExtremes(v[2:7])
			sq = append(sq, Num(v[7]))
			return nil
		}
	} else {
		handle = func(v []any) error {
			n := int(Num(v[9]))
			if Num(v[0]) != 0 {
				gr := th.Grids[2]
				i, j := cellAt(Num(v[6]), gr.NX), cellAt(Num(v[7]), gr.NY)
				gr.Counts[j*gr.NX+i] += n
				return nil
			}
			var at [2][2]int // the cells (i, j) of both grids
			for k := range 2 {
				gr := th.Grids[k]
				at[k] = [2]int{cellAt(Num(v[2+2*k]), gr.NX), cellAt(Num(v[3+2*k]), gr.NY)}
				gr.Counts[at[k][1]*gr.NX+at[k][0]] += n
			}
			cells = append(cells, extCell{at[0][0], at[0][1], clampR(Num(v[11])), clampR(Num(v[12])), Num(v[10])})
			fl := int(Num(v[8]))
			th.addFlags(fl, n)
			if fl&13 != 0 {
				r := p.suspect(v[16], v[17], v[18], v[19], v[20], fl)
				for range n { // a row repeated n times is n flagged rows
					sus = append(sus, r)
				}
				sus = keepRanked(sus, keep)
			}
			th.addExtremes(v[10:15])
			sq = append(sq, Num(v[15]))
			return nil
		}
	}
	if err := p.runParts(parts, build, handle); err != nil {
		return nil, err
	}
	return th.finish(sq, cells, sus, keep), nil
}

// suspect is a flagged row of the third pass as ranked: its x, y, id,
// Cook's distance and studentized residual as the server returned them,
// and its flags fl.
func (p *Prepared) suspect(x, y, id, d, t any, fl int) ranked {
	noID := p.id == "" || isMissing(id, p.spec.Missing)
	r := ranked{Row: Row{X: Num(x), Y: Num(y), D: Num(d), Flags: uint8(fl)}, noID: noID, d: Num(d), t: Num(t)}
	if fl&8 != 0 { // undefined distance, ranked before all (as in memory)
		r.d = math.Inf(1)
	}
	if !noID {
		r.ID = Text(id)
	}
	return r
}

// keepRanked is sus, cut to its keep highest ranked once it holds more
// than twice as many.
func keepRanked(sus []ranked, keep int) []ranked {
	if len(sus) > 2*keep {
		slices.SortFunc(sus, cmpSuspect)
		sus = sus[:keep]
	}
	return sus
}

// addExtremes takes a group's largest Cook's distance and least and
// largest leave-one-out r and slope (v, as the server returned them) into
// th's, ignoring NaN and NULL as min and max do.
func (th *Third) addExtremes(v []any) {
	lo := func(a, b float64) float64 {
		if math.IsNaN(a) || b < a {
			return b
		}
		return a
	}
	hi := func(a, b float64) float64 {
		if math.IsNaN(a) || b > a {
			return b
		}
		return a
	}
	if x := Num(v[0]); !math.IsNaN(x) {
		th.MaxD = hi(th.MaxD, x)
	}
	if x := clampR(Num(v[1])); !math.IsNaN(x) {
		th.LooRMin = lo(th.LooRMin, x)
	}
	if x := clampR(Num(v[2])); !math.IsNaN(x) {
		th.LooRMax = hi(th.LooRMax, x)
	}
	if x := Num(v[3]); !math.IsNaN(x) {
		th.LooSMin = lo(th.LooSMin, x)
	}
	if x := Num(v[4]); !math.IsNaN(x) {
		th.LooSMax = hi(th.LooSMax, x)
	}
}

// extCell is a group of the third pass in the cell (i, j) of the first
// grid, with the least and the largest leave-one-out r of its rows and
// their largest Cook's distance d.
type extCell struct {
	i, j   int
	lo, hi float64
	d      float64
}

// addFlags counts n rows of flags fl (findings.FlagSet's bits).
func (th *Third) addFlags(fl, n int) {
	if fl&1 != 0 {
		th.Outlier += n
	}
	if fl&2 != 0 {
		th.HighLeverage += n
	}
	if fl&4 != 0 {
		th.Influential += n
	}
	if fl&8 != 0 {
		th.SoleSupport += n
	}
	if fl != 0 {
		th.Flagged += n
	}
	if fl&13 != 0 {
		th.Suspect += n
	}
}

// cellKey is the SQL of one number for a row's cells i0 (x) and j0 (y)
// in the first grid and i1 (x) in the second, and its flags fl (below
// 16): ((i0·(NY₀ + 1) + j0)·(NX₁ + 1) + i1)·16 + fl, with 0 for i1 where
// both grids bin x alike (i0 and i1 the same SQL, as they are when both
// take the range of x), so that the server bins x once. The cells are
// cell's, unclamped: x and y lie within their grids' bounds, the least
// and the largest x and y of the first pass, so that each cell lies in
// 0…k (with k = NX or NY; the last for the largest value, whose cell
// cellAt clamps) and fits its place, and the number, below 2⁵³, is exact
// in double precision. The residual's cell, whose grid has the bounds of
// the second pass's residuals (of the first pass's line) and may lie
// outside them, is a grouping column of its own. Grouping the rows by it
// and collecting the flagged rows' measures in arrays, rather than by the
// four cells, the flags and the five measures of a flagged row as keys
// (the grouping twoLevel does with a run order), took the statement from
// a median 5.8 s of the server's CPU to 4.8 s on the 10⁷ rows of
// scripts/pushdown-bench.sh in a study without a group, run order or
// covariate (five alternating runs of bivar each, PostgreSQL 15,
// log_statement_stats; in psql, the key with i1 binned again took 5.7 s
// against 6.2 s and 5.0 s).
func cellKey(i0, j0, i1, fl string, g [3]Grid) string {
	if i1 == i0 {
		i1 = "0"
	}
	return "(((" + i0 + ") * " + strconv.Itoa(g[0].NY+1) + " + " + j0 + ") * " + strconv.Itoa(g[1].NX+1) + " + " + i1 + ") * 16 + " + fl
}

// splitCellKey is the cells and flags cellKey put in k, and the
// residual's cell from its number e, each clamped (cellAt); sameX says
// that the grids bin x alike (cellKey's i0 and i1 the same).
func splitCellKey(k, e float64, sameX bool, g [3]Grid) (i0, j0, i1, j1, fl int) {
	n := int64(k)
	fl = int(n % 16)
	n /= 16
	i1 = cellAt(float64(n%int64(g[1].NX+1)), g[1].NX)
	n /= int64(g[1].NX + 1)
	j0 = cellAt(float64(n%int64(g[0].NY+1)), g[0].NY)
	i0 = cellAt(float64(n/int64(g[0].NY+1)), g[0].NX)
	if sameX {
		i1 = i0
	}
	return i0, j0, i1, cellAt(e, g[1].NY), fl
}

// anys is an array the server returned, nil for NULL (an array_agg over
// no rows).
func anys(v any) []any {
	a, _ := v.([]any)
	return a
}

// finish adds up what the third pass's groups gave: the quadratic's
// squared residuals (sq, one sum per group), the boxes of the cells that
// hold the leave-one-out extremes, and the keep highest ranked of the
// flagged rows sus.
func (th *Third) finish(sq []float64, cells []extCell, sus []ranked, keep int) *Third {
	// Added in ascending order, not in the order the server returns the
	// cells, which depends on its plan and so on its statistics (an
	// ANALYZE between two runs on the same rows changed the last digits:
	// TestPushdownRerun).
	slices.Sort(sq)
	for _, v := range sq {
		th.SQ2 += v
	}
	add := func(bs []Box, c extCell) []Box {
		if b := boxOf(th.Grids[0], c.i, c.j); !slices.Contains(bs, b) {
			bs = append(bs, b)
		}
		return bs
	}
	for _, c := range cells {
		if c.lo == th.LooRMin || c.hi == th.LooRMax {
			th.ExtBoxes = add(th.ExtBoxes, c)
		}
		if c.d == th.MaxD {
			th.CookBoxes = add(th.CookBoxes, c)
		}
	}
	// In order of their bounds, not in the order the server returns the
	// cells (its hash table's, sized by the planner's estimates), so that
	// the same rows give the same statement for the extremes
	// (TestExtBoxesOrder).
	order := func(bs []Box) []Box {
		if len(bs) > extBoxesMax {
			return nil
		}
		slices.SortFunc(bs, func(a, b Box) int {
			return cmp.Or(cmp.Compare(a.XLo, b.XLo), cmp.Compare(a.YLo, b.YLo), cmp.Compare(a.XHi, b.XHi), cmp.Compare(a.YHi, b.YHi))
		})
		return bs
	}
	th.ExtBoxes, th.CookBoxes = order(th.ExtBoxes), order(th.CookBoxes)
	slices.SortFunc(sus, cmpSuspect)
	th.Suspects = []Row{}
	for _, r := range sus[:min(keep, len(sus))] {
		th.Suspects = append(th.Suspects, r.Row)
	}
	return th
}

// Kept are the moments of the complete cases the third pass does not
// flag outlier, influential or sole support, with whether x or y is
// constant over them.
type Kept struct {
	N              int
	MX, MY         float64
	Sxx, Syy, Sxy  float64
	XConst, YConst bool
}

// WithoutFlagged sums the complete cases that the third pass with f does
// not flag outlier, influential or sole support (the same SQL tells them),
// for the line and r without the flagged rows where taking those rows out
// of the moments (stats.WithoutRows) would cancel digits, as in memory the
// kept rows are then summed: PostgreSQL's regression aggregates over the
// line's deviations from the means (so the kept rows' means and centred
// sums keep their digits far from 0), the means then the line's plus the
// deviations' means.
func (p *Prepared) WithoutFlagged(f Fit) (*Kept, error) {
	src, _, isSuspect, _ := p.flaggedSQL(f)
	r, err := p.s.rows("SELECT count(*), avg(dx), avg(dy), regr_sxx(dy, dx), regr_syy(dy, dx), regr_sxy(dy, dx), min(x) = max(x), min(y) = max(y) FROM " +
		src + " WHERE NOT (" + isSuspect + ")")
	if err != nil {
		return nil, err
	}
	v := r[0]
	k := &Kept{N: int(Num(v[0])), MX: f.MX + (f.MXLo + Num(v[1])), MY: f.MY + (f.MYLo + Num(v[2])),
		Sxx: Num(v[3]), Syy: Num(v[4]), Sxy: Num(v[5])}
	k.XConst, _ = v[6].(bool)
	k.YConst, _ = v[7].(bool)
	return k, nil
}

// LackOfFit is the lack-of-fit test's sums over the complete cases,
// grouped by x (runs of exactly equal x, as stats.LackOfFit groups them):
// the number of levels m, the pure-error sum of squares Σ_g Σ(y − ȳ_g)²
// and the lack-of-fit sum Σ_g n_g·(ȳ_g − ŷ(x_g))², from the refined
// line's residuals e: within a level x is one value, so y − ȳ_g is e − ē_g
// and ȳ_g − ŷ(x_g) is ē_g, and neither is formed from y far from 0. Each
// level's Σ(e − ē_g)² by PostgreSQL's regression aggregate (Youngs and
// Cramer's updating form, see the file's comment), 0 where y is one value
// over the level (the aggregate leaves rounding noise there, which made
// a test of exact replicates reportable where in memory it is not; found
// by an independent review), its ē_g by avg. One
// row comes back whatever the levels; the grouping costs a hash table of
// m entries, so call it where m is known to be small. The levels' sums
// are added in order of x, not in the order the grouping gives them,
// which depends on the plan and so on the table's statistics.
func (p *Prepared) LackOfFit(f Fit) (m int, pureError, lackOfFit float64, err error) {
	r, err := p.s.rows("SELECT count(*), sum(ss ORDER BY x), sum(ng * (me * me) ORDER BY x) FROM (SELECT x, count(*) AS ng, avg(e) AS me, CASE WHEN min(e) = max(e) THEN 0 ELSE regr_syy(e, x) END AS ss FROM " +
		p.rowsLine(f, false) + " GROUP BY x) AS bivar_g")
	if err != nil {
		return 0, 0, 0, err
	}
	return int(Num(r[0][0])), Num(r[0][1]), Num(r[0][2]), nil
}

// twoLevel is the third pass's statement with a run order: the rows
// grouped once by the cells of both sets (k, the first set's keys, and o,
// the cells of the residual on the order: some 10⁵ groups on 10⁷ rows),
// each group's count, extremes and sum sq (the quadratic's squared
// residuals, already summed), and those groups then grouped by the two
// sets, in the columns ThirdPass reads. Grouping the rows by the two
// sets directly updates every sum twice a row: on 10⁷ rows (the table of
// scripts/pushdown-bench.sh, PostgreSQL 15), in five pairs run back to
// back, this took a median 1.3 s less of the server's CPU (7.6 to 11.7 s
// against 9.4 to 13.4 s; the machine's speed drifted between pairs).
// The second level adds each cell's sq in ascending order, not in the
// order the first level's grouping returns the groups, which depends on
// the plan and so on the table's statistics (TestPushdownRerun).
func twoLevel(k, o []string, dist, sq, src string) string {
	var in, ks, ocs []string
	for i, e := range k {
		ks = append(ks, "bivar_k"+strconv.Itoa(i))
		in = append(in, e+" AS "+ks[i])
	}
	for i, e := range o {
		ocs = append(ocs, "bivar_o"+strconv.Itoa(i))
		in = append(in, e+" AS "+ocs[i])
	}
	inner := "SELECT " + strings.Join(in, ", ") + ", count(*) AS n, max(" + dist + ") AS md, min(loor) AS lr0, max(loor) AS lr1, min(loos) AS ls0, max(loos) AS ls1, " +
		sq + " AS sq FROM " + src + " GROUP BY " + strings.Join(append(slices.Clone(k), o...), ", ")
	sel := []string{"GROUPING(" + strings.Join(ks, ", ") + ")", "0", ks[0], ks[1], ks[2], ks[3], ocs[0], ocs[1], ks[4],
		"CAST(sum(n) AS bigint)", "max(md)", "min(lr0)", "max(lr1)", "min(ls0)", "max(ls1)", "sum(sq ORDER BY sq)"}
	sel = append(sel, ks[5:]...)
	return "SELECT " + strings.Join(sel, ", ") + " FROM (" + inner + ") AS bivar_c GROUP BY GROUPING SETS ((" + strings.Join(ks, ", ") + "), (" + strings.Join(ocs, ", ") + "))"
}

// DurbinWatsonNumerator is the numerator of the Durbin–Watson statistic
// of the line's residuals in run order, averaged over the orders of rows
// whose run order ties (the closed form of stats.DurbinWatsonTied: 2·SS
// within each block of tied orders, (ē_A − ē_B)² + SS_A/m_A + SS_B/m_B
// between consecutive blocks), by GROUP BY on the order and lag() over the
// blocks: the one statement that sorts the rows (by the order). A block's
// SS is Σe² − (Σe)²/m, from two sums the server keeps by value (a few
// bytes a block, so that 10⁶ blocks group in memory): its rounding is
// that of Σe² over the block, and over all blocks at most a few units in
// the last place of Σe² = RSS, the denominator, whatever the blocks'
// means, so the statistic keeps its digits.
func (p *Prepared) DurbinWatsonNumerator(f Fit) (float64, error) {
	stmt := "SELECT sum(2 * ss) + coalesce(sum((me - pme) * (me - pme) + ss / m + pss / pm) FILTER (WHERE pm IS NOT NULL), 0) FROM (" +
		"SELECT m, me, ss, lag(m) OVER w AS pm, lag(me) OVER w AS pme, lag(ss) OVER w AS pss FROM (" +
		"SELECT o, m, se / m AS me, greatest(0, see - se * se / m) AS ss FROM (" +
		"SELECT o, CAST(count(*) AS double precision) AS m, sum(e) AS se, sum(e * e) AS see FROM (SELECT " +
		p.num[len(p.num)-1] + " AS o, " + f.resid(p.dx(f), p.dy(f)) + " AS e" + p.from() + " WHERE " + p.complete() + fence + ") AS bivar_e GROUP BY o" +
		") AS bivar_s) AS bivar_b WINDOW w AS (ORDER BY o)) AS bivar_l"
	r, err := p.s.rows(stmt)
	if err != nil {
		return 0, err
	}
	return Num(r[0][0]), nil
}

// Row is one row fetched by a push-down query.
type Row struct {
	X, Y float64
	ID   string  // "" when the dataset has no id_column or it is missing
	D    float64 // a flagged row's Cook's distance as the database computed it
	// Flags are a flagged row's flags as the third pass set them, as the
	// bits of findings.FlagSet: 1 outlier, 2 high leverage, 4
	// influential, 8 sole support.
	Flags uint8
}

// SampleRow is one row of the sample: every numeric column (NumCols
// order), the group and the id.
type SampleRow struct {
	H     int64 // the row's hash (FingerprintMethod)
	Num   []float64
	Group string
	ID    string
	noID  bool // the id is NULL or missing: it sorts after every other
}

// ranked is a fetched row with what ranks it.
type ranked struct {
	Row
	noID      bool
	d, t, loo float64
}

// Fetched are the rows a study fetches: the sample (Sample) and the rows
// at the leave-one-out extremes (Extremes).
type Fetched struct {
	// Sample holds the complete cases with the smallest row hashes, k of
	// them (all when fewer), in SampleMethod's order.
	Sample []SampleRow
	// Extremes are the rows whose leave-one-out r is the smallest or the
	// largest (in order of x, y and id, at most extremesMax), with their
	// leave-one-out r.
	Extremes []Row
	ExtLoo   []float64
	// Cook is the row of the largest Cook's distance (of those that tie
	// there, the first in order of x, y and id); nil when no row has one.
	Cook *Row
}

// extremesMax bounds the rows kept for the leave-one-out extremes (rows
// that tie there: the same x and y).
const extremesMax = 1000

// SampleMethod says how Rows draws the sample, for the report.
const SampleMethod = "drawn by the database: the complete cases with the smallest 64-bit row hash (the one of the dataset's hash: the exclusive or of the cells' hashes by PostgreSQL's built-in hash functions, see the dataset's order), ties by the values of the study's columns, the group and the id (bytewise); the server returns the rows whose hash lies below a threshold set for a few hundred more than the sample, so the rows need not be sorted; the same set of rows gives the same sample in any order, on any run"

// cmpID orders ids as ORDER BY id COLLATE "C" does: bytewise, NULL last.
func cmpID(a string, aNull bool, b string, bNull bool) int {
	switch {
	case aNull && bNull:
		return 0
	case aNull:
		return 1
	case bNull:
		return -1
	}
	return strings.Compare(a, b)
}

// cmpDesc orders a before b when a is larger, NaN (NULL) last.
func cmpDesc(a, b float64) int {
	switch an, bn := math.IsNaN(a), math.IsNaN(b); {
	case an && bn:
		return 0
	case an:
		return 1
	case bn:
		return -1
	}
	return cmp.Compare(b, a)
}

func (r ranked) cmpXYID(o ranked) int {
	if c := cmp.Compare(r.X, o.X); c != 0 {
		return c
	}
	if c := cmp.Compare(r.Y, o.Y); c != 0 {
		return c
	}
	return cmpID(r.ID, r.noID, o.ID, o.noID)
}

// cmpSuspect is the ranking of flagged rows.
func cmpSuspect(a, b ranked) int {
	if c := cmpDesc(a.d, b.d); c != 0 {
		return c
	}
	if c := cmpDesc(math.Abs(a.t), math.Abs(b.t)); c != 0 {
		return c
	}
	return a.cmpXYID(b)
}

func cmpSample(a, b SampleRow) int {
	if c := cmp.Compare(a.H, b.H); c != 0 {
		return c
	}
	for i := range a.Num {
		if c := cmp.Compare(a.Num[i], b.Num[i]); c != 0 {
			return c
		}
	}
	if c := strings.Compare(a.Group, b.Group); c != 0 {
		return c
	}
	return cmpID(a.ID, a.noID, b.ID, b.noID)
}

// Sample draws the sample of k rows of the complete ones (complete of
// them), in one scan: the complete cases whose hash lies below a
// threshold expected to pass k + 8√k + 100 of them (8 standard deviations
// of that count above k), sorted in Go (cmpSample) and cut to k; in the
// rare case fewer than k pass, the threshold is doubled and the scan run
// again. The statement has no derived table: the hash is computed once
// per row in its WHERE, and again only for the few rows it returns. It
// needs only the row count, so a study draws it on a second session
// while the second pass runs (see analysis).
func (p *Prepared) Sample(k, complete int) ([]SampleRow, error) {
	return p.sampleFrom(k, (float64(k)+8*math.Sqrt(float64(k))+100)/float64(complete))
}

// sampleFrom is Sample with the share frac of the rows that the first
// threshold passes.
func (p *Prepared) sampleFrom(k int, frac float64) ([]SampleRow, error) {
	for {
		out, err := p.samplePass(k, frac)
		if err != nil || len(out) >= k || frac >= 1 {
			return out, err
		}
		frac *= 2
	}
}

func (p *Prepared) samplePass(k int, frac float64) ([]SampleRow, error) {
	hk := p.s.rowHash()
	isSample := "true"
	if t := frac*0x1p64 - 0x1p63; frac < 1 && t < 0x1p63 {
		isSample = hk + " < " + strconv.FormatInt(int64(t), 10)
	}
	sel := slices.Clone(p.num)
	sel = append(sel, cmp.Or(p.group, "CAST(NULL AS text)"), cmp.Or(p.id, "CAST(NULL AS text)"), hk)
	stmt := "SELECT " + strings.Join(sel, ", ") + p.from() + " WHERE " + p.complete() + " AND " + isSample
	nk := len(p.NumCols)
	var out []SampleRow
	err := p.s.each(stmt, func(v []any) error {
		num := make([]float64, nk)
		for i := range nk {
			num[i] = Num(v[i])
		}
		noID := p.id == "" || isMissing(v[nk+1], p.spec.Missing)
		idText := ""
		if !noID {
			idText = Text(v[nk+1])
		}
		out = append(out, SampleRow{H: int64Of(v[nk+2]), Num: num, Group: Text(v[nk]), ID: idText, noID: noID})
		return nil
	})
	if err != nil {
		return nil, err
	}
	slices.SortFunc(out, cmpSample)
	return out[:min(k, len(out))], nil
}

// Extremes fetches the rows whose leave-one-out r is th's least or
// largest (LooRMin, LooRMax), in order of x, y and id, at most
// extremesMax, with their leave-one-out r, and the row of th's largest
// Cook's distance (MaxD; of those that tie, the first in order of x, y
// and id), into fetched: one scan that computes a row's leave-one-out r
// only for the rows in th.ExtBoxes and its Cook's distance only for those
// in th.CookBoxes (for every row when they are nil), the few cells that
// hold the extremes (it took a third of the pass's time on 10⁷ rows when
// every row's leave-one-out r was computed). Both are computed by the
// same expressions as in the third pass, so a row matches its extreme to
// the last digit. It runs whole, not in parts (Part): each part would
// scan every row for a test few pass, and two parts took as long as one
// scan.
func (p *Prepared) Extremes(f Fit, th *Third, fetched *Fetched) error {
	lo, hi, maxD := th.LooRMin, th.LooRMax, th.MaxD
	looOK, cookOK := !math.IsNaN(lo) && !math.IsNaN(hi), !math.IsNaN(maxD)
	if !looOK && !cookOK {
		return nil
	}
	dx, dy := p.dx(f), p.dy(f)
	h, omh := p.leverage(f)
	loor, dist := "CAST(NULL AS double precision)", "CAST(NULL AS double precision)"
	var tests []string
	if looOK {
		loor = f.loor(dx, dy, omh)
		isExt := "(" + clampedIs(loor, lo) + " OR " + clampedIs(loor, hi) + ")"
		if len(th.ExtBoxes) > 0 {
			isExt = boxesSQL(p.num[0], p.num[1], th.ExtBoxes) + " AND " + isExt
		}
		tests = append(tests, "("+isExt+")")
	}
	if cookOK {
		// The third pass's ri and Cook's distance (flaggedSQL, ThirdPass)
		// over its e, h and 1 − h (rowsLine), written out.
		dist = cooks(f.studentized(f.resid(dx, dy), omh), h, omh)
		isMax := "(" + dist + ") = " + lit(maxD)
		if len(th.CookBoxes) > 0 {
			isMax = boxesSQL(p.num[0], p.num[1], th.CookBoxes) + " AND " + isMax
		}
		tests = append(tests, "("+isMax+")")
	}
	stmt := "SELECT " + p.num[0] + ", " + p.num[1] + ", " + cmp.Or(p.id, "CAST(NULL AS text)") + ", " + loor + ", " + dist + p.from() +
		" WHERE " + p.complete() + " AND (" + strings.Join(tests, " OR ") + ")"
	var ext []ranked
	var cook *ranked
	err := p.s.each(stmt, func(v []any) error {
		noID := p.id == "" || isMissing(v[2], p.spec.Missing)
		idText := ""
		if !noID {
			idText = Text(v[2])
		}
		row := ranked{Row: Row{X: Num(v[0]), Y: Num(v[1]), ID: idText}, noID: noID}
		if r := clampR(Num(v[3])); looOK && (r == lo || r == hi) {
			row.loo = r
			ext = append(ext, row)
			if len(ext) > 2*extremesMax {
				slices.SortFunc(ext, ranked.cmpXYID)
				ext = ext[:extremesMax]
			}
		}
		if cookOK && Num(v[4]) == maxD && (cook == nil || row.cmpXYID(*cook) < 0) {
			cook = &row
		}
		return nil
	})
	if err != nil {
		return err
	}
	slices.SortFunc(ext, ranked.cmpXYID)
	for _, r := range ext[:min(extremesMax, len(ext))] {
		fetched.Extremes = append(fetched.Extremes, r.Row)
		fetched.ExtLoo = append(fetched.ExtLoo, r.loo)
	}
	if cook != nil {
		fetched.Cook = &cook.Row
	}
	return nil
}
