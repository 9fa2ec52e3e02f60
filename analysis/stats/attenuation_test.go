package stats

// Tests of attenuation.go: scipy 1.10.1 on the PEFR data of Bland & Altman
// (1986) for the raw figures and the closed forms (the calls are in
// testdata/agreement_reference.py), a seeded simulation with known true
// values, and edges.

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
)

func TestCorrectForErrorScipy(t *testing.T) {
	t.Parallel()
	d := agrPEFR(t)
	w := agrRef(t)["error_correction"]
	e := CorrectForError(d["wright_1"], d["mini_1"], w["err_x"], w["err_y"], 0.95)
	for _, f := range []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"r", e.R, w["r"], 1e-14},         // scipy.stats.pearsonr
		{"r_lo", e.RLo, w["r_lo"], 1e-12}, // Fisher z, scipy.stats.norm.ppf
		{"r_hi", e.RHi, w["r_hi"], 1e-12},
		{"rel_x", e.ReliabilityX, w["rel_x"], 1e-13},
		{"rel_y", e.ReliabilityY, w["rel_y"], 1e-13},
		{"r_corrected", e.RCorrected, w["r_corrected"], 1e-13},
		{"r_corrected_lo", e.RCorrectedLo, w["r_corrected_lo"], 1e-12},
		{"r_corrected_hi", e.RCorrectedHi, w["r_corrected_hi"], 1e-12}, // clipped at 1
		{"slope", e.Slope, w["slope"], 1e-13},                          // scipy.stats.linregress
		{"slope_lo", e.SlopeLo, w["slope_lo"], 1e-10},                  // with scipy.stats.t.ppf
		{"slope_hi", e.SlopeHi, w["slope_hi"], 1e-10},
		{"slope_corrected", e.SlopeCorrected, w["slope_corrected"], 1e-13},
	} {
		agrCheck(t, "CorrectForError "+f.name, f.got, f.want, f.tol)
	}
	// Fuller (1987) Theorem 1.2.1 in numpy, with scipy.stats.t.ppf
	agrCheck(t, "SlopeCorrectedSE", e.SlopeCorrectedSE, w["slope_corrected_se"], 1e-12)
	agrCheck(t, "SlopeCorrectedLo", e.SlopeCorrectedLo, w["slope_corrected_lo"], 1e-10)
	agrCheck(t, "SlopeCorrectedHi", e.SlopeCorrectedHi, w["slope_corrected_hi"], 1e-10)
	// No declared error: nothing changes.
	z := CorrectForError(d["wright_1"], d["mini_1"], 0, 0, 0.95)
	if z.RCorrected != z.R || z.SlopeCorrected != z.Slope || z.SlopeCorrectedHi != z.SlopeHi {
		t.Errorf("zero error SDs changed the figures: %+v", z)
	}
}

// The simulation: true x ~ N(0, 1), true y = 0.6·x + N(0, 0.8²) (ρ = 0.6,
// slope 0.6); observed with independent normal errors of SD 0.7 (x) and
// 0.5 (y), declared to CorrectForError. Over 1000 seeded runs of n = 200
// the raw r and slope are attenuated (expected r ≈ 0.6·√(0.671·0.8) =
// 0.440, slope 0.6·0.671 = 0.403), the corrected ones are not: each mean
// lies within 4 Monte Carlo standard errors of the true value, and the
// corrected slope's 95 % interval covers 0.6 in 95 % ± 4 MC SE of the runs.
func TestCorrectForErrorSimulation(t *testing.T) {
	t.Parallel()
	const (
		runs, n      = 1000, 200
		rho, slope   = 0.6, 0.6
		errX, errY   = 0.7, 0.5
		resid        = 0.8 // √(1 − 0.6²)
		mcSigmas     = 4.0
		nominalCover = 0.95
	)
	rng := rand.New(rand.NewPCG(14, 2026))
	x, y := make([]float64, n), make([]float64, n)
	var rRaw, rCor, bRaw, bCor, rCor2, bCor2 float64
	covered, coveredR := 0, 0
	for range runs {
		for i := range x {
			tx := rng.NormFloat64()
			ty := slope*tx + resid*rng.NormFloat64()
			x[i], y[i] = tx+errX*rng.NormFloat64(), ty+errY*rng.NormFloat64()
		}
		e := CorrectForError(x, y, errX, errY, nominalCover)
		rRaw += e.R
		rCor += e.RCorrected
		rCor2 += e.RCorrected * e.RCorrected
		bRaw += e.Slope
		bCor += e.SlopeCorrected
		bCor2 += e.SlopeCorrected * e.SlopeCorrected
		if e.SlopeCorrectedLo <= slope && slope <= e.SlopeCorrectedHi {
			covered++
		}
		if e.RCorrectedLo <= rho && rho <= e.RCorrectedHi {
			coveredR++
		}
	}
	m := func(s float64) float64 { return s / runs }
	se := func(s, s2 float64) float64 { return math.Sqrt((s2/runs - m(s)*m(s)) / runs) }
	seR, seB := se(rCor, rCor2), se(bCor, bCor2)
	if d := math.Abs(m(rCor) - rho); d > mcSigmas*seR {
		t.Errorf("corrected r: mean %.4f, true %.2f (|Δ| %.4f > %.0f MC SE %.4f)", m(rCor), rho, d, mcSigmas, seR)
	}
	if d := math.Abs(m(bCor) - slope); d > mcSigmas*seB {
		t.Errorf("corrected slope: mean %.4f, true %.2f (|Δ| %.4f > %.0f MC SE %.4f)", m(bCor), slope, d, mcSigmas, seB)
	}
	// The raw figures miss by far more than their Monte Carlo error.
	if d := rho - m(rRaw); d < 20*seR {
		t.Errorf("raw r: mean %.4f, true %.2f: not attenuated?", m(rRaw), rho)
	}
	if d := slope - m(bRaw); d < 20*seB {
		t.Errorf("raw slope: mean %.4f, true %.2f: not diluted?", m(bRaw), slope)
	}
	seCover := math.Sqrt(nominalCover * (1 - nominalCover) / runs)
	for name, c := range map[string]int{"slope": covered, "r": coveredR} {
		if p := float64(c) / runs; math.Abs(p-nominalCover) > mcSigmas*seCover {
			t.Errorf("corrected %s interval covers the true value in %.3f of runs, want %.2f ± %.3f",
				name, p, nominalCover, mcSigmas*seCover)
		}
	}
}

