package analysis_test

import (
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// A sheet whose first non-empty row is a title ("Line 7 report" in A1)
// above the column names on row 3: the title is read as the header by
// default, so a study's columns are not found. The message names the
// sheet and the row the names were read from and says to set header_row
// (found by a sweep of messy inputs: it listed the columns as "Line 7
// report" alone); with header_row = 3 the study runs. The workbook is
// written here with excelize.
func TestWorkbookTitleRowSaysHeaderRow(t *testing.T) {
	dir := t.TempDir()
	f := excelize.NewFile()
	set := func(cell string, v any) {
		if err := f.SetCellValue("Sheet1", cell, v); err != nil {
			t.Fatal(err)
		}
	}
	set("A1", "Line 7 report")
	set("A3", "temp")
	set("B3", "thickness")
	for i := range 10 {
		set("A"+strconv.Itoa(4+i), 400+i)
		set("B"+strconv.Itoa(4+i), 2+0.1*float64(i)+0.05*float64(i%3))
	}
	if err := f.SaveAs(filepath.Join(dir, "t.xlsx")); err != nil {
		t.Fatal(err)
	}
	study := "[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"temp\"\ny = \"thickness\"\n"
	r, err := runManifest(t, dir, "[[dataset]]\nid = \"d\"\nfile = \"t.xlsx\"\n"+study)
	if err != nil {
		t.Fatal(err)
	}
	msg := ""
	if e := r.Studies[0].Error; e != nil {
		msg = *e
	}
	if !strings.Contains(msg, `read from sheet "Sheet1" row 1`) || !strings.Contains(msg, "set header_row") {
		t.Errorf("message %q; want it to name sheet row 1 and header_row", msg)
	}
	r, err = runManifest(t, dir, "[[dataset]]\nid = \"d\"\nfile = \"t.xlsx\"\nheader_row = 3\n"+study)
	if err != nil || r.Studies[0].Error != nil || r.Studies[0].N != 10 {
		t.Errorf("with header_row = 3: error %v, study %v, n %d; want 10 rows", err, r.Studies[0].Error, r.Studies[0].N)
	}
}
