package render

import (
	"bytes"
	"crypto/sha256"
	"encoding/base64"
	"flag"
	htmlstd "html"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/extension"
	"github.com/yuin/goldmark/renderer/html"

	"bivar/analysis/report"
	"bivar/render/internal/fixture"
	"bivar/themes"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/golden")

// The reports used in this file are invented (render/internal/fixture);
// they check structure, escaping, files and determinism, never a statistic.

func mustHTML(t *testing.T, r *report.Report, opts ...Option) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := HTML(&b, r, opts...); err != nil {
		t.Fatalf("HTML: %v", err)
	}
	return b.Bytes()
}

func mustMD(t *testing.T, r *report.Report, opts ...Option) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := Markdown(&b, r, opts...); err != nil {
		t.Fatalf("Markdown: %v", err)
	}
	return b.Bytes()
}

var svgRE = regexp.MustCompile(`(?s)<svg .*?</svg>\n`)

func TestWriteSample(t *testing.T) {
	dir := os.Getenv("BIVAR_RENDER_OUT")
	if dir == "" {
		t.Skip("set BIVAR_RENDER_OUT to a folder to write the invented report there for viewing")
	}
	for _, th := range themes.Names() {
		r := fixture.Report(fixture.Options{Hostile: th == "night"})
		if err := WriteReport(filepath.Join(dir, th), r, []string{"html", "markdown", "json"}, WithTheme(th)); err != nil {
			t.Fatal(err)
		}
	}
}

func TestHTMLStructure(t *testing.T) {
	r := fixture.Report(fixture.Options{})
	page := string(mustHTML(t, r))

	// Self-contained: no scripts, no external resources, a strict CSP.
	for _, bad := range []string{"<script", "<link", "<img", "<iframe", "<object", "@import", " src=", "javascript:"} {
		if strings.Contains(page, bad) {
			t.Errorf("report.html contains %q", bad)
		}
	}
	// url() only for fragment references (clip paths), http only as the SVG namespace.
	if m := regexp.MustCompile(`url\([^#]`).FindString(page); m != "" {
		t.Errorf("report.html refers to a resource: %q", m)
	}
	if n := strings.Count(page, "http://") - strings.Count(page, `xmlns="http://www.w3.org/2000/svg"`); n != 0 {
		t.Errorf("report.html contains %d http:// references besides the SVG namespace", n)
	}
	m := regexp.MustCompile(`<meta http-equiv="Content-Security-Policy" content="([^"]+)">`).FindStringSubmatch(page)
	if m == nil {
		t.Fatal("no Content-Security-Policy meta tag")
	}
	policy := htmlstd.UnescapeString(m[1])
	for _, want := range []string{"default-src 'none'", "img-src 'none'", "script-src 'none'"} {
		if !strings.Contains(policy, want) {
			t.Errorf("CSP %q lacks %q", policy, want)
		}
	}
	// The one stylesheet is allowed by its hash; an attacker's style is not.
	st := regexp.MustCompile(`(?s)<style>(.*?)</style>`).FindAllStringSubmatch(page, -1)
	if len(st) != 1 {
		t.Fatalf("%d <style> elements, want 1", len(st))
	}
	sum := sha256.Sum256([]byte(st[0][1]))
	if want := "'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"; !strings.Contains(policy, "style-src "+want) {
		t.Errorf("CSP style-src does not carry the stylesheet's hash %s", want)
	}
	if strings.Contains(page, " style=") {
		t.Error("an inline style attribute would be blocked by the CSP")
	}
	// Print: a study's heading never left at a page's foot, figures not split, a running header.
	for _, want := range []string{".study > header { break-after: avoid", "break-inside: avoid", "@top-left { content: \"Invented demo", "@media print"} {
		if !strings.Contains(page, want) {
			t.Errorf("print CSS lacks %q", want)
		}
	}
	// Top of the page: title, caution, summary with one row per study, provenance.
	for _, want := range []string{"<h1>Invented demo", report.Caution[:40], "finding and status", "Manifest SHA-256", r.Manifest.SHA256, r.Datasets[0].SHA256, "Rows left out, and why"} {
		if !strings.Contains(page, want) {
			t.Errorf("report.html lacks %q", want)
		}
	}
	// Studies in manifest order, each a section with an id.
	last := -1
	for _, s := range r.Studies {
		i := strings.Index(page, `<section class="study" id="study-`+s.ID+`"`)
		if i < 0 {
			t.Errorf("no section for study %s", s.ID)
			continue
		}
		if i < last {
			t.Errorf("study %s out of manifest order", s.ID)
		}
		last = i
	}
	// Per study content of the rich study.
	for _, want := range []string{"What the data show", "The numbers", "Unusual rows",
		"Other units: r = ", "Predictions",
		"Mean of many rows, 95%", "One new row, 95%", "no — not supported", `class="limits limits"`, "What may not be concluded",
		"<strong>press controller</strong>", "Without named row P0010", "Without all 2 flagged rows",
		"Resistant line, Theil–Sen (exact)", "This study did not run.", "< 0.0001", "The line within each level of Resin lot",
		"Other shapes, against the line", "a bend (parabola)", "Where the data lie", "Cuts for 60 rows: off the line beyond"} {
		if !strings.Contains(page, strings.ReplaceAll(strings.ReplaceAll(want, "<", "&lt;"), "&lt;strong>", "<strong>")) && !strings.Contains(page, want) {
			t.Errorf("report.html lacks %q", want)
		}
	}
	// Figures: scatter, residuals, order for the rich study; scatter and
	// residuals for the plain one; none for the failed one.
	svgs := svgRE.FindAllString(page, -1)
	if len(svgs) != 5 {
		t.Fatalf("%d inline SVG figures, want 5", len(svgs))
	}
	for i, s := range svgs {
		if err := fixture.WellFormed([]byte(s)); err != nil {
			t.Errorf("figure %d is not well-formed XML: %v", i, err)
		}
		for _, want := range []string{`width="`, `height="`, "<title id=", "<desc id=", `role="img"`} {
			if !strings.Contains(s[:400], want) {
				t.Errorf("figure %d lacks %s near its start", i, want)
			}
		}
	}
	// Elements open and close in pairs.
	for _, tag := range []string{"section", "figure", "table", "div", "ul", "tr", "svg", "header", "aside", "p"} {
		open := len(regexp.MustCompile(`<`+tag+`[ >]`).FindAllString(page, -1))
		if shut := strings.Count(page, "</"+tag+">"); open != shut {
			t.Errorf("%d <%s> but %d </%s>", open, tag, shut, tag)
		}
	}
	// The notes' image and raw HTML are not rendered.
	if !strings.Contains(page, "[image: logo]") || strings.Contains(page, "example.invalid/x.png") {
		t.Error("notes: the image should show as its alt text and raw HTML should be dropped")
	}
}

