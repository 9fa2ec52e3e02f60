package manifest_test

import (
	"fmt"

	"bivar/analysis/manifest"
)

func ExampleLoad() {
	m, err := manifest.Load("testdata/good.toml")
	if err != nil {
		fmt.Println(err)
		return
	}
	s := m.Studies[0]
	fmt.Printf("%s: %s vs %s, also in %v (line %d)\n", s.ID, s.Y, s.X, s.AlsoIn.X, s.Line)
	fmt.Println("adjust", m.Adjust, "alpha", m.Alpha, "seed", m.Seed)
	// Output:
	// shrinkage-vs-melt: shrinkage vs melt_temp, also in [[degF]] (line 23)
	// adjust holm alpha 0.05 seed 20261201
}

func ExampleLoad_errors() {
	_, err := manifest.Load("testdata/unknown-key.toml")
	fmt.Println(err)
	// Output:
	// testdata/unknown-key.toml:6:1: study "shrinkage-vs-melt" has no y: add y = "…" (the column of the response)
	// testdata/unknown-key.toml:10:2: unknown key "study.yy" — did you mean "study.y"?
}
