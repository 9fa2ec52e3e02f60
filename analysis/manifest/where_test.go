package manifest

import (
	"errors"
	"strings"
	"testing"
)

// The rows and expressions here are invented. The expected answers are
// the expressions' meaning worked by hand, row by row.

func TestWhereEval(t *testing.T) {
	t.Parallel()
	type row map[string]Cell
	rows := []row{
		{"shift": {Text: "night"}, "temp": {Num: 430}, "line": {Num: 7}},
		{"shift": {Text: "day"}, "temp": {Num: 430}, "line": {Num: 8}},
		{"shift": {Text: "night"}, "temp": {Num: 420}, "line": {Num: 7}},
		{"shift": {Missing: true}, "temp": {Num: 440}, "line": {Num: 9}},
		{"shift": {Text: "swing"}, "temp": {Missing: true}, "line": {Num: 7}},
	}
	cases := []struct {
		expr    string
		keep    []bool
		missing []string
	}{
		{`shift == "night" and temp >= 425`, []bool{true, false, false, false, false}, []string{"", "", "", "shift", "temp"}},
		{`shift == "night" or temp > 425`, []bool{true, true, true, false, false}, []string{"", "", "", "shift", "temp"}},
		{`not shift == "night"`, []bool{false, true, false, false, true}, []string{"", "", "", "shift", ""}},
		{`shift != "day" and (line == 7 or line == 9)`, []bool{true, false, true, false, true}, []string{"", "", "", "shift", ""}},
		{`shift in ["day", "swing"]`, []bool{false, true, false, false, true}, []string{"", "", "", "shift", ""}},
		{`line not in [7, 9]`, []bool{false, true, false, false, false}, nil},
		{`temp < 430`, []bool{false, false, true, false, false}, []string{"", "", "", "", "temp"}},
		{`temp <= 430 and temp > 420`, []bool{true, true, false, false, false}, []string{"", "", "", "", "temp"}},
		{`not (line == 7) or temp == 4.2e2`, []bool{false, true, true, true, false}, []string{"", "", "", "", "temp"}},
		{"`line` != 8", []bool{true, false, true, true, true}, nil},
	}
	for _, c := range cases {
		e, err := ParseExpr(c.expr)
		if err != nil {
			t.Errorf("ParseExpr(%q): %v", c.expr, err)
			continue
		}
		for i, r := range rows {
			keep, miss := e.Eval(func(ref ColumnRef) Cell { return r[ref.Name] })
			wantMiss := ""
			if c.missing != nil {
				wantMiss = c.missing[i]
			}
			if keep != c.keep[i] || miss != wantMiss {
				t.Errorf("%s on row %d = (%v, %q), want (%v, %q)", c.expr, i+1, keep, miss, c.keep[i], wantMiss)
			}
		}
	}
}

func TestWhereSyntaxErrors(t *testing.T) {
	t.Parallel()
	cases := []struct {
		expr   string
		offset int
		msg    string
	}{
		{`shift = "night"`, 6, `"=" is not an operator`},
		{`shift == "night" and`, 20, "expected a column name, found the end of the expression"},
		{`temp >= 425 shift == "x"`, 12, `unexpected "shift"`},
		{`(temp > 1`, 9, "expected ) to close the ( at 1"},
		{`temp > "hot"`, 5, "> compares numbers"},
		{`shift == "night`, 9, "no closing double quote"},
		{`temp > 4;`, 8, `";" is not allowed here`},
		{`temp == 1 or temp == "a"`, 13, `column "temp" is compared with a number in one place and with a string in another`},
		{`shift in ["a", 2]`, 15, "numbers or strings, not both"},
		{`  `, 0, "the expression is empty"},
	}
	for _, c := range cases {
		_, err := ParseExpr(c.expr)
		var ee *ExprError
		if !errors.As(err, &ee) {
			t.Errorf("ParseExpr(%q) = %v, want an *ExprError", c.expr, err)
			continue
		}
		if ee.Offset != c.offset || !strings.Contains(ee.Msg, c.msg) {
			t.Errorf("ParseExpr(%q) = at %d %q, want at %d containing %q", c.expr, ee.Offset, ee.Msg, c.offset, c.msg)
		}
	}
}

func TestSubsetManifestErrors(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name, src, want string
	}{
		{"token position inside the string", head + study + "where = 'shift == \"night\" and temp => 425'\n",
			`bivar.toml:9:36: study "s1": where = "shift == \"night\" and temp => 425": "=" is not an operator: compare with ==, !=, <, <=, > or >= (at character 27)`},
		{"token position after escapes is the key's", head + study + "where = \"shift == \\\"x\\\" and t = 1\"\n",
			`bivar.toml:9:1: study "s1": where = "shift == \"x\" and t = 1": "=" is not an operator: compare with ==, !=, <, <=, > or >= (at character 20)`},
		{"exclude without reason", head + study + "exclude = [{ row = \"S-117\" }]\n",
			`bivar.toml:9:1: study "s1": exclude entry 1 has no reason: add reason = "…" saying why the row is left out (it is printed in the report)`},
		{"exclude with an empty reason", head + "exclude = [{ data_row = 3, reason = \" \" }]\n" + study,
			`bivar.toml:4:1: dataset "nov": exclude entry 1 has no reason: add reason = "…" saying why the row is left out (it is printed in the report)`},
		{"exclude entries as tables", head + "\n[[dataset.exclude]]\ndata_row = 3\n" + study + "[[study.exclude]]\nrow = \"c\"\nreason = \"ok\"\n[[study.exclude]]\nrow = \"d\"\nreason = \"\"\n",
			"bivar.toml:5:1: dataset \"nov\": exclude entry 1 has no reason: add reason = \"…\" saying why the row is left out (it is printed in the report)\n" +
				"bivar.toml:15:1: study \"s1\": exclude entry 2 has no reason: add reason = \"…\" saying why the row is left out (it is printed in the report)"},
		{"exclude naming no row", head + study + "exclude = [{ reason = \"bad\" }]\n",
			`bivar.toml:9:1: study "s1": exclude entry 1 names no row: give row = "…" (a value of the id_column) or data_row = N (1-based, the header not counted)`},
	}
	for _, c := range cases {
		_, err := parse(t, c.src)
		if err == nil {
			t.Errorf("%s: no error, want %s", c.name, c.want)
			continue
		}
		if err.Error() != c.want {
			t.Errorf("%s:\n got %s\nwant %s", c.name, err, c.want)
		}
	}
}

// FuzzParseExpr: no expression makes the parser or the evaluation panic,
// and an error's offset lies within the text.
func FuzzParseExpr(f *testing.F) {
	for _, s := range []string{`shift == "night" and temp >= 425`, `not (a in [1, 2]) or b != "x"`, "`a b` < -1e3", `a in [`, `((a == 1)`, `a not in ["x"]`} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		e, err := ParseExpr(s)
		if err != nil {
			var ee *ExprError
			if !errors.As(err, &ee) || ee.Offset < 0 || ee.Offset > len(s) {
				t.Fatalf("ParseExpr(%q) = %v", s, err)
			}
			return
		}
		e.Eval(func(ColumnRef) Cell { return Cell{Num: 1, Text: "x"} })
	})
}
