package session

import (
	"bytes"
	"encoding/json"
	"os"
	"reflect"
	"testing"
)

// TestFormat10StillOpens: testdata/format-1.0.pairline is the test vector
// written by format 1.0 (testdata/session/sample.pairline at commit
// e3b0f91, before the calibration record existed), and format-1.0.json is
// what that version decoded it to. This version must open it, find the
// same sessions (the 1.1 fields empty: no conditions, standards,
// unknowns or seal, revision 0), write it again as 1.1 and read that back
// unchanged.
func TestFormat10StillOpens(t *testing.T) {
	old, err := os.ReadFile("testdata/format-1.0.pairline")
	if err != nil {
		t.Fatal(err)
	}
	f, err := Decode(bytes.NewReader(old))
	if err != nil {
		t.Fatalf("a format 1.0 file no longer opens: %v", err)
	}
	if f.Major != 1 || f.Minor != 0 || len(f.Warnings) != 0 {
		t.Fatalf("format %d.%d with warnings %q, want 1.0 without warnings", f.Major, f.Minor, f.Warnings)
	}
	js, err := os.ReadFile("testdata/format-1.0.json")
	if err != nil {
		t.Fatal(err)
	}
	var want File
	if err := json.Unmarshal(js, &want); err != nil {
		t.Fatal(err)
	}
	if len(want.Sessions) != len(f.Sessions) || len(f.Sessions) == 0 {
		t.Fatalf("%d sessions, the 1.0 reader found %d", len(f.Sessions), len(want.Sessions))
	}
	for i, s := range f.Sessions {
		if !reflect.DeepEqual(s, want.Sessions[i]) {
			g, _ := json.Marshal(s)
			w, _ := json.Marshal(want.Sessions[i])
			t.Errorf("session %d differs from what format 1.0 read:\n%s\n%s", i, g, w)
		}
		if s.Revision != 0 || s.Seal != nil || s.Sealed != nil || s.Conditions != nil || s.Standards != nil || s.Unknowns != nil ||
			s.Instrument.ID != "" || s.Instrument.IntervalDays != 0 {
			t.Errorf("session %d: a 1.0 file gave record fields: %+v", i, s)
		}
		if ok, err := s.VerifySeal(); ok || err != ErrNotSealed {
			t.Errorf("session %d: VerifySeal = %v, %v; want false, ErrNotSealed", i, ok, err)
		}
	}
	b, err := EncodeBytes(f.Sessions)
	if err != nil {
		t.Fatal(err)
	}
	g, err := Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	if g.Minor != FormatMinor || !reflect.DeepEqual(g.Sessions, f.Sessions) {
		t.Errorf("writing the 1.0 sessions as %d.%d and reading them back changed them", FormatMajor, g.Minor)
	}
}
