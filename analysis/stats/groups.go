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
// LeVeque 1983); the single line's sums about the means of the groups
// compared are the groups' sums plus their means' spread (n_g·(x̄_g −
// x̄)², the parallel-axis rule, with the means as offsets from the first
// group's), and RSS_one is summed from its residuals in a third pass,
// their mean taken out. It keeps no column: O(groups) memory. Everything is NaN (Groups < 2) when fewer
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
		mx, my        float64 // pass 1's means (the corrected mean is mx + cx/n)
		cx, cy        float64 // pass 2: Σ of the deviations from pass 1's means
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
	var sxx, syy, sxy, rssSep float64
	// The means of the rows compared, about the first such group's mean
	// (rx, ry): each group's offset from it is small where the means are
	// far from 0, and kept in two parts (the mean and its correction).
	first := true
	var rx, ry, ox, oy float64
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
		if first {
			rx, ry, first = s.mx, s.my, false
		}
		nf := float64(s.n)
		ox += nf * ((s.mx - rx) + s.cx/nf)
		oy += nf * ((s.my - ry) + s.cy/nf)
	}
	G, n := out.Groups, out.N
	out.DF2 = n - 2*G
	out.SlopesDF1, out.LinesDF1 = G-1, 2*G-2
	out.RWithinDF = n - G - 1
	if G < 2 || out.DF2 < 1 {
		return out
	}
	rssPar := math.Max(rssSep, syy-sxy*sxy/sxx)
	// The single line through the rows of the groups compared: its means
	// rx + ox, ry + oy; each group's offset from them, in its two parts.
	ox, oy = ox/float64(n), oy/float64(n)
	var txx, txy float64
	for _, s := range gs {
		if s.used {
			nf := float64(s.n)
			dx, dy := ((s.mx-rx)+s.cx/nf)-ox, ((s.my-ry)+s.cy/nf)-oy
			txx += s.gxx + nf*dx*dx
			txy += s.gxy + nf*dx*dy
		}
	}
	b1 := txy / txx
	// Its residuals about the means in two parts, and their mean taken
	// out (Σ(e − ē)² = Σe² − (Σe)²/n: the intercept refitted, so the
	// rounding of the means costs nothing).
	var se, see float64
	for i, g := range group {
		if gs[slot(g)].used {
			e := ((y[i] - ry) - oy) - b1*((x[i]-rx)-ox)
			se += e
			see += e * e
		}
	}
	rssOne := math.Max(rssSep, see-se*se/float64(n))
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
