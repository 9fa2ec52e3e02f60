package manifest

import (
	"cmp"
	"errors"
	"fmt"
	"maps"
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"bivar/analysis/internal/suggest"
)

// Load reads, decodes and validates the manifest at path. Relative paths in
// it are resolved against its folder. On failure the error is an Errors
// value holding every problem found, each an *Error with file, line and
// column; a file that cannot be read gives a plain error.
func Load(path string) (*Manifest, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("manifest: %w", err)
	}
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, fmt.Errorf("manifest: %w", err)
	}
	m, err := Parse(path, data, filepath.Dir(abs))
	if m != nil {
		m.Path = path
	}
	return m, err
}

// Parse decodes and validates a manifest held in memory. name is used in
// messages; dir is the folder relative paths are resolved against (and
// where dataset files must exist).
func Parse(name string, data []byte, dir string) (*Manifest, error) {
	src := string(data)
	p := &parser{file: name}

	var generic map[string]any
	if _, err := toml.Decode(src, &generic); err != nil {
		p.ix = &lineIndex{lines: strings.Split(src, "\n")}
		p.decodeError(err)
		return nil, p.errs
	}
	p.ix = buildIndex(src)
	p.walk(generic, schema, "", nil)
	if p.typeErrs {
		// The typed decode would stop at one of these; unknown keys alone do
		// not stop it, so their manifests are validated too.
		return nil, p.sorted()
	}

	m := &Manifest{Path: name, Dir: dir}
	md, err := toml.Decode(src, m)
	if err != nil {
		p.decodeError(err)
		return nil, p.sorted()
	}
	if len(p.errs) == 0 {
		for _, k := range md.Undecoded() { // the schema walk should have caught these
			p.add("", k.String(), "key %q is not used by bivar", k.String())
		}
	}
	p.locate(m)
	p.defaults(m, &md)
	p.validate(m)
	if len(p.errs) > 0 {
		return nil, p.sorted()
	}
	return m, nil
}

type parser struct {
	file     string
	ix       *lineIndex
	errs     Errors
	typeErrs bool // a value has the wrong type
}

// add records a problem at the place of key (under owner), falling back to
// its nearest written ancestor, then to no line at all.
func (p *parser) add(owner, key string, format string, args ...any) {
	var k toml.Key
	if key != "" {
		k = strings.Split(key, ".")
	}
	p.addK(owner, k, format, args...)
}

// addK is add for a key whose parts may hold dots.
func (p *parser) addK(owner string, k toml.Key, format string, args ...any) {
	var at pos
	owners := []string{owner}
	if owner != "" { // an array written inline, study = [{…}], has no headers
		owners = append(owners, "")
	}
search:
	for _, o := range owners {
		for n := len(k); n > 0; n-- {
			if q, ok := p.ix.lookup(o, k[:n].String()); ok {
				at = q
				break search
			}
		}
	}
	p.addAt(at, k.String(), fmt.Sprintf(format, args...))
}

// addValue is addK for a value of the wrong type: the column is that of
// the value after "key =" when the key's line is known, or of the first
// quoted element when quoted says a list holds strings where numbers
// belong (predict_at = ["12"]).
func (p *parser) addValue(owner string, k toml.Key, quoted bool, format string, args ...any) {
	p.addK(owner, k, format, args...)
	e := p.errs[len(p.errs)-1]
	if e.Line <= 0 || e.Col <= 0 {
		return
	}
	text := p.ix.text(e.Line)
	if e.Col > len(text) {
		return
	}
	eq := strings.IndexByte(text[e.Col-1:], '=')
	if eq < 0 {
		return
	}
	i := e.Col - 1 + eq + 1
	for i < len(text) && (text[i] == ' ' || text[i] == '\t') {
		i++
	}
	if i >= len(text) {
		return
	}
	if quoted && text[i] == '[' {
		if q := strings.IndexAny(text[i:], "\"'"); q >= 0 {
			i += q
		}
	}
	e.Col = i + 1
}

func (p *parser) addAt(at pos, key, msg string) {
	p.errs = append(p.errs, &Error{File: p.file, Line: at.line, Col: at.col, Key: key, Msg: msg, text: p.ix.text(at.line)})
}

func (p *parser) sorted() Errors {
	slices.SortStableFunc(p.errs, func(a, b *Error) int {
		return cmp.Or(cmp.Compare(a.Line, b.Line), cmp.Compare(a.Col, b.Col))
	})
	return p.errs
}

// The decoder reports type problems as plain errors of the form
// `toml: line 3 (last key "study.n"): incompatible types: …`.
var decodeMsg = regexp.MustCompile(`^toml: (?:line (\d+) )?(?:\(last key "([^"]*)"\): )?(.*)$`)

