package analysis

import (
	"math"
	"math/rand/v2"
	"testing"

	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// TestRobustWiring: with a run order and residuals that follow an AR(1)
// in it, the findings say the residuals hang together, the study carries
// the Newey–West interval of the slope (stats.SlopeHAC on the rows in run
// order) and r with Bartlett's effective n; listing the rows in another
// order changes none of it.
func TestRobustWiring(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	n := 120
	x, y, ord := make([]float64, n), make([]float64, n), make([]float64, n)
	e := 0.0
	for i := range x {
		ord[i] = float64(i + 1)
		x[i] = 5 + 3*math.Sin(float64(i)/9) + 0.5*rng.NormFloat64()
		e = 0.8*e + rng.NormFloat64()
		y[i] = 2 + 0.5*x[i] + e
	}
	in := Input{ID: "ar1", X: report.Variable{Column: "x"}, Y: report.Variable{Column: "y"}, XS: x, YS: y, OrderColumn: "run", Order: ord}
	s := Analyze(in, DefaultConfig())
	if s.Findings == nil || !s.Findings.Autocorrelated || s.Robust == nil || s.Robust.HAC == nil {
		t.Fatalf("AR(1) residuals in run order: findings %+v robust %+v, want autocorrelated with a HAC interval", s.Findings, s.Robust)
	}
	lags := stats.NeweyWestLags(n)
	b, se := stats.SlopeHAC(x, y, lags)
	if h := s.Robust.HAC; h.Lags != lags || math.Abs(float64(h.SE)-se) > 1e-12*se ||
		math.Abs(float64(h.CILow)-(b-stats.NormalQuantile(0.975)*se)) > 1e-9 {
		t.Errorf("HAC %+v, want SE %v with %d lags about slope %v", h, se, lags, b)
	}
	if ne := float64(s.Robust.NEff); !(ne < float64(n)/2) {
		t.Errorf("effective n %v of %d, want well below n for x and y that both hang together in run order", ne, n)
	}
	perm := rng.Perm(n)
	in2 := in
	in2.XS, in2.YS, in2.Order = pick(x, perm), pick(y, perm), pick(ord, perm)
	s2 := Analyze(in2, DefaultConfig())
	if s2.Robust.HAC.SE != s.Robust.HAC.SE || s2.Robust.NEff != s.Robust.NEff || !s2.Findings.Autocorrelated {
		t.Errorf("rows listed in another order: HAC SE %v n_eff %v, want %v %v", s2.Robust.HAC.SE, s2.Robust.NEff, s.Robust.HAC.SE, s.Robust.NEff)
	}
	// Without a run order: HC3 only, and no claim about dependence.
	in.OrderColumn, in.Order = "", nil
	s3 := Analyze(in, DefaultConfig())
	if s3.Robust.HAC != nil || s3.Findings.Autocorrelated || s3.Robust.HC3 == nil {
		t.Errorf("no order: HAC %v autocorrelated %v HC3 %v; want nil false set", s3.Robust.HAC, s3.Findings.Autocorrelated, s3.Robust.HC3)
	}
}
