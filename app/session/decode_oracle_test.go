package session

import (
	"bytes"
	"crypto/sha256"
	"crypto/subtle"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"reflect"
	"testing"

	"github.com/vmihailenco/msgpack/v5/msgpcode"
)

// decodeOracle is Decode as it was before it was split into stages
// (cyclomatic complexity 23), kept unchanged as the oracle of
// TestDecodeMatchesOracle and FuzzDecodeMatchesOracle.
func decodeOracle(r io.Reader) (*File, error) {
	var hdr [headerSize]byte
	n, err := io.ReadFull(r, hdr[:])
	if err != nil && !errors.Is(err, io.ErrUnexpectedEOF) && !errors.Is(err, io.EOF) {
		return nil, &FormatError{Offset: int64(n), Err: fmt.Errorf("%w: the file could not be read: %v", ErrTruncated, err)}
	}
	m := min(n, len(Magic))
	if !bytes.Equal(hdr[:m], Magic[:m]) {
		return nil, &FormatError{Offset: 0, Err: notSessionFile(hdr[:n])}
	}
	if n == 0 {
		return nil, &FormatError{Offset: 0, Err: fmt.Errorf("%w: the file is empty", ErrTruncated)}
	}
	if n < headerSize {
		return nil, &FormatError{Offset: int64(n), Err: fmt.Errorf("%w: the file ends inside its %d-byte header", ErrTruncated, headerSize)}
	}
	major := int(binary.BigEndian.Uint16(hdr[8:]))
	minor := int(binary.BigEndian.Uint16(hdr[10:]))
	if major > FormatMajor {
		return nil, &FormatError{Offset: 8, Field: "major version", Err: fmt.Errorf(
			"%w (the file has format %d.%d; this Pairline reads format %d.x)", ErrNewerVersion, major, minor, FormatMajor)}
	}
	if major < 1 {
		return nil, &FormatError{Offset: 8, Field: "major version", Err: invalid("format version %d.%d was never written by Pairline", major, minor)}
	}
	length := binary.BigEndian.Uint64(hdr[12:])
	if length > maxBodySize {
		return nil, &FormatError{Offset: 12, Field: "body length", Err: fmt.Errorf(
			"%w: it claims %d bytes of contents, at most %d are allowed", ErrTooLarge, length, maxBodySize)}
	}
	want := int64(length) + checksumSize
	// The buffer starts at what the reader says it holds (a bytes.Reader in
	// the browser, a file natively), never at what the header claims: a
	// 200-byte file claiming 64 MiB gets a small buffer.
	start := int64(64 << 10)
	if l, ok := r.(interface{ Len() int }); ok {
		start = int64(l.Len())
	} else if st, ok := r.(interface{ Stat() (fs.FileInfo, error) }); ok {
		if fi, err := st.Stat(); err == nil && fi.Mode().IsRegular() {
			start = fi.Size() - headerSize
		}
	}
	rest, err := readAtMost(r, want, start)
	got := int64(len(rest))
	if err != nil {
		return nil, &FormatError{Offset: headerSize + got, Err: fmt.Errorf("%w: the file could not be read: %v", ErrTruncated, err)}
	}
	if got < want {
		return nil, &FormatError{Offset: headerSize + got, Err: fmt.Errorf(
			"%w: the file has %d bytes, its header says %d", ErrTruncated, headerSize+got, headerSize+want)}
	}
	var extra [1]byte
	if k, _ := io.ReadFull(r, extra[:]); k > 0 {
		return nil, &FormatError{Offset: headerSize + want, Err: invalid("there are extra bytes after the end of the file")}
	}
	body, stored := rest[:length], rest[length:]
	h := sha256.New()
	h.Write(hdr[:])
	h.Write(body)
	if subtle.ConstantTimeCompare(h.Sum(nil), stored) != 1 {
		return nil, &FormatError{Offset: headerSize + int64(length), Field: "checksum", Err: ErrChecksum}
	}
	f := &File{Major: major, Minor: minor, Checksum: hex.EncodeToString(stored)}
	d := newBodyDecoder(body)
	sessions, starts, ferr := d.bundle()
	if ferr != nil {
		return nil, ferr
	}
	seen := make(map[string]bool, len(sessions))
	for i, s := range sessions {
		if field, err := s.validate(); err != nil {
			return nil, &FormatError{Offset: starts[i], Field: fmt.Sprintf("sessions[%d].%s", i, field), Err: err}
		}
		if seen[s.ID] {
			return nil, &FormatError{Offset: starts[i], Field: fmt.Sprintf("sessions[%d].id", i), Err: invalid("two sessions share the ID %s", s.ID)}
		}
		seen[s.ID] = true
	}
	f.Sessions = sessions
	if minor > FormatMinor {
		f.Warnings = append(f.Warnings, fmt.Sprintf(
			"The file was written by a newer Pairline (format %d.%d; this one knows %d.%d). "+
				"Everything this version knows was read; newer details were skipped and are lost if you save from here.",
			major, minor, FormatMajor, FormatMinor))
	}
	migrate(f)
	return f, nil
}

