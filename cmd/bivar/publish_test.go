package main

// Tests of how run, diff and check put their files in place: whole or not
// at all whatever stops them (a kill or a signal at each step, injected
// through publish.WithTrace, not by timing), never mixed by two runs at
// once, and never into a folder that is not theirs.

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"bivar/internal/publish"
)

// project writes bivar.toml and d.csv into dir: twelve invented rows
// (their numbers are checked by nothing here; variant changes them so
// that two runs give two different reports) and one study with an
// expectation that holds for variant 0 and fails for variant 1.
func project(t *testing.T, dir string, variant int, title string) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("a,b\n")
	for i := 1; i <= 12; i++ {
		y := float64(i)*0.5 + float64(i%3)
		if variant == 1 {
			y = 20 - float64(i)*0.7 + float64(i%4)
		}
		fmt.Fprintf(&b, "%d,%g\n", i, y)
	}
	writeFile(t, filepath.Join(dir, "d.csv"), b.String())
	p := filepath.Join(dir, "bivar.toml")
	writeFile(t, p, "title = "+strconv.Quote(title)+"\n[[dataset]]\nid = \"d\"\nfile = \"d.csv\"\n"+
		"[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"a\"\ny = \"b\"\n[study.expect]\ndirection = \"positive\"\n")
	return p
}

