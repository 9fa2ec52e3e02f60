// Package publish replaces a set of output files as one atomic step, so
// that a reader, whatever happens to the writing process and whenever,
// finds either the whole previous set or the whole new one.
//
// A folder target (OpenDir) is published by building the complete new
// set in a fresh folder beside it, named .<name>.bivar-tmp-<pid>-<random>.new,
// and then exchanging the two folders with one renameat2(RENAME_EXCHANGE)
// call (Linux 3.15 and later, where the file system supports it; ext4, on
// which the tests run, does). Before the exchange the old folder is untouched; after
// it the new one is in place and the old set, now under the temporary
// name, is removed. Where the exchange is not available (another system,
// or a file system that refuses it) the folder is moved aside and the new
// one renamed into place: two renames, between which the folder is briefly
// absent; a process killed there leaves both sets whole under their
// temporary names, and the next Open puts one back (the new one when it
// was complete, else the old one) before anything else.
//
// The output folder stays a plain folder, so report/report.html keeps its
// path and the folder can be copied, archived or uploaded as it is. The
// price is that a publish replaces the whole folder: OpenDir refuses a
// folder that holds anything the previous publish did not write (its
// list is kept in the hidden file .bivar-contents), so nothing a user put
// there is ever removed.
//
// A file target (OpenFile) is one file replaced by a rename from a
// temporary file beside it.
//
// Every target is locked while it is open (flock on
// .<name>.bivar-lock beside it, which names the holder's process id and
// start time): a second writer is refused with a *BusyError. Under the
// lock, Open removes what earlier writers that died left behind, and only
// that: entries named .<name>.bivar-tmp-*, which only a holder of this
// lock writes.
package publish

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"syscall"
	"time"
)

// File is one file of a set: a slash-separated name relative to the
// folder published (it may name subfolders, such as "figures/a.svg"), and
// its bytes.
type File struct {
	Name string
	Data []byte
}

// ContentsFile is the hidden file, in every published folder, that lists
// the set's files and folders (one slash-separated name a line after a
// comment line). OpenDir reads it to tell its own files from a user's.
const ContentsFile = ".bivar-contents"

// ignorable are names an operating system's file browser may add to any
// folder it shows; they never make a folder foreign.
var ignorable = []string{".DS_Store", "Thumbs.db", "desktop.ini"}

// Options configure Open.
type Options struct {
	// Command names the writer in the lock file, for the message another
	// writer gets; default "bivar".
	Command string
	// Legacy, for a folder without ContentsFile, says whether an entry
	// (a slash-separated name relative to the folder) is one an earlier
	// version of the writer put there, so that such a folder is replaced
	// instead of refused. Nil: only an empty folder is adopted.
	Legacy func(rel string, isDir bool) bool
	// Replace takes over a folder whose list names another writer (another
	// Command) instead of refusing it: the user asked for it on purpose.
	// Entries the list does not name still make the folder foreign.
	Replace bool
}

// Target is a folder or a file, locked for publishing until Close.
type Target struct {
	path   string      // the folder or file (symbolic links resolved)
	parent string      // the folder holding it
	base   string      // its name in parent
	isDir  bool        // OpenDir rather than OpenFile
	mode   fs.FileMode // permissions of the new folder or file
	cmd    string      // Options.Command, written into the list of contents
	lock   *os.File
	// exchange swaps two folders atomically; errNoExchange where the
	// system has no such call. A field so that tests can take the
	// fallback path on a system that has it.
	exchange func(a, b string) error
}

// Path returns the folder or file the target publishes.
func (t *Target) Path() string { return t.path }

// BusyError is returned by Open when another process holds the target.
type BusyError struct {
	Path    string    // the folder or file
	PID     int       // the holder's process id; 0 when it could not be read
	Since   time.Time // when it took the lock; zero when unknown
	Command string    // the holder's command, such as "bivar run"
}

func (e *BusyError) Error() string {
	who := "another process"
	if e.Command != "" {
		who = "another " + e.Command
	}
	var what []string
	if e.PID > 0 {
		what = append(what, fmt.Sprintf("process %d", e.PID))
	}
	if !e.Since.IsZero() {
		what = append(what, "running since "+e.Since.UTC().Format("2006-01-02 15:04:05 UTC"))
	}
	if len(what) > 0 {
		who += " (" + strings.Join(what, ", ") + ")"
	}
	return fmt.Sprintf("%s is being written by %s", e.Path, who)
}

