// Package dataset reads the CSV files a manifest declares into typed
// columns: numbers for the variables of the studies, text for row names and
// groups.
//
// A file has a header row naming its columns. Fields are separated by
// comma, semicolon or tab (declared, or detected from the header line);
// numbers may be written with a decimal comma, as exports from many European
// plants do (declared, or detected when the delimiter is ';' or tab); a UTF-8
// byte-order mark, a first line "sep=;" naming the delimiter, CRLF line
// ends and quoted fields are accepted. Cells that
// match a declared missing-value token are missing (NaN), counted per column.
// A cell in a numeric column that is not a number is an error naming file,
// line, column and text, unless the dataset says such cells are missing.
//
// Read streams the file in blocks of a few MiB, cut at row ends: it never
// holds the text of the whole file, keeps only the requested columns (8
// bytes per numeric cell), parses the blocks on every core and hashes the
// bytes as it reads them. Limits bound the file's size, its rows, a row's
// and a cell's length and a group column's distinct values (see Limits);
// only regular files are read.
package dataset

import (
	"bytes"
	"encoding/binary"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"math/bits"
	"os"
	"slices"
	"strconv"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"
	"unsafe"

	"bivar/analysis/internal/suggest"
)

// Options say how a file is written. The zero value detects the delimiter
// and the decimal mark and treats "" and "NA" as missing.
type Options struct {
	// Delimiter is ',', ';' or '\t'; 0 takes it from a first line "sep=;"
	// when the file has one, else detects it from the header line (the
	// one of the three that occurs most often outside quotes; comma on a tie
	// or when none occurs).
	Delimiter rune
	// DecimalComma says numbers are written 1,5. DecimalPoint says they are
	// written 1.5. With neither, the mark is detected: a decimal point,
	// unless the delimiter is ';' or tab and the first number that shows a
	// mark shows a comma. A file that then mixes the two marks in numbers is
	// an error (1.234 might be a thousands separator), so declare the mark.
	// Detection reads 1,234 in a semicolon file as 1.234: a thousands
	// separator is accepted only when declared (Thousands).
	DecimalComma bool
	DecimalPoint bool
	// Thousands is the separator written between groups of three digits
	// ("1,234.5"), 0 for none: see parseThousands. ',' needs a decimal
	// point and '.' a decimal comma (declare it, or leave the mark to be
	// taken from the separator); the separator may not be the mark.
	Thousands rune
	// Missing are the cell texts read as missing, compared after trimming
	// spaces. nil means DefaultMissing; an empty non-nil list means none.
	Missing []string
	// NonNumericAsMissing counts a non-numeric cell in a numeric column as
	// missing (in Table.NonNumeric) instead of failing.
	NonNumericAsMissing bool
	// Groups names text columns that hold group levels (machine, lot,
	// shift): each may hold at most Limits.MaxLevels distinct values. A
	// name here that is not among the text columns read is ignored.
	Groups []string
	// Limits bound what is read; nil means DefaultLimits().
	Limits *Limits
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
	Text map[string]Strings
	// Missing counts, per requested column, the cells matching a missing
	// token. NonNumeric counts, per numeric column, the non-numeric cells
	// read as missing (always zero unless NonNumericAsMissing).
	Missing, NonNumeric map[string]int

	// Workbooks only (ReadWorkbook): the sheet read, the 1-based row of
	// its header, and per column the cells holding an Excel error value
	// (#DIV/0!, #N/A, …) counted by the error's text. Those cells are
	// missing (NaN, text ""), and are also counted in Missing.
	Sheet      string
	HeaderRow  int
	CellErrors map[string]map[string]int
}

// Error is a problem in a data file.
type Error struct {
	File   string
	Sheet  string // a workbook's sheet, "" for a CSV file
	Cell   string // a workbook cell reference (B17), "" if none
	Line   int    // 1-based line in the file; 0 when not about one line
	Column string // header name of the column concerned, "" if none
	Text   string // the offending cell text, if any; cut to 80 characters and "…"
	Msg    string // what is wrong and what to do

	err error // the underlying error, if any
}

// Unwrap returns the underlying error (for errors.Is(err, fs.ErrNotExist)).
func (e *Error) Unwrap() error { return e.err }

