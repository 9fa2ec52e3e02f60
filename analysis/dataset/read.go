package dataset

import (
	"bytes"
	"crypto/sha256"
	"encoding/binary"
	"encoding/csv"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"math"
	"math/bits"
	"runtime"
	"slices"
	"strings"
	"sync"
	"sync/atomic"
	"unsafe"

	"bivar/internal/hugepage"
)

// How the body of a file is read. One goroutine reads blocks of blockSize
// bytes, hashes them and cuts each after the last line end that is not
// inside double quotes (a quote toggles; a malformed quote is reported by
// the block that holds it, at the place a sequential read would report it).
// Worker goroutines (one per core) parse the blocks: with a plain splitter
// when a block's quotes, if any, only enclose simple whole fields, else with
// encoding/csv; the plain splitter reads rows of plain numbers a word of
// eight bytes at a time (fastRows). The calling goroutine joins the blocks' columns in file
// order, so rows keep their order and messages name the first problem in
// the file, as a sequential read would. At most 2·GOMAXPROCS+3 blocks are
// in memory at once, besides the columns read.
//
// The decimal mark, when it is to be detected, is the mark of the first
// number that shows one; a block parsed before that was settled is parsed
// again when the join finds it was settled by an earlier block.
const blockSize = 1 << 20 // a longer row makes its buffer larger

// column is one requested header column.
type column struct {
	name    string
	index   int
	numeric bool
	text    bool
	group   bool // text holding group levels, at most Limits.MaxLevels of them
}

// config is what every block's parse needs; it is not changed once built.
type config struct {
	path    string
	delim   byte
	fields  int // fields per row, from the header
	body    int // the line after the header's
	cols    []*column
	byIndex []int // header index -> position in cols, -1 when not read
	last    int   // the highest header index read
	missing []string
	opts    Options
	lim     Limits
	// plain: numeric cells may be read by scanNumber in the row's own
	// pass (no thousands separator, and no missing-value marker that
	// scanNumber would read as a number).
	plain bool
}

// job is one block of whole rows.
type job struct {
	data []byte
	line int // line number of data[0]
	buf  []byte
	mark uint64 // packed decimal-mark state the block is parsed with
	res  chan *part
	pre  *part // set when the block is only an error found by the reader
}

// span is a text cell's place in its block's arena.
type span struct{ off, n int32 }

// level is a group column's value first seen in a block, and where.
type level struct {
	span
	line int
}

// textPart holds one text column's cells of one block.
type textPart struct {
	arena  []byte
	spans  []span
	seen   map[string]span
	levels []level // group columns: new values in order of appearance
}

// part is what one block gives.
type part struct {
	assumed  uint64 // the packed mark state the block was parsed with
	mark     byte   // the decimal mark after the block (0: undecided)
	markLine int
	rows     int
	nums     [][]float64
	texts    []textPart
	missing  []int
	nonNum   []int
	err      error  // a problem that stops the read
	first    *Error // the block's first non-numeric cell
	more     int    // non-numeric cells after it
	over     bool   // a group column passed MaxLevels in this block
}

func packMark(mark byte, line int) uint64 { return uint64(line)<<8 | uint64(mark) }

func unpackMark(v uint64) (byte, int) { return byte(v), int(v >> 8) }

