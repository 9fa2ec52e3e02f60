package stats

// This file corrects a correlation and a slope for the measurement error
// of the gauges that produced x and y (classical errors of declared SD).

import "math"

// Reliability returns the reliability of a measured variable, the share of
// its observed variance that is not measurement error:
//
//	reliability = 1 − sdErr²/sdObs²
//
// (classical test theory: observed = true + error, error independent of
// the true value; Spearman 1904). It is NaN when sdObs is not positive,
// sdErr is negative or either is NaN or infinite, and when sdErr ≥ sdObs
// (the declared error explains all the observed spread: nothing is left to
// correct).
func Reliability(sdObs, sdErr float64) float64 {
	if !(sdObs > 0) || !(sdErr >= 0) || math.IsInf(sdObs, 0) || math.IsInf(sdErr, 0) {
		return math.NaN()
	}
	rel := 1 - (sdErr/sdObs)*(sdErr/sdObs)
	if !(rel > 0) {
		return math.NaN()
	}
	return rel
}

// ErrorCorrection is the result of CorrectForError. The raw figures are
// those of the observed data; the corrected ones estimate the figures of
// the true (error-free) values.
type ErrorCorrection struct {
	N                          int
	SDx, SDy                   float64 // observed SDs (n−1 divisor)
	ReliabilityX, ReliabilityY float64 // 1 − s_err²/s_obs² for each variable

	R, RLo, RHi  float64 // Pearson r and its Fisher-z interval (FisherCI)
	RCorrected   float64 // r/√(rel_x·rel_y), clipped to [−1, 1] (RUnclipped keeps the value)
	RUnclipped   float64 // r/√(rel_x·rel_y), which may exceed 1 in magnitude
	RClipped     bool    // RCorrected was clipped to ±1
	RCorrectedLo float64 // RLo/√(rel_x·rel_y), clipped to [−1, 1]
	RCorrectedHi float64 // RHi/√(rel_x·rel_y), clipped to [−1, 1]

	Slope, SlopeLo, SlopeHi float64 // least-squares slope of y on x, t interval (n−2 df)
	SlopeCorrected          float64 // Slope/rel_x
	SlopeCorrectedSE        float64 // Fuller's (1987) standard error, see CorrectForError
	SlopeCorrectedLo        float64 // SlopeCorrected ∓ t_{n−2}·SlopeCorrectedSE
	SlopeCorrectedHi        float64
}