// Error returns `file:line: column "name": msg`, leaving out what is unknown.
func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	switch {
	case e.Sheet != "" && e.Cell != "":
		fmt.Fprintf(&b, ": sheet %q, cell %s", e.Sheet, e.Cell)
	case e.Sheet != "":
		fmt.Fprintf(&b, ": sheet %q", e.Sheet)
	case e.Line > 0:
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	b.WriteString(": ")
	if e.Column != "" {
		fmt.Fprintf(&b, "column %q: ", e.Column)
	}
	b.WriteString(e.Msg)
	return b.String()
}

// readBuffer is the size of the first read; the delimiter is detected from
// the part of the header line that fits in it.
const readBuffer = 1 << 16

// Read reads the columns named in numeric (as numbers) and text (as text)
// from the CSV file at path. A column may be in both lists. Every named
// column must be in the header; the others are skipped. Only a regular
// file is read (not a folder, a named pipe or a device), and only within
// opts.Limits.
func Read(path string, opts Options, numeric, text []string) (*Table, error) {
	st, err := regularFile(path)
	if err != nil {
		return nil, err
	}
	lim := DefaultLimits()
	if opts.Limits != nil {
		lim = *opts.Limits
	}
	if st.Size() > lim.MaxBytes {
		return nil, sizeError(path, st.Size(), lim.MaxBytes)
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, openError(path, err)
	}
	defer f.Close()
	if st, err := f.Stat(); err == nil { // the file opened may differ from the one checked
		if err := notRegular(path, st); err != nil {
			return nil, err
		}
	}
	return read(path, f, st.Size(), opts, numeric, text)
}

// Header returns the column names of the file's header row (spaces
// trimmed), read as Read reads it, without reading further.
func Header(path string, delimiter rune) ([]string, error) {
	if _, err := regularFile(path); err != nil {
		return nil, err
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, openError(path, err)
	}
	defer f.Close()
	h, err := readHeader(path, f, delimiter)
	if err != nil {
		return nil, err
	}
	return h.names, nil
}

// head is the header row and the bytes read to find it.
type head struct {
	buf   []byte // every byte read so far
	body  int    // offset in buf of the first byte after the header row
	line  int    // line number of that byte
	eof   bool   // buf holds the whole file
	delim rune
	names []string
}

// readHeader skips a byte-order mark, settles the delimiter and reads the
// header row, reading more of the file while the row is not complete (up
// to MaxRowBytes).
func readHeader(path string, r io.Reader, delim rune) (*head, error) {
	switch delim {
	case 0, ',', ';', '\t':
	default:
		return nil, &Error{File: path, Msg: fmt.Sprintf("delimiter %q is not supported: use ',', ';' or tab", delim)}
	}
	h := &head{buf: make([]byte, 0, readBuffer)}
	for {
		for len(h.buf) < cap(h.buf) && !h.eof {
			n, err := r.Read(h.buf[len(h.buf):cap(h.buf)])
			h.buf = h.buf[:len(h.buf)+n]
			if err == io.EOF {
				h.eof = true
			} else if err != nil {
				return nil, &Error{File: path, Msg: fmt.Sprintf("reading the file: %v", err), err: err}
			}
		}
		more, err := h.parse(path, delim)
		if !more {
			return h, err
		}
		h.buf = slices.Grow(h.buf, cap(h.buf))
	}
}

