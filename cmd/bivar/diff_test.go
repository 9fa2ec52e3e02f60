package main

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"bivar/analysis/compare"
	"bivar/analysis/report"
	"bivar/analysis/stats"
)

// runOf draws one run of y = 1 + slope·x + e (a simulation, not a check
// value) and returns it as a Report with one study.
func runOf(seed uint64, slope float64, strength string) *report.Report {
	rng := rand.New(rand.NewPCG(seed, 1))
	x, y := make([]float64, 40), make([]float64, 40)
	for i := range x {
		x[i] = 10 + 2*rng.NormFloat64()
		y[i] = 1 + slope*x[i] + 0.5*rng.NormFloat64()
	}
	m := stats.CentredMoments(x, y)
	return &report.Report{Schema: report.Schema, Tool: report.Tool{Name: "bivar", Version: "test"},
		Manifest: report.ManifestInfo{Title: "run", Alpha: 0.05, Adjust: "holm"},
		Datasets: []report.Dataset{{ID: "d", File: "d.csv", SHA256: "h", Rows: 40}},
		Studies: []report.Study{{ID: "s", Dataset: "d", X: report.Variable{Column: "x"}, Y: report.Variable{Column: "y"}, N: 40,
			Moments: &report.Moments{N: m.N, MeanX: report.Float(m.MeanX), MeanY: report.Float(m.MeanY),
				Sxx: report.Float(m.Sxx), Syy: report.Float(m.Syy), Sxy: report.Float(m.Sxy)},
			Findings: &report.Findings{Form: "linear", Direction: "positive", Strength: strength}}}}
}