// skipOracle is bodyDecoder.skip as it was before it was split into
// stages (cyclomatic complexity 24), kept unchanged as the oracle of
// TestSkipMatchesOracle and FuzzSkipMatchesOracle.
func (b *bodyDecoder) skipOracle(field string, depth int) *FormatError {
	off := b.off()
	if b.pos >= len(b.b) {
		return b.short(off, field, "a value")
	}
	c := b.b[b.pos]
	var n int
	switch sz, ok := numberSize(c); {
	case c <= msgpcode.PosFixedNumHigh || c >= msgpcode.NegFixedNumLow:
		b.pos++
		return nil
	case ok:
		n = 1 + sz
	default:
		if k, isStr, done := b.header(msgpcode.FixedStrLow, 32, msgpcode.Str8, msgpcode.Str16, msgpcode.Str32); isStr || !done {
			if !done {
				return b.short(off, field, "a value")
			}
			n = k
			break
		}
		if k, isBin, done := b.header(0, 0, msgpcode.Bin8, msgpcode.Bin16, msgpcode.Bin32); isBin || !done {
			if !done {
				return b.short(off, field, "a value")
			}
			n = k
			break
		}
		if _, k, isExt, done := b.extHeader(); isExt || !done {
			if !done {
				return b.short(off, field, "a value")
			}
			n = k
			break
		}
		k, isMap, done := b.header(msgpcode.FixedMapLow, 16, 0, msgpcode.Map16, msgpcode.Map32)
		if isMap {
			k *= 2
		} else if done {
			k, isMap, done = b.header(msgpcode.FixedArrayLow, 16, 0, msgpcode.Array16, msgpcode.Array32)
			if done && !isMap {
				return b.fail(off, field, invalid("the value has a type MessagePack does not define (code 0x%02x)", c))
			}
		}
		if !done {
			return b.short(off, field, "a value")
		}
		if depth >= MaxNesting {
			return b.fail(off, field, invalid("values are nested more than %d deep", MaxNesting))
		}
		if k > b.left() {
			return b.fail(off, field, invalid("a value claims %d entries but only %d bytes are left", k, b.left()))
		}
		for i := 0; i < k; i++ {
			if ferr := b.skipOracle(field, depth+1); ferr != nil {
				return ferr
			}
		}
		return nil
	}
	if n > b.left() {
		return b.short(off, field, "a value")
	}
	b.pos += n
	return nil
}

// sameSkip compares skip with its oracle on b: the same error and the same
// position after it.
func sameSkip(t *testing.T, b []byte, depth int) {
	t.Helper()
	d1, d2 := newBodyDecoder(b), newBodyDecoder(b)
	e1, e2 := d1.skip("x", depth), d2.skipOracle("x", depth)
	if fmt.Sprint(e1) != fmt.Sprint(e2) || d1.pos != d2.pos {
		t.Fatalf("skip(% x, depth %d): got %v at %d, want %v at %d", b, depth, e1, d1.pos, e2, d2.pos)
	}
}

