package publish

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"testing"
)

// snapshot reads every file under dir, by slash-separated name; nil when
// dir does not exist.
func snapshot(t *testing.T, dir string) map[string]string {
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

// set returns a set of files tagged with tag: every file holds the tag,
// so a mixed folder shows.
func set(tag string, names ...string) []File {
	var fs []File
	for _, n := range names {
		fs = append(fs, File{Name: n, Data: []byte(tag + " " + n + "\n")})
	}
	return fs
}

// want is the snapshot a published set gives: its files and the list.
func want(files []File) map[string]string {
	dirs, _ := layout(files)
	m := map[string]string{ContentsFile: "# written by bivar test; each publish replaces this folder as a whole\n" + strings.Join(append(dirs, names(files)...), "\n") + "\n"}
	for _, f := range files {
		m[f.Name] = string(f.Data)
	}
	return m
}

func equal(a, b map[string]string) bool {
	if a == nil || b == nil {
		return a == nil && b == nil
	}
	if len(a) != len(b) {
		return false
	}
	for k, v := range a {
		if w, ok := b[k]; !ok || w != v {
			return false
		}
	}
	return true
}

func publish(t *testing.T, ctx context.Context, dir string, files []File) error {
	t.Helper()
	tg, err := OpenDir(dir, Options{Command: "bivar test"})
	if err != nil {
		return err
	}
	defer tg.Close()
	return tg.Publish(ctx, files)
}

// leftovers lists the entries beside dir that are not dir itself.
func leftovers(t *testing.T, dir string) []string {
	t.Helper()
	entries, err := os.ReadDir(filepath.Dir(dir))
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range entries {
		if e.Name() != filepath.Base(dir) {
			out = append(out, e.Name())
		}
	}
	return out
}

func TestPublish(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "report")
	a := set("A", "report.html", "results.json", "figures/s1.svg", "figures/s2.svg", "studies/s1/data.csv")
	if err := publish(t, context.Background(), dir, a); err != nil {
		t.Fatal(err)
	}
	if got := snapshot(t, dir); !equal(got, want(a)) {
		t.Errorf("after the first publish: %v\nwant %v", got, want(a))
	}
	// A second set with fewer names replaces the first whole: no stale
	// figure or file of the first stays.
	b := set("B", "report.html", "figures/s1.svg")
	if err := publish(t, context.Background(), dir, b); err != nil {
		t.Fatal(err)
	}
	if got := snapshot(t, dir); !equal(got, want(b)) {
		t.Errorf("after the second publish: %v\nwant %v", got, want(b))
	}
	if l := leftovers(t, dir); len(l) != 0 {
		t.Errorf("left beside the folder: %v", l)
	}
}

func TestPublishBadSets(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "report")
	a := set("A", "report.html")
	if err := publish(t, context.Background(), dir, a); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name  string
		files []File
		err   string
	}{
		{"twice", set("B", "a.txt", "a.txt"), "file a.txt would be written twice"},
		{"file-and-folder", set("B", "c", "c/d.txt"), "c would be both a file and a folder"},
		{"outside", set("B", "../x"), `"../x" is not a file name inside the folder`},
		{"contents", set("B", ContentsFile), "is not a file name inside the folder"},
		{"empty", nil, "an empty set"},
	} {
		err := publish(t, context.Background(), dir, tc.files)
		if err == nil || !strings.Contains(err.Error(), tc.err) {
			t.Errorf("%s: error %v, want one containing %q", tc.name, err, tc.err)
		}
	}
	if got := snapshot(t, dir); !equal(got, want(a)) {
		t.Errorf("a refused set changed the folder: %v", got)
	}
	if l := leftovers(t, dir); len(l) != 0 {
		t.Errorf("left beside the folder: %v", l)
	}
}

