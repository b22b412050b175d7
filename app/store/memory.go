package store

import (
	"errors"
	"sort"
	"sync"
	"time"
)

// Memory is a Store held in memory. It backs the native build and
// prerendering, and the tests of code that uses a Store.
type Memory struct {
	mu     sync.Mutex
	bodies map[string][]byte
	sums   map[string]Summary
	last   string
}

// NewMemory returns an empty in-memory store.
func NewMemory() *Memory {
	return &Memory{bodies: map[string][]byte{}, sums: map[string]Summary{}}
}

func (m *Memory) list(deleted bool) []Summary {
	m.mu.Lock()
	defer m.mu.Unlock()
	var out []Summary
	for _, s := range m.sums {
		if s.Deleted.IsZero() != deleted {
			out = append(out, s)
		}
	}
	sortSummaries(out, deleted)
	return out
}

func sortSummaries(out []Summary, byDeleted bool) {
	sort.Slice(out, func(i, j int) bool {
		if byDeleted {
			return out[i].Deleted.After(out[j].Deleted)
		}
		return out[i].Modified.After(out[j].Modified)
	})
}

// List implements Store.
func (m *Memory) List() ([]Summary, error) { return m.list(false), nil }

// Trash implements Store.
func (m *Memory) Trash() ([]Summary, error) { return m.list(true), nil }

// Load implements Store.
func (m *Memory) Load(id string) ([]byte, error) {
	m.mu.Lock()
	defer m.mu.Unlock()
	b, ok := m.bodies[id]
	if !ok {
		return nil, ErrNotFound
	}
	return append([]byte(nil), b...), nil
}

// Save implements Store.
func (m *Memory) Save(sum Summary, body []byte) error {
	m.mu.Lock()
	defer m.mu.Unlock()
	m.bodies[sum.ID] = append([]byte(nil), body...)
	m.sums[sum.ID] = sum
	return nil
}

// SaveAll implements Store.
func (m *Memory) SaveAll(sums []Summary, bodies [][]byte) error {
	if len(sums) != len(bodies) {
		return errors.New("SaveAll needs one body per summary")
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	for i, sum := range sums {
		m.bodies[sum.ID] = append([]byte(nil), bodies[i]...)
		m.sums[sum.ID] = sum
	}
	return nil
}

// Delete implements Store.
func (m *Memory) Delete(id string, now time.Time) error {
	m.mu.Lock()
	defer m.mu.Unlock()
	s, ok := m.sums[id]
	if !ok {
		return ErrNotFound
	}
	s.Deleted = now
	m.sums[id] = s
	if m.last == id {
		m.last = ""
	}
	return nil
}

// Restore implements Store.
func (m *Memory) Restore(id string) error {
	m.mu.Lock()
	defer m.mu.Unlock()
	s, ok := m.sums[id]
	if !ok {
		return ErrNotFound
	}
	s.Deleted = time.Time{}
	m.sums[id] = s
	return nil
}

// Purge implements Store.
func (m *Memory) Purge(now time.Time) (int, error) {
	m.mu.Lock()
	defer m.mu.Unlock()
	n := 0
	for id, s := range m.sums {
		if expired(s, now) {
			delete(m.sums, id)
			delete(m.bodies, id)
			n++
		}
	}
	return n, nil
}

// SetLast implements Store.
func (m *Memory) SetLast(id string) error {
	m.mu.Lock()
	defer m.mu.Unlock()
	m.last = id
	return nil
}

// Last implements Store.
func (m *Memory) Last() (string, error) {
	m.mu.Lock()
	defer m.mu.Unlock()
	return m.last, nil
}

// Usage implements Store; memory is not counted.
func (m *Memory) Usage() (Usage, error) { return Usage{}, nil }
