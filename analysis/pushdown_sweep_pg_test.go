package analysis_test

import (
	"math"
	"slices"
	"strings"
	"testing"

	"bivar/analysis/report"
)

// A covariate that is a linear function of x (cz = 2x + 1 on 20 rows)
// leaves x nothing once it is held fixed: the partial correlation is
// undefined, in memory (stats.PartialCorrelation) and pushed down. Pushed
// down, Sxx − Sxz²/Szz was rounding (about 1e-16 of Sxx) and gave r = 0,
// p = 1 and the headline "Holding cz fixed, no association …" (found by
// a sweep of small tables). A covariate that leaves x less than
// partialFloor of its spread (cz = x + 1e-7·sin i) is left out pushed
// down, with the reason, where the database's sums cannot resolve it
// (they gave 0.0184 against 0.0176 in memory and by exact rational
// arithmetic, Python's fractions on the same rows).
func TestPushdownCollinearCovariate(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdcol",
		`CREATE TABLE pdcol AS SELECT i AS id, (i * 0.7)::float8 AS x, (i * 0.3 + cos(i) * 2)::float8 AS y, (i * 1.4 + 1)::float8 AS cz,
		  (i * 0.7 + 1e-7 * sin(i))::float8 AS cn FROM generate_series(1, 20) i`)
	studies := "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ncovariates = [\"cz\"]\n" +
		"[[study]]\nid = \"n\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ncovariates = [\"cn\"]\n"
	mem, pushed := runBothDecl(t, url, table("pdcol"), studies, 5)
	omitted := func(k int) string {
		var said []string
		for _, o := range pushed.Studies[k].Pushdown.Omitted {
			said = append(said, o.Figure)
		}
		return strings.Join(said, "; ")
	}
	m, p := mem.Studies[0], pushed.Studies[0]
	bothRan(t, m, p)
	if !math.IsNaN(float64(m.Partial[0].R)) || !math.IsNaN(float64(p.Partial[0].R)) {
		t.Errorf("partial r with cz = 2x + 1: in memory %v, pushed %v; want NaN in both", m.Partial[0].R, p.Partial[0].R)
	}
	if p.Findings.Headline != m.Findings.Headline || strings.Contains(p.Findings.Headline, "Holding") {
		t.Errorf("headline pushed %q, in memory %q", p.Findings.Headline, m.Findings.Headline)
	}
	if !strings.Contains(omitted(0), "partial correlation with cz") {
		t.Errorf("omitted: %s; want the partial correlation with cz", omitted(0))
	}
	m, p = mem.Studies[1], pushed.Studies[1]
	bothRan(t, m, p)
	if !math.IsNaN(float64(p.Partial[0].R)) || !strings.Contains(omitted(1), "partial correlation with cn") {
		t.Errorf("partial r with cn = x + 1e-7·sin i pushed down: %v, omitted %q; want NaN, left out (in memory %v)", p.Partial[0].R, omitted(1), m.Partial[0].R)
	}
}

// x far from 0 against its spread: 10¹² + 0.01·i (40 rows), and
// nanoseconds since 1970 one millisecond apart (bigint near 1.7·10¹⁸),
// with y's spread growing with i. Breusch–Pagan by exact rational
// arithmetic (Python's fractions on the same float64 rows):
// 15.070806931798003 and 15.072027183074082, as in memory to 1e-15;
// pushed down it was 15.070948738299405 (9.4e-6 off) and
// 15.072027299184265 (7.7e-9 off), Σr⁴ without its terms in the square
// and higher powers of the first pass's error in the slope, off by 5e-4
// here (found by a sweep of small tables).
func TestPushdownFarBreuschPagan(t *testing.T) {
	runAdv(t, []advCase{{name: "far-breusch-pagan", setup: []string{"DROP TABLE IF EXISTS pdfar",
		`CREATE TABLE pdfar AS SELECT i AS id, (1e12 + i * 0.01)::float8 AS x, (1700000000000000000::bigint + i * 1000000::bigint) AS xns,
		  (i * 0.5 + sin(i) * (1 + i * 0.1))::float8 AS y FROM generate_series(1, 40) i`},
		decl: table("pdfar"), studies: plain + "[[study]]\nid = \"ns\"\ndataset = \"d\"\nx = \"xns\"\ny = \"y\"\n", maxRows: 5}})
}

