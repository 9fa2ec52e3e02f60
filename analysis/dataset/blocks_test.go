package dataset

import (
	"encoding/csv"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"strconv"
	"strings"
	"testing"
)

// All data in these tests are invented for the tests.

// blockFile writes rows enough to fill several read blocks: a quoted id
// (some with a comma, a doubled quote or a line break inside, unless
// simple), numbers in several spellings, NA cells, CRLF line ends and
// blank lines.
func blockFile(rows int, simple bool) string {
	rng := rand.New(rand.NewPCG(7, 8))
	var b strings.Builder
	b.WriteString("id,x,note,y\r\n")
	for i := range rows {
		switch {
		case simple && i%5 != 4:
			fmt.Fprintf(&b, "\"r%d\"", i)
		case i%5 == 0:
			fmt.Fprintf(&b, "\"r%d, a\"", i)
		case i%5 == 1:
			fmt.Fprintf(&b, "\"r%d\nsecond line\"", i)
		case i%5 == 2:
			fmt.Fprintf(&b, "\"say \"\"r%d\"\"\"", i)
		default:
			fmt.Fprintf(&b, "r%d", i)
		}
		x := strconv.FormatFloat(rng.NormFloat64()*100, 'f', rng.IntN(6), 64)
		y := strconv.FormatFloat(rng.NormFloat64()*1e-5, 'e', rng.IntN(17), 64)
		if i%97 == 0 {
			x = "NA"
		}
		if i%89 == 0 {
			y = " 12345678901234567890.5 "
		}
		fmt.Fprintf(&b, ",%s,n%d,%s\r\n", x, i%3, y)
		if i%1000 == 0 {
			b.WriteString("\r\n")
		}
	}
	return b.String()
}

// TestBlocksAgree reads a file of several blocks and compares every cell
// with encoding/csv reading the whole file and strconv.ParseFloat (Go's
// standard library, the reference for the quoting rules and for correctly
// rounded numbers).
func TestBlocksAgree(t *testing.T) {
	t.Parallel()
	for _, simple := range []bool{false, true} {
		t.Run(fmt.Sprintf("simple quotes %v", simple), func(t *testing.T) {
			t.Parallel()
			blocksAgree(t, blockFile(120000, simple))
		})
	}
}

func blocksAgree(t *testing.T, src string) {
	t.Helper()
	if len(src) < 3*blockSize {
		t.Fatalf("the file has %d bytes, want several blocks of %d", len(src), blockSize)
	}
	cr := csv.NewReader(strings.NewReader(src))
	recs, err := cr.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var wantX, wantY []float64
	var wantID []string
	missing := 0
	for _, r := range recs[1:] {
		wantID = append(wantID, strings.TrimSpace(r[0]))
		if x := strings.TrimSpace(r[1]); x == "NA" {
			wantX = append(wantX, nan)
			missing++
		} else {
			v, err := strconv.ParseFloat(x, 64)
			if err != nil {
				t.Fatal(err)
			}
			wantX = append(wantX, v)
		}
		v, err := strconv.ParseFloat(strings.TrimSpace(r[3]), 64)
		if err != nil {
			t.Fatal(err)
		}
		wantY = append(wantY, v)
	}
	for _, size := range []int64{int64(len(src)), 0} {
		tab, err := read("data.csv", strings.NewReader(src), size, Options{}, []string{"x", "y"}, []string{"id"})
		if err != nil {
			t.Fatal(err)
		}
		if tab.Rows != len(recs)-1 || !sameFloats(tab.Numeric["x"], wantX) || tab.Missing["x"] != missing {
			t.Errorf("size %d: rows %d, x equal %v, missing %d; want %d, true, %d", size, tab.Rows,
				sameFloats(tab.Numeric["x"], wantX), tab.Missing["x"], len(recs)-1, missing)
		}
		for i, v := range tab.Numeric["y"] {
			if math.Float64bits(v) != math.Float64bits(wantY[i]) {
				t.Fatalf("size %d: y[%d] = %v, want %v (strconv.ParseFloat)", size, i, v, wantY[i])
			}
		}
		if !reflect.DeepEqual(tab.Text["id"].Slice(), wantID) {
			t.Errorf("size %d: id column differs from encoding/csv's", size)
		}
	}
}

