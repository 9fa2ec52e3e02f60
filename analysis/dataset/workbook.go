package dataset

// This file reads Excel workbooks (.xlsx, .xlsm) with
// github.com/xuri/excelize/v2.

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"
)

// IsWorkbook says whether path names an Excel workbook that ReadWorkbook
// reads (by its extension: .xlsx or .xlsm, in any case).
func IsWorkbook(path string) bool {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".xlsx", ".xlsm":
		return true
	}
	return false
}

// SheetRef names a workbook's sheet: by Name, or by its 1-based Number in
// the workbook's tab order. The zero value is the first sheet.
type SheetRef struct {
	Name   string
	Number int
}

// excelErrors are the error values a cell may hold, as Excel writes them.
var excelErrors = []string{"#NULL!", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#N/A",
	"#GETTING_DATA", "#SPILL!", "#CALC!", "#FIELD!", "#BLOCKED!", "#CONNECT!", "#BUSY!", "#UNKNOWN!"}

// IsExcelError says whether a cell's text is an Excel error value.
func IsExcelError(s string) bool { return slices.Contains(excelErrors, s) }

// Workbook is an opened workbook, held in memory with its SHA-256.
type Workbook struct {
	path   string
	sha    string
	f      *excelize.File
	sheets []string
}

// OpenWorkbook reads the workbook at path (a regular file of at most
// lim.MaxBytes; nil means DefaultLimits) and hashes its bytes. The
// unzipped content is bounded too, at 64 times MaxBytes, so that a small
// file that unpacks to gigabytes is refused.
func OpenWorkbook(path string, lim *Limits) (*Workbook, error) {
	l := DefaultLimits()
	if lim != nil {
		l = *lim
	}
	if err := l.check(path); err != nil {
		return nil, err
	}
	st, err := regularFile(path)
	if err != nil {
		return nil, err
	}
	if st.Size() > l.MaxBytes {
		return nil, sizeError(path, st.Size(), l.MaxBytes)
	}
	fh, err := os.Open(path)
	if err != nil {
		return nil, openError(path, err)
	}
	defer fh.Close()
	data, err := io.ReadAll(io.LimitReader(fh, l.MaxBytes+1))
	if err != nil {
		return nil, &Error{File: path, Msg: fmt.Sprintf("reading the file: %v", err), err: err}
	}
	if int64(len(data)) > l.MaxBytes {
		return nil, sizeError(path, 0, l.MaxBytes)
	}
	sum := sha256.Sum256(data)
	unzip := min(l.MaxBytes, math.MaxInt64/64) * 64
	f, err := excelize.OpenReader(bytes.NewReader(data), excelize.Options{UnzipSizeLimit: unzip, UnzipXMLSizeLimit: min(unzip, 16<<20)})
	if err != nil {
		msg := "cannot read the workbook: " + err.Error() + "; check that it is an Excel workbook (.xlsx, saved by a spreadsheet program) and not password-protected, or export the sheet as CSV"
		if errors.Is(err, excelize.ErrWorkbookFileFormat) || strings.Contains(err.Error(), "zip") {
			msg = "cannot read the workbook: it is not an .xlsx file (an .xlsx file is a zip archive); if it is an older .xls or an .ods file, open it in a spreadsheet program and save it as .xlsx, or export the sheet as CSV"
		}
		return nil, &Error{File: path, Msg: msg, err: err}
	}
	return &Workbook{path: path, sha: hex.EncodeToString(sum[:]), f: f, sheets: f.GetSheetList()}, nil
}

// Close releases the workbook.
func (w *Workbook) Close() error { return w.f.Close() }

// SHA256 is the hex SHA-256 of the workbook file's bytes.
func (w *Workbook) SHA256() string { return w.sha }

// Sheets lists the sheet names in tab order.
func (w *Workbook) Sheets() []string { return slices.Clone(w.sheets) }

// sheet resolves ref to a sheet name.
func (w *Workbook) sheet(ref SheetRef) (string, error) {
	quoted := make([]string, len(w.sheets))
	for i, s := range w.sheets {
		quoted[i] = strconv.Quote(s)
	}
	list := strings.Join(quoted, ", ")
	switch {
	case len(w.sheets) == 0:
		return "", &Error{File: w.path, Msg: "the workbook has no sheets"}
	case ref.Name != "":
		for _, s := range w.sheets {
			if s == ref.Name {
				return s, nil
			}
		}
		for _, s := range w.sheets {
			if strings.EqualFold(s, ref.Name) {
				return "", &Error{File: w.path, Msg: fmt.Sprintf("no sheet %q (did you mean %q? names must match exactly); the sheets are %s", ref.Name, s, list)}
			}
		}
		return "", &Error{File: w.path, Msg: fmt.Sprintf("no sheet %q; the sheets are %s: set sheet to one of them, or to its number (1 for the first)", ref.Name, list)}
	case ref.Number < 0 || ref.Number > len(w.sheets):
		return "", &Error{File: w.path, Msg: fmt.Sprintf("sheet = %d, but the workbook has %d sheet(s) (%s): give a number from 1 to %d, or a name", ref.Number, len(w.sheets), list, len(w.sheets))}
	case ref.Number == 0:
		return w.sheets[0], nil
	}
	return w.sheets[ref.Number-1], nil
}

