package analysis_test

import (
	"encoding/csv"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"

	"bivar/analysis"
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
	bothRan(t, m, p)
	if n := sameFlaggedFile(t, m, p); n < 5 {
		t.Fatalf("%d records; want the header and the 4 planted rows at least", n)
	}
}

// sameFlaggedFile checks that the pushed-down study p writes the file of
// flagged rows that the study m in memory writes: the same records, the
// numbers within 1e-9 relative. It returns the number of records.
func sameFlaggedFile(t *testing.T, m, p report.Study) int {
	t.Helper()
	read := func(b []byte) [][]string {
		recs, err := csv.NewReader(strings.NewReader(string(b))).ReadAll()
		if err != nil {
			t.Fatal(err)
		}
		return recs
	}
	mr, pr := read(m.FlaggedCSV), read(p.FlaggedCSV)
	if len(pr) != len(mr) || p.Influence.FileRows != m.Influence.FileRows || p.Influence.File != m.Influence.File {
		t.Fatalf("in memory %d records (file %s, %d rows), pushed %d (file %s, %d rows); want the same",
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
	return len(mr)
}

// TestPushdownSoleSupport: when x takes two values and one of them is in
// a single row, that row alone sets the slope (leverage 1); a study whose
// rows stay in the database flags it sole support, names it first and
// lists it in its file as the study of the same rows in memory does
// (stats.LineInfluence, itself checked against statsmodels'
// OLSInfluence in its tests), whether the lone value is the largest x or
// the least, with every exact figure within 1e-9 relative.
func TestPushdownSoleSupport(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdsole", "CREATE TABLE pdsole (id text, x float8, xl float8, xf float8, y float8)",
		// Sines of multiples of an irrational step (reproducible on any
		// server); row r1500 alone at x = 35 (and at xl = 5, and at xf
		// = 10⁹ + 0.7 beside 10⁹ + 0.3: not whole and far from 0, where
		// the regression aggregates' Sxx rounds; from an independent
		// review, which found the study pushed down missed the row).
		`INSERT INTO pdsole SELECT 'r' || i, CASE WHEN i = 1500 THEN 35 ELSE 20 END, CASE WHEN i = 1500 THEN 5 ELSE 20 END,
		  CASE WHEN i = 1500 THEN 1e9 + 0.7 ELSE 1e9 + 0.3 END,
		  4 + sin(i * 1.3247 + 0.5) + CASE WHEN i = 1500 THEN 6 ELSE 0 END
		  FROM generate_series(1, 3000) i`)
	studies := "[[study]]\nid = \"hi\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n" +
		"[[study]]\nid = \"lo\"\ndataset = \"d\"\nx = \"xl\"\ny = \"y\"\n" +
		"[[study]]\nid = \"far\"\ndataset = \"d\"\nx = \"xf\"\ny = \"y\"\n"
	mem, pushed := runBoth(t, url, "pdsole", studies, 10)
	for i := range mem.Studies {
		m, p := mem.Studies[i], pushed.Studies[i]
		bothRan(t, m, p)
		if m.Influence.Counts.SoleSupport != 1 || len(m.Influence.Points) == 0 || m.Influence.Points[0].Row != "r1500" {
			t.Fatalf("study %s: the test data lost their point: in memory %d rows of sole support, named %v", m.ID, m.Influence.Counts.SoleSupport, m.Influence.Points)
		}
		if p.Influence.Counts != m.Influence.Counts {
			t.Errorf("study %s: flag counts %+v pushed, %+v in memory", m.ID, p.Influence.Counts, m.Influence.Counts)
		}
		if len(p.Influence.Points) != len(m.Influence.Points) {
			t.Errorf("study %s: %d named rows pushed, %d in memory", m.ID, len(p.Influence.Points), len(m.Influence.Points))
		}
		for k, pt := range p.Influence.Points {
			if k < len(m.Influence.Points) && (pt.Row != m.Influence.Points[k].Row || strings.Join(pt.Flags, "+") != strings.Join(m.Influence.Points[k].Flags, "+")) {
				t.Errorf("study %s: named row %d is %s %v, in memory %s %v", m.ID, k, pt.Row, pt.Flags, m.Influence.Points[k].Row, m.Influence.Points[k].Flags)
			}
		}
		agree(t, m.ID, exactFigures(p), exactFigures(m), 1e-9)
		sameFlaggedFile(t, m, p)
		for _, o := range p.Pushdown.Omitted {
			if strings.Contains(o.Figure, "sole support") {
				t.Errorf("study %s: the push-down still omits %q", m.ID, o.Figure)
			}
		}
	}
}

// bothRan stops the test unless study m ran in memory and p, the same
// study, ran with its rows left in the database, both without an error.
func bothRan(t *testing.T, m, p report.Study) {
	t.Helper()
	if m.Error != nil || p.Error != nil {
		t.Fatalf("study %s: errors %v in memory, %v pushed", m.ID, errText(m.Error), errText(p.Error))
	}
	if p.Pushdown == nil || m.Pushdown != nil {
		t.Fatalf("study %s: pushed down %v, in memory %v", m.ID, p.Pushdown != nil, m.Pushdown == nil)
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

// TestPushdownLackOfFit: where x is set to a few values on purpose, a
// study whose rows stay in the database runs the lack-of-fit test over
// every row as the study in memory does (stats.LackOfFit, itself checked
// against the pure-error F test of NIST/SEMATECH e-Handbook §4.4.4.3 in
// its tests): the same F, degrees of freedom and p to 1e-9 relative, and
// the same checks and verdicts; where x is continuous, the test is left
// out with the sample's count of values as the reason, and in memory it
// is not reported either.
func TestPushdownLackOfFit(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdlof", "CREATE TABLE pdlof (id text, x float8, xc float8, y float8, yc float8, xr float8, yr float8)",
		// Five set points far from 0, y bending over them (a quadratic
		// term the line misses); xc continuous, yc along it (sines of
		// multiples of irrational steps, reproducible on any server).
		`INSERT INTO pdlof SELECT 'r' || i, 1000 + 5 * (i % 5), 1000 + 10 * sin(i * 0.7071),
		  20 + 0.5 * (5 * (i % 5)) + 0.002 * (5 * (i % 5))^2 + sin(i * 1.3247 + 0.5),
		  20 + 0.5 * (10 * sin(i * 0.7071)) + sin(i * 1.3247 + 0.5),
		  (i % 7) * 0.1 + 1e3, 1e5 + 0.1 * (i % 7)^2 + 0.3 + 0.05 * sin((i % 7) * 1.7)
		  FROM generate_series(1, 3000) i`)
	studies := "[[study]]\nid = \"set\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n" +
		"[[study]]\nid = \"cont\"\ndataset = \"d\"\nx = \"xc\"\ny = \"yc\"\n" +
		// Exact replicates: y is one value at each of seven x far from 0,
		// so there is no pure error and no test, which both paths say
		// (no_pure_error; from an independent review: the database's sums
		// left rounding noise for one).
		"[[study]]\nid = \"replicates\"\ndataset = \"d\"\nx = \"xr\"\ny = \"yr\"\n"
	mem, pushed := runBoth(t, url, "pdlof", studies, 10)
	for i, want := range []struct{ reported, computed, noPureError bool }{{true, true, false}, {false, false, false}, {true, true, true}} {
		m, p := mem.Studies[i], pushed.Studies[i]
		bothRan(t, m, p)
		if (m.Diagnostics.LackOfFit != nil) != want.reported || want.reported && m.Diagnostics.LackOfFit.NoPureError != want.noPureError {
			t.Fatalf("study %s: the test data lost their point: lack of fit in memory %+v", m.ID, m.Diagnostics.LackOfFit)
		}
		if want.reported && (p.Diagnostics.LackOfFit == nil || p.Diagnostics.LackOfFit.NoPureError != want.noPureError) {
			t.Errorf("study %s: lack of fit pushed %+v, in memory %+v", m.ID, p.Diagnostics.LackOfFit, m.Diagnostics.LackOfFit)
		}
		agree(t, m.ID, exactFigures(p), exactFigures(m), 1e-9)
		omitted := false
		for _, o := range p.Pushdown.Omitted {
			omitted = omitted || o.Figure == "lack-of-fit test"
		}
		if (p.Diagnostics.LackOfFit != nil) != want.reported || omitted == want.computed || slices.Contains(p.Pushdown.Exact, "lack-of-fit test") != want.computed {
			t.Errorf("study %s: lack-of-fit test omitted %v, among the exact figures %v", m.ID, omitted, slices.Contains(p.Pushdown.Exact, "lack-of-fit test"))
		}
		if !slices.EqualFunc(p.Findings.Checks, m.Findings.Checks, func(a, b report.Check) bool { return a.Name == b.Name && a.Raised == b.Raised }) {
			t.Errorf("study %s: checks pushed %+v, in memory %+v", m.ID, p.Findings.Checks, m.Findings.Checks)
		}
	}
	t.Logf("set points: F = %v on %d and %d df, p = %v", mem.Studies[0].Diagnostics.LackOfFit.F, mem.Studies[0].Diagnostics.LackOfFit.DF1,
		mem.Studies[0].Diagnostics.LackOfFit.DF2, mem.Studies[0].Diagnostics.LackOfFit.P)
}

// TestPushdownManyFlagged: with more rows flagged than a pushed-down
// study fetches (lowered here to 2, with named_rows = 1; 10⁵ in use), the
// r and line without the flagged rows come from the database's sums of
// the rows kept, and agree with the study in memory to 1e-9 relative.
func TestPushdownManyFlagged(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdmany", "CREATE TABLE pdmany (id text, x float8, y float8)",
		// Sines of multiples of irrational steps (reproducible on any
		// server), five rows pushed far off the line.
		`INSERT INTO pdmany SELECT 'r' || i, 50 + 5 * sin(i * 0.7071),
		  2 + 0.4 * (50 + 5 * sin(i * 0.7071)) + sin(i * 1.3247 + 0.5)
		    + CASE WHEN i IN (40, 400, 1200, 1700, 2500) THEN 12 ELSE 0 END
		  FROM generate_series(1, 3000) i`)
	defer analysis.SetPushdownSuspectMax(2)()
	mem, pushed := runBoth(t, url, "pdmany", "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n[output]\nnamed_rows = 1\n", 10)
	m, p := mem.Studies[0], pushed.Studies[0]
	bothRan(t, m, p)
	if m.Influence.Counts.Suspect != 5 || p.Influence.Counts.Suspect != 5 {
		t.Fatalf("flagged rows: %d in memory, %d pushed; the test data planted 5", m.Influence.Counts.Suspect, p.Influence.Counts.Suspect)
	}
	got, want := map[string]float64{}, map[string]float64{}
	for _, f := range []struct {
		to *map[string]float64
		s  report.Study
	}{{&got, p}, {&want, m}} {
		se := f.s.Sensitivity
		*f.to = map[string]float64{"r_without": float64(se.RWithoutFlagged), "r_without_lo": float64(se.RWithoutLow), "p_without": float64(se.PWithoutFlagged),
			"slope_without": float64(se.SlopeWithoutFlagged), "intercept_without": float64(se.InterceptWithout)}
	}
	agree(t, "s", got, want, 1e-9)
	for _, o := range p.Pushdown.Omitted {
		if strings.Contains(o.Figure, "without the flagged rows") {
			t.Errorf("omitted: %+v", o)
		}
	}
	if math.IsNaN(got["r_without"]) {
		t.Errorf("r without the flagged rows is NaN")
	}
}

// TestPushdownBackslashLevel: a group level holding a backslash is read
// and matched on a server whose standard_conforming_strings is off (set
// here for the connection), where '…' literals take backslash escapes
// (from an independent review).
func TestPushdownBackslashLevel(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdslash", "CREATE TABLE pdslash (x float8, y float8, g text)",
		`INSERT INTO pdslash SELECT i, 0.5 * i + sin(i * 1.3247), CASE WHEN i % 2 = 0 THEN 'a\b' ELSE 'c' END FROM generate_series(1, 40) i`)
	t.Setenv("BIVAR_TEST_DB", url+"&standard_conforming_strings=off")
	r, err := runManifest(t, t.TempDir(), "[[dataset]]\nid = \"d\"\ntable = \"pdslash\"\nconnection = \"BIVAR_TEST_DB\"\nmax_rows = 10\n"+
		"[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\n")
	if err != nil {
		t.Fatal(err)
	}
	s := r.Studies[0]
	if s.Error != nil || s.Pushdown == nil || len(s.Groups) != 2 || s.Groups[0].Group != `a\b` || s.Groups[0].N != 20 {
		t.Errorf("error %s; pushed down %v; groups %+v", errText(s.Error), s.Pushdown != nil, s.Groups)
	}
}

