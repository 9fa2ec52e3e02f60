package compare

import (
	"bytes"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// process draws one run of n points from y = a + b·x + e, x ~ N(50, 10²),
// e ~ N(0, sd²). It is a simulation input, not a check value.
func process(rng *rand.Rand, n int, a, b, sd float64) (x, y []float64) {
	x, y = make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = 50 + 10*rng.NormFloat64()
		y[i] = a + b*x[i] + sd*rng.NormFloat64()
	}
	return x, y
}

// study builds a report.Study from data, with the findings given.
func study(id string, x, y []float64, f *report.Findings) report.Study {
	m := moments(x, y)
	return report.Study{ID: id, Dataset: "d", X: report.Variable{Column: "x", Unit: "Cel"}, Y: report.Variable{Column: "y", Unit: "%"},
		N: m.N, Moments: &m, Findings: f}
}

func rep(sha string, studies ...report.Study) *report.Report {
	return &report.Report{Schema: report.Schema, Tool: report.Tool{Name: "bivar", Version: "test"},
		Manifest: report.ManifestInfo{Alpha: 0.05, Adjust: "holm"},
		Datasets: []report.Dataset{{ID: "d", File: "d.csv", SHA256: sha, Rows: 30}},
		Studies:  studies}
}

func verdicts(form, dir, strength string, od bool) *report.Findings {
	return &report.Findings{Form: form, Direction: dir, Strength: strength, OutlierDriven: od}
}

// TestDiffSameProcess: two runs from the same process give no
// significant change and no verdict change.
func TestDiffSameProcess(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	f := verdicts("linear", "positive", "strong", false)
	x1, y1 := process(rng, 40, 2, 0.5, 2)
	x2, y2 := process(rng, 40, 2, 0.5, 2)
	res := Diff(rep("aaa", study("s", x1, y1, f)), rep("bbb", study("s", x2, y2, f)), Options{})
	if res.AnySignificant() || res.AnyVerdictChanged() {
		t.Fatalf("same process: significant %v, verdict changed %v; p(r) = %v, p(slope) = %v",
			res.AnySignificant(), res.AnyVerdictChanged(), res.Studies[0].R.P, res.Studies[0].Slope.P)
	}
	sc := res.Studies[0]
	if !sc.DataChanged || res.Summary.DataChanged != 1 || res.Datasets[0].Status != "changed" {
		t.Errorf("data hash aaa → bbb not reported as changed: %+v", res.Datasets)
	}
	if res.Summary.Tested != 2 || res.Alpha != 0.05 || res.Adjust != "holm" {
		t.Errorf("tested %d, alpha %v, adjust %q; want 2, 0.05 (manifest), holm (manifest)", res.Summary.Tested, res.Alpha, res.Adjust)
	}
}

// TestDiffChangedProcess: the slope doubles and the verdict changes; the
// diff says so.
func TestDiffChangedProcess(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	x1, y1 := process(rng, 40, 2, 0.5, 2)
	x2, y2 := process(rng, 40, 2, 0.1, 2)
	res := Diff(rep("aaa", study("s", x1, y1, verdicts("linear", "positive", "strong", false))),
		rep("aaa", study("s", x2, y2, verdicts("linear", "positive", "moderate", true))), Options{})
	sc := res.Studies[0]
	if !sc.Significant || !res.AnySignificant() {
		t.Errorf("slope 0.5 → 0.1 not significant: p(r) adj %v, p(slope) adj %v", sc.R.PAdjusted, sc.Slope.PAdjusted)
	}
	want := []VerdictChange{{"strength", "strong", "moderate"}, {"outlier_driven", "false", "true"}}
	if !slices.Equal(sc.Verdicts, want) {
		t.Errorf("verdicts = %+v, want %+v", sc.Verdicts, want)
	}
	if sc.DataChanged || res.Datasets[0].Status != "same" {
		t.Errorf("same hash reported as changed")
	}
	if float64(sc.Slope.Delta) > -0.2 {
		t.Errorf("Δslope = %v, want about -0.4", sc.Slope.Delta)
	}
}

