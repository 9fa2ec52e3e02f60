package analysis

// This file lists, per study, the figures computed on a sample or
// approximately, each with its error against the exact method, so that the
// report states every approximation it rests on.

import (
	"fmt"
	"math"

	"bivar/analysis/report"
)

// lowessSampleError is the error of LOWESS on a sample of 20 000 rows
// chosen by value against LOWESS on all rows (same span, iterations and
// delta = 1% of the x range), measured on data of the benchmark
// generator's shape (../shared/tools/bench/gen_data.py, 10⁵ rows, five
// draws): the largest |difference| of the curves, in SDs of y.
// TestLowessSampleError measures it again on every test run (0.031 and
// 0.074 with the present sample).
const (
	lowessErrCore = 0.038 // for x within the 1st to 99th percentile
	lowessErrAll  = 0.11  // over the whole x range, ends included
)

// approximations lists the study's sampled figures (see report.Approximation).
func approximations(s *report.Study, cfg Config) []report.Approximation {
	out := []report.Approximation{}
	d := s.Diagnostics
	if d == nil {
		return out
	}
	byValue := "rows chosen by their values (smallest hashes of the pairs): the same rows give the same sample in any order, with any seed"
	if lw := d.Lowess; lw != nil && lw.Sampled < s.N {
		out = append(out, report.Approximation{Figure: "LOWESS curve", Rows: lw.Sampled, Of: s.N, Method: byValue,
			Error: fmt.Sprintf("largest difference from LOWESS on all rows %s SD of y for x between its 1st and 99th percentiles, %s SD at the ends (measured by this tool on generated data of 10⁵ rows with normal x)",
				num(report.Float(lowessErrCore)), num(report.Float(lowessErrAll)))})
	}
	if dc := d.DistanceCorr; dc != nil && dc.Sampled < s.N {
		e := "the p-value's Monte Carlo standard error is given with it"
		out = append(out, report.Approximation{Figure: "distance-correlation permutation p", Rows: dc.Sampled, Of: s.N, Method: byValue,
			Error: e})
		if s.N > DcorStatMaxN {
			out = append(out, report.Approximation{Figure: "distance correlation", Rows: DcorStatMaxN, Of: s.N, Method: byValue,
				Error: fmt.Sprintf("sampling error of order 1/√%d ≈ %s, against the nonlinear cut point of %s (the statistic's standard error shrinks as one over the root of the rows)",
					DcorStatMaxN, num(report.Float(1/math.Sqrt(DcorStatMaxN))), num(report.Float(cfg.Thresholds.NonlinearDcor)))})
		}
	}
	if d.DurbinWatsonXRows > 0 && d.DurbinWatsonXRows < s.N {
		out = append(out, report.Approximation{Figure: "Durbin–Watson and spread ρ in order of x", Rows: d.DurbinWatsonXRows, Of: s.N, Method: byValue,
			Error: fmt.Sprintf("a screen read against a fixed cut point; its sampling SD is about 2/√%d ≈ %s", d.DurbinWatsonXRows,
				num(report.Float(2/math.Sqrt(float64(d.DurbinWatsonXRows)))))})
	}
	if rs := d.Resistant; rs != nil && rs.Pairs > 0 {
		out = append(out, report.Approximation{Figure: "Theil–Sen slope", Rows: rs.Pairs, Of: s.N,
			Method: "pairs of rows (the count is of pairs) drawn from a random stream seeded by the rows themselves",
			Error: fmt.Sprintf("the median of %d sampled slopes lies between the 0.5 ± %s quantiles of all pairwise slopes with about 95%% probability (binomial: 1/√m)",
				rs.Pairs, num(report.Float(1/math.Sqrt(float64(rs.Pairs)))))})
	}
	return out
}