// grid is one sheet's cells as text (raw values: numbers as stored, the
// cached value of a formula, an error's text), with its header resolved.
type grid struct {
	sheet     string
	headerRow int        // 1-based
	names     []string   // header names, by 0-based column
	rows      [][]string // the data rows, rows[0] is sheet row headerRow+1
}

// readGrid reads sheet ref, settles the header row (headerRow, 1-based;
// 0 means the first row with any non-empty cell) and drops empty rows at
// the end. A header cell inside a merged range takes the range's value;
// the second and later columns of a range merged across columns are named
// "NAME (2)", "NAME (3)", … so that each column keeps a distinct name.
func (w *Workbook) readGrid(ref SheetRef, headerRow int) (*grid, error) {
	sheet, err := w.sheet(ref)
	if err != nil {
		return nil, err
	}
	it, err := w.f.Rows(sheet)
	if err != nil {
		return nil, &Error{File: w.path, Sheet: sheet, Msg: "cannot read the sheet: " + err.Error(), err: err}
	}
	var rows [][]string
	for it.Next() {
		r, err := it.Columns(excelize.Options{RawCellValue: true})
		if err != nil {
			it.Close()
			return nil, &Error{File: w.path, Sheet: sheet, Msg: "cannot read the sheet: " + err.Error(), err: err}
		}
		rows = append(rows, r)
	}
	if err := it.Close(); err != nil {
		return nil, &Error{File: w.path, Sheet: sheet, Msg: "cannot read the sheet: " + err.Error(), err: err}
	}
	empty := func(r []string) bool {
		for _, c := range r {
			if strings.TrimSpace(c) != "" {
				return false
			}
		}
		return true
	}
	for len(rows) > 0 && empty(rows[len(rows)-1]) {
		rows = rows[:len(rows)-1]
	}
	if headerRow == 0 {
		for i, r := range rows {
			if !empty(r) {
				headerRow = i + 1
				break
			}
		}
		if headerRow == 0 {
			return nil, &Error{File: w.path, Sheet: sheet, Msg: "the sheet is empty: it needs a header row naming the columns; choose another sheet with sheet = \"…\""}
		}
	}
	if headerRow > len(rows) {
		return nil, &Error{File: w.path, Sheet: sheet, Msg: fmt.Sprintf("header_row = %d, but the sheet's last non-empty row is %d: set header_row to the row that names the columns", headerRow, len(rows))}
	}
	header := slices.Clone(rows[headerRow-1])
	merged, err := w.f.GetMergeCells(sheet)
	if err != nil {
		return nil, &Error{File: w.path, Sheet: sheet, Msg: "cannot read the sheet's merged cells: " + err.Error(), err: err}
	}
	for _, m := range merged {
		c1, r1, err1 := excelize.CellNameToCoordinates(m.GetStartAxis())
		c2, r2, err2 := excelize.CellNameToCoordinates(m.GetEndAxis())
		if err1 != nil || err2 != nil || headerRow < r1 || headerRow > r2 {
			continue
		}
		v := strings.TrimSpace(m.GetCellValue())
		for c := c1; c <= c2; c++ {
			for len(header) < c {
				header = append(header, "")
			}
			name := v
			if c > c1 && v != "" {
				name = fmt.Sprintf("%s (%d)", v, c-c1+1)
			}
			header[c-1] = name
		}
	}
	names := make([]string, len(header))
	for i, h := range header {
		names[i] = strings.TrimSpace(h)
	}
	return &grid{sheet: sheet, headerRow: headerRow, names: names, rows: rows[headerRow:]}, nil
}

// cellRef is the A1 reference of a 0-based column and 1-based row.
func cellRef(col, row int) string {
	s, err := excelize.CoordinatesToCellName(col+1, row)
	if err != nil {
		return fmt.Sprintf("R%dC%d", row, col+1)
	}
	return s
}

// WorkbookHeader returns the column names of the sheet's header row.
func WorkbookHeader(path string, ref SheetRef, headerRow int, lim *Limits) ([]string, error) {
	w, err := OpenWorkbook(path, lim)
	if err != nil {
		return nil, err
	}
	defer w.Close()
	g, err := w.readGrid(ref, headerRow)
	if err != nil {
		return nil, err
	}
	return g.names, nil
}

// ReadWorkbook reads the columns named in numeric and text from one sheet
// of the workbook at path, as Read does from a CSV file. headerRow is the
// 1-based row naming the columns (0: the first non-empty row); the data
// rows follow it, up to the last row with a non-empty cell.
//
// A cell reads as what the file stores: a number as its value, a date or
// time as its Excel serial number (days since 1899-12-30, the fraction
// the time of day; a workbook in the 1904 date system stores days since
// 1904-01-01 and is read as stored), a formula as the value cached when
// the workbook was last saved (a formula never calculated reads empty,
// hence missing), text as text. A cell holding an error value (#DIV/0!,
// #N/A, …) is missing in any column, counted in Table.Missing and by kind
// in Table.CellErrors. Cells matching opts.Missing are missing, as in a
// CSV file. Delimiter and decimal options do not apply. Errors name the
// file, the sheet and the cell.
func ReadWorkbook(path string, ref SheetRef, headerRow int, opts Options, numeric, text []string) (*Table, error) {
	w, err := OpenWorkbook(path, opts.Limits)
	if err != nil {
		return nil, err
	}
	defer w.Close()
	return w.Read(ref, headerRow, opts, numeric, text)
}

