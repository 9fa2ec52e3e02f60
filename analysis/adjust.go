package analysis

// This file holds the adjustment of Pearson p-values across all studies of
// a manifest.

import (
	"fmt"

	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// Adjust sets p_adjusted of every study that ran, adjusting Pearson's p
// across those studies by method: "holm" (Holm 1979, step-down, controls
// the family-wise error rate), "bh" (Benjamini & Hochberg 1995, step-up,
// controls the false discovery rate) or "none" (p_adjusted = p). Studies
// with an error or an undefined p take no part and keep p_adjusted
// undefined. The family is the studies of one manifest, in manifest order.
func Adjust(studies []report.Study, method string) error {
	var idx []int
	var p []float64
	for i := range studies {
		s := &studies[i]
		if s.Error != nil || s.Pearson == nil {
			continue
		}
		if !s.Pearson.P.Valid() {
			s.Pearson.PAdjusted = report.NaN()
			continue
		}
		idx = append(idx, i)
		p = append(p, float64(s.Pearson.P))
	}
	var adj []float64
	switch method {
	case "holm":
		adj = stats.Holm(p)
	case "bh":
		adj = stats.BenjaminiHochberg(p)
	case "none", "":
		adj = p
	default:
		return fmt.Errorf("adjust = %q: want holm, bh or none", method)
	}
	for k, i := range idx {
		studies[i].Pearson.PAdjusted = report.Float(adj[k])
	}
	return nil
}
