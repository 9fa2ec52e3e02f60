package analysis_test

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"maps"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/jackc/pgx/v5"

	"bivar/analysis"
	"bivar/analysis/report"
	"bivar/internal/reference"
)

// exactFigures lists, by name, the figures a pushed-down study computes
// over every row, for comparison with the same study in memory.
func exactFigures(s report.Study) map[string]float64 {
	f := map[string]float64{
		"n": float64(s.N), "n_missing": float64(s.NMissing),
		"mean_x": float64(s.Moments.MeanX), "mean_y": float64(s.Moments.MeanY),
		"sxx": float64(s.Moments.Sxx), "syy": float64(s.Moments.Syy), "sxy": float64(s.Moments.Sxy),
		"sd_x": float64(s.Describe.X.SD), "sd_y": float64(s.Describe.Y.SD), "min_x": float64(s.Describe.X.Min), "max_y": float64(s.Describe.Y.Max),
		"r": float64(s.Pearson.R), "r_lo": float64(s.Pearson.CILow), "r_p": float64(s.Pearson.P),
		"slope": float64(s.Line.Slope.Estimate), "slope_se": float64(s.Line.Slope.SE), "intercept": float64(s.Line.Intercept.Estimate),
		"intercept_se": float64(s.Line.Intercept.SE), "line_rss": float64(s.Line.RSS), "line_r2": float64(s.Line.R2), "line_f": float64(s.Line.F),
		"line_aic": float64(s.Line.AIC), "resid_se": float64(s.Line.ResidualSE),
		"bp": float64(s.Diagnostics.BreuschPagan.Stat), "bp_p": float64(s.Diagnostics.BreuschPagan.P),
		"quad_p":    float64(s.Diagnostics.QuadraticP),
		"max_cooks": float64(s.Influence.MaxCooksD), "flagged": float64(s.Influence.Counts.Flagged), "suspect": float64(s.Influence.Counts.Suspect),
		"high_leverage": float64(s.Influence.Counts.HighLeverage), "named": float64(s.Influence.Counts.Named),
		"loo_r_min": float64(s.Sensitivity.LooRMin), "loo_r_max": float64(s.Sensitivity.LooRMax),
		"loo_slope_min": float64(s.Sensitivity.LooSlopeMin), "loo_slope_max": float64(s.Sensitivity.LooSlopeMax),
		"r_without": float64(s.Sensitivity.RWithoutFlagged), "slope_without": float64(s.Sensitivity.SlopeWithoutFlagged),
	}
	for _, m := range s.Models {
		if m.Name == "quadratic" {
			for _, c := range m.Coefficients {
				f["quad_"+c.Name] = float64(c.Estimate)
				f["quad_se_"+c.Name] = float64(c.SE)
			}
			f["quad_rss"], f["quad_r2"], f["quad_f"], f["quad_vertex"] = float64(m.RSS), float64(m.R2), float64(m.F), float64(m.Vertex)
			f["quad_aic_vs_line"], f["quad_share_vs_line"] = float64(m.AICVsLine), float64(m.ShareVsLine)
		}
	}
	if pl := s.Plan; pl != nil {
		f["plan_n_for_r"], f["plan_r_now"], f["plan_n_for_slope"], f["plan_slope_now"] = float64(pl.NForR), float64(pl.RHalfWidthNow), float64(pl.NForSlope), float64(pl.SlopeHalfWidthNow)
		f["plan_n_for_power"], f["plan_power"] = float64(pl.NForPower), float64(pl.Power)
	}
	if lf := s.Diagnostics.LackOfFit; lf != nil {
		f["lof_f"], f["lof_df1"], f["lof_df2"], f["lof_p"] = float64(lf.F), float64(lf.DF1), float64(lf.DF2), float64(lf.P)
	}
	if d := s.Diagnostics; d.OrderTrend != nil {
		f["dw"], f["trend_slope"], f["trend_p"], f["trend_r"] = float64(d.DurbinWatson), float64(d.OrderTrend.Slope), float64(d.OrderTrend.P), float64(d.OrderTrend.R)
	}
	for _, p := range s.Partial {
		f["partial_"+p.Covariate], f["partial_p_"+p.Covariate], f["partial_lo_"+p.Covariate] = float64(p.R), float64(p.P), float64(p.CILow)
	}
	for _, g := range s.Groups {
		f["group_n_"+g.Group], f["group_slope_"+g.Group], f["group_r_"+g.Group], f["group_hi_"+g.Group] = float64(g.N), float64(g.Slope), float64(g.R), float64(g.SlopeHigh)
	}
	if gl := s.GroupLines; gl != nil {
		f["slopes_f"], f["lines_f"], f["r_within"] = float64(gl.SlopesF), float64(gl.LinesF), float64(gl.RWithin)
	}
	for i, p := range s.Influence.Points {
		f[fmt.Sprintf("point%d_cooks", i)], f[fmt.Sprintf("point%d_t", i)], f[fmt.Sprintf("point%d_x", i)] = float64(p.CooksD), float64(p.StudentizedExt), float64(p.X)
	}
	for i, u := range s.UnitInvariance {
		f[fmt.Sprintf("unit%d_slope", i)], f[fmt.Sprintf("unit%d_intercept", i)] = float64(u.Slope), float64(u.Intercept)
	}
	for i, p := range s.Predictions {
		f[fmt.Sprintf("pred%d_fit", i)], f[fmt.Sprintf("pred%d_hi", i)] = float64(p.Fit), float64(p.PredHigh)
	}
	return f
}

