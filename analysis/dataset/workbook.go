package dataset

// This file reads Excel workbooks (.xlsx, .xlsm), their parts and cells
// streamed by sheetxml.go; the tests check every cell against
// github.com/xuri/excelize/v2's reading of the same workbooks.

import (
	"archive/zip"
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
	"time"
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
// the workbook's tab order (hidden sheets counted). The zero value is the
// first worksheet that is not hidden (the first sheet, when every one is).
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
	pkg    *sheetPackage
	sheets []string
}

// OpenWorkbook reads the workbook at path (a regular file of at most
// lim.MaxBytes; nil means DefaultLimits), hashes its bytes and reads its
// list of sheets. Each part is bounded when unpacked too, at 64 times
// MaxBytes, so that a small file that unpacks to gigabytes is refused.
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
	pkg, err := openSheetPackage(data, uint64(min(l.MaxBytes, math.MaxInt64/64))*64)
	if err != nil {
		msg := "cannot read the workbook: " + err.Error() + "; check that it is an Excel workbook (.xlsx, saved by a spreadsheet program), or open it in one, save it again as .xlsx, or export the sheet as CSV"
		switch {
		case bytes.HasPrefix(data, oleMagic):
			msg = "cannot read the workbook: it is an OLE compound file, not a zip archive: a password-protected (encrypted) workbook or an older .xls file; remove the password or save it as .xlsx in a spreadsheet program, or export the sheet as CSV"
		case bytes.HasPrefix(data, []byte("PK\x03\x04")) && errors.Is(err, zip.ErrFormat):
			msg = "cannot read the workbook: the zip archive it is made of is damaged or cut off (was the file copied or downloaded completely?); open it in a spreadsheet program and save it again, or export the sheet as CSV"
		case errors.Is(err, zip.ErrFormat) || errors.Is(err, zip.ErrAlgorithm):
			msg = "cannot read the workbook: it is not an .xlsx file (an .xlsx file is a zip archive); if it is an older .xls or an .ods file, open it in a spreadsheet program and save it as .xlsx, or export the sheet as CSV"
		}
		return nil, &Error{File: path, Msg: msg, err: err}
	}
	return &Workbook{path: path, sha: hex.EncodeToString(sum[:]), pkg: pkg, sheets: pkg.order}, nil
}

// oleMagic starts an OLE compound file (MS-CFB §2.2): an encrypted .xlsx
// (MS-OFFCRYPTO) or a legacy .xls.
var oleMagic = []byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1}

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
		// The first sheet whose tab the workbook shows: a hidden sheet (an
		// old copy, a lookup table) or a chart sheet before it is read
		// only when named.
		for _, s := range w.sheets {
			if _, ok := w.pkg.sheets[s]; ok && !w.pkg.hidden[s] {
				return s, nil
			}
		}
		return w.sheets[0], nil
	}
	return w.sheets[ref.Number-1], nil
}

// mergeRange is a merged range of cells, inclusive: 0-based columns (as
// sheetCell's) and 1-based rows (as the sheet's).
type mergeRange struct{ c1, r1, c2, r2 int32 }