func writeResults(t *testing.T, dir string, r *report.Report) string {
	t.Helper()
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := report.Write(&buf, r); err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(dir, "results.json")
	if err := os.WriteFile(p, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

func TestDiffCommand(t *testing.T) {
	dir := t.TempDir()
	a := writeResults(t, filepath.Join(dir, "a"), runOf(1, 0.8, "strong"))
	same := writeResults(t, filepath.Join(dir, "same"), runOf(2, 0.8, "strong"))
	changed := writeResults(t, filepath.Join(dir, "changed"), runOf(3, 0.3, "moderate"))
	out := filepath.Join(dir, "out")
	// A gate met in the old run and failed in the new one (the sample
	// project's October to November runs, in small).
	gated := func(seed uint64, ok bool) string {
		r := runOf(seed, 0.8, "strong")
		r.Studies[0].Expectations = []report.Expectation{{Name: "slope_within", Title: "slope within its limits", Want: "slope in [0.7, 0.9]", OK: ok, Got: "slope"}}
		return writeResults(t, filepath.Join(dir, fmt.Sprintf("gated-%v", ok)), r)
	}
	gateMet, gateFailed := gated(1, true), gated(2, false)
	stoppedRep := runOf(1, 0.8, "strong")
	msg := `column "y" is constant`
	stoppedRep.Studies[0].Error, stoppedRep.Studies[0].Moments, stoppedRep.Studies[0].Findings = &msg, nil, nil
	stopped := writeResults(t, filepath.Join(dir, "stopped"), stoppedRep)

	cases := []struct {
		name string
		args []string
		code int
		want string // in stderr
	}{
		{"same process, gated", []string{"diff", "-o", out, "--fail-on", "verdict,significant", a, same}, exitOK, "0 changed beyond chance"},
		{"changed, not gated", []string{"diff", "-o", out, a, filepath.Join(dir, "changed")}, exitOK, "1 changed beyond chance"},
		{"changed, gated on significant", []string{"diff", "-o", out, "--fail-on", "significant", a, changed}, exitExpectation, "--fail-on significant"},
		{"changed, gated on verdict", []string{"diff", "--fail-on=verdict", "-o", out, a, changed}, exitExpectation, "strength strong → moderate"},
		{"gate broken, not gated", []string{"diff", "-o", out, gateMet, gateFailed}, exitOK, "1 CI gate changed outcome (1 now failing that did not fail before)"},
		{"gate broken, gated on verdict and significant", []string{"diff", "-o", out, "--fail-on", "verdict,significant", gateMet, gateFailed}, exitOK, "slope within its limits met → failed"},
		{"gate broken, gated on expectation", []string{"diff", "-o", out, "--fail-on", "expectation", gateMet, gateFailed}, exitExpectation, "--fail-on expectation"},
		{"gate mended, gated on expectation", []string{"diff", "-o", out, "--fail-on", "expectation", gateFailed, gateMet}, exitOK, "0 now failing"},
		{"folders", []string{"diff", "-o", out, filepath.Join(dir, "a"), filepath.Join(dir, "same")}, exitOK, "1 study compared"},
		{"bad fail-on", []string{"diff", "--fail-on", "verdicts", a, same}, exitUsage, `"verdicts": want a comma-separated list of expectation, verdict, significant`},
		{"bad theme", []string{"diff", "--theme", "neon", a, same}, exitUsage, "unknown theme"},
		{"one argument", []string{"diff", a}, exitUsage, "want OLD and NEW"},
		{"missing file", []string{"diff", "-o", out, filepath.Join(dir, "nope.json"), same}, exitFailed, "OLD:"},
		{"folder without results", []string{"diff", "-o", out, a, out + "-empty"}, exitFailed, "NEW:"},
		{"not a results file", []string{"diff", "-o", out, a, filepath.Join(out, "diff.json")}, exitFailed, "a diff.json cannot be compared"},
		// The same run given twice, as a file and as its folder: a usage
		// mistake (a CI job whose last/ points at the new report), which
		// exited 0 saying nothing changed. A copy of the file is compared.
		{"same file twice", []string{"diff", "-o", out, "--fail-on", "expectation", a, a}, exitUsage, "OLD and NEW are the same file, " + a},
		{"same file as folder and file", []string{"diff", "-o", out, filepath.Join(dir, "a"), a}, exitUsage, "OLD and NEW are the same file"},
		// A diff written inside a report folder stops the next 'bivar
		// run' of that folder (it holds files bivar run did not write).
		{"-o inside a report folder", []string{"diff", "-o", filepath.Join(dir, "a", "diff"), a, changed}, exitUsage, "-o " + filepath.Join(dir, "a", "diff") + " is inside the report folder " + filepath.Join(dir, "a") + ", which 'bivar run' replaces whole"},
		// A diff's own folder, and a results.json that is a folder, given
		// as OLD: each said only "holds no results.json" or "read …: is
		// a directory".
		{"a diff folder as OLD", []string{"diff", "-o", out + "-2", out, a}, exitFailed, out + " is the folder of a diff (it holds diff.json), not a report"},
		{"results.json a folder", []string{"diff", "-o", out + "-2", filepath.Join(dir, "odd"), a}, exitFailed, filepath.Join(dir, "odd", "results.json") + " is a folder, not a file"},
		// A study that ran in OLD and not in NEW, without gates: its
		// verdicts are lost, which --fail-on verdict gates on (exit 0
		// before, nothing counted).
		{"study stopped running, gated on verdict", []string{"diff", "-o", out, "--fail-on", "verdict", a, stopped}, exitExpectation, "1 stopped running"},
		{"study started running, gated on verdict", []string{"diff", "-o", out, "--fail-on", "verdict", stopped, a}, exitOK, "0 stopped running"},
		// The file saved again by an editor that writes a byte-order
		// mark: read as it was ("invalid character 'ï'" before).
		{"a byte-order mark", []string{"diff", "-o", out, a, filepath.Join(dir, "bom", "results.json")}, exitOK, "0 changed beyond chance"},
		{"a copy of the same file", []string{"diff", "-o", out, a, filepath.Join(dir, "copy", "results.json")}, exitOK, "0 changed beyond chance"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if tc.name == "folder without results" {
				os.MkdirAll(out+"-empty", 0o755)
			}
			if tc.name == "a byte-order mark" {
				b, _ := os.ReadFile(a)
				os.MkdirAll(filepath.Join(dir, "bom"), 0o755)
				os.WriteFile(filepath.Join(dir, "bom", "results.json"), append([]byte("\xef\xbb\xbf"), b...), 0o644)
			}
			if tc.name == "results.json a folder" {
				os.MkdirAll(filepath.Join(dir, "odd", "results.json"), 0o755)
			}
			if tc.name == "a copy of the same file" {
				b, _ := os.ReadFile(a)
				os.MkdirAll(filepath.Join(dir, "copy"), 0o755)
				os.WriteFile(filepath.Join(dir, "copy", "results.json"), b, 0o644)
			}
			code, _, stderr := call(t, tc.args...)
			if code != tc.code || !strings.Contains(stderr, tc.want) {
				t.Errorf("bivar %s: exit %d, stderr:\n%s\nwant exit %d and %q", strings.Join(tc.args, " "), code, stderr, tc.code, tc.want)
			}
		})
	}
	// The files of the last successful diff are there and read back.
	for _, f := range []string{"diff.html", "diff.md", "diff.json"} {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("missing %s: %v", f, err)
		}
	}
	b, _ := os.ReadFile(filepath.Join(out, "diff.json"))
	res, err := compare.Read(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	if res.Old.File != filepath.ToSlash(filepath.Join(dir, "a", "results.json")) || res.Summary.Compared != 1 {
		t.Errorf("diff.json: old file %q, compared %d", res.Old.File, res.Summary.Compared)
	}
}

// encode returns a results.json of runOf(1, …) changed by edit.
func encode(t *testing.T, edit func(*report.Report)) string {
	t.Helper()
	r := runOf(1, 0.8, "strong")
	edit(r)
	var buf bytes.Buffer
	if err := report.Write(&buf, r); err != nil {
		t.Fatal(err)
	}
	return buf.String()
}

// nanAt replaces the number after key (its first occurrence) by "NaN" in quotes.
func nanAt(t *testing.T, full []byte, key string) string {
	i := bytes.Index(full, []byte(key))
	if i < 0 {
		t.Fatalf("no %s in the results", key)
	}
	j := i + len(key)
	k := j + bytes.IndexAny(full[j:], ",\n}")
	return string(full[:j]) + `"NaN"` + string(full[k:])
}

// nanLine and nanCol give the 1-based line and byte column of the value after key.
func nanLine(full []byte, key string) int {
	return bytes.Count(full[:bytes.Index(full, []byte(key))], []byte("\n")) + 1
}

func nanCol(full []byte, key string) int {
	i := bytes.Index(full, []byte(key)) + len(key)
	return i - bytes.LastIndexByte(full[:i], '\n')
}

// TestDiffBadResults: every kind of file that is not a complete
// results.json of this schema is refused with exit status 1, a message
// naming the side, the file, what is wrong (and where) and what to do, and
// no diff written.
func TestDiffBadResults(t *testing.T) {
	dir := t.TempDir()
	good := writeResults(t, filepath.Join(dir, "good"), runOf(1, 0.8, "strong"))
	full, err := os.ReadFile(good)
	if err != nil {
		t.Fatal(err)
	}
	noID := encode(t, func(r *report.Report) { r.Studies[0].ID = "" })
	// The last character of a file cut in half: its line, and its
	// column counted from 1.
	cut := full[:len(full)/2]
	last := bytes.TrimRight(cut, " \t\r\n")
	cutLine, cutCol := bytes.Count(last, []byte("\n"))+1, len(last)-bytes.LastIndexByte(last, '\n')-1
	cases := []struct {
		name, content string
		want          []string
	}{
		{"truncated", string(cut), []string{fmt.Sprintf("ends early, at line %d, column %d (", cutLine, cutCol), "run 'bivar run' again"}}, // the column was not given
		{"empty", "", []string{"the file is empty"}},
		{"blank", " \n\n", []string{"the file is empty"}},
		{"array", "[1, 2]", []string{"not a JSON object"}},
		{"not utf-8", "{\"schema\": \"\xff\"}", []string{"not UTF-8"}},
		{"no schema", `{"studies": []}`, []string{`no "schema" key`}},
		{"newer schema", strings.Replace(string(full), report.Schema, "bivar.results/v9", 1), []string{`schema "bivar.results/v9", but this bivar reads "bivar.results/v3"`, "rerun 'bivar run'"}},
		{"other schema", `{"schema": "acme/1"}`, []string{`schema "acme/1" is not bivar's results schema`}},
		{"syntax error", strings.Replace(string(full), `"studies": [`, `"studies": [,`, 1), []string{"line ", "column ", "not valid JSON"}},
		{"wrong type", strings.Replace(string(full), `"rows": 40`, `"rows": "forty"`, 1), []string{"line ", `key "datasets.rows" holds a JSON string where bivar writes a whole number:`}}, // it said "writes a int"
		{"unknown key", strings.Replace(string(full), `"schema":`, `"colour": 1, "schema":`, 1), []string{`unknown field "colour"`, "does not write"}},
		// Hand-edited files that decode but are not whole: they were
		// compared as if studies were added, removed or alike (a second
		// study of the same id silently replaced the first).
		{"studies null", encode(t, func(r *report.Report) { r.Studies = nil }), []string{`key "studies" is missing or null`, "run 'bivar run' again"}},
		{"study without id", noID, []string{fmt.Sprintf("line %d, column 5: study 1 has no id", strings.Count(noID[:strings.Index(noID, `"studies": [`)], "\n")+2)}},
		{"two studies of one id", encode(t, func(r *report.Report) { r.Studies = append(r.Studies, r.Studies[0]) }), []string{`study 2 has the id "s" of study 1 too`}},
		{"expectation without a name", encode(t, func(r *report.Report) { r.Studies[0].Expectations = []report.Expectation{{}} }), []string{`study 1 ("s") has an expectation without a name`}},
		{"NaN in quotes", nanAt(t, full, `"sxx": `), []string{fmt.Sprintf("line %d, column %d: ", nanLine(full, `"sxx": `), nanCol(full, `"sxx": `)),
			`key "studies[0].moments.sxx" holds a JSON string where bivar writes a number, or null`, "NaN and infinities as null"}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			p := filepath.Join(dir, strings.ReplaceAll(tc.name, " ", "-")+".json")
			writeFile(t, p, tc.content)
			out := filepath.Join(dir, "out-"+strings.ReplaceAll(tc.name, " ", "-"))
			code, _, stderr := call(t, "diff", "-o", out, good, p)
			if code != exitFailed {
				t.Errorf("exit %d, want 1; stderr %q", code, stderr)
			}
			for _, w := range append([]string{"bivar diff: NEW: " + p + ": "}, tc.want...) {
				if !strings.Contains(stderr, w) {
					t.Errorf("stderr lacks %q:\n%s", w, stderr)
				}
			}
			if strings.Contains(stderr, "panic") || strings.Count(stderr, "\n") != 1 {
				t.Errorf("want one line of message:\n%s", stderr)
			}
			if _, err := os.Stat(out); err == nil {
				t.Errorf("%s was created for a diff that failed", out)
			}
		})
	}
	if code, _, stderr := call(t, "diff", "-o", filepath.Join(dir, "o"), filepath.Join(dir, "absent"), good); code != exitFailed ||
		!strings.Contains(stderr, "no such file or folder; give a results.json") {
		t.Errorf("absent OLD: exit %d, %q", code, stderr)
	}
	if code, _, stderr := call(t, "diff", "a", "b", "c"); code != exitUsage || !strings.Contains(stderr, "got 3 arguments") {
		t.Errorf("three arguments: exit %d, %q", code, stderr)
	}
	if code, _, stderr := call(t, "diff", "a"); code != exitUsage || !strings.Contains(stderr, "got 1 argument\n") {
		t.Errorf("one argument: exit %d, %q", code, stderr)
	}
	if code, _, stderr := call(t, "diff", "-o", good, good, good); code != exitUsage || !strings.Contains(stderr, "is a file: give a folder") {
		t.Errorf("-o a file: exit %d, %q", code, stderr)
	}
	goodCopy := filepath.Join(dir, "good-copy.json")
	if b, err := os.ReadFile(good); err != nil || os.WriteFile(goodCopy, b, 0o644) != nil {
		t.Fatal("copying", good, err)
	}
	if code, _, stderr := call(t, "diff", "-o", filepath.Join(dir, "o2"), "--fail-on", "verdict,", good, goodCopy); code != exitOK {
		t.Errorf("--fail-on with a trailing comma: exit %d, %q", code, stderr)
	}
	if code, _, _ := call(t, "diff", "--colour", "a", "b"); code != exitUsage {
		t.Errorf("unknown flag: exit %d, want 2", code)
	}
}