// Too few complete rows: the study fails in both paths with a message
// that names its columns (pushed down it said "only 2 rows of the 20
// rows are complete", naming none; found by a sweep of small tables).
func TestPushdownTooFewNamesColumns(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdfew",
		`CREATE TABLE pdfew AS SELECT i AS id, (i * 0.7)::float8 AS x, CASE WHEN i <= 2 THEN (i * 0.3)::float8 END AS y, (i % 3)::float8 AS cz FROM generate_series(1, 20) i`)
	mem, pushed := runBothDecl(t, url, table("pdfew"), "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ncovariates = [\"cz\"]\n", 5)
	want := `only 2 complete rows of x "x", y "y" and covariate "cz"`
	for _, s := range []struct {
		path string
		err  *string
	}{{"in memory", mem.Studies[0].Error}, {"pushed down", pushed.Studies[0].Error}} {
		if s.err == nil || !strings.Contains(*s.err, want) {
			t.Errorf("%s: error %v, want it to hold %q", s.path, errText(s.err), want)
		}
	}
}

// x a bigint near 2⁵³ against a spread of 80 (40 rows): the first
// pass's regression aggregates put Sxx 24% off, so the second pass's
// residuals of the first pass's line were mostly that line's error, and
// the RSS and Breusch–Pagan, formed from them, cancelled their digits;
// above 2⁵³ the mean of x (2⁵³ + 11) is no float64, and every deviation
// from it shared its rounding. Pushed down, Breusch–Pagan was 0.718 for
// "s" (in memory 1.411) and 0.0948 for "far" (in memory 14.71, p =
// 0.000125: the spread changes), NaN with y = 1000i + 0.1·sin i, whose
// check then went missing (found by a sweep of small tables). References
// on the same float64 rows: statsmodels 0.13.5,
// het_breuschpagan(OLS(y, [1, u]).fit().resid, [1, u], robust=True)
// with u = x − x̄ formed exactly (Python's fractions; Koenker's statistic
// does not change with a shift of x): 1.4108932542645691 for "s" and
// 14.712308010703108 for "far"; the line's RSS of "far" by exact rational
// arithmetic (Python's fractions, least squares on the rows),
// 0.8722137563341967. For "far", r is within 1 − r² = 1.6e-10 of 1,
// so Pearson's p and the r interval's half-width (the plan's) carry the
// rounding of r² in either path (p = 1.490045e-187 by exact r² and
// mpmath's incomplete beta function, in memory 1.490095e-187, pushed
// down 1.489980e-187). "ord", the rows of "s" in run order, checks the
// run-order sums of the second pass run again against memory.
func TestPushdownNear2To53(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pd2to53",
		`CREATE TABLE pd2to53 AS SELECT i AS id, (9007199254740000 + 2 * i)::bigint AS x, (2.5 + 1000 * i + cos(3 * i))::float8 AS y,
		  (9007199254740992 - 30 + 2 * i)::bigint AS xb, (1000 * i + 0.01 * i * cos(3 * i))::float8 AS yb FROM generate_series(1, 40) i`)
	studies := plain + "[[study]]\nid = \"far\"\ndataset = \"d\"\nx = \"xb\"\ny = \"yb\"\n" +
		"[[study]]\nid = \"ord\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\norder = \"id\"\n"
	mem, pushed := runBothDecl(t, url, table("pd2to53"), studies, 5)
	ill := "r within 1.6e-10 of 1: the figure carries the rounding of r² in either path"
	for i := range mem.Studies {
		sameStudy(t, mem.Studies[i].ID, mem.Studies[i], pushed.Studies[i], map[string]string{"far/r_p": ill, "far/plan_r_now": ill})
	}
	for _, c := range []struct {
		study, fig string
		k          int
		want       float64
	}{{"s", "bp", 0, 1.4108932542645691}, {"far", "bp", 1, 14.712308010703108}, {"far", "line_rss", 1, 0.8722137563341967}} {
		if got := exactFigures(pushed.Studies[c.k])[c.fig]; !(math.Abs(got-c.want) <= 1e-9*math.Abs(c.want)) {
			t.Errorf("%s: %s pushed down %.17g, reference %.17g", c.study, c.fig, got, c.want)
		}
	}
}

