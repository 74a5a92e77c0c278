// Package cputime reads the process's CPU time, which the benchmarks report
// beside the wall time: on a shared machine the CPU time per operation is
// disturbed far less by other jobs than the wall time is.
package cputime
