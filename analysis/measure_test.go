package analysis_test

import (
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"bivar/analysis"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/internal/reference"
)

// pefrRun runs studies on Bland & Altman (1986), Table 1 (two peak-flow
// meters, two readings each, l/min), read in place from the shared
// reference folder through a manifest written for the test.
func pefrRun(t *testing.T, studies string) *report.Report {
	t.Helper()
	file := reference.File(t, "bland-altman-1986-pefr.csv")
	src := `[[dataset]]
id = "pefr"
file = ` + strconv.Quote(file) + `
units = { wright_1 = "L/min", wright_2 = "L/min", mini_1 = "L/min", mini_2 = "L/min", mini_3 = "L/min" } # mini_3: no such column (TestReplicateColumnAbsent)
` + studies
	m, err := manifest.Parse("pefr.toml", []byte(src), filepath.Dir(file))
	if err != nil {
		t.Fatalf("manifest: %v", err)
	}
	m.Path = "" // held in memory: nothing to hash
	r, err := analysis.Run(m, analysis.Options{Version: "test"})
	if err != nil {
		t.Fatalf("Run: %v", err)
	}
	return r
}

// agreementStudy is one agreement study of the Wright meter (y) against the
// mini Wright (x), so that d = Wright − mini as in the paper.
func agreementStudy(id, extra string) string {
	return `
[[study]]
id = "` + id + `"
dataset = "pefr"
kind = "agreement"
x = "mini_1"
y = "wright_1"
` + extra
}

func TestAgreementPEFR(t *testing.T) {
	t.Parallel()
	r := pefrRun(t, agreementStudy("first", `agreement = { acceptable = 40 }
expect = { agree = true }`)+
		agreementStudy("wide", "agreement = { acceptable = 100 }")+
		agreementStudy("wider", "agreement = { acceptable = 2.5, unit = \"L/s\" }")+
		agreementStudy("none", ""))
	s := study(t, r, "first")
	a := s.Agreement
	if a == nil {
		t.Fatalf("no agreement figures; error %v", s.Error)
	}
	// Printed in Bland & Altman (1986), Lancet 327:307–310, for the first
	// readings: mean difference −2.1, SD 38.8 l/min, limits (mean ± 2 SD)
	// −79.7 to 75.5 l/min; tolerance half the last printed digit plus
	// the rounding of the printed mean and SD carried into the limits.
	checks := []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"bias", float64(a.Bias), -2.1, 0.05},
		{"sd", float64(a.SD), 38.8, 0.05},
		{"bias − 2 SD", float64(a.Bias - 2*a.SD), -79.7, 0.15},
		{"bias + 2 SD", float64(a.Bias + 2*a.SD), 75.5, 0.15},
		// Identities: limits at bias ∓ 1.96 SD (z_0.975, Bland & Altman 1999).
		{"lower", float64(a.Lower), float64(a.Bias) - 1.959963984540054*float64(a.SD), 1e-9},
		{"upper", float64(a.Upper), float64(a.Bias) + 1.959963984540054*float64(a.SD), 1e-9},
	}
	for _, c := range checks {
		if math.Abs(c.got-c.want) > c.tol {
			t.Errorf("%s = %.4f, want %.4f ±%g", c.name, c.got, c.want, c.tol)
		}
	}
	if a.N != 17 || a.XReadings != 1 || a.Unit != "L/min" || len(a.Repeatability) != 0 {
		t.Errorf("n %d, readings %d, unit %q, repeatability %d; want 17, 1, L/min, 0", a.N, a.XReadings, a.Unit, len(a.Repeatability))
	}
	if a.Deming == nil || a.PassingBablok == nil || a.Concordance == nil || !a.Concordance.CCC.Valid() {
		t.Fatal("Deming, Passing–Bablok or the concordance is missing")
	}
	if a.Deming.DeltaFrom != "assumed 1" {
		t.Errorf("delta from %q, want assumed 1 (no replicates)", a.Deming.DeltaFrom)
	}
	// Limits about −78 and +74 l/min, the lower one's interval −124 to −53:
	// wholly outside ±40; inside ±100 but with
	// intervals (exact, to −124 and +120) beyond it; ±2.5 L/s = ±150 L/min holds them all.
	for _, c := range []struct {
		id   string
		want report.AgreementVerdict
	}{
		{"first", report.NotWithin}, {"wide", report.Undecided}, {"wider", report.AgreeWithin}, {"none", ""},
	} {
		got := study(t, r, c.id).Agreement
		if got.Verdict != c.want {
			t.Errorf("%s: verdict %q, want %q (limits %v to %v, intervals to %v and %v, acceptable %v)", c.id, got.Verdict, c.want,
				got.Lower, got.Upper, got.LowerLow, got.UpperHigh, got.Acceptable)
		}
	}
	if acc := study(t, r, "wider").Agreement.Acceptable; math.Abs(float64(acc)-150) > 1e-9 {
		t.Errorf("±2.5 L/s in L/min = %v, want 150", acc)
	}
	var agree *report.Expectation
	for i := range s.Expectations {
		if s.Expectations[i].Name == "agree" {
			agree = &s.Expectations[i]
		}
	}
	if agree == nil || agree.OK || !strings.HasPrefix(agree.Got, "they do not agree: limits ") || agree.Title != "the two methods agree within ±40 L/min" {
		t.Errorf("expect.agree: %+v; want a failed gate named in words, with got %q", agree, "they do not agree")
	}
	if s.Plan == nil || len(s.Plan.Statements) == 0 || len(a.Statements) == 0 {
		t.Error("no plan or no agreement statements")
	}
}

