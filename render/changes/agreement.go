package changes

// This file shows the agreement studies' changes between runs (bias, SD of
// the differences and the limits of agreement; compare.AgreementChange)
// in both formats, from the same rows.

import (
	"fmt"
	"strings"

	"bivar/analysis/compare"
	"bivar/render/internal/mdtext"
)

// agreementHead is the header of the agreement table.
var agreementHead = []string{"Study", "bias old → new", "Δbias ± SE", "Welch t (df)", "adjusted p", "SD old → new", "F", "adjusted p", "limits old → new"}

// agreementRow is one study's cells; bad says which cells show a change
// beyond chance.
type agreementRow struct {
	ID    string
	Cells []string
	Bad   []bool
}

// agreementRows lists the compared agreement studies, in Result order.
func agreementRows(res *compare.Result) []agreementRow {
	var out []agreementRow
	for _, sc := range res.Studies {
		a := sc.Agreement
		if a == nil {
			continue
		}
		u := ""
		if a.Unit != "" {
			u = " " + a.Unit
		}
		df := "n/a"
		if a.BiasDF.Valid() {
			df = fmt.Sprintf("%.1f", float64(a.BiasDF))
		}
		t := fix2(a.DeltaBias / a.BiasSE)
		out = append(out, agreementRow{ID: sc.ID,
			Cells: []string{
				num(a.OldBias) + " → " + num(a.NewBias) + u,
				signed(a.DeltaBias) + " ± " + num(a.BiasSE) + u,
				t + " (" + df + ")",
				padj(a.BiasPAdj, res.Alpha),
				num(a.OldSD) + " → " + num(a.NewSD) + u,
				fix2(a.VarianceRatio),
				padj(a.SDPAdj, res.Alpha),
				num(a.OldLower) + " to " + num(a.OldUpper) + " → " + num(a.NewLower) + " to " + num(a.NewUpper) + u,
			},
			Bad: []bool{false, false, false, below(a.BiasPAdj, res.Alpha), false, false, below(a.SDPAdj, res.Alpha), false}})
	}
	return out
}

// agreementMarkdown is the Markdown section of the agreement changes, ""
// when no compared study has them.
func agreementMarkdown(res *compare.Result) string {
	rows := agreementRows(res)
	if len(rows) == 0 {
		return ""
	}
	var b strings.Builder
	b.WriteString("## Change in agreement\n\n")
	fmt.Fprintf(&b, "Agreement studies: %s; %s. Both p-values are adjusted with the other change tests.\n\n",
		mdtext.Escape(res.Tests.Bias), mdtext.Escape(res.Tests.Spread))
	b.WriteString("| " + strings.Join(agreementHead, " | ") + " |\n|---|--:|--:|--:|--:|--:|--:|--:|--:|\n")
	for _, r := range rows {
		cells := make([]string, len(r.Cells))
		for i, c := range r.Cells {
			cells[i] = mdtext.Cell(c)
			if r.Bad[i] {
				cells[i] = "**" + cells[i] + "**"
			}
		}
		fmt.Fprintf(&b, "| `%s` | %s |\n", code(r.ID), strings.Join(cells, " | "))
	}
	b.WriteString("\n")
	return b.String()
}
