// Package report holds the Report model: the one value that the analysis
// produces and that every renderer (HTML, Markdown, results.json) and
// `bivar diff` reads. It is plain data with no behaviour beyond its JSON
// encoding.
//
// Undefined numbers are stored as NaN in a Float and written to JSON as
// null (encoding/json cannot write NaN). This is DESIGN.md's "undefined
// values are null", done with a value type instead of pointers so that the
// code filling the model can assign results of arithmetic directly.
package report

// Schema names the results.json format. Change it only with a new version.
//
// v2 (from v1): thresholds.curve_gain_r2 became curve_share (the curve
// rule changed); influence.points holds only the named rows (at most
// influence.named_max), with counts, cut points and the flagged-rows file
// beside them; findings gained typed checks, reasons and more verdicts;
// studies gained group_lines and robust. Every key `bivar diff` reads is
// the same in both, so it reads v1 too (ReadsSchema). v3 added keys only:
// a study's kind, agreement, error_correction and plan, and x.scale and
// y.scale for a study on a transformed scale (a v2 reader, which refuses
// unknown keys, cannot read it; this version reads v2 and v1).
const Schema = "bivar.results/v3"

// ReadsSchema reports whether `bivar diff` reads results.json files of
// schema s: this version's, v2 and v1.
func ReadsSchema(s string) bool {
	return s == Schema || s == "bivar.results/v2" || s == "bivar.results/v1"
}

// Caution is printed on every report: statistical evidence supports, but
// does not replace, change control.
const Caution = "Statistical evidence supports, but does not replace, the organisation's " +
	"change control, validation and applicable codes and regulations."

// Report is the whole outcome of one `bivar run`.
type Report struct {
	Schema    string       `json:"schema"`
	Tool      Tool         `json:"tool"`
	Generated string       `json:"generated,omitempty"` // the run's date, RFC 3339 UTC: SOURCE_DATE_EPOCH when set, else the time of the run; "" from analysis.Run without one
	Manifest  ManifestInfo `json:"manifest"`
	Datasets  []Dataset    `json:"datasets"`
	Studies   []Study      `json:"studies"`
	Caution   string       `json:"caution"`
}

// Tool names the program that wrote the report.
type Tool struct {
	Name    string `json:"name"`
	Version string `json:"version"`
}

// ManifestInfo records the manifest's settings that shaped every study.
type ManifestInfo struct {
	File       string     `json:"file"` // as given on the command line
	Title      string     `json:"title"`
	Design     string     `json:"design"` // observational | designed-experiment | randomized-experiment
	Alpha      float64    `json:"alpha"`
	Adjust     string     `json:"adjust"` // holm | bh | none
	SHA256     string     `json:"sha256"`
	Seed       uint64     `json:"seed"` // the manifest's seed, recorded; no figure depends on it (random streams are seeded by the rows)
	Thresholds Thresholds `json:"thresholds"`
	// Rules states the cut points in force as the rules apply them
	// (findings.Rules), for people: common practice apart from this tool's
	// own choices.
	Rules string `json:"rules"`
}

// Thresholds are the cut points the findings use. The defaults live in
// findings.DefaultThresholds; the manifest's [thresholds] table overrides
// them. They are written out so a reader knows which were in force.
type Thresholds struct {
	Strong           float64 `json:"strong"`             // |r| at or above: strong (common practice 0.7)
	Moderate         float64 `json:"moderate"`           // |r| at or above: moderate (common practice 0.4)
	Weak             float64 `json:"weak"`               // |r| at or above: weak, below: none (0.1)
	LeverageFactor   float64 `json:"leverage_factor"`    // high leverage when h > factor·p/n (3)
	OutlierZ         float64 `json:"outlier_z"`          // outlier when |externally studentized| > this (3)
	CooksD           float64 `json:"cooks_d"`            // influential when Cook's D > this quantile of F(p, n−p) (0.5; see findings)
	CurveShare       float64 `json:"curve_share"`        // curved needs the quadratic to remove at least this share of the line's residual sum of squares (0.1)
	NonlinearDcor    float64 `json:"nonlinear_dcor"`     // nonlinear when dcor at or above this while |r| is weak (0.15)
	ReversalMinGroup int     `json:"reversal_min_group"` // smallest group used in the reversal check (5)
	// OutlierFamilyAlpha sets the Bonferroni bound for outliers: |t| must also
	// exceed t(1 − a/(2n), n − 3) (0.05; 0 turns the bound off).
	OutlierFamilyAlpha float64 `json:"outlier_family_alpha"`
	// DriftDW: with a run order, Durbin–Watson below this or above 4 − this
	// counts as drift (1.5).
	DriftDW float64 `json:"drift_dw"`
	// FormDW: the line's residuals in order of x with Durbin–Watson below
	// this (and below its alpha bound) make the form nonlinear (1.5).
	FormDW float64 `json:"form_dw"`
}

// ShortHash is the first 12 hex digits of a SHA-256, enough to tell files
// apart by eye where the full hash is given elsewhere (the report's
// appendix, diff.json and the diff's HTML titles).
func ShortHash(h string) string {
	if len(h) > 12 {
		return h[:12]
	}
	return h
}

