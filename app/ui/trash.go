package ui

import (
	"strconv"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/store"
)

// renderTrash draws the trash below the session list: deleted sessions that
// can be restored for store.TrashDays days (after that they are purged when
// the app starts).
func (c *Shell) renderTrash() app.UI {
	return app.Div().Class("pl-trash").Body(
		app.Button().Class("pl-btn pl-btn-quiet").DataSet("testid", "trash-open").
			Attr("aria-expanded", strconv.FormatBool(c.trashOpen)).
			Text(map[bool]string{true: "Hide the trash", false: "Show the trash"}[c.trashOpen]).
			OnClick(func(ctx app.Context, e app.Event) {
				c.trashOpen = !c.trashOpen
				if c.trashOpen {
					c.refreshTrash(ctx)
				}
			}),
		app.If(c.trashOpen, func() app.UI {
			return app.Section().Class("pl-trash-list").Attr("aria-label", "Trash").Body(
				app.H3().Text("Trash"),
				app.If(len(c.trash) == 0, func() app.UI { return app.P().Text("The trash is empty.") }),
				app.Ul().Class("pl-session-list").DataSet("testid", "trash").Body(
					app.Range(c.trash).Slice(func(i int) app.UI { return c.trashItem(c.trash[i]) }),
				),
			)
		}),
	)
}

func (c *Shell) trashItem(s store.Summary) app.UI {
	until := s.Deleted.Add(store.TrashDays * 24 * time.Hour).Local().Format("2 Jan 2006")
	return app.Li().Class("pl-session").DataSet("testid", "trash-item").DataSet("id", s.ID).Body(
		app.Div().Class("pl-session-open-btn").Body(
			app.Span().Class("pl-session-title").Text(s.Title),
			app.Span().Class("pl-session-meta").Text(plural(s.Readings, "reading", "readings")+
				" · deleted "+s.Deleted.Local().Format("2 Jan 2006 15:04")+" · can be restored until "+until),
		),
		app.Button().Class("pl-btn").Text("Restore").DataSet("testid", "trash-restore").
			OnClick(func(ctx app.Context, e app.Event) { c.restore(ctx, s.ID) }),
	)
}

func (c *Shell) refreshTrash(_ app.Context) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	st := c.st
	if st == nil {
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
	st := c.st
	ctx.Async(func() {
		err := st.Restore(id)
		list, _ := st.List()
		trash, _ := st.Trash()
		ctx.Dispatch(func(ctx app.Context) {
			c.sessions, c.trash = list, trash
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
	return c.sessions[:min(len(c.sessions), max(c.listMore, listPage))]
}

// renderListMore offers the rest of a long list.
func (c *Shell) renderListMore() app.UI {
	shown := len(c.listShown())
	return app.If(shown < len(c.sessions), func() app.UI {
		return app.Button().Class("pl-btn pl-btn-quiet pl-btn-wide").DataSet("testid", "sessions-more").
			Text("Show " + strconv.Itoa(min(listPage, len(c.sessions)-shown)) + " more of " + strconv.Itoa(len(c.sessions)-shown) + " older sessions").
			OnClick(func(ctx app.Context, e app.Event) { c.listMore = shown + listPage })
	})
}
