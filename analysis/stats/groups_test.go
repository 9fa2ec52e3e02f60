package stats

import (
	"encoding/csv"
	"math"
	"math/big"
	"os"
	"strconv"
	"testing"
)

// grunfeldCSV is the Grunfeld (1958) investment data as shipped with
// statsmodels (statsmodels.api.datasets.grunfeld), read in place from
// Debian's python3-statsmodels; the test skips where it is not installed.
const grunfeldCSV = "/usr/lib/python3/dist-packages/statsmodels/datasets/grunfeld/grunfeld.csv"

// TestCompareGroupLinesGrunfeld: investment against firm value within the
// 11 firms of Grunfeld's data, against statsmodels 0.13.5 (patsy formulas;
// testdata/groupsref.py, run as /usr/bin/python3):
//
//	anova_lm(ols("invest ~ value * C(firm)", d).fit()).loc["value:C(firm)"]
//	anova_lm(ols("invest ~ value", d).fit(), ols("invest ~ value * C(firm)", d).fit())
//	ols("invest ~ value + C(firm)", d).fit().tvalues["value"], .pvalues["value"]
//
// and the correlation of the residuals of invest ~ C(firm) and value ~ C(firm).
func TestCompareGroupLinesGrunfeld(t *testing.T) {
	f, err := os.Open(grunfeldCSV)
	if err != nil {
		t.Skipf("Grunfeld data not installed (%v): apt install python3-statsmodels", err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	ids := map[string]int{}
	var x, y []float64
	var g []int
	for _, r := range rows[1:] {
		inv, err1 := strconv.ParseFloat(r[col["invest"]], 64)
		val, err2 := strconv.ParseFloat(r[col["value"]], 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("bad row %v", r)
		}
		if _, ok := ids[r[col["firm"]]]; !ok {
			ids[r[col["firm"]]] = len(ids)
		}
		x, y, g = append(x, val), append(y, inv), append(g, ids[r[col["firm"]]])
	}
	c := CompareGroupLines(x, y, g)
	if c.Groups != 11 || c.N != 220 || c.SlopesDF1 != 10 || c.DF2 != 198 || c.LinesDF1 != 20 || c.RWithinDF != 208 {
		t.Fatalf("groups %d n %d df (%d, %d), lines df %d, r df %d; want 11, 220, (10, 198), 20, 208", c.Groups, c.N, c.SlopesDF1, c.DF2, c.LinesDF1, c.RWithinDF)
	}
	tw := c.RWithin * math.Sqrt(208) / math.Sqrt(1-c.RWithin*c.RWithin)
	for _, v := range []struct {
		name      string
		got, want float64
	}{
		{"slopes F", c.SlopesF, 1.8114923892815868},
		{"slopes p", c.SlopesP, 0.060617550182110735},
		{"one-line F", c.LinesF, 9.12735280674847},
		{"one-line p", c.LinesP, 4.725786995892033e-19},
		{"pooled within-firm r", c.RWithin, 0.6088086391917233},
		{"t of the common slope", tw, 11.067910832668334},
		{"its p", c.RWithinP, 1.094966194201203e-22},
	} {
		if math.Abs(v.got-v.want) > 1e-9*math.Abs(v.want) {
			t.Errorf("%s = %.17g, statsmodels %.17g", v.name, v.got, v.want)
		}
	}
}

// TestCompareGroupLinesEdges: parallel lines give a slopes F of 0; groups
// too small are left out; one group leaves nothing to compare.
func TestCompareGroupLinesEdges(t *testing.T) {
	x := []float64{1, 2, 3, 4, 1, 2, 3, 4, 9, 9}
	y := []float64{1, 2, 3, 5, 11, 12, 13, 15, 0, 1}
	g := []int{0, 0, 0, 0, 1, 1, 1, 1, 2, 2}
	c := CompareGroupLines(x, y, g)
	if c.Groups != 2 || c.N != 8 || math.Abs(c.SlopesF) > 1e-12 || !(c.LinesP < 1e-4) {
		t.Errorf("parallel lines 10 apart: %+v; want 2 groups of 8 rows, slopes F 0, one-line p tiny", c)
	}
	if c := CompareGroupLines(x[:4], y[:4], g[:4]); c.Groups != 1 || !math.IsNaN(c.SlopesF) {
		t.Errorf("one group: %+v, want NaN", c)
	}
}

// Far from 0 (x near 10⁹ with a spread of 1, y near 10⁶), the F tests
// agree with the same rows' sums in exact rational arithmetic (math/big,
// the definitions of RSS_sep, RSS_par and RSS_one in CompareGroupLines'
// comment) to 1e-11 relative. Plain sums of 150 values near 10⁹ are off
// by about 10⁻⁵ of a unit, and the single line's residuals about such
// means moved LinesF, a small difference of two RSS, by parts in 10⁸.
func TestCompareGroupLinesFarFromZero(t *testing.T) {
	n := 300
	x, y, g := make([]float64, n), make([]float64, n), make([]int, n)
	for i := range n {
		k := float64(i + 1)
		x[i] = 1e9 + math.Sin(k*0.7071)
		y[i] = 1e6 + 0.5*math.Sin(k*0.7071) + 0.05*math.Sin(k*1.3247+0.5)
		if i+1 == 33 {
			y[i] += 0.4
		}
		g[i] = (i + 1) % 2
	}
	wantSlopes, wantLines := exactGroupF(x, y, g, 2)
	agreeF(t, CompareGroupLines(x, y, g), wantSlopes, wantLines, 1e-11)
}

// agreeF checks both F tests of got against the exact ones to tol
// relative.
func agreeF(t *testing.T, got GroupLines, wantSlopes, wantLines, tol float64) {
	t.Helper()
	for _, c := range []struct {
		name      string
		got, want float64
	}{{"SlopesF", got.SlopesF, wantSlopes}, {"LinesF", got.LinesF, wantLines}} {
		if math.Abs(c.got-c.want) > tol*math.Abs(c.want) {
			t.Errorf("%s = %.17g, exact %.17g (relative %.2g)", c.name, c.got, c.want, math.Abs(c.got-c.want)/math.Abs(c.want))
		}
		t.Logf("%s = %.17g, exact %.17g (relative %.2g)", c.name, c.got, c.want, math.Abs(c.got-c.want)/math.Abs(c.want))
	}
}

// exactGroupF is the slopes F and the one-line F of CompareGroupLines for
// rows in groups 0…levels−1, every group qualifying, in exact rational
// arithmetic (math/big) from the definitions of RSS_sep, RSS_par and
// RSS_one in CompareGroupLines' comment, rounded once at the end.
func exactGroupF(x, y []float64, g []int, levels int) (slopes, lines float64) {
	n := len(x)
	type mom struct{ sxx, syy, sxy *big.Rat }
	moments := func(keep func(i int) bool) mom {
		m := 0
		sx, sy := new(big.Rat), new(big.Rat)
		for i := range n {
			if keep(i) {
				m++
				sx.Add(sx, new(big.Rat).SetFloat64(x[i]))
				sy.Add(sy, new(big.Rat).SetFloat64(y[i]))
			}
		}
		mx, my := new(big.Rat).Quo(sx, big.NewRat(int64(m), 1)), new(big.Rat).Quo(sy, big.NewRat(int64(m), 1))
		out := mom{new(big.Rat), new(big.Rat), new(big.Rat)}
		for i := range n {
			if keep(i) {
				dx := new(big.Rat).Sub(new(big.Rat).SetFloat64(x[i]), mx)
				dy := new(big.Rat).Sub(new(big.Rat).SetFloat64(y[i]), my)
				out.sxx.Add(out.sxx, new(big.Rat).Mul(dx, dx))
				out.syy.Add(out.syy, new(big.Rat).Mul(dy, dy))
				out.sxy.Add(out.sxy, new(big.Rat).Mul(dx, dy))
			}
		}
		return out
	}
	rss := func(m mom) *big.Rat {
		return new(big.Rat).Sub(m.syy, new(big.Rat).Quo(new(big.Rat).Mul(m.sxy, m.sxy), m.sxx))
	}
	rssSep, sxx, syy, sxy := new(big.Rat), new(big.Rat), new(big.Rat), new(big.Rat)
	for level := range levels {
		m := moments(func(i int) bool { return g[i] == level })
		rssSep.Add(rssSep, rss(m))
		sxx.Add(sxx, m.sxx)
		syy.Add(syy, m.syy)
		sxy.Add(sxy, m.sxy)
	}
	rssPar := rss(mom{sxx, syy, sxy})
	rssOne := rss(moments(func(int) bool { return true }))
	df2 := big.NewRat(int64(n-2*levels), 1)
	f := func(num *big.Rat, df1 int) float64 {
		v, _ := new(big.Rat).Quo(new(big.Rat).Quo(num, big.NewRat(int64(df1), 1)), new(big.Rat).Quo(rssSep, df2)).Float64()
		return v
	}
	return f(new(big.Rat).Sub(rssPar, rssSep), levels-1), f(new(big.Rat).Sub(rssOne, rssSep), 2*levels-2)
}

// Many groups whose lines hardly differ (F far below 1): both F tests
// agree with exact rational arithmetic (exactGroupF) to 1e-9 relative.
// Formed as a difference of two residual sums, as CompareGroupLines did
// before, the slopes F was off by 1.1·10⁻⁴ relative here (a 10⁶-row study in
// 1000 groups, checked against a long-double computation of the same
// rows, was off by 4·10⁻⁸).
func TestCompareGroupLinesManyGroups(t *testing.T) {
	const levels = 200
	x, y, g := grouped(levels, 25, func(k, l float64) (float64, float64) {
		x := 20 + math.Sin(k*0.7071) + 0.1*l
		// The same noise in every group but for a part in 10⁴ of its own.
		return x, 3 + 0.5*x + 0.3*math.Sin(k*1.3247+0.5)*(1+1e-4*math.Sin(l*2.1))
	})
	wantSlopes, wantLines := exactGroupF(x, y, g, levels)
	if !(wantSlopes > 0 && wantSlopes < 0.1 && wantLines > 0 && wantLines < 0.1) {
		t.Fatalf("exact F %g and %g: the test wants lines that hardly differ", wantSlopes, wantLines)
	}
	agreeF(t, CompareGroupLines(x, y, g), wantSlopes, wantLines, 1e-9)
}

// Groups whose means lie 10⁷ apart on one line, with lines of slope
// about 0.05 within that span about 2 in x: the single line through them
// all (slope about 1) misses every group's own line, and RSS_one −
// RSS_par ≈ δ²·ΣSxx_g is small against the terms Σ n_g·c_g² and
// 2δ·Σ n_g·c_g·(x̄_g − x̄), each about Σ n_g·(x̄_g − x̄)² ≈ 10¹⁵. Both F
// tests agree with exact rational arithmetic (exactGroupF) to 1e-9
// relative; summed as those three terms, the one-line F was off by
// 2.4·10⁻³ relative (80.793 for 80.990).
func TestCompareGroupLinesSpreadMeans(t *testing.T) {
	const levels = 3
	x, y, g := grouped(levels, 12, func(k, l float64) (float64, float64) {
		c := 1e7 * l
		x := c + math.Sin(k*0.7071)
		return x, c + 0.05*x - 0.05*c + 0.3*math.Sin(k*1.3247+0.5+l)
	})
	wantSlopes, wantLines := exactGroupF(x, y, g, levels)
	agreeF(t, CompareGroupLines(x, y, g), wantSlopes, wantLines, 1e-9)
}

// grouped is levels groups of per rows each, row k = 1…per of group l
// at row(k, l), g the group's number.
func grouped(levels, per int, row func(k, l float64) (float64, float64)) (x, y []float64, g []int) {
	n := levels * per
	x, y, g = make([]float64, n), make([]float64, n), make([]int, n)
	for i := range n {
		x[i], y[i] = row(float64(i%per+1), float64(i/per))
		g[i] = i / per
	}
	return x, y, g
}