// Dataset is one data file as read.
type Dataset struct {
	ID           string        `json:"id"`
	File         string        `json:"file"` // relative to the manifest's folder, slash-separated
	SHA256       string        `json:"sha256"`
	Rows         int           `json:"rows"` // data rows read (header not counted)
	Delimiter    string        `json:"delimiter"`
	DecimalComma bool          `json:"decimal_comma"`
	Missing      []ColumnCount `json:"missing"`     // cells read as missing, per column read
	NonNumeric   []ColumnCount `json:"non_numeric"` // non-numeric cells counted as missing (only when allowed)
	// MissingKinds splits the Missing counts by kind where the source
	// tells kinds apart: a workbook's error values ("#DIV/0!", "#N/A"), per
	// column in Missing's order, most frequent first; cells missing for
	// other reasons (empty, a missing token, NULL) are not listed.
	MissingKinds []KindCount `json:"missing_kinds,omitempty"`
	// Source says where rows came from when not from a CSV file: a
	// workbook's sheet, or a PostgreSQL query. nil for CSV.
	Source *Source `json:"source,omitempty"`
}

// ColumnCount is a count for one column.
type ColumnCount struct {
	Column string `json:"column"`
	Count  int    `json:"count"`
}

// KindCount is a count of one kind of missing cell in one column.
type KindCount struct {
	Column string `json:"column"`
	Kind   string `json:"kind"`
	Count  int    `json:"count"`
}

// Source kinds.
const (
	SourceWorkbook   = "xlsx"
	SourcePostgreSQL = "postgresql"
)

// Source is the provenance of a dataset read from a workbook or a
// database. Dataset.SHA256 is then the workbook file's hash, or the hash
// of the rows as fetched (see Rows and Order); Dataset.Rows the rows read.
type Source struct {
	Kind string `json:"kind"` // SourceWorkbook or SourcePostgreSQL

	// Workbooks: the sheet read and the 1-based row that names the columns.
	Sheet     string `json:"sheet,omitempty"`
	HeaderRow int    `json:"header_row,omitempty"`

	// PostgreSQL: the server's version (server_version), the statement run
	// as sent (the manifest's query or table wrapped in the canonical
	// ORDER BY and the row limit), when it started (UTC, RFC 3339), the
	// connection's environment variable (its name only), the statement
	// timeout, and how rows were ordered and hashed.
	ServerVersion    string `json:"server_version,omitempty"`
	Query            string `json:"query,omitempty"`
	RanAt            string `json:"ran_at,omitempty"`
	Connection       string `json:"connection,omitempty"`
	StatementTimeout string `json:"statement_timeout,omitempty"`
	Order            string `json:"order,omitempty"`
}

// Variable describes one side of a study.
type Variable struct {
	Column string `json:"column"`
	Label  string `json:"label"` // for people; defaults to the column name
	Unit   string `json:"unit"`  // UCUM code, "" when none declared

	// Symbol is Unit as people write it ("Cel" → "°C", "{HRC}" → "HRC",
	// "um" → "µm", "1" → ""), by units.Symbol; renderers and sentences
	// show this, never the code.
	Symbol string `json:"symbol"`

	// Scale is the scale the study puts the variable on before every
	// figure is computed: "log" (natural logarithm), "log10" or "sqrt";
	// "" (left out of results.json) for the values as recorded. Label,
	// Unit and Symbol stay those of the recorded values.
	Scale string `json:"scale,omitempty"`
}

// Study is one variable pair and everything computed for it. Sections are
// pointers: nil when the study failed before reaching them.
type Study struct {
	ID      string   `json:"id"`
	Title   string   `json:"title"`
	Dataset string   `json:"dataset"`
	X       Variable `json:"x"`
	Y       Variable `json:"y"`
	Group   string   `json:"group,omitempty"`
	Order   string   `json:"order,omitempty"`

	// GroupLabel and OrderLabel are the group and order columns' labels
	// from the dataset's [dataset.labels] (the column name when none), for
	// people; empty when the study has no group or order.
	GroupLabel string `json:"group_label,omitempty"`
	OrderLabel string `json:"order_label,omitempty"`

	Covariates []string `json:"covariates,omitempty"`

	// Design is how this study's data arose (the study's design key, else
	// the manifest's); the statements about cause follow it.
	Design string `json:"design"`

	N        int         `json:"n"`         // complete cases used
	NMissing int         `json:"n_missing"` // rows dropped because x, y (or group, order, a covariate) was missing
	Excluded []Exclusion `json:"excluded"`  // why rows were dropped, per column

	// LeftOut lists the rows the manifest left out on purpose (exclude),
	// at most MaxLeftOut of them, in data-row order; LeftOutMore counts the
	// rest. Subset is the where/subset expression and how many rows it left
	// out; nil when there is none. Both are applied before complete cases,
	// so NMissing counts only rows of the subset.
	LeftOut     []LeftOutRow `json:"left_out"`
	LeftOutMore int          `json:"left_out_more,omitempty"`
	Subset      *Subset      `json:"subset"`

	Moments        *Moments      `json:"moments"`
	Describe       *DescribePair `json:"describe"`
	Pearson        *Pearson      `json:"pearson"`
	Spearman       *Spearman     `json:"spearman"`
	Kendall        *Kendall      `json:"kendall"`
	Line           *Fit          `json:"line"`
	Models         []Fit         `json:"models"` // quadratic, then log transforms where the data allow
	Diagnostics    *Diagnostics  `json:"diagnostics"`
	Partial        []Partial     `json:"partial"`
	Groups         []GroupFit    `json:"groups"`
	Influence      *Influence    `json:"influence"`
	Sensitivity    *Sensitivity  `json:"sensitivity"`
	UnitInvariance []UnitRow     `json:"unit_invariance"`
	Predictions    []Prediction  `json:"predictions"`
	Findings       *Findings     `json:"findings"`
	// GroupLines compares the lines within the groups; nil without a group.
	GroupLines *GroupLines `json:"group_lines"`
	// Robust holds intervals for the slope and r that do not lean on the
	// ordinary ones' assumptions of independent rows with an even scatter.
	Robust *Robust `json:"robust"`
	// Approximations lists the figures of this study computed on a sample
	// or by an approximate method (at large n), each with its error;
	// empty when every figure is exact.
	Approximations []Approximation `json:"approximations"`
	// Kind is the manifest's study.kind ("relationship" or "agreement");
	// Agreement (agreement studies), ErrorCorrection (relationship studies
	// with gauge_sd or replicates) and Plan (every study that ran) are in
	// measure.go.
	Kind            string           `json:"kind,omitempty"`
	Agreement       *Agreement       `json:"agreement,omitempty"`
	ErrorCorrection *ErrorCorrection `json:"error_correction,omitempty"`
	Plan            *Plan            `json:"plan,omitempty"`
	// Pushdown is set when the study's rows stayed in the database (its
	// dataset gave more rows than max_rows): which figures the database
	// computed over every row, which come from its sample, and which were
	// not computed and why. nil for rows read into memory.
	Pushdown     *Pushdown     `json:"pushdown,omitempty"`
	Expectations []Expectation `json:"expectations"`
	Notes        string        `json:"notes,omitempty"` // Markdown from the manifest, rendered by the renderers
	Error        *string       `json:"error"`
	Plot         *Plot         `json:"-"` // what the charts draw (bounded); not in results.json

	// FlaggedCSV is the content of the CSV file named by Influence.File:
	// the rows flagged outlier, influential or sole support with all their
	// measures. It is not in results.json and renderers do not read it;
	// the command writes it beside the report. nil when no row is so
	// flagged.
	FlaggedCSV []byte `json:"-"`
}