// numeric cells beyond double precision's range (PostgreSQL's numeric
// holds 1e400): in memory a cell's text read by strconv.ParseFloat, ±Inf
// for ±1e400 (not a finite number, left out as Infinity is under
// non_numeric = "missing"), −0 and 0 for ∓1e-400 (IEEE 754 rounding to
// nearest: below half the least subnormal). Pushed down the study failed:
// "value out of range: overflow" (found by a sweep of small tables). Both
// paths now leave out the same 3 rows of y, 1e400, −1e400 and Infinity,
// and give the same study.
func TestPushdownNumericOutOfRange(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdnumrange",
		`CREATE TABLE pdnumrange AS SELECT i AS id, (i * 0.7)::numeric AS x, CASE WHEN i = 3 THEN 1e400 WHEN i = 4 THEN -1e400 WHEN i = 5 THEN -1e-400
		  WHEN i = 6 THEN 1e-400 WHEN i = 7 THEN 'Infinity'::numeric ELSE (i * 0.3 + cos(i))::numeric END AS y FROM generate_series(1, 20) i`)
	mem, pushed := runBothDecl(t, url, table("pdnumrange")+"non_numeric = \"missing\"\n", plain, 5)
	m, p := mem.Studies[0], pushed.Studies[0]
	sameStudy(t, "s", m, p, nil)
	want := []report.Exclusion{{Column: "y", Rows: 3, Reason: "non-numeric"}}
	for _, s := range []struct {
		path string
		st   report.Study
	}{{"in memory", m}, {"pushed down", p}} {
		if !slices.Equal(s.st.Excluded, want) || s.st.N != 17 {
			t.Errorf("%s: n = %d, excluded %+v; want 17 rows, %+v", s.path, s.st.N, s.st.Excluded, want)
		}
	}
}

// A group level whose rows lie on a line to the rounding of the numbers
// (x = 0.1, 0.2, 0.4, y = 2 + x): its slope's interval from the level's
// centred sums, Syy − Sxy²/Sxx, kept only the rounding of Syy, and was
// 1 ± 2.7e-7 pushed down against ±7e-15 in memory (found by a sweep of
// small tables). Reference: exact rational arithmetic on the same float64
// rows (Python's fractions: slope 0.9999999999999992, RSS 1.41e-32) with
// t(0.975, 1) = 12.706204736432095 from scipy 1.10.1 (scipy.stats.t.ppf),
// the interval 0.9999999999999922 to 1.0000000000000062; each bound is
// held to 1e-13, the rounding of the slope itself. Level c, small
// integers with y = 41 + x exactly, was 1 ± 1.9e-8 pushed down: its
// interval is [1, 1] (RSS 0 in exact arithmetic).
func TestPushdownGroupExactLine(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdgexact",
		`CREATE TABLE pdgexact AS SELECT row_number() OVER () AS id, * FROM (SELECT v AS x, 2 + v AS y, 'a' AS g FROM unnest(ARRAY[0.1, 0.2, 0.4]::float8[]) v
		  UNION ALL SELECT i::float8, (0.5 * i + sin(i))::float8, 'b' FROM generate_series(1, 20) i
		  UNION ALL SELECT v, 41 + v, 'c' FROM unnest(ARRAY[24, 53, 25, 38, 14, 50, 57]::float8[]) v) AS t`)
	mem, pushed := runBothDecl(t, url, table("pdgexact"), "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\n", 5)
	sameStudy(t, "s", mem.Studies[0], pushed.Studies[0], nil)
	for _, s := range []struct {
		path string
		st   report.Study
	}{{"in memory", mem.Studies[0]}, {"pushed down", pushed.Studies[0]}} {
		if len(s.st.Groups) != 3 {
			t.Fatalf("%s: %d group levels, want 3", s.path, len(s.st.Groups))
		}
		for _, w := range []struct {
			k      int
			lo, hi float64
		}{{0, 0.9999999999999922, 1.0000000000000062}, {2, 1, 1}} {
			g := s.st.Groups[w.k]
			if math.Abs(float64(g.SlopeLow)-w.lo) > 1e-13 || math.Abs(float64(g.SlopeHigh)-w.hi) > 1e-13 {
				t.Errorf("%s: level %s's slope interval [%.17g, %.17g], want [%.17g, %.17g] to 1e-13", s.path, g.Group, g.SlopeLow, g.SlopeHigh, w.lo, w.hi)
			}
		}
	}
}

