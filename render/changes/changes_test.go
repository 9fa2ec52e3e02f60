package changes

import (
	"bytes"
	"flag"
	"html/template"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"bivar/analysis/compare"
	"bivar/analysis/report"
	"bivar/themes"
)

var update = flag.Bool("update", false, "rewrite testdata/golden files")

// fixture is a Result built from hand-made moments (not check values: the
// numbers are tested in analysis/compare; here only their rendering).
func fixture() *compare.Result {
	mk := func(id string, n int, sxx, syy, sxy float64, f *report.Findings) report.Study {
		return report.Study{ID: id, Title: id, Dataset: "d", N: n,
			X: report.Variable{Column: "melt", Label: "Melt <temp>", Unit: "Cel"}, Y: report.Variable{Column: "shrink", Unit: "%"},
			Moments:  &report.Moments{N: n, MeanX: 50, MeanY: 10, Sxx: report.Float(sxx), Syy: report.Float(syy), Sxy: report.Float(sxy)},
			Describe: &report.DescribePair{X: report.Describe{N: n, Min: 40, Max: 60}},
			Findings: f}
	}
	gate := func(ok bool, got string) []report.Expectation {
		return []report.Expectation{{Name: "slope_within", Title: "slope within its limits", Want: "slope in [-0.2, -0.1] % per °C", Got: got, OK: ok,
			Limits: &report.Limits{Low: -0.2, High: -0.1}}}
	}
	fl := func(form, dir, str string) *report.Findings {
		return &report.Findings{Form: form, Direction: dir, Strength: str}
	}
	msg := "column \"shrink\" is constant"
	old := &report.Report{Schema: report.Schema, Tool: report.Tool{Name: "bivar", Version: "v1.0.0"},
		Manifest: report.ManifestInfo{Title: "Run A", Alpha: 0.05, Adjust: "holm"},
		Datasets: []report.Dataset{{ID: "d", File: "a.csv", SHA256: strings.Repeat("a", 64), Rows: 40}},
		Studies: []report.Study{
			withGate(mk("shrink-vs-melt", 40, 1000, 50, -180, fl("linear", "negative", "strong")), gate(true, "slope = -0.18 % per °C")),
			mk("<b>odd|id</b>", 40, 100, 100, 10, fl("none", "none", "weak")),
			mk("old-only", 40, 100, 100, 10, nil),
		}}
	failed := mk("<b>odd|id</b>", 0, 0, 0, 0, nil)
	failed.Moments, failed.Error = nil, &msg
	new := &report.Report{Schema: report.Schema, Tool: report.Tool{Name: "bivar", Version: "v1.0.0"},
		Manifest: report.ManifestInfo{Title: "Run B", Alpha: 0.05, Adjust: "holm"},
		Datasets: []report.Dataset{{ID: "d", File: "b.csv", SHA256: strings.Repeat("b", 64), Rows: 42}},
		Studies: []report.Study{
			withGate(mk("shrink-vs-melt", 42, 1100, 52, -90, fl("linear", "negative", "moderate")), gate(false, "slope = -0.08182 % per °C")),
			failed,
			mk("new-only", 42, 100, 100, 10, nil),
		}}
	res := compare.Diff(old, new, compare.Options{Tool: report.Tool{Name: "bivar", Version: "v1.0.0"}})
	res.Old.File, res.New.File = "runs/a/results.json", "runs/b/results.json"
	return res
}

func withGate(s report.Study, e []report.Expectation) report.Study {
	s.Expectations = e
	s.Predictions = []report.Prediction{{X: 55}}
	return s
}

func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", "golden", name)
	if *update {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs from %s (run go test -update after checking the change):\n%s", name, path, got)
	}
}

func TestMarkdownGolden(t *testing.T) {
	var buf bytes.Buffer
	if err := Markdown(&buf, fixture()); err != nil {
		t.Fatal(err)
	}
	golden(t, "diff.md", buf.Bytes())
}

func TestHTML(t *testing.T) {
	res0 := fixture()
	for _, theme := range themes.Names() {
		t.Run(theme, func(t *testing.T) {
			var buf bytes.Buffer
			if err := HTML(&buf, fixture(), WithTheme(theme)); err != nil {
				t.Fatal(err)
			}
			out := buf.String()
			css, _ := themes.CSS(theme)
			for _, want := range []string{
				`<meta http-equiv="Content-Security-Policy" content="default-src 'none';`,
				"<title>What changed: Run A → Run B</title>",
				"&lt;b&gt;odd|id&lt;/b&gt;", // the id escaped, never markup
				"strength", "moderate",
				"new-only", "old-only",
				report.Caution,
				compare.SlopeTest,
				css[:200],
				"<h2>What changed</h2>",
				res0.Statements[0],
				"<strong>shrink-vs-melt</strong> — ",
				res0.Studies[0].Statement,
				"Changed beyond chance (adjusted p below 0.05):",
				"<h2>CI gates</h2>",
				"1 of 1 CI gates changed its outcome; 1 now fails that did not fail before.",
				`<svg`, "Old run in long dashes, new run solid",
				`href="#study-shrink-vs-melt"`, `id="study-shrink-vs-melt"`,
			} {
				if !strings.Contains(out, want) && !strings.Contains(out, template.HTMLEscapeString(want)) && !strings.Contains(out, strings.ReplaceAll(template.HTMLEscapeString(want), "+", "&#43;")) {
					t.Errorf("diff.html lacks %q", want)
				}
			}
			out = strings.ReplaceAll(out, `xmlns="http://www.w3.org/2000/svg"`, "") // the inline chart's namespace, not a fetch
			for _, bad := range []string{"<script", "<b>odd", "http://", "https://", "src=", "@import"} {
				if strings.Contains(out, bad) {
					t.Errorf("diff.html contains %q", bad)
				}
			}
			if !strings.HasSuffix(out, "</html>\n") {
				t.Error("diff.html does not end with </html> and one newline")
			}
			// Tags balance for the elements the template opens.
			for _, tag := range []string{"table", "tr", "section", "ul", "td", "th"} {
				open := len(regexp.MustCompile(`<`+tag+`[ >]`).FindAllString(out, -1))
				if closed := strings.Count(out, "</"+tag+">"); open != closed {
					t.Errorf("<%s> opened %d times, closed %d", tag, open, closed)
				}
			}
		})
	}
	if err := HTML(&bytes.Buffer{}, fixture(), WithTheme("neon")); err == nil || !strings.Contains(err.Error(), "paper") {
		t.Errorf("unknown theme: err = %v, want one listing the themes", err)
	}
}

