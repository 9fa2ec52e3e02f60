package manifest

import "testing"

func TestIndex(t *testing.T) {
	t.Parallel()
	src := "# [[study]] in a comment\r\n" + // 1
		"title = 'a [b] = c' # x = 1\r\n" + // 2
		"[[dataset]]\r\n" + // 3
		"  id = \"d\"\r\n" + // 4
		"[dataset.units]\r\n" + // 5
		"\"melt.temp\" = \"Cel\"\r\n" + // 6
		"[[study]]\r\n" + // 7
		"notes = \"\"\"\r\n" + // 8
		"[[study]]\r\n" + // 9: inside the string
		"x = 1\r\n" + // 10: inside the string
		"\"\"\"\r\n" + // 11
		"predict_at = [\r\n" + // 12
		"  1, # one\r\n" + // 13
		"  2,\r\n" + // 14
		"]\r\n" + // 15
		"also_in . x = 'K'\r\n" + // 16
		"[study.expect]\r\n" + // 17
		"direction = \"none\"\r\n" + // 18
		"[[study]]\r\n" + // 19
		"id = '''s\r\n" + // 20
		"'''\r\n" + // 21
		"expect = { form = \"linear\", min_n = 5 }\r\n" // 22
	ix := buildIndex(src)
	cases := []struct {
		owner, key string
		line, col  int
	}{
		{"", "title", 2, 1},
		{"", "dataset", 3, 1},
		{"dataset#0", "dataset", 3, 1},
		{"dataset#0", "dataset.id", 4, 3},
		{"dataset#0", "dataset.units", 5, 1},
		{"dataset#0", `dataset.units."melt.temp"`, 6, 1},
		{"study#0", "study", 7, 1},
		{"study#0", "study.notes", 8, 1},
		{"study#0", "study.predict_at", 12, 1},
		{"study#0", "study.also_in.x", 16, 1},
		{"study#0", "study.also_in", 16, 1},
		{"study#0", "study.expect", 17, 1},
		{"study#0", "study.expect.direction", 18, 1},
		{"study#1", "study", 19, 1},
		{"study#1", "study.id", 20, 1},
		{"study#1", "study.expect", 22, 1},
		{"study#1", "study.expect.form", 22, 12},
		{"study#1", "study.expect.min_n", 22, 29},
	}
	for _, c := range cases {
		got, ok := ix.lookup(c.owner, c.key)
		if !ok || got.line != c.line || got.col != c.col {
			t.Errorf("lookup(%q, %q) = %d:%d (%v), want %d:%d", c.owner, c.key, got.line, got.col, ok, c.line, c.col)
		}
	}
	for _, absent := range []struct{ owner, key string }{{"study#2", "study"}, {"study#0", "study.x"}, {"", "x"}} {
		if p, ok := ix.lookup(absent.owner, absent.key); ok {
			t.Errorf("lookup(%q, %q) = %v, want nothing (the text is in a string or comment)", absent.owner, absent.key, p)
		}
	}
	if got := ix.text(4); got != "  id = \"d\"" {
		t.Errorf("text(4) = %q, want the line without its CR", got)
	}
}