// readSheet reads sheet ref row by row (sheetPackage.rows). It settles the
// header row (headerRow, 1-based; 0 means the first row with any
// non-blank cell), names the columns and passes them to header, which
// returns whether to read on; then it passes each data row that has a
// non-blank cell to data, with its 0-based index among the rows after the
// header (rows after the last non-blank one are never passed). A header
// cell inside a merged range takes the text of the range's first cell;
// the second and later columns of a range merged across columns are named
// "NAME (2)", "NAME (3)", … so that each column keeps a distinct name.
func (w *Workbook) readSheet(ref SheetRef, headerRow int, header func(sheet string, headerRow int, names []string) (bool, error),
	data func(r int, cells []sheetCell) error) error {
	sheet, err := w.sheet(ref)
	if err != nil {
		return err
	}
	fail := func(what string, err error) error {
		return &Error{File: w.path, Sheet: sheet, Msg: "cannot read the sheet" + what + ": " + err.Error() +
			"; the workbook looks damaged: open it in a spreadsheet program and save it again, or export the sheet as CSV", err: err}
	}
	part, ok := w.pkg.sheets[sheet]
	if k := w.pkg.other[sheet]; !ok && k != "" {
		var ws []string
		for _, s := range w.sheets {
			if _, ok := w.pkg.sheets[s]; ok {
				ws = append(ws, strconv.Quote(s))
			}
		}
		return &Error{File: w.path, Sheet: sheet, Msg: fmt.Sprintf("the sheet is %s, which holds no cells: set sheet to a worksheet (the workbook's are %s)", k, strings.Join(ws, ", "))}
	}
	if !ok {
		return fail("", errors.New("the workbook lists it but holds no worksheet part for it (is it a chart sheet?)"))
	}
	merges, err := w.pkg.mergeRefs(part)
	if err != nil {
		return fail("'s merged cells", err)
	}
	// The text of each range's first cell, once read: only of the ranges
	// that may cover the header row (all of them while it is unsettled).
	first := map[[2]int]string{}
	for _, m := range merges {
		if headerRow == 0 || int(m.r1) <= headerRow && headerRow <= int(m.r2) {
			first[[2]int{int(m.r1), int(m.c1)}] = ""
		}
	}

	settled, headerBlank, stop := false, false, false
	var pending error // the header's error, when it waits for the header_row check
	last := 0         // the last sheet row with a non-blank cell
	err = w.pkg.rows(part, func(row int, cells []sheetCell) (bool, error) {
		blank := true
		for _, c := range cells {
			if len(bytes.TrimSpace(c.v)) > 0 {
				blank = false
				break
			}
		}
		if !blank {
			last = row
		}
		if !settled {
			for _, c := range cells {
				if _, ok := first[[2]int{row, c.col}]; ok {
					first[[2]int{row, c.col}] = string(c.v)
				}
			}
			if headerRow == 0 && blank || row < headerRow {
				return false, nil
			}
			if headerRow == 0 {
				headerRow = row
			}
			var hc []sheetCell // the header row's cells (none when it has no row element)
			if row == headerRow {
				hc = cells
			}
			settled, headerBlank = true, row != headerRow || blank
			more, err := header(sheet, headerRow, headerNames(hc, merges, first, headerRow))
			switch {
			case err != nil && !headerBlank:
				return true, err
			case err != nil:
				pending, stop = err, true
			case !more && !headerBlank:
				return true, nil
			case !more:
				stop = true
			}
			if row == headerRow {
				return false, nil
			}
		}
		if blank {
			return false, nil
		}
		if stop {
			// Read only to learn that a non-blank row follows a blank header.
			return true, nil
		}
		return false, data(row-headerRow-1, cells)
	})
	if err != nil {
		var e *Error
		if errors.As(err, &e) {
			return err
		}
		return fail("", err)
	}
	switch {
	case !settled && headerRow == 0:
		return &Error{File: w.path, Sheet: sheet, Msg: "the sheet is empty: it needs a header row naming the columns; choose another sheet with sheet = \"…\""}
	case !settled || headerBlank && last < headerRow:
		return &Error{File: w.path, Sheet: sheet, Msg: fmt.Sprintf("header_row = %d, but the sheet's last non-empty row is %d: set header_row to the row that names the columns", headerRow, last)}
	}
	return pending
}

// headerNames names the columns from the header row's cells and the
// merged ranges over it (see readSheet).
func headerNames(cells []sheetCell, merges []mergeRange, first map[[2]int]string, headerRow int) []string {
	var header []string
	grow := func(c int) { // header holds column c
		for len(header) <= c {
			header = append(header, "")
		}
	}
	for _, c := range cells { // cells without a value are not among them
		grow(c.col)
		header[c.col] = string(c.v)
	}
	for _, m := range merges {
		r1, r2, c1, c2 := int(m.r1), int(m.r2), int(m.c1), int(m.c2)
		if headerRow < r1 || headerRow > r2 {
			continue
		}
		v := strings.TrimSpace(first[[2]int{r1, c1}])
		for c := c1; c <= c2; c++ {
			grow(c)
			name := v
			if c > c1 && v != "" {
				name = fmt.Sprintf("%s (%d)", v, c-c1+1)
			}
			header[c] = name
		}
	}
	names := make([]string, len(header))
	for i, h := range header {
		names[i] = strings.TrimSpace(h)
	}
	return names
}

