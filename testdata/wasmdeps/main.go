// Command wasmdeps prepares the browser build's copy of go-app: the same
// module at the version go.mod pins (verified against go.sum by `go mod
// download`), with its HTTP server left out of the js/wasm build.
//
//	go run ./testdata/wasmdeps -out bin/wasmdeps
//	GOWORK=$PWD/bin/wasmdeps/go.work GOOS=js GOARCH=wasm go build ./wasm
//
// `make wasm` does both. Why: go-app's package app declares its server
// (`Handler`, http.go) and the resource resolvers of the server (resource.go)
// in files without a build constraint, so the browser build imports
// net/http, and net/http brings crypto/tls, whose package initialisation
// keeps the elliptic-curve and post-quantum key code (about 1.5 MB of
// app.wasm, none of it ever run in a page: DEVELOPERS.md, "What app.wasm is
// made of"). The copy gives those two files the constraint `!wasm`, and a
// generated file (browser_wasm.go, `wasm` only) holds the declarations of
// theirs that do not reach net/http, directly or through each other (the
// URL helpers the page uses), plus an empty `Handler` type for the
// signature of go-app's own browser stub of GenerateStaticWebsite (which
// panics there). Nothing else changes: every other file is copied byte for
// byte, and the native build (the server, prerendering) uses the module
// from the module cache as before, because only the browser build is run
// with the go.work written here.
//
// The go.work file uses the repository and replaces go-app with the copy;
// both paths are relative to it.
package main

import (
	"bytes"
	"encoding/json"
	"flag"
	"fmt"
	"go/ast"
	"go/format"
	"go/parser"
	"go/token"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
)

// goApp is the module whose browser build is trimmed, and serverFiles the
// files of its package app that are split.
const (
	goApp    = "github.com/maxence-charriere/go-app/v10"
	appDir   = "pkg/app"
	httpPath = "net/http"
)

var serverFiles = []string{"http.go", "resource.go"}

// serverConstraint is what the copy puts before each of serverFiles.
const serverConstraint = "//go:build !wasm\n\n"

func main() {
	out := flag.String("out", "bin/wasmdeps", "directory to write the copy and go.work into")
	flag.Parse()
	if err := run(*out); err != nil {
		fmt.Fprintln(os.Stderr, "wasmdeps:", err)
		os.Exit(1)
	}
}

func run(out string) error {
	root, err := goOutput("list", "-m", "-f", "{{.Dir}}")
	if err != nil {
		return err
	}
	version, err := goOutput("list", "-m", "-f", "{{.Version}}", goApp)
	if err != nil {
		return err
	}
	raw, err := goOutput("mod", "download", "-json", goApp+"@"+version)
	if err != nil {
		return err
	}
	var mod struct{ Dir, Sum, Error string }
	if err := json.Unmarshal([]byte(raw), &mod); err != nil {
		return fmt.Errorf("reading go mod download's answer: %w", err)
	}
	if mod.Error != "" || mod.Dir == "" {
		return fmt.Errorf("%s@%s could not be downloaded: %s", goApp, version, mod.Error)
	}
	out, err = filepath.Abs(out)
	if err != nil {
		return err
	}
	copyDir := filepath.Join(out, "go-app@"+version)
	if err := os.RemoveAll(copyDir); err != nil {
		return err
	}
	if err := copyModule(mod.Dir, copyDir); err != nil {
		return err
	}
	if err := trimServer(filepath.Join(copyDir, appDir)); err != nil {
		return err
	}
	rel, err := filepath.Rel(out, root)
	if err != nil {
		return err
	}
	work := fmt.Sprintf("// Written by testdata/wasmdeps for the browser build (%s %s, sum %s).\n"+
		"go 1.26\n\nuse %s\n\nreplace %s %s => ./%s\n",
		goApp, version, mod.Sum, filepath.ToSlash(rel), goApp, version, filepath.Base(copyDir))
	return os.WriteFile(filepath.Join(out, "go.work"), []byte(work), 0o644)
}

// goOutput runs the go command and returns its standard output, trimmed.
func goOutput(args ...string) (string, error) {
	cmd := exec.Command("go", args...)
	cmd.Env = append(os.Environ(), "GOWORK=off", "GOOS=", "GOARCH=")
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	b, err := cmd.Output()
	if err != nil {
		return "", fmt.Errorf("go %s: %v: %s", strings.Join(args, " "), err, strings.TrimSpace(stderr.String()))
	}
	return strings.TrimSpace(string(b)), nil
}