// Read reads one sheet of an opened workbook; see ReadWorkbook.
func (w *Workbook) Read(ref SheetRef, headerRow int, opts Options, numeric, text []string) (*Table, error) {
	lim := DefaultLimits()
	if opts.Limits != nil {
		lim = *opts.Limits
	}
	g, err := w.readGrid(ref, headerRow)
	if err != nil {
		return nil, err
	}
	cols, err := selectColumns(w.path, g.names, numeric, text)
	if err != nil {
		var e *Error
		if errors.As(err, &e) {
			e.Sheet, e.Line = g.sheet, 0
			e.Msg = strings.Replace(e.Msg, "the header has", fmt.Sprintf("the header (row %d) has", g.headerRow), 1)
			if e.Column != "" {
				if i := slices.Index(g.names, e.Column); i >= 0 {
					e.Cell = cellRef(i, g.headerRow)
				}
			}
		}
		return nil, err
	}
	if len(g.rows) > lim.MaxRows {
		return nil, &Error{File: w.path, Sheet: g.sheet, Msg: fmt.Sprintf("the sheet has %d data rows, more than the limit of %d: check that it is the sheet meant; if it is, raise max_rows for the dataset", len(g.rows), lim.MaxRows)}
	}
	missing := opts.Missing
	if missing == nil {
		missing = DefaultMissing()
	}
	t := &Table{File: w.path, SHA256: w.sha, Rows: len(g.rows), Sheet: g.sheet, HeaderRow: g.headerRow,
		Numeric: map[string][]float64{}, Text: map[string]Strings{},
		Missing: map[string]int{}, NonNumeric: map[string]int{}, CellErrors: map[string]map[string]int{}}
	for _, c := range cols {
		c.group = c.text && slices.Contains(opts.Groups, c.name)
		var nums []float64
		var texts []string
		if c.numeric {
			nums = make([]float64, len(g.rows))
		}
		if c.text {
			texts = make([]string, len(g.rows))
		}
		levels := map[string]bool{}
		nMissing, nNon := 0, 0
		var firstNon *Error
		for r, row := range g.rows {
			cell := ""
			if c.index < len(row) {
				cell = strings.TrimSpace(row[c.index])
			}
			isErr := IsExcelError(cell)
			isMissing := isErr || slices.Contains(missing, cell)
			if isErr {
				if t.CellErrors[c.name] == nil {
					t.CellErrors[c.name] = map[string]int{}
				}
				t.CellErrors[c.name][cell]++
			}
			if isMissing {
				nMissing++
			}
			if c.text {
				if isErr {
					texts[r] = ""
				} else {
					texts[r] = cell
				}
				if c.group && !isMissing && !levels[cell] {
					levels[cell] = true
					if len(levels) > lim.MaxLevels {
						return nil, &Error{File: w.path, Sheet: g.sheet, Cell: cellRef(c.index, g.headerRow+1+r), Column: c.name, Text: cellText(cell),
							Msg: fmt.Sprintf("a group column may hold at most %d distinct values, and %s in this cell is one more: a group names machines, lots or shifts; if this column identifies rows or holds measurements, group by another column, and if it really is a grouping, raise max_levels for the dataset", lim.MaxLevels, quoteCell(cell))}
					}
				}
			}
			if !c.numeric {
				continue
			}
			if isMissing {
				nums[r] = math.NaN()
				continue
			}
			v, err := strconv.ParseFloat(cell, 64)
			if err == nil && !math.IsInf(v, 0) && !math.IsNaN(v) {
				nums[r] = v
				continue
			}
			nums[r] = math.NaN()
			if opts.NonNumericAsMissing {
				nNon++
				continue
			}
			if firstNon == nil {
				firstNon = &Error{File: w.path, Sheet: g.sheet, Cell: cellRef(c.index, g.headerRow+1+r), Column: c.name, Text: cellText(cell),
					Msg: quoteCell(cell) + ` is not a number; correct the cell (a number stored as text with units or separators shows this), add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`}
			} else {
				nNon++
			}
		}
		if firstNon != nil {
			if nNon > 0 {
				firstNon.Msg += fmt.Sprintf(" (%d more such cells in this column)", nNon)
			}
			return nil, firstNon
		}
		if c.numeric {
			t.Numeric[c.name] = nums
			t.NonNumeric[c.name] = nNon
		}
		if c.text {
			t.Text[c.name] = textColumn(texts)
		}
		t.Missing[c.name] = nMissing
	}
	return t, nil
}
