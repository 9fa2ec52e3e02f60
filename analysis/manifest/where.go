package manifest

// This file holds the subset expression of study.where and dataset.subset:
// a hand-written recursive-descent parser and its evaluation. Nothing in an
// expression is executed; it can only compare columns with constants.
//
//	expr    = or
//	or      = and { "or" and }
//	and     = unary { "and" unary }
//	unary   = "not" unary | "(" expr ")" | compare
//	compare = COLUMN op value | COLUMN ["not"] "in" "[" value { "," value } "]"
//	op      = "==" | "!=" | "<" | "<=" | ">" | ">="
//	value   = NUMBER | "double-quoted string"
//
// A column name is letters, digits, '_' and '.', not starting with a digit;
// a name with other characters is written in backquotes: `temp (°C)`.

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Expr is a parsed subset expression. Text is the expression as written;
// Line and Col are where its first character is in the manifest (0 when
// unknown), so a column's place can be given as Line:Col+offset.
type Expr struct {
	Text      string
	Line, Col int
	root      node2
	cols      []ColumnRef // the columns it reads, found once (columns)
}

// ColumnRef is one use of a column in an expression: its name, whether it
// is compared with numbers, and its byte offset in Text.
type ColumnRef struct {
	Name    string
	Numeric bool
	Offset  int
}

// ExprError is a problem in an expression at byte Offset of its text.
type ExprError struct {
	Offset int
	Msg    string
}

func (e *ExprError) Error() string { return e.Msg }

type node2 interface{}

type andNode struct{ a, b node2 }
type orNode struct{ a, b node2 }
type notNode struct{ a node2 }
type cmpNode struct {
	col    ColumnRef
	op     string // == != < <= > >= in
	nums   []float64
	strs   []string
	negate bool // not in
}

type token struct {
	kind string // "name", "num", "str", "op", "(", ")", "[", "]", ",", "end"
	text string
	num  float64
	off  int
}

func lex(s string) ([]token, *ExprError) {
	var out []token
	i := 0
	for i < len(s) {
		c := s[i]
		switch {
		case c == ' ' || c == '\t' || c == '\n' || c == '\r':
			i++
		case strings.ContainsRune("()[],", rune(c)):
			out = append(out, token{kind: string(c), text: string(c), off: i})
			i++
		case c == '=' || c == '!' || c == '<' || c == '>':
			op := string(c)
			if i+1 < len(s) && s[i+1] == '=' {
				op += "="
			}
			if op == "=" || op == "!" {
				return nil, &ExprError{i, fmt.Sprintf("%q is not an operator: compare with ==, !=, <, <=, > or >=", op)}
			}
			out = append(out, token{kind: "op", text: op, off: i})
			i += len(op)
		case c == '"':
			j := i + 1
			var b strings.Builder
			for j < len(s) && s[j] != '"' {
				if s[j] == '\\' && j+1 < len(s) {
					j++
				}
				b.WriteByte(s[j])
				j++
			}
			if j >= len(s) {
				return nil, &ExprError{i, "this string has no closing double quote"}
			}
			out = append(out, token{kind: "str", text: b.String(), off: i})
			i = j + 1
		case c == '`':
			j := strings.IndexByte(s[i+1:], '`')
			if j < 0 {
				return nil, &ExprError{i, "this column name has no closing backquote"}
			}
			out = append(out, token{kind: "name", text: s[i+1 : i+1+j], off: i})
			i += j + 2
		case c == '-' || c == '+' || c == '.' || (c >= '0' && c <= '9'):
			j := i + 1
			for j < len(s) && (strings.IndexByte("0123456789.eE", s[j]) >= 0 || ((s[j] == '-' || s[j] == '+') && (s[j-1] == 'e' || s[j-1] == 'E'))) {
				j++
			}
			v, err := strconv.ParseFloat(s[i:j], 64)
			if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
				return nil, &ExprError{i, fmt.Sprintf("%q is not a number", s[i:j])}
			}
			out = append(out, token{kind: "num", text: s[i:j], num: v, off: i})
			i = j
		default:
			r, size := utf8.DecodeRuneInString(s[i:])
			if !(unicode.IsLetter(r) || r == '_') {
				return nil, &ExprError{i, fmt.Sprintf("%q is not allowed here: an expression holds column names, numbers, double-quoted strings, comparisons, and, or, not, in and parentheses", string(r))}
			}
			j := i + size
			for j < len(s) {
				r, size := utf8.DecodeRuneInString(s[j:])
				if !(unicode.IsLetter(r) || unicode.IsDigit(r) || r == '_' || r == '.') {
					break
				}
				j += size
			}
			out = append(out, token{kind: "name", text: s[i:j], off: i})
			i = j
		}
	}
	return append(out, token{kind: "end", off: len(s)}), nil
}