func TestHostileText(t *testing.T) {
	r := fixture.Report(fixture.Options{Hostile: true})
	page := string(mustHTML(t, r))
	if strings.Contains(page, "<script") || strings.Contains(page, "<b>") {
		t.Error("hostile text reached report.html as markup")
	}
	if strings.Count(page, "<svg ") != strings.Count(page, "</svg>") {
		t.Errorf("%d <svg> but %d </svg>: a label closed a figure", strings.Count(page, "<svg "), strings.Count(page, "</svg>"))
	}
	if !strings.Contains(page, "&lt;script&gt;alert(&#34;x&#34;)&lt;/script&gt; &amp; &lt;/svg&gt;") {
		t.Error("hostile text is not shown escaped in the page")
	}
	for i, s := range svgRE.FindAllString(page, -1) {
		if err := fixture.WellFormed([]byte(s)); err != nil {
			t.Errorf("figure %d with hostile labels is not well-formed: %v", i, err)
		}
		if strings.Contains(s, "<script") {
			t.Errorf("figure %d contains a script element", i)
		}
	}
	if !strings.Contains(page, "&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &lt;/svg&gt; &#39;q&#39;") {
		t.Error("hostile text is not shown escaped inside the SVG")
	}
	// Markdown: render it as a permissive GFM viewer would (tables,
	// autolinks, raw HTML allowed) and check that no element from the data
	// comes out.
	md := mustMD(t, r)
	var out bytes.Buffer
	if err := goldmark.New(goldmark.WithExtensions(extension.GFM), goldmark.WithRendererOptions(html.WithUnsafe())).Convert(md, &out); err != nil {
		t.Fatal(err)
	}
	got := out.String()
	for _, bad := range []string{"<script", "<b>", "</svg>", "<img src=\"http"} {
		if strings.Contains(got, bad) {
			t.Errorf("report.md rendered with raw HTML allowed contains %q", bad)
		}
	}
	if !strings.Contains(got, "&lt;script&gt;") {
		t.Error("report.md does not show the hostile text as text")
	}
	if n := strings.Count(got, "<table>"); n < 5 {
		t.Errorf("report.md rendered as GFM has %d tables: a hostile cell broke one", n)
	}
	files, err := Figures(r)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range files {
		if err := fixture.WellFormed(f.Data); err != nil {
			t.Errorf("%s: %v", f.Name, err)
		}
		if strings.ContainsAny(strings.TrimPrefix(f.Name, "figures/"), `<>"'&/\ `) {
			t.Errorf("figure file name %q carries unsafe characters", f.Name)
		}
	}
}

