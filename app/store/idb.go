//go:build js && wasm

package store

import (
	"errors"
	"fmt"
	"syscall/js"
	"time"
)

const (
	dbName      = "pairline"
	dbVersion   = 1
	bodiesStore = "sessions" // id → {id, body: Uint8Array}
	indexStore  = "index"    // id → summary fields
	metaStore   = "meta"     // key → value
)

// idb is the IndexedDB store.
type idb struct {
	db js.Value
}

// Open opens (and on first use creates) Pairline's IndexedDB database.
func Open() (Store, error) {
	factory := js.Global().Get("indexedDB")
	if !factory.Truthy() {
		return nil, ErrUnavailable
	}
	req := factory.Call("open", dbName, dbVersion)
	upgrade := js.FuncOf(func(this js.Value, args []js.Value) any {
		db := req.Get("result")
		names := db.Get("objectStoreNames")
		if !names.Call("contains", bodiesStore).Bool() {
			db.Call("createObjectStore", bodiesStore, map[string]any{"keyPath": "id"})
		}
		if !names.Call("contains", indexStore).Bool() {
			db.Call("createObjectStore", indexStore, map[string]any{"keyPath": "id"})
		}
		if !names.Call("contains", metaStore).Bool() {
			db.Call("createObjectStore", metaStore)
		}
		return nil
	})
	defer upgrade.Release()
	req.Set("onupgradeneeded", upgrade)
	db, err := await(req)
	if err != nil {
		return nil, fmt.Errorf("%w (%v)", ErrUnavailable, err)
	}
	return &idb{db: db}, nil
}

// await waits for an IDBRequest to succeed or fail.
func await(req js.Value) (js.Value, error) {
	done := make(chan struct{})
	var res js.Value
	var err error
	ok := js.FuncOf(func(this js.Value, args []js.Value) any {
		res = req.Get("result")
		close(done)
		return nil
	})
	fail := js.FuncOf(func(this js.Value, args []js.Value) any {
		err = domError(req.Get("error"))
		if len(args) > 0 {
			args[0].Call("preventDefault")
		}
		close(done)
		return nil
	})
	defer ok.Release()
	defer fail.Release()
	req.Set("onsuccess", ok)
	req.Set("onerror", fail)
	<-done
	return res, err
}

// awaitTx waits for a transaction to commit; an abort or error rolls it back.
func awaitTx(tx js.Value) error {
	done := make(chan error, 1)
	complete := js.FuncOf(func(this js.Value, args []js.Value) any {
		done <- nil
		return nil
	})
	fail := js.FuncOf(func(this js.Value, args []js.Value) any {
		done <- domError(tx.Get("error"))
		return nil
	})
	defer complete.Release()
	defer fail.Release()
	tx.Set("oncomplete", complete)
	tx.Set("onerror", fail)
	tx.Set("onabort", fail)
	return <-done
}

func domError(v js.Value) error {
	if !v.Truthy() {
		return errors.New("the browser's storage refused the operation")
	}
	return errorForName(v.Get("name").String(), v.Get("message").String())
}

// call runs fn and turns a thrown JavaScript exception into an error.
func call(fn func() js.Value) (v js.Value, err error) {
	defer func() {
		if r := recover(); r != nil {
			if jsErr, ok := r.(js.Error); ok {
				err = domError(jsErr.Value)
				return
			}
			err = fmt.Errorf("storage failed: %v", r)
		}
	}()
	return fn(), nil
}

func (s *idb) tx(mode string, stores ...string) (js.Value, error) {
	names := make([]any, len(stores))
	for i, n := range stores {
		names[i] = n
	}
	return call(func() js.Value { return s.db.Call("transaction", names, mode) })
}

func toJS(sum Summary) map[string]any {
	return map[string]any{
		"id":       sum.ID,
		"title":    sum.Title,
		"site":     sum.Site,
		"modified": float64(sum.Modified.UnixMilli()),
		"readings": sum.Readings,
		"deleted":  deletedMillis(sum.Deleted),
	}
}