// Exclusion counts rows dropped from a study because one column was missing there.
type Exclusion struct {
	Column string `json:"column"`
	Rows   int    `json:"rows"`
	Reason string `json:"reason"` // "missing", "non-numeric", or "missing or non-numeric" (a study with exclude or where, on a dataset with non_numeric = "missing")
}

// MaxLeftOut is the most rows a study lists by name in LeftOut: the report
// stays bounded.
const MaxLeftOut = 1000

// LeftOutRow is one row left out of a study by an exclude entry.
type LeftOutRow struct {
	Row    string `json:"row"`              // the id_column value, else the 1-based data row number
	Reason string `json:"reason"`           // as written in the manifest
	Level  string `json:"level"`            // "dataset" or "study": where the entry is
	Shared int    `json:"shared,omitempty"` // when the entry's row value names several rows: how many
}

// Subset is the row filter of a study: the dataset's subset and the
// study's where, ANDed, as written; Rows counts the rows it left out
// (among those not excluded), Missing those of them left out because a
// column it reads was missing, per column.
type Subset struct {
	Expression string        `json:"expression"`
	Rows       int           `json:"rows"`
	Missing    []ColumnCount `json:"missing"`
}

// Moments are the centred sums that let `bivar diff` test changes from the
// JSON alone: Sxx = Σ(x−x̄)², Syy = Σ(y−ȳ)², Sxy = Σ(x−x̄)(y−ȳ).
type Moments struct {
	N     int   `json:"n"`
	MeanX Float `json:"mean_x"`
	MeanY Float `json:"mean_y"`
	Sxx   Float `json:"sxx"`
	Syy   Float `json:"syy"`
	Sxy   Float `json:"sxy"`
}

// DescribePair holds the summaries of x and y over the study's complete cases.
type DescribePair struct {
	X Describe `json:"x"`
	Y Describe `json:"y"`
}

// Describe is a five-number summary with mean and SD. Quartiles by the
// definition stats.Quartiles names.
type Describe struct {
	N      int   `json:"n"`
	Mean   Float `json:"mean"`
	SD     Float `json:"sd"` // sample SD, n−1 denominator
	Min    Float `json:"min"`
	Q1     Float `json:"q1"`
	Median Float `json:"median"`
	Q3     Float `json:"q3"`
	Max    Float `json:"max"`
}

// Pearson is the product-moment correlation with its inference.
type Pearson struct {
	R         Float `json:"r"`
	R2        Float `json:"r2"`
	CILow     Float `json:"ci_low"` // Fisher-z interval at the manifest's confidence 1−alpha
	CIHigh    Float `json:"ci_high"`
	T         Float `json:"t"`
	DF        int   `json:"df"`
	P         Float `json:"p"`
	PAdjusted Float `json:"p_adjusted"` // after the manifest's `adjust` across all studies
}

// Spearman is the rank correlation with average ranks for ties.
type Spearman struct {
	Rho Float `json:"rho"`
	P   Float `json:"p"` // t approximation with n−2 df
}

// Kendall is τ-b with the tie-corrected normal approximation for p.
type Kendall struct {
	TauB Float `json:"tau_b"`
	P    Float `json:"p"`
}

// Coef is one coefficient of a least-squares fit.
type Coef struct {
	Name     string `json:"name"` // "intercept", "x", "x^2", "log(x)"
	Estimate Float  `json:"estimate"`
	SE       Float  `json:"se"`
	T        Float  `json:"t"`
	P        Float  `json:"p"`
	CILow    Float  `json:"ci_low"`
	CIHigh   Float  `json:"ci_high"`
}