func TestDeterministic(t *testing.T) {
	for _, th := range themes.Names() {
		a := t.TempDir()
		b := t.TempDir()
		for _, dir := range []string{a, b} {
			if err := WriteReport(dir, fixture.Report(fixture.Options{Hostile: true}), Formats(), WithTheme(th)); err != nil {
				t.Fatal(err)
			}
		}
		n := 0
		filepath.WalkDir(a, func(p string, d os.DirEntry, err error) error {
			if err != nil || d.IsDir() {
				return err
			}
			rel, _ := filepath.Rel(a, p)
			x, _ := os.ReadFile(p)
			y, err := os.ReadFile(filepath.Join(b, rel))
			if err != nil || !bytes.Equal(x, y) {
				t.Errorf("%s: %s differs between two runs on the same input", th, rel)
			}
			n++
			return nil
		})
		if n != 3+5+1 {
			t.Errorf("%s: %d files written, want 9 (html, md, json, 5 figures and the list of contents)", th, n)
		}
	}
}

func TestGeneratedOnlyWhenSet(t *testing.T) {
	r := fixture.Report(fixture.Options{})
	if p := string(mustHTML(t, r)); strings.Contains(p, " · run ") {
		t.Error("a date appears although Report.Generated is empty")
	}
	r.Generated = "2026-11-30T06:00:00Z"
	if p := string(mustHTML(t, r)); !strings.Contains(p, "run 2026-11-30 06:00 UTC") {
		t.Error("Report.Generated is not shown")
	}
	if m := string(mustMD(t, r)); !strings.Contains(m, "run 2026-11-30 06:00 UTC") {
		t.Error("Report.Generated is not shown in Markdown")
	}
}

func TestThemes(t *testing.T) {
	r := fixture.Report(fixture.Options{})
	seen := map[string]bool{}
	for _, th := range themes.Names() {
		css, _ := themes.CSS(th)
		p := mustHTML(t, r, WithTheme(th))
		if !bytes.Contains(p, []byte(css[:200])) {
			t.Errorf("theme %s: its CSS is not inlined", th)
		}
		seen[string(p)] = true
	}
	if len(seen) != len(themes.Names()) {
		t.Error("two themes gave the same page")
	}
	err := HTML(io.Discard, r, WithTheme("neon"))
	if err == nil || !strings.Contains(err.Error(), "paper") {
		t.Errorf("unknown theme: err = %v, want one naming the themes", err)
	}
	if err := WriteReport(t.TempDir(), r, []string{"pdf"}); err == nil || !strings.Contains(err.Error(), "html, markdown, json") {
		t.Errorf("unknown format: err = %v, want one listing the formats", err)
	}
}

func TestLargeNStaysSmall(t *testing.T) {
	r := fixture.Report(fixture.Options{N: 200000})
	page := mustHTML(t, r)
	if len(page) > 2<<20 {
		t.Errorf("report.html is %d bytes with n = 200000, want under 2 MB", len(page))
	}
	if !bytes.Contains(page, []byte("drawn as density cells")) {
		t.Error("the caption does not say the points are drawn as density cells")
	}
	// The flagged rows are still drawn and labelled on top.
	if !bytes.Contains(page, []byte(">P0010</text>")) {
		t.Error("flagged row P0010 is not labelled in the density scatter")
	}
}

