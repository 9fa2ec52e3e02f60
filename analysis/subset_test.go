package analysis_test

import (
	"encoding/json"
	"strings"
	"testing"

	"bivar/analysis"
	"bivar/analysis/dataset"
)

// The rows below are invented. The outside check: the study run with
// exclude and where must equal Analyze on the same rows picked by hand
// (the same statistic on the same rows), and the counts are counted by
// hand from the table.
const subsetCSV = `spec,shift,temp,x,y
S-101,night,430,1.0,2.1
S-102,day,430,2.0,3.9
S-103,night,440,3.0,6.2
S-104,night,420,4.0,7.8
S-105,night,450,5.0,10.3
S-106,night,435,6.0,11.7
S-107,,445,7.0,14.4
S-108,night,455,8.0,15.6
S-109,night,460,9.0,18.5
S-110,night,465,10.0,19.9
S-111,night,470,11.0,40.0
S-110,night,475,12.0,23.8
`

const subsetTOML = `[[dataset]]
id = "d"
file = "d.csv"
id_column = "spec"
subset = 'shift == "night"'
exclude = [{ row = "S-111", reason = "specimen cracked in the grips" }]

[[study]]
id = "s"
dataset = "d"
x = "x"
y = "y"
where = "temp >= 425"
exclude = [{ data_row = 9, reason = "thermocouple off" }, { row = "S-110", reason = "retest" }]
`

func TestRunSubsetEqualsHandFiltered(t *testing.T) {
	t.Parallel()
	r, studyErrs, err := runText(t, subsetCSV, subsetTOML)
	if err != nil || studyErrs != "" {
		t.Fatalf("Run: %v %s", err, studyErrs)
	}
	s := r.Studies[0]
	// Left out by hand: S-111 (dataset), data row 9 = S-109 and both S-110
	// rows (study); the subset then drops S-102 (day), S-104 (420) and
	// S-107 (shift missing). Kept: S-101, S-103, S-105, S-106, S-108.
	if s.N != 5 || s.NMissing != 0 {
		t.Errorf("n = %d, n_missing = %d; want 5, 0", s.N, s.NMissing)
	}
	var got []string
	for _, l := range s.LeftOut {
		got = append(got, l.Row+"|"+l.Level+"|"+l.Reason)
	}
	want := []string{"S-109|study|thermocouple off", "S-110|study|retest", "S-111|dataset|specimen cracked in the grips", "S-110|study|retest"}
	if strings.Join(got, ";") != strings.Join(want, ";") {
		t.Errorf("left_out = %v, want %v", got, want)
	}
	if s.LeftOut[1].Shared != 2 {
		t.Errorf("S-110 shared = %d, want 2 (two rows hold that id)", s.LeftOut[1].Shared)
	}
	if s.Subset == nil || s.Subset.Rows != 3 || s.Subset.Expression != `(shift == "night") and (temp >= 425)` ||
		len(s.Subset.Missing) != 1 || s.Subset.Missing[0].Column != "shift" || s.Subset.Missing[0].Count != 1 {
		t.Errorf("subset = %+v, want 3 rows left out (1 missing in shift)", s.Subset)
	}

	keep := []int{0, 2, 4, 5, 7} // data rows 1, 3, 5, 6, 8
	xs := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12}
	ys := []float64{2.1, 3.9, 6.2, 7.8, 10.3, 11.7, 14.4, 15.6, 18.5, 19.9, 40.0, 23.8}
	var in analysis.Input
	in.ID, in.Dataset = "s", "d"
	in.X.Column, in.X.Label, in.Y.Column, in.Y.Label = "x", "x", "y", "y"
	names := []string{"S-101", "S-102", "S-103", "S-104", "S-105", "S-106", "S-107", "S-108", "S-109", "S-110", "S-111", "S-110"}
	var rows []string
	for _, i := range keep {
		in.XS, in.YS = append(in.XS, xs[i]), append(in.YS, ys[i])
		rows = append(rows, names[i])
	}
	in.Rows = dataset.StringsOf(rows)
	cfg := analysis.DefaultConfig()
	h := analysis.Analyze(in, cfg)
	for _, c := range []struct {
		name      string
		got, want any
	}{
		{"pearson", s.Pearson.R, h.Pearson.R},
		{"pearson p", s.Pearson.P, h.Pearson.P},
		{"line", s.Line, h.Line},
		{"spearman", s.Spearman, h.Spearman},
		{"moments", s.Moments, h.Moments},
		{"influence", s.Influence, h.Influence},
	} {
		a, _ := json.Marshal(c.got)
		b, _ := json.Marshal(c.want)
		if string(a) != string(b) {
			t.Errorf("%s: run with exclude/where %s, hand-filtered %s", c.name, a, b)
		}
	}
}

