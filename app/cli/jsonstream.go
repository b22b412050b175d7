package cli

import (
	"bufio"
	"bytes"
	"encoding"
	"encoding/json"
	"reflect"
	"slices"
	"strings"
	"sync"
)

// streamThreshold is the length from which a slice is written element by
// element instead of being marshalled in one piece. Below it a value costs at
// most a few hundred kB to marshal; above it (the readings, residuals and
// leverages of a big session) marshalling in one piece is what made
// `inspect --json` of a 64 MiB file take more than a GB.
const streamThreshold = 512

// jsonStream writes v as json.MarshalIndent(v, prefix, indent) followed by
// jsonText would, without building the whole text in memory: objects and
// long slices are written member by member, and only their small members
// are marshalled (by encoding/json itself, so numbers, strings, times and
// the escaping are exactly encoding/json's). Its peak memory is that of the
// largest small member, not of the output; TestJSONStreamMatchesMarshal
// compares the bytes with MarshalIndent's on real inspection output.
//
// Structs are walked by encoding/json's rules (jsonFieldsOf): exported
// fields, the name from the json tag, "-", omitempty and omitzero, embedded
// structs promoted. A map or a type with its own marshalling method is
// marshalled in one piece, which is always correct.
type jsonStream struct {
	w      *bufio.Writer
	indent string
	err    error
	buf    bytes.Buffer
	fast   fastJSON
}

func writeJSONIndented(w *bufio.Writer, v any, prefix, indent string) error {
	js := &jsonStream{w: w, indent: indent}
	js.value(reflect.ValueOf(v), prefix)
	return js.err
}

var (
	jsonMarshalerType = reflect.TypeFor[json.Marshaler]()
	textMarshalerType = reflect.TypeFor[encoding.TextMarshaler]()
)

// value writes v; at is the prefix of the line v starts on (its depth).
func (js *jsonStream) value(v reflect.Value, at string) {
	if js.err != nil {
		return
	}
	if !v.IsValid() {
		js.write("null")
		return
	}
	if !js.walks(v) {
		js.whole(v, at)
		return
	}
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			js.write("null")
			return
		}
		js.value(v.Elem(), at)
	case reflect.Slice:
		js.slice(v, at)
	case reflect.Struct:
		js.object(v, at)
	}
}

// walks says whether v is written member by member: a struct without
// embedded fields, a pointer or interface to one, or a long slice, and
// never a type that marshals itself.
func (js *jsonStream) walks(v reflect.Value) bool {
	t := v.Type()
	if marshalsItself(t) {
		return false
	}
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		return v.IsNil() || js.walks(v.Elem())
	case reflect.Slice:
		return v.Len() >= streamThreshold && t.Elem().Kind() != reflect.Uint8
	case reflect.Struct:
		return holdsLong(v, 8)
	}
	return false
}

// holdsLong says whether v holds, through struct fields and pointers (up
// to depth levels down, not inside slice elements), a slice long enough to
// be written element by element. A struct that holds none (a reading, a
// check) is marshalled in one piece: walking it field by field would only
// cost time.
func holdsLong(v reflect.Value, depth int) bool {
	if depth == 0 {
		return false
	}
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		return !v.IsNil() && holdsLong(v.Elem(), depth-1)
	case reflect.Slice:
		return v.Len() >= streamThreshold
	case reflect.Struct:
		t := v.Type()
		for i := 0; i < t.NumField(); i++ {
			if t.Field(i).IsExported() && holdsLong(v.Field(i), depth-1) {
				return true
			}
		}
	}
	return false
}

// whole marshals v in one piece and indents it to its depth.
func (js *jsonStream) whole(v reflect.Value, at string) {
	b, err := json.Marshal(v.Interface())
	if err != nil {
		js.err = err
		return
	}
	js.buf.Reset()
	if err := json.Indent(&js.buf, b, at, js.indent); err != nil {
		js.err = err
		return
	}
	js.writeBytes(jsonText(js.buf.Bytes()))
}

func (js *jsonStream) slice(v reflect.Value, at string) {
	if v.IsNil() {
		js.write("null")
		return
	}
	inner := at + js.indent
	js.write("[")
	// Elements of a flat type, or of one fastJSON writes (whose slices, such
	// as an influence row's reasons, are short), are written in chunks
	// without asking each whether it holds a long slice.
	flat := flatType(v.Type().Elem()) || fastType(v.Type().Elem())
	for i := 0; i < v.Len() && js.err == nil; {
		if i > 0 {
			js.write(",")
		}
		if !flat && js.walks(v.Index(i)) {
			js.write("\n" + inner)
			js.value(v.Index(i), inner)
			i++
			continue
		}
		// A run of elements marshalled in one piece.
		j := i + 1
		for j < v.Len() && j-i < chunkLen && (flat || !js.walks(v.Index(j))) {
			j++
		}
		js.chunk(v.Slice(i, j), at)
		i = j
	}
	js.write("\n" + at + "]")
}

// chunkLen is the most elements of a slice marshalled at once.
const chunkLen = 1024