// Fit is a least-squares model of y on functions of x. For the straight
// line, Intercept and Slope are set and Coefficients holds the same two.
type Fit struct {
	Name         string `json:"name"`    // "line", "quadratic", "log-x", "log-y", "log-log"
	Formula      string `json:"formula"` // e.g. "y = b0 + b1·x + b2·x²"
	Intercept    *Coef  `json:"intercept,omitempty"`
	Slope        *Coef  `json:"slope,omitempty"`
	Coefficients []Coef `json:"coefficients"`
	ResidualSE   Float  `json:"residual_se"`
	RSS          Float  `json:"rss"`
	R2           Float  `json:"r2"` // on the scale of the model's response (log y for log-y models)
	AdjR2        Float  `json:"adj_r2"`
	F            Float  `json:"f"`
	FP           Float  `json:"f_p"`
	DFResid      int    `json:"df_resid"`
	AIC          Float  `json:"aic"` // n·ln(RSS/n) + 2k, k = coefficients; comparable only between fits of the same response
	// Vertex is the x where a quadratic turns over (NaN for other fits).
	Vertex Float `json:"vertex"`
	// VertexNear: the turning point lies inside the observed x range or
	// within a quarter of its width beyond either end (VertexMargin); a
	// turning point farther out says nothing about these data and is not
	// shown.
	VertexNear bool `json:"vertex_near,omitempty"`
	// YScale is the scale of the response the fit was made on: "y", or
	// "ln(y)" for log-y and log-log. AIC and R² compare only fits on the
	// same scale.
	YScale string `json:"y_scale,omitempty"`
	// AICVsLine is AIC minus the straight line's AIC, and ShareVsLine the
	// share of the line's residual sum of squares the fit removes, 1 −
	// RSS/RSS_line: both only for fits on the line's y scale (the line
	// itself 0 and 0), NaN for the others.
	AICVsLine   Float `json:"aic_vs_line"`
	ShareVsLine Float `json:"share_vs_line"`
	// ExactToRounding, on the straight line only: the line leaves nothing
	// but the rounding of the numbers (its RSS at or below (16ε)²·Σy²,
	// ε = 2⁻⁵², the floor stats.NewLineInfluence takes for an exact fit),
	// so no check that reads its residuals (bend, lack of fit, changing
	// spread, their order in x or in run order) has anything to read.
	ExactToRounding bool `json:"exact_to_rounding,omitempty"`
}

// VertexMargin is how far beyond the observed x range, as a share of its
// width, a quadratic's turning point still counts as near the data (a
// choice of this tool, not a standard).
const VertexMargin = 0.25

// Diagnostics are the tests of form, spread and order.
type Diagnostics struct {
	QuadraticP   Float         `json:"quadratic_p"` // t-test of the x² term
	LackOfFit    *LackOfFit    `json:"lack_of_fit"` // nil unless x repeats: at most n/2 distinct settings (see analysis.diagnostics)
	DistanceCorr *DistanceCorr `json:"distance_corr"`
	BreuschPagan *ChiTest      `json:"breusch_pagan"` // Koenker's studentized form, n·R² of e² on x
	// DurbinWatson is the statistic of the residuals in run order, averaged
	// over the orders of rows whose run order ties (stats.DurbinWatsonTied);
	// in file order when there is no `order` (no verdict reads it then).
	DurbinWatson Float       `json:"durbin_watson"`
	OrderTrend   *OrderTrend `json:"order_trend"` // nil when no `order`
	Resistant    *Resistant  `json:"resistant"`
	Lowess       *LowessInfo `json:"lowess"`

	// DurbinWatsonX is the Durbin–Watson statistic of the line's residuals
	// taken in order of x, averaged over every order of rows whose x ties
	// (stats.DurbinWatsonTied), on all rows up to 20000 and above that on
	// a sample of 20000 chosen by the rows' values, so it depends on the set
	// of rows and not on the file's order or a seed (DurbinWatsonXRows says
	// how many rows). The form verdict reads it. NaN below 8 rows.
	DurbinWatsonX     Float `json:"durbin_watson_x"`
	DurbinWatsonXRows int   `json:"durbin_watson_x_rows"`
	// SpreadRho is Spearman's ρ of |residual| on x over the same rows: its
	// sign says whether a changing spread (Breusch–Pagan) grows or shrinks
	// with x. NaN below 3 rows.
	SpreadRho Float `json:"spread_rho"`
}

// LackOfFit is the pure-error F test for the straight line where x repeats.
type LackOfFit struct {
	F   Float `json:"f"`
	DF1 int   `json:"df1"`
	DF2 int   `json:"df2"`
	P   Float `json:"p"`
	// NoPureError: x repeats as the test needs, but y takes one value in
	// every repeat, so there is no scatter among repeats to weigh the
	// settings' means against: F and P are NaN and the test is not made.
	NoPureError bool `json:"no_pure_error,omitempty"`
}

// DistanceCorr is Székely's distance correlation with a permutation p.
type DistanceCorr struct {
	DCor         Float  `json:"dcor"`
	P            Float  `json:"p"`
	Permutations int    `json:"permutations"` // permutations drawn (the sequential rule stops early when p is clearly on one side of alpha)
	Sampled      int    `json:"sampled"`      // rows tested (above the stated bound, a sample chosen by the rows' values; = n otherwise)
	Method       string `json:"method"`
	// MCError is the Monte Carlo standard error of P, √(p(1 − p)/permutations).
	MCError Float `json:"mc_error"`
	// Resolved: the sequential rule settled on which side of alpha the
	// exact permutation p lies, with a chance below FlipRisk of being wrong
	// (so another random stream would give the same verdict); false when
	// the last look still left p within Monte Carlo error of alpha.
	Resolved bool    `json:"resolved"`
	FlipRisk float64 `json:"flip_risk"` // the rule's bound on that chance (0.001)
}