func (p *parser) decodeError(err error) {
	var pe toml.ParseError
	if errors.As(err, &pe) {
		msg := pe.Message
		if pe.Usage != "" {
			msg += " (" + strings.TrimSpace(pe.Usage) + ")"
		}
		at := pos{pe.Position.Line, pe.Position.Col}
		if at.col > len(p.ix.text(at.line))+1 { // the decoder's column can run past the line
			at.col = 1
		}
		p.addAt(at, pe.LastKey, "TOML syntax: "+msg)
		return
	}
	sm := decodeMsg.FindStringSubmatch(err.Error())
	if sm == nil {
		p.addAt(pos{}, "", err.Error())
		return
	}
	line, _ := strconv.Atoi(sm[1])
	at := pos{line: line}
	if line > 0 {
		at.col = 1
	}
	p.addAt(at, sm[2], sm[3])
}

// ---- the schema, read from the struct tags ----

type kind int

const (
	kString kind = iota
	kFloat
	kInt
	kUint
	kBool
	kStrings
	kFloats
	kTable
	kTables
	kMap // table of strings with any keys (units, labels)
	kStringOrList
	kStringOrInt
)

var kindWords = map[kind]string{
	kString:       "a string",
	kFloat:        "a number",
	kInt:          "a whole number",
	kUint:         "a whole number of 0 or more",
	kBool:         "true or false",
	kStrings:      "a list of strings",
	kFloats:       "a list of numbers",
	kTable:        "a table",
	kTables:       "an array of tables ([[…]])",
	kMap:          "a table of strings",
	kStringOrList: "a string or a list of strings",
	kStringOrInt:  "a string (a name) or a whole number",
}

type node struct {
	kind  kind
	keys  []string // in declaration order, for messages
	child map[string]*node
	label string // how messages name the table: "[[study]]"
}

var schema = func() *node {
	n := schemaOf(reflect.TypeFor[Manifest](), "")
	n.label = "the top level"
	return n
}()

func schemaOf(t reflect.Type, path string) *node {
	if t == reflect.TypeFor[AlsoIn]() {
		return &node{kind: kTable, keys: []string{"x", "y"}, label: "[" + path + "]",
			child: map[string]*node{"x": {kind: kStringOrList}, "y": {kind: kStringOrList}}}
	}
	if t == reflect.TypeFor[Sheet]() {
		return &node{kind: kStringOrInt}
	}
	switch t.Kind() {
	case reflect.Pointer:
		return schemaOf(t.Elem(), path)
	case reflect.Struct:
		n := &node{kind: kTable, child: map[string]*node{}, label: "[" + path + "]"}
		for f := range t.Fields() {
			tag := f.Tag.Get("toml")
			if tag == "" || tag == "-" {
				continue
			}
			sub := path + "." + tag
			if path == "" {
				sub = tag
			}
			n.keys = append(n.keys, tag)
			n.child[tag] = schemaOf(f.Type, sub)
		}
		return n
	case reflect.Slice:
		switch t.Elem().Kind() {
		case reflect.Struct:
			n := schemaOf(t.Elem(), path)
			n.kind, n.label = kTables, "[["+path+"]]"
			return n
		case reflect.String:
			return &node{kind: kStrings}
		case reflect.Float64:
			return &node{kind: kFloats}
		}
	case reflect.Map:
		return &node{kind: kMap}
	case reflect.String:
		return &node{kind: kString}
	case reflect.Float64:
		return &node{kind: kFloat}
	case reflect.Int:
		return &node{kind: kInt}
	case reflect.Uint64:
		return &node{kind: kUint}
	case reflect.Bool:
		return &node{kind: kBool}
	}
	panic("manifest: no schema for " + t.String()) // a programming error, found by any test
}

