package session

import (
	"bytes"
	"encoding/binary"
	"math"
	"time"

	"github.com/vmihailenco/msgpack/v5/msgpcode"
)

// mpWriter writes the few MessagePack values a session file holds (maps,
// arrays, strings, float64, integers, booleans, nil and timestamps) into a
// buffer, in exactly the forms msgpack.Encoder (v5, default options) writes
// them: the smallest length prefix, integers in the fewest bytes, float64
// always as a double, times as the timestamp extension −1 in 4, 8 or 12
// bytes. The forms are those of the MessagePack specification
// (github.com/msgpack/msgpack/blob/master/spec.md); TestMPWriterMatchesLibrary
// compares the bytes with the library's for every kind and length class.
//
// The library's encoder is not used in the build because it brings its
// reflection-based encoding of any Go value with it (about 240 kB of the
// browser's app.wasm) where the codec needs eight functions. Writes to a
// bytes.Buffer cannot fail; the methods return an error (always nil) so
// that they stand where the library's did.
type mpWriter struct {
	b   *bytes.Buffer
	tmp [13]byte
}

func newMPWriter(b *bytes.Buffer) *mpWriter { return &mpWriter{b: b} }

func (w *mpWriter) code(c byte) error { return w.b.WriteByte(c) }

func (w *mpWriter) code8(c byte, n uint8) error {
	w.tmp[0], w.tmp[1] = c, n
	_, err := w.b.Write(w.tmp[:2])
	return err
}

func (w *mpWriter) code16(c byte, n uint16) error {
	w.tmp[0] = c
	binary.BigEndian.PutUint16(w.tmp[1:], n)
	_, err := w.b.Write(w.tmp[:3])
	return err
}

func (w *mpWriter) code32(c byte, n uint32) error {
	w.tmp[0] = c
	binary.BigEndian.PutUint32(w.tmp[1:], n)
	_, err := w.b.Write(w.tmp[:5])
	return err
}

func (w *mpWriter) code64(c byte, n uint64) error {
	w.tmp[0] = c
	binary.BigEndian.PutUint64(w.tmp[1:], n)
	_, err := w.b.Write(w.tmp[:9])
	return err
}

// EncodeNil writes nil.
func (w *mpWriter) EncodeNil() error { return w.code(msgpcode.Nil) }

// EncodeBool writes true or false.
func (w *mpWriter) EncodeBool(v bool) error {
	if v {
		return w.code(msgpcode.True)
	}
	return w.code(msgpcode.False)
}

// EncodeFloat64 writes v as a float 64 (0xcb and 8 bytes).
func (w *mpWriter) EncodeFloat64(v float64) error {
	return w.code64(msgpcode.Double, math.Float64bits(v))
}

// EncodeInt writes n in the fewest bytes: a positive or negative fixint,
// else uint 8/16/32/64 for n ≥ 0 and int 8/16/32/64 below.
func (w *mpWriter) EncodeInt(n int64) error {
	switch {
	case n >= 0 && n <= math.MaxInt8:
		return w.code(byte(n))
	case n >= 0 && n <= math.MaxUint8:
		return w.code8(msgpcode.Uint8, uint8(n))
	case n >= 0 && n <= math.MaxUint16:
		return w.code16(msgpcode.Uint16, uint16(n))
	case n >= 0 && n <= math.MaxUint32:
		return w.code32(msgpcode.Uint32, uint32(n))
	case n >= 0:
		return w.code64(msgpcode.Uint64, uint64(n))
	case n >= int64(int8(msgpcode.NegFixedNumLow)):
		return w.code(byte(n))
	case n >= math.MinInt8:
		return w.code8(msgpcode.Int8, uint8(n))
	case n >= math.MinInt16:
		return w.code16(msgpcode.Int16, uint16(n))
	case n >= math.MinInt32:
		return w.code32(msgpcode.Int32, uint32(n))
	}
	return w.code64(msgpcode.Int64, uint64(n))
}

// length writes a map, array or string length with its fix form below fix
// (16 or 32) and the 8-bit form only when c8 is not 0 (strings).
func (w *mpWriter) length(l int, fixLow byte, fix int, c8, c16, c32 byte) error {
	switch {
	case l < fix:
		return w.code(fixLow | byte(l))
	case c8 != 0 && l <= math.MaxUint8:
		return w.code8(c8, uint8(l))
	case l <= math.MaxUint16:
		return w.code16(c16, uint16(l))
	}
	return w.code32(c32, uint32(l))
}

// EncodeMapLen writes the header of a map of l entries.
func (w *mpWriter) EncodeMapLen(l int) error {
	return w.length(l, msgpcode.FixedMapLow, 16, 0, msgpcode.Map16, msgpcode.Map32)
}

// EncodeArrayLen writes the header of an array of l values.
func (w *mpWriter) EncodeArrayLen(l int) error {
	return w.length(l, msgpcode.FixedArrayLow, 16, 0, msgpcode.Array16, msgpcode.Array32)
}

// EncodeString writes s as a str.
func (w *mpWriter) EncodeString(s string) error {
	if err := w.length(len(s), msgpcode.FixedStrLow, 32, msgpcode.Str8, msgpcode.Str16, msgpcode.Str32); err != nil {
		return err
	}
	_, err := w.b.WriteString(s)
	return err
}

// EncodeTime writes t as the timestamp extension (type −1): 32 bits of
// seconds when there are no nanoseconds and the seconds fit (fixext 4),
// 30 bits of nanoseconds and 34 of seconds when the seconds fit 34 bits
// (fixext 8), else 32 bits of nanoseconds and 64 of seconds (ext 8 of 12
// bytes).
func (w *mpWriter) EncodeTime(t time.Time) error {
	secs := uint64(t.Unix())
	const ext = 0xff // −1
	if secs>>34 == 0 {
		data := uint64(t.Nanosecond())<<34 | secs
		if data&0xffffffff00000000 == 0 {
			w.tmp[0], w.tmp[1] = msgpcode.FixExt4, ext
			binary.BigEndian.PutUint32(w.tmp[2:], uint32(data))
			_, err := w.b.Write(w.tmp[:6])
			return err
		}
		w.tmp[0], w.tmp[1] = msgpcode.FixExt8, ext
		binary.BigEndian.PutUint64(w.tmp[2:], data)
		_, err := w.b.Write(w.tmp[:10])
		return err
	}
	w.tmp[0], w.tmp[1], w.tmp[2] = msgpcode.Ext8, 12, ext
	binary.BigEndian.PutUint32(w.tmp[3:], uint32(t.Nanosecond()))
	if _, err := w.b.Write(w.tmp[:7]); err != nil {
		return err
	}
	binary.BigEndian.PutUint64(w.tmp[:8], secs)
	_, err := w.b.Write(w.tmp[:8])
	return err
}