// Rows exactly on y = 3 − 0.7·x in decimal arithmetic, y computed by the
// server in double precision (3 − 7·0.1·i): the line leaves only
// rounding, and in memory stats.NewLineInfluence takes its RSS, at or
// below (16ε)²·Σy², for an exact fit that flags no row an outlier.
// Pushed down, the third pass flagged 13 rows outliers, with studentized
// residuals of −7.6 read from that rounding, and the headline named them
// (from an independent review).
func TestPushdownExactLineNoOutliers(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdexact",
		`CREATE TABLE pdexact AS SELECT i AS id, i::float8 AS x, (3 - 7 * 0.1::float8 * i)::float8 AS y, (i * 37 % 201)::float8 AS o FROM generate_series(1, 200) i`)
	mem, pushed := runBothDecl(t, url, table("pdexact"), "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\norder = \"o\"\n", 100)
	m, p := mem.Studies[0], pushed.Studies[0]
	bothRan(t, m, p)
	if !m.Line.ExactToRounding || !p.Line.ExactToRounding {
		t.Fatalf("exact to rounding: in memory %v, pushed %v; want both", m.Line.ExactToRounding, p.Line.ExactToRounding)
	}
	if m.Influence.Counts != p.Influence.Counts || p.Influence.Counts.Outlier != 0 {
		t.Errorf("flags pushed %+v, in memory %+v; want no outlier in either", p.Influence.Counts, m.Influence.Counts)
	}
	if p.Findings.Headline != m.Findings.Headline {
		t.Errorf("headline pushed %q, in memory %q", p.Findings.Headline, m.Findings.Headline)
	}
}

// Eight settings of x run three times each, y the same in every repeat
// (as TestLackOfFitNoPureError in memory): pushed down the lack-of-fit
// test was left out without a word; both paths now say it has no pure
// error, on the same degrees of freedom.
func TestPushdownLackOfFitNoPureError(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdnope",
		`CREATE TABLE pdnope AS SELECT i AS id, (1 + i % 8)::float8 AS x, ((1 + i % 8) * (1 + i % 8) % 7 + 2 * (1 + i % 8))::float8 AS y FROM generate_series(1, 24) i`)
	mem, pushed := runBothDecl(t, url, table("pdnope"), "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n", 5)
	m, p := mem.Studies[0], pushed.Studies[0]
	bothRan(t, m, p)
	ml, pl := m.Diagnostics.LackOfFit, p.Diagnostics.LackOfFit
	if ml == nil || pl == nil || !ml.NoPureError || !pl.NoPureError || ml.DF1 != pl.DF1 || ml.DF2 != pl.DF2 {
		t.Errorf("lack of fit in memory %+v, pushed %+v; want no pure error in both, on the same df", ml, pl)
	}
}

