package render

import (
	"bytes"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/renderer"
	"github.com/yuin/goldmark/util"
)

// notesMD renders study notes. goldmark is used without html.WithUnsafe,
// so raw HTML in the notes is dropped and dangerous link targets are not
// written; images are replaced by their alt text (imageAsText), because a
// report must not fetch anything when it is opened.
var notesMD = goldmark.New(goldmark.WithRendererOptions(
	renderer.WithNodeRenderers(util.Prioritized(imageAsText{}, 100)),
))

func notesHTML(src string) (string, error) {
	var b bytes.Buffer
	if err := notesMD.Convert([]byte(src), &b); err != nil {
		return "", err
	}
	return b.String(), nil
}

// imageAsText renders an image as "[image: alt]" in plain text.
type imageAsText struct{}

func (imageAsText) RegisterFuncs(reg renderer.NodeRendererFuncRegisterer) {
	reg.Register(ast.KindImage, func(w util.BufWriter, source []byte, n ast.Node, entering bool) (ast.WalkStatus, error) {
		if entering {
			_, _ = w.WriteString("[image: ")
			return ast.WalkContinue, nil
		}
		_, _ = w.WriteString("]")
		return ast.WalkContinue, nil
	})
}
