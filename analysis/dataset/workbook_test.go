package dataset

import (
	"archive/zip"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"
)

// writeBook writes a workbook with excelize: the sheets in order, each a
// grid of cell values from A1 (nil leaves a cell empty).
func writeBook(t *testing.T, sheets []string, grids [][][]any, edit func(f *excelize.File)) string {
	t.Helper()
	f := excelize.NewFile()
	for i, name := range sheets {
		if i == 0 {
			if err := f.SetSheetName("Sheet1", name); err != nil {
				t.Fatal(err)
			}
		} else if _, err := f.NewSheet(name); err != nil {
			t.Fatal(err)
		}
		for r, row := range grids[i] {
			for c, v := range row {
				if v == nil {
					continue
				}
				if err := f.SetCellValue(name, cellRef(c, r+1), v); err != nil {
					t.Fatal(err)
				}
			}
		}
	}
	if edit != nil {
		edit(f)
	}
	path := filepath.Join(t.TempDir(), "book.xlsx")
	if err := f.SaveAs(path); err != nil {
		t.Fatal(err)
	}
	return path
}

func closeFloats(a, b []float64, tol float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if math.IsNaN(a[i]) != math.IsNaN(b[i]) || !math.IsNaN(a[i]) && math.Abs(a[i]-b[i]) > tol {
			return false
		}
	}
	return true
}

// Independent writer 1: openpyxl (testdata/make-workbooks.py). The values
// the script gave openpyxl are in the CSV beside it, read by Read; the
// workbook must read as the same numbers (dates as Excel serial days,
// which Python computed itself; a tolerance of 1e-9 days, 86 µs, allows
// openpyxl's rounding of times to the millisecond).
func TestReadWorkbookOpenpyxl(t *testing.T) {
	t.Parallel()
	book := filepath.Join("testdata", "openpyxl-line7.xlsx")
	num := []string{"poured", "melt_temp", "hardness", "hardness (2)"}
	got, err := ReadWorkbook(book, SheetRef{Name: "October"}, 2, Options{}, num, []string{"lot"})
	if err != nil {
		t.Fatal(err)
	}
	want, err := Read(filepath.Join("testdata", "openpyxl-line7.csv"), Options{}, num, []string{"lot"})
	if err != nil {
		t.Fatal(err)
	}
	if got.Rows != want.Rows || got.Rows != 10 {
		t.Fatalf("rows = %d, want %d (the styled empty row after the data is not a row)", got.Rows, want.Rows)
	}
	for _, c := range num {
		tol := 0.0
		if c == "poured" {
			tol = 1e-9
		}
		if !closeFloats(got.Numeric[c], want.Numeric[c], tol) {
			t.Errorf("column %q = %v, want %v", c, got.Numeric[c], want.Numeric[c])
		}
		if got.Missing[c] != want.Missing[c] {
			t.Errorf("column %q: %d missing, want %d", c, got.Missing[c], want.Missing[c])
		}
	}
	if strings.Join(got.Text["lot"].Slice(), ",") != strings.Join(want.Text["lot"].Slice(), ",") {
		t.Errorf("lot = %v, want %v", got.Text["lot"], want.Text["lot"])
	}
	if got.CellErrors["melt_temp"]["#DIV/0!"] != 1 || got.CellErrors["hardness"]["#N/A"] != 2 || len(got.CellErrors["hardness (2)"]) != 0 {
		t.Errorf("cell errors = %v, want melt_temp #DIV/0! 1, hardness #N/A 2, none in hardness (2) (its formula is uncalculated, so empty)", got.CellErrors)
	}
	b, _ := os.ReadFile(book)
	sum := sha256.Sum256(b)
	if got.SHA256 != hex.EncodeToString(sum[:]) || got.Sheet != "October" || got.HeaderRow != 2 {
		t.Errorf("sha %s sheet %q header row %d, want the file's hash, October, 2", got.SHA256, got.Sheet, got.HeaderRow)
	}
	// By number: the second sheet; the header row found as the first
	// non-empty row is row 1 (lot, the title), so header_row matters.
	byNum, err := ReadWorkbook(book, SheetRef{Number: 2}, 2, Options{}, num[:1], nil)
	if err != nil || !closeFloats(byNum.Numeric["poured"], want.Numeric["poured"], 1e-9) {
		t.Errorf("sheet 2 read %v (error %v), want the October sheet's poured column", byNum, err)
	}
	h, err := WorkbookHeader(book, SheetRef{Name: "October"}, 0, nil)
	if err != nil || h[0] != "lot" || h[1] != "Line 7 castings, October (invented)" || h[2] != "Line 7 castings, October (invented) (2)" {
		t.Errorf("header of row 1 = %q, %v; want lot, then the title merged over B..E named with (2), (3), …", h, err)
	}
}