// tree reads every file under dir by slash-separated name; nil when dir
// does not exist.
func tree(t *testing.T, dir string) map[string]string {
	t.Helper()
	if _, err := os.Stat(dir); errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	out := map[string]string{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		b, err := os.ReadFile(p)
		rel, _ := filepath.Rel(dir, p)
		out[filepath.ToSlash(rel)] = string(b)
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

func sameTree(a, b map[string]string) bool {
	if (a == nil) != (b == nil) || len(a) != len(b) {
		return false
	}
	for k, v := range a {
		if w, ok := b[k]; !ok || w != v {
			return false
		}
	}
	return true
}

// hidden lists the entries of dir whose names start with a dot: the
// lock and temporaries of a writer (the project itself has none).
func hidden(t *testing.T, dir string) []string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range entries {
		if strings.HasPrefix(e.Name(), ".") {
			out = append(out, e.Name())
		}
	}
	return out
}

// TestCommandChild is the child side of the tests below: it runs the
// command line in BIVAR_CHILD_ARGS as main does (signals caught) and, at
// publishing step BIVAR_CHILD_STEP, kills itself (BIVAR_CHILD=kill) or
// sends itself a signal (BIVAR_CHILD=SIGINT or SIGTERM) and waits until
// the command has seen it.
func TestCommandChild(t *testing.T) {
	action := os.Getenv("BIVAR_CHILD")
	if action == "" {
		t.Skip("run by the tests that stop a command")
	}
	k, _ := strconv.Atoi(os.Getenv("BIVAR_CHILD_STEP"))
	ctx, stop := withSignals(context.Background())
	n := 0
	ctx = publish.WithTrace(ctx, func(publish.Step) {
		if n++; n != k {
			return
		}
		switch action {
		case "kill":
			syscall.Kill(os.Getpid(), syscall.SIGKILL)
			select {}
		case "SIGINT", "SIGTERM":
			sig := syscall.SIGINT
			if action == "SIGTERM" {
				sig = syscall.SIGTERM
			}
			syscall.Kill(os.Getpid(), sig)
			select {
			case <-ctx.Done():
			case <-time.After(10 * time.Second):
				fmt.Fprintln(os.Stderr, "the signal never arrived")
			}
		}
	})
	code := run(ctx, strings.Split(os.Getenv("BIVAR_CHILD_ARGS"), "\x1f"), os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}

// child runs args in a child process that acts at step k; it returns
// whether the child was killed, its exit status and its stderr.
func child(t *testing.T, action string, k int, args ...string) (killed bool, code int, stderr string) {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^TestCommandChild$")
	cmd.Env = append(os.Environ(), "BIVAR_CHILD="+action, "BIVAR_CHILD_STEP="+strconv.Itoa(k), "BIVAR_CHILD_ARGS="+strings.Join(args, "\x1f"))
	var errb strings.Builder
	cmd.Stderr = &errb
	err := cmd.Run()
	var ee *exec.ExitError
	switch {
	case err == nil:
		return false, 0, errb.String()
	case errors.As(err, &ee) && ee.Sys().(syscall.WaitStatus).Signal() == syscall.SIGKILL:
		return true, -1, errb.String()
	case errors.As(err, &ee):
		return false, ee.ExitCode(), errb.String()
	}
	t.Fatalf("child: %v", err)
	return
}

// killCase is a command stopped at every step of its publishing.
type killCase struct {
	name  string
	setup func(t *testing.T, root string) []string // makes the old output, returns the new command line
	files func(t *testing.T, root string) []map[string]string
}

func killCases() []killCase {
	return []killCase{
		{
			name: "run",
			setup: func(t *testing.T, root string) []string {
				m := project(t, root, 0, "publish test (invented data)")
				if code, _, stderr := call(t, "run", m); code != exitOK {
					t.Fatalf("first run: exit %d\n%s", code, stderr)
				}
				project(t, root, 1, "publish test (invented data), second run")
				return []string{"run", m}
			},
			files: func(t *testing.T, root string) []map[string]string {
				return []map[string]string{tree(t, filepath.Join(root, "report"))}
			},
		},
		{
			name: "diff",
			setup: func(t *testing.T, root string) []string {
				a := writeResults(t, filepath.Join(root, "a"), runOf(1, 0.8, "strong"))
				same := writeResults(t, filepath.Join(root, "same"), runOf(2, 0.8, "strong"))
				changed := writeResults(t, filepath.Join(root, "changed"), runOf(3, 0.3, "moderate"))
				out := filepath.Join(root, "diff")
				if code, _, stderr := call(t, "diff", "-o", out, a, same); code != exitOK {
					t.Fatalf("first diff: exit %d\n%s", code, stderr)
				}
				return []string{"diff", "-o", out, a, changed}
			},
			files: func(t *testing.T, root string) []map[string]string {
				return []map[string]string{tree(t, filepath.Join(root, "diff"))}
			},
		},
		{
			name: "check",
			setup: func(t *testing.T, root string) []string {
				m := project(t, root, 0, "publish test (invented data)")
				ci := filepath.Join(root, "ci")
				args := []string{"check", "--junit", filepath.Join(ci, "junit.xml"), "--summary", filepath.Join(ci, "summary.md"), m}
				if code, _, stderr := call(t, args...); code != exitOK {
					t.Fatalf("first check: exit %d\n%s", code, stderr)
				}
				project(t, root, 1, "publish test (invented data)") // the expectation now fails
				return args
			},
			files: func(t *testing.T, root string) []map[string]string {
				ci := tree(t, filepath.Join(root, "ci"))
				return []map[string]string{{"junit.xml": ci["junit.xml"]}, {"summary.md": ci["summary.md"]}}
			},
		},
	}
}

// TestKillAtEveryStep kills run, diff and check at each step of putting
// their files in place, in turn, and checks that each output is then the
// old one or the new one, whole; that the next run clears what the killed
// one left; and, for check's two files, that they disagree only after a
// kill between their two renames (files in two places cannot be replaced
// in one step).
func TestKillAtEveryStep(t *testing.T) {
	if testing.Short() {
		t.Skip("starts a process per step")
	}
	// The run date is in the report: fixed, so that a killed run and the
	// complete one after it write the same bytes even a minute apart.
	t.Setenv("SOURCE_DATE_EPOCH", "1764892800")
	for _, kc := range killCases() {
		t.Run(kc.name, func(t *testing.T) {
			base := t.TempDir()
			root := filepath.Join(base, "w")
			var old, states [][]map[string]string
			mixed := 0
			steps := 0
			for k := 1; ; k++ {
				os.RemoveAll(root)
				args := kc.setup(t, root)
				old = append(old, kc.files(t, root))
				killed, code, stderr := child(t, "kill", k, args...)
				if !killed {
					if code != exitOK && code != exitExpectation {
						t.Fatalf("the complete command: exit %d\n%s", code, stderr)
					}
					steps = k - 1
					break
				}
				states = append(states, kc.files(t, root))
				// The next command clears what the killed one left.
				if code, _, stderr := call(t, args...); code != exitOK && code != exitExpectation {
					t.Errorf("killed at step %d, the next %s: exit %d\n%s", k, kc.name, code, stderr)
				}
				for _, dir := range []string{root, filepath.Join(root, "ci")} {
					if _, err := os.Stat(dir); err == nil {
						if h := hidden(t, dir); len(h) > 0 {
							t.Errorf("killed at step %d, then run again: %s holds %v", k, dir, h)
						}
					}
				}
			}
			newFiles := kc.files(t, root)
			for i := range states {
				mix := false
				for j := range states[i] {
					switch {
					case sameTree(states[i][j], old[i][j]):
						mix = mix || j > 0 && sameTree(states[i][0], newFiles[0])
					case sameTree(states[i][j], newFiles[j]):
						mix = mix || j > 0 && sameTree(states[i][0], old[i][0])
					default:
						t.Errorf("killed at step %d: output %d is neither the old nor the new one, whole: %d files", i+1, j, len(states[i][j]))
					}
				}
				if mix {
					mixed++
				}
			}
			if want := map[string]int{"check": 1}[kc.name]; mixed != want {
				t.Errorf("%d steps left old and new files side by side, want %d", mixed, want)
			}
			if steps < 3 {
				t.Errorf("only %d steps", steps)
			}
			t.Logf("killed at each of %d steps", steps)
		})
	}
}

// TestSignalAtEveryStep sends SIGINT to run, diff and check at each step
// in turn: each stops before its next step, says so, exits 130 and keeps
// the previous output, or, when the signal came after the output was put
// in place, finishes normally; no temporary file is left either way.
func TestSignalAtEveryStep(t *testing.T) {
	if testing.Short() {
		t.Skip("starts a process per step")
	}
	// The run date is in the report: fixed, so that a killed run and the
	// complete one after it write the same bytes even a minute apart.
	t.Setenv("SOURCE_DATE_EPOCH", "1764892800")
	for _, kc := range killCases() {
		t.Run(kc.name, func(t *testing.T) {
			root := filepath.Join(t.TempDir(), "w")
			stops := 0
			for k := 1; ; k++ {
				os.RemoveAll(root)
				args := kc.setup(t, root)
				old := kc.files(t, root)
				_, code, stderr := child(t, "SIGINT", k, args...)
				if code == exitInterrupted {
					stops++
				}
				got := kc.files(t, root)
				stoppedMsg := strings.Contains(stderr, "stopped by SIGINT; nothing written: ")
				switch {
				case code == exitInterrupted:
					if !stoppedMsg {
						t.Errorf("step %d: exit 130 without saying why:\n%s", k, stderr)
					}
					for j := range old {
						if !sameTree(got[j], old[j]) {
							t.Errorf("step %d: stopped, but output %d changed", k, j)
						}
					}
				case code == exitOK || code == exitExpectation:
					if stoppedMsg {
						t.Errorf("step %d: exit %d after saying it stopped:\n%s", k, code, stderr)
					}
				default:
					t.Fatalf("step %d: exit %d\n%s", k, code, stderr)
				}
				for _, dir := range []string{root, filepath.Join(root, "ci")} {
					if _, err := os.Stat(dir); err == nil {
						if h := hidden(t, dir); len(h) > 0 {
							t.Errorf("step %d: %s holds %v", k, dir, h)
						}
					}
				}
				if strings.Contains(stderr, "the signal never arrived") {
					t.Fatalf("step %d: the signal never arrived", k)
				}
				if code != exitInterrupted {
					break // the signal came after the output was in place, or never
				}
			}
			if stops < 2 {
				t.Errorf("stopped at %d steps, want every step before the output is put in place", stops)
			}
			t.Logf("stopped at each of %d steps", stops)
		})
	}
	// SIGTERM gives 143.
	root := t.TempDir()
	m := project(t, root, 0, "publish test (invented data)")
	if _, code, stderr := child(t, "SIGTERM", 1, "run", m); code != exitTerminated || !strings.Contains(stderr, "bivar: stopped by SIGTERM; nothing written: any earlier report in ") {
		t.Errorf("SIGTERM: exit %d, want %d, stderr:\n%s", code, exitTerminated, stderr)
	}
	if _, err := os.Stat(filepath.Join(root, "report")); err == nil {
		t.Error("a run stopped by SIGTERM before its report was put in place left a report folder")
	}
}

// TestSignalBeforeWriting: a signal that arrives while the studies run
// (here: before they start) stops run, check and diff with its exit
// status and writes nothing.
func TestSignalBeforeWriting(t *testing.T) {
	root := t.TempDir()
	m := project(t, root, 0, "publish test (invented data)")
	a := writeResults(t, filepath.Join(root, "a"), runOf(1, 0.8, "strong"))
	b := writeResults(t, filepath.Join(root, "b"), runOf(2, 0.8, "strong"))
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"run", m}, "bivar: stopped by SIGTERM; nothing written: any earlier report in "},
		{[]string{"check", "--junit", filepath.Join(root, "j.xml"), m}, "bivar check: stopped by SIGTERM; nothing written: the earlier --junit and --summary files are as they were"},
		{[]string{"diff", "-o", filepath.Join(root, "diff"), a, b}, "bivar diff: stopped by SIGTERM; nothing written: any earlier diff in "},
	} {
		ctx, cancel := context.WithCancelCause(context.Background())
		cancel(&signalError{syscall.SIGTERM})
		var out, errb strings.Builder
		code := run(ctx, tc.args, &out, &errb)
		if code != exitTerminated || !strings.Contains(errb.String(), tc.want) {
			t.Errorf("bivar %s: exit %d, stderr:\n%s\nwant %d and %q", tc.args[0], code, errb.String(), exitTerminated, tc.want)
		}
	}
	entries, _ := os.ReadDir(root)
	var names []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	if got := strings.Join(names, " "); got != "a b bivar.toml d.csv" {
		t.Errorf("after the stopped commands the folder holds %s, want a b bivar.toml d.csv", got)
	}
}

