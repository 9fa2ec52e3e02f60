package dataset

import (
	"context"
	"math"
	"math/big"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"
)

// The sample drawn by a threshold on the row hash, with the rows sorted in
// Go, is the one PostgreSQL gives for the same definition written the
// plain way (ORDER BY the hash and the tie-breaking columns, LIMIT k),
// also when the first threshold passes too few rows and is raised; rows
// with a NULL are not complete cases and never drawn.
func TestRowsSample(t *testing.T) {
	ctx, _, url := pgSetup(t, "DROP TABLE IF EXISTS pdsample",
		"CREATE TABLE pdsample (id text, x double precision, y double precision, n integer)",
		"INSERT INTO pdsample SELECT 'r' || i, sin(i), CASE WHEN i % 7 = 0 THEN NULL ELSE cos(i) END, i % 5 FROM generate_series(1, 5000) i")
	s, p := openTable(ctx, t, url, "pdsample", Spec{X: "x", Y: "y", ID: "id"})
	const k = 300
	var want []string
	r, err := s.rows("SELECT id FROM (SELECT " + s.rowHash() + " AS hk, x, y, id FROM pdsample AS bivar_q WHERE y IS NOT NULL) AS w ORDER BY hk, x, y, id COLLATE \"C\" LIMIT " + strconv.Itoa(k))
	if err != nil {
		t.Fatal(err)
	}
	for _, v := range r {
		want = append(want, Text(v[0]))
	}
	for _, frac := range []float64{0.001, 0.2} { // 0.001 passes about 4 rows: raised until 300 pass
		got, err := p.sampleFrom(k, frac)
		if err != nil {
			t.Fatal(err)
		}
		ids := make([]string, len(got))
		for i, r := range got {
			ids[i] = r.ID
		}
		if !slices.Equal(ids, want) {
			t.Errorf("first share %g: the sample's ids differ from ORDER BY … LIMIT: %d rows, first %v, want %v", frac, len(ids), ids[:min(5, len(ids))], want[:5])
		}
	}
}

// A session reads the server's major version from its server_version, as
// the server itself states it in server_version_num (PostgreSQL's
// documentation, "Preset Options": major version times 10 000 plus the
// minor, since version 10), and on PostgreSQL 11 and later (JIT, "JIT
// Compilation" in the same documentation) runs with its JIT settings.
func TestSessionSettings(t *testing.T) {
	ctx, _, url := pgSetup(t)
	s, err := Open(ctx, Query{Table: "pg_class", Env: "BIVAR_TEST_PG_URL", URL: url})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	r, err := s.rows("SELECT current_setting('server_version_num')::integer / 10000, current_setting('jit_optimize_above_cost'), current_setting('jit_inline_above_cost')")
	if err != nil {
		t.Fatal(err)
	}
	major := int(Num(r[0][0]))
	if got := majorVersion(s.ServerVersion); got != major {
		t.Errorf("server_version %q read as major version %d, server_version_num says %d", s.ServerVersion, got, major)
	}
	if major >= 11 && (Text(r[0][1]) != "200000" || Text(r[0][2]) != "200000") {
		t.Errorf("jit_optimize_above_cost %s, jit_inline_above_cost %s in the session, want 200000", Text(r[0][1]), Text(r[0][2]))
	}
}

