package render_test

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"

	"bivar/analysis"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/render"
	"bivar/themes"
)

// findSample walks up from the test's folder to sample-project/bivar.toml.
func findSample(t *testing.T) string {
	t.Helper()
	dir, _ := os.Getwd()
	for {
		p := filepath.Join(dir, "sample-project", "bivar.toml")
		if _, err := os.Stat(p); err == nil {
			// Relative to the test's folder, so the manifest path the
			// report shows is the same in every checkout.
			cwd, _ := os.Getwd()
			if rel, err := filepath.Rel(cwd, p); err == nil {
				return rel
			}
			return p
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			t.Skip("sample-project/bivar.toml not found above the test folder; the sample-project golden test needs it")
		}
		dir = parent
	}
}

// TestSampleProject renders the invented sample project (engineer H's
// sample-project/, run through analysis.Run) and compares report.md and
// the outline of report.html with the golden files. The test lives in the
// external test package: package render itself never imports analysis.
// After a reviewed change: go test ./render/ -run TestSampleProject -update
func TestSampleProject(t *testing.T) {
	path := findSample(t)
	m, err := manifest.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	r, err := analysis.Run(m, analysis.Options{Version: "golden"})
	if err != nil {
		t.Fatal(err)
	}
	md, page := renderBoth(t, r)
	render.Golden(t, "sample.md", md.Bytes())
	render.Golden(t, "sample.html.outline", []byte(render.Outline(page.Bytes())))

	// Two runs give the same bytes.
	r2, err := analysis.Run(m, analysis.Options{Version: "golden"})
	if err != nil {
		t.Fatal(err)
	}
	a, b := t.TempDir(), t.TempDir()
	if err := render.WriteReport(a, r, render.Formats()); err != nil {
		t.Fatal(err)
	}
	if err := render.WriteReport(b, r2, render.Formats()); err != nil {
		t.Fatal(err)
	}
	filepath.WalkDir(a, func(p string, d os.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		rel, _ := filepath.Rel(a, p)
		x, _ := os.ReadFile(p)
		y, _ := os.ReadFile(filepath.Join(b, rel))
		if !bytes.Equal(x, y) {
			t.Errorf("%s differs between two runs of the sample project", rel)
		}
		return nil
	})
	if fi, err := os.Stat(filepath.Join(a, render.HTMLFile)); err == nil && fi.Size() > 2<<20 {
		t.Errorf("sample report.html is %d bytes, want under 2 MB", fi.Size())
	}
}

// TestSampleProjectBrowser opens the sample project's report.html in
// headless Chromium in every theme: no network request, no console error.
func TestSampleProjectBrowser(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test skipped in -short mode")
	}
	path := findSample(t)
	m, err := manifest.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	r, err := analysis.Run(m, analysis.Options{Version: "golden"})
	if err != nil {
		t.Fatal(err)
	}
	c, stop := render.StartChromium(t)
	defer stop()
	for _, th := range themes.Names() {
		dir := filepath.Join(t.TempDir(), th)
		if err := render.WriteReport(dir, r, []string{"html"}, render.WithTheme(th)); err != nil {
			t.Fatal(err)
		}
		problems, png, pdf := render.PageProblems(t, c, filepath.Join(dir, render.HTMLFile))
		for _, p := range problems {
			t.Errorf("%s: %s", th, p)
		}
		if len(png) == 0 || !bytes.HasPrefix(pdf, []byte("%PDF-")) {
			t.Errorf("%s: no screenshot or no PDF", th)
		}
	}
}

// renderBoth writes r as Markdown and as HTML.
func renderBoth(t *testing.T, r *report.Report) (md, page *bytes.Buffer) {
	t.Helper()
	md, page = new(bytes.Buffer), new(bytes.Buffer)
	if err := render.Markdown(md, r); err != nil {
		t.Fatal(err)
	}
	if err := render.HTML(page, r); err != nil {
		t.Fatal(err)
	}
	return md, page
}
