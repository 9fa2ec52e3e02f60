package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCommittedDataMatchGenerator keeps data/ in step with the generator:
// the committed files must be exactly what `go run ./sample-project/gen`
// writes. (It checks reproducibility only; invented data are never used as
// check values for bivar's statistics.)
func TestCommittedDataMatchGenerator(t *testing.T) {
	for _, r := range runs {
		want := encode(r, generate(r))
		got, err := os.ReadFile(filepath.Join("..", "data", r.file))
		if err != nil {
			t.Fatalf("%v (run `go run ./sample-project/gen` to write it)", err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("data/%s differs from the generator's output: run `go run ./sample-project/gen` and commit the result", r.file)
		}
		if again := encode(r, generate(r)); !bytes.Equal(again, want) {
			t.Errorf("%s: two generations differ: the generator is not deterministic", r.file)
		}
	}
}

// TestEncodeFormats checks the two export formats on the header and the
// first data row: comma and decimal point for October, semicolon and
// decimal comma for November, with "NA" cells kept as they are.
func TestEncodeFormats(t *testing.T) {
	for _, r := range runs {
		lines := strings.Split(string(encode(r, generate(r))), "\n")
		if len(lines) != r.n+2 || lines[len(lines)-1] != "" {
			t.Fatalf("%s: %d lines, want header, %d rows and a final newline", r.file, len(lines), r.n)
		}
		delim, other := ",", ";"
		if r.semicolon {
			delim, other = ";", ","
		}
		for i, line := range lines[:len(lines)-1] {
			if got := len(strings.Split(line, delim)); got != len(columns) {
				t.Fatalf("%s line %d: %d fields split on %q, want %d", r.file, i+1, got, delim, len(columns))
			}
			if !r.semicolon && strings.Contains(line, other) {
				t.Fatalf("%s line %d: unexpected %q in %q", r.file, i+1, other, line)
			}
		}
		if r.semicolon && !strings.Contains(lines[1], ",") {
			t.Errorf("%s: no decimal comma in %q", r.file, lines[1])
		}
		na := strings.Count(strings.Join(lines, delim), delim+"NA")
		want := 0
		for _, cols := range r.missing {
			want += len(cols)
		}
		if na != want {
			t.Errorf("%s: %d NA cells, want %d", r.file, na, want)
		}
	}
}

// TestManifestsShareStudies: the October and November manifests must
// declare the same units, labels and studies, or `bivar diff` would compare
// different things.
func TestManifestsShareStudies(t *testing.T) {
	tail := func(name string) string {
		b, err := os.ReadFile(filepath.Join("..", name))
		if err != nil {
			t.Fatal(err)
		}
		s := string(b)
		i := strings.Index(s, "\n[dataset.units]\n")
		if i < 0 {
			t.Fatalf("%s: no [dataset.units] table", name)
		}
		return s[i:]
	}
	if tail("bivar.toml") != tail("bivar-nov.toml") {
		t.Errorf("bivar.toml and bivar-nov.toml differ from [dataset.units] down: make the studies identical")
	}
	// The PostgreSQL and workbook manifests read the shafts' October run
	// only (not the gauge file), so they hold every study but the gauge
	// study, which comes last in bivar.toml.
	oct := tail("bivar.toml")
	if i := strings.Index(oct, "\n[[study]]\nid           = \"testers-agree\""); i >= 0 {
		oct = oct[:i]
	} else {
		t.Fatal("bivar.toml: no testers-agree study")
	}
	for _, other := range []string{"bivar-pg.toml", "bivar-xlsx.toml"} {
		if oct != tail(other) {
			t.Errorf("bivar.toml (without the gauge study) and %s differ from [dataset.units] down: make the studies identical", other)
		}
	}
}
