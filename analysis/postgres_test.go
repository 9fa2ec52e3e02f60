package analysis_test

import (
	"bufio"
	"bytes"
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/jackc/pgx/v5"

	"bivar/analysis"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/internal/reference"
)

// pgURL is the test server's URL, from BIVAR_TEST_PG_URL; without it the
// test is skipped (scripts/pg-test.sh starts a server and sets it, and
// .ci/run runs the tests that way).
func pgURL(t *testing.T) string {
	t.Helper()
	u := os.Getenv("BIVAR_TEST_PG_URL")
	if u == "" {
		t.Skip("no PostgreSQL server: BIVAR_TEST_PG_URL is not set; run scripts/pg-test.sh go test ./analysis/ to start one")
	}
	return u
}

// pgExec runs statements on the test server.
func pgExec(t *testing.T, url string, stmts ...string) {
	t.Helper()
	ctx := context.Background()
	conn, err := pgx.Connect(ctx, url)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close(ctx)
	for _, s := range stmts {
		if _, err := conn.Exec(ctx, s); err != nil {
			t.Fatalf("%s: %v", s, err)
		}
	}
}

// runManifest parses src (datasets and studies) in dir and runs it.
func runManifest(t *testing.T, dir, src string) (*report.Report, error) {
	t.Helper()
	path := filepath.Join(dir, "pg.toml")
	if err := os.WriteFile(path, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	m, err := manifest.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	return analysis.Run(m, analysis.Options{Version: "test"})
}

var strdData = regexp.MustCompile(`Data\s+\(lines (\d+) to (\d+)\)`)

// norris returns the text of NIST StRD Norris's (x, y) pairs, in the
// file's order.
func norris(t *testing.T) (x, y []string) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(reference.Dir(t), "nist-strd", "Norris.dat"))
	if err != nil {
		t.Fatal(err)
	}
	var lines []string
	sc := bufio.NewScanner(bytes.NewReader(b))
	for sc.Scan() {
		lines = append(lines, sc.Text())
	}
	var from, to int
	for _, l := range lines {
		if m := strdData.FindStringSubmatch(l); m != nil {
			from, _ = strconv.Atoi(m[1])
			to, _ = strconv.Atoi(m[2])
			break
		}
	}
	for _, l := range lines[from-1 : to] {
		f := strings.Fields(l)
		y, x = append(y, f[0]), append(x, f[1])
	}
	return x, y
}

