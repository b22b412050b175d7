package ui

import (
	"strconv"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/demo"
)

// demoUI is the state of "Try the demo".
type demoUI struct {
	dmBusy bool
}

// loadDemo adds the invented demo sessions (app/demo) to the device as new
// sessions, with new IDs each time, so that a second tap adds a second copy
// and never overwrites the first (or the changes made to it). The first
// demo session opens and the session list shows the others.
func (c *Shell) loadDemo(ctx app.Context, e app.Event) {
	if c.dmBusy || c.ctl.st == nil {
		return
	}
	c.dmBusy = true
	again := false
	for _, s := range c.ctl.sessions {
		if strings.HasPrefix(s.Title, "Demo (invented)") {
			again = true
		}
	}
	st := c.ctl.st
	ctx = shellCtx(c.ui, ctx)
	ctx.Async(func() {
		ss, err := demo.Sessions(time.Now(), nil)
		if err == nil {
			for _, s := range ss {
				if err = saveNow(st, s); err != nil {
					break
				}
			}
		}
		if err == nil {
			err = st.SetLast(ss[0].ID)
		}
		list, _ := st.List()
		ctx.Dispatch(func(ctx app.Context) {
			c.dmBusy = false
			c.listChanged(list)
			if err != nil {
				c.notice = "The demo could not be loaded: " + err.Error()
				return
			}
			c.showStored(ss[0])
			c.resyncInputs()
			c.listOpen = true
			c.notice = "Added " + strconv.Itoa(len(ss)) + " demo sessions with invented readings (the fictional Larkwater Valley Water Board)"
			if again {
				c.notice += " as new copies; the earlier copies are kept"
			}
			c.notice += ". The first one is open; the others are in the list below."
		})
	})
}
