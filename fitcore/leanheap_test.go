package fitcore

import (
	"runtime"
	"runtime/debug"
	"runtime/metrics"
	"sync"
	"testing"
	"time"
)

// peakLiveHeap runs f with the collector at a target of 2 % (so that it
// collects every few MB) and returns the largest live heap a collection
// found while f ran, less the live heap before, as read from
// runtime/metrics every 100 µs. Sampling can miss a peak but not make
// one up, so a bound on what it returns errs towards passing; the
// collector's floating garbage adds a little.
func peakLiveHeap(f func()) uint64 {
	defer debug.SetGCPercent(debug.SetGCPercent(2))
	runtime.GC()
	s := []metrics.Sample{{Name: "/gc/heap/live:bytes"}}
	metrics.Read(s)
	base := s[0].Value.Uint64()
	var peak uint64
	stop := make(chan struct{})
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		t := time.NewTicker(100 * time.Microsecond)
		defer t.Stop()
		s := []metrics.Sample{{Name: "/gc/heap/live:bytes"}}
		for {
			metrics.Read(s)
			peak = max(peak, s[0].Value.Uint64())
			select {
			case <-stop:
				return
			case <-t.C:
			}
		}
	}()
	f()
	runtime.GC()
	close(stop)
	wg.Wait()
	if peak < base {
		return 0
	}
	return peak - base
}

// TestLeanRunPeakHeap: an analysis no advice refit shares its work space
// with (Options.SkipAdvice; with FlaggedInfluenceOnly, the work of
// `pairline fit --no-advice`, whose report then holds no n-sized table of
// influence) runs its checks one group after another and lets each
// group's work space go (checkRun.lean), so that its heap beyond x and y
// stays within 40 bytes a reading: the report's fitted values and
// residuals (16), then the largest group's work space, Durbin–Watson's two
// columns of the line (16), and small change. Measured on 300,000
// readings: 32.1 bytes a reading. Before 4 December lack of fit's sort of
// x held two key–position pairs a reading (32) beside the positions (4),
// and Shapiro–Wilk's sort the keys of every residual and their work space
// (16) beside the sorted copy: 52.1 (ckSortBuf.orderLarge and ckSortFloats
// now need the result and one bucket's work); with the three groups side
// by side and their work spaces held to the end (before checkRun.lean),
// 76.1.
func TestLeanRunPeakHeap(t *testing.T) {
	if testing.Short() {
		t.Skip("analyses 300,000 readings")
	}
	const n = 300_000
	x, y, _ := benchData(n)
	var err error
	peak := peakLiveHeap(func() { _, err = Analyze(x, y, Options{SkipAdvice: true, FlaggedInfluenceOnly: true}) })
	if err != nil {
		t.Fatal(err)
	}
	per := float64(peak) / n
	t.Logf("peak live heap of Analyze(SkipAdvice) on %d readings: %d bytes beyond x and y, %.1f a reading", n, peak, per)
	if per > 40 {
		t.Errorf("Analyze with SkipAdvice held %.1f bytes a reading at its peak (beyond x and y), more than 40", per)
	}
}
