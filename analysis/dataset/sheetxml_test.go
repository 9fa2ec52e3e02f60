package dataset

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"maps"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"
)

// excelizeRows reads every row of a sheet with excelize's row iterator
// (RawCellValue), the reference for sheetPackage.rows: a general-purpose
// library reading the same file.
func excelizeRows(t *testing.T, path, sheet string) [][]string {
	t.Helper()
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	it, err := f.Rows(sheet)
	if err != nil {
		t.Fatal(err)
	}
	var rows [][]string
	for it.Next() {
		r, err := it.Columns(excelize.Options{RawCellValue: true})
		if err != nil {
			t.Fatal(err)
		}
		rows = append(rows, r)
	}
	if err := it.Close(); err != nil {
		t.Fatal(err)
	}
	return rows
}

// ourRows reads every row of a sheet with sheetPackage.rows, laid out as
// excelize lays them out: one entry per row up to the last row element,
// each row's cells up to its last non-empty one.
func ourRows(t *testing.T, path, sheet string) (rows [][]string, merges []string) {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	p, err := openSheetPackage(data, 1<<40)
	if err != nil {
		t.Fatal(err)
	}
	part, ok := p.sheets[sheet]
	if !ok {
		t.Fatalf("%s: no part for sheet %q (%v)", path, sheet, p.sheets)
	}
	err = p.rows(part, func(row int, cells []sheetCell) (bool, error) {
		for len(rows) < row {
			rows = append(rows, nil)
		}
		var r []string
		for _, c := range cells {
			if len(c.v) == 0 {
				continue
			}
			for len(r) < c.col {
				r = append(r, "")
			}
			r = append(r, string(c.v))
		}
		rows[row-1] = r
		return false, nil
	})
	if err != nil {
		t.Fatal(err)
	}
	ms, err := p.mergeRefs(part)
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range ms {
		merges = append(merges, cellRef(int(m.c1), int(m.r1))+":"+cellRef(int(m.c2), int(m.r2)))
	}
	return rows, merges
}

// sameSheet compares both readings of every sheet of a workbook, cell by
// cell, and the merged ranges with excelize's GetMergeCells.
func sameSheet(t *testing.T, path string) {
	t.Helper()
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	w, err := OpenWorkbook(path, nil)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := w.Sheets(), f.GetSheetList(); !slices.Equal(got, want) {
		t.Errorf("%s: sheets %q, excelize lists %q", path, got, want)
	}
	for _, sheet := range f.GetSheetList() {
		want := excelizeRows(t, path, sheet)
		got, merges := ourRows(t, path, sheet)
		// excelize yields no row after the last row element with a cell.
		for len(got) > 0 && len(got[len(got)-1]) == 0 && len(got) > len(want) {
			got = got[:len(got)-1]
		}
		if len(got) != len(want) {
			t.Errorf("%s, sheet %q: %d rows, excelize reads %d", path, sheet, len(got), len(want))
		}
		for i := range min(len(got), len(want)) {
			// excelize keeps a formula cell without a cached value as "",
			// even last in its row; both read it as blank.
			for len(want[i]) > len(got[i]) && want[i][len(want[i])-1] == "" {
				want[i] = want[i][:len(want[i])-1]
			}
			if !slices.Equal(got[i], want[i]) {
				t.Errorf("%s, sheet %q, row %d: %q, excelize reads %q", path, sheet, i+1, got[i], want[i])
			}
		}
		mc, err := f.GetMergeCells(sheet)
		if err != nil {
			t.Fatal(err)
		}
		var wantMerges []string
		for _, m := range mc {
			wantMerges = append(wantMerges, m.GetStartAxis()+":"+m.GetEndAxis())
		}
		if !slices.Equal(merges, wantMerges) {
			t.Errorf("%s, sheet %q: merged ranges %q, excelize reads %q", path, sheet, merges, wantMerges)
		}
	}
}

