package reftest

import (
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// TestFind: $PAIRLINE_REFERENCE comes first; a missing file gives the
// path in the first folder looked in.
func TestFind(t *testing.T) {
	dir := t.TempDir()
	if err := os.MkdirAll(filepath.Join(dir, "strd"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "strd", "x.txt"), []byte("1"), 0o644); err != nil {
		t.Fatal(err)
	}
	t.Setenv(Env, dir)
	if got, want := Find("strd", "x.txt"), filepath.Join(dir, "strd", "x.txt"); got != want {
		t.Errorf("Find = %s, want %s", got, want)
	}
	if got, want := Find("strd", "none.txt"), filepath.Join(dir, "strd", "none.txt"); got != want {
		t.Errorf("Find of a missing file = %s, want %s", got, want)
	}
	if got := Path(t, "strd", "x.txt"); got != filepath.Join(dir, "strd", "x.txt") {
		t.Errorf("Path = %s", got)
	}
	if m := Missing("/a/b"); !strings.HasPrefix(m, "reference data not found at /a/b ") {
		t.Errorf("message %q", m)
	}
}

// TestPathMissing: outside CI a missing file skips the test; in CI it
// fails it. Run in subtests whose outcome is read back.
func TestPathMissing(t *testing.T) {
	t.Setenv(Env, t.TempDir())
	for _, ci := range []string{"", "true"} {
		t.Setenv("CI", ci)
		var skipped, failed bool
		done := make(chan struct{})
		inner := &recorder{TB: t, skip: &skipped, fail: &failed}
		go func() {
			defer close(done)
			Path(inner, "strd", "none.txt")
		}()
		<-done
		if ci == "true" && (!failed || skipped) || ci == "" && (!skipped || failed) {
			t.Errorf("CI=%q: skipped %v, failed %v", ci, skipped, failed)
		}
	}
}

// recorder is a testing.TB whose Skip and Fatal record the call and end
// the goroutine, as the real ones do, without ending the test.
type recorder struct {
	testing.TB
	skip, fail *bool
}

func (r *recorder) Helper() {}
func (r *recorder) Skip(args ...any) {
	*r.skip = true
	runtime.Goexit()
}
func (r *recorder) Fatal(args ...any) {
	*r.fail = true
	runtime.Goexit()
}