// chunk writes the elements of v (a part of a slice, none of them walked):
// v is marshalled as a slice, indented to the depth of the elements and
// written without its brackets, which gives the bytes MarshalIndent gives
// for those elements of the whole slice.
func (js *jsonStream) chunk(v reflect.Value, at string) {
	if fastType(v.Type().Elem()) {
		f := &js.fast
		if len(f.levels) == 0 || f.levels[0] != at || f.indent != js.indent {
			f.indent, f.levels = js.indent, append(f.levels[:0], at)
		}
		f.b = f.b[:0]
		if f.elements(v) {
			js.writeBytes(jsonText(f.b))
			return
		}
	}
	inner := at + js.indent
	b, err := json.Marshal(v.Interface())
	if err != nil {
		js.err = err
		return
	}
	if isNumberKind(v.Type().Elem().Kind()) {
		// "[1,2.5,3]": numbers hold no commas, so the elements are the
		// text between them.
		b = b[1 : len(b)-1]
		js.write("\n" + inner)
		sep := []byte(",\n" + inner)
		for len(b) > 0 && js.err == nil {
			k := bytes.IndexByte(b, ',')
			if k < 0 {
				js.writeBytes(b)
				break
			}
			js.writeBytes(b[:k])
			js.writeBytes(sep)
			b = b[k+1:]
		}
		return
	}
	js.buf.Reset()
	if err := json.Indent(&js.buf, b, at, js.indent); err != nil {
		js.err = err
		return
	}
	// "[\n" + inner + elements + "\n" + at + "]"
	out := js.buf.Bytes()
	js.writeBytes(jsonText(out[1 : len(out)-len(at)-2]))
}

func isNumberKind(k reflect.Kind) bool {
	switch k {
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Uintptr, reflect.Float32, reflect.Float64:
		return true
	}
	return false
}

// ownMarshal caches marshalsItself.
var ownMarshal sync.Map

// marshalsItself says whether t or *t has a MarshalJSON or MarshalText
// method (time.Time has both).
func marshalsItself(t reflect.Type) bool {
	if f, ok := ownMarshal.Load(t); ok {
		return f.(bool)
	}
	p := reflect.PointerTo(t)
	f := t.Implements(jsonMarshalerType) || t.Implements(textMarshalerType) ||
		p.Implements(jsonMarshalerType) || p.Implements(textMarshalerType)
	ownMarshal.Store(t, f)
	return f
}

// flatTypes caches flatType.
var flatTypes sync.Map

// flatType says whether no value of type t can hold a long slice, so that
// a slice of t is marshalled in chunks: a number, string or bool, a type
// that marshals itself, or a struct or array of flat types. Pointers,
// interfaces, slices and maps are not flat.
func flatType(t reflect.Type) bool {
	if f, ok := flatTypes.Load(t); ok {
		return f.(bool)
	}
	f := flatTypeOf(t, 8)
	flatTypes.Store(t, f)
	return f
}

func flatTypeOf(t reflect.Type, depth int) bool {
	if depth == 0 {
		return false
	}
	if t.Implements(jsonMarshalerType) || t.Implements(textMarshalerType) {
		return t.Kind() != reflect.Pointer && t.Kind() != reflect.Interface
	}
	switch t.Kind() {
	case reflect.Bool, reflect.String, reflect.Float32, reflect.Float64,
		reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		return true
	case reflect.Array:
		return flatTypeOf(t.Elem(), depth-1)
	case reflect.Struct:
		for i := 0; i < t.NumField(); i++ {
			if f := t.Field(i); f.IsExported() && !flatTypeOf(f.Type, depth-1) {
				return false
			}
		}
		return true
	}
	return false
}

func (js *jsonStream) object(v reflect.Value, at string) {
	inner := at + js.indent
	n := 0
	for _, f := range jsonFieldsOf(v.Type()) {
		fv, err := v.FieldByIndexErr(f.index)
		if err != nil {
			continue // inside a nil embedded pointer: encoding/json skips it
		}
		if f.omitEmpty && emptyJSON(fv) || f.omitZero && fv.IsZero() {
			continue
		}
		if n == 0 {
			js.write("{")
		} else {
			js.write(",")
		}
		n++
		js.write("\n" + inner)
		js.writeBytes(f.key)
		js.write(": ")
		js.value(fv, inner)
	}
	if n == 0 {
		js.write("{}")
		return
	}
	js.write("\n" + at + "}")
}

// jsonField is one member encoding/json writes for a struct type.
type jsonField struct {
	name                string
	key                 []byte // the name as JSON, escaped
	index               []int
	tagged              bool
	omitEmpty, omitZero bool
	quoted              bool // the ",string" option, which fastJSON does not take
}

// fieldLists caches jsonFieldsOf.
var fieldLists sync.Map

