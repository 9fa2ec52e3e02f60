package dataset

import (
	"encoding/binary"
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"strconv"
	"strings"
	"testing"
)

// All data in these tests are invented for the tests.

// wordCells are cells for the word-at-a-time readers: plain decimals of
// 1 to 20 digits with and without sign, mark and leading zeros (15 and 16
// significant digits among them), and texts they must leave.
func wordCells(rng *rand.Rand) []string {
	cells := []string{"", "0", "-0", "+0", "00000000", "000000000", "0.000000", "-0.0", "-0,0", ".5", "5.", ".", ",",
		"-", "+", "-.", "+,", "--1", "+-1", "1-", "1+", "1.5.", "1..5", "1.,5", "1,5", "1.5", "12345678", "123456789",
		"1234567.", ".1234567", "1234567.8", "0.1234567", "-1234567", "-12345678", "+7654321", "123456789012345",
		"1234567890123456", "000000000000000000001", "100000000000000.5", "0.000000000000000000001",
		"0.0000000000000000000001", "9007199254740993", "1e5", "1E5", " 1", "1 ", "NA", "1\x00", "\xff", "1\xba9",
		"1\"", "1\r", "5.123", "12.345", "3,456", "123456"}
	digits := func(n int) string {
		b := make([]byte, n)
		for i := range b {
			b[i] = '0' + byte(rng.IntN(10))
		}
		if n > 0 && rng.IntN(4) == 0 {
			b[0] = '0' // a leading zero
		}
		return string(b)
	}
	for range 4000 {
		s := [...]string{"", "", "-", "+"}[rng.IntN(4)]
		s += digits(rng.IntN(11))
		switch rng.IntN(4) {
		case 0:
			s += "."
		case 1:
			s += ","
		}
		s += digits(rng.IntN(11))
		if rng.IntN(8) == 0 && s != "" { // a byte that is no digit or a second mark
			i := rng.IntN(len(s))
			const junk = " eE+-.,;\t\"x\x00\xff\x8a\x80:/"
			s = s[:i] + junk[rng.IntN(len(junk)):][:1] + s[i+1:]
		}
		cells = append(cells, s)
	}
	return cells
}

// TestScanNumberWords: scanNumber, which reads a short cell from the word
// at its start, gives what scanBytes gives (the byte-at-a-time reader,
// itself checked against strconv.ParseFloat by TestFastNumber and
// FuzzScanNumber), to the bit, for every cell, delimiter and what follows
// the cell, and for every number of bytes past the row in its capacity,
// whatever those bytes are; and a number it reads is
// strconv.ParseFloat's (Go's standard library, correctly rounded; a
// decimal comma read as a point).
func TestScanNumberWords(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(3, 4))
	words := 0
	for _, cell := range wordCells(rng) {
		for _, delim := range []byte{',', ';', '\t'} {
			for _, follow := range []string{"", string(delim) + "7", string(delim), "x", "\n"} {
				row := cell + follow
				for past := range 10 {
					for _, fill := range []byte{'9', delim, '.', '\n'} {
						buf := make([]byte, len(row)+past)
						copy(buf, row)
						for i := len(row); i < len(buf); i++ {
							buf[i] = fill
						}
						rec := buf[:len(row)]
						v, n, seen, ok := scanNumber(rec, delim)
						wv, wn, wseen, wok := scanBytes(rec, delim)
						if math.Float64bits(v) != math.Float64bits(wv) || n != wn || seen != wseen || ok != wok {
							t.Fatalf("scanNumber(%q, %q) with %d bytes of %q past it = %v, %d, %q, %v; scanBytes gives %v, %d, %q, %v",
								row, delim, past, fill, v, n, seen, ok, wv, wn, wseen, wok)
						}
						if !ok {
							continue
						}
						if sign := n - len(strings.TrimLeft(row[:n], "+-")); cap(rec)-sign >= 8 && n-sign <= 7 {
							words++ // read from the word
						}
						want, err := strconv.ParseFloat(strings.Replace(row[:n], ",", ".", 1), 64)
						if err != nil || math.Float64bits(v) != math.Float64bits(want) {
							t.Fatalf("scanNumber(%q, %q) = %v; strconv.ParseFloat gives %v, %v", row, delim, v, want, err)
						}
					}
				}
			}
		}
	}
	if words < 10000 {
		t.Errorf("only %d numbers could be read from a word; want many", words)
	}
}

