// Package cleantext makes text from users' files safe to show: every
// output bivar writes (HTML, Markdown, SVG, JUnit XML, the CI summary, the
// diff files, JSON) and every message it prints passes through one of its
// functions on the way out, so no path can skip it.
//
// Text, Bytes and Writer replace what a reader or a terminal would act on
// or could not show:
//
//   - a byte that is not part of valid UTF-8 becomes U+FFFD;
//   - a C0 control character other than tab and line feed becomes its
//     visible symbol from the Control Pictures block (ESC → ␛ U+241B,
//     NUL → ␀ U+2400, CR → ␍ U+240D), so a terminal escape sequence, an
//     OSC-8 hyperlink or a carriage return that would overwrite a line
//     shows as text; a CR directly before a LF is dropped instead (a
//     line end written on Windows);
//   - DEL becomes ␡ (U+2421);
//   - a C1 control character (U+0080–U+009F, which some terminals obey as
//     CSI, OSC and the like) becomes U+FFFD, as it has no visible symbol.
//
// JSON keeps the text as data: encoding/json already writes C0 controls as
// \u escapes and invalid UTF-8 as U+FFFD, and JSON escapes DEL and the C1
// controls it leaves as they are.
package cleantext

import (
	"bytes"
	"fmt"
	"io"
	"unicode/utf8"
)

// Text returns s with every character replaced as the package doc says.
// Text of nothing but printable characters, tabs and line feeds is
// returned unchanged.
func Text(s string) string {
	if clean(s) {
		return s
	}
	return string(appendClean(nil, []byte(s)))
}

// Bytes is Text for a byte slice: b itself when nothing needs replacing,
// else a new slice.
func Bytes(b []byte) []byte {
	if clean(string(b)) {
		return b
	}
	return appendClean(make([]byte, 0, len(b)+16), b)
}

// clean reports whether s needs no replacement.
func clean(s string) bool {
	for i := 0; i < len(s); {
		c := s[i]
		if c < 0x80 {
			if c < 0x20 && c != '\t' && c != '\n' || c == 0x7f {
				return false
			}
			i++
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 || r <= 0x9f {
			return false
		}
		i += size
	}
	return true
}

// hasC1 reports whether valid UTF-8 s holds a C1 control (encoded C2 80–C2 9F).
func hasC1(s string) bool {
	for i := 0; i+1 < len(s); i++ {
		if s[i] == 0xc2 && s[i+1] >= 0x80 && s[i+1] <= 0x9f {
			return true
		}
	}
	return false
}

func appendClean(dst, b []byte) []byte {
	for i := 0; i < len(b); {
		c := b[i]
		switch {
		case c == '\t' || c == '\n' || (c >= 0x20 && c < 0x7f):
			dst = append(dst, c)
			i++
			continue
		case c == '\r' && i+1 < len(b) && b[i+1] == '\n':
			i++
			continue
		case c < 0x20:
			dst = utf8.AppendRune(dst, 0x2400+rune(c))
			i++
			continue
		case c == 0x7f:
			dst = utf8.AppendRune(dst, 0x2421)
			i++
			continue
		}
		r, size := utf8.DecodeRune(b[i:])
		if r == utf8.RuneError && size == 1 || r >= 0x80 && r <= 0x9f {
			r = utf8.RuneError
		}
		dst = utf8.AppendRune(dst, r)
		i += size
	}
	return dst
}

// JSON returns the JSON text b with DEL and every C1 control written as a
// \u escape, which encoding/json leaves raw: the same JSON value, but no
// byte a terminal would obey when the file is printed. b must be valid
// UTF-8 JSON as encoding/json writes it, where such characters can only
// stand inside strings.
func JSON(b []byte) []byte {
	s := string(b)
	if !(bytes.IndexByte(b, 0x7f) >= 0 || hasC1(s)) {
		return b
	}
	out := make([]byte, 0, len(b)+16)
	for i := 0; i < len(b); {
		r, size := utf8.DecodeRune(b[i:])
		if r == 0x7f || r >= 0x80 && r <= 0x9f {
			out = fmt.Appendf(out, `\u%04x`, r)
		} else {
			out = append(out, b[i:i+size]...)
		}
		i += size
	}
	return out
}

// Writer returns a writer that passes each Write through Bytes to w, for
// a terminal. Each Write is cleaned on its own, so a multi-byte character
// split across two writes shows as U+FFFD: write whole messages, as
// fmt.Fprintf does. It reports len(p) written when w took all of the
// cleaned bytes.
func Writer(w io.Writer) io.Writer { return writer{w} }

type writer struct{ w io.Writer }

func (c writer) Write(p []byte) (int, error) {
	if _, err := c.w.Write(Bytes(p)); err != nil {
		return 0, err
	}
	return len(p), nil
}