// A session forked from a shared one sees the rows of its snapshot, not
// those committed since (SET TRANSACTION SNAPSHOT, PostgreSQL's
// documentation, "Transaction Isolation" and "SET TRANSACTION"), and runs
// with the session's settings. Where the server refuses to export the
// snapshot (here a statement that fails in its place), Share starts the
// transaction anew with the same settings and Fork says it cannot.
func TestForkSnapshot(t *testing.T) {
	ctx, conn, url := pgSetup(t, "DROP TABLE IF EXISTS pdfork", "CREATE TABLE pdfork (x double precision)",
		"INSERT INTO pdfork SELECT i FROM generate_series(1, 100) i")
	q := Query{Table: "pdfork", Env: "BIVAR_TEST_PG_URL", URL: url, Timeout: 42 * time.Second}
	count := func(s *Session) (int, string, string) {
		t.Helper()
		r, err := s.rows("SELECT count(*), current_setting('work_mem'), current_setting('statement_timeout') FROM pdfork")
		if err != nil {
			t.Fatal(err)
		}
		return int(Num(r[0][0])), Text(r[0][1]), Text(r[0][2])
	}
	s, err := Open(ctx, q)
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	if err := s.Share(); err != nil {
		t.Fatal(err)
	}
	if _, err := conn.Exec(ctx, "INSERT INTO pdfork VALUES (101)"); err != nil {
		t.Fatal(err)
	}
	f, err := s.Fork()
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if n, wm, to := count(f); n != 100 || wm != "256MB" || to != "42s" {
		t.Errorf("forked session: %d rows, work_mem %s, statement_timeout %s; want 100 rows (the shared snapshot), 256MB, 42s", n, wm, to)
	}
	if n, _, _ := count(s); n != 100 {
		t.Errorf("shared session: %d rows, want 100", n)
	}

	exportSnapshot = "SELECT no_such_function()"
	defer func() { exportSnapshot = "SELECT pg_export_snapshot()" }()
	s2, err := Open(ctx, q)
	if err != nil {
		t.Fatal(err)
	}
	defer s2.Close()
	if err := s2.Share(); err != nil {
		t.Fatalf("a refused export should leave a usable session: %v", err)
	}
	if f2, err := s2.Fork(); err == nil {
		f2.Close()
		t.Errorf("Fork after a refused export: no error")
	}
	if n, wm, to := count(s2); n != 101 || wm != "256MB" || to != "42s" {
		t.Errorf("session after a refused export: %d rows, work_mem %s, statement_timeout %s; want 101, 256MB, 42s", n, wm, to)
	}
}

// The boxes of the cells that hold the leave-one-out extremes, which the
// fetch of the extremes writes into its statement, do not depend on the
// order in which the server returns the third pass's groups (its hash
// table's, which the planner sizes from its statistics, and with two
// parts the order of each part's): the same cells give the same
// statement.
func TestExtBoxesOrder(t *testing.T) {
	g := Grid{XLo: 0, XHi: 10, YLo: 0, YHi: 10, NX: 10, NY: 10, Counts: make([]int, 100)}
	cells := []extCell{{1, 2, -0.5, 0.1, 2}, {4, 4, 0, 0.3, 7}, {7, 8, 0.2, 0.9, 1}, {3, 9, -0.5, -0.1, 7}}
	var boxes, cook [2][]Box
	for k := range boxes {
		th := &Third{LooRMin: -0.5, LooRMax: 0.9, MaxD: 7}
		th.Grids[0] = &g
		cs := slices.Clone(cells)
		if k == 1 {
			slices.Reverse(cs)
		}
		th = th.finish(nil, cs, nil, 1)
		boxes[k], cook[k] = th.ExtBoxes, th.CookBoxes
	}
	if len(boxes[0]) != 3 || !slices.Equal(boxes[0], boxes[1]) {
		t.Errorf("boxes %v, and %v with the groups in reverse order", boxes[0], boxes[1])
	}
	if len(cook[0]) != 2 || !slices.Equal(cook[0], cook[1]) {
		t.Errorf("boxes of the largest Cook's distance %v, and %v with the groups in reverse order", cook[0], cook[1])
	}
}

