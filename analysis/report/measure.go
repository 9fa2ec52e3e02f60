package report

// This file holds the parts of a study about measurement: the agreement of
// two methods, the correction for a gauge's measurement error, and the
// planning of the next run.

// Agreement is what an agreement study (study.kind = "agreement") finds
// about two methods measuring the same items. Differences are d = y − x
// (the y method minus the x method); means are (x + y)/2, of each method's
// replicate readings when it has them. Intervals are at the manifest's
// confidence 1 − alpha.
type Agreement struct {
	N         int    `json:"n"`          // items with every reading present
	XReadings int    `json:"x_readings"` // readings per item of the x method (1 + x_replicates)
	YReadings int    `json:"y_readings"`
	Unit      string `json:"unit"` // UCUM code of both methods, "" when none declared

	// Acceptable is the declared acceptable difference ±Acceptable in Unit
	// (converted from agreement.unit); null when none was declared.
	Acceptable Float `json:"acceptable"`

	Bias       Float `json:"bias"` // mean difference
	BiasLow    Float `json:"bias_low"`
	BiasHigh   Float `json:"bias_high"`
	BiasSE     Float `json:"bias_se"` // standard error of the bias, SD of the observed differences/√n
	SD         Float `json:"sd"`      // SD of the difference of single readings
	K          Float `json:"k"`       // limits are Bias ∓ K·SD
	Lower      Float `json:"lower"`
	LowerLow   Float `json:"lower_low"` // the lower limit's interval
	LowerHigh  Float `json:"lower_high"`
	Upper      Float `json:"upper"`
	UpperLow   Float `json:"upper_low"`
	UpperHigh  Float `json:"upper_high"`
	TrendSlope Float `json:"trend_slope"` // least-squares slope of d on the mean
	TrendLow   Float `json:"trend_low"`   // its interval (t, n − 2 df)
	TrendHigh  Float `json:"trend_high"`
	TrendP     Float `json:"trend_p"`
	MeanLow    Float `json:"mean_low"`  // the observed range of the items' mean of the two methods,
	MeanHigh   Float `json:"mean_high"` // over which the trend is judged material

	Deming        *MethodLine     `json:"deming"`
	PassingBablok *MethodLine     `json:"passing_bablok"`
	Concordance   *Concordance    `json:"concordance"`
	Repeatability []Repeatability `json:"repeatability"` // one per method with replicates, x first

	// Verdicts (set by the findings).
	Verdict          AgreementVerdict `json:"verdict"`           // AgreeWithin, NotWithin, Undecided, or "" without an acceptable difference
	ConstantBias     bool             `json:"constant_bias"`     // the Deming intercept's interval excludes 0
	ProportionalBias bool             `json:"proportional_bias"` // the Deming slope's interval excludes 1
	Trend            bool             `json:"trend"`             // the difference changes with the magnitude: trend_p below alpha and the change over the range of the mean material (see findings)
	Statements       []string         `json:"statements"`        // the verdicts in words, with their figures
	Assumptions      []string         `json:"assumptions"`       // what the figures rest on

	Plot *AgreementPlot `json:"-"` // what the charts draw (bounded); not in results.json
}

// AgreementVerdict is the verdict of an agreement study on agreement
// within the declared acceptable difference, written to results.json as
// its word; "" when none was declared or a figure is undefined.
type AgreementVerdict string

// The agreement verdicts (Agreement.Verdict).
const (
	AgreeWithin AgreementVerdict = "agree"     // both limits, with their intervals, inside ±acceptable
	NotWithin   AgreementVerdict = "disagree"  // a limit's interval lies wholly outside ±acceptable
	Undecided   AgreementVerdict = "undecided" // neither: an interval reaches across ±acceptable (or is undefined)
)

// Words names the verdict for a reader: "agree", "do not agree",
// "undecided", or "undefined" when there is none.
func (v AgreementVerdict) Words() string {
	switch v {
	case AgreeWithin:
		return "agree"
	case NotWithin:
		return "do not agree"
	case Undecided:
		return "undecided"
	}
	return "undefined"
}

// MethodLine is a line y = Intercept + Slope·x fitted to two methods.
type MethodLine struct {
	Intercept     Float `json:"intercept"`
	InterceptLow  Float `json:"intercept_low"`
	InterceptHigh Float `json:"intercept_high"`
	Slope         Float `json:"slope"`
	SlopeLow      Float `json:"slope_low"`
	SlopeHigh     Float `json:"slope_high"`
	// Delta (Deming) is the error-variance ratio used and DeltaFrom where
	// it came from: "declared", "replicates" or "assumed 1".
	Delta     Float  `json:"delta,omitempty"`
	DeltaFrom string `json:"delta_from,omitempty"`
	// Sampled (Passing–Bablok) says the slopes came from a sample of pairs.
	Sampled bool `json:"sampled,omitempty"`
}

