package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// TestSplit: what split keeps of a small package of two files, table by
// table: a declaration that mentions net/http is left out, and so is one
// that reaches it through another declaration, a method or a type with a
// server method; the rest is kept with only the imports it uses, and an
// exported type left out becomes an empty struct.
func TestSplit(t *testing.T) {
	srcs := map[string][]byte{
		"a.go": []byte(`package p

import (
	"net/http"
	"strings"
)

// Server serves.
type Server struct{ h http.Handler }

func (s *Server) start() { s.h = http.NotFoundHandler() }

func (s *Server) Run() { s.start() }

func useServer() { var s Server; s.Run() }

// Clean trims.
func Clean(v string) string { return strings.TrimSpace(v) }

type Resolver interface{ Resolve(string) string }
`),
		"b.go": []byte(`package p

import "net/http"

const (
	shade = "#123456"
	other = 2
)

type local struct{ http.Handler }

func (l local) Resolve(s string) string { return s }

func viaMethod(r Resolver) string { return r.Resolve("x") }

func keep() string { return shade + Clean(" y ") }
`),
	}
	got, err := split(srcs, "net/http")
	if err != nil {
		t.Fatal(err)
	}
	src := string(got)
	for _, c := range []struct {
		decl string
		kept bool
	}{
		{"func Clean(", true},
		{"// Clean trims.", true},
		{"func keep(", true},
		{"shade = \"#123456\"", true},
		{"type Resolver interface", true}, // its method's name is not a use
		{"type Server struct{}", true},    // the exported type, empty
		{"func (s *Server) start", false}, // mentions net/http
		{"func (s *Server) Run", false},   // a method of a server type
		{"func useServer", false},         // uses the server type
		{"type local", false},             // unexported: no empty copy
		{"func (l local) Resolve", false},
		{"func viaMethod", false}, // calls a method named like a server method
		{`"net/http"`, false},
	} {
		if strings.Contains(src, c.decl) != c.kept {
			t.Errorf("%q kept = %v, want %v; file:\n%s", c.decl, !c.kept, c.kept, src)
		}
	}
	if !strings.HasPrefix(src, "//go:build wasm\n") || !strings.Contains(src, "\"strings\"") {
		t.Errorf("want the wasm constraint and the strings import:\n%s", src)
	}
}

// TestSplitRefusesConstrainedFile: a file that already has a build
// constraint means a go-app whose layout this tool was not written for.
func TestSplitRefusesConstrainedFile(t *testing.T) {
	_, err := split(map[string][]byte{"a.go": []byte("//go:build !wasm\n\npackage p\n")}, "net/http")
	if err == nil {
		t.Fatal("want an error for a file with a build constraint")
	}
}

// TestBrowserBuildHasNoServer writes the copy and its go.work into a
// temporary directory and asks the go command what the browser build of
// ./wasm links: go-app, but not net/http or crypto/tls; and that the copy
// differs from the module only in the two files' constraint and the new
// file. It needs go-app in the module cache (go mod download).
func TestBrowserBuildHasNoServer(t *testing.T) {
	if testing.Short() {
		t.Skip("runs the go command")
	}
	out := t.TempDir()
	root, err := filepath.Abs("../..")
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command("go", "run", "./testdata/wasmdeps", "-out", out)
	cmd.Dir = root
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("wasmdeps: %v\n%s", err, b)
	}
	list := exec.Command("go", "list", "-deps", "./wasm")
	list.Dir = root
	list.Env = append(os.Environ(), "GOWORK="+filepath.Join(out, "go.work"), "GOOS=js", "GOARCH=wasm")
	b, err := list.CombinedOutput()
	if err != nil {
		t.Fatalf("go list: %v\n%s", err, b)
	}
	deps := map[string]bool{}
	for _, l := range strings.Fields(string(b)) {
		deps[l] = true
	}
	if !deps["github.com/maxence-charriere/go-app/v10/pkg/app"] {
		t.Errorf("the browser build does not link go-app:\n%s", b)
	}
	for _, p := range []string{"net/http", "crypto/tls", "pairline/app/webapp", "pairline/app/cli"} {
		if deps[p] {
			t.Errorf("the browser build links %s", p)
		}
	}
	compareCopy(t, out)
}

// compareCopy: the copy in out against the module: the same files, byte
// for byte, but the two server files (the constraint line added) and
// browser_wasm.go.
func compareCopy(t *testing.T, out string) {
	t.Helper()
	d, err := goOutput("list", "-m", "-f", "{{.Dir}}", goApp)
	if err != nil {
		t.Fatal(err)
	}
	orig := filepath.Join(d, appDir)
	matches, _ := filepath.Glob(filepath.Join(out, "go-app@*", appDir))
	if len(matches) != 1 {
		t.Fatalf("copy of %s not found in %s", appDir, out)
	}
	entries, err := os.ReadDir(orig)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range entries {
		if e.IsDir() {
			continue
		}
		a, _ := os.ReadFile(filepath.Join(orig, e.Name()))
		c, err := os.ReadFile(filepath.Join(matches[0], e.Name()))
		if err != nil {
			t.Errorf("%s missing from the copy", e.Name())
			continue
		}
		want := string(a)
		if slices.Contains(serverFiles, e.Name()) {
			want = serverConstraint + want
		}
		if string(c) != want {
			t.Errorf("%s differs from the module's", e.Name())
		}
	}
	if _, err := os.Stat(filepath.Join(matches[0], "browser_wasm.go")); err != nil {
		t.Error(err)
	}
}
