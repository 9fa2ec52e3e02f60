package manifest

import (
	"fmt"
	"strings"
)

// Error is one problem in a manifest, with where it is.
type Error struct {
	File string // the manifest file as given to Load (or the name given to Parse)
	Line int    // 1-based; 0 when the problem has no single place (an empty manifest)
	Col  int    // 1-based byte column; 0 when unknown
	Key  string // the dotted key concerned, e.g. "study.y"; "" for syntax errors
	Msg  string // what is wrong and what to do

	text string // the source line, for Detail
}

// Error returns "file:line:col: msg" (without line and column when the
// problem has no single place).
func (e *Error) Error() string {
	switch {
	case e.Line > 0 && e.Col > 0:
		return fmt.Sprintf("%s:%d:%d: %s", e.File, e.Line, e.Col, e.Msg)
	case e.Line > 0:
		return fmt.Sprintf("%s:%d: %s", e.File, e.Line, e.Msg)
	}
	return fmt.Sprintf("%s: %s", e.File, e.Msg)
}

// Detail returns Error() followed by the source line and a caret under the
// column, for a terminal:
//
//	bivar.toml:7:1: unknown key "study.yy" — did you mean "study.y"?
//	    7 | yy = "shrinkage"
//	      | ^
func (e *Error) Detail() string {
	var b strings.Builder
	b.WriteString(e.Error())
	b.WriteByte('\n')
	if e.Line <= 0 || e.text == "" {
		return b.String()
	}
	text := strings.ReplaceAll(e.text, "\t", " ")
	num := fmt.Sprintf("%5d", e.Line)
	fmt.Fprintf(&b, "%s | %s\n", num, text)
	if e.Col > 0 && e.Col <= len(text)+1 {
		fmt.Fprintf(&b, "%s | %s^\n", strings.Repeat(" ", len(num)), strings.Repeat(" ", e.Col-1))
	}
	return b.String()
}

// Errors is every problem Load found, in the order of the manifest's lines.
// Its Error() puts each on its own line.
type Errors []*Error

func (es Errors) Error() string {
	lines := make([]string, len(es))
	for i, e := range es {
		lines[i] = e.Error()
	}
	return strings.Join(lines, "\n")
}

// Detail is every error's Detail, one after another.
func (es Errors) Detail() string {
	var b strings.Builder
	for _, e := range es {
		b.WriteString(e.Detail())
	}
	return b.String()
}

// Unwrap lets errors.As find the first *Error.
func (es Errors) Unwrap() []error {
	out := make([]error, len(es))
	for i, e := range es {
		out[i] = e
	}
	return out
}
