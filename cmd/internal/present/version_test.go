package present

import (
	"encoding/json"
	"testing"

	"rampart/internal/version"
)

func TestStampVersion(t *testing.T) {
	defer version.Override(version.Info{Version: "test", Revision: "test"})()
	for _, c := range []struct {
		in   any
		want string
	}{
		{map[string]int{"a": 1}, `{"rampart":{"version":"test","revision":"test"},"a":1}`},
		{struct{}{}, `{"rampart":{"version":"test","revision":"test"}}`},
		{[]int{1}, `[1]`}, // not an object: unchanged
	} {
		b, err := stampVersion(c.in)
		if err != nil || string(b) != c.want || !json.Valid(b) {
			t.Errorf("stampVersion(%v) = %s, %v, want %s", c.in, b, err, c.want)
		}
	}
}
