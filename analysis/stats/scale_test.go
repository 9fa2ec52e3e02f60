package stats

import (
	"math"
	"strconv"
	"testing"

	"bivar/internal/reference"
)

// TestScaleInvariance fits Anscombe (1973) set I (shared/reference/
// anscombe.csv; its unscaled line and r are checked against the published
// values in TestAnscombe) with x, y or both multiplied by 1e-300, 1e-200
// and 1e300. Any finite double is data: the scaled sets must not be refused
// as constant and must give the same r, ρ, τ, R², t, p and leverages, and
// the slope, intercept, standard errors, residual SE and intervals scaled
// by the units (an identity of least squares, not a reference value). The
// tolerance is 1e-13 relative: the products x·s round, so the scaled data
// are not exactly the unscaled ones times s.
func TestScaleInvariance(t *testing.T) {
	t.Parallel()
	set := reference.Anscombe(t)["I"]
	x0, y0 := set[0], set[1]
	base, err := Line(x0, y0, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	r0 := Pearson(x0, y0, 0.95)
	rho0, _ := Spearman(x0, y0)
	fit0, lo0, hi0, _, _ := base.Interval(11, 0.95)
	close := func(what string, got, want float64) {
		t.Helper()
		if !coreClose(got, want, 1e-13) {
			t.Errorf("%s = %.17g, want %.17g", what, got, want)
		}
	}
	scale := func(v []float64, s float64) []float64 {
		out := make([]float64, len(v))
		for i, a := range v {
			out[i] = a * s
		}
		return out
	}
	for _, s := range []float64{1e-300, 1e-200, 1e300} {
		for _, c := range []struct {
			name   string
			sx, sy float64
		}{{"x", s, 1}, {"y", 1, s}, {"both", s, s}} {
			x, y := scale(x0, c.sx), scale(y0, c.sy)
			pre := func(what string) string {
				return "scale " + c.name + " by " + strconv.FormatFloat(s, 'g', -1, 64) + ": " + what
			}
			l, err := Line(x, y, 0.95)
			if err != nil {
				t.Errorf("%s", pre(err.Error()))
				continue
			}
			close(pre("slope"), l.Slope.Estimate, base.Slope.Estimate*c.sy/c.sx)
			close(pre("SE(slope)"), l.Slope.SE, base.Slope.SE*c.sy/c.sx)
			close(pre("slope CI low"), l.Slope.CILow, base.Slope.CILow*c.sy/c.sx)
			close(pre("intercept"), l.Intercept.Estimate, base.Intercept.Estimate*c.sy)
			close(pre("SE(intercept)"), l.Intercept.SE, base.Intercept.SE*c.sy)
			close(pre("t(slope)"), l.Slope.T, base.Slope.T)
			close(pre("p(slope)"), l.Slope.P, base.Slope.P)
			close(pre("p(intercept)"), l.Intercept.P, base.Intercept.P)
			close(pre("R²"), l.R2, base.R2)
			close(pre("F"), l.F, base.F)
			close(pre("residual SE"), l.ResidualSE, base.ResidualSE*c.sy)
			close(pre("AIC − 2N·ln(sy)"), l.AIC-2*float64(l.N)*math.Log(c.sy), base.AIC)
			for i := range x {
				close(pre("leverage"), l.Leverage[i], base.Leverage[i])
				close(pre("residual"), l.Residuals[i], base.Residuals[i]*c.sy)
			}
			fit, lo, hi, _, _ := l.Interval(11*c.sx, 0.95)
			close(pre("fit at x = 11"), fit, fit0*c.sy)
			close(pre("confidence interval low"), lo, lo0*c.sy)
			close(pre("confidence interval high"), hi, hi0*c.sy)
			f, _, _, pl, _ := l.Predict([]float64{11 * c.sx}, 0.95)
			close(pre("Predict"), f, fit0*c.sy)
			_, _, _, pl0, _ := base.Predict([]float64{11}, 0.95)
			close(pre("prediction interval low"), pl, pl0*c.sy)

			r := Pearson(x, y, 0.95)
			close(pre("r"), r.R, r0.R)
			close(pre("p(r)"), r.P, r0.P)
			close(pre("Fisher CI low"), r.CILow, r0.CILow)
			rho, _ := Spearman(x, y)
			close(pre("ρ"), rho, rho0)

			q, err := Polynomial(x, y, 2, 0.95)
			if err != nil {
				t.Errorf("%s", pre("quadratic: "+err.Error()))
			} else {
				q0, _ := Polynomial(x0, y0, 2, 0.95)
				for j := range q.Coef {
					close(pre("quadratic t"), q.Coef[j].T, q0.Coef[j].T)
					close(pre("quadratic p"), q.Coef[j].P, q0.Coef[j].P)
				}
				close(pre("quadratic slope"), q.Coef[1].Estimate, q0.Coef[1].Estimate*c.sy/c.sx)
			}
		}
	}
	// Constant means every value the same, at any scale.
	for _, v := range []float64{1e-300, 5e-324, 1e300} {
		if _, err := Line(x0, []float64{v, v, v, v, v, v, v, v, v, v, v}, 0.95); err != nil {
			t.Errorf("constant y = %g refused: %v", v, err)
		}
		if _, err := Line([]float64{v, v, v}, []float64{1, 2, 3}, 0.95); err == nil {
			t.Errorf("constant x = %g accepted", v)
		}
	}
}
