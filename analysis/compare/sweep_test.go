package compare

// Cases found by a sweep of realistic and hostile uses of `bivar diff`.
// Each builds two reports that differ in one stated way; the reference
// for what the diff must say is the two inputs themselves.

import (
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"bivar/analysis/report"
)

// gated returns s with a slope_within gate [lo, hi] that held or not.
func gated(s report.Study, lo, hi float64, want string, ok bool) report.Study {
	s.Expectations = []report.Expectation{{Name: "slope_within", Title: "slope within its limits", Want: want, Got: "slope = 0.5", OK: ok,
		Limits: &report.Limits{Low: report.Float(lo), High: report.Float(hi)}}}
	return s
}

// TestDiffGateEdited: the same rows in both runs, only the slope gate's
// limits edited in the manifest ([0.4, 0.6] → [0.6, 0.7]), so the gate
// went from met to failed. The diff must say that the gate was edited
// (both wants), read the old slope against the old gate (inside it, as
// the old run found), and not send the reader to look for a cause in the
// process. It said "the old slope lay outside" the gate the old run met,
// and its statement was only "Find the cause (process, material, …)".
func TestDiffGateEdited(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	x, y := process(rng, 40, 2, 0.5, 1)
	s := study("s", x, y, verdicts("linear", "positive", "strong", false))
	old := rep("same", gated(s, 0.4, 0.6, "slope in [0.4, 0.6]", true))
	cur := rep("same", gated(s, 0.6, 0.7, "slope in [0.6, 0.7]", false))
	res := Diff(old, cur, Options{})
	sc := res.Studies[0]
	if len(sc.Expectations) != 1 {
		t.Fatalf("expectations = %+v, want the one gate", sc.Expectations)
	}
	e := sc.Expectations[0]
	if !e.WantChanged || e.OldWant != "slope in [0.4, 0.6]" || e.Want != "slope in [0.6, 0.7]" || !e.Changed || !e.Broken {
		t.Errorf("gate = %+v, want WantChanged with old want [0.4, 0.6], new [0.6, 0.7], changed and broken", e)
	}
	g := sc.SlopeGate
	if g == nil || g.OldLimits == nil || float64(g.OldLimits.Low) != 0.4 || float64(g.OldLimits.High) != 0.6 || !g.OldInside || g.NewInside {
		t.Fatalf("slope gate = %+v, want old limits [0.4, 0.6] with the old slope inside, the new outside [0.6, 0.7]", g)
	}
	for _, want := range []string{"was edited between the runs (it asked for slope in [0.4, 0.6], now slope in [0.6, 0.7])", "the old slope lay inside the old gate"} {
		if !strings.Contains(sc.Statement, want) {
			t.Errorf("statement lacks %q:\n%s", want, sc.Statement)
		}
	}
	if strings.Contains(sc.Statement, "Find the cause") {
		t.Errorf("statement sends the reader to the process for a change the manifest made:\n%s", sc.Statement)
	}
	// The same gate in both runs, the outcome changed by the data: the
	// edit is not mentioned, and the cause is to be found.
	x2, y2 := process(rng, 40, 2, 0.9, 1)
	s2 := study("s", x2, y2, verdicts("linear", "positive", "strong", false))
	res = Diff(old, rep("other", gated(s2, 0.4, 0.6, "slope in [0.4, 0.6]", false)), Options{})
	sc = res.Studies[0]
	if sc.Expectations[0].WantChanged || sc.SlopeGate.OldLimits != nil || strings.Contains(sc.Statement, "edited") || !strings.Contains(sc.Statement, "Find the cause") {
		t.Errorf("same gate, slope 0.5 → 0.9: gate %+v, slope gate %+v, statement:\n%s", sc.Expectations[0], sc.SlopeGate, sc.Statement)
	}
}

