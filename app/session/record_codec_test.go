package session

import (
	"bytes"
	"errors"
	"strconv"
	"strings"
	"testing"
)

// recordForgeries are hand-made sessions with hostile record fields (every
// length honest, the checksum valid): the limit tests below and the seeds
// of FuzzDecodeBody.
func recordForgeries(t testing.TB) map[string]struct {
	file  []byte
	field string
	err   error
} {
	arr := func(n int, each []byte) []byte { // a list of n copies of each
		b := []byte{0xdd, byte(n >> 24), byte(n >> 16), byte(n >> 8), byte(n)}
		return append(b, bytes.Repeat(each, n)...)
	}
	return map[string]struct {
		file  []byte
		field string
		err   error
	}{
		"standards past MaxStandards":   {rawFile(t, rawSession(t, 1, 0, mp(t, "standards"), arr(MaxStandards+1, []byte{0x80}))), "sessions[0].standards", ErrTooLarge},
		"conditions past MaxConditions": {rawFile(t, rawSession(t, 1, 0, mp(t, "conditions"), arr(MaxConditions+1, []byte{0x80}))), "sessions[0].conditions", ErrTooLarge},
		"unknown readings past the limit": {rawFile(t, rawSession(t, 1, 0, mp(t, "unknowns"),
			append([]byte{0x91, 0x81}, append(mp(t, "readings"), arr(MaxUnknownReadings+1, []byte{0xa0})...)...))), "sessions[0].unknowns[0].readings", ErrTooLarge},
		"standards claim more than the bytes": {rawFile(t, rawSession(t, 1, 0, mp(t, "standards"), []byte{0xdc, 0x03, 0xe8, 0x80})), "sessions[0].standards", ErrInvalidField},
		"sealed past MaxSealedRevisions":      {rawFile(t, rawSession(t, 1, 0, mp(t, "sealed"), arr(MaxSealedRevisions+1, []byte{0x80}))), "sessions[0].sealed", ErrTooLarge},
		"interval out of range":               {rawFile(t, rawSession(t, 1, 0, mp(t, "instrument"), append([]byte{0x81}, append(mp(t, "interval_days"), mp(t, -3)...)...))), "sessions[0].instrument.interval_days", ErrInvalidField},
		"revision negative":                   {rawFile(t, rawSession(t, 1, 0, mp(t, "revision"), mp(t, -1))), "sessions[0].revision", ErrInvalidField},
		"seal not a map":                      {rawFile(t, rawSession(t, 1, 0, mp(t, "seal"), mp(t, "signed"))), "sessions[0].seal", ErrInvalidField},
		"standard expiry not a time":          {rawFile(t, rawSession(t, 1, 0, mp(t, "standards"), append([]byte{0x91, 0x81}, append(mp(t, "expiry"), mp(t, "2026-01-01")...)...))), "sessions[0].standards[0].expiry", ErrInvalidField},
		"digest too long":                     {rawFile(t, rawSession(t, 1, 0, mp(t, "seal"), append([]byte{0x81}, append(mp(t, "digest"), mp(t, strings.Repeat("f", MaxShortText+1))...)...))), "sessions[0].seal.digest", ErrInvalidField},
		"sealed revision reading bad":         {rawFile(t, rawSession(t, 1, 0, mp(t, "sealed"), append([]byte{0x91, 0x81}, append(mp(t, "readings"), append([]byte{0x91, 0x81}, append(mp(t, "x"), mp(t, 5)...)...)...)...))), "sessions[0].sealed[0].readings[0].x", ErrInvalidField},
	}
}

// TestDecodeRecordLimits: each forged record field is refused with the
// field's path and the kind of problem, before its list is allocated.
func TestDecodeRecordLimits(t *testing.T) {
	for name, tc := range recordForgeries(t) {
		var err error
		n := allocated(func() { _, err = Decode(bytes.NewReader(tc.file)) })
		var fe *FormatError
		if !errors.As(err, &fe) || !errors.Is(err, tc.err) || fe.Field != tc.field {
			t.Errorf("%s: got %v; want %v at %s", name, err, tc.err, tc.field)
		}
		if n > uint64(8*len(tc.file)+1<<20) {
			t.Errorf("%s: Decode allocated %d bytes for a %d-byte file", name, n, len(tc.file))
		}
	}
}

