package render

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/yuin/goldmark/ast"
	"github.com/yuin/goldmark/text"
	"golang.org/x/net/html"

	"bivar/analysis"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/render/internal/fixture"
)

// This file holds the checks that nothing in a report is live, whatever
// the names, labels, values and notes hold, and the fuzz targets that
// apply them. The report's own links, the only ones allowed besides the
// notes' http, https and mailto links, are:
//   - report.html: fragment links "#…" (summary rows to their studies,
//     SVG clip paths), and the SVG namespace URI in xmlns attributes;
//   - report.md: the figures, ![…](figures/<study>-<kind>.svg).

// rawText fails on what no output may hold: invalid UTF-8 and control
// characters other than tab and line feed.
func rawText(out string) error {
	if !utf8.ValidString(out) {
		return fmt.Errorf("invalid UTF-8")
	}
	for i, r := range out {
		if r < 0x20 && r != '\t' && r != '\n' || r >= 0x7f && r <= 0x9f {
			return fmt.Errorf("control character %U at byte %d", r, i)
		}
	}
	return nil
}

// urlAttrs are the attributes whose value is loaded or followed.
var urlAttrs = map[string]bool{"href": true, "src": true, "srcset": true, "action": true, "formaction": true,
	"poster": true, "background": true, "data": true, "codebase": true, "cite": true, "ping": true, "xlink:href": true}

// liveElements load or run something, or could.
var liveElements = map[string]bool{"script": true, "iframe": true, "frame": true, "object": true, "embed": true,
	"img": true, "image": true, "link": true, "base": true, "form": true, "input": true, "button": true,
	"audio": true, "video": true, "source": true, "track": true, "picture": true, "portal": true,
	"foreignobject": true, "applet": true, "animate": true, "set": true, "math": true}

// checkHTML parses page as a browser would (golang.org/x/net/html) and
// fails on anything live: a script or other loading element, an event
// handler attribute, a URL other than a fragment or an allowed link (an
// <a href> to http, https or mailto), a style that loads (url() other
// than a fragment, @import), a refresh, or more than the one stylesheet.
func checkHTML(page string) error {
	if err := rawText(page); err != nil {
		return err
	}
	doc, err := html.Parse(strings.NewReader(page))
	if err != nil {
		return err
	}
	styles := 0
	var walk func(n *html.Node) error
	walk = func(n *html.Node) error {
		if n.Type == html.ElementNode {
			tag := strings.ToLower(n.Data)
			if liveElements[tag] {
				return fmt.Errorf("element <%s>", tag)
			}
			if tag == "style" {
				styles++
				if n.FirstChild != nil {
					css := strings.ToLower(n.FirstChild.Data)
					if strings.Contains(css, "@import") || loadURL.MatchString(css) {
						return fmt.Errorf("the stylesheet loads something")
					}
				}
			}
			for _, a := range n.Attr {
				key := strings.ToLower(a.Key)
				if a.Namespace != "" {
					key = strings.ToLower(a.Namespace) + ":" + key
				}
				val := strings.TrimSpace(a.Val)
				switch {
				case strings.HasPrefix(key, "on"):
					return fmt.Errorf("event handler %s=%q on <%s>", key, a.Val, tag)
				case key == "style" && strings.Contains(strings.ToLower(val), "url("):
					return fmt.Errorf("style with url() on <%s>", tag)
				case key == "http-equiv" && strings.EqualFold(val, "refresh"):
					return fmt.Errorf("a refresh")
				case key == "xmlns" || strings.HasPrefix(key, "xmlns:"):
					if val != "http://www.w3.org/2000/svg" && val != "http://www.w3.org/1999/xlink" {
						return fmt.Errorf("namespace %q", val)
					}
				case urlAttrs[key]:
					switch {
					case strings.HasPrefix(val, "#"):
					case tag == "a" && key == "href" && allowedURL([]byte(val)):
					default:
						return fmt.Errorf("<%s %s=%q>", tag, key, a.Val)
					}
				}
			}
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			if err := walk(c); err != nil {
				return err
			}
		}
		return nil
	}
	if err := walk(doc); err != nil {
		return err
	}
	if styles != 1 {
		return fmt.Errorf("%d stylesheets, want 1", styles)
	}
	return nil
}

