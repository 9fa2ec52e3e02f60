package render

// This file handles study notes: Markdown written by the user in the
// manifest. Both reports show them as Markdown, so both go through one
// parse (parseNotes) that makes them inert before they are written:
//
//   - a link, written or automatic, is kept only when it points to an
//     http, https or mailto address; any other (javascript:, vbscript:,
//     file:, data:, a relative path) is replaced by its text;
//   - an image becomes "[image: alt]", so opening a report fetches nothing;
//   - raw HTML, inline or as a block, is left out (its tags are markup,
//     not text; text between inline tags stays);
//   - a heading goes three levels down (# becomes h4), below the study's
//     "Notes" heading.
//
// The HTML report renders the cleaned tree with goldmark; report.md gets it
// written back as Markdown by notesMarkdown, with every text passed
// through mdtext.Escape, so no text of the notes can become markup that
// the tree did not hold.

import (
	"bytes"
	"fmt"
	"strconv"
	"strings"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/extension"
	east "github.com/yuin/goldmark/extension/ast"
	"github.com/yuin/goldmark/text"
	"github.com/yuin/goldmark/util"

	"bivar/render/internal/mdtext"
)

// notesMD reads notes as GitHub does (GFM tables, strikethrough and
// autolinks; task-list boxes are left as text) and renders HTML without
// html.WithUnsafe, a second guard: raw HTML is already gone from the tree.
// Task-list boxes are not enabled: "[ ]" stays text.
var notesMD = goldmark.New(goldmark.WithExtensions(extension.Table, extension.Strikethrough, extension.Linkify))

// notesHTML renders study notes as HTML.
func notesHTML(src string) (string, error) {
	doc, source := parseNotes(src)
	var b bytes.Buffer
	if err := notesMD.Renderer().Render(&b, source, doc); err != nil {
		return "", err
	}
	return b.String(), nil
}

// mdNotes renders study notes as Markdown for report.md.
func mdNotes(src string) string {
	doc, source := parseNotes(src)
	var w mdWriter
	return strings.Join(w.blocks(doc, source), "\n")
}

// parseNotes parses src and makes the tree inert (see the file comment).
func parseNotes(src string) (ast.Node, []byte) {
	source := []byte(strings.ReplaceAll(strings.TrimSpace(src), "\r\n", "\n"))
	doc := notesMD.Parser().Parse(text.NewReader(source))
	neutralise(doc, source)
	return doc, source
}

// allowedURL says whether a link may point to u: an http, https or mailto
// address, the scheme in any case.
func allowedURL(u []byte) bool {
	scheme, _, ok := strings.Cut(string(u), ":")
	if !ok {
		return false
	}
	switch strings.ToLower(scheme) {
	case "http", "https", "mailto":
		return true
	}
	return false
}

// neutralise replaces, below n, every link to a disallowed address by its
// content, every image by "[image: " content "]", and drops raw HTML.
func neutralise(n ast.Node, source []byte) {
	for c := n.FirstChild(); c != nil; {
		next := c.NextSibling()
		switch v := c.(type) {
		case *ast.Link:
			if !allowedURL(v.Destination) {
				unwrap(n, c, nil, nil)
				c = next
				continue
			}
		case *ast.AutoLink:
			if v.AutoLinkType == ast.AutoLinkURL && !allowedURL(v.URL(source)) {
				n.ReplaceChild(n, c, rawString(v.Label(source)))
				c = next
				continue
			}
		case *ast.Image:
			neutralise(c, source)
			unwrap(n, c, rawString([]byte("[image: ")), rawString([]byte("]")))
			c = next
			continue
		case *ast.Heading:
			// The notes stand under the study's "Notes" heading (h3):
			// their own headings go below it.
			v.Level = min(v.Level+3, 6)
		case *ast.RawHTML, *ast.HTMLBlock:
			n.RemoveChild(n, c)
			c = next
			continue
		}
		neutralise(c, source)
		c = next
	}
}

// unwrap replaces child c of parent by its children, between before and
// after when they are given, and neutralises what it moved up.
func unwrap(parent, c, before, after ast.Node) {
	if before != nil {
		parent.InsertBefore(parent, c, before)
	}
	for k := c.FirstChild(); k != nil; {
		next := k.NextSibling()
		parent.InsertBefore(parent, c, k)
		k = next
	}
	if after != nil {
		parent.InsertBefore(parent, c, after)
	}
	parent.RemoveChild(parent, c)
}

// rawString is text shown as it is: HTML-escaped by goldmark, and
// Markdown-escaped by mdWriter.
func rawString(b []byte) *ast.String {
	s := ast.NewString(b)
	s.SetRaw(true)
	return s
}

