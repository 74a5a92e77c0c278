package mc

import (
	"context"
	"runtime"
	"sync"
)

// Run realises the indices [from, to) on workers goroutines (all cores if
// workers < 1) and calls emit with the records in index order, whatever
// the order in which they complete. If ctx is cancelled, Run stops
// starting realisations, lets those under way finish, emits the contiguous
// prefix that is done and returns ctx.Err(); an error from emit stops the
// run the same way and is returned. It returns the number of records
// emitted.
func (r *Realiser) Run(ctx context.Context, from, to, workers int, emit func(Record) error) (int, error) {
	return runOrdered(ctx, from, to, workers, func() func(int) Record { return r.NewWorker().Realise }, emit)
}

// runOrdered runs jobs [from, to) on workers goroutines, each with its own
// job function from newJob, and emits the records in index order; see
// Realiser.Run for cancellation and errors.
func runOrdered(ctx context.Context, from, to, workers int, newJob func() func(int) Record, emit func(Record) error) (int, error) {
	if workers < 1 {
		workers = runtime.GOMAXPROCS(0)
	}
	if to <= from {
		return 0, nil
	}
	workers = min(workers, to-from) // more would idle, and --workers 2^63-1 would exhaust memory
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	jobs := make(chan int)
	results := make(chan Record)
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			job := newJob()
			for i := range jobs {
				results <- job(i)
			}
		}()
	}
	go func() {
		defer close(jobs)
		for i := from; i < to; i++ {
			select {
			case jobs <- i:
			case <-ctx.Done():
				return
			}
		}
	}()
	go func() {
		wg.Wait()
		close(results)
	}()
	pending := make(map[int]Record)
	next, emitted := from, 0
	var emitErr error
	for rec := range results {
		if emitErr != nil {
			continue // drain
		}
		pending[rec.Index] = rec
		for {
			p, ok := pending[next]
			if !ok {
				break
			}
			delete(pending, next)
			if err := emit(p); err != nil {
				emitErr = err
				cancel()
				break
			}
			next++
			emitted++
		}
	}
	if emitErr != nil {
		return emitted, emitErr
	}
	if emitted < to-from {
		return emitted, context.Cause(ctx)
	}
	return emitted, nil
}
