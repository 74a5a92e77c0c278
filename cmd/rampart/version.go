package main

import (
	"fmt"

	"rampart/internal/version"
)

// versionLine is what rampart --version prints.
func versionLine() string {
	return fmt.Sprintf("rampart %s\n", version.Get())
}