// ChiTest is a chi-squared test statistic.
type ChiTest struct {
	Stat Float `json:"stat"`
	DF   int   `json:"df"`
	P    Float `json:"p"`
}

// OrderTrend is the least-squares slope of the residuals on run order.
type OrderTrend struct {
	Slope Float `json:"slope"` // residual units per unit of order
	P     Float `json:"p"`
	R     Float `json:"r"` // correlation of residuals with order
}

// Resistant is the resistant line used for comparison with least squares.
type Resistant struct {
	Method    string `json:"method"` // "theil-sen (exact)" or the stated approximation
	Slope     Float  `json:"slope"`
	Intercept Float  `json:"intercept"`
	Pairs     int    `json:"pairs,omitempty"` // pairs sampled for the slope; absent when every pair was used
}

// LowessInfo records the smoother's settings.
type LowessInfo struct {
	Frac       float64 `json:"frac"`
	Iterations int     `json:"iterations"`
	Delta      float64 `json:"delta"`
	Sampled    int     `json:"sampled"` // rows the curve was fitted to (a seeded sample above the stated bound; = n otherwise)

	// The smooth curve's first and last points (in order of x) and its
	// highest and lowest points (the first of equal ones), which the
	// turn-over rule of the findings reads; NaN when the curve has fewer
	// than 3 points.
	FirstX Float `json:"first_x"`
	FirstY Float `json:"first_y"`
	LastX  Float `json:"last_x"`
	LastY  Float `json:"last_y"`
	MaxX   Float `json:"max_x"`
	MaxY   Float `json:"max_y"`
	MinX   Float `json:"min_x"`
	MinY   Float `json:"min_y"`
}

// Partial is the correlation of x and y given one covariate.
type Partial struct {
	Covariate string `json:"covariate"`
	Label     string `json:"label"` // the covariate for people: its [dataset.labels] entry, else the column name
	N         int    `json:"n"`
	R         Float  `json:"r"`
	CILow     Float  `json:"ci_low"`
	CIHigh    Float  `json:"ci_high"`
	P         Float  `json:"p"`
}

// GroupFit is the straight line within one level of `group`.
type GroupFit struct {
	Group     string `json:"group"`
	N         int    `json:"n"`
	R         Float  `json:"r"`
	Slope     Float  `json:"slope"`
	Intercept Float  `json:"intercept"`
	SlopeLow  Float  `json:"slope_ci_low"`
	SlopeHigh Float  `json:"slope_ci_high"`
}

// Influence summarises the straight line's influence measures. It is
// bounded whatever n is: the rows it names are at most NamedMax, and every
// other flagged row is only counted (the CSV file File lists them all).
type Influence struct {
	MaxCooksD   Float  `json:"max_cooks_d"`
	MaxCooksRow string `json:"max_cooks_row"`

	Rules  FlagCuts   `json:"rules"`  // the cut points the flags rest on, for this study's n
	Counts FlagCounts `json:"counts"` // rows per flag, over every complete case

	// NamedMax is the most rows a study names (the manifest's
	// [output] named_rows); Ranking says in which order the rows that may
	// be named are ranked before the first NamedMax are kept.
	NamedMax int    `json:"named_max"`
	Ranking  string `json:"ranking"`

	// Points are the named rows: the rows flagged outlier, influential or
	// sole support, ranked by Ranking, at most NamedMax. A row only of
	// high leverage (far out in x, on the line: good data) is counted in
	// Counts, never named.
	Points []Point `json:"points"`

	// File is the name of the CSV file written beside the report that
	// lists the rows flagged outlier, influential or sole support with all
	// their measures, ranked by Ranking ("" when no row is); FileRows is
	// the number of rows in it: Counts.Suspect, or the first
	// analysis.FlaggedFileMax when more rows are. Rows only of high
	// leverage are counted, not listed.
	File     string `json:"file"`
	FileRows int    `json:"file_rows"`
}

// Point is one named row.
type Point struct {
	Row            string   `json:"row"`   // id_column value, or the data row number (1 = first row after the header)
	Index          int      `json:"index"` // 0-based position among the study's complete cases; −1 for a row left in the database (report.Pushdown)
	X              Float    `json:"x"`
	Y              Float    `json:"y"`
	Leverage       Float    `json:"leverage"`
	Studentized    Float    `json:"studentized"`     // internally studentized residual
	StudentizedExt Float    `json:"studentized_ext"` // externally studentized (deleted) residual
	CooksD         Float    `json:"cooks_d"`
	DFFITS         Float    `json:"dffits"`
	Flags          []string `json:"flags"` // "outlier", "high-leverage", "influential", "sole-support" (leverage 1)
}

// FlagCuts are the cut points of the flags for one study.
type FlagCuts struct {
	Leverage Float `json:"leverage"` // high leverage when h exceeds this (leverage_factor·2/n); null when the rule is off
	Outlier  Float `json:"outlier"`  // outlier when |externally studentized residual| exceeds this (outlier_z, or the Bonferroni bound when larger)
	CooksD   Float `json:"cooks_d"`  // influential when Cook's distance exceeds this (the cooks_d quantile of F(2, n−2))
}

