package webapp

import (
	"encoding/json"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"testing"
)

// manifestOf decodes a served or written manifest.
type manifestOf struct {
	Name         string `json:"name"`
	StartURL     string `json:"start_url"`
	Icons        []any  `json:"icons"`
	FileHandlers []struct {
		Action string              `json:"action"`
		Accept map[string][]string `json:"accept"`
	} `json:"file_handlers"`
}

// TestManifestFileHandlers checks that the served manifest keeps go-app's
// members and declares the session file type (member names: W3C Web
// Application Manifest; file_handlers: WICG File Handling explainer).
func TestManifestFileHandlers(t *testing.T) {
	h := Site(testWeb(t), "test")
	for _, path := range []string{"/manifest.webmanifest"} {
		rec := httptest.NewRecorder()
		h.ServeHTTP(rec, httptest.NewRequest(http.MethodGet, path, nil))
		if rec.Code != 200 {
			t.Fatalf("%s: status %d", path, rec.Code)
		}
		if ct := rec.Header().Get("Content-Type"); ct != "application/manifest+json" {
			t.Errorf("%s: Content-Type %q", path, ct)
		}
		var m manifestOf
		if err := json.Unmarshal(rec.Body.Bytes(), &m); err != nil {
			t.Fatalf("%s: %v", path, err)
		}
		if m.Name != "Pairline" || len(m.Icons) == 0 {
			t.Errorf("%s lost go-app's members: name %q, %d icons", path, m.Name, len(m.Icons))
		}
		if len(m.FileHandlers) != 1 || m.FileHandlers[0].Action != "/" {
			t.Fatalf("%s: file_handlers %+v", path, m.FileHandlers)
		}
		if ext := m.FileHandlers[0].Accept[sessionMediaType]; len(ext) != 1 || ext[0] != ".pairline" {
			t.Errorf("%s: accept %v", path, m.FileHandlers[0].Accept)
		}
	}
}

// TestBuildWritesManifest checks that the static site carries the same manifest.
func TestBuildWritesManifest(t *testing.T) {
	web, out := testWeb(t), t.TempDir()
	if err := Build(out, web); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(filepath.Join(out, "manifest.webmanifest"))
	if err != nil {
		t.Fatal(err)
	}
	var m manifestOf
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatal(err)
	}
	if len(m.FileHandlers) != 1 || m.FileHandlers[0].Accept[sessionMediaType] == nil {
		t.Errorf("dist/manifest.webmanifest has no session file handler: %s", b)
	}
}
