package ui

import (
	"regexp"
	"strings"
	"testing"
	"time"

	"pairline/app/demo"
	"pairline/app/numfmt"
)

// A saved report is one self-contained file: no script, nothing fetched,
// the four plots inline, the readings with the left-out one marked with
// its reason, and the figures equal to fitcore's.
func TestReportFileSelfContained(t *testing.T) {
	ss, err := demo.Sessions(time.Now(), nil)
	if err != nil {
		t.Fatal(err)
	}
	s := ss[2] // the pressure check with the decimal slip
	if err := s.Exclude(demo.MistypedRow, "decimal point slipped", time.Now()); err != nil {
		t.Fatal(err)
	}
	rep, rows := analyzed(t, s)
	f := rpFile(s, rpBody(s, rep, rows, "", time.Now()))
	for _, bad := range []string{"<script", "<link", " src=", "@import", "https://"} {
		if strings.Contains(f, bad) {
			t.Errorf("the report file holds %q", bad)
		}
	}
	if m := regexp.MustCompile(`url\([^#]`).FindString(f); m != "" {
		t.Errorf("the report file refers to something outside itself: %s", m)
	}
	for _, m := range regexp.MustCompile(`http://[^"' ]*`).FindAllString(f, -1) {
		if m != "http://www.w3.org/2000/svg" {
			t.Errorf("the report file refers to %s", m)
		}
	}
	if n := strings.Count(f, "<svg "); n != 4 {
		t.Errorf("%d plots inline, want 4", n)
	}
	for _, id := range []string{"plot-fit", "plot-residuals", "plot-order", "plot-qq"} {
		if !strings.Contains(f, `data-testid="`+id+`"`) {
			t.Errorf("no %s in the report", id)
		}
	}
	if !strings.Contains(f, "□ Left out: decimal point slipped") {
		t.Error("the left-out reading is not marked with its reason")
	}
	for _, v := range []float64{rep.Slope.Estimate, rep.Intercept.Estimate, rep.RSquared, rep.ResidualSE} {
		if !strings.Contains(f, `data-value="`+numfmt.Full(v)+`"`) {
			t.Errorf("the report does not carry fitcore's %v", v)
		}
	}
	for _, want := range []string{"not a certification", "History of changes", "Larkwater Valley", "Acceptance"} {
		if !strings.Contains(f, want) {
			t.Errorf("the report does not say %q", want)
		}
	}
}
