// Package dataset reads the CSV files a manifest declares into typed
// columns: numbers for the variables of the studies, text for row names and
// groups.
//
// A file has a header row naming its columns. Fields are separated by
// comma, semicolon or tab (declared, or detected from the header line);
// numbers may be written with a decimal comma, as exports from many European
// plants do (declared, or detected when the delimiter is ';' or tab); a UTF-8
// byte-order mark, CRLF line ends and quoted fields are accepted. Cells that
// match a declared missing-value token are missing (NaN), counted per column.
// A cell in a numeric column that is not a number is an error naming file,
// line, column and text, unless the dataset says such cells are missing.
//
// Read streams the file: it keeps only the requested columns, never the
// text of the whole file, and hashes the bytes as it reads them.
package dataset

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"

	"bivar/analysis/internal/suggest"
)

// Options say how a file is written. The zero value detects the delimiter
// and the decimal mark and treats "" and "NA" as missing.
type Options struct {
	// Delimiter is ',', ';' or '\t'; 0 detects it from the header line (the
	// one of the three that occurs most often outside quotes; comma on a tie
	// or when none occurs).
	Delimiter rune
	// DecimalComma says numbers are written 1,5. DecimalPoint says they are
	// written 1.5. With neither, the mark is detected: a decimal point,
	// unless the delimiter is ';' or tab and the first number that shows a
	// mark shows a comma. A file that then mixes the two marks in numbers is
	// an error (1.234 might be a thousands separator), so declare the mark.
	// Detection reads 1,234 in a semicolon file as 1.234: thousands
	// separators are never accepted.
	DecimalComma bool
	DecimalPoint bool
	// Missing are the cell texts read as missing, compared after trimming
	// spaces. nil means DefaultMissing; an empty non-nil list means none.
	Missing []string
	// NonNumericAsMissing counts a non-numeric cell in a numeric column as
	// missing (in Table.NonNumeric) instead of failing.
	NonNumericAsMissing bool
}

// DefaultMissing are the missing-value tokens when Options.Missing is nil.
func DefaultMissing() []string { return []string{"", "NA"} }

// Table holds the requested columns of one file.
type Table struct {
	File         string // the path as given to Read
	SHA256       string // hex SHA-256 of the file's bytes
	Rows         int    // data rows (the header is not counted)
	Delimiter    rune   // as declared or detected
	DecimalComma bool   // numbers were read with a decimal comma
	// Numeric holds the numeric columns, one value per data row; NaN marks
	// a missing (or, with NonNumericAsMissing, non-numeric) cell.
	Numeric map[string][]float64
	// Text holds the text columns, one cell per data row, spaces trimmed.
	// Missing cells keep their text (often ""); Missing counts them.
	Text map[string][]string
	// Missing counts, per requested column, the cells matching a missing
	// token. NonNumeric counts, per numeric column, the non-numeric cells
	// read as missing (always zero unless NonNumericAsMissing).
	Missing, NonNumeric map[string]int
}

// Error is a problem in a data file.
type Error struct {
	File   string
	Line   int    // 1-based line in the file; 0 when not about one line
	Column string // header name of the column concerned, "" if none
	Text   string // the offending cell text, if any
	Msg    string // what is wrong and what to do

	err error // the underlying error, if any
}

// Unwrap returns the underlying error (for errors.Is(err, fs.ErrNotExist)).
func (e *Error) Unwrap() error { return e.err }

// Error returns `file:line: column "name": msg`, leaving out what is unknown.
func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	b.WriteString(": ")
	if e.Column != "" {
		fmt.Fprintf(&b, "column %q: ", e.Column)
	}
	b.WriteString(e.Msg)
	return b.String()
}

// readBuffer is the size of the read buffer; the header line must fit in
// it for the delimiter to be detected.
const readBuffer = 1 << 16

// Read reads the columns named in numeric (as numbers) and text (as text)
// from the CSV file at path. A column may be in both lists. Every named
// column must be in the header; the others are skipped.
func Read(path string, opts Options, numeric, text []string) (*Table, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, openError(path, err)
	}
	defer f.Close()
	var size int64
	if st, err := f.Stat(); err == nil {
		size = st.Size()
	}
	return read(path, f, size, opts, numeric, text)
}

// column is one requested header column and where its cells go.
type column struct {
	name    string
	index   int
	numeric bool
	text    bool
	nums    []float64
	texts   []string
	missing int
	nonNum  int
	intern  map[string]string // repeated texts (groups, lots) kept once
}

