// Package cli is the native `pairline` command: its sub-commands (serve,
// build, fit, inspect, export-csv), their flags and exit codes. Each command
// is a function of its arguments and streams that returns the exit status,
// so tests can run it without a process. The work is done by app/webapp,
// app/session and fitcore. The JSON that `pairline fit --json` writes is
// described in FIT-JSON.md beside this file.
package cli
