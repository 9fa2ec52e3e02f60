// Package mdtext escapes text from the user's files (titles, labels,
// column names, row ids, group values, units, messages) for the Markdown
// bivar writes: report.md, the CI summary and diff.md. It is the one
// escaper for all three, so what is safe in one is safe in the others.
//
// Escaped text is inert under GitHub-flavoured Markdown (CommonMark 0.31
// with the GFM extensions, as cmark-gfm and goldmark's GFM extension read
// it): it makes no link, image, autolink or raw HTML, and no block
// structure (heading, list, quote, rule, table row) when it stands at the
// start of a line or in a table cell. Characters that cannot start syntax
// where they stand are left alone, so plain text reads well in the file
// too: "p < 0.001", "R&D", "−0.98" and "ambient_rh" stay as written.
package mdtext

import (
	"strings"
	"unicode"
)

// Escape makes s safe as inline Markdown wherever bivar puts it: a
// paragraph, a heading or a list item (Cell for a table cell). Line
// breaks and tabs
// become spaces and each character that could start syntax where it
// stands is backslash-escaped (any ASCII punctuation may be, CommonMark
// §2.4). What follows s must not start with "[" or "(" (bivar's templates
// put no such text after data text), or a final "!" or "]" could join it. Bytes that are not UTF-8 become U+FFFD; other control characters
// are left for cleantext, which every writer applies on the way out.
func Escape(s string) string {
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
		case '@':
			// An e-mail autolink (GFM §6.9, "a@b.example") or the address
			// of a mailto:/xmpp: autolink needs the "@" as text.
			b.WriteString("\\@")
		case ':':
			// "http://", "https://", "ftp://" start a URL autolink: the
			// escaped colon is text, so the scheme is not seen.
			if at(i+1) == '/' && at(i+2) == '/' {
				b.WriteByte('\\')
			}
			b.WriteRune(r)
		case '.':
			switch {
			case i >= 3 && strings.EqualFold(string(rs[i-3:i]), "www"):
				// "www." starts a www autolink.
				b.WriteByte('\\')
			case i > 0 && i <= 9 && at(i+1) == ' ' && allDigits(rs[:i]):
				// "12. " at the start of a line is an ordered list item.
				b.WriteByte('\\')
			}
			b.WriteRune(r)
		case ')':
			// "3) " at the start of a line is an ordered list item.
			if i > 0 && i <= 9 && at(i+1) == ' ' && allDigits(rs[:i]) {
				b.WriteByte('\\')
			}
			b.WriteRune(r)
		case '!':
			// "![" opens an image.
			if at(i+1) == '[' {
				b.WriteByte('\\')
			}
			b.WriteRune(r)
		case ']':
			// "](" and "][" make a link, "]:" a link reference definition;
			// "[degF]" alone could only be a link if a definition for it
			// existed, and no text bivar writes makes one.
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
			if i == 0 {
				b.WriteByte('\\')
			}
			b.WriteRune(r)
		case '_':
			// An underscore between letters or digits cannot open or close
			// emphasis (§6.2), so ambient_rh stays as it is.
			if i > 0 && i+1 < len(rs) && isAlnum(rs[i-1]) && isAlnum(rs[i+1]) {
				b.WriteRune(r)
			} else {
				b.WriteString("\\_")
			}
		case '#', '-', '+', '=':
			// Only at the start of a line do these make headings, list
			// items or rules ("# ", "- ", "+ ", "=="); "-0.98" stays as it is.
			if next := at(i + 1); i == 0 && (r == '#' || next == ' ' || next == r) {
				b.WriteByte('\\')
			}
			b.WriteRune(r)
		case '\n', '\r', '\t':
			b.WriteByte(' ')
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}

// Cell is Escape for a table cell, where a pipe would end the cell.
func Cell(s string) string { return strings.ReplaceAll(Escape(s), "|", "\\|") }

// Label is Escape for the text of a link or image, "![label](…)", where
// an unmatched bracket would end the label early or open a link inside
// it: every bracket is escaped.
func Label(s string) string {
	return strings.NewReplacer("\\[", "\\[", "\\]", "\\]", "[", "\\[", "]", "\\]").Replace(Escape(s))
}

// Code writes s as a code span (a UCUM unit such as [degF] reads better
// without backslashes); a pipe is still escaped, as GFM tables require
// even inside code spans. Text that a code span cannot hold (a backtick,
// a line break) is written with Escape instead. "" stays "".
func Code(s string) string {
	if s == "" {
		return ""
	}
	if strings.ContainsAny(s, "`\n\r") {
		return Cell(s)
	}
	return "`" + strings.ReplaceAll(s, "|", "\\|") + "`"
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
