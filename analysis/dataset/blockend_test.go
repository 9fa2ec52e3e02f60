package dataset

import (
	"strings"
	"testing"
)

// TestFastRowsBlockEnd puts each awkward cell in a row at every distance
// from the end of a block of plain numeric rows (0 to 80 bytes: inside and
// outside the last 72 bytes, where fastRows stops and scanNumber must not
// read past the block), in rows of 62 to 66 bytes (fastRows takes rows of
// up to 63), with and without a final line end, with CRLF line ends, and
// with the decimal mark taken before the block or not; plainAgrees holds
// the plain splitter to encoding/csv with strconv.ParseFloat to the bit,
// with the same errors, first problem, and decimal mark and its line.
func TestFastRowsBlockEnd(t *testing.T) {
	t.Parallel()
	cells := []string{"+.5", "-.5", "-.", "5.", ".", "+", "-", "", "00000000.1", "-00000000", "12345678", "-12345678", "+12345678",
		"123456789", "-1234567.8", "0.1234567", "1.234567890123456", "1234567890123456", "12345678901234567", "-0", "+0",
		"1,234", "0,0000001", "1.2.3", "1,2,3", "NA", "1\r5", "5\r", "1e5", " 5", "--5", "0x10"}
	checked := 0
	for _, delim := range []byte{',', ';'} {
		for _, mark := range []byte{0, '.', ','} {
			for _, cell := range cells {
				if strings.IndexByte(cell, delim) >= 0 {
					continue
				}
				for _, nl := range []string{"\n", "\r\n"} {
					for width := 62; width <= 66; width++ {
						for tail := 0; tail <= 80; tail += 3 {
							for _, final := range []bool{true, false} {
								data := blockEndData(cell, delim, nl, width, tail, final)
								plainAgrees(t, data, delim, 1, mark)
								plainAgrees(t, blockEndData3(cell, delim, nl, width, tail, final), delim, 2, mark)
								checked += 2
							}
						}
					}
				}
			}
		}
	}
	if checked < 50000 {
		t.Errorf("only %d blocks checked", checked)
	}
}

// blockEndData is a block of two numeric fields: a run of plain rows long
// enough for fastRows, then cell as x in a row padded with leading zeros
// in y to width bytes (where the cell allows), then rows that fill about
// tail bytes up to the block's end.
func blockEndData(cell string, delim byte, nl string, width, tail int, final bool) string {
	var b strings.Builder
	d := string(delim)
	for i := range 12 {
		b.WriteString("1" + strings.Repeat("2", i%5) + d + "3" + nl)
	}
	y := "7"
	if pad := width - len(cell) - 1 - len(y); pad > 0 {
		y = strings.Repeat("0", pad) + y
	}
	b.WriteString(cell + d + y + nl)
	writeTail(&b, d, nl, tail)
	s := b.String()
	if !final {
		s = strings.TrimSuffix(s, nl)
	}
	return s
}

// blockEndData3 is blockEndData for three fields, the middle one unread
// and padding the awkward row to width bytes.
func blockEndData3(cell string, delim byte, nl string, width, tail int, final bool) string {
	var b strings.Builder
	d := string(delim)
	for i := range 12 {
		b.WriteString("1" + strings.Repeat("2", i%5) + d + "abc" + d + "3" + nl)
	}
	mid := ""
	if pad := width - len(cell) - 2 - 1; pad > 0 {
		mid = strings.Repeat("m", pad)
	}
	b.WriteString(cell + d + mid + d + "7" + nl)
	for range tail / 8 {
		b.WriteString("4" + d + d + "55" + nl)
	}
	if r := tail % 8; r > 0 {
		b.WriteString("9" + d + d + strings.Repeat("8", r) + nl)
	}
	s := b.String()
	if !final {
		s = strings.TrimSuffix(s, nl)
	}
	return s
}

// writeTail writes plain rows of two numbers, about tail bytes in all.
func writeTail(b *strings.Builder, d, nl string, tail int) {
	for range tail / 8 {
		b.WriteString("4.25" + d + "55" + nl)
	}
	if r := tail % 8; r > 0 {
		b.WriteString("9" + d + strings.Repeat("8", r) + nl)
	}
}
