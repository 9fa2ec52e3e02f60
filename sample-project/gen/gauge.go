package main

// This file writes the invented gauge study of the sample project: two
// Rockwell hardness testers measuring the surface hardness of the same
// shafts, each twice, once per production run.
//
// The model (one row per shaft):
//
//   - the shaft's true surface hardness is 40 ± 4 HRC (normal), the spread
//     of a tempering-temperature sweep;
//   - tester_a (the bench tester in the lab) reads it with a repeatability
//     SD of 0.25 HRC and no bias;
//   - tester_b (the portable tester on the line) reads it with a
//     repeatability SD of 0.30 HRC and a bias of +0.2 HRC in October; in
//     November, after its indenter was replaced, it reads +1.0 HRC high:
//     the two testers no longer agree within the ±1.5 HRC the shop accepts;
//   - readings are written to 0.1 HRC, as the testers display them.
//
// Seeds: 20261090 (October) and 20261190 (November), the first tried; the
// October testers agree within ±1.5 HRC and the November ones do not, as
// the model says they should at these sizes (the limits' margins are
// several standard errors wide).

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"strconv"
)

// gaugeRun is one run's gauge study.
type gaugeRun struct {
	file   string
	prefix string
	n      int
	seed   uint64
	biasB  float64 // tester_b − true, HRC
}

var gaugeRuns = []gaugeRun{
	{file: "gauge-2026-10.csv", prefix: "G10-", n: 40, seed: 20261090, biasB: 0.2},
	{file: "gauge-2026-11.csv", prefix: "G11-", n: 40, seed: 20261190, biasB: 1.0},
}

// encodeGauge returns the run's gauge study as CSV text (comma, decimal
// point).
func encodeGauge(g gaugeRun) []byte {
	d := draws{rand.NewPCG(g.seed, 1)}
	var b bytes.Buffer
	b.WriteString("shaft_id,tester_a_1,tester_a_2,tester_b_1,tester_b_2\n")
	hrc := func(v float64) string { return strconv.FormatFloat(v, 'f', 1, 64) }
	for i := range g.n {
		truth := 40 + 4*d.normal()
		a1, a2 := truth+0.25*d.normal(), truth+0.25*d.normal()
		b1, b2 := truth+g.biasB+0.30*d.normal(), truth+g.biasB+0.30*d.normal()
		fmt.Fprintf(&b, "%s%03d,%s,%s,%s,%s\n", g.prefix, i+1, hrc(a1), hrc(a2), hrc(b1), hrc(b2))
	}
	return b.Bytes()
}