// TestDiffGateDropped: a gate declared in the old run only. The statement
// names it (it said nothing but "Find the cause …" for a slope_within
// gate whose slope was not compared).
func TestDiffGateDropped(t *testing.T) {
	rng := rand.New(rand.NewPCG(13, 14))
	x, y := process(rng, 30, 2, 0.5, 1)
	s := study("s", x, y, verdicts("linear", "positive", "strong", false))
	cur := s
	cur.Y.Unit = "mm" // units changed: no slope test, so no slope gate sentence
	res := Diff(rep("same", gated(s, 0.4, 0.6, "slope in [0.4, 0.6]", true)), rep("same", cur), Options{})
	st := res.Studies[0].Statement
	if !strings.Contains(st, `The gate "slope within its limits" went met → not declared`) || strings.Contains(st, "Find the cause") {
		t.Errorf("statement = %q, want the gate named as no longer declared and no cause to find", st)
	}
}

// TestDiffColumnsChanged: one study id, x and y swapped in the new run
// (both in the same unit, so the slopes would otherwise be compared as
// if alike). The diff must say so in the statement, compare r (it is
// symmetric) and not the slope. A study that reads another column is
// not tested at all.
func TestDiffColumnsChanged(t *testing.T) {
	rng := rand.New(rand.NewPCG(15, 16))
	x, y := process(rng, 30, 2, 0.5, 1)
	old := study("s", x, y, nil)
	old.X.Unit, old.Y.Unit = "mm", "mm"
	cur := study("s", y, x, nil)
	cur.X, cur.Y = old.Y, old.X
	res := Diff(rep("same", old), rep("same", cur), Options{})
	sc := res.Studies[0]
	if sc.Slope != nil || sc.R == nil || sc.Lines != nil {
		t.Errorf("swapped x and y: slope %+v, r %+v, lines %v; want r only", sc.Slope, sc.R, sc.Lines != nil)
	}
	if !strings.HasPrefix(sc.Statement, `x and y were swapped (x "x", y "y" in the old run)`) {
		t.Errorf("statement = %q, want it to say x and y were swapped", sc.Statement)
	}
	other := study("s", x, y, nil)
	other.Y.Column = "z"
	sc = Diff(rep("same", study("s", x, y, nil)), rep("same", other), Options{}).Studies[0]
	if sc.Slope != nil || sc.R != nil || !strings.Contains(sc.Statement, `other columns than in the old run (y "y" → "z")`) {
		t.Errorf("y column y → z: slope %+v, r %+v, statement %q; want no test and the columns named", sc.Slope, sc.R, sc.Statement)
	}
}

// TestDiffDataSameFileChanged: the dataset is read from the same file
// name in both runs, with other contents (one value edited, 40 rows in
// each). The statement must say the data changed; it said only that d
// "was read from d.csv (40 rows) in the new run and from d.csv (40 rows)
// in the old".
func TestDiffDataSameFileChanged(t *testing.T) {
	rng := rand.New(rand.NewPCG(17, 18))
	x, y := process(rng, 40, 2, 0.5, 1)
	old, cur := rep("aaa", study("s", x, y, nil)), rep("bbb", study("s", x, y, nil))
	old.Datasets[0].Rows, cur.Datasets[0].Rows = 40, 40
	res := Diff(old, cur, Options{})
	want := "Data: d changed: the contents of d.csv differ between the runs (another SHA-256, which any edited, added, removed or reordered row gives; 40 rows in both)."
	if got := res.Statements[len(res.Statements)-1]; got != want {
		t.Errorf("data statement\n got %q\nwant %q", got, want)
	}
	cur.Datasets[0].File, cur.Datasets[0].Rows = "e.csv", 41
	want = "Data: d changed: the new run read e.csv, the old d.csv (another SHA-256; 40 rows old, 41 new)."
	if got := Diff(old, cur, Options{}).Statements; got[len(got)-1] != want {
		t.Errorf("data statement\n got %q\nwant %q", got[len(got)-1], want)
	}
}

