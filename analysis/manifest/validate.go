package manifest

import (
	"fmt"
	"maps"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/BurntSushi/toml"

	"bivar/analysis/internal/suggest"
	"bivar/analysis/units"
	"bivar/themes"
)

// locate fills the Line fields from the source index.
func (p *parser) locate(m *Manifest) {
	for i := range m.Datasets {
		if at, ok := p.ix.lookup("dataset#"+strconv.Itoa(i), "dataset"); ok {
			m.Datasets[i].Line = at.line
		}
	}
	for i := range m.Studies {
		owner := "study#" + strconv.Itoa(i)
		if at, ok := p.ix.lookup(owner, "study"); ok {
			m.Studies[i].Line = at.line
		}
		if e := m.Studies[i].Expect; e != nil {
			if at, ok := p.ix.lookup(owner, "study.expect"); ok {
				e.Line = at.line
			}
		}
	}
}

// defaults fills in what the manifest left out (see the Default… constants).
func (p *parser) defaults(m *Manifest, md *toml.MetaData) {
	if m.Design == "" {
		m.Design = DefaultDesign
	}
	if !md.IsDefined("alpha") {
		m.Alpha = DefaultAlpha
	}
	if m.Adjust == "" {
		m.Adjust = DefaultAdjust
	}
	if !md.IsDefined("seed") {
		m.Seed = DefaultSeed
	}
	if m.Output.Dir == "" {
		m.Output.Dir = DefaultOutputDir
	}
	if m.Output.Formats == nil {
		m.Output.Formats = DefaultFormats()
	}
	if m.Output.Theme == "" {
		m.Output.Theme = DefaultTheme
	}
	if !md.IsDefined("output", "named_rows") {
		m.Output.NamedRows = DefaultNamedRows
	}
	for i := range m.Datasets {
		d := &m.Datasets[i]
		if d.Missing == nil {
			d.Missing = DefaultMissing()
		}
		if d.NonNumeric == "" {
			d.NonNumeric = DefaultNonNumeric
		}
	}
}

// oneOf checks that v is one of allowed; what names the key for people.
func (p *parser) oneOf(owner, key, v string, allowed []string) {
	for _, a := range allowed {
		if v == a {
			return
		}
	}
	quoted := make([]string, len(allowed))
	for i, a := range allowed {
		quoted[i] = strconv.Quote(a)
	}
	hint := ""
	near := suggest.Nearest(v, allowed)
	if near == "" && len(v) >= 4 {
		// A word whose start names one choice ("randomised", "designed")
		// points to it even when the rest is spelt another way.
		for _, a := range allowed {
			if strings.HasPrefix(a, v[:min(len(v), 6)]) {
				near = a
				break
			}
		}
	}
	if near != "" {
		hint = fmt.Sprintf(" (did you mean %q?)", near)
	}
	p.add(owner, key, "%s = %q is not allowed; use one of %s%s", key, v, strings.Join(quoted, ", "), hint)
}

// adjustHint answers a request for an adjustment bivar does not offer by
// name: Bonferroni (and Šidák, its close relative) is pointed to Holm's
// method, which controls the same family-wise error rate under the same
// assumptions and rejects every hypothesis Bonferroni rejects, and
// possibly more (Holm 1979, Scand. J. Statist. 6:65–70: the step-down
// procedure's first step is Bonferroni's test); a false discovery rate
// request is pointed to bh. It returns "" for anything else.
func adjustHint(v string) string {
	w := strings.ToLower(strings.TrimSpace(v))
	has := func(names ...string) bool {
		for _, n := range names {
			if len(w) >= 3 && strings.HasPrefix(n, w) || strings.HasPrefix(w, n) {
				return true
			}
		}
		return false
	}
	switch {
	case w == "":
		return ""
	case has("bonferroni"):
		return "for Bonferroni use \"holm\": Holm's step-down method controls the same family-wise error rate and rejects whatever Bonferroni rejects, sometimes more, so it is uniformly more powerful"
	case has("fdr", "benjamini-hochberg", "benjamini", "hochberg"):
		return "for a false discovery rate use \"bh\" (Benjamini–Hochberg)"
	}
	return ""
}

