package ui

// The Shell's hook into the instrument view: it reads the stored sessions
// off the UI goroutine, keeps their history summaries (history.Summarize:
// decoding and fitting each session once per change), and hands the worded
// view to the instrumentsPanel. The session list shows the due marks of the
// same view.

import (
	hv "pairline/app/history/view"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/history"
	"pairline/app/store"
)

// instState is the Shell's part of the instrument view.
type instState struct {
	instOpen            bool
	instView            *hv.View
	instMsg             string
	instDone, instTotal int // sessions read of those listed, while a refresh runs
	instSeq             int // counts refreshes, so that only the newest is shown
	// instCache keeps each stored session's summary with the time of the
	// change it was made from, so that a refresh reads only what changed.
	instCache map[string]instCached
}

type instCached struct {
	modified time.Time
	sum      history.Summary
	ok       bool
}

// refresh reads the controller's listed sessions that changed since the
// last refresh, summarises them and words the history (view.Build), off
// the UI goroutine; the result comes through ctx, the Shell's own context.
func (in *instState) refresh(ctx app.Context, k *controller) {
	if k.st == nil || ctx.Src() == nil {
		return
	}
	if in.instCache == nil {
		in.instCache = map[string]instCached{}
	}
	in.instSeq++
	seq, st, list := in.instSeq, k.st, append([]store.Summary(nil), k.sessions...)
	cache := make(map[string]instCached, len(in.instCache))
	for id, v := range in.instCache {
		cache[id] = v
	}
	ctx.Async(func() {
		fresh := make(map[string]instCached, len(list))
		sums := make([]history.Summary, 0, len(list))
		for i, sm := range list {
			e, ok := cache[sm.ID]
			if !ok || !e.modified.Equal(sm.Modified) {
				e = instCached{modified: sm.Modified}
				if s, err := load(st, sm.ID); err == nil {
					if sum, err := history.Summarize(s); err == nil {
						e.sum, e.ok = sum, true
					}
				}
				if i%8 == 7 {
					n := i + 1
					ctx.Dispatch(func(ctx app.Context) {
						if seq == in.instSeq {
							in.instDone, in.instTotal = n, len(list)
						}
					})
					time.Sleep(time.Millisecond) // give the page its turn
				}
			}
			fresh[sm.ID] = e
			if e.ok {
				sums = append(sums, e.sum)
			}
		}
		v, err := hv.Build(sums, time.Now())
		ctx.Dispatch(func(ctx app.Context) {
			if seq != in.instSeq {
				return
			}
			in.instCache = fresh
			in.instDone, in.instTotal = 0, 0
			if err != nil {
				in.instMsg = "The history of the instruments could not be made: " + err.Error()
				return
			}
			in.instMsg = ""
			in.instView = &v
		})
	})
}

// listChanged takes the stored sessions as the device lists them now (after
// an import, a delete, a restore, another tab's change): an open instrument
// view or session list is made again from them, so that a calibration
// imported while the view is open shows in it (only the sessions that
// changed are read again).
func (c *Shell) listChanged(list []store.Summary) {
	c.ctl.sessions = list
	if c.inst.instOpen || c.listOpen {
		c.inst.refresh(c.ui, c.ctl)
	}
}

// renderInstruments is the instrument view (shown from the bar's
// Instruments button).
func (c *Shell) renderInstruments() app.UI {
	return &instrumentsPanel{
		View: c.inst.instView, Message: c.inst.instMsg, Done: c.inst.instDone, Total: c.inst.instTotal,
		OnOpen: func(id string) {
			c.inst.instOpen = false
			c.open(c.ui, id)
		},
		OnClose: func() { c.inst.instOpen = false },
	}
}

// toggleInstruments opens or closes the instrument view.
func (c *Shell) toggleInstruments(ctx app.Context, e app.Event) {
	c.inst.instOpen = !c.inst.instOpen
	if c.inst.instOpen {
		c.listOpen = false
		c.inst.instView = nil // the list as stored now, not as it was
		c.inst.refresh(c.ui, c.ctl)
	}
}

// dueMarkOf is the due mark the session list shows beside a session: the
// newest calibration of each instrument carries its instrument's.
func (in *instState) dueMarkOf(id string) (hv.DueMark, bool) {
	if in.instView == nil {
		return hv.DueMark{}, false
	}
	m, ok := in.instView.Due[id]
	if !ok || m.State == hv.DueNone {
		return hv.DueMark{}, false
	}
	return m, true
}
