package cli

import (
	"fmt"
	"sync"
	"testing"
	"time"

	"pairline/app/session"
)

// TestPrefetch: results come in order, all of them, and the analyses held
// at once (running, or done and not yet written) never take more than the
// budget, except a single session larger than it; a big session is never
// analysed beside another.
func TestPrefetch(t *testing.T) {
	tests := []struct {
		name    string
		weights []int
	}{
		{"none", nil},
		{"one small", []int{10}},
		{"many small", []int{5, 8, 1, 0, 30, 2, 2, 2, 2, 2, 2, 2, 2, 2, 2, 2, 2, 2}},
		{"big ones", []int{session.MaxReadings, session.MaxReadings, 10, session.MaxReadings, 10, 10}},
		{"mixed", []int{150_000, 140_000, 9_000, 200_000, 1, 100_000, 100_000, 100_000}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var mu sync.Mutex
			held, peak, bigBeside := 0, 0, false
			bigs := 0
			written := make([]bool, len(tt.weights))
			next, stop := prefetch(len(tt.weights), func(i int) int { return tt.weights[i] }, func(i int) sessionAnalysis {
				mu.Lock()
				held += prefetchWeight(tt.weights[i])
				peak = max(peak, held)
				if prefetchWeight(tt.weights[i]) == prefetchBudget {
					bigs++
				}
				if bigs > 0 && held > prefetchWeight(tt.weights[i]) && prefetchWeight(tt.weights[i]) == prefetchBudget {
					bigBeside = true
				}
				mu.Unlock()
				time.Sleep(time.Millisecond)
				return sessionAnalysis{AnalysisError: fmt.Sprint(i)}
			})
			defer stop()
			for i := range tt.weights {
				if i > 0 {
					// Session i−1 is written: what it held is free
					// once next(i) is called (the test's own count is
					// freed first).
					mu.Lock()
					held -= prefetchWeight(tt.weights[i-1])
					mu.Unlock()
				}
				a := next(i)
				if a.AnalysisError != fmt.Sprint(i) {
					t.Fatalf("call %d gave the analysis of session %s", i, a.AnalysisError)
				}
				written[i] = true
			}
			if peak > prefetchBudget {
				t.Errorf("analyses holding %d readings at once, budget %d", peak, prefetchBudget)
			}
			if bigBeside {
				t.Error("a session as large as the budget was analysed beside another")
			}
		})
	}
}

// TestPrefetchStop: a writer that gives up after the first session ends the
// workers (the test would hang on the channel sends otherwise, and the race
// detector sees any shared state).
func TestPrefetchStop(t *testing.T) {
	n := 50
	var mu sync.Mutex
	calls := 0
	next, stop := prefetch(n, func(int) int { return prefetchBudget / 3 }, func(i int) sessionAnalysis {
		mu.Lock()
		calls++
		mu.Unlock()
		return sessionAnalysis{}
	})
	next(0)
	stop()
	time.Sleep(20 * time.Millisecond)
	mu.Lock()
	defer mu.Unlock()
	if calls > 4 {
		t.Errorf("%d sessions analysed after the writer stopped at the first; the budget allows 3 ahead", calls)
	}
}
