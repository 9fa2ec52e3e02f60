package mdtext

import "testing"

func TestEscape(t *testing.T) {
	cases := []struct{ in, want string }{
		{"plain text 1.5", "plain text 1.5"},
		{"<script>alert(1)</script>", `\<script\>alert(1)\</script\>`},
		{"a|b", `a\|b`},
		{"*bold* _it_ `code` [l](u) #h &amp; !", `\*bold\* \_it\_ \` + "`" + `code\` + "`" + ` \[l\](u) \#h \&amp; \!`},
		{"two\nlines\tand\rtab", "two lines and tab"},
		{`back\slash`, `back\\slash`},
	}
	for _, tc := range cases {
		if got := Escape(tc.in); got != tc.want {
			t.Errorf("Escape(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}
