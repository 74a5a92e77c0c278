// Package version says which build of rampart is running: the module
// version and the version-control revision the Go toolchain stamped into
// the binary (runtime/debug.ReadBuildInfo). Manifests, summaries and
// reports carry it so that a signed-off result names what produced it.
package version

import (
	"runtime/debug"
	"sync"
)

// Info identifies a build.
type Info struct {
	// Version is the module version ("v1.2.3"), or "devel" for a build
	// from a source tree (go build, go test) that carries none.
	Version string `json:"version"`
	// Revision is the VCS commit, with "+modified" when the tree had
	// uncommitted changes, or "unknown" when the build recorded none (go
	// test, a build outside a repository, -buildvcs=false).
	Revision string `json:"revision"`
}

// String formats the build as "devel (revision unknown)" or "v1.2.3
// (revision 0123abcd...)".
func (i Info) String() string { return i.Version + " (revision " + i.Revision + ")" }

var (
	mu       sync.Mutex
	override *Info
)

// Get returns the running build's identity.
func Get() Info {
	mu.Lock()
	defer mu.Unlock()
	if override != nil {
		return *override
	}
	return fromBuildInfo(debug.ReadBuildInfo())
}

// Override makes Get return i until the returned function is called; tests
// use it to keep outputs that carry the version deterministic.
func Override(i Info) (restore func()) {
	mu.Lock()
	defer mu.Unlock()
	prev := override
	override = &i
	return func() {
		mu.Lock()
		defer mu.Unlock()
		override = prev
	}
}

func fromBuildInfo(bi *debug.BuildInfo, ok bool) Info {
	i := Info{Version: "devel", Revision: "unknown"}
	if !ok || bi == nil {
		return i
	}
	if v := bi.Main.Version; v != "" && v != "(devel)" {
		i.Version = v
	}
	var modified bool
	for _, s := range bi.Settings {
		switch s.Key {
		case "vcs.revision":
			if s.Value != "" {
				i.Revision = s.Value
			}
		case "vcs.modified":
			modified = s.Value == "true"
		}
	}
	if modified && i.Revision != "unknown" {
		i.Revision += "+modified"
	}
	return i
}