// ForeignError is returned by OpenDir for a folder that holds entries the
// previous publish did not write, or the output of another command.
type ForeignError struct {
	Path   string
	Names  []string // slash-separated, relative to Path, sorted
	Writer string   // when the folder holds another command's output: that command
}

func (e *ForeignError) Error() string {
	if e.Writer != "" {
		return fmt.Sprintf("%s holds the output of %s, which this command would replace whole: give each command a folder of its own", e.Path, e.Writer)
	}
	shown := e.Names
	more := ""
	if len(shown) > 3 {
		more = fmt.Sprintf(" and %d more", len(shown)-3)
		shown = shown[:3]
	}
	return fmt.Sprintf("%s holds %s%s, which bivar did not write there: each run replaces the whole folder, so they would be lost; move them elsewhere or choose a folder of bivar's own",
		e.Path, strings.Join(shown, ", "), more)
}

// OpenDir locks the folder path for publishing, puts back or removes what
// an earlier writer that died left behind, and checks that the folder, if
// it exists, holds only a previous set (or nothing). Missing folders
// above path are created.
func OpenDir(path string, opts Options) (*Target, error) {
	return open(path, true, opts)
}

// OpenFile locks the file path for WriteFile, after the same clean-up as
// OpenDir. Missing folders above path are created.
func OpenFile(path string, opts Options) (*Target, error) {
	return open(path, false, opts)
}

func open(path string, isDir bool, opts Options) (*Target, error) {
	if opts.Command == "" {
		opts.Command = "bivar"
	}
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, err
	}
	// A symbolic link is followed: the user chose where it points, and
	// replacing the link by a folder would undo that choice.
	if fi, err := os.Lstat(abs); err == nil && fi.Mode()&fs.ModeSymlink != 0 {
		if abs, err = filepath.EvalSymlinks(abs); err != nil {
			return nil, fmt.Errorf("%s: a symbolic link to nowhere: %w", path, err)
		}
	}
	t := &Target{path: abs, parent: filepath.Dir(abs), base: filepath.Base(abs), isDir: isDir, cmd: opts.Command, exchange: exchange}
	if t.parent == abs {
		return nil, fmt.Errorf("%s is the root of the file system: choose a folder of its own for the output", path)
	}
	if err := os.MkdirAll(t.parent, 0o755); err != nil {
		return nil, fmt.Errorf("creating the folder %s: %w", t.parent, err)
	}
	if t.lock, err = lock(filepath.Join(t.parent, "."+t.base+".bivar-lock"), opts.Command); err != nil {
		var busy *BusyError
		if errors.As(err, &busy) {
			busy.Path = path
			return nil, busy
		}
		return nil, fmt.Errorf("locking %s: %w", path, err)
	}
	if err := t.recover(); err != nil {
		t.Close()
		return nil, err
	}
	if err := t.check(path, opts.Command, opts.Legacy, opts.Replace); err != nil {
		t.Close()
		return nil, err
	}
	return t, nil
}

// tempPrefix starts the name of every temporary entry of this target.
func (t *Target) tempPrefix() string { return "." + t.base + ".bivar-tmp-" }

func (t *Target) tempName(role string) string {
	return filepath.Join(t.parent, fmt.Sprintf("%s%d-%08x.%s", t.tempPrefix(), os.Getpid(), rand.Uint32(), role))
}

