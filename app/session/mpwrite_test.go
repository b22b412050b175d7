package session

import (
	"bytes"
	"math"
	"strings"
	"testing"
	"time"

	"github.com/vmihailenco/msgpack/v5"
)

// TestMPWriterMatchesLibrary: for every kind the codec writes and every
// length or size class (each side of every boundary), mpWriter writes the
// bytes msgpack.Encoder v5.4.1 writes. The library is the oracle.
func TestMPWriterMatchesLibrary(t *testing.T) {
	type step struct {
		name string
		mine func(*mpWriter) error
		lib  func(*msgpack.Encoder) error
	}
	var steps []step
	for _, n := range []int64{0, 1, 127, 128, 255, 256, 65535, 65536, math.MaxUint32, math.MaxUint32 + 1, math.MaxInt64,
		-1, -32, -33, -128, -129, -32768, -32769, math.MinInt32, math.MinInt32 - 1, math.MinInt64} {
		steps = append(steps, step{"int", func(w *mpWriter) error { return w.EncodeInt(n) },
			func(e *msgpack.Encoder) error { return e.EncodeInt(n) }})
	}
	for _, l := range []int{0, 1, 15, 16, 31, 32, 255, 256, 65535, 65536, 70000} {
		s := strings.Repeat("é", l/2) + strings.Repeat("a", l%2)
		steps = append(steps,
			step{"string", func(w *mpWriter) error { return w.EncodeString(s) }, func(e *msgpack.Encoder) error { return e.EncodeString(s) }},
			step{"map", func(w *mpWriter) error { return w.EncodeMapLen(l) }, func(e *msgpack.Encoder) error { return e.EncodeMapLen(l) }},
			step{"array", func(w *mpWriter) error { return w.EncodeArrayLen(l) }, func(e *msgpack.Encoder) error { return e.EncodeArrayLen(l) }})
	}
	for _, f := range []float64{0, math.Copysign(0, -1), 1, -2.5, 1e300, math.SmallestNonzeroFloat64, math.Inf(1), math.NaN(), 3} {
		steps = append(steps, step{"float", func(w *mpWriter) error { return w.EncodeFloat64(f) },
			func(e *msgpack.Encoder) error { return e.EncodeFloat64(f) }})
	}
	for _, tm := range []time.Time{
		time.Unix(0, 0), time.Unix(1, 0), time.Unix(1<<32-1, 0), time.Unix(1<<32, 0), time.Unix(1<<34-1, 999_999_999),
		time.Unix(1<<34, 0), time.Unix(-1, 0), time.Unix(-62135596800, 0), time.Date(2026, 12, 2, 14, 5, 6, 789, time.UTC),
		time.Date(9999, 12, 31, 23, 59, 59, 999_999_999, time.UTC), time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC),
	} {
		steps = append(steps, step{"time " + tm.String(), func(w *mpWriter) error { return w.EncodeTime(tm) },
			func(e *msgpack.Encoder) error { return e.EncodeTime(tm) }})
	}
	steps = append(steps,
		step{"nil", (*mpWriter).EncodeNil, (*msgpack.Encoder).EncodeNil},
		step{"true", func(w *mpWriter) error { return w.EncodeBool(true) }, func(e *msgpack.Encoder) error { return e.EncodeBool(true) }},
		step{"false", func(w *mpWriter) error { return w.EncodeBool(false) }, func(e *msgpack.Encoder) error { return e.EncodeBool(false) }})
	for _, s := range steps {
		var a, b bytes.Buffer
		if err := s.mine(newMPWriter(&a)); err != nil {
			t.Fatal(err)
		}
		if err := s.lib(msgpack.NewEncoder(&b)); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(a.Bytes(), b.Bytes()) {
			got, want := a.Bytes(), b.Bytes()
			t.Errorf("%s: wrote % x, the library % x", s.name, got[:min(len(got), 16)], want[:min(len(want), 16)])
		}
	}
}