// maxPrealloc bounds the rows a column is sized for before they are read
// (an unusually short first row must not reserve a huge column).
const maxPrealloc = 1 << 22

// maxIntern bounds the distinct texts a column keeps shared copies of.
const maxIntern = 1024

// keep returns a copy of cell that does not pin the record's memory,
// shared with earlier equal cells while the column has few distinct texts.
func (c *column) keep(cell string) string {
	if v, ok := c.intern[cell]; ok {
		return v
	}
	v := strings.Clone(cell)
	if len(c.intern) < maxIntern {
		if c.intern == nil {
			c.intern = map[string]string{}
		}
		c.intern[v] = v
	}
	return v
}

// read reads from r; size, when known (> 0), lets it size the columns
// from the length of the first data row instead of growing them.
func read(path string, r io.Reader, size int64, opts Options, numeric, text []string) (*Table, error) {
	h := sha256.New()
	br := bufio.NewReaderSize(io.TeeReader(r, h), readBuffer)
	fail := func(line int, col, cell, format string, args ...any) error {
		return &Error{File: path, Line: line, Column: col, Text: cell, Msg: fmt.Sprintf(format, args...)}
	}

	cr, delim, names, err := readHeader(path, br, opts.Delimiter)
	if err != nil {
		return nil, err
	}
	header := names
	headerEnd := cr.InputOffset()
	cols, err := selectColumns(path, names, numeric, text)
	if err != nil {
		return nil, err
	}

	missing := opts.Missing
	if missing == nil {
		missing = DefaultMissing()
	}
	isMissing := func(s string) bool {
		for _, m := range missing {
			if s == m {
				return true
			}
		}
		return false
	}

	// mark is the decimal mark: '.' or ',' once known, 0 while undecided.
	var mark byte
	var markLine int // where an undecided mark was decided, for messages
	switch {
	case opts.DecimalComma:
		mark = ','
	case opts.DecimalPoint, delim == ',':
		mark = '.'
	}
	var first *Error // the first non-numeric cell
	var more int     // non-numeric cells after it

	rows := 0
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, csvError(path, err, rec, len(header))
		}
		rows++
		if rows == 1 && size > 0 {
			if per := cr.InputOffset() - headerEnd; per > 0 {
				est := int(min((size-headerEnd)/per+16, maxPrealloc))
				for _, c := range cols {
					if c.numeric {
						c.nums = slices.Grow(c.nums, est)
					}
					if c.text {
						c.texts = slices.Grow(c.texts, est)
					}
				}
			}
		}
		for _, c := range cols {
			cell := strings.TrimSpace(rec[c.index])
			miss := isMissing(cell)
			if miss {
				c.missing++
			}
			if c.text {
				c.texts = append(c.texts, c.keep(cell))
			}
			if !c.numeric {
				continue
			}
			if miss {
				c.nums = append(c.nums, math.NaN())
				continue
			}
			v, seen, ok := parseNumber(cell, mark)
			if ok && mark == 0 && seen != 0 {
				mark = seen
				markLine, _ = cr.FieldPos(c.index)
			}
			if ok {
				c.nums = append(c.nums, v)
				continue
			}
			if opts.NonNumericAsMissing {
				c.nonNum++
				c.nums = append(c.nums, math.NaN())
				continue
			}
			if first != nil {
				more++
				continue
			}
			line, _ := cr.FieldPos(c.index)
			first = &Error{File: path, Line: line, Column: c.name, Text: cell, Msg: nonNumericMsg(cell, mark, markLine, opts)}
			c.nums = append(c.nums, math.NaN())
		}
	}
	if _, err := io.Copy(io.Discard, br); err != nil { // hash every byte
		return nil, fail(0, "", "", "reading the file: %v", err)
	}
	if first != nil {
		if more > 0 {
			first.Msg += fmt.Sprintf(" (and %d more non-numeric cells after it)", more)
		}
		return nil, first
	}

	t := &Table{
		File:         path,
		SHA256:       hex.EncodeToString(h.Sum(nil)),
		Rows:         rows,
		Delimiter:    delim,
		DecimalComma: mark == ',',
		Numeric:      map[string][]float64{},
		Text:         map[string][]string{},
		Missing:      map[string]int{},
		NonNumeric:   map[string]int{},
	}
	for _, c := range cols {
		if c.numeric {
			t.Numeric[c.name] = c.nums
			t.NonNumeric[c.name] = c.nonNum
		}
		if c.text {
			t.Text[c.name] = c.texts
		}
		t.Missing[c.name] = c.missing
	}
	return t, nil
}

