package findings

// The false-alarm rate of the drift verdict, by simulation: clean straight
// lines (independent normal errors, x drawn at random, rows in run order)
// must be called drifting at most about alpha of the time.

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// cleanLineInRunOrder fills s with the numbers of one simulated study
// y = 1 + 0.5x + e, e ~ N(0, 1) independent, x uniform on [0, 10], the
// rows taken in run order 1..n: what Assess reads for the drift verdict.
func cleanLineInRunOrder(rng *rand.Rand, n int) *report.Study {
	x, y, order := make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = 10 * rng.Float64()
		y[i] = 1 + 0.5*x[i] + rng.NormFloat64()
		order[i] = float64(i + 1)
	}
	l, err := stats.Line(x, y, 0.95)
	if err != nil {
		panic(err)
	}
	c := stats.Pearson(x, y, 0.95)
	s := study(c.R, c.P)
	s.N = n
	s.Order = "run"
	s.Diagnostics.DurbinWatson = report.Float(stats.DurbinWatson(l.Residuals))
	// The study's other secondary checks, from the same data, so the drift
	// check shares alpha with them as in a real study.
	q, err := stats.Polynomial(x, y, 2, 0.95)
	if err != nil {
		panic(err)
	}
	s.Diagnostics.QuadraticP = report.Float(q.Coef[2].P)
	s.Models[0].Coefficients[2].P, s.Models[0].Coefficients[2].Estimate = report.Float(q.Coef[2].P), report.Float(q.Coef[2].Estimate)
	s.Models[0].R2, s.Models[0].FP = report.Float(q.R2), report.Float(q.FP)
	s.Line.R2, s.Pearson.R2 = report.Float(l.R2), report.Float(l.R2)
	_, _, bp := stats.BreuschPagan(l.Residuals, x)
	s.Diagnostics.BreuschPagan.P = report.Float(bp)
	slope, p, r := stats.OrderTrend(order, l.Residuals)
	s.Diagnostics.OrderTrend = &report.OrderTrend{Slope: report.Float(slope), P: report.Float(p), R: report.Float(r)}
	return s
}

// TestDriftFalseAlarmRate runs 4000 clean studies at each of n = 10, 20,
// 30 and 100 (seeded PCG, so the counts are fixed) and requires the share
// called drifting, and the share with any secondary flag (drift, changing
// spread, a curve: the checks that share alpha by Holm within the study),
// to stay within the one-sided binomial bound of alpha:
// count ≤ Rα + 3.09·√(Rα(1−α)) (normal approximation, 0.1% upper tail).
// The rule of thumb "Durbin–Watson outside 1.5 to 2.5" alone fails this
// badly at small n (about 40% at n = 10).
func TestDriftFalseAlarmRate(t *testing.T) {
	const runs = 4000
	alpha := ctx.Alpha
	limit := runs*alpha + 3.09*math.Sqrt(runs*alpha*(1-alpha))
	for _, n := range []int{10, 20, 30, 100} {
		rng := rand.New(rand.NewPCG(20261201, uint64(n)))
		alarms, any := 0, 0
		for range runs {
			f := Assess(cleanLineInRunOrder(rng, n), ctx)
			if f.Drift {
				alarms++
			}
			if f.Drift || f.SpreadChanges || f.Form == "curved" {
				any++
			}
		}
		t.Logf("n = %3d: drift called in %4d of %d clean studies (%.1f%%; bound %.0f); drift, changing spread or a curve in %d (%.1f%%)",
			n, alarms, runs, 100*float64(alarms)/runs, limit, any, 100*float64(any)/runs)
		if float64(any) > limit {
			t.Errorf("n = %d: drift, changing spread or a curve called in %d of %d clean studies (%.1f%%), above the binomial bound %.0f for alpha %v",
				n, any, runs, 100*float64(any)/runs, limit, alpha)
		}
		if float64(alarms) > limit {
			t.Errorf("n = %d: drift called in %d of %d clean studies (%.1f%%), above the binomial bound %.0f for alpha %v",
				n, alarms, runs, 100*float64(alarms)/runs, limit, alpha)
		}
	}
}

// TestDriftIgnoresAlternation: residuals that alternate from run to run
// (Durbin–Watson well above 2) are not drift; the old rule read DW above
// 4 − DriftDW = 2.5 as drift.
func TestDriftIgnoresAlternation(t *testing.T) {
	s := study(0.8, 1e-6)
	s.Order = "shot"
	s.Diagnostics.DurbinWatson = 3.2
	s.Diagnostics.OrderTrend = &report.OrderTrend{Slope: 0, P: 0.6, R: 0.05}
	f := Assess(s, ctx)
	if f.Drift {
		t.Errorf("Durbin–Watson 3.2, trend p 0.6: drift reported")
	}
	// n = 50, three checks in the study (curvature p 0.5, spread p 0.4,
	// drift): DW 1.47 has one-sided p 0.031, doubled for the two drift
	// screens and tripled by Holm: no drift.
	s.Diagnostics.DurbinWatson = 1.47
	if f := Assess(s, ctx); f.Drift {
		t.Errorf("Durbin–Watson 1.47 at n = 50: drift reported")
	}
	s.Diagnostics.DurbinWatson = 1.0 // one-sided p 0.0002
	if f := Assess(s, ctx); !f.Drift || !containsAll(all(f), "Durbin–Watson 1, one-sided p = 0.0002", "trend p = 0.60",
		"after Holm's adjustment over this study's 3 checks, p = 0.001") {
		t.Errorf("Durbin–Watson 1.0 at n = 50: drift %v\n%s", f.Drift, all(f))
	}
	s.Diagnostics.DurbinWatson = 2
	s.Diagnostics.OrderTrend.P = 0.03 // below alpha, not below alpha/2
	if f := Assess(s, ctx); f.Drift {
		t.Errorf("trend p 0.03 (two screens at alpha/2 = 0.025 each): drift reported")
	}
}

func containsAll(s string, subs ...string) bool {
	for _, x := range subs {
		if !strings.Contains(s, x) {
			return false
		}
	}
	return true
}
