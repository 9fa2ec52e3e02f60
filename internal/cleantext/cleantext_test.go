package cleantext

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"
	"unicode/utf8"
)

func TestText(t *testing.T) {
	cases := []struct{ in, want string }{
		{"plain 1.5 °C, tab\tand\nline", "plain 1.5 °C, tab\tand\nline"},
		{"\x1b[31mred\x1b[0m", "␛[31mred␛[0m"},
		{"\x1b]8;;http://x.example/\x1b\\link\x1b]8;;\x1b\\", "␛]8;;http://x.example/␛\\link␛]8;;␛\\"}, // an OSC-8 hyperlink
		{"100%\rdone", "100%␍done"},
		{"line\r\nend", "line\nend"},
		{"nul\x00 bel\x07 del\x7f", "nul␀ bel␇ del␡"},
		{"csi \u009b2J", "csi \ufffd2J"},
		{"bad \xff\xfe utf-8 \xe2\x82", "bad \ufffd\ufffd utf-8 \ufffd\ufffd"},
		{"é\x1b", "é␛"},
		{"\u00a0nbsp and \u2028 stay", "\u00a0nbsp and \u2028 stay"},
	}
	for _, tc := range cases {
		if got := Text(tc.in); got != tc.want {
			t.Errorf("Text(%q) = %q, want %q", tc.in, got, tc.want)
		}
		if got := string(Bytes([]byte(tc.in))); got != tc.want {
			t.Errorf("Bytes(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// TestTextProperties: the result is valid UTF-8 with no control character
// but tab and line feed, and cleaning twice changes nothing more.
func TestTextProperties(t *testing.T) {
	var all []byte
	for c := 0; c < 256; c++ {
		all = append(all, byte(c), 'a', 0xc2, byte(c))
	}
	for _, s := range []string{string(all), "\xed\xa0\x80 surrogate", "\xf4\x90\x80\x80 too big"} {
		got := Text(s)
		if !utf8.ValidString(got) {
			t.Errorf("Text(%q) is not valid UTF-8", s)
		}
		for _, r := range got {
			if r < 0x20 && r != '\t' && r != '\n' || r >= 0x7f && r <= 0x9f {
				t.Errorf("Text(%q) holds control %U", s, r)
			}
		}
		if again := Text(got); again != got {
			t.Errorf("Text is not idempotent on %q", s)
		}
	}
}

func TestJSON(t *testing.T) {
	v := map[string]string{"k": "del\x7f c1\u0085 esc\x1b é"}
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	got := JSON(b)
	if bytes.ContainsRune(got, 0x7f) || bytes.ContainsRune(got, 0x85) || bytes.IndexByte(got, 0x1b) >= 0 {
		t.Errorf("JSON(%q) = %q still holds a control character", b, got)
	}
	var back map[string]string
	if err := json.Unmarshal(got, &back); err != nil || back["k"] != v["k"] {
		t.Errorf("JSON changed the value: %q (%v), want %q", back["k"], err, v["k"])
	}
	if plain := []byte(`{"k":"é"}`); &JSON(plain)[0] != &plain[0] {
		t.Error("JSON copied text that needed nothing")
	}
}

func TestWriter(t *testing.T) {
	var b strings.Builder
	w := Writer(&b)
	n, err := w.Write([]byte("bivar: study \"\x1b[2Jx\": bad\r\n"))
	if err != nil || n != len("bivar: study \"\x1b[2Jx\": bad\r\n") {
		t.Fatalf("Write = %d, %v", n, err)
	}
	if b.String() != "bivar: study \"␛[2Jx\": bad\n" {
		t.Errorf("wrote %q", b.String())
	}
}