// FlagCounts counts the study's rows by flag; a row with two flags counts
// under both.
type FlagCounts struct {
	Flagged      int `json:"flagged"`       // rows with any flag
	Outlier      int `json:"outlier"`       // rows flagged outlier
	HighLeverage int `json:"high_leverage"` // rows flagged high-leverage (including those with other flags)
	Influential  int `json:"influential"`   // rows flagged influential
	SoleSupport  int `json:"sole_support"`  // rows of sole support (leverage 1)
	Suspect      int `json:"suspect"`       // rows flagged outlier, influential or sole support: the rows that may be named
	LeverageOnly int `json:"leverage_only"` // rows of high leverage and nothing else: counted, not named
	Named        int `json:"named"`         // rows named in Points (at most NamedMax)
}

// Sensitivity says how much the line depends on single rows.
type Sensitivity struct {
	LooRMin             Float     `json:"loo_r_min"`
	LooRMinRow          string    `json:"loo_r_min_row"`
	LooRMax             Float     `json:"loo_r_max"`
	LooRMaxRow          string    `json:"loo_r_max_row"`
	LooSlopeMin         Float     `json:"loo_slope_min"`
	LooSlopeMax         Float     `json:"loo_slope_max"`
	NFlagged            int       `json:"n_flagged"`
	RWithoutFlagged     Float     `json:"r_without_flagged"`
	RWithoutLow         Float     `json:"r_without_flagged_ci_low"`
	RWithoutHigh        Float     `json:"r_without_flagged_ci_high"`
	PWithoutFlagged     Float     `json:"p_without_flagged"`
	SlopeWithoutFlagged Float     `json:"slope_without_flagged"`
	InterceptWithout    Float     `json:"intercept_without_flagged"`
	ResistantSlope      Float     `json:"resistant_slope"`
	ResistantIntercept  Float     `json:"resistant_intercept"`
	WithoutEach         []Without `json:"without_each"` // one row per named row (Influence.Points), in the same order
}

// Without is the line refitted without one row.
type Without struct {
	Row       string `json:"row"`
	R         Float  `json:"r"`
	Slope     Float  `json:"slope"`
	Intercept Float  `json:"intercept"`
}

// UnitRow is r, slope and intercept with x and y in given units.
type UnitRow struct {
	XUnit     string `json:"x_unit"`
	YUnit     string `json:"y_unit"`
	Swapped   bool   `json:"swapped"` // x and y exchanged: r stays, slope does not
	R         Float  `json:"r"`
	Slope     Float  `json:"slope"`
	Intercept Float  `json:"intercept"`
	Note      string `json:"note,omitempty"` // why the row's numbers are undefined (a unit that does not convert)

	// XSymbol and YSymbol are XUnit and YUnit as people write them (units.Symbol).
	XSymbol string `json:"x_symbol"`
	YSymbol string `json:"y_symbol"`
}

// Prediction is the line's mean response and a new observation at one x.
type Prediction struct {
	X        Float `json:"x"`
	Fit      Float `json:"fit"`
	ConfLow  Float `json:"conf_low"` // mean response, confidence 1−alpha
	ConfHigh Float `json:"conf_high"`
	PredLow  Float `json:"pred_low"` // one new unit, confidence 1−alpha
	PredHigh Float `json:"pred_high"`
	InRange  bool  `json:"in_range"` // x inside the observed range; outside, no prediction is supported
}

// Findings are the verdicts in words.
type Findings struct {
	Form          string  `json:"form"`       // linear | curved | nonlinear | none
	Bend          *string `json:"bend"`       // bends-up | bends-down, for curved
	TurnsOver     bool    `json:"turns_over"` // the curve's vertex lies inside the observed x range
	TurnX         Float   `json:"turn_x"`
	Direction     string  `json:"direction"`      // positive | negative | none
	Strength      string  `json:"strength"`       // strong | moderate | weak | none, from |r|
	CurveStrength string  `json:"curve_strength"` // from the curve's own R² where curved, else ""
	OutlierDriven bool    `json:"outlier_driven"`
	Reversal      bool    `json:"reversal"`       // direction within groups opposes the pooled direction
	Drift         bool    `json:"drift"`          // residual trend or autocorrelation in run order
	SpreadChanges bool    `json:"spread_changes"` // Breusch–Pagan significant

	// FormWhy, DirectionWhy and StrengthWhy each say in one sentence, with
	// its figures, which rule decided the verdict of the same name (for
	// example why the direction is none: r not shown at alpha, or a curve
	// that turns over). Renderers show these rather than a reason of their
	// own.
	FormWhy      string `json:"form_why"`
	DirectionWhy string `json:"direction_why"`
	StrengthWhy  string `json:"strength_why"`

	Headline   string   `json:"headline"`
	Statements []string `json:"statements"`
	Limits     []string `json:"limits"`

	// ExplainedBy lists the covariates given which the association is no
	// longer shown (partial r's interval includes 0, or it turns sign).
	ExplainedBy []string `json:"explained_by"`

	// Lines says whether one line serves all levels of the group: "" without
	// a group; "untested" when fewer than two levels can be compared, or
	// when the lines within them leave no scatter (the F tests undefined);
	// "one-line" when the test that one line serves all levels
	// (GroupLines.LinesP) is not below alpha; "parallel" when it is but the
	// slopes do not differ clearly (SlopesP not below alpha: the levels are
	// shifted, with a common slope); "separate" when the slopes differ.
	Lines string `json:"lines"`
	// LevelsShown are the group's levels the report's table of the lines
	// within levels shows, in the order it shows them, where the study has
	// more levels than a reader can take in (findings.LevelsShownMax);
	// LevelsShownWhy says which they are. Both empty when every level is
	// shown; LevelsShown empty with LevelsShownWhy set when no level has
	// a line of its own (the table is then left out). Every level's line
	// stays in Groups.
	LevelsShown    []string `json:"levels_shown,omitempty"`
	LevelsShownWhy string   `json:"levels_shown_why,omitempty"`
	// Autocorrelated: with a run order, the line's residuals hang together
	// in it (their Durbin–Watson statistic's one-sided p, Checks
	// "drift-dw", below alpha, or drift raised): p-values and intervals that
	// assume independent rows are then too optimistic, and the study's
	// Robust HAC interval and effective n allow for it.
	Autocorrelated bool `json:"autocorrelated"`
	// CurveShare is the share of the straight line's residual sum of
	// squares that the quadratic removes (the curve rule reads it against
	// Thresholds.CurveShare); NaN without a quadratic.
	CurveShare Float `json:"curve_share"`
	// Rows says what leaving out the rows flagged as outliers, influential
	// or of sole support does to the verdict: "" when no row is flagged or
	// r cannot be recomputed without them; "stands" (same direction and
	// strength grade), "stronger" (same direction, a higher grade: the rows
	// hide some of the relationship), "within-interval" (a lower grade, but
	// r without them inside r's interval), "weaker" (a lower grade, r
	// without them outside r's interval), "direction-changes" (another
	// direction, or none), "hides-relationship" (no direction with them,
	// one without), "undefined" (r cannot be computed without them).
	Rows string `json:"rows"`
	// Checks are the tests the verdicts read, each with every number it
	// rests on: p raw and after Holm's adjustment within the study.
	Checks []Check `json:"checks"`
	// Reasons say, for each secondary verdict that is raised (outlier
	// driven, reversal, explained by, drift, spread changes, groups'
	// lines), which rule decided it, with its figures: the sentence a
	// renderer shows beside the verdict.
	Reasons []Reason `json:"reasons"`
}