// A column of a type bivar does not read (money, uuid, an enum, jsonb,
// interval, time, an array) is refused whether the rows are fetched or
// left in the database, as a number and as a group or id_column, and a
// text or boolean column used as a number: each message names the
// column and its type as PostgreSQL's format_type names it, and says to
// cast it in the query; the dataset fails in both paths. Pushed down, a
// group or id of such a type was grouped by its text where in memory it
// failed, the messages said "the column is text" of a boolean and "the
// column's type is not one bivar reads" without the type nor the
// dataset, and only the study that used the column failed where in
// memory the dataset does (found by a sweep of column types). The
// advice said "::double precision" of money, an interval, json and a
// boolean, which PostgreSQL refuses.
func TestPushdownColumnTypes(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdtypes", "DROP TYPE IF EXISTS pdlevel", "CREATE TYPE pdlevel AS ENUM ('lo', 'hi')",
		`CREATE TABLE pdtypes AS SELECT i AS id, (i * 0.7 + sin(i))::float8 AS x, (i * 0.3 + cos(i) * 2)::float8 AS y,
		  (i * 1.5)::numeric::money AS m, md5(i::text)::uuid AS u, (ARRAY['lo', 'hi']::pdlevel[])[i % 2 + 1] AS e,
		  jsonb_build_object('t', i) AS j, i * INTERVAL '1 min' AS iv, TIME '01:00' + i * INTERVAL '1 s' AS tm, ARRAY[i] AS a, (i % 2 = 0) AS b, (i % 3)::text AS s
		  FROM generate_series(1, 20) i`)
	// Each message's advice is SQL, run below on the table: PostgreSQL
	// casts money to numeric and not to double precision, and an
	// interval or a time to no number (its own documented casts, \dC).
	cases := []struct {
		col, typ, msg, sql string
	}{
		{"m", "money", `which bivar does not read: cast it in the query to numeric ("m"::numeric AS "m")`, `"m"::numeric`},
		{"u", "uuid", `which bivar does not read: cast it in the query to a number ("u"::double precision), a timestamp, or text for a group or an id ("u"::text)`, `"u"::text`},
		{"e", "pdlevel", `which bivar does not read: cast it in the query to a number ("e"::double precision), a timestamp, or text for a group or an id ("e"::text)`, `"e"::text`},
		{"j", "jsonb", `which bivar does not read: take a value out of it in the query (("j"->>'key')::double precision AS "j")`, `("j"->>'t')::double precision`},
		{"iv", "interval", `which bivar does not read: take its seconds in the query (EXTRACT(EPOCH FROM "iv") AS "iv")`, `EXTRACT(EPOCH FROM "iv")`},
		{"tm", "time without time zone", `which bivar does not read: take its seconds in the query (EXTRACT(EPOCH FROM "tm") AS "tm")`, `EXTRACT(EPOCH FROM "tm")`},
		{"a", "integer[]", `which bivar does not read: take an element out of it in the query ("a"[1] AS "a")`, `"a"[1]`},
		{"b", "boolean", `and a study uses it as a number: choose a numeric column, or cast it in the query ("b"::integer)`, `"b"::integer`},
		{"s", "text", `and a study uses it as a number: choose a numeric column, or cast it in the query ("s"::double precision)`, `"s"::double precision`},
	}
	for _, c := range cases {
		pgExec(t, url, "SELECT "+c.sql+" FROM pdtypes")
	}
	for _, c := range cases {
		roles := map[string]struct{ decl, study string }{
			"x":     {table("pdtypes"), "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"" + c.col + "\"\ny = \"y\"\n"},
			"group": {table("pdtypes"), plain + "group = \"" + c.col + "\"\n"},
			"id":    {"table = \"pdtypes\"\nid_column = \"" + c.col + "\"\n", plain},
		}
		for _, role := range []string{"x", "group", "id"} {
			if (c.col == "b" || c.col == "s") && role != "x" {
				continue // text and boolean serve as a group and an id
			}
			t.Run(c.col+"/"+role, func(t *testing.T) {
				t.Setenv("BIVAR_TEST_DB", url)
				dir := t.TempDir()
				r := roles[role]
				head := "[[dataset]]\nid = \"d\"\nconnection = \"BIVAR_TEST_DB\"\n" + r.decl
				want := `pg.toml:1): PostgreSQL (BIVAR_TEST_DB): column "` + c.col + `": the column is of type ` + c.typ + ", " + c.msg
				for _, limit := range []string{"", "max_rows = 5\n"} {
					_, err := runManifest(t, dir, head+limit+r.study)
					if err == nil || !strings.Contains(err.Error(), want) || !strings.HasPrefix(err.Error(), `dataset "d" (`) {
						t.Errorf("%q: %v; want dataset \"d\" and %q", limit, err, want)
					}
				}
			})
		}
	}
}

