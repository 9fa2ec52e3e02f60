package analysis

// This file holds the influence summary, the sensitivity figures and the
// CSV file of flagged rows. Everything here streams the rows once or
// twice through stats.LineInfluence: no per-row vector of measures and no
// per-row string is kept, so a study of 10⁷ rows costs what the flagged
// rows cost.

import (
	"cmp"
	"math"
	"slices"
	"strconv"

	"bivar/analysis/findings"
	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/internal/hugepage"
)

// ranking states the order in which the rows that may be named are ranked.
const ranking = "largest Cook's distance first (a row of sole support, whose distance is undefined, before all), " +
	"then largest |externally studentized residual|, then smallest x, then smallest y"

// flagged is one flagged row while the study runs.
type flagged struct {
	i     int // position among the complete cases
	flags findings.FlagSet
	d, t  float64 // Cook's distance (+Inf for sole support) and |t|, the ranking keys
}

// rankFlagged orders rows for naming (see ranking). The keys are values of
// the data, then the row's name, so the order is the same whatever the
// order of the file's rows; only rows alike in every value and in name
// fall back to their position.
func rankFlagged(x, y []float64, name func(int) string) func(a, b flagged) int {
	// Each key is compared only when the ones before it tie: cmp.Or
	// evaluates all its arguments, and two names per comparison were most
	// of the time of sorting 2.5·10⁵ flagged rows at 10⁷, the reads of x
	// and y (far apart in memory) much of the rest.
	return func(a, b flagged) int {
		if c := cmp.Compare(b.d, a.d); c != 0 {
			return c
		}
		if c := cmp.Compare(b.t, a.t); c != 0 {
			return c
		}
		if c := cmp.Compare(x[a.i], x[b.i]); c != 0 {
			return c
		}
		if c := cmp.Compare(y[a.i], y[b.i]); c != 0 {
			return c
		}
		return cmp.Or(cmp.Compare(name(a.i), name(b.i)), cmp.Compare(a.i, b.i))
	}
}