// Header returns the column names of the file's header row (spaces
// trimmed), read as Read reads it, without reading further.
func Header(path string, delimiter rune) ([]string, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, openError(path, err)
	}
	defer f.Close()
	_, _, names, err := readHeader(path, bufio.NewReaderSize(f, readBuffer), delimiter)
	return names, err
}

// readHeader skips a byte-order mark, settles the delimiter and reads the
// header row.
func readHeader(path string, br *bufio.Reader, delim rune) (*csv.Reader, rune, []string, error) {
	if b, _ := br.Peek(3); bytes.Equal(b, []byte("\xEF\xBB\xBF")) {
		br.Discard(3)
	}
	switch delim {
	case 0:
		delim = detectDelimiter(br)
	case ',', ';', '\t':
	default:
		return nil, 0, nil, &Error{File: path, Msg: fmt.Sprintf("delimiter %q is not supported: use ',', ';' or tab", delim)}
	}
	cr := csv.NewReader(br)
	cr.Comma = delim
	cr.ReuseRecord = true
	cr.FieldsPerRecord = 0 // the header sets the count
	header, err := cr.Read()
	if err == io.EOF {
		return nil, 0, nil, &Error{File: path, Msg: "the file is empty: it needs a header row naming the columns"}
	}
	if err != nil {
		return nil, 0, nil, csvError(path, err, nil, 0)
	}
	names := make([]string, len(header))
	for i, h := range header {
		names[i] = strings.TrimSpace(h)
	}
	return cr, delim, names, nil
}

func openError(path string, err error) error {
	msg := err.Error()
	var pe *os.PathError
	if errors.As(err, &pe) {
		msg = pe.Err.Error()
	}
	return &Error{File: path, Msg: "cannot open the data file: " + msg, err: err}
}

func nonNumericMsg(cell string, mark byte, markLine int, opts Options) string {
	msg := fmt.Sprintf("%q is not a number", cell)
	hasComma, hasPoint := strings.Contains(cell, ","), strings.Contains(cell, ".")
	switch {
	case mark == '.' && hasComma && !hasPoint && opts.DecimalPoint:
		msg += `: it has a decimal comma, but the dataset declares decimal = "."`
	case mark == '.' && hasComma && !hasPoint && markLine > 0:
		msg += fmt.Sprintf(": it has a decimal comma, but numbers from line %d on use a decimal point; declare decimal = \".\" or \",\" for the dataset and make the file agree", markLine)
	case mark == '.' && hasComma && !hasPoint:
		msg += `: it has a comma; if the file uses decimal commas, declare decimal = "," (and quote such cells, since the delimiter is also a comma)`
	case mark == ',' && hasPoint && !hasComma && markLine > 0:
		msg += fmt.Sprintf(": it has a decimal point, but numbers from line %d on use a decimal comma; declare decimal = \".\" or \",\" for the dataset and make the file agree", markLine)
	case mark == ',' && hasPoint && !hasComma && opts.DecimalComma:
		msg += `: it has a decimal point, but the dataset declares decimal = ","`
	case hasPoint && hasComma:
		msg += `: it shows both a point and a comma; thousands separators are not accepted, write the number without them`
	case !utf8.ValidString(cell):
		msg += `: it is not valid UTF-8 text; save the file as UTF-8 (an export in another encoding, such as Windows-1252, shows this)`
	default:
		msg += `; correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`
	}
	return msg
}