// TestDiffRenamed: the study's id edited between the runs, nothing else.
// The diff lists one added and one removed, and a note says they read the
// same dataset, x and y; it said nothing.
func TestDiffRenamed(t *testing.T) {
	rng := rand.New(rand.NewPCG(19, 20))
	x, y := process(rng, 30, 2, 0.5, 1)
	other := study("other", x, y, nil)
	other.Y.Column = "z"
	res := Diff(rep("same", study("hard-vs-temp", x, y, nil), other), rep("same", study("hardness-vs-temp", x, y, nil), other), Options{})
	if res.Summary.Added != 1 || res.Summary.Removed != 1 {
		t.Fatalf("added %d, removed %d; want 1 and 1", res.Summary.Added, res.Summary.Removed)
	}
	want := `study "hardness-vs-temp" of the new run reads the same dataset, x and y as "hard-vs-temp" of the old run`
	var got []string
	for _, n := range res.Notes {
		if strings.Contains(n, "same dataset, x and y") {
			got = append(got, n)
		}
	}
	if len(got) != 1 || !strings.HasPrefix(got[0], want) {
		t.Errorf("notes %q, want one beginning %q", res.Notes, want)
	}
}

// TestDiffStudyStoppedRunning: the study ran in the old run and failed in
// the new (its y column constant there), and the reverse. The statement
// says so first, with the reason; it said nothing on a study without
// gates, and only "the gate went met → failed (… → not computed)" on one
// with a gate, the reason left in the notes.
func TestDiffStudyStoppedRunning(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	x, y := process(rng, 30, 2, 0.5, 1)
	ran := study("s", x, y, verdicts("linear", "positive", "strong", false))
	msg := `column "y" is constant`
	failed := report.Study{ID: "s", Dataset: "d", X: ran.X, Y: ran.Y, Error: &msg}
	for _, tc := range []struct {
		name     string
		old, new report.Study
		want     string
	}{
		{"stopped", ran, failed, `The study ran in the old run but did not run in the new one: column "y" is constant.`},
		{"started", failed, ran, `The study did not run in the old run (column "y" is constant) and runs in the new one.`},
		{"neither", failed, failed, `The study did not run in either run: column "y" is constant.`},
	} {
		sc := Diff(rep("same", tc.old), rep("same", tc.new), Options{}).Studies[0]
		if !strings.HasPrefix(sc.Statement, tc.want) {
			t.Errorf("%s: statement %q, want it to begin %q", tc.name, sc.Statement, tc.want)
		}
	}
	// Stopping counts, and is what --fail-on verdict gates on with the
	// changed verdicts (a study that stopped running, without gates,
	// passed every gate of the diff).
	if res := Diff(rep("same", ran), rep("same", failed), Options{}); res.Summary.StoppedRunning != 1 || !res.AnyVerdictChanged() || res.Summary.VerdictChanged != 0 {
		t.Errorf("stopped: stopped running %d, verdict changed %d, any %v; want 1, 0, true", res.Summary.StoppedRunning, res.Summary.VerdictChanged, res.AnyVerdictChanged())
	}
	if res := Diff(rep("same", failed), rep("same", ran), Options{}); res.Summary.StoppedRunning != 0 || res.AnyVerdictChanged() {
		t.Errorf("started: stopped running %d, any verdict changed %v; want 0, false", res.Summary.StoppedRunning, res.AnyVerdictChanged())
	}
	if st := Diff(rep("same", ran), rep("same", ran), Options{}).Studies[0].Statement; st != "" {
		t.Errorf("ran in both, nothing changed: statement %q, want none", st)
	}
}

