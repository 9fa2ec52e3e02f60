package dataset

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"
)

// Dates and timestamps read as seconds since 1970-01-01 00:00 UTC, as Go's
// time package's Unix() gives them for the same instants; a timestamp
// without time zone is taken as UTC; NULL is missing; the hash of the
// same rows does not depend on the order the server stores them in.
func TestReadQueryTimes(t *testing.T) {
	ctx, conn, url := pgSetup(t, "DROP TABLE IF EXISTS times",
		"CREATE TABLE times (d date, ts timestamp, tz timestamptz, v double precision)",
		"INSERT INTO times VALUES ('2026-10-01', '2026-10-01 08:00:00.25', '2026-10-01 08:00:00+02', 1.5), (NULL, NULL, NULL, NULL), ('1969-12-31', '1969-12-31 23:59:59', '1970-01-01 00:00:00-01', -2)")
	q := Query{Table: "times", Env: "BIVAR_TEST_PG_URL", URL: url}
	tb, info, err := ReadQuery(ctx, q, Options{}, []string{"d", "ts", "tz", "v"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	// ORDER BY 1, 2, …: 1969 first, 2026 next, the NULL row last.
	unix := func(y int, mo time.Month, d, h, mi, s, ns int, loc *time.Location) float64 {
		tt := time.Date(y, mo, d, h, mi, s, ns, loc)
		return float64(tt.Unix()) + float64(tt.Nanosecond())/1e9
	}
	want := map[string][]float64{
		"d":  {unix(1969, 12, 31, 0, 0, 0, 0, time.UTC), unix(2026, 10, 1, 0, 0, 0, 0, time.UTC), math.NaN()},
		"ts": {unix(1969, 12, 31, 23, 59, 59, 0, time.UTC), unix(2026, 10, 1, 8, 0, 0, 250e6, time.UTC), math.NaN()},
		"tz": {unix(1970, 1, 1, 0, 0, 0, 0, time.FixedZone("", -3600)), unix(2026, 10, 1, 8, 0, 0, 0, time.FixedZone("", 7200)), math.NaN()},
		"v":  {-2, 1.5, math.NaN()},
	}
	for c, w := range want {
		if !closeFloats(tb.Numeric[c], w, 0) || tb.Missing[c] != 1 {
			t.Errorf("%s = %v (%d missing), want %v (1 missing)", c, tb.Numeric[c], tb.Missing[c], w)
		}
	}
	if info.ServerVersion == "" || info.Columns != 4 {
		t.Errorf("info = %+v", info)
	}
	// The same rows stored in another order hash the same.
	for _, s := range []string{"CREATE TABLE times2 AS SELECT * FROM times ORDER BY v DESC NULLS FIRST"} {
		if _, err := conn.Exec(ctx, "DROP TABLE IF EXISTS times2"); err != nil {
			t.Fatal(err)
		}
		if _, err := conn.Exec(ctx, s); err != nil {
			t.Fatal(err)
		}
	}
	q.Table = "times2"
	tb2, _, err := ReadQuery(ctx, q, Options{}, []string{"v"}, nil)
	if err != nil || tb2.SHA256 != tb.SHA256 {
		t.Errorf("hash of the rows stored in another order %s, want %s (%v)", tb2.SHA256, tb.SHA256, err)
	}
}

// Rows come ordered by every column with text bytewise, whatever the
// column's collation ("B" before "a" before "b", as in ASCII; a linguistic
// collation such as ICU's "en" puts "a" first and "B" last), and a column
// of a type with no order of its own (json) ordered by its text, so that a
// query may return it though no study uses it. The hash is SHA-256 over
// the rows in that order, each written as COPY's text format writes it,
// computed here from the lines themselves.
func TestReadQueryOrderBytewise(t *testing.T) {
	ctx, conn, url := pgSetup(t, "DROP TABLE IF EXISTS ordered")
	col := `w text COLLATE "en-x-icu"`
	if _, err := conn.Exec(ctx, "CREATE TABLE ordered ("+col+", meta json, v double precision)"); err != nil {
		t.Logf("no ICU collation on this server (%v): the text column has the database's collation", err)
		col = "w text"
		if _, err := conn.Exec(ctx, "CREATE TABLE ordered ("+col+", meta json, v double precision)"); err != nil {
			t.Fatal(err)
		}
	}
	if _, err := conn.Exec(ctx, `INSERT INTO ordered VALUES ('b', '{"k": 2}', 1), ('B', '{"k": 1}', 2), ('a', '{"k": 3}', 3), ('a', '{"k": 0}', 4)`); err != nil {
		t.Fatal(err)
	}
	q := Query{Table: "ordered", Env: "BIVAR_TEST_PG_URL", URL: url}
	tb, _, err := ReadQuery(ctx, q, Options{}, []string{"v"}, []string{"w"})
	if err != nil {
		t.Fatal(err)
	}
	if w := []float64{2, 4, 3, 1}; !closeFloats(tb.Numeric["v"], w, 0) {
		t.Errorf("v in the order fetched = %v, want %v (w bytewise, then meta's text)", tb.Numeric["v"], w)
	}
	h := sha256.Sum256([]byte("B\t{\"k\": 1}\t2\na\t{\"k\": 0}\t4\na\t{\"k\": 3}\t3\nb\t{\"k\": 2}\t1\n"))
	if got, want := tb.SHA256, hex.EncodeToString(h[:]); got != want {
		t.Errorf("hash %s, want %s", got, want)
	}
}

// Rows equal as numbers whose text differs (numeric 1.0 and 1.00, float
// -0 and 0) come in one order whatever the order stored, so their hash
// is the same, computed here from the lines themselves; and a result with
// two columns of one name, of a type with no order of its own, is read
// (it failed: the ORDER BY could not name them). Both from an independent
// review.
func TestReadQueryOrderTies(t *testing.T) {
	ctx, _, url := pgSetup(t, "DROP TABLE IF EXISTS ties1", "DROP TABLE IF EXISTS ties2",
		"CREATE TABLE ties1 (n numeric, f double precision)", "CREATE TABLE ties2 (n numeric, f double precision)",
		"INSERT INTO ties1 VALUES (1.00, 0), (1.0, '-0'), (1.00, '-0'), (1.0, 0)",
		"INSERT INTO ties2 VALUES (1.0, 0), (1.00, '-0'), (1.0, '-0'), (1.00, 0)")
	h := sha256.Sum256([]byte("1.0\t-0\n1.0\t0\n1.00\t-0\n1.00\t0\n"))
	for _, table := range []string{"ties1", "ties2"} {
		tb, _, err := ReadQuery(ctx, Query{Table: table, Env: "BIVAR_TEST_PG_URL", URL: url}, Options{}, []string{"n", "f"}, nil)
		if err != nil {
			t.Fatal(err)
		}
		if got, want := tb.SHA256, hex.EncodeToString(h[:]); got != want {
			t.Errorf("%s: hash %s, want %s", table, got, want)
		}
	}
	q := Query{SQL: `SELECT f, json_build_object('k', f) AS j, json_build_object('k', -f) AS j FROM ties1`, Env: "BIVAR_TEST_PG_URL", URL: url}
	if tb, _, err := ReadQuery(ctx, q, Options{}, []string{"f"}, nil); err != nil || tb.Rows != 4 {
		t.Errorf("two json columns named j: %v", err)
	}
}

// pgSetup connects to the test server (skipping the test when
// BIVAR_TEST_PG_URL is not set) and runs stmts; the connection closes when
// the test ends.
func pgSetup(t *testing.T, stmts ...string) (context.Context, *pgx.Conn, string) {
	t.Helper()
	url := os.Getenv("BIVAR_TEST_PG_URL")
	if url == "" {
		t.Skip("no PostgreSQL server: BIVAR_TEST_PG_URL is not set; run scripts/pg-test.sh go test ./analysis/dataset/ to start one")
	}
	ctx := context.Background()
	conn, err := pgx.Connect(ctx, url)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { conn.Close(ctx) })
	for _, s := range stmts {
		if _, err := conn.Exec(ctx, s); err != nil {
			t.Fatal(err)
		}
	}
	return ctx, conn, url
}

// A server's message keeps a long number readable: a run of more than 24
// digits becomes its first 8 and its length (a numeric cell of 10⁴⁰⁰
// came back with all 401 digits); shorter numbers stay as they are.
func TestShortDigits(t *testing.T) {
	long := "1" + strings.Repeat("0", 400)
	for _, c := range []struct{ in, want string }{
		{`value "` + long + `" is out of range for type double precision`, `value "10000000… (401 digits)" is out of range for type double precision`},
		{`value "1e400" is out of range`, `value "1e400" is out of range`},
		{"line 123456789012345678901234 and 42", "line 123456789012345678901234 and 42"},
		{"x " + strings.Repeat("9", 25) + ".5", "x 99999999… (25 digits).5"},
	} {
		if got := shortDigits(c.in); got != c.want {
			t.Errorf("shortDigits(%.60q) = %q, want %q", c.in, got, c.want)
		}
	}
}

// Dates and timestamps of any year PostgreSQL stores read as the seconds
// PostgreSQL's own EXTRACT(EPOCH FROM …) gives (its documented "number of
// seconds since 1970-01-01 00:00:00 UTC"; an exact numeric on
// PostgreSQL 14 and later), its text read by strconv.ParseFloat,
// correctly rounded as Python's float() is: years before 1 AD ("… BC")
// and past 9999, a fraction before 1970 and one far from 1970 where the
// sum of the whole seconds and the fraction is rounded. In memory these
// were "not a finite number" (BC, five-digit years) while the push-down
// read them by EXTRACT (found by a sweep of column types).
func TestReadQueryTimesEpoch(t *testing.T) {
	ctx, conn, url := pgSetup(t, "DROP TABLE IF EXISTS times_far",
		"CREATE TABLE times_far (k integer, d date, ts timestamp, tz timestamptz)",
		`INSERT INTO times_far VALUES
		 (1, '0044-03-15 BC', '0044-03-15 12:30:00.5 BC', '0001-01-01 00:00:00.000001 BC+00'),
		 (2, '12000-01-01', '12000-06-30 23:59:59.999999', '99999-12-31 00:00:00.123457+05:30'),
		 (3, '1969-12-31', '1969-12-31 23:59:59.123457', '1900-01-01 00:00:00.7-03'),
		 (4, '2026-10-01', '285000-01-01 00:00:00.000003', '2026-10-01 08:00:00.25+02')`)
	var major int
	if err := conn.QueryRow(ctx, "SELECT current_setting('server_version_num')::int / 10000").Scan(&major); err != nil {
		t.Fatal(err)
	}
	if major < 14 {
		t.Skipf("PostgreSQL %d: EXTRACT gives double precision before 14, not the exact seconds", major)
	}
	q := Query{SQL: "SELECT d, ts, tz FROM times_far ORDER BY k", Env: "BIVAR_TEST_PG_URL", URL: url}
	tb, _, err := ReadQuery(ctx, q, Options{}, []string{"d", "ts", "tz"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []string{"d", "ts", "tz"} {
		// ReadQuery orders by every column, d first: k's order here too.
		rows, err := conn.Query(ctx, "SELECT EXTRACT(EPOCH FROM "+c+")::text FROM times_far ORDER BY d")
		if err != nil {
			t.Fatal(err)
		}
		texts, err := pgx.CollectRows(rows, pgx.RowTo[string])
		if err != nil {
			t.Fatal(err)
		}
		for i, s := range texts {
			want, err := strconv.ParseFloat(s, 64)
			if err != nil {
				t.Fatal(err)
			}
			if got := tb.Numeric[c][i]; got != want {
				t.Errorf("%s row %d = %.17g, want %.17g (EXTRACT(EPOCH) %s)", c, i+1, got, want, s)
			}
		}
	}
}

// pgEpoch reads each form of PostgreSQL's ISO date and timestamp output
// (its documented DateStyle ISO: "1997-12-17 07:37:16-08", an offset with
// minutes or seconds for zones that have them, " BC") as Go's time
// package places the same instant, the fraction added exactly (the
// decimal's value by strconv.ParseFloat, correctly rounded); anything
// else is no number.
func TestPgEpoch(t *testing.T) {
	for _, c := range []struct {
		in   string
		want float64
	}{
		{"1997-12-17 07:37:16-08", float64(time.Date(1997, 12, 17, 15, 37, 16, 0, time.UTC).Unix())},
		{"1997-12-17 07:37:16+05:30", float64(time.Date(1997, 12, 17, 2, 7, 16, 0, time.UTC).Unix())},
		{"1890-01-01 00:00:00+00:53:28", float64(time.Date(1889, 12, 31, 23, 6, 32, 0, time.UTC).Unix())},
		{"1969-12-31 23:59:59.75", -0.25},
		{"1969-12-31 23:59:58.000001", -1.999999},
		{"2026-10-01", float64(time.Date(2026, 10, 1, 0, 0, 0, 0, time.UTC).Unix())},
		{"0001-01-01 BC", float64(time.Date(0, 1, 1, 0, 0, 0, 0, time.UTC).Unix())},
		{"2026-10-01 08:00:00.1", 1790841600.1}, // 1790812800 (Python 3.11: datetime(2026, 10, 1, tzinfo=timezone.utc).timestamp()) + 8 h + 0.1 s
	} {
		if got, ok := pgEpoch(c.in); !ok || got != c.want {
			t.Errorf("pgEpoch(%q) = %.17g, %v; want %.17g", c.in, got, ok, c.want)
		}
	}
	for _, bad := range []string{"infinity", "-infinity", "", "2026-1-01", "26-10-01", "2026-10-01 8:00:00", "2026-10-01 08:00:00.", "2026-10-01 08:00:00+", "2026-10-01x", "0000-01-01", "2026-10-01 BC BC"} {
		if v, ok := pgEpoch(bad); ok {
			t.Errorf("pgEpoch(%q) = %v, want no number", bad, v)
		}
	}
}
