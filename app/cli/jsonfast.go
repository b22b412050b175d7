package cli

import (
	"encoding/json"
	"math"
	"reflect"
	"strconv"
	"strings"
	"sync"
)

// fastJSON writes the elements of a chunk of a long slice (the influence of
// every reading, residuals, fitted values) directly in the indented form,
// instead of json.Marshal followed by json.Indent, which for the report of
// a million readings took most of the time of `pairline fit --json`. It
// takes only types whose encoding is plain (fastType): booleans, integers,
// float64, strings, and pointers, slices and structs of them; each value is
// encoding/json's own text (floats by its rule, strings by json.Marshal
// where they need escaping), so the bytes are those of the other path,
// which TestJSONStreamMatchesMarshal, FuzzJSONStream and FuzzJSONFloat
// check against json.MarshalIndent. A value it cannot write exactly (NaN
// or infinity, which encoding/json refuses) sends the chunk back to the
// other path, which reports the error.
type fastJSON struct {
	b      []byte
	indent string
	levels []string // levels[k]: the prefix of depth k below the chunk's slice
}

// level is the line prefix k levels below the slice.
func (f *fastJSON) level(k int) string {
	for len(f.levels) <= k {
		f.levels = append(f.levels, f.levels[0]+strings.Repeat(f.indent, len(f.levels)))
	}
	return f.levels[k]
}

// elements appends "\n" + prefix + element, joined by ",", for each
// element of v, as chunk writes them.
func (f *fastJSON) elements(v reflect.Value) bool {
	for i := 0; i < v.Len(); i++ {
		if i > 0 {
			f.b = append(f.b, ',')
		}
		f.b = append(f.b, '\n')
		f.b = append(f.b, f.level(1)...)
		if !f.value(v.Index(i), 1) {
			return false
		}
	}
	return true
}

// value appends v, whose first line is at depth k.
func (f *fastJSON) value(v reflect.Value, k int) bool {
	switch v.Kind() {
	case reflect.Bool:
		f.b = strconv.AppendBool(f.b, v.Bool())
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		f.b = strconv.AppendInt(f.b, v.Int(), 10)
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		f.b = strconv.AppendUint(f.b, v.Uint(), 10)
	case reflect.Float64:
		var ok bool
		if f.b, ok = appendJSONFloat(f.b, v.Float()); !ok {
			return false
		}
	case reflect.String:
		f.b = appendJSONString(f.b, v.String())
	case reflect.Pointer:
		if v.IsNil() {
			f.b = append(f.b, "null"...)
			return true
		}
		return f.value(v.Elem(), k)
	case reflect.Slice:
		return f.slice(v, k)
	case reflect.Struct:
		return f.object(v, k)
	default:
		return false
	}
	return true
}

func (f *fastJSON) slice(v reflect.Value, k int) bool {
	switch {
	case v.IsNil():
		f.b = append(f.b, "null"...)
		return true
	case v.Len() == 0:
		f.b = append(f.b, "[]"...)
		return true
	}
	f.b = append(f.b, '[')
	for i := 0; i < v.Len(); i++ {
		if i > 0 {
			f.b = append(f.b, ',')
		}
		f.b = append(f.b, '\n')
		f.b = append(f.b, f.level(k+1)...)
		if !f.value(v.Index(i), k+1) {
			return false
		}
	}
	f.b = append(f.b, '\n')
	f.b = append(f.b, f.level(k)...)
	f.b = append(f.b, ']')
	return true
}

// object is jsonStream.object in the buffer.
func (f *fastJSON) object(v reflect.Value, k int) bool {
	n := 0
	for _, fl := range jsonFieldsOf(v.Type()) {
		fv := v.FieldByIndex(fl.index) // fastType: no embedded fields
		if fl.omitEmpty && emptyJSON(fv) || fl.omitZero && fv.IsZero() {
			continue
		}
		if n == 0 {
			f.b = append(f.b, '{')
		} else {
			f.b = append(f.b, ',')
		}
		n++
		f.b = append(f.b, '\n')
		f.b = append(f.b, f.level(k+1)...)
		f.b = append(f.b, fl.key...)
		f.b = append(f.b, ": "...)
		if !f.value(fv, k+1) {
			return false
		}
	}
	if n == 0 {
		f.b = append(f.b, "{}"...)
		return true
	}
	f.b = append(f.b, '\n')
	f.b = append(f.b, f.level(k)...)
	f.b = append(f.b, '}')
	return true
}

// appendJSONFloat appends f as encoding/json writes a float64: the
// shortest decimal that reads back as f, in 'f' form, or 'e' form below
// 1e-6 and from 1e21 on, with an exponent of one digit not padded
// ("1e-7", not "1e-07"). ok is false for NaN and infinities.
func appendJSONFloat(b []byte, f float64) ([]byte, bool) {
	if math.IsInf(f, 0) || math.IsNaN(f) {
		return b, false
	}
	form := byte('f')
	if abs := math.Abs(f); abs != 0 && (abs < 1e-6 || abs >= 1e21) {
		form = 'e'
	}
	b = strconv.AppendFloat(b, f, form, -1, 64)
	if n := len(b); form == 'e' && n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
		b[n-2] = b[n-1]
		b = b[:n-1]
	}
	return b, true
}

// appendJSONString appends s quoted: directly when every byte is printable
// ASCII that encoding/json leaves as it is (not '"', '\\', '<', '>', '&'),
// else as json.Marshal writes it.
func appendJSONString(b []byte, s string) []byte {
	for i := 0; i < len(s); i++ {
		if c := s[i]; c < 0x20 || c >= 0x7f || c == '"' || c == '\\' || c == '<' || c == '>' || c == '&' {
			q, _ := json.Marshal(s) // a string always marshals
			return append(b, q...)
		}
	}
	b = append(b, '"')
	b = append(b, s...)
	return append(b, '"')
}

// fastTypes caches fastType.
var fastTypes sync.Map

// fastType says whether fastJSON writes values of type t: a boolean,
// integer, float64 or string, or a pointer, slice (not of bytes) or struct
// (without embedded fields or ",string" options) of such types, none of
// which marshals itself.
func fastType(t reflect.Type) bool {
	if f, ok := fastTypes.Load(t); ok {
		return f.(bool)
	}
	f := fastTypeOf(t, 8)
	fastTypes.Store(t, f)
	return f
}

func fastTypeOf(t reflect.Type, depth int) bool {
	if depth == 0 || marshalsItself(t) {
		return false
	}
	switch t.Kind() {
	case reflect.Bool, reflect.String, reflect.Float64,
		reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		return true
	case reflect.Pointer:
		return fastTypeOf(t.Elem(), depth-1)
	case reflect.Slice:
		return t.Elem().Kind() != reflect.Uint8 && fastTypeOf(t.Elem(), depth-1)
	case reflect.Struct:
		for i := 0; i < t.NumField(); i++ {
			if t.Field(i).Anonymous {
				return false
			}
		}
		for _, fl := range jsonFieldsOf(t) {
			if fl.quoted || !fastTypeOf(t.FieldByIndex(fl.index).Type, depth-1) {
				return false
			}
		}
		return true
	}
	return false
}
