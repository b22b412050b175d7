package session

import (
	"bytes"
	"reflect"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/vmihailenco/msgpack/v5"
)

// TestCodecKeysMatchJSON proves that the hand-written encoder and the JSON
// tags agree key for key, and that every map length the encoder writes
// (mapLen) equals the entries it writes: the body is read back by the
// msgpack library's generic decoder, which must end exactly at the
// checksum (a length one too high or too low leaves bytes over or runs
// short), and every map's keys must be the JSON keys of the struct it
// encodes. The decoder reading each key back is TestRoundTrip's part.
func TestCodecKeysMatchJSON(t *testing.T) {
	ss := sampleSessions(t)
	b, err := EncodeBytes(ss)
	if err != nil {
		t.Fatal(err)
	}
	body := b[headerSize : len(b)-checksumSize]
	r := bytes.NewReader(body)
	var v any
	if err := msgpack.NewDecoder(r).Decode(&v); err != nil {
		t.Fatalf("the body does not read as msgpack: %v", err)
	}
	if r.Len() != 0 {
		t.Fatalf("%d bytes of the body are left after its value: a map length is lower than what was written", r.Len())
	}
	top, _ := v.(map[string]any)
	list, _ := top["sessions"].([]any)
	if len(list) != len(ss) {
		t.Fatalf("%d sessions read, %d written", len(list), len(ss))
	}
	for i, m := range list {
		compareKeys(t, "sessions["+string(rune('0'+i))+"]", reflect.ValueOf(ss[i]).Elem(), m)
	}
}

// jsonFields maps the JSON keys of a struct type to the index paths of
// their fields, the fields of an embedded struct without a tag among them
// (encoding/json promotes them into the enclosing object).
func jsonFields(tp reflect.Type) map[string][]int {
	out := map[string][]int{}
	for i := 0; i < tp.NumField(); i++ {
		f := tp.Field(i)
		tag := f.Tag.Get("json")
		if f.Anonymous && tag == "" && f.Type.Kind() == reflect.Struct {
			for k, idx := range jsonFields(f.Type) {
				out[k] = append([]int{i}, idx...)
			}
			continue
		}
		name := strings.Split(tag, ",")[0]
		if name != "" && name != "-" && f.IsExported() {
			out[name] = []int{i}
		}
	}
	return out
}

func compareKeys(t *testing.T, path string, sv reflect.Value, got any) {
	t.Helper()
	for sv.Kind() == reflect.Pointer {
		if sv.IsNil() {
			return
		}
		sv = sv.Elem()
	}
	switch sv.Kind() {
	case reflect.Struct:
		if sv.Type() == reflect.TypeOf(time.Time{}) {
			return
		}
		m, ok := got.(map[string]any)
		if !ok {
			t.Errorf("%s: written as %T, want a map", path, got)
			return
		}
		fields := jsonFields(sv.Type())
		var missing, extra []string
		for k := range fields {
			if _, ok := m[k]; !ok {
				missing = append(missing, k)
			}
		}
		for k := range m {
			if _, ok := fields[k]; !ok {
				extra = append(extra, k)
			}
		}
		sort.Strings(missing)
		sort.Strings(extra)
		if len(missing)+len(extra) > 0 {
			t.Errorf("%s (%s): JSON keys not written %v, written keys without a JSON tag %v", path, sv.Type(), missing, extra)
		}
		for k, i := range fields {
			if g, ok := m[k]; ok && g != nil {
				compareKeys(t, path+"."+k, sv.FieldByIndex(i), g)
			}
		}
	case reflect.Slice:
		a, ok := got.([]any)
		if !ok || sv.Type().Elem().Kind() == reflect.Uint8 {
			return
		}
		for i := 0; i < sv.Len() && i < len(a); i++ {
			compareKeys(t, path+"[]", sv.Index(i), a[i])
		}
	}
}
