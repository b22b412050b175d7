package ui

import (
	"strconv"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/store"
)

// renderSessions draws the list of stored sessions with open, rename and
// delete (delete asks first; deleted sessions go to the trash).
func (c *Shell) renderSessions() app.UI {
	return app.Section().Class("pl-card pl-sessions").Attr("aria-label", "Stored sessions").Body(
		app.H2().Text("Sessions on this device"),
		app.If(len(c.sessions) == 0, func() app.UI {
			return app.P().Text("No session is stored yet.")
		}),
		app.Ul().Class("pl-session-list").DataSet("testid", "session-list").Body(
			app.Range(c.listShown()).Slice(func(i int) app.UI { return c.sessionItem(c.sessions[i]) }),
		),
		c.renderListMore(),
		c.renderTrash(),
	)
}

func (c *Shell) sessionItem(s store.Summary) app.UI {
	// The scope ties each handler to its session: go-app would otherwise keep
	// the first handler of a reused list element (same function literal).
	scope := app.EventScope(s.ID)
	open := c.sess != nil && c.sess.ID == s.ID
	cls := "pl-session"
	if open {
		cls += " pl-session-open"
	}
	if c.renaming == s.ID {
		return app.Li().Class(cls).DataSet("testid", "session-item").DataSet("id", s.ID).Body(
			app.Input().Type("text").Class("pl-rename").Value(c.renameText).DataSet("testid", "session-rename-input").
				Attr("aria-label", "New title").
				OnInput(func(ctx app.Context, e app.Event) { c.renameText = ctx.JSSrc().Get("value").String() }, scope),
			app.Button().Class("pl-btn").Text("Save title").DataSet("testid", "session-rename-save").
				OnClick(func(ctx app.Context, e app.Event) { c.rename(ctx, s.ID, c.renameText) }, scope),
			app.Button().Class("pl-btn pl-btn-quiet").Text("Cancel").
				OnClick(func(ctx app.Context, e app.Event) { c.renaming = "" }, scope),
		)
	}
	if c.confirmDel == s.ID {
		return app.Li().Class(cls+" pl-session-confirm").DataSet("testid", "session-item").DataSet("id", s.ID).Body(
			app.P().Text("Move “"+s.Title+"” to the trash? It can be restored for "+strconv.Itoa(store.TrashDays)+" days."),
			app.Button().Class("pl-btn pl-btn-danger").Text("Move to trash").DataSet("testid", "session-delete-confirm").
				OnClick(func(ctx app.Context, e app.Event) { c.delete(ctx, s.ID) }, scope),
			app.Button().Class("pl-btn pl-btn-quiet").Text("Keep it").
				OnClick(func(ctx app.Context, e app.Event) { c.confirmDel = "" }, scope),
		)
	}
	return app.Li().Class(cls).DataSet("testid", "session-item").DataSet("id", s.ID).Body(
		app.Button().Class("pl-session-open-btn").DataSet("testid", "session-open").
			OnClick(func(ctx app.Context, e app.Event) { c.open(ctx, s.ID) }, scope).Body(
			app.Span().Class("pl-session-title").Text(s.Title),
			app.Span().Class("pl-session-meta").Text(sessionMeta(s)),
			c.sessionDue(s.ID),
		),
		app.Button().Class("pl-btn pl-btn-quiet").Text("Rename").DataSet("testid", "session-rename").
			OnClick(func(ctx app.Context, e app.Event) { c.renaming, c.renameText = s.ID, s.Title }, scope),
		app.Button().Class("pl-btn pl-btn-quiet").Text("Delete").DataSet("testid", "session-delete").
			OnClick(func(ctx app.Context, e app.Event) { c.confirmDel = s.ID }, scope),
	)
}

// sessionDue is the due mark of the newest calibration of an instrument
// (an empty span for the other sessions, so that the button's children
// keep their places).
func (c *Shell) sessionDue(id string) app.UI {
	m, ok := c.dueMarkOf(id)
	if !ok {
		return app.Span().Class("pl-due-slot")
	}
	return app.Span().Class("pl-due pl-due-"+m.State).DataSet("testid", "session-due").DataSet("state", m.State).Text(m.Text)
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

func (c *Shell) open(ctx app.Context, id string) {
	st := c.st
	c.ui.Async(func() {
		s, err := load(st, id)
		if err == nil {
			st.SetLast(id)
		}
		c.ui.Dispatch(func(ctx app.Context) {
			if err != nil {
				c.notice = err.Error()
				return
			}
			c.showStored(s)
			c.listOpen = false
		})
	})
}

func (c *Shell) rename(ctx app.Context, id, title string) {
	c.renaming = ""
	if c.sess != nil && c.sess.ID == id {
		if c.refuseLocked() {
			return
		}
		if err := c.setField("title", title); err != nil {
			c.notice = err.Error()
			return
		}
		c.afterChange(ctx)
		return
	}
	st := c.st
	c.ui.Async(func() {
		s, err := load(st, id)
		if err == nil {
			err = s.SetField("title", title, time.Now())
		}
		if err == nil {
			err = saveNow(st, s)
		}
		list, _ := st.List()
		c.ui.Dispatch(func(ctx app.Context) {
			c.sessions = list
			if err != nil {
				c.notice = err.Error()
			}
		})
	})
}

func (c *Shell) delete(ctx app.Context, id string) {
	c.confirmDel = ""
	st := c.st
	wasOpen := c.sess != nil && c.sess.ID == id
	c.ui.Async(func() {
		err := st.Delete(id, time.Now())
		list, _ := st.List()
		c.ui.Dispatch(func(ctx app.Context) {
			c.sessions = list
			if err != nil {
				c.notice = err.Error()
				return
			}
			c.notice = "The session went to the trash."
			if !wasOpen {
				return
			}
			if len(list) > 0 {
				c.open(ctx, list[0].ID)
			} else {
				c.onNew(ctx, app.Event{})
			}
		})
	})
}
