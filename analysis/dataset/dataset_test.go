package dataset

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// All data in these tests are invented for the tests.

var nan = math.NaN()

func sameFloats(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] && !(math.IsNaN(a[i]) && math.IsNaN(b[i])) {
			return false
		}
	}
	return true
}

func TestRead(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name    string
		src     string
		opts    Options
		numeric []string
		text    []string

		rows      int
		delim     rune
		comma     bool
		nums      map[string][]float64
		texts     map[string][]string
		missing   map[string]int
		nonNumber map[string]int
	}{
		{name: "comma", src: "shot,temp,shrink\n1,230.5,1.25\n2,231,-1e-2\n",
			numeric: []string{"temp", "shrink"}, text: []string{"shot"},
			rows: 2, delim: ',',
			nums:  map[string][]float64{"temp": {230.5, 231}, "shrink": {1.25, -0.01}},
			texts: map[string][]string{"shot": {"1", "2"}}},
		{name: "semicolon detected, decimal comma detected", src: "shot;temp;shrink\nA;230,5;1,25\nB;231;2\n",
			numeric: []string{"temp", "shrink"},
			rows:    2, delim: ';', comma: true,
			nums: map[string][]float64{"temp": {230.5, 231}, "shrink": {1.25, 2}}},
		{name: "tab detected, decimal comma detected", src: "a\tb\n0,5\t1\n",
			numeric: []string{"a", "b"},
			rows:    1, delim: '\t', comma: true,
			nums: map[string][]float64{"a": {0.5}, "b": {1}}},
		// The first line "sep=;" that spreadsheet programs write above a
		// CSV export names the delimiter; the header is the next line.
		// It read before as a header of two columns, "sep=" and "", and
		// every data row as one of the wrong length.
		{name: "sep= line", src: "\xEF\xBB\xBFsep=;\r\nshot;temp\r\nA;230,5\r\nB;231\r\n",
			numeric: []string{"temp"}, text: []string{"shot"},
			rows: 2, delim: ';', comma: true,
			nums:  map[string][]float64{"temp": {230.5, 231}},
			texts: map[string][]string{"shot": {"A", "B"}}},
		{name: "sep= line, comma", src: "sep=,\na,b\n1,2\n",
			numeric: []string{"a", "b"}, rows: 1, delim: ',',
			nums: map[string][]float64{"a": {1}, "b": {2}}},
		{name: "semicolon with decimal point", src: "a;b\n0.5;1\n",
			numeric: []string{"a"}, rows: 1, delim: ';',
			nums: map[string][]float64{"a": {0.5}}},
		{name: "declared delimiter wins over detection", src: "a;b,c\n1;2,5\n",
			opts: Options{Delimiter: ',', NonNumericAsMissing: true}, numeric: []string{"a;b"}, text: []string{"c"},
			rows: 1, delim: ',',
			texts: map[string][]string{"c": {"5"}}, nums: map[string][]float64{"a;b": {nan}},
			nonNumber: map[string]int{"a;b": 1}},
		{name: "declared decimal comma with comma delimiter and quotes", src: "a,b\n\"1,5\",2\n",
			opts: Options{DecimalComma: true}, numeric: []string{"a", "b"},
			rows: 1, delim: ',', comma: true,
			nums: map[string][]float64{"a": {1.5}, "b": {2}}},
		{name: "BOM and CRLF", src: "\xEF\xBB\xBFx,y\r\n1,2\r\n3,4\r\n",
			numeric: []string{"x", "y"}, rows: 2, delim: ',',
			nums: map[string][]float64{"x": {1, 3}, "y": {2, 4}}},
		{name: "quoted fields", src: "id,\"the x\",y\n\"a, b\",1,\"2\"\n\"say \"\"hi\"\"\",3,4\n\"two\nlines\",5,6\n",
			numeric: []string{"the x", "y"}, text: []string{"id"}, rows: 3, delim: ',',
			nums:  map[string][]float64{"the x": {1, 3, 5}, "y": {2, 4, 6}},
			texts: map[string][]string{"id": {"a, b", `say "hi"`, "two\nlines"}}},
		{name: "missing tokens counted", src: "x,y,g\n1,NA,a\n,2,NA\n 3 , 4 ,b\n",
			numeric: []string{"x", "y"}, text: []string{"g"}, rows: 3, delim: ',',
			nums:    map[string][]float64{"x": {1, nan, 3}, "y": {nan, 2, 4}},
			texts:   map[string][]string{"g": {"a", "NA", "b"}},
			missing: map[string]int{"x": 1, "y": 1, "g": 1}},
		{name: "declared missing tokens", src: "x\n-\n999\nNA\n",
			opts: Options{Missing: []string{"-", "999", "NA"}}, numeric: []string{"x"}, rows: 3, delim: ',',
			nums: map[string][]float64{"x": {nan, nan, nan}}, missing: map[string]int{"x": 3}},
		{name: "non-numeric as missing", src: "x\n1\nbroken\nNaN\nInf\n0x10\n1_000\n",
			opts: Options{NonNumericAsMissing: true}, numeric: []string{"x"}, rows: 6, delim: ',',
			nums: map[string][]float64{"x": {1, nan, nan, nan, nan, nan}}, nonNumber: map[string]int{"x": 5}},
		{name: "column both numeric and text", src: "order\n3\n1\n",
			numeric: []string{"order"}, text: []string{"order"}, rows: 2, delim: ',',
			nums: map[string][]float64{"order": {3, 1}}, texts: map[string][]string{"order": {"3", "1"}}},
		{name: "header only", src: "x,y\n", numeric: []string{"x"}, rows: 0, delim: ',',
			nums: map[string][]float64{"x": nil}},
		{name: "blank lines skipped", src: "x\n1\n\n2\n", numeric: []string{"x"}, rows: 2, delim: ',',
			nums: map[string][]float64{"x": {1, 2}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			tab, err := read("data.csv", strings.NewReader(c.src), int64(len(c.src)), c.opts, c.numeric, c.text)
			if err != nil {
				t.Fatalf("read: %v", err)
			}
			if tab.Rows != c.rows || tab.Delimiter != c.delim || tab.DecimalComma != c.comma {
				t.Errorf("Rows, Delimiter, DecimalComma = %d, %q, %v; want %d, %q, %v",
					tab.Rows, tab.Delimiter, tab.DecimalComma, c.rows, c.delim, c.comma)
			}
			for name, want := range c.nums {
				if got := tab.Numeric[name]; !sameFloats(got, want) {
					t.Errorf("Numeric[%q] = %v, want %v", name, got, want)
				}
			}
			for name, want := range c.texts {
				if got := tab.Text[name].Slice(); !reflect.DeepEqual(got, want) {
					t.Errorf("Text[%q] = %q, want %q", name, got, want)
				}
			}
			for _, name := range append(append([]string{}, c.numeric...), c.text...) {
				if got, want := tab.Missing[name], c.missing[name]; got != want {
					t.Errorf("Missing[%q] = %d, want %d", name, got, want)
				}
			}
			for _, name := range c.numeric {
				if got, want := tab.NonNumeric[name], c.nonNumber[name]; got != want {
					t.Errorf("NonNumeric[%q] = %d, want %d", name, got, want)
				}
			}
			if len(tab.Numeric) != len(c.numeric) && len(c.nums) == len(c.numeric) {
				t.Errorf("Numeric holds %d columns, want %d", len(tab.Numeric), len(c.numeric))
			}
		})
	}
}

