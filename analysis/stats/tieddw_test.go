package stats

import (
	"math"
	"math/rand/v2"
	"testing"
)

// permutations calls f with every permutation of a (Heap's algorithm).
func permutations(a []float64, f func([]float64)) {
	var gen func(k int)
	gen = func(k int) {
		if k == 1 {
			f(a)
			return
		}
		gen(k - 1)
		for i := 0; i < k-1; i++ {
			if k%2 == 0 {
				a[i], a[k-1] = a[k-1], a[i]
			} else {
				a[0], a[k-1] = a[k-1], a[0]
			}
			gen(k - 1)
		}
	}
	gen(len(a))
}

// TestDurbinWatsonTiedIsTheMeanOverTieOrders checks the closed form
// against its definition, by brute force: the mean of DurbinWatson over
// every order of the rows within each block of tied keys.
func TestDurbinWatsonTiedIsTheMeanOverTieOrders(t *testing.T) {
	key := []float64{1, 1, 1, 2, 3, 3, 3, 3}
	e := []float64{0.3, -1.2, 0.8, 2.1, -0.4, -0.9, 1.7, 0.05}
	// Blocks: rows 0–2, row 3, rows 4–7; enumerate the 3!·4! orders.
	b1, b3 := []float64{0.3, -1.2, 0.8}, []float64{-0.4, -0.9, 1.7, 0.05}
	var sum float64
	count := 0
	permutations(b1, func(p1 []float64) {
		permutations(b3, func(p3 []float64) {
			r := append(append(append([]float64{}, p1...), 2.1), p3...)
			sum += DurbinWatson(r)
			count++
		})
	})
	want := sum / float64(count)
	// Shuffle the rows: the result is a function of the pairs only.
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := 0; trial < 5; trial++ {
		got := DurbinWatsonTied(key, e)
		if math.Abs(got-want) > 1e-13*want {
			t.Fatalf("DurbinWatsonTied = %.17g, mean over the %d tie orders = %.17g", got, count, want)
		}
		rng.Shuffle(len(key), func(i, j int) { key[i], key[j] = key[j], key[i]; e[i], e[j] = e[j], e[i] })
	}
}

// TestDurbinWatsonTiedWithoutTies: with distinct keys it is the ordinary
// statistic of the residuals sorted by key.
func TestDurbinWatsonTiedWithoutTies(t *testing.T) {
	key := []float64{5, 1, 4, 2, 3}
	e := []float64{0.5, -1, 0.2, 0.7, -0.4}
	want := DurbinWatson([]float64{-1, 0.7, -0.4, 0.2, 0.5})
	if got := DurbinWatsonTied(key, e); math.Abs(got-want) > 1e-15 {
		t.Fatalf("DurbinWatsonTied = %v, want %v", got, want)
	}
	if got := DurbinWatsonTied([]float64{1}, []float64{1}); !math.IsNaN(got) {
		t.Fatalf("one row: %v, want NaN", got)
	}
	if got := DurbinWatsonTied([]float64{1, 2}, []float64{0, 0}); !math.IsNaN(got) {
		t.Fatalf("zero residuals: %v, want NaN", got)
	}
}

// TestClopperPearson against statsmodels 0.13.5,
// statsmodels.stats.proportion.proportion_confint(k, n, alpha=a,
// method="beta") (scipy 1.10.1 beta quantiles underneath).
func TestClopperPearson(t *testing.T) {
	for _, c := range []struct {
		k, n   int
		a      float64
		lo, hi float64
	}{
		{3, 20, 0.05, 0.0320709371854637, 0.37892682654531396},
		{0, 199, 0.001, 0, 0.03747524122307612},
		{10, 999, 0.00025, 0.0022695621868623708, 0.027210713218800173},
		{199, 199, 0.01, 0.9737266024440432, 1},
	} {
		lo, hi := ClopperPearson(c.k, c.n, 1-c.a)
		if math.Abs(lo-c.lo) > 1e-9*math.Max(c.lo, 1e-300) && !(lo == 0 && c.lo == 0) || math.Abs(hi-c.hi) > 1e-9*c.hi {
			t.Errorf("ClopperPearson(%d, %d, %v) = %.17g, %.17g; want %.17g, %.17g", c.k, c.n, 1-c.a, lo, hi, c.lo, c.hi)
		}
	}
}
