package ui

import (
	"testing"
	"time"

	"pairline/app/session"
)

// TestPristine: a new session (one blank row) is not stored until its first
// real change, and the list counts only readings that hold something.
func TestPristine(t *testing.T) {
	now := time.Date(2026, 5, 1, 10, 0, 0, 0, time.UTC)
	for _, tc := range []struct {
		name     string
		edit     func(s *session.Session) error
		pristine bool
		filled   int
	}{
		{"new", func(s *session.Session) error { return nil }, true, 0},
		{"another blank row", func(s *session.Session) error { s.AddRow("", "", now); return nil }, true, 0},
		{"a value", func(s *session.Session) error { return s.SetCell(0, session.ColumnX, "12.5", now) }, false, 1},
		{"a note only", func(s *session.Session) error { return s.SetCell(0, session.ColumnNote, "probe rinsed", now) }, false, 1},
		{"a title", func(s *session.Session) error { return s.SetField(session.FieldTitle, "Intake (invented)", now) }, false, 0},
		{"typed and cleared", func(s *session.Session) error {
			if err := s.SetCell(0, session.ColumnY, "3", now); err != nil {
				return err
			}
			return s.SetCell(0, session.ColumnY, "", now.Add(time.Second)) // the same entry, typed back: no change
		}, true, 0},
		{"two values, a blank row", func(s *session.Session) error {
			s.AddRow("1", "2", now)
			s.AddRow("", "", now)
			return nil
		}, false, 1},
	} {
		s, err := newSession(now)
		if err != nil {
			t.Fatal(err)
		}
		if err := tc.edit(s); err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if got := pristine(s); got != tc.pristine {
			t.Errorf("%s: pristine = %v, want %v", tc.name, got, tc.pristine)
		}
		if got := filledReadings(s); got != tc.filled {
			t.Errorf("%s: filled readings = %d, want %d", tc.name, got, tc.filled)
		}
	}
}