// influence fills the influence summary and the sensitivity figures, and
// returns the CSV of the first fileMax rows flagged outlier, influential
// or sole support by ranking (nil when none is; see flaggedCSV; a study
// passes FlaggedFileMax).
//
// Flags follow findings.FlagRulesFor. Rows flagged outlier, influential or sole
// support (findings.FlagSet.Suspect) may be named: the first namedMax of
// them by ranking are, with all their measures and the line without each;
// the rest are counted. A row only of high leverage is far out in x but on
// the line: good data, counted, never named and not listed in the CSV. "Without the flagged rows"
// leaves out every suspect row, named or not.
func influence(x, y []float64, name func(int) string, th report.Thresholds, namedMax, fileMax int, conf float64,
	mom stats.Moments, all stats.Correlation, line stats.LineFit) (*report.Influence, *report.Sensitivity, []byte) {
	n := len(x)
	li := stats.NewLineInfluence(x, y)
	rules := findings.FlagRulesFor(n, th)
	in := &report.Influence{MaxCooksD: report.NaN(), NamedMax: namedMax, Ranking: ranking,
		Rules: report.FlagCuts{Leverage: report.Float(rules.Leverage), Outlier: report.Float(rules.Outlier), CooksD: report.Float(rules.Cooks)}}
	if math.IsInf(rules.Leverage, 1) {
		in.Rules.Leverage = report.NaN()
	}
	if math.IsInf(rules.Cooks, 1) {
		in.Rules.CooksD = report.NaN() // too few rows for the rule
	}
	se := &report.Sensitivity{LooRMin: report.NaN(), LooRMax: report.NaN(), LooSlopeMin: report.NaN(), LooSlopeMax: report.NaN(),
		RWithoutFlagged: report.NaN(), RWithoutLow: report.NaN(), RWithoutHigh: report.NaN(),
		PWithoutFlagged: report.NaN(), SlopeWithoutFlagged: report.NaN(), InterceptWithout: report.NaN(),
		ResistantSlope: report.NaN(), ResistantIntercept: report.NaN(), WithoutEach: []report.Without{}} // the resistant line: set by analyze

	// One pass: flags, counts, the largest Cook's D and the leave-one-out
	// extremes (first occurrence in the ranking's value order on ties).
	var rows []flagged
	best, rmin, rmax, smin, smax := -1, -1, -1, -1, -1
	var bestD, lrMin, lrMax, lsMin, lsMax float64
	c := &in.Counts
	var r stats.InfluenceRow
	for i := 0; i < n; i++ {
		li.ScreenInto(i, &r)
		if d := r.CooksD; !math.IsNaN(d) && (best < 0 || d > bestD || d == bestD && before(x, y, name, i, best)) {
			best, bestD = i, d
		}
		if v := r.LooR; !math.IsNaN(v) {
			if rmin < 0 || v < lrMin || v == lrMin && before(x, y, name, i, rmin) {
				rmin, lrMin = i, v
			}
			if rmax < 0 || v > lrMax || v == lrMax && before(x, y, name, i, rmax) {
				rmax, lrMax = i, v
			}
		}
		if v := r.LooSlope; !math.IsNaN(v) {
			if smin < 0 || v < lsMin {
				smin, lsMin = i, v
			}
			if smax < 0 || v > lsMax {
				smax, lsMax = i, v
			}
		}
		f := rules.Flag(r.Leverage, r.StudentizedExt, r.CooksD, r.SoleSupport)
		if f == 0 {
			continue
		}
		c.Flagged++
		if f&findings.BitOutlier != 0 {
			c.Outlier++
		}
		if f&findings.BitHighLeverage != 0 {
			c.HighLeverage++
		}
		if f&findings.BitInfluential != 0 {
			c.Influential++
		}
		if f&findings.BitSoleSupport != 0 {
			c.SoleSupport++
		}
		if !f.Suspect() {
			c.LeverageOnly++ // good data: counted, never named nor listed
			continue
		}
		c.Suspect++
		d := r.CooksD
		if math.IsNaN(d) {
			d = math.Inf(1)
		}
		rows = append(rows, flagged{i: i, flags: f, d: d, t: nanToInf(math.Abs(r.StudentizedExt))})
	}
	if best >= 0 {
		in.MaxCooksD, in.MaxCooksRow = report.Float(bestD), name(best)
	}
	if rmin >= 0 {
		se.LooRMin, se.LooRMinRow = report.Float(lrMin), name(rmin)
		se.LooRMax, se.LooRMaxRow = report.Float(lrMax), name(rmax)
	}
	if smin >= 0 {
		se.LooSlopeMin, se.LooSlopeMax = report.Float(lsMin), report.Float(lsMax)
	}
	slices.SortFunc(rows, rankFlagged(x, y, name))

	in.Points = []report.Point{}
	for _, fr := range rows {
		if len(in.Points) == namedMax {
			break
		}
		i := fr.i
		r := li.At(i)
		row := name(i)
		in.Points = append(in.Points, report.Point{Row: row, Index: i, X: report.Float(x[i]), Y: report.Float(y[i]),
			Leverage: report.Float(r.Leverage), Studentized: report.Float(r.Studentized),
			StudentizedExt: report.Float(r.StudentizedExt), CooksD: report.Float(r.CooksD),
			DFFITS: report.Float(r.DFFITS), Flags: fr.flags.Names()})
		se.WithoutEach = append(se.WithoutEach, report.Without{Row: row, R: report.Float(r.LooR),
			Slope: report.Float(r.LooSlope), Intercept: report.Float(r.LooIntercept)})
	}
	c.Named = len(in.Points)

	se.NFlagged = c.Suspect
	var drop []int // suspect rows still to leave out by copying the rest
	if se.NFlagged == 0 {
		// Nothing to leave out: the line without the flagged rows is the line.
		se.RWithoutFlagged, se.RWithoutLow, se.RWithoutHigh, se.PWithoutFlagged = report.Float(all.R),
			report.Float(all.CILow), report.Float(all.CIHigh), report.Float(all.P)
		se.SlopeWithoutFlagged, se.InterceptWithout = report.Float(line.Slope.Estimate), report.Float(line.Intercept.Estimate)
	} else {
		drop = make([]int, 0, c.Suspect)
		for _, fr := range rows {
			drop = append(drop, fr.i)
		}
		slices.Sort(drop)
		// Few rows out and the rest holding most of the spread: the kept
		// rows' moments by downdating (stats.WithoutRows), with no copy of
		// the columns (two at 10⁷ rows are 160 MB). Else the kept rows are
		// copied and summed.
		dx, dy := make([]float64, len(drop)), make([]float64, len(drop))
		for k, i := range drop {
			dx[k], dy[k] = x[i], y[i]
		}
		if kept, ok := stats.WithoutRows(mom, dx, dy); ok && kept.N >= 3 {
			p := stats.PearsonMoments(kept, conf)
			se.RWithoutFlagged, se.RWithoutLow, se.RWithoutHigh, se.PWithoutFlagged = report.Float(p.R),
				report.Float(p.CILow), report.Float(p.CIHigh), report.Float(p.P)
			b := kept.Sxy / kept.Sxx
			se.SlopeWithoutFlagged, se.InterceptWithout = report.Float(b), report.Float(kept.MeanY-b*kept.MeanX)
			drop = nil
		}
	}
	if len(drop) > 0 {
		kx, ky := hugepage.Empty[float64](n-len(drop)), hugepage.Empty[float64](n-len(drop))
		j := 0
		for i := 0; i < n; i++ {
			if j < len(drop) && drop[j] == i {
				j++
				continue
			}
			kx, ky = append(kx, x[i]), append(ky, y[i])
		}
		if len(kx) >= 3 {
			cx, _ := constant(kx)
			cy, _ := constant(ky)
			if !cx && !cy {
				p := stats.Pearson(kx, ky, conf)
				se.RWithoutFlagged, se.RWithoutLow, se.RWithoutHigh, se.PWithoutFlagged = report.Float(p.R),
					report.Float(p.CILow), report.Float(p.CIHigh), report.Float(p.P)
			}
			if !cx {
				if l, err := stats.LineSummary(kx, ky, conf); err == nil {
					se.SlopeWithoutFlagged, se.InterceptWithout = report.Float(l.Slope.Estimate), report.Float(l.Intercept.Estimate)
				}
			}
		}
	}
	var csv []byte
	if len(rows) > 0 {
		rows = rows[:min(len(rows), fileMax)]
		csv = flaggedCSV(len(rows), func(k int) flaggedRow {
			fr := rows[k]
			return flaggedRow{name: name(fr.i), x: x[fr.i], y: y[fr.i], flags: fr.flags, r: li.At(fr.i)}
		})
		in.FileRows = len(rows)
	}
	return in, se, csv
}

