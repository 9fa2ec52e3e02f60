package changes

import (
	"bytes"
	"regexp"
	"strings"
	"testing"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/extension"
	"github.com/yuin/goldmark/text"

	fx "bivar/render/internal/fixture"
)

var ownFigure = regexp.MustCompile(`^figures/s[0-9]+-runs\.svg$`)

// TestMarkdownHostileStrings: with every text of a Result set to hostile
// text, diff.md read as GitHub-flavoured Markdown (goldmark v1.8.7 with
// extension.GFM) holds no link, image, autolink or raw HTML, other than
// the image of its own old-against-new chart.
func TestMarkdownHostileStrings(t *testing.T) {
	gfm := goldmark.New(goldmark.WithExtensions(extension.GFM))
	for _, s := range []string{
		"<img src=x onerror=alert(1)>", "[x](javascript:alert(1))", "![i](http://e.example/i.png)", "http://e.example",
		"www.e.example", "qa@e.example", "`<b>`", "a|b`<b>`", "x]: http://e.example", "<http://e.example>",
	} {
		res := fixture()
		fx.FillStrings(res, s)
		var b bytes.Buffer
		if err := Markdown(&b, res); err != nil {
			t.Fatal(err)
		}
		src := b.Bytes()
		doc := gfm.Parser().Parse(text.NewReader(src))
		err := ast.Walk(doc, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
			if entering {
				// The one image diff.md may hold is our own chart, by a
				// name we make from the study's position.
				if img, ok := n.(*ast.Image); ok && ownFigure.Match(img.Destination) {
					return ast.WalkSkipChildren, nil
				}
				switch n.Kind() {
				case ast.KindLink, ast.KindImage, ast.KindAutoLink, ast.KindRawHTML, ast.KindHTMLBlock:
					t.Errorf("text %q makes a %s in diff.md", s, n.Kind())
					return ast.WalkStop, nil
				}
			}
			return ast.WalkContinue, nil
		})
		if err != nil {
			t.Fatal(err)
		}
		if t.Failed() {
			lines := strings.Split(b.String(), "\n")
			for _, l := range lines {
				if strings.Contains(l, "<") || strings.Contains(l, "](") || strings.Contains(l, "http") {
					t.Log(l)
				}
			}
			return
		}
	}
}