func TestOpenRefuses(t *testing.T) {
	root := t.TempDir()
	write := func(name, text string) {
		t.Helper()
		p := filepath.Join(root, filepath.FromSlash(name))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write("file", "x")
	write("mine/notes.txt", "a user's notes")
	write("mine/report.html", "old")
	write("legacy/report.html", "old")
	write("legacy/figures/s-scatter.svg", "old")
	write("legacy/.report.html.1234.tmp", "")
	write("legacy-extra/report.html", "old")
	write("legacy-extra/figures/photo.jpg", "a user's photo")
	if err := os.Mkdir(filepath.Join(root, "empty"), 0o755); err != nil {
		t.Fatal(err)
	}
	legacy := func(rel string, isDir bool) bool {
		return rel == "report.html" || rel == "figures" && isDir || strings.HasPrefix(rel, "figures/") && strings.HasSuffix(rel, ".svg") ||
			strings.HasPrefix(rel, ".") && strings.HasSuffix(rel, ".tmp")
	}
	for _, tc := range []struct {
		path string
		err  string // "" when Open must succeed
	}{
		{"/", "is the root of the file system"},
		{"file", "is a file, not a folder"},
		{"mine", "holds notes.txt, which bivar did not write there"},
		{"legacy-extra", "holds figures/photo.jpg, which bivar did not write there"},
		{"legacy", ""},
		{"empty", ""},
		{"absent/report", ""},
	} {
		p := tc.path
		if p != "/" {
			p = filepath.Join(root, p)
		}
		tg, err := OpenDir(p, Options{Legacy: legacy})
		switch {
		case tc.err == "" && err != nil:
			t.Errorf("OpenDir(%s): %v", tc.path, err)
		case tc.err != "" && (err == nil || !strings.Contains(err.Error(), tc.err)):
			t.Errorf("OpenDir(%s): error %v, want one containing %q", tc.path, err, tc.err)
		}
		tg.Close()
	}
	var fe *ForeignError
	if _, err := OpenDir(filepath.Join(root, "mine"), Options{}); !errors.As(err, &fe) || !slices.Equal(fe.Names, []string{"notes.txt", "report.html"}) {
		t.Errorf("OpenDir(mine) without Legacy: %v, want a ForeignError naming notes.txt and report.html", err)
	}
	if _, err := OpenFile(filepath.Join(root, "empty"), Options{}); err == nil || !strings.Contains(err.Error(), "is a folder: give a file name") {
		t.Errorf("OpenFile(a folder): %v", err)
	}
}

// A folder published once is recognised by its list of contents, and a
// file a user adds to it afterwards makes the next publish refuse.
func TestUserFileAddedLater(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "report")
	if err := publish(t, context.Background(), dir, set("A", "report.html", "figures/a.svg")); err != nil {
		t.Fatal(err)
	}
	if _, err := OpenDir(dir, Options{Command: "bivar diff"}); err == nil || !strings.Contains(err.Error(), "holds the output of bivar test, which this command would replace whole") {
		t.Errorf("another command's folder: %v", err)
	}
	if err := os.WriteFile(filepath.Join(dir, "figures", "mine.png"), nil, 0o644); err != nil {
		t.Fatal(err)
	}
	if err := publish(t, context.Background(), dir, set("B", "report.html")); err == nil || !strings.Contains(err.Error(), "figures/mine.png") {
		t.Errorf("publish over a user's file: %v", err)
	}
	if _, err := os.Stat(filepath.Join(dir, "figures", "mine.png")); err != nil {
		t.Errorf("the user's file is gone: %v", err)
	}
}

func TestBusy(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "report")
	first, err := OpenDir(dir, Options{Command: "bivar run"})
	if err != nil {
		t.Fatal(err)
	}
	_, err = OpenDir(dir, Options{Command: "bivar run"})
	var busy *BusyError
	if !errors.As(err, &busy) || busy.PID != os.Getpid() || busy.Since.IsZero() || busy.Command != "bivar run" {
		t.Fatalf("second OpenDir: %#v, want a BusyError naming this process", err)
	}
	if msg := err.Error(); !strings.Contains(msg, fmt.Sprintf("is being written by another bivar run (process %d, running since ", os.Getpid())) {
		t.Errorf("message: %s", msg)
	}
	// A file target beside it is another target, with its own lock.
	other, err := OpenFile(filepath.Join(filepath.Dir(dir), "junit.xml"), Options{})
	if err != nil {
		t.Errorf("a file beside a locked folder: %v", err)
	}
	other.Close()
	if err := first.Close(); err != nil {
		t.Fatal(err)
	}
	second, err := OpenDir(dir, Options{})
	if err != nil {
		t.Fatalf("after the first let go: %v", err)
	}
	second.Close()
	if l := leftovers(t, dir); len(l) != 0 {
		t.Errorf("left beside the folder after Close: %v", l)
	}
}