// Coverage of the corrected slope's interval (Fuller's variance) at
// reliabilities of x from 0.5 to 0.9: true x ~ N(0, 1), y = 0.6·x +
// N(0, 0.8²), errors of SD √(1/rel − 1) on x and 0.5 on y, n = 50, 2000
// seeded runs each. The interval must cover 0.6 in 95 % ± 4 MC SE of the
// runs (the raw interval divided by rel_x covered 0.91 at rel 0.5).
func TestCorrectedSlopeCoverage(t *testing.T) {
	t.Parallel()
	const runs, n, slope, nominal = 2000, 50, 0.6, 0.95
	tol := 4 * math.Sqrt(nominal*(1-nominal)/runs)
	for _, rel := range []float64{0.5, 0.7, 0.9} {
		rng := rand.New(rand.NewPCG(7, uint64(rel*10)))
		errX := math.Sqrt(1/rel - 1)
		x, y := make([]float64, n), make([]float64, n)
		covered := 0
		for range runs {
			for i := range x {
				tx := rng.NormFloat64()
				x[i] = tx + errX*rng.NormFloat64()
				y[i] = slope*tx + 0.8*rng.NormFloat64() + 0.5*rng.NormFloat64()
			}
			e := CorrectForError(x, y, errX, 0.5, nominal)
			if e.SlopeCorrectedLo <= slope && slope <= e.SlopeCorrectedHi {
				covered++
			}
		}
		if p := float64(covered) / runs; math.Abs(p-nominal) > tol {
			t.Errorf("reliability %.1f: the corrected slope's interval covers in %.3f of runs, want %.2f ± %.3f", rel, p, nominal, tol)
		}
	}
}

// A corrected r beyond 1 is reported as 1, inside its interval that ends
// at 1, with the unclipped value kept.
func TestCorrectedRClipped(t *testing.T) {
	t.Parallel()
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	y := []float64{1.1, 2.0, 2.9, 4.2, 4.9, 6.1, 7.0, 7.9}
	e := CorrectForError(x, y, 1, 1, 0.95) // error SDs far above what r ≈ 0.998 allows
	if !e.RClipped || e.RCorrected != 1 || !(e.RUnclipped > 1) || e.RCorrectedHi != 1 || !(e.RCorrectedLo <= e.RCorrected) {
		t.Errorf("clipped r: %v (unclipped %v, clipped %v), interval %v to %v", e.RCorrected, e.RUnclipped, e.RClipped, e.RCorrectedLo, e.RCorrectedHi)
	}
}

func TestCorrectForErrorEdges(t *testing.T) {
	t.Parallel()
	if !corePanics(func() { CorrectForError([]float64{1}, nil, 0, 0, 0.95) }) {
		t.Error("no panic on length mismatch")
	}
	for _, tc := range []struct{ obs, err, want float64 }{
		{2, 1, 0.75}, {2, 0, 1}, {2, 2, math.NaN()}, {2, 3, math.NaN()}, {0, 1, math.NaN()},
		{2, -1, math.NaN()}, {math.NaN(), 1, math.NaN()}, {math.Inf(1), 1, math.NaN()},
	} {
		if got := Reliability(tc.obs, tc.err); !coreClose(got, tc.want, 1e-15) {
			t.Errorf("Reliability(%v, %v) = %v, want %v", tc.obs, tc.err, got, tc.want)
		}
	}
	x, y := []float64{1, 2, 3, 4, 5}, []float64{2, 1, 4, 3, 6}
	// Error SD larger than the observed SD of x: corrected figures undefined.
	if e := CorrectForError(x, y, 5, 0, 0.95); !math.IsNaN(e.RCorrected) || !math.IsNaN(e.SlopeCorrected) || math.IsNaN(e.R) {
		t.Errorf("error SD above observed SD: %+v", e)
	}
	if e := CorrectForError(x, []float64{1, 1, 1, 1, 1}, 0, 0, 0.95); !math.IsNaN(e.R) {
		t.Errorf("constant y: r = %v", e.R)
	}
	if e := CorrectForError(x[:2], y[:2], 0, 0, 0.95); !math.IsNaN(e.R) {
		t.Errorf("n = 2: r = %v", e.R)
	}
}

func BenchmarkCorrectForError(b *testing.B) {
	for _, n := range []int{1_000, 100_000} {
		x, y := agrGauges(n, 3)
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				CorrectForError(x, y, 1, 1.5, 0.95)
			}
		})
	}
}
