//go:build !(js && wasm)

package main

import (
	"os"

	"pairline/app/cli"
)

// run is the `pairline` command.
func run() {
	os.Exit(cli.Main(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}