// TestDecodeFileItemsCap: the record lists of many sessions together stop
// at MaxFileItems (the per-record limits alone would multiply).
func TestDecodeFileItemsCap(t *testing.T) {
	n := MaxFileItems/(MaxStandards+MaxUnknowns) + 1
	var ss [][]byte
	std := append([]byte{0xdd, 0, 0, byte(MaxStandards >> 8), byte(MaxStandards & 0xff)}, bytes.Repeat([]byte{0x80}, MaxStandards)...)
	unk := append([]byte{0xdd, 0, 0, byte(MaxUnknowns >> 8), byte(MaxUnknowns & 0xff)}, bytes.Repeat([]byte{0x80}, MaxUnknowns)...)
	for i := 0; i < n; i++ {
		ss = append(ss, rawSession(t, i, 0, mp(t, "standards"), std, mp(t, "unknowns"), unk))
	}
	_, err := Decode(bytes.NewReader(rawFile(t, ss...)))
	var fe *FormatError
	if !errors.As(err, &fe) || !errors.Is(err, ErrTooLarge) || !strings.HasSuffix(fe.Field, "s") || !strings.Contains(err.Error(), "1000000") {
		t.Errorf("got %v; want ErrTooLarge naming the limit", err)
	}
}

// TestEncodeRefusesRecordLimits: what Decode refuses, Encode refuses too.
func TestEncodeRefusesRecordLimits(t *testing.T) {
	s := newRecord(t)
	s.Standards = make([]Standard, MaxStandards+1)
	if _, err := EncodeBytes([]*Session{s}); !errors.Is(err, ErrTooLarge) || !strings.Contains(err.Error(), "standards") {
		t.Errorf("too many standards: %v", err)
	}
	s = newRecord(t)
	s.Instrument.IntervalDays = -1
	if _, err := EncodeBytes([]*Session{s}); !errors.Is(err, ErrInvalidField) || !strings.Contains(err.Error(), "instrument.interval_days") {
		t.Errorf("negative interval: %v", err)
	}
	s = newRecord(t)
	s.Sealed = []SealedRevision{{Revision: 1, Content: Content{Readings: []Reading{{X: string([]byte{0xff})}}}}}
	if _, err := EncodeBytes([]*Session{s}); !errors.Is(err, ErrInvalidField) || !strings.Contains(err.Error(), "sealed[0].readings[0].x") {
		t.Errorf("bad UTF-8 in a sealed revision: %v", err)
	}
}

// FuzzDecodeRecord fuzzes bodies seeded with the record fields: the sample
// (all of them, sealed twice) and the forgeries above. Whatever decodes
// encodes again to the same sessions, and VerifySeal never panics.
func FuzzDecodeRecord(f *testing.F) {
	b, err := EncodeBytes(sampleSessions(f))
	if err != nil {
		f.Fatal(err)
	}
	f.Add(b[headerSize : len(b)-checksumSize])
	for _, tc := range recordForgeries(f) {
		f.Add(tc.file[headerSize : len(tc.file)-checksumSize])
	}
	f.Fuzz(func(t *testing.T, body []byte) {
		file, err := Decode(bytes.NewReader(wrap(FormatMajor, FormatMinor, body)))
		if err != nil {
			var fe *FormatError
			if !errors.As(err, &fe) {
				t.Fatalf("error %v is not a *FormatError", err)
			}
			return
		}
		for _, s := range file.Sessions {
			if ok, err := s.VerifySeal(); ok != (err == nil) {
				t.Fatalf("VerifySeal = %v, %v", ok, err)
			}
			_ = s.ExpiredStandards()
			_, _ = s.StandardUncertainties([]float64{1, 2})
			_ = s.UnknownQueries()
		}
		again, err := EncodeBytes(file.Sessions)
		if err != nil {
			t.Fatalf("decoded sessions do not encode: %v", err)
		}
		g, err := Decode(bytes.NewReader(again))
		if err != nil || len(g.Sessions) != len(file.Sessions) {
			t.Fatalf("re-encoded file does not decode: %v", err)
		}
	})
}

// BenchmarkSealDigest100k: the digest of a record of 100,000 readings
// (computed at every signature and every VerifySeal).
func BenchmarkSealDigest100k(b *testing.B) {
	s := newRecord(b)
	s.Readings = make([]Reading, 100_000)
	for i := range s.Readings {
		s.Readings[i] = Reading{X: strconv.Itoa(i), Y: strconv.Itoa(i + 1), Note: "invented", Taken: t0}
	}
	s.Seal = &Seal{PerformedBy: "A. Marsh", PerformedAt: t0}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := s.SealDigest(); err != nil {
			b.Fatal(err)
		}
	}
}
