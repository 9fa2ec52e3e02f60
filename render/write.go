package render

import (
	"bytes"
	"context"
	"fmt"
	"strings"

	"bivar/analysis/report"
	"bivar/internal/publish"
)

// File names WriteReport uses inside the report folder.
const (
	HTMLFile     = "report.html"
	MarkdownFile = "report.md"
	JSONFile     = "results.json"

	defaultFigureDir = "figures" // the figures beside report.md, unless WithFigureDir
)

// Formats lists the format names WriteReport accepts.
func Formats() []string { return []string{"html", "markdown", "json"} }

// ReportFiles renders the report's files in memory: report.html for
// "html", report.md and its figures for "markdown", results.json for
// "json". The caller may add files of its own to the set before
// publishing it with publish.Target.Publish.
func ReportFiles(r *report.Report, formats []string, opts ...Option) ([]File, error) {
	if r == nil {
		return nil, fmt.Errorf("no report to write")
	}
	if len(formats) == 0 {
		return nil, fmt.Errorf("no output format chosen: want one or more of %s", strings.Join(Formats(), ", "))
	}
	var files []File
	seen := map[string]bool{}
	// The page both reports show, built (its charts drawn) once.
	var p *page
	var cfg *config
	built := func() error {
		if p != nil {
			return nil
		}
		var err error
		p, cfg, err = pageOf(r, opts)
		return err
	}
	for _, f := range formats {
		if seen[f] {
			continue
		}
		seen[f] = true
		switch f {
		case "html":
			if err := built(); err != nil {
				return nil, err
			}
			b, err := htmlOf(p, cfg)
			if err != nil {
				return nil, err
			}
			files = append(files, File{Name: HTMLFile, Data: b})
		case "markdown":
			if err := built(); err != nil {
				return nil, err
			}
			b, err := markdownOf(p)
			if err != nil {
				return nil, err
			}
			files = append(files, File{Name: MarkdownFile, Data: b})
			files = append(files, figureFiles(p)...)
		case "json":
			var b bytes.Buffer
			if err := report.Write(&b, r); err != nil {
				return nil, err
			}
			files = append(files, File{Name: JSONFile, Data: b.Bytes()})
		default:
			return nil, fmt.Errorf("unknown output format %q: want one or more of %s", f, strings.Join(Formats(), ", "))
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
	return files, nil
}

// WriteReport writes ReportFiles into the folder dir as one set, replacing
// the previous report in one atomic step (see internal/publish): a failure
// at any point, or a process killed at any point, leaves the previous
// report whole. It refuses a folder that holds files of its own (see
// EarlierFile) and one another process is writing.
func WriteReport(dir string, r *report.Report, formats []string, opts ...Option) error {
	files, err := ReportFiles(r, formats, opts...)
	if err != nil {
		return err
	}
	t, err := publish.OpenDir(dir, publish.Options{Command: "bivar run", Legacy: EarlierFile})
	if err != nil {
		return err
	}
	defer t.Close()
	return t.Publish(context.Background(), files)
}

// EarlierFile says whether rel (slash-separated, relative to the report
// folder) is a name that bivar wrote into a report folder before folders
// were published whole (and listed in publish.ContentsFile): the three
// reports, the figures folder and its figures, and the temporary files of
// that writer (.NAME.RANDOM.tmp). A folder holding only such names is
// replaced as a report folder; any other name makes it a user's folder.
// It is for publish.Options.Legacy.
func EarlierFile(rel string, isDir bool) bool {
	dir, name, sub := strings.Cut(rel, "/")
	if !sub {
		name = dir
		dir = ""
	}
	tmp := strings.HasPrefix(name, ".") && strings.HasSuffix(name, ".tmp")
	switch dir {
	case "":
		if isDir {
			return name == defaultFigureDir
		}
		return name == HTMLFile || name == MarkdownFile || name == JSONFile || strings.HasSuffix(name, "-flagged.csv") || tmp
	case defaultFigureDir:
		return !isDir && !strings.Contains(name, "/") && (tmp || strings.HasSuffix(name, "-scatter.svg") ||
			strings.HasSuffix(name, "-residuals.svg") || strings.HasSuffix(name, "-order.svg"))
	}
	return false
}
