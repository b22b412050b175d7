// Command demo writes Pairline's invented demo sessions (the fictional
// Larkwater Valley Water Board) as a session file, from the fixed seed in
// app/demo:
//
//	go run ./testdata/demo
//
// writes testdata/demo/demo.pairline and the copy app/demo/demo.pairline
// that the app embeds. Run it from the repository root after changing
// app/demo/build.go; app/demo's tests fail while the embedded copy is out
// of date.
package main

import (
	"bytes"
	"fmt"
	"os"

	"pairline/app/demo"
	"pairline/app/session"
)

func main() {
	ss, err := demo.Build()
	if err != nil {
		fmt.Fprintln(os.Stderr, "demo:", err)
		os.Exit(1)
	}
	var buf bytes.Buffer
	if err := session.Encode(&buf, ss); err != nil {
		fmt.Fprintln(os.Stderr, "demo:", err)
		os.Exit(1)
	}
	for _, path := range []string{"testdata/demo/demo.pairline", "app/demo/demo.pairline"} {
		if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
			fmt.Fprintln(os.Stderr, "demo:", err)
			os.Exit(1)
		}
		fmt.Printf("wrote %s (%d bytes, %d sessions)\n", path, buf.Len(), len(ss))
	}
}
