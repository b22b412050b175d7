package wording

import (
	"strings"
	"testing"
	"unicode/utf8"
)

// TestVisible: the escape sequences that retitle or clear a terminal (ECMA-48
// CSI and OSC, xterm's "ESC ] 0 ; title BEL"), a newline that forges a line of
// output, C1 controls, bidirectional overrides (Unicode TR #9) and bytes that
// are not UTF-8 come out as visible escapes; ordinary text is unchanged.
func TestVisible(t *testing.T) {
	cases := []struct {
		name, in, want string
	}{
		{"plain", "Conductivity (µS/cm) – λ ≈ 0.5", "Conductivity (µS/cm) – λ ≈ 0.5"},
		{"empty", "", ""},
		{"backslash kept", `C:\data\probe.csv`, `C:\data\probe.csv`},
		{"forged checksum line", "Probe A\nchecksum OK (SHA-256 00)", `Probe A\x0achecksum OK (SHA-256 00)`},
		{"carriage return overwrite", "bad\rgood", `bad\x0dgood`},
		{"OSC retitle", "\x1b]0;owned\x07Title", `\x1b]0;owned\x07Title`},
		{"OSC with ST", "\x1b]2;t\x1b\\", `\x1b]2;t\x1b\`},
		{"CSI clear screen", "\x1b[2J\x1b[H", `\x1b[2J\x1b[H`},
		{"C1 CSI", "a\u009b2Jb", `a\u009b2Jb`},
		{"DEL and NUL", "a\x7fb\x00", `a\x7fb\x00`},
		{"tab", "x\ty", `x\x09y`},
		{"right-to-left override", "invoice\u202Etxt.exe", `invoice\u202etxt.exe`},
		{"isolates", "\u2066a\u2069", `\u2066a\u2069`},
		{"marks", "\u200e\u200f\u061c", `\u200e\u200f\u061c`},
		{"line separator", "a\u2028b", `a\u2028b`},
		{"invalid UTF-8", "a\xffb\xc3", `a\xffb\xc3`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := Visible(c.in)
			if got != c.want {
				t.Errorf("Visible(%q) = %q, want %q", c.in, got, c.want)
			}
			if hidden := firstHidden(got); hidden >= 0 {
				t.Errorf("Visible(%q) = %q still holds a control at byte %d", c.in, got, hidden)
			}
		})
	}
}

func TestVisibleLines(t *testing.T) {
	in := "Title: \x1b[2J\nNotes: ok\u202e\n"
	want := "Title: \\x1b[2J\nNotes: ok\\u202e\n"
	if got := VisibleLines(in); got != want {
		t.Errorf("VisibleLines = %q, want %q", got, want)
	}
	if got := VisibleLines("a\nb\n"); got != "a\nb\n" {
		t.Errorf("VisibleLines changed plain lines: %q", got)
	}
}

// FuzzVisible: whatever the input, the output is valid UTF-8 with no
// control, bidirectional or separator character, on one line, and text
// that needs no escape comes back as it was.
func FuzzVisible(f *testing.F) {
	for _, s := range []string{"", "plain", "\x1b]0;t\x07", "a\u202eb", "\xff\xfe", "µ\n\r\t"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		got := Visible(s)
		if !utf8.ValidString(got) || firstHidden(got) >= 0 || strings.ContainsAny(got, "\n\r") {
			t.Fatalf("Visible(%q) = %q", s, got)
		}
		if firstHidden(s) != firstHiddenSlow(s) {
			t.Fatalf("the fast scan finds %d, the rune scan %d in %q", firstHidden(s), firstHiddenSlow(s), s)
		}
		if firstHidden(s) < 0 && got != s {
			t.Fatalf("Visible changed %q to %q", s, got)
		}
	})
}

// BenchmarkVisible: a megabyte of session notes with an escape every few
// hundred bytes (linear in the text; the common case, nothing to escape,
// does not copy).
func BenchmarkVisible(b *testing.B) {
	plain := strings.Repeat("Standards at 25 °C, probe rinsed between readings. ", 20000)
	hostile := strings.Repeat("Standards at 25 °C\x1b[2J, probe\u202e rinsed. ", 25000)
	b.Run("plain", func(b *testing.B) {
		b.SetBytes(int64(len(plain)))
		for b.Loop() {
			Visible(plain)
		}
	})
	b.Run("escapes", func(b *testing.B) {
		b.SetBytes(int64(len(hostile)))
		for b.Loop() {
			Visible(hostile)
		}
	})
}