// TestDiffSecondaryVerdicts: the same moments in both runs, and in the
// new one a secondary verdict raised: a reversal within groups, drift in
// run order, a changing spread, an association explained by a covariate.
// Each is a changed verdict (what --fail-on verdict gates on); the diff
// said "no verdict changed" for all four.
func TestDiffSecondaryVerdicts(t *testing.T) {
	rng := rand.New(rand.NewPCG(23, 24))
	x, y := process(rng, 30, 2, 0.5, 1)
	for _, tc := range []struct {
		raise func(*report.Findings)
		want  VerdictChange
		words string
	}{
		{func(f *report.Findings) { f.Reversal = true }, VerdictChange{"reversal", "false", "true"}, "The verdict changed: reversal false → true."},
		{func(f *report.Findings) { f.Drift = true }, VerdictChange{"drift", "false", "true"}, "The verdict changed: drift false → true."},
		{func(f *report.Findings) { f.SpreadChanges = true }, VerdictChange{"spread_changes", "false", "true"}, "The verdict changed: changing spread false → true."},
		{func(f *report.Findings) { f.ExplainedBy = []string{"ambient_rh", "shift"} }, VerdictChange{"explained_by", "", "ambient_rh, shift"}, "The verdict changed: explained by - → ambient_rh, shift."},
	} {
		nf := verdicts("linear", "positive", "strong", false)
		tc.raise(nf)
		res := Diff(rep("same", study("s", x, y, verdicts("linear", "positive", "strong", false))), rep("same", study("s", x, y, nf)), Options{})
		sc := res.Studies[0]
		if len(sc.Verdicts) != 1 || sc.Verdicts[0] != tc.want || !res.AnyVerdictChanged() {
			t.Errorf("%s raised: verdicts %+v, want exactly %+v", tc.want.Name, sc.Verdicts, tc.want)
		}
		if !strings.Contains(sc.Statement, tc.words) {
			t.Errorf("%s raised: statement %q lacks %q", tc.want.Name, sc.Statement, tc.words)
		}
	}
}

// TestDiffEditedGateNoAtX: the same rows, only a min_abs_r gate edited
// (0.999 → 0.5, failed → met). The statement gives no change in y units:
// it gave "at 9.949 the line gives 9.719 instead of 9.719 (0 ± 0.2409)"
// at three x values, for a change the manifest alone made.
func TestDiffEditedGateNoAtX(t *testing.T) {
	rng := rand.New(rand.NewPCG(25, 26))
	x, y := process(rng, 30, 2, 0.5, 1)
	s := study("s", x, y, verdicts("linear", "positive", "strong", false))
	s.Describe = &report.DescribePair{X: report.Describe{N: 30, Min: 30, Max: 70}}
	gate := func(want string, ok bool) report.Study {
		g := s
		g.Expectations = []report.Expectation{{Name: "min_abs_r", Title: "correlation at least as strong as required", Want: want, Got: "|r| = 0.98", OK: ok}}
		return g
	}
	sc := Diff(rep("same", gate("|r| ≥ 0.999", false)), rep("same", gate("|r| ≥ 0.5", true)), Options{}).Studies[0]
	if strings.Contains(sc.Statement, "the line gives") || !strings.Contains(sc.Statement, "was edited between the runs") {
		t.Errorf("statement = %q, want the edited gate and no change in y units", sc.Statement)
	}
}