func TestAgreementPEFRReplicates(t *testing.T) {
	t.Parallel()
	r := pefrRun(t, agreementStudy("both", `x_replicates = ["mini_2"]
y_replicates = ["wright_2"]`))
	a := study(t, r, "both").Agreement
	if a == nil || a.XReadings != 2 || a.YReadings != 2 || len(a.Repeatability) != 2 {
		t.Fatalf("agreement %+v: want two readings and two repeatabilities", a)
	}
	// Wiring: the same figures as the statistics on the file's columns
	// (those are checked against scipy in analysis/stats).
	col := pefrColumns(t)
	mini := [][]float64{col["mini_1"], col["mini_2"]}
	wright := [][]float64{col["wright_1"], col["wright_2"]}
	want := stats.BlandAltmanReplicates(wright, mini, 1.959963984540054, 0.95)
	if math.Abs(float64(a.Bias)-want.Bias) > 1e-9 || math.Abs(float64(a.SD)-want.SD) > 1e-9 || math.Abs(float64(a.UpperHigh)-want.UpperHi) > 1e-9 {
		t.Errorf("bias %v sd %v upper-high %v; want %v %v %v", a.Bias, a.SD, a.UpperHigh, want.Bias, want.SD, want.UpperHi)
	}
	if rp := stats.Repeatability(mini, 0.95); math.Abs(float64(a.Repeatability[0].SW)-rp.SW) > 1e-9 || a.Repeatability[0].Method != "x" {
		t.Errorf("repeatability of x %v, want %v", a.Repeatability[0].SW, rp.SW)
	}
	if d := stats.DemingDeltaFromReplicates(mini, wright); a.Deming.DeltaFrom != "replicates" || math.Abs(float64(a.Deming.Delta)-d) > 1e-12 {
		t.Errorf("Deming delta %v from %q, want %v from replicates", a.Deming.Delta, a.Deming.DeltaFrom, d)
	}
	if a.Plot == nil || len(a.Plot.Points) != 17 || len(a.Plot.Pairs) != 17 {
		t.Errorf("plot data: %+v", a.Plot)
	}
}

// pefrColumns reads the PEFR table's columns by name.
func pefrColumns(t *testing.T) map[string][]float64 {
	t.Helper()
	return reference.NumericColumns(t, "bland-altman-1986-pefr.csv")
}

