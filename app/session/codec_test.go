package session

import (
	"bytes"
	"crypto/sha256"
	"encoding/binary"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"reflect"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/vmihailenco/msgpack/v5"
)

func encodeT(t testing.TB, ss []*Session) []byte {
	t.Helper()
	var buf bytes.Buffer
	if err := Encode(&buf, ss); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func TestRoundTrip(t *testing.T) {
	ss := sampleSessions(t)
	f, err := Decode(bytes.NewReader(encodeT(t, ss)))
	if err != nil {
		t.Fatal(err)
	}
	if f.Major != FormatMajor || f.Minor != FormatMinor || len(f.Warnings) != 0 {
		t.Errorf("version %d.%d, warnings %q", f.Major, f.Minor, f.Warnings)
	}
	if !reflect.DeepEqual(f.Sessions, ss) {
		a, _ := json.Marshal(ss)
		b, _ := json.Marshal(f.Sessions)
		t.Errorf("round trip changed the sessions:\n%s\n%s", a, b)
	}
	sum := sha256.Sum256(encodeT(t, ss)[:len(encodeT(t, ss))-32])
	if f.Checksum != fmt.Sprintf("%x", sum) {
		t.Errorf("File.Checksum = %s, want %x", f.Checksum, sum)
	}
}

func readSample(t testing.TB) []byte {
	t.Helper()
	b, err := os.ReadFile(samplePath)
	if err != nil {
		t.Skipf("%s is missing (%v); run go test -run TestSampleFile -update", samplePath, err)
	}
	return b
}

// Every single-byte change of the sample is caught: the checksum covers the
// header and the body, and the checksum itself must match.
func TestEveryByteChangeDetected(t *testing.T) {
	orig := readSample(t)
	b := make([]byte, len(orig))
	for off := range orig {
		for _, x := range []byte{0x01, 0x80, 0xff} {
			copy(b, orig)
			b[off] ^= x
			if _, err := Decode(bytes.NewReader(b)); err == nil {
				t.Fatalf("changing byte %d (xor %#x) went unnoticed", off, x)
			} else if _, ok := err.(*FormatError); !ok {
				t.Fatalf("byte %d: error %T is not a *FormatError", off, err)
			}
		}
	}
}

func TestEveryTruncationDetected(t *testing.T) {
	orig := readSample(t)
	for n := 0; n < len(orig); n++ {
		_, err := Decode(bytes.NewReader(orig[:n]))
		if !errors.Is(err, ErrTruncated) {
			t.Fatalf("cut to %d bytes: got %v, want ErrTruncated", n, err)
		}
	}
	if _, err := Decode(bytes.NewReader(append(append([]byte{}, orig...), 0))); !errors.Is(err, ErrInvalidField) {
		t.Errorf("a byte after the checksum: got %v", err)
	}
}

// wrap frames a raw body as a session file with a correct checksum.
func wrap(major, minor uint16, body []byte) []byte {
	b := make([]byte, headerSize, headerSize+len(body)+32)
	copy(b, Magic[:])
	binary.BigEndian.PutUint16(b[8:], major)
	binary.BigEndian.PutUint16(b[10:], minor)
	binary.BigEndian.PutUint64(b[12:], uint64(len(body)))
	b = append(b, body...)
	sum := sha256.Sum256(b)
	return append(b, sum[:]...)
}

// genericSession is the sample's first session as a plain map, encoded by
// msgpack's own reflection encoder: a second writer, independent of
// encodeSession, that Decode must understand.
func genericSession() map[string]any {
	t0 := time.Date(2025, 3, 14, 8, 30, 0, 0, time.UTC)
	return map[string]any{
		"id": "0123456789abcdef0123456789abcdef", "title": "Generic (invented)",
		"created": t0, "modified": t0,
		"readings": []any{
			map[string]any{"x": "1", "y": "2", "taken": t0, "excluded": false},
			map[string]any{"x": "2", "y": "4,1", "taken": nil, "excluded": true, "exclude_reason": "spilled (invented)"},
		},
		"settings": map[string]any{"model": "ols", "level": 0.9, "slope_ref": nil},
		"history":  []any{map[string]any{"at": t0, "field": "x", "row": 0, "old": "", "new": "1"}},
	}
}

func marshalBody(t testing.TB, sessions ...map[string]any) []byte {
	t.Helper()
	list := make([]any, len(sessions))
	for i, s := range sessions {
		list[i] = s
	}
	b, err := msgpack.Marshal(map[string]any{"sessions": list})
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func TestDecodeOtherWriterAndNewerMinor(t *testing.T) {
	g := genericSession()
	g["added_in_a_later_minor"] = map[string]any{"deep": []any{1, "two", []any{3.0, nil}}}
	g["readings"].([]any)[0].(map[string]any)["colour"] = "red"
	f, err := Decode(bytes.NewReader(wrap(FormatMajor, FormatMinor+3, marshalBody(t, g))))
	if err != nil {
		t.Fatal(err)
	}
	if len(f.Warnings) != 1 || !strings.Contains(f.Warnings[0], "newer") {
		t.Errorf("warnings %q; want one about the newer minor version", f.Warnings)
	}
	s := f.Sessions[0]
	if len(s.Readings) != 2 || s.Readings[1].Y != "4,1" || !s.Readings[1].Excluded || s.Settings.Level != 0.9 ||
		!s.Readings[1].Taken.IsZero() || s.History[0].New != "1" {
		t.Errorf("decoded %+v", s)
	}
}

func TestDecodeRefuses(t *testing.T) {
	mod := func(f func(m map[string]any)) []byte {
		g := genericSession()
		f(g)
		return wrap(FormatMajor, FormatMinor, marshalBody(&testing.T{}, g))
	}
	setReading := func(k string, v any) []byte {
		return mod(func(m map[string]any) { m["readings"].([]any)[0].(map[string]any)[k] = v })
	}
	dup, _ := msgpack.Marshal(map[string]any{"sessions": []any{}})
	dupKey := append([]byte{0x82}, dup[1:]...) // the map now claims 2 entries
	s2, _ := msgpack.Marshal("sessions")
	e2, _ := msgpack.Marshal([]any{})
	dupKey = append(dupKey, append(s2, e2...)...)
	tests := []struct {
		name  string
		file  []byte
		want  error
		field string
	}{
		{"text file", []byte("x,y\n1,2\n3,4\n5,6\n7,8\n9,10\n"), ErrNotSessionFile, ""},
		{"newer major", wrap(FormatMajor+1, 0, marshalBody(t, genericSession())), ErrNewerVersion, "major version"},
		{"major zero", wrap(0, 9, marshalBody(t, genericSession())), ErrInvalidField, "major version"},
		{"no sessions", wrap(1, 0, marshalBody(t)), ErrInvalidField, "sessions"},
		{"NaN level", mod(func(m map[string]any) { m["settings"].(map[string]any)["level"] = math.NaN() }), ErrInvalidField, "sessions[0].settings.level"},
		{"level 1", mod(func(m map[string]any) { m["settings"].(map[string]any)["level"] = 1.0 }), ErrInvalidField, "sessions[0].settings.level"},
		{"unknown model", mod(func(m map[string]any) { m["settings"].(map[string]any)["model"] = "spline" }), ErrInvalidField, "sessions[0].settings.model"},
		{"bad UTF-8", setReading("x", "\xff\xfe"), ErrInvalidField, "sessions[0].readings[0].x"},
		{"long cell", setReading("x", strings.Repeat("9", MaxCellText+1)), ErrInvalidField, "sessions[0].readings[0].x"},
		{"number as text", setReading("x", 1.5), ErrInvalidField, "sessions[0].readings[0].x"},
		{"time as text", setReading("taken", "2025-01-01"), ErrInvalidField, "sessions[0].readings[0].taken"},
		{"time too old", setReading("taken", time.Date(1850, 1, 1, 0, 0, 0, 0, time.UTC)), ErrInvalidField, "sessions[0].readings[0].taken"},
		{"time too late", setReading("taken", time.Date(2300, 1, 1, 0, 0, 0, 0, time.UTC)), ErrInvalidField, "sessions[0].readings[0].taken"},
		{"no created", mod(func(m map[string]any) { delete(m, "created") }), ErrInvalidField, "sessions[0].created"},
		{"bad id", mod(func(m map[string]any) { m["id"] = "ABC" }), ErrInvalidField, "sessions[0].id"},
		{"history row", mod(func(m map[string]any) { m["history"].([]any)[0].(map[string]any)["row"] = 5 }), ErrInvalidField, "sessions[0].history[0].row"},
		{"latitude", mod(func(m map[string]any) { m["location"] = map[string]any{"lat": 91.0, "lon": 0.0} }), ErrInvalidField, "sessions[0].location.lat"},
		{"duplicate key", wrap(1, 0, dupKey), ErrInvalidField, "sessions"},
		{"deep nesting", mod(func(m map[string]any) {
			var v any = 1
			for range 40 {
				v = []any{v}
			}
			m["future"] = v
		}), ErrInvalidField, "sessions[0].future"},
		{"trailing body bytes", wrap(1, 0, append(marshalBody(t, genericSession()), 0xc0)), ErrInvalidField, ""},
		{"huge length", func() []byte {
			b := wrap(1, 0, marshalBody(t, genericSession()))
			binary.BigEndian.PutUint64(b[12:], 1<<40)
			return b
		}(), ErrTooLarge, "body length"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Decode(bytes.NewReader(tc.file))
			var fe *FormatError
			if !errors.As(err, &fe) || !errors.Is(err, tc.want) {
				t.Fatalf("got %v; want a *FormatError wrapping %v", err, tc.want)
			}
			if fe.Field != tc.field {
				t.Errorf("field %q, want %q (error: %v)", fe.Field, tc.field, err)
			}
			if fe.Offset < 0 || fe.Offset > int64(len(tc.file)) {
				t.Errorf("offset %d outside the file of %d bytes", fe.Offset, len(tc.file))
			}
		})
	}
}

// allocated reports the bytes allocated while f runs.
func allocated(f func()) uint64 {
	var a, b runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&a)
	f()
	runtime.ReadMemStats(&b)
	return b.TotalAlloc - a.TotalAlloc
}