// Independent writer 2: SpreadsheetML written by hand (make-workbooks.py),
// with formulas whose values are cached beside them and cells of error
// type. The cached values are the quotients written in the script.
func TestReadWorkbookHandmade(t *testing.T) {
	t.Parallel()
	got, err := ReadWorkbook(filepath.Join("testdata", "handmade-cached.xlsx"), SheetRef{}, 0, Options{}, []string{"x", "y", "ratio"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	nan := math.NaN()
	for c, want := range map[string][]float64{
		"x":     {1, 2, 0, 3, 4},
		"y":     {2.5, 4.75, 1, nan, 8.25},
		"ratio": {2.5, 2.375, nan, nan, 2.0625},
	} {
		if !closeFloats(got.Numeric[c], want, 0) {
			t.Errorf("%s = %v, want %v", c, got.Numeric[c], want)
		}
	}
	if e := got.CellErrors; e["ratio"]["#DIV/0!"] != 1 || e["ratio"]["#VALUE!"] != 1 || e["y"]["#VALUE!"] != 1 || got.Missing["ratio"] != 2 {
		t.Errorf("cell errors %v, missing %v; want ratio: #DIV/0! 1, #VALUE! 1 (2 missing); y: #VALUE! 1", e, got.Missing)
	}
}

// Workbooks written by excelize in the test: numbers, times, a formula
// with its cached value, error texts, merged header cells, blank rows
// after the data, and each failure's message.
func TestReadWorkbookExcelize(t *testing.T) {
	t.Parallel()
	t0 := time.Date(2026, 10, 1, 6, 0, 0, 0, time.UTC)
	grid := [][]any{
		{"Line 7", nil, nil},
		{"run", "temp", nil},
		{"", "", "hardness"},
		{1, 1401.5, 250.25},
		{2, "#DIV/0!", 251},
		{3, 1402, nil},
		{4, 1403.25, "#N/A"},
		{t0, 1404, 252.5},
	}
	path := writeBook(t, []string{"Runs", "Empty"}, [][][]any{grid, {}}, func(f *excelize.File) {
		// "run" and "temp" are merged down over rows 2–3; row 3 is the header.
		for _, r := range []string{"A2:A3", "B2:B3"} {
			if err := f.MergeCell("Runs", r[:2], r[3:]); err != nil {
				t.Fatal(err)
			}
		}
		// C6 holds a formula whose value excelize caches (the 1402 is set first).
		if err := f.SetCellValue("Runs", "C6", 253.75); err != nil {
			t.Fatal(err)
		}
		if err := f.SetCellFormula("Runs", "C6", "C5+2.75"); err != nil {
			t.Fatal(err)
		}
		// A formatted but empty row after the data.
		st, _ := f.NewStyle(&excelize.Style{NumFmt: 2})
		if err := f.SetCellStyle("Runs", "A12", "C12", st); err != nil {
			t.Fatal(err)
		}
	})
	tb, err := ReadWorkbook(path, SheetRef{Name: "Runs"}, 3, Options{}, []string{"run", "temp", "hardness"}, nil)
	if err != nil {
		t.Fatal(err)
	}
	// excelize stores a time as its serial day count: 2026-10-01 06:00 UTC
	// is 46296 + 6/24 days after 1899-12-30 (46296 days: 126 years of
	// 365 days plus 31 leap days, 1900 not one, to 2025-12-30, then 275).
	days := t0.Sub(time.Date(1899, 12, 30, 0, 0, 0, 0, time.UTC)).Hours() / 24
	nan := math.NaN()
	for c, want := range map[string][]float64{
		"run":      {1, 2, 3, 4, days},
		"temp":     {1401.5, nan, 1402, 1403.25, 1404},
		"hardness": {250.25, 251, 253.75, nan, 252.5},
	} {
		if !closeFloats(tb.Numeric[c], want, 1e-9) {
			t.Errorf("%s = %v, want %v", c, tb.Numeric[c], want)
		}
	}
	if tb.Rows != 5 || tb.Missing["temp"] != 1 || tb.CellErrors["hardness"]["#N/A"] != 1 {
		t.Errorf("rows %d, missing %v, errors %v", tb.Rows, tb.Missing, tb.CellErrors)
	}

	bad := writeBook(t, []string{"S"}, [][][]any{{{"x", "y"}, {1, 2}, {2, "3 mm"}, {3, "n/a"}}}, nil)
	notZip := filepath.Join(t.TempDir(), "export.xlsx")
	if err := os.WriteFile(notZip, []byte("x,y\n1,2\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	// A workbook cut off after its first 5000 bytes.
	whole, err := os.ReadFile(bad)
	if err != nil {
		t.Fatal(err)
	}
	cut := filepath.Join(t.TempDir(), "cut.xlsx")
	if err := os.WriteFile(cut, whole[:min(len(whole)/2, 5000)], 0o644); err != nil {
		t.Fatal(err)
	}
	// An encrypted workbook is an OLE compound file (MS-OFFCRYPTO §2.1;
	// its signature from MS-CFB §2.2).
	ole := filepath.Join(t.TempDir(), "locked.xlsx")
	if err := os.WriteFile(ole, append([]byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1}, make([]byte, 504)...), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name, path string
		ref        SheetRef
		header     int
		opts       Options
		want       string
	}{
		{"non-numeric", bad, SheetRef{}, 1, Options{}, `sheet "S", cell B3: column "y": "3 mm" is not a number; correct the cell`},
		{"non-numeric count", bad, SheetRef{}, 1, Options{}, `(1 more such cells in this column)`},
		{"no sheet", bad, SheetRef{Name: "s"}, 1, Options{}, `no sheet "s" (did you mean "S"? names must match exactly); the sheets are "S"`},
		{"sheet number", bad, SheetRef{Number: 3}, 1, Options{}, `sheet = 3, but the workbook has 1 sheet(s) ("S"): give a number from 1 to 1, or a name`},
		{"header row", bad, SheetRef{}, 9, Options{}, `sheet "S": header_row = 9, but the sheet's last non-empty row is 4`},
		{"no column", bad, SheetRef{}, 1, Options{}, ""},
		{"empty sheet", path, SheetRef{Name: "Empty"}, 0, Options{}, `sheet "Empty": the sheet is empty`},
		{"not a zip", notZip, SheetRef{}, 0, Options{}, `it is not an .xlsx file (an .xlsx file is a zip archive)`},
		{"cut off", cut, SheetRef{}, 0, Options{}, `the zip archive it is made of is damaged or cut off`},
		{"encrypted", ole, SheetRef{}, 0, Options{}, `a password-protected (encrypted) workbook or an older .xls file`},
		{"too large", bad, SheetRef{}, 1, Options{Limits: &Limits{MaxBytes: 100, MaxRows: 10, MaxLevels: 10}}, `more than the limit of 100 bytes: check`},
		{"too many rows", bad, SheetRef{}, 1, Options{Limits: &Limits{MaxBytes: 1 << 20, MaxRows: 2, MaxLevels: 10}}, `the sheet has 3 data rows, more than the limit of 2`},
	} {
		cols := []string{"x", "y"}
		if tc.name == "no column" {
			cols = []string{"yy"}
			tc.want = `no column "yy" (did you mean "y"?); the header (row 1) has "x", "y"`
		}
		_, err := ReadWorkbook(tc.path, tc.ref, tc.header, tc.opts, cols, nil)
		var e *Error
		if !errors.As(err, &e) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want a *dataset.Error containing %q", tc.name, err, tc.want)
		}
	}
	tb, err = ReadWorkbook(bad, SheetRef{}, 1, Options{NonNumericAsMissing: true}, []string{"y"}, nil)
	if err != nil || tb.NonNumeric["y"] != 2 {
		t.Errorf("non_numeric = missing: %v, %v", tb, err)
	}
}

// BenchmarkReadWorkbook1e4 reads two numeric columns of a 10⁴-row sheet
// written by excelize (normal x, y = 2x + noise, seeded).
func BenchmarkReadWorkbook1e4(b *testing.B) {
	f := excelize.NewFile()
	sw, err := f.NewStreamWriter("Sheet1")
	if err != nil {
		b.Fatal(err)
	}
	if err := sw.SetRow("A1", []any{"x", "y", "lot"}); err != nil {
		b.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(1, 2))
	for i := range 10_000 {
		x := rng.NormFloat64()
		if err := sw.SetRow(cellRef(0, i+2), []any{x, 2*x + rng.NormFloat64(), "L" + strconv.Itoa(i%7)}); err != nil {
			b.Fatal(err)
		}
	}
	if err := sw.Flush(); err != nil {
		b.Fatal(err)
	}
	path := filepath.Join(b.TempDir(), "bench.xlsx")
	if err := f.SaveAs(path); err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := ReadWorkbook(path, SheetRef{}, 0, Options{Groups: []string{"lot"}}, []string{"x", "y"}, []string{"lot"}); err != nil {
			b.Fatal(err)
		}
	}
}

// cellRef names cells as excelize's CoordinatesToCellName does (the
// reference library of these tests), and as R…C… where excelize refuses.
func TestCellRefAsExcelize(t *testing.T) {
	for _, col := range []int{0, 1, 24, 25, 26, 27, 51, 52, 701, 702, 703, 18277, 16382, 16383, 16384, -1} {
		for _, row := range []int{0, 1, 2, 99, 1048576, 1048577} {
			want, err := excelize.CoordinatesToCellName(col+1, row)
			if err != nil {
				want = fmt.Sprintf("R%dC%d", row, col+1)
			}
			if got := cellRef(col, row); got != want {
				t.Errorf("cellRef(%d, %d) = %q, want %q", col, row, got, want)
			}
		}
	}
}

// Text cells in a numeric column read by the rules of a CSV cell. The
// cells are stored as text (excelize writes a Go string as a shared
// string); openpyxl 3.0.9 (load_workbook(path, data_only=True)) reads each
// back as that Python str, and Python's float() refuses "0x1p3" and
// "Inf". strconv.ParseFloat, which read such cells before, took "0x1p3"
// as the hexadecimal float 8 and reported "1e400" as not a number rather
// than out of range.
func TestReadWorkbookTextNumbers(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		cell string
		want float64 // NaN: not a number
		msg  string  // part of the error when not a number
	}{
		{" 7 ", 7, ""},
		{".5", 0.5, ""},
		{"+5", 5, ""},
		{"-2.5E-3", -0.0025, ""},
		{"0x1p3", math.NaN(), `"0x1p3" is not a number`},
		{"0X10P0", math.NaN(), `"0X10P0" is not a number`},
		{"Inf", math.NaN(), `"Inf" is not a number`},
		{"1e400", math.NaN(), `"1e400" is out of range`},
		{"\u22125", math.NaN(), `"−5" is not a number: it starts with U+2212`},
		{"1,5", math.NaN(), `"1,5" is not a number: it is text holding a number written with a comma`},
		{"NULL", math.NaN(), `"NULL" is not a number: it is how database exports write a missing value (NULL)`},
		{"nan", math.NaN(), `"nan" is not a number: bivar reads no NaN or infinite value as a number`},
		{"\uff15", math.NaN(), `"５" is not a number: it has digits other than the ASCII 0 to 9`},
	} {
		path := writeBook(t, []string{"S"}, [][][]any{{{"x"}, {1.0}, {tc.cell}}}, nil)
		tb, err := ReadWorkbook(path, SheetRef{}, 0, Options{}, []string{"x"}, nil)
		if math.IsNaN(tc.want) {
			if err == nil || !strings.Contains(err.Error(), tc.msg) || !strings.Contains(err.Error(), "cell A3") {
				t.Errorf("%q: got %v, want an error at cell A3 containing %q", tc.cell, err, tc.msg)
			}
			tb, err = ReadWorkbook(path, SheetRef{}, 0, Options{NonNumericAsMissing: true}, []string{"x"}, nil)
			if err != nil || tb.NonNumeric["x"] != 1 || !math.IsNaN(tb.Numeric["x"][1]) {
				t.Errorf("%q with non_numeric = missing: %v, %v", tc.cell, tb, err)
			}
			continue
		}
		if err != nil || tb.Numeric["x"][1] != tc.want {
			t.Errorf("%q: got %v, %v; want %v", tc.cell, tb, err, tc.want)
		}
	}
}

