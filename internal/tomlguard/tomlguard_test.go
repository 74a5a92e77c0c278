package tomlguard

import (
	"strings"
	"testing"
)

func TestCheck(t *testing.T) {
	for _, c := range []struct {
		name, doc string
		line      int // 0: accepted
	}{
		{"flat scenario", "[ring]\nradius_um = 5\nsites = 20\n[noise.depth]\nrin_band_hz = [1, 1e4]\n", 0},
		{"array of tables", "[[x]]\na = [[1, 2], [3]]\n", 0},
		{"brackets in strings and comments", "a = \"[[[[[[{{{{\" # [[[[[[\nb = '{{{{{{'\nc = \"\"\"\n[[[[[[\n\"\"\"\n", 0},
		{"escaped quote", `a = "\"[[[[[[" ` + "\n", 0},
		{"nested inline tables", "a = {b = {c = {d = {e = {f = 1}}}}}\n", 1},
		{"nested arrays after a multi-line string", "s = '''\n\n'''\nx = [[[[[1]]]]]\n", 4},
		{"long line", "a = " + strings.Repeat("1", MaxLine+10) + "\n", 1},
		// TOML 1.0: a document is valid UTF-8. A UTF-8 byte-order mark is
		// UTF-8; a UTF-16 one, and a Latin-1 byte, are not.
		{"UTF-8 byte-order mark", "\xef\xbb\xbfa = 1\n", 0},
		{"UTF-16 byte-order mark", "\xff\xfea = 1\n", 1},
		{"Latin-1 byte in a string", "a = 1\nb = 2\nc = \"caf\xe9\"\n", 3},
		{"truncated sequence at the end", "a = 1\n# \xe2\x82", 2},
	} {
		err := Check([]byte(c.doc))
		switch {
		case c.line == 0 && err != nil:
			t.Errorf("%s: refused: %v", c.name, err)
		case c.line != 0 && (err == nil || err.(*Error).Line != c.line):
			t.Errorf("%s: got %v, want an error at line %d", c.name, err, c.line)
		}
	}
}

// TestCheckDeepDocument checks that a document of a quarter million
// nested inline tables (the decoder took over 100 s on 40 KB of them) is
// refused at the first bracket beyond MaxDepth.
func TestCheckDeepDocument(t *testing.T) {
	doc := []byte("a = " + strings.Repeat("{b = ", 1<<18))
	err := Check(doc)
	if err == nil || !strings.Contains(err.Error(), "line 1: brackets nested 5 deep") {
		t.Fatalf("got %v", err)
	}
}