// TestDiffStructure: added, removed, unit changes, failed studies, order.
func TestDiffStructure(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	x, y := process(rng, 20, 0, 1, 1)
	a, b, c := study("a", x, y, nil), study("b", x, y, nil), study("c", x, y, nil)
	bF := b
	bF.X.Unit = "[degF]"
	msg := "column \"y\" is constant"
	cErr := report.Study{ID: "c", Error: &msg}
	d := study("d", x, y, nil)
	old := rep("h", a, b, c, study("gone", x, y, nil))
	old.Datasets = append(old.Datasets, report.Dataset{ID: "old-only", SHA256: "x"})
	res := Diff(old, rep("h", d, cErr, bF, a), Options{Adjust: "none", Alpha: 0.1})
	var ids []string
	for _, s := range res.Studies {
		ids = append(ids, s.ID)
	}
	if !slices.Equal(ids, []string{"c", "b", "a"}) {
		t.Errorf("compared studies %v, want the new report's order [c b a]", ids)
	}
	if len(res.Added) != 1 || res.Added[0].ID != "d" || len(res.Removed) != 1 || res.Removed[0].ID != "gone" {
		t.Errorf("added %+v removed %+v", res.Added, res.Removed)
	}
	if res.Studies[0].R != nil || res.Studies[0].NewError == nil || len(res.Studies[0].Notes) == 0 {
		t.Errorf("failed study: %+v", res.Studies[0])
	}
	if res.Studies[1].Slope != nil || res.Studies[1].R == nil || !strings.Contains(strings.Join(res.Studies[1].Notes, " "), "units changed") {
		t.Errorf("unit change: slope %+v notes %v", res.Studies[1].Slope, res.Studies[1].Notes)
	}
	if res.Alpha != 0.1 || res.Adjust != "none" || res.Summary.Tested != 3 {
		t.Errorf("alpha %v adjust %q tested %d; want 0.1 none 3", res.Alpha, res.Adjust, res.Summary.Tested)
	}
	if got := res.Datasets[len(res.Datasets)-1]; got.ID != "old-only" || got.Status != "removed" {
		t.Errorf("dataset removed: %+v", got)
	}
	if bad := Diff(old, old, Options{Adjust: "bonferroni"}); bad.Adjust != "holm" || len(bad.Notes) == 0 {
		t.Errorf("unknown adjust: %q, notes %v", bad.Adjust, bad.Notes)
	}
}

// TestDiffAdjust: the change tests of all studies are one family.
func TestDiffAdjust(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	var olds, news []report.Study
	for i, b := range []float64{0.5, 0.4, 0.3} {
		x1, y1 := process(rng, 25, 0, 0.5, 3)
		x2, y2 := process(rng, 25, 0, b, 3)
		id := string(rune('a' + i))
		olds, news = append(olds, study(id, x1, y1, nil)), append(news, study(id, x2, y2, nil))
	}
	for _, method := range []string{"holm", "bh", "none"} {
		res := Diff(rep("h", olds...), rep("h", news...), Options{Adjust: method})
		var raw, adj []float64
		for _, s := range res.Studies {
			raw = append(raw, float64(s.R.P), float64(s.Slope.P))
			adj = append(adj, float64(s.R.PAdjusted), float64(s.Slope.PAdjusted))
		}
		want := raw
		switch method {
		case "holm":
			want = stats.Holm(raw)
		case "bh":
			want = stats.BenjaminiHochberg(raw)
		}
		if !slices.Equal(adj, want) {
			t.Errorf("%s: adjusted %v, want %v", method, adj, want)
		}
	}
}