// A hidden first sheet (state="hidden", ECMA-376 Part 1 §18.2.19; excelize
// SetSheetVisible(name, false) writes it) is not the default: the default
// is the first sheet whose tab shows. Read before without a word, such a
// sheet (an earlier copy of the data) gave another study than the sheet
// in front of its author. Named or numbered, it is read.
func TestReadWorkbookHiddenSheet(t *testing.T) {
	t.Parallel()
	old := [][]any{{"x", "y"}, {1, 100}, {2, 99}, {3, 98}}
	cur := [][]any{{"x", "y"}, {1, 2}, {2, 4}, {3, 6}}
	path := writeBook(t, []string{"Old", "Current"}, [][][]any{old, cur}, func(f *excelize.File) {
		f.SetActiveSheet(1)
		if err := f.SetSheetVisible("Old", false); err != nil {
			t.Fatal(err)
		}
	})
	for _, tc := range []struct {
		ref   SheetRef
		sheet string
		y0    float64
	}{
		{SheetRef{}, "Current", 2},
		{SheetRef{Name: "Old"}, "Old", 100},
		{SheetRef{Number: 1}, "Old", 100},
		{SheetRef{Number: 2}, "Current", 2},
	} {
		tb, err := ReadWorkbook(path, tc.ref, 0, Options{}, []string{"x", "y"}, nil)
		if err != nil || tb.Sheet != tc.sheet || tb.Numeric["y"][0] != tc.y0 {
			t.Errorf("%+v: got %v, %v; want sheet %q with y[0] = %v", tc.ref, tb, err, tc.sheet, tc.y0)
		}
	}
}

