package stats

// This file holds the comparison of the straight lines fitted within
// groups: are the slopes equal, does one line serve all groups, and the
// pooled within-group correlation.

import "math"

// GroupLines is the outcome of CompareGroupLines.
type GroupLines struct {
	Groups int // groups compared (each with at least 3 rows and x not constant)
	N      int // rows in those groups

	// SlopesF is the F test that the groups' slopes are equal, the
	// group × x interaction: lines with a common slope (one intercept per
	// group) against a line per group, on (Groups − 1, N − 2·Groups) df.
	SlopesF, SlopesP float64
	SlopesDF1, DF2   int
	// LinesF is the F test that one line serves all groups: the single
	// line against a line per group, on (2·Groups − 2, N − 2·Groups) df.
	LinesF, LinesP float64
	LinesDF1       int
	// RWithin is the pooled within-group correlation Σ Sxy_g /
	// √(Σ Sxx_g · Σ Syy_g), the correlation of x and y after each is
	// centred on its group mean; RWithinP its two-sided p on N − Groups − 1
	// df (the t of x's coefficient in the model with one intercept per
	// group and a common slope).
	RWithin, RWithinP float64
	RWithinDF         int
}

// CompareGroupLines compares the least-squares lines of y on x within the
// groups named by group (any integer label per row). Groups with fewer
// than 3 rows or a constant x are left out. With RSS_sep = Σ_g (Syy_g −
// Sxy_g²/Sxx_g) (a line per group), RSS_par = Σ Syy_g − (Σ Sxy_g)²/Σ Sxx_g
// (a common slope) and RSS_one the single line's, both tests divide by
// RSS_sep/(N − 2G) (the analysis of covariance; e.g. Weisberg, Applied
// Linear Regression, 4th ed. 2014, §5.1, from memory). They equal the
// "x:C(g)" row of statsmodels' anova_lm(ols("y ~ x * C(g)")) and
// anova_lm(ols("y ~ x"), ols("y ~ x * C(g)")). Sums are taken about each
// group's means (two passes). Everything is NaN (Groups < 2) when fewer
// than two groups qualify or no residual df is left; x, y and group must
// have equal length (it panics otherwise).
func CompareGroupLines(x, y []float64, group []int) GroupLines {
	if len(x) != len(y) || len(x) != len(group) {
		panic("stats: CompareGroupLines: x, y and group lengths differ")
	}
	nan := math.NaN()
	out := GroupLines{SlopesF: nan, SlopesP: nan, LinesF: nan, LinesP: nan, RWithin: nan, RWithinP: nan}
	idx := map[int][]int{}
	var keys []int
	for i, g := range group {
		if _, ok := idx[g]; !ok {
			keys = append(keys, g)
		}
		idx[g] = append(idx[g], i)
	}
	var sxx, syy, sxy, rssSep float64
	var xs, ys []float64 // rows of the groups compared, for the single line
	for _, g := range keys {
		rows := idx[g]
		if len(rows) < 3 {
			continue
		}
		var mx, my float64
		for _, i := range rows {
			mx += x[i]
			my += y[i]
		}
		mx /= float64(len(rows))
		my /= float64(len(rows))
		var gxx, gyy, gxy float64
		for _, i := range rows {
			dx, dy := x[i]-mx, y[i]-my
			gxx += dx * dx
			gyy += dy * dy
			gxy += dx * dy
		}
		if !(gxx > 0) {
			continue
		}
		out.Groups++
		out.N += len(rows)
		sxx, syy, sxy = sxx+gxx, syy+gyy, sxy+gxy
		rssSep += math.Max(0, gyy-gxy*gxy/gxx)
		for _, i := range rows {
			xs, ys = append(xs, x[i]), append(ys, y[i])
		}
	}
	G, n := out.Groups, out.N
	out.DF2 = n - 2*G
	out.SlopesDF1, out.LinesDF1 = G-1, 2*G-2
	out.RWithinDF = n - G - 1
	if G < 2 || out.DF2 < 1 {
		return out
	}
	rssPar := math.Max(rssSep, syy-sxy*sxy/sxx)
	mx1, my1, _, b1 := lineParts(xs, ys)
	var rssOne float64
	for i := range xs {
		e := ys[i] - my1 - b1*(xs[i]-mx1)
		rssOne += e * e
	}
	rssOne = math.Max(rssSep, rssOne)
	ms := rssSep / float64(out.DF2)
	if ms > 0 {
		out.SlopesF = (rssPar - rssSep) / float64(out.SlopesDF1) / ms
		out.SlopesP = UpperF(out.SlopesF, float64(out.SlopesDF1), float64(out.DF2))
		out.LinesF = (rssOne - rssSep) / float64(out.LinesDF1) / ms
		out.LinesP = UpperF(out.LinesF, float64(out.LinesDF1), float64(out.DF2))
	}
	if syy > 0 {
		r := sxy / math.Sqrt(sxx*syy)
		out.RWithin = r
		if out.RWithinDF > 0 && math.Abs(r) < 1 {
			out.RWithinP = TwoSidedT(r*math.Sqrt(float64(out.RWithinDF))/math.Sqrt(1-r*r), float64(out.RWithinDF))
		}
	}
	return out
}