// A study's complete-case condition is one no index can serve, so the
// passes read the rows in the table's order whatever indexes the table
// has and whatever the planner's statistics say (an index scan would sum
// them in the index's order, and a plan that changed after an ANALYZE
// would move the last digits; see Part). Here the group is NULL in all
// but 50 of 10⁵ rows and indexed, and x and y are indexed: written as
// g IS NOT NULL, PostgreSQL 15 reads those rows through the index on g.
func TestCompleteNotIndexable(t *testing.T) {
	ctx, _, url := pgSetup(t, "DROP TABLE IF EXISTS pdnull", "CREATE TABLE pdnull (g text, x double precision, y double precision)",
		"INSERT INTO pdnull SELECT CASE WHEN i % 2000 = 0 THEN 'L' || (i % 3) END, sin(i), cos(i) FROM generate_series(1, 100000) i",
		"CREATE INDEX pdnull_g ON pdnull (g)", "CREATE INDEX pdnull_x ON pdnull (x)", "CREATE INDEX pdnull_y ON pdnull (y)", "ANALYZE pdnull")
	s, p := openTable(ctx, t, url, "pdnull", Spec{X: "x", Y: "y", Group: "g"})
	for _, q := range []*Prepared{p, p.Part(s, 0.5, false), p.Part(s, 0.5, true)} {
		r, err := s.rows("EXPLAIN SELECT count(*)" + q.from() + " WHERE " + q.complete())
		if err != nil {
			t.Fatal(err)
		}
		if all := planText(r); strings.Contains(all, "Index") || !strings.Contains(all, "Seq Scan") {
			t.Errorf("complete cases %q read by:\n%s", q.complete(), all)
		}
	}
}

// The server's number for a row's cells (cellKey, evaluated by the
// server) gives back the cells and flags (splitCellKey), each clamped to
// its grid as analysis.grid clamps, at the edges of every place: the cell
// k that the largest x or y falls in before clamping, and residual cells
// below and far above their grid's.
func TestCellKey(t *testing.T) {
	ctx, _, url := pgSetup(t)
	s, err := Open(ctx, Query{SQL: "SELECT 1 AS one", Env: "BIVAR_TEST_PG_URL", URL: url})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	var g [3]Grid
	g[0] = Grid{NX: 90, NY: 64}
	g[1] = Grid{NX: 90, NY: 64}
	for _, c := range []struct {
		i0, j0 int
		e      float64
		fl     int
	}{{0, 0, -1, 0}, {90, 64, 64, 15}, {89, 63, 63, 13}, {45, 7, 1e9, 8}, {90, 0, -3e9, 1}, {0, 64, 0.5, 2}} {
		key := cellKey(strconv.Itoa(c.i0), strconv.Itoa(c.j0), strconv.Itoa(c.i0), strconv.Itoa(c.fl), g)
		r, err := s.rows("SELECT CAST(" + key + " AS double precision)")
		if err != nil {
			t.Fatal(err)
		}
		i0, j0, i1, j1, fl := splitCellKey(Num(r[0][0]), c.e, true, g)
		wi, wj := min(c.i0, 89), min(c.j0, 63)
		wj1 := cellAt(c.e, 64)
		if i0 != wi || j0 != wj || i1 != wi || j1 != wj1 || fl != c.fl {
			t.Errorf("cells (%d, %d), residual %g, flags %d: got (%d, %d), (%d, %d), %d; want (%d, %d), (%d, %d), %d",
				c.i0, c.j0, c.e, c.fl, i0, j0, i1, j1, fl, wi, wj, wi, wj1, c.fl)
		}
	}
	for _, c := range []struct {
		v    float64
		k, w int
	}{{-1, 64, 0}, {0, 64, 0}, {0.99, 64, 0}, {63, 64, 63}, {64, 64, 63}, {1e300, 64, 63}, {math.NaN(), 64, 0}} {
		if got := cellAt(c.v, c.k); got != c.w {
			t.Errorf("cellAt(%g, %d) = %d, want %d", c.v, c.k, got, c.w)
		}
	}
}