// read reads from r; size, when known (> 0), sizes the first block and
// the columns.
func read(path string, r io.Reader, size int64, opts Options, numeric, text []string) (*Table, error) {
	lim := DefaultLimits()
	if opts.Limits != nil {
		lim = *opts.Limits
	}
	if err := lim.check(path); err != nil {
		return nil, err
	}
	if size > lim.MaxBytes {
		return nil, sizeError(path, size, lim.MaxBytes)
	}
	hd, err := readHeader(path, r, opts.Delimiter)
	if err != nil {
		return nil, err
	}
	cols, err := selectColumns(path, hd.names, numeric, text)
	if err != nil {
		return nil, err
	}
	cfg := &config{path: path, delim: byte(hd.delim), fields: len(hd.names), body: hd.line, cols: cols,
		byIndex: make([]int, len(hd.names)), last: -1, missing: opts.Missing, opts: opts, lim: lim}
	if cfg.missing == nil {
		cfg.missing = DefaultMissing()
	}
	cfg.plain = opts.Thousands == 0
	for _, m := range cfg.missing {
		if _, n, _, ok := scanNumber([]byte(m), cfg.delim); ok && n == len(m) {
			cfg.plain = false
		}
	}
	for i := range cfg.byIndex {
		cfg.byIndex[i] = -1
	}
	for i, c := range cols {
		cfg.byIndex[c.index] = i
		cfg.last = max(cfg.last, c.index)
		c.group = c.text && slices.Contains(opts.Groups, c.name)
	}

	var mark byte // '.' or ',' once known, 0 while undecided
	switch {
	case opts.DecimalComma:
		mark = ','
	case opts.DecimalPoint, hd.delim == ',':
		mark = '.'
	}
	markLine := 0
	var shared atomic.Uint64 // the mark state, for the reader to hand to blocks
	shared.Store(packMark(mark, markLine))

	h := sha256.New()
	h.Write(hd.buf)
	workers := max(1, runtime.GOMAXPROCS(0))
	inflight := 2*workers + 1
	ordered := make(chan *job, inflight)
	work := make(chan *job, inflight)
	stop := make(chan struct{})
	defer close(stop)
	for range workers {
		go func() {
			for j := range work {
				m, l := unpackMark(j.mark)
				j.res <- parseBlock(cfg, j.data, j.line, m, l)
			}
		}()
	}
	bufSize := blockSize
	if size > 0 && size < blockSize {
		bufSize = int(size) + 4096
	}
	free := make(chan []byte, inflight+2)
	go produce(cfg, r, hd, h, bufSize, free, ordered, work, stop, &shared)

	t := &Table{File: path, Delimiter: hd.delim, Numeric: map[string][]float64{}, Text: map[string]Strings{},
		Missing: map[string]int{}, NonNumeric: map[string]int{}}
	nums := make([][]float64, len(cols))
	texts := make([]Strings, len(cols))
	levels := make([]map[string]bool, len(cols))
	missing := make([]int, len(cols))
	nonNum := make([]int, len(cols))
	var first *Error
	more := 0
	sized := false
	for j := range ordered {
		p := j.pre
		if p == nil {
			p = <-j.res
			if p.assumed != packMark(mark, markLine) {
				p = parseBlock(cfg, j.data, j.line, mark, markLine)
			}
		}
		// The rows a block counted all come before the place where it
		// stopped, if it did: a file over the row limit says so first.
		t.Rows += p.rows
		if t.Rows > lim.MaxRows {
			return nil, &Error{File: path, Msg: fmt.Sprintf("the file has more than %d data rows, the limit: check that it is the data file meant; if it is, raise max_rows for the dataset", lim.MaxRows)}
		}
		for i, c := range cols {
			if !c.group {
				continue
			}
			if levels[i] == nil {
				levels[i] = map[string]bool{}
			}
			tp := &p.texts[i]
			for _, lv := range tp.levels {
				s := string(tp.arena[lv.off : lv.off+lv.n])
				if levels[i][s] {
					continue
				}
				levels[i][s] = true
				if len(levels[i]) > lim.MaxLevels {
					return nil, levelsError(cfg, c, s, lv.line)
				}
			}
		}
		if p.err != nil {
			return nil, p.err
		}
		if mark == 0 && p.mark != 0 {
			mark, markLine = p.mark, p.markLine
			shared.Store(packMark(mark, markLine))
		}
		if first == nil {
			first, more = p.first, p.more
		} else if p.first != nil {
			more += 1 + p.more
		}
		if !sized && p.rows > 0 {
			sized = true
			est := len(j.data) / p.rows // bytes per row
			if size > 0 && est > 0 {
				n := int(min(size/int64(est)+size/int64(est)/32+16, int64(lim.MaxRows)+1))
				for i, c := range cols {
					if c.numeric {
						nums[i] = hugepage.Grow(nums[i], n)
					}
					if c.text {
						// The cells' bytes at the first block's length a row.
						var b int
						for _, sp := range p.texts[i].spans {
							b += int(sp.n)
						}
						texts[i].end = hugepage.Grow(texts[i].end, n)
						texts[i].data = hugepage.Grow(texts[i].data, int(min(float64(n)*(float64(b)/float64(p.rows)+1), MaxTextBytes)))
					}
				}
			}
		}
		for i, c := range cols {
			missing[i] += p.missing[i]
			nonNum[i] += p.nonNum[i]
			if c.numeric {
				nums[i] = append(nums[i], p.nums[i]...)
				putFloats(p.nums[i])
			}
			if c.text {
				tp := &p.texts[i]
				arena := unsafe.String(unsafe.SliceData(tp.arena), len(tp.arena))
				for _, sp := range tp.spans {
					if !texts[i].add(arena[sp.off : sp.off+sp.n]) {
						return nil, &Error{File: path, Column: c.name, Msg: fmt.Sprintf("text column %q holds more than 4 GiB of text, the most bivar reads from one column: check that it is the column meant (an id or group column), or read a shorter span of the data", c.name)}
					}
				}
			}
		}
		if j.buf != nil {
			free <- j.buf
		}
	}
	if first != nil {
		if more > 0 {
			first.Msg += fmt.Sprintf(" (and %d more non-numeric cells after it)", more)
		}
		return nil, first
	}
	t.SHA256 = hex.EncodeToString(h.Sum(nil))
	t.DecimalComma = mark == ','
	for i, c := range cols {
		if c.numeric {
			t.Numeric[c.name] = nums[i]
			t.NonNumeric[c.name] = nonNum[i]
		}
		if c.text {
			if !texts[i].Given() {
				texts[i] = textColumn(nil)
			}
			t.Text[c.name] = texts[i]
		}
		t.Missing[c.name] = missing[i]
	}
	return t, nil
}