// TestConcurrentRuns: two runs of two projects into one output folder at
// once, many times over, while a reader reads the folder. Every run either
// writes its whole report or is refused with a message naming the other
// process; the reader never finds files of two runs in one folder.
func TestConcurrentRuns(t *testing.T) {
	base := t.TempDir()
	out := filepath.Join(base, "shared-report")
	manifests := []string{
		project(t, filepath.Join(base, "p1"), 0, "project one (invented data)"),
		project(t, filepath.Join(base, "p2"), 1, "project two (invented data)"),
	}
	const rounds = 15
	var wg sync.WaitGroup
	var mu sync.Mutex
	written, refused := 0, 0
	for _, m := range manifests {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for range rounds {
				code, _, stderr := call(t, "run", "-replace", "-o", out, m) // two manifests, one folder: on purpose
				mu.Lock()
				switch {
				case (code == exitOK || code == exitExpectation) && strings.Contains(stderr, "report written to"):
					written++
				case code == exitFailed && strings.Contains(stderr, "is being written by another bivar run \"") &&
					strings.Contains(stderr, "(process "+strconv.Itoa(os.Getpid())+", running since ") &&
					strings.Contains(stderr, "wait for it to finish, or choose another with -o DIR"):
					refused++
				default:
					t.Errorf("exit %d, stderr:\n%s", code, stderr)
				}
				mu.Unlock()
			}
		}()
	}
	done := make(chan struct{})
	reads := 0
	var rwg sync.WaitGroup
	rwg.Add(1)
	go func() {
		defer rwg.Done()
		for {
			select {
			case <-done:
				return
			default:
			}
			root, err := os.OpenRoot(out)
			if err != nil {
				continue
			}
			md, err1 := root.ReadFile("report.md")
			js, err2 := root.ReadFile("results.json")
			html, err3 := root.ReadFile("report.html")
			root.Close()
			if err1 != nil || err2 != nil || err3 != nil {
				continue // the folder was removed after an exchange, mid-read
			}
			reads++
			one := strings.Contains(string(md), "project one")
			if strings.Contains(string(js), "project one") != one || strings.Contains(string(html), "project one") != one {
				t.Error("one report folder held files of two runs")
			}
		}
	}()
	wg.Wait()
	close(done)
	rwg.Wait()
	if written+refused != 2*rounds || written == 0 {
		t.Errorf("%d written, %d refused, want %d in all", written, refused, 2*rounds)
	}
	if h := hidden(t, base); len(h) > 0 {
		t.Errorf("left beside the report: %v", h)
	}
	t.Logf("%d written, %d refused, %d whole reads", written, refused, reads)
}

