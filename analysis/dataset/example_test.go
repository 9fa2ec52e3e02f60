package dataset_test

import (
	"fmt"

	"bivar/analysis/dataset"
)

func ExampleRead() {
	t, err := dataset.Read("testdata/semicolon-decimal-comma.csv", dataset.Options{},
		[]string{"melt_temp", "shrinkage"}, []string{"lot"})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("rows %d, delimiter %q, decimal comma %v\n", t.Rows, t.Delimiter, t.DecimalComma)
	fmt.Println("melt_temp", t.Numeric["melt_temp"], "missing", t.Missing["melt_temp"])
	fmt.Println("lot", t.Text["lot"])
	// Output:
	// rows 3, delimiter ';', decimal comma true
	// melt_temp [231.5 NaN 236] missing 1
	// lot [A A B]
}

func ExampleRead_nonNumeric() {
	_, err := dataset.Read("testdata/semicolon-decimal-comma.csv", dataset.Options{Missing: []string{}},
		[]string{"melt_temp"}, nil)
	fmt.Println(err)
	// Output:
	// testdata/semicolon-decimal-comma.csv:3: column "melt_temp": "NA" is not a number; correct the cell, add this text to the dataset's missing list, or set non_numeric = "missing" to count such cells as missing
}
