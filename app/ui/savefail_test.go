package ui

import (
	"strings"
	"testing"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
	"pairline/app/store"
)

// TestSaveQueueKeepsRefused: a state the store refused is kept until a
// newer state of its session replaces it or it is tried again; another
// session's next save tries it again too; drop forgets it.
func TestSaveQueueKeepsRefused(t *testing.T) {
	q := newSaveQueue()
	job := func(id, body string) saveJob { return saveJob{sum: store.Summary{ID: id}, body: []byte(body)} }
	q.put(job("a", "a1"))
	j, _ := q.next()
	q.fail(j, store.ErrQuota)
	if msg, ok := q.failure("a"); !ok || msg != store.ErrQuota.Error() {
		t.Fatalf("failure(a) = %q, %v: want the refusal kept", msg, ok)
	}
	// Another session's save brings the refused state back into the queue.
	q.put(job("b", "b1"))
	var got []string
	for q.len() > 0 {
		j, _ := q.next()
		got = append(got, string(j.body))
	}
	if strings.Join(got, " ") != "a1 b1" {
		t.Errorf("written after b's save: %v, want the kept a1, then b1", got)
	}
	// A newer state of the session replaces its refused one.
	q.fail(job("a", "a1"), store.ErrQuota)
	q.put(job("a", "a2"))
	if j, _ := q.next(); string(j.body) != "a2" || q.len() != 0 {
		t.Errorf("next = %q with %d more, want a2 alone", j.body, q.len())
	}
	if _, ok := q.failure("a"); ok {
		t.Error("the refused a1 is still kept after a2 was handed in")
	}
	// A refusal that arrives while a newer state waits is not kept.
	q.put(job("a", "a3"))
	q.fail(job("a", "a2"), store.ErrQuota)
	if _, ok := q.failure("a"); ok {
		t.Error("a2 kept although a3 waits")
	}
	q.next()
	// Retry and drop.
	q.fail(job("c", "c1"), store.ErrQuota)
	q.retry()
	if !q.pending("c") {
		t.Error("retry did not queue c1 again")
	}
	q.fail(job("d", "d1"), store.ErrQuota)
	q.drop("c")
	q.drop("d")
	if q.pending("c") || q.len() != 0 {
		t.Error("drop left c1 waiting")
	}
	if _, ok := q.failure("d"); ok {
		t.Error("drop left d1 kept")
	}
}

// TestSaveFailureShown: a refused save says so in a plain sentence with
// the detail, keeps the session on screen and waiting, is tried again by
// the next edit, and belongs to the session it concerns: opening another
// session shows that one's state and says the first is not saved yet.
func TestSaveFailureShown(t *testing.T) {
	s, err := newSession(time.Now())
	if err != nil {
		t.Fatal(err)
	}
	s.Title = "Invented probe check"
	c := propShell(t, s)
	ctx := app.Context{}
	if err := c.ctl.setCell(0, session.ColumnX, "1"); err != nil {
		t.Fatal(err)
	}
	j, _ := c.ctl.saves.next()
	c.ctl.saves.fail(j, store.ErrQuota)
	c.saveDone(ctx, j.sum, store.ErrQuota, nil)
	if c.ctl.saveState != SaveFailed {
		t.Fatalf("save state %q after a refusal, want failed", c.ctl.saveState)
	}
	txt := c.ctl.saveText()
	for _, want := range []string{"Not saved: this device refused to store the session", "no room left", "Your changes are kept on screen", "Try again"} {
		if !strings.Contains(txt, want) {
			t.Errorf("save status %q does not say %q", txt, want)
		}
	}
	// The next edit hands in a newer state (the refused one is replaced);
	// the failure stays shown until a save succeeds.
	if err := c.ctl.setCell(0, session.ColumnY, "2"); err != nil {
		t.Fatal(err)
	}
	if !c.ctl.saves.pending(s.ID) {
		t.Fatal("the edit after a refusal was not handed to the saver")
	}
	if c.ctl.saveState != SaveSaving && c.ctl.saveState != SaveFailed {
		t.Errorf("save state %q while the retry waits", c.ctl.saveState)
	}
	j, _ = c.ctl.saves.next()
	if f, err := session.Decode(strings.NewReader(string(j.body))); err != nil || f.Sessions[0].Readings[0].Y != "2" {
		t.Fatalf("the retried state does not hold the later edit: %v", err)
	}
	c.ctl.saves.fail(j, store.ErrQuota)
	c.saveDone(ctx, j.sum, store.ErrQuota, nil)

	// Another session: its own status; the first one is named in a notice
	// and its state is still kept for the next try.
	other, err := newSession(time.Now())
	if err != nil {
		t.Fatal(err)
	}
	c.show(other)
	if c.ctl.saveState == SaveFailed {
		t.Errorf("the failure of %q is shown for the session opened after it", s.Title)
	}
	if !strings.Contains(c.notice, s.Title) || !strings.Contains(c.notice, "not saved") {
		t.Errorf("notice %q does not say that %q is not saved yet", c.notice, s.Title)
	}
	if _, ok := c.ctl.saves.failure(s.ID); !ok {
		t.Error("the refused state of the session left was dropped")
	}
	// Its next save succeeds: the status of the open session is not
	// touched by the other session's outcome.
	c.ctl.saves.retry()
	j, _ = c.ctl.saves.next()
	c.usage.at = time.Now() // no storage figures to ask for natively
	c.saveDone(ctx, j.sum, nil, nil)
	if c.ctl.saveState == SaveFailed {
		t.Error("a success of another session left the open one failed")
	}
	// Back to the first: saved now.
	c.show(s)
	if c.ctl.saveState == SaveFailed {
		t.Errorf("save state %q for a session whose state was written", c.ctl.saveState)
	}
}
