// Command gen writes the invented data of bivar's sample project: two
// production runs of a fictional quench-and-temper line for steel drive
// shafts. Nothing in these files was measured; the numbers come from the
// model below and a fixed seed.
//
// Run it from the repository root (or from sample-project/):
//
//	go run ./sample-project/gen
//
// It rewrites sample-project/data/run-2026-10.csv (comma-delimited, decimal
// point) and sample-project/data/run-2026-11.csv (semicolon-delimited,
// decimal comma, as a European plant's export would be), and the gauge
// study of each run (gauge-2026-10.csv, gauge-2026-11.csv; see gauge.go),
// byte for byte the same every time. Random numbers come only from math/rand/v2's PCG source
// (a specified algorithm), turned into uniform and normal draws here, so the
// output does not depend on how a Go release implements Rand's helpers.
//
// The seeds were chosen, and this is said so that nobody reads more into
// the demo than is there: seeds 20261001+k (October) and 20261101+k
// (November) were tried for k = 0 to 80, and k = 69 was the first for which
// every study made its intended point in both runs without a side finding
// that chance alone produces now and then (a lack of fit, a change of
// spread, a drift in run order, an outlier, a significant change between
// runs in a study whose model did not change). With other seeds such side
// findings appear at about the rates the tests' significance levels say.
//
// The model (one row per shaft; see ../README.md for what each study shows):
//
//   - temper_temp is the tempering set point, 400 to 600 Cel in steps of 25;
//     surface_hardness falls along a straight line with it. In November a new
//     steel heat with more molybdenum resists tempering: the line starts a
//     little higher and falls more slowly (slope -0.080 -> -0.058 HRC per Cel).
//     This is the one relationship that changes between the runs.
//   - austenitize_temp is a set point from 820 to 900 Cel in steps of 10,
//     each used equally often (shuffled in blocks of nine), plus up to ±3 Cel
//     of furnace variation; impact_energy peaks near 857 Cel and falls on
//     both sides (a curve turning over inside the range).
//   - transfer_time (furnace door to oil) is about 11 s; one shaft per run
//     waited much longer behind a sticking door and came out soft in the
//     core. Below 15 s the wait does nothing to core_hardness.
//   - soak_time varies from 45 to 90 min and does nothing to hardness.
//   - quench_tank Q1, Q2, Q3 run their oil at about 48, 62 and 76 Cel. Within
//     each tank hotter oil gives less runout (a gentler quench); the hotter
//     tanks are also the older ones with poorer agitation and more runout,
//     so pooled over tanks runout rises with oil temperature.
//   - shop_rh (ambient relative humidity) wanders with the weather over the
//     run. The atmosphere controller adds enrichment gas when the furnace dew
//     point rises with it, and the wetter atmosphere decarburizes the surface
//     more; enrich_gas_flow itself has no effect on decarb_depth.
//   - A few cells are "NA": a hardness tester out of service, an impact
//     specimen lost, a humidity logger gap.
package main

import (
	"bytes"
	"errors"
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
)

// run describes one production run: its size, seed, export format and the
// parameters that differ between runs.
type run struct {
	file      string
	prefix    string // part id prefix
	n         int
	seed      uint64 // each block of variables draws from its own PCG(seed, block) stream
	semicolon bool   // semicolon delimiter and decimal comma
	// surface_hardness = hrc400 + hrcSlope·(temper_temp − 400) + noise
	hrc400, hrcSlope float64
	slowTransfer     map[int]float64 // row index -> transfer time of a door fault, s
	missing          map[int][]string
}