// TestReadErrors pins whole messages: they are the interface.
func TestReadErrors(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name    string
		src     string
		opts    Options
		numeric []string
		text    []string
		want    Error
	}{
		{"non-numeric cell", "shot,temp\n1,230\n2,23O\n3,231\n", Options{}, []string{"temp"}, nil,
			Error{Line: 3, Column: "temp", Text: "23O", Msg: `"23O" is not a number; correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`}},
		{"several non-numeric cells", "x,y\nn/a,1\n2,n/a\nn/a,3\n", Options{}, []string{"x", "y"}, nil,
			Error{Line: 2, Column: "x", Text: "n/a", Msg: `"n/a" is not a number; correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing (and 2 more non-numeric cells after it)`}},
		{"empty cell when no missing tokens", "x\n1\n\"\"\n", Options{Missing: []string{}}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "", Msg: `"" is not a number; correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`}},
		{"line counted across a quoted line break", "id,x\n\"a\nb\",1\nc,oops\n", Options{}, []string{"x"}, nil,
			Error{Line: 4, Column: "x", Text: "oops", Msg: `"oops" is not a number; correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`}},
		{"mixed decimal marks", "a;b\n1,5;2\n2.5;3\n", Options{}, []string{"a"}, nil,
			Error{Line: 3, Column: "a", Text: "2.5", Msg: `"2.5" is not a number: it has a decimal point, but numbers from line 2 on use a decimal comma; declare decimal = "." or "," for the dataset and make the file agree`}},
		{"comma in a comma-separated file", "a,b\n\"1,5\",2\n", Options{}, []string{"a"}, nil,
			Error{Line: 2, Column: "a", Text: "1,5", Msg: `"1,5" is not a number: it has a comma; if the file uses decimal commas, declare decimal = "," (and quote such cells, since the delimiter is also a comma), and if it separates thousands, declare thousands = ","`}},
		{"declared decimal point", "a;b\n1,5;2\n", Options{DecimalPoint: true}, []string{"a"}, nil,
			Error{Line: 2, Column: "a", Text: "1,5", Msg: `"1,5" is not a number: it has a decimal comma, but the dataset declares decimal = "."`}},
		{"declared decimal comma", "a;b\n1.5;2\n", Options{DecimalComma: true}, []string{"a"}, nil,
			Error{Line: 2, Column: "a", Text: "1.5", Msg: `"1.5" is not a number: it has a decimal point, but the dataset declares decimal = ","`}},
		{"thousands separator", "a;b\n1.234,5;2\n", Options{DecimalComma: true}, []string{"a"}, nil,
			Error{Line: 2, Column: "a", Text: "1.234,5", Msg: `"1.234,5" is not a number: it shows both a point and a comma; if one of them separates thousands, declare it for the dataset (thousands = "," or "."), or write the number without it`}},
		{"absent columns", "shot,melt_temp,shrinkage\n1,2,3\n", Options{}, []string{"melt_tmp", "pressure"}, nil,
			Error{Line: 1, Column: "melt_tmp", Msg: `no column "melt_tmp" (did you mean "melt_temp"?), no column "pressure"; the header has "shot", "melt_temp", "shrinkage"`}},
		{"column named twice", "x,y,x\n1,2,3\n", Options{}, []string{"x"}, nil,
			Error{Line: 1, Column: "x", Msg: `the header names this column twice (columns 1 and 3); rename one`}},
		{"wrong field count", "x,y\n1,2\n3,4,5\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Msg: `this row has 3 fields but the header has 2: look for a missing or extra delimiter, or a value holding the delimiter that is not in double quotes`}},
		{"one field in a row", "x,y\n1,2\n3\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Msg: `this row has 1 field but the header has 2: look for a missing or extra delimiter, or a value holding the delimiter that is not in double quotes`}},
		{"not UTF-8", "x,y\n1,2\n\xff,4\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "\xff", Msg: `"\xff" is not a number: it is not valid UTF-8 text; save the file as UTF-8 (an export in another encoding, such as Windows-1252, shows this)`}},
		{"bare quote", "x,y\n1,2 \"in\"\n", Options{}, []string{"x"}, nil,
			Error{Line: 2, Msg: `a double quote inside an unquoted field (character 5): put the whole field in double quotes and write the quote twice ("")`}},
		{"unclosed quote", "x,y\n1,\"abc\n", Options{}, []string{"x"}, nil,
			Error{Line: 2, Msg: `at character 8: a quoted field (in the row starting on line 2) is not closed, or holds a quote not written twice ("")`}},
		// The bytes of Python 3.11's "x,y\n1,2\n".encode(e) for e = "utf-16"
		// (little-endian with its mark), "utf-16-be", "utf-16-le" (no
		// mark) and "utf-32". They read before as a header of mangled
		// names and a data row of "1 field", on the last line.
		{"UTF-16 with its mark", "\xff\xfex\x00,\x00y\x00\n\x001\x00,\x002\x00\n\x00", Options{}, []string{"x"}, nil,
			Error{Line: 1, Msg: `the file is UTF-16LE text (Excel's "Unicode Text" export and some database tools write it), which bivar does not read: save it as "CSV UTF-8", or convert it (iconv -f UTF-16LE -t UTF-8)`}},
		{"UTF-16BE without its mark", "\x00x\x00,\x00y\x00\n\x001\x00,\x002\x00\n", Options{}, []string{"x"}, nil,
			Error{Line: 1, Msg: `the file is UTF-16BE text (Excel's "Unicode Text" export and some database tools write it), which bivar does not read: save it as "CSV UTF-8", or convert it (iconv -f UTF-16BE -t UTF-8)`}},
		{"UTF-16LE without its mark", "x\x00,\x00y\x00\n\x001\x00,\x002\x00\n\x00", Options{}, []string{"x"}, nil,
			Error{Line: 1, Msg: `the file is UTF-16LE text (Excel's "Unicode Text" export and some database tools write it), which bivar does not read: save it as "CSV UTF-8", or convert it (iconv -f UTF-16LE -t UTF-8)`}},
		{"UTF-32", "\xff\xfe\x00\x00x\x00\x00\x00,\x00\x00\x00y\x00\x00\x00\n\x00\x00\x00", Options{}, []string{"x"}, nil,
			Error{Line: 1, Msg: `the file is UTF-32LE text (Excel's "Unicode Text" export and some database tools write it), which bivar does not read: save it as "CSV UTF-8", or convert it (iconv -f UTF-32LE -t UTF-8)`}},
		{"zeroed file", "\x00\x00\x00\x00\x00\x00\x00\x00", Options{}, []string{"x"}, nil,
			Error{Line: 1, Msg: `the header row holds NUL (zero) bytes, which a text file does not: check that this is the CSV file meant (not a zeroed or damaged file, or text in another encoding), or save it again as CSV in UTF-8`}},
		// A file padded with zero bytes after its last line (a write cut
		// short by a crash): they read before as a row of "1 field" whose
		// message sent the user looking for a delimiter.
		{"NUL padding", "x,y\n1,2\n\x00\x00\x00\x00", Options{}, []string{"x"}, nil,
			Error{Line: 3, Msg: `this row has 1 field but the header has 2: it holds NUL (zero) bytes, which a text file does not: the file may be padded or cut off by a failed write or copy (look at its end), or be UTF-16 text; correct the file, or save it again as CSV in UTF-8`}},
		{"NUL padding in a quoted file", "x,y\n1,\"a\"\"b\"\n\x00\x00\x00\x00", Options{}, []string{"x"}, nil,
			Error{Line: 3, Msg: `this row has 1 field but the header has 2: it holds NUL (zero) bytes, which a text file does not: the file may be padded or cut off by a failed write or copy (look at its end), or be UTF-16 text; correct the file, or save it again as CSV in UTF-8`}},
		{"NUL in a cell", "x,y\n1,2\n3\x00\x00,4\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "3\x00\x00", Msg: `"3\x00\x00" is not a number: it holds NUL (zero) bytes, which a text file does not: the file may be padded or cut off by a failed write or copy (look at its end), or be UTF-16 text; correct the file, or save it again as CSV in UTF-8`}},
		// LF line ends, then CR-only ones from line 3: Python's csv module
		// (3.11, newline="") ends a row at either and reads rows 1,2 3,4
		// 5,6; encoding/csv keeps a lone CR in the field, one long row.
		{"CR-only line ends after LF ones", "x,y\n1,2\n3,4\r5,6\r", Options{}, []string{"x"}, nil,
			Error{Line: 3, Msg: `this row has 3 fields but the header has 2: it holds a carriage return (CR) that ends no line, so from here on the file may use CR-only line ends (as classic Mac OS wrote them), or two files were joined; save it with LF or CRLF line ends`}},
		{"CR-only line ends after LF ones, quoted", "x,y\n1,\"a\"\"b\"\n3,4\r5,6\r", Options{}, []string{"x"}, nil,
			Error{Line: 3, Msg: `this row has 3 fields but the header has 2: it holds a carriage return (CR) that ends no line, so from here on the file may use CR-only line ends (as classic Mac OS wrote them), or two files were joined; save it with LF or CRLF line ends`}},
		// Python 3.11's float() refuses these too ("could not convert
		// string to float"); the messages name the sign or the points.
		{"minus sign U+2212", "x,y\n1,2\n\u22121.5,4\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "\u22121.5", Msg: `"−1.5" is not a number: it starts with U+2212 (−), not the hyphen-minus '-' that bivar reads as a sign; replace it with '-' (word processors, and spreadsheets in some locales, write this sign)`}},
		{"en dash", "x;y\n1;2\n \u20132,5;4\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "\u20132,5", Msg: `"–2,5" is not a number: it starts with U+2013 (–), not the hyphen-minus '-' that bivar reads as a sign; replace it with '-' (word processors, and spreadsheets in some locales, write this sign)`}},
		{"a dash alone", "x,y\n1,2\n\u2013,4\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "\u2013", Msg: `"–" is not a number; correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`}},
		{"points between thousands", "x;y\n1;2\n1.234.567;4\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "1.234.567", Msg: `"1.234.567" is not a number: it has more than one point; if the points separate thousands (1.234.567), declare thousands = "." for the dataset`}},
		{"line counted after a sep= line", "sep=;\nx;y\n1;2\nz;4\n", Options{}, []string{"x"}, nil,
			Error{Line: 4, Column: "x", Text: "z", Msg: `"z" is not a number; correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`}},
		{"sep= line against the declared delimiter", "sep=;\nx;y\n1;2\n", Options{Delimiter: ','}, []string{"x"}, nil,
			Error{Line: 1, Msg: `the file's first line, "sep=;", says its delimiter is ';', but the dataset declares delimiter = ',': remove one of the two, or make them agree`}},
		// A title line above the column names is read as the header: the
		// first data row is then of the wrong length, and the message said
		// only to look for a delimiter.
		{"title above the header", "Line 7, October\nx,y,z\n1,2,3\n", Options{}, []string{"Line 7"}, nil,
			Error{Line: 2, Msg: `this row has 3 fields but the header has 2: the first line is read as the header; if lines above the column names hold a title or notes, delete them, else look for a missing or extra delimiter in the header or this row`}},
		{"title above the header, quoted", "Line 7, October\n\"x\"\"\",y,z\n1,2,3\n", Options{}, []string{"Line 7"}, nil,
			Error{Line: 2, Msg: `this row has 3 fields but the header has 2: the first line is read as the header; if lines above the column names hold a title or notes, delete them, else look for a missing or extra delimiter in the header or this row`}},
		// An export of a sheet writes an error value as its text (Excel,
		// LibreOffice: #DIV/0!, #N/A); the workbook reader counts such a
		// cell as missing, and the message says how to do the same here.
		{"spreadsheet error value", "x,y\n1,2\n#DIV/0!,4\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "#DIV/0!", Msg: `"#DIV/0!" is not a number: it is a spreadsheet's error value (a formula that could not be computed, exported as its text); add it to the dataset's missing list to count such cells as missing, or correct the formula and export again`}},
		// Files that are no text, named .csv: each read as a header of
		// mangled names, then a row of the wrong length or a NUL.
		{"workbook named .csv", "PK\x03\x04\x14\x00\x06\x00", Options{}, []string{"x"}, nil,
			Error{Line: 1, Msg: `the file is a zip archive (an Excel workbook, .xlsx, is one), not CSV text: if it is a workbook, give it the extension .xlsx so that bivar reads it as one; if it holds a CSV file, unpack it`}},
		{"gzip", "\x1f\x8b\x08\x00\x00\x00\x00\x00", Options{}, []string{"x"}, nil,
			Error{Line: 1, Msg: `the file is compressed with gzip, not CSV text: unpack it (gunzip) and name the unpacked file`}},
		// What database dumps and NumPy write for NULL, NaN and infinity
		// (mysqldump --tab and PostgreSQL's COPY text format: \N;
		// numpy.savetxt: nan, inf).
		{"database NULL", "x\ty\n1\t2\n\\N\t3\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: `\N`, Msg: `"\\N" is not a number: it is how database exports write a missing value (NULL); add "\\N" to the dataset's missing list`}},
		{"NaN", "x,y\n1,2\n-inf,3\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "-inf", Msg: `"-inf" is not a number: bivar reads no NaN or infinite value as a number (NumPy and other programs write them so); if it marks a missing value, add "-inf" to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`}},
		// Python 3.11's float() reads "０５" (U+FF10, U+FF15) as 5.0;
		// bivar reads ASCII digits only, and says so.
		{"fullwidth digits", "x,y\n1,2\n\uff10\uff15,3\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "\uff10\uff15", Msg: `"０５" is not a number: it has digits other than the ASCII 0 to 9 (fullwidth digits, as an East Asian input method types them, or digits of another script); retype the number with 0 to 9`}},
		// Two exports joined end to end: the second one's header (with
		// its byte-order mark) is a data row.
		{"header repeated", "x,y\n1,2\nx,y\n3,4\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "x", Msg: `"x" is not a number: it is the column's name, so this line repeats the header (were two files joined?); delete the line, or join the files without their headers`}},
		{"header repeated with its mark", "\uFEFFx,y\n1,2\n\uFEFFx,y\n3,4\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "\uFEFFx", Msg: `"\ufeffx" is not a number: it is the column's name, so this line repeats the header (were two files joined?); delete the line, or join the files without their headers`}},
		{"byte-order mark in a cell", "y,x\n1,2\n\uFEFF3,4\n", Options{}, []string{"y"}, nil,
			Error{Line: 3, Column: "y", Text: "\uFEFF3", Msg: `"\ufeff3" is not a number: it starts with a byte-order mark (U+FEFF), which belongs only at the start of a file: were two files joined? delete the mark (or the line, if it repeats the header)`}},
		// Dates and times in a CSV file (Python 3.11's float() refuses
		// them too); the message says where bivar reads them as numbers.
		{"date", "x,y\n1,2\n2026-10-01 08:30,3\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "2026-10-01 08:30", Msg: `"2026-10-01 08:30" is not a number: it is a date or a time, which bivar reads as a number only from a workbook (as Excel's serial days) or a database; write the column as numbers (hours or days since a start, as a spreadsheet formula can), or read the data from the workbook`}},
		{"time", "x;y\n1;2\n08:30:15;3\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "08:30:15", Msg: `"08:30:15" is not a number: it is a date or a time, which bivar reads as a number only from a workbook (as Excel's serial days) or a database; write the column as numbers (hours or days since a start, as a spreadsheet formula can), or read the data from the workbook`}},
		{"German date", "x;y\n1,5;2\n01.10.2026;3\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "01.10.2026", Msg: `"01.10.2026" is not a number: it is a date or a time, which bivar reads as a number only from a workbook (as Excel's serial days) or a database; write the column as numbers (hours or days since a start, as a spreadsheet formula can), or read the data from the workbook`}},
		{"DOS end-of-file mark", "x,y\r\n1,2\r\n3,4\r\n\x1a", Options{}, []string{"x"}, nil,
			Error{Line: 4, Msg: `this row has 1 field but the header has 2: it is a lone Ctrl-Z (0x1A), the end-of-file mark some DOS-era programs write after the last line; delete it`}},
		// A space after the delimiter before a quoted field, as people
		// type lists: RFC 4180 §2 (rule 5) has a quoted field start at the
		// delimiter; Python 3.11's csv module reads it only with
		// skipinitialspace=True. The message said to put the field in
		// double quotes, which it is.
		{"space before an opening quote", "x,y,z\n1, \"a, b\",3\n", Options{}, []string{"x"}, nil,
			Error{Line: 2, Msg: `spaces between the delimiter and the double quote that opens a field (character 4): a quoted field starts right after the delimiter; remove the spaces`}},
		{"space after a closing quote", "x;y;z\n1;2;3\n3;\"a\"  ;4\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Msg: `spaces between the double quote that closes a field (character 5) and the delimiter: a quoted field ends right before the delimiter; remove the spaces`}},
		{"quote after a comma in a semicolon file", "x;y\n1;a, \"b\"\n", Options{}, []string{"x"}, nil,
			Error{Line: 2, Msg: `a double quote inside an unquoted field (character 6): put the whole field in double quotes and write the quote twice ("")`}},
		// psql's output redirected to a file: aligned (the default) and
		// unaligned with a comma (psql -A -F ','), each with its footer.
		{"psql table", " x | y \n---+---\n 1 | 2\n(1 row)\n", Options{}, []string{"x"}, nil,
			Error{Line: 1, Msg: `the header row is separated by '|', as a database shell prints a table, which bivar does not read: export the query as CSV (in psql: \copy (SELECT …) TO 'file.csv' CSV HEADER), or read the table from the database with query or table`}},
		{"psql row count", "x,y\n1,2\n3,4\n(2 rows)\n", Options{}, []string{"x"}, nil,
			Error{Line: 4, Msg: `this row has 1 field but the header has 2: it is the count of rows a database shell prints after a table (psql's "(10 rows)"); delete the line, or export the query as CSV (in psql: \copy (SELECT …) TO 'file.csv' CSV HEADER)`}},
		{"empty file", "", Options{}, []string{"x"}, nil,
			Error{Msg: `the file is empty: it needs a header row naming the columns`}},
		{"unsupported delimiter", "x|y\n", Options{Delimiter: '|'}, []string{"x"}, nil,
			Error{Msg: `delimiter '|' is not supported: use ',', ';' or tab`}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			_, err := read("data.csv", strings.NewReader(c.src), int64(len(c.src)), c.opts, c.numeric, c.text)
			var got *Error
			if !errors.As(err, &got) {
				t.Fatalf("read error = %v (%T), want *Error", err, err)
			}
			c.want.File = "data.csv"
			if got.Error() != c.want.Error() {
				t.Errorf("error\ngot  %s\nwant %s", got.Error(), c.want.Error())
			}
			if got.Line != c.want.Line || got.Column != c.want.Column || got.Text != c.want.Text {
				t.Errorf("Line, Column, Text = %d, %q, %q; want %d, %q, %q",
					got.Line, got.Column, got.Text, c.want.Line, c.want.Column, c.want.Text)
			}
		})
	}
}

func TestReadFile(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	// FIPS 180-4 / FIPS 180-2 Appendix B.1 example: SHA-256("abc") =
	// ba7816bf 8f01cfea 414140de 5dae2223 b00361a3 96177a9c b410ff61 f20015ad.
	// A file holding exactly "abc" is a header row with one column and no data.
	abc := filepath.Join(dir, "abc.csv")
	if err := os.WriteFile(abc, []byte("abc"), 0o644); err != nil {
		t.Fatal(err)
	}
	tab, err := Read(abc, Options{}, []string{"abc"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if want := "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"; tab.SHA256 != want {
		t.Errorf("SHA256 = %s, want %s (FIPS 180-2 B.1)", tab.SHA256, want)
	}
	if tab.File != abc || tab.Rows != 0 {
		t.Errorf("File, Rows = %q, %d; want %q, 0", tab.File, tab.Rows, abc)
	}

	// A file larger than the read buffer: the hash covers every byte,
	// including those after the last record csv needs.
	var b strings.Builder
	b.WriteString("\xEF\xBB\xBFi;v\r\n")
	for i := range 20000 {
		b.WriteString(strings.Repeat("x", i%7) + ";1,5\r\n")
	}
	big := filepath.Join(dir, "big.csv")
	if err := os.WriteFile(big, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	tab, err = Read(big, Options{}, []string{"v"}, []string{"i"})
	if err != nil {
		t.Fatal(err)
	}
	sum := sha256.Sum256([]byte(b.String()))
	if got, want := tab.SHA256, hex.EncodeToString(sum[:]); got != want {
		t.Errorf("SHA256 = %s, want %s (crypto/sha256 over the whole file)", got, want)
	}
	if tab.Rows != 20000 || tab.Numeric["v"][19999] != 1.5 || tab.Missing["i"] != 20000/7+1 {
		t.Errorf("Rows = %d, last v = %v, missing i = %d", tab.Rows, tab.Numeric["v"][19999], tab.Missing["i"])
	}

	_, err = Read(filepath.Join(dir, "none.csv"), Options{}, []string{"x"}, nil)
	if !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("Read(none.csv) error = %v, want one wrapping fs.ErrNotExist", err)
	}
	if want := filepath.Join(dir, "none.csv") + ": cannot open the data file: no such file or directory"; err == nil || err.Error() != want {
		t.Errorf("Read(none.csv) error = %v, want %s", err, want)
	}
}

func FuzzDataset(f *testing.F) {
	for _, s := range []string{
		"x,y\n1,2\n3,4\n",
		"x;y\n1,5;2,25\n3;4\n",
		"x\ty\n1,5\t2\n",
		"\xEF\xBB\xBFx,y\r\n\"1\",\"2\"\r\n",
		"x,y\nNA,\n1e3,-2.5E-2\n",
		"x;y\n1.234,5;2\n\"a;b\";3\n",
	} {
		f.Add([]byte(s), byte(0), false)
		f.Add([]byte(s), byte(';'), true)
	}
	f.Fuzz(func(t *testing.T, data []byte, delim byte, comma bool) {
		opts := Options{Delimiter: rune(delim), DecimalComma: comma, NonNumericAsMissing: comma}
		tab, err := read("fuzz.csv", strings.NewReader(string(data)), int64(len(data)), opts, []string{"x"}, []string{"y"})
		if err != nil {
			var e *Error
			if !errors.As(err, &e) || e.Msg == "" {
				t.Fatalf("error %v (%T) is not a *Error with a message", err, err)
			}
			return
		}
		if len(tab.Numeric["x"]) != tab.Rows || tab.Text["y"].Len() != tab.Rows {
			t.Fatalf("Rows = %d but columns hold %d and %d values", tab.Rows, len(tab.Numeric["x"]), tab.Text["y"].Len())
		}
		for _, v := range tab.Numeric["x"] {
			if math.IsInf(v, 0) {
				t.Fatalf("Inf read from %q", data)
			}
		}
	})
}

func TestHeader(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "h.csv")
	if err := os.WriteFile(path, []byte("\xEF\xBB\xBF shot ;\"melt; temp\";shrink\r\n1;2;3\r\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	got, err := Header(path, 0)
	if want := []string{"shot", "melt; temp", "shrink"}; err != nil || !reflect.DeepEqual(got, want) {
		t.Errorf("Header = %q, %v; want %q", got, err, want)
	}
	// Read with a comma, the same line has a quote inside an unquoted field.
	if got, err = Header(path, ','); err == nil || !strings.Contains(err.Error(), "a double quote inside an unquoted field") {
		t.Errorf("Header(delimiter ',') = %q, %v; want the bare-quote error", got, err)
	}
	if _, err := Header(filepath.Join(t.TempDir(), "none.csv"), 0); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("Header(none.csv) error = %v, want fs.ErrNotExist", err)
	}
}

// TestTextManyValues: a name column of all-different values and a group
// column of repeated ones read every cell as written.
func TestTextManyValues(t *testing.T) {
	t.Parallel()
	var b strings.Builder
	b.WriteString("name,g\n")
	n := 3000
	for i := range n {
		fmt.Fprintf(&b, "r%d,g%d\n", i, i%3)
	}
	tab, err := read("data.csv", strings.NewReader(b.String()), 0, Options{}, nil, []string{"name", "g"})
	if err != nil {
		t.Fatal(err)
	}
	for i := range n {
		if want := fmt.Sprintf("r%d", i); tab.Text["name"].At(i) != want || tab.Text["g"].At(i) != fmt.Sprintf("g%d", i%3) {
			t.Fatalf("row %d: name %q g %q, want %q g%d", i, tab.Text["name"].At(i), tab.Text["g"].At(i), want, i%3)
		}
	}
}
