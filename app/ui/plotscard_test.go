package ui

import (
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/demo"
	"pairline/app/numfmt"
)

// plotsShell is a Shell natively with the invented demo session whose
// reading demo.MistypedRow has a slipped decimal point (fitcore flags it).
func plotsShell(t *testing.T) *Shell {
	t.Helper()
	ss, err := demo.Sessions(time.Date(2026, 7, 1, 8, 0, 0, 0, time.UTC), nil)
	if err != nil {
		t.Fatal(err)
	}
	return propShell(t, ss[2])
}

// TestPlotsCardRender: the card draws from its data alone (natively, as
// go-app prerenders): the note before there is a line; the four plots, the
// legend at the bands' level and the notes kept in place but hidden; the
// ring and the panel of the reading selected, whose buttons name their
// actions; the panel's figures with their full values; "Put back" for a
// left-out reading; a refusal as an alert.
func TestPlotsCardRender(t *testing.T) {
	c := plotsShell(t)
	ps := c.pl.drawing(c.ctl)
	row := demo.MistypedRow
	panel := c.pl.point(c.ctl, row)
	if !panel.Flagged || len(panel.More) != 3 {
		t.Fatalf("the mistyped reading's panel is not flagged with its figures: %+v", panel)
	}
	first := pointPanel{Row: 0, Rows: 9, XHead: "x", YHead: "y", X: "1", Y: "2", Status: "Used in the line."}
	last := pointPanel{Row: 8, Rows: 9, X: "9", Y: "18", Excluded: true, Status: "Left out of the line: invented reason",
		Msg: "Invented refusal."}
	tests := []struct {
		name    string
		card    plotsCard
		want    []string
		notWant []string
	}{
		{"no line", plotsCard{Empty: true, Sel: -1},
			[]string{"The plots appear once there are at least 3 usable pairs of readings."},
			[]string{`data-testid="plot-fit"`, `data-testid="plot-point-open"`}},
		{"plots", plotsCard{Plots: ps, Level: 0.95, Sel: -1, Rows: 20},
			[]string{`data-testid="plot-fit"`, `data-testid="plot-residuals"`, `data-testid="plot-order"`, `data-testid="plot-qq"`,
				"95 % band of the line", "95 % band of a new reading", `data-testid="plot-point-open"`,
				"Tap a point to see that reading"},
			[]string{`data-testid="plot-point-panel"`, "-selected", "Updating the plots"}},
		{"stale", plotsCard{Plots: ps, Level: 0.99, Stale: true, Sel: -1},
			[]string{"Updating the plots after your last change…", "99 % band of the line"}, nil},
		{"selected", plotsCard{Plots: ps, Level: 0.95, Sel: row, Rows: panel.Rows, Panel: panel},
			[]string{`data-testid="plot-point-panel"`, `data-row="` + strconv.Itoa(row) + `"`, "Reading " + strconv.Itoa(row+1),
				`data-testid="plot-fit-selected"`, `data-testid="plot-qq-selected"`,
				"◆ Flagged: this reading stands out from the line. It looks like a slipped decimal point",
				`data-value="` + numfmt.Full(panel.Facts[1].Value) + `"`, `data-value="` + numfmt.Full(panel.More[2].Value) + `"`,
				"Show the numbers", `data-testid="plot-point-flags"`, `data-testid="plot-point-reason"`, `data-act="exclude"`},
			[]string{`data-act="include"`, `data-testid="plot-point-message"`}},
		{"first reading", plotsCard{Plots: ps, Sel: 0, Rows: 9, Panel: first},
			[]string{`data-testid="plot-point-status"`, "Used in the line.", `data-act="exclude"`},
			[]string{"Flagged", "Show the numbers"}},
		{"left out", plotsCard{Plots: ps, Sel: 8, Rows: 9, Panel: last},
			[]string{"Left out of the line: invented reason", `data-act="include"`, "Put back into the line",
				`role="alert"`, "Invented refusal."},
			[]string{`data-testid="plot-point-reason"`}},
	}
	for _, tt := range tests {
		html := app.HTMLString(&tt.card)
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
		if tt.card.Empty {
			continue
		}
		// The hint button is hidden while a panel is open; the previous
		// and next buttons stop at the ends.
		open := tagWith(html, `data-testid="plot-point-open"`)
		if boolAttr(open, "hidden") != (tt.card.Sel >= 0) {
			t.Errorf("%s: the button that opens the panel is %q", tt.name, open)
		}
		if tt.card.Sel < 0 {
			continue
		}
		prev, next := tagWith(html, `data-testid="plot-point-prev"`), tagWith(html, `data-testid="plot-point-next"`)
		if boolAttr(prev, "disabled") != (tt.card.Panel.Row == 0) || boolAttr(next, "disabled") != (tt.card.Panel.Row == tt.card.Panel.Rows-1) {
			t.Errorf("%s: previous %q, next %q", tt.name, prev, next)
		}
		if !strings.Contains(prev, `data-step="-1"`) || !strings.Contains(next, `data-step="1"`) {
			t.Errorf("%s: the steps are not in the buttons: %q, %q", tt.name, prev, next)
		}
	}
}