func TestWriteReportAtomic(t *testing.T) {
	dir := t.TempDir()
	r := fixture.Report(fixture.Options{})
	if err := WriteReport(dir, r, Formats()); err != nil {
		t.Fatal(err)
	}
	before := snapshot(t, dir)

	// A failing run must leave the previous report whole and no temporaries.
	r2 := fixture.Report(fixture.Options{Hostile: true})
	// 1. Failure before anything is written: an unknown format.
	if err := WriteReport(dir, r2, []string{"html", "pdf"}); err == nil {
		t.Fatal("unknown format accepted")
	}
	// 2. A folder that holds a file bivar did not write is refused before
	//    anything is written, so the user's file is never lost.
	//    (internal/publish stops a writer at each of its steps and checks
	//    the folder holds the old report or the new one, whole.)
	dir2 := t.TempDir()
	if err := WriteReport(dir2, r, Formats()); err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(dir2, "figures", "photo.jpg"), []byte("a user's"), 0o644)
	before2 := snapshot(t, dir2)
	if err := WriteReport(dir2, r2, Formats()); err == nil || !strings.Contains(err.Error(), "holds figures/photo.jpg, which bivar did not write there") {
		t.Fatalf("write into a folder holding a user's file: %v", err)
	}
	for name, snap := range map[string]map[string]string{dir: before, dir2: before2} {
		after := snapshot(t, name)
		for k, v := range snap {
			if after[k] != v {
				t.Errorf("%s changed after a failed run", k)
			}
		}
		for k := range after {
			if _, ok := snap[k]; !ok {
				t.Errorf("failed run left %s behind", k)
			}
		}
	}
}

func snapshot(t *testing.T, dir string) map[string]string {
	t.Helper()
	out := map[string]string{}
	filepath.WalkDir(dir, func(p string, d os.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		rel, _ := filepath.Rel(dir, p)
		b, _ := os.ReadFile(p)
		out[filepath.ToSlash(rel)] = string(b)
		return nil
	})
	return out
}

// outline reduces report.html to its structure: headings, section and
// figure openings, table captions and header cells, one per line. The
// golden file of the outline changes when the layout does, not when a
// number does.
func outline(page []byte) string {
	tags := regexp.MustCompile(`(?s)<(h1|h2|h3|section|figure|caption|th|svg|table|dt)\b([^>]*)>([^<]*)`)
	attrs := regexp.MustCompile(`\b(class|id|width|height)="[^"]*"`)
	var b strings.Builder
	for _, m := range tags.FindAllSubmatch(page, -1) {
		b.WriteString(string(m[1]))
		for _, a := range attrs.FindAll(m[2], -1) {
			b.WriteString(" " + string(a))
		}
		if txt := strings.TrimSpace(string(m[3])); txt != "" && string(m[1]) != "svg" {
			b.WriteString(" | " + txt)
		}
		b.WriteString("\n")
	}
	return b.String()
}

func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", "golden", name)
	if *update {
		os.MkdirAll(filepath.Dir(path), 0o755)
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./render/ -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		gl, wl := strings.Split(string(got), "\n"), strings.Split(string(want), "\n")
		for i := range min(len(gl), len(wl)) {
			if gl[i] != wl[i] {
				t.Fatalf("%s differs from the golden file at line %d:\n got  %s\n want %s\n(review, then go test ./render/ -update)", name, i+1, gl[i], wl[i])
			}
		}
		t.Fatalf("%s differs from the golden file in length (%d lines, want %d); review, then go test ./render/ -update", name, len(gl), len(wl))
	}
}

func TestGoldenFixture(t *testing.T) {
	r := fixture.Report(fixture.Options{Hostile: true})
	golden(t, "fixture.md", mustMD(t, r))
	golden(t, "fixture.html.outline", []byte(outline(mustHTML(t, r))))
}

