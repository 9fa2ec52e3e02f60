package analysis

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"bivar/analysis/findings"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
)

// gaugePair is invented data: two gauges reading n items, with replicates.
func gaugePair(n int, seed uint64) (xcols, ycols [][]float64) {
	rng := rand.New(rand.NewPCG(seed, 1))
	xcols, ycols = make([][]float64, 2), make([][]float64, 2)
	for range n {
		v := 50 + 5*rng.NormFloat64()
		for j := range 2 {
			xcols[j] = append(xcols[j], v+0.3*rng.NormFloat64())
			ycols[j] = append(ycols[j], 0.4+v+0.4*rng.NormFloat64())
		}
	}
	return xcols, ycols
}

// TestAgreementOrderFree: the figures and the plot data depend on the set
// of items, not on their order in the file.
func TestAgreementOrderFree(t *testing.T) {
	t.Parallel()
	xcols, ycols := gaugePair(300, 3)
	st := manifest.Study{X: "a1", Y: "b1", XReplicates: []string{"a2"}, YReplicates: []string{"b2"}}
	a := agreement(xcols, ycols, 300, st, "", 0.95)
	perm := rand.New(rand.NewPCG(9, 9)).Perm(300)
	shuffle := func(cols [][]float64) [][]float64 {
		out := make([][]float64, len(cols))
		for j, c := range cols {
			for _, i := range perm {
				out[j] = append(out[j], c[i])
			}
		}
		return out
	}
	b := agreement(shuffle(xcols), shuffle(ycols), 300, st, "", 0.95)
	// Sums in another order differ in the last bits; every figure must
	// agree to 1e-12 relative, and every verdict and the plot exactly.
	Measurement := func(a *report.Agreement) { findingsMeasurement(a) }
	Measurement(a)
	Measurement(b)
	var ma, mb any
	ja, _ := json.Marshal(a)
	jb, _ := json.Marshal(b)
	_ = json.Unmarshal(ja, &ma)
	_ = json.Unmarshal(jb, &mb)
	if !closeJSON(ma, mb) || !reflect.DeepEqual(a.Plot.Pairs, b.Plot.Pairs) || len(a.Plot.Points) != len(b.Plot.Points) {
		t.Errorf("agreement changes with the order of the rows:\n%s\n%s", ja, jb)
	}
}

// findingsMeasurement gives a the verdicts of an invented study around it.
func findingsMeasurement(a *report.Agreement) {
	a.Acceptable = 1.4
	s := &report.Study{Agreement: a}
	findings.Measurement(s, 0.05)
}

// closeJSON compares decoded JSON values, numbers to 1e-12 relative.
func closeJSON(a, b any) bool {
	switch a := a.(type) {
	case float64:
		bf, ok := b.(float64)
		return ok && math.Abs(a-bf) <= 1e-12*math.Max(1, math.Abs(a))
	case map[string]any:
		bm, ok := b.(map[string]any)
		if !ok || len(a) != len(bm) {
			return false
		}
		for k, v := range a {
			if !closeJSON(v, bm[k]) {
				return false
			}
		}
		return true
	case []any:
		bl, ok := b.([]any)
		if !ok || len(a) != len(bl) {
			return false
		}
		for i := range a {
			if !closeJSON(a[i], bl[i]) {
				return false
			}
		}
		return true
	}
	return reflect.DeepEqual(a, b)
}

// TestAgreementPlotBounded: above report.PlotPointsMax items the plot data
// are density grids, whatever n is.
func TestAgreementPlotBounded(t *testing.T) {
	if testing.Short() {
		t.Skip("10⁵ items: Passing–Bablok on a sample of pairs takes a while")
	}
	t.Parallel()
	const n = 100_000
	xcols, ycols := gaugePair(n, 4)
	a := agreement(xcols, ycols, n, manifest.Study{X: "a", Y: "b"}, "", 0.95)
	p := a.Plot
	if p.Points != nil || p.Pairs != nil || p.Grid == nil || p.PairGrid == nil || p.N != n {
		t.Fatalf("plot at n = %d: %d points, %d pairs, grids %v %v", n, len(p.Points), len(p.Pairs), p.Grid != nil, p.PairGrid != nil)
	}
	if len(p.Grid.Counts) != gridNX*gridNY {
		t.Errorf("grid of %d cells, want %d", len(p.Grid.Counts), gridNX*gridNY)
	}
	if !a.PassingBablok.Sampled {
		t.Error("Passing–Bablok not marked as sampled at 10⁵ items")
	}
	_ = report.PlotPointsMax
}

