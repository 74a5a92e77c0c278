package version

import (
	"runtime/debug"
	"testing"
)

func TestFromBuildInfo(t *testing.T) {
	for _, c := range []struct {
		name string
		bi   *debug.BuildInfo
		ok   bool
		want Info
	}{
		{"no build info", nil, false, Info{"devel", "unknown"}},
		{"source tree, no VCS", &debug.BuildInfo{Main: debug.Module{Version: "(devel)"}}, true, Info{"devel", "unknown"}},
		{"tagged module, clean tree", &debug.BuildInfo{Main: debug.Module{Version: "v1.2.3"}, Settings: []debug.BuildSetting{
			{Key: "vcs.revision", Value: "abc123"}, {Key: "vcs.modified", Value: "false"}}}, true, Info{"v1.2.3", "abc123"}},
		{"modified tree", &debug.BuildInfo{Settings: []debug.BuildSetting{
			{Key: "vcs.revision", Value: "abc123"}, {Key: "vcs.modified", Value: "true"}}}, true, Info{"devel", "abc123+modified"}},
	} {
		if got := fromBuildInfo(c.bi, c.ok); got != c.want {
			t.Errorf("%s: got %+v, want %+v", c.name, got, c.want)
		}
	}
}

func TestOverride(t *testing.T) {
	restore := Override(Info{"vtest", "rtest"})
	if got := Get(); got != (Info{"vtest", "rtest"}) {
		t.Errorf("got %+v under the override", got)
	}
	restore()
	if got := Get(); got == (Info{"vtest", "rtest"}) {
		t.Error("override still in force after restore")
	}
	if s := (Info{"devel", "unknown"}).String(); s != "devel (revision unknown)" {
		t.Errorf("String() = %q", s)
	}
}