var runs = []run{
	{
		file: "run-2026-10.csv", prefix: "D10-", n: 120,
		seed:   20261070,
		hrc400: 48.0, hrcSlope: -0.080,
		slowTransfer: map[int]float64{87: 36.0},
		missing: map[int][]string{
			14: {"surface_hardness"}, 15: {"surface_hardness"},
			52: {"impact_energy"}, 101: {"shop_rh"},
		},
	},
	{
		file: "run-2026-11.csv", prefix: "D11-", n: 116,
		seed: 20261170, semicolon: true,
		hrc400: 49.0, hrcSlope: -0.058,
		slowTransfer: map[int]float64{23: 34.0},
		missing: map[int][]string{
			40: {"surface_hardness", "core_hardness"},
			77: {"impact_energy"}, 9: {"shop_rh"},
		},
	},
}

// columns in file order, with the number of decimals written (-1: text).
var columns = []struct {
	name     string
	decimals int
}{
	{"part_id", -1}, {"load_seq", 0}, {"shift", -1}, {"quench_tank", -1},
	{"austenitize_temp", 1}, {"soak_time", 0}, {"transfer_time", 1},
	{"oil_temp", 1}, {"temper_temp", 0}, {"enrich_gas_flow", 2},
	{"shop_rh", 1}, {"surface_hardness", 1}, {"core_hardness", 1},
	{"impact_energy", 1}, {"runout", 3}, {"decarb_depth", 0},
}

// draws turns a PCG stream into uniform and normal variates.
type draws struct{ src *rand.PCG }

// unif returns a uniform variate in [0, 1) from the top 53 bits.
func (d draws) unif() float64 { return float64(d.src.Uint64()>>11) / (1 << 53) }

// between returns a uniform variate in [lo, hi).
func (d draws) between(lo, hi float64) float64 { return lo + (hi-lo)*d.unif() }

// normal returns a standard normal variate (Box–Muller, one of the pair).
func (d draws) normal() float64 {
	u := 1 - d.unif() // (0, 1]
	v := d.unif()
	return math.Sqrt(-2*math.Log(u)) * math.Cos(2*math.Pi*v)
}

// shuffled returns 0..n-1 in random order (Fisher–Yates).
func shuffled(d draws, n int) []int {
	p := make([]int, n)
	for i := range p {
		p[i] = i
	}
	for i := n - 1; i > 0; i-- {
		j := int(d.unif() * float64(i+1))
		p[i], p[j] = p[j], p[i]
	}
	return p
}

// generate returns the rows of one run, each a map from column to value
// (float64 or string).
func generate(r run) []map[string]any {
	// One stream per block of related variables, so that a change to one
	// block's model leaves the draws of the others as they were.
	stream := func(block uint64) draws { return draws{rand.NewPCG(r.seed, block)} }
	quench, austen, soaking, transfers, tempering, humidity :=
		stream(1), stream(2), stream(3), stream(4), stream(5), stream(6)
	tanks := []string{"Q1", "Q2", "Q3"}
	setpoint := map[string]float64{"Q1": 48, "Q2": 62, "Q3": 76}
	baseRunout := map[string]float64{"Q1": 0.100, "Q2": 0.160, "Q3": 0.220}
	shifts := []string{"early", "late", "night"}
	phase := humidity.between(0, 2*math.Pi)

	var austLevels []int // austenitizing set points, 9 at a time in shuffled order
	rows := make([]map[string]any, r.n)
	for i := range rows {
		tank := tanks[int(quench.unif()*3)]
		if len(austLevels) == 0 {
			austLevels = shuffled(austen, 9)
		}
		aust := 820 + 10*float64(austLevels[0]) + austen.between(-3, 3)
		austLevels = austLevels[1:]
		soak := math.Round(soaking.between(45, 90))
		transfer := 11 + 0.6*transfers.normal()
		if t, ok := r.slowTransfer[i]; ok {
			transfer = t
		}
		oil := setpoint[tank] + quench.between(-7, 7)
		temper := 400 + 25*float64(int(tempering.unif()*9))
		rh := 50 + 14*math.Sin(2*math.Pi*1.3*float64(i)/float64(r.n)+phase) + 3*humidity.normal()
		flow := 8.0 + 0.06*(rh-50) + 0.25*humidity.normal()
		surface := r.hrc400 + r.hrcSlope*(temper-400) + 1.0*tempering.normal()
		core := 24 + 0.25*(surface-40) + 0.8*transfers.normal()
		if transfer > 15 {
			core -= 0.45 * (transfer - 15)
		}
		impact := 62 - 0.022*(aust-857)*(aust-857) + 2.5*austen.normal()
		runout := baseRunout[tank] - 0.0035*(oil-setpoint[tank]) + 0.008*quench.normal()
		decarb := 60 + 1.5*(rh-50) + 8*humidity.normal()

		rows[i] = map[string]any{
			"part_id":          fmt.Sprintf("%s%03d", r.prefix, i+1),
			"load_seq":         float64(i + 1),
			"shift":            shifts[(i/40)%3],
			"quench_tank":      tank,
			"austenitize_temp": aust,
			"soak_time":        soak,
			"transfer_time":    transfer,
			"oil_temp":         oil,
			"temper_temp":      temper,
			"enrich_gas_flow":  flow,
			"shop_rh":          rh,
			"surface_hardness": surface,
			"core_hardness":    core,
			"impact_energy":    impact,
			"runout":           runout,
			"decarb_depth":     decarb,
		}
		for _, c := range r.missing[i] {
			rows[i][c] = "NA"
		}
	}
	return rows
}

