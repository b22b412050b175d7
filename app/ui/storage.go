package ui

// The storage figures (how much of the device the sessions use).

import (
	"strconv"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
)

// refreshUsageWhenReady waits for the store to open, then reads the usage.
func (c *Shell) refreshUsageWhenReady(ctx app.Context, tries int) {
	if c.ctl.st != nil {
		c.refreshUsage(ctx)
		return
	}
	if tries < 100 {
		ctx.After(200*time.Millisecond, func(ctx app.Context) { c.refreshUsageWhenReady(ctx, tries+1) })
	}
}

// refreshUsage asks the browser what is used of the quota (and, through
// store.Usage, for persistent storage).
func (c *Shell) refreshUsage(_ app.Context) {
	ctx := c.ui // dispatch through the Shell: the element that asked may be gone by then
	st := c.ctl.st
	if st == nil {
		return
	}
	c.usageAt = time.Now()
	ctx.Async(func() {
		u, err := st.Usage()
		ctx.Dispatch(func(ctx app.Context) {
			if err == nil {
				c.usage, c.usageKnown = u, true
			}
		})
	})
}

// bytesText is a size for people: 1.2 MB, 640 kB, 512 bytes (SI units).
func bytesText(n int64) string {
	switch {
	case n >= 1e9:
		return numfmt.Sig(float64(n)/1e9, 2) + " GB"
	case n >= 1e6:
		return numfmt.Sig(float64(n)/1e6, 2) + " MB"
	case n >= 1e3:
		return numfmt.Sig(float64(n)/1e3, 2) + " kB"
	}
	return strconv.FormatInt(n, 10) + " bytes"
}

func (c *Shell) usageText() string {
	if !c.usageKnown || c.usage.Quota == 0 {
		return "Sessions are kept in this browser's storage on this device."
	}
	t := "Storage: " + bytesText(c.usage.Used) + " used of " + bytesText(c.usage.Quota) + " allowed."
	if c.usage.Persistent {
		return t + " The browser keeps these data even when the device runs low on space."
	}
	return t + " The browser may clear these data when the device runs low on space: export sessions you need to keep."
}
