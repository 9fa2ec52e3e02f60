package render

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"bivar/analysis/report"
	"bivar/internal/atomicfile"
)

// File names WriteReport uses inside the report folder.
const (
	HTMLFile     = "report.html"
	MarkdownFile = "report.md"
	JSONFile     = "results.json"
)

// Formats lists the format names WriteReport accepts.
func Formats() []string { return []string{"html", "markdown", "json"} }

// WriteReport writes the report's files into dir: report.html for "html",
// report.md and its figures for "markdown", results.json for "json".
//
// It is all or nothing: every file is rendered in memory first, then
// written to a temporary name in the folder it belongs in, and only when
// all are written and synced are they renamed into place. A failure at any
// step removes the temporary files and leaves the previous report as it
// was. (A crash during the final renames can leave a mix of old and new
// files, each of them whole.)
func WriteReport(dir string, r *report.Report, formats []string, opts ...Option) error {
	if r == nil {
		return fmt.Errorf("no report to write")
	}
	if len(formats) == 0 {
		return fmt.Errorf("no output format chosen: want one or more of %s", strings.Join(Formats(), ", "))
	}
	var files []File
	figDir := ""
	seen := map[string]bool{}
	for _, f := range formats {
		if seen[f] {
			continue
		}
		seen[f] = true
		switch f {
		case "html":
			b, err := htmlBytes(r, opts)
			if err != nil {
				return err
			}
			files = append(files, File{Name: HTMLFile, Data: b})
		case "markdown":
			b, p, err := markdownBytes(r, opts)
			if err != nil {
				return err
			}
			files = append(files, File{Name: MarkdownFile, Data: b})
			files = append(files, figureFiles(p)...)
			cfg, _ := newConfig(opts) // already validated by markdownBytes
			figDir = cfg.figureDir
		case "json":
			var b bytes.Buffer
			if err := report.Write(&b, r); err != nil {
				return err
			}
			files = append(files, File{Name: JSONFile, Data: b.Bytes()})
		default:
			return fmt.Errorf("unknown output format %q: want one or more of %s", f, strings.Join(Formats(), ", "))
		}
	}
	// Each study's flagged rows, as the analysis wrote them, beside the
	// report whatever the formats (results.json and both reports name it).
	for i := range r.Studies {
		st := &r.Studies[i]
		if st.Influence != nil && st.Influence.File != "" && st.FlaggedCSV != nil {
			files = append(files, File{Name: st.Influence.File, Data: st.FlaggedCSV})
		}
	}
	if err := atomicfile.Write(dir, files); err != nil {
		return err
	}
	if figDir != "" {
		return removeStaleFigures(filepath.Join(dir, filepath.FromSlash(figDir)), files)
	}
	return nil
}

// removeStaleFigures deletes figures a previous run wrote for studies this
// run no longer has, so report.md's folder holds only what it links to.
// Only files named like our figures (<study>-scatter.svg, -residuals.svg,
// -order.svg) are touched.
func removeStaleFigures(figDir string, files []File) error {
	keep := map[string]bool{}
	for _, f := range files {
		keep[filepath.Base(filepath.FromSlash(f.Name))] = true
	}
	entries, err := os.ReadDir(figDir)
	if err != nil {
		return nil // nothing to tidy
	}
	for _, e := range entries {
		n := e.Name()
		if !e.Type().IsRegular() || keep[n] {
			continue
		}
		if strings.HasSuffix(n, "-scatter.svg") || strings.HasSuffix(n, "-residuals.svg") || strings.HasSuffix(n, "-order.svg") {
			if err := os.Remove(filepath.Join(figDir, n)); err != nil {
				return fmt.Errorf("removing the old figure %s: %w", n, err)
			}
		}
	}
	return nil
}
