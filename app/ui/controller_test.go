package ui

import (
	"bytes"
	"strings"
	"sync"
	"testing"
	"time"

	"pairline/app/session"
	"pairline/app/store"
)

// fullStore is the in-memory store with a device that can run out of room:
// while full, Save refuses with store.ErrQuota, as IndexedDB does when the
// quota is spent (store.go maps QuotaExceededError to it).
type fullStore struct {
	*store.Memory
	mu   sync.Mutex
	full bool
}

func (f *fullStore) setFull(v bool) { f.mu.Lock(); f.full = v; f.mu.Unlock() }

func (f *fullStore) Save(sum store.Summary, body []byte) error {
	f.mu.Lock()
	full := f.full
	f.mu.Unlock()
	if full {
		return store.ErrQuota
	}
	return f.Memory.Save(sum, body)
}

// ctlWith opens a new session in a controller saving into st.
func ctlWith(t *testing.T, st store.Store) *controller {
	t.Helper()
	s, err := newSession(time.Now())
	if err != nil {
		t.Fatal(err)
	}
	s.Title = "Invented conductivity check"
	k := newController(st)
	k.openSession(s)
	return k
}

// writeAll writes every queued state, as the Shell's saver does off the UI
// goroutine, and hands each outcome back to the controller.
func writeAll(k *controller) (notices []string) {
	for k.saves.len() > 0 {
		w, _ := writeNext(k.st, k.saves)
		if n := k.saved(w.sum, w.err, w.list); n != "" {
			notices = append(notices, n)
		}
	}
	return notices
}

// stored decodes what the device holds of session id.
func storedReadings(t *testing.T, st store.Store, id string) []session.Reading {
	t.Helper()
	b, err := st.Load(id)
	if err != nil {
		t.Fatalf("the device holds no copy of the session: %v", err)
	}
	f, err := session.Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	return f.Sessions[0].Readings
}

// TestControllerSaveStates: the save status goes from blank (nothing typed:
// a session is stored from its first real change) to saving with the
// change, to saved once the device has it; a change while a write is under
// way keeps it "saving" until the newer state is written.
func TestControllerSaveStates(t *testing.T) {
	st := store.NewMemory()
	k := ctlWith(t, st)
	if k.saveState != SaveNone {
		t.Fatalf("a new session is %q before any change, want blank", k.saveState)
	}
	k.save()
	if k.saveState != SaveNone || k.saves.len() != 0 {
		t.Errorf("an untouched session was handed to the saver (state %q, %d queued)", k.saveState, k.saves.len())
	}
	steps := []struct {
		name string
		do   func() error
		want SaveState // right after the action
	}{
		{"type x", func() error { return k.setCell(0, session.ColumnX, "1.5") }, SaveSaving},
		{"type y", func() error { return k.setCell(0, session.ColumnY, "2.25") }, SaveSaving},
		{"add a row", func() error { _, err := k.addRow(); return err }, SaveSaving},
		{"rename", func() error { return k.setField(session.FieldTitle, "Invented probe 7") }, SaveSaving},
	}
	for _, s := range steps {
		if err := s.do(); err != nil {
			t.Fatalf("%s: %v", s.name, err)
		}
		if k.saveState != s.want {
			t.Errorf("after %s: %q, want %q", s.name, k.saveState, s.want)
		}
	}
	// One write under way while another change comes: not "saved" yet.
	w, _ := writeNext(st, k.saves)
	if err := k.setCell(1, session.ColumnX, "3"); err != nil {
		t.Fatal(err)
	}
	k.saved(w.sum, w.err, w.list)
	if k.saveState != SaveSaving {
		t.Errorf("an older write finished while a newer state waits: %q, want saving", k.saveState)
	}
	writeAll(k)
	if k.saveState != SaveSaved || k.saveText() != "Saved on this device" {
		t.Errorf("all written: %q (%q), want saved", k.saveState, k.saveText())
	}
	if got := storedReadings(t, st, k.sess.ID); len(got) != 2 || got[1].X != "3" {
		t.Errorf("the device holds %+v, want the last change (x of reading 2 = 3)", got)
	}
}

// TestControllerFailingStoreRetries: a store that refuses keeps the state
// on screen and queued whole; the status says so with the detail; the next
// change and "Try again" both try again, and once the device takes it the
// status is "saved" and the device holds the newest state.
func TestControllerFailingStoreRetries(t *testing.T) {
	st := &fullStore{Memory: store.NewMemory()}
	k := ctlWith(t, st)
	st.setFull(true)
	if err := k.setCell(0, session.ColumnX, "10"); err != nil {
		t.Fatal(err)
	}
	writeAll(k)
	if k.saveState != SaveFailed || !k.retryable() {
		t.Fatalf("refused: %q (retryable %v), want failed and retryable", k.saveState, k.retryable())
	}
	if txt := k.saveText(); !strings.Contains(txt, "refused to store") || !strings.Contains(txt, "no room left") {
		t.Errorf("status %q: want the refusal in words with its detail", txt)
	}
	if _, ok := k.saves.failure(k.sess.ID); !ok {
		t.Error("the refused state was not kept for the next try")
	}
	if k.sess.Readings[0].X != "10" {
		t.Error("the refusal changed what is on screen")
	}
	// The next change tries again: still refused, still failed, the newer
	// state kept in place of the older one.
	if err := k.setCell(0, session.ColumnY, "20"); err != nil {
		t.Fatal(err)
	}
	if k.saveState != SaveFailed {
		t.Errorf("a change after a refusal shows %q: the failure must stay shown until a save succeeds", k.saveState)
	}
	writeAll(k)
	if k.saveState != SaveFailed {
		t.Errorf("refused again: %q", k.saveState)
	}
	// Room again: "Try again" writes the newest state.
	st.setFull(false)
	k.retrySave()
	if k.saveState != SaveSaving {
		t.Errorf("try again: %q, want saving", k.saveState)
	}
	writeAll(k)
	if k.saveState != SaveSaved || k.retryable() {
		t.Errorf("written after the retry: %q (retryable %v), want saved", k.saveState, k.retryable())
	}
	if got := storedReadings(t, st, k.sess.ID); got[0].X != "10" || got[0].Y != "20" {
		t.Errorf("the device holds %+v, want the newest state (10, 20)", got[0])
	}
}