// Date cells stored as ISO 8601 text (t="d", ECMA-376 Part 1 §18.17.4;
// openpyxl writes them with Workbook(iso_dates=True)) read as the serial
// numbers a number cell holding them stores, in the workbook's date
// system. They were "not a number" before. Expected values: openpyxl
// 3.0.9, load_workbook(path, data_only=True) of the same parts, then
// openpyxl.utils.datetime.to_excel(value, wb.epoch) of each cell.
func TestReadWorkbookISODates(t *testing.T) {
	t.Parallel()
	cells := []string{"2026-10-01T08:30:00", "2026-10-01", "08:30:00", "1900-02-28T12:00:00", "1900-03-01",
		"2026-10-01T08:30:00.5", "2026-10-01T08:30:00Z", "1899-12-29T18:00:00"}
	sheet := `<sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>x</t></is></c></row>`
	for i, c := range cells {
		sheet += fmt.Sprintf(`<row r="%d"><c r="A%[1]d" t="d"><v>%s</v></c></row>`, i+2, c)
	}
	sheet += `</sheetData></worksheet>`
	for _, tc := range []struct {
		pr   string
		want []float64
	}{
		{"", []float64{46296.354166666664, 46296.0, 0.3541666666666667, 59.5, 61.0, 46296.354172453706, 46296.354166666664, -0.25}},
		{`<workbookPr date1904="1"/>`, []float64{44834.354166666664, 44834.0, 0.3541666666666667, -1401.5, -1401.0, 44834.354172453706, 44834.354166666664, -1462.25}},
	} {
		path := zipParts(t, map[string]string{
			"_rels/.rels": `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
				`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/></Relationships>`,
			"xl/_rels/workbook.xml.rels": `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
				`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/></Relationships>`,
			"xl/workbook.xml": `<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" ` +
				`xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships">` + tc.pr + `<sheets><sheet name="S" sheetId="1" r:id="rId1"/></sheets></workbook>`,
			"xl/worksheets/sheet1.xml": `<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">` + sheet,
		})
		tb, err := ReadWorkbook(path, SheetRef{}, 0, Options{}, []string{"x"}, []string{"x"})
		if err != nil {
			t.Fatalf("%s: %v", tc.pr, err)
		}
		// Python's float repr reads back as the same double: equal to the
		// last bit.
		if !closeFloats(tb.Numeric["x"], tc.want, 0) {
			t.Errorf("%s: got %v, want %v", tc.pr, tb.Numeric["x"], tc.want)
		}
		// As text (a row name, a group), the cell keeps what it shows.
		if got := tb.Text["x"].At(0); got != cells[0] {
			t.Errorf("%s: text %q, want %q", tc.pr, got, cells[0])
		}
	}
	// A date cell whose text is no date is not a number, named by cell.
	path := handBook(t, `<sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>x</t></is></c></row><row r="2"><c r="A2" t="d"><v>2026-13-01</v></c></row></sheetData></worksheet>`, "", false)
	if _, err := ReadWorkbook(path, SheetRef{}, 0, Options{}, []string{"x"}, nil); err == nil || !strings.Contains(err.Error(), `cell A2: column "x": "2026-13-01" is not a number`) {
		t.Errorf("month 13: got %v", err)
	}
}

