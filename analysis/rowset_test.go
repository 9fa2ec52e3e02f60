package analysis

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"bivar/analysis/stats"
)

// TestCanonical: the canonical rows and the sample above maxN are the same
// whatever the order of the input rows.
func TestCanonical(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	n := 500
	x, y := make([]float64, n), make([]float64, n)
	for i := range x {
		x[i], y[i] = float64(rng.IntN(20)), rng.NormFloat64()
	}
	for _, maxN := range []int{0, 100, 500} {
		ax, ay := canonical(x, y, maxN)
		perm := rng.Perm(n)
		bx, by := pick(x, perm), pick(y, perm)
		cx, cy := canonical(bx, by, maxN)
		if !slices.Equal(ax, cx) || !slices.Equal(ay, cy) {
			t.Errorf("maxN %d: canonical rows differ after a shuffle", maxN)
		}
		want := n
		if maxN > 0 && maxN < n {
			want = maxN
		}
		if len(ax) != want {
			t.Errorf("maxN %d: %d rows, want %d", maxN, len(ax), want)
		}
	}
}

// TestDcorTestStops: far from alpha the sequential rule stops at the first
// look, and its p is stats.DistanceCorrTest's on the canonical rows with the
// rows' own stream; for independent data p is well above alpha; p and its
// Monte Carlo error are consistent; shuffling the rows changes nothing.
func TestDcorTestStops(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	n := 120
	x, y, z := make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = rng.Float64()*4 - 2
		y[i] = x[i]*x[i] + 0.3*rng.NormFloat64() // a parabola: r near 0, dcor clearly significant
		z[i] = rng.NormFloat64()
	}
	d, p, se, perms, used, resolved, _ := dcorTest(x, y, 0.05, 24999, 5000)
	if !resolved || perms != dcorFirstLook || used != n || !(p < 0.05) {
		t.Errorf("parabola: p %v after %d permutations (resolved %v), want resolved below 0.05 at %d", p, perms, resolved, dcorFirstLook)
	}
	cx, cy := canonical(x, y, 5000)
	d2, p2, _, _ := stats.DistanceCorrTest(cx, cy, dcorFirstLook, 5000, rowSource(cx, cy, "dcor"))
	if math.Abs(d-d2) > 1e-12 || p != p2 {
		t.Errorf("dcorTest %v, %v; DistanceCorrTest on the canonical rows %v, %v", d, p, d2, p2)
	}
	if want := math.Sqrt(p * (1 - p) / float64(perms)); se != want {
		t.Errorf("Monte Carlo error %v, want %v", se, want)
	}
	_, pz, _, permsZ, _, resolvedZ, _ := dcorTest(x, z, 0.05, 24999, 5000)
	if !resolvedZ || !(pz > 0.05) {
		t.Errorf("independent: p %v after %d permutations (resolved %v), want resolved above 0.05", pz, permsZ, resolvedZ)
	}
	perm := rng.Perm(n)
	_, p3, _, perms3, _, _, _ := dcorTest(pick(x, perm), pick(y, perm), 0.05, 24999, 5000)
	if p3 != p || perms3 != perms {
		t.Errorf("shuffled rows: p %v after %d, want %v after %d", p3, perms3, p, perms)
	}
}

// TestDcorLooks: the looks of the sequential rule.
func TestDcorLooks(t *testing.T) {
	if got, want := dcorLooks(24999), []int{199, 999, 4999, 24999}; !slices.Equal(got, want) {
		t.Errorf("dcorLooks(24999) = %v, want %v", got, want)
	}
	if got, want := dcorLooks(99), []int{99}; !slices.Equal(got, want) {
		t.Errorf("dcorLooks(99) = %v, want %v", got, want)
	}
	if got, want := dcorLooks(2000), []int{199, 999, 2000}; !slices.Equal(got, want) {
		t.Errorf("dcorLooks(2000) = %v, want %v", got, want)
	}
}

// TestDcorTestNearAlphaGoesOn: data whose first-look p lies near alpha
// draw more permutations, and where the rule settles, p̂ lies more than two
// Monte Carlo errors from alpha (the rule asks for about 3.5).
func TestDcorTestNearAlphaGoesOn(t *testing.T) {
	// Search a few seeded data sets for one whose first-look p is near 0.05.
	rng := rand.New(rand.NewPCG(8, 9))
	for try := 0; try < 200; try++ {
		n := 40
		x, y := make([]float64, n), make([]float64, n)
		for i := range x {
			x[i] = rng.NormFloat64()
			y[i] = 0.25*x[i]*x[i] + rng.NormFloat64()
		}
		cx, cy := canonical(x, y, 5000)
		_, p0, _, _ := stats.DistanceCorrTest(cx, cy, dcorFirstLook, 5000, rowSource(cx, cy, "dcor"))
		if !(p0 > 0.035 && p0 < 0.07) {
			continue
		}
		_, p, se, perms, _, resolved, _ := dcorTest(x, y, 0.05, 24999, 5000)
		if perms == dcorFirstLook && !resolved {
			t.Fatalf("p %v near alpha: stopped at the first look without settling", p)
		}
		t.Logf("try %d: first-look p %v; sequential p %v ± %v after %d permutations, resolved %v", try, p0, p, se, perms, resolved)
		if resolved && math.Abs(p-0.05) < 2*se {
			t.Errorf("resolved with p %v within 2 Monte Carlo errors (%v) of alpha", p, se)
		}
		return
	}
	t.Fatal("no data set with a first-look p near alpha in 200 tries")
}
