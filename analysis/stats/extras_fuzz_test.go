package stats

import (
	"encoding/binary"
	"math"
	"math/rand/v2"
	"testing"
)

// FuzzExtrasNoPanic: whatever the numbers (NaN, ±Inf, ±0, huge, tiny,
// ties, constant columns), the additional statistics never panic, and the
// bounded quantities stay in their bounds: dCor and every p-value in
// [0, 1], adjusted p-values between the raw value and 1, Durbin–Watson in
// [0, 4], one LOWESS value per row.
func FuzzExtrasNoPanic(f *testing.F) {
	seed := func(v ...float64) []byte {
		b := make([]byte, 8*len(v))
		for i, x := range v {
			binary.LittleEndian.PutUint64(b[8*i:], math.Float64bits(x))
		}
		return b
	}
	f.Add(seed(1, 2, 3, 4, 5, 2, 4, 5, 4, 5, 1, 1, 2, 2))
	f.Add(seed(2, 5, 2, 1, 2, 3, 9, 10))
	f.Add(seed(math.NaN(), 1, math.Inf(1), 2, 0, math.Copysign(0, -1)))
	f.Add(seed(1e300, -1e300, 1e-300, 5e-324, 3, 3, 3, 3))
	f.Add(seed(1e9, 1, 1e9+1, 2, 1e9+2, 2, 1e9, 3, 1e9+1, 5, 1e9+2, 4))
	f.Fuzz(func(t *testing.T, data []byte) {
		n := len(data) / 16
		x, y := make([]float64, n), make([]float64, n)
		for i := 0; i < n; i++ {
			x[i] = math.Float64frombits(binary.LittleEndian.Uint64(data[16*i:]))
			y[i] = math.Float64frombits(binary.LittleEndian.Uint64(data[16*i+8:]))
		}
		in01 := func(what string, p float64) {
			if !math.IsNaN(p) && !(p >= 0 && p <= 1) {
				t.Fatalf("%s = %v outside [0, 1]", what, p)
			}
		}
		if fit := Lowess(x, y, 2.0/3, 2, -1); len(fit) != n {
			t.Fatalf("Lowess: %d values for %d rows", len(fit), n)
		}
		LowessCurve(x, y, 0.3, 1, 0)
		TheilSen(x, y, 8, rand.NewPCG(1, 2))
		d := DistanceCorrelation(x, y)
		in01("dCor", d)
		d2, p, _, _ := DistanceCorrTest(x, y, 9, 6, rand.NewPCG(3, 4))
		in01("dCor (test)", d2)
		in01("dCor p", p)
		_, _, _, lp, _ := LackOfFit(x, y)
		in01("lack-of-fit p", lp)
		_, _, bp := BreuschPagan(y, x)
		in01("Breusch–Pagan p", bp)
		if dw := DurbinWatson(y); !math.IsNaN(dw) && !(dw >= 0 && dw <= 4+1e-12) {
			if !math.IsInf(dw, 0) { // overflow of the sums is possible for |y| near MaxFloat64
				t.Fatalf("Durbin–Watson = %v outside [0, 4]", dw)
			}
		}
		_, op, or := OrderTrend(x, y)
		in01("order-trend p", op)
		if !math.IsNaN(or) && !(or >= -1 && or <= 1) {
			t.Fatalf("order-trend r = %v", or)
		}
		PartialCorrelation(x, y, y, 0.95) // z = y: must not panic
		_, _, _, pp := PartialCorrelation(x, y, x, 0.95)
		in01("partial p", pp)
		ps := make([]float64, n)
		for i := range ps {
			ps[i] = math.Abs(math.Mod(x[i], 1))
		}
		for name, adj := range map[string][]float64{"Holm": Holm(ps), "BH": BenjaminiHochberg(ps)} {
			for i, v := range adj {
				if !math.IsNaN(ps[i]) && !(v >= ps[i] && v <= 1) {
					t.Fatalf("%s[%d] = %v for p %v", name, i, v, ps[i])
				}
			}
		}
	})
}