// parse reads the header row from h.buf; more says the row may go on
// beyond the bytes read so far.
func (h *head) parse(path string, delim rune) (more bool, err error) {
	bom := 0
	if bytes.HasPrefix(h.buf, []byte("\xEF\xBB\xBF")) {
		bom = 3
	}
	b := h.buf[bom:]
	sep := 0
	if d, n := sepLine(b); n > 0 {
		if delim != 0 && delim != d {
			return false, &Error{File: path, Line: 1, Msg: fmt.Sprintf("the file's first line, %q, says its delimiter is %q, but the dataset declares delimiter = %q: remove one of the two, or make them agree", strings.TrimRight(string(b[:n]), "\r\n"), d, delim)}
		}
		delim, sep = d, n
		b = b[n:]
	}
	if what, todo := notText(h.buf); what != "" {
		return false, &Error{File: path, Line: 1, Msg: "the file is " + what + ", not CSV text: " + todo}
	}
	if enc := wideEncoding(h.buf); enc != "" {
		return false, &Error{File: path, Line: 1, Msg: "the file is " + enc + " text (Excel's \"Unicode Text\" export and some database tools write it), which bivar does not read: save it as \"CSV UTF-8\", or convert it (iconv -f " + enc + " -t UTF-8)"}
	}
	if i, j := bytes.IndexByte(b, 0), bytes.IndexByte(b, '\n'); i >= 0 && (j < 0 || i < j) {
		return false, &Error{File: path, Line: 1, Msg: "the header row holds NUL (zero) bytes, which a text file does not: check that this is the CSV file meant (not a zeroed or damaged file, or text in another encoding), or save it again as CSV in UTF-8"}
	}
	if bytes.IndexByte(b, '\n') < 0 {
		if i := bytes.IndexByte(b, '\r'); i >= 0 && i < len(b)-1 {
			return false, &Error{File: path, Msg: "the file uses CR-only line ends (as classic Mac OS wrote them), which bivar does not read: save it with LF or CRLF line ends"}
		}
	}
	if delim == 0 {
		line := b[:min(len(b), readBuffer)]
		if i := bytes.IndexByte(line, '\n'); i >= 0 {
			line = line[:i]
		}
		if bytes.IndexByte(line, '|') >= 0 && bytes.IndexAny(line, ",;\t") < 0 {
			// A table as a database shell prints it (psql, mysql --table):
			// one column of bivar's, whose name holds every name.
			return false, &Error{File: path, Line: 1, Msg: "the header row is separated by '|', as a database shell prints a table, which bivar does not read: export the query as CSV (in psql: \\copy (SELECT …) TO 'file.csv' CSV HEADER), or read the table from the database with query or table"}
		}
		delim = detectDelimiter(line)
	}
	cr := csv.NewReader(bytes.NewReader(b))
	cr.Comma = delim
	header, err := cr.Read()
	off := int(cr.InputOffset())
	if !h.eof && (err != nil || off == len(b)) && len(h.buf) <= MaxRowBytes {
		return true, nil
	}
	if off > MaxRowBytes || err != nil && !h.eof && len(h.buf) > MaxRowBytes {
		return false, rowTooLong(path, 1)
	}
	if err == io.EOF {
		return false, &Error{File: path, Msg: "the file is empty: it needs a header row naming the columns"}
	}
	if err != nil {
		return false, csvError(path, err, nil, 0, 0, 0, b, byte(delim))
	}
	h.names = make([]string, len(header))
	for i, s := range header {
		h.names[i] = strings.TrimSpace(s)
	}
	h.delim, h.body = delim, bom+sep+off
	h.line = 1 + bytes.Count(h.buf[:h.body], []byte{'\n'})
	return false, nil
}

// sepLine reads a first line "sep=;" (or "sep=," or "sep=" and a tab), the
// line spreadsheet programs write above a CSV export to name its
// delimiter: the delimiter and the line's length with its end, or 0, 0.
func sepLine(b []byte) (delim rune, n int) {
	if !bytes.HasPrefix(b, []byte("sep=")) || len(b) < 6 {
		return 0, 0
	}
	switch {
	case b[4] != ',' && b[4] != ';' && b[4] != '\t':
		return 0, 0
	case b[5] == '\n':
		return rune(b[4]), 6
	case b[5] == '\r' && len(b) > 6 && b[6] == '\n':
		return rune(b[4]), 7
	}
	return 0, 0
}

// notText says what a file is whose first bytes are the signature of a
// format that is not text (each format's magic number: ZIP, APPNOTE.TXT
// §4.3.7; gzip, RFC 1952 §2.3.1; OLE compound file, MS-CFB §2.2; PDF,
// ISO 32000-1 §7.5.2), and what to do; "", "" for any other.
func notText(b []byte) (what, todo string) {
	switch {
	case bytes.HasPrefix(b, []byte("PK\x03\x04")):
		return "a zip archive (an Excel workbook, .xlsx, is one)", "if it is a workbook, give it the extension .xlsx so that bivar reads it as one; if it holds a CSV file, unpack it"
	case bytes.HasPrefix(b, []byte{0x1F, 0x8B}):
		return "compressed with gzip", "unpack it (gunzip) and name the unpacked file"
	case bytes.HasPrefix(b, oleMagic):
		return "an OLE compound file (an older .xls workbook, or an encrypted .xlsx)", "save it as .xlsx or as CSV in a spreadsheet program"
	case bytes.HasPrefix(b, []byte("%PDF-")):
		return "a PDF document", "export the table as CSV from the program that made it"
	}
	return "", ""
}