// Concordance is Lin's concordance correlation coefficient.
type Concordance struct {
	CCC     Float `json:"ccc"`
	Low     Float `json:"low"`
	High    Float `json:"high"`
	Pearson Float `json:"pearson"` // precision
	Cb      Float `json:"cb"`      // accuracy (bias correction factor)
}

// Repeatability is one method's repeatability from its replicate readings.
type Repeatability struct {
	Method   string `json:"method"` // "x" or "y"
	Column   string `json:"column"`
	Readings int    `json:"readings"` // per item
	DF       int    `json:"df"`
	SW       Float  `json:"sw"` // within-item SD
	SWLow    Float  `json:"sw_low"`
	SWHigh   Float  `json:"sw_high"`
	Coef     Float  `json:"coefficient"` // repeatability coefficient 2.77·sw
	CoefLow  Float  `json:"coefficient_low"`
	CoefHigh Float  `json:"coefficient_high"`
}

// AgreementPlot is what the agreement charts draw: the difference against
// the mean of each item, and y against x, every item up to PlotPointsMax,
// else density grids.
type AgreementPlot struct {
	N        int
	Points   []XY    // (mean, difference), sorted; nil above PlotPointsMax
	Grid     *Grid   // the same binned, above PlotPointsMax
	Pairs    []XY    // (x, y) of each item (replicate means), sorted; nil above PlotPointsMax
	PairGrid *Grid   // the same binned, above PlotPointsMax
	Lo, Hi   float64 // range of both methods' values, for the identity and Deming lines
}

// ErrorCorrection is r and the slope corrected for the measurement error
// of the gauges (study.gauge_sd or replicate columns). Intervals are at the
// manifest's confidence.
type ErrorCorrection struct {
	N            int    `json:"n"`
	SDErrorX     Float  `json:"sd_error_x"` // the gauge's repeatability SD for x; 0 when x is taken as exact
	SDErrorY     Float  `json:"sd_error_y"`
	FromX        string `json:"from_x"` // "declared", "replicates" or "none"
	FromY        string `json:"from_y"`
	ReliabilityX Float  `json:"reliability_x"` // 1 − sd_error²/sd_observed²
	ReliabilityY Float  `json:"reliability_y"`

	R                  Float `json:"r"`
	RCorrected         Float `json:"r_corrected"` // clipped to ±1 (see RCorrectedClipped)
	RCorrectedClipped  bool  `json:"r_corrected_clipped"`
	RUnclipped         Float `json:"r_corrected_unclipped"` // r/√(rel_x·rel_y) before clipping
	RCorrectedLow      Float `json:"r_corrected_low"`
	RCorrectedHigh     Float `json:"r_corrected_high"`
	Slope              Float `json:"slope"`
	SlopeCorrected     Float `json:"slope_corrected"`
	SlopeCorrectedLow  Float `json:"slope_corrected_low"`
	SlopeCorrectedHigh Float `json:"slope_corrected_high"`

	Statements  []string `json:"statements"`
	Assumptions []string `json:"assumptions"`
}

// Plan says how many rows the next run needs. A need of 0 means not
// computable (an undefined figure) or beyond any practical run.
type Plan struct {
	N     int   `json:"n"`     // rows in this run
	Alpha Float `json:"alpha"` // the study's alpha (intervals at 1 − alpha; the test two-sided)

	RHalfWidthNow  Float  `json:"r_half_width_now"`  // r's present half-width
	RHalfWidth     Float  `json:"r_half_width"`      // the target
	RHalfWidthFrom string `json:"r_half_width_from"` // "declared" or "default"
	NForR          int    `json:"n_for_r"`           // rows for r's interval to reach the target, at the observed r

	SlopeHalfWidthNow  Float  `json:"slope_half_width_now"`
	SlopeHalfWidth     Float  `json:"slope_half_width"`
	SlopeHalfWidthFrom string `json:"slope_half_width_from"` // "declared" or "default" (half the present)
	NForSlope          int    `json:"n_for_slope"`

	DetectR     Float  `json:"detect_r"`      // the r to detect
	DetectRFrom string `json:"detect_r_from"` // "declared" or "observed"
	Power       Float  `json:"power"`
	NForPower   int    `json:"n_for_power"`
	PowerNow    Float  `json:"power_now"` // power of this run's n to detect DetectR; NaN unless DetectR is declared (at the observed r it is only a transform of p)

	// Agreement studies plan the limits of agreement instead (the r, slope
	// and power figures above are then NaN and 0: a test of ρ = 0 says
	// nothing about agreement).
	LimitsHalfWidthNow  Float  `json:"limits_half_width_now"`  // half-width of the limits' exact intervals now
	LimitsHalfWidth     Float  `json:"limits_half_width"`      // the target, in the columns' unit
	LimitsHalfWidthFrom string `json:"limits_half_width_from"` // "declared" or "default" (half the present); "" outside agreement studies
	NForLimits          int    `json:"n_for_limits"`           // items for the target, at the present SD of the differences

	Statements []string `json:"statements"`
}
