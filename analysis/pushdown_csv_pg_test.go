package analysis_test

import (
	"encoding/csv"
	"math"
	"strconv"
	"strings"
	"testing"

	"bivar/analysis/report"
)

// TestPushdownFlaggedFile: a study whose rows stay in the database writes
// the same file of flagged rows as the study of the same rows in memory:
// the same rows in the same order with the same flags, every measure
// within 1e-9 relative (the database's sums are added in another order).
func TestPushdownFlaggedFile(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdcsv", "CREATE TABLE pdcsv (id text, x float8, y float8)",
		// Sines of multiples of irrational steps (reproducible on any
		// server), three rows pushed off the line and one far out in x.
		`INSERT INTO pdcsv SELECT 'r' || i, 50 + 5 * sin(i * 0.7071),
		  2 + 0.4 * (50 + 5 * sin(i * 0.7071)) + sin(i * 1.3247 + 0.5)
		    + CASE WHEN i IN (40, 400, 1200) THEN 9 ELSE 0 END
		  FROM generate_series(1, 3000) i`,
		"UPDATE pdcsv SET x = 90, y = 10 WHERE id = 'r7'")
	mem, pushed := runBoth(t, url, "pdcsv", "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n", 10)
	m, p := mem.Studies[0], pushed.Studies[0]
	if p.Pushdown == nil || m.Pushdown != nil {
		t.Fatalf("push-down %v / in memory %v", p.Pushdown != nil, m.Pushdown == nil)
	}
	read := func(b []byte) [][]string {
		recs, err := csv.NewReader(strings.NewReader(string(b))).ReadAll()
		if err != nil {
			t.Fatal(err)
		}
		return recs
	}
	mr, pr := read(m.FlaggedCSV), read(p.FlaggedCSV)
	if len(mr) < 5 || len(pr) != len(mr) || p.Influence.FileRows != m.Influence.FileRows || p.Influence.File != m.Influence.File {
		t.Fatalf("in memory %d records (file %s, %d rows), pushed %d (file %s, %d rows); want the same, the 4 planted rows among them",
			len(mr), m.Influence.File, m.Influence.FileRows, len(pr), p.Influence.File, p.Influence.FileRows)
	}
	for i := range mr {
		for j := range mr[i] {
			a, b := mr[i][j], pr[i][j]
			va, ea := strconv.ParseFloat(a, 64)
			vb, eb := strconv.ParseFloat(b, 64)
			if ea == nil && eb == nil && i > 0 && j > 0 {
				if math.Abs(va-vb) > 1e-9*math.Max(math.Abs(va), 1e-12) {
					t.Errorf("row %d, %s: %s pushed, %s in memory", i, mr[0][j], b, a)
				}
				continue
			}
			if a != b {
				t.Errorf("row %d, %s: %q pushed, %q in memory", i, mr[0][j], b, a)
			}
		}
	}
}

// runBoth runs the studies (TOML, on dataset "d") on the table's rows
// read into memory and on its rows left in the database (max_rows =
// maxRows), named by the table's id column.
func runBoth(t *testing.T, url, table, studies string, maxRows int) (mem, pushed *report.Report) {
	t.Helper()
	t.Setenv("BIVAR_TEST_DB", url)
	dir := t.TempDir()
	decl := "[[dataset]]\nid = \"d\"\ntable = \"" + table + "\"\nconnection = \"BIVAR_TEST_DB\"\nid_column = \"id\"\n"
	mem, err := runManifest(t, dir, decl+studies)
	if err != nil {
		t.Fatal(err)
	}
	pushed, err = runManifest(t, dir, strings.Replace(decl, "id_column", "max_rows = "+strconv.Itoa(maxRows)+"\nid_column", 1)+studies)
	if err != nil {
		t.Fatal(err)
	}
	return mem, pushed
}
