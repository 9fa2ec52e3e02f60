package manifest

import (
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"
)

// The TOML decoder's MetaData knows which keys exist but not where they are.
// This file scans the source once and records the line and column of every
// table header, array-of-tables header and key, so each message can point
// at the line to fix. The scanner only runs on text the decoder has already
// accepted, but it never panics on any input: at anything it does not
// understand it skips to the next line.

// pos is a place in the source, 1-based.
type pos struct{ line, col int }

// lineIndex maps "owner|key" to where the key is written. owner names the
// array-of-tables element the key belongs to ("study#2" is the third
// [[study]]) or is "" for keys outside any array element; key is the dotted
// path as toml.Key.String spells it. A key written more than once (which the
// decoder rejects) keeps its first place.
type lineIndex struct {
	at    map[string]pos
	lines []string // the source lines, for Error.Detail
}

func (ix *lineIndex) lookup(owner, key string) (pos, bool) {
	p, ok := ix.at[owner+"|"+key]
	return p, ok
}

// text returns source line n (1-based), or "".
func (ix *lineIndex) text(n int) string {
	if n < 1 || n > len(ix.lines) {
		return ""
	}
	return strings.TrimRight(ix.lines[n-1], "\r")
}

type scanner struct {
	src       string
	i         int // byte offset
	line, col int // of src[i]
	ix        *lineIndex
	count     map[string]int // array-of-tables headers seen, per path
	owner     string         // current array element, "" at top level
	ownerPath string         // its path, e.g. "study"
	table     toml.Key       // current table path
}

func buildIndex(src string) *lineIndex {
	ix := &lineIndex{at: map[string]pos{}, lines: strings.Split(src, "\n")}
	s := &scanner{src: src, line: 1, col: 1, ix: ix, count: map[string]int{}}
	s.statements()
	return ix
}

func (s *scanner) eof() bool { return s.i >= len(s.src) }

func (s *scanner) peek(k int) byte {
	if s.i+k < len(s.src) {
		return s.src[s.i+k]
	}
	return 0
}

func (s *scanner) next() {
	if s.eof() {
		return
	}
	if s.src[s.i] == '\n' {
		s.line++
		s.col = 1
	} else {
		s.col++
	}
	s.i++
}

func (s *scanner) hasPrefix(p string) bool { return strings.HasPrefix(s.src[s.i:], p) }

// skipSpace skips spaces and tabs; with newlines also line ends and comments.
func (s *scanner) skipSpace(newlines bool) {
	for !s.eof() {
		switch c := s.peek(0); {
		case c == ' ' || c == '\t' || c == '\r':
			s.next()
		case c == '#':
			if !newlines {
				return
			}
			s.skipLine()
		case c == '\n' && newlines:
			s.next()
		default:
			return
		}
	}
}

// skipLine moves to the start of the next line.
func (s *scanner) skipLine() {
	for !s.eof() && s.peek(0) != '\n' {
		s.next()
	}
	s.next()
}

// record notes where key is written, and its parents too when they are not
// written anywhere before ([a.b] and a.b = 1 create the table a).
func (s *scanner) record(owner string, key toml.Key, p pos) {
	for n := len(key); n > 0; n-- {
		k := owner + "|" + key[:n].String()
		if _, dup := s.ix.at[k]; dup {
			return
		}
		s.ix.at[k] = p
	}
}

func (s *scanner) statements() {
	for {
		s.skipSpace(true)
		if s.eof() {
			return
		}
		start, line := s.i, s.line
		p := pos{s.line, s.col}
		if s.peek(0) == '[' {
			s.header(p)
		} else if key := s.key(); key != nil {
			s.skipSpace(false)
			if s.peek(0) == '=' {
				s.next()
				full := append(append(toml.Key{}, s.table...), key...)
				s.record(s.owner, full, p)
				s.value(full)
			}
		}
		// Whatever is left of the statement's last line is not ours to read.
		if s.line == line || s.i == start {
			s.skipLine()
		}
	}
}

func (s *scanner) header(p pos) {
	array := s.hasPrefix("[[")
	s.next()
	if array {
		s.next()
	}
	s.skipSpace(false)
	key := s.key()
	if key == nil {
		return
	}
	s.table = key
	path := key.String()
	if array {
		n := s.count[path]
		s.count[path] = n + 1
		s.owner, s.ownerPath = path+"#"+strconv.Itoa(n), path
		s.record("", key, p) // every element's header under owner "": first one
		s.record(s.owner, key, p)
		return
	}
	if s.owner != "" && !strings.HasPrefix(path, s.ownerPath+".") {
		s.owner, s.ownerPath = "", ""
	}
	s.record(s.owner, key, p)
}