// agree reports the figures of got that differ from want by more than tol
// relative (absolute below 1e-300 in want; NaN must match NaN).
func agree(t *testing.T, what string, got, want map[string]float64, tol float64) {
	t.Helper()
	for k, w := range want {
		g, ok := got[k]
		switch {
		case !ok:
			t.Errorf("%s: %s missing from the pushed-down study", what, k)
		case math.IsNaN(w) || math.IsNaN(g):
			if math.IsNaN(w) != math.IsNaN(g) {
				t.Errorf("%s: %s = %v, in memory %v", what, k, g, w)
			}
		case math.Abs(g-w) > tol*math.Abs(w) && math.Abs(g-w) > 1e-300:
			t.Errorf("%s: %s = %.17g, in memory %.17g (relative %.2g)", what, k, g, w, math.Abs(g-w)/math.Abs(w))
		}
	}
	for k := range got {
		if _, ok := want[k]; !ok {
			t.Errorf("%s: %s only in the pushed-down study", what, k)
		}
	}
}

// A table of generated rows read into memory (max_rows above its size)
// and left in the database (max_rows = 10) gives the same exact figures
// to 1e-9 relative: the in-memory path is the reference here, itself
// checked against NIST StRD, statsmodels and scipy in its own tests.
// The rows have a group, a run order with ties, a covariate, NULLs and an
// id column; y bends (a quadratic term) and its spread grows with x.
func TestPushdownSameAsInMemory(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pd", "CREATE TABLE pd (id text, x float8, y float8, z float8, g text, o integer)",
		// A deterministic pseudo-random stream: sines of multiples of
		// irrational steps, reproducible on any server.
		`INSERT INTO pd SELECT 'r' || i, 100 + 10 * sin(i * 0.7071), 
		  5 + 0.3 * (100 + 10 * sin(i * 0.7071)) + 0.02 * (10 * sin(i * 0.7071))^2 + (1 + abs(sin(i * 0.7071))) * sin(i * 1.3247 + 0.5) + CASE WHEN i = 77 THEN 12 ELSE 0 END,
		  cos(i * 0.4142) + 0.1 * sin(i * 0.7071), CASE WHEN i % 3 = 0 THEN 'a' WHEN i % 3 = 1 THEN 'b' ELSE 'c' END, i / 4
		  FROM generate_series(1, 2000) i`,
		"UPDATE pd SET y = NULL WHERE id IN ('r5', 'r900')", "UPDATE pd SET z = NULL WHERE id = 'r17'")
	study := "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\norder = \"o\"\ncovariates = [\"z\"]\npredict_at = [95, 104.5]\n" +
		"[[study]]\nid = \"plain\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n"
	mem, pushed := runBoth(t, url, "pd", study, 10)
	for i := range mem.Studies {
		m, p := mem.Studies[i], pushed.Studies[i]
		bothRan(t, m, p)
		agree(t, m.ID, exactFigures(p), exactFigures(m), 1e-9)
		if p.Kind != m.Kind || p.Line.YScale != m.Line.YScale || p.Models[0].YScale != m.Models[0].YScale {
			t.Errorf("study %s: kind %q, y scales %q and %q; in memory %q, %q and %q", m.ID, p.Kind, p.Line.YScale, p.Models[0].YScale, m.Kind, m.Line.YScale, m.Models[0].YScale)
		}
		// Below PushdownSample rows the sample is every complete case, so
		// the sampled figures are those in memory too.
		if p.Pushdown.Sample != m.N || p.Spearman.Rho != m.Spearman.Rho || p.Kendall.TauB != m.Kendall.TauB || p.Describe.X.Median != m.Describe.X.Median {
			t.Errorf("study %s: sample %d of %d rows; ρ %v / %v, τ %v / %v", m.ID, p.Pushdown.Sample, m.N, p.Spearman.Rho, m.Spearman.Rho, p.Kendall.TauB, m.Kendall.TauB)
		}
		if len(p.Approximations) != len(m.Approximations) || len(p.Pushdown.Sampled) != 0 || len(p.Pushdown.Omitted) == 0 || len(p.Pushdown.Statements) < 4 {
			t.Errorf("study %s: approximations %d (in memory %d), sampled %v, omitted %v, %d statements", m.ID, len(p.Approximations), len(m.Approximations),
				p.Pushdown.Sampled, p.Pushdown.Omitted, len(p.Pushdown.Statements))
		}
		if p.Findings == nil || m.Findings == nil || p.Findings.Form != m.Findings.Form || p.Findings.Direction != m.Findings.Direction || p.Findings.Strength != m.Findings.Strength {
			t.Errorf("study %s: findings differ: %+v / %+v", m.ID, p.Findings, m.Findings)
		}
		for k, pt := range p.Influence.Points {
			if pt.Row != m.Influence.Points[k].Row || strings.Join(pt.Flags, "+") != strings.Join(m.Influence.Points[k].Flags, "+") {
				t.Errorf("study %s: named row %d is %s %v, in memory %s %v", m.ID, k, pt.Row, pt.Flags, m.Influence.Points[k].Row, m.Influence.Points[k].Flags)
			}
		}
		if p.Plot.Scatter == nil || sum(p.Plot.Scatter.Counts) != p.N {
			t.Errorf("study %s: the density grid holds %v rows, want %d", m.ID, p.Plot.Scatter, p.N)
		}
		// The residual on x is binned on the same cells of x as y on x (at
		// 2000 rows the study in memory draws points, not grids): each
		// column of cells holds the same rows in both.
		if g, r := p.Plot.Scatter, p.Plot.ResidX; g == nil || r == nil || g.XLo != r.XLo || g.XHi != r.XHi || g.NX != r.NX {
			t.Errorf("study %s: the grids of y and of the residual on x differ in x: %+v / %+v", m.ID, g, r)
		} else {
			for i := range g.NX {
				var a, b int
				for j := range g.NY {
					a += g.Counts[j*g.NX+i]
				}
				for j := range r.NY {
					b += r.Counts[j*r.NX+i]
				}
				if a != b {
					t.Errorf("study %s: column %d of cells holds %d rows of y on x and %d of the residual on x", m.ID, i, a, b)
				}
			}
		}
		sameLooRows(t, m.ID, p, m)
		if p.Influence.MaxCooksRow != m.Influence.MaxCooksRow {
			t.Errorf("study %s: the row of the largest Cook's distance is %q, in memory %q", m.ID, p.Influence.MaxCooksRow, m.Influence.MaxCooksRow)
		}
	}
	// The data were built to exercise every part: a named outlier, three
	// groups, a bend, ties in run order.
	s := pushed.Studies[0]
	if len(s.Influence.Points) == 0 || s.Influence.Points[0].Row != "r77" || len(s.Groups) != 3 || s.Models[0].Name != "quadratic" || s.Findings.Form != "curved" {
		t.Errorf("the test data lost their point: named %v, groups %d, form %s", s.Influence.Points, len(s.Groups), s.Findings.Form)
	}
	t.Logf("n %d, named %d (first %s), flagged %d, form %s, DW %v", s.N, len(s.Influence.Points), s.Influence.Points[0].Row, s.Influence.Counts.Flagged, s.Findings.Form, s.Diagnostics.DurbinWatson)
}

