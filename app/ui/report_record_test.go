package ui

import (
	"regexp"
	"strings"
	"testing"
	"time"

	"pairline/app/session"
	"pairline/fitcore"
)

// recSession is an invented record of the fictional Larkwater Valley Water
// Board: seven readings, the third left out with a reason, then put back
// and the fifth left out, acceptance criteria set.
func recSession(t *testing.T) *session.Session {
	t.Helper()
	now := time.Date(2026, 3, 2, 9, 0, 0, 0, time.UTC)
	s, err := session.New("Probe check (invented)", now, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range [][2]string{{"1", "1.02"}, {"2", "2.01"}, {"3", "3.2"}, {"4", "3.98"}, {"5", "5.4"}, {"6", "6.01"}, {"7", "6.99"}} {
		s.AddRow(p[0], p[1], now)
	}
	step := func(m int) time.Time { return now.Add(time.Duration(m) * time.Minute) }
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	must(s.Exclude(2, "bubble on the probe", step(1)))
	must(s.Include(2, step(2)))
	must(s.Exclude(4, "sample spilled", step(3)))
	st := s.Settings
	r2 := 0.99
	st.Acceptance = &fitcore.Criteria{MinRSquared: &r2}
	must(s.SetSettings(st, step(4)))
	return s
}

// TestReportRecordWords: the report says the verdict's criteria, the
// history and the readings left out in words, as the record stands: the
// reading put back is not listed as left out, the one left out is, with
// its reason; no field name or JSON reaches the page.
func TestReportRecordWords(t *testing.T) {
	s := recSession(t)
	rep, rows := analyzed(t, s)
	renumberReport(rep, rows)
	body := rpBody(s, rep, rows, "", time.Now())
	text := regexp.MustCompile(`<[^>]*>`).ReplaceAllString(body, " ")
	for _, want := range []string{
		"R² at least",                        // the criterion in words
		"Reading 5 left out: sample spilled", // history, in words
		"Reading 3 left out: bubble on the probe",
		"Reading 3 put back into the line",
		"Reading 5 (5, 5.4): sample spilled", // the readings left out now
		"Performed by", "Reviewed by",        // the signature block
	} {
		if !strings.Contains(text, want) {
			t.Errorf("the report does not say %q", want)
		}
	}
	left := body[strings.Index(body, `data-testid="report-left-out"`):]
	left = left[:strings.Index(left, "</section>")]
	if strings.Contains(left, "bubble on the probe") {
		t.Error("the reading put back is still listed as left out")
	}
	hist := body[strings.Index(body, `data-testid="report-history"`):]
	for _, bad := range []string{"exclude_reason", "min_r_squared", `{"`, "acceptance\":"} {
		if strings.Contains(hist, bad) {
			t.Errorf("the report's history shows %q", bad)
		}
	}
	if strings.Contains(text, "r_squared") {
		t.Error("the report names a criterion by its key")
	}
}

// TestReportPageMargins: every printed page carries the title in its
// margin box, as a CSS string of escapes only: a title that tries to end
// the style element stays text.
func TestReportPageMargins(t *testing.T) {
	s := recSession(t)
	s.Title = `Probe "A" </style><script>x</script> (invented)`
	body := rpBody(s, nil, nil, "no line", time.Now())
	style := body[:strings.Index(body, "</style>")+len("</style>")]
	if strings.Count(body, "</style>") != 1 || strings.Contains(body, "<script") {
		t.Fatal("the title escaped from the style element")
	}
	for _, want := range []string{"@top-left", `counter(page) " of " counter(pages)`, `Probe \22 A\22  \3c \2f style\3e `} {
		if !strings.Contains(style, want) {
			t.Errorf("the page rule lacks %q:\n%s", want, style)
		}
	}
}