// An oid column reads as a number pushed down as in memory: PostgreSQL
// casts oid to bigint but not to double precision, and the study failed
// with "cannot cast type oid to double precision" where in memory it ran
// (found by a sweep of column types).
func TestPushdownOidColumn(t *testing.T) {
	runAdv(t, []advCase{{name: "oid", setup: []string{"DROP TABLE IF EXISTS pdoid",
		`CREATE TABLE pdoid AS SELECT i AS id, (i * 7 + i % 3)::oid AS x, (i * 0.3 + cos(i) * 2)::float8 AS y FROM generate_series(1, 30) i`},
		decl: table("pdoid"), studies: plain + "[[study]]\nid = \"o\"\ndataset = \"d\"\nx = \"y\"\ny = \"x\"\norder = \"x\"\n", maxRows: 5}})
}

// A date column holding 'infinity' and '-infinity' (PostgreSQL's
// documented special date values) beside NULL: the study that does not
// use it runs pushed down as in memory, and with non_numeric = "missing"
// the study of it as x counts the two as non-numeric in both. Pushed
// down the dataset's hash subtracted a date from each date, and the
// server refused ("cannot subtract infinite dates"), so every study of
// the dataset failed (found by a sweep of column types).
func TestPushdownInfiniteDate(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdinfdate",
		`CREATE TABLE pdinfdate AS SELECT i AS id, (i * 0.7 + sin(i))::float8 AS x, (i * 0.3 + cos(i) * 2)::float8 AS y,
		  CASE WHEN i = 3 THEN 'infinity'::date WHEN i = 4 THEN '-infinity'::date WHEN i = 5 THEN NULL ELSE DATE '2026-01-01' + i * 3 END AS d
		  FROM generate_series(1, 30) i`)
	mem, pushed := runBothDecl(t, url, table("pdinfdate")+"non_numeric = \"missing\"\n",
		plain+"[[study]]\nid = \"d\"\ndataset = \"d\"\nx = \"d\"\ny = \"y\"\n", 5)
	for i := range mem.Studies {
		m, p := mem.Studies[i], pushed.Studies[i]
		sameStudy(t, m.ID, m, p, nil)
	}
	m, p := mem.Studies[1], pushed.Studies[1]
	if m.N != 27 || p.N != 27 || !slices.Equal(m.Excluded, p.Excluded) {
		t.Errorf("x = d: n %d in memory, %d pushed (want 27: one NULL, two infinite); excluded %v in memory, %v pushed", m.N, p.N, m.Excluded, p.Excluded)
	}
}

// A query whose result names a column a study uses twice (SELECT x, …,
// y * 2 AS x) fails the dataset in both paths with one message, naming
// the two columns and how to rename one: fetched it said "the header
// names this column twice", pushed down it was the server's "column
// reference "x" is ambiguous" (found by a sweep of column types). A
// duplicate the studies do not use is no error in either.
func TestPushdownDuplicateColumn(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pddup",
		`CREATE TABLE pddup AS SELECT i AS id, (i * 0.7 + sin(i))::float8 AS x, (i * 0.3 + cos(i) * 2)::float8 AS y FROM generate_series(1, 20) i`)
	t.Setenv("BIVAR_TEST_DB", url)
	for _, c := range []struct{ query, want string }{
		{"SELECT id, x, y, y * 2 AS x FROM pddup", `column "x": the result names this column twice (columns 2 and 4), and a study uses it: give one of them another name in the query (… AS another_name)`},
		{"SELECT id, x, y, x AS id FROM pddup", `column "id": the result names this column twice (columns 1 and 4), and a study uses it`},
		{"SELECT id, x, y, y AS z, x AS z FROM pddup", ""},
	} {
		head := "[[dataset]]\nid = \"d\"\nconnection = \"BIVAR_TEST_DB\"\nquery = \"" + c.query + "\"\nid_column = \"id\"\n"
		for _, limit := range []string{"", "max_rows = 5\n"} {
			r, err := runManifest(t, t.TempDir(), head+limit+plain)
			if c.want == "" {
				if err != nil || r.Studies[0].Error != nil {
					t.Errorf("%s (%q): %v %v; want the study to run", c.query, limit, err, r)
				}
				continue
			}
			if err == nil || !strings.Contains(err.Error(), `pg.toml:1): PostgreSQL (BIVAR_TEST_DB): `+c.want) {
				t.Errorf("%s (%q): %v\nwant %s", c.query, limit, err, c.want)
			}
		}
	}
}