// TestControllerLeavingUnsaved: leaving a session whose save was refused
// says so (a notice naming it) and keeps its state for the next try; the
// session opened shows its own status.
func TestControllerLeavingUnsaved(t *testing.T) {
	st := &fullStore{Memory: store.NewMemory()}
	k := ctlWith(t, st)
	first := k.sess
	st.setFull(true)
	k.setCell(0, session.ColumnX, "1")
	writeAll(k)
	other, err := newSession(time.Now())
	if err != nil {
		t.Fatal(err)
	}
	notice := k.openSession(other)
	if !strings.Contains(notice, first.Title) || !strings.Contains(notice, "not saved") {
		t.Errorf("notice %q does not say that %q is not saved", notice, first.Title)
	}
	if k.saveState != SaveNone {
		t.Errorf("the session opened shows %q, want its own (blank) status", k.saveState)
	}
	st.setFull(false)
	k.retrySave()
	writeAll(k)
	if got := storedReadings(t, st, first.ID); got[0].X != "1" {
		t.Errorf("the state of the session left was not written on retry: %+v", got)
	}
}

// TestControllerUndoRedo: undo takes back one change at a time (typing a
// cell key by key is one), in words; redo brings back exactly the state
// undone; a new change ends what redo could bring back; a sealed record
// refuses both.
func TestControllerUndoRedo(t *testing.T) {
	k := ctlWith(t, store.NewMemory())
	for _, txt := range []string{"1", "12", "12.", "12.5"} {
		if err := k.setCell(0, session.ColumnX, txt); err != nil {
			t.Fatal(err)
		}
	}
	k.setCell(0, session.ColumnY, "3")
	if err := k.exclude(0, "invented: probe not settled"); err != nil {
		t.Fatal(err)
	}
	if n := len(k.unStack); n != 3 {
		t.Fatalf("%d steps to undo after typing x, typing y and leaving the reading out, want 3", n)
	}
	cases := []struct {
		back      bool
		msg       string
		x, y      string
		excluded  bool
		undo, red int
	}{
		{true, "Undone: reading 1 left out (invented: probe not settled).", "12.5", "3", false, 2, 1},
		{true, "Undone: y of reading 1 typed as 3.", "12.5", "", false, 1, 2},
		{false, "Redone: y of reading 1 typed as 3.", "12.5", "3", false, 2, 1},
		{true, "Undone: y of reading 1 typed as 3.", "12.5", "", false, 1, 2},
		{true, "Undone: x of reading 1 typed as 12.5.", "", "", false, 0, 3},
		{true, "Undone: x of reading 1 typed as 12.5.", "", "", false, 0, 3}, // nothing left: no step
	}
	for i, c := range cases {
		took := k.undoRedo(c.back)
		r := k.sess.Readings[0]
		if k.unMsg != c.msg || r.X != c.x || r.Y != c.y || r.Excluded != c.excluded || len(k.unStack) != c.undo || len(k.unRedo) != c.red {
			t.Errorf("step %d (took %v): %q x=%q y=%q excluded=%v, %d/%d; want %q x=%q y=%q excluded=%v, %d/%d",
				i, took, k.unMsg, r.X, r.Y, r.Excluded, len(k.unStack), len(k.unRedo), c.msg, c.x, c.y, c.excluded, c.undo, c.red)
		}
	}
	if k.view.usable != 0 {
		t.Errorf("after undoing every change the analysis counts %d usable pairs", k.view.usable)
	}
	// A new change ends redo.
	k.setCell(0, session.ColumnX, "7")
	if len(k.unRedo) != 0 {
		t.Errorf("%d steps to redo after a new change, want none", len(k.unRedo))
	}
	// Every state undo and redo left is a valid record.
	if err := k.sess.Validate(); err != nil {
		t.Errorf("the session after undo and redo fails validation: %v", err)
	}
	// A sealed record: no undo, and no action changes it.
	k.sess.Seal = &session.Seal{}
	if k.undo() {
		t.Error("undo changed a sealed record")
	}
	if err := k.setCell(0, session.ColumnX, "8"); err != errLocked {
		t.Errorf("typing into a sealed record: %v, want errLocked", err)
	}
	k.unlocked = k.sess.ID // "Start revision N"
	if err := k.setCell(0, session.ColumnX, "8"); err != nil {
		t.Errorf("typing after the record was opened for its next revision: %v", err)
	}
}
