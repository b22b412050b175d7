//go:build js && wasm

package main

import "runtime/debug"

// In the browser the garbage collector runs on the page's only thread, so
// each collection is a pause in the screen's work: collecting less often
// (GOGC 300) made edits reach the screen sooner (measured by app/e2e
// TestAnalysisSpeed; figures in DEVELOPERS.md). A soft limit keeps the heap
// of a very big session bounded: near it the collector works as often as it
// has to (the undo states alone hold 10 copies of the readings).
func init() {
	debug.SetGCPercent(300)
	debug.SetMemoryLimit(512 << 20)
}
