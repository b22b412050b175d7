package ui

import (
	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/store"
)

// trashBin is the sessions list's trash: whether it is open and the
// sessions in it, read from the store it is given. Work that finishes
// later comes back through ctx, the Shell's own context (the element that
// asked may be gone by then); say shows a sentence in the message strip.
type trashBin struct {
	items []store.Summary
	open  bool
}

// toggle opens or closes the trash, reading it when it opens.
func (t *trashBin) toggle(ctx app.Context, st store.Store, say func(string)) {
	t.open = !t.open
	if t.open {
		t.refresh(ctx, st, say)
	}
}

// refresh reads the trash from st.
func (t *trashBin) refresh(ctx app.Context, st store.Store, say func(string)) {
	if st == nil || ctx.Src() == nil { // natively (unmounted): no store to read off the page's goroutine
		return
	}
	ctx.Async(func() {
		trash, err := st.Trash()
		ctx.Dispatch(func(ctx app.Context) {
			if err != nil {
				say(err.Error())
				return
			}
			t.items = trash
		})
	})
}

// restore takes session id out of the trash of the controller's store and
// gives the controller the list again.
func (t *trashBin) restore(ctx app.Context, k *controller, id string, say func(string)) {
	st := k.st
	ctx.Async(func() {
		err := st.Restore(id)
		list, _ := st.List()
		trash, _ := st.Trash()
		ctx.Dispatch(func(ctx app.Context) {
			k.sessions, t.items = list, trash
			if err != nil {
				say(err.Error())
				return
			}
			say("The session was restored from the trash.")
		})
	})
}

// listPage is how many sessions the list draws at first (newest first) and
// adds with each "show more": drawing hundreds of entries at once would make
// the list slow to open on a tablet.
const listPage = 30

// listShown returns the sessions of all the list draws: the first listPage,
// or more when "show more" asked for them.
func listShown(all []store.Summary, more int) []store.Summary {
	return all[:min(len(all), max(more, listPage))]
}