var loadURL = regexp.MustCompile(`url\(\s*['"]?[^#'"\s]`)

var ownFigure = regexp.MustCompile(`^figures/[a-z0-9_-]+-(scatter|residuals|order)\.svg$`)

// checkMarkdown parses md as GitHub-flavoured Markdown (goldmark v1.8.7
// with extension.GFM, the reader in notes_test.go) and fails on raw HTML,
// an image other than the report's own figures, or a link, except a link
// to http, https or mailto in a "Notes" section (from the h3 "Notes" that
// bivar writes, data text never making a heading, to the next study or
// the closing line).
func checkMarkdown(md string) error {
	if err := rawText(md); err != nil {
		return err
	}
	src := []byte(md)
	doc := gfm.Parser().Parse(text.NewReader(src))
	inNotes := false
	return ast.Walk(doc, func(n ast.Node, entering bool) (ast.WalkStatus, error) {
		if !entering {
			return ast.WalkContinue, nil
		}
		switch v := n.(type) {
		case *ast.Heading:
			if n.Parent() == doc {
				inNotes = v.Level == 3 && string(n.Text(src)) == "Notes" //nolint:staticcheck // plain heading text
			}
		case *ast.ThematicBreak:
			// bivar's own rules stand before a study's h2 and before the
			// closing line; a rule inside the notes does neither.
			if next := n.NextSibling(); n.Parent() == doc && (next == nil || next.NextSibling() == nil || next.Kind() == ast.KindHeading && next.(*ast.Heading).Level == 2) {
				inNotes = false
			}
		case *ast.RawHTML, *ast.HTMLBlock:
			return ast.WalkStop, fmt.Errorf("raw HTML %q", n.Text(src)) //nolint:staticcheck // the text is for the message only
		case *ast.Image:
			if !ownFigure.Match(v.Destination) {
				return ast.WalkStop, fmt.Errorf("image %q", v.Destination)
			}
		case *ast.Link:
			if !inNotes || !allowedURL(v.Destination) {
				return ast.WalkStop, fmt.Errorf("link to %q", v.Destination)
			}
		case *ast.AutoLink:
			if !inNotes || v.AutoLinkType == ast.AutoLinkURL && !allowedURL(v.URL(src)) {
				return ast.WalkStop, fmt.Errorf("autolink %q", v.URL(src))
			}
		}
		return ast.WalkContinue, nil
	})
}

// svgs returns the inline SVG figures of an HTML page.
func svgs(page string) []string {
	var out []string
	for {
		i := strings.Index(page, "<svg ")
		if i < 0 {
			return out
		}
		j := strings.Index(page[i:], "</svg>")
		if j < 0 {
			return append(out, page[i:])
		}
		out = append(out, page[i:i+j+len("</svg>")])
		page = page[i+j:]
	}
}

// checkReport renders r as HTML and Markdown and checks both.
func checkReport(t *testing.T, r *report.Report, what string) {
	t.Helper()
	var page, md bytes.Buffer
	if err := HTML(&page, r); err != nil {
		t.Fatalf("HTML: %v", err)
	}
	if err := checkHTML(page.String()); err != nil {
		t.Fatalf("%s: report.html: %v", what, err)
	}
	for _, svg := range svgs(page.String()) {
		if err := fixture.WellFormed([]byte(svg)); err != nil {
			t.Fatalf("%s broke an SVG: %v", what, err)
		}
	}
	if err := Markdown(&md, r); err != nil {
		t.Fatalf("Markdown: %v", err)
	}
	if err := checkMarkdown(md.String()); err != nil {
		t.Fatalf("%s: report.md: %v", what, err)
	}
}