// where names the place of an earlier array element.
func where(line int, what string, i int) string {
	if line > 0 {
		return fmt.Sprintf("at line %d", line)
	}
	return fmt.Sprintf("as %s number %d", what, i+1)
}

// validID: ids become file and anchor names and JSON keys of diffs.
func validID(id string) bool {
	for _, r := range id {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '-' || r == '_' || r == '.') {
			return false
		}
	}
	return id != ""
}

// noDatasetIDs says why a study can name no dataset: the manifest declares
// none, or none of its datasets has a usable id.
func noDatasetIDs(m *Manifest) string {
	if len(m.Datasets) == 0 {
		return "the manifest declares no dataset"
	}
	return "no [[dataset]] has a usable id"
}

func (p *parser) validate(m *Manifest) {
	p.oneOf("", "design", m.Design, Designs())
	if hint := adjustHint(m.Adjust); hint != "" {
		p.addValue("", toml.Key{"adjust"}, false, "adjust = %q is not allowed; use one of \"holm\", \"bh\", \"none\" — %s", m.Adjust, hint)
	} else {
		p.oneOf("", "adjust", m.Adjust, Adjustments())
	}
	if !(m.Alpha > 0 && m.Alpha <= 0.5) {
		p.add("", "alpha", "alpha = %v is outside (0, 0.5]: give the significance level as a fraction, such as 0.05", m.Alpha)
	}
	seen := map[string]bool{}
	for _, f := range m.Output.Formats {
		p.oneOf("", "output.formats", f, Formats())
		if seen[f] {
			p.add("", "output.formats", "output.formats lists %q twice", f)
		}
		seen[f] = true
	}
	if len(m.Output.Formats) == 0 {
		p.add("", "output.formats", "output.formats is empty: list at least one of %s", strings.Join(Formats(), ", "))
	}
	if n := m.Output.NamedRows; n < 0 || n > MaxNamedRows {
		p.add("", "output.named_rows", "output.named_rows = %d is outside 0 to %d: give how many flagged rows a study may name in the report (the rest are counted and listed in the CSV file beside it)", n, MaxNamedRows)
	}
	p.oneOf("", "output.theme", m.Output.Theme, themes.Names())
	outDir := m.Output.Dir // as written, for messages
	if !filepath.IsAbs(m.Output.Dir) {
		m.Output.Dir = filepath.Join(m.Dir, m.Output.Dir)
	}
	defer func() { // after the datasets' files are resolved
		if problem := m.OutputDirProblem(m.Output.Dir); problem != "" {
			p.add("", "output.dir", "output.dir = %q %s", outDir, problem)
		}
	}()
	p.thresholds(&m.Thresholds)

	if len(m.Datasets) == 0 {
		// At the first study when there is one: the dataset goes above it.
		// A manifest without studies either has no place to point at.
		var at pos
		above := ""
		if q, ok := p.ix.lookup("study#0", "study"); ok {
			at, above = q, " above this [[study]]"
		}
		p.addAt(at, "dataset", "the manifest has no dataset: add a [[dataset]] table"+above+
			" with id = \"…\" and file = \"…\" (the data file, such as data/run.csv), and name that id in each study's dataset = \"…\"; "+
			"'bivar init DATA.csv' writes a starting manifest for a data file")
	}
	if len(m.Studies) == 0 {
		p.addAt(pos{}, "study", "no [[study]] declared: a manifest needs at least one study")
	}

	datasets := map[string]int{} // id -> index
	var ids []string
	for i := range m.Datasets {
		d := &m.Datasets[i]
		owner := "dataset#" + strconv.Itoa(i)
		switch {
		case d.ID == "":
			p.add(owner, "dataset.id", "[[dataset]] number %d has no id: add id = \"…\" (a short name the studies refer to)", i+1)
		case !validID(d.ID):
			p.add(owner, "dataset.id", "dataset id %q may hold only the ASCII letters a–z and A–Z, digits, '-', '_' and '.'", d.ID)
		default:
			if j, dup := datasets[d.ID]; dup {
				p.add(owner, "dataset.id", "dataset id %q is used twice (first %s)", d.ID, where(m.Datasets[j].Line, "dataset", j))
			} else {
				datasets[d.ID] = i
				ids = append(ids, d.ID)
			}
		}
		name := d.ID
		if name == "" {
			name = "number " + strconv.Itoa(i+1)
		}
		p.source(owner, name, d, m.Dir)
		p.exclusions(owner, "dataset.exclude", "dataset "+strconv.Quote(name), d.Exclude, d.Line)
		if d.Subset != "" {
			d.SubsetExpr = p.expr(owner, "dataset.subset", "dataset "+strconv.Quote(name), d.Subset)
		}
		p.oneOf(owner, "dataset.non_numeric", d.NonNumeric, NonNumericPolicies())
		for _, l := range []struct {
			key string
			v   *int
		}{{"max_rows", d.MaxRows}, {"max_bytes", d.MaxBytes}, {"max_levels", d.MaxLevels}} {
			if l.v != nil && *l.v <= 0 {
				p.add(owner, "dataset."+l.key, "dataset %q: %s = %d is not allowed; give a positive whole number, or leave the key out for the default", name, l.key, *l.v)
			}
		}
		for _, col := range slices.Sorted(maps.Keys(d.Units)) {
			if err := units.Check(d.Units[col]); err != nil {
				p.addK(owner, toml.Key{"dataset", "units", col}, "dataset %q, column %q: %v", name, col, err)
			}
		}
	}

	studies := map[string]int{}
	for i := range m.Studies {
		s := &m.Studies[i]
		owner := "study#" + strconv.Itoa(i)
		name := s.ID
		switch {
		case s.ID == "":
			name = "number " + strconv.Itoa(i+1)
			p.add(owner, "study.id", "[[study]] number %d has no id: add id = \"…\" (a short name, used in reports and in diffs between runs)", i+1)
		case !validID(s.ID):
			p.add(owner, "study.id", "study id %q may hold only the ASCII letters a–z and A–Z, digits, '-', '_' and '.' (it names the study's files and anchors)", s.ID)
		default:
			if j, dup := studies[s.ID]; dup {
				p.add(owner, "study.id", "study id %q is used twice (first %s)", s.ID, where(m.Studies[j].Line, "study", j))
			} else {
				studies[s.ID] = i
			}
		}
		switch {
		case s.Dataset == "" && len(m.Datasets) == 0:
			// The manifest's own "no dataset" error says what to add.
		case s.Dataset == "" && len(ids) == 0:
			p.add(owner, "study.dataset", "study %q has no dataset, and %s: declare a [[dataset]] with an id, then add dataset = \"…\" naming it", name, noDatasetIDs(m))
		case s.Dataset == "":
			p.add(owner, "study.dataset", "study %q has no dataset: add dataset = \"…\" naming one of: %s", name, strings.Join(ids, ", "))
		default:
			if _, ok := datasets[s.Dataset]; !ok && len(ids) == 0 {
				p.add(owner, "study.dataset", "study %q: dataset %q is not declared, and %s: add a [[dataset]] with id = %q and file = \"…\"", name, s.Dataset, noDatasetIDs(m), s.Dataset)
			} else if !ok {
				hint := ""
				if near := suggest.Nearest(s.Dataset, ids); near != "" {
					hint = fmt.Sprintf(" — did you mean %q?", near)
				}
				p.add(owner, "study.dataset", "study %q: dataset %q is not declared%s (declared: %s)", name, s.Dataset, hint, strings.Join(ids, ", "))
			}
		}
		if s.X == "" {
			p.add(owner, "study.x", "study %q has no x: add x = \"…\" (the column of the explanatory variable)", name)
		}
		if s.Y == "" {
			p.add(owner, "study.y", "study %q has no y: add y = \"…\" (the column of the response)", name)
		}
		if s.X != "" && s.X == s.Y {
			p.add(owner, "study.y", "study %q: x and y are the same column %q", name, s.X)
		}
		for _, c := range s.Covariates {
			if c == s.X || c == s.Y {
				p.add(owner, "study.covariates", "study %q: covariate %q is x or y itself; list other columns", name, c)
			}
		}
		for _, v := range s.PredictAt {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				p.add(owner, "study.predict_at", "study %q: predict_at holds %v; give finite x values", name, v)
			}
		}
		if j, ok := datasets[s.Dataset]; ok {
			d := m.Datasets[j]
			p.alsoIn(owner, name, "x", s.X, s.AlsoIn.X, d)
			p.alsoIn(owner, name, "y", s.Y, s.AlsoIn.Y, d)
		}
		if s.Expect != nil {
			p.expect(owner, name, s.Expect)
		}
		if j, ok := datasets[s.Dataset]; ok {
			p.measure(owner, name, s, m.Datasets[j])
		} else {
			p.measure(owner, name, s, Dataset{})
		}
		if s.Design != "" {
			p.oneOf(owner, "study.design", s.Design, Designs())
		}
		p.scales(owner, name, s)
		p.exclusions(owner, "study.exclude", "study "+strconv.Quote(name), s.Exclude, s.Line)
		if s.Where != "" {
			s.WhereExpr = p.expr(owner, "study.where", "study "+strconv.Quote(name), s.Where)
		}
	}
}