// TestDiffGatesOfAddedStudies: the new run adds a study whose gate fails
// (and keeps one alike in both runs). That gate is new and fails, so it
// is broken, what --fail-on expectation gates on (its help: "or a new
// gate fails"); it was not counted at all, and the diff exited 0. The
// same study removed takes its gate away: changed, not broken.
func TestDiffGatesOfAddedStudies(t *testing.T) {
	rng := rand.New(rand.NewPCG(27, 28))
	x, y := process(rng, 30, 2, 0.5, 1)
	kept := study("kept", x, y, nil)
	added := study("added", x, y, nil)
	added.Y.Column = "z"
	added.Expectations = []report.Expectation{{Name: "direction", Title: "direction as expected", Want: "negative", Got: "positive", OK: false}}
	res := Diff(rep("same", kept), rep("same", kept, added), Options{})
	if res.Summary.ExpectationChanged != 1 || res.Summary.ExpectationBroken != 1 || !res.AnyExpectationBroken() {
		t.Errorf("added study with a failing gate: changed %d, broken %d; want 1 and 1", res.Summary.ExpectationChanged, res.Summary.ExpectationBroken)
	}
	g := res.ChangedGates()
	if len(g) != 1 || g[0].Study != "added" || g[0].Compared || g[0].OldOK != nil || g[0].NewOK == nil || *g[0].NewOK {
		t.Errorf("changed gates %+v, want the added study's gate, not declared → failed", g)
	}
	if want := "1 CI gate changed its outcome (added: direction as expected not declared → failed, a study in one run only)."; !slices.Contains(res.Statements, want) {
		t.Errorf("statements %q lack %q", res.Statements, want)
	}
	res = Diff(rep("same", kept, added), rep("same", kept), Options{})
	if res.Summary.ExpectationChanged != 1 || res.Summary.ExpectationBroken != 0 {
		t.Errorf("removed study with a gate: changed %d, broken %d; want 1 and 0", res.Summary.ExpectationChanged, res.Summary.ExpectationBroken)
	}
}

// TestDiffFlaggedRows: the same study, and in the new run one row (P005)
// flagged as an outlier where the old run flagged none (one value of the
// file edited). The diff says so with the row; it said nothing, since no
// verdict moved. Another row flagged in place of the old one, the count
// alike (other units in a new production run), is not a change.
func TestDiffFlaggedRows(t *testing.T) {
	rng := rand.New(rand.NewPCG(29, 30))
	x, y := process(rng, 40, 2, 0.5, 1)
	old, cur := study("s", x, y, nil), study("s", x, y, nil)
	old.Influence = &report.Influence{}
	cur.Influence = &report.Influence{Counts: report.FlagCounts{Flagged: 1, Outlier: 1, Suspect: 1, Named: 1},
		Points: []report.Point{{Row: "P005", Flags: []string{"outlier"}}}}
	sc := Diff(rep("a", old), rep("b", cur), Options{}).Studies[0]
	if sc.Flagged == nil || sc.Flagged.New.Outlier != 1 || sc.Flagged.Old.Outlier != 0 || !slices.Equal(sc.Flagged.NewlyNamed, []string{"P005"}) {
		t.Fatalf("flagged = %+v, want outlier 0 → 1 with P005 newly named", sc.Flagged)
	}
	if want := "The flagged rows changed (outlier 0 → 1); flagged in the new run only: P005."; !strings.Contains(sc.Statement, want) {
		t.Errorf("statement %q lacks %q", sc.Statement, want)
	}
	other := cur
	other.Influence = &report.Influence{Counts: cur.Influence.Counts, Points: []report.Point{{Row: "Q017", Flags: []string{"outlier"}}}}
	if sc := Diff(rep("a", cur), rep("b", other), Options{}).Studies[0]; sc.Flagged != nil || sc.Statement != "" {
		t.Errorf("one outlier in each run: flagged %+v, statement %q; want neither", sc.Flagged, sc.Statement)
	}
}

// TestDiffOrderNote: OLD written after NEW (the arguments given the wrong
// way round) gets a note; the right order, or a run without a date
// (SOURCE_DATE_EPOCH unset in analysis.Run), none.
func TestDiffOrderNote(t *testing.T) {
	rng := rand.New(rand.NewPCG(31, 32))
	x, y := process(rng, 30, 2, 0.5, 1)
	a, b := rep("a", study("s", x, y, nil)), rep("b", study("s", x, y, nil))
	a.Generated, b.Generated = "2026-10-31T22:00:00Z", "2026-11-30T22:00:00Z"
	note := "the old run is the later one (written 2026-11-30T22:00:00Z, the new run 2026-10-31T22:00:00Z)"
	has := func(res *Result) bool {
		for _, n := range res.Notes {
			if strings.HasPrefix(n, note) {
				return true
			}
		}
		return false
	}
	if !has(Diff(b, a, Options{})) {
		t.Errorf("November given as OLD: notes %q lack %q", Diff(b, a, Options{}).Notes, note)
	}
	if has(Diff(a, b, Options{})) {
		t.Error("October as OLD, November as NEW: an order note")
	}
	a.Generated = ""
	if res := Diff(b, a, Options{}); len(res.Notes) != 0 {
		t.Errorf("a run without a date: notes %q", res.Notes)
	}
}

