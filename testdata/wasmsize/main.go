// Command wasmsize prints what each Go package costs in a WebAssembly
// build: the bytes of function bodies (the code section) per package, read
// from the module's name section, and the size of the data section.
//
//	GOOS=js GOARCH=wasm go build -trimpath -o /tmp/app.wasm ./wasm   # not stripped: names kept
//	go run ./testdata/wasmsize [-top N] [-funcs] /tmp/app.wasm
//
// `make wasm-size` does both. The stripped web/app.wasm has no name
// section, so its functions cannot be named; the sizes per package are the
// same in both builds (-s -w drops only the names and the DWARF sections).
// The layout read is the WebAssembly binary format (W3C WebAssembly Core
// Specification, sections 5.5 "Modules" and 7.4.3 "Name section").
package main

import (
	"encoding/binary"
	"errors"
	"flag"
	"fmt"
	"os"
	"sort"
	"strings"
)

func main() {
	top := flag.Int("top", 40, "how many packages (or functions) to list")
	funcs := flag.Bool("funcs", false, "list the largest functions instead of packages")
	flag.Parse()
	if flag.NArg() != 1 {
		fmt.Fprintln(os.Stderr, "usage: wasmsize [-top N] [-funcs] FILE.wasm")
		os.Exit(2)
	}
	b, err := os.ReadFile(flag.Arg(0))
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	m, err := read(b)
	if err != nil {
		fmt.Fprintf(os.Stderr, "%s: %v\n", flag.Arg(0), err)
		os.Exit(1)
	}
	code := 0
	for _, s := range m.code {
		code += s
	}
	fmt.Printf("file %d bytes: code %d, data %d, other %d\n", len(b), code, m.data, len(b)-code-m.data)
	type entry struct {
		name string
		size int
	}
	var list []entry
	if *funcs {
		for i, s := range m.code {
			list = append(list, entry{m.name(i), s})
		}
	} else {
		per := map[string]int{}
		for i, s := range m.code {
			per[pkgOf(m.name(i))] += s
		}
		for p, s := range per {
			list = append(list, entry{p, s})
		}
	}
	sort.Slice(list, func(a, b int) bool { return list[a].size > list[b].size })
	for _, e := range list[:min(*top, len(list))] {
		fmt.Printf("%9d  %5.1f %%  %s\n", e.size, 100*float64(e.size)/float64(code), e.name)
	}
}

// module is what wasmsize reads of a WebAssembly module.
type module struct {
	imports int            // imported functions: they come first in the function index space
	code    []int          // body size of each defined function
	names   map[int]string // function index → name
	data    int            // bytes of the data section
}

func (m *module) name(defined int) string {
	if n, ok := m.names[defined+m.imports]; ok {
		return n
	}
	return fmt.Sprintf("function %d", defined+m.imports)
}

// pkgOf is the package of a Go function name as the wasm linker writes it
// ("pairline_app_ui.__Shell_.render" → "pairline_app_ui",
// "github.com_maxence_charriere_go_app_v10_pkg_app.nodeManager.x" →
// "github.com_maxence_charriere_go_app_v10_pkg_app"): the text before the
// first dot, where a dot inside a module's domain (a first element without
// "_" followed by a short lowercase word and "_", as in "gonum.org_v1")
// does not count.
func pkgOf(name string) string {
	d := strings.IndexByte(name, '.')
	if d < 0 {
		return name
	}
	rest := name[d+1:]
	if !strings.Contains(name[:d], "_") {
		if u, e := strings.IndexByte(rest, '_'), strings.IndexByte(rest, '.'); u > 0 && u <= 6 && (e < 0 || u < e) && lower(rest[:u]) {
			if e < 0 {
				return name
			}
			return name[:d+1+e]
		}
	}
	return name[:d]
}

func lower(s string) bool {
	for _, r := range s {
		if r < 'a' || r > 'z' {
			return false
		}
	}
	return true
}

var errShort = errors.New("the file ends inside a section: not a complete WebAssembly module")

type reader struct {
	b   []byte
	i   int
	err error
}

func (r *reader) uleb() int {
	if r.err != nil {
		return 0
	}
	v, n := binary.Uvarint(r.b[min(r.i, len(r.b)):])
	if n <= 0 || v > uint64(len(r.b)) {
		r.err = errShort
		return 0
	}
	r.i += n
	return int(v)
}

func (r *reader) bytes(n int) []byte {
	if r.err != nil || r.i+n > len(r.b) || n < 0 {
		r.err = errShort
		return nil
	}
	s := r.b[r.i : r.i+n]
	r.i += n
	return s
}

func (r *reader) byte1() byte {
	if s := r.bytes(1); s != nil {
		return s[0]
	}
	return 0
}

func read(b []byte) (*module, error) {
	if len(b) < 8 || string(b[:4]) != "\x00asm" {
		return nil, errors.New("not a WebAssembly module")
	}
	m := &module{names: map[int]string{}}
	r := &reader{b: b, i: 8}
	for r.i < len(b) && r.err == nil {
		id := r.byte1()
		sec := &reader{b: r.bytes(r.uleb())}
		switch id {
		case 2:
			m.imports = countFuncImports(sec)
		case 10:
			for n := sec.uleb(); n > 0 && sec.err == nil; n-- {
				size := sec.uleb()
				sec.bytes(size)
				m.code = append(m.code, size)
			}
		case 11:
			m.data = len(sec.b)
		case 0:
			if string(sec.bytes(sec.uleb())) == "name" {
				readNames(sec, m.names)
			}
		}
		if sec.err != nil {
			return nil, sec.err
		}
	}
	return m, r.err
}

func countFuncImports(sec *reader) int {
	funcs := 0
	for n := sec.uleb(); n > 0 && sec.err == nil; n-- {
		sec.bytes(sec.uleb()) // module
		sec.bytes(sec.uleb()) // name
		switch sec.byte1() {
		case 0: // function: type index
			sec.uleb()
			funcs++
		case 1: // table: element type, limits
			sec.byte1()
			limits(sec)
		case 2: // memory: limits
			limits(sec)
		case 3: // global: value type, mutability
			sec.bytes(2)
		}
	}
	return funcs
}

func limits(sec *reader) {
	flags := sec.byte1()
	sec.uleb()
	if flags&1 == 1 {
		sec.uleb()
	}
}

func readNames(sec *reader, names map[int]string) {
	for sec.i < len(sec.b) && sec.err == nil {
		kind := sec.byte1()
		sub := &reader{b: sec.bytes(sec.uleb())}
		if kind != 1 { // function names
			continue
		}
		for n := sub.uleb(); n > 0 && sub.err == nil; n-- {
			idx := sub.uleb()
			names[idx] = string(sub.bytes(sub.uleb()))
		}
	}
}