// TestSheetCellsAsExcelize reads the committed workbooks of other writers
// (openpyxl 3.0.9 and hand-written SpreadsheetML, see testdata/README.md)
// and workbooks excelize writes here, with text that needs escaping
// (&, <, quotes, line ends, characters outside the BMP, ST_Xstring's
// _xHHHH_), rich text in the shared strings, booleans, formulas with
// cached values of each type, error cells, gaps between rows and
// columns, merged ranges and a sheet long enough to cross the scanner's
// buffers; every cell must read as excelize reads it.
func TestSheetCellsAsExcelize(t *testing.T) {
	t.Parallel()
	for _, p := range []string{"openpyxl-line7.xlsx", "handmade-cached.xlsx"} {
		sameSheet(t, filepath.Join("testdata", p))
	}

	texts := []string{"a & b", "<tag>", `say "so"`, "it's", "two\nlines", "crlf\r\nend", " padded ", "µm²", "😀 emoji",
		"_x000D_ literal", "under_x005F_score", "tab\there", "]]>", "&amp; literal"}
	path := writeBook(t, []string{"Mixed", "Long", "Blank"}, [][][]any{
		{{"name", "value", "flag"}, {texts[0], 1.5, true}, {texts[1], -2e-300, false}},
		nil, {}}, func(f *excelize.File) {
		for i, s := range texts {
			r := i + 4
			must(t, f.SetCellValue("Mixed", cellRef(0, r), s))
			must(t, f.SetCellValue("Mixed", cellRef(3, r), float64(i)*1.25))
			must(t, f.SetCellValue("Mixed", cellRef(7, r), i)) // a gap of columns
		}
		must(t, f.SetCellValue("Mixed", "A30", time.Date(2026, 10, 1, 6, 30, 0, 0, time.UTC)))
		must(t, f.SetCellValue("Mixed", "B30", 17)) // a gap of rows before
		must(t, f.SetCellFormula("Mixed", "C30", "B30*2"))
		must(t, f.SetCellFormula("Mixed", "D30", `"text"&"formula"`))
		must(t, f.SetCellRichText("Mixed", "E30", []excelize.RichTextRun{{Text: "rich "}, {Text: "text", Font: &excelize.Font{Bold: true}}}))
		must(t, f.SetCellStr("Mixed", "F30", "#DIV/0!"))
		must(t, f.MergeCell("Mixed", "A1", "A2"))
		must(t, f.MergeCell("Mixed", "F4", "H6"))
		sw, err := f.NewStreamWriter("Long")
		must(t, err)
		for r := 1; r <= 30000; r++ {
			row := []any{r, float64(r) / 7, fmt.Sprintf("lot %d & <%d>", r%13, r%5)}
			if r%1000 == 0 {
				row = append(row, strings.Repeat("long text ", 2000)) // 20 000 characters
			}
			must(t, sw.SetRow(cellRef(0, r), row))
		}
		must(t, sw.MergeCell("D1", "E1"))
		must(t, sw.Flush())
	})
	sameSheet(t, path)
}

func must(t *testing.T, err error) {
	t.Helper()
	if err != nil {
		t.Fatal(err)
	}
}

