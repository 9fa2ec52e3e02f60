package report

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"
)

func TestFloatJSON(t *testing.T) {
	cases := []struct {
		in   Float
		want string
	}{
		{Float(math.NaN()), "null"},
		{Float(math.Inf(1)), "null"},
		{Float(math.Inf(-1)), "null"},
		{0, "0"},
		{0.1, "0.1"},
		{-2.5e-300, "-2.5e-300"},
		{0.81642051634484, "0.81642051634484"},
	}
	for _, tc := range cases {
		b, err := json.Marshal(tc.in)
		if err != nil || string(b) != tc.want {
			t.Errorf("Marshal(%v) = %s, %v; want %s", float64(tc.in), b, err, tc.want)
		}
		var back Float
		if err := json.Unmarshal(b, &back); err != nil {
			t.Fatalf("Unmarshal(%s): %v", b, err)
		}
		if tc.in.Valid() && back != tc.in {
			t.Errorf("round trip of %v gave %v", float64(tc.in), float64(back))
		}
		if !tc.in.Valid() && !math.IsNaN(float64(back)) {
			t.Errorf("null read back as %v, want NaN", float64(back))
		}
	}
}

// sample is a small Report with every kind of value: nested sections,
// undefined numbers and an error.
func sample() *Report {
	msg := "column \"y\" is constant"
	bend := "bends-down"
	return &Report{
		Schema:   Schema,
		Tool:     Tool{Name: "bivar", Version: "dev"},
		Manifest: ManifestInfo{File: "m.toml", Title: "t <&>", Alpha: 0.05, Adjust: "holm"},
		Datasets: []Dataset{{ID: "d", File: "d.csv", Rows: 3, Missing: []ColumnCount{{"x", 1}}}},
		Studies: []Study{
			{ID: "a", Pearson: &Pearson{R: 0.5, CILow: NaN(), CIHigh: 0.9, P: 1e-320}, Findings: &Findings{Form: "curved", Bend: &bend}},
			{ID: "b", Error: &msg},
		},
		Caution: Caution,
	}
}

func TestWriteReadStable(t *testing.T) {
	var first bytes.Buffer
	if err := Write(&first, sample()); err != nil {
		t.Fatal(err)
	}
	if !strings.HasSuffix(first.String(), "}\n") {
		t.Error("results.json does not end in one newline")
	}
	if !strings.Contains(first.String(), `"ci_low": null`) {
		t.Error("NaN not written as null")
	}
	if !strings.Contains(first.String(), `"title": "t <&>"`) {
		t.Error("HTML characters escaped in JSON; want them as written")
	}
	back, err := Read(bytes.NewReader(first.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	var second bytes.Buffer
	if err := Write(&second, back); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(first.Bytes(), second.Bytes()) {
		t.Errorf("JSON -> Report -> JSON changed the bytes:\n%s\n---\n%s", first.String(), second.String())
	}
}

func TestReadRefuses(t *testing.T) {
	cases := []struct{ name, in, want string }{
		{"other-schema", `{"schema": "bivar.results/v9"}`, `schema "bivar.results/v9"`},
		{"unknown-key", `{"schema": "bivar.results/v3", "extra": 1}`, `unknown field "extra"`},
		{"not-json", `<html>`, "not a bivar results file"},
		{"bad-number", `{"schema": "bivar.results/v1", "studies": [{"n_missing": 1, "pearson": {"r": "x"}}]}`, "studies[0].pearson.r"},
	}
	for _, tc := range cases {
		_, err := Read(strings.NewReader(tc.in))
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: Read error %v, want one containing %q", tc.name, err, tc.want)
		}
	}
	// A v1 file, with the key v2 renamed, is read for `bivar diff`.
	r, err := Read(strings.NewReader(`{"schema": "bivar.results/v1", "manifest": {"thresholds": {"curve_gain_r2": 0.05}}, "studies": [{"id": "s", "moments": {"n": 5}}]}`))
	if err != nil || len(r.Studies) != 1 || r.Studies[0].Moments.N != 5 {
		t.Errorf("v1 file: %v, %+v", err, r)
	}
	// A v2 file (no kind, agreement, plan or scale keys) is read too.
	r, err = Read(strings.NewReader(`{"schema": "bivar.results/v2", "studies": [{"id": "s", "moments": {"n": 7}}]}`))
	if err != nil || len(r.Studies) != 1 || r.Studies[0].Moments.N != 7 {
		t.Errorf("v2 file: %v, %+v", err, r)
	}
}

// FuzzResults checks that reading never panics and that whatever reads
// back writes the same bytes twice (JSON -> Report -> JSON is stable).
//
// The seeds are small, compact JSON: the fuzzer minimises every input that
// finds new code, and a large seed makes each of those take seconds.
func FuzzResults(f *testing.F) {
	f.Add([]byte(`{"schema":"bivar.results/v1","manifest":{"title":"t <&>","alpha":0.05,"adjust":"holm"},` +
		`"datasets":[{"id":"d","file":"d.csv","rows":3,"missing":[{"column":"x","count":1}]}],` +
		`"studies":[{"id":"a","pearson":{"r":0.5,"ci_low":null,"ci_high":0.9,"p":1e-320},"findings":{"form":"curved","bend":"bends-down"}},{"id":"b","error":"constant"}]}`))
	f.Add([]byte(`{"schema":"bivar.results/v1","studies":[{"pearson":{"r":null}}]}`))
	f.Add([]byte(`{"schema":"bivar.results/v1","studies":[{"pearson":{"r":"NaN"}}]}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		r, err := Read(bytes.NewReader(data))
		if err != nil {
			return
		}
		var a, b bytes.Buffer
		if err := Write(&a, r); err != nil {
			return // e.g. a value JSON cannot hold; Read accepted it, Write says so
		}
		r2, err := Read(bytes.NewReader(a.Bytes()))
		if err != nil {
			t.Fatalf("written results do not read back: %v\n%s", err, a.String())
		}
		if err := Write(&b, r2); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(a.Bytes(), b.Bytes()) {
			t.Fatalf("unstable round trip:\n%s\n---\n%s", a.String(), b.String())
		}
	})
}