// produce reads the body of the file in blocks of whole rows, hashes every
// byte and hands the blocks out: in order to ordered (for the join) and to
// work (for the parsers). It stops at the end of the file, on a read error
// or a row too long (handed on as a block holding only that error), or
// when stop is closed. It closes ordered and work.
func produce(cfg *config, r io.Reader, hd *head, h io.Writer, bufSize int, free chan []byte,
	ordered, work chan<- *job, stop <-chan struct{}, shared *atomic.Uint64) {
	defer close(work)
	defer close(ordered)
	made := 0
	// A buffer is taken from hugepage: its first fill, in 4 KiB pages, was
	// a fifth of a 10⁶-row run's page faults.
	get := func(n int) []byte {
		if made < cap(free) {
			select {
			case b := <-free:
				return grow(b, n)
			default:
			}
			made++
			return hugepage.Make[byte](max(bufSize, n))
		}
		select {
		case b := <-free:
			return grow(b, n)
		case <-stop:
			return nil
		}
	}
	send := func(j *job) bool {
		select {
		case ordered <- j:
		case <-stop:
			return false
		}
		if j.pre != nil {
			return true
		}
		select {
		case work <- j:
			return true
		case <-stop:
			return false
		}
	}
	fail := func(err error) { send(&job{pre: &part{err: err}}) }

	rest := hd.buf[hd.body:]
	buf := get(len(rest) + 1)
	if buf == nil {
		return
	}
	n := copy(buf, rest)
	line := hd.line
	total := int64(len(hd.buf))
	eof := hd.eof
	for {
		for n < len(buf) && !eof {
			m, err := r.Read(buf[n:])
			h.Write(buf[n : n+m])
			n += m
			total += int64(m)
			if err == io.EOF {
				eof = true
			} else if err != nil {
				fail(&Error{File: cfg.path, Msg: fmt.Sprintf("reading the file: %v", err), err: err})
				return
			}
		}
		if total > cfg.lim.MaxBytes {
			fail(sizeError(cfg.path, 0, cfg.lim.MaxBytes))
			return
		}
		cutAt := n
		if !eof {
			cutAt = rowsEnd(buf[:n])
			if n-cutAt > MaxRowBytes {
				if cutAt > 0 && !send(&job{data: buf[:cutAt], line: line, buf: buf, mark: shared.Load(), res: make(chan *part, 1)}) {
					return
				}
				fail(longRow(cfg, buf[cutAt:n], line+bytes.Count(buf[:cutAt], []byte{'\n'})))
				return
			}
			if cutAt == 0 { // one row fills the buffer: make it larger
				buf = grow(buf, 2*len(buf))
				continue
			}
		}
		if cutAt > 0 {
			next := []byte(nil)
			if !eof {
				if next = get(n - cutAt + 1); next == nil {
					return
				}
			}
			j := &job{data: buf[:cutAt], line: line, buf: buf, mark: shared.Load(), res: make(chan *part, 1)}
			line += bytes.Count(buf[:cutAt], []byte{'\n'})
			if next != nil {
				copy(next, buf[cutAt:n])
			}
			if !send(j) {
				return
			}
			buf, n = next, n-cutAt
		}
		if eof {
			return
		}
	}
}

