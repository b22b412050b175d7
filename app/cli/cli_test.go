package cli

import (
	"bytes"
	"strings"
	"testing"
)

// The command line contract of issue "Foundation": unknown commands and
// flags print the usage on stderr and exit 2; help exits 0.
func TestMainUsage(t *testing.T) {
	cases := []struct {
		args     []string
		code     int
		stdout   string
		stderrIn string
	}{
		{nil, ExitUsage, "", "Usage:"},
		{[]string{"help"}, ExitOK, "pairline serve", ""},
		{[]string{"--help"}, ExitOK, "pairline build", ""},
		{[]string{"frobnicate"}, ExitUsage, "", `unknown command "frobnicate"`},
		{[]string{"serve", "--no-such-flag"}, ExitUsage, "", "flag provided but not defined"},
		{[]string{"build", "--out"}, ExitUsage, "", "flag needs an argument"},
		{[]string{"serve", "extra"}, ExitUsage, "", `unexpected argument "extra"`},
		{[]string{"serve", "--web", t.TempDir()}, ExitFailure, "", "the app is not built"},
		{[]string{"build", "--web", t.TempDir(), "--out", t.TempDir()}, ExitFailure, "", "the app is not built"},
		{[]string{"inspect"}, ExitUsage, "", ""},
	}
	for _, c := range cases {
		var out, errb bytes.Buffer
		code := Main(c.args, strings.NewReader(""), &out, &errb)
		if code != c.code {
			t.Errorf("pairline %v: exit %d, want %d (stderr %q)", c.args, code, c.code, errb.String())
		}
		if !strings.Contains(out.String(), c.stdout) {
			t.Errorf("pairline %v: stdout %q lacks %q", c.args, out.String(), c.stdout)
		}
		if !strings.Contains(errb.String(), c.stderrIn) {
			t.Errorf("pairline %v: stderr %q lacks %q", c.args, errb.String(), c.stderrIn)
		}
	}
}
