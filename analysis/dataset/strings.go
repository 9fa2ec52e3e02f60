package dataset

import (
	"fmt"
	"math"
	"unsafe"

	"bivar/internal/hugepage"
)

// Strings is a text column: the cells' bytes one after another in one
// block, and where each cell ends. It costs 4 bytes a row besides the text
// and holds two pointers in all, where a []string holds a 16-byte header
// and a pointer per cell: at 10⁷ rows that is 160 MB which every garbage
// collection walks, and which took a run with a name column past its
// memory limit, where the collector never stops. The zero value is no
// column (Given reports false); StringsOf makes one from a []string.
type Strings struct {
	data []byte
	end  []uint32 // cell i is data[end[i−1]:end[i]] (from 0 for i = 0)
}

// MaxTextBytes is the most text one column holds: its offsets are 32-bit.
const MaxTextBytes = math.MaxUint32

// StringsOf returns the column holding v's cells: no column (the zero
// value) for a nil v, as a nil []string meant none, and a column of no
// rows for an empty one. It panics when the cells hold more than
// MaxTextBytes bytes between them.
func StringsOf(v []string) Strings {
	if v == nil {
		return Strings{}
	}
	return textColumn(v)
}

// textColumn is StringsOf, a column even for a nil v.
func textColumn(v []string) Strings {
	s := Strings{end: make([]uint32, 0, len(v))}
	for _, c := range v {
		if !s.add(c) {
			panic("dataset: StringsOf: more than 4 GiB of text")
		}
	}
	return s
}

// add appends one cell, reporting false (and adding nothing) when the
// column would hold more than MaxTextBytes bytes.
func (s *Strings) add(c string) bool { return addCell(s, c) }

// addBytes is add for a cell's bytes.
func (s *Strings) addBytes(c []byte) bool { return addCell(s, c) }

func addCell[T string | []byte](s *Strings, c T) bool {
	if len(s.data)+len(c) > MaxTextBytes {
		return false
	}
	if s.end == nil {
		s.end = []uint32{}
	}
	s.data = append(s.data, c...)
	s.end = append(s.end, uint32(len(s.data)))
	return true
}

// Given reports whether s is a column (a column may have no rows).
func (s Strings) Given() bool { return s.end != nil }

// Len returns the number of cells.
func (s Strings) Len() int { return len(s.end) }

// At returns cell i, a view of the column's bytes (not a copy; the column
// is never written once made).
func (s Strings) At(i int) string {
	lo := uint32(0)
	if i > 0 {
		lo = s.end[i-1]
	}
	b := s.data[lo:s.end[i]]
	return unsafe.String(unsafe.SliceData(b), len(b))
}

// Slice returns the cells as a []string (views, as At's).
func (s Strings) Slice() []string {
	if !s.Given() {
		return nil
	}
	out := make([]string, s.Len())
	for i := range out {
		out[i] = s.At(i)
	}
	return out
}

// String prints the cells as fmt prints a []string.
func (s Strings) String() string { return fmt.Sprint(s.Slice()) }

// Blank returns the column with the cells for which drop holds made
// empty: s itself when there are none (nothing is copied), else a new
// column.
func (s Strings) Blank(drop func(string) bool) Strings {
	first := -1
	for i := range s.Len() {
		if drop(s.At(i)) {
			first = i
			break
		}
	}
	if first < 0 {
		return s
	}
	out := Strings{data: make([]byte, 0, len(s.data)), end: hugepage.Make[uint32](s.Len())}
	for i := range s.Len() {
		c := s.At(i)
		if i >= first && drop(c) {
			c = ""
		}
		out.data = append(out.data, c...)
		out.end[i] = uint32(len(out.data))
	}
	return out
}

// Pick returns the column of the cells at idx, in that order.
func (s Strings) Pick(idx []int) Strings {
	var n int
	for _, i := range idx {
		n += len(s.At(i))
	}
	out := Strings{data: make([]byte, 0, n), end: hugepage.Make[uint32](len(idx))}
	for j, i := range idx {
		out.data = append(out.data, s.At(i)...)
		out.end[j] = uint32(len(out.data))
	}
	return out
}
