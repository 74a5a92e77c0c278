//go:build !unix

package sim

import "time"

// processCPU is not measured on this platform: the cpu-ns/op metric reads 0.
func processCPU() time.Duration { return 0 }