func TestErrorCorrectionPEFR(t *testing.T) {
	t.Parallel()
	r := pefrRun(t, `
[[study]]
id = "reps"
dataset = "pefr"
x = "mini_1"
y = "wright_1"
x_replicates = ["mini_2"]
y_replicates = ["wright_2"]

[[study]]
id = "declared"
dataset = "pefr"
x = "mini_1"
y = "wright_1"
gauge_sd = { x = 20 }
plan = { smallest_r = 0.3, r_half_width = 0.05 }
`)
	col := pefrColumns(t)
	mini := [][]float64{col["mini_1"], col["mini_2"]}
	wright := [][]float64{col["wright_1"], col["wright_2"]}
	// Wiring: the figures of stats.CorrectForError (checked against scipy
	// and by simulation in analysis/stats) with the SDs from the replicates.
	e := study(t, r, "reps").ErrorCorrection
	want := stats.CorrectForError(col["mini_1"], col["wright_1"], stats.Repeatability(mini, 0).SW, stats.Repeatability(wright, 0).SW, 0.95)
	if e == nil || e.FromX != "replicates" || e.FromY != "replicates" ||
		math.Abs(float64(e.RCorrected)-want.RCorrected) > 1e-12 || math.Abs(float64(e.SlopeCorrectedHigh)-want.SlopeCorrectedHi) > 1e-9 {
		t.Fatalf("error correction %+v; want r %v, slope high %v", e, want.RCorrected, want.SlopeCorrectedHi)
	}
	if len(e.Statements) < 2 || len(e.Assumptions) != 2 {
		t.Errorf("statements %q, assumptions %q", e.Statements, e.Assumptions)
	}
	d := study(t, r, "declared")
	if d.ErrorCorrection.FromX != "declared" || d.ErrorCorrection.FromY != "none" || float64(d.ErrorCorrection.SDErrorX) != 20 || d.ErrorCorrection.ReliabilityY != 1 {
		t.Errorf("declared: %+v", d.ErrorCorrection)
	}
	// The planning statement with declared targets. For |r| = 0.3 at
	// two-sided alpha 0.05 and power 0.8 the Fisher-z calculator at
	// clinicaltrials-tools.vercel.app/calculators/correlation prints
	// "Required Sample Size 85".
	p := d.Plan
	if p.NForPower != 85 || p.DetectRFrom != "declared" || p.RHalfWidthFrom != "declared" || p.SlopeHalfWidthFrom != "default" {
		t.Errorf("plan: %+v", p)
	}
	if n := stats.NForCorrelationHalfWidth(float64(d.Pearson.R), 0.05, 0.95); p.NForR != n || n <= 0 {
		t.Errorf("n for r's half-width: %d, want %d", p.NForR, n)
	}
	// The slope's present half-width is that of the reported interval.
	if hw := float64(d.Line.Slope.CIHigh-d.Line.Slope.CILow) / 2; math.Abs(float64(p.SlopeHalfWidthNow)-hw) > 1e-9*hw {
		t.Errorf("slope half-width now %v, the interval's %v", p.SlopeHalfWidthNow, hw)
	}
	if study(t, r, "reps").Plan.SlopeHalfWidth*2 != study(t, r, "reps").Plan.SlopeHalfWidthNow {
		t.Error("default slope target is not half the present half-width")
	}
	// The power of this run is stated for the declared r only (at the
	// observed r it is a transform of p).
	if !p.PowerNow.Valid() || !strings.Contains(strings.Join(p.Statements, " "), "this run's 17 rows give power") {
		t.Errorf("declared r: power now %v, statements %q", p.PowerNow, p.Statements)
	}
	if q := study(t, r, "reps").Plan; q.PowerNow.Valid() || strings.Contains(strings.Join(q.Statements, " "), "this run's") {
		t.Errorf("observed r: power now %v, statements %q; want no observed power", q.PowerNow, q.Statements)
	}
}

