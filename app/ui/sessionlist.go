package ui

// The list of stored sessions as a go-app component, as the cards are
// (cards.go, record.go, transfer_render.go): its data come in as exported
// fields (the summaries drawn, which one is open, their due marks, the
// paging, the rename and delete questions, the trash), never a pointer
// into the Shell, and what the technician does goes out as a ListAction
// through OnAction; the Shell applies it (applyList, sessions.go).
//
// A handler reads the session it acts on from the element's list item
// (data-id) and its kind from data-act when it runs: go-app v10.1.11 keeps
// an element's first handler when a new one comes from the same function
// literal, so a list item reused for another session would otherwise act
// on the first.

import (
	"strconv"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	hv "pairline/app/history/view"
	"pairline/app/numfmt"
	"pairline/app/store"
)

// Kinds of ListAction.
const (
	laOpen          = "open"           // open the session ID
	laRename        = "rename"         // ask for a new title of the session ID
	laRenameText    = "rename-text"    // the title typed is Text
	laRenameSave    = "rename-save"    // give the session ID the title typed
	laRenameCancel  = "rename-cancel"  // keep the title
	laDelete        = "delete"         // ask whether to move the session ID to the trash
	laDeleteKeep    = "delete-keep"    // keep it after all
	laDeleteConfirm = "delete-confirm" // move the session ID to the trash
	laMore          = "more"           // draw the next page of older sessions
	laTrash         = "trash"          // show or hide the trash
	laRestore       = "restore"        // restore the session ID from the trash
)

// ListAction is one thing asked for on the sessions list.
type ListAction struct {
	Kind string
	ID   string // the session acted on
	Text string // what was typed
}

// sessionsList draws the stored sessions with open, rename and delete
// (delete asks first; deleted sessions go to the trash, shown below).
type sessionsList struct {
	app.Compo

	Sessions []store.Summary       // the sessions drawn, newest first
	Older    int                   // stored sessions not drawn yet
	Due      map[string]hv.DueMark // due marks of the drawn sessions that carry one
	OpenID   string                // the session open on the screen ("" none)

	Renaming   string // the session being renamed
	RenameText string // the title typed for it
	ConfirmDel string // the session whose deletion is being asked

	TrashOpen bool
	Trash     []store.Summary

	OnAction func(ListAction)
}

func (r *sessionsList) act(a ListAction) {
	if r.OnAction != nil {
		r.OnAction(a)
	}
}

// button is one of the list's buttons: data-act says what it does, the
// enclosing list item's data-id which session, both read when it is
// pressed.
func (r *sessionsList) button(b app.HTMLButton, act string) app.HTMLButton {
	return b.DataSet("act", act).OnClick(func(ctx app.Context, e app.Event) {
		src := ctx.JSSrc()
		a := ListAction{Kind: src.Get("dataset").Get("act").String()}
		if li := src.Call("closest", "li"); li.Truthy() {
			a.ID = li.Get("dataset").Get("id").String()
		}
		r.act(a)
	})
}

// Render draws the list.
func (r *sessionsList) Render() app.UI {
	return app.Section().Class("pl-card pl-sessions").Attr("aria-label", "Stored sessions").Body(
		app.H2().Text("Sessions on this device"),
		app.If(len(r.Sessions) == 0, func() app.UI {
			return app.P().Text("No session is stored yet.")
		}),
		app.Ul().Class("pl-session-list").DataSet("testid", "session-list").Body(
			app.Range(r.Sessions).Slice(func(i int) app.UI { return r.item(r.Sessions[i]) }),
		),
		app.If(r.Older > 0, func() app.UI {
			return r.button(app.Button().Class("pl-btn pl-btn-quiet pl-btn-wide").DataSet("testid", "sessions-more").
				Text("Show "+numfmt.Count(min(listPage, r.Older))+" more of "+numfmt.Count(r.Older)+" older sessions"), laMore)
		}),
		r.trash(),
	)
}

