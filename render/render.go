// Package render writes a report.Report as a self-contained HTML page and
// as Markdown with its figures as SVG files, and writes all of a run's
// files atomically (WriteReport).
//
// Renderers only read the Report: the analysis computed every number,
// including the per-point plot data in Study.Plot; this package selects,
// orders, formats and draws. The same Report always gives the same bytes:
// numbers have fixed formats, studies keep manifest order, and the only
// time printed is Report.Generated, the run date (SOURCE_DATE_EPOCH when set).
//
// The HTML page inlines its stylesheet (a theme from bivar/themes) and its
// SVG figures, loads nothing, needs no JavaScript, and carries a
// Content-Security-Policy that forbids every network load; its only style
// source is allowed by hash. Every text from the manifest or the data is
// escaped by html/template (page) or by package chart (SVG); study notes
// are Markdown rendered by goldmark with raw HTML disabled and images shown
// as their alt text.
package render

import (
	"bytes"
	"crypto/sha256"
	"embed"
	"encoding/base64"
	"fmt"
	htmltemplate "html/template"
	"io"
	"path"
	"strings"
	"text/template"

	"bivar/analysis/report"
	"bivar/internal/cleantext"
	"bivar/internal/publish"
	"bivar/render/chart"
	"bivar/render/internal/mdtext"
	"bivar/themes"
)

//go:embed templates/*.tmpl
var templateFS embed.FS

// Templates are parsed once, strictly: a missing key is an error.
var (
	htmlTmpl = htmltemplate.Must(htmltemplate.New("html").Funcs(htmltemplate.FuncMap{
		// svg marks chart output as trusted markup. It is the only place
		// that does: package chart escapes every label it draws.
		"svg":       func(s string) htmltemplate.HTML { return htmltemplate.HTML(s) },
		"notes":     func(s string) htmltemplate.HTML { return htmltemplate.HTML(s) }, // goldmark output, raw HTML disabled
		"rowClass":  rowClass,
		"rowLink":   rowLink,
		"isCode":    isCode,
		"cellClass": cellClass,
	}).Option("missingkey=error").ParseFS(templateFS, "templates/report.html.tmpl"))

	mdTmpl = template.Must(template.New("md").Funcs(template.FuncMap{
		"md":    mdtext.Escape,
		"label": mdtext.Label,
		"table": mdTable,
		"notes": mdNotes,
	}).Option("missingkey=error").ParseFS(templateFS, "templates/report.md.tmpl"))
)

func rowClass(t table, i int) string {
	if i < len(t.Classes) {
		return t.Classes[i]
	}
	return ""
}

func rowLink(t table, i int) string {
	if i < len(t.Links) {
		return t.Links[i]
	}
	return ""
}

// cellClass is the class of a body cell: "n" for numbers, "nw" for a
// column that must not wrap.
func cellClass(t table, col int) string {
	switch {
	case col < len(t.Num) && t.Num[col]:
		return "n"
	case col < len(t.NoWrap) && t.NoWrap[col]:
		return "nw"
	}
	return ""
}

// isCode says whether cell c of column col is written as code: a column
// marked Code, except an empty or undefined cell.
func isCode(t table, col int, c string) bool {
	return col < len(t.Code) && t.Code[col] && c != "" && c != na
}

// config holds the options; newConfig spells out every default.
type config struct {
	theme     string       // theme name; default themes.Default ("paper")
	figureDir string       // folder of the SVG figures beside report.md; default "figures"
	css       string       // the theme's stylesheet
	drawer    chart.Drawer // draws the figures with the theme's colours
}

// Option configures HTML, Markdown, Figures and WriteReport.
type Option func(*config)

// WithTheme chooses the theme by name (see themes.Names). "" means the default.
func WithTheme(name string) Option { return func(c *config) { c.theme = name } }

// WithFigureDir sets the folder, relative to report.md, that holds its SVG
// figures. The default is "figures".
func WithFigureDir(dir string) Option { return func(c *config) { c.figureDir = dir } }

func newConfig(opts []Option) (*config, error) {
	c := &config{theme: themes.Default, figureDir: defaultFigureDir}
	for _, o := range opts {
		o(c)
	}
	if c.theme == "" {
		c.theme = themes.Default
	}
	css, err := themes.CSS(c.theme)
	if err != nil {
		return nil, err
	}
	pal, err := themes.ChartPalette(c.theme)
	if err != nil {
		return nil, err
	}
	c.figureDir = strings.Trim(path.Clean(strings.ReplaceAll(c.figureDir, "\\", "/")), "/")
	if c.figureDir == "" || c.figureDir == "." || strings.HasPrefix(c.figureDir, "..") {
		return nil, fmt.Errorf("figure folder %q: want a folder inside the report folder, such as \"figures\"", c.figureDir)
	}
	c.css, c.drawer = css, chart.NewSVG(pal)
	return c, nil
}