// TestRunOutputRefused: an output the user cannot have meant, a folder
// that holds files bivar did not write, and a folder another run is
// writing are refused with what to do, and nothing is changed.
func TestRunOutputRefused(t *testing.T) {
	root := t.TempDir()
	m := project(t, root, 0, "publish test (invented data)")
	mine := filepath.Join(root, "mine")
	writeFile(t, filepath.Join(mine, "notes.txt"), "a user's notes")
	for _, tc := range []struct {
		name string
		args []string
		code int
		want string
	}{
		{"root", []string{"run", "-o", "/", m}, exitUsage, `bivar run: -o / is the root of the file system: give the report a folder of its own, such as "report"`},
		{"manifest", []string{"run", "-o", m, m}, exitUsage, "bivar run: -o " + m + ` is the manifest: give the report a folder of its own`},
		{"data", []string{"run", "-o", filepath.Join(root, "d.csv"), m}, exitUsage, `is the data file of dataset "d": give the report a folder of its own`},
		{"holds the inputs", []string{"run", "-o", root, m}, exitUsage, `holds the manifest (bivar.toml), and each run replaces its output folder as a whole`},
		{"user's folder", []string{"run", "-o", mine, m}, exitFailed, mine + " holds notes.txt, which bivar did not write there: each run replaces the whole folder, so they would be lost; move them elsewhere or choose a folder of bivar's own (the folder comes from -o)"},
	} {
		code, _, stderr := call(t, tc.args...)
		if code != tc.code || !strings.Contains(stderr, tc.want) {
			t.Errorf("%s: exit %d, stderr:\n%s\nwant %d and %q", tc.name, code, stderr, tc.code, tc.want)
		}
	}
	if b, err := os.ReadFile(filepath.Join(mine, "notes.txt")); err != nil || string(b) != "a user's notes" {
		t.Errorf("the user's file changed: %q, %v", b, err)
	}
	// check's files are not the inputs either.
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"check", "--junit", m, m}, "bivar check: --junit " + m + " is the manifest: give the CI file a name of its own"},
		{[]string{"check", "--summary", filepath.Join(root, "d.csv"), m}, "bivar check: --summary " + filepath.Join(root, "d.csv") + ` is the data file of dataset "d": give the CI file a name of its own`},
	} {
		code, _, stderr := call(t, tc.args...)
		if code != exitUsage || !strings.Contains(stderr, tc.want) {
			t.Errorf("bivar %s: exit %d, stderr:\n%s\nwant %d and %q", strings.Join(tc.args, " "), code, stderr, exitUsage, tc.want)
		}
	}
	if b, _ := os.ReadFile(filepath.Join(root, "d.csv")); !strings.HasPrefix(string(b), "a,b\n") {
		t.Error("check wrote over the data file")
	}
	// [output] dir gets its manifest line.
	bad := filepath.Join(root, "bad.toml")
	src, _ := os.ReadFile(m)
	writeFile(t, bad, string(src)+"[output]\ndir = \".\"\ntheme = \"papr\"\n")
	code, _, stderr := call(t, "run", bad)
	for _, want := range []string{
		bad + `:13:1: output.dir = "." holds the manifest (bad.toml), and each run replaces its output folder as a whole: give the report a folder of its own, such as "report"`,
		bad + `:14:1: output.theme = "papr" is not allowed; use one of "paper", "night", "contrast" (did you mean "paper"?)`,
	} {
		if code != exitFailed || !strings.Contains(stderr, want) {
			t.Errorf("manifest with a bad output: exit %d, stderr:\n%s\nwant %q", code, stderr, want)
		}
	}
	// Another run holds the folder.
	held, err := publish.OpenDir(filepath.Join(root, "report"), publish.Options{Command: "bivar run"})
	if err != nil {
		t.Fatal(err)
	}
	code, _, stderr = call(t, "run", m)
	held.Close()
	if want := fmt.Sprintf("is being written by another bivar run (process %d, running since ", os.Getpid()); code != exitFailed || !strings.Contains(stderr, want) {
		t.Errorf("a held folder: exit %d, stderr:\n%s\nwant %q", code, stderr, want)
	}
	// The output of another command is not replaced.
	if code, _, _ := call(t, "run", m); code != exitOK {
		t.Fatalf("run: exit %d", code)
	}
	a := writeResults(t, filepath.Join(root, "a"), runOf(1, 0.8, "strong"))
	code, _, stderr = call(t, "diff", "-o", filepath.Join(root, "report"), a, a)
	if want := "which this command would replace whole: give each command a folder of its own"; code != exitFailed || !strings.Contains(stderr, want) {
		t.Errorf("diff into a report folder: exit %d, stderr:\n%s\nwant %q", code, stderr, want)
	}
	// Leftovers of a run that died are cleared, and only they.
	stale := filepath.Join(root, ".report.bivar-tmp-99999-0000abcd.new")
	writeFile(t, filepath.Join(stale, "report.html"), "half")
	if code, _, stderr := call(t, "run", m); code != exitOK {
		t.Fatalf("run: exit %d\n%s", code, stderr)
	}
	if _, err := os.Stat(stale); err == nil {
		t.Error("a dead run's temporary folder was left")
	}
	if h := hidden(t, root); len(h) > 0 {
		t.Errorf("left in the project: %v", h)
	}
}

