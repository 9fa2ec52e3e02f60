package gate

import (
	"bytes"
	"testing"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/extension"
	"github.com/yuin/goldmark/text"

	"bivar/render/internal/fixture"
)

// TestSummaryHostileStrings: with every text of a report set to hostile
// text, the CI summary read as GitHub-flavoured Markdown (goldmark v1.8.7
// with extension.GFM) holds no link, image, autolink or raw HTML, and
// neither does the summary of a check that could not run.
func TestSummaryHostileStrings(t *testing.T) {
	gfm := goldmark.New(goldmark.WithExtensions(extension.GFM))
	for _, s := range []string{
		"<img src=x onerror=alert(1)>", "[x](javascript:alert(1))", "![i](http://e.example/i.png)", "http://e.example",
		"www.e.example", "qa@e.example", "`<b>`", "a|b`<b>`", "```\n<b>x</b>", "<http://e.example>",
	} {
		r := sample()
		fixture.FillStrings(r, s)
		var sum, failed bytes.Buffer
		if err := Summary(&sum, r); err != nil {
			t.Fatal(err)
		}
		if err := SummaryFailedRun(&failed, s, "bivar: "+s); err != nil {
			t.Fatal(err)
		}
		for name, md := range map[string][]byte{"summary": sum.Bytes(), "failed-run summary": failed.Bytes()} {
			doc := gfm.Parser().Parse(text.NewReader(md))
			_ = ast.Walk(doc, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
				if entering {
					switch n.Kind() {
					case ast.KindLink, ast.KindImage, ast.KindAutoLink, ast.KindRawHTML, ast.KindHTMLBlock:
						t.Errorf("text %q makes a %s in the %s:\n%s", s, n.Kind(), name, md)
						return ast.WalkStop, nil
					}
				}
				return ast.WalkContinue, nil
			})
		}
	}
}
