//go:build !(js && wasm)

package store

// Open returns the device store: outside the browser, a fresh memory store.
func Open() (Store, error) { return NewMemory(), nil }