// TestConcurrentRunProcesses: the same as TestConcurrentRuns with two
// processes, so the lock is taken between processes and the refused one
// names the other's process id.
func TestConcurrentRunProcesses(t *testing.T) {
	if testing.Short() {
		t.Skip("starts processes")
	}
	base := t.TempDir()
	out := filepath.Join(base, "shared-report")
	manifests := []string{
		project(t, filepath.Join(base, "p1"), 0, "project one (invented data)"),
		project(t, filepath.Join(base, "p2"), 1, "project two (invented data)"),
	}
	const rounds = 8
	var wg sync.WaitGroup
	var mu sync.Mutex
	written, refused := 0, 0
	for _, m := range manifests {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for range rounds {
				_, code, stderr := child(t, "none", 0, "run", "-replace", "-o", out, m) // two manifests, one folder: on purpose
				mu.Lock()
				switch {
				case (code == exitOK || code == exitExpectation) && strings.Contains(stderr, "report written to"):
					written++
				case code == exitFailed && strings.Contains(stderr, "is being written by another bivar run \"") && strings.Contains(stderr, "(process ") &&
					!strings.Contains(stderr, "(process "+strconv.Itoa(os.Getpid())+",") && !strings.Contains(stderr, "(process 0"):
					refused++
				default:
					t.Errorf("exit %d, stderr:\n%s", code, stderr)
				}
				mu.Unlock()
			}
		}()
	}
	wg.Wait()
	got := tree(t, out)
	one := strings.Contains(got["report.md"], "project one")
	if strings.Contains(got["results.json"], "project one") != one || strings.Contains(got["report.html"], "project one") != one {
		t.Error("the report folder holds files of two runs")
	}
	if written+refused != 2*rounds || written == 0 {
		t.Errorf("%d written, %d refused, want %d in all", written, refused, 2*rounds)
	}
	if h := hidden(t, base); len(h) > 0 {
		t.Errorf("left beside the report: %v", h)
	}
	t.Logf("%d written, %d refused", written, refused)
}

