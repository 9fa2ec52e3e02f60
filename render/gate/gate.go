// Package gate writes what a CI job needs from a run: JUnit XML with one
// test case per expectation per study, and a short Markdown summary for the
// job page. It reads the Report only; the expectations were evaluated by
// the analysis.
//
// The JUnit XML follows the common form that CI servers read (one
// <testsuites> root, one <testsuite> per study that declares expectations,
// one <testcase> per expectation named after its manifest key, class name
// "bivar.<study id>"). A failed expectation is a <failure>; an expectation
// of a study that could not run is an <error> carrying the study's error,
// and a study without expectations that could not run gets one test case
// "run" with that <error>, since it fails the job too.
// Every text is escaped by encoding/xml, which also replaces characters
// that XML 1.0 does not allow.
package gate

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"io"
	"strings"

	"bivar/analysis/report"
	"bivar/internal/cleantext"
	"bivar/render/internal/mdtext"
)

// Counts are the totals over a report's expectations.
type Counts struct {
	Studies      int // studies in the report
	StudyErrors  int // studies that did not run
	Expectations int // expectations declared, over all studies
	Failed       int // expectations that did not hold (in studies that ran)
	Errored      int // expectations of studies that did not run
}

// Passed reports whether every expectation held and every study ran.
func (c Counts) Passed() bool { return c.Failed == 0 && c.Errored == 0 && c.StudyErrors == 0 }

// Count totals the expectations of r.
func Count(r *report.Report) Counts {
	var c Counts
	c.Studies = len(r.Studies)
	for _, s := range r.Studies {
		if s.Error != nil {
			c.StudyErrors++
		}
		for _, e := range s.Expectations {
			c.Expectations++
			switch {
			case s.Error != nil:
				c.Errored++
			case !e.OK:
				c.Failed++
			}
		}
	}
	return c
}

type junitSuites struct {
	XMLName  xml.Name     `xml:"testsuites"`
	Name     string       `xml:"name,attr"`
	Tests    int          `xml:"tests,attr"`
	Failures int          `xml:"failures,attr"`
	Errors   int          `xml:"errors,attr"`
	Suites   []junitSuite `xml:"testsuite"`
}

type junitSuite struct {
	Name       string           `xml:"name,attr"`
	Tests      int              `xml:"tests,attr"`
	Failures   int              `xml:"failures,attr"`
	Errors     int              `xml:"errors,attr"`
	Skipped    int              `xml:"skipped,attr"`
	Properties *junitProperties `xml:"properties"` // nil: no element (an empty one upsets some readers)
	Cases      []junitCase      `xml:"testcase"`
}

type junitProperties struct {
	Property []junitProperty `xml:"property"`
}

type junitProperty struct {
	Name  string `xml:"name,attr"`
	Value string `xml:"value,attr"`
}

type junitCase struct {
	Name      string        `xml:"name,attr"`
	Classname string        `xml:"classname,attr"`
	Failure   *junitProblem `xml:"failure,omitempty"`
	Error     *junitProblem `xml:"error,omitempty"`
	SystemOut string        `xml:"system-out,omitempty"`
}

type junitProblem struct {
	Message string `xml:"message,attr"`
	Type    string `xml:"type,attr"`
	Text    string `xml:",chardata"`
}