// wideEncoding names the encoding of a file that starts with a UTF-16 or
// UTF-32 byte-order mark (U+FEFF as each encoding form writes it: the
// signatures The Unicode Standard tabulates, quoted from memory and
// matching Python 3.11's codecs.BOM_UTF16_LE, _BE, BOM_UTF32_LE, _BE),
// or whose first bytes are ASCII characters each beside a NUL, as UTF-16
// without a mark writes them; "" for any other.
func wideEncoding(b []byte) string {
	switch {
	case bytes.HasPrefix(b, []byte{0xFF, 0xFE, 0, 0}):
		return "UTF-32LE"
	case bytes.HasPrefix(b, []byte{0, 0, 0xFE, 0xFF}):
		return "UTF-32BE"
	case bytes.HasPrefix(b, []byte{0xFF, 0xFE}):
		return "UTF-16LE"
	case bytes.HasPrefix(b, []byte{0xFE, 0xFF}):
		return "UTF-16BE"
	}
	n := min(len(b), 16) &^ 1
	le, be := n >= 4, n >= 4
	for i := 0; i < n; i += 2 {
		le = le && b[i] != 0 && b[i] < 0x80 && b[i+1] == 0
		be = be && b[i] == 0 && b[i+1] != 0 && b[i+1] < 0x80
	}
	switch {
	case le:
		return "UTF-16LE"
	case be:
		return "UTF-16BE"
	}
	return ""
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
	msg := quoteCell(cell) + " is not a number"
	hasComma, hasPoint := strings.Contains(cell, ","), strings.Contains(cell, ".")
	switch {
	case looksLikeDate(cell):
		msg += `: it is a date or a time, which bivar reads as a number only from a workbook (as Excel's serial days) or a database; write the column as numbers (hours or days since a start, as a spreadsheet formula can), or read the data from the workbook`
	case opts.Thousands != 0 && strings.ContainsRune(cell, opts.Thousands):
		msg += fmt.Sprintf(": the dataset declares thousands = %q, and a number written with it has one to three digits before the first separator, exactly three after each, and none after the decimal mark; correct the cell, or check thousands and decimal", string(opts.Thousands))
	case mark == '.' && hasComma && !hasPoint && opts.DecimalPoint:
		msg += `: it has a decimal comma, but the dataset declares decimal = "."`
	case mark == '.' && hasComma && !hasPoint && markLine > 0:
		msg += fmt.Sprintf(": it has a decimal comma, but numbers from line %d on use a decimal point; declare decimal = \".\" or \",\" for the dataset and make the file agree", markLine)
	case mark == '.' && hasComma && !hasPoint:
		msg += `: it has a comma; if the file uses decimal commas, declare decimal = "," (and quote such cells, since the delimiter is also a comma), and if it separates thousands, declare thousands = ","`
	case mark == ',' && hasPoint && !hasComma && markLine > 0:
		msg += fmt.Sprintf(": it has a decimal point, but numbers from line %d on use a decimal comma; declare decimal = \".\" or \",\" for the dataset and make the file agree", markLine)
	case mark == ',' && hasPoint && !hasComma && opts.DecimalComma:
		msg += `: it has a decimal point, but the dataset declares decimal = ","`
	case hasPoint && hasComma:
		msg += `: it shows both a point and a comma; if one of them separates thousands, declare it for the dataset (thousands = "," or "."), or write the number without it`
	case textHint(cell) != "":
		msg += textHint(cell)
	case IsExcelError(cell):
		msg += `: it is a spreadsheet's error value (a formula that could not be computed, exported as its text); add it to the dataset's missing list to count such cells as missing, or correct the formula and export again`
	case strings.Count(cell, ".") > 1 && !hasComma && opts.Thousands == 0:
		msg += `: it has more than one point; if the points separate thousands (1.234.567), declare thousands = "." for the dataset`
	case strings.HasPrefix(cell, "\uFEFF"):
		msg += `: it starts with a byte-order mark (U+FEFF), which belongs only at the start of a file: were two files joined? delete the mark (or the line, if it repeats the header)`
	case strings.IndexByte(cell, 0) >= 0:
		msg += nulBytes
	case !utf8.ValidString(cell):
		msg += `: it is not valid UTF-8 text; save the file as UTF-8 (an export in another encoding, such as Windows-1252, shows this)`
	default:
		msg += `; correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`
	}
	return msg
}

// nulBytes says what NUL bytes in a cell or a row mean and what to do.
const nulBytes = ": it holds NUL (zero) bytes, which a text file does not: the file may be padded or cut off by a failed write or copy (look at its end), or be UTF-16 text; correct the file, or save it again as CSV in UTF-8"

