package render

import (
	"strings"
	"unicode"
	"unicode/utf8"
)

// mdText makes s safe as inline Markdown text: line breaks become spaces
// and each character that GFM (CommonMark 0.31 with the GFM extensions)
// could take as syntax where it stands is backslash-escaped (§2.4: any
// ASCII punctuation may be escaped), so names from the manifest and the
// data read as written and never become markup. Characters that cannot
// start syntax where they stand are left alone, so the plain text reads
// well: "p < 0.001", "R&D", "−0.98" and "a > b" stay as they are.
func mdText(s string) string { return mdEscape(s, true) }

// mdEscape is mdText; lead says whether s may start a line, where a few
// more characters need escaping.
func mdEscape(s string, lead bool) string {
	var b strings.Builder
	rs := []rune(s)
	at := func(i int) rune {
		if i >= 0 && i < len(rs) {
			return rs[i]
		}
		return ' '
	}
	for i, r := range rs {
		switch r {
		case '\\', '`', '*', '~':
			b.WriteByte('\\')
			b.WriteRune(r)
		case '[':
			// "![" opens an image.
			if at(i-1) == '!' {
				b.WriteByte('\\')
			}
			b.WriteRune(r)
		case ']':
			// "](" and "][" make a link, "]:" a link reference definition;
			// "[degF]" alone could only be a link if a definition for it
			// existed, and mdNotes keeps the notes from making one.
			if n := at(i + 1); n == '(' || n == '[' || n == ':' {
				b.WriteByte('\\')
			}
			b.WriteRune(r)
		case '<':
			// Only "<" before a letter, "/", "!" or "?" can open an HTML
			// tag, comment or autolink (§6.5, §6.6).
			if n := at(i + 1); unicode.IsLetter(n) || n == '/' || n == '!' || n == '?' {
				b.WriteByte('\\')
			}
			b.WriteRune(r)
		case '&':
			// Only "&name;" or "&#123;" is an entity reference (§2.5).
			if entityAt(rs[i+1:]) {
				b.WriteByte('\\')
			}
			b.WriteRune(r)
		case '>':
			// A blockquote marker only at the start of a line.
			if i == 0 && lead {
				b.WriteByte('\\')
			}
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
			next := at(i + 1)
			if i == 0 && lead && (r == '#' || next == ' ' || next == r) {
				b.WriteByte('\\')
			}
			b.WriteRune(r)
		case '.', ')':
			// "12. " or "3) " at the start of a line is an ordered list item.
			if lead && i > 0 && i <= 9 && at(i+1) == ' ' && allDigits(rs[:i]) {
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

// entityAt says whether rs (the text after an "&") starts an entity or
// numeric character reference: letters or digits, or "#" and digits, then ";".
func entityAt(rs []rune) bool {
	for k, r := range rs {
		switch {
		case r == ';':
			return k > 0
		case r == '#' && k == 0, r < 0x80 && isAlnum(r):
		default:
			return false
		}
		if k > 32 {
			return false
		}
	}
	return false
}

func allDigits(rs []rune) bool {
	for _, r := range rs {
		if r < '0' || r > '9' {
			return false
		}
	}
	return len(rs) > 0
}

func isAlnum(r rune) bool { return unicode.IsLetter(r) || unicode.IsDigit(r) }

// mdCell is mdText for a table cell, where a pipe would end the cell.
func mdCell(s string) string { return strings.ReplaceAll(mdEscape(s, false), "|", "\\|") }

// mdCode writes a code (a UCUM unit such as [degF]) as a code span in a
// table cell, so it needs no backslashes; a pipe is still escaped, as GFM
// tables require even inside code spans. A code holding a backtick or a
// line break is written as escaped text instead.
func mdCode(s string) string {
	if s == "" {
		return ""
	}
	if strings.ContainsAny(s, "`\n\r") {
		return mdCell(s)
	}
	return "`" + strings.ReplaceAll(s, "|", "\\|") + "`"
}

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
			switch {
			case i >= len(row):
			case isCode(t, i, row[i]):
				r[i] = mdCode(row[i])
			default:
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
// A line that would define a link reference ("[label]: url") has its "["
// escaped: a definition applies to the whole document and would turn
// bracketed text elsewhere in the report ("[degF]") into a link. Inline
// links in the notes keep working.
func mdNotes(s string) string {
	s = strings.ReplaceAll(strings.TrimSpace(s), "\r\n", "\n")
	s = strings.NewReplacer("<", "&lt;", "![", "!\\[").Replace(s)
	lines := strings.Split(s, "\n")
	for i, l := range lines {
		t := strings.TrimLeft(l, " >")
		if strings.HasPrefix(t, "[") && strings.Contains(t, "]:") {
			k := len(l) - len(t)
			lines[i] = l[:k] + "\\" + t
		}
	}
	return strings.Join(lines, "\n")
}
