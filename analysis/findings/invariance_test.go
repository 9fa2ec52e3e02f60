package findings_test

// Verdicts are a function of the set of rows: the same cases, shuffled or
// run with another seed, give the same verdicts.

import (
	"math/rand/v2"
	"path/filepath"
	"slices"
	"strconv"
	"testing"

	"bivar/analysis"
	"bivar/analysis/dataset"
	"bivar/analysis/report"
)

// suiteInput reads one case of testdata/suite as analysis.Analyze's Input.
func suiteInput(t *testing.T, name string) analysis.Input {
	t.Helper()
	path := filepath.Join("testdata", "suite", name+".csv")
	h, data := readCSV(t, path)
	in := analysis.Input{ID: name, X: report.Variable{Column: "x", Label: "x"}, Y: report.Variable{Column: "y", Label: "y"},
		XS: column(t, path, h, data, "x"), YS: column(t, path, h, data, "y")}
	if j := slices.Index(h, "group"); j >= 0 {
		in.GroupColumn = "group"
		var g []string
		for _, r := range data {
			g = append(g, r[j])
		}
		in.Groups = dataset.StringsOf(g)
	}
	if o := column(t, path, h, data, "order"); o != nil {
		in.OrderColumn, in.Order = "order", o
	}
	if z := column(t, path, h, data, "z"); z != nil {
		in.Covariates = map[string][]float64{"z": z}
	}
	return in
}

// shuffled returns in with its rows in a random order (every per-row
// column moved together, row names kept with their rows).
func shuffled(in analysis.Input, rng *rand.Rand) analysis.Input {
	n := len(in.XS)
	perm := rng.Perm(n)
	pf := func(v []float64) []float64 {
		if v == nil {
			return nil
		}
		out := make([]float64, n)
		for i, k := range perm {
			out[i] = v[k]
		}
		return out
	}
	out := in
	out.XS, out.YS, out.Order = pf(in.XS), pf(in.YS), pf(in.Order)
	rows := make([]string, n)
	for i, k := range perm {
		rows[i] = strconv.Itoa(k + 1)
	}
	out.Rows = dataset.StringsOf(rows)
	if in.Groups.Given() {
		out.Groups = in.Groups.Pick(perm)
	}
	if in.Covariates != nil {
		out.Covariates = map[string][]float64{}
		for c, v := range in.Covariates {
			out.Covariates[c] = pf(v)
		}
	}
	return out
}

// TestVerdictsAreFunctionsOfTheRows runs every case of the labelled suite
// with its rows shuffled (twice) and with 20 seeds, and requires every
// verdict to be the one of the case as written with the default seed.
func TestVerdictsAreFunctionsOfTheRows(t *testing.T) {
	_, labels := readCSV(t, filepath.Join("testdata", "suite", "labels.csv"))
	seeds := 20
	if testing.Short() {
		seeds = 3
	}
	rng := rand.New(rand.NewPCG(7, 11))
	for _, lab := range labels {
		name := lab[0]
		in := suiteInput(t, name)
		cfg := analysis.DefaultConfig()
		base := analysis.Analyze(in, cfg).Findings
		if base == nil {
			t.Fatalf("%s: no findings", name)
		}
		check := func(how string, f *report.Findings) {
			if f == nil {
				t.Errorf("%s %s: no findings", name, how)
				return
			}
			for _, v := range verdicts {
				if a, b := verdict(base, v), verdict(f, v); a != b {
					t.Errorf("%s: %s = %q as written, %q %s", name, v, a, b, how)
				}
			}
		}
		for k := 0; k < 2; k++ {
			check("with the rows shuffled", analysis.Analyze(shuffled(in, rng), cfg).Findings)
		}
		for seed := uint64(1); seed <= uint64(seeds); seed++ {
			c := cfg
			c.Seed = seed
			check("with seed "+strconv.FormatUint(seed, 10), analysis.Analyze(in, c).Findings)
		}
	}
}
