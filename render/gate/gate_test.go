package gate

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"io"
	"strings"
	"testing"

	"bivar/analysis/report"
)

// The JUnit form read here is the one CI servers share: testsuites >
// testsuite > testcase with failure / error children and the counts as
// attributes (as read by, e.g., Jenkins' JUnit plugin and GitLab's unit
// test reports). This test parses the output back with encoding/xml.
type parsedSuites struct {
	XMLName  xml.Name      `xml:"testsuites"`
	Tests    int           `xml:"tests,attr"`
	Failures int           `xml:"failures,attr"`
	Errors   int           `xml:"errors,attr"`
	Suites   []parsedSuite `xml:"testsuite"`
}

type parsedSuite struct {
	Name     string       `xml:"name,attr"`
	Tests    int          `xml:"tests,attr"`
	Failures int          `xml:"failures,attr"`
	Errors   int          `xml:"errors,attr"`
	Cases    []parsedCase `xml:"testcase"`
}

type parsedCase struct {
	Name      string `xml:"name,attr"`
	Classname string `xml:"classname,attr"`
	Failure   *struct {
		Message string `xml:"message,attr"`
		Text    string `xml:",chardata"`
	} `xml:"failure"`
	Error *struct {
		Message string `xml:"message,attr"`
	} `xml:"error"`
	SystemOut string `xml:"system-out"`
}

func sample() *report.Report {
	bad := "column \"y\" has fewer than 3 complete rows"
	return &report.Report{
		Schema:   report.Schema,
		Manifest: report.ManifestInfo{Title: `Cell <4> & "friends"`},
		Datasets: []report.Dataset{{ID: "d", SHA256: "abc123"}},
		Studies: []report.Study{
			{ID: "s1", Dataset: "d", X: report.Variable{Column: "x"}, Y: report.Variable{Column: "y"}, N: 30,
				Expectations: []report.Expectation{
					{Name: "direction", Want: "negative", Got: "negative", OK: true},
					{Name: "min_abs_r", Want: "|r| ≥ 0.6", Got: "|r| = 0.41", OK: false, Detail: "r = -0.41 <below> & \x01 control"},
				}},
			{ID: "s2", Dataset: "d"}, // no expectations: no suite
			{ID: "s3|x", Dataset: "d", Error: &bad,
				Expectations: []report.Expectation{{Name: "min_n", Want: "n ≥ 10", Got: "", OK: false}}},
		},
	}
}

func TestJUnitParsesBack(t *testing.T) {
	var buf bytes.Buffer
	if err := JUnit(&buf, sample()); err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(buf.String(), `<?xml version="1.0" encoding="UTF-8"?>`) {
		t.Errorf("no XML declaration:\n%s", buf.String())
	}
	var got parsedSuites
	if err := xml.Unmarshal(buf.Bytes(), &got); err != nil {
		t.Fatalf("JUnit XML does not parse: %v\n%s", err, buf.String())
	}
	if got.Tests != 3 || got.Failures != 1 || got.Errors != 1 || len(got.Suites) != 2 {
		t.Fatalf("tests %d failures %d errors %d suites %d; want 3 1 1 2\n%s", got.Tests, got.Failures, got.Errors, len(got.Suites), buf.String())
	}
	s1 := got.Suites[0]
	if s1.Name != "s1" || s1.Tests != 2 || s1.Failures != 1 || len(s1.Cases) != 2 {
		t.Errorf("suite s1: %+v", s1)
	}
	if c := s1.Cases[0]; c.Name != "direction" || c.Classname != "bivar.s1" || c.Failure != nil || c.Error != nil {
		t.Errorf("held expectation: %+v", c)
	}
	c := s1.Cases[1]
	if c.Failure == nil || !strings.Contains(c.Failure.Message, "|r| ≥ 0.6") || !strings.Contains(c.Failure.Text, "<below> &") {
		t.Errorf("failed expectation lost its text: %+v", c)
	}
	if strings.Contains(c.Failure.Text, "\x01") {
		t.Error("a control character reached the XML")
	}
	if c := got.Suites[1].Cases[0]; c.Error == nil || !strings.Contains(c.Error.Message, "fewer than 3") {
		t.Errorf("expectation of a failed study: %+v", c)
	}
}

func TestJUnitNoExpectations(t *testing.T) {
	var buf bytes.Buffer
	if err := JUnit(&buf, &report.Report{Studies: []report.Study{{ID: "a"}}}); err != nil {
		t.Fatal(err)
	}
	var got parsedSuites
	if err := xml.Unmarshal(buf.Bytes(), &got); err != nil || got.Tests != 0 {
		t.Errorf("empty report: err %v tests %d\n%s", err, got.Tests, buf.String())
	}
}