// CorrectForError returns the correlation of x and y corrected for
// attenuation and the slope of y on x corrected for regression dilution,
// given the declared SDs of the measurement error of each variable
// (errSDx, errSDy; 0 for a variable measured without error):
//
//	r_corrected = r / √(rel_x·rel_y)      (Spearman 1904, "The proof and
//	      measurement of association between two things", Am. J. Psychol.
//	      15:72–101)
//	slope_corrected = slope / rel_x       (regression dilution; Fuller 1987,
//	      Measurement Error Models, ch. 1; Frost & Thompson 2000, J. R.
//	      Stat. Soc. A 163:173–189)
//
// with rel = Reliability(observed SD, error SD). Error in y does not bias
// the slope; it only widens its interval.
//
// Assumptions, which the caller should state beside the figures: the
// errors are classical (observed = true + error), independent of the true
// values and of each other, with constant SD; the declared SDs are known
// exactly (not estimated), so the reliabilities are treated as constants.
// The interval of r is the Fisher-z interval divided by √(rel_x·rel_y)
// (its ends clipped to [−1, 1]); a corrected r beyond ±1 is reported
// clipped to ±1 (RClipped, RUnclipped keeps it), so that the interval,
// which then ends at ±1, contains it. The interval of the slope is
// SlopeCorrected ∓ t_{n−2,(1+conf)/2}·SE with the variance of Fuller
// (1987), Measurement Error Models, §1.2, Theorem 1.2.1 (written here from
// memory, and checked by the seeded simulation of the tests: coverage
// within Monte Carlo error of the nominal at reliabilities 0.5 to 0.9):
//
//	V(β̂) = (m_xx·s_vv + β̂²·σ_uu²) / ((n−1)·(m_xx − σ_uu)²)
//	s_vv = Σ (y − ȳ − β̂(x − x̄))² / (n−2),   m_xx = Σ (x − x̄)²/(n−1),
//
// σ_uu = errSDx², β̂ = SlopeCorrected. It allows for the error in x (the
// raw t interval divided by rel_x does not, and covers too seldom), but
// not for the uncertainty of σ_uu itself: the interval is too narrow when
// the SD comes from a small repeatability study. With errSDx = 0 it is the
// raw least-squares interval.
//
// x and y must have equal length (it panics otherwise). Figures are NaN
// when n < 3, a value is NaN or infinite, a column is constant, conf lies
// outside (0, 1) (intervals only) or a reliability is undefined (corrected
// figures only).
func CorrectForError(x, y []float64, errSDx, errSDy, conf float64) ErrorCorrection {
	if len(x) != len(y) {
		panic("stats: CorrectForError: slice length mismatch")
	}
	n := len(x)
	nan := math.NaN()
	e := ErrorCorrection{N: n, SDx: nan, SDy: nan, ReliabilityX: nan, ReliabilityY: nan,
		R: nan, RLo: nan, RHi: nan, RCorrected: nan, RUnclipped: nan, RCorrectedLo: nan, RCorrectedHi: nan,
		Slope: nan, SlopeLo: nan, SlopeHi: nan, SlopeCorrected: nan, SlopeCorrectedSE: nan, SlopeCorrectedLo: nan, SlopeCorrectedHi: nan}
	if n < 3 {
		return e
	}
	mx, sdx := agrMeanSD(x)
	my, sdy := agrMeanSD(y)
	if math.IsNaN(mx+my+sdx+sdy) || math.IsInf(mx+my+sdx+sdy, 0) || !(sdx > 0) || !(sdy > 0) {
		return e
	}
	e.SDx, e.SDy = sdx, sdy
	e.ReliabilityX, e.ReliabilityY = Reliability(sdx, errSDx), Reliability(sdy, errSDy)
	var sxx, syy, sxy float64
	for i := range x {
		dx, dy := x[i]-mx, y[i]-my
		sxx += dx * dx
		syy += dy * dy
		sxy += dx * dy
	}
	e.R = math.Max(-1, math.Min(1, sxy/math.Sqrt(sxx*syy)))
	e.Slope = sxy / sxx
	rss := math.Max(syy-sxy*sxy/sxx, 0)
	se := math.Sqrt(rss / float64(n-2) / sxx)
	t := nan
	if conf > 0 && conf < 1 {
		if n >= 4 {
			e.RLo, e.RHi = FisherCI(e.R, n, conf)
		}
		t = TQuantile(0.5+conf/2, float64(n-2))
		e.SlopeLo, e.SlopeHi = e.Slope-t*se, e.Slope+t*se
	}
	if f := math.Sqrt(e.ReliabilityX * e.ReliabilityY); f > 0 {
		clip := func(v float64) float64 { return math.Max(-1, math.Min(1, v)) }
		e.RUnclipped = e.R / f
		e.RCorrected = clip(e.RUnclipped)
		e.RClipped = e.RCorrected != e.RUnclipped
		e.RCorrectedLo, e.RCorrectedHi = clip(e.RLo/f), clip(e.RHi/f)
	}
	if rx := e.ReliabilityX; rx > 0 {
		e.SlopeCorrected = e.Slope / rx
		if errSDx == 0 {
			e.SlopeCorrectedSE = se
			e.SlopeCorrectedLo, e.SlopeCorrectedHi = e.SlopeLo, e.SlopeHi
			return e
		}
		// Fuller (1987), Theorem 1.2.1.
		b := e.SlopeCorrected
		var svv float64
		for i := range x {
			v := y[i] - my - b*(x[i]-mx)
			svv += v * v
		}
		fn := float64(n)
		svv /= fn - 2
		mxx := sxx / (fn - 1)
		suu := errSDx * errSDx
		mt := mxx - suu // > 0 as rel_x > 0
		e.SlopeCorrectedSE = math.Sqrt((mxx*svv + b*b*suu*suu) / ((fn - 1) * mt * mt))
		e.SlopeCorrectedLo, e.SlopeCorrectedHi = b-t*e.SlopeCorrectedSE, b+t*e.SlopeCorrectedSE
	}
	return e
}