func TestStaleFiguresRemoved(t *testing.T) {
	dir := t.TempDir()
	if err := WriteReport(dir, fixture.Report(fixture.Options{}), Formats()); err != nil {
		t.Fatal(err)
	}
	r := fixture.Report(fixture.Options{})
	r.Studies = r.Studies[1:] // the study gap-vs-force is gone
	if err := WriteReport(dir, r, Formats()); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(dir, "figures", "gap-vs-force-scatter.svg")); err == nil {
		t.Error("the figure of a study that is gone was left behind")
	}
	if _, err := os.Stat(filepath.Join(dir, "figures", "cure-vs-hold-scatter.svg")); err != nil {
		t.Error("a current figure was removed")
	}
}

// TestEarlierReportFolder: a report folder as bivar wrote it before
// folders were published whole (no list of contents, a stale figure, a
// temporary file of a writer that died) is replaced; one holding anything
// else is not.
func TestEarlierReportFolder(t *testing.T) {
	for _, tc := range []struct {
		name  string
		files []string
		err   string
	}{
		{"earlier", []string{"report.html", "report.md", "results.json", "figures/old-study-scatter.svg", "figures/.old-study-order.svg.123.tmp", ".results.json.99.tmp"}, ""},
		{"user-file", []string{"report.html", "todo.txt"}, "holds todo.txt, which bivar did not write there"},
		{"user-folder", []string{"report.html", "drafts/a.md"}, "holds drafts, which bivar did not write there"},
	} {
		dir := t.TempDir()
		for _, f := range tc.files {
			p := filepath.Join(dir, filepath.FromSlash(f))
			os.MkdirAll(filepath.Dir(p), 0o755)
			os.WriteFile(p, []byte("old"), 0o644)
		}
		err := WriteReport(dir, fixture.Report(fixture.Options{}), Formats())
		switch {
		case tc.err == "" && err != nil:
			t.Errorf("%s: %v", tc.name, err)
		case tc.err != "" && (err == nil || !strings.Contains(err.Error(), tc.err)):
			t.Errorf("%s: error %v, want one containing %q", tc.name, err, tc.err)
		case tc.err == "":
			got := snapshot(t, dir)
			if _, ok := got["figures/old-study-scatter.svg"]; ok || got["report.html"] == "old" {
				t.Errorf("%s: the earlier report was not replaced whole: %d files", tc.name, len(got))
			}
		}
	}
}

// TestDatasetSource: a dataset read from a database (or a workbook) shows
// where its rows came from in both reports: server, statement, time run.
func TestDatasetSource(t *testing.T) {
	r := fixture.Report(fixture.Options{})
	r.Datasets[0].Source = &report.Source{Kind: "postgresql", ServerVersion: "15.18 (invented)", Query: "SELECT force, gap FROM press ORDER BY 1, 2",
		RanAt: "2026-12-05T03:00:00Z", Connection: "LINE7_DB", StatementTimeout: "60s"}
	r.Datasets[0].MissingKinds = []report.KindCount{{Column: "gap", Kind: "#N/A", Count: 2}}
	page := string(mustHTML(t, r))
	var md bytes.Buffer
	if err := Markdown(&md, r); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"15.18 (invented)", "SELECT force, gap FROM press ORDER BY 1, 2", "2026-12-05T03:00:00Z", "LINE7_DB", "2 #N/A in gap"} {
		if !strings.Contains(page, want) {
			t.Errorf("report.html lacks %q", want)
		}
		if !strings.Contains(md.String(), want) {
			t.Errorf("report.md lacks %q", want)
		}
	}
}

