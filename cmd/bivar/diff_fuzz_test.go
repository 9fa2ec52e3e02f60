package main

import (
	"io"
	"strings"
	"testing"

	"bivar/analysis/compare"
	"bivar/render/changes"
)

// FuzzDiffFiles: any bytes as OLD either give an error that names the
// file, or a Report that compare and the renderers take without
// panicking. The seeds are small (a results.json cut to one study), so
// that the fuzzer spends its time on new inputs rather than on
// minimising large ones; parseResults is the file reader without the
// file, so no input touches the disk.
func FuzzDiffFiles(f *testing.F) {
	const study = `{"id":"s","dataset":"d","x":{"column":"x"},"y":{"column":"y"},"n":40,` +
		`"moments":{"n":40,"mean_x":10,"mean_y":9,"sxx":160,"syy":110,"sxy":128},` +
		`"findings":{"form":"linear","direction":"positive","strength":"strong"}}`
	f.Add([]byte(`{"schema":"bivar.results/v1","manifest":{"title":"run","alpha":0.05,"adjust":"holm"},` +
		`"datasets":[{"id":"d","file":"d.csv","sha256":"h","rows":40}],"studies":[` + study + `]}`))
	f.Add([]byte(`{"schema":"bivar.results/v1","studies":[{"id":"s","moments":{"n":2,"sxx":0}}]}`))
	f.Add([]byte(`{"schema":"bivar.results/v1","studies":[{"id":"s","pearson":{"r":"NaN"}}]}`))
	f.Add([]byte(`{"schema":"bivar.results/v1","studies":[` + study[:60]))
	f.Add([]byte("\xef\xbb\xbf{}"))
	newRep := runOf(2, 0.8, "strong")
	const file = "old/results.json"
	f.Fuzz(func(t *testing.T, data []byte) {
		rep, err := parseResults(file, data)
		if err != nil {
			if !strings.Contains(err.Error(), file) {
				t.Fatalf("error does not name the file: %v", err)
			}
			return
		}
		res := compare.Diff(rep, newRep, compare.Options{})
		if err := changes.Markdown(io.Discard, res); err != nil {
			t.Fatal(err)
		}
		if err := changes.HTML(io.Discard, res); err != nil {
			t.Fatal(err)
		}
		if err := compare.Write(io.Discard, res); err != nil {
			t.Fatal(err)
		}
	})
}