// Length fields that lie make Decode fail without allocating what they
// claim: the header's body length, and array, map and string lengths
// inside a body whose checksum is correct.
func TestHostileLengthsDoNotAllocate(t *testing.T) {
	hostile := func(key string, code byte) []byte {
		// {"sessions": [ {key: <code with a 32-bit length of 2³²−1>} ]}
		b := []byte{0x81}
		k, _ := msgpack.Marshal("sessions")
		b = append(b, k...)
		b = append(b, 0x91, 0x81)
		k, _ = msgpack.Marshal(key)
		b = append(b, k...)
		return append(b, code, 0xff, 0xff, 0xff, 0xff)
	}
	lying := wrap(1, 0, marshalBody(t, genericSession()))
	binary.BigEndian.PutUint64(lying[12:], maxBodySize)
	cases := map[string][]byte{
		"body length":          lying[:200],
		"array length":         wrap(1, 0, hostile("readings", 0xdd)),
		"map length":           wrap(1, 0, hostile("readings", 0xdf)),
		"text length":          wrap(1, 0, hostile("title", 0xdb)),
		"ext length":           wrap(1, 0, hostile("created", 0xc9)),
		"unknown array length": wrap(1, 0, hostile("future", 0xdd)),
		"unknown map length":   wrap(1, 0, hostile("future", 0xdf)),
		"unknown text length":  wrap(1, 0, hostile("future", 0xdb)),
	}
	for name, file := range cases {
		var err error
		n := allocated(func() { _, err = Decode(bytes.NewReader(file)) })
		if err == nil {
			t.Errorf("%s: a lying length was accepted", name)
		}
		// The limit is generous against noise but far below what any of the
		// claimed lengths would need (4 GiB entries, 64 MiB body).
		if n > 2<<20 {
			t.Errorf("%s: Decode allocated %d bytes for a %d-byte file (%v)", name, n, len(file), err)
		}
	}
}

