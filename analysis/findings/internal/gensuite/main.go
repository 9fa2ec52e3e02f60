// Command gensuite writes the labelled suite of generated cases that the
// findings tests run through the analysis: one CSV per case and a labels
// file giving each case's true verdicts, known by construction. Every case
// has its own fixed seed, so the output is the same on every run. Each
// construction is drawn once with its own seed (set "tuning": the cases
// the thresholds were first tuned on), again with three more seeds (set
// "check": drawn after that tuning; its results led to one more change of
// the rules, so it is not held out), with three more (set "holdout": drawn
// after that change; two more rules were changed after seeing them), and
// with three more (set "final": drawn after the last change of the rules
// and never used to tune them):
//
//	go run ./analysis/findings/internal/gensuite -o analysis/findings/testdata/suite
//
// The data are invented (simulated) for testing; they describe nothing
// real. Each CSV has the columns x and y, and where a case needs them,
// group (a lot name), order (run order) and z (a covariate).
package main

import (
	"encoding/csv"
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
)

// label is a case's truth; "*" means the case does not decide that verdict.
type label struct {
	Form, Bend, TurnsOver, Direction, Strength, OutlierDriven, Reversal, Spread, ExplainedBy, Drift string
}

// gen is one generated data set.
type gen struct {
	x, y, order, z []float64
	group          []string
}

type suiteCase struct {
	name  string
	seed  uint64
	note  string
	want  label
	build func(r *rand.Rand) gen
}

// open is the label with every verdict left open.
func open() label {
	return label{"*", "*", "*", "*", "*", "*", "*", "*", "*", "*"}
}

func with(mod func(*label)) label {
	l := open()
	mod(&l)
	return l
}

// lineCase draws x uniform on [0, 10] and y = 5 + b·x + e with the noise
// SD set so that the population correlation is rho.
func lineCase(n int, rho float64) func(r *rand.Rand) gen {
	return func(r *rand.Rand) gen {
		const b = 1.0
		sx := 10 / math.Sqrt(12)
		se := math.Abs(b) * sx * math.Sqrt(1-rho*rho) / math.Abs(rho)
		s := 1.0
		if rho < 0 {
			s = -1
		}
		var g gen
		for i := 0; i < n; i++ {
			x := 10 * r.Float64()
			g.x = append(g.x, x)
			g.y = append(g.y, 5+s*b*x+se*r.NormFloat64())
		}
		return g
	}
}

func lineLabel(dir, strength string) label {
	return with(func(l *label) {
		l.Form, l.Bend, l.TurnsOver, l.Direction, l.Strength, l.OutlierDriven = "linear", "none", "false", dir, strength, "false"
		l.Reversal, l.ExplainedBy = "false", ""
	})
}

func noneLabel() label {
	return with(func(l *label) {
		l.Form, l.Bend, l.TurnsOver, l.Direction, l.Strength, l.OutlierDriven = "none", "none", "false", "none", "none", "false"
		l.Reversal, l.ExplainedBy = "false", ""
	})
}

func curveLabel(bend, turns, dir string) label {
	return with(func(l *label) {
		l.Form, l.Bend, l.TurnsOver, l.Direction, l.OutlierDriven = "curved", bend, turns, dir, "false"
	})
}

// fn draws x uniform on [lo, hi] and y = f(x) + N(0, sd).
func fn(n int, lo, hi, sd float64, f func(float64) float64) func(r *rand.Rand) gen {
	return func(r *rand.Rand) gen {
		var g gen
		for i := 0; i < n; i++ {
			x := lo + (hi-lo)*r.Float64()
			g.x = append(g.x, x)
			g.y = append(g.y, f(x)+sd*r.NormFloat64())
		}
		return g
	}
}

