package analysis_test

import (
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"

	"bivar/analysis/report"
)

// The push-down against the study of the same rows in memory on data
// built to be awkward rather than tidy: the in-memory path is the
// reference (itself checked against NIST StRD, statsmodels and scipy in
// its own tests), and a pushed-down study must give its exact figures to
// 1e-9 relative, the same flags, named rows and verdicts, and fail where
// it fails. Every table is generated from sines of multiples of
// irrational steps, reproducible on any server.

// advCase is one adversarial dataset: the SQL that builds it, the
// dataset's declaration (without max_rows and connection), the studies,
// and the max_rows that pushes it down.
type advCase struct {
	name    string
	setup   []string
	decl    string
	studies string
	maxRows int
	// notHere lists figures ("study/figure") left out of the comparison,
	// each with the reason (where the in-memory reference is itself off).
	notHere map[string]string
}

// runBothDecl runs studies on the dataset decl read into memory and left
// in the database (max_rows = maxRows).
func runBothDecl(t *testing.T, url, decl, studies string, maxRows int) (mem, pushed *report.Report) {
	t.Helper()
	t.Setenv("BIVAR_TEST_DB", url)
	dir := t.TempDir()
	head := "[[dataset]]\nid = \"d\"\nconnection = \"BIVAR_TEST_DB\"\n" + decl
	mem, err := runManifest(t, dir, head+studies)
	if err != nil {
		t.Fatal(err)
	}
	pushed, err = runManifest(t, dir, head+"max_rows = "+strconv.Itoa(maxRows)+"\n"+studies)
	if err != nil {
		t.Fatal(err)
	}
	return mem, pushed
}

// sameStudy checks that the pushed-down study p is the study m in
// memory: both fail or neither does; the exact figures within 1e-9
// relative; the flag counts, the named rows with their flags, the rows
// at the leave-one-out extremes of r, the file of flagged rows; and every
// verdict that does not read a figure the push-down leaves out.
func sameStudy(t *testing.T, what string, m, p report.Study, notHere map[string]string) {
	t.Helper()
	if (m.Error == nil) != (p.Error == nil) {
		t.Errorf("%s: in memory error %q, pushed error %q", what, errText(m.Error), errText(p.Error))
		return
	}
	if m.Error != nil {
		t.Logf("%s: both fail: in memory %q; pushed %q", what, *m.Error, *p.Error)
		return
	}
	bothRan(t, m, p)
	got, want := exactFigures(p), exactFigures(m)
	for k, why := range notHere {
		if fig, ok := strings.CutPrefix(k, what+"/"); ok {
			t.Logf("%s: %s not compared (%s): %.17g pushed, %.17g in memory", what, fig, why, got[fig], want[fig])
			delete(got, fig)
			delete(want, fig)
		}
	}
	agree(t, what, got, want, 1e-9)
	if p.Influence.Counts != m.Influence.Counts {
		t.Errorf("%s: flag counts %+v pushed, %+v in memory", what, p.Influence.Counts, m.Influence.Counts)
	}
	// The unit table's row in the recorded units is the line, as in
	// memory (it was Sxy/Sxx and ȳ − b·x̄ in one part: x near 10⁹ moved
	// its intercept by parts in 10⁹).
	if u := p.UnitInvariance[0]; u.Slope != p.Line.Slope.Estimate || u.Intercept != p.Line.Intercept.Estimate {
		t.Errorf("%s: unit table's first row %v, %v; the line %v, %v", what, u.Slope, u.Intercept, p.Line.Slope.Estimate, p.Line.Intercept.Estimate)
	}
	if len(p.Influence.Points) != len(m.Influence.Points) {
		t.Errorf("%s: %d named rows pushed, %d in memory", what, len(p.Influence.Points), len(m.Influence.Points))
	}
	for k, pt := range p.Influence.Points {
		if k < len(m.Influence.Points) && (!sameRowName(pt.Row, m.Influence.Points[k].Row) || strings.Join(pt.Flags, "+") != strings.Join(m.Influence.Points[k].Flags, "+")) {
			t.Errorf("%s: named row %d is %s %v, in memory %s %v", what, k, pt.Row, pt.Flags, m.Influence.Points[k].Row, m.Influence.Points[k].Flags)
		}
	}
	if !sameRowName(p.Sensitivity.LooRMinRow, m.Sensitivity.LooRMinRow) || !sameRowName(p.Sensitivity.LooRMaxRow, m.Sensitivity.LooRMaxRow) {
		t.Errorf("%s: rows at the leave-one-out extremes of r %q and %q, in memory %q and %q", what,
			p.Sensitivity.LooRMinRow, p.Sensitivity.LooRMaxRow, m.Sensitivity.LooRMinRow, m.Sensitivity.LooRMaxRow)
	}
	if (len(m.FlaggedCSV) > 0 || len(p.FlaggedCSV) > 0) && !strings.Contains(string(p.FlaggedCSV), "(x = ") {
		sameFlaggedFile(t, m, p)
	}
	if p.Plot.Scatter == nil || sum(p.Plot.Scatter.Counts) != p.N {
		t.Errorf("%s: the density grid holds %v rows, want %d", what, p.Plot.Scatter, p.N)
	}
	mf, pf := m.Findings, p.Findings
	if mf == nil || pf == nil {
		t.Errorf("%s: findings %v pushed, %v in memory", what, pf != nil, mf != nil)
		return
	}
	type verdicts struct {
		Form, Direction, Strength, CurveStrength, Lines, Rows string
		Bend                                                  string
		TurnsOver, OutlierDriven, Reversal, Drift, Spread     bool
		Autocorrelated                                        bool
		ExplainedBy                                           string
	}
	of := func(f *report.Findings) verdicts {
		v := verdicts{Form: f.Form, Direction: f.Direction, Strength: f.Strength, CurveStrength: f.CurveStrength, Lines: f.Lines, Rows: f.Rows,
			TurnsOver: f.TurnsOver, OutlierDriven: f.OutlierDriven, Reversal: f.Reversal, Drift: f.Drift, Spread: f.SpreadChanges,
			Autocorrelated: f.Autocorrelated, ExplainedBy: strings.Join(f.ExplainedBy, ",")}
		if f.Bend != nil {
			v.Bend = *f.Bend
		}
		return v
	}
	if of(pf) != of(mf) {
		t.Errorf("%s: verdicts pushed %+v, in memory %+v", what, of(pf), of(mf))
	}
	// The checks the verdicts read, by name, with their raised state.
	checks := func(f *report.Findings) []string {
		var out []string
		for _, c := range f.Checks {
			out = append(out, c.Name+"="+strconv.FormatBool(c.Raised))
		}
		slices.Sort(out)
		return out
	}
	if !slices.Equal(checks(pf), checks(mf)) {
		t.Errorf("%s: checks pushed %v, in memory %v", what, checks(pf), checks(mf))
	}
}

