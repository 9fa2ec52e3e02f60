package compare_test

import (
	"bytes"
	"encoding/json"
	"io"
	"testing"

	"bivar/analysis/compare"
	"bivar/analysis/report"
	"bivar/render/changes"
)

// smallDiff is the diff.json of two one-study runs whose slope changed,
// compacted so that the seed stays small.
func smallDiff(f *testing.F) []byte {
	side := func(sxy float64, dir string) *report.Report {
		return &report.Report{Schema: report.Schema, Tool: report.Tool{Name: "bivar", Version: "test"},
			Manifest: report.ManifestInfo{Title: "t", Alpha: 0.05, Adjust: "holm"},
			Datasets: []report.Dataset{{ID: "d", File: "d.csv", SHA256: "h", Rows: 30}},
			Studies: []report.Study{{ID: "s", Dataset: "d", X: report.Variable{Column: "x", Unit: "Cel"}, Y: report.Variable{Column: "y"}, N: 30,
				Moments:  &report.Moments{N: 30, MeanX: 10, MeanY: 5, Sxx: 100, Syy: 80, Sxy: report.Float(sxy)},
				Findings: &report.Findings{Form: "linear", Direction: dir, Strength: "strong"}}}}
	}
	var buf, small bytes.Buffer
	if err := compare.Write(&buf, compare.Diff(side(80, "positive"), side(-60, "negative"), compare.Options{})); err != nil {
		f.Fatal(err)
	}
	if err := json.Compact(&small, buf.Bytes()); err != nil {
		f.Fatal(err)
	}
	return small.Bytes()
}

// FuzzReadDiff: compare.Read (the diff.json reader) never panics; what it
// accepts is written back, read again and written to the same bytes, and
// the renderers take it.
func FuzzReadDiff(f *testing.F) {
	f.Add(smallDiff(f))
	f.Add([]byte(`{"schema":"bivar.diff/v1","studies":[{"id":"s","r":{"old":"NaN"}}]}`))
	f.Add([]byte(`{"schema":"bivar.diff/v1","studies":[{"id":"s","r":{"old":null,"new":1e999}}]}`))
	f.Add([]byte(`{"schema":"bivar.diff/v2"}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		res, err := compare.Read(bytes.NewReader(data))
		if err != nil {
			if err.Error() == "" {
				t.Fatal("an empty error")
			}
			return
		}
		var a, b bytes.Buffer
		if err := compare.Write(&a, res); err != nil {
			return // a value JSON cannot hold; Read accepted it, Write says so
		}
		again, err := compare.Read(bytes.NewReader(a.Bytes()))
		if err != nil {
			t.Fatalf("written diff does not read back: %v\n%s", err, a.String())
		}
		if err := compare.Write(&b, again); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(a.Bytes(), b.Bytes()) {
			t.Fatalf("unstable round trip:\n%s\n---\n%s", a.String(), b.String())
		}
		if err := changes.Markdown(io.Discard, res); err != nil {
			t.Fatal(err)
		}
		if err := changes.HTML(io.Discard, res); err != nil {
			t.Fatal(err)
		}
	})
}
