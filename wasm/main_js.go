//go:build js && wasm

package main

import "github.com/maxence-charriere/go-app/v10/pkg/app"

// run starts the app in the browser; it never returns.
func run() {
	app.RunWhenOnBrowser()
}