// sameRowName says whether a pushed-down row's name is the in-memory
// one: the same id, or, for a row without one, its values where in
// memory its data row number (rows left in the database have none).
func sameRowName(pushed, mem string) bool {
	if pushed == mem {
		return true
	}
	_, err := strconv.Atoi(mem)
	return err == nil && strings.HasPrefix(pushed, "(x = ")
}

// runAdv builds each case's table, runs its studies both ways and
// compares every study.
func runAdv(t *testing.T, cases []advCase) {
	url := pgURL(t)
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			pgExec(t, url, c.setup...)
			mem, pushed := runBothDecl(t, url, c.decl, c.studies, c.maxRows)
			if len(mem.Studies) != len(pushed.Studies) {
				t.Fatalf("%d studies in memory, %d pushed", len(mem.Studies), len(pushed.Studies))
			}
			for i := range mem.Studies {
				sameStudy(t, mem.Studies[i].ID, mem.Studies[i], pushed.Studies[i], c.notHere)
			}
		})
	}
}

// table is the declaration of a table dataset with id_column id.
func table(name string) string {
	return "table = \"" + name + "\"\nid_column = \"id\"\n"
}

// plain is a study of y on x.
const plain = "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n"

func TestPushdownAdversarial(t *testing.T) {
	runAdv(t, []advCase{
		// x near 10⁹ with a spread of 1, y near 10⁶: the means hold nine
		// of the sixteen digits, the centred sums must not lose them;
		// with a group, an order and a covariate also far from 0. The
		// named row's measures (deviations from the means in two parts),
		// the rows at the leave-one-out extremes (told by the server's own
		// r), Breusch–Pagan (with the refined slope) and the group lines
		// (the levels' sums by the corrected two-pass algorithm; the F of
		// the slopes' comparison was off by 2.5e-6) failed here.
		{name: "far-from-zero", setup: []string{"DROP TABLE IF EXISTS adv_far",
			"CREATE TABLE adv_far (id text, x float8, y float8, z float8, g text, o float8)",
			`INSERT INTO adv_far SELECT 'r' || i, 1e9 + sin(i * 0.7071), 1e6 + 0.5 * sin(i * 0.7071) + 0.05 * sin(i * 1.3247 + 0.5) + CASE WHEN i = 33 THEN 0.4 ELSE 0 END,
			  1e8 + cos(i * 0.4142), CASE WHEN i % 2 = 0 THEN 'a' ELSE 'b' END, 1.7e9 + i / 3
			  FROM generate_series(1, 300) i`},
			decl:    table("adv_far"),
			studies: plain + "[[study]]\nid = \"full\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\norder = \"o\"\ncovariates = [\"z\"]\n",
			maxRows: 10,
			// Exact rational arithmetic on the same float64 rows (Python
			// 3's fractions.Fraction, RSS of one line less the two lines'
			// over the two levels) gives F = 0.41617154035385434: pushed
			// 0.41617154035385823; in memory 0.41617153718587402 until
			// stats.CompareGroupLines took its means by the corrected
			// two-pass algorithm (TestCompareGroupLinesFarFromZero).
		},
		// x from 10⁻⁶ to 10⁶ (twelve decades), y proportional with a
		// multiplicative wobble: a few rows carry all of Sxx.
		{name: "many-magnitudes", setup: []string{"DROP TABLE IF EXISTS adv_mag",
			"CREATE TABLE adv_mag (id text, x float8, y float8)",
			`INSERT INTO adv_mag SELECT 'r' || i, power(10, 6 * sin(i * 0.7071)), 3 * power(10, 6 * sin(i * 0.7071)) * (1 + 0.1 * sin(i * 1.3247)) + sin(i * 2.2361)
			  FROM generate_series(1, 400) i`},
			decl: table("adv_mag"), studies: plain, maxRows: 10},
		// x takes two values, balanced: every row has the same leverage,
		// the quadratic is singular.
		{name: "two-x-values", setup: []string{"DROP TABLE IF EXISTS adv_two",
			"CREATE TABLE adv_two (id text, x float8, y float8)",
			`INSERT INTO adv_two SELECT 'r' || i, i % 2, 1 + 0.7 * (i % 2) + sin(i * 1.3247 + 0.5) FROM generate_series(1, 200) i`},
			decl: table("adv_two"), studies: plain, maxRows: 10},
		// x takes three values: replicates at each, a quadratic with
		// three distinct x (exactly determined at the means).
		{name: "three-x-values", setup: []string{"DROP TABLE IF EXISTS adv_three",
			"CREATE TABLE adv_three (id text, x float8, y float8)",
			`INSERT INTO adv_three SELECT 'r' || i, 1 + i % 3, 1 + 0.7 * (i % 3) + 0.3 * (i % 3) * (i % 3) + sin(i * 1.3247 + 0.5) FROM generate_series(1, 150) i`},
			decl: table("adv_three"), studies: plain, maxRows: 10},
		// x takes two values with two and three rows on one side: high
		// leverage, not sole support; r without the flagged rows is
		// summed over the kept rows.
		{name: "two-values-few-rows", setup: []string{"DROP TABLE IF EXISTS adv_few",
			"CREATE TABLE adv_few (id text, x float8, xt float8, y float8)",
			`INSERT INTO adv_few SELECT 'r' || i, CASE WHEN i <= 2 THEN 7 ELSE 3 END, CASE WHEN i <= 3 THEN 7 ELSE 3 END, 2 + sin(i * 1.3247 + 0.5) + CASE WHEN i <= 2 THEN 3 ELSE 0 END
			  FROM generate_series(1, 100) i`},
			decl: table("adv_few"), studies: plain + "[[study]]\nid = \"three\"\ndataset = \"d\"\nx = \"xt\"\ny = \"y\"\n", maxRows: 10},
		// Groups of one and two rows, a group whose x is constant and one
		// whose y is constant, beside two ordinary ones.
		{name: "awkward-groups", setup: []string{"DROP TABLE IF EXISTS adv_grp",
			"CREATE TABLE adv_grp (id text, x float8, y float8, g text)",
			`INSERT INTO adv_grp SELECT 'r' || i, 10 + 3 * sin(i * 0.7071), 4 + 0.5 * (10 + 3 * sin(i * 0.7071)) + sin(i * 1.3247 + 0.5),
			  CASE WHEN i % 2 = 0 THEN 'a' ELSE 'b' END FROM generate_series(1, 120) i`,
			"INSERT INTO adv_grp VALUES ('one', 11, 9, 'single'), ('two1', 9, 8, 'pair'), ('two2', 12, 10, 'pair')",
			"INSERT INTO adv_grp SELECT 'cx' || i, 10, 9 + sin(i), 'constx' FROM generate_series(1, 6) i",
			"INSERT INTO adv_grp SELECT 'cy' || i, 8 + i, 9.5, 'consty' FROM generate_series(1, 6) i"},
			decl:    table("adv_grp"),
			studies: "[[study]]\nid = \"g\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\n", maxRows: 10},
		// NULL cells, NaN and ±Infinity counted as missing, in x, y, a
		// covariate and the order.
		{name: "nulls-and-nonfinite", setup: []string{"DROP TABLE IF EXISTS adv_nan",
			"CREATE TABLE adv_nan (id text, x float8, y float8, z float8, o float8)",
			`INSERT INTO adv_nan SELECT 'r' || i,
			  CASE WHEN i % 7 = 0 THEN NULL WHEN i % 11 = 0 THEN 'NaN' ELSE 5 + sin(i * 0.7071) END,
			  CASE WHEN i % 5 = 0 THEN NULL WHEN i % 13 = 0 THEN 'Infinity' WHEN i % 17 = 0 THEN '-Infinity' ELSE 2 * sin(i * 0.7071) + sin(i * 1.3247) END,
			  CASE WHEN i % 19 = 0 THEN 'NaN' ELSE cos(i * 0.4142) END, CASE WHEN i % 23 = 0 THEN NULL ELSE i END
			  FROM generate_series(1, 400) i`},
			decl:    table("adv_nan") + "non_numeric = \"missing\"\n",
			studies: plain + "[[study]]\nid = \"full\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\norder = \"o\"\ncovariates = [\"z\"]\n", maxRows: 10},
		// Run orders: a timestamp, one with 4 orders shared by 50 rows
		// each, one where every row has the same order.
		{name: "awkward-orders", setup: []string{"DROP TABLE IF EXISTS adv_ord",
			"CREATE TABLE adv_ord (id text, x float8, y float8, ts timestamptz, ot integer, oc integer)",
			`INSERT INTO adv_ord SELECT 'r' || i, sin(i * 0.7071), sin(i * 0.7071) + 0.5 * sin(i * 1.3247) + 0.002 * i,
			  timestamptz '2026-10-01 08:00:00+00' + i * interval '37 minutes', i % 4, 1 FROM generate_series(1, 200) i`},
			decl: table("adv_ord"),
			studies: "[[study]]\nid = \"ts\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\norder = \"ts\"\n" +
				"[[study]]\nid = \"ties\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\norder = \"ot\"\n" +
				"[[study]]\nid = \"one\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\norder = \"oc\"\n", maxRows: 10},
		// Negative values, zeros and a negative slope.
		{name: "negative-and-zero", setup: []string{"DROP TABLE IF EXISTS adv_neg",
			"CREATE TABLE adv_neg (id text, x float8, y float8)",
			`INSERT INTO adv_neg SELECT 'r' || i, CASE WHEN i % 9 = 0 THEN 0 ELSE -50 + 40 * sin(i * 0.7071) END,
			  CASE WHEN i % 10 = 0 THEN 0 ELSE -2 - 0.8 * (-50 + 40 * sin(i * 0.7071)) + 5 * sin(i * 1.3247) END FROM generate_series(1, 250) i`},
			decl: table("adv_neg"), studies: plain, maxRows: 10},
		// A near-exact fit: y = 3 − 2x + 10⁻³·noise (with 10⁻⁹ the RSS is
		// 10⁻²² of Syy and its digits are the rounding of y: see
		// TestPushdownExactFit).
		{name: "near-exact-fit", setup: []string{"DROP TABLE IF EXISTS adv_near",
			"CREATE TABLE adv_near (id text, x float8, y float8)",
			`INSERT INTO adv_near SELECT 'r' || i, i, 3 - 2 * i + 1e-3 * sin(i * 1.3247) FROM generate_series(1, 100) i`},
			decl: table("adv_near"), studies: plain, maxRows: 10},
		// Three, four and five rows over max_rows = 2. With three the
		// deleted residual's SD has no degree of freedom (the third pass
		// divided by n − 3 = 0: "division by zero"), and every
		// leave-one-out r is ±1 up to rounding (clamped, as in memory, so
		// the rows at its extremes tie and are named alike); with four and
		// five the flagged row holds more than half of Sxx or Syy, so r
		// and the line without it are summed over the kept rows.
		{name: "n3", setup: []string{"DROP TABLE IF EXISTS adv_n3", "CREATE TABLE adv_n3 (id text, x float8, y float8)",
			"INSERT INTO adv_n3 VALUES ('a', 1, 2.1), ('b', 2, 3.9), ('c', 4, 8.3)"},
			decl: table("adv_n3"), studies: plain, maxRows: 2},
		{name: "n4", setup: []string{"DROP TABLE IF EXISTS adv_n4", "CREATE TABLE adv_n4 (id text, x float8, y float8)",
			"INSERT INTO adv_n4 VALUES ('a', 1, 2.1), ('b', 2, 3.9), ('c', 4, 8.3), ('d', 5, 9.2)"},
			decl: table("adv_n4"), studies: plain, maxRows: 2},
		{name: "n5", setup: []string{"DROP TABLE IF EXISTS adv_n5", "CREATE TABLE adv_n5 (id text, x float8, y float8, g text, o int, z float8)",
			"INSERT INTO adv_n5 VALUES ('a', 1, 2.1, 'p', 1, 0.3), ('b', 2, 3.9, 'p', 2, -1), ('c', 4, 8.3, 'q', 2, 0.5), ('d', 5, 9.2, 'q', 3, 2), ('e', 7, 15.1, 'q', 4, 1)"},
			decl:    table("adv_n5"),
			studies: plain + "[[study]]\nid = \"full\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\norder = \"o\"\ncovariates = [\"z\"]\n", maxRows: 2},
		// An id column with NULLs, duplicates, a missing token and
		// padding (kept in the name, as in memory; it was trimmed), on
		// the flagged rows; the flagged rows hold more than half of Syy,
		// so r without them is summed over the kept rows (it was left
		// undefined, and the verdict on them "undefined").
		{name: "awkward-ids", setup: []string{"DROP TABLE IF EXISTS adv_ids",
			"CREATE TABLE adv_ids (id text, x float8, y float8)",
			`INSERT INTO adv_ids SELECT CASE WHEN i % 10 = 0 THEN NULL WHEN i % 10 = 1 THEN 'NA' WHEN i % 10 = 2 THEN 'dup' WHEN i % 10 = 3 THEN '  p' || i || '  ' ELSE 'r' || i END,
			  5 + sin(i * 0.7071), 2 + 0.4 * sin(i * 0.7071) + 0.3 * sin(i * 1.3247) + CASE WHEN i IN (10, 11, 12, 13, 14) THEN 4 ELSE 0 END
			  FROM generate_series(1, 200) i`},
			decl: table("adv_ids"), studies: plain, maxRows: 10},
		// A covariate that is x exactly, one that is a multiple of x plus
		// a constant, and one that is constant.
		{name: "collinear-covariates", setup: []string{"DROP TABLE IF EXISTS adv_col",
			"CREATE TABLE adv_col (id text, x float8, y float8, z1 float8, z2 float8, z3 float8)",
			`INSERT INTO adv_col SELECT 'r' || i, 5 + sin(i * 0.7071), 2 + 0.4 * sin(i * 0.7071) + 0.3 * sin(i * 1.3247), 5 + sin(i * 0.7071), 3 * (5 + sin(i * 0.7071)) + 1, 4
			  FROM generate_series(1, 150) i`},
			decl:    table("adv_col"),
			studies: "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ncovariates = [\"z1\", \"z2\", \"z3\"]\n", maxRows: 10},
		// integer, bigint, smallint, real and numeric columns; a real
		// is read through its text, as below max_rows (it was widened in
		// binary: y's maximum 3.1956138610839844 against 3.1956139).
		{name: "column-types", setup: []string{"DROP TABLE IF EXISTS adv_types",
			"CREATE TABLE adv_types (id text, xi integer, xb bigint, xs smallint, yr real, yn numeric(20, 9))",
			`INSERT INTO adv_types SELECT 'r' || i, (100 * sin(i * 0.7071))::integer, 1000000000000 + (1000 * sin(i * 0.7071))::bigint, (i % 7)::smallint,
			  (2 + sin(i * 0.7071) + 0.2 * sin(i * 1.3247))::real, round((2 + sin(i * 0.7071) + 0.2 * sin(i * 1.3247))::numeric, 9)
			  FROM generate_series(1, 300) i`},
			decl: table("adv_types"),
			studies: "[[study]]\nid = \"int-numeric\"\ndataset = \"d\"\nx = \"xi\"\ny = \"yn\"\n" +
				"[[study]]\nid = \"bigint-real\"\ndataset = \"d\"\nx = \"xb\"\ny = \"yr\"\n" +
				"[[study]]\nid = \"smallint\"\ndataset = \"d\"\nx = \"xs\"\ny = \"yn\"\norder = \"xi\"\n", maxRows: 10},
		// A query with WHERE and computed columns.
		{name: "query", setup: []string{"DROP TABLE IF EXISTS adv_q",
			"CREATE TABLE adv_q (k integer, a float8, b float8)",
			`INSERT INTO adv_q SELECT i, 5 + sin(i * 0.7071), 2 + sin(i * 1.3247) FROM generate_series(1, 400) i`},
			decl:    "query = \"SELECT 'q' || k AS id, a * 2 - 1 AS x, b + 0.3 * a * a AS y, k % 3 AS o FROM adv_q WHERE k % 4 <> 0 AND b > 1.2\"\nid_column = \"id\"\n",
			studies: plain + "[[study]]\nid = \"ord\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\norder = \"o\"\n", maxRows: 10},
		// A text group with padding, missing tokens (NA, empty, spaces)
		// and NULL.
		{name: "text-group", setup: []string{"DROP TABLE IF EXISTS adv_tg",
			"CREATE TABLE adv_tg (id text, x float8, y float8, g text)",
			`INSERT INTO adv_tg SELECT 'r' || i, 5 + sin(i * 0.7071), 2 + 0.4 * sin(i * 0.7071) + 0.3 * sin(i * 1.3247),
			  CASE i % 7 WHEN 0 THEN 'a' WHEN 1 THEN 'a ' WHEN 2 THEN ' b' WHEN 3 THEN 'NA' WHEN 4 THEN '' WHEN 5 THEN '   ' ELSE NULL END
			  FROM generate_series(1, 210) i`},
			decl:    table("adv_tg"),
			studies: "[[study]]\nid = \"g\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\n", maxRows: 10},
	})
}