// boolAttr reports whether the tag carries the boolean attribute name set
// (go-app writes a false one as name="false").
func boolAttr(tag, name string) bool {
	return strings.Contains(tag, " "+name+" ") || strings.Contains(tag, " "+name+">") || strings.Contains(tag, " "+name+`="true"`)
}

// TestPointViewIsFitcores: the panel's figures are fitcore's for that
// reading (the fitted value, the residual, the influence and its reasons),
// a reading not used says why, and the typed reason and the refusal are
// the Shell's.
func TestPointViewIsFitcores(t *testing.T) {
	c := plotsShell(t)
	rep, rows := c.ctl.view.report, c.ctl.view.rows
	for i, row := range rows {
		p := c.pl.point(c.ctl, row)
		if p.Row != row || p.X != c.ctl.sess.Readings[row].X || p.Y != c.ctl.sess.Readings[row].Y || p.Status != "Used in the line." {
			t.Fatalf("row %d: panel %+v", row, p)
		}
		if len(p.Facts) != 2 || p.Facts[0].Value != rep.Fitted[i] || p.Facts[1].Value != rep.Residuals[i] {
			t.Fatalf("row %d: the figures %+v are not fitcore's fitted %v and residual %v", row, p.Facts, rep.Fitted[i], rep.Residuals[i])
		}
		for _, q := range rep.Influence {
			if q.Index != i {
				continue
			}
			if len(p.More) != 3 || p.More[0].Value != q.Studentized || p.More[1].Value != q.Leverage || p.More[2].Value != q.CooksD {
				t.Fatalf("row %d: the influence %+v is not fitcore's %+v", row, p.More, q)
			}
			if p.Flagged != q.Flagged || (q.Flagged && strings.Join(p.Reasons, "|") != strings.Join(q.Reasons, "|")) {
				t.Fatalf("row %d: flag %v %v, fitcore %v %v", row, p.Flagged, p.Reasons, q.Flagged, q.Reasons)
			}
		}
		if (p.Slip != "") != (rep.Slip != nil && rep.Slip.Index == i) {
			t.Errorf("row %d: slip sentence %q", row, p.Slip)
		}
	}
	c.ctl.sess.Readings[0].Y = "not a number"
	c.pl.plReason, c.pl.plMsg = "invented reason", "invented refusal"
	c.ctl.changed()
	p := c.pl.point(c.ctl, 0)
	if p.Status != "Not used: a cell is empty or not a number." || len(p.Facts) != 0 || p.Reason != "invented reason" || p.Msg != "invented refusal" {
		t.Errorf("a reading not used: %+v", p)
	}
}