// floats keeps blocks' number slices for the next blocks, so that reading
// a large file does not leave a block's worth of garbage per block.
var floats sync.Pool

func getFloats(n int) []float64 {
	if p, ok := floats.Get().(*[]float64); ok && cap(*p) >= n {
		return (*p)[:0]
	}
	return hugepage.Empty[float64](n)
}

func putFloats(s []float64) { floats.Put(&s) }

// longRow explains rows that start on line line, outside quotes, and run
// past MaxRowBytes without a line end outside quotes: encoding/csv finds a
// malformed quote in them (an inch mark in 12" pipe leaves the rest of the
// file inside quotes) where a sequential read would; else the row is too
// long. An error on the last, cut line of data is not trusted.
func longRow(cfg *config, data []byte, line int) error {
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comma = rune(cfg.delim)
	cr.ReuseRecord = true
	cr.FieldsPerRecord = cfg.fields
	whole := bytes.Count(data, []byte{'\n'})
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		var pe *csv.ParseError
		if errors.As(err, &pe) && pe.Line <= whole {
			return csvError(cfg.path, err, rec, cfg.fields, line-1, cfg.body, data, cfg.delim)
		}
		if err != nil {
			break
		}
	}
	return rowTooLong(cfg.path, line)
}

// grow returns b with at least n bytes of length, keeping its contents.
func grow(b []byte, n int) []byte {
	if len(b) >= n {
		return b
	}
	return append(b, make([]byte, n-len(b))...)
}

// rowsEnd returns the offset just after the last line end in b that is
// not inside double quotes (b starts outside quotes), or 0.
func rowsEnd(b []byte) int {
	if bytes.IndexByte(b, '"') < 0 {
		return bytes.LastIndexByte(b, '\n') + 1
	}
	in, end := false, 0
	for i, c := range b {
		switch c {
		case '"':
			in = !in
		case '\n':
			if !in {
				end = i + 1
			}
		}
	}
	return end
}

// parseBlock parses whole rows starting on line line, with the decimal
// mark state (mark, markLine) that holds at their start.
func parseBlock(cfg *config, data []byte, line int, mark byte, markLine int) *part {
	rows := bytes.Count(data, []byte{'\n'}) + 1
	p := newPart(cfg, mark, markLine, rows)
	if !p.parsePlain(cfg, data, line) {
		p = newPart(cfg, mark, markLine, rows)
		p.parseQuoted(cfg, data, line)
	}
	return p
}

func newPart(cfg *config, mark byte, markLine int, rows int) *part {
	p := &part{assumed: packMark(mark, markLine), mark: mark, markLine: markLine,
		nums: make([][]float64, len(cfg.cols)), texts: make([]textPart, len(cfg.cols)),
		missing: make([]int, len(cfg.cols)), nonNum: make([]int, len(cfg.cols))}
	for i, c := range cfg.cols {
		if c.numeric {
			p.nums[i] = getFloats(rows)
		}
		if c.text {
			p.texts[i].spans = make([]span, 0, rows)
		}
	}
	return p
}

