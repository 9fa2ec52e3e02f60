package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"bivar/analysis/manifest"
)

// uncommentStudies removes one leading "# " from every line of each
// commented-out [[study]] block (from "# [[study]]" to the blank line), as
// a user choosing them would.
func uncommentStudies(text string) string {
	var out []string
	in := false
	for _, l := range strings.Split(text, "\n") {
		if l == "# [[study]]" {
			in = true
		}
		if l == "" {
			in = false
		}
		if in {
			l = strings.TrimPrefix(l, "# ")
		}
		out = append(out, l)
	}
	return strings.Join(out, "\n")
}

func writeFile(t *testing.T, path, text string) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
}

// A small CSV of our own making: only its structure is tested here.
const initCSV = `shot,lot,melt temp,pressure,shrinkage,note,line
1,A,230.5,80,1.52,ok,4
2,A,231.0,82,1.49,,4
3,B,229.8,79,NA,check gauge,4
4,B,233.1,85,1.41,ok,4
5,C,232.4,84,1.44,ok,4
6,C,228.9,78,1.58,ok,4
`

func TestInit(t *testing.T) {
	dir := t.TempDir()
	csvPath := filepath.Join(dir, "data", "cell4.csv")
	writeFile(t, csvPath, initCSV)
	dest := filepath.Join(dir, "bivar.toml")

	code, _, stderr := call(t, "init", "-o", dest, csvPath)
	if code != exitOK {
		t.Fatalf("bivar init: exit %d\n%s", code, stderr)
	}
	b, err := os.ReadFile(dest)
	if err != nil {
		t.Fatal(err)
	}
	text := string(b)
	for _, want := range []string{
		`file    = "data/cell4.csv"`,
		"[[study]]\nid      = \"pressure-vs-melt-temp\"",
		`# x       = "melt temp"`,
		`# id      = "shrinkage-vs-pressure"`,
		`# # group = "lot"`,
		`# # order = "shot"`,
		`# group = "lot"`,
		`#   shot                 numeric, rises by 1 each row`,
		`#   line                 numeric, constant (4)`,
		`# "melt temp" = ""`,
		`design = "observational"`,
	} {
		if !strings.Contains(text, want) {
			t.Errorf("manifest lacks %q:\n%s", want, text)
		}
	}
	// The counter and the constant column are not paired.
	for _, bad := range []string{`x       = "shot"`, `y       = "line"`, `x       = "line"`} {
		if strings.Contains(text, bad) {
			t.Errorf("manifest pairs a counter or constant column: %q", bad)
		}
	}
	if n := strings.Count(text, "# [[study]]"); n != 2 {
		t.Errorf("%d commented-out studies, want 2 (three pairs of melt temp, pressure, shrinkage; the first active)", n)
	}
	if !strings.Contains(stderr, "bivar run") {
		t.Errorf("init does not say what to run next: %q", stderr)
	}

	// As written it loads with the first study active; with the others
	// uncommented it loads with all three.
	m, err := manifest.Load(dest)
	if err != nil {
		t.Fatalf("the manifest as written does not load: %v\n%s", err, text)
	}
	if len(m.Studies) != 1 || m.Studies[0].ID != "pressure-vs-melt-temp" {
		t.Errorf("as written: studies %+v, want the first pair only", m.Studies)
	}
	chosen := filepath.Join(dir, "chosen.toml")
	writeFile(t, chosen, uncommentStudies(text))
	m, err = manifest.Load(chosen)
	if err != nil {
		t.Fatalf("the manifest with its studies uncommented does not load: %v\n%s", err, uncommentStudies(text))
	}
	if len(m.Studies) != 3 || m.Studies[0].X != "melt temp" || m.Studies[0].Y != "pressure" || m.Studies[2].ID != "shrinkage-vs-pressure" {
		t.Errorf("studies = %+v", m.Studies)
	}

	// Never overwrite without --force.
	code, _, stderr = call(t, "init", "-o", dest, csvPath)
	if code != exitFailed || !strings.Contains(stderr, "--force") {
		t.Errorf("second init: exit %d, stderr %q; want 1 and a hint about --force", code, stderr)
	}
	if code, _, stderr = call(t, "init", "--force", "-o", dest, csvPath); code != exitOK {
		t.Errorf("init --force: exit %d\n%s", code, stderr)
	}
}