// Check is one test that a verdict reads.
type Check struct {
	// Name: curvature | lack-of-fit | changing-spread | drift (the run-order
	// check: its P is the smaller of drift-trend's and drift-dw's, doubled)
	// | drift-trend | drift-dw | distance-correlation | x-order-dw.
	Name string `json:"name"`
	Stat Float  `json:"stat"` // the statistic: x² t, lack-of-fit F, Breusch–Pagan χ², Durbin–Watson, residual trend slope, dcor
	P    Float  `json:"p"`    // its p (one-sided for drift-dw); NaN where the rule reads no p
	// PAdjusted is P after Holm's adjustment over the study's screens
	// (curvature, lack-of-fit, changing-spread, drift); = P for a check
	// read unadjusted or as part of another; NaN where P is.
	PAdjusted Float `json:"p_adjusted"`
	Bound     Float `json:"bound"`    // the cut point Stat is compared with, where the rule has one (NaN otherwise)
	Raised    bool  `json:"raised"`   // the check fired by its own rule
	Adjusted  bool  `json:"adjusted"` // PAdjusted comes from Holm's adjustment within the study
}

// Reason is the sentence of the rule that raised one secondary verdict.
type Reason struct {
	Verdict string `json:"verdict"` // outlier_driven | reversal | explained_by | drift | spread_changes | groups_differ
	Topic   string `json:"topic"`   // for people: Influence, Groups, Covariates, Run order, Spread
	Why     string `json:"why"`
}

// Approximation is one figure computed on a sample or approximately.
type Approximation struct {
	Figure string `json:"figure"` // what: "LOWESS curve", "Theil–Sen slope", …
	Rows   int    `json:"rows"`   // rows (or pairs, see Method) it was computed on
	Of     int    `json:"of"`     // the study's rows
	Method string `json:"method"` // how the sample was drawn
	Error  string `json:"error"`  // its error against the exact method, and where that figure comes from
}

// Pushdown describes a study computed in the database.
type Pushdown struct {
	Rows   int      `json:"rows"`   // rows of the dataset's query
	Limit  int      `json:"limit"`  // the dataset's max_rows, exceeded
	Sample int      `json:"sample"` // rows in the sample the sampled figures rest on
	Method string   `json:"method"` // how the database drew the sample
	Exact  []string `json:"exact"`  // figures computed over every complete case (by the database; those of the sample too when it holds every complete case)
	// Sampled lists the figures computed on the sample (Approximations
	// gives each with its error).
	Sampled []string   `json:"sampled"`
	Omitted []Omission `json:"omitted"`
	// Statements are the SQL statements run, in order.
	Statements []string `json:"statements"`
}

// Omission is a figure a study does not have, and why.
type Omission struct {
	Figure string `json:"figure"`
	Why    string `json:"why"`
}

// Expectation is one CI gate from [study.expect] and its outcome.
type Expectation struct {
	Name string `json:"name"` // the manifest key: direction, form, min_abs_r, r_within, slope_within, max_p, min_n, not_outlier_driven
	// Title names the gate in words for reviewers ("slope within its
	// limits"); the key stays in Name for the manifest's author.
	Title  string `json:"title,omitempty"`
	Want   string `json:"want"`
	Got    string `json:"got"`
	OK     bool   `json:"ok"`
	Detail string `json:"detail"`
	// Limits are the declared [low, high] of r_within and slope_within
	// (slope in y units per x unit), so that a comparison of two runs can
	// set a change against them; nil for the other gates.
	Limits *Limits `json:"limits,omitempty"`
}

// Limits is a gate's declared range, both ends included.
type Limits struct {
	Low  Float `json:"low"`
	High Float `json:"high"`
}

// PlotPointsMax is the most rows a Plot carries one by one; above it the
// point clouds are density grids ("a few thousand": an SVG of that many
// marks stays under a few hundred kB).
const PlotPointsMax = 3000

