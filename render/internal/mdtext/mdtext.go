// Package mdtext escapes text for the Markdown written by bivar diff and
// bivar check, where names and messages from the user's files go into
// paragraphs, list items and table cells.
package mdtext

import "strings"

// Escape escapes text for a Markdown table cell or paragraph: every
// character Markdown gives a meaning gets a backslash, the pipe that ends a
// cell included, and line breaks and tabs become spaces, so user text can
// neither start markup nor end a cell or a line.
func Escape(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch r {
		case '\\', '`', '*', '_', '[', ']', '<', '>', '|', '#', '&', '!':
			b.WriteByte('\\')
			b.WriteRune(r)
		case '\n', '\r', '\t':
			b.WriteByte(' ')
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}