// TestSheetPrefixedNames reads a hand-made package whose parts use
// namespace prefixes (x:row, x:c, as some writers emit), an absolute
// relationship target, an inline string, a comment and a CDATA section,
// and checks each cell against the values written out here by hand
// (excelize looks for the shared strings only at xl/sharedStrings.xml, so
// it is no reference for this package).
func TestSheetPrefixedNames(t *testing.T) {
	t.Parallel()
	const ns = `xmlns:x="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"`
	parts := map[string]string{
		"[Content_Types].xml": `<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">` +
			`<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/>` +
			`<Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>` +
			`<Override PartName="/xl/worksheets/data.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>` +
			`<Override PartName="/xl/strings.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"/></Types>`,
		"_rels/.rels": `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
			`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/></Relationships>`,
		"xl/_rels/workbook.xml.rels": `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
			`<Relationship Id="rId7" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="/xl/worksheets/data.xml"/>` +
			`<Relationship Id="rId8" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/sharedStrings" Target="strings.xml"/></Relationships>`,
		"xl/workbook.xml": `<?xml version="1.0" encoding="UTF-8"?><x:workbook ` + ns + `><x:sheets><x:sheet name="Run 1" sheetId="1" r:id="rId7"/></x:sheets></x:workbook>`,
		"xl/strings.xml": `<?xml version="1.0" encoding="UTF-8"?><x:sst ` + ns + ` count="3" uniqueCount="3">` +
			`<x:si><x:t>temp</x:t></x:si><x:si><x:r><x:t xml:space="preserve">hard </x:t></x:r><x:r><x:rPr><x:b/></x:rPr><x:t>ness</x:t></x:r><x:rPh sb="0" eb="1"><x:t>PH</x:t></x:rPh></x:si>` +
			`<x:si><x:t>a&lt;b &#x3bc;m</x:t></x:si></x:sst>`,
		"xl/worksheets/data.xml": `<?xml version="1.0" encoding="UTF-8"?><x:worksheet ` + ns + `><x:sheetData>` +
			`<x:row r="1"><x:c r="A1" t="s"><x:v>0</x:v></x:c><x:c r="B1" t="s"><x:v>1</x:v></x:c></x:row>` +
			`<!-- a comment with <x:row r="9"> inside -->` +
			`<x:row r="2"><x:c r="A2"><x:v>1401.5</x:v></x:c><x:c r="B2" t="inlineStr"><x:is><x:t>250</x:t></x:is></x:c></x:row>` +
			`<x:row r="4"><x:c r="A4" t="str"><x:f>A2+1</x:f><x:v><![CDATA[1402.5]]></x:v></x:c><x:c r="C4" t="s"><x:v>2</x:v></x:c><x:c r="D4" t="e"><x:v>#N/A</x:v></x:c></x:row>` +
			`</x:sheetData><x:mergeCells count="1"><x:mergeCell ref="A1:A1"/></x:mergeCells></x:worksheet>`,
	}
	path := zipParts(t, parts)
	got, merges := ourRows(t, path, "Run 1")
	want := [][]string{{"temp", "hard ness"}, {"1401.5", "250"}, nil, {"1402.5", "", "a<b μm", "#N/A"}}
	if len(got) != len(want) || !slices.EqualFunc(got, want, slices.Equal) {
		t.Errorf("rows %q, want %q", got, want)
	}
	if !slices.Equal(merges, []string{"A1:A1"}) {
		t.Errorf("merges %q, want [A1:A1]", merges)
	}
	w, err := OpenWorkbook(path, nil)
	must(t, err)
	tb, err := w.Read(SheetRef{}, 0, Options{}, []string{"temp"}, []string{"hard ness"})
	if err != nil || tb.Rows != 3 || tb.Numeric["temp"][2] != 1402.5 || tb.Text["hard ness"].At(0) != "250" || tb.CellErrors["temp"] != nil {
		t.Errorf("Read: %+v, %v", tb, err)
	}
}

// TestUnescapeOOXML: ST_Xstring escapes (ECMA-376 Part 1 §22.9.2.19).
func TestUnescapeOOXML(t *testing.T) {
	for in, want := range map[string]string{
		"plain":                "plain",
		"a_x000D_b":            "a\rb",
		"_x005F_x000D_":        "_x000D_",
		"_x0041__x0042_":       "AB",
		"_xD83D__xDE00_":       "😀",
		"lone _xD83D_ half":    "lone \uFFFD half",
		"_x00zz_ not hex":      "_x00zz_ not hex",
		"_X0041_ capital X":    "_X0041_ capital X",
		"short _x004_":         "short _x004_",
		"trailing _x0041":      "trailing _x0041",
		"_x0009_tab_x000A_end": "\ttab\nend",
	} {
		if got := unescapeOOXML(in); got != want {
			t.Errorf("unescapeOOXML(%q) = %q, want %q", in, got, want)
		}
	}
}