type exprParser struct {
	toks []token
	i    int
}

func (p *exprParser) peek() token { return p.toks[p.i] }
func (p *exprParser) next() token { t := p.toks[p.i]; p.i++; return t }
func (p *exprParser) word(w string) bool {
	t := p.peek()
	return t.kind == "name" && t.text == w
}

func describeTok(t token) string {
	switch t.kind {
	case "end":
		return "the end of the expression"
	case "str":
		return strconv.Quote(t.text)
	}
	return strconv.Quote(t.text)
}

// ParseExpr parses a subset expression; the error is an *ExprError.
func ParseExpr(s string) (*Expr, error) {
	toks, lerr := lex(s)
	if lerr != nil {
		return nil, lerr
	}
	if len(toks) == 1 {
		return nil, &ExprError{0, "the expression is empty: write a condition such as shift == \"night\", or remove the key"}
	}
	p := &exprParser{toks: toks}
	root, err := p.or()
	if err != nil {
		return nil, err
	}
	if t := p.peek(); t.kind != "end" {
		return nil, &ExprError{t.off, fmt.Sprintf("unexpected %s: join conditions with and / or", describeTok(t))}
	}
	e := &Expr{Text: s, root: root}
	e.cols = columns(root)
	// A column compared with numbers in one place and strings in another.
	kind := map[string]ColumnRef{}
	for _, c := range e.Columns() {
		if k, ok := kind[c.Name]; ok && k.Numeric != c.Numeric {
			return nil, &ExprError{c.Offset, fmt.Sprintf("column %q is compared with a number in one place and with a string in another", c.Name)}
		}
		kind[c.Name] = c
	}
	return e, nil
}

func (p *exprParser) or() (node2, *ExprError) {
	a, err := p.and()
	for err == nil && p.word("or") {
		p.next()
		var b node2
		b, err = p.and()
		a = orNode{a, b}
	}
	return a, err
}

func (p *exprParser) and() (node2, *ExprError) {
	a, err := p.unary()
	for err == nil && p.word("and") {
		p.next()
		var b node2
		b, err = p.unary()
		a = andNode{a, b}
	}
	return a, err
}

func (p *exprParser) unary() (node2, *ExprError) {
	t := p.peek()
	switch {
	case t.kind == "name" && t.text == "not":
		p.next()
		a, err := p.unary()
		return notNode{a}, err
	case t.kind == "(":
		p.next()
		a, err := p.or()
		if err != nil {
			return nil, err
		}
		if c := p.peek(); c.kind != ")" {
			return nil, &ExprError{c.off, fmt.Sprintf("expected ) to close the ( at %d, found %s", t.off+1, describeTok(c))}
		}
		p.next()
		return a, nil
	case t.kind == "name" && (t.text == "and" || t.text == "or" || t.text == "in"):
		return nil, &ExprError{t.off, fmt.Sprintf("expected a column name, found %q", t.text)}
	case t.kind == "name":
		return p.compare()
	}
	return nil, &ExprError{t.off, fmt.Sprintf("expected a column name, found %s", describeTok(t))}
}

