package dataset

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// All data in these tests are invented for the tests.

// TestLimitErrors pins the messages of the bounds on what is read.
func TestLimitErrors(t *testing.T) {
	t.Parallel()
	long := strings.Repeat("7", MaxCellBytes+1)
	word := strings.Repeat("ab", 50) // 100 characters
	var levels strings.Builder
	levels.WriteString("x,g\n")
	for i := range DefaultMaxLevels + 5 {
		fmt.Fprintf(&levels, "%d,lot-%d\n", i, i)
	}
	cases := []struct {
		name    string
		src     string
		opts    Options
		numeric []string
		text    []string
		want    Error
	}{
		{"row longer than the limit", "x,y\n1,2\n3," + strings.Repeat(" ", MaxRowBytes) + "\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Msg: `the row starting on this line is longer than 1048576 bytes (1 MiB), the longest row bivar reads: check that the file is CSV with one row per line and that every double quote is closed`}},
		{"quoted row longer than the limit", "x,y\n1,\"" + strings.Repeat("q\n", MaxRowBytes/2+1) + "\"\n", Options{}, []string{"x"}, nil,
			Error{Line: 2, Msg: `the row starting on this line is longer than 1048576 bytes (1 MiB), the longest row bivar reads: check that the file is CSV with one row per line and that every double quote is closed`}},
		{"cell longer than the limit", "x,y\n1,2\n" + long + ",2\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: strings.Repeat("7", 80) + "…", Msg: `the cell "` + strings.Repeat("7", 80) + `…" (a cell of 65537 bytes) is longer than 65536 bytes (64 KiB), the longest cell bivar reads: check the delimiter and the quotes around this cell`}},
		{"long cell quoted in part", "x\n1\n" + word + "\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: word[:80] + "…", Msg: `"` + word[:80] + `…" (a cell of 100 bytes) is not a number; correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`}},
		{"too many rows", "x\n1\n2\n3\n", Options{Limits: &Limits{MaxBytes: 1 << 20, MaxRows: 2, MaxLevels: 10}}, []string{"x"}, nil,
			Error{Msg: `the file has more than 2 data rows, the limit: check that it is the data file meant; if it is, raise max_rows for the dataset`}},
		{"file larger than the limit", "x\n1\n2\n3\n", Options{Limits: &Limits{MaxBytes: 5, MaxRows: 10, MaxLevels: 10}}, []string{"x"}, nil,
			Error{Msg: `the file has 8 bytes, more than the limit of 5 bytes: check that it is the data file meant; if it is, raise max_bytes for the dataset`}},
		{"group levels beyond the limit", "x,g\n1,a\n2,b\n3,a\n4,c\n", Options{Groups: []string{"g"}, Limits: &Limits{MaxBytes: 1 << 20, MaxRows: 10, MaxLevels: 2}}, []string{"x"}, []string{"g"},
			Error{Line: 5, Column: "g", Text: "c", Msg: `a group column may hold at most 2 distinct values, and "c" on this line is one more: a group names machines, lots or shifts; if this column identifies rows or holds measurements, group by another column, and if it really is a grouping, raise max_levels for the dataset`}},
		{"group levels beyond the default limit", levels.String(), Options{Groups: []string{"g"}}, []string{"x"}, []string{"g"},
			Error{Line: 1002, Column: "g", Text: "lot-1000", Msg: `a group column may hold at most 1000 distinct values, and "lot-1000" on this line is one more: a group names machines, lots or shifts; if this column identifies rows or holds measurements, group by another column, and if it really is a grouping, raise max_levels for the dataset`}},
		{"limit not positive", "x\n1\n", Options{Limits: &Limits{MaxBytes: 1, MaxRows: 0, MaxLevels: 1}}, []string{"x"}, nil,
			Error{Msg: `the limit on rows must be positive, not 0`}},
		{"number out of range", "x,y\n1,2\n1e400,3\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "1e400", Msg: `"1e400" is out of range: a number's size may be at most about 1.8e308 (the largest double); correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`}},
		{"negative number out of range", "x;y\n1;2\n-2,5e308;3\n", Options{}, []string{"x"}, nil,
			Error{Line: 3, Column: "x", Text: "-2,5e308", Msg: `"-2,5e308" is out of range: a number's size may be at most about 1.8e308 (the largest double); correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing`}},
		{"CR-only line ends", "x,y\r1,2\r3,4\r", Options{}, []string{"x"}, nil,
			Error{Msg: `the file uses CR-only line ends (as classic Mac OS wrote them), which bivar does not read: save it with LF or CRLF line ends`}},
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

// TestWithinLimits: what the limits allow is read.
func TestWithinLimits(t *testing.T) {
	t.Parallel()
	src := "x,g\n1,a\n2,b\n3,a\n1e-400,b\n"
	tab, err := read("data.csv", strings.NewReader(src), int64(len(src)),
		Options{Groups: []string{"g"}, Limits: &Limits{MaxBytes: int64(len(src)), MaxRows: 4, MaxLevels: 2}}, []string{"x"}, []string{"g"})
	if err != nil {
		t.Fatal(err)
	}
	// 1e-400 is below the least subnormal double: strconv.ParseFloat (Go
	// 1.26) rounds it to 0 without an error, and so does Read.
	if got := tab.Numeric["x"]; !sameFloats(got, []float64{1, 2, 3, 0}) || tab.Rows != 4 {
		t.Errorf("x = %v, rows %d; want [1 2 3 0], 4", got, tab.Rows)
	}
	// Out of range with non_numeric = "missing": counted like a non-numeric cell.
	src = "x\n1e400\n2\n"
	tab, err = read("data.csv", strings.NewReader(src), int64(len(src)), Options{NonNumericAsMissing: true}, []string{"x"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if got := tab.Numeric["x"]; !sameFloats(got, []float64{nan, 2}) || tab.NonNumeric["x"] != 1 {
		t.Errorf("x = %v, non-numeric %d; want [NaN 2], 1", got, tab.NonNumeric["x"])
	}
	// A text column that is not a group may hold any number of values.
	var b strings.Builder
	b.WriteString("id\n")
	for i := range 3 * DefaultMaxLevels {
		fmt.Fprintf(&b, "r%d\n", i)
	}
	tab, err = read("data.csv", strings.NewReader(b.String()), 0, Options{}, nil, []string{"id"})
	if err != nil || tab.Rows != 3*DefaultMaxLevels {
		t.Errorf("id column of %d distinct values: rows %v, %v", 3*DefaultMaxLevels, tab, err)
	}
}

// TestReadFileLimits: the size limit is checked before reading, and what
// is not a regular file is refused before it is opened.
func TestReadFileLimits(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "d.csv")
	if err := os.WriteFile(path, []byte("x\n1\n2\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err := Read(path, Options{Limits: &Limits{MaxBytes: 4, MaxRows: 10, MaxLevels: 10}}, []string{"x"}, nil)
	if want := path + ": the file has 6 bytes, more than the limit of 4 bytes: check that it is the data file meant; if it is, raise max_bytes for the dataset"; err == nil || err.Error() != want {
		t.Errorf("Read over MaxBytes: %v\nwant %s", err, want)
	}
	for _, c := range []struct{ path, what string }{
		{dir, "a folder"},
		{"/dev/zero", "a character device"},
	} {
		if _, err := os.Stat(c.path); err != nil {
			t.Fatalf("%s: %v", c.path, err)
		}
		want := c.path + ": cannot read the data file: it is " + c.what + ", not a regular file; bivar reads CSV data only from regular files, so save the data to a file and name that"
		if _, err := Read(c.path, Options{}, []string{"x"}, nil); err == nil || err.Error() != want {
			t.Errorf("Read(%s) error = %v\nwant %s", c.path, err, want)
		}
		if _, err := Header(c.path, 0); err == nil || err.Error() != want {
			t.Errorf("Header(%s) error = %v\nwant %s", c.path, err, want)
		}
	}
}

func TestBytesText(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		n    int64
		want string
	}{
		{5, "5 bytes"},
		{1023, "1023 bytes"},
		{1024, "1024 bytes (1 KiB)"},
		{199024893, "199024893 bytes (189.8 MiB)"},
		{4 << 30, "4294967296 bytes (4 GiB)"},
	} {
		if got := bytesText(c.n); got != c.want {
			t.Errorf("bytesText(%d) = %q, want %q", c.n, got, c.want)
		}
	}
}

// failAfter is a reader that fails after n bytes.
type failAfter struct {
	r io.Reader
	n int
}

func (f *failAfter) Read(p []byte) (int, error) {
	if f.n <= 0 {
		return 0, errors.New("device gone")
	}
	p = p[:min(len(p), f.n)]
	n, err := f.r.Read(p)
	f.n -= n
	return n, err
}

// TestReadEdges: headers longer than the first read, a header past the
// row limit, a quoted cell past it with rows after it, a file that grows
// past its size limit while read, and a read that fails.
func TestReadEdges(t *testing.T) {
	t.Parallel()
	var h strings.Builder
	for i := range 20000 {
		fmt.Fprintf(&h, "c%d,", i)
	}
	header := h.String() + "x\n" // more than readBuffer
	row := strings.Repeat("0,", 20000) + "7\n"
	tab, err := read("data.csv", strings.NewReader(header+row+row), 0, Options{}, []string{"x"}, nil)
	if err != nil || tab.Rows != 2 || tab.Numeric["x"][1] != 7 {
		t.Errorf("a %d-byte header: %v, %v", len(header), tab, err)
	}
	tooLong := "x" + strings.Repeat(",y", MaxRowBytes/2+1) + "\n1\n"
	want := "data.csv:1: the row starting on this line is longer than 1048576 bytes (1 MiB), the longest row bivar reads: check that the file is CSV with one row per line and that every double quote is closed"
	if _, err := read("data.csv", strings.NewReader(tooLong), 0, Options{}, []string{"x"}, nil); err == nil || err.Error() != want {
		t.Errorf("a header over the row limit: %v\nwant %s", err, want)
	}
	longCell := "x,y\n1,2\n3,\"" + strings.Repeat("q", 2*MaxRowBytes) + "\"\n" + strings.Repeat("4,5\n", 1000)
	want = "data.csv:3: the row starting on this line is longer than 1048576 bytes (1 MiB), the longest row bivar reads: check that the file is CSV with one row per line and that every double quote is closed"
	if _, err := read("data.csv", strings.NewReader(longCell), 0, Options{}, []string{"x"}, nil); err == nil || err.Error() != want {
		t.Errorf("a quoted cell over the row limit: %v\nwant %s", err, want)
	}
	big := "x\n" + strings.Repeat("1\n", blockSize)
	want = "data.csv: the file has more than 1000 bytes, the limit: check that it is the data file meant; if it is, raise max_bytes for the dataset"
	if _, err := read("data.csv", strings.NewReader(big), 0, Options{Limits: &Limits{MaxBytes: 1000, MaxRows: 1 << 30, MaxLevels: 1}}, []string{"x"}, nil); err == nil || err.Error() != want {
		t.Errorf("a file growing past MaxBytes: %v\nwant %s", err, want)
	}
	want = "data.csv: reading the file: device gone"
	for _, n := range []int{10, readBuffer + 10} {
		if _, err := read("data.csv", &failAfter{strings.NewReader(big), n}, 0, Options{}, []string{"x"}, nil); err == nil || err.Error() != want {
			t.Errorf("a read failing after %d bytes: %v\nwant %s", n, err, want)
		}
	}
}