func cases() []suiteCase {
	return []suiteCase{
		{"line-strong-positive", 101, "rho 0.9, n 60", lineLabel("positive", "strong"), lineCase(60, 0.9)},
		{"line-strong-negative", 102, "rho -0.9, n 60", lineLabel("negative", "strong"), lineCase(60, -0.9)},
		{"line-very-strong-positive", 103, "rho 0.99, n 25", lineLabel("positive", "strong"), lineCase(25, 0.99)},
		{"line-moderate-positive", 104, "rho 0.55, n 150", lineLabel("positive", "moderate"), lineCase(150, 0.55)},
		{"line-moderate-negative", 105, "rho -0.55, n 150", lineLabel("negative", "moderate"), lineCase(150, -0.55)},
		{"line-weak-positive", 106, "rho 0.25, n 400", lineLabel("positive", "weak"), lineCase(400, 0.25)},
		{"line-weak-negative", 107, "rho -0.25, n 400", lineLabel("negative", "weak"), lineCase(400, -0.25)},
		{"none-small", 201, "independent, n 20", noneLabel(), lineCase0(20)},
		{"none-medium", 202, "independent, n 60", noneLabel(), lineCase0(60)},
		{"none-large", 203, "independent, n 500", noneLabel(), lineCase0(500)},
		{"hump", 301, "y = 10 - (x-5)^2/2.5 + N(0,1), x on [0,10], n 80",
			with(func(l *label) {
				*l = curveLabel("bends-down", "true", "none")
				l.Strength = "none"
			}),
			fn(80, 0, 10, 1, func(x float64) float64 { return 10 - (x-5)*(x-5)/2.5 })},
		{"valley-off-centre", 302, "y = (x-6)^2/3 + N(0,1), x on [0,10], n 80",
			curveLabel("bends-up", "true", "*"),
			fn(80, 0, 10, 1, func(x float64) float64 { return (x - 6) * (x - 6) / 3 })},
		{"saturating", 303, "y = 10(1 - exp(-x/2)) + N(0,0.4), x on [0,8], n 80",
			curveLabel("bends-down", "false", "positive"),
			fn(80, 0, 8, 0.4, func(x float64) float64 { return 10 * (1 - math.Exp(-x/2)) })},
		{"accelerating", 304, "y = exp(x/2) + N(0,1), x on [0,6], n 80",
			curveLabel("bends-up", "false", "positive"),
			fn(80, 0, 6, 1, func(x float64) float64 { return math.Exp(x / 2) })},
		{"decay", 305, "y = 20 exp(-x/3) + N(0,0.5), x on [0,10], n 60",
			curveLabel("bends-up", "false", "negative"),
			fn(60, 0, 10, 0.5, func(x float64) float64 { return 20 * math.Exp(-x/3) })},
		{"periodic", 401, "y = sin(2 pi x / 2.5) + N(0,0.3), x on [0,10] (four cycles), n 200",
			with(func(l *label) { l.Form, l.OutlierDriven = "nonlinear", "false" }),
			fn(200, 0, 10, 0.3, func(x float64) float64 { return math.Sin(2 * math.Pi * x / 2.5) })},
		{"growing-spread", 501, "y = 1 + 2x + N(0, (0.5x)^2), x on [1,10], n 150",
			with(func(l *label) { l.Form, l.Direction, l.Spread, l.OutlierDriven = "linear", "positive", "true", "false" }),
			func(r *rand.Rand) gen {
				var g gen
				for i := 0; i < 150; i++ {
					x := 1 + 9*r.Float64()
					g.x = append(g.x, x)
					g.y = append(g.y, 1+2*x+0.5*x*r.NormFloat64())
				}
				return g
			}},
		{"even-spread", 502, "rho 0.8 line, n 150: the control for growing-spread",
			with(func(l *label) { l.Form, l.Direction, l.Spread = "linear", "positive", "false" }), lineCase(150, 0.8)},
		{"far-point-from-nothing", 601, "30 independent N(0,1) pairs and one row at (12, 12)",
			with(func(l *label) { l.OutlierDriven = "true" }),
			func(r *rand.Rand) gen {
				var g gen
				for i := 0; i < 30; i++ {
					g.x = append(g.x, r.NormFloat64())
					g.y = append(g.y, r.NormFloat64())
				}
				g.x = append(g.x, 12)
				g.y = append(g.y, 12)
				return g
			}},
		{"gross-outlier-in-strong-line", 602, "rho 0.95 line, n 40, one row at mid x lifted by 12 residual SDs",
			with(func(l *label) {
				l.Form, l.Direction, l.OutlierDriven = "linear", "positive", "false"
			}),
			func(r *rand.Rand) gen {
				g := lineCase(39, 0.95)(r)
				se := (10 / math.Sqrt(12)) * math.Sqrt(1-0.95*0.95) / 0.95
				g.x = append(g.x, 5)
				g.y = append(g.y, 5+5+12*se)
				return g
			}},
		{"reversal-within-lots", 701, "three lots; within each y falls 1 per x, lot means rise 3 per x",
			with(func(l *label) { l.Direction, l.Reversal = "positive", "true" }),
			func(r *rand.Rand) gen {
				var g gen
				for k, c := range []float64{2, 5, 8} {
					for i := 0; i < 25; i++ {
						x := c + 2*(r.Float64()-0.5)*1.5
						g.x = append(g.x, x)
						g.y = append(g.y, 3*c-(x-c)+0.5*r.NormFloat64())
						g.group = append(g.group, fmt.Sprintf("lot-%c", 'A'+k))
					}
				}
				return g
			}},
		{"same-direction-in-lots", 702, "three lots; y rises 1 per x within and between lots: the control for reversal",
			with(func(l *label) { l.Direction, l.Reversal = "positive", "false" }),
			func(r *rand.Rand) gen {
				var g gen
				for k, c := range []float64{2, 5, 8} {
					for i := 0; i < 25; i++ {
						x := c + 2*(r.Float64()-0.5)*1.5
						g.x = append(g.x, x)
						g.y = append(g.y, x+0.5*float64(k)+0.7*r.NormFloat64())
						g.group = append(g.group, fmt.Sprintf("lot-%c", 'A'+k))
					}
				}
				return g
			}},
		{"covariate-carries-all", 801, "z ~ N(0,1); x = z + N(0,0.6), y = z + N(0,0.6): no direct link",
			with(func(l *label) { l.Direction, l.ExplainedBy = "positive", "z" }),
			func(r *rand.Rand) gen {
				var g gen
				for i := 0; i < 120; i++ {
					z := r.NormFloat64()
					g.z = append(g.z, z)
					g.x = append(g.x, z+0.6*r.NormFloat64())
					g.y = append(g.y, z+0.6*r.NormFloat64())
				}
				return g
			}},
		{"covariate-irrelevant", 802, "rho 0.7 line with an unrelated z: the control for covariate-carries-all",
			with(func(l *label) { l.Direction, l.ExplainedBy = "positive", "" }),
			func(r *rand.Rand) gen {
				g := lineCase(120, 0.7)(r)
				for range g.x {
					g.z = append(g.z, r.NormFloat64())
				}
				return g
			}},
		{"drift-in-run-order", 901, "rho 0.8 line in run order, y drifting up 0.04 per run over 100 runs",
			with(func(l *label) { l.Direction, l.Drift = "positive", "true" }),
			func(r *rand.Rand) gen {
				g := lineCase(100, 0.8)(r)
				for i := range g.x {
					g.order = append(g.order, float64(i+1))
					g.y[i] += 0.04 * float64(i)
				}
				return g
			}},
		{"no-drift-in-run-order", 902, "rho 0.8 line in run order, no drift: the control for drift",
			with(func(l *label) { l.Direction, l.Drift = "positive", "false" }),
			func(r *rand.Rand) gen {
				g := lineCase(100, 0.8)(r)
				for i := range g.x {
					g.order = append(g.order, float64(i+1))
				}
				return g
			}},
		// Added after the curve rule became a share of the line's residual
		// sum of squares, and drawn (all ten seeds) after that change; no
		// rule was tuned on them.
		{"strong-line-bending-up", 306, "y = 2x + 0.08x^2 + N(0,0.5), x on [0,10], n 100: line R^2 about 0.99, a real bend",
			with(func(l *label) {
				*l = curveLabel("bends-up", "false", "positive")
				l.Strength = "strong"
			}),
			fn(100, 0, 10, 0.5, func(x float64) float64 { return 2*x + 0.08*x*x })},
		{"strong-line-bending-down-fanning", 307, "y = 20 + 3x - 0.1x^2 + N(0, (0.15x)^2), x on [1,10], n 150: line R^2 about 0.96, concave, spread grows",
			with(func(l *label) {
				*l = curveLabel("bends-down", "false", "positive")
				l.Strength, l.Spread = "strong", "true"
			}),
			func(r *rand.Rand) gen {
				var g gen
				for i := 0; i < 150; i++ {
					x := 1 + 9*r.Float64()
					g.x = append(g.x, x)
					g.y = append(g.y, 20+3*x-0.1*x*x+0.15*x*r.NormFloat64())
				}
				return g
			}},
		{"line-on-few-levels-listed-by-y", 403, "x on 4 levels (1 to 4), 50 rows each, y = 5 + 0.25x + N(0,1); rows listed by x, then by y",
			lineLabel("positive", "weak"),
			func(r *rand.Rand) gen {
				var g gen
				for lv := 1; lv <= 4; lv++ {
					ys := make([]float64, 50)
					for i := range ys {
						ys[i] = 5 + 0.25*float64(lv) + r.NormFloat64()
					}
					slices.Sort(ys)
					for _, y := range ys {
						g.x = append(g.x, float64(lv))
						g.y = append(g.y, y)
					}
				}
				return g
			}},
	}
}

