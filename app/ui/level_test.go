package ui

import (
	"testing"

	"pairline/fitcore"
)

// TestLevelFromPercent checks the custom level field against the range
// fitcore.Options.Normalize accepts: every level the field lets through is
// one fitcore takes, and the bounds themselves are accepted.
func TestLevelFromPercent(t *testing.T) {
	tests := []struct {
		pct  float64
		want float64
		ok   bool
	}{
		{50, 0.5, true},
		{95, 0.95, true},
		{99.99, fitcore.MaxLevel, true},
		{99.995, 0, false}, // was accepted before; fitcore refuses it
		{99.999, 0, false},
		{100, 0, false},
		{49.99, 0, false},
		{0, 0, false},
		{-5, 0, false},
	}
	for _, tt := range tests {
		got, msg := levelFromPercent(tt.pct)
		if (msg == "") != tt.ok {
			t.Errorf("levelFromPercent(%v): message %q, want ok=%v", tt.pct, msg, tt.ok)
			continue
		}
		if !tt.ok {
			continue
		}
		if got != tt.want {
			t.Errorf("levelFromPercent(%v) = %v, want %v", tt.pct, got, tt.want)
		}
		if _, err := (fitcore.Options{Level: got}).Normalize(); err != nil {
			t.Errorf("levelFromPercent(%v) = %v, which fitcore refuses: %v", tt.pct, got, err)
		}
	}
}

// TestLevelRangeText keeps the field's hint as it read before the bounds
// came from fitcore.
func TestLevelRangeText(t *testing.T) {
	if got, want := levelRangeText(), "between 50 and 99.99"; got != want {
		t.Errorf("levelRangeText() = %q, want %q", got, want)
	}
}
