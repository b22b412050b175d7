package ui

import (
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	hv "pairline/app/history/view"
	"pairline/app/session"
	"pairline/app/store"
)

// TestSessionsListRender: the list draws from its data alone (natively, as
// go-app prerenders): one item per summary drawn, the open one marked, the
// due marks given and an empty slot for the others, the rename and delete
// questions, "show more" with the count of older sessions, and the trash.
func TestSessionsListRender(t *testing.T) {
	t0 := time.Date(2026, 7, 1, 8, 0, 0, 0, time.UTC)
	sums := []store.Summary{
		{ID: "a1", Title: "Invented pH probe, Larkwater intake", Readings: 1, Site: "Intake", Modified: t0},
		{ID: "b2", Title: "Invented flow meter", Readings: 5, Modified: t0},
		{ID: "c3", Title: "Invented turbidity meter", Readings: 0, Modified: t0},
	}
	count := func(html, s string) int { return strings.Count(html, s) }
	tests := []struct {
		name    string
		list    sessionsList
		want    []string
		notWant []string
		items   int
	}{
		{"empty", sessionsList{}, []string{"No session is stored yet.", `data-testid="session-list"`, "Show the trash"},
			[]string{`data-testid="sessions-more"`, `data-testid="trash"`}, 0},
		{"plain", sessionsList{Sessions: sums, OpenID: "b2",
			Due: map[string]hv.DueMark{"a1": {State: hv.DueOverdue, Text: "overdue by 3 days"}, "c3": {State: hv.DueNone, Text: "no interval"}}},
			[]string{`data-id="a1"`, "1 reading · Intake · changed ", "5 readings · changed ",
				`data-testid="session-due"`, `data-state="overdue"`, "overdue by 3 days",
				`class="pl-due-slot"`, `data-act="open"`, `data-act="rename"`, `data-act="delete"`},
			[]string{"No session is stored yet.", "no interval", `data-testid="sessions-more"`, `data-testid="session-rename-input"`}, 3},
		{"paged", sessionsList{Sessions: sums, Older: 45},
			[]string{`data-testid="sessions-more"`, "Show " + strconv.Itoa(listPage) + " more of 45 older sessions"}, nil, 3},
		{"few older", sessionsList{Sessions: sums, Older: 2}, []string{"Show 2 more of 2 older sessions"}, nil, 3},
		{"renaming", sessionsList{Sessions: sums, Renaming: "b2", RenameText: "New invented title"},
			[]string{`data-testid="session-rename-input"`, `value="New invented title"`, `data-testid="session-rename-save"`, `data-act="rename-save"`, "Cancel"},
			[]string{"5 readings"}, 3},
		{"deleting", sessionsList{Sessions: sums, ConfirmDel: "c3"},
			[]string{"Move “Invented turbidity meter” to the trash? It can be restored for " + strconv.Itoa(store.TrashDays) + " days.",
				`pl-session-confirm`, `data-testid="session-delete-confirm"`, "Keep it"}, nil, 3},
		{"trash", sessionsList{TrashOpen: true, Trash: []store.Summary{{ID: "d4", Title: "Invented old meter", Readings: 2, Deleted: t0}}},
			[]string{"Hide the trash", `data-testid="trash"`, `data-testid="trash-item"`, `data-id="d4"`,
				"2 readings · deleted ", "can be restored until ", `data-act="restore"`}, []string{"The trash is empty."}, 0},
		{"trash empty", sessionsList{TrashOpen: true}, []string{"The trash is empty."}, nil, 0},
	}
	for _, tt := range tests {
		html := app.HTMLString(&tt.list)
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
		if tt.list.OpenID != "" {
			// go-app writes an element's attributes in no fixed order: find
			// the open session's tag and look inside it.
			tag := tagWith(html, `data-id="`+tt.list.OpenID+`"`)
			if !strings.Contains(tag, "pl-session-open") || !strings.Contains(tag, `data-testid="session-item"`) {
				t.Errorf("%s: the open session's item is %q, not marked open", tt.name, tag)
			}
			for _, o := range tt.list.Sessions {
				if tag := tagWith(html, `data-id="`+o.ID+`"`); o.ID != tt.list.OpenID && strings.Contains(tag, "pl-session-open") {
					t.Errorf("%s: %s is marked open: %q", tt.name, o.ID, tag)
				}
			}
		}
		if n := count(html, `data-testid="session-item"`); n != tt.items {
			t.Errorf("%s: %d items, want %d", tt.name, n, tt.items)
		}
	}
}

// tagWith returns the first start tag of html that holds attr ("" if none).
func tagWith(html, attr string) string {
	i := strings.Index(html, attr)
	if i < 0 {
		return ""
	}
	lo := strings.LastIndexByte(html[:i], '<')
	hi := strings.IndexByte(html[i:], '>')
	if lo < 0 || hi < 0 {
		return ""
	}
	return html[lo : i+hi+1]
}