func deletedMillis(t time.Time) float64 {
	if t.IsZero() {
		return 0
	}
	return float64(t.UnixMilli())
}

func fromJS(v js.Value) Summary {
	s := Summary{
		ID:       v.Get("id").String(),
		Title:    v.Get("title").String(),
		Site:     v.Get("site").String(),
		Modified: time.UnixMilli(int64(v.Get("modified").Float())).UTC(),
		Readings: v.Get("readings").Int(),
	}
	if d := v.Get("deleted").Float(); d > 0 {
		s.Deleted = time.UnixMilli(int64(d)).UTC()
	}
	return s
}

func (s *idb) all() ([]Summary, error) {
	tx, err := s.tx("readonly", indexStore)
	if err != nil {
		return nil, err
	}
	req, err := call(func() js.Value { return tx.Call("objectStore", indexStore).Call("getAll") })
	if err != nil {
		return nil, err
	}
	res, err := await(req)
	if err != nil {
		return nil, err
	}
	out := make([]Summary, res.Length())
	for i := range out {
		out[i] = fromJS(res.Index(i))
	}
	return out, nil
}

func (s *idb) filtered(deleted bool) ([]Summary, error) {
	all, err := s.all()
	if err != nil {
		return nil, err
	}
	var out []Summary
	for _, x := range all {
		if x.Deleted.IsZero() != deleted {
			out = append(out, x)
		}
	}
	sortSummaries(out, deleted)
	return out, nil
}

func (s *idb) List() ([]Summary, error)  { return s.filtered(false) }
func (s *idb) Trash() ([]Summary, error) { return s.filtered(true) }

func (s *idb) Load(id string) ([]byte, error) {
	tx, err := s.tx("readonly", bodiesStore)
	if err != nil {
		return nil, err
	}
	req, err := call(func() js.Value { return tx.Call("objectStore", bodiesStore).Call("get", id) })
	if err != nil {
		return nil, err
	}
	res, err := await(req)
	if err != nil {
		return nil, err
	}
	if !res.Truthy() {
		return nil, ErrNotFound
	}
	u8 := res.Get("body")
	b := make([]byte, u8.Get("length").Int())
	js.CopyBytesToGo(b, u8)
	return b, nil
}

func (s *idb) Save(sum Summary, body []byte) error {
	u8 := js.Global().Get("Uint8Array").New(len(body))
	js.CopyBytesToJS(u8, body)
	tx, err := s.tx("readwrite", bodiesStore, indexStore)
	if err != nil {
		return err
	}
	if _, err := call(func() js.Value {
		tx.Call("objectStore", bodiesStore).Call("put", map[string]any{"id": sum.ID, "body": u8})
		return tx.Call("objectStore", indexStore).Call("put", toJS(sum))
	}); err != nil {
		tx.Call("abort")
		return err
	}
	return awaitTx(tx)
}

func (s *idb) SaveAll(sums []Summary, bodies [][]byte) error {
	if len(sums) != len(bodies) {
		return errors.New("SaveAll needs one body per summary")
	}
	tx, err := s.tx("readwrite", bodiesStore, indexStore)
	if err != nil {
		return err
	}
	if _, err := call(func() js.Value {
		bs, is := tx.Call("objectStore", bodiesStore), tx.Call("objectStore", indexStore)
		for i, sum := range sums {
			u8 := js.Global().Get("Uint8Array").New(len(bodies[i]))
			js.CopyBytesToJS(u8, bodies[i])
			bs.Call("put", map[string]any{"id": sum.ID, "body": u8})
			is.Call("put", toJS(sum))
		}
		return js.Undefined()
	}); err != nil {
		tx.Call("abort")
		return err
	}
	return awaitTx(tx)
}

