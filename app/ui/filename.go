package ui

import (
	"strings"
	"unicode/utf8"

	"pairline/app/wording"
)

// maxFileBase caps the bytes of a file name made from a title (before its
// extension): common file systems allow 255 bytes, and a title is free text.
const maxFileBase = 80

// fileBase is the one rule for turning a session title into a file name
// without extension, for every file the app hands out (session file, CSV
// files, report). Characters that file systems or shells treat specially
// (/ \ : * ? " < > |), control characters and the hidden characters that
// reorder or hide text (wording.Hidden) become '-'; surrounding spaces go;
// the name is cut to at most maxFileBase bytes at a character boundary, so
// it stays valid UTF-8; an empty result is "pairline-session".
func fileBase(title string) string {
	var b strings.Builder
	for _, r := range strings.TrimSpace(title) {
		if r == utf8.RuneError || wording.Hidden(r) || strings.ContainsRune(`/\:*?"<>|`, r) {
			r = '-'
		}
		if b.Len()+utf8.RuneLen(r) > maxFileBase {
			break
		}
		b.WriteRune(r)
	}
	if s := strings.TrimSpace(b.String()); s != "" {
		return s
	}
	return "pairline-session"
}
