package ui

import (
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	hv "pairline/app/history/view"
	"pairline/app/store"
)

// renderSessions gathers the data of the sessions list (sessionlist.go):
// the page of summaries drawn, the open session, the due marks of the
// instrument view, the rename and delete questions and the trash.
func (c *Shell) renderSessions() app.UI {
	shown := append([]store.Summary(nil), listShown(c.ctl.sessions, c.xfer.listMore)...)
	due := map[string]hv.DueMark{}
	for _, s := range shown {
		if m, ok := c.inst.dueMarkOf(s.ID); ok {
			due[s.ID] = m
		}
	}
	open := ""
	if c.ctl.sess != nil {
		open = c.ctl.sess.ID
	}
	return &sessionsList{
		Sessions: shown, Older: len(c.ctl.sessions) - len(shown), Due: due, OpenID: open,
		Renaming: c.renaming, RenameText: c.renameText, ConfirmDel: c.confirmDel,
		TrashOpen: c.trash.open, Trash: append([]store.Summary(nil), c.trash.items...),
		OnAction: func(a ListAction) { c.dispatch(func(ctx app.Context) { c.applyList(ctx, a) }) },
	}
}

// applyList makes the change of a: the questions, the paging and the trash
// are the screen's; open, rename, delete and restore go to the store (and
// a rename of the open session through the controller).
func (c *Shell) applyList(ctx app.Context, a ListAction) {
	switch a.Kind {
	case laOpen:
		c.open(ctx, a.ID)
	case laRename:
		c.renaming, c.renameText = a.ID, ""
		for _, s := range c.ctl.sessions {
			if s.ID == a.ID {
				c.renameText = s.Title
			}
		}
	case laRenameText:
		c.renameText = a.Text
	case laRenameSave:
		if a.ID != "" {
			c.rename(ctx, a.ID, c.renameText)
		}
	case laRenameCancel:
		c.renaming = ""
	case laDelete:
		c.confirmDel = a.ID
	case laDeleteKeep:
		c.confirmDel = ""
	case laDeleteConfirm:
		if a.ID != "" {
			c.delete(ctx, a.ID)
		}
	case laMore:
		c.xfer.listMore = len(listShown(c.ctl.sessions, c.xfer.listMore)) + listPage
	case laTrash:
		c.trash.toggle(c.ui, c.ctl.st, c.say)
	case laRestore:
		c.trash.restore(c.ui, c.ctl, a.ID, c.say)
	}
}

func (c *Shell) open(ctx app.Context, id string) {
	st := c.ctl.st
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
	if c.ctl.sess != nil && c.ctl.sess.ID == id {
		if c.refuseLocked() {
			return
		}
		if err := c.ctl.setField("title", title); err != nil {
			c.notice = err.Error()
			return
		}
		c.afterChange(ctx)
		return
	}
	st := c.ctl.st
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
			c.listChanged(list)
			if err != nil {
				c.notice = err.Error()
			}
		})
	})
}

func (c *Shell) delete(ctx app.Context, id string) {
	c.confirmDel = ""
	st := c.ctl.st
	wasOpen := c.ctl.sess != nil && c.ctl.sess.ID == id
	c.ui.Async(func() {
		err := st.Delete(id, time.Now())
		list, _ := st.List()
		c.ui.Dispatch(func(ctx app.Context) {
			c.listChanged(list)
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