// JUnit writes r's expectations as JUnit XML. A report without any
// expectation gives a valid document with no test cases.
func JUnit(w io.Writer, r *report.Report) error {
	root := junitSuites{Name: suiteName(r)}
	for _, s := range r.Studies {
		if len(s.Expectations) == 0 && s.Error == nil {
			continue
		}
		props := &junitProperties{Property: []junitProperty{
			{Name: "dataset", Value: s.Dataset},
			{Name: "x", Value: s.X.Column},
			{Name: "y", Value: s.Y.Column},
			{Name: "n", Value: fmt.Sprint(s.N)},
		}}
		if sha := datasetSHA(r, s.Dataset); sha != "" {
			props.Property = append(props.Property, junitProperty{Name: "dataset_sha256", Value: sha})
		}
		suite := junitSuite{Name: s.ID, Properties: props}
		if len(s.Expectations) == 0 {
			// A study that did not run fails the job (exit status 1) even
			// without expectations: one error case says so on the CI page.
			suite.Cases = append(suite.Cases, junitCase{Name: "run", Classname: "bivar." + s.ID,
				Error: &junitProblem{Message: "the study did not run: " + *s.Error, Type: "study-error", Text: *s.Error}})
			suite.Errors++
		}
		for _, e := range s.Expectations {
			c := junitCase{Name: Label(e), Classname: "bivar." + s.ID,
				SystemOut: fmt.Sprintf("want %s; got %s. %s", e.Want, e.Got, e.Detail)}
			switch {
			case s.Error != nil:
				c.Error = &junitProblem{Message: "the study did not run: " + *s.Error, Type: "study-error", Text: *s.Error}
				suite.Errors++
			case !e.OK:
				c.Failure = &junitProblem{Message: fmt.Sprintf("%s: want %s, got %s", gateTitle(e), e.Want, e.Got), Type: "expectation",
					Text: strings.TrimSpace(fmt.Sprintf("study %s (%s vs %s): %s", s.ID, label(s.Y), label(s.X), e.Detail))}
				suite.Failures++
			}
			suite.Cases = append(suite.Cases, c)
		}
		suite.Tests = len(suite.Cases)
		root.Tests += suite.Tests
		root.Failures += suite.Failures
		root.Errors += suite.Errors
		root.Suites = append(root.Suites, suite)
	}
	return writeJUnit(w, root)
}

// JUnitFailedRun writes a JUnit document for a check that could not run
// at all (a manifest or data file that could not be read): one test case
// "run" with an <error> holding msg. Written in place of the usual file,
// it keeps a CI server from reading a stale, passing one.
func JUnitFailedRun(w io.Writer, manifest, msg string) error {
	root := junitSuites{Name: "bivar: " + manifest, Tests: 1, Errors: 1, Suites: []junitSuite{{
		Name: manifest, Tests: 1, Errors: 1,
		Cases: []junitCase{{Name: "run", Classname: "bivar", Error: &junitProblem{
			Message: "bivar check could not run", Type: "bad-input", Text: msg}}},
	}}}
	return writeJUnit(w, root)
}

// writeJUnit encodes root as an indented XML document with its header and
// one final newline, and writes it to w in one piece.
func writeJUnit(w io.Writer, root junitSuites) error {
	var buf bytes.Buffer
	buf.WriteString(xml.Header)
	enc := xml.NewEncoder(&buf)
	enc.Indent("", "  ")
	if err := enc.Encode(root); err != nil {
		return fmt.Errorf("gate: encoding JUnit XML: %w", err)
	}
	buf.WriteByte('\n')
	_, err := w.Write(cleantext.Bytes(buf.Bytes())) // encoding/xml leaves DEL and C1 controls
	return err
}

// SummaryFailedRun writes the Markdown summary of a check that could not
// run at all.
func SummaryFailedRun(w io.Writer, manifest, msg string) error {
	_, err := io.WriteString(w, cleantext.Text(fmt.Sprintf("## bivar check: %s\n\n**Could not run**: the manifest or its data could not be read.\n\n```\n%s\n```\n",
		mdtext.Escape(manifest), strings.ReplaceAll(strings.TrimSpace(msg), "```", "` ` `"))))
	return err
}

func suiteName(r *report.Report) string {
	if r.Manifest.Title != "" {
		return "bivar: " + r.Manifest.Title
	}
	if r.Manifest.File != "" {
		return "bivar: " + r.Manifest.File
	}
	return "bivar"
}

func datasetSHA(r *report.Report, id string) string {
	for _, d := range r.Datasets {
		if d.ID == id {
			return d.SHA256
		}
	}
	return ""
}

func label(v report.Variable) string {
	if v.Label != "" {
		return v.Label
	}
	return v.Column
}

