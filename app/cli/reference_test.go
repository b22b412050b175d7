package cli

import (
	"fmt"
	"os"
	"path/filepath"
	"testing"
)

// refDir is the shared reference data (NIST StRD and e-Handbook files):
// ../shared/reference beside the repository (the folder above go.mod), or
// $PAIRLINE_REFERENCE when set (for a checkout that lives elsewhere).
func refDir() string {
	if d := os.Getenv("PAIRLINE_REFERENCE"); d != "" {
		return d
	}
	wd, _ := os.Getwd()
	for d := wd; ; d = filepath.Dir(d) {
		if _, err := os.Stat(filepath.Join(d, "go.mod")); err == nil {
			return filepath.Join(d, "..", "shared", "reference")
		}
		if filepath.Dir(d) == d {
			return filepath.Join(wd, "..", "shared", "reference")
		}
	}
}

// refPath is the path of a reference file under refDir. When the file is
// missing the test skips, saying where it looked, except in CI (CI=true),
// where a missing reference file fails the test.
func refPath(t testing.TB, parts ...string) string {
	t.Helper()
	p := filepath.Join(append([]string{refDir()}, parts...)...)
	if _, err := os.Stat(p); err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatal(refMissing(p))
		}
		t.Skip(refMissing(p))
	}
	return p
}

// refMissing is the one message for a reference file that is not there.
func refMissing(path string) string {
	return fmt.Sprintf("reference data not found at %s (see ../shared/reference/README.md)", path)
}
