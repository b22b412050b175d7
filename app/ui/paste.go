package ui

// Pasting a block of readings into the grid.

import (
	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// pasteBlock fills the grid from a block pasted into the x cell of row: the
// first column goes to x, the second to y, one reading per line, overwriting
// the rows below and adding rows as needed.
func (c *Shell) pasteBlock(ctx app.Context, row int, text string) {
	if c.ctl.sess == nil || c.refuseLocked() {
		return
	}
	done, err := c.ctl.paste(row, text)
	if err != nil {
		c.notice = "The pasted block was not used: " + err.Error()
		if err == errTooManyReadings {
			c.notice += "."
		}
		return
	}
	c.notice = done
	c.page = row / pageSize
	c.afterChange(ctx)
	c.collectAfterLoad()
}
