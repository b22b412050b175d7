package store

import (
	"errors"
	"testing"
	"time"
)

// The trash keeps a deleted session for TrashDays, restores it, and purges
// it after that; the list shows the newest change first.
func TestMemoryTrashAndList(t *testing.T) {
	t0 := time.Date(2026, 3, 1, 8, 0, 0, 0, time.UTC)
	m := NewMemory()
	for i, id := range []string{"a", "b", "c"} {
		if err := m.Save(Summary{ID: id, Title: id, Modified: t0.Add(time.Duration(i) * time.Hour)}, []byte(id)); err != nil {
			t.Fatal(err)
		}
	}
	list, _ := m.List()
	if len(list) != 3 || list[0].ID != "c" || list[2].ID != "a" {
		t.Fatalf("list order %+v", list)
	}
	m.SetLast("b")
	if err := m.Delete("b", t0.Add(24*time.Hour)); err != nil {
		t.Fatal(err)
	}
	if last, _ := m.Last(); last != "" {
		t.Errorf("the deleted session is still the last open one")
	}
	list, _ = m.List()
	trash, _ := m.Trash()
	if len(list) != 2 || len(trash) != 1 || trash[0].ID != "b" {
		t.Fatalf("after delete: list %v trash %v", list, trash)
	}
	if b, err := m.Load("b"); err != nil || string(b) != "b" {
		t.Errorf("a trashed session must still load: %q %v", b, err)
	}
	if n, _ := m.Purge(t0.Add((TrashDays - 1) * 24 * time.Hour)); n != 0 {
		t.Errorf("purged %d sessions inside the restore window", n)
	}
	if err := m.Restore("b"); err != nil {
		t.Fatal(err)
	}
	m.Delete("b", t0)
	if n, _ := m.Purge(t0.Add((TrashDays + 1) * 24 * time.Hour)); n != 1 {
		t.Errorf("purged %d sessions after the window, want 1", n)
	}
	if _, err := m.Load("b"); !errors.Is(err, ErrNotFound) {
		t.Errorf("purged session: %v", err)
	}
}

// Save keeps a copy (the Store contract): the screen reuses the memory of
// a saved state for the next one.
func TestMemorySaveCopies(t *testing.T) {
	m := NewMemory()
	body := []byte("first state")
	if err := m.Save(Summary{ID: "a", Title: "a"}, body); err != nil {
		t.Fatal(err)
	}
	copy(body, "XXXXX")
	got, err := m.Load("a")
	if err != nil || string(got) != "first state" {
		t.Errorf("stored %q, %v; want the bytes as they were when saved", got, err)
	}
}
