package session

import (
	"bytes"
	"testing"
	"time"
)

// Typing a value key by key is one edit; a later change of the same cell, or a
// change of another cell, is a new one (common practice for audit trails:
// record what changed, not every keystroke).
func TestHistoryCoalescesTyping(t *testing.T) {
	t0 := time.Date(2026, 5, 4, 9, 0, 0, 0, time.UTC)
	s, err := New("typing", t0, nil)
	if err != nil {
		t.Fatal(err)
	}
	s.AddRow("", "", t0)
	for i, text := range []string{"1", "12", "12.", "12.5"} {
		if err := s.SetCell(0, ColumnX, text, t0.Add(time.Duration(i)*time.Second)); err != nil {
			t.Fatal(err)
		}
	}
	s.SetCell(0, ColumnY, "3", t0.Add(5*time.Second))
	s.SetCell(0, ColumnX, "12.6", t0.Add(10*time.Minute))
	want := []Edit{
		{Field: "row", Row: 0, Old: "", New: "added"},
		{Field: "x", Row: 0, Old: "", New: "12.5"},
		{Field: "y", Row: 0, Old: "", New: "3"},
		{Field: "x", Row: 0, Old: "12.5", New: "12.6"},
	}
	if len(s.History) != len(want) {
		t.Fatalf("history has %d entries, want %d: %+v", len(s.History), len(want), s.History)
	}
	for i, w := range want {
		g := s.History[i]
		if g.Field != w.Field || g.Row != w.Row || g.Old != w.Old || g.New != w.New {
			t.Errorf("entry %d = %+v, want %+v", i, g, w)
		}
	}
	// Typing a value back to what it was within the window leaves no entry.
	s.SetCell(0, ColumnY, "35", t0.Add(10*time.Minute+time.Second))
	s.SetCell(0, ColumnY, "3", t0.Add(10*time.Minute+2*time.Second))
	if n := len(s.History); n != len(want) {
		t.Errorf("typing back to the old value left %d entries, want %d", n, len(want))
	}
}

// TestPasteRows: pasted pairs overwrite the rows they land on (each change
// recorded with the old text) and add the rest with one "paste" entry.
func TestPasteRows(t *testing.T) {
	now := time.Date(2026, 6, 1, 9, 0, 0, 0, time.UTC)
	s, err := New("Invented paste check", now, nil)
	if err != nil {
		t.Fatal(err)
	}
	s.AddRow("1", "2.0", now)
	s.AddRow("2", "4.1", now)
	h0 := len(s.History)
	later := now.Add(time.Minute)
	added, err := s.PasteRows(1, []string{"2", "3", "4", "5"}, []string{"4.2", "6.1", "8.0", "9.9"}, later)
	if err != nil || added != 3 {
		t.Fatalf("PasteRows = %d, %v; want 3 rows added", added, err)
	}
	if len(s.Readings) != 5 || s.Readings[1].Y != "4.2" || s.Readings[4].X != "5" || s.Readings[4].Y != "9.9" || !s.Readings[4].Taken.Equal(later) {
		t.Fatalf("readings after the paste: %+v", s.Readings)
	}
	got := s.History[h0:]
	// Row 2's x was already "2" (no entry); its y changed; then one entry for the 3 rows added.
	if len(got) != 2 || got[0].Field != "y" || got[0].Row != 1 || got[0].Old != "4.1" || got[0].New != "4.2" ||
		got[1].Field != "paste" || got[1].New != "3 readings added (rows 3–5)" {
		t.Errorf("history of the paste: %+v", got)
	}
	if _, err := s.PasteRows(9, []string{"1"}, []string{"1"}, later); err == nil {
		t.Error("a paste below the last row + 1 was accepted")
	}
	if _, err := s.PasteRows(0, []string{"1", "2"}, []string{"1"}, later); err == nil {
		t.Error("a paste with unequal columns was accepted")
	}
}

// A device clock put back days after a session was started must not make
// its record invalid: the last-change stamp never goes back, the history
// entry keeps the time the device gave.
func TestClockPutBackKeepsRecordValid(t *testing.T) {
	start := time.Date(2026, 6, 1, 9, 0, 0, 0, time.UTC)
	s, err := New("Invented clock test", start, nil)
	if err != nil {
		t.Fatal(err)
	}
	back := start.Add(-72 * time.Hour)
	s.AddRow("1", "2", back)
	if s.Modified.Before(s.Created) {
		t.Fatalf("modified %v is before created %v", s.Modified, s.Created)
	}
	var buf bytes.Buffer
	if err := Encode(&buf, []*Session{s}); err != nil {
		t.Fatalf("a record edited with the clock put back cannot be saved: %v", err)
	}
	if _, err := Decode(&buf); err != nil {
		t.Fatalf("a record edited with the clock put back cannot be read: %v", err)
	}
	if got := s.History[len(s.History)-1].At; !got.Equal(back) {
		t.Errorf("history entry at %v, want the device's time %v", got, back)
	}
}
