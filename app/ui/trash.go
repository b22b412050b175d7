package ui

import (
	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/store"
)

func (c *Shell) refreshTrash(_ app.Context) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	st := c.ctl.st
	if st == nil || ctx.Src() == nil { // natively (unmounted): no store to read off the page's goroutine
		return
	}
	ctx.Async(func() {
		trash, err := st.Trash()
		ctx.Dispatch(func(ctx app.Context) {
			if err != nil {
				c.notice = err.Error()
				return
			}
			c.trash = trash
		})
	})
}

func (c *Shell) restore(_ app.Context, id string) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	st := c.ctl.st
	ctx.Async(func() {
		err := st.Restore(id)
		list, _ := st.List()
		trash, _ := st.Trash()
		ctx.Dispatch(func(ctx app.Context) {
			c.ctl.sessions, c.trash = list, trash
			if err != nil {
				c.notice = err.Error()
				return
			}
			c.notice = "The session was restored from the trash."
		})
	})
}

// listPage is how many sessions the list draws at first (newest first) and
// adds with each "show more": drawing hundreds of entries at once would make
// the list slow to open on a tablet.
const listPage = 30

// listShown returns the sessions the list draws.
func (c *Shell) listShown() []store.Summary {
	return c.ctl.sessions[:min(len(c.ctl.sessions), max(c.listMore, listPage))]
}