func TestCount(t *testing.T) {
	c := Count(sample())
	want := Counts{Studies: 3, StudyErrors: 1, Expectations: 3, Failed: 1, Errored: 1}
	if c != want || c.Passed() {
		t.Errorf("Count = %+v (passed %v), want %+v", c, c.Passed(), want)
	}
}

func TestSummary(t *testing.T) {
	var buf bytes.Buffer
	if err := Summary(&buf, sample()); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	for _, want := range []string{
		"## bivar check: Cell <4> & \"friends\"",
		"**Failed**: 1 of 3 expectations did not hold; 1 of 3 studies did not run, so 1 expectation was not evaluated.",
		"| s1 | min_abs_r | \\|r\\| ≥ 0.6 | \\|r\\| = 0.41 | **failed** |",
		"| s3\\|x | min_n | n ≥ 10 |  | **not evaluated** |",
		"- `s1` min_abs_r: r = -0.41 \\<below> & ␁ control",
		"- `s3|x`: column \"y\" has fewer than 3 complete rows",
		report.Caution,
	} {
		if !strings.Contains(out, want) {
			t.Errorf("summary lacks %q:\n%s", want, out)
		}
	}
	// Failures come before the expectations that held, within a study.
	if strings.Index(out, "| s1 | min_abs_r") > strings.Index(out, "| s1 | direction") {
		t.Errorf("failure not listed first:\n%s", out)
	}
	// Every table row has the same number of unescaped cell separators.
	for _, l := range strings.Split(out, "\n") {
		if strings.HasPrefix(l, "| ") {
			if n := strings.Count(l, "|") - strings.Count(l, "\\|"); n != 6 {
				t.Errorf("row with %d separators: %s", n, l)
			}
		}
	}
}

func TestFailedRun(t *testing.T) {
	var buf bytes.Buffer
	if err := JUnitFailedRun(&buf, "m.toml", "bivar: m.toml:3:1: unknown key \"tilte\" <&>"); err != nil {
		t.Fatal(err)
	}
	var got parsedSuites
	if err := xml.Unmarshal(buf.Bytes(), &got); err != nil {
		t.Fatalf("does not parse: %v\n%s", err, buf.String())
	}
	if got.Tests != 1 || got.Errors != 1 || got.Suites[0].Cases[0].Error == nil {
		t.Errorf("failed run: %+v", got)
	}
	buf.Reset()
	if err := SummaryFailedRun(&buf, "m.toml", "bad ``` thing"); err != nil {
		t.Fatal(err)
	}
	if strings.Count(buf.String(), "```") != 2 || !strings.Contains(buf.String(), "Could not run") {
		t.Errorf("summary:\n%s", buf.String())
	}
}

// TestJUnitStudyThatDidNotRun: a study without expectations that could
// not run fails the job (exit status 1), so the JUnit file must show it:
// one error case "run" carrying the study's error.
func TestJUnitStudyThatDidNotRun(t *testing.T) {
	bad := `only 2 complete rows of x "a" and y "b"; at least 3 are needed`
	r := &report.Report{Schema: report.Schema, Manifest: report.ManifestInfo{Title: "t"},
		Studies: []report.Study{
			{ID: "ran", Dataset: "d"}, // ran, nothing declared: not a test
			{ID: "broken", Dataset: "d", Error: &bad},
		}}
	var buf bytes.Buffer
	if err := JUnit(&buf, r); err != nil {
		t.Fatal(err)
	}
	var got parsedSuites
	if err := xml.Unmarshal(buf.Bytes(), &got); err != nil {
		t.Fatalf("does not parse: %v\n%s", err, buf.String())
	}
	if got.Tests != 1 || got.Errors != 1 || got.Failures != 0 || len(got.Suites) != 1 {
		t.Fatalf("tests %d errors %d failures %d suites %d; want 1 1 0 1\n%s", got.Tests, got.Errors, got.Failures, len(got.Suites), buf.String())
	}
	s := got.Suites[0]
	if s.Name != "broken" || s.Errors != 1 || len(s.Cases) != 1 {
		t.Fatalf("suite %+v", s)
	}
	if c := s.Cases[0]; c.Name != "run" || c.Classname != "bivar.broken" || c.Error == nil || !strings.Contains(c.Error.Message, "only 2 complete rows") {
		t.Errorf("case %+v", c)
	}
	conformant(t, buf.Bytes())
}

