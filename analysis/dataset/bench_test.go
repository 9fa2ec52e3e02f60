package dataset

import (
	"bufio"
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"testing"
)

// writeBench writes an invented file of n rows: a row name, four numeric
// columns (one with a missing cell every 1000 rows) and a group column.
func writeBench(b *testing.B, n int, delim string, decimalComma bool) string {
	b.Helper()
	path := filepath.Join(b.TempDir(), "bench.csv")
	f, err := os.Create(path)
	if err != nil {
		b.Fatal(err)
	}
	w := bufio.NewWriter(f)
	fmt.Fprintf(w, "row%[1]stemp%[1]spressure%[1]shold%[1]sshrink%[1]sgroup\n", delim)
	for i := range n {
		t, p, h, s := fmt.Sprintf("%.2f", 230+float64(i%97)*0.1), fmt.Sprintf("%.1f", 80+float64(i%13)), fmt.Sprint(i%50), fmt.Sprintf("%.4f", 1.2+float64(i%89)*1e-3)
		if decimalComma {
			t, p, s = comma(t), comma(p), comma(s)
		}
		if i%1000 == 999 {
			s = "NA"
		}
		fmt.Fprintf(w, "r%d%s%s%s%s%s%s%s%s%sM%d\n", i, delim, t, delim, p, delim, h, delim, s, delim, i%4)
	}
	if err := w.Flush(); err != nil {
		b.Fatal(err)
	}
	if err := f.Close(); err != nil {
		b.Fatal(err)
	}
	return path
}

func comma(s string) string {
	out := []byte(s)
	for i, c := range out {
		if c == '.' {
			out[i] = ','
		}
	}
	return string(out)
}

func benchmarkRead(b *testing.B, n int, delim string, decimalComma bool) {
	path := writeBench(b, n, delim, decimalComma)
	st, err := os.Stat(path)
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(st.Size())
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		t, err := Read(path, Options{}, []string{"temp", "pressure", "hold", "shrink"}, []string{"row", "group"})
		if err != nil {
			b.Fatal(err)
		}
		if t.Rows != n {
			b.Fatalf("Rows = %d, want %d", t.Rows, n)
		}
	}
}

// Four numeric and two text columns, every row read.
func BenchmarkRead1e3(b *testing.B)             { benchmarkRead(b, 1e3, ",", false) }
func BenchmarkRead1e6(b *testing.B)             { benchmarkRead(b, 1e6, ",", false) }
func BenchmarkRead1e6DecimalComma(b *testing.B) { benchmarkRead(b, 1e6, ";", true) }

// benchmarkFile reads the file nN.csv written by the project's data
// generator (/work/shared/tools/bench/gen_data.py, columns x,y,t) from the
// folder named by BIVAR_BENCH_DATA; it skips when the variable is unset.
func benchmarkFile(b *testing.B, n int) {
	dir := os.Getenv("BIVAR_BENCH_DATA")
	if dir == "" {
		b.Skip("BIVAR_BENCH_DATA is not set: generate files with gen_data.py and name their folder")
	}
	path := filepath.Join(dir, fmt.Sprintf("n%d.csv", n))
	st, err := os.Stat(path)
	if err != nil {
		b.Skip(err)
	}
	b.SetBytes(st.Size())
	b.ReportAllocs()
	cpu := cpuTime()
	for b.Loop() {
		t, err := Read(path, Options{}, []string{"x", "y", "t"}, nil)
		if err != nil {
			b.Fatal(err)
		}
		if t.Rows != n {
			b.Fatalf("Rows = %d, want %d", t.Rows, n)
		}
	}
	// CPU time says more than wall time on a machine shared with other
	// jobs; it includes the benchmark's own small overhead.
	if end := cpuTime(); cpu >= 0 && end >= 0 {
		b.ReportMetric(float64(end-cpu)/float64(b.N), "cpu-ns/op")
	}
}

// Three numeric columns of the generated benchmark data.
func BenchmarkReadFile1e5(b *testing.B) { benchmarkFile(b, 100000) }
func BenchmarkReadFile1e6(b *testing.B) { benchmarkFile(b, 1000000) }

// BenchmarkReadFile1e7 is run once, under /usr/bin/time -v for the peak
// memory, by testdata/read1e7.sh.
func BenchmarkReadFile1e7(b *testing.B) { benchmarkFile(b, 10000000) }

// BenchmarkParseBlock parses one read block of invented rows shaped like
// the generator's (x, y with three decimals, t the run order) on one
// goroutine: the parser's own cost, without reading, hashing or joining.
func BenchmarkParseBlock(b *testing.B) {
	var src []byte
	for i := 1; len(src) < blockSize; i++ {
		src = fmt.Appendf(src, "%.3f,%.3f,%d\n", 5+float64(i%997)*0.013, 3+float64(i%991)*0.007, i)
	}
	src = src[:bytes.LastIndexByte(src, '\n')+1]
	cfg := &config{path: "b.csv", delim: ',', fields: 3, last: 2, byIndex: []int{0, 1, 2},
		cols:    []*column{{name: "x", index: 0, numeric: true}, {name: "y", index: 1, numeric: true}, {name: "t", index: 2, numeric: true}},
		missing: DefaultMissing(), lim: DefaultLimits(), plain: true}
	b.SetBytes(int64(len(src)))
	b.ReportAllocs()
	cpu := cpuTime()
	for b.Loop() {
		p := parseBlock(cfg, src, 2, '.', 0)
		if p.err != nil || p.first != nil {
			b.Fatal(p.err, p.first)
		}
		for _, s := range p.nums {
			putFloats(s)
		}
	}
	if end := cpuTime(); cpu >= 0 && end >= 0 {
		b.ReportMetric(float64(end-cpu)/float64(b.N), "cpu-ns/op")
	}
}
