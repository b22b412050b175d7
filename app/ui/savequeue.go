package ui

// Saving: the states waiting to be written, newest per session, and what
// a failure is called. Plain Go; the controller hands states in
// (controller.save) and the Shell's saver writes them (writeNext).

import (
	"slices"
	"strings"
	"sync"

	"pairline/app/session"
	"pairline/app/store"
)

type saveJob struct {
	sum  store.Summary
	body []byte
}

// Why a save failed (Shell.saveWhy).
const (
	saveRefused    = "refused"    // the device's storage refused it (full, private mode, …)
	saveUnwritable = "unwritable" // the session could not be encoded as a record
	saveHeld       = "held"       // another tab stored a newer version; the technician chooses
)

// leftUnsaved is the notice shown when a session whose save failed is left
// for another one.
func leftUnsaved(title, why, detail string) string {
	if why == saveUnwritable {
		return "“" + title + "” could not be written as a record (" + detail + "); its last changes were not stored and are lost when this tab closes."
	}
	return "“" + title + "” is not saved on this device yet (" + detail + "). Its last state is kept here and tried again with your next change, or with “Try again”."
}

// saveQueue holds the states waiting to be written, the newest of each
// session: a newer state of a session replaces its older pending one (which
// is then never written after it), while another session's pending state
// keeps its place. A state the store refused is kept (with why) until a
// newer state of its session comes, or it is tried again: with the next
// state handed in, or on retry. Several goroutines may use it.
type saveQueue struct {
	mu     sync.Mutex
	jobs   []saveJob
	failed map[string]failedJob // by session ID
	wake   chan struct{}
	closed bool
	spare  []byte // the memory of a state already written, for the next one
}

// failedJob is a state the store refused, and its error.
type failedJob struct {
	job saveJob
	err string
}

// takeSpare returns memory for encoding the next state (nil when none).
func (q *saveQueue) takeSpare() []byte {
	if q == nil {
		return nil
	}
	q.mu.Lock()
	defer q.mu.Unlock()
	b := q.spare
	q.spare = nil
	return b
}

// giveBack offers the memory of a state the store has taken a copy of.
func (q *saveQueue) giveBack(b []byte) {
	q.mu.Lock()
	if cap(b) > cap(q.spare) {
		q.spare = b
	}
	q.mu.Unlock()
}

func newSaveQueue() *saveQueue { return &saveQueue{wake: make(chan struct{}, 1)} }

// put queues a state (it supersedes a refused state of its session), and
// before it the states of other sessions refused earlier.
func (q *saveQueue) put(j saveJob) {
	q.mu.Lock()
	delete(q.failed, j.sum.ID)
	q.requeueFailed()
	q.queue(j)
	q.mu.Unlock()
	q.signal()
}

// queue puts j in the place of its session's pending state, or last.
// The caller holds mu.
func (q *saveQueue) queue(j saveJob) {
	for i := range q.jobs {
		if q.jobs[i].sum.ID == j.sum.ID {
			q.jobs[i] = j
			return
		}
	}
	q.jobs = append(q.jobs, j)
}

// requeueFailed queues the refused states again (a newer pending state of
// the same session wins). The caller holds mu.
func (q *saveQueue) requeueFailed() {
	for id, f := range q.failed {
		if !q.pendingLocked(id) {
			q.jobs = append(q.jobs, f.job)
		}
	}
	q.failed = nil
}

func (q *saveQueue) signal() {
	select {
	case q.wake <- struct{}{}:
	default:
	}
}

// fail keeps a state the store refused, unless a newer state of its
// session is already waiting.
func (q *saveQueue) fail(j saveJob, err error) {
	q.mu.Lock()
	defer q.mu.Unlock()
	if q.pendingLocked(j.sum.ID) {
		return
	}
	if q.failed == nil {
		q.failed = map[string]failedJob{}
	}
	q.failed[j.sum.ID] = failedJob{job: j, err: err.Error()}
}

// retry queues every refused state again.
func (q *saveQueue) retry() {
	if q == nil {
		return
	}
	q.mu.Lock()
	q.requeueFailed()
	q.mu.Unlock()
	q.signal()
}

// hasFailed reports whether any refused state is kept.
func (q *saveQueue) hasFailed() bool {
	if q == nil {
		return false
	}
	q.mu.Lock()
	defer q.mu.Unlock()
	return len(q.failed) > 0
}

// failure returns the error of the refused state of session id, if one is kept.
func (q *saveQueue) failure(id string) (string, bool) {
	if q == nil {
		return "", false
	}
	q.mu.Lock()
	defer q.mu.Unlock()
	f, ok := q.failed[id]
	return f.err, ok
}

// drop forgets the waiting and refused states of session id (another
// version of it replaces them).
func (q *saveQueue) drop(id string) {
	if q == nil {
		return
	}
	q.mu.Lock()
	defer q.mu.Unlock()
	delete(q.failed, id)
	q.jobs = slices.DeleteFunc(q.jobs, func(j saveJob) bool { return j.sum.ID == id })
}

// pending reports whether a state of session id waits to be written.
func (q *saveQueue) pending(id string) bool {
	q.mu.Lock()
	defer q.mu.Unlock()
	return q.pendingLocked(id)
}

func (q *saveQueue) pendingLocked(id string) bool {
	for i := range q.jobs {
		if q.jobs[i].sum.ID == id {
			return true
		}
	}
	return false
}

// next waits for the oldest queued state; false once the queue is closed.
func (q *saveQueue) next() (saveJob, bool) {
	for {
		q.mu.Lock()
		if q.closed {
			q.mu.Unlock()
			return saveJob{}, false
		}
		if len(q.jobs) > 0 {
			j := q.jobs[0]
			q.jobs = q.jobs[1:]
			q.mu.Unlock()
			return j, true
		}
		q.mu.Unlock()
		<-q.wake
	}
}

// len is the number of states waiting.
func (q *saveQueue) len() int {
	q.mu.Lock()
	defer q.mu.Unlock()
	return len(q.jobs)
}

// close stops next.
func (q *saveQueue) close() {
	q.mu.Lock()
	q.closed = true
	q.mu.Unlock()
	q.signal()
}

// encodeJob encodes a session as its stored record and summary.
func encodeJob(s *session.Session) (saveJob, error) { return encodeJobInto(nil, s) }

// encodeJobInto is encodeJob reusing the memory of buf.
func encodeJobInto(buf []byte, s *session.Session) (saveJob, error) {
	body, err := session.EncodeAppend(buf, []*session.Session{s})
	if err != nil {
		return saveJob{}, err
	}
	return saveJob{
		sum:  store.Summary{ID: s.ID, Title: s.Title, Site: s.Site, Modified: s.Modified, Readings: filledReadings(s)},
		body: body,
	}, nil
}

// filledReadings counts the readings that hold a value (an x, a y or a
// note; a left-out reading counts): the list shows it, so the blank row a
// new session starts with is not "1 reading".
func filledReadings(s *session.Session) int {
	n := 0
	for i := range s.Readings {
		r := &s.Readings[i]
		if r.Excluded || strings.TrimSpace(r.X) != "" || strings.TrimSpace(r.Y) != "" || strings.TrimSpace(r.Note) != "" {
			n++
		}
	}
	return n
}

// pristine reports whether s holds nothing anyone typed: its history has
// only the blank rows added, and every reading is blank.
func pristine(s *session.Session) bool {
	for _, e := range s.History {
		if e.Field != session.EditRowAdded {
			return false
		}
	}
	return filledReadings(s) == 0
}
