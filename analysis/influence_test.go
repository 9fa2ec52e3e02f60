package analysis

import (
	"encoding/csv"
	"math"
	"slices"
	"strings"
	"testing"

	"bivar/analysis/findings"
	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// TestFlaggedCSVField: the flagged-rows file is RFC 4180 (read back by
// encoding/csv, Go's reader of that format) whatever the row names hold,
// and a name a spreadsheet would run as a formula is defused (OWASP's
// advice on CSV injection: a leading apostrophe).
func TestFlaggedCSVField(t *testing.T) {
	for _, name := range []string{"S-1", "a,b", `say "hi"`, "two\nlines", "=1+1", "+x", "@cmd", "plain"} {
		line := string(appendCSVField(nil, name)) + ",1\r\n"
		recs, err := csv.NewReader(strings.NewReader(line)).ReadAll()
		if err != nil || len(recs) != 1 || len(recs[0]) != 2 {
			t.Errorf("%q: %q does not read back as one field (%v)", name, line, err)
			continue
		}
		want := name
		if strings.ContainsAny(name[:1], "=+-@") {
			want = "'" + name
		}
		if recs[0][0] != want {
			t.Errorf("%q read back as %q, want %q", name, recs[0][0], want)
		}
	}
}

// TestInfluenceCountsAndTies: every flagged row is counted once as suspect
// or as high leverage only; no row is named when named_rows is 0; and of
// two suspect rows with the same values the one named first is decided by
// the names, not by the rows' order in the file.
func TestInfluenceCountsAndTies(t *testing.T) {
	const n = 400
	x, y := make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = float64(i%40) / 4
		y[i] = 2 + 0.5*x[i] + 0.3*math.Sin(float64(i))
	}
	// Two identical far-off rows (the same values, other names) and one
	// far out in x on the line.
	x[10], y[10] = 5, 40
	x[300], y[300] = 5, 40
	x[200], y[200] = 60, 2+0.5*60
	run := func(x, y []float64, name func(int) string, named, fileMax int) (*report.Influence, []byte) {
		line, err := stats.Line(x, y, 0.95)
		if err != nil {
			t.Fatal(err)
		}
		in, _, csvb := influence(x, y, name, findings.DefaultThresholds(), named, fileMax, 0.95, stats.CentredMoments(x, y), stats.Pearson(x, y, 0.95), line)
		return in, csvb
	}
	name := func(j int) string {
		switch j {
		case 10:
			return "U-B"
		case 300:
			return "U-A"
		}
		return "row" + strings.Repeat("x", j%3)
	}
	in, csvb := run(x, y, name, 25, FlaggedFileMax)
	c := in.Counts
	if c.Flagged != c.Suspect+c.LeverageOnly || c.Named != len(in.Points) || c.Suspect < 2 {
		t.Errorf("counts %+v", c)
	}
	if in.Points[0].Row != "U-A" || in.Points[1].Row != "U-B" {
		t.Errorf("named %s, %s first; want U-A then U-B (same values: by name)", in.Points[0].Row, in.Points[1].Row)
	}
	// The same rows in another order: the same names first.
	rx, ry := slices.Clone(x), slices.Clone(y)
	rx[10], ry[10], rx[300], ry[300] = x[300], y[300], x[10], y[10]
	swapped := func(j int) string {
		switch j {
		case 10:
			return "U-A"
		case 300:
			return "U-B"
		}
		return name(j)
	}
	in2, _ := run(rx, ry, swapped, 25, FlaggedFileMax)
	if in2.Points[0].Row != "U-A" {
		t.Errorf("after reordering the rows, %s is named first; want U-A", in2.Points[0].Row)
	}
	// The CSV lists the suspect rows, not the row only of high leverage
	// (row 200, far out in x on the line: good data, counted).
	if c.LeverageOnly < 1 {
		t.Errorf("counts %+v: want row 200 counted as high leverage only", c)
	}
	recs, err := csv.NewReader(strings.NewReader(string(csvb))).ReadAll()
	if err != nil || len(recs) != c.Suspect+1 || in.FileRows != c.Suspect {
		t.Errorf("flagged CSV: %d records (%v), file_rows %d, want a header and %d rows", len(recs), err, in.FileRows, c.Suspect)
	}
	for k, rec := range recs[1:] {
		if !strings.Contains(rec[3], "outlier") && !strings.Contains(rec[3], "influential") && !strings.Contains(rec[3], "sole-support") {
			t.Errorf("CSV row %d (%s) flagged %q: want only rows flagged outlier, influential or sole support", k+1, rec[0], rec[3])
		}
		if rec[1] == "60" {
			t.Errorf("CSV lists row 200 (x = 60, on the line), which is of high leverage only")
		}
	}
	// A cap of one row keeps the first by the ranking, the first named.
	one, oneb := run(x, y, name, 25, 1)
	recs, err = csv.NewReader(strings.NewReader(string(oneb))).ReadAll()
	if err != nil || len(recs) != 2 || one.FileRows != 1 || recs[1][0] != one.Points[0].Row || recs[1][12] != "1" {
		t.Errorf("file cap 1: %d records (%v), file_rows %d; want the header and the first named row %s", len(recs), err, one.FileRows, one.Points[0].Row)
	}
	if none, _ := run(x, y, name, 0, FlaggedFileMax); len(none.Points) != 0 || none.Counts.Suspect != c.Suspect {
		t.Errorf("named_rows 0: %d named, %d suspect; want none named and the same counts", len(none.Points), none.Counts.Suspect)
	}
}