// FuzzSheetText: a text cell written by excelize reads back as excelize
// reads it, for any text.
func FuzzSheetText(f *testing.F) {
	for _, s := range []string{"a & b", "x\r\ny", "_x000D_", "<]]>", "😀", " lead", "\x00bad"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		path := writeBook(t, []string{"S"}, [][][]any{{{"h"}}}, func(x *excelize.File) {
			if err := x.SetCellStr("S", "A2", s); err != nil {
				t.Skip()
			}
			if err := x.SetCellValue("S", "B3", s); err != nil {
				t.Skip()
			}
		})
		got, _ := ourRows(t, path, "S")
		want := excelizeRows(t, path, "S")
		for len(got) > len(want) && len(got[len(got)-1]) == 0 {
			got = got[:len(got)-1]
		}
		if len(got) != len(want) || !slices.EqualFunc(got, want, slices.Equal) {
			t.Errorf("%q: rows %q, excelize reads %q", s, got, want)
		}
	})
}

// handBook zips a one-sheet package around the given worksheet part (and
// shared strings part, when sst is not "", with a relationship to it when
// sstRel), as the ECMA-376 examples lay a package out.
func handBook(t *testing.T, sheet, sst string, sstRel bool) string {
	t.Helper()
	rels := `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
		`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/>`
	if sstRel {
		rels += `<Relationship Id="rId2" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/sharedStrings" Target="sharedStrings.xml"/>`
	}
	parts := map[string]string{
		"_rels/.rels": `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">` +
			`<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/></Relationships>`,
		"xl/_rels/workbook.xml.rels": rels + `</Relationships>`,
		"xl/workbook.xml": `<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" ` +
			`xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"><sheets><sheet name="S" sheetId="1" r:id="rId1"/></sheets></workbook>`,
		"xl/worksheets/sheet1.xml": `<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">` + sheet,
	}
	if strings.HasPrefix(sheet, "<?xml") { // a part with its own declaration
		parts["xl/worksheets/sheet1.xml"] = sheet
	}
	if sst != "" {
		parts["xl/sharedStrings.xml"] = `<?xml version="1.0" encoding="UTF-8"?><sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">` + sst
	}
	return zipParts(t, parts)
}

// zipParts writes the parts (name → content), in name order, as a zip
// archive in a new .xlsx file and returns its path.
func zipParts(t *testing.T, parts map[string]string) string {
	t.Helper()
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, name := range slices.Sorted(maps.Keys(parts)) {
		fw, err := zw.Create(name)
		must(t, err)
		_, err = fw.Write([]byte(parts[name]))
		must(t, err)
	}
	must(t, zw.Close())
	path := filepath.Join(t.TempDir(), "hand.xlsx")
	must(t, os.WriteFile(path, buf.Bytes(), 0o644))
	return path
}

