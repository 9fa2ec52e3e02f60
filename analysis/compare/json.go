package compare

// This file holds diff.json's encoding: the Result written out.

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"

	"bivar/analysis/internal/jsonloc"
	"bivar/internal/cleantext"
)

// Write encodes res as diff.json: two-space indent, keys in struct order,
// one final newline. The same Result always gives the same bytes.
func Write(w io.Writer, res *Result) error {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(res); err != nil {
		return fmt.Errorf("compare: encoding the diff: %w", err)
	}
	_, err := w.Write(cleantext.JSON(buf.Bytes()))
	return err
}

// Read decodes a diff.json, refusing another schema and unknown keys. A
// value of the wrong type is named by its path with array indices,
// "studies[2].r.old", and its byte offset.
func Read(rd io.Reader) (*Result, error) {
	data, err := io.ReadAll(rd)
	if err != nil {
		return nil, err
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	var res Result
	if err := dec.Decode(&res); err != nil {
		jsonloc.Fill(data, err) // a bad number names its path and offset
		return nil, fmt.Errorf("not a bivar diff file: %w", err)
	}
	if res.Schema != Schema {
		return nil, fmt.Errorf("schema %q, want %q: written by another version of bivar", res.Schema, Schema)
	}
	return &res, nil
}