// TestBlocksDecimalMark: the mark is settled by the first number showing
// one, wherever it is; blocks parsed before then are parsed again.
func TestBlocksDecimalMark(t *testing.T) {
	t.Parallel()
	var b strings.Builder
	b.WriteString("a;b\n")
	line := 1
	for b.Len() < 2*blockSize+100 {
		fmt.Fprintf(&b, "%d;%d\n", line, line%7)
		line++
	}
	commaLine := line + 1
	b.WriteString("1,5;2\n")
	line++
	for b.Len() < 3*blockSize+100 {
		b.WriteString("3;4\n")
		line++
	}
	src := b.String()
	tab, err := read("data.csv", strings.NewReader(src), int64(len(src)), Options{}, []string{"a", "b"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !tab.DecimalComma || tab.Numeric["a"][commaLine-2] != 1.5 || tab.Rows != line-1 {
		t.Errorf("DecimalComma %v, a on line %d = %v, rows %d; want true, 1.5, %d",
			tab.DecimalComma, commaLine, tab.Numeric["a"][commaLine-2], tab.Rows, line-1)
	}
	// A decimal point soon after, in the next block: an error naming both lines.
	pointLine := line + 1
	src += "2.5;1\n" + strings.Repeat("3;4\n", 1000)
	_, err = read("data.csv", strings.NewReader(src), int64(len(src)), Options{}, []string{"a", "b"}, nil)
	want := fmt.Sprintf(`data.csv:%d: column "a": "2.5" is not a number: it has a decimal point, but numbers from line %d on use a decimal comma; declare decimal = "." or "," for the dataset and make the file agree`, pointLine, commaLine)
	if err == nil || err.Error() != want {
		t.Errorf("error\ngot  %v\nwant %s", err, want)
	}
}

// TestBlocksFirstProblem: messages name the first problem in the file, as
// a sequential read does: the first non-numeric cell with a count of the
// others, unless the file's structure is broken somewhere, which wins.
func TestBlocksFirstProblem(t *testing.T) {
	t.Parallel()
	var b strings.Builder
	b.WriteString("x,y\n")
	bad := map[int]bool{}
	for i := 2; b.Len() < 3*blockSize; i++ {
		if i%50000 == 0 {
			b.WriteString("oops,1\n")
			bad[i] = true
			continue
		}
		b.WriteString("1.25,2\n")
	}
	src := b.String()
	_, err := read("data.csv", strings.NewReader(src), 0, Options{}, []string{"x"}, nil)
	want := fmt.Sprintf(`data.csv:50000: column "x": "oops" is not a number; correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing (and %d more non-numeric cells after it)`, len(bad)-1)
	if err == nil || err.Error() != want {
		t.Errorf("error\ngot  %v\nwant %s", err, want)
	}
	lines := strings.Count(src, "\n")
	src += "1,2,3\n" + strings.Repeat("1,2\n", 1000)
	_, err = read("data.csv", strings.NewReader(src), 0, Options{}, []string{"x"}, nil)
	var e *Error
	if !errors.As(err, &e) || e.Line != lines+1 || !strings.HasPrefix(e.Msg, "this row has 3 fields but the header has 2") {
		t.Errorf("error = %v, want the field count on line %d", err, lines+1)
	}
	// An unclosed quote near the end: the rows after it are one long cell.
	// encoding/csv reading the whole file gives the place.
	src = "x,y\n" + strings.Repeat("1,2\n", blockSize/4) + "3,\"4\n" + strings.Repeat("5,6\n", 100)
	_, err = read("data.csv", strings.NewReader(src), 0, Options{}, []string{"x"}, nil)
	_, csvErr := csv.NewReader(strings.NewReader(src)).ReadAll()
	var pe *csv.ParseError
	if !errors.As(csvErr, &pe) || pe.StartLine != blockSize/4+2 {
		t.Fatalf("encoding/csv: %v", csvErr)
	}
	want = fmt.Sprintf(`data.csv:%d: at character %d: a quoted field (in the row starting on line %d) is not closed, or holds a quote not written twice ("")`, pe.Line, pe.Column, pe.StartLine)
	if err == nil || err.Error() != want {
		t.Errorf("error\ngot  %v\nwant %s", err, want)
	}
}

// TestFastNumber compares the fast path with strconv.ParseFloat (Go 1.26,
// correctly rounded) bit for bit on seeded random decimals and edge cases.
func TestFastNumber(t *testing.T) {
	t.Parallel()
	cases := []string{"0", "-0", "+0", "0.0", "-0.000", ".5", "5.", "1e22", "1e23", "123456789012345",
		"1234567890123456", "0.000000000000000000001", "9007199254740993", "1.7976931348623157e308",
		"4.9e-324", "1e-22", "1e-23", "0e999", "12e-30", "3.0e+05", "1E5", "-1.5E-3", "000123.4500"}
	rng := rand.New(rand.NewPCG(1, 2))
	for range 200000 {
		digits := rng.IntN(17) + 1
		s := strconv.FormatUint(rng.Uint64()%uint64(math.Pow10(min(digits, 19))), 10)
		if p := rng.IntN(len(s) + 1); p < len(s) {
			s = s[:p] + "." + s[p:]
		}
		if rng.IntN(3) == 0 {
			s += "e" + strconv.Itoa(rng.IntN(61)-30)
		}
		if rng.IntN(2) == 0 {
			s = "-" + s
		}
		cases = append(cases, s)
	}
	fast := 0
	for _, s := range cases {
		want, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatalf("ParseFloat(%q): %v", s, err)
		}
		got, seen, st := parseNumber(s, '.')
		if st != numOK || math.Float64bits(got) != math.Float64bits(want) || (seen == '.') != strings.Contains(s, ".") {
			t.Errorf("parseNumber(%q) = %v, %q, %d; want %v (strconv.ParseFloat)", s, got, seen, st, want)
		}
		if _, _, ok := fastNumber(s); ok {
			fast++
		}
	}
	if fast < len(cases)/2 {
		t.Errorf("the fast path took %d of %d numbers; want most", fast, len(cases))
	}
}

// FuzzNumber: parseNumber agrees with strconv.ParseFloat on every text
// both accept, and accepts no text ParseFloat rejects.
func FuzzNumber(f *testing.F) {
	for _, s := range []string{"1.5", "-0", "1e400", "1,5", "12345678901234567", ".e1", "1e+", "+.5"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		v, seen, st := parseNumber(s, '.')
		want, err := strconv.ParseFloat(s, 64)
		switch {
		case st == numOK && (err != nil || math.Float64bits(v) != math.Float64bits(want)):
			t.Fatalf("parseNumber(%q) = %v, want %v, %v (strconv.ParseFloat)", s, v, want, err)
		case st == numOutOfRange && !errors.Is(err, strconv.ErrRange):
			t.Fatalf("parseNumber(%q) out of range, but ParseFloat: %v, %v", s, want, err)
		case seen == ',' && st == numOK:
			t.Fatalf("parseNumber(%q) accepted a comma with a decimal point declared", s)
		}
	})
}