// With no row flagged (cut points no row passes), the report still names
// the row of the largest Cook's distance ("No row is flagged (largest
// Cook's distance …, row …)"): the database finds it as it finds the rows
// at the leave-one-out extremes, and it is the row named in memory.
// Before, a study left in the database named it only when it was flagged,
// and the report's sentence ended in "row )".
func TestPushdownMaxCooksUnflagged(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdcook", "CREATE TABLE pdcook (id text, x float8, y float8)",
		"INSERT INTO pdcook SELECT 'r' || i, 10 + sin(i * 0.7071), 2 + 0.5 * sin(i * 0.7071) + 0.3 * sin(i * 1.3247 + 0.5) FROM generate_series(1, 3000) i")
	study := "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n[thresholds]\noutlier_z = 50.0\ncooks_d = 0.999\n"
	mem, pushed := runBoth(t, url, "pdcook", study, 10)
	m, p := mem.Studies[0], pushed.Studies[0]
	bothRan(t, m, p)
	if m.Influence.Counts.Suspect != 0 || p.Influence.Counts.Suspect != 0 {
		t.Fatalf("rows flagged: %d in memory, %d pushed; the test wants none", m.Influence.Counts.Suspect, p.Influence.Counts.Suspect)
	}
	if p.Influence.MaxCooksRow == "" || p.Influence.MaxCooksRow != m.Influence.MaxCooksRow ||
		math.Abs(float64(p.Influence.MaxCooksD-m.Influence.MaxCooksD)) > 1e-9*float64(m.Influence.MaxCooksD) {
		t.Errorf("largest Cook's distance %v at row %q, in memory %v at row %q", p.Influence.MaxCooksD, p.Influence.MaxCooksRow, m.Influence.MaxCooksD, m.Influence.MaxCooksRow)
	}
}

// sameLooRows checks that the pushed-down study names the rows at the
// leave-one-out extremes of r as the study in memory does (the database
// computes a row's leave-one-out r only in the cells that hold them).
func sameLooRows(t *testing.T, what string, p, m report.Study) {
	t.Helper()
	if p.Sensitivity.LooRMinRow == "" || p.Sensitivity.LooRMinRow != m.Sensitivity.LooRMinRow || p.Sensitivity.LooRMaxRow != m.Sensitivity.LooRMaxRow {
		t.Errorf("%s: rows at the leave-one-out extremes of r %q and %q, in memory %q and %q", what,
			p.Sensitivity.LooRMinRow, p.Sensitivity.LooRMaxRow, m.Sensitivity.LooRMinRow, m.Sensitivity.LooRMaxRow)
	}
}

func sum(v []int) int {
	s := 0
	for _, a := range v {
		s += a
	}
	return s
}