// TestApplyPlot: what the plots card sends selects and steps through the
// readings, keeps the reason typed, refuses to leave a reading out without
// a reason, and leaves it out and puts it back through the controller, so
// that the change is saved and can be undone like any other.
func TestApplyPlot(t *testing.T) {
	c := plotsShell(t)
	row := demo.MistypedRow
	n := len(c.ctl.sess.Readings)
	at := panelPlace{top: true, y: 80, h: 300}
	tests := []struct {
		name  string
		a     PlotAction
		check func() string
	}{
		{"tap", PlotAction{Kind: paTap, Row: row, At: at}, func() string {
			if c.pl.plSel != row+1 || c.pl.plAt != at {
				return "not selected where tapped: " + strconv.Itoa(c.pl.plSel)
			}
			card := c.renderPlots().(*plotsCard)
			if card.Sel != row || card.Panel.Row != row || card.Panel.At != at || card.Empty {
				return "the card was not given the selection"
			}
			if card.First != row {
				return "the panel without a tap does not open on the flagged reading but on " + strconv.Itoa(card.First)
			}
			return ""
		}},
		{"tap outside", PlotAction{Kind: paTap, Row: n, At: panelPlace{}}, func() string {
			if c.pl.plSel != row+1 || c.pl.plAt != at {
				return "a tap past the last reading changed the selection"
			}
			return ""
		}},
		{"reason cleared", PlotAction{Kind: paReason, Row: row, Text: ""}, func() string {
			if c.pl.plReason != "" {
				return "the reason is " + c.pl.plReason
			}
			return ""
		}},
		{"exclude without a reason", PlotAction{Kind: paExclude, Row: row}, func() string {
			if c.ctl.sess.Readings[row].Excluded || !strings.Contains(c.pl.plMsg, "Say why") {
				return "left out without a reason, or not said why not: " + c.pl.plMsg
			}
			return ""
		}},
		{"reason for another reading", PlotAction{Kind: paReason, Row: row + 1, Text: "wrong reading"}, func() string {
			if c.pl.plReason != "" {
				return "a reason typed for another reading was kept"
			}
			return ""
		}},
		{"reason", PlotAction{Kind: paReason, Row: row, Text: "invented: decimal point slipped"}, func() string {
			if c.pl.plReason != "invented: decimal point slipped" || c.renderPlots().(*plotsCard).Panel.Reason != c.pl.plReason {
				return "the reason was not kept for the panel"
			}
			return ""
		}},
		{"exclude", PlotAction{Kind: paExclude, Row: row}, func() string {
			rd := c.ctl.sess.Readings[row]
			if !rd.Excluded || rd.ExcludeReason != "invented: decimal point slipped" || c.pl.plReason != "" || c.pl.plMsg != "" {
				return "not left out with its reason"
			}
			if c.ctl.view.report.N != n-1 || len(c.ctl.unStack) == 0 {
				return "the line or the undo history did not see it"
			}
			return ""
		}},
		{"include", PlotAction{Kind: paInclude, Row: row}, func() string {
			if c.ctl.sess.Readings[row].Excluded || c.ctl.view.report.N != n {
				return "not put back"
			}
			return ""
		}},
		{"step back", PlotAction{Kind: paStep, Row: row - 1}, func() string {
			if c.pl.plSel != row || c.pl.plAt != at {
				return "not stepped back, or the panel moved"
			}
			return ""
		}},
		{"step past the start", PlotAction{Kind: paStep, Row: -1}, func() string {
			if c.pl.plSel != row {
				return "stepped before the first reading"
			}
			return ""
		}},
		{"close", PlotAction{Kind: paClose}, func() string {
			if c.pl.plSel != 0 || c.renderPlots().(*plotsCard).Sel != -1 {
				return "the panel is still open"
			}
			return ""
		}},
	}
	for _, tt := range tests {
		c.renderPlots().(*plotsCard).OnAction(tt.a)
		if msg := tt.check(); msg != "" {
			t.Errorf("%s: %s", tt.name, msg)
		}
	}
	if !c.ctl.undo() || !c.ctl.sess.Readings[row].Excluded {
		t.Error("undo did not take back the putting back")
	}
}

// TestPlotsCardActs: the card's actions reach OnAction as sent, and a
// card without OnAction drops them.
func TestPlotsCardActs(t *testing.T) {
	var got []PlotAction
	card := plotsCard{OnAction: func(a PlotAction) { got = append(got, a) }}
	card.act(PlotAction{Kind: paStep, Row: 4})
	card.act(PlotAction{Kind: paReason, Row: 4, Text: "invented"})
	if len(got) != 2 || got[0] != (PlotAction{Kind: paStep, Row: 4}) || got[1].Text != "invented" {
		t.Errorf("OnAction got %+v", got)
	}
	(&plotsCard{}).act(PlotAction{Kind: paClose}) // must not panic
}