// looksLikeDate says whether s is a date, a time or both in a layout
// that exports write: ISO 8601 (2026-10-01, 2026-10-01T08:30:00,
// 2026-10-01 08:30), 01.10.2026, 10/01/2026, 2026/10/01, 08:30, 08:30:00.
func looksLikeDate(s string) bool {
	date, clock, _ := strings.Cut(strings.Replace(s, "T", " ", 1), " ")
	ok := func(v string, layouts ...string) bool {
		for _, l := range layouts {
			if _, err := time.Parse(l, v); err == nil {
				return true
			}
		}
		return false
	}
	clockOK := func(v string) bool {
		return ok(strings.TrimSuffix(v, "Z"), "15:04", "15:04:05", "15:04:05.999999999", "3:04 PM", "3:04:05 PM")
	}
	dates := []string{"2006-01-02", "02.01.2006", "1/2/2006", "2006/01/02", "2.1.2006"}
	if clock != "" {
		return ok(date, dates...) && clockOK(clock)
	}
	return ok(date, dates...) || clockOK(date)
}

// textHint explains a cell that is not a number, in a CSV file or a
// workbook, when it is a missing value as databases and NumPy write them,
// or a number written with characters bivar does not read as one: "" for
// any other cell. It starts with ": ".
func textHint(cell string) string {
	switch {
	case cell == `\N` || strings.EqualFold(cell, "NULL"):
		return fmt.Sprintf(`: it is how database exports write a missing value (NULL); add %s to the dataset's missing list`, strconv.Quote(cell))
	case nanOrInf(cell):
		return fmt.Sprintf(`: bivar reads no NaN or infinite value as a number (NumPy and other programs write them so); if it marks a missing value, add %s to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`, strconv.Quote(cell))
	case strings.IndexFunc(cell, func(r rune) bool { return r > unicode.MaxASCII && unicode.IsDigit(r) }) >= 0:
		return `: it has digits other than the ASCII 0 to 9 (fullwidth digits, as an East Asian input method types them, or digits of another script); retype the number with 0 to 9`
	}
	return otherMinus(cell)
}

// nanOrInf says whether s is a not-a-number or an infinity as programs
// write them: NaN, nan, inf, -Infinity, … (any case, any sign).
func nanOrInf(s string) bool {
	s = strings.ToLower(strings.TrimLeft(s, "+-"))
	return s == "nan" || s == "inf" || s == "infinity"
}

// otherMinus explains a cell that starts, after any spaces, with a dash
// that is not the ASCII hyphen-minus a number's sign must be: the minus
// sign U+2212 (which locales such as Swedish and Finnish format numbers
// with, and word processors put in), the figure dash U+2012 or the en
// dash U+2013, or the small and fullwidth hyphen-minus U+FE63, U+FF0D.
// It returns "" for any other cell.
func otherMinus(cell string) string {
	r, n := utf8.DecodeRuneInString(strings.TrimSpace(cell))
	switch r {
	case '\u2212', '\u2012', '\u2013', '\uFE63', '\uFF0D':
	default:
		return ""
	}
	rest := strings.TrimSpace(cell)[n:]
	if rest == "" || rest[0] < '0' || rest[0] > '9' && rest[0] != '.' && rest[0] != ',' {
		return ""
	}
	return fmt.Sprintf(": it starts with %U (%s), not the hyphen-minus '-' that bivar reads as a sign; replace it with '-' (word processors, and spreadsheets in some locales, write this sign)", r, string(r))
}

// outOfRangeMsg: a number too large in size for a double.
func outOfRangeMsg(cell string) string {
	return quoteCell(cell) + ` is out of range: a number's size may be at most about 1.8e308 (the largest double); correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`
}

// numStatus says how a cell read as a number.
type numStatus uint8

const (
	numOK         numStatus = iota
	numNot                  // not a number (or a number with the other mark)
	numOutOfRange           // a number too large in size for a double
)