// TestSheetDamaged: damaged or hostile sheet parts (found by an
// independent review's mutation testing) give an error meant for a
// person, never a panic, a silent loss of rows or unbounded memory.
func TestSheetDamaged(t *testing.T) {
	t.Parallel()
	const head = `<sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>x</t></is></c><c r="B1" t="inlineStr"><is><t>y</t></is></c></row>`
	many := strings.Repeat("<c/>", 20000) // more cells than columns A to XFD
	for _, tc := range []struct{ name, sheet, sst, want string }{
		{"row inside a cell", head + `<row r="2"><c r="A2"><v>2</v><row r="3"></c></row></sheetData></worksheet>`, "", "a row element starts inside another row"},
		{"cell inside a cell", head + `<row r="2"><c r="A2"><c r="B2"><v>2</v></c></c></row></sheetData></worksheet>`, "", "a cell element starts inside another cell"},
		{"row ends in a cell", head + `<row r="2"><c r="A2"><v>2</v></row></sheetData></worksheet>`, "", "a row element ends inside a cell"},
		{"cut off after a row", head + `<row r="2"><c r="A2"><v>2</v></c></row>`, "", "the part ends before its sheetData element does"},
		{"cut off in a row", head + `<row r="2"><c r="A2"><v>2</v></c>`, "", "the part ends before its sheetData element does"},
		{"cells out of order", head + `<row r="2"><c r="B2"><v>2</v></c><c r="A2"><v>1</v></c></row></sheetData></worksheet>`, "", "the cells are out of order"},
		{"cell twice", head + `<row r="2"><c r="A2"><v>2</v></c><c r="A2"><v>1</v></c></row></sheetData></worksheet>`, "", "the cells are out of order"},
		{"past XFD", head + `<row r="2">` + many + `</row></sheetData></worksheet>`, "", "past column XFD"},
		{"beyond XFD", head + `<row r="2"><c r="XFE2"><v>1</v></c></row></sheetData></worksheet>`, "", `names no column from A to XFD`},
		{"rows out of order", head + `<row r="3"/><row r="2"/></sheetData></worksheet>`, "", "the rows are out of order"},
		{"NUL by reference", head + `<row r="2"><c r="A2"><v>1&#0;</v></c></row></sheetData></worksheet>`, "", "not a character XML allows"},
		{"raw control", head + "<row r=\"2\"><c r=\"A2\"><v>1\x01</v></c></row></sheetData></worksheet>", "", "control character"},
		{"string index", head + `<row r="2"><c r="A2" t="s"><v>5</v></c></row></sheetData></worksheet>`, `<si><t>a</t></si></sst>`, "shared string \"5\" is not in the table of 1"},
		{"string cut off", head + `<row r="2"><c r="A2" t="s"><v>0</v></c></row></sheetData></worksheet>`, `<si><t>a</t></si><si><t>b</sst>`, "the table ends inside a string"},
		{"strings cut off", head + `<row r="2"><c r="A2" t="s"><v>0</v></c></row></sheetData></worksheet>`, `<si><t>a</t></si><si><t>b`, "the XML is cut off"},
	} {
		_, err := ReadWorkbook(handBook(t, tc.sheet, tc.sst, true), SheetRef{}, 0, Options{}, []string{"x"}, nil)
		var e *Error
		if !errors.As(err, &e) || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), "save it again") {
			t.Errorf("%s: got %v, want a *dataset.Error containing %q and what to do", tc.name, err, tc.want)
		}
	}
	// Not a sheet's cells: markup in a comment, CDATA text, a quoted '>'.
	sheet := `<sheetData><!-- <mergeCell ref="A1:C1"/> --><row r="1"><c r="A1" t="inlineStr"><is><t>a</t></is></c></row>` +
		`<row r="2"><c r="A2" t="str"><v><![CDATA[<mergeCell ref="A1:D1"/>]]></v></c></row></sheetData>` +
		`<mergeCells count="1"><mergeCell note="x>y" ref="E1:F1"/></mergeCells></worksheet>`
	h, err := WorkbookHeader(handBook(t, sheet, "", false), SheetRef{}, 0, nil)
	if err != nil || !slices.Equal(h, []string{"a", "", "", "", "", ""}) {
		t.Errorf("header %q (%v), want [a] and the empty range E1:F1", h, err)
	}
	// A shared strings part named but absent is an empty table; one
	// present without its relationship is read from where writers put it.
	plain := head + `<row r="2"><c r="A2"><v>1</v></c></row></sheetData></worksheet>`
	if tb, err := ReadWorkbook(handBook(t, plain, "", true), SheetRef{}, 0, Options{}, []string{"x"}, nil); err != nil || tb.Rows != 1 {
		t.Errorf("absent shared strings: %v", err)
	}
	strs := `<row r="1"><c r="A1" t="s"><v>0</v></c><c r="B1" t="s"><v>1</v></c></row><row r="2"><c r="A2"><v>1</v></c></row></sheetData></worksheet>`
	if h, err := WorkbookHeader(handBook(t, "<sheetData>"+strs, `<si><t>x</t></si><si><t>y</t></si></sst>`, false), SheetRef{}, 0, nil); err != nil || !slices.Equal(h, []string{"x", "y"}) {
		t.Errorf("shared strings without a relationship: %q, %v", h, err)
	}
	// An encoding other than UTF-8 is named.
	latin := `<?xml version="1.0" encoding="ISO-8859-1"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">` + head + `</sheetData></worksheet>`
	if _, err := ReadWorkbook(handBook(t, latin, "", false), SheetRef{}, 0, Options{}, []string{"x"}, nil); err == nil || !strings.Contains(err.Error(), "ISO-8859-1 encoding") {
		t.Errorf("latin-1 part: %v", err)
	}
}
