package mdtext

import (
	"bytes"
	"regexp"
	"strings"
	"testing"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/extension"
)

func TestEscape(t *testing.T) {
	cases := []struct{ in, want string }{
		{"plain text 1.5", "plain text 1.5"},
		{"-0.98", "-0.98"}, {"- item", "\\- item"}, {"# head", "\\# head"}, {"ambient_rh", "ambient_rh"},
		{"_x_", "\\_x\\_"}, {"a*b", "a\\*b"}, {"<b>", "\\<b>"}, {"</svg>", "\\</svg>"}, {"<!--", "\\<!--"},
		{"<script>alert(1)</script>", `\<script>alert(1)\</script>`},
		{"R&D", "R&D"}, {"&amp;", "\\&amp;"}, {"&#60;", "\\&#60;"}, {"p < 0.001", "p < 0.001"}, {"a > b", "a > b"}, {"> quote", "\\> quote"},
		{"2026. year", "2026\\. year"}, {"3) item", "3\\) item"}, {"r = 0.5. Next", "r = 0.5. Next"}, {"[lbf_av]", "[lbf_av]"},
		{"[x](javascript:alert(1))", "[x\\](javascript:alert(1))"}, {"![a](b)", "\\![a\\](b)"}, {"[a][b]", "[a\\][b]"}, {"[a]: http://e", "[a\\]: http\\://e"},
		{"two\nlines\tand\rtab", "two lines and tab"}, {"a|b", "a|b"}, {"−0.98", "−0.98"}, {`back\slash`, `back\\slash`},
		{"see http://x.example/a", "see http\\://x.example/a"}, {"HTTPS://x.example", "HTTPS\\://x.example"},
		{"www.x.example", "www\\.x.example"}, {"(WWW.x.example)", "(WWW\\.x.example)"},
		{"ask qa@plant.example", "ask qa\\@plant.example"}, {"mailto:a@b.example", "mailto:a\\@b.example"},
		{"ends with !", "ends with !"}, {"wow![", "wow\\!["},
	}
	for _, tc := range cases {
		if got := Escape(tc.in); got != tc.want {
			t.Errorf("Escape(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// gfm renders Markdown as GitHub-flavoured Markdown (goldmark v1.8.7 with
// extension.GFM: tables, strikethrough, autolinks, task lists); raw HTML
// is passed through (html.WithUnsafe is not set, so goldmark writes a
// "raw HTML omitted" comment for it, which the test looks for).
var gfm = goldmark.New(goldmark.WithExtensions(extension.GFM))

var live = regexp.MustCompile(`<a |<img |raw HTML omitted|<script|<input|<h[1-6]|<li>|<blockquote>|<hr|<table`)

// TestEscapeInert: escaped text, alone, after text, at the start of a
// table cell or a list item, renders as one paragraph (or cell, or item)
// of plain text, and reads back as the original.
func TestEscapeInert(t *testing.T) {
	hostile := []string{
		"<script>alert(1)</script>", "<img src=x onerror=alert(1)>", "<!-- c -->", "<?php ?>", "<a href='x'>x</a>",
		"[x](javascript:alert(1))", "[x]( http://e )", "![i](http://e/i.png)", "[a]: http://e", "[a][b]", "[a]",
		"<http://e.example>", "<a@b.example>", "http://e.example/x", "https://e.example", "ftp://e.example",
		"www.e.example", "qa@plant.example", "mailto:qa@plant.example", "xmpp:qa@plant.example",
		"# h", "- li", "+ li", "* li", "1. li", "2) li", "> q", "---", "===", "***", "    code", "```", "~~~",
		"| a | b |", "|---|", "&lt;b&gt;", "&#x3C;b>", "a\\", "x_y_z", "*a*", "~~s~~", "- [ ] task", "[^1]",
		"!", "]", "[", "www.", "http://", "@",
	}
	for _, h := range hostile {
		for _, doc := range []string{
			Escape(h),
			"text " + Escape(h),
			"| head |\n| --- |\n| " + Cell(h) + " |",
			"- " + Escape(h),
			"## " + Escape(h),
		} {
			var b bytes.Buffer
			if err := gfm.Convert([]byte(doc), &b); err != nil {
				t.Fatal(err)
			}
			html := b.String()
			own := strings.Count(doc, "(https://bivar.example/own)")
			if strings.HasPrefix(doc, "    ") {
				own = 0 // an indented code block, own link included
			}
			if got := strings.Count(html, "<a "); got != own {
				t.Errorf("%q as %q: %d links, want %d:\n%s", h, doc, got, own, html)
				continue
			}
			html = strings.ReplaceAll(html, `<a href="https://bivar.example/own">link</a>`, "")
			if m := live.FindString(strings.TrimPrefix(html, "<h2>")); m != "" && !(strings.HasPrefix(doc, "| ") && (m == "<table")) && !(strings.HasPrefix(doc, "- ") && m == "<li>") {
				t.Errorf("%q as %q makes %q:\n%s", h, doc, m, html)
			}
		}
	}
}

func TestLabel(t *testing.T) {
	for in, want := range map[string]string{"a [2J b": "a \\[2J b", "x](y)": "x\\](y)", "![i](u)": "\\!\\[i\\](u)", "[degF]": "\\[degF\\]"} {
		if got := Label(in); got != want {
			t.Errorf("Label(%q) = %q, want %q", in, got, want)
		}
		doc := "![" + Label(in) + "](figures/own.svg)"
		var b bytes.Buffer
		if err := gfm.Convert([]byte(doc), &b); err != nil {
			t.Fatal(err)
		}
		if strings.Count(b.String(), "<img") != 1 || strings.Contains(b.String(), "<a ") {
			t.Errorf("Label(%q) in an image: %s", in, b.String())
		}
	}
}

func TestCell(t *testing.T) {
	if got := Cell("a|b <b>"); got != "a\\|b \\<b>" {
		t.Errorf("Cell(a|b <b>) = %q", got)
	}
}

func TestCode(t *testing.T) {
	for in, want := range map[string]string{"": "", "[degF]": "`[degF]`", "a|b": "`a\\|b`", "a`b": "a\\`b", "http://x": "`http://x`"} {
		if got := Code(in); got != want {
			t.Errorf("Code(%q) = %q, want %q", in, got, want)
		}
	}
}
