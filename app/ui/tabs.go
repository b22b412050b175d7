package ui

import (
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
	"pairline/app/store"
)

// Two tabs with the same session open talk over BroadcastChannel("pairline").
// After every save a tab posts {id, modified, base}: the session, the time of
// the version it has just stored and the time of the stored version its
// edits started from (all Unix milliseconds). A tab with that session open
// takes the new version when it has no edits of its own since base (a plain
// fast-forward); otherwise it says so and lets the technician choose. No
// version is ever dropped without a word.

// changedElsewhere is a newer stored version written by another tab while
// this tab has edits of its own.
type changedElsewhere struct {
	id       string
	modified int64 // Unix ms of the other tab's version
}

// mountTabs opens the channel (when the browser has one).
func (c *Shell) mountTabs(ctx app.Context) {
	bc := app.Window().Get("BroadcastChannel")
	if !bc.Truthy() {
		return
	}
	c.channel = bc.New("pairline")
	c.channel.Set("onmessage", app.FuncOf(func(this app.Value, args []app.Value) any {
		if len(args) == 0 {
			return nil
		}
		d := args[0].Get("data")
		if !d.Truthy() || d.Get("id").Type() != app.TypeString {
			return nil
		}
		id, mod, base := d.Get("id").String(), int64(d.Get("modified").Float()), int64(d.Get("base").Float())
		ctx.Dispatch(func(ctx app.Context) { c.otherTabSaved(ctx, id, mod, base) })
		return nil
	}))
}

// opened records the stored version of a session that was just shown.
func (c *Shell) opened(s *session.Session) {
	c.seenID, c.seen, c.elsewhere = s.ID, s.Modified.UnixMilli(), nil
}

// announceSaved tells other tabs that a session was stored.
func (c *Shell) announceSaved(ctx app.Context, sum store.Summary) {
	mod := sum.Modified.UnixMilli()
	base := int64(0)
	if c.seenID == sum.ID {
		base = c.seen
	}
	if c.ctl.sess != nil && c.ctl.sess.ID == sum.ID {
		c.seenID, c.seen = sum.ID, mod
	}
	if time.Since(c.usageAt) > 5*time.Second {
		c.refreshUsage(ctx)
	}
	if c.channel == nil || !c.channel.Truthy() || base == mod {
		return
	}
	msg := app.Window().Get("Object").New()
	msg.Set("id", sum.ID)
	msg.Set("modified", float64(mod))
	msg.Set("base", float64(base))
	c.channel.Call("postMessage", msg)
}

// unsaved reports whether the open session has edits not yet stored.
func (c *Shell) unsaved() bool {
	return c.ctl.sess != nil && (c.ctl.sess.Modified.UnixMilli() > c.seen || c.seenID != c.ctl.sess.ID ||
		c.ctl.saveState == SaveSaving || c.ctl.saveState == SaveFailed || c.ctl.view.stale)
}

// otherTabSaved handles a save made by another tab.
func (c *Shell) otherTabSaved(_ app.Context, id string, mod, base int64) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	st := c.ctl.st
	if st == nil {
		return
	}
	if c.ctl.sess == nil || c.ctl.sess.ID != id || mod == c.seen {
		ctx.Async(func() {
			list, _ := st.List()
			ctx.Dispatch(func(ctx app.Context) { c.listChanged(list) })
		})
		return
	}
	if c.unsaved() || base != c.seen {
		c.elsewhere = &changedElsewhere{id: id, modified: mod}
		return
	}
	c.reloadFromStore(ctx, id, "This session was updated with the changes made in another tab.")
}

// reloadFromStore shows the stored version of the open session.
func (c *Shell) reloadFromStore(_ app.Context, id, note string) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	st := c.ctl.st
	seq := c.ctl.editSeq
	ctx.Async(func() {
		s, err := load(st, id)
		list, _ := st.List()
		ctx.Dispatch(func(ctx app.Context) {
			c.listChanged(list)
			if err != nil {
				c.notice = err.Error()
				return
			}
			if c.ctl.sess == nil || c.ctl.sess.ID != id {
				return
			}
			if c.ctl.editSeq != seq {
				// Edited while the stored version was loading: showing it
				// now would drop that edit without a word, so ask instead.
				c.elsewhere = &changedElsewhere{id: id, modified: s.Modified.UnixMilli()}
				return
			}
			page := c.page
			c.showStored(s)
			c.opened(s)
			c.page = page
			c.ctl.saveState, c.ctl.saveMessage, c.ctl.saveWhy = SaveSaved, "", ""
			c.notice = note
		})
	})
}

// renderElsewhere asks what to do when another tab stored a newer version
// while this one has edits of its own.
func (c *Shell) renderElsewhere() app.UI {
	k := c.elsewhere
	at := time.UnixMilli(k.modified).Local().Format("15:04:05")
	return app.Div().Class("pl-strip pl-xfer-ask").Attr("role", "alertdialog").DataSet("testid", "changed-elsewhere").Body(
		app.P().Body(
			app.Strong().Text("⚠ This session was changed in another tab"),
			app.Text(" (saved there at "+at+") while this tab has changes of its own. Nothing is overwritten until you choose."),
		),
		app.Div().Class("pl-xfer-actions").Body(
			app.Button().Class("pl-btn").Text("Show the other tab’s version").DataSet("testid", "changed-elsewhere-load").
				OnClick(func(ctx app.Context, e app.Event) {
					c.elsewhere = nil
					c.reloadFromStore(ctx, k.id, "Showing the version saved in the other tab; the changes made here were set aside.")
				}),
			app.Button().Class("pl-btn pl-btn-quiet").Text("Keep this tab’s version as a copy").DataSet("testid", "changed-elsewhere-copy").
				OnClick(func(ctx app.Context, e app.Event) { c.keepAsCopy(ctx, k) }),
			app.Button().Class("pl-btn pl-btn-quiet").Text("Keep this tab’s version").DataSet("testid", "changed-elsewhere-keep").
				OnClick(func(ctx app.Context, e app.Event) {
					c.elsewhere = nil
					// This tab's version replaces the other one, as chosen;
					// the other tab then takes it as a fast-forward.
					c.seenID, c.seen = k.id, k.modified
					c.ctl.save()
				}),
		),
	)
}

// keepAsCopy stores this tab's version under a new ID and leaves the other
// tab's version as the session of that ID.
func (c *Shell) keepAsCopy(_ app.Context, k *changedElsewhere) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	c.elsewhere = nil
	id, err := session.NewID(nil)
	if err != nil {
		c.notice = err.Error()
		return
	}
	cp := *c.ctl.sess
	cp.ID = id
	cp.Readings = append([]session.Reading(nil), c.ctl.sess.Readings...)
	cp.History = append([]session.Edit(nil), c.ctl.sess.History...)
	if err := cp.SetField(session.FieldTitle, c.ctl.sess.Title+" (copy from this tab)", time.Now()); err != nil {
		c.notice = err.Error()
		return
	}
	c.show(&cp)
	c.opened(&cp)
	c.seen = 0
	c.ctl.save()
	c.notice = "This tab’s version is kept as a new session; the other tab’s version keeps the original."
	st := c.ctl.st
	ctx.Async(func() { st.SetLast(id) })
}

// heldByOtherTab keeps this tab from saving while it asks about a version
// stored by another tab: saving first would overwrite that version before
// the technician has chosen (the controller's held; it says so in the save
// state).
func (c *Shell) heldByOtherTab() bool {
	return c.elsewhere != nil && c.ctl.sess != nil && c.elsewhere.id == c.ctl.sess.ID
}