// parseNumber reads a decimal number written with mark ('.' or ','; 0 =
// either, undecided). seen is the mark the text shows (0 if none). Only
// digits, one sign, one mark and an exponent are accepted: not "NaN",
// "Inf", hexadecimal, digit separators or units. The value is
// strconv.ParseFloat's, correctly rounded (IEEE 754 round to nearest); a
// number smaller in size than the least double reads as 0 or a subnormal,
// one larger than the largest is numOutOfRange. s is not kept: it may be
// a view of a buffer that is reused.
func parseNumber(s string, mark byte) (v float64, seen byte, st numStatus) {
	if v, seen, ok := fastNumber(s); ok {
		if mark != 0 && seen != 0 && seen != mark {
			return 0, seen, numNot
		}
		return v, seen, numOK
	}
	if s == "" {
		return 0, 0, numNot
	}
	digits := false
	at := 0
	for i := 0; i < len(s); i++ {
		switch c := s[i]; {
		case c >= '0' && c <= '9':
			digits = true
		case c == '+' || c == '-' || c == 'e' || c == 'E':
		case c == '.' || c == ',':
			if seen != 0 {
				return 0, 0, numNot
			}
			seen, at = c, i
		default:
			return 0, 0, numNot
		}
	}
	if !digits || mark != 0 && seen != 0 && seen != mark {
		return 0, seen, numNot
	}
	var err error
	if seen == ',' {
		var buf [64]byte
		if len(s) <= len(buf) {
			b := append(buf[:0], s...)
			b[at] = '.'
			v, err = strconv.ParseFloat(unsafe.String(&b[0], len(b)), 64)
		} else {
			v, err = strconv.ParseFloat(s[:at]+"."+s[at+1:], 64)
		}
	} else {
		v, err = strconv.ParseFloat(s, 64)
	}
	if err != nil {
		if errors.Is(err, strconv.ErrRange) && math.IsInf(v, 0) {
			return 0, seen, numOutOfRange
		}
		return 0, seen, numNot
	}
	return v, seen, numOK
}

// pow10 holds the powers of ten that are exact doubles.
var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
	1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// fastNumber reads the common short decimals, [+-]digits[mark digits]
// [e[+-]digits] with at most 15 significant digits and a power of ten
// within ±22, by Clinger's fast path (W. D. Clinger, "How to read floating
// point numbers accurately", PLDI 1990): the digits form an integer m <
// 10¹⁵ < 2⁵³ and 10^|e| ≤ 10²² are both exact doubles, so m·10^e or
// m/10^-e is one correctly rounded IEEE operation, the value
// strconv.ParseFloat returns. Anything else returns ok = false and goes the
// slow way.
func fastNumber(s string) (v float64, seen byte, ok bool) {
	d, i, ok := leadingDecimal(unsafe.Slice(unsafe.StringData(s), len(s)), 0)
	if !ok {
		return 0, 0, false
	}
	e := 0
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		i++
		eneg := false
		if i < len(s) && (s[i] == '+' || s[i] == '-') {
			eneg = s[i] == '-'
			i++
		}
		if i == len(s) {
			return 0, 0, false
		}
		for ; i < len(s); i++ {
			c := s[i]
			if c < '0' || c > '9' {
				return 0, 0, false
			}
			if e < 1000 {
				e = e*10 + int(c-'0')
			}
		}
		if eneg {
			e = -e
		}
	}
	if i != len(s) {
		return 0, 0, false
	}
	v, ok = d.value(e)
	return v, d.seen, ok
}

// scanNumber reads the cell at the start of rec, up to the first delim or
// the end, when it is a plain decimal: [+-]digits[mark digits] with mark
// '.' or ',' (not the delimiter), at most 15 significant digits and 22
// after the mark, no spaces and no exponent. n is the cell's length. It
// gives fastNumber's value and seen mark for such a cell, and ok = false
// for any other, which the caller reads the general way (parseNumber,
// missing markers, trimming).
//
// A cell that ends within the eight bytes after its sign, where rec's
// capacity holds those eight, is read from them as one word (wordCell);
// any other a byte at a time (scanBytes), by the same rules.
func scanNumber(rec []byte, delim byte) (v float64, n int, seen byte, ok bool) {
	i := 0
	if len(rec) > 0 && (rec[0] == '-' || rec[0] == '+') {
		i = 1
	}
	if cap(rec)-i < 8 {
		return scanBytes(rec, delim)
	}
	w := binary.LittleEndian.Uint64(rec[i : i+8])
	end := uint(min(len(rec)-i, 8))
	e := uint(bits.TrailingZeros64(byteMask(w, delim)|0x80<<(end*8))) >> 3 // the cell's end in w
	if e-1 >= 7 {
		return scanBytes(rec, delim) // empty, or the cell may go on past w
	}
	if v, seen, ok = wordCell(w, e); !ok {
		return 0, 0, 0, false
	}
	if i == 1 && rec[0] == '-' {
		v = -v
	}
	return v, i + int(e), seen, true
}

// Byte-wise constants: every byte holds the same value.
const (
	bytes01 = 0x0101010101010101
	bytes7f = 0x7f * bytes01
	bytes80 = 0x80 * bytes01
)

