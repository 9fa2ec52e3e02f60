package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCommittedGaugeData keeps the gauge files in step with the generator
// (reproducibility only: invented data are never check values).
func TestCommittedGaugeData(t *testing.T) {
	for _, g := range gaugeRuns {
		want := encodeGauge(g)
		got, err := os.ReadFile(filepath.Join("..", "data", g.file))
		if err != nil {
			t.Fatalf("%v (run `go run ./sample-project/gen` to write it)", err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("data/%s differs from the generator's output: run `go run ./sample-project/gen` and commit the result", g.file)
		}
		if lines := strings.Count(string(want), "\n"); lines != g.n+1 {
			t.Errorf("%s: %d lines, want a header and %d rows", g.file, lines, g.n)
		}
	}
}