// jsonFieldsOf lists the members encoding/json writes for struct type t, in
// its order, by its rules: exported fields, names from the json tag, "-"
// skipped, the fields of embedded structs without a tag name promoted, and
// of fields with the same name the shallowest wins, a tagged one before an
// untagged one at the same depth, and neither when that does not decide.
// The stages: every candidate field, depth by depth (jsonCandidates), the
// dominant one of each name (jsonDominant), then the struct's order.
func jsonFieldsOf(t reflect.Type) []jsonField {
	if f, ok := fieldLists.Load(t); ok {
		return f.([]jsonField)
	}
	out := jsonDominant(jsonCandidates(t))
	// In the order of the fields in the struct, embedded ones at the place
	// of their embedding.
	slices.SortStableFunc(out, func(a, b jsonField) int { return slices.Compare(a.index, b.index) })
	fieldLists.Store(t, out)
	return out
}

// jsonLevel is one struct type met in jsonCandidates, at its index path.
type jsonLevel struct {
	t     reflect.Type
	index []int
}

// jsonCandidates lists every field of t that encoding/json could write,
// breadth first: the fields of t, then those of the structs it embeds
// without a tag name, and so on, each struct type looked at once.
func jsonCandidates(t reflect.Type) []jsonField {
	var all []jsonField
	visited := map[reflect.Type]bool{}
	for current := []jsonLevel{{t: t}}; len(current) > 0; {
		var next []jsonLevel
		for _, l := range current {
			if visited[l.t] {
				continue
			}
			visited[l.t] = true
			for i := 0; i < l.t.NumField(); i++ {
				f, embed, ok := jsonCandidate(l.t.Field(i), append(append([]int(nil), l.index...), i))
				switch {
				case embed != nil:
					next = append(next, jsonLevel{t: embed, index: f.index})
				case ok:
					all = append(all, f)
				}
			}
		}
		current = next
	}
	return all
}

// jsonCandidate is struct field sf at index path index as encoding/json
// sees it: a member f (ok), a struct whose fields are promoted (embed), or
// neither (unexported, or tagged "-").
func jsonCandidate(sf reflect.StructField, index []int) (f jsonField, embed reflect.Type, ok bool) {
	ft := sf.Type
	if sf.Anonymous {
		if ft.Kind() == reflect.Pointer {
			ft = ft.Elem()
		}
		if !sf.IsExported() && ft.Kind() != reflect.Struct {
			return f, nil, false
		}
	} else if !sf.IsExported() {
		return f, nil, false
	}
	tag := sf.Tag.Get("json")
	if tag == "-" {
		return f, nil, false
	}
	name, opts, _ := strings.Cut(tag, ",")
	if name == "" && sf.Anonymous && ft.Kind() == reflect.Struct {
		return jsonField{index: index}, ft, false
	}
	f = jsonField{name: name, index: index, tagged: name != "",
		omitEmpty: hasOption(opts, "omitempty"), omitZero: hasOption(opts, "omitzero"), quoted: hasOption(opts, "string")}
	if f.name == "" {
		f.name = sf.Name
	}
	return f, nil, true
}

// jsonDominant keeps, of the fields sharing a name, the dominant one
// (encoding/json's rule) with its key written as JSON; the others are
// dropped, and all of them when none dominates.
func jsonDominant(all []jsonField) []jsonField {
	byName := map[string][]jsonField{}
	for _, f := range all {
		byName[f.name] = append(byName[f.name], f)
	}
	var out []jsonField
	for _, f := range all {
		best, ambiguous := jsonBest(byName[f.name])
		if ambiguous || !slices.Equal(best.index, f.index) {
			continue
		}
		key, _ := json.Marshal(f.name)
		f.key = jsonText(key)
		out = append(out, f)
	}
	return out
}

// jsonBest is the dominant field of a group sharing one name: the
// shallowest, a tagged one before an untagged one at the same depth;
// ambiguous when that does not decide.
func jsonBest(group []jsonField) (best jsonField, ambiguous bool) {
	best = group[0]
	for _, g := range group[1:] {
		switch {
		case len(g.index) < len(best.index) || len(g.index) == len(best.index) && g.tagged && !best.tagged:
			best, ambiguous = g, false
		case len(g.index) == len(best.index) && g.tagged == best.tagged:
			ambiguous = true
		}
	}
	return best, ambiguous
}

func hasOption(opts, name string) bool {
	for opts != "" {
		var o string
		o, opts, _ = strings.Cut(opts, ",")
		if o == name {
			return true
		}
	}
	return false
}

// emptyJSON is encoding/json's test for omitempty.
func emptyJSON(v reflect.Value) bool {
	switch v.Kind() {
	case reflect.Array, reflect.Map, reflect.Slice, reflect.String:
		return v.Len() == 0
	case reflect.Bool:
		return !v.Bool()
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		return v.Int() == 0
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Uintptr:
		return v.Uint() == 0
	case reflect.Float32, reflect.Float64:
		return v.Float() == 0
	case reflect.Interface, reflect.Pointer:
		return v.IsNil()
	}
	return false
}

func (js *jsonStream) write(s string) {
	if js.err == nil {
		_, js.err = js.w.WriteString(s)
	}
}

func (js *jsonStream) writeBytes(b []byte) {
	if js.err == nil {
		_, js.err = js.w.Write(b)
	}
}
