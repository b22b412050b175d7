package ui

import (
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
)

// TestReportDialogRender: the dialog draws from its data alone (natively,
// as go-app prerenders): the report's markup as given, the three buttons
// each naming its action in data-act, and the status line only when there
// is something to say.
func TestReportDialogRender(t *testing.T) {
	body := `<article class="pl-report" data-testid="report"><h1>Invented report body</h1></article>`
	tests := []struct {
		name    string
		d       reportDialog
		want    []string
		notWant []string
	}{
		{"opened", reportDialog{Body: body},
			[]string{body, `data-testid="report-view"`, `role="dialog"`, `aria-label="Report"`,
				"Print or save as PDF", "Save as HTML file", "Close report"},
			[]string{`role="status"`}},
		{"saved", reportDialog{Body: body, Msg: "Saved “Invented.html” to your downloads."},
			[]string{body, `role="status"`, "Saved “Invented.html” to your downloads."}, nil},
	}
	for _, tt := range tests {
		html := app.HTMLString(&tt.d)
		for _, w := range tt.want {
			if !strings.Contains(html, w) {
				t.Errorf("%s: %q not in the markup", tt.name, w)
			}
		}
		for _, w := range tt.notWant {
			if strings.Contains(html, w) {
				t.Errorf("%s: %q in the markup", tt.name, w)
			}
		}
		for id, act := range map[string]string{"report-print": rdPrint, "report-save-html": rdSaveHTML, "report-close": rdClose} {
			if tag := tagWith(html, `data-testid="`+id+`"`); !strings.Contains(tag, `data-act="`+act+`"`) {
				t.Errorf("%s: the button %s is %q, without data-act %q", tt.name, id, tag, act)
			}
		}
	}
}

// TestReportDialogActs: what the dialog sends reaches OnAction as it was
// sent, and a dialog without OnAction drops it.
func TestReportDialogActs(t *testing.T) {
	var got []ReportAction
	d := reportDialog{OnAction: func(a ReportAction) { got = append(got, a) }}
	for _, k := range []string{rdPrint, rdSaveHTML, rdClose} {
		d.act(ReportAction{Kind: k})
	}
	if len(got) != 3 || got[0].Kind != rdPrint || got[1].Kind != rdSaveHTML || got[2].Kind != rdClose {
		t.Errorf("OnAction got %+v", got)
	}
	(&reportDialog{}).act(ReportAction{Kind: rdClose}) // must not panic
}

// TestApplyReport: the Shell opens the report from the open session and
// fitcore's report, hands the dialog that markup, saves the file with the
// session's name, closes it, and builds the markup again when the analysis
// changed under the open report.
func TestApplyReport(t *testing.T) {
	c := cardsShell(t)
	c.rp.show(app.Context{}, c.ctl, &c.pl)
	if !c.rp.rpOpen || c.rp.rpFor != c.ctl.view.report || !strings.Contains(c.rp.rpHTML, `data-testid="report"`) {
		t.Fatalf("the report did not open from the analysis (open %v)", c.rp.rpOpen)
	}
	d, ok := c.renderReport().(*reportDialog)
	if !ok || d.Body != c.rp.rpHTML || d.Msg != "" || d.OnAction == nil {
		t.Fatalf("the dialog was not given the report: %#v", d)
	}
	tests := []struct {
		name  string
		a     ReportAction
		check func() string
	}{
		{"print natively does nothing", ReportAction{Kind: rdPrint}, func() string {
			if !c.rp.rpOpen || c.rp.rpMsg != "" {
				return "printing changed the dialog"
			}
			return ""
		}},
		{"save", ReportAction{Kind: rdSaveHTML}, func() string {
			if want := "Saved “" + fileBase(c.ctl.sess.Title) + " report.html” to your downloads."; c.rp.rpMsg != want {
				return "message " + c.rp.rpMsg + ", want " + want
			}
			if d := c.renderReport().(*reportDialog); d.Msg != c.rp.rpMsg {
				return "the dialog does not show the message"
			}
			return ""
		}},
		{"unknown kind", ReportAction{Kind: "no-such"}, func() string {
			if !c.rp.rpOpen {
				return "an unknown action closed the report"
			}
			return ""
		}},
		{"close", ReportAction{Kind: rdClose}, func() string {
			if c.rp.rpOpen {
				return "the report is still open"
			}
			return ""
		}},
	}
	for _, tt := range tests {
		c.renderReport().(*reportDialog).OnAction(tt.a)
		if msg := tt.check(); msg != "" {
			t.Errorf("%s: %s", tt.name, msg)
		}
	}

	// A change under an open report: the dialog shows the new figures.
	c.rp.show(app.Context{}, c.ctl, &c.pl)
	old := c.rp.rpHTML
	if err := c.ctl.setCell(0, session.ColumnY, "2.5"); err != nil {
		t.Fatal(err)
	}
	d = c.renderReport().(*reportDialog)
	if c.rp.rpFor != c.ctl.view.report || d.Body == old || !strings.Contains(d.Body, c.ctl.sess.Readings[0].Y) {
		t.Error("the dialog kept the report of before the change")
	}
}

// TestApplyReportShowAll: "show all" lists every reading of a long
// session's report on the screen (the first rpRowsAtOnce before).
func TestApplyReportShowAll(t *testing.T) {
	t0 := time.Date(2026, 7, 1, 8, 0, 0, 0, time.UTC)
	s, err := session.New("Invented long report", t0, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i := range rpRowsAtOnce + 20 {
		s.AddRow(strconv.Itoa(i+1), strconv.FormatFloat(2*float64(i+1)+0.1*float64(i%7), 'f', 1, 64), t0)
	}
	c := propShell(t, s)
	c.rp.show(app.Context{}, c.ctl, &c.pl)
	if !strings.Contains(c.rp.rpHTML, `data-testid="report-readings-all"`) {
		t.Fatal("a long session's report offers no show all")
	}
	c.rp.apply(app.Context{}, c.ctl, &c.pl, ReportAction{Kind: rdShowAll})
	if !c.rp.rpAll || strings.Contains(c.rp.rpHTML, `data-testid="report-readings-all"`) {
		t.Errorf("after show all: rpAll %v, the button still there: %v", c.rp.rpAll, strings.Contains(c.rp.rpHTML, `data-testid="report-readings-all"`))
	}
}
