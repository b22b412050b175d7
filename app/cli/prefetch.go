package cli

import (
	"runtime"
	"sync"
)

// prefetchBudget is how many readings the analyses running ahead of the
// writer may hold together (each reading costs about 1 kB while it is
// analysed and until its report is written). A session of MaxReadings
// readings takes the whole budget, so big sessions are analysed one at a
// time, as before, and memory stays that of one big analysis; small
// sessions are analysed side by side on every core.
const prefetchBudget = 300_000

// prefetchWeight is what one session of n readings takes of the budget: a
// session's report costs something even without readings.
func prefetchWeight(n int) int { return min(n+1_000, prefetchBudget) }

// prefetch returns a next(i) that gives analyse(i)'s result for i = 0, 1,
// … n−1 in order, while up to workers goroutines (GOMAXPROCS, at most 4)
// analyse the sessions after i, within prefetchBudget readings in all.
// weight(i) is the number of readings of session i. next must be called for
// every i in order (session i's budget is freed by the call for i+1, once
// its analysis has been written); stop (deferred by the caller) ends the workers early when
// the writer gives up.
func prefetch(n int, weight func(int) int, analyse func(int) sessionAnalysis) (next func(int) sessionAnalysis, stop func()) {
	workers := min(runtime.GOMAXPROCS(0), 4, max(n, 1))
	results := make([]chan sessionAnalysis, n)
	for i := range results {
		results[i] = make(chan sessionAnalysis, 1)
	}
	var (
		mu     sync.Mutex
		cond   = sync.NewCond(&mu)
		used   int  // budget taken by sessions analysed or waiting to be written
		taken  int  // sessions handed to a worker so far
		closed bool // stop was called
	)
	work := func() {
		for {
			mu.Lock()
			// Sessions are handed out in order, each when the budget
			// has room for it (always when nothing else is held).
			for !closed && taken < n && used > 0 && used+prefetchWeight(weight(taken)) > prefetchBudget {
				cond.Wait()
			}
			if closed || taken >= n {
				mu.Unlock()
				return
			}
			i := taken
			taken++
			used += prefetchWeight(weight(i))
			mu.Unlock()
			results[i] <- analyse(i)
		}
	}
	for k := 0; k < workers; k++ {
		go work()
	}
	next = func(i int) sessionAnalysis {
		// Session i−1 has been written: its budget is free.
		if i > 0 {
			mu.Lock()
			used -= prefetchWeight(weight(i - 1))
			cond.Broadcast()
			mu.Unlock()
		}
		return <-results[i]
	}
	stop = func() {
		mu.Lock()
		closed = true
		cond.Broadcast()
		mu.Unlock()
	}
	return next, stop
}
