package dataset

import "bivar/internal/hugepage"

// floatBlockLen is the length of one block of a floatBlocks: 512 KiB.
const floatBlockLen = 1 << 16

// floatBlocks gathers a numeric column of unknown length (the rows of a
// query or of a sheet, which arrive one at a time) in blocks of
// floatBlockLen values, and column copies them once into a slice of the
// exact length. A slice grown by append is copied each time it grows, by
// a quarter once it is large: about a dozen copies between 10⁵ and 10⁷
// values, each into fresh memory the system must clear first.
type floatBlocks struct {
	full [][]float64
	cur  []float64
}

// add appends v.
func (b *floatBlocks) add(v float64) {
	if len(b.cur) == cap(b.cur) {
		if b.cur != nil {
			b.full = append(b.full, b.cur)
		}
		b.cur = make([]float64, 0, floatBlockLen)
	}
	b.cur = append(b.cur, v)
}

// column returns the values added, in order, in one slice of their
// number (empty, not nil, when none were).
func (b *floatBlocks) column() []float64 {
	out := hugepage.Make[float64](len(b.full)*floatBlockLen + len(b.cur))
	at := 0
	for _, f := range b.full {
		at += copy(out[at:], f)
	}
	copy(out[at:], b.cur)
	return out
}