// recover deals with what writers of this target that died left behind.
// It runs under the lock, so no live writer owns any of it. A folder
// target found absent while its old set waits moved aside (a death
// between the two renames of the fallback) is put back first: the new set
// when it is complete, else the old one.
func (t *Target) recover() error {
	entries, err := os.ReadDir(t.parent)
	if err != nil {
		return fmt.Errorf("reading %s: %w", t.parent, err)
	}
	var temps []string
	for _, e := range entries {
		if strings.HasPrefix(e.Name(), t.tempPrefix()) {
			temps = append(temps, filepath.Join(t.parent, e.Name()))
		}
	}
	if _, err := os.Lstat(t.path); t.isDir && errors.Is(err, fs.ErrNotExist) {
		// Only the fallback moves a folder aside (".old"); without one the
		// folder was absent before, and a new set that was never put in
		// place is not put there now.
		var back, newSet string
		for _, p := range temps {
			switch {
			case strings.HasSuffix(p, ".old"):
				back = p
			case strings.HasSuffix(p, ".new"):
				if _, err := os.Stat(filepath.Join(p, ContentsFile)); err == nil {
					newSet = p // complete: its writer died between the two renames
				}
			}
		}
		if back != "" && newSet != "" {
			back = newSet
		}
		if back != "" {
			if err := os.Rename(back, t.path); err != nil {
				return fmt.Errorf("putting back %s, left aside by a bivar that stopped: %w", t.path, err)
			}
			syncDir(t.parent)
		}
	}
	for _, p := range temps {
		if err := os.RemoveAll(p); err != nil && !errors.Is(err, fs.ErrNotExist) {
			return fmt.Errorf("removing %s, left by a bivar that stopped: %w", p, err)
		}
	}
	return nil
}

// check refuses a target that is not what it should be, and notes the
// permissions to keep.
func (t *Target) check(given, command string, legacy func(string, bool) bool, replace bool) error {
	t.mode = 0o755
	if !t.isDir {
		t.mode = 0o644
	}
	fi, err := os.Stat(t.path)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil
	case err != nil:
		return err
	case !t.isDir && fi.IsDir():
		return fmt.Errorf("%s is a folder: give a file name", given)
	case !t.isDir:
		t.mode = fi.Mode().Perm()
		return nil
	case !fi.IsDir():
		return fmt.Errorf("%s is a file, not a folder: give a folder for the output (it is created if needed)", given)
	}
	t.mode = fi.Mode().Perm()
	listed := map[string]bool{}
	marked := false
	if b, err := os.ReadFile(filepath.Join(t.path, ContentsFile)); err == nil {
		marked = true
		lines := strings.Split(string(b), "\n")
		if w, ok := writer(lines[0]); ok && w != command && !replace && !sameWriter(w, command) {
			return &ForeignError{Path: given, Writer: w}
		}
		for _, line := range lines {
			if line != "" && !strings.HasPrefix(line, "#") {
				listed[line] = true
			}
		}
	}
	var foreign []string
	err = filepath.WalkDir(t.path, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if p == t.path {
			return nil
		}
		rel, _ := filepath.Rel(t.path, p)
		rel = filepath.ToSlash(rel)
		switch {
		case rel == ContentsFile && marked, slices.Contains(ignorable, d.Name()), listed[rel]:
		case !marked && legacy != nil && legacy(rel, d.IsDir()):
		default:
			foreign = append(foreign, rel)
			if d.IsDir() {
				return fs.SkipDir
			}
		}
		return nil
	})
	if err != nil {
		return fmt.Errorf("reading %s: %w", given, err)
	}
	if len(foreign) > 0 {
		slices.Sort(foreign)
		return &ForeignError{Path: given, Names: foreign}
	}
	return nil
}

// Close releases the lock. It is safe to call more than once.
func (t *Target) Close() error {
	if t == nil || t.lock == nil {
		return nil
	}
	err := unlock(t.lock)
	t.lock = nil
	return err
}

// errNoExchange is returned by exchange where the system cannot swap two
// folders in one step.
var errNoExchange = errors.New("no atomic exchange of folders here")