// What a study above the row limit cannot do is an error of that study,
// naming what to do; the other studies run.
func TestPushdownStudyErrors(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdbad", "CREATE TABLE pdbad (x float8, y float8, w float8, g text, big float8)",
		"INSERT INTO pdbad SELECT i, i * 0.5 + sin(i), CASE WHEN i = 7 THEN 'NaN'::float8 ELSE i END, 'L' || i, 1e150 * (i * 0.5 + sin(i)) FROM generate_series(1, 40) i")
	t.Setenv("BIVAR_TEST_DB", url)
	decl := "[[dataset]]\nid = \"d\"\ntable = \"pdbad\"\nconnection = \"BIVAR_TEST_DB\"\nmax_rows = 10\nmax_levels = 5\n"
	r, err := runManifest(t, t.TempDir(), decl+
		"[[study]]\nid = \"where\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\nwhere = \"x > 3\"\n"+
		"[[study]]\nid = \"nan\"\ndataset = \"d\"\nx = \"w\"\ny = \"y\"\n"+
		"[[study]]\nid = \"levels\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\n"+
		"[[study]]\nid = \"good\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n"+
		"[[study]]\nid = \"scaled\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\nx_scale = \"log\"\n"+
		"[[study]]\nid = \"huge\"\ndataset = \"d\"\nx = \"x\"\ny = \"big\"\n")
	if err != nil {
		t.Fatal(err)
	}
	for i, want := range []string{
		`pg.toml:7: in this [[study]]: dataset "d" gives 40 rows, more than its max_rows = 10, so its rows stay in the database, where exclude, subset and where do not apply: put the filter in the dataset's query`,
		`pg.toml:13: in this [[study]]: dataset "d": PostgreSQL (BIVAR_TEST_DB): column "w": it holds 1 value that is not a finite number (NaN or infinite): filter such rows in the query, or set non_numeric = "missing"`,
		`pg.toml:18: in this [[study]]: dataset "d": PostgreSQL (BIVAR_TEST_DB): column "g": a group column may hold at most 5 distinct values, and this one holds more`,
	} {
		if e := r.Studies[i].Error; e == nil || !strings.Contains(*e, want) {
			t.Errorf("study %s: error %s\nwant %s", r.Studies[i].ID, errText(e), want)
		}
	}
	if e := r.Studies[4].Error; e == nil || !strings.Contains(*e, `so its rows stay in the database, where x_scale or y_scale cannot be computed: raise max_rows`) {
		t.Errorf("study scaled: error %s", errText(e))
	}
	// y near 10¹⁵⁰: the fourth powers of its deviations pass double
	// precision's range in the database's sums.
	if e := r.Studies[5].Error; e == nil || !strings.Contains(*e, `pg.toml:35: in this [[study]]: dataset "d": PostgreSQL (BIVAR_TEST_DB): a number went out of range in the database (value out of range: overflow): unless the query itself fails so in psql`) ||
		!strings.Contains(*e, "raise max_rows above the row count") {
		t.Errorf("study huge: error %s", errText(e))
	}
	if s := r.Studies[3]; s.Error != nil || s.N != 40 || s.Pushdown == nil {
		t.Errorf("study good: error %s, n %d", errText(s.Error), s.N)
	}
}

// lre is the log relative error of got against want, the digits that
// agree (McCullough 1998), capped at 15.
func lre(got, want float64) float64 {
	if got == want {
		return 15
	}
	return math.Min(15, -math.Log10(math.Abs(got-want)/math.Abs(want)))
}

// NIST StRD Norris (y on x) and Longley (y on year, x6, with population,
// x5, as the covariate), loaded into tables and left in the database
// (max_rows = 5), reach the log relative errors (LRE) that the same rows
// reach from a CSV file, less at most half a digit. Expected values:
// NIST's certified values for Norris's line (Norris.dat: B1 =
// 1.00211681802045, B0 = -0.262323073774029, residual SD
// 0.884796396144373); the rest computed exactly in rational arithmetic by
// scripts/strd-exact.py (Python 3's fractions, square roots in decimal at
// 40 digits), which reproduces Norris's certified values.
func TestPushdownStRD(t *testing.T) {
	url := pgURL(t)
	t.Setenv("BIVAR_TEST_DB", url)
	type want struct {
		name string
		get  func(s report.Study) float64
		v    float64
	}
	slope := func(s report.Study) float64 { return float64(s.Line.Slope.Estimate) }
	icpt := func(s report.Study) float64 { return float64(s.Line.Intercept.Estimate) }
	r := func(s report.Study) float64 { return float64(s.Pearson.R) }
	rsd := func(s report.Study) float64 { return float64(s.Line.ResidualSE) }
	quad := func(i int) func(s report.Study) float64 {
		return func(s report.Study) float64 { return float64(s.Models[0].Coefficients[i].Estimate) }
	}
	partial := func(s report.Study) float64 { return float64(s.Partial[0].R) }
	for _, c := range []struct {
		name, file string
		cols       []int // columns of the data lines: y, x, covariate
		study      string
		want       []want
		minLRE     float64
	}{
		{"Norris", "Norris.dat", []int{0, 1}, "", []want{
			{"slope", slope, 1.00211681802045}, {"intercept", icpt, -0.262323073774029}, {"residual SD", rsd, 0.884796396144373},
			{"r", r, 0.9999968729369666009}, {"b0 of the quadratic", quad(0), -0.44888516305745718345}, {"b1 of the quadratic", quad(1), 1.0040063241910019168},
			{"b2 of the quadratic", quad(2), -0.0000020634314949706343254}}, 9},
		{"Longley", "Longley.dat", []int{0, 6, 5}, "covariates = [\"z\"]\n", []want{
			{"slope", slope, 716.51176470588235294}, {"intercept", icpt, -1335105.2441176470588}, {"residual SD", rsd, 864.23082866216016144},
			{"r", r, 0.97132945919211871698}, {"b0 of the quadratic", quad(0), -25614352.249719887955}, {"b1 of the quadratic", quad(1), 25561.108403361344538},
			{"b2 of the quadratic", quad(2), -6.3557422969187675070}, {"partial r given x5", partial, 0.54729434175851379894}}, 7},
	} {
		t.Run(c.name, func(t *testing.T) {
			rows := strdRows(t, c.file)
			var csv strings.Builder
			var values []string
			csv.WriteString("x,y,z\n")
			for _, f := range rows {
				z := "0"
				if len(c.cols) > 2 {
					z = f[c.cols[2]]
				}
				fmt.Fprintf(&csv, "%s,%s,%s\n", f[c.cols[1]], f[c.cols[0]], z)
				values = append(values, fmt.Sprintf("(%s, %s, %s)", f[c.cols[1]], f[c.cols[0]], z))
			}
			dir := t.TempDir()
			if err := os.WriteFile(filepath.Join(dir, "d.csv"), []byte(csv.String()), 0o644); err != nil {
				t.Fatal(err)
			}
			table := strings.ToLower(c.name)
			pgExec(t, url, "DROP TABLE IF EXISTS "+table, "CREATE TABLE "+table+" (x double precision, y double precision, z double precision)",
				"INSERT INTO "+table+" VALUES "+strings.Join(values, ", "))
			study := "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n" + c.study
			fromCSV, err := runManifest(t, dir, "[[dataset]]\nid = \"d\"\nfile = \"d.csv\"\n"+study)
			if err != nil {
				t.Fatal(err)
			}
			pushed, err := runManifest(t, dir, "[[dataset]]\nid = \"d\"\ntable = \""+table+"\"\nconnection = \"BIVAR_TEST_DB\"\nmax_rows = 5\n"+study)
			if err != nil {
				t.Fatal(err)
			}
			cs, ps := fromCSV.Studies[0], pushed.Studies[0]
			if cs.Error != nil || ps.Error != nil || ps.Pushdown == nil {
				t.Fatalf("errors: CSV %s, database %s", errText(cs.Error), errText(ps.Error))
			}
			for _, w := range c.want {
				lc, lp := lre(w.get(cs), w.v), lre(w.get(ps), w.v)
				t.Logf("%s %s: LRE from CSV %.1f, pushed down %.1f", c.name, w.name, lc, lp)
				if lp < math.Min(lc, 14)-0.5 || lp < c.minLRE {
					t.Errorf("%s %s = %.15g pushed down (LRE %.1f), %.15g from CSV (LRE %.1f), exact %.15g", c.name, w.name, w.get(ps), lp, w.get(cs), lc, w.v)
				}
			}
		})
	}
}

