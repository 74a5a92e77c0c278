package tomlpos

import (
	"math"
	"testing"

	"github.com/BurntSushi/toml"
)

func TestLine(t *testing.T) {
	data := []byte("# a comment\n[ring]\nradius_um = 5.0\n\n[noise.depth]\ncommon_rel = 0.01\nCommon_Rel2 = 1\n")
	var raw map[string]any
	md, err := toml.Decode(string(data), &raw)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		path []string
		want int // counted in the document above
	}{
		{[]string{"ring", "radius_um"}, 3},
		{[]string{"noise", "depth", "common_rel"}, 6},
		{[]string{"ring", "missing"}, 0},
	} {
		if got := Line(data, md, tc.path); got != tc.want {
			t.Errorf("Line(%v) = %d, want %d", tc.path, got, tc.want)
		}
	}
	if v := Lookup(raw, []string{"noise", "depth", "common_rel"}); v != 0.01 {
		t.Errorf("Lookup = %v, want 0.01", v)
	}
}

func TestShow(t *testing.T) {
	for _, tc := range []struct {
		v    any
		want string
	}{
		{2.0, "2.0"}, {1.5e-6, "1.5e-06"}, {math.Inf(-1), "-inf"}, {int64(3), "3"},
		{"a", `"a"`}, {[]any{int64(1), 2.5}, "[1, 2.5]"}, {map[string]any{}, "{...}"},
	} {
		if got := Show(tc.v); got != tc.want {
			t.Errorf("Show(%#v) = %q, want %q", tc.v, got, tc.want)
		}
	}
	if got := TypeName(int64(1)); got != "an integer" {
		t.Errorf("TypeName(int64) = %q", got)
	}
}
