package session

import (
	"bytes"
	"errors"
	"strings"
	"testing"
	"time"
)

// restoreSession is an invented session of three readings and the
// history the methods wrote for them.
func restoreSession(t *testing.T) (*Session, time.Time) {
	t.Helper()
	t0 := time.Date(2026, 7, 1, 8, 0, 0, 0, time.UTC)
	s, err := New("Invented restore check", t0, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range [][2]string{{"1", "2.1"}, {"2", "3.9"}, {"3", "6.2"}} {
		s.AddRow(p[0], p[1], t0.Add(time.Duration(i)*time.Minute))
	}
	return s, t0
}

// TestRestoreKeepsHistoryValid: going back to a state with fewer readings
// keeps every history entry (the record is evidence), says in words what
// was undone, and records the new count, so the session still validates
// and encodes; going forward again records the count back.
func TestRestoreKeepsHistoryValid(t *testing.T) {
	s, t0 := restoreSession(t)
	before := snapshotForTest(s)
	if _, err := s.PasteRows(3, []string{"4", "5"}, []string{"8.1", "9.8"}, t0.Add(time.Hour)); err != nil {
		t.Fatal(err)
	}
	s.SetCell(4, ColumnX, "5.5", t0.Add(time.Hour+time.Minute))
	after := snapshotForTest(s)
	n := len(s.History)
	if err := s.Restore(before, FieldUndo, "paste of 2 readings", t0.Add(2*time.Hour)); err != nil {
		t.Fatal(err)
	}
	if len(s.Readings) != 3 {
		t.Fatalf("%d readings after undo, want 3", len(s.Readings))
	}
	want := []Edit{
		{Field: FieldUndo, Row: -1, Old: "", New: "paste of 2 readings"},
		{Field: FieldRows, Row: -1, Old: "5", New: "3"},
	}
	if len(s.History) != n+len(want) {
		t.Fatalf("history has %d entries, want the %d before and %d more: %+v", len(s.History), n, len(want), s.History[n:])
	}
	for i, w := range want {
		if g := s.History[n+i]; g.Field != w.Field || g.Row != w.Row || g.Old != w.Old || g.New != w.New {
			t.Errorf("entry %d = %+v, want %+v", n+i, g, w)
		}
	}
	if err := s.Validate(); err != nil {
		t.Fatalf("the session after undo does not validate: %v", err)
	}
	var buf bytes.Buffer
	if err := Encode(&buf, []*Session{s}); err != nil {
		t.Fatalf("the session after undo does not encode: %v", err)
	}
	f, err := Decode(&buf)
	if err != nil {
		t.Fatalf("the session after undo does not decode: %v", err)
	}
	if got := f.Sessions[0]; len(got.Readings) != 3 || len(got.History) != len(s.History) {
		t.Errorf("decoded %d readings and %d entries, want 3 and %d", len(got.Readings), len(got.History), len(s.History))
	}
	// Typing into row 4 again, then redo: the rows come back.
	s.AddRow("7", "", t0.Add(3*time.Hour))
	if err := s.Validate(); err != nil {
		t.Fatalf("a reading added after undo: %v", err)
	}
	if err := s.Restore(after, FieldRedo, "paste of 2 readings", t0.Add(4*time.Hour)); err != nil {
		t.Fatal(err)
	}
	if last := s.History[len(s.History)-1]; last.Field != FieldRows || last.Old != "4" || last.New != "5" {
		t.Errorf("the last entry after redo is %+v, want rows 4 → 5", last)
	}
	if s.Readings[4].X != "5.5" {
		t.Errorf("redo gave x of reading 5 = %q, want 5.5", s.Readings[4].X)
	}
	if err := s.Validate(); err != nil {
		t.Fatalf("the session after redo does not validate: %v", err)
	}
	if err := s.Restore(after, "rewrite", "", t0); !errors.Is(err, ErrNoSuchField) {
		t.Errorf("Restore with field %q: %v, want ErrNoSuchField", "rewrite", err)
	}
}

func snapshotForTest(s *Session) *Session {
	c := *s
	c.History = nil
	c.Readings = append([]Reading(nil), s.Readings...)
	c.Settings = s.Settings.clone()
	return &c
}

// TestValidateHistoryRows: every history entry must name a row that
// existed when it was made. Without a "rows" entry that is checked
// against the session's count (as for every file written before there
// were such entries); a "rows" entry gives the count at its point.
func TestValidateHistoryRows(t *testing.T) {
	at := time.Date(2026, 7, 1, 9, 0, 0, 0, time.UTC)
	e := func(field string, row int, old, new string) Edit {
		return Edit{At: at, Field: field, Row: row, Old: old, New: new}
	}
	for _, c := range []struct {
		name    string
		rows    int
		history []Edit
		bad     string // the field path named by the error; "" = valid
	}{
		{"old file, rows in range", 2, []Edit{e("row", 0, "", "added"), e("row", 1, "", "added"), e("x", 1, "", "3")}, ""},
		{"old file, a row beyond the readings", 1, []Edit{e("row", 0, "", "added"), e("x", 1, "", "3")}, "history[1].row"},
		{"undo took rows away", 1, []Edit{e("row", 0, "", "added"), e("row", 1, "", "added"), e("x", 1, "", "3"),
			e(FieldUndo, -1, "", "reading 2 added"), e(FieldRows, -1, "2", "1")}, ""},
		{"a row that did not exist before the rows entry", 1, []Edit{e("x", 2, "", "3"), e(FieldRows, -1, "2", "1")}, "history[0].row"},
		{"an entry after the rows entry names a row removed", 1, []Edit{e("row", 1, "", "added"), e(FieldRows, -1, "2", "1"), e("x", 1, "", "4")}, "history[2].row"},
		{"rows added after the rows entry", 3, []Edit{e(FieldRows, -1, "2", "1"), e("paste", -1, "", "2 readings added (rows 2–3)"), e("x", 2, "", "4")}, ""},
		{"redo brought rows back", 2, []Edit{e("x", 1, "", "3"), e(FieldRows, -1, "2", "1"), e(FieldRows, -1, "1", "2"), e("y", 1, "", "5")}, ""},
		{"a count more than the readings after it", 1, []Edit{e(FieldRows, -1, "1", "2")}, "history[0].new"},
		{"a count that is not a number", 1, []Edit{e(FieldRows, -1, "two", "1")}, "history[0].old"},
		{"a count with a sign", 1, []Edit{e(FieldRows, -1, "-1", "1")}, "history[0].old"},
		{"a count with a leading zero", 1, []Edit{e(FieldRows, -1, "02", "1")}, "history[0].old"},
		{"a count entry naming a row", 1, []Edit{e(FieldRows, 0, "2", "1")}, "history[0].row"},
	} {
		t.Run(c.name, func(t *testing.T) {
			s, err := New("Invented history check", at, nil)
			if err != nil {
				t.Fatal(err)
			}
			s.Readings = make([]Reading, c.rows)
			s.History = c.history
			err = s.Validate()
			switch {
			case c.bad == "" && err != nil:
				t.Errorf("valid history refused: %v", err)
			case c.bad != "" && err == nil:
				t.Errorf("invalid history accepted, want an error at %s", c.bad)
			case c.bad != "" && !strings.HasPrefix(err.Error(), c.bad+":"):
				t.Errorf("error %q, want one at %s", err, c.bad)
			case c.bad != "" && !errors.Is(err, ErrInvalidField):
				t.Errorf("error %v does not wrap ErrInvalidField", err)
			}
		})
	}
}
