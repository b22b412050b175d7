package ui

// Pasting a block of readings into the grid.

import (
	"fmt"
	"strconv"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
)

// pasteBlock fills the grid from a block pasted into the x cell of row: the
// first column goes to x, the second to y, one reading per line, overwriting
// the rows below and adding rows as needed.
func (c *Shell) pasteBlock(ctx app.Context, row int, text string) {
	if c.sess == nil {
		return
	}
	if c.refuseLocked() {
		return
	}
	res, err := session.ReadPaste(text, session.CSVOptions{})
	if err != nil {
		c.notice = "The pasted block was not used: " + err.Error()
		return
	}
	now := time.Now()
	if len(res.X)+row > session.MaxReadings {
		c.notice = fmt.Sprintf("The pasted block was not used: the session would hold more than %d readings.", session.MaxReadings)
		return
	}
	if c.sess.DecimalComma == nil {
		c.sess.SetField(session.FieldDecimalComma, strconv.FormatBool(res.DecimalComma), now)
	}
	if _, err := c.sess.PasteRows(row, res.X, res.Y, now); err != nil {
		c.notice = "The pasted block was not used: " + err.Error()
		return
	}
	c.notice = "Pasted " + plural(len(res.X), "reading", "readings") + " into rows " + strconv.Itoa(row+1) + "–" + strconv.Itoa(row+len(res.X)) + "."
	if res.Incomplete > 0 {
		c.notice += " " + plural(res.Incomplete, "incomplete line was", "incomplete lines were") + " skipped."
	}
	c.page = row / pageSize
	c.edited(ctx)
	c.collectAfterLoad()
}