// TestDiffSameRunTwice: the same manifest, data and tool twice; only the
// times differ. The diff says nothing changed, in so many words (it
// listed zero counts and "only the settings or the tool can explain a
// change"). A gate edited in the manifest with its outcome alike is named
// (it was not mentioned), with a note that the manifest was edited.
func TestDiffSameRunTwice(t *testing.T) {
	rng := rand.New(rand.NewPCG(33, 34))
	x, y := process(rng, 30, 2, 0.5, 1)
	mk := func(generated, want string) *report.Report {
		s := study("s", x, y, verdicts("linear", "positive", "strong", false))
		s.Expectations = []report.Expectation{{Name: "min_abs_r", Title: "correlation at least as strong as required", Want: want, Got: "|r| = 0.98", OK: true}}
		r := rep("same", s)
		r.Generated = generated
		r.Manifest.File, r.Manifest.SHA256 = "m.toml", "m1"
		return r
	}
	a, b := mk("2026-11-30T22:00:00Z", "|r| ≥ 0.9"), mk("2026-11-30T22:05:00Z", "|r| ≥ 0.9")
	res := Diff(a, b, Options{})
	if !res.Identical() || !strings.HasPrefix(res.Statements[0], "Nothing changed: ") || len(res.Notes) != 0 {
		t.Errorf("same run twice: identical %v, statements %q, notes %q", res.Identical(), res.Statements, res.Notes)
	}
	b = mk("2026-11-30T22:05:00Z", "|r| ≥ 0.95")
	b.Manifest.SHA256 = "m2"
	res = Diff(a, b, Options{})
	want := `The gate "correlation at least as strong as required" was edited between the runs (it asked for |r| ≥ 0.9, now |r| ≥ 0.95); it is met in both.`
	if res.Identical() || res.Studies[0].Statement != want {
		t.Errorf("gate edited, outcome alike: identical %v, statement %q, want %q", res.Identical(), res.Studies[0].Statement, want)
	}
	if !slices.Contains(res.Notes, "the manifest m.toml was edited between the runs (SHA-256 m1 → m2): a setting, a study or a gate may differ") {
		t.Errorf("notes %q lack the edited manifest", res.Notes)
	}
}

// TestDiffThresholdsNamed: the strong cut point raised from 0.7 to 0.999
// and the outlier z from 3 to 3.5 between the runs; the note names both
// with their values (it said only that "the verdict thresholds differ").
func TestDiffThresholdsNamed(t *testing.T) {
	rng := rand.New(rand.NewPCG(35, 36))
	x, y := process(rng, 30, 2, 0.5, 1)
	a, b := rep("same", study("s", x, y, nil)), rep("same", study("s", x, y, nil))
	a.Manifest.Thresholds = report.Thresholds{Strong: 0.7, OutlierZ: 3}
	b.Manifest.Thresholds = report.Thresholds{Strong: 0.999, OutlierZ: 3.5}
	want := "the verdict thresholds differ between the runs (strong 0.7 → 0.999, outlier_z 3 → 3.5), so a changed verdict may come from the thresholds rather than the data"
	if res := Diff(a, b, Options{}); !slices.Contains(res.Notes, want) {
		t.Errorf("notes %q lack %q", res.Notes, want)
	}
}

