package render

import (
	"bytes"
	"strings"
	"testing"

	"bivar/render/internal/fixture"
)

// FuzzHostileNames puts arbitrary text into every name, label and note of
// the invented report: rendering must not fail, every SVG must stay
// well-formed XML, and no text may become a script or style element.
func FuzzHostileNames(f *testing.F) {
	for _, seed := range []string{"", "<script>", "</svg>", "a & b", "\"'", "\x00\xff\xfe", "]]>", "<!--", "{{.}}", "|---|", "# h", "![x](http://a/b.png)", "\u2028\ufffe"} {
		f.Add(seed)
	}
	f.Fuzz(func(t *testing.T, s string) {
		r := fixture.Report(fixture.Options{N: 12})
		r.Manifest.Title = s
		r.Datasets[0].File = s
		for i := range r.Studies {
			st := &r.Studies[i]
			st.ID, st.Title, st.Notes = s+st.ID, s, s
			st.X.Label, st.Y.Unit, st.Group = s, s, s
			st.X.Symbol, st.Y.Symbol, st.GroupLabel, st.OrderLabel = s, s, s, s
			if st.Plot != nil {
				for k := range st.Plot.Marked {
					st.Plot.Marked[k].Row = s
				}
				for k := range st.Plot.Levels {
					st.Plot.Levels[k] = s + st.Plot.Levels[k]
				}
			}
		}
		var page bytes.Buffer
		if err := HTML(&page, r); err != nil {
			t.Fatalf("HTML: %v", err)
		}
		p := page.String()
		if strings.Count(p, "<script") != 0 || strings.Count(p, "<style") != 1 {
			t.Fatalf("text %q became markup", s)
		}
		for _, svg := range svgRE.FindAllString(p, -1) {
			if err := fixture.WellFormed([]byte(svg)); err != nil {
				t.Fatalf("text %q broke an SVG: %v", s, err)
			}
		}
		var md bytes.Buffer
		if err := Markdown(&md, r); err != nil {
			t.Fatalf("Markdown: %v", err)
		}
	})
}

func BenchmarkHTML(b *testing.B) {
	r := fixture.Report(fixture.Options{N: 100000})
	b.ReportAllocs()
	for b.Loop() {
		var buf bytes.Buffer
		if err := HTML(&buf, r); err != nil {
			b.Fatal(err)
		}
	}
}