// Summary writes a Markdown summary for a CI job page: the verdict in one
// line, then a table of every expectation, failures first within a study,
// studies in report order, then the studies that did not run.
func Summary(w io.Writer, r *report.Report) error {
	c := Count(r)
	var b strings.Builder
	title := r.Manifest.Title
	if title == "" {
		title = r.Manifest.File
	}
	fmt.Fprintf(&b, "## bivar check: %s\n\n", mdtext.Escape(title))
	switch {
	case c.Expectations == 0 && c.StudyErrors == 0:
		fmt.Fprintf(&b, "**No expectations declared** in %d studies; nothing was gated. Add a `[study.expect]` table to gate a study.\n\n", c.Studies)
	case c.Passed():
		fmt.Fprintf(&b, "**Passed**: all %d expectations held in %d studies.\n\n", c.Expectations, c.Studies)
	default:
		var why []string
		if c.Failed > 0 {
			why = append(why, fmt.Sprintf("%d of %d expectations did not hold", c.Failed, c.Expectations))
		}
		if c.StudyErrors > 0 {
			st := fmt.Sprintf("%d of %d studies did not run", c.StudyErrors, c.Studies)
			switch c.Errored {
			case 0:
			case 1:
				st += ", so 1 expectation was not evaluated"
			default:
				st += fmt.Sprintf(", so %d expectations were not evaluated", c.Errored)
			}
			why = append(why, st)
		}
		fmt.Fprintf(&b, "**Failed**: %s.\n\n", strings.Join(why, "; "))
	}
	if c.Expectations > 0 {
		b.WriteString("| Study | Expectation | Want | Got | Result |\n|---|---|---|---|---|\n")
		for _, s := range r.Studies {
			for pass := 0; pass < 2; pass++ { // failures first
				for _, e := range s.Expectations {
					bad := s.Error != nil || !e.OK
					if bad != (pass == 0) {
						continue
					}
					result := "held"
					switch {
					case s.Error != nil:
						result = "**not evaluated**"
					case !e.OK:
						result = "**failed**"
					}
					fmt.Fprintf(&b, "| %s | %s | %s | %s | %s |\n", mdtext.Cell(s.ID), mdtext.Cell(gateTitle(e)), mdtext.Cell(e.Want), mdtext.Cell(e.Got), result)
				}
			}
		}
		b.WriteString("\n")
	}
	var fails []string
	for _, s := range r.Studies {
		for _, e := range s.Expectations {
			if s.Error == nil && !e.OK && e.Detail != "" {
				fails = append(fails, fmt.Sprintf("- `%s` %s: %s", code(s.ID), mdtext.Escape(gateTitle(e)), mdtext.Escape(e.Detail)))
			}
		}
	}
	if len(fails) > 0 {
		b.WriteString("Why they failed:\n\n" + strings.Join(fails, "\n") + "\n\n")
	}
	if c.StudyErrors > 0 {
		b.WriteString("Studies that did not run:\n\n")
		for _, s := range r.Studies {
			if s.Error != nil {
				fmt.Fprintf(&b, "- `%s`: %s\n", code(s.ID), mdtext.Escape(*s.Error))
			}
		}
		b.WriteString("\n")
	}
	fmt.Fprintf(&b, "_%s_\n", mdtext.Escape(report.Caution))
	_, err := io.WriteString(w, cleantext.Text(b.String()))
	return err
}

// code makes s safe inside a one-backtick code span.
func code(s string) string {
	return strings.NewReplacer("`", "'", "\n", " ", "\r", " ").Replace(s)
}

// Label names a gate for a test case's name and the command line's
// messages: its manifest key first, which CI tools and logs are searched
// for, then in parentheses its title in words from the analysis, which
// reviewers read: "slope_within (slope within its limits)". The key alone
// for a report written before gates had titles.
func Label(e report.Expectation) string {
	if e.Title == "" || e.Title == e.Name {
		return e.Name
	}
	return e.Name + " (" + e.Title + ")"
}

// gateTitle names a gate in words for reviewers: the analysis's title, or
// the manifest key for a report written before gates had titles.
func gateTitle(e report.Expectation) string {
	if e.Title != "" {
		return e.Title
	}
	return e.Name
}
