package render

import (
	"strings"
	"unicode"
	"unicode/utf8"
)

// mdText makes s safe as inline Markdown text: line breaks become spaces
// and every character that Markdown or HTML could take as syntax is
// backslash-escaped (CommonMark 0.31, §2.4: any ASCII punctuation may be
// escaped), so names from the manifest and the data read as written and
// never become markup.
func mdText(s string) string { return mdEscape(s, true) }

// mdEscape is mdText; lead says whether s may start a line, where a few
// more characters need escaping.
func mdEscape(s string, lead bool) string {
	var b strings.Builder
	rs := []rune(s)
	for i, r := range rs {
		switch r {
		case '\\', '`', '*', '[', ']', '<', '>', '&', '~':
			b.WriteByte('\\')
			b.WriteRune(r)
		case '_':
			// An underscore between letters or digits cannot open or close
			// emphasis (CommonMark 0.31, §6.2), so ambient_rh stays as it is.
			if i > 0 && i+1 < len(rs) && isAlnum(rs[i-1]) && isAlnum(rs[i+1]) {
				b.WriteRune(r)
			} else {
				b.WriteString("\\_")
			}
		case '#', '-', '+', '=':
			// Only at the start of a line do these make headings, list
			// items or rules ("# ", "- ", "+ ", "=="); "-0.98" stays as it is.
			next := rune(' ')
			if i+1 < len(rs) {
				next = rs[i+1]
			}
			if i == 0 && lead && (r == '#' || next == ' ' || next == r) {
				b.WriteByte('\\')
			}
			b.WriteRune(r)
		case '\n', '\r', '\t':
			b.WriteByte(' ')
		default:
			if r < 0x20 {
				b.WriteByte(' ')
				continue
			}
			b.WriteRune(r)
		}
	}
	return b.String()
}

func isAlnum(r rune) bool { return unicode.IsLetter(r) || unicode.IsDigit(r) }

// mdCell is mdText for a table cell, where a pipe would end the cell.
func mdCell(s string) string { return strings.ReplaceAll(mdEscape(s, false), "|", "\\|") }

// mdTable writes a pipe table with its columns padded, so that it reads
// as a table in plain text too. The caption goes first, in italics.
func mdTable(t table) string {
	if len(t.Head) == 0 {
		return ""
	}
	cells := make([][]string, 0, len(t.Rows)+1)
	head := make([]string, len(t.Head))
	for i, h := range t.Head {
		head[i] = mdCell(h)
	}
	cells = append(cells, head)
	for _, row := range t.Rows {
		r := make([]string, len(t.Head))
		for i := range r {
			if i < len(row) {
				r[i] = mdCell(row[i])
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
		b.WriteString("*" + mdText(t.Caption) + "*\n\n")
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

// mdNotes passes the study's notes on as Markdown, with "<" written as an
// entity so raw HTML in the notes shows as text in any Markdown viewer,
// and "![" escaped so an image in the notes is not fetched by the viewer
// (the HTML report shows images as their alt text for the same reason).
func mdNotes(s string) string {
	s = strings.ReplaceAll(strings.TrimSpace(s), "\r\n", "\n")
	return strings.NewReplacer("<", "&lt;", "![", "!\\[").Replace(s)
}