// strdRows returns the data lines of a NIST StRD file, split in fields.
func strdRows(t *testing.T, file string) [][]string {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(reference.Dir(t), "nist-strd", file))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(string(b), "\n")
	for _, l := range lines {
		if m := strdData.FindStringSubmatch(l); m != nil {
			from, _ := strconv.Atoi(m[1])
			to, _ := strconv.Atoi(m[2])
			var out [][]string
			for _, d := range lines[from-1 : to] {
				out = append(out, strings.Fields(d))
			}
			return out
		}
	}
	t.Fatalf("%s: no data lines", file)
	return nil
}

// bigTable creates a table of n generated rows: x, y with a bend, a
// spread that grows with x and a few far rows, a covariate z, a group of
// four levels, a run order with ties (ten rows per value) and an id. The
// stream is deterministic (sines of large multiples, the usual
// hash-like generator of shader code), so every server builds the same table.
func bigTableSQL(name string, n int) []string {
	return []string{"DROP TABLE IF EXISTS " + name,
		"CREATE TABLE " + name + " (id text, x float8, y float8, z float8, g text, o bigint)",
		fmt.Sprintf(`INSERT INTO %s SELECT 'r' || i, 50 + 10 * sin(i * 12.9898),
		  3 + 0.5 * (50 + 10 * sin(i * 12.9898)) + 0.01 * (10 * sin(i * 12.9898))^2 + (1.5 + sin(i * 12.9898)) * sin(i * 78.233)
		    + CASE WHEN i %% 99991 = 0 THEN 40 ELSE 0 END,
		  cos(i * 3.3) + 0.2 * sin(i * 12.9898), 'L' || (i %% 4), i / 10
		  FROM generate_series(1, %d) i`, name, n)}
}

// On 10⁶ generated rows, the figures computed in the database agree with
// the same rows read into memory to 1e-9 relative, and the same rows are
// named. (10⁷ rows, bivar's peak memory and its time against the
// database's own scan are measured by scripts/pushdown-bench.sh.)
func TestPushdownMillion(t *testing.T) {
	if testing.Short() {
		t.Skip("10⁶ rows: not with -short")
	}
	url := pgURL(t)
	pgExec(t, url, bigTableSQL("pdbig", 1_000_000)...)
	study := "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\norder = \"o\"\ncovariates = [\"z\"]\n"
	mem, pushed := runBoth(t, url, "pdbig", study, 1000)
	m, p := mem.Studies[0], pushed.Studies[0]
	if m.Error != nil || p.Error != nil || p.Pushdown == nil || p.Pushdown.Sample != 20000 {
		t.Fatalf("errors %s / %s, push-down %+v", errText(m.Error), errText(p.Error), p.Pushdown)
	}
	// The F tests of the group lines to 1e-9·DF2 (agreeF), the rest to 1e-9.
	fp, fm := exactFigures(p), exactFigures(m)
	agreeF(t, "in memory", fp, fm, m.GroupLines.DF2)
	agree(t, "10⁶ rows", fp, fm, 1e-9)
	if len(p.Approximations) != 6 || len(p.Pushdown.Sampled) != 7 || p.Approximations[0].Rows != 20000 || p.Approximations[0].Of != p.N {
		t.Errorf("approximations %+v, sampled %v", p.Approximations, p.Pushdown.Sampled)
	}
	for k, pt := range p.Influence.Points {
		if pt.Row != m.Influence.Points[k].Row {
			t.Errorf("named row %d is %s, in memory %s", k, pt.Row, m.Influence.Points[k].Row)
		}
	}
	sameLooRows(t, "10⁶ rows", p, m)
	if len(p.Influence.Points) == 0 || p.Findings.Form != m.Findings.Form || p.Findings.Direction != m.Findings.Direction {
		t.Errorf("named %d rows; form %s / %s", len(p.Influence.Points), p.Findings.Form, m.Findings.Form)
	}
	// The density grids: y on x binned alike cell for cell; the residual
	// charts' cells may trade a row at a cell's edge, since the two paths'
	// residuals differ in the last digits.
	if m.Plot.Scatter == nil || p.Plot.Scatter == nil {
		t.Fatalf("no density grid: in memory %v, pushed down %v", m.Plot.Scatter != nil, p.Plot.Scatter != nil)
	}
	if g, w := p.Plot.Scatter, m.Plot.Scatter; g.XLo != w.XLo || g.XHi != w.XHi || g.YLo != w.YLo || g.YHi != w.YHi || !slices.Equal(g.Counts, w.Counts) {
		t.Errorf("the scatter's density grid differs from the one in memory")
	}
	for _, c := range []struct {
		name string
		g, w *report.Grid
	}{{"residual on x", p.Plot.ResidX, m.Plot.ResidX}, {"residual on order", p.Plot.ResidOrder, m.Plot.ResidOrder}} {
		moved := 0
		for i := range c.w.Counts {
			moved += max(c.g.Counts[i]-c.w.Counts[i], c.w.Counts[i]-c.g.Counts[i])
		}
		if sum(c.g.Counts) != p.N || moved > 10 {
			t.Errorf("%s: %d rows binned, %d in other cells than in memory", c.name, sum(c.g.Counts), moved)
		}
	}
	// The sampled figures are near those of every row: within the errors
	// the report states (a few times 1/√20000 ≈ 0.007).
	for _, c := range []struct {
		name      string
		got, want float64
	}{{"Spearman's ρ", float64(p.Spearman.Rho), float64(m.Spearman.Rho)}, {"Kendall's τ-b", float64(p.Kendall.TauB), float64(m.Kendall.TauB)},
		{"median of x", float64(p.Describe.X.Median), float64(m.Describe.X.Median)}} {
		if math.Abs(c.got-c.want) > 0.03*math.Max(1, math.Abs(c.want)) {
			t.Errorf("%s from the sample %g, from every row %g", c.name, c.got, c.want)
		}
	}
	t.Logf("n %d; named %d; flagged %d; r %v; DW %v", p.N, len(p.Influence.Points), p.Influence.Counts.Flagged, p.Pearson.R, p.Diagnostics.DurbinWatson)
}