// TestDiffJSON: diff.json is deterministic and reads back to the same bytes.
func TestDiffJSON(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	x1, y1 := process(rng, 12, 0, 1, 1)
	x2, y2 := process(rng, 3, 0, 1, 1) // n = 3: undefined z, written as null
	res := Diff(rep("a", study("s", x1, y1, nil)), rep("b", study("s", x2, y2, nil), study("t", x1, y1, nil)), Options{})
	var b1, b2, b3 bytes.Buffer
	if err := Write(&b1, res); err != nil {
		t.Fatal(err)
	}
	if err := Write(&b2, Diff(rep("a", study("s", x1, y1, nil)), rep("b", study("s", x2, y2, nil), study("t", x1, y1, nil)), Options{})); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(b1.Bytes(), b2.Bytes()) {
		t.Fatal("two diffs of the same reports differ")
	}
	back, err := Read(bytes.NewReader(b1.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	if err := Write(&b3, back); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(b1.Bytes(), b3.Bytes()) {
		t.Errorf("diff.json read back and written again differs:\n%s\n---\n%s", b1.String(), b3.String())
	}
	if !strings.Contains(b1.String(), `"schema": "bivar.diff/v1"`) || !strings.Contains(b1.String(), `"z": null`) {
		t.Errorf("diff.json lacks the schema or null for an undefined z:\n%s", b1.String())
	}
	if _, err := Read(strings.NewReader(`{"schema":"bivar.diff/v0"}`)); err == nil {
		t.Error("another schema was accepted")
	}
}

// TestFalseAlarmRate draws many pairs of runs from one process and
// measures how often the diff calls a change significant. Each test alone
// (no adjustment) must reject at about alpha; the study's `significant`
// (either test, Holm over both) and a five-study diff's `significant`
// (Holm over ten tests) must not exceed alpha. Bounds are 4 binomial
// standard errors, sqrt(alpha(1−alpha)/M): a correct test fails this by
// chance with probability below 1e-4.
func TestFalseAlarmRate(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation")
	}
	const alpha, M, n = 0.05, 4000, 30
	rng := rand.New(rand.NewPCG(20261201, 5))
	bound := 4 * math.Sqrt(alpha*(1-alpha)/M)
	var rRej, sRej, sigNone, sigHolm int
	for range M {
		x1, y1 := process(rng, n, 2, 0.5, 4)
		x2, y2 := process(rng, n, 2, 0.5, 4)
		old, new := rep("a", study("s", x1, y1, nil)), rep("b", study("s", x2, y2, nil))
		res := Diff(old, new, Options{Alpha: alpha, Adjust: "none"})
		sc := res.Studies[0]
		if float64(sc.R.P) < alpha {
			rRej++
		}
		if float64(sc.Slope.P) < alpha {
			sRej++
		}
		if sc.Significant {
			sigNone++
		}
		if Diff(old, new, Options{Alpha: alpha, Adjust: "holm"}).AnySignificant() {
			sigHolm++
		}
	}
	rate := func(k int) float64 { return float64(k) / M }
	t.Logf("false-alarm rate over %d pairs of runs (n = %d each, same process), alpha %.2f, bound ±%.4f:", M, n, alpha, bound)
	t.Logf("  Fisher-z change in r alone: %.4f", rate(rRej))
	t.Logf("  equal-slopes t alone:       %.4f", rate(sRej))
	t.Logf("  significant, no adjustment (either test): %.4f", rate(sigNone))
	t.Logf("  significant, Holm over both tests:        %.4f", rate(sigHolm))
	if math.Abs(rate(rRej)-alpha) > bound {
		t.Errorf("Fisher-z test rejects at %.4f, want %.2f ± %.4f", rate(rRej), alpha, bound)
	}
	if math.Abs(rate(sRej)-alpha) > bound {
		t.Errorf("equal-slopes test rejects at %.4f, want %.2f ± %.4f", rate(sRej), alpha, bound)
	}
	if rate(sigHolm) > alpha+bound {
		t.Errorf("significant (Holm) at %.4f, want at most %.2f + %.4f", rate(sigHolm), alpha, bound)
	}

	// Five studies per run, Holm over all ten tests: the chance of any
	// false alarm in the diff stays at or below alpha.
	const M5 = 2000
	bound5 := 4 * math.Sqrt(alpha*(1-alpha)/M5)
	var any5 int
	for range M5 {
		var olds, news []report.Study
		for i := range 5 {
			id := string(rune('a' + i))
			x1, y1 := process(rng, n, 0, float64(i)/4, 4)
			x2, y2 := process(rng, n, 0, float64(i)/4, 4)
			olds, news = append(olds, study(id, x1, y1, nil)), append(news, study(id, x2, y2, nil))
		}
		if Diff(rep("a", olds...), rep("b", news...), Options{Alpha: alpha}).AnySignificant() {
			any5++
		}
	}
	t.Logf("  five studies, Holm over ten tests, any significant: %.4f (%d diffs, bound +%.4f)", float64(any5)/M5, M5, bound5)
	if float64(any5)/M5 > alpha+bound5 {
		t.Errorf("five-study diff flags a change at %.4f, want at most %.2f + %.4f", float64(any5)/M5, alpha, bound5)
	}
}

// TestStatements: the plain-language sentences say what changed, from
// what to what, whether beyond chance and under which adjustment, and
// nothing about a study that did not change. The numbers in them are the
// Result's own (the test compares against the fields, not fixed values).
func TestStatements(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	x1, y1 := process(rng, 40, 2, 0.5, 2)
	x2, y2 := process(rng, 40, 2, 0.1, 2)
	x3, y3 := process(rng, 40, 2, 0.5, 2)
	x4, y4 := process(rng, 40, 2, 0.5, 2)
	f := verdicts("linear", "positive", "strong", false)
	old := rep("a", study("moved", x1, y1, f), study("still", x3, y3, f))
	old.Studies[0].X.Symbol, old.Studies[0].Y.Symbol = "°C", "%"
	nw := rep("b", study("moved", x2, y2, verdicts("linear", "positive", "moderate", false)), study("still", x4, y4, f))
	nw.Studies[0].X.Symbol, nw.Studies[0].Y.Symbol = "°C", "%"
	res := Diff(old, nw, Options{})
	if len(res.Statements) == 0 || !strings.HasPrefix(res.Statements[0], "1 of 2 studies changed beyond what chance explains (at alpha = 0.05 after Holm's step-down method across all 4 change tests); 1 study's verdict changed.") {
		t.Errorf("overall statement: %q", res.Statements)
	}
	moved, still := res.Studies[0], res.Studies[1]
	sl := moved.Slope
	for _, want := range []string{
		"The slope changed beyond chance: from " + g4(sl.Old) + " to " + g4(sl.New) + " % per °C",
		"a change of " + signed4(sl.Delta) + " ± " + g4(sl.SE) + " % per °C (SE)",
		"% less steep",
		"adjusted p " + pText(sl.PAdjusted, res.Alpha),
		"The verdict changed: strength strong → moderate.",
		"Find the cause",
	} {
		if !strings.Contains(moved.Statement, want) {
			t.Errorf("statement lacks %q:\n%s", want, moved.Statement)
		}
	}
	if still.Significant || still.Statement != "" {
		t.Errorf("unchanged study has statement %q", still.Statement)
	}
	// Same process, no adjustment: the head says so and names it.
	same := Diff(rep("a", study("still", x3, y3, f)), rep("a", study("still", x4, y4, f)), Options{Adjust: "none"})
	if h := same.Statements[0]; !strings.HasPrefix(h, "No study's correlation or slope changed beyond what chance explains (1 compared, at alpha = 0.05, with no adjustment across the 2 change tests); no verdict changed.") {
		t.Errorf("no-change statement: %q", h)
	}
	// A study that could not be tested is named.
	msg := "column \"y\" is constant"
	bad := Diff(rep("a", study("s", x3, y3, f)), rep("a", report.Study{ID: "s", Error: &msg}), Options{})
	if !slices.Contains(bad.Statements, "Not tested (see the notes): s.") {
		t.Errorf("untested: %q", bad.Statements)
	}
}

func TestSteepness(t *testing.T) {
	cases := []struct {
		old, new float64
		want     string
	}{
		{-0.08, -0.056, ", 30% less steep"},
		{0.5, 1.0, ", 100% steeper"},
		{0.5, -0.5, ", the direction reversed"},
		{0.5, 0.501, ""},
		{0, 1, ""},
	}
	for _, tc := range cases {
		if got := steepness(report.Float(tc.old), report.Float(tc.new)); got != tc.want {
			t.Errorf("steepness(%v, %v) = %q, want %q", tc.old, tc.new, got, tc.want)
		}
	}
}

// TestPText: the diff writes p-values by the project's one formatter
// (findings.PValueVs against alpha): "< 0.0001" below 0.0001, never
// the e notation, and digits enough that the printed value stays on its
// side of alpha. The cases are the formatter's rules (the project's own
// convention, not a standard).
func TestPText(t *testing.T) {
	cases := []struct {
		p, alpha float64
		want     string
	}{
		{5.2e-05, 0.05, "< 0.0001"},
		{1.5e-119, 0.05, "< 0.0001"},
		{0.0496, 0.05, "= 0.0496"}, // PValue alone would print 0.050
		{0.0663, 0.05, "= 0.066"},
		{0.00123, 0.05, "= 0.001"},
		{0.00087, 0.05, "= 0.0009"},
		{1, 0.05, "= 1.00"},
		{math.NaN(), 0.05, "undefined"},
	}
	for _, c := range cases {
		if got := pText(report.Float(c.p), c.alpha); got != c.want {
			t.Errorf("pText(%g, %g) = %q, want %q", c.p, c.alpha, got, c.want)
		}
	}
}

// TestVarianceNoteP: the note on unequal residual variances prints its
// F test's p as the report does ("p < 0.0001", not "p = 5.2e-05").
func TestVarianceNoteP(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	x1, y1 := process(rng, 60, 2, 0.5, 2)
	x2, y2 := process(rng, 60, 2, 0.5, 0.2) // a tenth of the SD: F far in the tail
	f := verdicts("linear", "positive", "strong", false)
	res := Diff(rep("a", study("s", x1, y1, f)), rep("b", study("s", x2, y2, f)), Options{})
	sc := res.Studies[0]
	if vp := float64(sc.Slope.VarianceP); !(vp < 1e-4) {
		t.Fatalf("variance p %g: the case needs one below 0.0001", vp)
	}
	var note string
	for _, n := range sc.Notes {
		if strings.Contains(n, "residual variance differs") {
			note = n
		}
	}
	if !strings.Contains(note, "F test p < 0.0001)") || strings.Contains(note, "e-") {
		t.Errorf("variance note %q: want \"F test p < 0.0001)\"", note)
	}
}

// The data sentence names where the rows came from: a file, a workbook's
// sheet, or a database by its connection's variable, whose hash is over
// the rows (before, a database dataset was "the same file in both runs
// (, SHA-256 alike)").
func TestDataFactSources(t *testing.T) {
	f := verdicts("linear", "positive", "strong", false)
	rng := rand.New(rand.NewPCG(5, 6))
	x, y := process(rng, 40, 2, 0.5, 2)
	for _, c := range []struct {
		name string
		d    report.Dataset
		want string
	}{
		{"file", report.Dataset{ID: "d", File: "d.csv", SHA256: "aaa", Rows: 30},
			"d is the same file in both runs (d.csv, SHA-256 alike)"},
		{"sheet", report.Dataset{ID: "d", File: "w.xlsx", SHA256: "aaa", Rows: 30, Source: &report.Source{Kind: report.SourceWorkbook, Sheet: "Oct"}},
			"d is the same file in both runs (w.xlsx, sheet Oct, SHA-256 alike)"},
		{"database", report.Dataset{ID: "d", SHA256: "aaa", Rows: 30, Source: &report.Source{Kind: report.SourcePostgreSQL, Connection: "LINE7_DB"}},
			"d holds the same rows in both runs (PostgreSQL, connection LINE7_DB: the same count and hash of the rows)"},
	} {
		a, b := rep("aaa", study("s", x, y, f)), rep("aaa", study("s", x, y, f))
		a.Datasets, b.Datasets = []report.Dataset{c.d}, []report.Dataset{c.d}
		res := Diff(a, b, Options{})
		if got := dataFact(res); !strings.Contains(got, c.want) {
			t.Errorf("%s: %q, want it to hold %q", c.name, got, c.want)
		}
		if d := res.Datasets[0]; d.Status != "same" || d.NewFrom == "" || d.OldFrom != d.NewFrom || d.Database != (c.d.Source != nil && c.d.Source.Kind == report.SourcePostgreSQL) {
			t.Errorf("%s: %+v", c.name, d)
		}
	}
}

// The same rows fetched from a database in one run and left in it in the
// other carry hashes of two methods (report.Source.Order): the diff says
// the hashes cannot tell, not that the rows changed (from an independent
// review).
func TestDataFactRehashed(t *testing.T) {
	f := verdicts("linear", "positive", "strong", false)
	rng := rand.New(rand.NewPCG(7, 8))
	x, y := process(rng, 40, 2, 0.5, 2)
	a, b := rep("aaa", study("s", x, y, f)), rep("bbb", study("s", x, y, f))
	src := func(order string) *report.Source {
		return &report.Source{Kind: report.SourcePostgreSQL, Connection: "LINE7_DB", Order: order}
	}
	a.Datasets = []report.Dataset{{ID: "d", SHA256: "aaa", Rows: 30, Source: src("fetched in a canonical order")}}
	b.Datasets = []report.Dataset{{ID: "d", SHA256: "bbb", Rows: 30, Source: src("left in the database: a sum of row hashes")}}
	res := Diff(a, b, Options{})
	if d := res.Datasets[0]; d.Status != "rehashed" || !strings.Contains(dataFact(res), "cannot say whether its rows changed") {
		t.Errorf("status %q, %q", d.Status, dataFact(res))
	}
	b.Datasets[0].Source = src("fetched in a canonical order")
	if d := Diff(a, b, Options{}).Datasets[0]; d.Status != "changed" {
		t.Errorf("same method, other hash: status %q, want changed", d.Status)
	}
}
