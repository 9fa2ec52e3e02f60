package dataset

import (
	"fmt"
	"io/fs"
	"math"
	"os"
	"strconv"
	"strings"
)

// Limits bound what Read accepts, so that a wrong or hostile file ends in a
// message naming the file and the limit instead of exhausting memory.
type Limits struct {
	// MaxBytes is the largest file read, in bytes.
	MaxBytes int64
	// MaxRows is the most data rows read.
	MaxRows int
	// MaxLevels is the most distinct values a group column (Options.Groups)
	// may hold.
	MaxLevels int
}

// The default limits, our choices:
//
//   - DefaultMaxRows: 20 million rows. Reading keeps 8 bytes per row and
//     numeric column, and the analysis a few per-row vectors per study; at
//     10⁷ rows of three columns the whole program stays near 1 GB, so the
//     default allows twice that on a machine with a few GB free.
//   - DefaultMaxBytes: 4 GiB, 200 bytes per row at DefaultMaxRows: room for
//     wide exports whose unused columns are skipped, and a stop before a
//     wrong file (a disk image, a log) is read to its end.
//   - DefaultMaxLevels: 1000 group levels. A group column names machines,
//     lots, shifts or operators: tens, at most hundreds. A column with more
//     distinct values is an identifier or a measurement, and per-group lines
//     over it would neither be readable nor fit in memory.
const (
	DefaultMaxBytes  = 4 << 30
	DefaultMaxRows   = 20_000_000
	DefaultMaxLevels = 1000
)

// Fixed limits on one row and one cell, which bound the memory a single
// record can take while the file is read in blocks.
const (
	// MaxRowBytes is the longest row, in bytes, line breaks inside quoted
	// cells included, the line end not.
	MaxRowBytes = 1 << 20
	// MaxCellBytes is the longest cell in a column that is read.
	MaxCellBytes = 64 << 10
	// quoteRunes is how much of a cell a message quotes.
	quoteRunes = 80
)

// DefaultLimits returns the limits Read applies when Options.Limits is nil.
func DefaultLimits() Limits {
	return Limits{MaxBytes: DefaultMaxBytes, MaxRows: DefaultMaxRows, MaxLevels: DefaultMaxLevels}
}

// check says which limit is not positive.
func (l Limits) check(path string) error {
	switch {
	case l.MaxBytes <= 0:
		return &Error{File: path, Msg: fmt.Sprintf("the limit on the file size must be positive, not %d", l.MaxBytes)}
	case l.MaxRows <= 0:
		return &Error{File: path, Msg: fmt.Sprintf("the limit on rows must be positive, not %d", l.MaxRows)}
	case l.MaxLevels <= 0:
		return &Error{File: path, Msg: fmt.Sprintf("the limit on group levels must be positive, not %d", l.MaxLevels)}
	}
	return nil
}

// regularFile refuses what is not a regular file (a folder, a named pipe,
// a device), before it is opened: opening a named pipe waits for a writer,
// and a device such as /dev/zero never ends.
func regularFile(path string) (fs.FileInfo, error) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, openError(path, err)
	}
	return st, notRegular(path, st)
}

func notRegular(path string, st fs.FileInfo) error {
	m := st.Mode()
	var what string
	switch {
	case m.IsRegular():
		return nil
	case m.IsDir():
		what = "a folder"
	case m&fs.ModeNamedPipe != 0:
		what = "a named pipe (FIFO)"
	case m&fs.ModeSocket != 0:
		what = "a socket"
	case m&fs.ModeCharDevice != 0:
		what = "a character device"
	case m&fs.ModeDevice != 0:
		what = "a block device"
	default:
		what = "not a regular file"
	}
	if what != "not a regular file" {
		what = "is " + what + ", not a regular file"
	} else {
		what = "is " + what
	}
	return &Error{File: path, Msg: "cannot read the data file: it " + what + "; bivar reads CSV data only from regular files, so save the data to a file and name that"}
}

// sizeError says the file is larger than the limit; size is its size, or
// 0 when it was found out while reading.
func sizeError(path string, size, limit int64) error {
	has := "more than " + bytesText(limit) + ", the limit"
	if size > 0 {
		has = fmt.Sprintf("%s, more than the limit of %s", bytesText(size), bytesText(limit))
	}
	return &Error{File: path, Msg: "the file has " + has + ": check that it is the data file meant; if it is, raise max_bytes for the dataset"}
}

// bytesText writes a size in bytes and, from 1 KiB on, in binary units.
func bytesText(n int64) string {
	units := []string{"KiB", "MiB", "GiB", "TiB"}
	v, u := float64(n), -1
	for v >= 1024 && u < len(units)-1 {
		v /= 1024
		u++
	}
	if u < 0 {
		return fmt.Sprintf("%d bytes", n)
	}
	return fmt.Sprintf("%d bytes (%s %s)", n, strconv.FormatFloat(math.Round(v*10)/10, 'f', -1, 64), units[u])
}

// cut returns the first quoteRunes characters of s, with "…" when it is
// longer; long says whether it was.
func cut(s string) (short string, long bool) {
	n := 0
	for i := range s {
		if n == quoteRunes {
			return s[:i] + "…", true
		}
		n++
	}
	return s, false
}

// quoteCell quotes a cell for a message: at most quoteRunes characters,
// with the cell's length when it was cut.
func quoteCell(s string) string {
	short, long := cut(s)
	if !long {
		return strconv.Quote(s)
	}
	return fmt.Sprintf("%s (a cell of %d bytes)", strconv.Quote(short), len(s))
}

// cellText is the text an Error keeps of a cell: cut like quoteCell.
func cellText(s string) string {
	short, _ := cut(s)
	return strings.Clone(short)
}
