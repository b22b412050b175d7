// Package store keeps sessions on the device. In the browser (js/wasm) it
// uses IndexedDB; elsewhere (the native build and go-app's server-side
// prerendering) it keeps them in memory, so the same UI code runs in both.
//
// A session is stored as its encoded session file (the bytes the codec in
// app/session writes) next to a small summary used by the session list, both
// in one IndexedDB transaction: a replaced record is either written whole or
// not at all, so a crash in the middle of a save leaves the previous state.
package store

import (
	"errors"
	"time"
)

// Summary is what the session list shows without decoding a session.
type Summary struct {
	ID       string
	Title    string
	Site     string
	Modified time.Time
	Readings int
	// Deleted is when the session went to the trash; zero when it is not there.
	Deleted time.Time
}

// TrashDays is how long a deleted session can be restored.
const TrashDays = 30

// Errors the store returns. Each reads as a sentence for the technician.
var (
	ErrNotFound    = errors.New("this session is not stored on this device")
	ErrQuota       = errors.New("the device has no room left for Pairline's data: export and delete old sessions, then try again; the last saved state is kept")
	ErrUnavailable = errors.New("this browser does not let Pairline store data (private mode or storage turned off): readings will be lost when the tab closes")
)

// Usage is what the browser reports of the storage used and allowed.
type Usage struct {
	Used, Quota int64
	Persistent  bool
}

// Store is the device storage. Calls block until the browser has answered,
// so call them off the UI goroutine (go-app's ctx.Async).
type Store interface {
	// List returns the sessions not in the trash, newest first.
	List() ([]Summary, error)
	// Trash returns the sessions in the trash, newest deletion first.
	Trash() ([]Summary, error)
	// Load returns a session's encoded bytes.
	Load(id string) ([]byte, error)
	// Save writes a session's bytes and summary in one transaction. It
	// keeps a copy of body: the caller may reuse body once Save returns.
	Save(sum Summary, body []byte) error
	// SaveAll writes several sessions in one transaction: all of them or,
	// when anything fails (a full device, say), none. sums[i] goes with
	// bodies[i].
	SaveAll(sums []Summary, bodies [][]byte) error
	// Delete moves a session to the trash.
	Delete(id string, now time.Time) error
	// Restore takes a session out of the trash.
	Restore(id string) error
	// Purge removes for good the sessions deleted more than TrashDays before now.
	Purge(now time.Time) (int, error)
	// SetLast remembers the session that is open, to reopen it after a reload.
	SetLast(id string) error
	// Last returns the session last open, or "".
	Last() (string, error)
	// Usage asks for persistent storage and reports what is used.
	Usage() (Usage, error)
}

// expired reports whether a trashed summary is past its restore window.
func expired(s Summary, now time.Time) bool {
	return !s.Deleted.IsZero() && now.Sub(s.Deleted) > TrashDays*24*time.Hour
}

// errorForName maps the name of a DOMException thrown by the browser's
// storage to the error shown to the technician. Chromium and Safari name a
// full quota "QuotaExceededError" (the WebIDL name, DOMException code 22);
// older Firefox releases report "NS_ERROR_DOM_QUOTA_REACHED" (from memory).
func errorForName(name, message string) error {
	switch name {
	case "QuotaExceededError", "NS_ERROR_DOM_QUOTA_REACHED":
		return ErrQuota
	case "":
		return errors.New("the browser's storage refused the operation")
	}
	if message == "" {
		return errors.New(name)
	}
	return errors.New(name + ": " + message)
}

// IsQuota reports whether err says that the device ran out of room.
func IsQuota(err error) bool { return errors.Is(err, ErrQuota) }