// Publish writes files as the folder's new set and puts it in place in
// one atomic step (see the package comment). Until that step the
// previous set is untouched; if ctx is cancelled before it, Publish
// removes what it wrote and returns context.Cause(ctx). A name given
// twice, or a name that is also another's folder, is an error found
// before anything is written.
func (t *Target) Publish(ctx context.Context, files []File) (err error) {
	if !t.isDir {
		return errors.New("publish: Publish on a file target; use WriteFile")
	}
	if t.lock == nil {
		return errors.New("publish: target closed")
	}
	dirs, err := layout(files)
	if err != nil {
		return err
	}
	s := stepper{ctx: ctx, trace: traceFrom(ctx)}
	tmp := t.tempName("new")
	committed := false
	defer func() {
		if !committed {
			os.RemoveAll(tmp)
		}
	}()
	if err := s.step("mkdir", tmp); err != nil {
		return err
	}
	if err := os.Mkdir(tmp, t.mode); err != nil {
		return fmt.Errorf("creating a folder beside %s: %w", t.path, err)
	}
	for _, d := range dirs {
		p := filepath.Join(tmp, filepath.FromSlash(d))
		if err := s.step("mkdir", p); err != nil {
			return err
		}
		if err := os.Mkdir(p, 0o755); err != nil {
			return fmt.Errorf("writing %s: %w", t.path, err)
		}
	}
	for _, f := range files {
		if err := s.writeFile(filepath.Join(tmp, filepath.FromSlash(f.Name)), f.Data, 0o644); err != nil {
			return fmt.Errorf("writing %s: %w", filepath.Join(t.path, filepath.FromSlash(f.Name)), err)
		}
	}
	// The list of contents goes last: a folder that has it is complete.
	list := contents(t.cmd, dirs, files)
	if err := s.writeFile(filepath.Join(tmp, ContentsFile), []byte(list), 0o644); err != nil {
		return fmt.Errorf("writing %s: %w", t.path, err)
	}
	for i := len(dirs) - 1; i >= 0; i-- {
		if err := syncDir(filepath.Join(tmp, filepath.FromSlash(dirs[i]))); err != nil {
			return fmt.Errorf("writing %s: %w", t.path, err)
		}
	}
	if err := syncDir(tmp); err != nil {
		return fmt.Errorf("writing %s: %w", t.path, err)
	}

	// The one step that publishes.
	old, err := t.swap(&s, tmp)
	if err != nil {
		return err
	}
	committed = true
	syncDir(t.parent)
	if old != "" {
		s.after("remove", old)
		if err := os.RemoveAll(old); err != nil {
			// The new set is in place; the old one is left for the next run.
			return nil
		}
	}
	return nil
}

// swap puts the folder tmp in place of t.path and returns where the old
// set now is ("" when there was none).
func (t *Target) swap(s *stepper, tmp string) (old string, err error) {
	if _, err := os.Lstat(t.path); errors.Is(err, fs.ErrNotExist) {
		if err := s.step("rename", t.path); err != nil {
			return "", err
		}
		if err := os.Rename(tmp, t.path); err != nil {
			return "", fmt.Errorf("putting %s in place: %w", t.path, err)
		}
		return "", nil
	}
	if err := s.step("exchange", t.path); err != nil {
		return "", err
	}
	err = t.exchange(tmp, t.path)
	if err == nil {
		return tmp, nil
	}
	if !errors.Is(err, errNoExchange) {
		return "", replaceError(t.path, err)
	}
	// The fallback: move the old set aside, then the new one in.
	old = t.tempName("old")
	if err := s.step("rename", t.path); err != nil {
		return "", err
	}
	if err := os.Rename(t.path, old); err != nil {
		return "", replaceError(t.path, err)
	}
	s.after("rename", tmp) // past the point of no return: a cancel no longer stops it
	if err := os.Rename(tmp, t.path); err != nil {
		if rerr := os.Rename(old, t.path); rerr != nil {
			return "", fmt.Errorf("putting %s in place: %w; the previous set is in %s", t.path, err, old)
		}
		return "", fmt.Errorf("putting %s in place: %w", t.path, err)
	}
	return old, nil
}

// replaceError explains a folder that cannot be replaced.
func replaceError(path string, err error) error {
	if errors.Is(err, syscall.EBUSY) || errors.Is(err, syscall.EXDEV) {
		return fmt.Errorf("%s cannot be replaced as a whole (is it a mount point?): choose a folder inside it for the output: %w", path, err)
	}
	return fmt.Errorf("putting %s in place: %w", path, err)
}

// WriteFile replaces the target file with data in one rename. If ctx is
// cancelled first, the previous file is untouched.
func (t *Target) WriteFile(ctx context.Context, data []byte) error {
	return WriteFiles(ctx, []*Target{t}, [][]byte{data})
}

