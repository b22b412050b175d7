package webapp

import (
	"encoding/json"
	"io"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"pairline/app/ui"
)

func TestMain(m *testing.M) {
	ui.Register()
	os.Exit(m.Run())
}

// testWeb copies the repository's web/ folder into a temporary folder and
// adds an app.wasm (its content does not matter to the handler).
func testWeb(t *testing.T) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "web")
	if err := copyTree(dir, "../../web"); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "app.wasm"), []byte("\x00asm\x01\x00\x00\x00"), 0o644); err != nil {
		t.Fatal(err)
	}
	return dir
}

func get(t *testing.T, h http.Handler, path string) (*http.Response, string) {
	t.Helper()
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, httptest.NewRequest("GET", path, nil))
	res := rec.Result()
	b, _ := io.ReadAll(res.Body)
	return res, string(b)
}

var remoteURL = regexp.MustCompile(`https?://[A-Za-z0-9]`)

// Every resource the service worker caches must exist: go-app's worker uses
// cache.addAll, which caches nothing when one URL fails, and then the app
// cannot start offline (measured with go-app v10).
func TestWorkerResourcesAllServed(t *testing.T) {
	h := WithHeaders(Handler(testWeb(t), "test"))
	res, worker := get(t, h, "/app-worker.js")
	if res.StatusCode != 200 {
		t.Fatalf("/app-worker.js: %d", res.StatusCode)
	}
	m := regexp.MustCompile(`const resourcesToCache = (\[.*\]);`).FindStringSubmatch(worker)
	if m == nil {
		t.Fatal("no resource list in the worker")
	}
	var list []string
	if err := json.Unmarshal([]byte(m[1]), &list); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"/", "/web/app.wasm", "/app.js", "/wasm_exec.js", "/web/pairline.css", "/web/icons/icon.svg"} {
		if !contains(list, want) {
			t.Errorf("the worker does not cache %s", want)
		}
	}
	for _, u := range list {
		if !strings.HasPrefix(u, "/") {
			t.Errorf("cached resource %q is not on the app's origin", u)
			continue
		}
		if res, _ := get(t, h, u); res.StatusCode != 200 {
			t.Errorf("cached resource %s answers %d", u, res.StatusCode)
		}
	}
	if !strings.Contains(worker, "event.waitUntil") {
		t.Error("the install handler must wait until the cache is filled")
	}
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// No response names another origin for anything the browser would load,
// and every response carries the Content-Security-Policy.
func TestNothingFromAnotherOrigin(t *testing.T) {
	h := WithHeaders(Handler(testWeb(t), "test"))
	for _, path := range []string{"/", "/manifest.webmanifest", "/app.js", "/app-worker.js", "/web/pairline.css"} {
		res, body := get(t, h, path)
		if res.StatusCode != 200 {
			t.Errorf("%s: %d", path, res.StatusCode)
		}
		csp := res.Header.Get("Content-Security-Policy")
		if !strings.Contains(csp, "default-src 'self'") || strings.Contains(csp, "http") {
			t.Errorf("%s: Content-Security-Policy %q", path, csp)
		}
		for _, line := range strings.Split(body, "\n") {
			// go-app writes og:url/og:image meta properties with an empty
			// domain; they are metadata for link previews, never loaded.
			if remoteURL.MatchString(line) && !strings.Contains(line, `property="og:`) {
				t.Errorf("%s refers to another origin: %.200s", path, line)
			}
		}
	}
}

// The manifest names the app with its own colours and local icons of the
// sizes an install needs (192, 512 and a maskable 512).
func TestManifest(t *testing.T) {
	_, body := get(t, Handler(testWeb(t), "test"), "/manifest.webmanifest")
	var m struct {
		Name, ShortName, StartURL, Display, ThemeColor string
		Icons                                          []struct{ Src, Sizes, Purpose, Type string }
	}
	if err := json.Unmarshal([]byte(body), &m); err != nil {
		t.Fatalf("manifest: %v\n%s", err, body)
	}
	if m.Name != "Pairline" {
		t.Errorf("name %q", m.Name)
	}
	sizes := map[string]bool{}
	for _, ic := range m.Icons {
		if !strings.HasPrefix(ic.Src, "/web/icons/") {
			t.Errorf("icon %q is not a local file under /web/icons/", ic.Src)
		}
		if _, err := os.Stat(filepath.Join("../..", ic.Src)); err != nil {
			t.Errorf("icon %s: %v", ic.Src, err)
		}
		sizes[ic.Sizes+"/"+ic.Purpose] = true
	}
	for _, want := range []string{"192x192/", "512x512/", "512x512/maskable"} {
		if !sizes[want] {
			t.Errorf("no %s icon", want)
		}
	}
}

// The static site holds everything the app loads, and the service worker's
// list only names files that exist in it.
func TestBuildStaticSite(t *testing.T) {
	out := filepath.Join(t.TempDir(), "dist")
	if err := Build(out, testWeb(t)); err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"index.html", "app.js", "app-worker.js", "wasm_exec.js", "manifest.webmanifest", "app.css", "web/app.wasm", "web/pairline.css", "web/icons/icon-192.png"} {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("dist lacks %s", f)
		}
	}
	worker, _ := os.ReadFile(filepath.Join(out, "app-worker.js"))
	m := regexp.MustCompile(`const resourcesToCache = (\[.*\]);`).FindSubmatch(worker)
	var list []string
	if m == nil || json.Unmarshal(m[1], &list) != nil {
		t.Fatal("no resource list in dist/app-worker.js")
	}
	for _, u := range list {
		f := strings.TrimPrefix(u, "/")
		if f == "" {
			f = "index.html"
		}
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("the worker caches %s, which dist lacks", u)
		}
	}
	if _, err := os.Stat(filepath.Join(out, "web", "icons", "gen.go")); err == nil {
		t.Error("dist holds the icon generator's source")
	}
}

// A new build gets a new version (so the worker offers the update); the
// same files keep it.
func TestVersionFollowsFiles(t *testing.T) {
	web := testWeb(t)
	v1, v2 := Version(web), Version(web)
	if v1 != v2 || len(v1) != 16 {
		t.Fatalf("versions %q %q", v1, v2)
	}
	os.WriteFile(filepath.Join(web, "app.wasm"), []byte("\x00asm\x01\x00\x00\x00\x01"), 0o644)
	if Version(web) == v1 {
		t.Error("a changed app.wasm kept the version")
	}
}
