package demo

import (
	"bytes"
	_ "embed"
	"fmt"
	"io"
	"time"

	"pairline/app/session"
)

// File is the embedded demo file, written by `go run ./testdata/demo`.
//
//go:embed demo.pairline
var File []byte

// Sessions decodes the embedded demo and gives every session a fresh ID
// (from random, crypto/rand when nil), so that loading the demo twice adds
// the sessions again beside the first copies instead of overwriting them
// (and any changes made to them). The record of loading is one history
// entry, "demo" at now, and Modified is now (the first session a
// millisecond after the second, and so on, so that a list sorted newest
// first shows them in order).
func Sessions(now time.Time, random io.Reader) ([]*session.Session, error) {
	f, err := session.Decode(bytes.NewReader(File))
	if err != nil {
		return nil, fmt.Errorf("the demo sessions could not be read: %w", err)
	}
	for i, s := range f.Sessions {
		id, err := session.NewID(random)
		if err != nil {
			return nil, err
		}
		s.ID = id
		// Loading is the latest change: the demo sessions come first in
		// the list, in their order.
		s.Modified = now.UTC().Add(-time.Duration(i) * time.Millisecond)
		s.History = append(s.History, session.Edit{At: now.UTC(), Field: "demo", Row: -1, New: "loaded the invented demo session"})
	}
	return f.Sessions, nil
}