// TestErrorCorrectionSimulation: a seeded simulation with known true
// values, the gauges' SDs estimated from duplicate readings. True x ~
// N(0, 1), true y = 0.6·x + N(0, 0.8²) (true r 0.6, slope 0.6); each of
// two readings of x adds N(0, 0.7²), of y N(0, 0.5²). Over 400 runs of
// n = 200 the raw r and slope are attenuated (expected r ≈ 0.6·√(0.671·0.8)
// = 0.440, slope 0.6·0.671 = 0.403); the corrected means lie within 4
// Monte Carlo standard errors of the true values, the raw ones far outside.
func TestErrorCorrectionSimulation(t *testing.T) {
	if testing.Short() {
		t.Skip("400 simulated runs")
	}
	t.Parallel()
	const runs, n = 400, 200
	rng := rand.New(rand.NewPCG(2026, 14))
	var raw, cor, rawB, corB []float64
	for range runs {
		xc, yc := make([][]float64, 2), make([][]float64, 2)
		for range n {
			tx := rng.NormFloat64()
			ty := 0.6*tx + 0.8*rng.NormFloat64()
			for j := range 2 {
				xc[j] = append(xc[j], tx+0.7*rng.NormFloat64())
				yc[j] = append(yc[j], ty+0.5*rng.NormFloat64())
			}
		}
		e := errorCorrection(xc, yc, n, nil, 0.95)
		raw, cor = append(raw, float64(e.R)), append(cor, float64(e.RCorrected))
		rawB, corB = append(rawB, float64(e.Slope)), append(corB, float64(e.SlopeCorrected))
	}
	meanSE := func(v []float64) (m, se float64) {
		for _, a := range v {
			m += a
		}
		m /= float64(len(v))
		for _, a := range v {
			se += (a - m) * (a - m)
		}
		return m, math.Sqrt(se / float64(len(v)-1) / float64(len(v)))
	}
	for _, c := range []struct {
		name      string
		raw, corr []float64
		truth     float64
	}{{"r", raw, cor, 0.6}, {"slope", rawB, corB, 0.6}} {
		mr, ser := meanSE(c.raw)
		mc, sec := meanSE(c.corr)
		if math.Abs(mc-c.truth) > 4*sec {
			t.Errorf("%s corrected: mean %.4f, true %.1f, MC SE %.4f", c.name, mc, c.truth, sec)
		}
		if math.Abs(mr-c.truth) < 20*ser {
			t.Errorf("%s raw: mean %.4f is not clearly attenuated (MC SE %.4f)", c.name, mr, ser)
		}
	}
}

// TestAgreementFewItems: with 0 to 3 complete items nothing panics and the
// figures that need more items are undefined; the findings still write
// their sentences.
func TestAgreementFewItems(t *testing.T) {
	t.Parallel()
	acc := 1.0
	st := manifest.Study{X: "a", Y: "b", XReplicates: []string{"a2"}, Agreement: &manifest.Agreement{Acceptable: &acc}}
	for n := range 4 {
		xc, yc := gaugePair(n, 5)
		a := agreement(xc, yc[:1], n, st, "", 0.95)
		s := &report.Study{Agreement: a, X: report.Variable{Column: "a"}, Y: report.Variable{Column: "b"}}
		findings.Measurement(s, 0.05)
		if n < 2 && (a.Bias.Valid() || a.Verdict != "") {
			t.Errorf("n = %d: bias %v, verdict %q; want undefined and none", n, a.Bias, a.Verdict)
		}
		if len(a.Statements) == 0 {
			t.Errorf("n = %d: no statements", n)
		}
		for _, st := range a.Statements {
			if strings.Contains(st, "NaN") {
				t.Errorf("n = %d: %q", n, st)
			}
		}
	}
}

// BenchmarkAgreement: an agreement study with duplicate readings (invented
// data), the figures and plot data of agreement().
func BenchmarkAgreement(b *testing.B) {
	for _, n := range []int{1000, 100_000} {
		xc, yc := gaugePair(n, 6)
		st := manifest.Study{X: "a", Y: "b", XReplicates: []string{"a2"}, YReplicates: []string{"b2"}}
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				agreement(xc, yc, n, st, "", 0.95)
			}
		})
	}
}
