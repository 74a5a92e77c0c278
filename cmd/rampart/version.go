package main

import (
	"encoding/json"
	"fmt"

	"rampart/internal/version"
)

// stampVersion marshals v; a JSON object gets the build as its first
// member, "rampart": {"version": ..., "revision": ...}.
func stampVersion(v any) ([]byte, error) {
	b, err := json.Marshal(v)
	if err != nil || len(b) < 2 || b[0] != '{' {
		return b, err
	}
	stamp, err := json.Marshal(version.Get())
	if err != nil {
		return nil, err
	}
	out := append([]byte(`{"rampart":`), stamp...)
	if string(b) != "{}" {
		out = append(out, ',')
	}
	return append(out, b[1:]...), nil
}

// versionLine is what rampart --version prints.
func versionLine() string {
	return fmt.Sprintf("rampart %s\n", version.Get())
}