// TestRunOtherManifestRefused: a report folder records the manifest that
// wrote it; a run of another manifest into it stops with a message naming
// both, and -replace overwrites it on purpose.
func TestRunOtherManifestRefused(t *testing.T) {
	base := t.TempDir()
	out := filepath.Join(base, "report")
	a := project(t, filepath.Join(base, "a"), 0, "project a (invented data)")
	b := project(t, filepath.Join(base, "b"), 1, "project b (invented data)")
	if code, _, stderr := call(t, "run", "-o", out, a); code != exitOK && code != exitExpectation {
		t.Fatalf("first run: exit %d\n%s", code, stderr)
	}
	if code, _, stderr := call(t, "run", "-o", out, a); code != exitOK && code != exitExpectation {
		t.Fatalf("same manifest again: exit %d\n%s", code, stderr)
	}
	before, _ := os.ReadFile(filepath.Join(out, "results.json"))
	code, _, stderr := call(t, "run", "-o", out, b)
	absA, _ := filepath.Abs(a)
	absB, _ := filepath.Abs(b)
	if code != exitFailed || !strings.Contains(stderr, absA) || !strings.Contains(stderr, absB) || !strings.Contains(stderr, "-replace") {
		t.Errorf("other manifest: exit %d, stderr:\n%s\nwant exit 1 naming both manifests and -replace", code, stderr)
	}
	if after, _ := os.ReadFile(filepath.Join(out, "results.json")); !bytes.Equal(before, after) {
		t.Error("the refused run changed the report")
	}
	if code, _, stderr := call(t, "run", "-replace", "-o", out, b); code != exitOK && code != exitExpectation {
		t.Errorf("-replace: exit %d\n%s", code, stderr)
	}
}

