package ui

import (
	"testing"
	"time"

	"pairline/app/session"
	"pairline/app/store"
)

// TestTabSyncOtherSaved: what this tab does about a version another tab
// stored, by the rule of tabs.go's package comment (a fast-forward only
// when this tab has no edits of its own since the version it started
// from; otherwise it asks, and saves nothing meanwhile).
func TestTabSyncOtherSaved(t *testing.T) {
	tests := []struct {
		name      string
		edit      bool // this tab typed into the session after it was shown
		id        func(open *session.Session) string
		mod, base func(seen int64) int64
		want      tabReply
	}{
		{"another session", false, func(*session.Session) string { return "other-session" },
			func(seen int64) int64 { return seen + 1000 }, func(seen int64) int64 { return seen }, tabList},
		{"this tab's own version", false, func(s *session.Session) string { return s.ID },
			func(seen int64) int64 { return seen }, func(seen int64) int64 { return seen - 1000 }, tabList},
		{"newer, no edits here", false, func(s *session.Session) string { return s.ID },
			func(seen int64) int64 { return seen + 1000 }, func(seen int64) int64 { return seen }, tabReload},
		{"newer, from another version", false, func(s *session.Session) string { return s.ID },
			func(seen int64) int64 { return seen + 1000 }, func(seen int64) int64 { return seen - 1 }, tabAsk},
		{"newer, edits here", true, func(s *session.Session) string { return s.ID },
			func(seen int64) int64 { return seen + 1000 }, func(seen int64) int64 { return seen }, tabAsk},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			k := newController(store.NewMemory())
			s, err := newSession(time.Now().Add(-time.Hour))
			if err != nil {
				t.Fatal(err)
			}
			k.openSession(s)
			var tabs tabSync
			tabs.opened(s)
			k.held = func() bool { return tabs.held(k.sess) }
			if tt.edit {
				if err := k.setCell(0, session.ColumnX, "1.5"); err != nil {
					t.Fatal(err)
				}
			}
			seen := tabs.seen
			got := tabs.otherSaved(k, tt.id(s), tt.mod(seen), tt.base(seen))
			if got != tt.want {
				t.Fatalf("otherSaved = %d, want %d", got, tt.want)
			}
			asked := tabs.elsewhere != nil
			if asked != (tt.want == tabAsk) {
				t.Errorf("question asked: %v, want %v", asked, tt.want == tabAsk)
			}
			if k.heldElsewhere() != (tt.want == tabAsk) {
				t.Errorf("controller held: %v, want %v", k.heldElsewhere(), tt.want == tabAsk)
			}
			if asked {
				// "Keep this tab's version": this tab's version replaces
				// the other one and the save goes ahead.
				tabs.keep(tabs.elsewhere)
				if tabs.elsewhere != nil || tabs.seen != tt.mod(seen) || k.heldElsewhere() {
					t.Errorf("after keep: elsewhere %v, seen %d (want %d), held %v", tabs.elsewhere, tabs.seen, tt.mod(seen), k.heldElsewhere())
				}
			}
		})
	}
}

// TestListShown: the list draws the first listPage sessions, and as many
// more as "show more" asked for, never more than there are.
func TestListShown(t *testing.T) {
	all := make([]store.Summary, 75)
	tests := []struct {
		n, more, want int
	}{
		{0, 0, 0}, {10, 0, 10}, {75, 0, listPage}, {75, listPage + listPage, 2 * listPage}, {75, 200, 75}, {31, listPage, 30},
	}
	for _, tt := range tests {
		if got := len(listShown(all[:tt.n], tt.more)); got != tt.want {
			t.Errorf("listShown(%d sessions, more %d) draws %d, want %d", tt.n, tt.more, got, tt.want)
		}
	}
}