func (s *idb) getSummary(tx js.Value, id string) (Summary, error) {
	req, err := call(func() js.Value { return tx.Call("objectStore", indexStore).Call("get", id) })
	if err != nil {
		return Summary{}, err
	}
	res, err := await(req)
	if err != nil {
		return Summary{}, err
	}
	if !res.Truthy() {
		return Summary{}, ErrNotFound
	}
	return fromJS(res), nil
}

func (s *idb) setDeleted(id string, when time.Time) error {
	tx, err := s.tx("readwrite", indexStore, metaStore)
	if err != nil {
		return err
	}
	sum, err := s.getSummary(tx, id)
	if err != nil {
		tx.Call("abort")
		return err
	}
	sum.Deleted = when
	if _, err := call(func() js.Value { return tx.Call("objectStore", indexStore).Call("put", toJS(sum)) }); err != nil {
		tx.Call("abort")
		return err
	}
	return awaitTx(tx)
}

func (s *idb) Delete(id string, now time.Time) error { return s.setDeleted(id, now) }
func (s *idb) Restore(id string) error               { return s.setDeleted(id, time.Time{}) }

func (s *idb) Purge(now time.Time) (int, error) {
	trash, err := s.Trash()
	if err != nil {
		return 0, err
	}
	var ids []string
	for _, t := range trash {
		if expired(t, now) {
			ids = append(ids, t.ID)
		}
	}
	if len(ids) == 0 {
		return 0, nil
	}
	tx, err := s.tx("readwrite", bodiesStore, indexStore)
	if err != nil {
		return 0, err
	}
	for _, id := range ids {
		tx.Call("objectStore", bodiesStore).Call("delete", id)
		tx.Call("objectStore", indexStore).Call("delete", id)
	}
	if err := awaitTx(tx); err != nil {
		return 0, err
	}
	return len(ids), nil
}

func (s *idb) SetLast(id string) error {
	tx, err := s.tx("readwrite", metaStore)
	if err != nil {
		return err
	}
	if _, err := call(func() js.Value { return tx.Call("objectStore", metaStore).Call("put", id, "last") }); err != nil {
		return err
	}
	return awaitTx(tx)
}

func (s *idb) Last() (string, error) {
	tx, err := s.tx("readonly", metaStore)
	if err != nil {
		return "", err
	}
	req, err := call(func() js.Value { return tx.Call("objectStore", metaStore).Call("get", "last") })
	if err != nil {
		return "", err
	}
	res, err := await(req)
	if err != nil || res.Type() != js.TypeString {
		return "", err
	}
	return res.String(), nil
}

// Usage asks the browser to keep Pairline's data (navigator.storage.persist)
// and reports the estimate of what is used.
func (s *idb) Usage() (Usage, error) {
	sm := js.Global().Get("navigator").Get("storage")
	if !sm.Truthy() {
		return Usage{}, nil
	}
	var u Usage
	if sm.Get("persist").Truthy() {
		if v, err := awaitPromise(sm.Call("persist")); err == nil {
			u.Persistent = v.Truthy()
		}
	}
	if sm.Get("estimate").Truthy() {
		v, err := awaitPromise(sm.Call("estimate"))
		if err != nil {
			return u, err
		}
		u.Used = int64(v.Get("usage").Float())
		u.Quota = int64(v.Get("quota").Float())
	}
	return u, nil
}

func awaitPromise(p js.Value) (js.Value, error) {
	done := make(chan struct{})
	var res js.Value
	var err error
	ok := js.FuncOf(func(this js.Value, args []js.Value) any {
		if len(args) > 0 {
			res = args[0]
		}
		close(done)
		return nil
	})
	fail := js.FuncOf(func(this js.Value, args []js.Value) any {
		err = errors.New("the browser refused")
		if len(args) > 0 {
			err = domError(args[0])
		}
		close(done)
		return nil
	})
	defer ok.Release()
	defer fail.Release()
	p.Call("then", ok, fail)
	<-done
	return res, err
}
