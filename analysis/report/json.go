package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"reflect"
	"strconv"

	"bivar/analysis/internal/jsonloc"
	"bivar/internal/cleantext"
)

// Float is a float64 that is written to JSON as null when it is NaN or
// infinite, and read back from null as NaN.
type Float float64

// NaN is the undefined Float.
func NaN() Float { return Float(math.NaN()) }

// Valid reports whether f is a finite number.
func (f Float) Valid() bool { return !math.IsNaN(float64(f)) && !math.IsInf(float64(f), 0) }

// MarshalJSON writes f with the shortest decimal that reads back to the
// same float64, or null.
func (f Float) MarshalJSON() ([]byte, error) {
	v := float64(f)
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return []byte("null"), nil
	}
	return json.Marshal(v)
}

// UnmarshalJSON reads a number, or null as NaN.
func (f *Float) UnmarshalJSON(b []byte) error {
	if string(b) == "null" {
		*f = NaN()
		return nil
	}
	v, err := strconv.ParseFloat(string(b), 64)
	if err != nil {
		// A type error, so that encoding/json adds the field path and
		// Read the line (jsonloc.Fill); "NaN" and infinities are null.
		what := "number " + string(b)
		switch b[0] {
		case '"':
			what = "string"
		case 't', 'f':
			what = "bool"
		case '[':
			what = "array"
		case '{':
			what = "object"
		}
		return &json.UnmarshalTypeError{Value: what, Type: reflect.TypeFor[Float]()}
	}
	*f = Float(v)
	return nil
}

// Write encodes r as results.json: two-space indent, keys in struct order,
// one final newline. The same Report always gives the same bytes.
func Write(w io.Writer, r *Report) error {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(r); err != nil {
		return fmt.Errorf("report: encoding results: %w", err)
	}
	_, err := w.Write(cleantext.JSON(buf.Bytes()))
	return err
}

// Read decodes a results.json. It refuses another schema and unknown keys,
// so a file written by a newer bivar is not half-understood; a v1 file is
// read without the unknown-key check (its keys that v2 renamed are left
// out; every key `bivar diff` reads is the same in both, see Schema).
func Read(rd io.Reader) (*Report, error) {
	data, err := io.ReadAll(rd)
	if err != nil {
		return nil, fmt.Errorf("reading results: %w", err)
	}
	var head struct {
		Schema string `json:"schema"`
	}
	_ = json.Unmarshal(data, &head) // a bad file is explained by the decode below
	dec := json.NewDecoder(bytes.NewReader(data))
	if head.Schema != "bivar.results/v1" {
		dec.DisallowUnknownFields()
	}
	var r Report
	if err := dec.Decode(&r); err != nil {
		jsonloc.Fill(data, err)
		return nil, fmt.Errorf("not a bivar results file: %w", err)
	}
	if !ReadsSchema(r.Schema) {
		return nil, fmt.Errorf("schema %q, want %q: written by another version of bivar", r.Schema, Schema)
	}
	return &r, nil
}