// mdWriter writes a neutralised notes tree back as Markdown. Block
// structure is rebuilt (paragraphs, headings, lists, quotes, code, tables,
// rules); every run of text is escaped whole with mdtext.Escape.
type mdWriter struct{}

// blocks renders the block children of n, as lines, with a blank line
// between blocks.
func (w mdWriter) blocks(n ast.Node, source []byte) []string {
	var out []string
	for c := n.FirstChild(); c != nil; c = c.NextSibling() {
		lines := w.block(c, source)
		if len(lines) == 0 {
			continue
		}
		if len(out) > 0 {
			out = append(out, "")
		}
		out = append(out, lines...)
	}
	return out
}

func (w mdWriter) block(n ast.Node, source []byte) []string {
	switch v := n.(type) {
	case *ast.Paragraph, *ast.TextBlock:
		return strings.Split(w.inline(n, source, inBlock), "\n")
	case *ast.Heading:
		return []string{strings.Repeat("#", min(max(v.Level, 1), 6)) + " " + w.inline(n, source, inHeading)}
	case *ast.ThematicBreak:
		return []string{"***"}
	case *ast.CodeBlock, *ast.FencedCodeBlock:
		var body []string
		lines := n.Lines()
		for i := 0; i < lines.Len(); i++ {
			s := lines.At(i)
			body = append(body, strings.TrimRight(string(s.Value(source)), "\n"))
		}
		fence := strings.Repeat("`", max(3, longestRun(strings.Join(body, "\n"), '`')+1))
		info := ""
		if f, ok := n.(*ast.FencedCodeBlock); ok {
			if lang := string(f.Language(source)); isWord(lang) {
				info = lang
			}
		}
		return append(append([]string{fence + info}, body...), fence)
	case *ast.Blockquote:
		inner := w.blocks(n, source)
		for i, l := range inner {
			inner[i] = strings.TrimRight("> "+l, " ")
		}
		return inner
	case *ast.List:
		var out []string
		num := v.Start
		for item := n.FirstChild(); item != nil; item = item.NextSibling() {
			marker := "-"
			if v.IsOrdered() {
				marker = strconv.Itoa(num) + "."
				num++
			}
			var inner []string
			if v.IsTight {
				for c := item.FirstChild(); c != nil; c = c.NextSibling() {
					inner = append(inner, w.block(c, source)...)
				}
			} else {
				inner = w.blocks(item, source)
				if item.NextSibling() != nil {
					inner = append(inner, "")
				}
			}
			if len(inner) == 0 {
				inner = []string{""}
			}
			pad := strings.Repeat(" ", len(marker)+1)
			for i, l := range inner {
				switch {
				case i == 0:
					out = append(out, strings.TrimRight(marker+" "+l, " "))
				case l == "":
					out = append(out, "")
				default:
					out = append(out, pad+l)
				}
			}
		}
		return out
	case *east.Table:
		return w.table(v, source)
	}
	// Anything else: its text, as a paragraph.
	if n.Type() == ast.TypeInline {
		return []string{w.inline(n, source, inBlock)}
	}
	return w.blocks(n, source)
}

func (w mdWriter) table(t *east.Table, source []byte) []string {
	var rows [][]string
	for r := t.FirstChild(); r != nil; r = r.NextSibling() {
		var cells []string
		for c := r.FirstChild(); c != nil; c = c.NextSibling() {
			cells = append(cells, w.inline(c, source, inCell))
		}
		rows = append(rows, cells)
	}
	if len(rows) == 0 {
		return nil
	}
	cols := len(rows[0])
	line := func(cells []string) string {
		var b strings.Builder
		b.WriteString("|")
		for i := 0; i < cols; i++ {
			c := ""
			if i < len(cells) {
				c = cells[i]
			}
			b.WriteString(" " + c + " |")
		}
		return b.String()
	}
	out := []string{line(rows[0])}
	var delim strings.Builder
	delim.WriteString("|")
	for i := 0; i < cols; i++ {
		a := east.AlignNone
		if i < len(t.Alignments) {
			a = t.Alignments[i]
		}
		switch a {
		case east.AlignLeft:
			delim.WriteString(" :-- |")
		case east.AlignRight:
			delim.WriteString(" --: |")
		case east.AlignCenter:
			delim.WriteString(" :-: |")
		default:
			delim.WriteString(" --- |")
		}
	}
	out = append(out, delim.String())
	for _, r := range rows[1:] {
		out = append(out, line(r))
	}
	return out
}

// mode is where inline content stands.
type mode int

const (
	inBlock   mode = iota // a paragraph or list item: line breaks kept
	inHeading             // one line
	inCell                // one line, pipes escaped
)