// TestCleanup: Open removes the temporaries of this target that writers
// that died left, and nothing else.
func TestCleanup(t *testing.T) {
	root := t.TempDir()
	dir := filepath.Join(root, "report")
	if err := publish(t, context.Background(), dir, set("A", "report.html")); err != nil {
		t.Fatal(err)
	}
	stale := []string{".report.bivar-tmp-77-0000abcd.new", ".report.bivar-tmp-78-0000abce.old"}
	keep := []string{".report.bivar-tmp", ".report.other", ".reports.bivar-tmp-1-00000001.new", ".report2.bivar-tmp-1-00000001.new", "data.csv"}
	for _, n := range stale {
		if err := os.MkdirAll(filepath.Join(root, n, "figures"), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	for _, n := range keep {
		if err := os.WriteFile(filepath.Join(root, n), nil, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if err := publish(t, context.Background(), dir, set("B", "report.html")); err != nil {
		t.Fatal(err)
	}
	got := leftovers(t, dir)
	slices.Sort(got)
	wantLeft := slices.Sorted(slices.Values(keep))
	if !slices.Equal(got, wantLeft) {
		t.Errorf("beside the folder: %v, want %v", got, wantLeft)
	}
}

// TestRecover: a writer of the fallback that died between its two renames
// left the folder absent; the next Open puts back the complete new set,
// else the old one.
func TestRecover(t *testing.T) {
	for _, tc := range []struct {
		name    string
		present []string // temporaries: "new" (complete), "partial" (new without its list), "old"
		want    string   // tag of the set found after Open
	}{
		{"complete-new", []string{"new", "old"}, "N"},
		{"partial-new", []string{"partial", "old"}, "O"},
		{"only-old", []string{"old"}, "O"},
		{"never-published", []string{"new"}, ""}, // the folder was absent before: it stays so
	} {
		t.Run(tc.name, func(t *testing.T) {
			root := t.TempDir()
			dir := filepath.Join(root, "report")
			for _, role := range tc.present {
				tag, suffix := "N", "new"
				if role == "old" {
					tag, suffix = "O", "old"
				}
				p := filepath.Join(root, ".report.bivar-tmp-1-00000001."+suffix)
				os.Mkdir(p, 0o755)
				os.WriteFile(filepath.Join(p, "report.html"), []byte(tag), 0o644)
				if role != "partial" {
					os.WriteFile(filepath.Join(p, ContentsFile), []byte("report.html\n"), 0o644)
				}
			}
			tg, err := OpenDir(dir, Options{})
			if err != nil {
				t.Fatal(err)
			}
			tg.Close()
			b, err := os.ReadFile(filepath.Join(dir, "report.html"))
			if tc.want == "" && !errors.Is(err, fs.ErrNotExist) || tc.want != "" && (err != nil || string(b) != tc.want) {
				t.Errorf("report.html = %q, %v; want %q", b, err, tc.want)
			}
			if l := leftovers(t, dir); len(l) != 0 {
				t.Errorf("left beside the folder: %v", l)
			}
		})
	}
}

type stopped struct{}

func (stopped) Error() string { return "stopped by a signal" }

// TestCancel: a cancellation at any step before the exchange leaves the
// previous set and no temporary.
func TestCancel(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "report")
	a := set("A", "report.html", "figures/a.svg")
	if err := publish(t, context.Background(), dir, a); err != nil {
		t.Fatal(err)
	}
	b := set("B", "report.html", "figures/a.svg", "figures/b.svg")
	for k := 1; ; k++ {
		ctx, cancel := context.WithCancelCause(context.Background())
		n := 0
		ctx = WithTrace(ctx, func(Step) {
			if n++; n == k {
				cancel(stopped{})
			}
		})
		err := publish(t, ctx, dir, b)
		cancel(nil)
		if n < k { // the whole publish ran without reaching step k
			break
		}
		got := snapshot(t, dir)
		switch {
		case errors.Is(err, stopped{}) && !equal(got, want(a)):
			t.Errorf("cancelled at step %d: the previous set changed: %v", k, got)
		case err == nil && !equal(got, want(b)):
			t.Errorf("cancelled at step %d after the exchange: not the new set: %v", k, got)
		case err != nil && !errors.Is(err, stopped{}):
			t.Errorf("cancelled at step %d: %v", k, err)
		}
		if l := leftovers(t, dir); len(l) != 0 {
			t.Errorf("cancelled at step %d: left %v", k, l)
		}
		if err == nil { // published: restore the old set for the next case
			if err := publish(t, context.Background(), dir, a); err != nil {
				t.Fatal(err)
			}
		}
	}
}

func TestWriteFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "ci", "junit.xml")
	for _, text := range []string{"one", "two"} {
		tg, err := OpenFile(path, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if err := tg.WriteFile(context.Background(), []byte(text)); err != nil {
			t.Fatal(err)
		}
		tg.Close()
		if b, _ := os.ReadFile(path); string(b) != text {
			t.Errorf("junit.xml = %q, want %q", b, text)
		}
	}
	if l := leftovers(t, path); len(l) != 0 {
		t.Errorf("left beside the file: %v", l)
	}
}

// TestConcurrent: writers in several goroutines publish into one folder
// while a reader reads it; the reader never finds files of two sets, and
// every writer either publishes or is refused with a BusyError.
func TestConcurrent(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "report")
	names := []string{"report.html", "report.md", "results.json", "figures/a.svg", "figures/b.svg"}
	if err := publish(t, context.Background(), dir, set("w0-0", names...)); err != nil {
		t.Fatal(err)
	}
	const writers, rounds = 4, 40
	var wg sync.WaitGroup
	var mu sync.Mutex
	published, refused := 0, 0
	done := make(chan struct{})
	for w := 1; w <= writers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := 0; i < rounds; i++ {
				tg, err := OpenDir(dir, Options{Command: "bivar test"})
				var busy *BusyError
				if errors.As(err, &busy) {
					mu.Lock()
					refused++
					mu.Unlock()
					continue
				}
				if err != nil {
					t.Error(err)
					return
				}
				if err := tg.Publish(context.Background(), set(fmt.Sprintf("w%d-%d", w, i), names...)); err != nil {
					t.Error(err)
				}
				tg.Close()
				mu.Lock()
				published++
				mu.Unlock()
			}
		}()
	}
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
			// Read one folder, held open, as a reader that opened it does.
			root, err := os.OpenRoot(dir)
			if err != nil {
				continue
			}
			tags := map[string]bool{}
			whole := true
			for _, n := range names {
				b, err := root.ReadFile(n)
				if err != nil {
					whole = false // removed after the exchange, mid-read
					break
				}
				tags[strings.Fields(string(b))[0]] = true
			}
			root.Close()
			if whole {
				reads++
				if len(tags) != 1 {
					t.Errorf("one folder held files of several sets: %v", tags)
				}
			}
		}
	}()
	wg.Wait()
	close(done)
	rwg.Wait()
	got := snapshot(t, dir)
	tag := strings.Fields(got["report.html"])[0]
	if !equal(got, want(set(tag, names...))) {
		t.Errorf("final folder is not one whole set: %v", got)
	}
	if l := leftovers(t, dir); len(l) != 0 {
		t.Errorf("left beside the folder: %v", l)
	}
	if published+refused != writers*rounds || published == 0 {
		t.Errorf("%d published, %d refused, want %d in all", published, refused, writers*rounds)
	}
	t.Logf("%d published, %d refused, %d whole reads", published, refused, reads)
}