// FuzzScanNumber: a cell scanNumber reads (the fast path of the plain
// splitter) has strconv.ParseFloat's value (the standard library's
// correctly rounded reader; the decimal comma read as a point), and the
// cell ends at the delimiter or the end of the row.
func FuzzScanNumber(f *testing.F) {
	for _, s := range []string{"0", "-0", "1.5", "-.5", "3.", "007.250", "123456789012345", "1234567890123456", "0.0000000000000000000001",
		"1,5", "1.5,2", "+4", "1e5", " 1", "1 ", "NA", "", "-", ".", "9007199254740993", "0.1234567890123456789012"} {
		f.Add(s, byte(','))
		f.Add(s, byte(';'))
	}
	f.Fuzz(func(t *testing.T, s string, delim byte) {
		if delim != ',' && delim != ';' && delim != '\t' {
			return
		}
		v, n, seen, ok := scanNumber([]byte(s), delim)
		if !ok {
			return
		}
		if n < len(s) && s[n] != delim {
			t.Fatalf("scanNumber(%q) stopped at %d, not at a delimiter", s, n)
		}
		cell := s[:n]
		if seen != 0 && strings.Count(cell, string(seen)) != 1 {
			t.Fatalf("scanNumber(%q): mark %q", s, seen)
		}
		want, err := strconv.ParseFloat(strings.Replace(cell, ",", ".", 1), 64)
		if err != nil || math.Float64bits(v) != math.Float64bits(want) {
			t.Fatalf("scanNumber(%q) = %v, strconv.ParseFloat %v (%v)", s, v, want, err)
		}
	})
}

