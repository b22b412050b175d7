package ui

import (
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
)

// edit applies a change as the screen does: change, then edited's hook.
func (c *Shell) testEdit(f func()) {
	f()
	c.ctl.undoTrack()
	c.ctl.analyse()
}

// TestUndo: typing a cell key by key is one step; leaving a reading out is
// one step; undo restores the state before it, keeps every history entry
// and records itself.
func TestUndo(t *testing.T) {
	t0 := time.Date(2026, 7, 1, 8, 0, 0, 0, time.UTC)
	s, err := session.New("Invented undo check", t0, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range [][2]string{{"1", "2.1"}, {"2", "3.9"}, {"3", "6.2"}, {"4", "8.1"}} {
		s.AddRow(p[0], p[1], t0.Add(time.Duration(i)*time.Minute))
	}
	c := newShell()
	c.show(s)
	c.ctl.undoSync()
	at := t0.Add(time.Hour)
	row := s.AddRow("", "", at)
	c.testEdit(func() {})
	for i, txt := range []string{"5", "5.", "5.0"} {
		c.testEdit(func() { c.ctl.sess.SetCell(row, session.ColumnX, txt, at.Add(time.Duration(i+1)*time.Second)) })
	}
	c.testEdit(func() { c.ctl.sess.Exclude(1, "invented reason", at.Add(time.Minute)) })
	if got := len(c.ctl.unStack); got != 3 {
		t.Fatalf("%d undo steps, want 3 (row added, x typed, reading left out)", got)
	}
	hist := len(c.ctl.sess.History)
	c.undo(app.Context{}, app.Event{})
	if c.ctl.sess.Readings[1].Excluded {
		t.Error("undo did not put reading 2 back")
	}
	if c.ctl.sess.Readings[row].X != "5.0" {
		t.Errorf("undo went too far: x of the new row is %q", c.ctl.sess.Readings[row].X)
	}
	if len(c.ctl.sess.History) != hist+1 || c.ctl.sess.History[hist].Field != "undo" {
		t.Errorf("history has %d entries (was %d), last %+v: want every entry kept and the undo recorded", len(c.ctl.sess.History), hist, c.ctl.sess.History[len(c.ctl.sess.History)-1])
	}
	c.undo(app.Context{}, app.Event{})
	if c.ctl.sess.Readings[row].X != "" {
		t.Errorf("undoing the typing leaves %q, want the empty cell", c.ctl.sess.Readings[row].X)
	}
	if c.ctl.view.report == nil || c.ctl.view.report.N != 4 {
		t.Errorf("after undo the line uses %v pairs, want 4", c.ctl.view.report)
	}
	if err := c.ctl.sess.Validate(); err != nil {
		t.Errorf("the restored session is not valid: %v", err)
	}
}

// A very big session keeps fewer undo states (each is a copy of the
// readings), never fewer than 5.
func TestUndoDepthFor(t *testing.T) {
	for _, c := range []struct{ n, want int }{{0, 20}, {10, 20}, {10000, 20}, {50000, 20}, {100000, 10}, {400000, 5}, {1000000, 5}} {
		if got := undoDepthFor(c.n); got != c.want {
			t.Errorf("undoDepthFor(%d) = %d, want %d", c.n, got, c.want)
		}
	}
}
