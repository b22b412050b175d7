package webapp

import (
	"encoding/json"
	"fmt"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"sync"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// Session files, as in app/session (kept here as text so that this package
// does not depend on the codec): the media type and extension the installed
// app is registered for.
const (
	sessionMediaType = "application/vnd.pairline.session"
	sessionExtension = ".pairline"
	manifestPath     = "/manifest.webmanifest"
)

// Manifest returns the web app manifest: go-app's (names, colours, icons,
// start URL) plus file_handlers, so that opening a .pairline file on a
// device where Pairline is installed opens it in Pairline (the browser then
// hands the file to the page through window.launchQueue). go-app writes no
// file_handlers of its own. Member names follow the W3C Web Application
// Manifest and the WICG File Handling explainer.
func Manifest(h *app.Handler) ([]byte, error) {
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, httptest.NewRequest(http.MethodGet, manifestPath, nil))
	if rec.Code != http.StatusOK {
		return nil, fmt.Errorf("go-app's manifest answered %d", rec.Code)
	}
	var m map[string]any
	if err := json.Unmarshal(rec.Body.Bytes(), &m); err != nil {
		return nil, fmt.Errorf("go-app's manifest is not JSON: %w", err)
	}
	m["file_handlers"] = []any{map[string]any{
		"action": "/",
		"accept": map[string]any{sessionMediaType: []string{sessionExtension}},
		"icons": []any{map[string]any{
			"src": "/web/icons/icon-192.png", "sizes": "192x192", "type": "image/png",
		}},
		"launch_type": "single-client",
	}}
	return json.MarshalIndent(m, "", "  ")
}

// WithManifest serves Manifest at /manifest.webmanifest (and go-app's alias
// /manifest.json) and passes every other request to h.
func WithManifest(h *app.Handler) http.Handler {
	var once sync.Once
	var body []byte
	var err error
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if r.URL.Path != manifestPath && r.URL.Path != "/manifest.json" {
			h.ServeHTTP(w, r)
			return
		}
		once.Do(func() { body, err = Manifest(h) })
		if err != nil {
			http.Error(w, err.Error(), http.StatusInternalServerError)
			return
		}
		w.Header().Set("Content-Type", "application/manifest+json")
		w.Header().Set("Cache-Control", "no-cache")
		w.Write(body)
	})
}

// writeManifest replaces go-app's manifest in a static site with Manifest.
func writeManifest(outDir string, h *app.Handler) error {
	b, err := Manifest(h)
	if err != nil {
		return err
	}
	return os.WriteFile(filepath.Join(outDir, filepath.FromSlash(manifestPath)), b, 0o644)
}
