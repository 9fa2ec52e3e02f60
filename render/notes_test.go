package render

import (
	"bytes"
	"regexp"
	"strings"
	"testing"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/extension"
)

// gfm reads Markdown as GitHub does: goldmark v1.8.7 with extension.GFM
// (tables, strikethrough, autolinks, task lists); raw HTML is written as
// goldmark's "raw HTML omitted" comment, which the checks look for.
var gfm = goldmark.New(goldmark.WithExtensions(extension.GFM))

var hrefRE = regexp.MustCompile(`<a href="([^"]*)"`)

// liveHTML lists what must not appear in rendered notes.
func liveHTML(html string) string {
	for _, bad := range []string{"<img", "<script", "raw HTML omitted", "<iframe", "<input", " on", "javascript:", "vbscript:", "data:", "file:"} {
		if strings.Contains(strings.ToLower(html), bad) {
			return bad
		}
	}
	for _, m := range hrefRE.FindAllStringSubmatch(html, -1) {
		if !allowedURL([]byte(m[1])) {
			return "link to " + m[1]
		}
	}
	return ""
}

const hostileNotes = `Kept: [spec](https://e.example/spec), [mail](mailto:qa@e.example), <https://e.example/a>, www.e.example, qa@e.example, http://e.example/b.
Dropped: [js](javascript:alert(1)) [JS](JaVaScRiPt:alert(1)) [vb](vbscript:msgbox(1)) [file](file:///etc/passwd) [data](data:text/html;base64,PHNjcmlwdD4=)
[rel](../secret.html) [frag](#top) <ftp://e.example/f> ftp://e.example/g [ent](javascript&#58;alert(1)) [ref][r1] [r2]
![pixel](https://e.example/p.png) <img src=x onerror=alert(1)> <b onclick="x()">bold</b> <!-- c -->

[r1]: javascript:alert(2)
[r2
]: data:text/html,x

<script>alert(3)</script>

| a | b |
| - | - |
| [x](javascript:y) | ` + "`c|d`" + ` |

- item with [ok](http://e.example/c)
  > quote <i>x</i>

` + "```\n<script>in code</script>\n```\n\n# Head"

func TestNotesLinks(t *testing.T) {
	md := mdNotes(hostileNotes)
	var b bytes.Buffer
	if err := gfm.Convert([]byte(md), &b); err != nil {
		t.Fatal(err)
	}
	fromMD := b.String()
	fromHTML, err := notesHTML(hostileNotes)
	if err != nil {
		t.Fatal(err)
	}
	for name, html := range map[string]string{"report.md": fromMD, "report.html": fromHTML} {
		if bad := liveHTML(html); bad != "" {
			t.Errorf("%s notes hold %q:\n%s\n--- from Markdown:\n%s", name, bad, html, md)
		}
		var got []string
		for _, m := range hrefRE.FindAllStringSubmatch(html, -1) {
			got = append(got, m[1])
		}
		want := "https://e.example/spec mailto:qa@e.example https://e.example/a http://www.e.example mailto:qa@e.example http://e.example/b. http://e.example/c"
		if strings.Join(got, " ") != strings.ReplaceAll(want, "b. ", "b ") && strings.Join(got, " ") != want {
			t.Errorf("%s notes link to %q, want %q", name, got, want)
		}
		for _, text := range []string{"js", "vb", "rel", "frag", "[image: pixel]", "bold", "quote", "&lt;script&gt;in code", "<h4>Head</h4>"} {
			if !strings.Contains(html, text) {
				t.Errorf("%s notes lost the text %q:\n%s", name, text, html)
			}
		}
	}
}

// TestNotesMarkdownReadsBack: ordinary notes keep their structure in
// report.md: the same HTML comes from the notes and from what mdNotes
// writes for them. (The heading is h3, so that it is h6 both ways: each
// pass moves headings three levels down, to at most h6.)
func TestNotesMarkdownReadsBack(t *testing.T) {
	src := "*Invented.* The **drawing** asks for `36 to 44` HRC.\nSecond line_with_underscore & R&D, p < 0.05.\n\n" +
		"- one\n- two with [a link](https://e.example/x)\n\n1. first\n2. second\n\n> quoted\n\n### A heading\n\n| h | k |\n| :- | -: |\n| 1 | 2 |\n\n~~gone~~ and a hard  \nbreak"
	want, err := notesHTML(src)
	if err != nil {
		t.Fatal(err)
	}
	got, err := notesHTML(mdNotes(src))
	if err != nil {
		t.Fatal(err)
	}
	if got != want {
		t.Errorf("notes changed on the way through Markdown:\n%s\n--- want:\n%s\n--- Markdown:\n%s", got, want, mdNotes(src))
	}
}
