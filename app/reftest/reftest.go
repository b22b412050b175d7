// Package reftest finds the shared reference data the tests check against
// (NIST StRD certified values and the NIST/SEMATECH e-Handbook datasets in
// ../shared/reference, see its README.md). It is imported only from _test
// files, so nothing of it is linked into the app or the command.
package reftest

import (
	"fmt"
	"os"
	"path/filepath"
	"testing"
)

// Env names the variable that points at the reference folder when the
// checkout does not sit beside it.
const Env = "PAIRLINE_REFERENCE"

// Dirs are the folders looked in, in order: $PAIRLINE_REFERENCE when set,
// shared/reference beside the repository (the folder that holds go.mod),
// and one level further up (a worktree in a folder of worktrees beside the
// main checkout).
func Dirs() []string {
	var dirs []string
	if d := os.Getenv(Env); d != "" {
		dirs = append(dirs, d)
	}
	root := moduleRoot()
	return append(dirs, filepath.Join(root, "..", "shared", "reference"), filepath.Join(root, "..", "..", "shared", "reference"))
}

// moduleRoot is the nearest folder at or above the working directory that
// holds go.mod (the working directory when there is none).
func moduleRoot() string {
	wd, _ := os.Getwd()
	for d := wd; ; d = filepath.Dir(d) {
		if _, err := os.Stat(filepath.Join(d, "go.mod")); err == nil {
			return d
		}
		if filepath.Dir(d) == d {
			return wd
		}
	}
}

// Find is the path of the reference file parts (relative to the reference
// folder, such as "strd", "Norris.txt") in the first of Dirs that has it;
// when none has it, the path in the first of Dirs, so that a message names
// where it was looked for. Use Path in a test; Find is for tables and
// loaders that run before a test can skip.
func Find(parts ...string) string {
	dirs := Dirs()
	for _, d := range dirs {
		p := filepath.Join(append([]string{d}, parts...)...)
		if _, err := os.Stat(p); err == nil {
			return p
		}
	}
	return filepath.Join(append([]string{dirs[0]}, parts...)...)
}

// Path is Find for a test: when the file is missing the test skips with
// Missing's message, except in CI (CI=true), where it fails.
func Path(t testing.TB, parts ...string) string {
	t.Helper()
	p := Find(parts...)
	if _, err := os.Stat(p); err != nil {
		Skip(t, p)
	}
	return p
}

// Skip skips the test because the reference file at path is missing, or
// fails it in CI (CI=true), where the reference data must be present.
func Skip(t testing.TB, path string) {
	t.Helper()
	if os.Getenv("CI") == "true" {
		t.Fatal(Missing(path))
	}
	t.Skip(Missing(path))
}

// Missing is the one message for a reference file that is not there.
func Missing(path string) string {
	return fmt.Sprintf("reference data not found at %s (see ../shared/reference/README.md)", path)
}

// Note is for a test that goes on without one of its reference files (a
// table of cases, some from the reference data): it logs that the case
// named name was passed over and why, and in CI (CI=true) marks the test
// failed.
func Note(t testing.TB, name, path string) {
	t.Helper()
	if os.Getenv("CI") == "true" {
		t.Errorf("%s: %s", name, Missing(path))
		return
	}
	t.Logf("SKIP %s: %s", name, Missing(path))
}