// TestPushdownExactFit: y = a + b·x exactly, in integers (every residual
// 0) and in fractions (the residuals are rounding only). The figures that
// are rounding noise (the SEs, the RSS, the quadratic's x² term, and
// Breusch–Pagan of the noise) are not compared; those that are defined
// must agree: the line, r, the moments, F = +Inf where the RSS is 0 (as
// stats.Regression gives; it was NaN), and no Cook's distance (the
// residual SD is undefined at or below the rounding floor (16ε)²·Σy², as
// in stats.NewLineInfluence; it was 0.093 in the fractions), with the
// same flag counts.
func TestPushdownExactFit(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS adv_exact",
		"CREATE TABLE adv_exact (id text, x float8, y float8, xf float8, yf float8)",
		`INSERT INTO adv_exact SELECT 'r' || i, i, 3 - 2 * i, i * 0.37, 0.1 + 0.3 * (i * 0.37) FROM generate_series(1, 100) i`)
	mem, pushed := runBothDecl(t, url, table("adv_exact"), plain+"[[study]]\nid = \"frac\"\ndataset = \"d\"\nx = \"xf\"\ny = \"yf\"\n", 10)
	for i := range mem.Studies {
		m, p := mem.Studies[i], pushed.Studies[i]
		if m.Error != nil || p.Error != nil {
			t.Fatalf("study %s: errors %v, %v", m.ID, errText(m.Error), errText(p.Error))
		}
		if p.Pushdown == nil {
			t.Fatalf("study %s: not pushed down", m.ID)
		}
		all, want := exactFigures(p), exactFigures(m)
		got := map[string]float64{}
		for _, k := range []string{"n", "mean_x", "mean_y", "sxx", "syy", "sxy", "r", "slope", "intercept", "line_r2", "max_cooks", "flagged", "suspect", "high_leverage", "named"} {
			got[k] = all[k]
		}
		for k := range want {
			if _, ok := got[k]; !ok {
				delete(want, k)
			}
		}
		agree(t, m.ID, got, want, 1e-9)
		if m.ID == "s" && (!math.IsInf(float64(m.Line.F), 1) || !math.IsInf(float64(p.Line.F), 1)) {
			t.Errorf("study %s: F = %v pushed, %v in memory; want +Inf for an exact fit", m.ID, p.Line.F, m.Line.F)
		}
		if p.Influence.Counts != m.Influence.Counts {
			t.Errorf("study %s: flag counts %+v pushed, %+v in memory", m.ID, p.Influence.Counts, m.Influence.Counts)
		}
	}
}