// The second pass of a study with a group joins each row to its level's
// means, a list of VALUES; with four levels PostgreSQL 15 plans that join
// as a nested loop, which compares each row's level with every level in
// turn (the plan without the setting is printed when the test fails).
// Run by hashJoined, the statement is joined by hashing, and the setting
// is back as it was after the statement.
func TestSecondHashJoin(t *testing.T) {
	ctx, _, url := pgSetup(t, "DROP TABLE IF EXISTS pdlevels", "CREATE TABLE pdlevels (g text, x double precision, y double precision)",
		"INSERT INTO pdlevels SELECT 'L' || (i % 4), sin(i), cos(i) + sin(i) FROM generate_series(1, 20000) i", "ANALYZE pdlevels")
	s, p := openTable(ctx, t, url, "pdlevels", Spec{X: "x", Y: "y", Group: "g"})
	c, levels, err := p.First(1000, nil)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := p.Second(c.Mean, nil, c.Sxy/c.Sxx, [2]float64{c.Min[0], c.Max[0]}, levels); err != nil {
		t.Fatal(err)
	}
	stmt := s.Statements[len(s.Statements)-1]
	r, err := s.hashJoined("EXPLAIN " + stmt)
	if err != nil {
		t.Fatal(err)
	}
	if got := planText(r); !strings.Contains(got, "Hash Join") || strings.Contains(got, "Nested Loop") {
		plain, _ := s.rows("EXPLAIN " + stmt)
		t.Errorf("the second pass under hashJoined is planned as:\n%s\nand without it as:\n%s", got, planText(plain))
	}
	var now string
	if err := s.tx.QueryRow(s.ctx, "SHOW enable_nestloop").Scan(&now); err != nil || now != "on" {
		t.Errorf("enable_nestloop after hashJoined: %q (%v), want on", now, err)
	}
}

// openTable opens a session on the table of the test server and prepares
// spec on it; the session closes when the test ends.
func openTable(ctx context.Context, t *testing.T, url, table string, spec Spec) (*Session, *Prepared) {
	t.Helper()
	s, err := Open(ctx, Query{Table: table, Env: "BIVAR_TEST_PG_URL", URL: url})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(s.Close)
	p, err := s.Prepare(spec)
	if err != nil {
		t.Fatal(err)
	}
	return s, p
}

// planText is the text of an EXPLAIN's rows.
func planText(r [][]any) string {
	var lines []string
	for _, v := range r {
		lines = append(lines, Text(v[0]))
	}
	return strings.Join(lines, "\n")
}

// A numeric cell reads pushed down as the rows fetched below max_rows read
// its text: Go's strconv.ParseFloat, correctly rounded to IEEE 754
// binary64 (±Inf with ErrRange at and beyond 2¹⁰²⁴ − 2⁹⁷⁰, half a unit in
// the last place above the largest float64; 0 with the value's sign at
// and below 2⁻¹⁰⁷⁵, half the least subnormal, which rounds to even). The
// plain cast failed the statement with "out of range" on 1e400 and on
// 1e-400.
func TestNumericAsFloat(t *testing.T) {
	ctx, _, url := pgSetup(t)
	s, err := Open(ctx, Query{Table: "pg_class", Env: "BIVAR_TEST_PG_URL", URL: url})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	hi := new(big.Int).Sub(new(big.Int).Lsh(big.NewInt(1), 1024), new(big.Int).Lsh(big.NewInt(1), 970))
	half := new(big.Float).SetMantExp(big.NewFloat(1), -1075).Text('f', 1075)
	cells := []string{"1e400", "-1e400", "1e-400", "-1e-400", hi.String(), "-" + hi.String(), new(big.Int).Sub(hi, big.NewInt(1)).String(),
		half, "-" + half, half + "1", "5e-324", "2.5e-324", "2e-324", "2.2250738585072014e-308", "0.1", "-3.5", "123456789012345678901234567890", "0", "NaN"}
	for _, c := range cells {
		r, err := s.rows("SELECT " + numericAsFloat("CAST('"+c+"' AS numeric)"))
		if err != nil {
			t.Errorf("%.30s: %v", c, err)
			continue
		}
		got := Num(r[0][0])
		want, err := strconv.ParseFloat(c, 64)
		if err != nil && !math.IsInf(want, 0) {
			t.Fatalf("ParseFloat(%.30s): %v", c, err)
		}
		if got != want && !(math.IsNaN(got) && math.IsNaN(want)) || math.Signbit(got) != math.Signbit(want) {
			t.Errorf("%.30s… (%d digits): %v pushed down, ParseFloat gives %v", c, len(c), got, want)
		}
	}
}