func TestInitDefaultPathAndDecimalComma(t *testing.T) {
	dir := t.TempDir()
	csvPath := filepath.Join(dir, "m.csv")
	writeFile(t, csvPath, "a;b;c\n1,5;2,25;x\n2,5;3,5;y\n3,0;4,75;x\n4,5;5,0;y\n")
	if code, _, stderr := call(t, "init", csvPath); code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	b, err := os.ReadFile(filepath.Join(dir, "bivar.toml"))
	if err != nil {
		t.Fatalf("no bivar.toml beside the CSV: %v", err)
	}
	text := string(b)
	for _, want := range []string{`delimiter = ";"`, `decimal = ","`, `id      = "b-vs-a"`, `# group = "c"`} {
		if !strings.Contains(text, want) {
			t.Errorf("manifest lacks %q:\n%s", want, text)
		}
	}
	writeFile(t, filepath.Join(dir, "chosen.toml"), uncommentStudies(text))
	if _, err := manifest.Load(filepath.Join(dir, "chosen.toml")); err != nil {
		t.Errorf("does not load: %v", err)
	}
}

func TestInitErrors(t *testing.T) {
	dir := t.TempDir()
	cases := []struct {
		name, csv, want string
		code            int
	}{
		{"missing file", "", "no such file", exitFailed},
		{"empty", "\n", "empty file", exitFailed},
		{"header only", "a,b\n", "no data rows", exitFailed},
		{"duplicate column", "a,a\n1,2\n", `"a" is named twice`, exitFailed},
		{"unnamed column", "a,,c\n1,2,3\n", "column 2 has no name", exitFailed},
	}
	for i, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			p := filepath.Join(dir, tc.name+".csv")
			if tc.csv != "" {
				writeFile(t, p, tc.csv)
			}
			code, _, stderr := call(t, "init", "-o", filepath.Join(dir, "out", string(rune('a'+i))+".toml"), p)
			if code != tc.code || !strings.Contains(stderr, tc.want) {
				t.Errorf("exit %d, stderr %q; want %d and %q", code, stderr, tc.code, tc.want)
			}
		})
	}
	if code, _, _ := call(t, "init"); code != exitUsage {
		t.Errorf("no argument: exit %d, want 2", code)
	}
	// No numeric pair: a manifest that says so, still loadable.
	p := filepath.Join(dir, "text.csv")
	writeFile(t, p, "name,score\nann,1\nbob,2\n")
	out := filepath.Join(dir, "text.toml")
	if code, _, stderr := call(t, "init", "-o", out, p); code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	b, _ := os.ReadFile(out)
	if !strings.Contains(string(b), "No pair of numeric") {
		t.Errorf("no-pair manifest does not say so:\n%s", b)
	}
}

// FuzzInit: any CSV either gives an error or a manifest that, with every
// study uncommented, the loaderifest.Load accepts (so column names are quoted
// correctly whatever they hold).
func FuzzInit(f *testing.F) {
	f.Add(initCSV)
	f.Add("a;b\n1,5;2\n2,5;3\n3,5;1\n")
	f.Add("\"we\"\"ird\",\"new\nline\",#x\n1,2,3\n2,3,1\n3,1,2\n")
	f.Add("a\tb\tc\n1\t2\t3\n4\t5\t7\n7\t8\t8\n")
	f.Add("ü ñ,=,[x]\n1,2,3\n2,3,4\n3,5,4\n")
	f.Fuzz(func(t *testing.T, data string) {
		dir := t.TempDir()
		p := filepath.Join(dir, "d.csv")
		writeFile(t, p, data)
		prof, err := profileCSV(p)
		if err != nil {
			return
		}
		text := initManifest(prof, "d.csv")
		if len(prof.pairs()) == 0 {
			return
		}
		m := filepath.Join(dir, "m.toml")
		writeFile(t, m, uncommentStudies(text))
		got, err := manifest.Load(m)
		if err != nil {
			t.Fatalf("generated manifest does not load: %v\n%s", err, uncommentStudies(text))
		}
		if want := min(len(prof.pairs()), initMaxPairs); len(got.Studies) != want {
			t.Fatalf("%d studies loaded, want %d", len(got.Studies), want)
		}
	})
}
