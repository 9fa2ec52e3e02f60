package analysis_test

import (
	"encoding/binary"
	"math"
	"testing"

	"bivar/analysis"
	"bivar/analysis/dataset"
	"bivar/analysis/report"
)

// FuzzAnalyze: any numbers (NaN, ±Inf, ties, huge and tiny values,
// constant columns, group levels) give a study or a study error, never a
// panic, and a study that ran has r in [−1, 1].
func FuzzAnalyze(f *testing.F) {
	enc := func(v ...float64) []byte {
		b := make([]byte, 8*len(v))
		for i, a := range v {
			binary.LittleEndian.PutUint64(b[8*i:], math.Float64bits(a))
		}
		return b
	}
	f.Add(enc(1, 2, 2, 4, 3, 5, 4, 4), uint8(0))
	f.Add(enc(8, 6.58, 8, 5.76, 8, 7.71, 19, 12.5, 8, 8.84), uint8(3)) // Anscombe IV-like: one row sets the slope
	f.Add(enc(1, math.NaN(), 2, 3, math.Inf(1), 4, 5, 5, 6, 6), uint8(1))
	f.Add(enc(1e300, 1, -1e300, 2, 0, 3, 1e-300, 4), uint8(2))
	f.Add(enc(5, 1, 5, 2, 5, 3, 5, 4), uint8(0))
	f.Fuzz(func(t *testing.T, data []byte, groups uint8) {
		n := len(data) / 16
		x, y := make([]float64, n), make([]float64, n)
		var g []string
		for i := 0; i < n; i++ {
			x[i] = math.Float64frombits(binary.LittleEndian.Uint64(data[16*i:]))
			y[i] = math.Float64frombits(binary.LittleEndian.Uint64(data[16*i+8:]))
			if groups > 0 {
				g = append(g, string(rune('a'+i%int(groups%5+1))))
			}
		}
		inp := analysis.Input{ID: "fuzz", X: report.Variable{Column: "x", Unit: "Cel"}, Y: report.Variable{Column: "y"},
			XS: x, YS: y, PredictAt: []float64{0, 1e6}}
		inp.AlsoIn.X = []string{"K"}
		if g != nil {
			inp.GroupColumn, inp.Groups = "g", dataset.StringsOf(g)
			inp.OrderColumn, inp.Order = "o", y
		}
		s := analysis.Analyze(inp, analysis.DefaultConfig())
		if s.Error != nil {
			return
		}
		if r := float64(s.Pearson.R); r < -1 || r > 1 {
			t.Errorf("r = %v outside [−1, 1]", r)
		}
	})
}
