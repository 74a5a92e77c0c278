package mc

import (
	"fmt"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"sync"
	"testing"
	"time"
)

// benchRecord is a physical record of index i drawn from rng-free
// functions of i: contrast in [0.85, 0.95), bias within +-0.05 rad, and
// one static input, as a run with one static source writes them.
func benchRecord(i int) Record {
	u := math.Mod(float64(i)*0.6180339887498949, 1) // golden-ratio sequence in [0, 1)
	v := math.Mod(float64(i)*0.7548776662466927, 1)
	c := 0.85 + 0.1*u
	bias := 0.1 * (v - 0.5)
	z := cmplx.Rect(c, 0.1+bias)
	return Record{Index: i, Inputs: []float64{1e-3 * (u - 0.5)}, Contrast: c, PhaseRad: 0.1 + bias, BiasRad: bias,
		Z: z, Ground: [2]float64{0.99, 0.98}}
}

// benchShards writes an ensemble of n records as shards sealed shards with
// the store's own writer and returns their directories.
func benchShards(b *testing.B, n, shards int) []string {
	b.Helper()
	root := b.TempDir()
	var dirs []string
	for k := 1; k <= shards; k++ {
		m := testManifest(n)
		m.Shard = &Shard{Index: k, Count: shards}
		d := filepath.Join(root, strconv.Itoa(k))
		st, err := Create(d, m)
		if err != nil {
			b.Fatal(err)
		}
		from, to := m.Range()
		for i := from; i < to; i++ {
			if err := st.Append(benchRecord(i)); err != nil {
				b.Fatal(err)
			}
		}
		if err := st.Close(); err != nil {
			b.Fatal(err)
		}
		dirs = append(dirs, d)
	}
	return dirs
}

// peakHeap samples the live heap every millisecond while f runs and
// returns its largest value, in bytes, above the heap before f.
func peakHeap(f func()) uint64 {
	runtime.GC()
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	base := ms.HeapAlloc
	peak := base
	done := make(chan struct{})
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		t := time.NewTicker(time.Millisecond)
		defer t.Stop()
		for {
			var s runtime.MemStats
			runtime.ReadMemStats(&s)
			peak = max(peak, s.HeapAlloc)
			select {
			case <-done:
				return
			case <-t.C:
			}
		}
	}()
	f()
	close(done)
	wg.Wait()
	runtime.ReadMemStats(&ms)
	return max(peak, ms.HeapAlloc) - base
}

// benchSizes are the ensemble sizes of the merge benchmarks; 10^7 (2 GB of
// records on disk) only with RAMPART_BENCH_LARGE=1.
func benchSizes() []int {
	sizes := []int{100_000, 1_000_000}
	if os.Getenv("RAMPART_BENCH_LARGE") == "1" {
		sizes = append(sizes, 10_000_000)
	}
	return sizes
}

// BenchmarkMergeShards merges two sealed shards into a run directory as
// the merge command does: every row verified and copied, the output
// columns kept. It reports the peak live heap above the start.
func BenchmarkMergeShards(b *testing.B) {
	for _, n := range benchSizes() {
		b.Run(fmt.Sprintf("records=%d", n), func(b *testing.B) {
			dirs := benchShards(b, n, 2)
			var peak uint64
			k := 0
			for b.Loop() {
				out := filepath.Join(b.TempDir(), strconv.Itoa(k))
				k++
				peak = max(peak, peakHeap(func() {
					g, err := OpenShards(dirs)
					if err != nil {
						b.Fatal(err)
					}
					o := NewOutcomes(g.Manifest.Samples)
					if err := g.WriteRun(out, o.Add); err != nil {
						b.Fatal(err)
					}
				}))
			}
			b.ReportMetric(float64(peak)/1e6, "peak-MB")
		})
	}
}

// BenchmarkSummariseOutcomes summarises the columns of an ensemble as the
// merge command does after BenchmarkMergeShards. It reports the peak live
// heap above the columns.
func BenchmarkSummariseOutcomes(b *testing.B) {
	for _, n := range benchSizes() {
		b.Run(fmt.Sprintf("records=%d", n), func(b *testing.B) {
			o := NewOutcomes(n)
			for i := range n {
				o.Add(benchRecord(i))
			}
			var peak uint64
			for b.Loop() {
				peak = max(peak, peakHeap(func() {
					SummariseOutcomes(o, 7, 0.1, 1, 0.95, Spec{MinContrast: 0.9})
				}))
			}
			b.ReportMetric(float64(peak)/1e6, "peak-MB")
			b.ReportMetric(float64(32*n)/1e6, "columns-MB")
		})
	}
}