func TestEncodeRefuses(t *testing.T) {
	ok := sampleSessions(t)
	var buf bytes.Buffer
	if err := Encode(&buf, nil); !errors.Is(err, ErrInvalidField) {
		t.Errorf("no sessions: %v", err)
	}
	bad := *ok[0]
	bad.Settings.XUncertainty = math.Inf(1)
	if err := Encode(&buf, []*Session{&bad}); !errors.Is(err, ErrInvalidField) || !strings.Contains(err.Error(), "x_uncertainty") {
		t.Errorf("infinite uncertainty: %v", err)
	}
	if err := Encode(&buf, []*Session{ok[0], ok[0]}); !errors.Is(err, ErrInvalidField) {
		t.Errorf("same ID twice: %v", err)
	}
}

func FuzzDecode(f *testing.F) {
	sample, err := os.ReadFile(samplePath)
	if err == nil {
		f.Add(sample)
		f.Add(sample[:len(sample)/2])
	}
	f.Add(wrap(1, 0, marshalBody(f, genericSession())))
	f.Add(wrap(1, 7, marshalBody(f, genericSession())))
	f.Add([]byte("PAIRLN"))
	f.Fuzz(func(t *testing.T, b []byte) {
		file, err := Decode(bytes.NewReader(b))
		if err != nil {
			var fe *FormatError
			if !errors.As(err, &fe) || fe.Err == nil {
				t.Fatalf("error %v is not a *FormatError", err)
			}
			return
		}
		// Whatever decodes encodes again and decodes to the same sessions.
		var buf bytes.Buffer
		if err := Encode(&buf, file.Sessions); err != nil {
			t.Fatalf("decoded sessions do not encode: %v", err)
		}
		again, err := Decode(&buf)
		if err != nil || !reflect.DeepEqual(again.Sessions, file.Sessions) {
			t.Fatalf("re-encoding changed the sessions: %v", err)
		}
	})
}

