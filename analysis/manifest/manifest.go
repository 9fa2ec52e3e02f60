// Package manifest defines bivar's TOML manifest: its schema as Go types,
// decoding with BurntSushi/toml, validation, and the defaults (all in the
// Default… constants and functions in this file, the one place they are
// written down).
//
// Load checks every key against the schema with its exact spelling (the
// TOML decoder alone matches keys case-insensitively and ignores unknown
// ones), checks value types, then decodes into the types below and
// validates the values. It reports every problem it finds, not only the
// first, each as an *Error naming the manifest file, line and column.
package manifest

// Manifest is a decoded and validated manifest. Paths in Dataset.File are
// absolute after Load (resolved against the manifest's folder); Dir is that
// folder.
type Manifest struct {
	Path string `toml:"-"` // the file as given
	Dir  string `toml:"-"` // its folder; relative paths are resolved against it

	Title      string     `toml:"title"`
	Design     string     `toml:"design"` // observational | designed-experiment | randomized-experiment
	Alpha      float64    `toml:"alpha"`
	Adjust     string     `toml:"adjust"` // holm | bh | none
	Seed       uint64     `toml:"seed"`   // seed for permutation tests and samples
	Output     Output     `toml:"output"`
	Thresholds Thresholds `toml:"thresholds"`
	Datasets   []Dataset  `toml:"dataset"`
	Studies    []Study    `toml:"study"`
}

// Output chooses where and what `bivar run` writes.
type Output struct {
	Dir     string   `toml:"dir"`     // relative to the manifest's folder
	Formats []string `toml:"formats"` // html, markdown, json
	Theme   string   `toml:"theme"`   // a theme name from themes/

	// NamedRows is the most flagged rows a study names in the report
	// (the rest are counted and listed in a CSV file beside it).
	NamedRows int `toml:"named_rows"`
}

// Thresholds override the findings' cut points; nil keeps the default.
type Thresholds struct {
	Strong           *float64 `toml:"strong"`
	Moderate         *float64 `toml:"moderate"`
	Weak             *float64 `toml:"weak"`
	LeverageFactor   *float64 `toml:"leverage_factor"`
	OutlierZ         *float64 `toml:"outlier_z"`
	CooksD           *float64 `toml:"cooks_d"`
	CurveShare       *float64 `toml:"curve_share"`
	NonlinearDcor    *float64 `toml:"nonlinear_dcor"`
	ReversalMinGroup *int     `toml:"reversal_min_group"`

	// OutlierFamilyAlpha is the family-wise level of the outliers'
	// Bonferroni bound, in [0, 1); 0 turns the bound off.
	OutlierFamilyAlpha *float64 `toml:"outlier_family_alpha"`
	// DriftDW and FormDW are Durbin–Watson cut points, in [0, 2); 0 turns
	// the rule off (see findings.DefaultThresholds).
	DriftDW *float64 `toml:"drift_dw"`
	FormDW  *float64 `toml:"form_dw"`
}

// Dataset declares one CSV file.
type Dataset struct {
	ID        string `toml:"id"`
	File      string `toml:"file"`
	Delimiter string `toml:"delimiter"` // "," ";" "\t" or "" to detect
	Decimal   string `toml:"decimal"`   // "." or ","; "" means "." (or "," when the delimiter is ";" and cells show it)
	// Thousands is the separator between groups of three digits that the
	// file's numbers are written with ("1,234.5"), one of Thousands(); ""
	// means none is accepted. "," implies a decimal point and "." a decimal
	// comma; it may not equal decimal.
	Thousands string   `toml:"thousands"`
	Missing   []string `toml:"missing"` // cells read as missing
	// NonNumeric says what a non-numeric cell in a numeric column is:
	// "error" (default) or "missing".
	NonNumeric string            `toml:"non_numeric"`
	IDColumn   string            `toml:"id_column"` // names rows in the report; default: data row number
	Units      map[string]string `toml:"units"`     // column -> UCUM unit code
	Labels     map[string]string `toml:"labels"`    // column -> label for people
	// Limits on reading the file; nil (left out) means the reader's
	// default: dataset.DefaultMaxRows, DefaultMaxBytes, DefaultMaxLevels.
	MaxRows   *int `toml:"max_rows"`   // most data rows
	MaxBytes  *int `toml:"max_bytes"`  // largest file, in bytes
	MaxLevels *int `toml:"max_levels"` // most distinct values in a study's group column

	// Excel workbooks (file ending .xlsx or .xlsm): the sheet, by name or
	// 1-based number (default: the first), and the 1-based row naming the
	// columns (nil: the first non-empty row).
	Sheet     Sheet `toml:"sheet"`
	HeaderRow *int  `toml:"header_row"`

	// PostgreSQL: Query (a SELECT), or Table with an optional Where filter,
	// instead of File; Connection names the environment variable holding
	// the connection URL (never the URL itself); StatementTimeout bounds
	// the query's run time, a Go duration such as "60s" (default
	// DefaultStatementTimeout).
	Query            string `toml:"query"`
	Table            string `toml:"table"`
	Where            string `toml:"where"`
	Connection       string `toml:"connection"`
	StatementTimeout string `toml:"statement_timeout"`

	// Exclude leaves rows out of every study of the dataset, each with a
	// reason; Subset keeps only the rows where its expression holds (see
	// ParseExpr; `where` is the SQL filter of a table). SubsetExpr is
	// Subset parsed by Load.
	Exclude    []Exclusion `toml:"exclude"`
	Subset     string      `toml:"subset"`
	SubsetExpr *Expr       `toml:"-"`

	Line int `toml:"-"` // line of the [[dataset]] header, for messages
}