func (p *exprParser) compare() (node2, *ExprError) {
	col := p.next()
	n := cmpNode{col: ColumnRef{Name: col.text, Offset: col.off}}
	op := p.peek()
	if op.kind == "name" && op.text == "not" {
		p.next()
		n.negate = true
		op = p.peek()
		if !(op.kind == "name" && op.text == "in") {
			return nil, &ExprError{op.off, fmt.Sprintf("expected in after %q not, found %s", col.text, describeTok(op))}
		}
	}
	switch {
	case op.kind == "op":
		p.next()
		n.op = op.text
		v := p.next()
		switch v.kind {
		case "num":
			n.nums = []float64{v.num}
		case "str":
			if n.op != "==" && n.op != "!=" {
				return nil, &ExprError{op.off, fmt.Sprintf("%s compares numbers; a string (column %q) can only be tested with ==, != or in", n.op, col.text)}
			}
			n.strs = []string{v.text}
		default:
			return nil, &ExprError{v.off, fmt.Sprintf("expected a number or a double-quoted string after %s, found %s", n.op, describeTok(v))}
		}
	case op.kind == "name" && op.text == "in":
		p.next()
		n.op = "in"
		if b := p.next(); b.kind != "[" {
			return nil, &ExprError{b.off, fmt.Sprintf("expected [ after in, found %s", describeTok(b))}
		}
		for {
			v := p.next()
			switch {
			case v.kind == "num" && len(n.strs) == 0:
				n.nums = append(n.nums, v.num)
			case v.kind == "str" && len(n.nums) == 0:
				n.strs = append(n.strs, v.text)
			case v.kind == "num" || v.kind == "str":
				return nil, &ExprError{v.off, "a list after in holds numbers or strings, not both"}
			default:
				return nil, &ExprError{v.off, fmt.Sprintf("expected a number or a double-quoted string in the list, found %s", describeTok(v))}
			}
			s := p.next()
			if s.kind == "]" {
				break
			}
			if s.kind != "," {
				return nil, &ExprError{s.off, fmt.Sprintf("expected , or ] in the list, found %s", describeTok(s))}
			}
		}
	default:
		return nil, &ExprError{op.off, fmt.Sprintf("expected a comparison (==, !=, <, <=, >, >= or in) after column %q, found %s", col.text, describeTok(op))}
	}
	n.col.Numeric = n.nums != nil
	return n, nil
}

// Columns lists every use of a column, in the order written.
func (e *Expr) Columns() []ColumnRef {
	if e.cols == nil {
		return columns(e.root)
	}
	return slices.Clone(e.cols)
}

// columns lists the column uses under n, left to right.
func columns(root node2) []ColumnRef {
	var out []ColumnRef
	var walk func(n node2)
	walk = func(n node2) {
		switch n := n.(type) {
		case andNode:
			walk(n.a)
			walk(n.b)
		case orNode:
			walk(n.a)
			walk(n.b)
		case notNode:
			walk(n.a)
		case cmpNode:
			out = append(out, n.col)
		}
	}
	walk(root)
	return out
}

// Cell is one row's value in a column an expression reads: Num for a
// column compared with numbers, Text for one compared with strings;
// Missing says the cell is empty (or a missing token).
type Cell struct {
	Num     float64
	Text    string
	Missing bool
}

// Eval says whether a row is in the subset. cell gives the row's value in a
// column. A row missing in any column the expression reads is left out,
// and missing names the first such column (in the order written), so the
// answer does not depend on how the conditions are grouped.
func (e *Expr) Eval(cell func(ref ColumnRef) Cell) (keep bool, missing string) {
	cols := e.cols
	if cols == nil {
		cols = columns(e.root)
	}
	for _, c := range cols {
		if cell(c).Missing {
			return false, c.Name
		}
	}
	return eval(e.root, cell), ""
}

func eval(n node2, cell func(ColumnRef) Cell) bool {
	switch n := n.(type) {
	case andNode:
		return eval(n.a, cell) && eval(n.b, cell)
	case orNode:
		return eval(n.a, cell) || eval(n.b, cell)
	case notNode:
		return !eval(n.a, cell)
	case cmpNode:
		c := cell(n.col)
		if n.op == "in" {
			found := false
			for _, v := range n.nums {
				found = found || c.Num == v
			}
			for _, v := range n.strs {
				found = found || c.Text == v
			}
			return found != n.negate
		}
		if n.strs != nil {
			return (c.Text == n.strs[0]) == (n.op == "==")
		}
		x, v := c.Num, n.nums[0]
		switch n.op {
		case "==":
			return x == v
		case "!=":
			return x != v
		case "<":
			return x < v
		case "<=":
			return x <= v
		case ">":
			return x > v
		case ">=":
			return x >= v
		}
	}
	return false
}