// FuzzHostileNames puts arbitrary text into every name, label, value and
// note of a small invented report (one study that ran, with groups, run
// order and flagged rows, and one that failed): rendering must not fail,
// every SVG must stay well-formed XML, and checkReport must find nothing
// live. The report is small so that one input takes milliseconds.
func FuzzHostileNames(f *testing.F) {
	for _, seed := range []string{"", "<script>", "</svg>", "a & b", "\"'", "\x00\xff\xfe\x1b[2J\r", "]]>", "<!--", "{{.}}",
		"|---|", "# h", "![x](http://a/b.png)", "[x](javascript:alert(1))", "www.a.example a@b.example https://a.example",
		"\u2028\ufffe\u009b"} {
		f.Add(seed)
	}
	f.Fuzz(func(t *testing.T, s string) {
		if len(s) > 256 {
			return // keep each input fast: the text goes into every name
		}
		r := fixture.Report(fixture.Options{N: 12})
		r.Studies = []report.Study{r.Studies[0], r.Studies[2]}
		r.Manifest.Title = s
		r.Datasets[0].File = s
		for i := range r.Studies {
			st := &r.Studies[i]
			st.ID, st.Title, st.Notes = s+st.ID, s, s
			st.X.Label, st.Y.Unit, st.Group = s, s, s
			st.X.Symbol, st.Y.Symbol, st.GroupLabel, st.OrderLabel = s, s, s, s
			if st.Error != nil {
				st.Error = &s
			}
			if st.Plot != nil {
				for k := range st.Plot.Marked {
					st.Plot.Marked[k].Row = s
				}
				for k := range st.Plot.Levels {
					st.Plot.Levels[k] = s + st.Plot.Levels[k]
				}
			}
		}
		checkReport(t, r, fmt.Sprintf("text %q", s))
	})
}

// FuzzProject takes a CSV file and a manifest, byte for byte, through
// manifest.Load and analysis.Run to report.html and report.md, and checks
// them with checkReport. The seeds are small valid projects (the manifest
// in TOML's inline form, to keep it short) whose names, labels, values and
// notes are hostile; most mutations keep the manifest valid TOML, so the
// renderers see what a user's files can put in.
func FuzzProject(f *testing.F) {
	const (
		csv = "x,y,g\n1,2.1,a\n2,2.9,a\n3,4.2,b\n4,4.8,b\n"
		man = "dataset=[{id='d',file='d.csv'}]\nstudy=[{id='s',dataset='d',x='x',y='y',group='g',notes='n'}]\n"
	)
	f.Add([]byte(csv), []byte(man))
	f.Add([]byte("x,<b>y</b>,www.g.example\n1,2,a@b.example\n2,3,http://e.example\n3,5,[x](javascript:y)\n4,4,\x1b]8;;http://e/\x1b\\\n5,7,\xff\n"),
		[]byte("title='[t](javascript:x) <img src=x>'\ndataset=[{id='d',file='d.csv',labels={x=\"\\u001b[2J\"}}]\n"+
			"study=[{id='s',dataset='d',x='x',y='<b>y</b>',group='www.g.example',notes='[a](javascript:x) ![i](http://e/i.png) <b>x</b> www.e.example'}]\n"))
	f.Add([]byte(csv), []byte("title=\"t\\u001b[2J\\r\\u0085\"\n"+man))
	f.Fuzz(func(t *testing.T, csv, man []byte) {
		if len(csv) > 1024 || len(man) > 1024 {
			return // keep each input fast: the checks are about text, not size
		}
		dir := t.TempDir()
		if err := os.WriteFile(filepath.Join(dir, "d.csv"), csv, 0o644); err != nil {
			t.Fatal(err)
		}
		p := filepath.Join(dir, "bivar.toml")
		if err := os.WriteFile(p, man, 0o644); err != nil {
			t.Fatal(err)
		}
		m, err := manifest.Load(p)
		if err != nil {
			return
		}
		r, err := analysis.Run(m, analysis.Options{Version: "fuzz"})
		if err != nil {
			return
		}
		checkReport(t, r, "the project")
	})
}
