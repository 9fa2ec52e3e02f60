package stats

import (
	"encoding/binary"
	"math"
	"testing"
)

// FuzzCoreNoPanic: whatever the numbers (NaN, ±Inf, ±0, huge, tiny, ties,
// constant columns, leverage-1 rows), the core statistics return values or
// errors and never panic, and the bounded quantities stay in their bounds.
func FuzzCoreNoPanic(f *testing.F) {
	seed := func(v ...float64) []byte {
		b := make([]byte, 8*len(v))
		for i, x := range v {
			binary.LittleEndian.PutUint64(b[8*i:], math.Float64bits(x))
		}
		return b
	}
	f.Add(seed(1, 2, 3, 4, 5, 2, 4, 5, 4, 5))
	f.Add(seed(2, 5, 2, 1, 2, 3, 9, 10))
	f.Add(seed(math.NaN(), 1, math.Inf(1), 2, 0, math.Copysign(0, -1)))
	f.Add(seed(1e300, -1e300, 1e-300, 5e-324, 3, 3, 3, 3))
	f.Fuzz(func(t *testing.T, data []byte) {
		n := len(data) / 16
		x, y := make([]float64, n), make([]float64, n)
		for i := 0; i < n; i++ {
			x[i] = math.Float64frombits(binary.LittleEndian.Uint64(data[16*i:]))
			y[i] = math.Float64frombits(binary.LittleEndian.Uint64(data[16*i+8:]))
		}
		Describe(x)
		c := Pearson(x, y, 0.95)
		if c.R < -1 || c.R > 1 {
			t.Fatalf("r = %v", c.R)
		}
		if r, _ := Spearman(x, y); r < -1 || r > 1 {
			t.Fatalf("rho = %v", r)
		}
		if tau, _ := KendallTauB(x, y); tau < -1 || tau > 1 {
			t.Fatalf("tau = %v", tau)
		}
		if l, err := Line(x, y, 0.95); err == nil {
			l.Interval(1, 0.95)
		}
		if n > 0 {
			Polynomial(x, y, 2, 0.95)
		}
		in := Influence(x, y)
		for i, h := range in.Leverage {
			if h > 1+1e-9 || in.SoleSupport[i] && h != 1 {
				t.Fatalf("h[%d] = %v sole %v", i, h, in.SoleSupport[i])
			}
		}
	})
}
