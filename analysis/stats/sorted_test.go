package stats

import (
	"cmp"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// sortedTestData returns the seeded wavy set (extraWavy: x on a grid of
// 0.5, so many ties) with a few exact duplicate pairs and a −0 added.
func sortedTestData(n int) (x, y []float64) {
	x, y = extraWavy(31, n)
	for i := 10; i+20 < n; i += 37 {
		x[i+20], y[i+20] = x[i], y[i]
	}
	x[3] = math.Copysign(0, -1)
	return x, y
}

// shuffled returns x and y with their rows in a seeded random order.
func shuffled(x, y []float64, seed uint64) (sx, sy []float64) {
	sx, sy = slices.Clone(x), slices.Clone(y)
	rand.New(rand.NewPCG(seed, 9)).Shuffle(len(sx), func(i, j int) {
		sx[i], sx[j] = sx[j], sx[i]
		sy[i], sy[j] = sy[j], sy[i]
	})
	return sx, sy
}

// TestNewSorted checks the canonical order: x ascending, tied x by
// tieKey(y), Row a permutation that maps back to the input, ByY ascending
// in y with ties by position; and ToRows inverts it.
func TestNewSorted(t *testing.T) {
	t.Parallel()
	x, y := sortedTestData(600)
	s := NewSorted(x, y)
	seen := make([]bool, len(x))
	for k, i := range s.Row {
		if seen[i] {
			t.Fatalf("Row repeats %d", i)
		}
		seen[i] = true
		if s.X[k] != x[i] || s.Y[k] != y[i] {
			t.Fatalf("pair %d is (%v, %v), row %d holds (%v, %v)", k, s.X[k], s.Y[k], i, x[i], y[i])
		}
		if k > 0 && (s.X[k] < s.X[k-1] || s.X[k] == s.X[k-1] && tieKey(s.Y[k]) < tieKey(s.Y[k-1])) {
			t.Fatalf("pairs %d, %d out of canonical order", k-1, k)
		}
	}
	for j := 1; j < len(s.ByY); j++ {
		a, b := s.ByY[j-1], s.ByY[j]
		if s.Y[b] < s.Y[a] || s.Y[b] == s.Y[a] && b < a {
			t.Fatalf("ByY %d, %d out of order", j-1, j)
		}
	}
	if !slices.Equal(s.ToRows(s.X), x) || !slices.Equal(s.ToRows(s.Y), y) {
		t.Error("ToRows does not return the input order")
	}
	// tieKey is a bijection of the keys: equal y, equal keys; −0 as +0.
	if tieKey(0) != tieKey(math.Copysign(0, -1)) || tieKey(1) == tieKey(2) {
		t.Error("tieKey: −0 and +0 differ, or 1 and 2 collide")
	}
}

// TestSortedMatches: each method gives what the function on the unsorted
// columns gives (those are checked against scipy and statsmodels in their
// own tests): bit for bit where only order statistics or integer counts
// are involved, to rounding where sums are taken in another order.
func TestSortedMatches(t *testing.T) {
	t.Parallel()
	x, y := sortedTestData(700)
	s := NewSorted(x, y)

	dx, dy := s.Describe()
	for _, c := range []struct {
		got, want Summary
	}{{dx, Describe(x)}, {dy, Describe(y)}} {
		g, w := c.got, c.want
		if g.N != w.N || g.Min != w.Min || g.Q1 != w.Q1 || g.Median != w.Median || g.Q3 != w.Q3 || g.Max != w.Max {
			t.Errorf("Describe: %+v, want %+v", g, w)
		}
		if !extraClose(g.Mean, w.Mean, 1e-14) || !extraClose(g.SD, w.SD, 1e-14) {
			t.Errorf("Describe mean, SD: %v %v, want %v %v", g.Mean, g.SD, w.Mean, w.SD)
		}
	}
	rho, p := s.Spearman()
	if wr, wp := Spearman(x, y); !extraClose(rho, wr, 1e-14) || !extraClose(p, wp, 1e-10) {
		t.Errorf("Spearman: %v %v, want %v %v", rho, p, wr, wp)
	}
	tau, pt := s.KendallTauB()
	if wt, wp := KendallTauB(x, y); tau != wt || pt != wp {
		t.Errorf("KendallTauB: %v %v, want %v %v (the counts are integers)", tau, pt, wt, wp)
	}
	line, err := Line(s.X, s.Y, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	f, df1, df2, pf, ok := s.LackOfFit(line.Slope.Estimate)
	wf, wdf1, wdf2, wpf, wok := LackOfFit(x, y)
	if !ok || !wok || df1 != wdf1 || df2 != wdf2 || !extraClose(f, wf, 1e-12) || !extraClose(pf, wpf, 1e-10) {
		t.Errorf("LackOfFit: %v (%d, %d) p %v %v, want %v (%d, %d) p %v %v", f, df1, df2, pf, ok, wf, wdf1, wdf2, wpf, wok)
	}
	d, _, used, method := s.DistanceCorrTest(0, 0, nil)
	if want := DistanceCorrelation(x, y); !extraClose(d, want, 1e-12) || used != len(x) || method != dcorMethod(len(x))+"; no permutation test" {
		t.Errorf("DistanceCorrTest: dCor %v (%d rows, %q), want %v", d, used, method, want)
	}
	// The definition, O(n²) (dcorDirect), on a subset.
	small := NewSorted(x[:150], y[:150])
	if d, _, _, _ := small.DistanceCorrTest(0, 0, nil); !extraClose(d, dcorDirect(x[:150], y[:150]), 1e-12) {
		t.Errorf("dCor of 150 rows %v, want %v from the matrices", d, dcorDirect(x[:150], y[:150]))
	}
	// Undefined cases as the functions have them.
	c := NewSorted([]float64{1, 2, 3}, []float64{4, 4, 4})
	if r, _ := c.Spearman(); !math.IsNaN(r) {
		t.Errorf("constant y: Spearman %v, want NaN", r)
	}
	if tb, _ := c.KendallTauB(); !math.IsNaN(tb) {
		t.Errorf("constant y: τ-b %v, want NaN", tb)
	}
	if d, p, _, _ := c.DistanceCorrTest(9, 0, nil); !math.IsNaN(d) || !math.IsNaN(p) {
		t.Errorf("constant y: dCor %v p %v, want NaN", d, p)
	}
	if _, _, _, _, ok := NewSorted([]float64{1, 2, 3}, []float64{1, 2, 4}).LackOfFit(1.5); ok {
		t.Error("3 rows: lack of fit reported")
	}
}

// TestSortedShuffle: the same pairs in any order give the same sorted
// columns and the same results, to the last bit, seeded samples included.
func TestSortedShuffle(t *testing.T) {
	t.Parallel()
	x, y := sortedTestData(3000)
	a := NewSorted(x, y)
	sx, sy := shuffled(x, y, 5)
	b := NewSorted(sx, sy)
	if !slices.Equal(a.X, b.X) || !slices.Equal(a.Y, b.Y) || !slices.Equal(a.ByY, b.ByY) {
		t.Fatal("shuffled rows: different canonical order")
	}
	type all struct {
		dx, dy           Summary
		rho, p, tau, pt  float64
		f, pf            float64
		dc, pd           float64
		used             int
		method           string
		lx, ly, lx2, ly2 []float64
	}
	run := func(s *Sorted) all {
		var r all
		r.dx, r.dy = s.Describe()
		r.rho, r.p = s.Spearman()
		r.tau, r.pt = s.KendallTauB()
		l, _ := Line(s.X, s.Y, 0.95)
		r.f, _, _, r.pf, _ = s.LackOfFit(l.Slope.Estimate)
		r.dc, r.pd, r.used, r.method = s.DistanceCorrTest(29, 400, rand.NewPCG(3, 3))
		r.lx, r.ly = s.Sample(250, rand.NewPCG(4, 4))
		r.lx2, r.ly2 = s.Sample(5000, nil)
		return r
	}
	ra, rb := run(a), run(b)
	if ra.dx != rb.dx || ra.dy != rb.dy || ra.rho != rb.rho || ra.p != rb.p || ra.tau != rb.tau || ra.pt != rb.pt ||
		ra.f != rb.f || ra.pf != rb.pf || ra.dc != rb.dc || ra.pd != rb.pd || ra.used != rb.used || ra.method != rb.method ||
		!slices.Equal(ra.lx, rb.lx) || !slices.Equal(ra.ly, rb.ly) || !slices.Equal(ra.lx2, rb.lx2) {
		t.Errorf("shuffled rows give other results:\n%+v\n%+v", ra, rb)
	}
	if ra.used != 400 || len(ra.lx) != 250 || len(ra.lx2) != len(x) {
		t.Errorf("sample sizes %d, %d, %d; want 400, 250, %d", ra.used, len(ra.lx), len(ra.lx2), len(x))
	}
	// The order of a third column: ties by canonical position, and the
	// same sequence of pairs for any order of the rows.
	order := make([]float64, len(x))
	for i := range order {
		order[i] = float64(i % 50)
	}
	so := slices.Clone(order)
	rand.New(rand.NewPCG(5, 9)).Shuffle(len(so), func(i, j int) { so[i], so[j] = so[j], so[i] }) // as shuffled(x, y, 5)
	pa, pb := a.OrderOf(order), b.OrderOf(so)
	for j := range pa {
		ka, kb := pa[j], pb[j]
		if order[a.Row[ka]] != so[b.Row[kb]] || a.X[ka] != b.X[kb] || a.Y[ka] != b.Y[kb] {
			t.Fatalf("OrderOf: position %d differs between the orders of the rows", j)
		}
		if j > 0 && order[a.Row[pa[j-1]]] == order[a.Row[ka]] && pa[j-1] > ka {
			t.Fatalf("OrderOf: tie at %d not in canonical order", j)
		}
	}
	// Strictly increasing order: the caller's order.
	inc := make([]float64, len(x))
	for i := range inc {
		inc[i] = float64(i) * 0.5
	}
	for j, k := range a.OrderOf(inc) {
		if int(a.Row[k]) != j {
			t.Fatalf("OrderOf(increasing): position %d is row %d", j, a.Row[k])
		}
	}
}

// TestSortedDcorPermutations: the permutation p equals the one of the same
// permutations of the canonical pairs scored by the O(n²) definition
// (dcorDirect), as TestDistanceCorrTest checks for DistanceCorrTest.
func TestSortedDcorPermutations(t *testing.T) {
	t.Parallel()
	x, y := extraWavy(13, 60)
	src := rand.NewPCG(5, 0)
	for i := range y {
		y[i] = extraUniform(src) + 0.01*x[i]
	}
	s := NewSorted(x, y)
	const perms = 99
	_, p, used, _ := s.DistanceCorrTest(perms, 0, rand.NewPCG(4, 4))
	rng := rand.New(rand.NewPCG(4, 4))
	obs := dcorDirect(s.X, s.Y)
	perm := make([]int, len(x))
	for i := range perm {
		perm[i] = i
	}
	yp := make([]float64, len(y))
	ge := 0
	for range perms {
		rng.Shuffle(len(perm), func(i, j int) { perm[i], perm[j] = perm[j], perm[i] })
		for i := range yp {
			yp[i] = s.Y[perm[i]]
		}
		if dcorDirect(s.X, yp) >= obs*(1-1e-12) {
			ge++
		}
	}
	if want := float64(1+ge) / (perms + 1); p != want || used != len(x) {
		t.Errorf("p = %v (used %d), want %v from direct permutations", p, used, want)
	}
}

// TestSortedSample: Floyd's sample is m distinct positions in canonical
// order, and every position is about equally likely: over 2000 seeded
// samples of 10 from 40, each position's count is binomial(2000, 1/4),
// mean 500, SD 19.4; all 40 within ±5 SD.
func TestSortedSample(t *testing.T) {
	t.Parallel()
	n := 40
	x, y := make([]float64, n), make([]float64, n)
	for i := range x {
		x[i], y[i] = float64(i), float64(i%7)
	}
	s := NewSorted(x, y)
	count := make([]int, n)
	for seed := range uint64(2000) {
		sx, _ := s.Sample(10, rand.NewPCG(seed, 1))
		if len(sx) != 10 || !slices.IsSorted(sx) {
			t.Fatalf("sample %v: want 10 values ascending", sx)
		}
		for j := 1; j < len(sx); j++ {
			if sx[j] == sx[j-1] {
				t.Fatalf("sample %v repeats a row", sx)
			}
		}
		for _, v := range sx {
			count[int(v)]++
		}
	}
	for i, c := range count {
		if math.Abs(float64(c)-500) > 5*19.4 {
			t.Errorf("position %d drawn %d times in 2000 samples, want about 500", i, c)
		}
	}
}

// TestNewSortedTies: on x with runs of ties of many lengths (1, 2, 3, 40,
// 2047, 2048, 5000), the canonical order is that of a comparison sort by
// (x, tieKey(y), row), so equal pairs keep their rows' order.
func TestNewSortedTies(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(11, 12))
	var x, y []float64
	for lev, m := range []int{1, 2, 3, 24, 25, 40, 2047, 2048, 2049, 5000, 1} {
		for range m {
			x = append(x, float64(lev%4)*0.5-float64(lev)) // distinct levels, some negative
			y = append(y, math.Round(rng.NormFloat64()*4)) // many equal y, so equal pairs
		}
	}
	rng.Shuffle(len(x), func(i, j int) { x[i], x[j] = x[j], x[i]; y[i], y[j] = y[j], y[i] })
	want := make([]int32, len(x))
	for i := range want {
		want[i] = int32(i)
	}
	slices.SortFunc(want, func(a, b int32) int {
		return cmp.Or(cmp.Compare(x[a], x[b]), cmp.Compare(tieKey(y[a]), tieKey(y[b])), cmp.Compare(a, b))
	})
	if s := NewSorted(x, y); !slices.Equal(s.Row, want) {
		t.Error("canonical order differs from the comparison sort by (x, tieKey(y), row)")
	}
}

// TestSortRunHighBitsCollide: pairs of one run whose tieKeys agree in all
// but the low runBits bits (sortRun's packed keys then tie) still come out
// in full tieKey order, equal pairs in their places' order. The y values
// are made from chosen keys by inverting tieKey (each step of SplitMix64's
// finaliser inverted: xor-shifts by their repeated application, the odd
// multipliers by their inverses mod 2⁶⁴).
func TestSortRunHighBitsCollide(t *testing.T) {
	t.Parallel()
	inv := func(a uint64) uint64 { // Newton's iteration for a⁻¹ mod 2⁶⁴
		x := a
		for range 6 {
			x *= 2 - a*x
		}
		return x
	}
	// z ^ (z >> s) inverted by iterating z = v ^ (z >> s) to its fixed
	// point (each round fixes s more bits).
	unxor := func(v uint64, s uint) uint64 {
		z := v
		for range 64 {
			z = v ^ (z >> s)
		}
		return z
	}
	untie := func(k uint64) float64 {
		z := unxor(k, 31)
		z *= inv(0x94d049bb133111eb)
		z = unxor(z, 27)
		z *= inv(0xbf58476d1ce4e5b9)
		z = unxor(z, 30)
		return keyFloat(z)
	}
	base := uint64(0x5a5a_1234_5678_9000) &^ (1<<runBits - 1)
	lows := []uint64{9, 3, 700, 3, 0, 9, 1}
	var y []float64
	for _, l := range lows {
		v := untie(base | l)
		if math.IsNaN(v) || tieKey(v) != base|l {
			t.Fatalf("untie(%#x) = %v, whose tieKey is %#x", base|l, v, tieKey(v))
		}
		y = append(y, v)
	}
	y = append(y, untie(base-1<<runBits)) // other high bits, first
	row := make([]int32, len(y))
	for i := range row {
		row[i] = int32(100 + i)
	}
	want := slices.Clone(row)
	slices.SortStableFunc(want, func(a, b int32) int { return cmp.Compare(tieKey(y[a-100]), tieKey(y[b-100])) })
	ys := slices.Clone(y)
	sortRun(ys, row, nil, nil, nil, make([]uint64, len(ys)))
	if !slices.Equal(row, want) {
		t.Errorf("sortRun order %v, want %v", row, want)
	}
	for j, r := range row {
		if ys[j] != y[r-100] {
			t.Fatalf("y at %d is not row %d's", j, r)
		}
	}
}

// TestSortSpread: the distribution sort of a run's packed keys orders as
// slices.Sort does, for evenly spread keys, for keys that share their high
// bits (where it gives up on insertion and sorts plainly) and for keys
// already in order or reversed.
func TestSortSpread(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for _, m := range []int{1, 2, 63, 64, 65, 127, 128, 129, 500, 1000, 2047, 2048} {
		for _, kind := range []string{"spread", "bunched", "ascending", "descending"} {
			a := make([]uint64, m)
			for j := range a {
				switch kind {
				case "spread":
					a[j] = rng.Uint64()&^(1<<runBits-1) | uint64(j)
				case "bunched":
					a[j] = 0xabc<<52 | rng.Uint64()>>20&^(1<<runBits-1) | uint64(j)
				case "ascending":
					a[j] = uint64(j) << 40
				case "descending":
					a[j] = uint64(m-j) << 40
				}
			}
			want := slices.Clone(a)
			slices.Sort(want)
			sortSpread(a, make([]uint64, m))
			if !slices.Equal(a, want) {
				t.Errorf("m %d, %s keys: not in ascending order", m, kind)
			}
		}
	}
}

// TestSortedPearson: Sorted.Pearson from the moments is Pearson on the
// pairs, bit for bit, for data that need no scaling and for data that do
// (magnitudes near 1e300 and 1e-300, where Pearson scales by a power of
// two first): an identity, for any data.
func TestSortedPearson(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(11, 12))
	for _, scale := range []float64{1, 1e300, 1e-300, 1e-100} {
		x, y := make([]float64, 2000), make([]float64, 2000)
		for i := range x {
			x[i] = math.Round(rng.NormFloat64()*100) / 100
			y[i] = (1 + 0.4*x[i] + rng.NormFloat64()) * scale
		}
		s := NewSorted(x, y)
		got, want := s.Pearson(CentredMoments(s.X, s.Y), 0.95), Pearson(s.X, s.Y, 0.95)
		if fmt.Sprintf("%#v", got) != fmt.Sprintf("%#v", want) {
			t.Errorf("scale %g: Sorted.Pearson %+v, Pearson %+v", scale, got, want)
		}
	}
}