// copyModule copies the module's go.mod, go.sum, LICENSE and pkg/ tree
// (its documentation site is left out), writable.
func copyModule(from, to string) error {
	for _, name := range []string{"go.mod", "go.sum", "LICENSE"} {
		if err := copyFile(filepath.Join(from, name), filepath.Join(to, name)); err != nil {
			return err
		}
	}
	pkg := filepath.Join(from, "pkg")
	return filepath.WalkDir(pkg, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		rel, err := filepath.Rel(from, p)
		if err != nil {
			return err
		}
		return copyFile(p, filepath.Join(to, rel))
	})
}

func copyFile(from, to string) error {
	b, err := os.ReadFile(from)
	if err != nil {
		return err
	}
	if err := os.MkdirAll(filepath.Dir(to), 0o755); err != nil {
		return err
	}
	return os.WriteFile(to, b, 0o644)
}

// trimServer gives the server files of dir the constraint !wasm and writes
// browser_wasm.go with what the browser build keeps of them.
func trimServer(dir string) error {
	srcs := map[string][]byte{}
	for _, name := range serverFiles {
		b, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			return err
		}
		srcs[name] = b
	}
	browser, err := split(srcs, httpPath)
	if err != nil {
		return err
	}
	for name, b := range srcs {
		if err := os.WriteFile(filepath.Join(dir, name), append([]byte(serverConstraint), b...), 0o644); err != nil {
			return err
		}
	}
	return os.WriteFile(filepath.Join(dir, "browser_wasm.go"), browser, 0o644)
}

// unit is one top-level declaration: a function or method, or a whole
// const, var or type group.
type unit struct {
	file   string
	decl   ast.Decl
	names  []string        // the package-level names it declares
	uses   map[string]bool // the identifiers it mentions
	recv   string          // a method's receiver type
	method string          // and its name
	pkgs   map[string]bool // the import paths it uses
}

// split returns the source of a file (build constraint wasm) that holds the
// declarations of srcs (one package's files) that reach the import path
// server neither directly nor through another of these declarations (a
// type reaches it through any of its methods, a call x.m through every
// method named m), with
// the imports they use, and an empty struct for each exported type that
// does. A group (const, var or type in parentheses) is kept or left out
// whole. Files that already have a build constraint are refused.
func split(srcs map[string][]byte, server string) ([]byte, error) {
	fset := token.NewFileSet()
	names := make([]string, 0, len(srcs))
	for name := range srcs {
		names = append(names, name)
	}
	sort.Strings(names)
	units, pkgName, err := parseUnits(fset, srcs, names)
	if err != nil {
		return nil, err
	}
	serverSide := markServer(units, server)
	var body bytes.Buffer
	used := map[string]bool{}
	var stubs []string
	for _, u := range units {
		if serverSide[u] {
			stubs = append(stubs, exportedTypes(u)...)
			continue
		}
		for p := range u.pkgs {
			used[p] = true
		}
		start, end := u.decl.Pos(), u.decl.End()
		if doc := docOf(u.decl); doc != nil {
			start = doc.Pos()
		}
		body.Write(srcs[u.file][fset.Position(start).Offset:fset.Position(end).Offset])
		body.WriteString("\n\n")
	}
	return render(names, server, pkgName, used, body.Bytes(), stubs)
}

// parseUnits parses the files (in the order of names) into their
// top-level declarations, imports left out, and returns the package name.
func parseUnits(fset *token.FileSet, srcs map[string][]byte, names []string) ([]*unit, string, error) {
	var units []*unit
	var pkgName string
	for _, name := range names {
		if bytes.Contains(srcs[name], []byte("//go:build")) {
			return nil, "", fmt.Errorf("%s already has a build constraint: this version of %s needs a new look", name, goApp)
		}
		f, err := parser.ParseFile(fset, name, srcs[name], parser.ParseComments)
		if err != nil {
			return nil, "", err
		}
		pkgName = f.Name.Name
		imports := map[string]string{} // local name → path
		for _, im := range f.Imports {
			p, _ := strconv.Unquote(im.Path.Value)
			local := p[strings.LastIndex(p, "/")+1:]
			if im.Name != nil {
				local = im.Name.Name
			}
			imports[local] = p
		}
		for _, d := range f.Decls {
			if g, ok := d.(*ast.GenDecl); ok && g.Tok == token.IMPORT {
				continue
			}
			units = append(units, newUnit(name, d, imports))
		}
	}
	return units, pkgName, nil
}