// cellRef is the A1 reference of a 0-based column and 1-based row (the
// column's letters in bijective base 26, A to XFD, as ECMA-376 Part 1,
// §18.3.1.4 writes a cell's r attribute), or R…C… outside a sheet's
// 16 384 columns and 1 048 576 rows.
func cellRef(col, row int) string {
	if col < 0 || col >= 16384 || row < 1 || row > 1048576 {
		return fmt.Sprintf("R%dC%d", row, col+1)
	}
	var letters [3]byte
	i := len(letters)
	for c := col + 1; c > 0; c = (c - 1) / 26 {
		i--
		letters[i] = byte('A' + (c-1)%26)
	}
	return string(letters[i:]) + strconv.Itoa(row)
}

// WorkbookHeader returns the column names of the sheet's header row. It
// reads the sheet only as far as the header (and, to find the merged
// ranges, which follow the cells, the sheet's part once more).
func WorkbookHeader(path string, ref SheetRef, headerRow int, lim *Limits) ([]string, error) {
	w, err := OpenWorkbook(path, lim)
	if err != nil {
		return nil, err
	}
	return w.Header(ref, headerRow)
}

// Header returns the column names of the sheet's header row; see
// WorkbookHeader.
func (w *Workbook) Header(ref SheetRef, headerRow int) ([]string, error) {
	var names []string
	err := w.readSheet(ref, headerRow, func(_ string, _ int, n []string) (bool, error) {
		names = n
		return false, nil
	}, nil)
	return names, err
}

// ReadWorkbook reads the columns named in numeric and text from one sheet
// of the workbook at path, as Read does from a CSV file. headerRow is the
// 1-based row naming the columns (0: the first non-empty row); the data
// rows follow it, up to the last row with a non-empty cell.
//
// A cell reads as what the file stores: a number as its value, a date or
// time as its Excel serial number (days since 1899-12-30, the fraction
// the time of day; a workbook in the 1904 date system stores days since
// 1904-01-01 and is read as stored; a date cell stored as ISO 8601 text,
// t="d", is read as that serial number too: dateSerial), a formula as the value cached when
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
	return w.Read(ref, headerRow, opts, numeric, text)
}

// colRead is one selected column while a sheet is read.
type colRead struct {
	*column
	nums      floatBlocks
	texts     Strings
	levels    map[string]bool
	nMissing  int
	nNon      int
	firstNon  *Error // the column's first non-numeric cell
	levelsErr *Error // the group value past the limit of levels
}