// FuzzDecodeBody fuzzes the MessagePack body behind a valid frame, so that
// the fuzzer gets past the checksum.
func FuzzDecodeBody(f *testing.F) {
	f.Add(marshalBody(f, genericSession()))
	f.Add([]byte{0x81, 0xa8, 's', 'e', 's', 's', 'i', 'o', 'n', 's', 0xdd, 0xff, 0xff, 0xff, 0xff})
	// The forged files of the limit tests: empty readings, a level of
	// 2^64-1, a history of one-byte entries, a map of too many keys.
	body := func(raw []byte) []byte { return raw[headerSize : len(raw)-checksumSize] }
	f.Add(body(rawFile(f, rawSession(f, 1, 1000))))
	f.Add(body(rawFile(f, rawSession(f, 1, 2, mp(f, "settings"), append([]byte{0x81}, append(mp(f, "level"), 0xcf, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff)...)))))
	f.Add(body(rawFile(f, rawSession(f, 1, 0, mp(f, "history"), append([]byte{0xdc, 0x01, 0x00}, bytes.Repeat([]byte{0x80}, 256)...)))))
	f.Add(body(rawFile(f, rawSession(f, 1, 0, mp(f, "settings"), append([]byte{0xde, 0x01, 0x01}, bytes.Repeat([]byte{0xa1, 'k', 0xc0}, 257)...)))))
	f.Fuzz(func(t *testing.T, body []byte) {
		file, err := Decode(bytes.NewReader(wrap(1, 0, body)))
		if err != nil {
			return
		}
		var buf bytes.Buffer
		if err := Encode(&buf, file.Sessions); err != nil {
			t.Fatalf("decoded sessions do not encode: %v", err)
		}
	})
}