// byteMask sets the top bit of each byte of w that is c, and no other bit.
// The low seven bits of a byte plus 0x7f carry into its top bit if any is
// set and never into the next byte, so the test is exact in every byte.
func byteMask(w uint64, c byte) uint64 {
	x := w ^ uint64(c)*bytes01
	return ^((x&bytes7f + bytes7f) | x) & bytes80
}

// wordCell reads a cell without its sign, the first n ≤ 8 bytes of w (the
// first in the low byte; the other bytes are ignored), when it is
// digits[mark digits] with a digit and the mark '.' or ','; the caller
// has made sure that the cell holds no delimiter. v is its value without
// the sign and seen its mark (0 if none); ok is false for any other cell.
// At most eight digits are fewer than the 15 significant digits and the
// 22 after the mark scanNumber allows, and the value is Clinger's fast
// path (see fastNumber) of an integer below 10⁸ and a power of ten up to
// 10⁷: the value strconv.ParseFloat gives.
//
// The bytes are tested for digits and the digits summed eight at a time
// (SWAR), after D. Lemire, "Number parsing at a gigabyte per second",
// Software: Practice and Experience 51(8), 2021, section 6: a test of
// eight bytes for digits by adding to every byte, and eight digits joined
// by multiplications into pairs, then fours, then the eight.
func wordCell(w uint64, n uint) (v float64, seen byte, ok bool) {
	y := w ^ 0x30*bytes01 // a digit byte now holds its value, 0 to 9
	// The top bit of a byte is set where the byte is not a digit: y ≥ 10
	// either has it already or gets it from adding 0x76. Adding carries
	// into the next byte only from a byte ≥ 0x8a, which is neither a digit
	// nor a mark: with such a byte the cell fails whatever the next
	// byte's bit says.
	nd := (y + 0x76*bytes01 | y) & (bytes80 >> ((64 - n*8) & 63))
	if nd == 0 {
		return float64(eightDigits(y, n)), 0, true
	}
	a := uint(bits.TrailingZeros64(nd)) >> 3 // the mark's index
	seen = byte(w >> (a * 8 & 63))
	if nd&(nd-1) != 0 || seen != '.' && seen != ',' || n == 1 {
		return 0, 0, false // not a digit, two marks, or only a mark
	}
	low := uint64(1)<<(a*8&63) - 1 // the bytes before the mark
	v = float64(eightDigits(y&low|y>>8&^low, n-1))
	if after := n - 1 - a; after != 0 {
		v /= pow10[after&7]
	}
	return v, seen, true
}

// eightDigits is the integer that the first k bytes of y spell, 1 ≤ k ≤ 8,
// each byte a digit's value, the first the most significant. The k digits
// move to the top bytes, the first at byte 8-k: the bytes below it are
// leading zeros and the bytes after the k-th are shifted out. Then each
// even byte takes ten times itself plus the next (pairs), and two
// multiplications place the four pairs.
func eightDigits(y uint64, k uint) uint64 {
	m := y << ((64 - k*8) & 63)
	m = m*10 + m>>8
	return (m&0x000000ff000000ff*(100+1000000<<32) + m>>16&0x000000ff000000ff*(1+10000<<32)) >> 32
}

// scanBytes is scanNumber a byte at a time.
func scanBytes(rec []byte, delim byte) (v float64, n int, seen byte, ok bool) {
	d, i, ok := leadingDecimal(rec, delim)
	if !ok || i < len(rec) && rec[i] != delim || i > MaxCellBytes {
		return 0, 0, 0, false
	}
	v, ok = d.value(0)
	return v, i, d.seen, ok
}

// decimal is the start of a number as leadingDecimal reads it: the
// significant digits as an integer, the digits after the mark, the sign
// and the mark (0 if none).
type decimal struct {
	m     uint64
	after int
	neg   bool
	seen  byte
}

// leadingDecimal reads [+-]digits[mark digits] from the start of s, the
// mark '.' or ',' but not stop, and returns it with the index of the first
// byte after it; ok is false without a digit or with more than 15
// significant digits (leading zeros do not count).
func leadingDecimal(s []byte, stop byte) (d decimal, i int, ok bool) {
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		d.neg = s[i] == '-'
		i++
	}
	nd, digits := 0, false
	for ; i < len(s); i++ {
		c := s[i]
		if c >= '0' && c <= '9' {
			digits = true
			if d.seen != 0 {
				d.after++
			}
			if d.m == 0 && c == '0' {
				continue
			}
			if nd == 15 {
				return d, i, false
			}
			d.m = d.m*10 + uint64(c-'0')
			nd++
			continue
		}
		if (c == '.' || c == ',') && c != stop && d.seen == 0 {
			d.seen = c
			continue
		}
		break
	}
	return d, i, digits
}