// parsePlain parses rows whose double quotes, if any, only enclose whole
// fields that hold no quote, delimiter or line break ("A", as many exports
// write text): a field is the text between delimiters, without those
// quotes, as encoding/csv reads it. Cells are views of data, never kept.
// It returns false, having read part of the block, at the first row with
// other quoting: the block is then for encoding/csv.
func (p *part) parsePlain(cfg *config, data []byte, line int) bool {
	delim := cfg.delim
	quotes := bytes.IndexByte(data, '"') >= 0
	// A row's capacity ends with the block: scanNumber and fastRows may
	// read a word past a cell, to the next rows, never past the block.
	data = data[:len(data):len(data)]
	var fast *[fastRowFields]int // the column of each field up to cfg.last, if fastRow reads rows
	var fastCols [fastRowFields]int
	if cfg.plain && cfg.last < fastRowFields {
		fast = &fastCols
		for f := 0; f <= cfg.last; f++ {
			ci := cfg.byIndex[f]
			if ci >= 0 && cfg.cols[ci].text {
				fast = nil
				break
			}
			fastCols[f] = ci
		}
	}
	// wait counts the rows read the general way before fastRows is tried
	// again, after it took no row: a file whose every row it leaves (a
	// missing marker in a column, spaces around numbers) is then read at
	// nearly the general way's speed. It changes no result.
	wait := 0
	for len(data) > 0 {
		tried := false // fastRows has left the row at data's start
		if fast != nil && !quotes && wait == 0 {
			from := line
			if data, line, tried = p.fastRows(cfg, fast, data, line); len(data) == 0 {
				break
			}
			if line == from {
				wait = 16
			}
		} else if wait > 0 {
			wait--
		}
		var rec []byte
		if i := bytes.IndexByte(data, '\n'); i >= 0 {
			rec, data = data[:i], data[i+1:]
		} else {
			rec, data = data, nil
		}
		ln := line
		line++
		if n := len(rec); n > 0 && rec[n-1] == '\r' {
			rec = rec[:n-1]
		}
		if len(rec) == 0 {
			continue // a blank line
		}
		quoted := quotes && bytes.IndexByte(rec, '"') >= 0
		if quoted && !plainQuotes(rec, delim) {
			return false
		}
		if len(rec) > MaxRowBytes {
			p.err = rowTooLong(cfg.path, ln)
			return true
		}
		if !quoted && fast != nil && !tried && p.fastRow(cfg, fast, rec, ln) {
			continue
		}
		if nf := bytes.Count(rec, []byte{delim}) + 1; nf != cfg.fields {
			p.err = &Error{File: cfg.path, Line: ln, Msg: fieldCountMsg(nf, cfg.fields, string(rec), ln == cfg.body)}
			return true
		}
		p.rows++
		for f := 0; f <= cfg.last; f++ {
			ci := cfg.byIndex[f]
			if ci >= 0 && cfg.plain && !quoted && !cfg.cols[ci].text {
				// The common cell, a short decimal number, read in one
				// pass; anything else goes the general way below.
				if v, n, seen, ok := scanNumber(rec, delim); ok && takeMark(&p.mark, &p.markLine, seen, ln) {
					p.nums[ci] = append(p.nums[ci], v)
					if n < len(rec) {
						rec = rec[n+1:]
					} else {
						rec = nil
					}
					continue
				}
			}
			var cell []byte
			if i := bytes.IndexByte(rec, delim); i >= 0 {
				cell, rec = rec[:i], rec[i+1:]
			} else {
				cell, rec = rec, nil
			}
			if quoted && len(cell) >= 2 && cell[0] == '"' {
				cell = cell[1 : len(cell)-1]
			}
			if ci >= 0 && p.cell(cfg, ci, unsafe.String(unsafe.SliceData(cell), len(cell)), ln) {
				return true
			}
		}
	}
	return true
}

// fastRowFields is the most fields up to the last one read that fastRow
// takes.
const fastRowFields = 16

// fastRows reads the rows at the start of data, a block without double
// quotes, that fastRow would take, up to the first it would not, a row
// of 64 bytes or more, or the last 72 bytes of the block. It returns the
// rest of data and the line it starts on; tried says that wordRow has
// left that row (so fastRow would too).
//
// A row is read a word of eight bytes (a little-endian uint64) at a time:
// the word's delimiters and line end are found at once, with no search
// for the row's end beforehand, and then its cells (wordRow).
func (p *part) fastRows(cfg *config, cols *[fastRowFields]int, data []byte, line int) (rest []byte, next int, tried bool) {
	delim := cfg.delim
	for len(data) >= 72 {
		var at uint64 // bit j set where data[j] is the delimiter
		size := uint(64)
		for off := uint(0); off < 64; off += 8 {
			w := binary.LittleEndian.Uint64(data[off : off+8])
			at |= gather(byteMask(w, delim)) << off
			if nl := byteMask(w, '\n'); nl != 0 {
				size = off + uint(bits.TrailingZeros64(nl))>>3
				break
			}
		}
		if size == 64 {
			break // no line end in 64 bytes
		}
		end := size // the line end
		if size > 0 && data[size-1] == '\r' {
			size--
		}
		if size == 0 {
			break // a blank line
		}
		if !p.wordRow(cfg, cols, data[:size], at&(1<<size-1), line) {
			return data, line, true
		}
		data = data[end+1:]
		line++
	}
	return data, line, false
}