// TestSymlinkedFolder: an output folder that is a symbolic link stays a
// link, and the folder it points to is the one replaced.
func TestSymlinkedFolder(t *testing.T) {
	root := t.TempDir()
	real := filepath.Join(root, "elsewhere", "report")
	link := filepath.Join(root, "report")
	if err := os.MkdirAll(real, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(real, link); err != nil {
		t.Fatal(err)
	}
	for _, tag := range []string{"A", "B"} {
		if err := publish(t, context.Background(), link, set(tag, "report.html")); err != nil {
			t.Fatal(err)
		}
	}
	if fi, err := os.Lstat(link); err != nil || fi.Mode()&fs.ModeSymlink == 0 {
		t.Fatalf("the link was replaced: %v, %v", fi, err)
	}
	if got := snapshot(t, real); !equal(got, want(set("B", "report.html"))) {
		t.Errorf("the linked folder holds %v", got)
	}
	if l := leftovers(t, real); len(l) != 0 {
		t.Errorf("left beside the linked folder: %v", l)
	}
}

// BenchmarkPublish replaces a set shaped like the sample project's report
// (report.html 470 kB, report.md 86 kB, results.json 110 kB, 18 figures of
// 12 kB) in a folder that already holds one: every file and folder is
// synced, so the figure is mostly the disk's.
func BenchmarkPublish(b *testing.B) {
	files := []File{
		{Name: "report.html", Data: make([]byte, 470_000)},
		{Name: "report.md", Data: make([]byte, 86_000)},
		{Name: "results.json", Data: make([]byte, 110_000)},
	}
	for i := range 18 {
		files = append(files, File{Name: fmt.Sprintf("figures/s%02d-scatter.svg", i), Data: make([]byte, 12_000)})
	}
	dir := filepath.Join(b.TempDir(), "report")
	b.ReportAllocs()
	for b.Loop() {
		tg, err := OpenDir(dir, Options{})
		if err != nil {
			b.Fatal(err)
		}
		if err := tg.Publish(context.Background(), files); err != nil {
			b.Fatal(err)
		}
		tg.Close()
	}
}

// TestExchange: where the system has it, exchange swaps two folders (so
// the exchange cases of TestKillAtEveryStep do not quietly take the
// fallback).
func TestExchange(t *testing.T) {
	root := t.TempDir()
	a, b := filepath.Join(root, "a"), filepath.Join(root, "b")
	for _, d := range []string{a, b} {
		if err := os.Mkdir(d, 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(d, "x"), []byte(filepath.Base(d)), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	err := exchange(a, b)
	if errors.Is(err, errNoExchange) {
		t.Skip("no renameat2(RENAME_EXCHANGE) on this system or file system: Publish takes the fallback")
	}
	if err != nil {
		t.Fatal(err)
	}
	if x, _ := os.ReadFile(filepath.Join(a, "x")); string(x) != "b" {
		t.Errorf("after the exchange a/x = %q, want %q", x, "b")
	}
}