// Pos is the manifest line and column of byte off of the expression.
func (e *Expr) Pos(off int) (line, col int) {
	if e.Line <= 0 || e.Col <= 0 {
		return e.Line, e.Col
	}
	return e.Line, e.Col + off
}

// valueStart is the place of the first character inside the quoted value
// of key (under owner): the key's line and the column after its opening
// quote. ok is false when the value is not a one-line basic or literal
// string (its characters' columns are then not those of the text).
func (p *parser) valueStart(owner, key string) (at pos, ok bool) {
	at, found := p.ix.lookup(owner, key)
	if !found {
		at, found = p.ix.lookup("", key)
	}
	if !found || at.line <= 0 || at.col <= 0 {
		return at, false
	}
	text := p.ix.text(at.line)
	if at.col > len(text) {
		return at, false
	}
	eq := strings.IndexByte(text[at.col-1:], '=')
	if eq < 0 {
		return at, false
	}
	i := at.col - 1 + eq + 1
	for i < len(text) && (text[i] == ' ' || text[i] == '\t') {
		i++
	}
	if i+1 >= len(text) || (text[i] != '"' && text[i] != '\'') || strings.HasPrefix(text[i:], `"""`) || strings.HasPrefix(text[i:], `'''`) {
		return at, false
	}
	if text[i] == '"' && strings.Contains(text[i+1:], `\`) { // escapes shift the columns
		return at, false
	}
	return pos{at.line, i + 2}, true
}

// expr parses the expression of key (dataset.subset or study.where) and
// records a problem at the offending token's column.
func (p *parser) expr(owner, key, name, src string) *Expr {
	start, exact := p.valueStart(owner, key)
	e, err := ParseExpr(src)
	if err != nil {
		ee := err.(*ExprError)
		at := start
		if exact {
			at.col += ee.Offset
		}
		p.addAt(at, key, fmt.Sprintf("%s: %s = %q: %s (at character %d)", name, key[strings.IndexByte(key, '.')+1:], src, ee.Msg, ee.Offset+1))
		return nil
	}
	if exact {
		e.Line, e.Col = start.line, start.col
	} else {
		e.Line = start.line
	}
	return e
}

// exclusions checks each entry of an exclude list: a row or a data_row
// (not both), and a reason.
//
// An entry's place is the exclude key (exclude = [{…}, …]) or, when the
// entries are written as [[study.exclude]] tables, the entry's header: the
// first headers after the owning table's header line (tableLine).
func (p *parser) exclusions(owner, key, name string, list []Exclusion, tableLine int) {
	at, inline := p.ix.lookup(owner, key)
	var headers []pos
	if !inline {
		for k := 0; ; k++ {
			q, ok := p.ix.lookup(key+"#"+strconv.Itoa(k), key)
			if !ok {
				break
			}
			if q.line > tableLine {
				headers = append(headers, q)
			}
		}
	}
	for i := range list {
		x := &list[i]
		switch {
		case inline:
			x.Line, x.Col = at.line, at.col
		case i < len(headers):
			x.Line, x.Col = headers[i].line, headers[i].col
		}
		problem := func(format string, args ...any) {
			if x.Line > 0 {
				p.addAt(pos{x.Line, x.Col}, key, fmt.Sprintf(format, args...))
			} else {
				p.add(owner, key, format, args...)
			}
		}
		n := i + 1
		switch {
		case x.Row == "" && x.DataRow == 0:
			problem("%s: exclude entry %d names no row: give row = \"…\" (a value of the id_column) or data_row = N (1-based, the header not counted)", name, n)
		case x.Row != "" && x.DataRow != 0:
			problem("%s: exclude entry %d gives both row and data_row: keep one", name, n)
		case x.DataRow < 0:
			problem("%s: exclude entry %d: data_row = %d; data rows are numbered from 1 (the header not counted)", name, n, x.DataRow)
		}
		if strings.TrimSpace(x.Reason) == "" {
			problem("%s: exclude entry %d has no reason: add reason = \"…\" saying why the row is left out (it is printed in the report)", name, n)
		}
	}
}