// before reports whether row i comes before row j in value order (x, then
// y, then the row's name), the tie-break that keeps extremes independent of
// the file's order. Names are made only on a tie.
func before(x, y []float64, name func(int) string, i, j int) bool {
	if c := cmp.Or(cmp.Compare(x[i], x[j]), cmp.Compare(y[i], y[j])); c != 0 {
		return c < 0
	}
	return name(i) < name(j)
}

func nanToInf(v float64) float64 {
	if math.IsNaN(v) {
		return math.Inf(1)
	}
	return v
}

// flaggedRow is one row of the flagged-rows file.
type flaggedRow struct {
	name  string
	x, y  float64
	flags findings.FlagSet
	r     stats.InfluenceRow
}

// flaggedCSVHeader names the columns of the flagged-rows file.
var flaggedCSVHeader = []string{"row", "x", "y", "flags", "leverage", "studentized_residual", "deleted_residual_t",
	"cooks_distance", "dffits", "r_without_row", "slope_without_row", "intercept_without_row", "rank"}

// FlaggedFileMax is the most rows a study's flagged-rows file lists: the
// first by the ranking when more rows are flagged outlier, influential or
// sole support. Under the model the flag rules expect about none of them
// by chance at any n (the outlier cut is Bonferroni-bounded), so the cap
// only bites on data that are largely off the line, where a longer list
// would not say more than the counts; 10⁵ rows of the file are about
// 20 MB and fit a spreadsheet (Excel holds 1 048 576 rows).
const FlaggedFileMax = 100_000

// flaggedCSV writes the rows flagged outlier, influential or sole support
// (rows only of high leverage are good data, counted and not listed), in
// the ranking's order, with all their measures (rank is the row's place in
// that order, the same as a named row's place among the named): RFC 4180 CSV, comma-separated, numbers in Go's shortest
// round-trip form, an empty cell for an undefined measure, flags joined by
// "+". A row name that could be read as a spreadsheet formula is prefixed
// with an apostrophe (OWASP's advice on CSV injection).
//
// row(k) is the k-th row of n in that order.
func flaggedCSV(n int, row func(k int) flaggedRow) []byte {
	buf := make([]byte, 0, 64+n*120)
	for k, h := range flaggedCSVHeader {
		if k > 0 {
			buf = append(buf, ',')
		}
		buf = append(buf, h...)
	}
	buf = append(buf, '\r', '\n')
	num := func(v float64) {
		buf = append(buf, ',')
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			buf = strconv.AppendFloat(buf, v, 'g', -1, 64)
		}
	}
	for rank := range n {
		fr := row(rank)
		r := fr.r
		buf = appendCSVField(buf, fr.name)
		num(fr.x)
		num(fr.y)
		buf = append(buf, ',')
		for k, f := range fr.flags.Names() {
			if k > 0 {
				buf = append(buf, '+')
			}
			buf = append(buf, f...)
		}
		for _, v := range []float64{r.Leverage, r.Studentized, r.StudentizedExt, r.CooksD, r.DFFITS, r.LooR, r.LooSlope, r.LooIntercept} {
			num(v)
		}
		buf = append(buf, ',')
		buf = strconv.AppendInt(buf, int64(rank+1), 10)
		buf = append(buf, '\r', '\n')
	}
	return buf
}

// appendCSVField appends s as one CSV field, quoted when it holds a comma,
// quote or line break, and defused when a spreadsheet would read it as a
// formula.
func appendCSVField(buf []byte, s string) []byte {
	if s != "" && (s[0] == '=' || s[0] == '+' || s[0] == '-' || s[0] == '@' || s[0] == '\t' || s[0] == '\r') {
		s = "'" + s
	}
	quote := false
	for i := 0; i < len(s); i++ {
		if c := s[i]; c == ',' || c == '"' || c == '\n' || c == '\r' {
			quote = true
			break
		}
	}
	if !quote {
		return append(buf, s...)
	}
	buf = append(buf, '"')
	for i := 0; i < len(s); i++ {
		if s[i] == '"' {
			buf = append(buf, '"')
		}
		buf = append(buf, s[i])
	}
	return append(buf, '"')
}