// The same set of rows stored in another order gives the same study: the
// sample is the same rows (its figures are equal), and the sums differ at
// most in rounding.
func TestPushdownRowOrder(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, append(bigTableSQL("pdord", 50_000),
		"DROP TABLE IF EXISTS pdord2", "CREATE TABLE pdord2 AS SELECT * FROM pdord ORDER BY md5(id) DESC")...)
	t.Setenv("BIVAR_TEST_DB", url)
	dir := t.TempDir()
	study := "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\norder = \"o\"\n"
	decl := "[[dataset]]\nid = \"d\"\ntable = \"pdord\"\nconnection = \"BIVAR_TEST_DB\"\nid_column = \"id\"\nmax_rows = 1000\n"
	a, err := runManifest(t, dir, decl+study)
	if err != nil {
		t.Fatal(err)
	}
	b, err := runManifest(t, dir, strings.Replace(decl, `"pdord"`, `"pdord2"`, 1)+study)
	if err != nil {
		t.Fatal(err)
	}
	sa, sb := a.Studies[0], b.Studies[0]
	if sa.Error != nil || sb.Error != nil || sa.Pushdown == nil || sa.Pushdown.Sample != 20000 {
		t.Fatalf("errors %s / %s", errText(sa.Error), errText(sb.Error))
	}
	// The F tests of the group lines as in TestPushdownMillion (agreeF).
	fa, fb := exactFigures(sa), exactFigures(sb)
	agreeF(t, "stored in another order", fb, fa, sa.GroupLines.DF2)
	agree(t, "stored in another order", fb, fa, 1e-9)
	if sa.Spearman.Rho != sb.Spearman.Rho || sa.Kendall.TauB != sb.Kendall.TauB || sa.Describe.Y.Q3 != sb.Describe.Y.Q3 ||
		sa.Diagnostics.Resistant.Slope != sb.Diagnostics.Resistant.Slope || sa.Diagnostics.DistanceCorr.DCor != sb.Diagnostics.DistanceCorr.DCor ||
		!slices.Equal(sa.Plot.Lowess, sb.Plot.Lowess) {
		t.Errorf("the sampled figures differ: ρ %v / %v, τ %v / %v", sa.Spearman.Rho, sb.Spearman.Rho, sa.Kendall.TauB, sb.Kendall.TauB)
	}
	if a.Datasets[0].SHA256 != b.Datasets[0].SHA256 {
		t.Errorf("the order-free hash differs: %s / %s", a.Datasets[0].SHA256, b.Datasets[0].SHA256)
	}
	// One value changed in its last bit, one id in one letter, one cell
	// set to NULL: each gives another hash.
	for _, change := range []string{
		"UPDATE pdord2 SET y = y * (1 + 2.3e-16) WHERE id = 'r17'",
		"UPDATE pdord2 SET id = 'R17' WHERE id = 'r17'",
		"UPDATE pdord2 SET z = NULL WHERE id = 'r18'",
	} {
		pgExec(t, url, change)
		c, err := runManifest(t, dir, strings.Replace(decl, `"pdord"`, `"pdord2"`, 1)+study)
		if err != nil {
			t.Fatal(err)
		}
		if c.Datasets[0].SHA256 == b.Datasets[0].SHA256 {
			t.Errorf("after %s the hash is still %s", change, c.Datasets[0].SHA256)
		}
		b = c
	}
}

// agreeF compares the F tests of the group lines in got and want (exact
// figures as exactFigures gives them) to 1e-9·df2, and deletes them from
// both: they are differences of residual sums of squares of order n, so
// their rounding is relative to those sums, not to F.
func agreeF(t *testing.T, what string, got, want map[string]float64, df2 int) {
	t.Helper()
	for _, k := range []string{"slopes_f", "lines_f"} {
		if d := math.Abs(got[k] - want[k]); !(d <= 1e-9*float64(df2)) {
			t.Errorf("%s = %.17g, %s %.17g: differs by %.2g, more than 1e-9·DF2", k, got[k], what, want[k], d)
		}
		delete(got, k)
		delete(want, k)
	}
}