// A declared δ is per single reading; with m_x = 2 readings of x and
// m_y = 1 of y the means' error variances are σ_x²/2 and σ_y², so the
// Deming line of the means takes δ·2 (the ratio scipy.odr's weights would
// be given; the Deming fit itself is checked against scipy.odr in
// analysis/stats).
func TestAgreementDeltaScaledToMeans(t *testing.T) {
	t.Parallel()
	r := pefrRun(t, agreementStudy("d", "x_replicates = [\"mini_2\"]\nagreement = { delta = 1.5 }")+
		agreementStudy("a", "x_replicates = [\"mini_2\"]"))
	col := pefrColumns(t)
	xm := stats.RowMeans([][]float64{col["mini_1"], col["mini_2"]}, 17)
	for _, c := range []struct {
		id    string
		delta float64
	}{{"d", 3}, {"a", 2}} {
		a := study(t, r, c.id).Agreement
		want := stats.Deming(xm, col["wright_1"], c.delta, 0.95)
		if float64(a.Deming.Delta) != c.delta || math.Abs(float64(a.Deming.Slope)-want.Slope) > 1e-12 {
			t.Errorf("%s: δ %v slope %v; want δ %v slope %v", c.id, a.Deming.Delta, a.Deming.Slope, c.delta, want.Slope)
		}
		if !strings.Contains(strings.Join(a.Assumptions, " "), "per single reading, times 2/1") {
			t.Errorf("%s: assumptions %q", c.id, a.Assumptions)
		}
	}
}

func TestAgreementPlan(t *testing.T) {
	t.Parallel()
	r := pefrRun(t, agreementStudy("dflt", "")+agreementStudy("decl", "plan = { limits_half_width = 15 }"))
	d := study(t, r, "dflt")
	p, a := d.Plan, d.Agreement
	// The present half-width is that of the reported exact intervals.
	if hw := float64(a.UpperHigh-a.UpperLow) / 2; math.Abs(float64(p.LimitsHalfWidthNow)-hw) > 1e-9*hw || p.LimitsHalfWidth*2 != p.LimitsHalfWidthNow {
		t.Errorf("limits half-width now %v target %v; the interval's %v", p.LimitsHalfWidthNow, p.LimitsHalfWidth, hw)
	}
	if p.NForR != 0 || p.NForPower != 0 || p.PowerNow.Valid() || p.RHalfWidthNow.Valid() {
		t.Errorf("agreement plan carries r or power figures: %+v", p)
	}
	all := strings.Join(p.Statements, " ")
	if !strings.Contains(all, "intervals of the limits of agreement") || !strings.Contains(all, "ρ = 0") || strings.Contains(all, "power 0.8") {
		t.Errorf("statements %q", p.Statements)
	}
	// Declared ±15 l/min at the SD of the first readings (38.76): scipy
	// 1.10.1 stats.nct.ppf search gives n = 79 at SD 38.76, k 1.96 (see
	// stats.TestLimitsHalfWidthScipy); here the wiring to that function.
	q := study(t, r, "decl").Plan
	if want := stats.NForLimitsHalfWidth(float64(a.SD), float64(a.K), 15, 0.95); q.NForLimits != want || q.LimitsHalfWidthFrom != "declared" || want < 70 || want > 90 {
		t.Errorf("declared: n %d from %q, want %d", q.NForLimits, q.LimitsHalfWidthFrom, want)
	}
}

func TestReplicateColumnAbsent(t *testing.T) {
	t.Parallel()
	r := pefrRun(t, agreementStudy("absent", `x_replicates = ["mini_3"]`))
	s := study(t, r, "absent")
	if s.Error == nil || !strings.Contains(*s.Error, `replicate column "mini_3" is not in dataset "pefr"`) || !strings.Contains(*s.Error, `did you mean`) {
		t.Errorf("error %v; want the replicate column named, with a suggestion", s.Error)
	}
	if s.Agreement != nil {
		t.Error("a study that did not run has agreement figures")
	}
}