// pageCSS is the theme plus the print page box with the report's name in
// the running header. The page is portrait in the printer's paper size
// (A4 or Letter: the layout fits both).
// The caution stands in every printed page's footer.
func pageCSS(theme, title, caution string) string {
	return theme + "\n@page {\n  size: portrait;\n  margin: 14mm 12mm 17mm;\n" +
		"  @top-left { content: " + cssString(title) + "; font: 8pt sans-serif; color: #444444; }\n" +
		"  @top-right { content: \"bivar report\"; font: 8pt sans-serif; color: #444444; }\n" +
		"  @bottom-left { content: " + cssString(caution) + "; font: 6.5pt sans-serif; color: #444444; width: 80%; }\n" +
		"  @bottom-right { content: \"page \" counter(page) \" of \" counter(pages); font: 8pt sans-serif; color: #444444; }\n}\n"
}

// cssString quotes s as a CSS string, escaping every character that is not
// a letter, digit or space as a CSS hex escape, so no text can end the
// string or the <style> element. Each escape ends with the one space that
// CSS consumes after a hex escape (CSS Syntax 3, §4.3.7), so a space that
// follows in s is kept: "demo: line" stays "demo: line".
func cssString(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range s {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == ' ':
			b.WriteRune(r)
		case r < 0x20 || r == 0x7f:
			b.WriteByte(' ')
		default:
			fmt.Fprintf(&b, "\\%x ", r)
		}
	}
	b.WriteByte('"')
	return b.String()
}

// csp is the Content-Security-Policy of the page: nothing may be loaded or
// run; the one inline stylesheet is allowed by its SHA-256.
func csp(css string) string {
	sum := sha256.Sum256([]byte(css))
	return "default-src 'none'; style-src 'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) +
		"'; img-src 'none'; script-src 'none'; base-uri 'none'; form-action 'none'"
}

// HTML writes r as one self-contained HTML page. Nothing is written when
// an error occurs.
func HTML(w io.Writer, r *report.Report, opts ...Option) error {
	b, err := htmlBytes(r, opts)
	if err != nil {
		return err
	}
	_, err = w.Write(b)
	return err
}

func htmlBytes(r *report.Report, opts []Option) ([]byte, error) {
	p, cfg, err := pageOf(r, opts)
	if err != nil {
		return nil, err
	}
	return htmlOf(p, cfg)
}

// pageOf builds r's page (charts drawn, sentences written) with the
// settings opts give: what both reports show, built once for both.
func pageOf(r *report.Report, opts []Option) (*page, *config, error) {
	if r == nil {
		return nil, nil, fmt.Errorf("no report to render")
	}
	cfg, err := newConfig(opts)
	if err != nil {
		return nil, nil, err
	}
	p, err := buildPage(r, cfg)
	if err != nil {
		return nil, nil, err
	}
	return p, cfg, nil
}

// htmlOf is the HTML page of p.
func htmlOf(p *page, cfg *config) ([]byte, error) {
	css := pageCSS(cfg.css, p.Title, p.Caution)
	var b bytes.Buffer
	err := htmlTmpl.ExecuteTemplate(&b, "page", map[string]any{
		"Page": p, "CSS": htmltemplate.CSS(css), "CSP": csp(css),
	})
	if err != nil {
		return nil, fmt.Errorf("html report: %w", err)
	}
	return cleantext.Bytes(b.Bytes()), nil
}

// Markdown writes r as Markdown for code review. Figures are linked as
// <figure dir>/<study>-<kind>.svg; Figures returns those files and
// WriteReport writes them beside report.md. Nothing is written when an
// error occurs.
func Markdown(w io.Writer, r *report.Report, opts ...Option) error {
	b, _, err := markdownBytes(r, opts)
	if err != nil {
		return err
	}
	_, err = w.Write(b)
	return err
}

func markdownBytes(r *report.Report, opts []Option) ([]byte, *page, error) {
	p, _, err := pageOf(r, opts)
	if err != nil {
		return nil, nil, err
	}
	b, err := markdownOf(p)
	return b, p, err
}

// markdownOf is the Markdown report of p (its figures are figureFiles(p)).
func markdownOf(p *page) ([]byte, error) {
	var b bytes.Buffer
	if err := mdTmpl.ExecuteTemplate(&b, "page", p); err != nil {
		return nil, fmt.Errorf("markdown report: %w", err)
	}
	return cleantext.Bytes(squeezeBlank(b.Bytes())), nil
}

// File is one file of the report: a slash-separated name relative to the
// report folder and its bytes.
type File = publish.File

// Figures returns the SVG files report.md links to, in study order.
func Figures(r *report.Report, opts ...Option) ([]File, error) {
	_, p, err := markdownBytes(r, opts)
	if err != nil {
		return nil, err
	}
	return figureFiles(p), nil
}

func figureFiles(p *page) []File {
	var out []File
	for _, s := range p.Studies {
		for _, f := range s.Figures {
			out = append(out, File{Name: f.File, Data: cleantext.Bytes([]byte(f.SVG))})
		}
	}
	return out
}

// squeezeBlank collapses runs of blank lines to one and ends the text with
// exactly one newline, so the template's layout cannot leak into the file.
func squeezeBlank(b []byte) []byte {
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	out := make([]string, 0, len(lines))
	blank := false
	for _, l := range lines {
		l = strings.TrimRight(l, " \t")
		if l == "" {
			if blank {
				continue
			}
			blank = true
		} else {
			blank = false
		}
		out = append(out, l)
	}
	return []byte(strings.Join(out, "\n") + "\n")
}
