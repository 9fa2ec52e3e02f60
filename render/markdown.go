package render

import (
	"strings"
	"unicode/utf8"

	"bivar/render/internal/mdtext"
)

// mdTable writes a pipe table with its columns padded, so that it reads
// as a table in plain text too. The caption goes first, in italics.
func mdTable(t table) string {
	if len(t.Head) == 0 {
		return ""
	}
	cells := make([][]string, 0, len(t.Rows)+1)
	head := make([]string, len(t.Head))
	for i, h := range t.Head {
		head[i] = mdtext.Cell(h)
	}
	cells = append(cells, head)
	for _, row := range t.Rows {
		r := make([]string, len(t.Head))
		for i := range r {
			switch {
			case i >= len(row):
			case isCode(t, i, row[i]):
				r[i] = mdtext.Code(row[i])
			default:
				r[i] = mdtext.Cell(row[i])
			}
		}
		cells = append(cells, r)
	}
	width := make([]int, len(t.Head))
	for _, r := range cells {
		for i, c := range r {
			width[i] = max(width[i], utf8.RuneCountInString(c), 3)
		}
	}
	var b strings.Builder
	if t.Caption != "" {
		b.WriteString("*" + mdtext.Escape(t.Caption) + "*\n\n")
	}
	line := func(r []string) {
		b.WriteString("|")
		for i, c := range r {
			pad := strings.Repeat(" ", width[i]-utf8.RuneCountInString(c))
			if i < len(t.Num) && t.Num[i] {
				b.WriteString(" " + pad + c + " |")
			} else {
				b.WriteString(" " + c + pad + " |")
			}
		}
		b.WriteString("\n")
	}
	line(cells[0])
	b.WriteString("|")
	for i := range t.Head {
		if i < len(t.Num) && t.Num[i] {
			b.WriteString(" " + strings.Repeat("-", width[i]-1) + ": |")
		} else {
			b.WriteString(" " + strings.Repeat("-", width[i]) + " |")
		}
	}
	b.WriteString("\n")
	for _, r := range cells[1:] {
		line(r)
	}
	return b.String()
}