// gather moves the top bit of byte j of m to bit j, for m with no other
// bits set: the multiplication adds the top bit of byte j into bit 56+j,
// and no two of its partial products share a bit, so nothing carries.
func gather(m uint64) uint64 { return m * 0x0002040810204081 >> 56 }

// wordRow reads rec, a row of at most 64 bytes with eight more bytes in
// its capacity, whose delimiters are the set bits of at (bit j for byte
// j), as fastRow does, with the same results: it appends the row's
// numbers and returns true, or leaves the row as it was (false). Each cell
// is read from the word at its start (wordCell), which the delimiters give
// before any cell is read: no cell waits for the reading of the one
// before it, as in scanNumber's search for the cell's end.
func (p *part) wordRow(cfg *config, cols *[fastRowFields]int, rec []byte, at uint64, ln int) bool {
	if bits.OnesCount64(at)+1 != cfg.fields {
		return false
	}
	delim, last, size := cfg.delim, cfg.last, uint(len(rec))
	mark, markLine := p.mark, p.markLine
	start, f := uint(0), 0
	for ; f <= last; f++ {
		end := min(uint(bits.TrailingZeros64(at)), size) // the field's end: size for the last
		at &= at - 1
		if ci := cols[f&(fastRowFields-1)]; ci >= 0 {
			if end == start {
				break // an empty cell
			}
			i := start
			if c := rec[i]; c == '-' || c == '+' {
				i++
			}
			var v float64
			var seen byte
			var ok bool
			if end-i-1 < 8 { // 1 to 8 bytes
				v, seen, ok = wordCell(binary.LittleEndian.Uint64(rec[i:i+8]), end-i)
				if i > start && rec[start] == '-' {
					v = -v
				}
			} else {
				var n int
				v, n, seen, ok = scanBytes(rec[start:end], delim)
				ok = ok && n == int(end-start)
			}
			if !ok || !takeMark(&mark, &markLine, seen, ln) {
				break
			}
			p.nums[ci] = append(p.nums[ci], v)
		}
		start = end + 1
	}
	return p.settleRow(cols, f, f > last, mark, markLine)
}

// fastRow reads rec, a row without double quotes, in one pass when every
// cell it reads is a plain decimal (scanNumber, with the block's decimal
// mark) and it has the header's number of fields, counted as its cells
// are read: it appends the row's numbers and returns true. Any other row
// it leaves as it was (false), for the caller to read the general way,
// which then reports what is wrong in the order it always has (the count
// of fields first). cols holds the column of each field up to cfg.last
// (-1 if not read), none of them a text column.
func (p *part) fastRow(cfg *config, cols *[fastRowFields]int, rec []byte, ln int) bool {
	delim, last := cfg.delim, cfg.last
	mark, markLine := p.mark, p.markLine
	passed, ended := 0, false // delimiters passed; the row's last field read
	f := 0
	for ; f <= last; f++ {
		if ended {
			break // fewer fields than the header's
		}
		var n int
		if ci := cols[f&(fastRowFields-1)]; ci >= 0 {
			v, m, seen, ok := scanNumber(rec, delim)
			if !ok || !takeMark(&mark, &markLine, seen, ln) {
				break
			}
			p.nums[ci] = append(p.nums[ci], v)
			n = m
		} else if n = bytes.IndexByte(rec, delim); n < 0 {
			n = len(rec)
		}
		if n < len(rec) {
			rec = rec[n+1:]
			passed++
		} else {
			rec, ended = nil, true
		}
	}
	ok := false
	if f > last {
		nf := passed + 1
		if !ended {
			nf += bytes.Count(rec, []byte{delim})
		}
		ok = nf == cfg.fields
	}
	return p.settleRow(cols, f, ok, mark, markLine)
}

// settleRow ends a row that wordRow or fastRow read up to field f: a row
// taken (ok) counts and leaves the block its decimal mark and the mark's
// line; a row left has the numbers appended for its fields before f taken
// back, so the general way reads it from scratch. It returns ok.
func (p *part) settleRow(cols *[fastRowFields]int, f int, ok bool, mark byte, markLine int) bool {
	if ok {
		p.rows++
		p.mark, p.markLine = mark, markLine
		return true
	}
	for g := range f {
		if ci := cols[g&(fastRowFields-1)]; ci >= 0 {
			p.nums[ci] = p.nums[ci][:len(p.nums[ci])-1]
		}
	}
	return false
}

