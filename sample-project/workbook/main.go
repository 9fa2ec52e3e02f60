// Command workbook writes the sample project's October run as an Excel
// workbook, data/run-2026-10.xlsx, from data/run-2026-10.csv (invented
// demo data, see ../README.md): one sheet, "October", the CSV's header in
// row 1, numbers as numbers, text as text, and each "NA" cell left empty,
// as a plant's spreadsheet would hold a missing value. Run from the
// checkout's top folder:
//
//	go run ./sample-project/workbook
package main

import (
	"encoding/csv"
	"fmt"
	"os"
	"path/filepath"
	"strconv"

	"github.com/xuri/excelize/v2"
)

func main() {
	if err := write(filepath.Join("sample-project", "data", "run-2026-10.csv"), filepath.Join("sample-project", "data", "run-2026-10.xlsx")); err != nil {
		fmt.Fprintln(os.Stderr, "workbook:", err)
		os.Exit(1)
	}
}

func write(from, to string) error {
	f, err := os.Open(from)
	if err != nil {
		return err
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		return fmt.Errorf("%s: %w", from, err)
	}
	x := excelize.NewFile()
	defer x.Close()
	const sheet = "October"
	if err := x.SetSheetName("Sheet1", sheet); err != nil {
		return err
	}
	for r, row := range rows {
		for c, v := range row {
			cell, err := excelize.CoordinatesToCellName(c+1, r+1)
			if err != nil {
				return err
			}
			var val any = v
			switch {
			case r > 0 && v == "NA":
				continue
			case r > 0:
				if n, err := strconv.ParseFloat(v, 64); err == nil {
					val = n
				}
			}
			if err := x.SetCellValue(sheet, cell, val); err != nil {
				return err
			}
		}
	}
	return x.SaveAs(to)
}