// value is the decimal times 10^e, by Clinger's fast path (see
// fastNumber); ok is false where that path does not apply.
func (d decimal) value(e int) (float64, bool) {
	e -= d.after
	v := float64(d.m)
	switch {
	case d.m == 0 || e == 0:
	case e > 0 && e < len(pow10):
		v *= pow10[e]
	case e < 0 && -e < len(pow10):
		v /= pow10[-e]
	default:
		return 0, false
	}
	if d.neg {
		v = -v
	}
	return v, true
}

// detectDelimiter counts commas, semicolons and tabs outside double quotes
// in the header line (as far as it is in b).
func detectDelimiter(b []byte) rune {
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
// off is added to the lines, for a block that starts on line off+1.
// first is the line after the header's: a row there of the wrong length
// may be under a title line read as the header. src is the text read,
// whose first line is line off+1, and delim its delimiter.
func csvError(path string, err error, rec []string, want, off, first int, src []byte, delim byte) error {
	var pe *csv.ParseError
	if !errors.As(err, &pe) {
		return &Error{File: path, Msg: fmt.Sprintf("reading the file: %v", err), err: err}
	}
	e := &Error{File: path, Line: pe.Line + off, err: err}
	switch {
	case errors.Is(pe.Err, csv.ErrFieldCount):
		e.Line = pe.StartLine + off
		e.Msg = fieldCountMsg(len(rec), want, strings.Join(rec, ""), e.Line == first)
	case errors.Is(pe.Err, csv.ErrBareQuote) && spaceByQuote(src, delim, pe.Line, pe.Column, true):
		e.Msg = fmt.Sprintf("spaces between the delimiter and the double quote that opens a field (character %d): a quoted field starts right after the delimiter; remove the spaces", pe.Column)
	case errors.Is(pe.Err, csv.ErrQuote) && spaceByQuote(src, delim, pe.Line, pe.Column, false):
		e.Msg = fmt.Sprintf("spaces between the double quote that closes a field (character %d) and the delimiter: a quoted field ends right before the delimiter; remove the spaces", pe.Column)
	case errors.Is(pe.Err, csv.ErrBareQuote):
		e.Msg = fmt.Sprintf("a double quote inside an unquoted field (character %d): put the whole field in double quotes and write the quote twice (\"\")", pe.Column)
	case errors.Is(pe.Err, csv.ErrQuote):
		e.Msg = fmt.Sprintf("at character %d: a quoted field (in the row starting on line %d) is not closed, or holds a quote not written twice (\"\")", pe.Column, pe.StartLine+off)
	default:
		e.Msg = pe.Err.Error()
	}
	return e
}

// spaceByQuote says whether the double quote at the 1-based byte col of
// line line of src has only spaces (at least one) between it and the
// delimiter (delim) or line end before it (open) or after it (!open): a field
// written , "a, b" , as people type lists: RFC 4180 §2 makes the spaces
// part of the field (rule 4) and then allows no quote in it (rule 5), and
// encoding/csv reports a quote out of place.
func spaceByQuote(src []byte, delim byte, line, col int, open bool) bool {
	for ; line > 1; line-- {
		i := bytes.IndexByte(src, '\n')
		if i < 0 {
			return false
		}
		src = src[i+1:]
	}
	if i := bytes.IndexByte(src, '\n'); i >= 0 {
		src = src[:i]
	}
	src = bytes.TrimSuffix(src, []byte{'\r'})
	q := col - 1
	if q < 0 || q >= len(src) || src[q] != '"' {
		return false
	}
	var gap []byte
	if open {
		gap = src[:q]
		if i := bytes.LastIndexByte(gap, delim); i >= 0 {
			gap = gap[i+1:]
		}
	} else {
		gap = src[q+1:]
		if i := bytes.IndexByte(gap, delim); i >= 0 {
			gap = gap[:i]
		}
	}
	return len(gap) > 0 && len(bytes.Trim(gap, " ")) == 0
}

func fieldCount(n int) string {
	if n == 1 {
		return "1 field"
	}
	return fmt.Sprintf("%d fields", n)
}