func bigSession(tb testing.TB, n int) *Session {
	tb.Helper()
	t0 := time.Date(2025, 3, 14, 8, 30, 0, 0, time.UTC)
	s, err := New("Big (invented)", t0, &counter{})
	if err != nil {
		tb.Fatal(err)
	}
	s.Readings = make([]Reading, n)
	for i := range s.Readings {
		s.Readings[i] = Reading{X: strconv.Itoa(i), Y: strconv.FormatFloat(float64(i)*1.01+0.3, 'f', 3, 64),
			Taken: t0.Add(time.Duration(i) * time.Second)}
	}
	return s
}

func BenchmarkEncode100k(b *testing.B) {
	ss := []*Session{bigSession(b, 100_000)}
	var buf bytes.Buffer
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		buf.Reset()
		if err := Encode(&buf, ss); err != nil {
			b.Fatal(err)
		}
	}
	b.SetBytes(int64(buf.Len()))
}

func BenchmarkDecode100k(b *testing.B) {
	file := encodeT(b, []*Session{bigSession(b, 100_000)})
	b.SetBytes(int64(len(file)))
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := Decode(bytes.NewReader(file)); err != nil {
			b.Fatal(err)
		}
	}
}

func ExampleDecode() {
	f, err := os.Open("../../testdata/session/sample.pairline")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer f.Close()
	file, err := Decode(f)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range file.Sessions {
		c := s.Count()
		fmt.Printf("%s: %d rows, %d usable, %d excluded, %d problems\n", s.Title, c.Rows, c.Usable, c.Excluded, c.Problems)
	}
	// Output:
	// Conductivity check, bench meter 2 (invented example): 9 rows, 7 usable, 1 excluded, 1 problems
	// Gauge height against flow, Heron Ford weir (invented): 3 rows, 3 usable, 0 excluded, 0 problems
}

// TestEncodeBytes: EncodeBytes gives the bytes Encode writes, and the size
// guessed beforehand is never short of them (so the buffer is filled
// without growing), for the sample sessions and a big invented one.
func TestEncodeBytes(t *testing.T) {
	big := sampleSessions(t)[0]
	cp := *big
	cp.ID = "0000000000004000800000000000000b"
	cp.Readings = nil
	for i := 0; i < 5000; i++ {
		cp.Readings = append(cp.Readings, Reading{X: strconv.Itoa(i), Y: strconv.FormatFloat(float64(i)*1.0001, 'f', 4, 64), Note: "invented"})
	}
	for _, ss := range [][]*Session{sampleSessions(t), {&cp}} {
		var buf bytes.Buffer
		if err := Encode(&buf, ss); err != nil {
			t.Fatal(err)
		}
		b, err := EncodeBytes(ss)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(b, buf.Bytes()) {
			t.Fatal("EncodeBytes and Encode differ")
		}
		if hint := encodedSizeHint(ss); hint < len(b) {
			t.Errorf("size hint %d, encoded %d bytes", hint, len(b))
		}
	}
}

// TestEncodeAppendReuses: encoding into the memory of an earlier file gives
// the same bytes as a fresh encoding, using that memory when it is big
// enough.
func TestEncodeAppendReuses(t *testing.T) {
	ss := sampleSessions(t)
	want, err := EncodeBytes(ss)
	if err != nil {
		t.Fatal(err)
	}
	old := make([]byte, 0, encodedSizeHint(ss)+100)
	old = append(old, "stale bytes of an earlier state"...)
	got, err := EncodeAppend(old, ss)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, want) {
		t.Fatal("EncodeAppend into used memory differs from EncodeBytes")
	}
	if &got[0] != &old[:1][0] {
		t.Error("EncodeAppend did not reuse memory that was big enough")
	}
}