// Read reads one sheet of an opened workbook; see ReadWorkbook.
func (w *Workbook) Read(ref SheetRef, headerRow int, opts Options, numeric, text []string) (*Table, error) {
	lim := DefaultLimits()
	if opts.Limits != nil {
		lim = *opts.Limits
	}
	missing := opts.Missing
	if missing == nil {
		missing = DefaultMissing()
	}
	t := &Table{File: w.path, SHA256: w.sha, Numeric: map[string][]float64{}, Text: map[string]Strings{},
		Missing: map[string]int{}, NonNumeric: map[string]int{}, CellErrors: map[string]map[string]int{}}
	var cols []*colRead
	var slot []int // sheet column → index in cols, −1 for a column not read
	var cell [][]byte
	var dates []bool // the cells of cell that are date cells (t="d")
	rows := 0        // data rows so far, up to the last with a non-blank cell
	over := false

	// put reads one cell of column c in data row r.
	put := func(c *colRead, r int, b []byte, date bool) {
		b = bytes.TrimSpace(b)
		isErr := len(b) > 0 && b[0] == '#' && IsExcelError(string(b))
		isMissing := isErr || slices.Contains(missing, string(b))
		if isErr {
			if t.CellErrors[c.name] == nil {
				t.CellErrors[c.name] = map[string]int{}
			}
			t.CellErrors[c.name][string(b)]++
		}
		if isMissing {
			c.nMissing++
		}
		if c.text {
			tb := b
			if isErr {
				tb = nil
			}
			if !c.texts.add(string(tb)) && c.levelsErr == nil {
				c.levelsErr = &Error{File: w.path, Sheet: t.Sheet, Cell: cellRef(c.index, t.HeaderRow+1+r), Column: c.name,
					Msg: fmt.Sprintf("the column's text passes %d bytes, the most bivar holds in one column: use a column with shorter values", MaxTextBytes)}
			}
			if c.group && !isMissing && c.levelsErr == nil && !c.levels[string(b)] {
				v := string(b)
				c.levels[v] = true
				if len(c.levels) > lim.MaxLevels {
					c.levelsErr = &Error{File: w.path, Sheet: t.Sheet, Cell: cellRef(c.index, t.HeaderRow+1+r), Column: c.name, Text: cellText(v),
						Msg: fmt.Sprintf("a group column may hold at most %d distinct values, and %s in this cell is one more: a group names machines, lots or shifts; if this column identifies rows or holds measurements, group by another column, and if it really is a grouping, raise max_levels for the dataset", lim.MaxLevels, quoteCell(v))}
				}
			}
		}
		if !c.numeric {
			return
		}
		if isMissing {
			c.nums.add(math.NaN())
			return
		}
		if date {
			// A date cell stored as text (t="d") reads as the serial
			// number a number cell holding it stores.
			if v, ok := dateSerial(string(b), w.pkg.date1904); ok {
				c.nums.add(v)
				return
			}
		}
		// The rules of a CSV cell with a decimal point: a number's text as
		// a spreadsheet program writes it passes, and so does text typed
		// as a number; not "NaN", "Inf", hexadecimal ("0x1p3", which
		// strconv.ParseFloat would read as 8) or digit separators.
		v, _, st := parseNumber(string(b), '.')
		if st == numOK {
			c.nums.add(v)
			return
		}
		c.nums.add(math.NaN())
		if opts.NonNumericAsMissing {
			c.nNon++
			return
		}
		if c.firstNon == nil {
			s := string(b)
			msg := quoteCell(s) + ` is not a number; correct the cell (a number stored as text with units or separators shows this), add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`
			if st == numOutOfRange {
				msg = outOfRangeMsg(s)
			} else if h := textHint(s); h != "" {
				msg = quoteCell(s) + " is not a number" + h
			} else if _, _, st := parseNumber(s, ','); st == numOK && strings.Contains(s, ",") {
				msg = quoteCell(s) + ` is not a number: it is text holding a number written with a comma (a decimal comma, or one between thousands); convert the column to numbers in the spreadsheet program, or set non_numeric = "missing" to count such cells as missing`
			}
			c.firstNon = &Error{File: w.path, Sheet: t.Sheet, Cell: cellRef(c.index, t.HeaderRow+1+r), Column: c.name, Text: cellText(s), Msg: msg}
		} else {
			c.nNon++
		}
	}

	err := w.readSheet(ref, headerRow, func(sheet string, headerRow int, names []string) (bool, error) {
		t.Sheet, t.HeaderRow = sheet, headerRow
		sel, err := selectColumns(w.path, names, numeric, text)
		if err != nil {
			var e *Error
			if errors.As(err, &e) {
				e.Sheet, e.Line = sheet, 0
				e.Msg = strings.Replace(e.Msg, "the header has", fmt.Sprintf("the header (row %d) has", headerRow), 1)
				if e.Column != "" {
					if i := slices.Index(names, e.Column); i >= 0 {
						e.Cell = cellRef(i, headerRow)
					}
				}
			}
			return false, err
		}
		for _, c := range sel {
			c.group = c.text && slices.Contains(opts.Groups, c.name)
			cr := &colRead{column: c, levels: map[string]bool{}, texts: Strings{end: []uint32{}}}
			cols = append(cols, cr)
			for len(slot) <= c.index {
				slot = append(slot, -1)
			}
			slot[c.index] = len(cols) - 1
		}
		cell, dates = make([][]byte, len(cols)), make([]bool, len(cols))
		return true, nil
	}, func(r int, cells []sheetCell) error {
		if r >= lim.MaxRows {
			over = true // count on, to say how many rows the sheet has
		}
		if over {
			rows = r + 1
			return nil
		}
		for ; rows < r; rows++ { // rows of blank cells before this one
			for _, c := range cols {
				put(c, rows, nil, false)
			}
		}
		clear(cell)
		clear(dates)
		for _, sc := range cells {
			if sc.col < len(slot) && slot[sc.col] >= 0 {
				cell[slot[sc.col]], dates[slot[sc.col]] = sc.v, sc.date
			}
		}
		for k, c := range cols {
			put(c, r, cell[k], dates[k])
		}
		rows = r + 1
		return nil
	})
	if err != nil {
		return nil, err
	}
	if over {
		return nil, &Error{File: w.path, Sheet: t.Sheet, Msg: fmt.Sprintf("the sheet has %d data rows, more than the limit of %d: check that it is the sheet meant; if it is, raise max_rows for the dataset", rows, lim.MaxRows)}
	}
	for _, c := range cols {
		if c.levelsErr != nil {
			return nil, c.levelsErr
		}
		if c.firstNon != nil {
			if c.nNon > 0 {
				c.firstNon.Msg += fmt.Sprintf(" (%d more such cells in this column)", c.nNon)
			}
			return nil, c.firstNon
		}
	}
	t.Rows = rows
	for _, c := range cols {
		if c.numeric {
			t.Numeric[c.name] = c.nums.column()
			t.NonNumeric[c.name] = c.nNon
		}
		if c.text {
			t.Text[c.name] = c.texts
		}
		t.Missing[c.name] = c.nMissing
	}
	return t, nil
}

