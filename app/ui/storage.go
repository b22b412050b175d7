package ui

// The storage figures (how much of the device the sessions use).

import (
	"strconv"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/store"
)

// storageUse is what the browser says of the storage the sessions use,
// asked of the store it is given.
type storageUse struct {
	usage store.Usage
	known bool      // usage was read
	at    time.Time // when it was last asked for
}

// refreshWhenReady waits for the controller's store to open, then reads
// the usage.
func (u *storageUse) refreshWhenReady(ctx app.Context, k *controller, tries int) {
	if k.st != nil {
		u.refresh(ctx, k.st)
		return
	}
	if tries < 100 {
		ctx.After(200*time.Millisecond, func(ctx app.Context) { u.refreshWhenReady(ctx, k, tries+1) })
	}
}

// refresh asks the browser what is used of the quota (and, through
// store.Usage, for persistent storage); the answer comes through ctx, the
// Shell's own context (the element that asked may be gone by then).
func (u *storageUse) refresh(ctx app.Context, st store.Store) {
	if st == nil {
		return
	}
	u.at = time.Now()
	ctx.Async(func() {
		got, err := st.Usage()
		ctx.Dispatch(func(ctx app.Context) {
			if err == nil {
				u.usage, u.known = got, true
			}
		})
	})
}

// refreshStale reads the usage again when it was last read more than 5 s
// ago (after a save).
func (u *storageUse) refreshStale(ctx app.Context, st store.Store) {
	if time.Since(u.at) > 5*time.Second {
		u.refresh(ctx, st)
	}
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

// text says how much of the device the sessions use.
func (u *storageUse) text() string {
	if !u.known || u.usage.Quota == 0 {
		return "Sessions are kept in this browser's storage on this device."
	}
	t := "Storage: " + bytesText(u.usage.Used) + " used of " + bytesText(u.usage.Quota) + " allowed."
	if u.usage.Persistent {
		return t + " The browser keeps these data even when the device runs low on space."
	}
	return t + " The browser may clear these data when the device runs low on space: export sessions you need to keep."
}