// encode writes the rows as CSV text in the run's export format.
func encode(r run, rows []map[string]any) []byte {
	delim, point := ",", "."
	if r.semicolon {
		delim, point = ";", ","
	}
	var b bytes.Buffer
	for i, c := range columns {
		if i > 0 {
			b.WriteString(delim)
		}
		b.WriteString(c.name)
	}
	b.WriteByte('\n')
	for _, row := range rows {
		for i, c := range columns {
			if i > 0 {
				b.WriteString(delim)
			}
			switch v := row[c.name].(type) {
			case string:
				b.WriteString(v)
			case float64:
				s := strconv.FormatFloat(v, 'f', c.decimals, 64)
				if strings.HasPrefix(s, "-") && strings.Trim(s, "-0.") == "" {
					s = s[1:] // no negative zero after rounding
				}
				b.WriteString(strings.Replace(s, ".", point, 1))
			}
		}
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// dataDir finds sample-project/data from the repository root or from
// sample-project itself.
func dataDir() (string, error) {
	for _, dir := range []string{"sample-project", "."} {
		if _, err := os.Stat(filepath.Join(dir, "gen", "main.go")); err == nil {
			return filepath.Join(dir, "data"), nil
		}
	}
	return "", errors.New("cannot find sample-project/gen/main.go: run from the repository root or from sample-project/, or give -o DIR")
}

func main() {
	out := flag.String("o", "", "folder to write the CSV files to (default: sample-project/data)")
	flag.Parse()
	dir := *out
	if dir == "" {
		var err error
		if dir, err = dataDir(); err != nil {
			fmt.Fprintln(os.Stderr, "gen:", err)
			os.Exit(1)
		}
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		fmt.Fprintln(os.Stderr, "gen:", err)
		os.Exit(1)
	}
	for _, r := range runs {
		path := filepath.Join(dir, r.file)
		if err := os.WriteFile(path, encode(r, generate(r)), 0o644); err != nil {
			fmt.Fprintln(os.Stderr, "gen:", err)
			os.Exit(1)
		}
		fmt.Fprintln(os.Stderr, "gen: wrote", path)
	}
	for _, g := range gaugeRuns {
		path := filepath.Join(dir, g.file)
		if err := os.WriteFile(path, encodeGauge(g), 0o644); err != nil {
			fmt.Fprintln(os.Stderr, "gen:", err)
			os.Exit(1)
		}
		fmt.Fprintln(os.Stderr, "gen: wrote", path)
	}
}