func TestWrite(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	if err := Write(dir, fixture()); err != nil {
		t.Fatal(err)
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	if strings.Join(names, " ") != ".bivar-contents diff.html diff.json diff.md figures" {
		t.Errorf("files %v, want the list of contents, diff.html, diff.json, diff.md, figures and no temporaries", names)
	}
	b, _ := os.ReadFile(filepath.Join(dir, "diff.json"))
	if _, err := compare.Read(bytes.NewReader(b)); err != nil {
		t.Errorf("diff.json does not read back: %v", err)
	}
	before, _ := os.ReadFile(filepath.Join(dir, "diff.md"))
	// A failure part-way leaves the previous files as they were.
	if err := Write(dir, &compare.Result{Schema: compare.Schema}, WithFormats("markdown", "pdf")); err == nil {
		t.Fatal("unknown format accepted")
	}
	after, _ := os.ReadFile(filepath.Join(dir, "diff.md"))
	if !bytes.Equal(before, after) {
		t.Error("a failed Write changed diff.md")
	}
	entries, _ = os.ReadDir(dir)
	if len(entries) != 5 {
		t.Errorf("a failed Write left %d files, want the 5 from before", len(entries))
	}
	if l, _ := os.ReadDir(filepath.Dir(dir)); len(l) != 1 {
		t.Errorf("beside the folder: %d entries, want only the folder", len(l))
	}
}

func TestEarlierFile(t *testing.T) {
	for rel, want := range map[string]bool{
		"diff.html": true, "diff.md": true, "diff.json": true, ".diff.md.123456.tmp": true,
		"report.html": false, "notes.txt": false, "sub/diff.html": false,
	} {
		if got := EarlierFile(rel, false); got != want {
			t.Errorf("EarlierFile(%q) = %v, want %v", rel, got, want)
		}
	}
	if EarlierFile("figures", true) {
		t.Error("EarlierFile(figures/) = true, want false")
	}
}

// TestScaledUnitsShown: a study on a transformed scale shows its figures
// with the scale's name for unit, as the report does ("ln y per ln x",
// "x (ln x)"), never the recorded symbol of a logarithm; its chart places
// the lines by the transformed values and labels the ticks in recorded
// units (the figure's scales set).
func TestScaledUnitsShown(t *testing.T) {
	res := fixture()
	res.Studies[0].XScale, res.Studies[0].YScale = "log", "log"
	var md, html bytes.Buffer
	if err := Markdown(&md, res); err != nil {
		t.Fatal(err)
	}
	if err := HTML(&html, res); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"| x (ln x) | Old (ln y) | New (ln y) | Change (ln y) | ± SE (ln y) |", "| `shrink-vs-melt` | ln y per ln x |", " ln y |\n", "Slope gate: -0.2 to -0.1 ln y per ln x."} {
		if !strings.Contains(md.String(), want) {
			t.Errorf("diff.md lacks %q", want)
		}
	}
	for _, want := range []string{`<th class="n">x (ln x)</th>`, "<small>ln y per ln x</small>"} {
		if !strings.Contains(html.String(), want) {
			t.Errorf("diff.html lacks %q", want)
		}
	}
	if f := runsFigure(res, 0); f == nil || f.XScale != "log" || f.YScale != "log" {
		t.Errorf("runs figure %+v: want both scales log", f)
	}
}

// TestOneTitle: two runs of one manifest (a production run against the
// last one) have one title, and the heading says it once; two titles are
// both said.
func TestOneTitle(t *testing.T) {
	res := fixture()
	res.Old.Title, res.New.Title = "Line 7 weekly", "Line 7 weekly"
	var md, page bytes.Buffer
	if err := Markdown(&md, res); err != nil {
		t.Fatal(err)
	}
	if err := HTML(&page, res); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(md.String(), "# What changed: Line 7 weekly\n") || !strings.Contains(page.String(), "<h1>What changed: Line 7 weekly</h1>") {
		t.Errorf("one title: want the heading to say it once")
	}
	res.New.Title = "Line 7 weekly, new gauge"
	md.Reset()
	if err := Markdown(&md, res); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(md.String(), "# What changed: Line 7 weekly → Line 7 weekly, new gauge\n") {
		t.Errorf("two titles: want both in the heading")
	}
}