// WriteFiles replaces several file targets, ts[i] by data[i]: every new
// file is written and synced beside its target first, and then all are
// renamed into place one after the other, with nothing between the
// renames. Until the first rename every previous file is untouched, and a
// cancellation of ctx stops it there; once the renames start they all go
// ahead. Files in different places cannot be replaced in one step: a
// process killed between two renames leaves some files new and the rest
// old, each whole.
func WriteFiles(ctx context.Context, ts []*Target, data [][]byte) (err error) {
	if len(ts) != len(data) {
		panic("publish: WriteFiles with a target count unequal to the data count")
	}
	s := stepper{ctx: ctx, trace: traceFrom(ctx)}
	tmps := make([]string, 0, len(ts))
	renamed := 0
	defer func() {
		for _, tmp := range tmps[renamed:] {
			os.Remove(tmp)
		}
	}()
	for i, t := range ts {
		switch {
		case t.isDir:
			return errors.New("publish: WriteFile on a folder target; use Publish")
		case t.lock == nil:
			return errors.New("publish: target closed")
		}
		tmp := t.tempName("new")
		tmps = append(tmps, tmp)
		if err := s.writeFile(tmp, data[i], t.mode); err != nil {
			return fmt.Errorf("writing %s: %w", t.path, err)
		}
	}
	if err := s.step("rename", ts[0].path); err != nil {
		return err
	}
	for i, t := range ts {
		if i > 0 {
			s.after("rename", t.path)
		}
		if err := os.Rename(tmps[i], t.path); err != nil {
			return fmt.Errorf("putting %s in place: %w", t.path, err)
		}
		renamed++
		syncDir(t.parent)
	}
	return nil
}

// layout checks the names of a set and returns the folders they need,
// parents before children.
func layout(files []File) ([]string, error) {
	if len(files) == 0 {
		return nil, errors.New("publish: an empty set")
	}
	seen := map[string]bool{}
	dirSet := map[string]bool{}
	for _, f := range files {
		if !fs.ValidPath(f.Name) || f.Name == "." || f.Name == ContentsFile || strings.Contains(f.Name, `\`) {
			return nil, fmt.Errorf("publish: %q is not a file name inside the folder", f.Name)
		}
		if seen[f.Name] {
			return nil, fmt.Errorf("file %s would be written twice", f.Name)
		}
		seen[f.Name] = true
		for d := f.Name; ; {
			i := strings.LastIndexByte(d, '/')
			if i < 0 {
				break
			}
			d = d[:i]
			dirSet[d] = true
		}
	}
	for d := range dirSet {
		if seen[d] {
			return nil, fmt.Errorf("%s would be both a file and a folder", d)
		}
	}
	dirs := make([]string, 0, len(dirSet))
	for d := range dirSet {
		dirs = append(dirs, d)
	}
	slices.Sort(dirs) // "a" before "a/b"
	return dirs, nil
}

// contents is the text of ContentsFile: a comment line naming the
// writer, then the set's folders and files, one a line.
func contents(command string, dirs []string, files []File) string {
	return contentsHead + command + contentsTail + "\n" + strings.Join(append(dirs, names(files)...), "\n") + "\n"
}

const (
	contentsHead = "# written by "
	contentsTail = "; each publish replaces this folder as a whole"
)

// writer reads the command from the first line of ContentsFile.
// sameWriter reports whether a folder listed as written by w may be taken
// by command without asking: a writer recorded by its command alone ("bivar
// run", before runs recorded their manifest) is taken by the same command
// with its manifest ("bivar run \"/path/bivar.toml\"").
func sameWriter(w, command string) bool {
	return !strings.Contains(w, " \"") && strings.HasPrefix(command, w+" \"")
}

func writer(line string) (string, bool) {
	w, ok := strings.CutPrefix(line, contentsHead)
	if !ok {
		return "", false
	}
	return strings.CutSuffix(w, contentsTail)
}

func names(files []File) []string {
	out := make([]string, len(files))
	for i, f := range files {
		out[i] = f.Name
	}
	return out
}

// syncDir flushes a folder's entries to disk.
func syncDir(dir string) error {
	f, err := os.Open(dir)
	if err != nil {
		return err
	}
	err = f.Sync()
	if errors.Is(err, syscall.EINVAL) || errors.Is(err, syscall.ENOTSUP) {
		err = nil // some file systems cannot sync a folder; the data files were synced
	}
	return errors.Join(err, f.Close())
}
