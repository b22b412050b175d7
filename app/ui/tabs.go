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

// tabSync is this tab's side of the talk with other tabs: the channel, the
// stored version of the open session this tab has seen, and the question
// asked when another tab stored a newer version while this one has edits
// of its own. Its methods take the controller or the open session; the
// Shell shows what they decide.
type tabSync struct {
	elsewhere *changedElsewhere
	channel   app.Value // BroadcastChannel("pairline"), or nil
	seenID    string    // the session whose stored version is seen
	seen      int64     // Modified (Unix ms) of the stored version this tab has
}

// mount opens the channel (when the browser has one); saved gets each
// message of another tab on the UI goroutine, dispatched through ctx.
func (t *tabSync) mount(ctx app.Context, saved func(ctx app.Context, id string, mod, base int64)) {
	bc := app.Window().Get("BroadcastChannel")
	if !bc.Truthy() {
		return
	}
	t.channel = bc.New("pairline")
	t.channel.Set("onmessage", app.FuncOf(func(this app.Value, args []app.Value) any {
		if len(args) == 0 {
			return nil
		}
		d := args[0].Get("data")
		if !d.Truthy() || d.Get("id").Type() != app.TypeString {
			return nil
		}
		id, mod, base := d.Get("id").String(), int64(d.Get("modified").Float()), int64(d.Get("base").Float())
		ctx.Dispatch(func(ctx app.Context) { saved(ctx, id, mod, base) })
		return nil
	}))
}

// opened records the stored version of a session that was just shown.
func (t *tabSync) opened(s *session.Session) {
	t.seenID, t.seen, t.elsewhere = s.ID, s.Modified.UnixMilli(), nil
}

// announce tells other tabs that a session was stored (open: the open
// session).
func (t *tabSync) announce(sum store.Summary, open *session.Session) {
	mod := sum.Modified.UnixMilli()
	base := int64(0)
	if t.seenID == sum.ID {
		base = t.seen
	}
	if open != nil && open.ID == sum.ID {
		t.seenID, t.seen = sum.ID, mod
	}
	if t.channel == nil || !t.channel.Truthy() || base == mod {
		return
	}
	msg := app.Window().Get("Object").New()
	msg.Set("id", sum.ID)
	msg.Set("modified", float64(mod))
	msg.Set("base", float64(base))
	t.channel.Call("postMessage", msg)
}

// unsaved reports whether the open session has edits not yet stored.
func (t *tabSync) unsaved(k *controller) bool {
	return k.sess != nil && (k.sess.Modified.UnixMilli() > t.seen || t.seenID != k.sess.ID ||
		k.saveState == SaveSaving || k.saveState == SaveFailed || k.view.stale)
}

// tabReply is what this tab does about a save made by another tab.
type tabReply int

const (
	tabList   tabReply = iota // another session (or this tab's own version): read the list again
	tabAsk                    // this tab has edits of its own: ask (elsewhere is set)
	tabReload                 // show the stored version
)

// otherSaved decides what to do about the version of session id stored by
// another tab at mod from the version of base.
func (t *tabSync) otherSaved(k *controller, id string, mod, base int64) tabReply {
	if k.sess == nil || k.sess.ID != id || mod == t.seen {
		return tabList
	}
	if t.unsaved(k) || base != t.seen {
		t.elsewhere = &changedElsewhere{id: id, modified: mod}
		return tabAsk
	}
	return tabReload
}

// keep makes this tab's version replace the one of k, as chosen: the
// other tab then takes it as a fast-forward once it is saved.
func (t *tabSync) keep(k *changedElsewhere) {
	t.elsewhere = nil
	t.seenID, t.seen = k.id, k.modified
}

// held keeps this tab from saving while it asks about a version stored by
// another tab: saving first would overwrite that version before the
// technician has chosen (the controller's held; it says so in the save
// state).
func (t *tabSync) held(open *session.Session) bool {
	return t.elsewhere != nil && open != nil && t.elsewhere.id == open.ID
}

// otherTabSaved handles a save made by another tab: the list read again,
// the question asked, or the stored version shown (tabSync.otherSaved).
func (c *Shell) otherTabSaved(_ app.Context, id string, mod, base int64) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	st := c.ctl.st
	if st == nil {
		return
	}
	switch c.tabs.otherSaved(c.ctl, id, mod, base) {
	case tabList:
		ctx.Async(func() {
			list, _ := st.List()
			ctx.Dispatch(func(ctx app.Context) { c.listChanged(list) })
		})
	case tabReload:
		c.reloadFromStore(ctx, id, "This session was updated with the changes made in another tab.")
	}
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
				c.tabs.elsewhere = &changedElsewhere{id: id, modified: s.Modified.UnixMilli()}
				return
			}
			page := c.page
			c.showStored(s)
			c.tabs.opened(s)
			c.page = page
			c.ctl.saveState, c.ctl.saveMessage, c.ctl.saveWhy = SaveSaved, "", ""
			c.notice = note
		})
	})
}

// render asks what to do when another tab stored a newer version while
// this one has edits of its own: reload shows the stored version of a
// session with a note, keepCopy keeps this tab's as a copy, save saves
// this tab's over the other.
func (t *tabSync) render(reload func(ctx app.Context, id, note string), keepCopy func(ctx app.Context, k *changedElsewhere), save func()) app.UI {
	k := t.elsewhere
	at := time.UnixMilli(k.modified).Local().Format("15:04:05")
	return app.Div().Class("pl-strip pl-xfer-ask").Attr("role", "alertdialog").DataSet("testid", "changed-elsewhere").Body(
		app.P().Body(
			app.Strong().Text("⚠ This session was changed in another tab"),
			app.Text(" (saved there at "+at+") while this tab has changes of its own. Nothing is overwritten until you choose."),
		),
		app.Div().Class("pl-xfer-actions").Body(
			anButton("pl-btn", "Show the other tab’s version", "changed-elsewhere-load").
				OnClick(func(ctx app.Context, e app.Event) {
					t.elsewhere = nil
					reload(ctx, k.id, "Showing the version saved in the other tab; the changes made here were set aside.")
				}),
			anButton("pl-btn pl-btn-quiet", "Keep this tab’s version as a copy", "changed-elsewhere-copy").
				OnClick(func(ctx app.Context, e app.Event) { keepCopy(ctx, k) }),
			anButton("pl-btn pl-btn-quiet", "Keep this tab’s version", "changed-elsewhere-keep").
				OnClick(func(ctx app.Context, e app.Event) {
					t.keep(k)
					save()
				}),
		),
	)
}

// keepAsCopy stores this tab's version under a new ID and leaves the other
// tab's version as the session of that ID.
func (c *Shell) keepAsCopy(_ app.Context, k *changedElsewhere) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	c.tabs.elsewhere = nil
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
	c.tabs.opened(&cp)
	c.tabs.seen = 0
	c.ctl.save()
	c.notice = "This tab’s version is kept as a new session; the other tab’s version keeps the original."
	st := c.ctl.st
	ctx.Async(func() { st.SetLast(id) })
}
