package analysis_test

import "testing"

// Breusch–Pagan at the ends of double precision's range, pushed down as
// in memory (the statistic's denominator taken as two square roots).
func TestPushdownSweepScale(t *testing.T) {
	runAdv(t, []advCase{
		// x and y near 10⁵⁰ and near 10⁻⁶⁰ (15 rows): Breusch–Pagan
		// divided by √(Σu²·Σe⁴), a product that overflowed (statistic 0,
		// p = 1) or underflowed (statistic +Inf, p = 0 and "spread
		// changes"); in memory, as exact arithmetic gives, 7.527e-05 and
		// 0.05335 (the same as the same rows at scale 1).
		{name: "scale", setup: []string{"DROP TABLE IF EXISTS sw_tscale",
			`CREATE TABLE sw_tscale AS SELECT i AS id, (i * 1e50)::float8 AS xb, ((i * i + sin(i)) * 1e50)::float8 AS yb,
			  (i * 1e-60)::float8 AS xs, ((i + 3 * sin(i)) * 1e-60)::float8 AS ys FROM generate_series(1, 15) i`},
			decl: table("sw_tscale"), studies: "[[study]]\nid = \"big\"\ndataset = \"d\"\nx = \"xb\"\ny = \"yb\"\n" +
				"[[study]]\nid = \"small\"\ndataset = \"d\"\nx = \"xs\"\ny = \"ys\"\n", maxRows: 5},
	})
}