// TestSortedFits: Sorted.LineSummary and Sorted.PolynomialSummary, whose
// checks and scaling read the sorted ends and whose means and centred sums
// come from Sorted.Moments, and Sorted.Describe and Sorted.LackOfFit, give
// LineSummary's, PolynomialSummary's, Describe's and lack of fit's results
// on the sorted pairs bit for bit, errors included: data that need no
// scaling, y and x far from 1 (scaled by a power of two), x far from 0
// (both parts of the mean), a constant x and x with two distinct values
// (an identity, for any data).
func TestSortedFits(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(13, 14))
	for _, c := range []struct {
		name   string
		xs, ys float64 // scales of x and y
		levels int     // distinct x (0: many)
		off    float64 // added to x (a mean far larger than the spread needs both parts of the mean)
	}{{"plain", 1, 1, 0, 0}, {"y-1e300", 1, 1e300, 0, 0}, {"x-1e-300", 1e-300, 1, 0, 0}, {"x-1e250-y-1e-250", 1e250, 1e-250, 0, 0},
		{"constant-x", 1, 1, 1, 0}, {"two-levels", 1, 1, 2, 0}, {"x-offset-1e9", 1, 1, 0, 1e9}} {
		x, y := make([]float64, 3000), make([]float64, 3000)
		for i := range x {
			u := math.Round(rng.NormFloat64()*100) / 100
			if c.levels > 0 {
				u = float64(i % c.levels)
			}
			x[i] = (5+u)*c.xs + c.off
			y[i] = (1 + 0.4*u + 0.05*u*u + rng.NormFloat64()) * c.ys
		}
		s := NewSorted(x, y)
		l1, e1 := s.LineSummary(0.95)
		l2, e2 := LineSummary(s.X, s.Y, 0.95)
		if fmt.Sprintf("%#v %v", l1, e1) != fmt.Sprintf("%#v %v", l2, e2) {
			t.Errorf("%s: Sorted.LineSummary %+v %v, LineSummary %+v %v", c.name, l1, e1, l2, e2)
		}
		dx, dy := s.Describe()
		if wx, wy := Describe(s.X), Describe(s.Y); fmt.Sprintf("%#v %#v", dx, dy) != fmt.Sprintf("%#v %#v", wx, wy) {
			t.Errorf("%s: Sorted.Describe %+v %+v, Describe %+v %+v", c.name, dx, dy, wx, wy)
		}
		if e2 == nil {
			f1, a1, b1, p1, ok1 := s.LackOfFit(l2.Slope.Estimate)
			f2, a2, b2, p2, ok2 := lackOfFitSorted(s.X, s.Y, l2.Slope.Estimate, nil)
			if fmt.Sprint(f1, a1, b1, p1, ok1) != fmt.Sprint(f2, a2, b2, p2, ok2) {
				t.Errorf("%s: Sorted.LackOfFit %v %v %v %v %v, lackOfFitSorted %v %v %v %v %v", c.name, f1, a1, b1, p1, ok1, f2, a2, b2, p2, ok2)
			}
		}
		q1, e1 := s.PolynomialSummary(2, 0.95)
		q2, e2 := PolynomialSummary(s.X, s.Y, 2, 0.95)
		show := func(r Regression, err error) string { // the polynomial's map by value, not its address
			pm := r.poly
			r.poly = nil
			return fmt.Sprintf("%#v %#v %v", r, pm, err)
		}
		if show(q1, e1) != show(q2, e2) {
			t.Errorf("%s: Sorted.PolynomialSummary %+v %v, PolynomialSummary %+v %v", c.name, q1, e1, q2, e2)
		}
	}
}