func TestRunSubsetErrors(t *testing.T) {
	t.Parallel()
	base := "[[dataset]]\nid = \"d\"\nfile = \"d.csv\"\nid_column = \"spec\"\n\n[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n"
	cases := []struct{ name, add, want string }{
		{"unknown column with suggestion", "where = 'shfit == \"night\"'\n",
			`m.toml:11:10: column "shfit" in "shfit == \"night\"" is not in dataset "d": did you mean "shift"?`},
		{"number compared with a text column", "where = \"temp > 1 and shift > 2\"\n",
			`m.toml:11:23: column "shift" is compared with a number in "temp > 1 and shift > 2", but it holds text ("night" at data row 1): compare it with a double-quoted string, or correct the cell`},
		{"row that does not exist", "exclude = [{ row = \"S-1O3\", reason = \"typo\" }]\n",
			`m.toml:11:1: study exclude: row = "S-1O3" is not a value of id_column "spec" in dataset "d": did you mean "S-103"?`},
		{"data row beyond the file", "exclude = [{ data_row = 13, reason = \"x\" }]\n",
			`m.toml:11:1: study exclude: data_row = 13, but dataset "d" has 12 data rows (the header not counted): correct the number or remove the entry`},
	}
	for _, c := range cases {
		_, _, err := runText(t, subsetCSV, base+c.add)
		if err == nil {
			t.Errorf("%s: Run gave no error", c.name)
			continue
		}
		msg := err.Error()
		if i := strings.Index(msg, "m.toml:"); i >= 0 {
			msg = msg[i:]
		}
		if msg != c.want {
			t.Errorf("%s:\n got %s\nwant %s", c.name, msg, c.want)
		}
	}
}

func TestRunSubsetTooFew(t *testing.T) {
	t.Parallel()
	toml := "[[dataset]]\nid = \"d\"\nfile = \"d.csv\"\n\n[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\nwhere = \"temp > 460\"\n"
	r, studyErrs, err := runText(t, subsetCSV, toml)
	if err != nil {
		t.Fatal(err)
	}
	// temp > 460 keeps 465, 470 and 475 (3 rows); temp > 465 keeps 2 and
	// leaves 10 out.
	if r.Studies[0].N != 3 || studyErrs != "" {
		t.Fatalf("temp > 460: n = %d, errors %q; want 3 rows and no error", r.Studies[0].N, studyErrs)
	}
	_, studyErrs, err = runText(t, subsetCSV, strings.Replace(toml, "460", "465", 1))
	if err != nil {
		t.Fatal(err)
	}
	// Led by where to fix it, the study's [[study]] header on line 5.
	want := `m.toml:5: in this [[study]]: only 2 complete rows of x "x" and y "y" after the 10 rows left out by exclude or where`
	if !strings.HasPrefix(studyErrs, "s: ") || !strings.Contains(studyErrs, want) {
		t.Errorf("error = %q, want it to start \"s: …/%s\"", studyErrs, want)
	}
	// A constant x, found only once the rows are read, names the line too.
	_, studyErrs, err = runText(t, "x,y\n1,2\n1,3\n1,5\n", "[[dataset]]\nid = \"d\"\nfile = \"d.csv\"\n\n[[study]]\nid = \"c\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n")
	if err != nil {
		t.Fatal(err)
	}
	if want := `m.toml:5: in this [[study]]: x column "x" is constant`; !strings.Contains(studyErrs, want) {
		t.Errorf("constant x: error = %q, want it to hold %q", studyErrs, want)
	}
	// A file of the column names alone says so (it said "only 0 complete
	// rows …: check the columns for missing cells"; found by a sweep of
	// messy inputs).
	_, studyErrs, err = runText(t, "x,y\n", "[[dataset]]\nid = \"d\"\nfile = \"d.csv\"\n\n[[study]]\nid = \"c\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\n")
	if err != nil {
		t.Fatal(err)
	}
	if want := `m.toml:5: in this [[study]]: the dataset has no data rows`; !strings.Contains(studyErrs, want) {
		t.Errorf("header only: error = %q, want it to hold %q", studyErrs, want)
	}
}

func TestRunSubsetNonNumericCounts(t *testing.T) {
	t.Parallel()
	csv := strings.Replace(subsetCSV, "S-104,night,420,4.0,", "S-104,night,420,four,", 1)
	toml := "[[dataset]]\nid = \"d\"\nfile = \"d.csv\"\nnon_numeric = \"missing\"\n\n[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"x\"\ny = \"y\"\nwhere = \"temp >= 425\"\n"
	r, studyErrs, err := runText(t, csv, toml)
	if err != nil || studyErrs != "" {
		t.Fatalf("Run: %v %s", err, studyErrs)
	}
	// S-104 (temp 420) is outside the subset, so its non-numeric x is not
	// the study's: no incomplete row is left, and nothing is counted.
	if s := r.Studies[0]; s.N != 11 || s.NMissing != 0 || len(s.Excluded) != 0 || s.Subset.Rows != 1 {
		t.Errorf("n = %d, n_missing = %d, excluded = %+v, subset rows = %d; want 11, 0, none, 1", s.N, s.NMissing, s.Excluded, s.Subset.Rows)
	}
	r, _, err = runText(t, csv, strings.Replace(toml, "temp >= 425", "temp >= 415", 1))
	if err != nil {
		t.Fatal(err)
	}
	if s := r.Studies[0]; s.N != 11 || s.NMissing != 1 || len(s.Excluded) != 1 || s.Excluded[0].Reason != "missing or non-numeric" {
		t.Errorf("n = %d, n_missing = %d, excluded = %+v; want 11, 1, one \"missing or non-numeric\" in x", s.N, s.NMissing, s.Excluded)
	}
}