// lineCase0 draws independent x uniform on [0, 10] and y normal.
func lineCase0(n int) func(r *rand.Rand) gen {
	return func(r *rand.Rand) gen {
		var g gen
		for i := 0; i < n; i++ {
			g.x = append(g.x, 10*r.Float64())
			g.y = append(g.y, 5+2*r.NormFloat64())
		}
		return g
	}
}

// replicates is the number of extra seeds drawn for each construction in
// each of the sets check and holdout.
const replicates = 3

func ftoa(v float64) string { return strconv.FormatFloat(v, 'g', 10, 64) }

func writeCSV(path string, rows [][]string) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	w := csv.NewWriter(f)
	if err := w.WriteAll(rows); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

func main() {
	dir := flag.String("o", "analysis/findings/testdata/suite", "folder to write the suite into")
	flag.Parse()
	if err := os.MkdirAll(*dir, 0o755); err != nil {
		fmt.Fprintln(os.Stderr, "gensuite:", err)
		os.Exit(1)
	}
	labels := [][]string{{"case", "set", "seed", "form", "bend", "turns_over", "direction", "strength",
		"outlier_driven", "reversal", "spread_changes", "explained_by", "drift", "construction"}}
	all := cases()
	for _, c := range cases() {
		for k := uint64(1); k <= 3*replicates; k++ {
			r := c
			switch {
			case k > 2*replicates:
				r.name = fmt.Sprintf("%s-final%d", c.name, k-2*replicates)
			case k > replicates:
				r.name = fmt.Sprintf("%s-holdout%d", c.name, k-replicates)
			default:
				r.name = fmt.Sprintf("%s-check%d", c.name, k)
			}
			r.seed = c.seed*100 + k
			all = append(all, r)
		}
	}
	for _, c := range all {
		g := c.build(rand.New(rand.NewPCG(c.seed, 20261201)))
		head := []string{"x", "y"}
		if g.group != nil {
			head = append(head, "group")
		}
		if g.order != nil {
			head = append(head, "order")
		}
		if g.z != nil {
			head = append(head, "z")
		}
		rows := [][]string{head}
		for i := range g.x {
			row := []string{ftoa(g.x[i]), ftoa(g.y[i])}
			if g.group != nil {
				row = append(row, g.group[i])
			}
			if g.order != nil {
				row = append(row, ftoa(g.order[i]))
			}
			if g.z != nil {
				row = append(row, ftoa(g.z[i]))
			}
			rows = append(rows, row)
		}
		if err := writeCSV(filepath.Join(*dir, c.name+".csv"), rows); err != nil {
			fmt.Fprintln(os.Stderr, "gensuite:", err)
			os.Exit(1)
		}
		w := c.want
		set := "tuning"
		switch {
		case c.seed > 1000 && c.seed%100 > 2*replicates:
			set = "final"
		case c.seed > 1000 && c.seed%100 > replicates:
			set = "holdout"
		case c.seed > 1000:
			set = "check"
		}
		labels = append(labels, []string{c.name, set, strconv.FormatUint(c.seed, 10), w.Form, w.Bend, w.TurnsOver,
			w.Direction, w.Strength, w.OutlierDriven, w.Reversal, w.Spread, w.ExplainedBy, w.Drift, c.note})
	}
	if err := writeCSV(filepath.Join(*dir, "labels.csv"), labels); err != nil {
		fmt.Fprintln(os.Stderr, "gensuite:", err)
		os.Exit(1)
	}
}
