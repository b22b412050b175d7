//go:build js && wasm

package main

import "runtime/debug"

// In the browser the garbage collector runs on the page's only thread, so
// each collection is a pause in the screen's work. Measured in Chromium at
// 1,000 readings (app/e2e TestAnalysisSpeed): with the default GOGC=100 an
// edit took a median 47–55 ms to reach the screen, with 300 a median
// 28–35 ms. A soft limit keeps the heap of a very big session bounded: near
// it the collector works as often as it has to. (At 100,000 readings the
// undo states alone hold about 120 MB: 10 copies of the readings.)
func init() {
	debug.SetGCPercent(300)
	debug.SetMemoryLimit(512 << 20)
}