// LabelMax is the most named rows a chart labels; the rest of the named
// rows are marked without a label.
const LabelMax = 10

// Plot is what the charts draw, computed by the analysis so renderers draw
// without computing. It is bounded whatever n is: at most PlotPointsMax
// points, else fixed-size density grids, and at most NamedMax marked rows.
type Plot struct {
	N int // rows behind the point clouds (the study's complete cases)

	// Points holds every row when N ≤ PlotPointsMax, in run order when
	// the study has one (ties by x, then y), else in order of x, then y;
	// nil above PlotPointsMax, where the grids stand in for them.
	Points []PlotPoint
	// Levels are the group levels in sorted order (PlotPoint.Group indexes
	// them); nil when the study has no group.
	Levels []string
	// LevelCounts is the number of rows in each level and LevelXMin,
	// LevelXMax the range of x within it, parallel to Levels.
	LevelCounts          []int
	LevelXMin, LevelXMax []float64

	// Above PlotPointsMax: the rows binned on fixed grids, y against x,
	// residual against x and residual against run order (nil without an
	// order). nil at or below PlotPointsMax.
	Scatter, ResidX, ResidOrder *Grid
	// ResidualsOf says which fit the residuals above (and those of Points
	// and Marked) are taken from: "line", or "curve" when the form is
	// curved and the quadratic is the main fit (assess puts the curve's in
	// place from CurveResid*, CFitted and CResidual).
	ResidualsOf string
	// The quadratic's residuals, binned like ResidX and ResidOrder above
	// PlotPointsMax; nil without a quadratic.
	CurveResidX, CurveResidOrder *Grid

	Band   []BandPoint
	Lowess []XY // LOWESS curve, sorted by x
	Curve  []XY // the curved model (quadratic) on a grid, when the form is curved

	// Marked are the named rows (Influence.Points), in the same order; a
	// chart labels those with Label set (the first LabelMax) and marks the
	// rest without a label.
	Marked []Marked
}

// PlotPoint is one row as the charts draw it.
type PlotPoint struct {
	X, Y, Fitted, Residual float64
	CFitted, CResidual     float64 // the quadratic's; NaN without one
	Order                  float64 // run order; NaN when the study has none
	Group                  int     // index into Plot.Levels; 0 when no group
}

// Marked is one named row as the charts draw it.
type Marked struct {
	Row                    string
	X, Y, Fitted, Residual float64
	CFitted, CResidual     float64 // the quadratic's; NaN without one
	Order                  float64 // NaN when the study has no order
	Label                  bool
}

// Grid counts rows in NX × NY equal cells over [XLo, XHi] × [YLo, YHi];
// Counts[j*NX+i] is the cell i-th from the left and j-th from the bottom.
// A value on the upper edge falls in the last cell.
type Grid struct {
	XLo, XHi, YLo, YHi float64
	NX, NY             int
	Counts             []int
}

// BandPoint is the line with its confidence and prediction bands at one x.
type BandPoint struct {
	X, Fit, ConfLow, ConfHigh, PredLow, PredHigh float64
}

// XY is one point of a curve.
type XY struct{ X, Y float64 }

// Robust holds the slope's intervals by heteroscedasticity-consistent
// (HC3) and, with a run order, heteroscedasticity-and-autocorrelation-
// consistent (Newey–West) standard errors, and r with Bartlett's effective
// sample size. Intervals use normal quantiles, as large-sample results.
type Robust struct {
	HC3 *SlopeInterval `json:"hc3"`
	HAC *SlopeInterval `json:"hac"` // nil without `order`
	// Rho1X and Rho1E are the lag-1 autocorrelations in run order of x and
	// of the line's residuals (standing for y: see analysis.robust);
	// NEff = n(1 − ρx ρy)/(1 + ρx ρy), capped at n (Bartlett);
	// RP, RLow and RHigh are r's p and interval with NEff in place of n.
	// All NaN without `order`.
	Rho1X Float `json:"rho1_x"`
	Rho1E Float `json:"rho1_residual"`
	NEff  Float `json:"n_eff"`
	RP    Float `json:"r_p"`
	RLow  Float `json:"r_ci_low"`
	RHigh Float `json:"r_ci_high"`
}

// SlopeInterval is the least-squares slope's standard error by one method,
// with its interval and two-sided p (normal).
type SlopeInterval struct {
	Method string `json:"method"`
	Lags   int    `json:"lags"` // Newey–West lags (Bartlett kernel); 0 for HC3
	SE     Float  `json:"se"`
	CILow  Float  `json:"ci_low"`
	CIHigh Float  `json:"ci_high"`
	P      Float  `json:"p"`
}

// GroupLines compares the straight lines fitted within the levels of the
// group (stats.CompareGroupLines; levels with fewer than 3 rows or a
// constant x are left out).
type GroupLines struct {
	Groups    int   `json:"groups"`   // levels compared
	N         int   `json:"n"`        // rows in them
	SlopesF   Float `json:"slopes_f"` // F test that the slopes are equal (group × x interaction)
	SlopesDF1 int   `json:"slopes_df1"`
	SlopesP   Float `json:"slopes_p"`
	LinesF    Float `json:"lines_f"` // F test that one line serves all levels
	LinesDF1  int   `json:"lines_df1"`
	LinesP    Float `json:"lines_p"`
	DF2       int   `json:"df2"`      // residual df of a line per level, N − 2·Groups
	RWithin   Float `json:"r_within"` // pooled within-group correlation
	RWithinDF int   `json:"r_within_df"`
	RWithinP  Float `json:"r_within_p"`
}
