package ui

// Session-file import, with the choice when an imported session already exists.

import (
	"bytes"
	"errors"
	"strconv"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
	"pairline/app/store"
)

// importSessionFile decodes a session file and stores its sessions in one
// transaction; sessions whose ID is already stored wait for the technician.
func (c *Shell) importSessionFile(ctx app.Context, name string, data []byte) {
	st := c.ctl.st
	ctx.Dispatch(func(ctx app.Context) { c.xfer.importPhase = "checking the file" })
	f, err := session.Decode(bytes.NewReader(data))
	if err != nil {
		ctx.Dispatch(func(ctx app.Context) { c.xfer.failed(name, err) })
		return
	}
	stored := map[string]store.Summary{}
	list, err1 := st.List()
	trash, err2 := st.Trash()
	if err := errors.Join(err1, err2); err != nil {
		ctx.Dispatch(func(ctx app.Context) { c.xfer.failed(name, err) })
		return
	}
	for _, s := range append(list, trash...) {
		stored[s.ID] = s
	}
	var fresh, clash []*session.Session
	for _, s := range f.Sessions {
		if _, ok := stored[s.ID]; ok {
			clash = append(clash, s)
		} else {
			fresh = append(fresh, s)
		}
	}
	if err := saveAll(st, fresh); err != nil {
		ctx.Dispatch(func(ctx app.Context) { c.xfer.failed(name, err) })
		return
	}
	list, _ = st.List()
	ctx.Dispatch(func(ctx app.Context) {
		c.xfer.importing = ""
		c.xfer.importSeq++
		c.listChanged(list)
		for _, w := range f.Warnings {
			c.xfer.importReport += w + " "
		}
		if len(fresh) > 0 {
			c.openImported(ctx, fresh[0])
		}
		if len(clash) > 0 {
			c.xfer.conflict = &importConflict{file: name, pending: clash, stored: stored, added: len(fresh)}
			return
		}
		c.xfer.importReport += importedText(name, len(fresh), 0)
		c.usage.refresh(c.ui, c.ctl.st)
	})
}

func importedText(name string, added, replaced int) string {
	t := "Imported " + plural(added, "session", "sessions") + " from “" + name + "”"
	if replaced > 0 {
		t += ", " + plural(replaced, "session", "sessions") + " replaced"
	}
	return t + "."
}

func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

// saveAll encodes sessions and stores them in one transaction.
func saveAll(st store.Store, ss []*session.Session) error {
	if len(ss) == 0 {
		return nil
	}
	sums := make([]store.Summary, len(ss))
	bodies := make([][]byte, len(ss))
	for i, s := range ss {
		job, err := encodeJob(s)
		if err != nil {
			return err
		}
		sums[i], bodies[i] = job.sum, job.body
		if i%20 == 19 {
			time.Sleep(time.Millisecond) // give the page its turn
		}
	}
	return st.SaveAll(sums, bodies)
}

// openImported shows an imported session and remembers it as the last open.
func (c *Shell) openImported(_ app.Context, s *session.Session) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	c.showStored(s)
	c.listOpen = false
	st, id := c.ctl.st, s.ID
	ctx.Async(func() { st.SetLast(id) })
}

// resolveConflict handles the first waiting session: "replace" overwrites the
// stored one, "both" keeps both (the imported one gets a new ID), "skip"
// leaves the stored one alone.
func (c *Shell) resolveConflict(_ app.Context, how string) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	k := c.xfer.conflict
	if k == nil || len(k.pending) == 0 {
		c.xfer.conflict = nil
		return
	}
	s := k.pending[0]
	k.pending = k.pending[1:]
	if how == "skip" {
		c.afterConflict(ctx, k)
		return
	}
	if how == "both" {
		id, err := session.NewID(nil)
		if err != nil {
			c.xfer.failed(k.file, err)
			return
		}
		s.ID = id
	}
	st := c.ctl.st
	ctx.Async(func() {
		err := saveNow(st, s)
		list, _ := st.List()
		ctx.Dispatch(func(ctx app.Context) {
			c.listChanged(list)
			if err != nil {
				c.xfer.failed(k.file, err)
				c.xfer.conflict = nil
				return
			}
			k.added++
			c.openImported(ctx, s)
			c.afterConflict(ctx, k)
		})
	})
}

func (c *Shell) afterConflict(ctx app.Context, k *importConflict) {
	if len(k.pending) > 0 {
		return
	}
	c.xfer.conflict = nil
	c.xfer.importSeq++
	c.xfer.importReport = importedText(k.file, k.added, 0)
	c.usage.refresh(c.ui, c.ctl.st)
}