// alsoIn checks that each extra unit of a study's variable converts from the
// unit its dataset declares for the column.
func (p *parser) alsoIn(owner, name, axis, column string, codes []string, d Dataset) {
	if len(codes) == 0 || column == "" {
		return
	}
	key := "study.also_in." + axis
	from, ok := d.Units[column]
	if !ok {
		declared := slices.Sorted(maps.Keys(d.Units)) // sorted: the same hint every run
		hint := ""
		if near := suggest.Nearest(column, declared); near != "" {
			hint = fmt.Sprintf(" (is %s = %q a misspelling of %q?)", axis, column, near)
		}
		p.add(owner, key, "study %q: also_in.%s converts column %q, but [dataset.units] of dataset %q gives it no unit%s: declare the unit it was recorded in, or correct %s",
			name, axis, column, d.ID, hint, axis)
		return
	}
	if units.Check(from) != nil {
		return // reported at the dataset
	}
	for _, to := range codes {
		if _, _, err := units.Affine(from, to); err != nil {
			p.add(owner, key, "study %q: also_in.%s: %v", name, axis, err)
		}
	}
}

func (p *parser) expect(owner, name string, e *Expect) {
	if e.Direction != "" {
		p.oneOf(owner, "study.expect.direction", e.Direction, Directions())
	}
	if e.Form != "" {
		p.oneOf(owner, "study.expect.form", e.Form, Forms())
	}
	if e.MinAbsR != nil && !(*e.MinAbsR >= 0 && *e.MinAbsR <= 1) {
		p.add(owner, "study.expect.min_abs_r", "study %q: expect.min_abs_r = %v is outside [0, 1]", name, *e.MinAbsR)
	}
	if e.RWithin != nil {
		p.interval(owner, name, "r_within", e.RWithin, -1, 1)
	}
	if e.SlopeWithin != nil {
		p.interval(owner, name, "slope_within", e.SlopeWithin, math.Inf(-1), math.Inf(1))
	}
	if e.MaxP != nil && !(*e.MaxP > 0 && *e.MaxP <= 1) {
		p.add(owner, "study.expect.max_p", "study %q: expect.max_p = %v is outside (0, 1]", name, *e.MaxP)
	}
	if e.MinN != nil && *e.MinN < 3 {
		p.add(owner, "study.expect.min_n", "study %q: expect.min_n = %d is below 3, the fewest rows a study runs on", name, *e.MinN)
	}
}