// TestByteMask checks byteMask, byte by byte, on words of bytes near the
// one it looks for, and gather on every mask of eight bits.
func TestByteMask(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(5, 6))
	for _, c := range []byte{',', ';', '\t', '\n'} {
		near := []byte{c, c ^ 1, c + 1, c - 1, c | 0x80, 0, 0x7f, 0x80, 0xff}
		for range 20000 {
			var b [8]byte
			for i := range b {
				if rng.IntN(2) == 0 {
					b[i] = near[rng.IntN(len(near))]
				} else {
					b[i] = byte(rng.Uint32())
				}
			}
			var want uint64
			for i, x := range b {
				if x == c {
					want |= 0x80 << (8 * i)
				}
			}
			if got := byteMask(binary.LittleEndian.Uint64(b[:]), c); got != want {
				t.Fatalf("byteMask(% x, %q) = %#x, want %#x", b, c, got, want)
			}
		}
	}
	for m := range uint64(256) {
		var spread uint64
		for j := range 8 {
			spread |= (m >> j & 1) << (8*j + 7)
		}
		if got := gather(spread); got != m {
			t.Fatalf("gather(%#x) = %#x, want %#x", spread, got, m)
		}
	}
}

// plainAgrees reads data with the plain splitter and with encoding/csv
// (the standard library's reader, used for blocks with quotes), both
// starting with the decimal mark mark, and fails unless they read the
// same rows, numbers (to the bit), texts, missing counts, decimal mark and
// the line it was taken on, first problem and error, or the plain
// splitter leaves the block to encoding/csv. shape chooses the columns: a
// text column and a number (0), two numbers (1: rows of plain decimals
// then go through fastRows and fastRow), or two numbers with an unread
// field between them (2).
func plainAgrees(t *testing.T, data string, delim, shape, mark byte) {
	t.Helper()
	cfg := &config{path: "f.csv", delim: delim, fields: 2, last: 1, byIndex: []int{0, 1},
		cols:    []*column{{name: "a", index: 0, numeric: true, text: shape == 0}, {name: "b", index: 1, numeric: true}},
		missing: DefaultMissing(), lim: DefaultLimits(), plain: true}
	if shape == 2 {
		cfg.fields, cfg.last, cfg.byIndex = 3, 2, []int{0, -1, 1}
		cfg.cols[1].index = 2
	}
	newPart := func() *part {
		return &part{nums: [][]float64{nil, nil}, texts: make([]textPart, 2), missing: make([]int, 2), nonNum: make([]int, 2),
			mark: mark, markLine: 1}
	}
	plain, quoted := newPart(), newPart()
	if !plain.parsePlain(cfg, []byte(data), 2) {
		return // quoting the plain splitter leaves to encoding/csv
	}
	quoted.parseQuoted(cfg, []byte(data), 2)
	texts := func(p *part) []string {
		var out []string
		for _, sp := range p.texts[0].spans {
			out = append(out, string(p.texts[0].arena[sp.off:sp.off+sp.n]))
		}
		return out
	}
	errText := func(e error) string {
		if e == nil {
			return ""
		}
		return e.Error()
	}
	firstText := func(e *Error) string {
		if e == nil {
			return ""
		}
		return e.Error()
	}
	sameBits := func(a, b []float64) bool {
		if len(a) != len(b) {
			return false
		}
		for i := range a {
			if math.Float64bits(a[i]) != math.Float64bits(b[i]) {
				return false
			}
		}
		return true
	}
	if plain.rows != quoted.rows || errText(plain.err) != errText(quoted.err) || firstText(plain.first) != firstText(quoted.first) ||
		plain.more != quoted.more || !reflect.DeepEqual(plain.missing, quoted.missing) || !reflect.DeepEqual(plain.nonNum, quoted.nonNum) ||
		plain.mark != quoted.mark || plain.markLine != quoted.markLine ||
		!sameBits(plain.nums[0], quoted.nums[0]) || !sameBits(plain.nums[1], quoted.nums[1]) ||
		!reflect.DeepEqual(texts(plain), texts(quoted)) {
		t.Fatalf("%q (delimiter %q, shape %d, mark %q): plain and encoding/csv differ:\nplain  %d rows, err %v, first %v, mark %q on %d, nums %v %v, texts %q\ncsv    %d rows, err %v, first %v, mark %q on %d, nums %v %v, texts %q",
			data, delim, shape, mark, plain.rows, plain.err, plain.first, plain.mark, plain.markLine, plain.nums[0], plain.nums[1], texts(plain),
			quoted.rows, quoted.err, quoted.first, quoted.mark, quoted.markLine, quoted.nums[0], quoted.nums[1], texts(quoted))
	}
}