// TestSampleProjectRuns keeps the sample project's story true (issue 5,
// item 4): the October check passes, November's fails its slope gate, a
// diff of October with itself finds nothing, and October against
// November finds the one relationship the (invented) generator changes.
// The data are invented; this checks the commands' behaviour, not numbers.
func TestSampleProjectRuns(t *testing.T) {
	if testing.Short() {
		t.Skip("runs the sample project")
	}
	sp := filepath.Join("..", "..", "sample-project")
	oct, nov := filepath.Join(sp, "bivar.toml"), filepath.Join(sp, "bivar-nov.toml")
	for _, p := range []string{oct, nov} {
		if _, err := os.Stat(p); err != nil {
			t.Skipf("sample project manifest %s not found", p)
		}
	}
	dir := t.TempDir()
	if code, _, stderr := call(t, "check", oct); code != exitOK {
		t.Fatalf("check October: exit %d, want 0\n%s", code, stderr)
	}
	if code, _, stderr := call(t, "check", nov); code != exitExpectation {
		t.Errorf("check November: exit %d, want 3\n%s", code, stderr)
	}
	octDir, novDir := filepath.Join(dir, "oct"), filepath.Join(dir, "nov")
	if code, _, stderr := call(t, "run", "-o", octDir, oct); code != exitOK {
		t.Fatalf("run October: exit %d\n%s", code, stderr)
	}
	call(t, "run", "-o", novDir, nov) // exits 3: its gate fails
	// October run twice: the same run again is compared, and nothing
	// changed (the same folder twice is refused: TestDiffCommand).
	oct2Dir := filepath.Join(dir, "oct2")
	if code, _, stderr := call(t, "run", "-o", oct2Dir, oct); code != exitOK {
		t.Fatalf("run October again: exit %d\n%s", code, stderr)
	}
	code, _, stderr := call(t, "diff", "-o", filepath.Join(dir, "same"), "--fail-on", "expectation,verdict,significant", octDir, oct2Dir)
	if code != exitOK || !strings.Contains(stderr, "0 CI gates changed outcome (0 now failing that did not fail before), 0 changed beyond chance") ||
		!strings.Contains(stderr, "0 with a changed verdict; 0 added, 0 removed") || strings.Contains(stderr, "study \"") || !strings.Contains(stderr, "bivar diff: Nothing changed: ") {
		t.Errorf("October against October run again: exit %d\n%s", code, stderr)
	}
	code, _, stderr = call(t, "diff", "-o", filepath.Join(dir, "changed"), "--fail-on", "significant", octDir, novDir)
	if code != exitExpectation {
		t.Errorf("October against November: exit %d, want 3\n%s", code, stderr)
	}
	b, err := os.ReadFile(filepath.Join(dir, "changed", "diff.json"))
	if err != nil {
		t.Fatal(err)
	}
	res, err := compare.Read(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	var flagged []string
	for _, s := range res.Studies {
		if s.Significant {
			flagged = append(flagged, s.ID)
		}
	}
	if strings.Join(flagged, ",") != "hardness-vs-temper,testers-agree" {
		t.Errorf("studies with a significant change: %v, want [hardness-vs-temper testers-agree] (the slope and the tester's bias the generator changes)", flagged)
	}
}
