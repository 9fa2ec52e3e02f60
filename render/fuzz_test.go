package render

import (
	"bytes"
	"testing"

	"bivar/render/internal/fixture"
)

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
