package ui

import "testing"

// TestSaveStateString keeps the save-status data-state values the browser
// tests and README's hook table name.
func TestSaveStateString(t *testing.T) {
	for _, tt := range []struct {
		s    SaveState
		want string
	}{{SaveNone, ""}, {SaveSaving, "saving"}, {SaveSaved, "saved"}, {SaveFailed, "failed"}} {
		if got := tt.s.String(); got != tt.want {
			t.Errorf("SaveState(%d).String() = %q, want %q", int(tt.s), got, tt.want)
		}
	}
}
