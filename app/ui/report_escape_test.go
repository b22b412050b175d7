package ui

import (
	"bytes"
	"fmt"
	"strings"
	"testing"
	"time"

	"pairline/app/session"
	"pairline/app/wording"
)

// TestReportEscapesSessionText: every text of the session reaches the
// report's HTML escaped: markup as entities, control characters and
// bidirectional overrides as visible escapes (in the plots' SVG, where
// app/plot drops them), and the saved file's name has neither.
func TestReportEscapesSessionText(t *testing.T) {
	s, err := session.New("Probe <script>alert(1)</script>\u202egnp.exe\x1b]0;t\x07", time.Date(2026, 3, 1, 9, 0, 0, 0, time.UTC),
		bytes.NewReader(bytes.Repeat([]byte{3}, 64)))
	if err != nil {
		t.Fatal(err)
	}
	s.Notes = "a\nb <img src=x onerror=alert(1)>\u2066"
	s.XName, s.XUnit, s.YName, s.YUnit = "std\x1b[2J", "µS/cm\u009b", "meter\"'&", "u\u202e"
	s.Site, s.Operator = "</td><td>forged", "op\x00"
	for i, y := range []string{"1.1", "2.0", "3.2", "3.9", "5.1"} {
		s.Readings = append(s.Readings, session.Reading{X: fmt.Sprint(i + 1), Y: y, Note: "n<b>\u202e"})
	}
	s.Readings = append(s.Readings, session.Reading{X: "<i>7", Y: "\x1b[2J", Excluded: true, ExcludeReason: "<u>bubble\u202e"})
	rep, rows := analyzed(t, s)
	body := rpBody(s, rep, rows, "", time.Now())
	file := rpFile(s, body)
	for _, bad := range []string{"<script", "<img", "<i>7", "<u>", "<b>", "</td><td>forged", "\x1b", "\u202e", "\u2066", "\u009b", "\x00"} {
		if strings.Contains(file, bad) {
			t.Errorf("the report holds %q raw", bad)
		}
	}
	for _, want := range []string{`Probe &lt;script&gt;alert(1)&lt;/script&gt;\u202egnp.exe\x1b]0;t\x07`, `std\x1b[2J`, `u\u202e`,
		`&lt;u&gt;bubble\u202e`, `a b &lt;img`} {
		if !strings.Contains(file, want) {
			t.Errorf("the report lacks %q", want)
		}
	}
	if name := fileBase(s.Title); strings.ContainsFunc(name, wording.Hidden) {
		t.Errorf("file name %q holds a control or bidirectional character", name)
	}
}