// The same rows from a CSV file and from a PostgreSQL table give the same
// studies, byte for byte in JSON; only the dataset's provenance differs.
// The database's rows come ordered by every column (dataset.Order), so the
// CSV file holds them in that order too: row numbers and run order agree.
// NIST StRD Norris: the slope and intercept reach the certified values
// (NIST, Norris.dat, certified B1 = 1.00211681802045, B0 =
// -0.262323073774029) to 1e-11 relative from the table as from the file.
func TestRunPostgreSQLSameAsCSV(t *testing.T) {
	url := pgURL(t)
	x, y := norris(t)
	type row struct{ x, y string }
	var rows []row
	for i := range x {
		rows = append(rows, row{x[i], y[i]})
	}
	num := func(s string) float64 { v, _ := strconv.ParseFloat(s, 64); return v }
	slices.SortFunc(rows, func(a, b row) int {
		switch {
		case num(a.x) != num(b.x):
			return map[bool]int{true: -1, false: 1}[num(a.x) < num(b.x)]
		case num(a.y) != num(b.y):
			return map[bool]int{true: -1, false: 1}[num(a.y) < num(b.y)]
		}
		return 0
	})
	dir := t.TempDir()
	var csv strings.Builder
	var values []string
	csv.WriteString("x,y\n")
	for _, r := range rows {
		fmt.Fprintf(&csv, "%s,%s\n", r.x, r.y)
		values = append(values, fmt.Sprintf("(%s, %s)", r.x, r.y))
	}
	if err := os.WriteFile(filepath.Join(dir, "norris.csv"), []byte(csv.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	pgExec(t, url, "DROP TABLE IF EXISTS norris", "CREATE TABLE norris (x double precision, y double precision)",
		"INSERT INTO norris VALUES "+strings.Join(values, ", "))
	t.Setenv("BIVAR_TEST_DB", url)
	study := "\n[[study]]\nid = \"norris\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\norder = \"x\"\n"
	fromCSV, err := runManifest(t, dir, "[[dataset]]\nid = \"d\"\nfile = \"norris.csv\"\n"+study)
	if err != nil {
		t.Fatal(err)
	}
	fromDB, err := runManifest(t, dir, "[[dataset]]\nid = \"d\"\ntable = \"norris\"\nconnection = \"BIVAR_TEST_DB\"\n"+study)
	if err != nil {
		t.Fatal(err)
	}
	if c, d := studyJSON(t, fromCSV.Studies[0]), studyJSON(t, fromDB.Studies[0]); c != d {
		t.Errorf("the study differs:\n%s\n%s", c, d)
	}
	line := fromDB.Studies[0].Line
	for _, c := range []struct {
		name      string
		got, want float64
	}{{"slope", float64(line.Slope.Estimate), 1.00211681802045}, {"intercept", float64(line.Intercept.Estimate), -0.262323073774029}} {
		if math.Abs(c.got-c.want) > 1e-11*math.Abs(c.want) {
			t.Errorf("Norris %s from PostgreSQL = %.15g, certified %.15g", c.name, c.got, c.want)
		}
	}
	src := fromDB.Datasets[0].Source
	if src == nil || src.Kind != report.SourcePostgreSQL || !strings.HasPrefix(src.ServerVersion, "1") || src.Connection != "BIVAR_TEST_DB" ||
		!strings.Contains(src.Query, `FROM "norris"`) || !strings.Contains(src.Query, "ORDER BY 1, 2") || src.RanAt == "" || fromDB.Datasets[0].Rows != len(x) {
		t.Errorf("source block = %+v, rows %d", src, fromDB.Datasets[0].Rows)
	}
	// A rerun on the same data gives the same hash; a change gives another.
	again, err := runManifest(t, dir, "[[dataset]]\nid = \"d\"\ntable = \"norris\"\nconnection = \"BIVAR_TEST_DB\"\n"+study)
	if err != nil || again.Datasets[0].SHA256 != fromDB.Datasets[0].SHA256 {
		t.Errorf("rerun: hash %s, first %s (%v)", again.Datasets[0].SHA256, fromDB.Datasets[0].SHA256, err)
	}
	pgExec(t, url, "UPDATE norris SET y = y + 1 WHERE x = (SELECT max(x) FROM norris)")
	changed, err := runManifest(t, dir, "[[dataset]]\nid = \"d\"\ntable = \"norris\"\nconnection = \"BIVAR_TEST_DB\"\n"+study)
	if err != nil || changed.Datasets[0].SHA256 == fromDB.Datasets[0].SHA256 {
		t.Errorf("a changed row kept the hash %s (%v)", changed.Datasets[0].SHA256, err)
	}
}

// Column types: numbers, NULL as missing, text as a group, a timestamp as
// order in seconds since 1970 UTC (checked against Go's time package's
// Unix()), on the rows of the workbook test's CSV.
func TestRunPostgreSQLTypes(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS casts",
		`CREATE TABLE casts (lot varchar(8), poured timestamptz, melt_temp numeric(8,3), hardness real, h2 integer, note json)`,
		`INSERT INTO casts VALUES ('L01', '2026-10-01 08:00:00+00', 1412.5, 251, 249, '{}'), ('L02', '2026-10-01 14:30:00+02', NULL, 247.5, 248, '{}'),
		 ('L03', '2026-10-02 06:15:00.5+00', 1408.25, 252, 250, '{}'), ('L04', '2026-10-02 22:45:00+00', 1415, NULL, 253, '{}')`)
	t.Setenv("BIVAR_TEST_DB", url)
	dir := t.TempDir()
	decl := "[[dataset]]\nid = \"d\"\nquery = \"SELECT lot, poured, melt_temp, hardness, h2 FROM casts;\"\nconnection = \"BIVAR_TEST_DB\"\n"
	r, err := runManifest(t, dir, decl+"[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"h2\"\ny = \"melt_temp\"\norder = \"poured\"\ncovariates = [\"hardness\"]\n")
	if err != nil {
		t.Fatal(err)
	}
	d := r.Datasets[0]
	want := map[string]int{"h2": 0, "melt_temp": 1, "poured": 0, "hardness": 1}
	for _, mc := range d.Missing {
		if mc.Count != want[mc.Column] {
			t.Errorf("missing in %s = %d, want %d", mc.Column, mc.Count, want[mc.Column])
		}
	}
	if d.Rows != 4 || r.Studies[0].N != 2 {
		t.Errorf("rows %d, n %d; want 4 rows, 2 complete", d.Rows, r.Studies[0].N)
	}
	// Wrong types: text as a number, json at all.
	for _, c := range []struct{ x, want string }{
		{"lot", `column "lot": the column is of type character varying, and a study uses it as a number: choose a numeric column, or cast it in the query ("lot"::double precision)`},
		{"note", `column "note": the column is of type json, which bivar does not read`},
	} {
		_, err := runManifest(t, dir, strings.Replace(decl, "h2 FROM", "h2, note FROM", 1)+"[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \""+c.x+"\"\ny = \"h2\"\n")
		if err == nil || !strings.Contains(err.Error(), `pg.toml:1): PostgreSQL (BIVAR_TEST_DB): `+c.want) {
			t.Errorf("x = %s: %v\nwant %s", c.x, err, c.want)
		}
	}
}

// A study whose column the query's result lacks keeps its place with an
// error naming the columns there are, and the other studies run.
func TestRunPostgreSQLAbsentColumn(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS absent", "CREATE TABLE absent (xx float8, y float8)", "INSERT INTO absent SELECT g, g*g + (g % 3) FROM generate_series(1, 20) g")
	t.Setenv("BIVAR_TEST_DB", url)
	r, err := runManifest(t, t.TempDir(), "[[dataset]]\nid = \"d\"\ntable = \"absent\"\nconnection = \"BIVAR_TEST_DB\"\n"+
		"[[study]]\nid = \"bad\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n[[study]]\nid = \"good\"\ndataset = \"d\"\nx = \"xx\"\ny = \"y\"\n")
	if err != nil {
		t.Fatal(err)
	}
	want := `pg.toml:5: in this [[study]]: x column "x" is not in dataset "d" (the result of its query): its columns are "xx", "y"`
	if e := r.Studies[0].Error; e == nil || !strings.HasSuffix(*e, want) {
		t.Errorf("study bad: error %v, want %q", errText(e), want)
	}
	if r.Studies[1].Error != nil || r.Studies[1].N != 20 {
		t.Errorf("study good: error %v, n %d", r.Studies[1].Error, r.Studies[1].N)
	}
}

// Each failure names the dataset, the manifest line and what to do, and
// no message holds the password.
func TestRunPostgreSQLErrors(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS small", "CREATE TABLE small (x float8, y float8)", "INSERT INTO small SELECT g, g*g FROM generate_series(1, 50) g")
	const pw = "s3cretPW"
	dir := t.TempDir()
	study := "[[study]]\nid = \"s\"\ndataset = \"db\"\nx = \"x\"\ny = \"y\"\n"
	cases := []struct {
		name, env, decl, want string
	}{
		{"unset variable", "", `query = "SELECT x, y FROM small"`, "the environment variable BIVAR_TEST_X is empty or not set: set it to the server's URL"},
		{"wrong URL", "postgres://bivar_test:" + pw + "@[::1:5432/x", `query = "SELECT x, y FROM small"`, "BIVAR_TEST_X does not hold a PostgreSQL URL that can be read"},
		{"refusing server", "postgres://bivar_test:" + pw + "@127.0.0.1:1/postgres?connect_timeout=5", `query = "SELECT x, y FROM small"`, "cannot connect to the server in BIVAR_TEST_X (host 127.0.0.1, port 1"},
		{"failing query", url, `query = "SELECT x, y FROM no_such_table"`, `the query failed: relation "no_such_table" does not exist (SQLSTATE 42P01): correct it in the manifest`},
		{"writing query", url, `query = "SELECT x, y FROM small FOR UPDATE"`, "read-only transaction"},
		{"timeout", url, "query = \"SELECT x, y FROM small, pg_sleep(2)\"\nstatement_timeout = \"300ms\"", "the query ran longer than statement_timeout = 300ms and the server stopped it"},
		{"timeout above the row limit", url, "query = \"SELECT x, y, pg_sleep(0.02)::text AS z FROM small\"\nstatement_timeout = \"300ms\"\nmax_rows = 10", "the query ran longer than statement_timeout = 300ms and the server stopped it"},
		{"failing query above the row limit", url, "query = \"SELECT x, y FROM no_such_table\"\nmax_rows = 10", `the query failed: relation "no_such_table" does not exist`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Setenv("BIVAR_TEST_X", tc.env)
			_, err := runManifest(t, dir, "[[dataset]]\nid = \"db\"\n"+tc.decl+"\nconnection = \"BIVAR_TEST_X\"\n"+study)
			if err == nil {
				t.Fatal("no error")
			}
			msg := err.Error()
			if !strings.HasPrefix(msg, `dataset "db" (`) || !strings.Contains(msg, `pg.toml:1): PostgreSQL (BIVAR_TEST_X): `) || !strings.Contains(msg, tc.want) {
				t.Errorf("got  %s\nwant %q", msg, tc.want)
			}
			if strings.Contains(msg, pw) || tc.env != "" && strings.Contains(msg, tc.env) {
				t.Errorf("the message shows the URL or its password: %s", msg)
			}
		})
	}
}

func errText(e *string) string {
	if e == nil {
		return "<nil>"
	}
	return *e
}