// The dataset's hash and NULL counts are the same whether the first pass
// of a study computes them (the usual case) or a scan of their own does
// (a study that stops before its first pass, here one with where =), and
// both are those of the definition in dataset.FingerprintMethod, written
// out here as its own statement: the row count and the exact sum of the
// exclusive or of the cells' hashes, each seeded by the column's
// position, a NULL cell hashing to that position. The rows have NULLs in
// a study's number, in a column only the second study uses, in the group
// and in the id, and the group has more levels than one.
func TestPushdownHashInFirstPass(t *testing.T) {
	url := pgURL(t)
	pgExec(t, url, "DROP TABLE IF EXISTS pdhash",
		"CREATE TABLE pdhash (id text, x float8, y float8, w float8, g text, o bigint)",
		`INSERT INTO pdhash SELECT CASE WHEN i % 13 = 0 THEN NULL ELSE 'r' || i END, CASE WHEN i % 7 = 0 THEN NULL ELSE i END,
		   i * 0.5 + sin(i), CASE WHEN i % 5 = 0 THEN NULL ELSE cos(i) END, CASE WHEN i % 11 = 0 THEN NULL ELSE 'L' || (i % 3) END, i / 4
		 FROM generate_series(1, 300) i`)
	ctx := context.Background()
	conn, err := pgx.Connect(ctx, url)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close(ctx)
	var n int
	var hashSum string
	var nx, nw, ng, nid int
	if err := conn.QueryRow(ctx, `SELECT count(*), coalesce(sum(coalesce(hashtextextended(id COLLATE "C", 1), 1) # coalesce(hashfloat8extended(x, 2), 2)
		  # coalesce(hashfloat8extended(y, 3), 3) # coalesce(hashfloat8extended(w, 4), 4) # coalesce(hashtextextended(g COLLATE "C", 5), 5)
		  # coalesce(hashint8extended(o, 6), 6)), 0)::text,
		count(*) - count(x), count(*) - count(w), count(*) - count(g), count(*) - count(id) FROM pdhash`).Scan(&n, &hashSum, &nx, &nw, &ng, &nid); err != nil {
		t.Fatal(err)
	}
	want := sha256.Sum256([]byte(fmt.Sprintf("%d %s", n, hashSum)))
	wantMissing := map[string]int{"x": nx, "y": 0, "w": nw, "g": ng, "id": nid, "o": 0}
	t.Setenv("BIVAR_TEST_DB", url)
	decl := "[[dataset]]\nid = \"d\"\ntable = \"pdhash\"\nconnection = \"BIVAR_TEST_DB\"\nid_column = \"id\"\nmax_rows = 100\n"
	second := "[[study]]\nid = \"w\"\ndataset = \"d\"\nx = \"w\"\ny = \"y\"\n"
	for _, c := range []struct{ what, first string }{
		{"computed in the first pass", "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\norder = \"o\"\n"},
		{"computed by a scan of its own", "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\norder = \"o\"\nwhere = \"x > 3\"\n"},
	} {
		r, err := runManifest(t, t.TempDir(), decl+c.first+second)
		if err != nil {
			t.Fatal(err)
		}
		if r.Studies[1].Error != nil || r.Studies[1].Pushdown == nil {
			t.Fatalf("%s: study w: %s", c.what, errText(r.Studies[1].Error))
		}
		ds := r.Datasets[0]
		if ds.SHA256 != hex.EncodeToString(want[:]) || ds.Rows != 300 || r.Studies[1].Pushdown.Rows != 300 {
			t.Errorf("%s: hash %s over %d rows, want %x over %d (%s)", c.what, ds.SHA256, ds.Rows, want, n, hashSum)
		}
		got := map[string]int{}
		for _, m := range ds.Missing {
			got[m.Column] = m.Count
		}
		if !maps.Equal(got, wantMissing) {
			t.Errorf("%s: missing cells %v, want %v", c.what, got, wantMissing)
		}
		if ds.Source == nil || ds.Source.RanAt == "" || !strings.Contains(ds.Source.Query, `FROM "pdhash"`) {
			t.Errorf("%s: source %+v", c.what, ds.Source)
		}
	}
}