// markServer returns the units that reach the import path server, by the
// rules written on split, repeated until nothing more is marked.
func markServer(units []*unit, server string) map[*unit]bool {
	serverSide := map[*unit]bool{}
	serverNames := map[string]bool{}
	for changed := true; changed; {
		changed = false
		for _, u := range units {
			if serverSide[u] || !u.reaches(server, serverNames) {
				continue
			}
			serverSide[u], changed = true, true
			for _, n := range u.names {
				serverNames[n] = true
			}
			if u.recv != "" {
				serverNames[u.recv] = true
				serverNames["."+u.method] = true
			}
		}
	}
	return serverSide
}

// reaches says whether u uses the import path server or a name already
// marked (a method name as ".m").
func (u *unit) reaches(server string, serverNames map[string]bool) bool {
	if u.pkgs[server] || serverNames[u.recv] {
		return true
	}
	for n := range u.uses {
		// (A method is matched by its name alone: x.m for any x.)
		if serverNames[n] || serverNames["."+n] {
			return true
		}
	}
	for _, n := range u.names {
		if serverNames[n] { // a type with a server method
			return true
		}
	}
	return false
}

// exportedTypes are the exported type names a type declaration declares.
func exportedTypes(u *unit) []string {
	var out []string
	if g, ok := u.decl.(*ast.GenDecl); ok && g.Tok == token.TYPE {
		for _, n := range u.names {
			if ast.IsExported(n) {
				out = append(out, n)
			}
		}
	}
	return out
}

// render writes the generated file: the constraint, its header, the
// imports used, the kept declarations and an empty struct per stub.
func render(names []string, server, pkgName string, used map[string]bool, body []byte, stubs []string) ([]byte, error) {
	var b bytes.Buffer
	b.WriteString("//go:build wasm\n\n")
	b.WriteString("// Code generated by testdata/wasmdeps from " + strings.Join(names, " and ") + "; DO NOT EDIT.\n")
	b.WriteString("// The declarations of those files that the browser build keeps: the others\n")
	b.WriteString("// reach " + server + " and are left to the native build.\n\n")
	b.WriteString("package " + pkgName + "\n\n")
	paths := make([]string, 0, len(used))
	for p := range used {
		paths = append(paths, p)
	}
	sort.Strings(paths)
	if len(paths) > 0 {
		b.WriteString("import (\n")
		for _, p := range paths {
			b.WriteString("\t" + strconv.Quote(p) + "\n")
		}
		b.WriteString(")\n\n")
	}
	b.Write(body)
	sort.Strings(stubs)
	for _, n := range stubs {
		fmt.Fprintf(&b, "// %s has no server in the browser build; it is here for the signatures\n// of the package's browser stubs, which panic.\ntype %s struct{}\n\n", n, n)
	}
	return format.Source(b.Bytes())
}

func newUnit(file string, d ast.Decl, imports map[string]string) *unit {
	u := &unit{file: file, decl: d, uses: map[string]bool{}, pkgs: map[string]bool{}}
	switch d := d.(type) {
	case *ast.FuncDecl:
		if d.Recv == nil {
			u.names = []string{d.Name.Name}
		} else if len(d.Recv.List) > 0 {
			u.recv, u.method = recvName(d.Recv.List[0].Type), d.Name.Name
		}
	case *ast.GenDecl:
		for _, s := range d.Specs {
			switch s := s.(type) {
			case *ast.TypeSpec:
				u.names = append(u.names, s.Name.Name)
			case *ast.ValueSpec:
				for _, n := range s.Names {
					u.names = append(u.names, n.Name)
				}
			}
		}
	}
	var inspect func(ast.Node) bool
	inspect = func(n ast.Node) bool {
		switch n := n.(type) {
		case *ast.SelectorExpr:
			if x, ok := n.X.(*ast.Ident); ok {
				if p, ok := imports[x.Name]; ok {
					u.pkgs[p] = true
				}
			}
		case *ast.Field:
			// A field's or interface method's own name uses nothing.
			ast.Inspect(n.Type, inspect)
			return false
		case *ast.Ident:
			u.uses[n.Name] = true
		}
		return true
	}
	ast.Inspect(d, inspect)
	return u
}

// recvName is the type name of a method's receiver (T, *T, T[P]).
func recvName(e ast.Expr) string {
	for {
		switch t := e.(type) {
		case *ast.StarExpr:
			e = t.X
		case *ast.IndexExpr:
			e = t.X
		case *ast.IndexListExpr:
			e = t.X
		case *ast.Ident:
			return t.Name
		default:
			return ""
		}
	}
}

func docOf(d ast.Decl) *ast.CommentGroup {
	switch d := d.(type) {
	case *ast.FuncDecl:
		return d.Doc
	case *ast.GenDecl:
		return d.Doc
	}
	return nil
}