// takeMark reports whether a number read with the decimal mark seen (0
// for none) agrees with the block's mark *mark, and where the block has
// none yet takes seen as its mark, first seen on line ln (*line).
func takeMark(mark *byte, line *int, seen byte, ln int) bool {
	switch {
	case seen == 0 || seen == *mark:
		return true
	case *mark != 0:
		return false
	}
	*mark, *line = seen, ln
	return true
}

// plainQuotes reports whether every double quote in rec belongs to a pair
// enclosing a whole field with no other quote inside.
func plainQuotes(rec []byte, delim byte) bool {
	for len(rec) > 0 {
		f := rec
		if i := bytes.IndexByte(rec, delim); i >= 0 {
			f, rec = rec[:i], rec[i+1:]
		} else {
			rec = nil
		}
		if bytes.IndexByte(f, '"') < 0 {
			continue
		}
		if len(f) < 2 || f[0] != '"' || f[len(f)-1] != '"' || bytes.IndexByte(f[1:len(f)-1], '"') >= 0 {
			return false
		}
	}
	return true
}

// parseQuoted parses rows with encoding/csv, which knows the quoting rules.
func (p *part) parseQuoted(cfg *config, data []byte, line int) {
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comma = rune(cfg.delim)
	cr.ReuseRecord = true
	cr.FieldsPerRecord = cfg.fields
	off := line - 1
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			return
		}
		if err != nil {
			p.err = csvError(cfg.path, err, rec, cfg.fields, off, cfg.body, data, cfg.delim)
			return
		}
		n := len(rec) - 1
		for _, f := range rec {
			n += len(f)
		}
		if n > MaxRowBytes {
			ln, _ := cr.FieldPos(0)
			p.err = rowTooLong(cfg.path, ln+off)
			return
		}
		p.rows++
		for ci, c := range cfg.cols {
			ln, _ := cr.FieldPos(c.index)
			if p.cell(cfg, ci, rec[c.index], ln+off) {
				return
			}
		}
	}
}

// cell takes one cell of column cfg.cols[ci] on line ln; raw may be a view
// of a buffer that is reused. It reports whether the block must stop.
func (p *part) cell(cfg *config, ci int, raw string, ln int) (stop bool) {
	c := cfg.cols[ci]
	if len(raw) > MaxCellBytes {
		p.err = &Error{File: cfg.path, Line: ln, Column: c.name, Text: cellText(raw),
			Msg: fmt.Sprintf("the cell %s is longer than %s, the longest cell bivar reads: check the delimiter and the quotes around this cell", quoteCell(raw), bytesText(MaxCellBytes))}
		return true
	}
	s := trimSpace(raw)
	miss := false
	for _, m := range cfg.missing {
		if s == m {
			miss = true
			break
		}
	}
	if miss {
		p.missing[ci]++
	}
	if c.text && p.texts[ci].add(s, ln, c.group, cfg.lim.MaxLevels) {
		p.over = true
		return true
	}
	if !c.numeric {
		return false
	}
	if miss {
		p.nums[ci] = append(p.nums[ci], math.NaN())
		return false
	}
	var v float64
	var seen byte
	var st numStatus
	if cfg.opts.Thousands == 0 {
		v, seen, st = parseNumber(s, p.mark)
	} else {
		v, seen, st = parseThousands(s, p.mark, cfg.opts.Thousands)
	}
	if st == numOK {
		if p.mark == 0 && seen != 0 {
			p.mark, p.markLine = seen, ln
		}
		p.nums[ci] = append(p.nums[ci], v)
		return false
	}
	p.nums[ci] = append(p.nums[ci], math.NaN())
	switch {
	case cfg.opts.NonNumericAsMissing:
		p.nonNum[ci]++
	case p.first != nil:
		p.more++
	default:
		msg := nonNumericMsg(s, p.mark, p.markLine, cfg.opts)
		if s == c.name || strings.TrimPrefix(s, "\uFEFF") == c.name {
			// A second header: files joined end to end.
			msg = quoteCell(s) + " is not a number: it is the column's name, so this line repeats the header (were two files joined?); delete the line, or join the files without their headers"
		}
		if st == numOutOfRange {
			msg = outOfRangeMsg(s)
		}
		p.first = &Error{File: cfg.path, Line: ln, Column: c.name, Text: cellText(s), Msg: msg}
	}
	return false
}

