package session

import (
	"bytes"
	"errors"
	"math"
	"reflect"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/vmihailenco/msgpack/v5"

	"pairline/fitcore"
)

// rawSession writes a session map by hand: the fields a valid session
// needs, then the given readings list (n empty maps, one byte each) and
// extra raw key/value pairs. It is the forged file an attacker would make:
// every length is honest, the checksum is valid, the counts are hostile.
func rawSession(t testing.TB, id int, readings int, extra ...[]byte) []byte {
	t.Helper()
	var buf bytes.Buffer
	e := msgpack.NewEncoder(&buf)
	t0 := time.Date(2025, 3, 14, 8, 30, 0, 0, time.UTC)
	must := func(err error) {
		if err != nil {
			t.Fatal(err)
		}
	}
	must(e.EncodeMapLen(4 + len(extra)/2))
	must(e.EncodeString("id"))
	must(e.EncodeString(strings.Repeat("0", 32-len(strconv.Itoa(id))) + strconv.Itoa(id)))
	must(e.EncodeString("created"))
	must(e.EncodeTime(t0))
	must(e.EncodeString("modified"))
	must(e.EncodeTime(t0))
	must(e.EncodeString("readings"))
	must(e.EncodeArrayLen(readings))
	buf.Write(bytes.Repeat([]byte{0x80}, readings))
	for _, x := range extra {
		buf.Write(x)
	}
	return buf.Bytes()
}

// rawFile puts raw sessions into a file with a valid checksum.
func rawFile(t testing.TB, sessions ...[]byte) []byte {
	t.Helper()
	var buf bytes.Buffer
	e := msgpack.NewEncoder(&buf)
	_ = e.EncodeMapLen(1)
	_ = e.EncodeString("sessions")
	_ = e.EncodeArrayLen(len(sessions))
	for _, s := range sessions {
		buf.Write(s)
	}
	return wrap(FormatMajor, FormatMinor, buf.Bytes())
}