// FuzzPlainAgrees: on text it takes (no double quotes, or quotes around
// whole fields that hold no quote, delimiter or line break) the plain
// splitter reads what encoding/csv (the standard library's reader, used
// for blocks with quotes) reads: the same rows, cells, counts and first
// problem (plainAgrees, which also says what shape chooses). The longer
// seeds fill the 72 bytes fastRows needs.
func FuzzPlainAgrees(f *testing.F) {
	for _, s := range []string{"1,2\n3,4\n", "1;2\r\n\r\n 3 ;NA\r", "a,b\n,\n\n1e5,-.5\n", "1,2,3\n", "\xff,2\n1,\r2\n",
		"\"1.5\",\"A\"\n\"\",2\n", "\"1,5\";2\n", " \"1\",2\n", "\"1\" ,2\n", "\"a\"\"b\",1\n", "\"1\",\"2\",\"3\"\n",
		"1,5;2,5\n3;4,\n", "1,x,2\n3,,4\n5,6\n", "1.5,2\n3,4,5\n-0.25,1e3\n", "1,2,\n",
		"5.123,3.456\n12.5,-0.001\n7,8\n1.25,2.5\n-0,+0\n3.14159,2.71828\n100,200\n0.5,0.25\n9.75,1\n",
		"1,5;2,5\r\n3;4,25\r\n-5,5;6\r\n7,125;8\r\n9;10\r\n11,5;12,5\r\n13;14\r\n15,5;16\r\n17;18,75\r\n",
		"1.5,2.5\n3.5,4.5\n5.5,6.5\n7.5,8.5\n9.5,NA\n1.5,2.5\n3.5,4.5\n5.5,6.5,7\n1,2\n3\n4,5\n6,7\n8,9\n",
		"123456789012345,0.0000001\n12345678,1234567.8\n1,2\n3,4\n5,6\n7,8\n9,10\n11,12\n13,14\n15,16\n"} {
		for shape := range byte(3) {
			f.Add(s, byte(','), shape)
			f.Add(s, byte(';'), shape)
		}
	}
	f.Fuzz(func(t *testing.T, data string, delim, shape byte) {
		if delim != ',' && delim != ';' && delim != '\t' || shape > 2 {
			return
		}
		plainAgrees(t, data, delim, shape, 0)
	})
}

// TestPlainQuotes: which quoted rows the plain splitter takes; the others
// go to encoding/csv.
func TestPlainQuotes(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		row  string
		want bool
	}{
		{`"A",1.5,""`, true},
		{`"3.969","5.657","1"`, true},
		{`"a, b",1`, false},       // a delimiter inside the quotes
		{`"say ""hi""",1`, false}, // doubled quotes
		{` "A",1`, false},         // a space before the quote: a bare quote to encoding/csv
		{`"A" ,1`, false},         // a space after it: an extraneous quote
		{`"A`, false},             // a line break inside the quotes
		{`"`, false},
		{`1,2`, true},
	} {
		if got := plainQuotes([]byte(c.row), ','); got != c.want {
			t.Errorf("plainQuotes(%s) = %v, want %v", c.row, got, c.want)
		}
	}
}

// TestBlocksInchMark: one bare quote (12" as an inch mark) leaves the
// rest of a large file inside quotes for the block cutter; the message is
// still encoding/csv's, at the place a sequential read finds it.
func TestBlocksInchMark(t *testing.T) {
	t.Parallel()
	src := "x,part\n" + strings.Repeat("1,bolt\n", 10) + "2,12\" pipe\n" + strings.Repeat("3,nut\n", MaxRowBytes/3)
	_, err := read("data.csv", strings.NewReader(src), 0, Options{}, []string{"x"}, []string{"part"})
	_, csvErr := csv.NewReader(strings.NewReader(src)).ReadAll()
	var pe *csv.ParseError
	if !errors.As(csvErr, &pe) || pe.Line != 12 {
		t.Fatalf("encoding/csv: %v", csvErr)
	}
	want := fmt.Sprintf(`data.csv:12: a double quote inside an unquoted field (character %d): put the whole field in double quotes and write the quote twice ("")`, pe.Column)
	if err == nil || err.Error() != want {
		t.Errorf("error\ngot  %v\nwant %s", err, want)
	}
}