func (p *parser) interval(owner, name, key string, v []float64, lo, hi float64) {
	ok := len(v) == 2 && !math.IsNaN(v[0]) && !math.IsNaN(v[1]) && v[0] <= v[1] && v[0] >= lo && v[1] <= hi
	if ok {
		return
	}
	rng := ""
	if !math.IsInf(lo, 0) {
		rng = fmt.Sprintf(", both in [%v, %v]", lo, hi)
	}
	got := make([]string, len(v))
	for i, x := range v {
		got[i] = strconv.FormatFloat(x, 'g', -1, 64)
	}
	what := "got [" + strings.Join(got, ", ") + "]"
	if len(v) == 2 && v[0] > v[1] {
		what += fmt.Sprintf(": write the lower first, [%s, %s]", got[1], got[0])
	}
	p.add(owner, "study.expect."+key, "study %q: expect.%s must be two numbers [low, high] with low ≤ high%s; %s", name, key, rng, what)
}

func (p *parser) thresholds(t *Thresholds) {
	frac := func(key string, v *float64) {
		if v != nil && !(*v > 0 && *v < 1) {
			p.add("", "thresholds."+key, "thresholds.%s = %v is outside (0, 1)", key, *v)
		}
	}
	pos := func(key string, v *float64) {
		if v != nil && !(*v > 0) || v != nil && math.IsInf(*v, 0) {
			p.add("", "thresholds."+key, "thresholds.%s = %v must be a positive number", key, *v)
		}
	}
	frac("strong", t.Strong)
	frac("moderate", t.Moderate)
	frac("weak", t.Weak)
	// in [0, hi): 0 turns a rule off.
	offOr := func(key string, v *float64, hi float64, what string) {
		if v != nil && !(*v >= 0 && *v < hi) {
			p.add("", "thresholds."+key, "thresholds.%s = %v is outside [0, %v) (%s; 0 turns the rule off)", key, *v, hi, what)
		}
	}
	frac("curve_share", t.CurveShare)
	frac("nonlinear_dcor", t.NonlinearDcor)
	// Cook's D is compared with this quantile of F(p, n − p): a
	// probability, like the fractions above.
	frac("cooks_d", t.CooksD)
	pos("leverage_factor", t.LeverageFactor)
	pos("outlier_z", t.OutlierZ)
	offOr("outlier_family_alpha", t.OutlierFamilyAlpha, 1, "a family-wise significance level")
	offOr("drift_dw", t.DriftDW, 2, "a Durbin–Watson statistic below 2, the value for independent residuals")
	offOr("form_dw", t.FormDW, 2, "a Durbin–Watson statistic below 2, the value for independent residuals")
	if t.Strong != nil && t.Moderate != nil && *t.Moderate >= *t.Strong {
		p.add("", "thresholds.moderate", "thresholds.moderate = %v must be below thresholds.strong = %v", *t.Moderate, *t.Strong)
	}
	if t.Moderate != nil && t.Weak != nil && *t.Weak >= *t.Moderate {
		p.add("", "thresholds.weak", "thresholds.weak = %v must be below thresholds.moderate = %v", *t.Weak, *t.Moderate)
	}
	if t.ReversalMinGroup != nil && *t.ReversalMinGroup < 3 {
		p.add("", "thresholds.reversal_min_group", "thresholds.reversal_min_group = %d is below 3, the fewest rows a fit needs", *t.ReversalMinGroup)
	}
}

