package webapp

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"net/http"
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
	var body bytes.Buffer
	code, err := fetch(h, manifestPath, &body)
	if err != nil {
		return nil, err
	}
	if code != http.StatusOK {
		return nil, fmt.Errorf("go-app's manifest answered %d", code)
	}
	var m map[string]any
	if err := json.Unmarshal(body.Bytes(), &m); err != nil {
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

// WithManifest serves Manifest at /manifest.webmanifest and passes every
// other request to h.
func WithManifest(h *app.Handler) http.Handler {
	var once sync.Once
	var body []byte
	var err error
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if r.URL.Path != manifestPath {
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

// captured is the http.ResponseWriter through which Manifest and Build ask
// a handler for one URL without a network connection: it keeps the status
// and headers and writes the body to body. (net/http/httptest would do, but
// it is meant for tests and would link its test certificate into the app.)
type captured struct {
	header http.Header
	code   int
	body   io.Writer
	err    error // the first error of body
}

func (c *captured) Header() http.Header { return c.header }

func (c *captured) WriteHeader(code int) {
	if c.code == 0 {
		c.code = code
	}
}

func (c *captured) Write(p []byte) (int, error) {
	c.WriteHeader(http.StatusOK)
	if c.err != nil {
		return 0, c.err
	}
	n, err := c.body.Write(p)
	if err != nil {
		c.err = err
	}
	return n, err
}

// fetch asks h for the URL path p with GET and writes the body to body; it
// returns the status, or the first error writing the body.
func fetch(h http.Handler, p string, body io.Writer) (int, error) {
	req, err := http.NewRequest(http.MethodGet, p, nil)
	if err != nil {
		return 0, err
	}
	req.RequestURI = p
	c := &captured{header: http.Header{}, body: body}
	h.ServeHTTP(c, req)
	if c.code == 0 {
		c.code = http.StatusOK
	}
	return c.code, c.err
}
