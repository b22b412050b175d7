package ui

import (
	"testing"

	"pairline/app/store"
)

// TestSaveQueue: a newer state of a session replaces its pending one in
// place; another session's pending state is kept and written in its turn
// (a session opened right after an edit must not drop that edit).
func TestSaveQueue(t *testing.T) {
	q := newSaveQueue()
	job := func(id, body string) saveJob { return saveJob{sum: store.Summary{ID: id}, body: []byte(body)} }
	q.put(job("a", "a1"))
	q.put(job("b", "b1"))
	q.put(job("a", "a2"))
	if q.len() != 2 {
		t.Fatalf("%d states wait, want 2 (a's newest and b's)", q.len())
	}
	for _, want := range []string{"a2", "b1"} {
		j, ok := q.next()
		if !ok || string(j.body) != want {
			t.Fatalf("next = %q %v, want %q", j.body, ok, want)
		}
	}
	done := make(chan bool)
	go func() { _, ok := q.next(); done <- ok }()
	q.put(job("c", "c1"))
	if !<-done {
		t.Fatal("a waiting saver was not woken by a new state")
	}
	q.close()
	if _, ok := q.next(); ok {
		t.Error("next after close gave a state")
	}
}