// TestRunCopiedProject: a report folder records its manifest relative to
// itself, so a project copied whole (manifest, data and report folder)
// runs in its new place without --replace; a folder whose list names the
// same manifest by its absolute path (as runs recorded it before) is
// taken too; and two manifests of one copied project still do not share
// a folder without --replace.
func TestRunCopiedProject(t *testing.T) {
	base := t.TempDir()
	a := project(t, filepath.Join(base, "a"), 0, "project (invented data)")
	if code, _, stderr := call(t, "run", a); code != exitOK && code != exitExpectation {
		t.Fatalf("first run: exit %d\n%s", code, stderr)
	}
	list, err := os.ReadFile(filepath.Join(base, "a", "report", publish.ContentsFile))
	if err != nil {
		t.Fatal(err)
	}
	if first, _, _ := strings.Cut(string(list), "\n"); !strings.Contains(first, `bivar run "../bivar.toml"`) {
		t.Errorf("the folder records %q, want the manifest relative to it", first)
	}
	// Copy the whole project, report folder included.
	b := filepath.Join(base, "b")
	for name, text := range tree(t, filepath.Join(base, "a")) {
		writeFile(t, filepath.Join(b, filepath.FromSlash(name)), text)
	}
	if code, _, stderr := call(t, "run", filepath.Join(b, "bivar.toml")); code != exitOK && code != exitExpectation {
		t.Errorf("copied project: exit %d\n%s", code, stderr)
	}
	// A list written before runs recorded the path relative: the same
	// manifest by its absolute path.
	abs, _ := filepath.Abs(filepath.Join(b, "bivar.toml"))
	listB := filepath.Join(b, "report", publish.ContentsFile)
	old, _ := os.ReadFile(listB)
	_, rest, _ := strings.Cut(string(old), "\n")
	writeFile(t, listB, "# written by bivar run "+strconv.Quote(abs)+"; each publish replaces this folder as a whole\n"+rest)
	if code, _, stderr := call(t, "run", filepath.Join(b, "bivar.toml")); code != exitOK && code != exitExpectation {
		t.Errorf("folder listed with the manifest's absolute path: exit %d\n%s", code, stderr)
	}
	// Another manifest of the copy, into the same folder.
	other := filepath.Join(b, "other.toml")
	src, _ := os.ReadFile(filepath.Join(b, "bivar.toml"))
	writeFile(t, other, string(src))
	if code, _, stderr := call(t, "run", "-o", filepath.Join(b, "report"), other); code != exitFailed || !strings.Contains(stderr, "--replace") {
		t.Errorf("another manifest into the copied folder: exit %d, stderr:\n%s\nwant exit 1 naming --replace", code, stderr)
	}
}