// listShell is a Shell natively with a stored list of n invented sessions
// (summaries only) and the first of them open.
func listShell(t *testing.T, n int) *Shell {
	t.Helper()
	t0 := time.Date(2026, 7, 1, 8, 0, 0, 0, time.UTC)
	s, err := session.New("Invented open session", t0, nil)
	if err != nil {
		t.Fatal(err)
	}
	c := propShell(t, s)
	c.ctl.sessions = []store.Summary{{ID: s.ID, Title: s.Title, Modified: t0}}
	for i := 1; i < n; i++ {
		c.ctl.sessions = append(c.ctl.sessions, store.Summary{ID: "x" + strconv.Itoa(i), Title: "Invented " + strconv.Itoa(i), Modified: t0})
	}
	return c
}

// TestApplyList: the list's actions change the screen's state (questions,
// paging, trash) or, for the open session's title, the session through the
// controller; what the Shell gives the list afterwards says so.
func TestApplyList(t *testing.T) {
	c := listShell(t, 75)
	list := func() *sessionsList { return c.renderSessions().(*sessionsList) }
	if l := list(); len(l.Sessions) != listPage || l.Older != 75-listPage || l.OpenID != c.ctl.sess.ID {
		t.Fatalf("first page: %d drawn, %d older, open %q", len(l.Sessions), l.Older, l.OpenID)
	}
	c.applyList(app.Context{}, ListAction{Kind: laMore})
	if l := list(); len(l.Sessions) != 2*listPage || l.Older != 75-2*listPage {
		t.Errorf("after one show more: %d drawn, %d older", len(l.Sessions), l.Older)
	}
	c.applyList(app.Context{}, ListAction{Kind: laMore})
	if l := list(); len(l.Sessions) != 75 || l.Older != 0 {
		t.Errorf("after two: %d drawn, %d older", len(l.Sessions), l.Older)
	}

	c.applyList(app.Context{}, ListAction{Kind: laDelete, ID: "x3"})
	if l := list(); l.ConfirmDel != "x3" {
		t.Errorf("delete asked: ConfirmDel %q", l.ConfirmDel)
	}
	c.applyList(app.Context{}, ListAction{Kind: laDeleteKeep, ID: "x3"})
	if l := list(); l.ConfirmDel != "" {
		t.Errorf("kept: ConfirmDel %q", l.ConfirmDel)
	}

	c.applyList(app.Context{}, ListAction{Kind: laRename, ID: "x2"})
	if l := list(); l.Renaming != "x2" || l.RenameText != "Invented 2" {
		t.Errorf("rename asked: %q %q", l.Renaming, l.RenameText)
	}
	c.applyList(app.Context{}, ListAction{Kind: laRenameCancel, ID: "x2"})
	if l := list(); l.Renaming != "" {
		t.Errorf("cancelled: still renaming %q", l.Renaming)
	}

	id := c.ctl.sess.ID
	c.applyList(app.Context{}, ListAction{Kind: laRename, ID: id})
	c.applyList(app.Context{}, ListAction{Kind: laRenameText, Text: "Invented new title"})
	if l := list(); l.RenameText != "Invented new title" {
		t.Errorf("typed: %q", l.RenameText)
	}
	c.applyList(app.Context{}, ListAction{Kind: laRenameSave, ID: id})
	if c.ctl.sess.Title != "Invented new title" || c.renaming != "" {
		t.Errorf("open session renamed to %q (renaming %q)", c.ctl.sess.Title, c.renaming)
	}

	c.applyList(app.Context{}, ListAction{Kind: laTrash})
	if l := list(); !l.TrashOpen {
		t.Error("trash not shown")
	}
	c.applyList(app.Context{}, ListAction{Kind: laTrash})
	if l := list(); l.TrashOpen {
		t.Error("trash not hidden")
	}

	// The due marks are values of the instrument view's, for the drawn
	// sessions only.
	c.inst.instView = &hv.View{Due: map[string]hv.DueMark{"x1": {State: hv.DueSoon, Text: "due in 2 days"}, "x2": {State: hv.DueNone}}}
	l := list()
	if m, ok := l.Due["x1"]; !ok || m.State != hv.DueSoon {
		t.Errorf("due mark of x1: %+v %v", m, ok)
	}
	if _, ok := l.Due["x2"]; ok {
		t.Error("a session without a due date got a mark")
	}
	c.inst.instView.Due["x1"] = hv.DueMark{State: hv.DueOverdue}
	if l.Due["x1"].State != hv.DueSoon {
		t.Error("the list's due marks share the instrument view's map")
	}
}