// conformant checks a JUnit document against the conventions the common
// CI readers share (the Ant JUnit task's report format as read by
// Jenkins' JUnit plugin, GitLab and GitHub test-report actions; stated
// from their documentation as remembered, no schema file at hand):
// root <testsuites> with tests, failures and errors; each <testsuite>
// with name, tests, failures, errors; each <testcase> with name and
// classname; <failure> and <error> with message and type; the counts
// equal to the cases below them; no empty <properties>.
func conformant(t *testing.T, doc []byte) {
	t.Helper()
	dec := xml.NewDecoder(bytes.NewReader(doc))
	attrs := func(se xml.StartElement) map[string]string {
		m := map[string]string{}
		for _, a := range se.Attr {
			m[a.Name.Local] = a.Value
		}
		return m
	}
	need := func(se xml.StartElement, names ...string) map[string]string {
		m := attrs(se)
		for _, n := range names {
			if _, ok := m[n]; !ok {
				t.Errorf("<%s> lacks attribute %s", se.Name.Local, n)
			}
		}
		return m
	}
	type counts struct{ tests, failures, errors int }
	var root, suite counts
	var rootAttr, suiteAttr map[string]string
	var stack []string
	propsChildren := 0
	check := func(what string, attr map[string]string, c counts) {
		for k, v := range map[string]int{"tests": c.tests, "failures": c.failures, "errors": c.errors} {
			if attr[k] != fmt.Sprint(v) {
				t.Errorf("%s %s=%q, but it holds %d", what, k, attr[k], v)
			}
		}
	}
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("not well-formed XML: %v", err)
		}
		switch tok := tok.(type) {
		case xml.StartElement:
			name := tok.Name.Local
			if len(stack) == 0 && name != "testsuites" {
				t.Fatalf("root element <%s>, want <testsuites>", name)
			}
			switch name {
			case "testsuites":
				rootAttr = need(tok, "tests", "failures", "errors")
			case "testsuite":
				suiteAttr = need(tok, "name", "tests", "failures", "errors")
				suite = counts{}
			case "testcase":
				need(tok, "name", "classname")
				suite.tests++
				root.tests++
			case "failure", "error":
				need(tok, "message", "type")
				if name == "failure" {
					suite.failures++
					root.failures++
				} else {
					suite.errors++
					root.errors++
				}
			case "properties":
				propsChildren = 0
			case "property":
				need(tok, "name", "value")
				propsChildren++
			}
			stack = append(stack, name)
		case xml.EndElement:
			switch tok.Name.Local {
			case "testsuite":
				check("testsuite "+suiteAttr["name"], suiteAttr, suite)
			case "properties":
				if propsChildren == 0 {
					t.Error("an empty <properties> element")
				}
			}
			stack = stack[:len(stack)-1]
		}
	}
	check("testsuites", rootAttr, root)
}

func TestJUnitConformant(t *testing.T) {
	var buf bytes.Buffer
	if err := JUnit(&buf, sample()); err != nil {
		t.Fatal(err)
	}
	conformant(t, buf.Bytes())
	buf.Reset()
	if err := JUnitFailedRun(&buf, "m.toml", "bivar: m.toml: no such file"); err != nil {
		t.Fatal(err)
	}
	conformant(t, buf.Bytes())
	buf.Reset()
	if err := JUnit(&buf, &report.Report{}); err != nil {
		t.Fatal(err)
	}
	conformant(t, buf.Bytes())
}

// TestSummaryOnlyStudyErrors: when nothing failed but a study did not run,
// the summary does not claim "0 of n expectations did not hold".
func TestSummaryOnlyStudyErrors(t *testing.T) {
	bad := "only 0 complete rows"
	r := &report.Report{Manifest: report.ManifestInfo{Title: "t"}, Studies: []report.Study{
		{ID: "a", Error: &bad, Expectations: []report.Expectation{{Name: "min_n"}, {Name: "max_p"}}},
		{ID: "b"},
	}}
	var buf bytes.Buffer
	if err := Summary(&buf, r); err != nil {
		t.Fatal(err)
	}
	if want := "**Failed**: 1 of 2 studies did not run, so 2 expectations were not evaluated.\n"; !strings.Contains(buf.String(), want) {
		t.Errorf("summary lacks %q:\n%s", want, buf.String())
	}
}

// TestJUnitCaseNames: a test case is named by the gate's manifest key, for
// CI tools matching on it, followed by its title in words for reviewers;
// a report written before gates had titles keeps the key alone.
func TestJUnitCaseNames(t *testing.T) {
	r := &report.Report{Studies: []report.Study{{ID: "s", Expectations: []report.Expectation{
		{Name: "slope_within", Title: "slope within its limits", Want: "slope in [1, 2]", Got: "slope = 3", OK: false},
		{Name: "max_p", Want: "p ≤ 0.05", Got: "p = 0.01", OK: true},
	}}}}
	var buf bytes.Buffer
	if err := JUnit(&buf, r); err != nil {
		t.Fatal(err)
	}
	var got parsedSuites
	if err := xml.Unmarshal(buf.Bytes(), &got); err != nil || len(got.Suites) != 1 || len(got.Suites[0].Cases) != 2 {
		t.Fatalf("err %v\n%s", err, buf.String())
	}
	for i, want := range []string{"slope_within (slope within its limits)", "max_p"} {
		if name := got.Suites[0].Cases[i].Name; name != want {
			t.Errorf("test case %d named %q, want %q", i, name, want)
		}
	}
}
