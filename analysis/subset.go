package analysis

// This file selects the rows a study may use before complete cases are
// taken: the manifest's exclude entries (each with a reason) and the
// dataset's subset ANDed with the study's where.

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"bivar/analysis/dataset"
	"bivar/analysis/internal/suggest"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
)

// subsetColumns lists the columns the dataset's subset and its studies'
// where expressions read, in first-use order. They are read as text (a
// column compared with numbers is parsed by cellOf), so a text column
// compared with a number is an error naming the expression, not the file.
func subsetColumns(m *manifest.Manifest, ds manifest.Dataset) []string {
	var out []string
	add := func(e *manifest.Expr) {
		if e == nil {
			return
		}
		for _, c := range e.Columns() {
			if !slices.Contains(out, c.Name) {
				out = append(out, c.Name)
			}
		}
	}
	add(ds.SubsetExpr)
	for _, st := range m.Studies {
		if st.Dataset == ds.ID {
			add(st.WhereExpr)
		}
	}
	return out
}

// rowSelection is what rowFilter decided for one study.
type rowSelection struct {
	keep    []bool // nil when every row is kept
	leftOut []report.LeftOutRow
	more    int
	subset  *report.Subset
}

// rowFilter applies the dataset's and the study's exclude entries and
// expressions to the loaded rows. The error (an exclude entry naming no
// row, an expression reading a column the dataset lacks or comparing a
// text column with a number) stops the run: it is bad input, given at the
// manifest's file:line:col.
func rowFilter(m *manifest.Manifest, st manifest.Study, ls *loadedSet) (rowSelection, error) {
	var sel rowSelection
	t := ls.table
	n := t.Rows
	decl := ls.decl
	if len(decl.Exclude) == 0 && len(st.Exclude) == 0 && decl.SubsetExpr == nil && st.WhereExpr == nil {
		return sel, nil
	}
	at := func(line, col int) string {
		switch {
		case line > 0 && col > 0:
			return fmt.Sprintf("%s:%d:%d: ", m.Path, line, col)
		case line > 0:
			return fmt.Sprintf("%s:%d: ", m.Path, line)
		}
		return m.Path + ": "
	}
	missingTok := decl.Missing
	if missingTok == nil {
		missingTok = manifest.DefaultMissing()
	}
	isMissing := func(s string) bool { return slices.Contains(missingTok, strings.TrimSpace(s)) }
	ids := t.Text[decl.IDColumn]
	name := func(i int) string {
		if ids.Given() && !isMissing(ids.At(i)) {
			return strings.TrimSpace(ids.At(i))
		}
		return strconv.Itoa(i + 1)
	}

	sel.keep = make([]bool, n)
	for i := range sel.keep {
		sel.keep[i] = true
	}
	type entry struct {
		row    report.LeftOutRow
		dataIx int
	}
	var entries []entry
	apply := func(list []manifest.Exclusion, level string) error {
		for _, x := range list {
			var rows []int
			if x.DataRow > 0 {
				if x.DataRow > n {
					return fmt.Errorf("%s%s exclude: data_row = %d, but dataset %q has %d data rows (the header not counted): correct the number or remove the entry",
						at(x.Line, x.Col), level, x.DataRow, decl.ID, n)
				}
				rows = []int{x.DataRow - 1}
			} else {
				if !ids.Given() {
					return fmt.Errorf("%s%s exclude: row = %q names a row by its id, but dataset %q has no id_column: add id_column = \"…\" to the dataset, or use data_row = N",
						at(x.Line, x.Col), level, x.Row, decl.ID)
				}
				for i := range ids.Len() {
					if strings.TrimSpace(ids.At(i)) == x.Row {
						rows = append(rows, i)
					}
				}
				if len(rows) == 0 {
					msg := fmt.Sprintf("%s%s exclude: row = %q is not a value of id_column %q in dataset %q", at(x.Line, x.Col), level, x.Row, decl.IDColumn, decl.ID)
					var cands []string
					seen := map[string]bool{}
					for i := range ids.Len() {
						if v := strings.TrimSpace(ids.At(i)); !seen[v] && len(cands) < 100000 {
							seen[v] = true
							cands = append(cands, v)
						}
					}
					if near := suggest.Nearest(x.Row, cands); near != "" {
						msg += fmt.Sprintf(": did you mean %q?", near)
					}
					return fmt.Errorf("%s", msg)
				}
			}
			for _, i := range rows {
				if !sel.keep[i] {
					continue // already left out by an earlier entry
				}
				sel.keep[i] = false
				r := report.LeftOutRow{Row: name(i), Reason: x.Reason, Level: level}
				if len(rows) > 1 {
					r.Shared = len(rows)
				}
				entries = append(entries, entry{r, i})
			}
		}
		return nil
	}
	if err := apply(decl.Exclude, "dataset"); err != nil {
		return sel, err
	}
	if err := apply(st.Exclude, "study"); err != nil {
		return sel, err
	}
	slices.SortFunc(entries, func(a, b entry) int { return a.dataIx - b.dataIx })
	sel.leftOut = []report.LeftOutRow{}
	for k, e := range entries {
		if k >= report.MaxLeftOut {
			sel.more = len(entries) - k
			break
		}
		sel.leftOut = append(sel.leftOut, e.row)
	}

	var exprs []*manifest.Expr
	for _, e := range []*manifest.Expr{decl.SubsetExpr, st.WhereExpr} {
		if e != nil {
			exprs = append(exprs, e)
		}
	}
	if len(exprs) == 0 {
		return sel, nil
	}
	// Every column first, so an unknown one is named before any row is read.
	for _, e := range exprs {
		for _, c := range e.Columns() {
			if ls.absent[c.Name] || (!t.Text[c.Name].Given() && t.Numeric[c.Name] == nil) {
				line, col := e.Pos(c.Offset)
				msg := fmt.Sprintf("%scolumn %q in %q is not in dataset %q", at(line, col), c.Name, e.Text, decl.ID)
				if near := suggest.Nearest(c.Name, ls.columns); near != "" {
					return sel, fmt.Errorf("%s: did you mean %q?", msg, near)
				}
				return sel, fmt.Errorf("%s: its columns are %s", msg, quoteList(ls.columns))
			}
		}
	}
	var cellErr error
	var row int
	var cur *manifest.Expr
	cell := func(ref manifest.ColumnRef) manifest.Cell {
		if !ref.Numeric {
			v := t.Text[ref.Name].At(row)
			return manifest.Cell{Text: strings.TrimSpace(v), Missing: isMissing(v)}
		}
		if num := t.Numeric[ref.Name]; num != nil {
			return manifest.Cell{Num: num[row], Missing: missing(num[row])}
		}
		v := t.Text[ref.Name].At(row)
		if isMissing(v) {
			return manifest.Cell{Missing: true}
		}
		s := strings.TrimSpace(v)
		var f float64
		var err error
		if sep := decl.Thousands; sep != "" {
			var ok bool
			if f, ok = dataset.ParseGrouped(s, t.DecimalComma, []rune(sep)[0]); !ok {
				err = strconv.ErrSyntax
			}
		} else {
			if t.DecimalComma {
				s = strings.Replace(s, ",", ".", 1)
			}
			f, err = strconv.ParseFloat(s, 64)
		}
		if err != nil {
			if cellErr == nil {
				line, col := cur.Pos(ref.Offset)
				cellErr = fmt.Errorf("%scolumn %q is compared with a number in %q, but it holds text (%q at data row %d): compare it with a double-quoted string, or correct the cell",
					at(line, col), ref.Name, cur.Text, strings.TrimSpace(v), row+1)
			}
			return manifest.Cell{Missing: true}
		}
		return manifest.Cell{Num: f}
	}
	texts := make([]string, len(exprs))
	for k, e := range exprs {
		texts[k] = e.Text
	}
	sub := &report.Subset{Expression: texts[0], Missing: []report.ColumnCount{}}
	if len(exprs) == 2 {
		sub.Expression = "(" + texts[0] + ") and (" + texts[1] + ")"
	}
	miss := map[string]int{}
	var order []string
	for row = 0; row < n; row++ {
		if !sel.keep[row] {
			continue
		}
		for _, e := range exprs {
			cur = e
			ok, col := e.Eval(cell)
			if cellErr != nil {
				return sel, cellErr
			}
			if !ok {
				sel.keep[row] = false
				sub.Rows++
				if col != "" {
					if miss[col] == 0 {
						order = append(order, col)
					}
					miss[col]++
				}
				break
			}
		}
	}
	for _, c := range order {
		sub.Missing = append(sub.Missing, report.ColumnCount{Column: c, Count: miss[c]})
	}
	sel.subset = sub
	return sel, nil
}