// OutputDirProblem says what is wrong with dir as the folder a run of m
// writes its report into, as the end of a sentence whose subject is the
// folder ("is the root of the file system: …"), or "" when nothing is.
// A run replaces its output folder as a whole, so the folder may be
// neither the file system's root, nor a file (the manifest, a data file
// or another), nor a folder that holds the manifest or a data file.
// Datasets' files must be resolved (as after Load).
func (m *Manifest) OutputDirProblem(dir string) string {
	const own = `give the report a folder of its own, such as "report"`
	abs, err := filepath.Abs(dir)
	if err != nil {
		return ""
	}
	if filepath.Dir(abs) == abs {
		return "is the root of the file system: " + own
	}
	type input struct{ what, path string }
	inputs := []input{{"the manifest", filepath.Join(m.Dir, filepath.Base(m.Path))}}
	for _, d := range m.Datasets {
		if d.File != "" {
			inputs = append(inputs, input{fmt.Sprintf("the data file of dataset %q", d.ID), d.File})
		}
	}
	st, err := os.Stat(abs)
	if err == nil && !st.IsDir() {
		for _, in := range inputs {
			if is, err := os.Stat(in.path); err == nil && os.SameFile(st, is) {
				return "is " + in.what + ": " + own
			}
		}
		return "is a file, not a folder: " + own
	}
	real := abs
	if r, err := filepath.EvalSymlinks(abs); err == nil {
		real = r
	}
	for _, in := range inputs {
		p, err := filepath.Abs(in.path)
		if _, serr := os.Stat(p); err != nil || serr != nil {
			continue // only inputs that are there can be lost
		}
		if r, err := filepath.EvalSymlinks(p); err == nil {
			p = r
		}
		if rel, err := filepath.Rel(real, p); err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
			return fmt.Sprintf("holds %s (%s), and each run replaces its output folder as a whole: %s", in.what, rel, own)
		}
	}
	return ""
}