// TestDiffGateWordingNotEdit: a results.json of schema v2 wrote a slope
// gate's want as "slope in [0.7, 0.9] HRC/°C", today's bivar as "… HRC
// per °C"; the limits are alike, so the gate was not edited (the diff of
// such runs said it was). Numbers that differ are an edit; a number
// written another way ("0.90", "0.9") is not.
func TestDiffGateWordingNotEdit(t *testing.T) {
	lim := &report.Limits{Low: 0.7, High: 0.9}
	cases := []struct {
		old, new report.Expectation
		edited   bool
	}{
		{report.Expectation{Name: "slope_within", Want: "slope in [0.7, 0.9] HRC/°C", Limits: lim}, report.Expectation{Name: "slope_within", Want: "slope in [0.7, 0.9] HRC per °C", Limits: lim}, false},
		{report.Expectation{Name: "slope_within", Want: "slope in [0.7, 0.9]", Limits: lim}, report.Expectation{Name: "slope_within", Want: "slope in [0.7, 1]", Limits: &report.Limits{Low: 0.7, High: 1}}, true},
		{report.Expectation{Name: "min_abs_r", Want: "|r| ≥ 0.90"}, report.Expectation{Name: "min_abs_r", Want: "|r| ≥ 0.9"}, false},
		{report.Expectation{Name: "min_abs_r", Want: "|r| ≥ 0.9"}, report.Expectation{Name: "min_abs_r", Want: "|r| ≥ 0.95"}, true},
		{report.Expectation{Name: "direction", Want: "positive"}, report.Expectation{Name: "direction", Want: "negative"}, true},
		{report.Expectation{Name: "direction", Want: "positive"}, report.Expectation{Name: "direction", Want: "positive"}, false},
	}
	for _, tc := range cases {
		if got := wantEdited(tc.old, tc.new); got != tc.edited {
			t.Errorf("%q → %q: edited %v, want %v", tc.old.Want, tc.new.Want, got, tc.edited)
		}
	}
}

// TestDiffSchemasDiffer: the same manifest and data, the old run written
// by a build of schema v1 (both builds calling themselves "dev"). The
// diff does not say nothing changed (it did: the old file lacks figures
// the new one has) and notes the two schemas.
func TestDiffSchemasDiffer(t *testing.T) {
	rng := rand.New(rand.NewPCG(37, 38))
	x, y := process(rng, 30, 2, 0.5, 1)
	a, b := rep("same", study("s", x, y, nil)), rep("same", study("s", x, y, nil))
	a.Manifest.SHA256, b.Manifest.SHA256 = "m", "m"
	a.Schema = "bivar.results/v1"
	res := Diff(a, b, Options{})
	want := "the runs were written by different builds of bivar, in results.json schemas bivar.results/v1 and " + report.Schema
	if res.Identical() || len(res.Notes) != 1 || !strings.HasPrefix(res.Notes[0], want) {
		t.Errorf("identical %v, notes %q; want not identical and a note beginning %q", res.Identical(), res.Notes, want)
	}
	a.Schema = report.Schema
	if res := Diff(a, b, Options{}); !res.Identical() {
		t.Errorf("same schema, manifest and data: not identical; statements %q", res.Statements)
	}
}

// TestDiffDatasetRenamed: one study, its dataset's id edited from "d" to
// "e" (the same file): a note says which dataset the study reads in each
// run (nothing did).
func TestDiffDatasetRenamed(t *testing.T) {
	rng := rand.New(rand.NewPCG(39, 40))
	x, y := process(rng, 30, 2, 0.5, 1)
	old, cur := rep("h", study("s", x, y, nil)), rep("h", study("s", x, y, nil))
	cur.Datasets[0].ID, cur.Studies[0].Dataset = "e", "e"
	sc := Diff(old, cur, Options{}).Studies[0]
	want := `the study reads dataset "e" in the new run and "d" in the old; its data are compared by those datasets' hashes`
	if !slices.Contains(sc.Notes, want) || sc.DataChanged {
		t.Errorf("notes %q, data changed %v; want %q and no data change (same hash)", sc.Notes, sc.DataChanged, want)
	}
}