// walk checks v against n: exact key spelling, unknown keys, value types.
func (p *parser) walk(v any, n *node, owner string, key toml.Key) {
	name := key.String()
	bad := func() {
		p.typeErrs = true
		what, quoted := describe(v), false
		if l, ok := v.([]any); ok {
			what, quoted = describeList(l, n.kind == kFloats)
		}
		p.addValue(owner, key, quoted, "%q must be %s, not %s", name, kindWords[n.kind], what)
	}
	switch n.kind {
	case kTable:
		m, ok := v.(map[string]any)
		if !ok {
			bad()
			return
		}
		p.table(m, n, owner, key)
	case kTables:
		var elems []map[string]any
		switch v := v.(type) {
		case []map[string]any:
			elems = v
		case []any:
			for _, e := range v {
				m, ok := e.(map[string]any)
				if !ok {
					bad()
					return
				}
				elems = append(elems, m)
			}
		default:
			bad()
			return
		}
		for i, m := range elems {
			p.table(m, n, name+"#"+strconv.Itoa(i), key)
		}
	case kMap:
		m, ok := v.(map[string]any)
		if !ok {
			bad()
			return
		}
		for _, k := range slices.Sorted(maps.Keys(m)) {
			if _, ok := m[k].(string); !ok {
				p.typeErrs = true
				sub := append(slices.Clone(key), k)
				p.addK(owner, sub, "%q must be a string, not %s", sub.String(), describe(m[k]))
			}
		}
	case kString:
		if _, ok := v.(string); !ok {
			bad()
		}
	case kFloat:
		switch v.(type) {
		case float64, int64:
		default:
			bad()
		}
	case kInt:
		if _, ok := v.(int64); !ok {
			bad()
		}
	case kUint:
		if i, ok := v.(int64); !ok {
			bad()
		} else if i < 0 {
			p.typeErrs = true
			p.addValue(owner, key, false, "%q must be %s, not %d: a negative number is not allowed here", name, kindWords[n.kind], i)
		}
	case kBool:
		if _, ok := v.(bool); !ok {
			bad()
		}
	case kStringOrInt:
		switch v.(type) {
		case string, int64:
		default:
			bad()
		}
	case kStrings, kStringOrList:
		if _, ok := v.(string); ok && n.kind == kStringOrList {
			return
		}
		l, ok := v.([]any)
		if !ok {
			bad()
			return
		}
		for _, e := range l {
			if _, ok := e.(string); !ok {
				bad()
				return
			}
		}
	case kFloats:
		l, ok := v.([]any)
		if !ok {
			bad()
			return
		}
		for _, e := range l {
			switch e.(type) {
			case float64, int64:
			default:
				bad()
				return
			}
		}
	}
}

func (p *parser) table(m map[string]any, n *node, owner string, key toml.Key) {
	for _, k := range slices.Sorted(maps.Keys(m)) {
		sub := append(slices.Clone(key), k)
		c, ok := n.child[k]
		if !ok {
			p.addK(owner, sub, "%s", unknownKey(n, key, k))
			for _, known := range n.keys {
				if strings.EqualFold(known, k) {
					// The typed decoder would match it anyway, case-blind,
					// and may then fail on it without a line number.
					p.typeErrs = true
				}
			}
			continue
		}
		p.walk(m[k], c, owner, sub)
	}
}

func unknownKey(n *node, parent toml.Key, k string) string {
	full := append(slices.Clone(parent), k).String()
	if near := suggest.Nearest(k, n.keys); near != "" {
		msg := fmt.Sprintf("unknown key %q — did you mean %q?", full, append(slices.Clone(parent), near).String())
		if strings.EqualFold(near, k) {
			msg += " (keys are case-sensitive)"
		}
		return msg
	}
	// A key written at the wrong level: look one level down and up.
	for _, c := range n.keys {
		if child := n.child[c]; child.child != nil && child.child[k] != nil {
			return fmt.Sprintf("unknown key %q — did you mean %q?", full, append(slices.Clone(parent), c, k).String())
		}
	}
	if len(parent) > 0 && schema.child[k] != nil {
		return fmt.Sprintf("unknown key %q — %q is a top-level key: move it above the first table", full, k)
	}
	return fmt.Sprintf("unknown key %q; the keys of %s are: %s", full, n.label, strings.Join(n.keys, ", "))
}

// describeList says what a list holds, for a message about a list of the
// wrong kind: "a list of strings", "a list of numbers and strings". When
// numbers are wanted and the strings are all numbers in quotes it says so,
// and quoted reports that case.
func describeList(l []any, numbersWanted bool) (what string, quoted bool) {
	if len(l) == 0 {
		return "an empty list", false
	}
	var kinds []string
	allNumeric := true
	for _, e := range l {
		d := strings.TrimPrefix(strings.TrimPrefix(describe(e), "a "), "an ")
		switch d {
		case "string":
			d = "strings"
			if _, err := strconv.ParseFloat(strings.TrimSpace(e.(string)), 64); err != nil {
				allNumeric = false
			}
		case "whole number", "number":
			d = "numbers"
			allNumeric = false
		case "list":
			d = "lists"
			allNumeric = false
		case "table":
			d = "tables"
			allNumeric = false
		default:
			d = "dates or times"
			allNumeric = false
		}
		if !slices.Contains(kinds, d) {
			kinds = append(kinds, d)
		}
	}
	what = "a list of " + strings.Join(kinds, " and ")
	if numbersWanted && allNumeric {
		return what + " (numbers in quotes): write them without quotes, as [12, 15.5]", true
	}
	return what, numbersWanted && slices.Contains(kinds, "strings")
}

func describe(v any) string {
	switch v.(type) {
	case string:
		return "a string"
	case int64:
		return "a whole number"
	case float64:
		return "a number"
	case bool:
		return "true/false"
	case []any, []map[string]any:
		return "a list"
	case map[string]any:
		return "a table"
	}
	return "a date or time"
}