func mp(t testing.TB, v any) []byte {
	t.Helper()
	b, err := msgpack.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestDecodeFileReadingsCap: the per-session and per-file limits no longer
// multiply. Five sessions of 250,000 empty readings (1.25 MB) pass
// MaxReadings in each session but not MaxFileReadings in all; the file is
// refused at the fifth session, with what was allocated bounded by the
// limit (about 100 bytes a reading), not by 1,000 × 250,000 readings.
func TestDecodeFileReadingsCap(t *testing.T) {
	var ss [][]byte
	for i := range 5 {
		ss = append(ss, rawSession(t, i, MaxReadings))
	}
	file := rawFile(t, ss...)
	var err error
	n := allocated(func() { _, err = Decode(bytes.NewReader(file)) })
	var fe *FormatError
	if !errors.As(err, &fe) || !errors.Is(err, ErrTooLarge) || fe.Field != "sessions[4].readings" {
		t.Fatalf("got %v; want ErrTooLarge at sessions[4].readings", err)
	}
	if !strings.Contains(err.Error(), strconv.Itoa(MaxFileReadings)) {
		t.Errorf("the error %q does not name the limit", err)
	}
	if limit := uint64(MaxFileReadings*110 + 4*len(file)); n > limit {
		t.Errorf("Decode allocated %d bytes for a %d-byte file (limit %d)", n, len(file), limit)
	}
}

// TestDecodeCountsBeforeAllocating: lists that claim more entries than the
// bytes left could hold are refused before the list is made, with lengths
// under the per-session limits (so that the limit itself does not catch
// them) and a valid checksum.
func TestDecodeCountsBeforeAllocating(t *testing.T) {
	readings := func(n int) []byte { // a readings list that claims n and holds 3
		return append([]byte{0xdd, byte(n >> 24), byte(n >> 16), byte(n >> 8), byte(n)}, 0x80, 0x80, 0x80)
	}
	cases := map[string]struct {
		file  []byte
		field string
	}{
		"readings claim 200,000": {rawFile(t, append(rawSession(t, 1, 0)[:0:0], func() []byte {
			s := rawSession(t, 1, 0)
			return append(s[:len(s)-1], readings(200_000)...) // replace the empty list
		}()...)), "sessions[0].readings"},
		"history of 100,000 one-byte entries": {rawFile(t, rawSession(t, 1, 0, mp(t, "history"),
			append([]byte{0xdd, 0, 1, 0x86, 0xa0}, bytes.Repeat([]byte{0x80}, 100_000)...))), "sessions[0].history"},
		"sessions claim 1,000": {wrap(FormatMajor, FormatMinor, append([]byte{0x81, 0xa8, 's', 'e', 's', 's', 'i', 'o', 'n', 's', 0xdc, 0x03, 0xe8},
			bytes.Repeat([]byte{0x80}, 2000)...)), "sessions"},
	}
	for name, tc := range cases {
		var err error
		n := allocated(func() { _, err = Decode(bytes.NewReader(tc.file)) })
		var fe *FormatError
		if !errors.As(err, &fe) || !errors.Is(err, ErrInvalidField) || fe.Field != tc.field {
			t.Errorf("%s: got %v; want an invalid field at %s", name, err, tc.field)
			continue
		}
		if !strings.Contains(err.Error(), "bytes are left") {
			t.Errorf("%s: %q does not say why", name, err)
		}
		if n > uint64(4*len(tc.file)+1<<20) {
			t.Errorf("%s: Decode allocated %d bytes for a %d-byte file", name, n, len(tc.file))
		}
	}
}

// TestDecodeMapKeys: a map with more than MaxMapKeys keys is refused as too
// large; within the limit, a repeated key is found however many keys there
// are (the check is a set, not a comparison of every pair).
func TestDecodeMapKeys(t *testing.T) {
	keys := func(n int, dup bool) []byte {
		var buf bytes.Buffer
		e := msgpack.NewEncoder(&buf)
		_ = e.EncodeMapLen(n)
		for i := range n {
			k := "future_" + strconv.Itoa(i)
			if dup && i == n-1 {
				k = "future_0"
			}
			_ = e.EncodeString(k)
			_ = e.EncodeNil()
		}
		return buf.Bytes()
	}
	for _, tc := range []struct {
		name  string
		value []byte
		want  error
		field string
	}{
		{"256 distinct keys", keys(MaxMapKeys, false), nil, ""},
		{"a repeated key among 256", keys(MaxMapKeys, true), ErrInvalidField, "sessions[0].settings.future_0"},
		{"a repeated key among 20", keys(20, true), ErrInvalidField, "sessions[0].settings.future_0"},
		{"100,000 keys", keys(100_000, false), ErrTooLarge, "sessions[0].settings"},
	} {
		file := rawFile(t, rawSession(t, 1, 0, mp(t, "settings"), tc.value))
		_, err := Decode(bytes.NewReader(file))
		if tc.want == nil {
			if err != nil {
				t.Errorf("%s: %v", tc.name, err)
			}
			continue
		}
		var fe *FormatError
		if !errors.As(err, &fe) || !errors.Is(err, tc.want) || fe.Field != tc.field {
			t.Errorf("%s: got %v (field %q); want %v at %s", tc.name, err, fieldOf(err), tc.want, tc.field)
		}
	}
}

func fieldOf(err error) string {
	var fe *FormatError
	if errors.As(err, &fe) {
		return fe.Field
	}
	return ""
}

// TestDecodeNumbersKeepTheirValue: integers stored where a number is read
// keep their value or are refused; 2⁶⁴−1 used to come back as −1. The
// settings then go through fitcore's one validation of options, which
// names the setting and its range.
func TestDecodeNumbersKeepTheirValue(t *testing.T) {
	u64max := []byte{0xcf, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff}
	settings := func(kv ...[]byte) []byte {
		b := []byte{0x80 | byte(len(kv)/2)}
		for _, x := range kv {
			b = append(b, x...)
		}
		return rawSession(t, 1, 2, mp(t, "settings"), b)
	}
	history := func(row []byte) []byte {
		e := append([]byte{0x83}, mp(t, "at")...)
		e = append(e, mp(t, time.Date(2025, 3, 14, 8, 30, 0, 0, time.UTC))...)
		e = append(e, mp(t, "field")...)
		e = append(e, mp(t, "x")...)
		e = append(e, mp(t, "row")...)
		e = append(e, row...)
		return rawSession(t, 1, 2, mp(t, "history"), append([]byte{0x91}, e...))
	}
	for _, tc := range []struct {
		name, field, inText string
		file                []byte
		ok                  func(*Session) bool
	}{
		{name: "level 2⁶⁴−1", file: rawFile(t, settings(mp(t, "level"), u64max)), field: "sessions[0].settings.level", inText: "18446744073709551615"},
		{name: "level int64 −1", file: rawFile(t, settings(mp(t, "level"), []byte{0xd3, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff})),
			field: "sessions[0].settings.level", inText: "from 0.5 to 0.9999"},
		{name: "level 1e-300", file: rawFile(t, settings(mp(t, "level"), mp(t, 1e-300))), field: "sessions[0].settings.level", inText: "from 0.5 to 0.9999"},
		{name: "level 0 is the default", file: rawFile(t, settings(mp(t, "level"), []byte{0x00})),
			ok: func(s *Session) bool { return s.Settings.Level == 0 }},
		{name: "uncertainty as uint16 300", file: rawFile(t, settings(mp(t, "y_uncertainty"), []byte{0xcd, 0x01, 0x2c})),
			ok: func(s *Session) bool { return s.Settings.YUncertainty == 300 }},
		{name: "slope_ref int8 −3", file: rawFile(t, settings(mp(t, "slope_ref"), []byte{0xd0, 0xfd})),
			ok: func(s *Session) bool { return s.Settings.SlopeRef != nil && *s.Settings.SlopeRef == -3 }},
		{name: "origin with weights", file: rawFile(t, settings(mp(t, "model"), mp(t, "origin"), mp(t, "weights"), mp(t, "x"))),
			field: "sessions[0].settings.weights", inText: "through the origin"},
		{name: "log_y with a Box–Cox power", file: rawFile(t, settings(mp(t, "transform"), mp(t, "log_y"), mp(t, "box_cox_lambda"), mp(t, 0.5))),
			field: "sessions[0].settings.box_cox_lambda", inText: "box_cox"},
		{name: "history row 2⁶⁴−1", file: rawFile(t, history(u64max)), field: "sessions[0].history[0].row", inText: "18446744073709551615"},
		{name: "history row −1", file: rawFile(t, history([]byte{0xff})), ok: func(s *Session) bool { return s.History[0].Row == -1 }},
		{name: "history row 1.5", file: rawFile(t, history(mp(t, 1.5))), field: "sessions[0].history[0].row", inText: "whole number"},
	} {
		f, err := Decode(bytes.NewReader(tc.file))
		if tc.ok != nil {
			if err != nil || !tc.ok(f.Sessions[0]) {
				t.Errorf("%s: %v", tc.name, err)
			}
			continue
		}
		var fe *FormatError
		if !errors.As(err, &fe) || !errors.Is(err, ErrInvalidField) || fe.Field != tc.field || !strings.Contains(err.Error(), tc.inText) {
			t.Errorf("%s: got %v (field %q); want an invalid field at %s saying %q", tc.name, err, fieldOf(err), tc.field, tc.inText)
		}
	}
}

// TestSettingsOneValidation: what Decode refuses, Encode and SetSettings
// refuse too, with the same setting named (fitcore.Options.Normalize is
// the one validation).
func TestSettingsOneValidation(t *testing.T) {
	lambda := 0.5
	for _, tc := range []struct {
		name  string
		st    Settings
		field string
	}{
		{"origin with weights", Settings{Model: "origin", Weights: "x2"}, "weights"},
		{"log_y with λ", Settings{Transform: "log_y", BoxCoxLambda: &lambda}, "box_cox_lambda"},
		{"level 1e-300", Settings{Level: 1e-300}, "level"},
		{"level 0.99999", Settings{Level: 0.99999}, "level"},
		{"negative variance ratio", Settings{Model: "deming", VarianceRatio: -1}, "variance_ratio"},
		{"NaN uncertainty", Settings{XUncertainty: math.NaN()}, "x_uncertainty"},
	} {
		s := sampleSessions(t)[0]
		if err := s.SetSettings(tc.st, s.Modified.Add(time.Minute)); err == nil || !strings.Contains(err.Error(), tc.field) {
			t.Errorf("%s: SetSettings gave %v; want a refusal naming %s", tc.name, err, tc.field)
		}
		s.Settings = tc.st
		if _, err := EncodeBytes([]*Session{s}); !errors.Is(err, ErrInvalidField) || !strings.Contains(err.Error(), "settings."+tc.field) {
			t.Errorf("%s: Encode gave %v; want a refusal naming settings.%s", tc.name, err, tc.field)
		}
	}
}

// TestModifiedBeforeCreated: a last change more than ModifiedSkew before the
// start is refused; a clock put back by less is accepted.
func TestModifiedBeforeCreated(t *testing.T) {
	for _, tc := range []struct {
		back time.Duration
		ok   bool
	}{{time.Hour, true}, {ModifiedSkew, true}, {ModifiedSkew + time.Second, false}, {400 * 24 * time.Hour, false}} {
		g := genericSession()
		g["modified"] = g["created"].(time.Time).Add(-tc.back)
		_, err := Decode(bytes.NewReader(wrap(FormatMajor, FormatMinor, marshalBody(t, g))))
		if tc.ok != (err == nil) {
			t.Errorf("modified %v before created: %v", tc.back, err)
		}
		if !tc.ok && fieldOf(err) != "sessions[0].modified" {
			t.Errorf("modified %v before created: field %q", tc.back, fieldOf(err))
		}
	}
}

// BenchmarkDecodeManyKeys: a settings map with MaxMapKeys unknown keys, the
// most a map may hold, in every one of 1,000 sessions (the duplicate check
// used to compare every key with every other).
func BenchmarkDecodeManyKeys(b *testing.B) {
	var kv []byte
	for i := range MaxMapKeys {
		kv = append(kv, mp(b, "future_"+strconv.Itoa(i))...)
		kv = append(kv, 0xc0)
	}
	var ss [][]byte
	for i := range MaxSessions {
		ss = append(ss, rawSession(b, i, 0, mp(b, "settings"), append([]byte{0xde, MaxMapKeys >> 8, MaxMapKeys & 0xff}, kv...)))
	}
	file := rawFile(b, ss...)
	b.SetBytes(int64(len(file)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Decode(bytes.NewReader(file)); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkDecodeEmptyReadings: the worst case of the reading limits, four
// sessions of 250,000 empty readings (MaxFileReadings in all, 1 MB).
func BenchmarkDecodeEmptyReadings(b *testing.B) {
	var ss [][]byte
	for i := range MaxFileReadings / MaxReadings {
		ss = append(ss, rawSession(b, i, MaxReadings))
	}
	file := rawFile(b, ss...)
	b.SetBytes(int64(len(file)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Decode(bytes.NewReader(file)); err != nil {
			b.Fatal(err)
		}
	}
}

// FuzzSettings: stored settings are accepted exactly when fitcore's one
// validation of options accepts them (and the acceptance criteria are
// sound), and accepted settings come back unchanged from a file.
func FuzzSettings(f *testing.F) {
	f.Add("origin", "none", "x", 0.95, 0.0, false, 0.0, 0.0)
	f.Add("", "log_y", "", 0.0, 0.5, true, 0.0, 0.1)
	f.Add("deming", "box_cox", "", 1e-300, -2.0, true, 3.0, 0.0)
	f.Add("weighted", "", "fitted2", 0.9999, 0.0, false, 0.0, -1.0)
	f.Fuzz(func(t *testing.T, model, transform, weights string, level, lambda float64, hasLambda bool, vr, xu float64) {
		st := Settings{Model: fitcore.Model(model), Transform: fitcore.Transform(transform), Weights: fitcore.WeightScheme(weights),
			Level: level, VarianceRatio: vr, XUncertainty: xu}
		if hasLambda {
			st.BoxCoxLambda = &lambda
		}
		_, nerr := st.Options().Normalize()
		field, verr := st.validate()
		if (nerr == nil) != (verr == nil) {
			t.Fatalf("Normalize: %v; validate: %s %v", nerr, field, verr)
		}
		if verr != nil {
			var oe *fitcore.OptionError
			if !errors.As(nerr, &oe) || oe.Option != field || !errors.Is(verr, ErrInvalidField) {
				t.Fatalf("validate names %q (%v); Normalize %v", field, verr, nerr)
			}
			return
		}
		s := sampleSessions(t)[0]
		s.Settings = st
		b, err := EncodeBytes([]*Session{s})
		if err != nil {
			t.Fatal(err)
		}
		file, err := Decode(bytes.NewReader(b))
		if err != nil {
			t.Fatal(err)
		}
		if got := file.Sessions[0].Settings; !reflect.DeepEqual(got, st) {
			t.Fatalf("settings %+v came back as %+v", st, got)
		}
	})
}

// TestEncodeRefusesFileTotals: Encode refuses what Decode would refuse, so
// exporting many big sessions at once says so instead of writing a file
// the office cannot open.
func TestEncodeRefusesFileTotals(t *testing.T) {
	t0 := time.Date(2025, 3, 14, 8, 30, 0, 0, time.UTC)
	var ss []*Session
	for i := range MaxFileReadings/MaxReadings + 1 {
		s, _ := New("Big "+strconv.Itoa(i)+" (invented)", t0, nil)
		s.Readings = make([]Reading, MaxReadings)
		ss = append(ss, s)
	}
	_, err := EncodeBytes(ss)
	if !errors.Is(err, ErrTooLarge) || !strings.Contains(err.Error(), strconv.Itoa(MaxFileReadings)) {
		t.Errorf("%d sessions of %d readings: %v", len(ss), MaxReadings, err)
	}
}
