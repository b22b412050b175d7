// Command pairline is Pairline's single main package. Compiled to
// WebAssembly it starts the app in the browser; compiled natively it is the
// `pairline` command (serve, build, fit, inspect, export-csv).
package main

import (
	"os"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/cli"
	"pairline/app/ui"
)

func main() {
	ui.Register()
	app.RunWhenOnBrowser() // in the browser this never returns
	os.Exit(cli.Main(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}