// TestFirstScreenAndConventions checks the report's first screen and its
// number conventions on the fixture: the banner names each failed gate and
// links to an anchor that exists; the caution stands in the printed
// footer; one minus sign (the hyphen-minus) in both formats; no
// exponent-form p-value; a shape's turning point far from the data is not
// printed; fits of ln(y) are not compared with the line.
func TestFirstScreenAndConventions(t *testing.T) {
	r := fixture.Report(fixture.Options{})
	page, md := string(mustHTML(t, r)), string(mustMD(t, r))
	banner := regexp.MustCompile(`<div class="gate-banner" role="alert">.*?</div>`).FindString(page)
	if banner == "" {
		t.Fatal("no banner although a gate failed")
	}
	for _, m := range regexp.MustCompile(`href="#([^"]+)"`).FindAllStringSubmatch(banner, -1) {
		if !strings.Contains(page, `id="`+m[1]+`"`) {
			t.Errorf("the banner links to #%s, which no element carries", m[1])
		}
	}
	if !strings.Contains(page, "Does the line bend? (x² term)") || !strings.Contains(md, "Does the line bend? (x² term)") {
		t.Error("no table of every study's checks under the summary")
	}
	if !strings.Contains(md, "CI gate failed") {
		t.Error("report.md has no line naming the failed gate")
	}
	if !strings.Contains(page, "@bottom-left { content: "+cssString(r.Caution)) {
		t.Error("the caution is not in the printed pages' footer")
	}
	for name, out := range map[string]string{"report.html": page, "report.md": md} {
		if strings.Contains(out, "−") {
			t.Errorf("%s holds the minus sign U+2212: one convention per output, the hyphen-minus", name)
		}
		if m := regexp.MustCompile(`p = [0-9.]+e-`).FindString(out); m != "" {
			t.Errorf("%s prints a p-value in exponent form: %q", name, m)
		}
	}
	// The failed gate's row in the summary shows what the gate judged:
	// the figure found and the limit wanted, in the analysis's words.
	for _, e := range r.Studies[0].Expectations {
		if e.OK {
			continue
		}
		row := regexp.MustCompile(`(?m)^\| gap-vs-force.*$`).FindString(md)
		if !strings.Contains(row, "found "+e.Got) || !strings.Contains(row, "wanted "+e.Want) {
			t.Errorf("the summary row of a failed gate lacks its figures (found %q, wanted %q):\n%s", e.Got, e.Want, row)
		}
	}
	// Other shapes are compared with the line in words by what they would
	// mean, not listed by model name in a table of fits.
	for _, bad := range []string{"| quadratic", "| log-x", "| log-y", "| log-log", "R² of"} {
		if strings.Contains(md, bad) {
			t.Errorf("report.md lists the fits by model name: %q", bad)
		}
	}
	// Every check is a question answered in words first.
	_, checks, _ := strings.Cut(md, "*Checks of every study")
	checks, _, _ = strings.Cut(checks, "\n\n---")
	rows := regexp.MustCompile(`(?m)^\| (?:gap-vs-force|cure-vs-hold)[^|]*\|([^\n]*)$`).FindAllStringSubmatch(checks, -1)
	if len(rows) == 0 {
		t.Error("no checks table rows")
	}
	for _, row := range rows {
		for _, cell := range strings.Split(row[1], "|") {
			if c := strings.TrimSpace(cell); c != "" && !regexp.MustCompile(`^(Yes|No|not checked|none repeated|no run order declared|Not as a parabola|Too slightly to count)\b`).MatchString(c) {
				t.Errorf("a check is answered by %q, not in words first", c)
			}
		}
	}
	// A bend the x² term finds but the findings do not call a curve (too
	// little of the line's scatter taken away) is answered so, not "No"
	// beside a small p.
	f := r.Studies[0].Findings
	form, saved := f.Form, f.Checks
	f.Form = "linear"
	f.Checks = append(slices.Clone(saved), report.Check{Name: "curvature", Stat: 4.2, P: 0.0004, PAdjusted: 0.0012, Bound: report.NaN(), Raised: true, Adjusted: true})
	_, tbl, _ := strings.Cut(string(mustMD(t, r)), "*Checks of every study")
	if row := regexp.MustCompile(`(?m)^\| gap-vs-force[^|]*\|([^|]*)\|`).FindStringSubmatch(tbl); row == nil || strings.TrimSpace(row[1]) != "Too slightly to count (p 0.001)" {
		t.Errorf("a significant but slight bend is answered %q", row)
	}
	f.Form, f.Checks = form, saved
	// The fixture's quadratic turns at 44.4, near its data; then far out.
	if !strings.Contains(md, "turning at x = 44.40 kN") {
		t.Error("a turning point near the data is not printed")
	}
	r.Studies[0].Models[0].VertexNear = false
	md = string(mustMD(t, r))
	if !strings.Contains(md, "turning far outside the data") || strings.Contains(md, "turning at x = ") {
		t.Error("a turning point far from the data is printed as if it meant something")
	}
}