// TestFastRowsAgree: blocks of mostly plain numeric rows, long enough for
// fastRows, with now and then a row it must leave (a missing or
// non-numeric cell, a cell with spaces, an exponent or 16 digits, a row of
// 64 bytes or more, a field too many or too few, a blank line, the other
// decimal mark), read as encoding/csv reads them (plainAgrees).
func TestFastRowsAgree(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(9, 10))
	odd := []string{"NA", "", " 1.5", "2.5 ", "1e3", "1234567890123456", "x", "-", ".", "1.2.3", "0000000000000000000000000000000000000000000000000000000000007.5"}
	number := func(comma bool) string {
		var s string
		switch rng.IntN(4) {
		case 0:
			s = strconv.Itoa(rng.IntN(2000000) - 1000000)
		case 1:
			s = strconv.FormatFloat(rng.Float64()*20-5, 'f', rng.IntN(8), 64)
		case 2:
			s = fmt.Sprintf("%.3f", rng.Float64()*20)
		default:
			s = strconv.FormatFloat(rng.NormFloat64()*1e3, 'f', -1, 64) // up to 17 digits
		}
		if comma {
			s = strings.Replace(s, ".", ",", 1)
		}
		return s
	}
	blocks := 0
	for _, delim := range []byte{',', ';', '\t'} {
		for shape := byte(1); shape <= 2; shape++ {
			for _, mark := range []byte{0, '.', ','} {
				for range 150 {
					comma := delim != ',' && rng.IntN(2) == 0
					var b strings.Builder
					rows := 5 + rng.IntN(40)
					for range rows {
						fields := 2 + int(shape) - 1
						if rng.IntN(60) == 0 {
							fields += rng.IntN(3) - 1 // one too many or too few, or as many
						}
						for f := range fields {
							if f > 0 {
								b.WriteByte(delim)
							}
							switch {
							case shape == 2 && f == 1:
								b.WriteString([...]string{"", "abc", "1.5", "\"q\""}[rng.IntN(4)])
							case rng.IntN(25) == 0:
								b.WriteString(odd[rng.IntN(len(odd))])
							default:
								b.WriteString(number(comma != (rng.IntN(200) == 0)))
							}
						}
						switch rng.IntN(30) {
						case 0:
							b.WriteString("\r\n")
						case 1:
							b.WriteString("\n\n")
						default:
							b.WriteString("\n")
						}
					}
					if rng.IntN(4) == 0 { // no line end after the last row
						s := strings.TrimRight(b.String(), "\r\n")
						b.Reset()
						b.WriteString(s)
					}
					plainAgrees(t, b.String(), delim, shape, mark)
					blocks++
				}
			}
		}
	}
	if blocks < 2000 {
		t.Errorf("%d blocks", blocks)
	}
}
