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
// group's means by the corrected two-pass algorithm (Chan, Golub &
// LeVeque 1983), and the tests are formed from each group's count, means
// and sums by GroupLinesFromMoments, without subtracting one residual sum
// from another. It keeps no column: O(groups) memory. Everything is NaN
// (Groups < 2) when fewer than two groups qualify or no residual df is
// left; x, y and group must have equal length (it panics otherwise).
func CompareGroupLines[L int | int32](x, y []float64, group []L) GroupLines {
	if len(x) != len(y) || len(x) != len(group) {
		panic("stats: CompareGroupLines: x, y and group lengths differ")
	}
	// Each label's slot: labels in a range no longer than the rows index
	// a slice, others go through a map.
	slot := groupSlots(group)
	type sums struct {
		n             int
		sx, sy        float64 // pass 1
		mx, my        float64 // pass 1's means (the corrected mean is mx + cx/n)
		cx, cy        float64 // pass 2: Σ of the deviations from pass 1's means
		gxx, gyy, gxy float64 // pass 2, about the group's means
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
		s.cx += dx
		s.cy += dy
		s.gxx += dx * dx
		s.gyy += dy * dy
		s.gxy += dx * dy
	}
	// The corrected two-pass algorithm (Chan, Golub & LeVeque 1983): the
	// deviations' sums correct the centred sums and the means, which plain
	// sums of values far from 0 leave off by many units in the last place
	// of the mean (150 values near 10⁹: about 10⁻⁵).
	for k := range gs {
		s := &gs[k]
		nf := float64(s.n)
		s.gxx -= s.cx * s.cx / nf
		s.gyy -= s.cy * s.cy / nf
		s.gxy -= s.cx * s.cy / nf
	}
	if len(gs) == 0 {
		return GroupLinesFromMoments(nil)
	}
	// Each group's means as offsets from the first group's (rx, ry), in
	// two parts (the mean and its correction): small where the means are
	// far from 0.
	ms := make([]Moments, len(gs))
	rx, ry := gs[0].mx, gs[0].my
	for k, s := range gs {
		nf := float64(s.n)
		ms[k] = Moments{N: s.n, MeanX: (s.mx - rx) + s.cx/nf, MeanY: (s.my - ry) + s.cy/nf, Sxx: s.gxx, Syy: s.gyy, Sxy: s.gxy}
	}
	return GroupLinesFromMoments(ms)
}

// GroupLinesFromMoments is CompareGroupLines from each group's count,
// means and centred sums (the means may be offsets from any one point,
// the same for every group), in the groups' order. Groups with fewer than
// 3 rows or Sxx not above 0 are left out.
//
// Both differences of residual sums are formed without subtracting one
// residual sum from another, which loses the digits the two share: where
// the lines hardly differ (F far below 1) with many groups, RSS_par −
// RSS_sep as a difference was off by 4·10⁻⁸ relative on 10⁶ rows in 1000
// groups, where this form agreed with a long-double computation of the
// same rows to 5·10⁻¹³. The slopes' difference is
// RSS_par − RSS_sep = Σ_g Sxx_g·(b_g − b_w)², b_w = ΣSxy_g/ΣSxx_g (the
// interaction sum of squares of the analysis of covariance). The single
// line's is RSS_one − RSS_par, the squared distance between the two
// models' fitted values (the one-line model lies within the common-slope
// one): ŷ_par − ŷ_one = r_g + δ·(x − x̄_g) with r_g = (ȳ_g − ȳ) −
// b_one·(x̄_g − x̄), the group mean's residual from the single line, and
// δ = b_w − b_one, means over the groups compared; the cross term
// vanishes within each group (Σ(x − x̄_g) = 0), so
// RSS_one − RSS_par = Σ_g (n_g·r_g² + δ²·Sxx_g), a sum of squares that
// cancels nothing (our algebra; written as Σ n_g·c_g² + 2δ·Σ n_g·c_g·(x̄_g
// − x̄) + δ²·Sxx, c_g = r_g − δ·(x̄_g − x̄), its terms cancelled where the
// groups' means lie far apart on one line: TestCompareGroupLinesSpreadMeans).
// TestCompareGroupLinesFarFromZero, TestCompareGroupLinesManyGroups and
// TestCompareGroupLinesSpreadMeans check both against exact rational
// arithmetic.
func GroupLinesFromMoments(gs []Moments) GroupLines {
	nan := math.NaN()
	out := GroupLines{SlopesF: nan, SlopesP: nan, LinesF: nan, LinesP: nan, RWithin: nan, RWithinP: nan}
	var sxx, syy, sxy, rssSep float64
	var pooled Moments // the groups compared together (Chan et al.'s pairwise combination)
	var used []Moments // those groups
	for _, g := range gs {
		if g.N < 3 || !(g.Sxx > 0) {
			continue
		}
		used = append(used, g)
		out.Groups++
		out.N += g.N
		sxx, syy, sxy = sxx+g.Sxx, syy+g.Syy, sxy+g.Sxy
		rssSep += math.Max(0, g.Syy-g.Sxy*g.Sxy/g.Sxx)
		pooled = Combine(pooled, g)
	}
	G, n := out.Groups, out.N
	out.DF2 = n - 2*G
	out.SlopesDF1, out.LinesDF1 = G-1, 2*G-2
	out.RWithinDF = n - G - 1
	if G < 2 || out.DF2 < 1 {
		return out
	}
	bw := sxy / sxx
	b1 := pooled.Sxy / pooled.Sxx
	delta := bw - b1
	var slopes, onePar float64
	for _, g := range used {
		d := g.Sxy/g.Sxx - bw
		slopes += g.Sxx * d * d
		nf := float64(g.N)
		dx := g.MeanX - pooled.MeanX
		rg := (g.MeanY - pooled.MeanY) - b1*dx // the group mean's residual from the single line
		onePar += nf*rg*rg + delta*delta*g.Sxx
	}
	ms := rssSep / float64(out.DF2)
	if ms > 0 {
		out.SlopesF = slopes / float64(out.SlopesDF1) / ms
		out.SlopesP = UpperF(out.SlopesF, float64(out.SlopesDF1), float64(out.DF2))
		out.LinesF = math.Max(0, slopes+onePar) / float64(out.LinesDF1) / ms
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

// Combine pools the moments of two disjoint sets of pairs (Chan, Golub &
// LeVeque 1983, eq. 2.1); either may be empty (N = 0).
func Combine(a, b Moments) Moments {
	if a.N == 0 {
		return b
	}
	if b.N == 0 {
		return a
	}
	n := float64(a.N + b.N)
	f := float64(a.N) * float64(b.N) / n
	dx, dy := b.MeanX-a.MeanX, b.MeanY-a.MeanY
	return Moments{N: a.N + b.N, MeanX: a.MeanX + dx*float64(b.N)/n, MeanY: a.MeanY + dy*float64(b.N)/n,
		Sxx: a.Sxx + b.Sxx + f*dx*dx, Syy: a.Syy + b.Syy + f*dy*dy, Sxy: a.Sxy + b.Sxy + f*dx*dy}
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