func (r *sessionsList) item(s store.Summary) app.UI {
	cls := "pl-session"
	if r.OpenID != "" && r.OpenID == s.ID {
		cls += " pl-session-open"
	}
	if r.Renaming == s.ID {
		return app.Li().Class(cls).DataSet("testid", "session-item").DataSet("id", s.ID).Body(
			app.Input().Type("text").Class("pl-rename").Value(typedValue("session-rename-input", r.RenameText)).DataSet("testid", "session-rename-input").
				Attr("aria-label", "New title").
				OnInput(func(ctx app.Context, e app.Event) {
					r.act(ListAction{Kind: laRenameText, Text: takeTyped(ctx.JSSrc())})
				}),
			r.button(anButton("pl-btn", "Save title", "session-rename-save"), laRenameSave),
			r.button(app.Button().Class("pl-btn pl-btn-quiet").Text("Cancel"), laRenameCancel),
		)
	}
	if r.ConfirmDel == s.ID {
		return app.Li().Class(cls+" pl-session-confirm").DataSet("testid", "session-item").DataSet("id", s.ID).Body(
			app.P().Text("Move “"+s.Title+"” to the trash? It can be restored for "+strconv.Itoa(store.TrashDays)+" days."),
			r.button(anButton("pl-btn pl-btn-danger", "Move to trash", "session-delete-confirm"), laDeleteConfirm),
			r.button(app.Button().Class("pl-btn pl-btn-quiet").Text("Keep it"), laDeleteKeep),
		)
	}
	return app.Li().Class(cls).DataSet("testid", "session-item").DataSet("id", s.ID).Body(
		r.button(app.Button().Class("pl-session-open-btn").DataSet("testid", "session-open"), laOpen).Body(
			anSpanText("pl-session-title", s.Title),
			anSpanText("pl-session-meta", sessionMeta(s)),
			r.due(s.ID),
		),
		r.button(anButton("pl-btn pl-btn-quiet", "Rename", "session-rename"), laRename),
		r.button(anButton("pl-btn pl-btn-quiet", "Delete", "session-delete"), laDelete),
	)
}

// due is the due mark of the newest calibration of an instrument (an empty
// span for the other sessions, so that the button's children keep their
// places).
func (r *sessionsList) due(id string) app.UI {
	m, ok := r.Due[id]
	if !ok || m.State == hv.DueNone {
		return app.Span().Class("pl-due-slot")
	}
	return app.Span().Class("pl-due pl-due-"+m.State).DataSet("testid", "session-due").DataSet("state", m.State).Text(m.Text)
}

// trash draws the trash below the list: deleted sessions that can be
// restored for store.TrashDays days (after that they are purged when the
// app starts).
func (r *sessionsList) trash() app.UI {
	return app.Div().Class("pl-trash").Body(
		r.button(app.Button().Class("pl-btn pl-btn-quiet").DataSet("testid", "trash-open").
			Attr("aria-expanded", strconv.FormatBool(r.TrashOpen)).
			Text(pick(r.TrashOpen, "Hide the trash", "Show the trash")), laTrash),
		app.If(r.TrashOpen, func() app.UI {
			return app.Section().Class("pl-trash-list").Attr("aria-label", "Trash").Body(
				app.H3().Text("Trash"),
				app.If(len(r.Trash) == 0, func() app.UI { return app.P().Text("The trash is empty.") }),
				app.Ul().Class("pl-session-list").DataSet("testid", "trash").Body(
					app.Range(r.Trash).Slice(func(i int) app.UI { return r.trashItem(r.Trash[i]) }),
				),
			)
		}),
	)
}

func (r *sessionsList) trashItem(s store.Summary) app.UI {
	until := s.Deleted.Add(store.TrashDays * 24 * time.Hour).Local().Format("2 Jan 2006")
	return app.Li().Class("pl-session").DataSet("testid", "trash-item").DataSet("id", s.ID).Body(
		app.Div().Class("pl-session-open-btn").Body(
			anSpanText("pl-session-title", s.Title),
			anSpanText("pl-session-meta", plural(s.Readings, "reading", "readings")+
				" · deleted "+s.Deleted.Local().Format("2 Jan 2006 15:04")+" · can be restored until "+until),
		),
		r.button(anButton("pl-btn", "Restore", "trash-restore"), laRestore),
	)
}

func sessionMeta(s store.Summary) string {
	t := strconv.Itoa(s.Readings) + " reading"
	if s.Readings != 1 {
		t += "s"
	}
	if s.Site != "" {
		t += " · " + s.Site
	}
	return t + " · changed " + s.Modified.Local().Format("2 Jan 2006 15:04")
}