// key reads a dotted key of bare and quoted parts; nil when there is none.
func (s *scanner) key() toml.Key {
	var key toml.Key
	for {
		s.skipSpace(false)
		part, ok := s.keyPart()
		if !ok {
			return nil
		}
		key = append(key, part)
		s.skipSpace(false)
		if s.peek(0) != '.' {
			return key
		}
		s.next()
	}
}

func (s *scanner) keyPart() (string, bool) {
	switch c := s.peek(0); {
	case c == '"':
		return s.quoted('"', true)
	case c == '\'':
		return s.quoted('\'', false)
	}
	start := s.i
	for !s.eof() {
		c := s.peek(0)
		if c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '_' || c == '-' {
			s.next()
			continue
		}
		break
	}
	return s.src[start:s.i], s.i > start
}

// quoted reads a one-line string starting at its opening quote.
func (s *scanner) quoted(q byte, escapes bool) (string, bool) {
	s.next()
	var b strings.Builder
	for !s.eof() {
		c := s.peek(0)
		switch {
		case c == '\n':
			return "", false
		case c == q:
			s.next()
			if escapes {
				if u, err := strconv.Unquote(`"` + b.String() + `"`); err == nil {
					return u, true
				}
			}
			return b.String(), true
		case c == '\\' && escapes:
			b.WriteByte(c)
			s.next()
			if !s.eof() && s.peek(0) != '\n' {
				b.WriteByte(s.peek(0))
				s.next()
			}
			continue
		}
		b.WriteByte(c)
		s.next()
	}
	return "", false
}

// value skips one value, recording the keys of inline tables under key.
func (s *scanner) value(key toml.Key) {
	s.skipSpace(false)
	switch {
	case s.hasPrefix(`"""`):
		s.multiline(`"""`, true)
	case s.hasPrefix(`'''`):
		s.multiline(`'''`, false)
	case s.peek(0) == '"':
		s.quoted('"', true)
	case s.peek(0) == '\'':
		s.quoted('\'', false)
	case s.peek(0) == '[':
		s.next()
		elem := 0
		for !s.eof() {
			s.skipSpace(true)
			if s.peek(0) == ']' {
				s.next()
				return
			}
			at := s.i
			if s.peek(0) == '{' && s.owner == "" {
				// An inline array of tables, study = [{…}, {…}]: each
				// element is an owner like a [[study]] header makes.
				s.owner = key.String() + "#" + strconv.Itoa(elem)
				s.record(s.owner, key, pos{s.line, s.col})
				s.value(key)
				s.owner = ""
				elem++
			} else {
				s.value(key)
			}
			s.skipSpace(true)
			if s.peek(0) == ',' {
				s.next()
			}
			if s.i == at {
				return
			}
		}
	case s.peek(0) == '{':
		s.next()
		for !s.eof() {
			s.skipSpace(true)
			if s.peek(0) == '}' {
				s.next()
				return
			}
			p := pos{s.line, s.col}
			sub := s.key()
			s.skipSpace(false)
			if sub == nil || s.peek(0) != '=' {
				return
			}
			s.next()
			full := append(append(toml.Key{}, key...), sub...)
			s.record(s.owner, full, p)
			s.value(full)
			s.skipSpace(true)
			if s.peek(0) == ',' {
				s.next()
			}
		}
	default: // number, boolean, date: up to a separator
		for !s.eof() && !strings.ContainsRune(" \t\r\n,]}#", rune(s.peek(0))) {
			s.next()
		}
	}
}

func (s *scanner) multiline(delim string, escapes bool) {
	for range 3 {
		s.next()
	}
	for !s.eof() {
		if escapes && s.peek(0) == '\\' {
			s.next()
			s.next()
			continue
		}
		if s.hasPrefix(delim) {
			for range 3 {
				s.next()
			}
			// Up to two more quotes may belong to the string.
			for n := 0; n < 2 && s.peek(0) == delim[0]; n++ {
				s.next()
			}
			return
		}
		s.next()
	}
}