// TestPushdownLackOfFitManyLevels: x on 25 000 values of 60 000 rows
// (each two or three times): more values in the sample of 20 000 than
// half its rows, yet the study in memory reports the test (at most half
// as many values as rows), and so does the study pushed down, with the
// same F and p (the case is an independent review's).
func TestPushdownLackOfFitManyLevels(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdlofm", "CREATE TABLE pdlofm (id text, x float8, y float8)",
		// Sines of multiples of an irrational step, reproducible on any server.
		`INSERT INTO pdlofm SELECT 'r' || i, 5 + 0.01 * (i % 25000), 2 + 0.3 * (5 + 0.01 * (i % 25000)) + 0.01 * (0.01 * (i % 25000))^2 + sin(i * 1.3247 + 0.5)
		  FROM generate_series(1, 60000) i`)
	mem, pushed := runBoth(t, url, "pdlofm", "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n", 10)
	m, p := mem.Studies[0], pushed.Studies[0]
	bothRan(t, m, p)
	if m.Diagnostics.LackOfFit == nil || p.Pushdown.Sample >= m.N {
		t.Fatalf("the test data lost their point: lack of fit in memory %+v, sample %d of %d rows", m.Diagnostics.LackOfFit, p.Pushdown.Sample, m.N)
	}
	agree(t, "s", exactFigures(p), exactFigures(m), 1e-9)
}