// A chart sheet (ECMA-376 Part 1 §12.3.2, written by excelize's
// AddChartSheet) holds no cells: as the first tab it is not the default,
// and named it is refused as what it is, with the worksheets to choose
// from; the message called the workbook damaged and told the user to
// save it again.
func TestReadWorkbookChartSheet(t *testing.T) {
	t.Parallel()
	data := [][]any{{"x", "y"}, {1, 3}, {2, 6}, {3, 9}}
	path := writeBook(t, []string{"Data"}, [][][]any{data}, func(f *excelize.File) {
		err := f.AddChartSheet("Chart", &excelize.Chart{Type: excelize.Line,
			Series: []excelize.ChartSeries{{Name: "Data!$B$1", Categories: "Data!$A$2:$A$4", Values: "Data!$B$2:$B$4"}}})
		if err != nil {
			t.Fatal(err)
		}
	})
	// Put the chart sheet's tab first (excelize's MoveSheet panics on a
	// chart sheet): swap the two sheet elements of the workbook part.
	zr, err := zip.OpenReader(path)
	must(t, err)
	parts := map[string]string{}
	for _, f := range zr.File {
		rc, err := f.Open()
		must(t, err)
		b, err := io.ReadAll(rc)
		must(t, err)
		parts[f.Name] = string(b)
	}
	must(t, zr.Close())
	wb := parts["xl/workbook.xml"]
	i, j := strings.Index(wb, `<sheet name="Data"`), strings.Index(wb, `<sheet name="Chart"`)
	if i < 0 || j < i {
		t.Fatalf("workbook part: %s", wb)
	}
	end := strings.Index(wb[j:], "</sheet>")
	if end < 0 {
		t.Fatalf("workbook part: %s", wb)
	}
	dataEl, chartEl := wb[i:j], wb[j:j+end+len("</sheet>")]
	parts["xl/workbook.xml"] = wb[:i] + chartEl + dataEl + wb[j+len(chartEl):]
	path = zipParts(t, parts)
	w, err := OpenWorkbook(path, nil)
	if err != nil || !slices.Equal(w.Sheets(), []string{"Chart", "Data"}) {
		t.Fatalf("sheets %v, %v; want the chart sheet first", w, err)
	}
	if tb, err := w.Read(SheetRef{}, 0, Options{}, []string{"x", "y"}, nil); err != nil || tb.Sheet != "Data" || tb.Numeric["y"][2] != 9 {
		t.Errorf("default sheet: got %v, %v; want Data", tb, err)
	}
	_, err = w.Read(SheetRef{Number: 1}, 0, Options{}, []string{"x", "y"}, nil)
	if want := `sheet "Chart": the sheet is a chart sheet, which holds no cells: set sheet to a worksheet (the workbook's are "Data")`; err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("sheet = 1: got %v, want %q", err, want)
	}
}
