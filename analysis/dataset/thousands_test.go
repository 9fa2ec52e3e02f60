package dataset

import (
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// TestParseThousands: numbers with a separator between thousands read
// exactly as strconv.ParseFloat reads the same text without the
// separators (the Go standard library, correctly rounded: the reference
// here), and every malformed grouping is refused (invented cells).
func TestParseThousands(t *testing.T) {
	t.Parallel()
	cases := []struct {
		s     string
		mark  byte
		sep   rune
		plain string // the same number without separators; "" when s is not a number
	}{
		{"1,234.5", '.', ',', "1234.5"},
		{"1,234.5", 0, ',', "1234.5"}, // ',' separates: the mark is '.'
		{"-12,345,678.901234567890123", '.', ',', "-12345678.901234567890123"},
		{"+999,999,999,999,999,999,999", '.', ',', "999999999999999999999"},
		{"1,234e3", '.', ',', "1234e3"},
		{"1234.5", '.', ',', "1234.5"}, // no separator: read as usual
		{"0.1", '.', ',', "0.1"},
		{"1.234,5", ',', '.', "1234,5"},
		{"1.234,5", 0, '.', "1234,5"},
		{"12 345,25", ',', ' ', "12345,25"},
		{"12 345.25", 0, ' ', "12345.25"},
		{"1'000'000", '.', '\'', "1000000"},
		{"1\u00a0000,5", ',', '\u00a0', "1000,5"},
		{"1\u202f000", '.', '\u202f', "1000"},
		{"1,23,456", '.', ',', ""},    // a group of two (not accepted: see parseThousands)
		{"1,2345", '.', ',', ""},      // a last group of four
		{"1234,567", '.', ',', ""},    // a first group of four
		{",123", '.', ',', ""},        // no first group
		{"1,,234", '.', ',', ""},      // an empty group
		{"1,234,", '.', ',', ""},      // a trailing separator
		{"1.5", ',', '.', ""},         // "." separates thousands here: 1.5 is ambiguous
		{"1,234.567,8", '.', ',', ""}, // a separator after the mark
		{"1,234", ',', ',', ""},       // the separator is the mark
		{"1 234", '.', ',', ""},       // another separator
		{"1,234x", '.', ',', ""},
		{"--1,234", '.', ',', ""},
	}
	for _, c := range cases {
		v, _, st := parseThousands(c.s, c.mark, c.sep)
		if c.plain == "" {
			if st == numOK {
				t.Errorf("parseThousands(%q, %q, %q) = %v; want not a number", c.s, c.mark, c.sep, v)
			}
			continue
		}
		want, err := strconv.ParseFloat(strings.Replace(c.plain, ",", ".", 1), 64)
		if err != nil {
			t.Fatal(err)
		}
		if st != numOK || v != want {
			t.Errorf("parseThousands(%q, %q, %q) = %v (status %d); want %v, as strconv.ParseFloat(%q)", c.s, c.mark, c.sep, v, st, want, c.plain)
		}
	}
}

// TestReadThousands: Read takes the separator the dataset declares, in
// quoted cells of a comma-delimited file and in a semicolon file with a
// decimal comma, and names a malformed cell with the rule (invented data).
func TestReadThousands(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	write := func(name, src string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	p := write("a.csv", "lot,mass\nA,\"1,234.5\"\nB,987.25\nC,\"12,000,000\"\nD,NA\n")
	tab, err := Read(p, Options{Thousands: ',', DecimalPoint: true}, []string{"mass"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := tab.Numeric["mass"], []float64{1234.5, 987.25, 12e6, nan}; !sameFloats(got, want) {
		t.Errorf("mass = %v, want %v", got, want)
	}
	p = write("b.csv", "lot;mass\nA;1.234,5\nB;987,25\n")
	tab, err = Read(p, Options{Thousands: '.', DecimalComma: true}, []string{"mass"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := tab.Numeric["mass"], []float64{1234.5, 987.25}; !sameFloats(got, want) {
		t.Errorf("mass = %v, want %v", got, want)
	}
	// Without the key the separator is not a number, and the message says
	// which key to declare.
	p = write("c.csv", "lot,mass\nA,\"1,234.5\"\n")
	_, err = Read(p, Options{}, []string{"mass"}, nil)
	if err == nil || !strings.Contains(err.Error(), `declare it for the dataset (thousands = "," or ".")`) {
		t.Errorf("Read without thousands: %v", err)
	}
	p = write("d.csv", "lot,mass\nA,\"1,234.5\"\nB,\"1,23\"\n")
	_, err = Read(p, Options{Thousands: ',', DecimalPoint: true}, []string{"mass"}, nil)
	want := p + `:3: column "mass": "1,23" is not a number: the dataset declares thousands = ",", and a number written with it has one to three digits before the first separator, exactly three after each, and none after the decimal mark; correct the cell, or check thousands and decimal`
	if err == nil || err.Error() != want {
		t.Errorf("Read of a malformed group:\ngot  %v\nwant %s", err, want)
	}
}

// BenchmarkRead1e6Thousands is BenchmarkRead1e6 with a thousands
// separator declared (the file has none): the cost of the declared key.
func BenchmarkRead1e6Thousands(b *testing.B) {
	path := writeBench(b, 1e6, ",", false)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Read(path, Options{Thousands: '\'', DecimalPoint: true}, []string{"temp", "pressure", "hold", "shrink"}, []string{"row", "group"}); err != nil {
			b.Fatal(err)
		}
	}
}

// FuzzParseThousands: whatever the cell, a number read with a thousands
// separator is the number read without its separators, and a cell
// without the separator reads as parseNumber reads it.
func FuzzParseThousands(f *testing.F) {
	for _, s := range []string{"1,234.5", "1.234,5", "12 345", "1'000'000", "-1,234e5", "1,23", "0.5", ""} {
		f.Add(s, byte(0), byte('.'))
		f.Add(s, byte(1), byte(','))
	}
	seps := []rune{',', '.', '\'', ' ', '\u00a0', '\u202f'}
	f.Fuzz(func(t *testing.T, s string, si, mark byte) {
		sep := seps[int(si)%len(seps)]
		if mark != '.' && mark != ',' {
			mark = 0
		}
		v, _, st := parseThousands(s, mark, sep)
		eff := mark
		switch {
		case eff == 0 && sep == ',':
			eff = '.'
		case eff == 0 && sep == '.':
			eff = ','
		}
		if sep < 0x80 && byte(sep) == eff {
			if st == numOK {
				t.Fatalf("parseThousands(%q, %q, %q) accepted a separator that is the mark", s, mark, sep)
			}
			return
		}
		plain := strings.ReplaceAll(s, string(sep), "")
		w, _, wst := parseNumber(plain, eff)
		if !strings.ContainsRune(s, sep) {
			if st != wst || st == numOK && v != w && !(v != v && w != w) {
				t.Fatalf("parseThousands(%q) = %v, %d; parseNumber gives %v, %d", s, v, st, w, wst)
			}
			return
		}
		if st == numOK && (wst != numOK || v != w) {
			t.Fatalf("parseThousands(%q, %q, %q) = %v; without the separators %q reads %v (status %d)", s, mark, sep, v, plain, w, wst)
		}
	})
}
