package store

import (
	"errors"
	"testing"
	"time"
)

// TestErrorForName checks the mapping of the browser's DOMException names.
// Source of the names: the WebIDL standard's table of DOMException names
// (QuotaExceededError, legacy code 22) and Firefox's older
// NS_ERROR_DOM_QUOTA_REACHED (from memory).
func TestErrorForName(t *testing.T) {
	tests := []struct {
		name, message string
		quota         bool
		want          string
	}{
		{"QuotaExceededError", "The quota has been exceeded.", true, ErrQuota.Error()},
		{"NS_ERROR_DOM_QUOTA_REACHED", "", true, ErrQuota.Error()},
		{"InvalidStateError", "The database connection is closing.", false, "InvalidStateError: The database connection is closing."},
		{"AbortError", "", false, "AbortError"},
		{"", "", false, "the browser's storage refused the operation"},
	}
	for _, tc := range tests {
		err := errorForName(tc.name, tc.message)
		if IsQuota(err) != tc.quota {
			t.Errorf("%q: IsQuota = %v, want %v", tc.name, IsQuota(err), tc.quota)
		}
		if err.Error() != tc.want {
			t.Errorf("%q: %q, want %q", tc.name, err.Error(), tc.want)
		}
	}
}

// TestMemorySaveAllAndTrash follows a bundle import, a deletion, a restore
// and the purge after TrashDays (30 days; our own rule, see TrashDays).
func TestMemorySaveAllAndTrash(t *testing.T) {
	m := NewMemory()
	now := time.Date(2026, 3, 1, 9, 0, 0, 0, time.UTC)
	sums := []Summary{{ID: "a", Title: "A", Modified: now}, {ID: "b", Title: "B", Modified: now.Add(time.Minute)}}
	if err := m.SaveAll(sums, [][]byte{{1}, {2}}); err != nil {
		t.Fatal(err)
	}
	if err := m.SaveAll(sums, [][]byte{{1}}); err == nil {
		t.Error("SaveAll with a missing body must fail")
	}
	list, _ := m.List()
	if len(list) != 2 || list[0].ID != "b" {
		t.Fatalf("List = %+v, want b then a", list)
	}
	if err := m.Delete("a", now); err != nil {
		t.Fatal(err)
	}
	trash, _ := m.Trash()
	if len(trash) != 1 || trash[0].ID != "a" {
		t.Fatalf("Trash = %+v", trash)
	}
	if n, _ := m.Purge(now.Add(29 * 24 * time.Hour)); n != 0 {
		t.Errorf("purged %d sessions after 29 days, want 0", n)
	}
	if err := m.Restore("a"); err != nil {
		t.Fatal(err)
	}
	if list, _ := m.List(); len(list) != 2 {
		t.Errorf("after restore List has %d sessions, want 2", len(list))
	}
	m.Delete("a", now)
	if n, _ := m.Purge(now.Add(31 * 24 * time.Hour)); n != 1 {
		t.Errorf("purged %d sessions after 31 days, want 1", n)
	}
	if _, err := m.Load("a"); !errors.Is(err, ErrNotFound) {
		t.Errorf("Load after purge: %v, want ErrNotFound", err)
	}
}
