package ui

import (
	"strings"
	"testing"
	"unicode/utf8"
)

// TestFileBase is the table of the one file-name rule (fileBase) used by
// every download: session file, readings and results CSV, report.
func TestFileBase(t *testing.T) {
	long := strings.Repeat("µ", 50) // 100 bytes: the cut falls inside a character unless it respects boundaries
	tests := []struct {
		name, in, want string
	}{
		{"slash", "Probe C-12 / intake", "Probe C-12 - intake"},
		{"blank", "  ", "pairline-session"},
		{"empty", "", "pairline-session"},
		{"reserved", "a:b*c?d\"e<f>g|h\\i", "a-b-c-d-e-f-g-h-i"},
		{"non-ASCII kept", "Messung 1,5 µS/cm", "Messung 1,5 µS-cm"},
		{"control", "a\tb\nc\x7fd", "a-b-c-d"},
		{"bidi override", "probe\u202etxt.exe", "probe-txt.exe"},
		{"isolate", "x\u2066y\u2069", "x-y-"},
		{"invalid UTF-8", "a\xffb", "a-b"},
		{"cut at a character", long, strings.Repeat("µ", 40)},
		{"cut ASCII", strings.Repeat("a", 100), strings.Repeat("a", 80)},
		{"cut then trailing space trimmed", strings.Repeat("a", 79) + "  b", strings.Repeat("a", 79)},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := fileBase(tt.in)
			if got != tt.want {
				t.Errorf("fileBase(%q) = %q, want %q", tt.in, got, tt.want)
			}
			if !utf8.ValidString(got) || len(got) > maxFileBase {
				t.Errorf("fileBase(%q) = %q: not valid UTF-8 or longer than %d bytes", tt.in, got, maxFileBase)
			}
		})
	}
}

// FuzzFileBase: whatever the title, the name is valid UTF-8, at most
// maxFileBase bytes, not empty, and free of the reserved characters.
func FuzzFileBase(f *testing.F) {
	f.Add("Probe C-12 / intake")
	f.Add(strings.Repeat("µ", 50))
	f.Add("a\xffb\u202e")
	f.Fuzz(func(t *testing.T, in string) {
		got := fileBase(in)
		if got == "" || !utf8.ValidString(got) || len(got) > maxFileBase || strings.ContainsAny(got, `/\:*?"<>|`) {
			t.Fatalf("fileBase(%q) = %q", in, got)
		}
	})
}