func TestSkipMatchesOracle(t *testing.T) {
	body := marshalBody(t, genericSession(), genericSession())
	for i := range body {
		for _, depth := range []int{0, MaxNesting - 1, MaxNesting} {
			sameSkip(t, body[i:], depth)
			sameSkip(t, body[:i], depth)
		}
	}
	for c := range 256 {
		for _, tail := range [][]byte{nil, {0}, {0, 1}, {0xff, 0xff, 0xff, 0xff, 0xff}, {1, 2, 3, 4, 5, 6, 7, 8, 9, 10}} {
			sameSkip(t, append([]byte{byte(c)}, tail...), 0)
		}
	}
}

// FuzzSkipMatchesOracle: skip passes over what the body it was split from
// passes over, and fails where it fails, for any bytes.
func FuzzSkipMatchesOracle(f *testing.F) {
	f.Add(marshalBody(f, genericSession()), 0)
	f.Add([]byte{0x91, 0x91, 0x91, 0xc0}, MaxNesting-2)
	f.Fuzz(func(t *testing.T, b []byte, depth int) {
		sameSkip(t, b, min(max(depth, 0), MaxNesting))
	})
}

// plainReader hides the Len method of a bytes.Reader, so that Decode
// starts its buffer at its default size.
type plainReader struct{ r io.Reader }

func (p plainReader) Read(b []byte) (int, error) { return p.r.Read(b) }

// sameDecode compares Decode with its oracle on b, read through a
// bytes.Reader and through a reader that tells nothing of its size.
func sameDecode(t *testing.T, b []byte) {
	t.Helper()
	for _, plain := range []bool{false, true} {
		var r1, r2 io.Reader = bytes.NewReader(b), bytes.NewReader(b)
		if plain {
			r1, r2 = plainReader{r1}, plainReader{r2}
		}
		gf, gerr := Decode(r1)
		wf, werr := decodeOracle(r2)
		if fmt.Sprint(gerr) != fmt.Sprint(werr) || !reflect.DeepEqual(gf, wf) {
			t.Fatalf("Decode(%d bytes, plain reader %v): got %+v, %v; want %+v, %v", len(b), plain, gf, gerr, wf, werr)
		}
	}
}

func TestDecodeMatchesOracle(t *testing.T) {
	good := wrap(1, 0, marshalBody(t, genericSession()))
	inputs := [][]byte{
		nil, []byte("PAIRLN"), []byte("not a session file at all"), good,
		wrap(1, 7, marshalBody(t, genericSession())),
		wrap(0, 0, marshalBody(t, genericSession())),
		wrap(FormatMajor+1, 0, marshalBody(t, genericSession())),
		wrap(1, 0, marshalBody(t, genericSession(), genericSession())), // one ID twice
		wrap(1, 0, []byte{0x81, 0xa8, 's', 'e', 's', 's', 'i', 'o', 'n', 's', 0xdd, 0xff, 0xff, 0xff, 0xff}),
		append(append([]byte(nil), good...), 0),
	}
	if sample, err := os.ReadFile(samplePath); err == nil {
		inputs = append(inputs, sample)
	}
	for _, b := range inputs[:4] {
		for _, cut := range []int{1, 5, headerSize - 1, headerSize, headerSize + 3, len(b) - 1} {
			if cut > 0 && cut < len(b) {
				inputs = append(inputs, b[:cut])
			}
		}
	}
	// The header's length and checksum spoiled.
	long := append([]byte(nil), good...)
	binary.BigEndian.PutUint64(long[12:], 1<<40)
	short := append([]byte(nil), good...)
	binary.BigEndian.PutUint64(short[12:], 3)
	sum := append([]byte(nil), good...)
	sum[len(sum)-1] ^= 1
	inputs = append(inputs, long, short, sum)
	for _, b := range inputs {
		sameDecode(t, b)
	}
}

// FuzzDecodeMatchesOracle: Decode gives what the body it was split from
// gives (the same file or the same error) for any bytes.
func FuzzDecodeMatchesOracle(f *testing.F) {
	f.Add(wrap(1, 0, marshalBody(f, genericSession())))
	f.Add(wrap(1, 9, marshalBody(f, genericSession())))
	f.Add([]byte("PAIRLN"))
	f.Fuzz(func(t *testing.T, b []byte) {
		sameDecode(t, b)
	})
}