// envName is what an environment variable's name may be.
var envName = regexp.MustCompile(`^[A-Za-z_][A-Za-z0-9_]*$`)

// source checks where a dataset's rows come from: a CSV file, a workbook
// (with sheet and header_row), or PostgreSQL (query or table, with where,
// connection and statement_timeout). A value given to connection is never
// repeated in a message: it may be a URL holding a password.
func (p *parser) source(owner, name string, d *Dataset, dir string) {
	db := d.IsDatabase()
	switch {
	case d.Query != "" && d.Table != "":
		p.add(owner, "dataset.table", "dataset %q has both query and table: keep one (table = \"name\" reads the whole table, with where = \"…\" to filter it)", name)
	case db && d.File != "":
		p.add(owner, "dataset.file", "dataset %q has both file and %s: a dataset reads a file or a database, not both; keep one", name, map[bool]string{true: "query", false: "table"}[d.Query != ""])
	case !db && d.File == "":
		p.add(owner, "dataset.file", "dataset %q has no file: add file = \"…\" (a CSV file or an .xlsx workbook, relative to the manifest's folder), or query = \"SELECT …\" and connection = \"ENV_VAR\" for PostgreSQL", name)
	}
	workbook := d.File != "" && isWorkbookPath(d.File)
	if d.File != "" && !db {
		rel := d.File
		if !filepath.IsAbs(d.File) {
			d.File = filepath.Join(dir, d.File)
		}
		if st, err := os.Stat(d.File); err != nil {
			p.add(owner, "dataset.file", "dataset %q: file %q not found (looked for %s)", name, rel, d.File)
		} else if st.IsDir() {
			p.add(owner, "dataset.file", "dataset %q: %q is a folder, not a data file", name, rel)
		}
	}
	if d.Delimiter != "" {
		p.oneOf(owner, "dataset.delimiter", d.Delimiter, Delimiters())
	}
	if d.Decimal != "" {
		p.oneOf(owner, "dataset.decimal", d.Decimal, Decimals())
	}
	p.thousands(owner, name, d)
	if d.Delimiter == "," && d.Decimal == "," {
		p.add(owner, "dataset.decimal", "dataset %q: decimal = \",\" with delimiter = \",\" works only when every number is quoted; check the file, or use delimiter = \";\"", name)
	}
	if workbook || db {
		what := "a workbook"
		if db {
			what = "a database"
		}
		for _, k := range []struct{ key, v string }{{"delimiter", d.Delimiter}, {"decimal", d.Decimal}, {"thousands", d.Thousands}} {
			if k.v != "" {
				p.add(owner, "dataset."+k.key, "dataset %q: %s applies to CSV files only, and this dataset reads %s (cells hold numbers, not text); remove it", name, k.key, what)
			}
		}
	}
	if !workbook {
		if d.Sheet.IsSet() {
			p.add(owner, "dataset.sheet", "dataset %q: sheet applies to Excel workbooks (a file ending .xlsx or .xlsm) only; remove it", name)
		}
		if d.HeaderRow != nil {
			p.add(owner, "dataset.header_row", "dataset %q: header_row applies to Excel workbooks (a file ending .xlsx or .xlsm) only; remove it", name)
		}
	} else {
		if d.Sheet.Name == "" && d.Sheet.Number < 0 || d.Sheet.Name == "" && d.Sheet.Number == 0 && p.sheetZero(owner) {
			p.add(owner, "dataset.sheet", "dataset %q: sheet = %d is not allowed; give the sheet's name, or its number counting from 1", name, d.Sheet.Number)
		}
		if d.HeaderRow != nil && *d.HeaderRow <= 0 {
			p.add(owner, "dataset.header_row", "dataset %q: header_row = %d is not allowed; give the row that names the columns, counting from 1 as the spreadsheet does", name, *d.HeaderRow)
		}
	}
	if !db {
		for _, k := range []struct{ key, v string }{{"where", d.Where}, {"connection", d.Connection}, {"statement_timeout", d.StatementTimeout}} {
			if k.v != "" {
				p.add(owner, "dataset."+k.key, "dataset %q: %s applies to database datasets (query or table) only; remove it", name, k.key)
			}
		}
		return
	}
	if d.Where != "" && d.Table == "" {
		p.add(owner, "dataset.where", "dataset %q: where applies with table only; with query, write the filter into the query", name)
	}
	if d.Query != "" {
		q := strings.ToUpper(strings.TrimSpace(d.Query))
		if !strings.HasPrefix(q, "SELECT") && !strings.HasPrefix(q, "WITH") && !strings.HasPrefix(q, "VALUES") && !strings.HasPrefix(q, "TABLE") {
			p.add(owner, "dataset.query", "dataset %q: query must be a SELECT (or WITH … SELECT) statement; bivar only reads, in a read-only transaction", name)
		}
	}
	switch c := d.Connection; {
	case c == "":
		key := "dataset.query"
		if d.Query == "" {
			key = "dataset.table"
		}
		p.add(owner, key, "dataset %q has no connection: add connection = \"NAME\", naming the environment variable that holds the PostgreSQL URL (postgres://user@host/db); the URL and its password stay out of the manifest", name)
	case strings.Contains(c, "://") || strings.Contains(c, "=") || strings.Contains(c, "@"):
		p.add(owner, "dataset.connection", "dataset %q: connection must name an environment variable (such as LINE7_DB), not hold the connection string itself: a password written here would be kept with the manifest; set the variable to the URL and give its name", name)
	case !envName.MatchString(c):
		p.add(owner, "dataset.connection", "dataset %q: connection = %q is not an environment variable name: use letters, digits and '_', not starting with a digit", name, c)
	}
	if d.StatementTimeout != "" {
		if t, err := time.ParseDuration(d.StatementTimeout); err != nil || t <= 0 {
			p.add(owner, "dataset.statement_timeout", "dataset %q: statement_timeout = %q is not a positive duration: write it as \"90s\", \"5m\" or \"1h\"", name, d.StatementTimeout)
		}
	}
}

// sheetZero says sheet = 0 was written (a zero Number is otherwise "left out").
func (p *parser) sheetZero(owner string) bool {
	_, ok := p.ix.lookup(owner, "dataset.sheet")
	return ok
}

// isWorkbookPath says a file is read as an Excel workbook (as
// dataset.IsWorkbook says; repeated here so that the manifest does not
// import the reader).
func isWorkbookPath(path string) bool {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".xlsx", ".xlsm":
		return true
	}
	return false
}
