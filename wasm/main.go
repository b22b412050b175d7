// Command pairline is Pairline's single main package. Compiled to
// WebAssembly it starts the app in the browser (main_js.go); compiled
// natively it is the `pairline` command (main_native.go: serve, build, fit,
// inspect, export-csv). Build constraints keep the native command, the
// server and the CLI's summaries out of app.wasm: the browser never runs
// them, and they were 7.7 MB of its download.
package main

import "pairline/app/ui"

func main() {
	// Both builds register the app's routes: in the browser to run them,
	// natively because go-app prerenders the page on the server.
	ui.Register()
	run()
}
