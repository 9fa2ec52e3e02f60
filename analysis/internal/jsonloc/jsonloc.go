// Package jsonloc finds where in a JSON document a decoding error
// happened when encoding/json does not say: a type error raised by a
// value's own UnmarshalJSON carries the dotted field path (without array
// indices) but no offset.
package jsonloc

import (
	"bytes"
	"encoding/json"
	"errors"
	"strconv"
	"strings"
)

// Fill completes a *json.UnmarshalTypeError inside err that has a Field
// but no Offset: it finds the first value in data at that field path whose
// JSON kind is the one the error names (its Value: "string", "number", …),
// and sets Offset to just past that value's first byte (Offset counts the
// bytes read when the error happened, as encoding/json's offsets do) and
// Field to the path with array indices, "studies[1].pearson.r". Other
// errors are left alone.
func Fill(data []byte, err error) {
	var te *json.UnmarshalTypeError
	if !errors.As(err, &te) || te.Offset != 0 || te.Field == "" {
		return
	}
	kind, lit, _ := strings.Cut(te.Value, " ") // "string", or "number 1e999"
	if path, off, ok := find(data, te.Field, kind, lit); ok {
		te.Field, te.Offset = path, off+1
	}
}

type frame struct {
	array bool
	index int    // array: index of the next element
	key   string // object: the key whose value comes next
	ready bool   // object: a key was read and its value is next
}

// find walks the tokens of data and returns the first value at the
// dotted path field (indices ignored) whose kind is kind (and, for a
// number, whose text is lit when lit is given).
func find(data []byte, field, kind, lit string) (path string, off int64, ok bool) {
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	var stack []frame
	names := func() (dotted, indexed string) {
		var d, ix strings.Builder
		for _, f := range stack {
			switch {
			case f.array:
				ix.WriteString("[" + strconv.Itoa(f.index) + "]")
			case f.ready:
				if d.Len() > 0 {
					d.WriteByte('.')
				}
				if ix.Len() > 0 {
					ix.WriteByte('.')
				}
				d.WriteString(f.key)
				ix.WriteString(f.key)
			}
		}
		return d.String(), ix.String()
	}
	for {
		start := dec.InputOffset()
		// The value starts after blanks and the ':' or ',' the decoder skips.
		for int(start) < len(data) && strings.IndexByte(" \t\r\n:,", data[start]) >= 0 {
			start++
		}
		tok, err := dec.Token()
		if err != nil {
			return "", 0, false
		}
		top := len(stack) - 1
		if d, isDelim := tok.(json.Delim); isDelim && (d == '}' || d == ']') {
			stack = stack[:top]
			if top > 0 {
				advance(&stack[top-1])
			}
			continue
		}
		if top >= 0 && !stack[top].array && !stack[top].ready {
			stack[top].key, stack[top].ready = tok.(string), true
			continue
		}
		// tok starts a value at the current path.
		dotted, indexed := names()
		if n, isNum := tok.(json.Number); dotted == field && kindOf(tok) == kind && (!isNum || lit == "" || string(n) == lit) {
			return indexed, start, true
		}
		if d, isDelim := tok.(json.Delim); isDelim {
			stack = append(stack, frame{array: d == '['})
			continue
		}
		if top >= 0 {
			advance(&stack[top])
		}
	}
}

func advance(f *frame) {
	if f.array {
		f.index++
	} else {
		f.ready = false
	}
}

// kindOf names a token's JSON kind as encoding/json's errors do.
func kindOf(tok json.Token) string {
	switch t := tok.(type) {
	case json.Delim:
		if t == '[' {
			return "array"
		}
		return "object"
	case string:
		return "string"
	case json.Number:
		return "number"
	case bool:
		return "bool"
	case nil:
		return "null"
	}
	return ""
}
