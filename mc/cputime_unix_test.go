//go:build unix

package mc

import (
	"syscall"
	"time"
)

// processCPU returns the user and system CPU time the process has used,
// all threads (the collector's included).
func processCPU() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}