// inline renders the inline children of n. Consecutive texts are joined
// and escaped as one run, so that text split by the parser ("www" and
// ".example.org") is seen whole. A line break is kept, a hard one as a
// backslash at the end of the line, unless oneLine asks for a single line
// (a heading, a table cell); a line starts without blanks, so that the
// escaper sees its first character.
func (w mdWriter) inline(n ast.Node, source []byte, m mode) string {
	var b, run strings.Builder
	lineStart, oneLine, escape := true, m != inBlock, mdtext.Escape
	if m == inCell {
		escape = mdtext.Cell
	}
	flush := func() {
		t := run.String()
		if lineStart {
			t = strings.TrimLeft(t, " \t")
		}
		if t != "" {
			// A final "!" is escaped: a link may follow ("![" is an image).
			bang := strings.HasSuffix(t, "!")
			b.WriteString(escape(strings.TrimSuffix(t, "!")))
			if bang {
				b.WriteString("\\!")
			}
			lineStart = false
		}
		run.Reset()
	}
	for c := n.FirstChild(); c != nil; c = c.NextSibling() {
		switch v := c.(type) {
		case *ast.Text:
			run.WriteString(literal(v, source))
			switch {
			case oneLine && (v.SoftLineBreak() || v.HardLineBreak()):
				run.WriteByte(' ')
			case v.HardLineBreak():
				flush()
				b.WriteString("\\\n")
				lineStart = true
			case v.SoftLineBreak():
				flush()
				b.WriteString("\n")
				lineStart = true
			}
			continue
		case *ast.String:
			run.Write(v.Value)
			continue
		}
		flush()
		lineStart = false
		switch v := c.(type) {
		case *ast.Emphasis:
			mark := strings.Repeat("*", min(max(v.Level, 1), 2))
			b.WriteString(mark + w.inline(c, source, m) + mark)
		case *east.Strikethrough:
			b.WriteString("~~" + w.inline(c, source, m) + "~~")
		case *ast.CodeSpan:
			var code strings.Builder
			for k := c.FirstChild(); k != nil; k = k.NextSibling() {
				switch t := k.(type) {
				case *ast.Text:
					code.Write(t.Value(source))
				case *ast.String:
					code.Write(t.Value)
				}
			}
			b.WriteString(codeSpan(code.String(), m == inCell))
		case *ast.Link:
			fmt.Fprintf(&b, "[%s](<%s>)", w.inline(c, source, m), linkDest(v.Destination))
		case *ast.AutoLink:
			url := v.URL(source)
			if v.AutoLinkType == ast.AutoLinkEmail && !bytes.HasPrefix(bytes.ToLower(url), []byte("mailto:")) {
				url = append([]byte("mailto:"), url...)
			}
			fmt.Fprintf(&b, "[%s](<%s>)", escape(string(v.Label(source))), linkDest(url))
		default:
			b.WriteString(w.inline(c, source, m))
		}
	}
	flush()
	return b.String()
}

// literal is the text a Text node stands for: backslash escapes and
// entity references resolved, as goldmark's HTML writer resolves them.
func literal(t *ast.Text, source []byte) string {
	v := t.Value(source)
	if t.IsRaw() {
		return string(v)
	}
	v = util.UnescapePunctuations(v)
	v = util.ResolveNumericReferences(v)
	return string(util.ResolveEntityNames(v))
}

// codeSpan writes s as a code span whose fence is longer than any run of
// backticks in it; inside a table cell a pipe is escaped.
func codeSpan(s string, cell bool) string {
	s = strings.ReplaceAll(s, "\n", " ")
	if cell {
		s = strings.ReplaceAll(s, "|", "\\|")
	}
	fence := strings.Repeat("`", longestRun(s, '`')+1)
	if strings.HasPrefix(s, "`") || strings.HasSuffix(s, "`") || strings.HasPrefix(s, " ") && strings.HasSuffix(s, " ") {
		s = " " + s + " "
	}
	return fence + s + fence
}

// linkDest writes an allowed address for a link destination in angle
// brackets, percent-encoding what angle brackets cannot hold.
func linkDest(u []byte) string {
	var b strings.Builder
	for _, c := range u {
		switch {
		case c == '<' || c == '>' || c == '\\' || c == '`' || c <= ' ' || c == 0x7f:
			fmt.Fprintf(&b, "%%%02X", c)
		default:
			b.WriteByte(c)
		}
	}
	return b.String()
}

func longestRun(s string, c byte) int {
	best, n := 0, 0
	for i := 0; i < len(s); i++ {
		if s[i] == c {
			n++
			best = max(best, n)
		} else {
			n = 0
		}
	}
	return best
}

func isWord(s string) bool {
	for _, r := range s {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '-' || r == '_' || r == '+') {
			return false
		}
	}
	return s != ""
}
