package publish

import (
	"context"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
)

// The child side of TestKillAtEveryStep: publish a set into the folder
// named by the environment and kill this process with SIGKILL, which
// cannot be caught, before step K.
func TestKillChild(t *testing.T) {
	spec := os.Getenv("PUBLISH_KILL_CHILD")
	if spec == "" {
		t.Skip("run by TestKillAtEveryStep")
	}
	parts := strings.Split(spec, ",") // dir,k,mode
	k, _ := strconv.Atoi(parts[1])
	tg, err := OpenDir(parts[0], Options{Command: "bivar test"})
	if err != nil {
		fmt.Println("open:", err)
		os.Exit(2)
	}
	if parts[2] == "fallback" {
		tg.exchange = func(a, b string) error { return errNoExchange }
	}
	n := 0
	ctx := WithTrace(context.Background(), func(s Step) {
		if n++; n == k {
			syscall.Kill(os.Getpid(), syscall.SIGKILL)
			select {} // the signal is on its way
		}
	})
	if err := tg.Publish(ctx, killNew); err != nil {
		fmt.Println("publish:", err)
		os.Exit(2)
	}
	tg.Close()
	os.Exit(0)
}

var (
	killOld = set("OLD", "report.html", "report.md", "results.json", "figures/a.svg", "figures/b.svg", "studies/a/data.csv")
	killNew = set("NEW", "report.html", "report.md", "results.json", "figures/a.svg", "figures/c.svg", "studies/c/data.csv")
)

// TestKillAtEveryStep kills a publishing process at each of its steps in
// turn (an injected hook, not timing) and checks that the folder then
// holds the old set or the new one, complete, and that the next Open
// clears everything the dead process left.
func TestKillAtEveryStep(t *testing.T) {
	if testing.Short() {
		t.Skip("starts a process per step")
	}
	for _, mode := range []string{"exchange", "fallback"} {
		for _, first := range []bool{false, true} {
			t.Run(fmt.Sprintf("%s/first=%v", mode, first), func(t *testing.T) {
				steps := 0
				for k := 1; ; k++ {
					dir := filepath.Join(t.TempDir(), "report")
					if !first {
						if err := publish(t, context.Background(), dir, killOld); err != nil {
							t.Fatal(err)
						}
					}
					old := snapshot(t, dir)
					cmd := exec.Command(os.Args[0], "-test.run=^TestKillChild$")
					cmd.Env = append(os.Environ(), fmt.Sprintf("PUBLISH_KILL_CHILD=%s,%d,%s", dir, k, mode))
					out, err := cmd.CombinedOutput()
					var ee *exec.ExitError
					killed := errors.As(err, &ee) && ee.Sys().(syscall.WaitStatus).Signal() == syscall.SIGKILL
					if err != nil && !killed {
						t.Fatalf("step %d: child: %v\n%s", k, err, out)
					}
					got := snapshot(t, dir)
					inPlace := equal(got, old) || equal(got, want(killNew))
					// The fallback's two renames leave the folder absent
					// between them; the exchange never does.
					if !inPlace && (mode == "exchange" || got != nil) {
						t.Errorf("killed before step %d: the folder holds neither set: %v", k, got)
					}
					// The next Open puts a set back and clears the rest.
					tg, err := OpenDir(dir, Options{Command: "bivar test"})
					if err != nil {
						t.Fatalf("step %d: reopening: %v", k, err)
					}
					tg.Close()
					got = snapshot(t, dir)
					if !equal(got, old) && !equal(got, want(killNew)) {
						t.Errorf("killed before step %d, then reopened: neither set: %v", k, got)
					}
					if l := leftovers(t, dir); len(l) != 0 {
						t.Errorf("killed before step %d, then reopened: left %v", k, l)
					}
					if !killed {
						steps = k - 1
						if !equal(got, want(killNew)) {
							t.Errorf("the complete publish did not leave the new set: %v", got)
						}
						break
					}
				}
				// mkdir ×4 (folder, figures, studies, studies/c), 7 writes, and the
				// exchange, or the fallback's two renames; remove of the old set
				// when there was one.
				min := 12
				if !first {
					min++
				}
				if steps < min {
					t.Errorf("%d steps killed, want at least %d", steps, min)
				}
				t.Logf("killed at each of %d steps", steps)
			})
		}
	}
}
