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
// group's means (two passes); the single line's sums about the means of
// the groups compared are the groups' sums plus their means' spread
// (n_g·(x̄_g − x̄)², the parallel-axis rule), and RSS_one is summed from its
// residuals in a third pass. It keeps no column: O(groups) memory. Everything is NaN (Groups < 2) when fewer
// than two groups qualify or no residual df is left; x, y and group must
// have equal length (it panics otherwise).
func CompareGroupLines[L int | int32](x, y []float64, group []L) GroupLines {
	if len(x) != len(y) || len(x) != len(group) {
		panic("stats: CompareGroupLines: x, y and group lengths differ")
	}
	nan := math.NaN()
	out := GroupLines{SlopesF: nan, SlopesP: nan, LinesF: nan, LinesP: nan, RWithin: nan, RWithinP: nan}
	// Each label's slot: labels in a range no longer than the rows index
	// a slice, others go through a map.
	slot := groupSlots(group)
	type sums struct {
		n             int
		sx, sy        float64 // pass 1
		mx, my        float64
		gxx, gyy, gxy float64 // pass 2, about the group's means
		used          bool
	}
	var gs []sums
	for i, g := range group {
		k := slot(g)
		if k == len(gs) {
			gs = append(gs, sums{})
		}
		gs[k].n++
		gs[k].sx += x[i]
		gs[k].sy += y[i]
	}
	for k := range gs {
		gs[k].mx, gs[k].my = gs[k].sx/float64(gs[k].n), gs[k].sy/float64(gs[k].n)
	}
	for i, g := range group {
		s := &gs[slot(g)]
		dx, dy := x[i]-s.mx, y[i]-s.my
		s.gxx += dx * dx
		s.gyy += dy * dy
		s.gxy += dx * dy
	}
	var sxx, syy, sxy, rssSep, mx1, my1 float64
	for k := range gs {
		s := &gs[k]
		if s.n < 3 || !(s.gxx > 0) {
			continue
		}
		s.used = true
		out.Groups++
		out.N += s.n
		sxx, syy, sxy = sxx+s.gxx, syy+s.gyy, sxy+s.gxy
		rssSep += math.Max(0, s.gyy-s.gxy*s.gxy/s.gxx)
		mx1 += s.sx
		my1 += s.sy
	}
	G, n := out.Groups, out.N
	out.DF2 = n - 2*G
	out.SlopesDF1, out.LinesDF1 = G-1, 2*G-2
	out.RWithinDF = n - G - 1
	if G < 2 || out.DF2 < 1 {
		return out
	}
	rssPar := math.Max(rssSep, syy-sxy*sxy/sxx)
	// The single line through the rows of the groups compared.
	mx1, my1 = mx1/float64(n), my1/float64(n)
	var txx, txy float64
	for _, s := range gs {
		if s.used {
			dx, dy := s.mx-mx1, s.my-my1
			txx += s.gxx + float64(s.n)*dx*dx
			txy += s.gxy + float64(s.n)*dx*dy
		}
	}
	b1 := txy / txx
	var rssOne float64
	for i, g := range group {
		if gs[slot(g)].used {
			e := y[i] - my1 - b1*(x[i]-mx1)
			rssOne += e * e
		}
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

// groupSlots returns a function giving each label of group its slot: 0 for
// the first label met, 1 for the next new one, and so on. It must be called
// on the rows in order the first time (a new label gets the next slot);
// after that any label seen before may be asked. Labels within a range no
// longer than the rows (the codes 0…L−1 callers pass) go through a slice,
// others through a map.
func groupSlots[G int | int32](group []G) func(G) int {
	if len(group) == 0 {
		return func(G) int { return 0 }
	}
	lo, hi := group[0], group[0]
	for _, g := range group {
		lo, hi = min(lo, g), max(hi, g)
	}
	next := 0
	if uint(int(hi)-int(lo)) < uint(len(group)) {
		at := make([]int32, int(hi)-int(lo)+1)
		for i := range at {
			at[i] = -1
		}
		return func(g G) int {
			k := &at[g-lo]
			if *k < 0 {
				*k = int32(next)
				next++
			}
			return int(*k)
		}
	}
	at := map[G]int{}
	return func(g G) int {
		k, ok := at[g]
		if !ok {
			k = next
			at[g] = k
			next++
		}
		return k
	}
}