// parseNumber reads a decimal number written with mark ('.' or ','; 0 =
// either, undecided). seen is the mark the text shows (0 if none). Only
// digits, one sign, one mark and an exponent are accepted: not "NaN",
// "Inf", hexadecimal, digit separators or units.
func parseNumber(s string, mark byte) (v float64, seen byte, ok bool) {
	if s == "" {
		return 0, 0, false
	}
	digits := false
	for i := 0; i < len(s); i++ {
		switch c := s[i]; {
		case c >= '0' && c <= '9':
			digits = true
		case c == '+' || c == '-' || c == 'e' || c == 'E':
		case c == '.' || c == ',':
			if seen != 0 {
				return 0, 0, false
			}
			seen = c
		default:
			return 0, 0, false
		}
	}
	if !digits || mark != 0 && seen != 0 && seen != mark {
		return 0, seen, false
	}
	if seen == ',' {
		var buf [64]byte
		if len(s) <= len(buf) {
			b := append(buf[:0], s...)
			b[strings.IndexByte(s, ',')] = '.'
			s = string(b)
		} else {
			s = strings.Replace(s, ",", ".", 1)
		}
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(v, 0) {
		return 0, seen, false
	}
	return v, seen, true
}

// detectDelimiter counts commas, semicolons and tabs outside double quotes
// in the header line (as far as it fits in the read buffer).
func detectDelimiter(br *bufio.Reader) rune {
	b, _ := br.Peek(readBuffer)
	if i := bytes.IndexByte(b, '\n'); i >= 0 {
		b = b[:i]
	}
	var comma, semi, tab int
	quoted := false
	for _, c := range b {
		switch {
		case c == '"':
			quoted = !quoted
		case quoted:
		case c == ',':
			comma++
		case c == ';':
			semi++
		case c == '\t':
			tab++
		}
	}
	switch {
	case semi > comma && semi >= tab:
		return ';'
	case tab > comma && tab > semi:
		return '\t'
	}
	return ','
}

func selectColumns(path string, names, numeric, text []string) ([]*column, error) {
	index := map[string]int{}
	dup := map[string]int{}
	for i, n := range names {
		if j, ok := index[n]; ok {
			dup[n] = j
			continue
		}
		index[n] = i
	}
	var cols []*column
	byName := map[string]*column{}
	var absent []string
	want := func(name string, num bool) error {
		if c, ok := byName[name]; ok {
			c.numeric = c.numeric || num
			c.text = c.text || !num
			return nil
		}
		i, ok := index[name]
		if !ok {
			absent = append(absent, name)
			return nil
		}
		if j, twice := dup[name]; twice {
			return &Error{File: path, Line: 1, Column: name, Msg: fmt.Sprintf("the header names this column twice (columns %d and %d); rename one", j+1, lastIndex(names, name)+1)}
		}
		c := &column{name: name, index: i, numeric: num, text: !num}
		cols = append(cols, c)
		byName[name] = c
		return nil
	}
	for _, n := range numeric {
		if err := want(n, true); err != nil {
			return nil, err
		}
	}
	for _, n := range text {
		if err := want(n, false); err != nil {
			return nil, err
		}
	}
	if len(absent) == 0 {
		return cols, nil
	}
	var parts []string
	for _, a := range absent {
		p := fmt.Sprintf("no column %q", a)
		if near := suggest.Nearest(a, names); near != "" {
			p += fmt.Sprintf(" (did you mean %q?)", near)
		}
		parts = append(parts, p)
	}
	quoted := make([]string, len(names))
	for i, n := range names {
		quoted[i] = strconv.Quote(n)
	}
	return nil, &Error{File: path, Line: 1, Column: absent[0],
		Msg: strings.Join(parts, ", ") + "; the header has " + strings.Join(quoted, ", ")}
}

func lastIndex(names []string, name string) int {
	for i := len(names) - 1; i >= 0; i-- {
		if names[i] == name {
			return i
		}
	}
	return -1
}

// csvError turns encoding/csv's errors into ones that say what to do.
func csvError(path string, err error, rec []string, want int) error {
	var pe *csv.ParseError
	if !errors.As(err, &pe) {
		return &Error{File: path, Msg: fmt.Sprintf("reading the file: %v", err), err: err}
	}
	e := &Error{File: path, Line: pe.Line, err: err}
	switch {
	case errors.Is(pe.Err, csv.ErrFieldCount):
		e.Line = pe.StartLine
		e.Msg = fmt.Sprintf("this row has %s but the header has %d: look for a missing or extra delimiter, or a value holding the delimiter that is not in double quotes", fieldCount(len(rec)), want)
	case errors.Is(pe.Err, csv.ErrBareQuote):
		e.Msg = fmt.Sprintf("a double quote inside an unquoted field (character %d): put the whole field in double quotes and write the quote twice (\"\")", pe.Column)
	case errors.Is(pe.Err, csv.ErrQuote):
		e.Msg = fmt.Sprintf("at character %d: a quoted field (in the row starting on line %d) is not closed, or holds a quote not written twice (\"\")", pe.Column, pe.StartLine)
	default:
		e.Msg = pe.Err.Error()
	}
	return e
}

func fieldCount(n int) string {
	if n == 1 {
		return "1 field"
	}
	return fmt.Sprintf("%d fields", n)
}
