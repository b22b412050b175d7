package cli

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"

	"pairline/app/webapp"
)

const usage = `Pairline: paired readings to a trustworthy straight line.

Usage:
  pairline serve [--addr HOST:PORT] [--web DIR] [--tls-cert FILE --tls-key FILE]
      Serve the app (default http://127.0.0.1:8000).
  pairline build [--out DIR] [--web DIR]
      Write a self-contained static site for any static HTTPS host.
  pairline fit [flags] FILE|-
      Fit a line to a CSV/TSV file of readings and print the analysis
      (pairline fit --help lists the flags).
  pairline inspect [--json] FILE
      Show a .pairline session file: metadata, checksum status, analysis.
  pairline export-csv [--session N|ID] FILE
      Write the readings of a .pairline session file as CSV (the first
      session, or the one chosen by number from 1 or by ID).
  pairline history [--json|--csv|--html OUT] [--instrument ID] [--interval DAYS] FILE|DIR...
      Follow each instrument through its calibration records: changes
      against the previous accepted calibration, drift, next due date.
  pairline new [--title T] [--site S] [--instrument D] [--serial N] [--id ID]
      [--operator O] [--taken DATE] [--x-name ... --x-unit ... --y-name ...
      --y-unit ...] FILE.csv -o OUT.pairline
      Make a session file from a CSV file of readings.
  pairline help
      Show this text.
`

// Main runs the command with args (without the program name) and returns
// the process exit code.
func Main(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		fmt.Fprint(stderr, usage)
		return ExitUsage
	}
	switch args[0] {
	case "help", "-h", "--help":
		fmt.Fprint(stdout, usage)
		return ExitOK
	case "serve":
		return serve(args[1:], stdout, stderr)
	case "build":
		return build(args[1:], stdout, stderr)
	}
	if run, ok := commands[args[0]]; ok {
		return run(args[1:], stdin, stdout, stderr)
	}
	fmt.Fprintf(stderr, "pairline: unknown command %s\n\n%s", quoted(args[0]), usage)
	return ExitUsage
}

// commands are the commands that read data files; each lives in its own
// file of this package.
var commands = map[string]func(args []string, stdin io.Reader, stdout, stderr io.Writer) int{
	"fit": Fit,
	"inspect": func(args []string, _ io.Reader, stdout, stderr io.Writer) int {
		return Inspect(args, stdout, stderr)
	},
	"export-csv": func(args []string, _ io.Reader, stdout, stderr io.Writer) int {
		return ExportCSV(args, stdout, stderr)
	},
	"new": func(args []string, _ io.Reader, stdout, stderr io.Writer) int {
		return New(args, stdout, stderr)
	},
	"history": func(args []string, _ io.Reader, stdout, stderr io.Writer) int {
		return History(args, stdout, stderr)
	},
}

// newFlags is the flag set of a command. Its output is stderr, for the
// usage; a Usage function given later must write to fs.Output().
func newFlags(name string, stderr io.Writer) *flag.FlagSet {
	fs := flag.NewFlagSet("pairline "+name, flag.ContinueOnError)
	fs.SetOutput(stderr)
	return fs
}

// parseArgs parses args. The flag package would print its error with the
// argument as given (a newline or an escape sequence in it included), so it
// parses silently and the error is written here, made visible, on one line,
// followed by the usage. -h and --help print the usage and give
// flag.ErrHelp.
func parseArgs(fs *flag.FlagSet, args []string) error {
	out := fs.Output()
	fs.SetOutput(io.Discard)
	err := fs.Parse(args)
	fs.SetOutput(out)
	if err != nil {
		if !errors.Is(err, flag.ErrHelp) {
			fmt.Fprintf(out, "%s: %s\n", fs.Name(), term(err.Error()))
		}
		fs.Usage()
	}
	return err
}

func parse(fs *flag.FlagSet, args []string) (int, bool) {
	if err := parseArgs(fs, args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return ExitOK, false
		}
		return ExitUsage, false
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(fs.Output(), "%s: unexpected argument %s\n", fs.Name(), quoted(fs.Arg(0)))
		fs.Usage()
		return ExitUsage, false
	}
	return 0, true
}

func serve(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("serve", stderr)
	addr := fs.String("addr", "127.0.0.1:8000", "address to listen on, HOST:PORT")
	web := fs.String("web", "web", "folder with app.wasm, the stylesheet and the icons")
	cert := fs.String("tls-cert", "", "PEM certificate file, to serve HTTPS (with --tls-key)")
	key := fs.String("tls-key", "", "PEM private key file for --tls-cert")
	if code, ok := parse(fs, args); !ok {
		return code
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	err := webapp.Serve(ctx, webapp.ServeOptions{Addr: *addr, WebDir: *web, TLSCert: *cert, TLSKey: *key, Log: stdout})
	if err != nil {
		fail(stderr, "serve", "%v", err)
		return ExitFailure
	}
	return ExitOK
}

func build(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("build", stderr)
	out := fs.String("out", "dist", "folder to write the static site to")
	web := fs.String("web", "web", "folder with app.wasm, the stylesheet and the icons")
	if code, ok := parse(fs, args); !ok {
		return code
	}
	if err := webapp.Build(*out, *web); err != nil {
		fail(stderr, "build", "%v", err)
		return ExitFailure
	}
	fmt.Fprintf(stdout, "Static site written to %s\n", term(*out))
	return ExitOK
}