// Exclusion is one row left out on purpose: by its id_column value (Row)
// or its 1-based data row number (DataRow), with the reason why. Line and
// Col are where the entry is in the manifest, for messages.
type Exclusion struct {
	Row     string `toml:"row"`
	DataRow int    `toml:"data_row"`
	Reason  string `toml:"reason"`

	Line, Col int `toml:"-"`
}

// DefaultStatementTimeout is a query's time limit when statement_timeout is
// left out: long enough for a scan of tens of millions of rows on a plant
// server, short enough that a query without the filter meant (a scan of
// years of history) stops before it burdens a production database.
const DefaultStatementTimeout = "60s"

// IsDatabase says the dataset is read from PostgreSQL (query or table).
func (d *Dataset) IsDatabase() bool { return d.Query != "" || d.Table != "" }

// Sheet names a workbook's sheet: sheet = "October" or sheet = 2.
type Sheet struct {
	Name   string // "" when given by number
	Number int    // 1-based; 0 when given by name or left out
}

// UnmarshalTOML accepts a string or a whole number. Load has already
// checked the type.
func (s *Sheet) UnmarshalTOML(v any) error {
	switch v := v.(type) {
	case string:
		s.Name = v
	case int64:
		s.Number = int(v)
	}
	return nil
}

// IsSet says a sheet was named.
func (s Sheet) IsSet() bool { return s.Name != "" || s.Number != 0 }

// Study declares one variable pair.
type Study struct {
	ID         string    `toml:"id"`
	Title      string    `toml:"title"`
	Dataset    string    `toml:"dataset"`
	X          string    `toml:"x"`
	Y          string    `toml:"y"`
	Group      string    `toml:"group"`
	Order      string    `toml:"order"`
	Covariates []string  `toml:"covariates"`
	AlsoIn     AlsoIn    `toml:"also_in"`
	PredictAt  []float64 `toml:"predict_at"`
	Notes      string    `toml:"notes"`
	Expect     *Expect   `toml:"expect"`

	// Kind is what the study asks of x and y (see Kinds, measure.go);
	// Defaults fill it with KindRelationship. The keys after it belong to
	// measurement: replicate readings, a gauge's repeatability, agreement
	// of two methods and the planning of the next run.
	Kind        string     `toml:"kind"`
	XReplicates []string   `toml:"x_replicates"`
	YReplicates []string   `toml:"y_replicates"`
	GaugeSD     *GaugeSD   `toml:"gauge_sd"`
	Agreement   *Agreement `toml:"agreement"`
	Plan        *Plan      `toml:"plan"`

	// Design is how this study's data arose, when it differs from the
	// manifest's design (in a randomized experiment only the randomized
	// factor is a randomized x); "" takes the manifest's. Defaults fill it.
	Design string `toml:"design"`

	// Exclude and Where leave rows out of this study only, on top of its
	// dataset's exclude and subset (Where is ANDed with the subset).
	Exclude   []Exclusion `toml:"exclude"`
	Where     string      `toml:"where"`
	WhereExpr *Expr       `toml:"-"`

	// XScale and YScale put x and y on a transformed scale before the
	// study runs (one of Scales(); "" or "linear": as recorded): every
	// figure of the study is then of the transformed values. XScaleAt and
	// YScaleAt are where the keys are written, for messages about the data.
	XScale   string `toml:"x_scale"`
	YScale   string `toml:"y_scale"`
	XScaleAt Pos    `toml:"-"`
	YScaleAt Pos    `toml:"-"`

	Line int `toml:"-"` // line of the [[study]] header, for messages
}

