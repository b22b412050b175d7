package ui

import (
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
)

// TestDescribeEdits: what undo and redo say they took back, in words.
func TestDescribeEdits(t *testing.T) {
	e := func(field string, row int, old, new string) session.Edit {
		return session.Edit{Field: field, Row: row, Old: old, New: new}
	}
	for _, c := range []struct {
		h    []session.Edit
		want string
	}{
		{[]session.Edit{e("x", 2, "", "12.5")}, "x of reading 3 typed as 12.5"},
		{[]session.Edit{e("y", 0, "4.1", "4.7")}, "y of reading 1 changed from 4.1 to 4.7"},
		{[]session.Edit{e("y", 0, "4.1", "")}, `y of reading 1 cleared (was "4.1")`},
		{[]session.Edit{e("row", 5, "", "added")}, "reading 6 added"},
		{[]session.Edit{e("excluded", 1, "false", "true"), e("exclude_reason", 1, "", "invented: bubble in the cell")}, "reading 2 left out (invented: bubble in the cell)"},
		{[]session.Edit{e("excluded", 1, "true", "false"), e("exclude_reason", 1, "invented", "")}, "reading 2 put back"},
		{[]session.Edit{e("settings", -1, `{"level":0.95}`, `{"level":0.95,"acceptance":{"min_r_squared":0.999}}`)}, "smallest R² allowed set to 0.999"},
		{[]session.Edit{e("settings", -1, `{"transform":"none","acceptance":{"slope_low":1.5}}`, `{"transform":"log_y"}`)}, "scale set to ln y, lowest slope cleared (was 1.5)"},
		{[]session.Edit{e("decimal_comma", -1, "", "true"), e("paste", -1, "", "3 readings added (rows 6–8)")}, "“1,234” read as 1.234 (decimal comma) and paste of 3 readings added (rows 6–8)"},
		{[]session.Edit{e("x", 0, "", "1"), e("y", 0, "", "2"), e("x", 1, "", "3")}, "x of reading 1 typed as 1 and 2 more changes"},
		{[]session.Edit{e("title", -1, "a", "Invented probe C-14")}, `title set to "Invented probe C-14"`},
		{nil, "the last change"},
	} {
		if got := describeEdits(c.h); got != c.want {
			t.Errorf("describeEdits(%+v) = %q, want %q", c.h, got, c.want)
		}
	}
}

// TestUndoRedoCriterion: undoing a criterion clears it from the settings,
// from the box the card draws and from the verdict; redo brings all three
// back. Typing a cell back to what it was leaves no step to undo.
func TestUndoRedoCriterion(t *testing.T) {
	t0 := time.Date(2026, 7, 1, 8, 0, 0, 0, time.UTC)
	s, err := session.New("Invented criterion check", t0, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range [][2]string{{"1", "2.1"}, {"2", "4.0"}, {"3", "6.1"}, {"4", "7.9"}} {
		s.AddRow(p[0], p[1], t0.Add(time.Duration(i)*time.Minute))
	}
	c := propShell(t, s)
	ctx := app.Context{}
	v := 0.9
	k := c.ctl.criteria()
	k.MinRSquared = &v
	c.anSetCriteria(ctx, k)
	judged := func() int {
		if c.ctl.view.report == nil || c.ctl.view.report.Acceptance == nil {
			return 0
		}
		return len(c.ctl.view.report.Acceptance.Results)
	}
	box := func() string {
		c.renderAcceptance()
		return c.an.anFieldVals["acceptance_min_r2"]
	}
	if box() != "0.9" || judged() != 1 {
		t.Fatalf("criterion not in use: box %q", box())
	}
	c.undo(ctx, app.Event{})
	if c.ctl.sess.Settings.Acceptance != nil || box() != "" || judged() != 0 {
		t.Errorf("after undo: settings %+v, box %q, %d criteria judged; want none", c.ctl.sess.Settings.Acceptance, box(), judged())
	}
	if c.ctl.unMsg != "Undone: smallest R² allowed set to 0.9." {
		t.Errorf("undo message %q", c.ctl.unMsg)
	}
	if !c.needSync {
		t.Error("undo did not ask for the text fields to be written again")
	}
	c.redo(ctx, app.Event{})
	if box() != "0.9" || judged() != 1 {
		t.Errorf("after redo: box %q, %d criteria judged; want the criterion back", box(), judged())
	}
	// Typed and typed back within the typing window: no step.
	depth := len(c.ctl.unStack)
	if err := c.ctl.setCell(0, session.ColumnX, "17"); err != nil {
		t.Fatal(err)
	}
	if err := c.ctl.setCell(0, session.ColumnX, "1"); err != nil {
		t.Fatal(err)
	}
	if len(c.ctl.unStack) != depth {
		t.Errorf("%d steps to undo after typing a cell back to what it was, want %d", len(c.ctl.unStack), depth)
	}
}

// TestSnapshotOwnsRecordLists: a state kept for undo is not changed by a
// later edit of a standard, a condition or an unknown's readings (their
// setters change the lists in place).
func TestSnapshotOwnsRecordLists(t *testing.T) {
	now := time.Date(2026, 5, 1, 10, 0, 0, 0, time.UTC)
	s, err := newSession(now)
	if err != nil {
		t.Fatal(err)
	}
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	_, err = s.AddStandard(session.Standard{Name: "KCl 500 (invented)", Value: "500"}, now)
	must(err)
	_, err = s.AddCondition(session.Condition{Name: "temperature", Value: "21.4", Unit: "°C"}, now)
	must(err)
	_, err = s.AddUnknown(session.Unknown{Name: "Tap 3 (invented)", Readings: []string{"612.0", "614.5"}}, now)
	must(err)
	kept := snapshot(s)
	must(s.SetStandard(0, session.Standard{Name: "KCl 500 (invented)", Value: "501"}, now))
	must(s.SetCondition(0, session.Condition{Name: "temperature", Value: "22.0", Unit: "°C"}, now))
	must(s.SetUnknown(0, session.Unknown{Name: "Tap 3 (invented)", Readings: []string{"612.0", "615.0"}}, now))
	if kept.Standards[0].Value != "500" || kept.Conditions[0].Value != "21.4" || kept.Unknowns[0].Readings[1] != "614.5" {
		t.Errorf("the kept state changed with the session: %+v %+v %+v", kept.Standards, kept.Conditions, kept.Unknowns)
	}
}
