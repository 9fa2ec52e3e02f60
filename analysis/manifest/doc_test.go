package manifest

import (
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"testing"
)

// TestReferencePage keeps docs/manifest.md and the schema in step: every
// key the decoder accepts is documented there, and every key documented
// there is accepted.
func TestReferencePage(t *testing.T) {
	page, err := os.ReadFile(filepath.Join("..", "..", "docs", "manifest.md"))
	if err != nil {
		t.Fatal(err)
	}
	var documented []string
	for _, m := range regexp.MustCompile("(?m)^\\| `([a-z0-9_.]+)` \\|").FindAllSubmatch(page, -1) {
		documented = append(documented, string(m[1]))
	}
	var accepted []string
	var walk func(n *node, path string)
	walk = func(n *node, path string) {
		for _, k := range n.keys {
			p := k
			if path != "" {
				p = path + "." + k
			}
			accepted = append(accepted, p)
			if c := n.child[k]; c != nil && (c.kind == kTable || c.kind == kTables) && p != "study.also_in" {
				walk(c, p)
			}
		}
	}
	walk(schema, "")
	for _, k := range accepted {
		if n := schema.child[k]; n != nil && (n.kind == kTable || n.kind == kTables) && k != "study" && k != "dataset" {
			continue // a table heading, documented by its section
		}
		if k == "output" || k == "thresholds" || k == "dataset" || k == "study" {
			continue
		}
		if !slices.Contains(documented, k) {
			t.Errorf("docs/manifest.md does not document %q", k)
		}
	}
	for _, k := range documented {
		if !slices.Contains(accepted, k) {
			t.Errorf("docs/manifest.md documents %q, which the manifest does not accept", k)
		}
	}
	if len(documented) < 40 {
		t.Errorf("found only %d documented keys; is the table format still `| \\`key\\` |`?", len(documented))
	}
}
