package session

import (
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
