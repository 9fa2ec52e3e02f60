package render

import (
	"bytes"
	"encoding/xml"
	"flag"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"bivar/analysis/report"
	"bivar/render/internal/fixture"
	"bivar/themes"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/golden")

// The reports used in these tests are invented (render/internal/fixture);
// they check structure, escaping and determinism, never a statistic.

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

func TestWriteSample(t *testing.T) {
	dir := os.Getenv("BIVAR_RENDER_OUT")
	if dir == "" {
		t.Skip("set BIVAR_RENDER_OUT to a folder to write the invented sample report there for viewing")
	}
	for _, th := range themes.Names() {
		r := fixture.Report(fixture.Options{Hostile: th == "night"})
		if err := WriteReport(filepath.Join(dir, th), r, []string{"html", "markdown", "json"}, WithTheme(th)); err != nil {
			t.Fatal(err)
		}
	}
}

// wellFormed reports whether b parses as XML (used on each SVG).
func wellFormed(b []byte) error {
	d := xml.NewDecoder(bytes.NewReader(b))
	for {
		_, err := d.Token()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return err
		}
	}
}

var _ = strings.Contains