// A rerun on the same rows gives the same study to the last digit, and
// lists the same statements in the same order: each statement sums its
// rows in one server process, in one order, and the Durbin–Watson
// grouping, which runs alongside the third pass on a second session,
// reads the same snapshot.
func TestPushdownRerun(t *testing.T) {
	url := pgURL(t)
	// Larger than a quarter of the server's shared_buffers (128 MB by
	// default), where PostgreSQL would synchronize two scans of the table
	// unless the session turns that off.
	rows := 50_000
	if !testing.Short() {
		rows = 600_000
	}
	// Without statistics at first (autovacuum off for the table), then
	// analyzed before the second run: the planner may then group by
	// sorting in one run and by hashing in the next, which sums the rows
	// in another order (the second pass, grouped by level, did so).
	stmts := bigTableSQL("pdrerun", rows)
	stmts = append(stmts[:2:2], append([]string{"ALTER TABLE pdrerun SET (autovacuum_enabled = false)"}, stmts[2:]...)...)
	pgExec(t, url, stmts...)
	t.Setenv("BIVAR_TEST_DB", url)
	src := "[[dataset]]\nid = \"d\"\ntable = \"pdrerun\"\nconnection = \"BIVAR_TEST_DB\"\nid_column = \"id\"\nmax_rows = 1000\n" +
		"[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\ngroup = \"g\"\norder = \"o\"\ncovariates = [\"z\"]\n" +
		"[[study]]\nid = \"plain\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n" // its third pass in two parts
	var runs [3][]byte
	var sha [3]string
	for i := range runs {
		r, err := runManifest(t, t.TempDir(), src)
		if err != nil {
			t.Fatal(err)
		}
		for _, s := range r.Studies {
			if s.Error != nil || s.Pushdown == nil || s.ID == "s" && math.IsNaN(float64(s.Diagnostics.DurbinWatson)) {
				t.Fatalf("run %d: study %s: error %s", i+1, s.ID, errText(s.Error))
			}
		}
		if runs[i], err = json.Marshal(r.Studies); err != nil {
			t.Fatal(err)
		}
		sha[i] = r.Datasets[0].SHA256
		if i == 0 {
			pgExec(t, url, "ANALYZE pdrerun")
		}
	}
	for i := 1; i < len(runs); i++ {
		if !bytes.Equal(runs[0], runs[i]) || sha[0] != sha[i] {
			t.Errorf("rerun %d gives another study or hash (%s / %s)", i+1, sha[0], sha[i])
		}
	}

	// On one session (a server that cannot share its snapshot, so that no
	// statement runs beside another): the same study to the last digit,
	// from the same statements (in another order: the second session's
	// are listed after the first's), and the same hash, which the first
	// pass then computes.
	restore := analysis.SetSecondSession(false)
	defer restore()
	r, err := runManifest(t, t.TempDir(), src)
	if err != nil {
		t.Fatal(err)
	}
	again, err := runManifest(t, t.TempDir(), src)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(mustJSON(t, again.Studies), mustJSON(t, r.Studies)) {
		t.Errorf("one session: a rerun gives other studies")
	}
	var two []report.Study
	if err := json.Unmarshal(runs[0], &two); err != nil {
		t.Fatal(err)
	}
	if r.Datasets[0].SHA256 != sha[0] || len(r.Studies) != len(two) {
		t.Fatalf("one session: hash %s, want %s; %d studies", r.Datasets[0].SHA256, sha[0], len(r.Studies))
	}
	for k, one := range r.Studies {
		if one.Pushdown == nil || two[k].Pushdown == nil {
			t.Fatalf("one session: study %s: error %s", one.ID, errText(one.Error))
		}
		// Two sessions: the dataset's hash is a statement of its own (in
		// its first study), beside the first pass, which then does not
		// compute it; every other statement is the same.
		st1, st2 := one.Pushdown.Statements, two[k].Pushdown.Statements
		extra := 0
		if k == 0 {
			extra = 1
		}
		if len(st2) != len(st1)+extra || len(st1) < 5 {
			t.Errorf("study %s: one session ran %d statements, two sessions %d; want %d more", one.ID, len(st1), len(st2), extra)
		}
		for _, st := range st1 {
			if !strings.Contains(st, "sum(bivar_h)") && !slices.Contains(st2, st) {
				t.Errorf("study %s: one session ran a statement that two did not: %.200s", one.ID, st)
			}
		}
		one.Pushdown.Statements, two[k].Pushdown.Statements = nil, nil
		if !bytes.Equal(mustJSON(t, one), mustJSON(t, two[k])) {
			t.Errorf("study %s: one session gives another study", one.ID)
		}
	}
}

func mustJSON(t *testing.T, v any) []byte {
	t.Helper()
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// A rerun gives the same study to the last digit where x has an index
// that the statistics make worth using: the parts of the third pass (the
// rows below and not below a cut in x) must not be read through it. Read
// in order of x after an ANALYZE, and in the table's order before (a
// bitmap scan, without statistics), each cell summed its quadratic's
// squared residuals in another order, and the quadratic's last digits
// changed (found by an independent review, PostgreSQL 15). x follows the
// rows' order in the table with a wiggle, so the index's order is not the
// table's and the planner, once it knows the correlation, reads half the
// table through the index.
func TestPushdownRerunIndexedX(t *testing.T) {
	url := pgURL(t)
	// 4·10⁵ rows (10⁵ did not show the change, with or without the fix).
	rows := 400_000
	pgExec(t, url, "DROP TABLE IF EXISTS pdidx", "CREATE TABLE pdidx (id text, x float8, y float8) WITH (autovacuum_enabled = false)",
		fmt.Sprintf(`INSERT INTO pdidx SELECT 'r' || i, i * 0.001 + 0.3 * sin(i * 0.7071),
		  2 + 0.4 * (i * 0.001) + 1e-6 * (i * 0.001)^2 + sin(i * 1.3247) FROM generate_series(1, %d) i`, rows),
		"CREATE INDEX pdidx_x ON pdidx (x)")
	t.Setenv("BIVAR_TEST_DB", url)
	src := "[[dataset]]\nid = \"d\"\ntable = \"pdidx\"\nconnection = \"BIVAR_TEST_DB\"\nid_column = \"id\"\nmax_rows = 1000\n" +
		"[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n"
	var runs [2][]byte
	for i := range runs {
		r, err := runManifest(t, t.TempDir(), src)
		if err != nil {
			t.Fatal(err)
		}
		if s := r.Studies[0]; s.Error != nil || s.Pushdown == nil || len(s.Models) == 0 {
			t.Fatalf("run %d: error %s, %d models", i+1, errText(s.Error), len(s.Models))
		}
		if runs[i], err = json.Marshal(r.Studies); err != nil {
			t.Fatal(err)
		}
		if i == 0 {
			pgExec(t, url, "ANALYZE pdidx")
		}
	}
	if !bytes.Equal(runs[0], runs[1]) {
		t.Errorf("after ANALYZE, a rerun gives another study")
	}
}