// add keeps a text cell (s may be a view of a reused buffer) and reports
// whether a group column passed maxLevels distinct values in this block.
// A group column's values are looked up, to count its levels and keep one
// copy of each; any other text column's cells (row names, mostly all
// different) are kept as they come: the table copies every cell's bytes
// anyway, and a lookup per cell was a tenth of reading a file with a name
// column.
func (tp *textPart) add(s string, ln int, group bool, maxLevels int) bool {
	if group {
		if sp, ok := tp.seen[s]; ok {
			tp.spans = append(tp.spans, sp)
			return false
		}
	}
	sp := span{int32(len(tp.arena)), int32(len(s))}
	tp.arena = append(tp.arena, s...)
	tp.spans = append(tp.spans, sp)
	if !group {
		return false
	}
	if tp.seen == nil {
		tp.seen = map[string]span{}
	}
	tp.seen[strings.Clone(s)] = sp
	tp.levels = append(tp.levels, level{sp, ln})
	return len(tp.seen) > maxLevels
}

// asciiSpace marks the ASCII bytes unicode.IsSpace accepts.
var asciiSpace = [256]bool{'\t': true, '\n': true, '\v': true, '\f': true, '\r': true, ' ': true}

// trimSpace is strings.TrimSpace, fast for ASCII edges.
func trimSpace(s string) string {
	i, j := 0, len(s)
	for i < j && asciiSpace[s[i]] {
		i++
	}
	for j > i && asciiSpace[s[j-1]] {
		j--
	}
	if i < j && (s[i] >= 0x80 || s[j-1] >= 0x80) {
		return strings.TrimSpace(s[i:j])
	}
	return s[i:j]
}

func rowTooLong(path string, line int) error {
	return &Error{File: path, Line: line, Msg: fmt.Sprintf("the row starting on this line is longer than %s, the longest row bivar reads: check that the file is CSV with one row per line and that every double quote is closed", bytesText(MaxRowBytes))}
}

// fieldCountMsg explains a row of got fields where the header has want;
// row is the row's text (its fields, when only they are known), whose
// NUL bytes or carriage returns that end no line point at a cause other
// than a delimiter; first says the row is on the line after the header,
// which may then be a title above the column names.
func fieldCountMsg(got, want int, row string, first bool) string {
	msg := fmt.Sprintf("this row has %s but the header has %d", fieldCount(got), want)
	switch {
	case got == 1 && strings.HasPrefix(row, "(") && (strings.HasSuffix(row, " rows)") || strings.HasSuffix(row, " row)")):
		return msg + ": it is the count of rows a database shell prints after a table (psql's \"(10 rows)\"); delete the line, or export the query as CSV (in psql: \\copy (SELECT …) TO 'file.csv' CSV HEADER)"
	case row == "\x1a":
		return msg + ": it is a lone Ctrl-Z (0x1A), the end-of-file mark some DOS-era programs write after the last line; delete it"
	case first && strings.IndexByte(row, 0) < 0:
		return msg + ": the first line is read as the header; if lines above the column names hold a title or notes, delete them, else look for a missing or extra delimiter in the header or this row"
	case strings.IndexByte(row, 0) >= 0:
		return msg + nulBytes
	case strings.IndexByte(row, '\r') >= 0:
		return msg + ": it holds a carriage return (CR) that ends no line, so from here on the file may use CR-only line ends (as classic Mac OS wrote them), or two files were joined; save it with LF or CRLF line ends"
	}
	return msg + ": look for a missing or extra delimiter, or a value holding the delimiter that is not in double quotes"
}

func levelsError(cfg *config, c *column, s string, line int) error {
	return &Error{File: cfg.path, Line: line, Column: c.name, Text: cellText(s),
		Msg: fmt.Sprintf("a group column may hold at most %d distinct values, and %s on this line is one more: a group names machines, lots or shifts; if this column identifies rows or holds measurements, group by another column, and if it really is a grouping, raise max_levels for the dataset", cfg.lim.MaxLevels, quoteCell(s))}
}