// dateSerial reads the text of a date cell (t="d": ECMA-376 Part 1
// §18.17.4, ISO 8601 as a date 2026-10-01, a time 08:30:00 or both
// 2026-10-01T08:30:00, seconds and their fraction optional) as the serial
// number a number cell holding it stores: days since 1899-12-30 (a date
// before 1900-03-01 one less, as the 1900 date system counts a
// 29 February 1900 that never was), or since 1904-01-01 in the 1904 date
// system, the fraction the time of day; a time alone is that fraction. A
// zone (Z, +02:00) is dropped: a spreadsheet's clock has none, and the
// cell is read at the clock time it shows. openpyxl's to_excel
// (openpyxl/utils/datetime.py, 3.0.9) counts the same.
func dateSerial(s string, date1904 bool) (float64, bool) {
	var t time.Time
	var err error
	for _, layout := range []string{"2006-01-02T15:04:05.999999999Z07:00", "2006-01-02T15:04:05.999999999",
		"2006-01-02T15:04Z07:00", "2006-01-02T15:04", "2006-01-02", "15:04:05.999999999Z07:00",
		"15:04:05.999999999", "15:04"} {
		if t, err = time.Parse(layout, s); err == nil {
			if !strings.Contains(layout, "2006") {
				return float64(t.Hour()*3600+t.Minute()*60+t.Second())/86400 + float64(t.Nanosecond())/86400e9, true
			}
			break
		}
	}
	if err != nil {
		return 0, false
	}
	// The clock time as written, in seconds from the epoch's midnight.
	clock := time.Date(t.Year(), t.Month(), t.Day(), t.Hour(), t.Minute(), t.Second(), 0, time.UTC)
	epoch := time.Date(1899, 12, 30, 0, 0, 0, 0, time.UTC)
	if date1904 {
		epoch = time.Date(1904, 1, 1, 0, 0, 0, 0, time.UTC)
	}
	secs := clock.Unix() - epoch.Unix()
	days := secs / 86400
	if secs%86400 < 0 {
		days--
	}
	rest := float64(secs-days*86400)/86400 + float64(t.Nanosecond())/86400e9
	if !date1904 && days > 0 && days <= 60 {
		days--
	}
	return float64(days) + rest, true
}