// Pos is a place in the manifest: 1-based line and column, 0 when unknown.
type Pos struct{ Line, Col int }

// AlsoIn lists other units to express x and y in, for the unit-invariance
// table. Each may be one unit code or a list.
type AlsoIn struct {
	X []string `toml:"x"`
	Y []string `toml:"y"`
}

// UnmarshalTOML accepts x and y as one string or a list of strings. Load has
// already checked the value types and the keys, so anything else is ignored
// here.
func (a *AlsoIn) UnmarshalTOML(v any) error {
	m, _ := v.(map[string]any)
	a.X = stringOrList(m["x"])
	a.Y = stringOrList(m["y"])
	return nil
}

func stringOrList(v any) []string {
	switch v := v.(type) {
	case string:
		return []string{v}
	case []any:
		out := make([]string, 0, len(v))
		for _, e := range v {
			if s, ok := e.(string); ok {
				out = append(out, s)
			}
		}
		return out
	}
	return nil
}

// Expect are the study's CI gates; nil fields are not checked.
type Expect struct {
	Direction        string    `toml:"direction"` // positive | negative | none
	Form             string    `toml:"form"`      // linear | curved | nonlinear | none
	MinAbsR          *float64  `toml:"min_abs_r"`
	RWithin          []float64 `toml:"r_within"`     // [low, high]
	SlopeWithin      []float64 `toml:"slope_within"` // [low, high], recorded units
	MaxP             *float64  `toml:"max_p"`        // on the adjusted p
	MinN             *int      `toml:"min_n"`
	NotOutlierDriven *bool     `toml:"not_outlier_driven"`
	// Agree (agreement studies): true asks that both limits of agreement,
	// with their confidence intervals, lie inside ±agreement.acceptable.
	Agree *bool `toml:"agree"`

	Line int `toml:"-"`
}

// Defaults: the values a manifest gets for the keys it leaves out. They are
// written down here and nowhere else; the finding thresholds' defaults are
// findings.DefaultThresholds.
const (
	DefaultDesign     = "observational" // design
	DefaultAlpha      = 0.05            // alpha
	DefaultAdjust     = "holm"          // adjust
	DefaultSeed       = 20261201        // seed
	DefaultOutputDir  = "report"        // output.dir, relative to the manifest's folder
	DefaultTheme      = "paper"         // output.theme
	DefaultNamedRows  = 25              // output.named_rows
	MaxNamedRows      = 1000            // output.named_rows at most: the report stays bounded
	DefaultNonNumeric = "error"         // dataset.non_numeric
)

// DefaultFormats is output.formats when left out: every format.
func DefaultFormats() []string { return []string{"html", "markdown", "json"} }

// DefaultMissing is dataset.missing when left out: an empty cell or NA.
func DefaultMissing() []string { return []string{"", "NA"} }

// The allowed values of the keys that take one word from a list. Each
// function returns a fresh slice, in the order the messages list them.

// Designs are the values of design: they choose what the report may say
// about cause.
func Designs() []string {
	return []string{"observational", "designed-experiment", "randomized-experiment"}
}

// Adjustments are the values of adjust: Holm's step-down family-wise
// method, Benjamini–Hochberg false discovery rate, or none.
func Adjustments() []string { return []string{"holm", "bh", "none"} }

// Formats are the values of output.formats.
func Formats() []string { return []string{"html", "markdown", "json"} }

// NonNumericPolicies are the values of dataset.non_numeric.
func NonNumericPolicies() []string { return []string{"error", "missing"} }

// Decimals are the values of dataset.decimal ("" or left out: detect).
func Decimals() []string { return []string{".", ","} }

// Delimiters are the values of dataset.delimiter ("" or left out: detect).
func Delimiters() []string { return []string{",", ";", "\t"} }

// Scales are the values of study.x_scale and study.y_scale: as recorded,
// the natural logarithm, the base-10 logarithm, the square root.
func Scales() []string { return []string{"linear", "log", "log10", "sqrt"} }

// ThousandsSeparators are the values of dataset.thousands: comma, point,
// apostrophe, space, no-break space (U+00A0) and narrow no-break space
// (U+202F), the separators spreadsheets and plant systems write.
func ThousandsSeparators() []string { return []string{",", ".", "'", " ", "\u00a0", "\u202f"} }

// Directions are the values of expect.direction.
func Directions() []string { return []string{"positive", "negative", "none"} }

// Forms are the values of expect.form.
func Forms() []string { return []string{"linear", "curved", "nonlinear", "none"} }