// More awkward data: sole support far from 0, with four rows and within
// a level, numeric and date group and order columns, boolean and
// character(n) groups and ids, duplicated flagged rows, a run order with
// non-finite cells, x a timestamp, and studies that fail (x constant, too
// few complete rows, y constant) both ways.
func TestPushdownAdversarialEdges(t *testing.T) {
	runAdv(t, []advCase{
		// One row alone at x = 10⁹ + 1, the rest at 10⁹: sole support
		// where the first pass's Sxx is far from 0's accuracy.
		{name: "sole-far", setup: []string{"DROP TABLE IF EXISTS adv_solefar",
			"CREATE TABLE adv_solefar (id text, x float8, y float8)",
			`INSERT INTO adv_solefar SELECT 'r' || i, 1e9 + CASE WHEN i = 50 THEN 1 ELSE 0 END, 1e6 + sin(i * 1.3247 + 0.5) + CASE WHEN i = 50 THEN 3 ELSE 0 END
			  FROM generate_series(1, 120) i`},
			decl: table("adv_solefar"), studies: plain, maxRows: 10},
		// An integer group, a date order, a sole-support study with a
		// group and an order.
		{name: "numeric-group-date-order", setup: []string{"DROP TABLE IF EXISTS adv_gd",
			"CREATE TABLE adv_gd (id text, x float8, xs float8, y float8, g integer, d date)",
			`INSERT INTO adv_gd SELECT 'r' || i, 5 + sin(i * 0.7071), CASE WHEN i = 7 THEN 9 ELSE 4 END, 2 + 0.4 * sin(i * 0.7071) + 0.3 * sin(i * 1.3247), i % 3 - 1,
			  date '2026-01-01' + (i / 5) FROM generate_series(1, 150) i`},
			decl: table("adv_gd"),
			studies: "[[study]]\nid = \"g\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\norder = \"d\"\n" +
				"[[study]]\nid = \"sole\"\ndataset = \"d\"\nx = \"xs\"\ny = \"y\"\ngroup = \"g\"\norder = \"d\"\n", maxRows: 10},
		// A boolean and a character(4) group and a character(8) id: read
		// in their text output, as below max_rows (the levels were
		// true/false for t/f and "ab" for "ab  ", the ids unpadded).
		{name: "bool-char", setup: []string{"DROP TABLE IF EXISTS adv_bc",
			"CREATE TABLE adv_bc (id char(8), x float8, y float8, gb boolean, gc char(4))",
			`INSERT INTO adv_bc SELECT 'r' || i, 5 + sin(i * 0.7071), 2 + 0.4 * sin(i * 0.7071) + 0.3 * sin(i * 1.3247) + CASE WHEN i = 9 THEN 3 ELSE 0 END,
			  i % 2 = 0, CASE WHEN i % 3 = 0 THEN 'ab' ELSE 'c' END FROM generate_series(1, 150) i`},
			decl: table("adv_bc"),
			studies: "[[study]]\nid = \"gb\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"gb\"\n" +
				"[[study]]\nid = \"gc\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"gc\"\n", maxRows: 10},
		// Identical flagged rows (the same id, x and y, three times) and
		// two identical rows without an id: each counted and ranked.
		{name: "dup-rows", setup: []string{"DROP TABLE IF EXISTS adv_dup",
			"CREATE TABLE adv_dup (id text, x float8, y float8)",
			`INSERT INTO adv_dup SELECT 'r' || i, 5 + sin(i * 0.7071), 2 + 0.4 * sin(i * 0.7071) + 0.3 * sin(i * 1.3247) FROM generate_series(1, 100) i`,
			"INSERT INTO adv_dup SELECT 'dd', 9, 1 FROM generate_series(1, 3)",
			"INSERT INTO adv_dup SELECT NULL, 5, 7 FROM generate_series(1, 2)"},
			decl: table("adv_dup"), studies: plain, maxRows: 10},
		// Four complete rows (one left out by a NULL y), x on two values
		// with one row alone: sole support with an order and a covariate.
		{name: "sole-n4-all", setup: []string{"DROP TABLE IF EXISTS adv_s4",
			"CREATE TABLE adv_s4 (id text, x float8, y float8, z float8, o int)",
			"INSERT INTO adv_s4 VALUES ('a', 1, 2, 0.5, 1), ('b', 1, 3, 0.1, 2), ('c', 1, 2.5, 0.9, 3), ('d', 4, 7, 0.3, 4), ('e', 9, NULL, 1, 5)"},
			decl: table("adv_s4"), studies: plain + "[[study]]\nid = \"full\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\norder = \"o\"\ncovariates = [\"z\"]\n", maxRows: 2},
		// A run order with NaN and −Infinity counted as missing, and
		// heavy ties.
		{name: "order-nan", setup: []string{"DROP TABLE IF EXISTS adv_on",
			"CREATE TABLE adv_on (id text, x float8, y float8, o float8)",
			`INSERT INTO adv_on SELECT 'r' || i, sin(i * 0.7071), sin(i * 0.7071) + 0.5 * sin(i * 1.3247), CASE WHEN i % 9 = 0 THEN 'NaN'::float8 WHEN i % 10 = 0 THEN '-Infinity'::float8 ELSE (i % 17)::float8 END FROM generate_series(1, 200) i`},
			decl: table("adv_on") + "non_numeric = \"missing\"\n", studies: "[[study]]\nid = \"o\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\norder = \"o\"\n", maxRows: 10},
		// A level whose x takes two values, one of them once: its row has
		// leverage 1 within the level, not overall.
		{name: "group-sole", setup: []string{"DROP TABLE IF EXISTS adv_gs",
			"CREATE TABLE adv_gs (id text, x float8, y float8, g text)",
			`INSERT INTO adv_gs SELECT 'r' || i, CASE WHEN i % 2 = 0 THEN 5 + sin(i * 0.7071) WHEN i = 7 THEN 3 ELSE 1 END, 2 + sin(i * 1.3247), CASE WHEN i % 2 = 0 THEN 'a' ELSE 'b' END FROM generate_series(1, 100) i`},
			decl: table("adv_gs"), studies: "[[study]]\nid = \"g\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\n", maxRows: 10},
		// x a timestamp and a timestamptz (seconds since 1970: near
		// 1.8·10⁹ with a spread of 10⁵), with a group and an order.
		{name: "time-x", setup: []string{"DROP TABLE IF EXISTS adv_tx",
			"CREATE TABLE adv_tx (id text, t timestamp, tz timestamptz, y float8, g text, o integer)",
			`INSERT INTO adv_tx SELECT 'r' || i, timestamp '2026-10-01 08:00:00' + i * interval '7 minutes 13.25 seconds', timestamptz '2026-10-01 08:00:00+02' + i * interval '7 minutes 13.25 seconds',
			  20 + 0.001 * i + sin(i * 1.3247), CASE WHEN i % 3 = 0 THEN 'a' ELSE 'b' END, (i * 7) % 13 FROM generate_series(1, 300) i`},
			decl: table("adv_tx"), studies: "[[study]]\nid = \"t\"\ndataset = \"d\"\nx = \"t\"\ny = \"y\"\ngroup = \"g\"\norder = \"o\"\n" +
				"[[study]]\nid = \"tz\"\ndataset = \"d\"\nx = \"tz\"\ny = \"y\"\n", maxRows: 10},
		// Sole support in a real and a numeric column (the lone row told
		// by its value as the study reads it: a real through its text).
		{name: "sole-types", setup: []string{"DROP TABLE IF EXISTS adv_st",
			"CREATE TABLE adv_st (id text, xr real, xn numeric(12,3), y float8)",
			`INSERT INTO adv_st SELECT 'r' || i, CASE WHEN i = 5 THEN 0.3 ELSE 0.1 END, CASE WHEN i = 9 THEN 0.1 ELSE 0.7 END, 2 + sin(i * 1.3247 + 0.5) + CASE WHEN i IN (5, 9) THEN 2 ELSE 0 END
			  FROM generate_series(1, 80) i`},
			decl: table("adv_st"), studies: "[[study]]\nid = \"r\"\ndataset = \"d\"\nx = \"xr\"\ny = \"y\"\n[[study]]\nid = \"n\"\ndataset = \"d\"\nx = \"xn\"\ny = \"y\"\n", maxRows: 10},
		// Studies that fail: x constant over the complete rows; two
		// complete rows; y constant.
		{name: "failing", setup: []string{"DROP TABLE IF EXISTS adv_fail",
			"CREATE TABLE adv_fail (id text, x float8, y float8, xc float8, ys float8, yc float8)",
			`INSERT INTO adv_fail SELECT 'r' || i, i, sin(i), CASE WHEN i % 2 = 0 THEN 4 ELSE NULL END, CASE WHEN i <= 2 THEN i ELSE NULL END, 7 FROM generate_series(1, 40) i`},
			decl: table("adv_fail"),
			studies: "[[study]]\nid = \"xconst\"\ndataset = \"d\"\nx = \"xc\"\ny = \"y\"\n" +
				"[[study]]\nid = \"two\"\ndataset = \"d\"\nx = \"x\"\ny = \"ys\"\n" +
				"[[study]]\nid = \"yconst\"\ndataset = \"d\"\nx = \"x\"\ny = \"yc\"\n", maxRows: 10},
	})
}
