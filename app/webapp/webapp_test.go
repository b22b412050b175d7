package webapp

import (
	"bufio"
	"encoding/json"
	"go/parser"
	"go/token"
	"io"
	"io/fs"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"pairline/app/ui"
)

func TestMain(m *testing.M) {
	ui.Register()
	os.Exit(m.Run())
}

// testWeb copies the repository's web/ folder (Go sources included, to show
// they are not served) into a temporary folder and adds an app.wasm (its
// content does not matter to the handler).
func testWeb(t testing.TB) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "web")
	err := filepath.WalkDir("../../web", func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel("../../web", path)
		target := filepath.Join(dir, rel)
		if d.IsDir() {
			return os.MkdirAll(target, 0o755)
		}
		if rel == "app.wasm" {
			return nil
		}
		b, err := os.ReadFile(path)
		if err != nil {
			return err
		}
		return os.WriteFile(target, b, 0o644)
	})
	if err != nil {
		t.Fatal(err)
	}
	writeFile(t, filepath.Join(dir, "app.wasm"), "\x00asm\x01\x00\x00\x00")
	return dir
}

func writeFile(t testing.TB, path, content string) {
	t.Helper()
	if err := os.WriteFile(path, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
}

// do asks h for target (a request target as sent on the wire) with method.
func do(t *testing.T, h http.Handler, method, target string) (*http.Response, string) {
	t.Helper()
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, httptest.NewRequest(method, target, nil))
	res := rec.Result()
	b, _ := io.ReadAll(res.Body)
	return res, string(b)
}

func get(t *testing.T, h http.Handler, path string) (*http.Response, string) {
	t.Helper()
	return do(t, h, http.MethodGet, path)
}

var workerList = regexp.MustCompile(`const resourcesToCache = (\[.*\]);`)

// cachedBy returns the resource list of a service worker's script.
func cachedBy(t *testing.T, worker string) []string {
	t.Helper()
	m := workerList.FindStringSubmatch(worker)
	if m == nil {
		t.Fatal("no resource list in the worker")
	}
	var list []string
	if err := json.Unmarshal([]byte(m[1]), &list); err != nil {
		t.Fatal(err)
	}
	slices.Sort(list)
	return list
}

// The service worker caches exactly the served set but itself, and every
// entry is answered 200: go-app's worker uses cache.addAll, which caches
// nothing when one URL fails (W3C Service Workers, Cache.addAll: all or
// nothing), and then the app cannot start offline (measured with go-app v10).
func TestWorkerCachesTheServedSet(t *testing.T) {
	h := Site(testWeb(t), "test")
	res, worker := get(t, h, "/app-worker.js")
	if res.StatusCode != 200 {
		t.Fatalf("/app-worker.js: %d", res.StatusCode)
	}
	list := cachedBy(t, worker)
	want := slices.DeleteFunc(Served(), func(p string) bool { return p == workerPath })
	if !slices.Equal(list, want) {
		t.Errorf("the worker caches\n%v\nthe served set but the worker is\n%v", list, want)
	}
	for _, must := range []string{"/", "/web/app.wasm", "/app.js", "/wasm_exec.js", "/web/pairline.css", "/web/icons/icon.svg", "/manifest.webmanifest"} {
		if !slices.Contains(list, must) {
			t.Errorf("the worker does not cache %s", must)
		}
	}
	for _, u := range Served() {
		if res, _ := get(t, h, u); res.StatusCode != 200 {
			t.Errorf("served %s answers %d", u, res.StatusCode)
		}
	}
	if !strings.Contains(worker, "event.waitUntil") {
		t.Error("the install handler must wait until the cache is filled")
	}
}

// Only the served set is answered: no listing of a folder, no Go source, no
// go-app alias or proxy (go-app's /robots.txt is fetched by the server from
// the Host the request names), no file outside the set, and odd spellings
// of a served path are 404, never 500 (a 256-character name gave 500 when
// the folder was served by http.FileServer: the system refuses the name).
func TestOnlyTheServedSet(t *testing.T) {
	web := testWeb(t)
	writeFile(t, filepath.Join(web, "notes.txt"), "not part of the app")
	h := Site(web, "test")
	long := strings.Repeat("a", 256)
	for _, c := range []struct {
		target string
		code   int
	}{
		{"/", 200},
		{"/?session=0f3a", 200},
		{"/web/app.wasm", 200},
		{"/web/app.wasm?v=2", 200},
		{"/web/icons/maskable-512.png", 200},
		{"/web", 404},
		{"/web/", 404},
		{"/web/icons", 404},
		{"/web/icons/", 404},
		{"/web/web.go", 404},
		{"/web/icons/gen.go", 404},
		{"/web/notes.txt", 404},
		{"/web/APP.WASM", 404},
		{"/manifest.json", 404},
		{"/goapp.js", 404},
		{"/app.wasm", 404},
		{"/goapp.wasm", 404},
		{"/robots.txt", 404},
		{"/sitemap.xml", 404},
		{"/ads.txt", 404},
		{"/test/web/app.wasm", 404}, // go-app strips a version prefix
		{"/index.html", 404},
		{"/favicon.ico", 404},
		{"/" + long, 404},
		{"/web/" + long, 404},
		{"/web/" + long + ".css", 404},
		{"/web/" + strings.Repeat("b/", 200) + "c", 404},
		{"/web/app.wasm%00", 404},
		{"/web/app%00.wasm", 404},
		{"/web/app.wasm/", 404},
		{"/web/./app.wasm", 404},
		{"/web/../web/app.wasm", 404},
		{"/web/icons/../app.wasm", 404},
		{"/web/%2e%2e/web/app.wasm", 404},
		{"/web/..%2fweb%2fapp.wasm", 404},
		{"/web%2fapp.wasm", 404},
		{"/web%2Fapp.wasm", 404},
		{"/web/app%2ewasm", 404},
		{"/web\\app.wasm", 404},
		{"/web/icons\\icon.svg", 404},
		{"//web/app.wasm", 404},
		{"/web//app.wasm", 404},
		{"/%2e%2e/%2e%2e/etc/passwd", 404},
		{"*", 404},
	} {
		res, body := get(t, h, c.target)
		if res.StatusCode != c.code {
			t.Errorf("GET %.80s: %d, want %d", c.target, res.StatusCode, c.code)
		}
		if c.code == 404 && strings.Contains(body, "<a href") {
			t.Errorf("GET %.80s lists something: %.200s", c.target, body)
		}
	}
}

// A file reached through a link that leaves the web folder is never served,
// whether the link has a name of the set or another; a link that stays in
// the folder is followed. The server and the build refuse such a folder.
func TestNoLinkOutOfTheFolder(t *testing.T) {
	web := testWeb(t)
	outside := filepath.Join(filepath.Dir(web), "secret.css")
	writeFile(t, outside, "SECRET outside the web folder")
	css := filepath.Join(web, "pairline.css")
	os.Remove(css)
	if err := os.Symlink(outside, css); err != nil {
		t.Skipf("cannot make links here: %v", err)
	}
	must(t, os.Symlink("/etc/hostname", filepath.Join(web, "hostname")))
	must(t, os.Remove(filepath.Join(web, "themes.css")))
	must(t, os.Symlink("../"+filepath.Base(web)+"/../secret.css", filepath.Join(web, "themes.css")))
	// A link inside the folder: icon.svg read through another name.
	svg := filepath.Join(web, "icons", "icon.svg")
	must(t, os.Rename(svg, filepath.Join(web, "icons", "drawn.svg")))
	must(t, os.Symlink("drawn.svg", svg))

	h := Site(web, "test")
	for _, p := range []string{"/web/pairline.css", "/web/themes.css", "/web/hostname"} {
		res, body := get(t, h, p)
		if res.StatusCode != 404 || strings.Contains(body, "SECRET") {
			t.Errorf("%s through a link out of the folder: %d %.100q", p, res.StatusCode, body)
		}
	}
	if res, body := get(t, h, "/web/icons/icon.svg"); res.StatusCode != 200 || !strings.Contains(body, "<svg") {
		t.Errorf("a link inside the folder: %d %.100q", res.StatusCode, body)
	}
	err := checkWebDir(web)
	if err == nil || !strings.Contains(err.Error(), "pairline.css cannot be served: it is a link that leads out of the web folder") ||
		!strings.Contains(err.Error(), "themes.css") {
		t.Errorf("checkWebDir: %v", err)
	}
	if err := Build(filepath.Join(t.TempDir(), "dist"), web); err == nil {
		t.Error("the build used a folder with a link out of it")
	}
}

func must(t *testing.T, err error) {
	t.Helper()
	if err != nil {
		t.Fatal(err)
	}
}

// GET and HEAD are answered; every other method gets 405 with the Allow
// header RFC 9110 §15.5.6 requires, and the usual headers. OPTIONS too: the
// app makes no cross-origin requests, so no browser sends it a CORS
// preflight.
func TestOnlyGetAndHead(t *testing.T) {
	h := Site(testWeb(t), "test")
	for _, c := range []struct {
		method string
		code   int
	}{
		{"GET", 200}, {"HEAD", 200},
		{"POST", 405}, {"PUT", 405}, {"DELETE", 405}, {"PATCH", 405}, {"TRACE", 405},
		{"OPTIONS", 405}, {"PROPFIND", 405}, {"MKCOL", 405}, {"get", 405},
	} {
		for _, p := range []string{"/", "/web/app.wasm", "/web/", "/nothing"} {
			res, _ := do(t, h, c.method, p)
			want := c.code
			if want == 200 && (p == "/web/" || p == "/nothing") {
				want = 404
			}
			if res.StatusCode != want {
				t.Errorf("%s %s: %d, want %d", c.method, p, res.StatusCode, want)
			}
			if want == 405 && res.Header.Get("Allow") != "GET, HEAD" {
				t.Errorf("%s %s: Allow %q", c.method, p, res.Header.Get("Allow"))
			}
			if res.Header.Get("X-Content-Type-Options") != "nosniff" || res.Header.Get("Content-Security-Policy") == "" {
				t.Errorf("%s %s lacks the security headers: %v", c.method, p, res.Header)
			}
		}
	}
}

// Over a real connection, HEAD sends the headers of GET and no body, for
// every file of the set; each has its media type and the security headers.
func TestHeadAndMediaTypes(t *testing.T) {
	srv := httptest.NewServer(Site(testWeb(t), "test"))
	defer srv.Close()
	types := map[string]string{
		"/":                           "text/html",
		"/app.js":                     "application/javascript",
		"/wasm_exec.js":               "application/javascript",
		"/app-worker.js":              "application/javascript",
		"/app.css":                    "text/css",
		"/manifest.webmanifest":       "application/manifest+json",
		"/web/app.wasm":               "application/wasm", // browsers compile nothing else (WebAssembly Web API)
		"/web/pairline.css":           "text/css; charset=utf-8",
		"/web/icons/icon.svg":         "image/svg+xml",
		"/web/icons/icon-192.png":     "image/png",
		"/web/icons/maskable-512.png": "image/png",
	}
	for _, p := range Served() {
		g, err := http.Get(srv.URL + p)
		must(t, err)
		body, _ := io.ReadAll(g.Body)
		g.Body.Close()
		hd, err := http.Head(srv.URL + p)
		must(t, err)
		rest, _ := io.ReadAll(hd.Body)
		hd.Body.Close()
		if g.StatusCode != 200 || hd.StatusCode != 200 {
			t.Errorf("%s: GET %d, HEAD %d", p, g.StatusCode, hd.StatusCode)
		}
		if len(rest) != 0 {
			t.Errorf("HEAD %s sent %d bytes of body", p, len(rest))
		}
		if cl := hd.Header.Get("Content-Length"); cl != "" && cl != strconv.Itoa(len(body)) {
			t.Errorf("HEAD %s: Content-Length %s, GET sends %d bytes", p, cl, len(body))
		}
		ct := g.Header.Get("Content-Type")
		if want, ok := types[p]; ok && !strings.HasPrefix(ct, want) {
			t.Errorf("%s: Content-Type %q, want %q", p, ct, want)
		}
		if hd.Header.Get("Content-Type") != ct {
			t.Errorf("%s: HEAD Content-Type %q, GET %q", p, hd.Header.Get("Content-Type"), ct)
		}
		for k, want := range map[string]string{"X-Content-Type-Options": "nosniff", "Referrer-Policy": "no-referrer"} {
			if got := g.Header.Get(k); got != want {
				t.Errorf("%s: %s %q, want %q", p, k, got, want)
			}
		}
		if !strings.Contains(g.Header.Get("Content-Security-Policy"), "frame-ancestors 'none'") {
			t.Errorf("%s: Content-Security-Policy %q", p, g.Header.Get("Content-Security-Policy"))
		}
		if g.Header.Get("Strict-Transport-Security") != "" {
			t.Errorf("%s: Strict-Transport-Security over plain HTTP (RFC 6797 §7.2: not over HTTP)", p)
		}
	}
}

// Over HTTPS every answer, 404 and 405 included, carries
// Strict-Transport-Security for a year (RFC 6797 §6.1).
func TestHSTSOverTLS(t *testing.T) {
	srv := httptest.NewTLSServer(Site(testWeb(t), "test"))
	defer srv.Close()
	for _, c := range []struct{ method, path string }{{"GET", "/"}, {"GET", "/web/app.wasm"}, {"GET", "/web/"}, {"PUT", "/"}} {
		req, _ := http.NewRequest(c.method, srv.URL+c.path, nil)
		res, err := srv.Client().Do(req)
		must(t, err)
		res.Body.Close()
		if got := res.Header.Get("Strict-Transport-Security"); got != "max-age=31536000" {
			t.Errorf("%s %s: Strict-Transport-Security %q", c.method, c.path, got)
		}
	}
}

// No response names another origin for anything the browser would load,
// and every response carries the Content-Security-Policy.
func TestNothingFromAnotherOrigin(t *testing.T) {
	h := Site(testWeb(t), "test")
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

var remoteURL = regexp.MustCompile(`https?://[A-Za-z0-9]`)

// The manifest names the app with its own colours and local icons of the
// sizes an install needs (192, 512 and a maskable 512), all of the set.
func TestManifest(t *testing.T) {
	_, body := get(t, Site(testWeb(t), "test"), "/manifest.webmanifest")
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
		if !served[ic.Src] {
			t.Errorf("icon %q is not of the served set", ic.Src)
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

// The static site is exactly the served set, each file as the server
// answers it, and its service worker caches only files it holds.
func TestBuildStaticSite(t *testing.T) {
	web := testWeb(t)
	out := filepath.Join(t.TempDir(), "dist")
	must(t, Build(out, web))
	var got []string
	filepath.WalkDir(out, func(path string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			rel, _ := filepath.Rel(out, path)
			got = append(got, filepath.ToSlash(rel))
		}
		return nil
	})
	slices.Sort(got)
	var want []string
	for _, p := range Served() {
		if p == "/" {
			p = "/index.html"
		}
		want = append(want, strings.TrimPrefix(p, "/"))
		if compressible(p) {
			want = append(want, strings.TrimPrefix(p, "/")+".br", strings.TrimPrefix(p, "/")+".gz")
		}
	}
	slices.Sort(want)
	if !slices.Equal(got, want) {
		t.Errorf("dist holds\n%v\nwant\n%v", got, want)
	}
	h := Site(web, "")
	for _, p := range Served() {
		f := strings.TrimPrefix(p, "/")
		if f == "" {
			f = "index.html"
		}
		b, err := os.ReadFile(filepath.Join(out, f))
		must(t, err)
		if _, body := get(t, h, p); sortAttrs(body) != sortAttrs(string(b)) {
			t.Errorf("dist/%s differs from what the server answers at %s", f, p)
		}
	}
	worker, _ := os.ReadFile(filepath.Join(out, "app-worker.js"))
	for _, u := range cachedBy(t, string(worker)) {
		f := strings.TrimPrefix(u, "/")
		if f == "" {
			f = "index.html"
		}
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("the worker caches %s, which dist lacks", u)
		}
	}
}

var (
	htmlTag  = regexp.MustCompile(`<[a-z]+[^>]*>`)
	htmlAttr = regexp.MustCompile(`[a-z-]+(="[^"]*")?`)
)

// sortAttrs puts the attributes of each HTML tag in order: go-app writes
// them in the order of a Go map.
func sortAttrs(page string) string {
	return htmlTag.ReplaceAllStringFunc(page, func(tag string) string {
		attrs := htmlAttr.FindAllString(tag, -1)
		slices.Sort(attrs[1:])
		return strings.Join(attrs, " ")
	})
}

// Serve and Build refuse a web folder without a file of the set, saying
// which; without app.wasm they say the app is not built.
func TestIncompleteWebFolder(t *testing.T) {
	web := testWeb(t)
	must(t, os.Remove(filepath.Join(web, "plots.css")))
	must(t, os.Remove(filepath.Join(web, "icons", "icon-512.png")))
	must(t, os.Mkdir(filepath.Join(web, "icons", "icon-512.png"), 0o755))
	err := Build(filepath.Join(t.TempDir(), "dist"), web)
	if err == nil || !strings.Contains(err.Error(), "plots.css is missing") || !strings.Contains(err.Error(), "icons/icon-512.png cannot be served: it is a folder") {
		t.Errorf("Build: %v", err)
	}
	must(t, os.Remove(filepath.Join(web, "app.wasm")))
	if err := checkWebDir(web); err == nil || !strings.Contains(err.Error(), "the app is not built") {
		t.Errorf("without app.wasm: %v", err)
	}
}

// A new build gets a new version (so the worker offers the update); the
// same files keep it wherever the folder is; files outside the set do not
// count.
func TestVersionFollowsFiles(t *testing.T) {
	web := testWeb(t)
	v1, v2 := Version(web), Version(web)
	if v1 != v2 || len(v1) != 16 {
		t.Fatalf("versions %q %q", v1, v2)
	}
	if other := testWeb(t); Version(other) != v1 {
		t.Errorf("the same files in another folder: %s, want %s", Version(other), v1)
	}
	writeFile(t, filepath.Join(web, "icons", "gen.go"), "package main // changed\n")
	if Version(web) != v1 {
		t.Error("a file outside the set changed the version")
	}
	writeFile(t, filepath.Join(web, "app.wasm"), "\x00asm\x01\x00\x00\x00\x01")
	if Version(web) == v1 {
		t.Error("a changed app.wasm kept the version")
	}
}

// net/http/httptest is for tests: imported by the package it would be
// linked into app.wasm (with its test certificate).
func TestNoHTTPTestOutsideTests(t *testing.T) {
	names, _ := filepath.Glob("*.go")
	for _, n := range names {
		if strings.HasSuffix(n, "_test.go") {
			continue
		}
		f, err := parser.ParseFile(token.NewFileSet(), n, nil, parser.ImportsOnly)
		must(t, err)
		for _, imp := range f.Imports {
			if imp.Path.Value == `"net/http/httptest"` {
				t.Errorf("%s imports net/http/httptest", n)
			}
		}
	}
}

// Any request target Go's parser accepts is answered 200 only when its path
// is of the served set as sent, and otherwise 404 or 405, never 500.
func FuzzSiteTargets(f *testing.F) {
	for _, s := range []string{"/", "/web/app.wasm", "/web/", "/web/%2e%2e/x", "/web\\app.wasm", "/web/app.wasm%00",
		"/" + strings.Repeat("a", 300), "//web/app.wasm", "/web/icons/gen.go", "*", "http://h/web/app.wasm"} {
		f.Add("GET", s)
	}
	f.Add("PUT", "/")
	f.Add("OPTIONS", "*")
	web := testWeb(f)
	h := Site(web, "test")
	f.Fuzz(func(t *testing.T, method, target string) {
		req, err := http.ReadRequest(bufio.NewReader(strings.NewReader(method + " " + target + " HTTP/1.1\r\nHost: tablet\r\n\r\n")))
		if err != nil {
			return
		}
		rec := httptest.NewRecorder()
		h.ServeHTTP(rec, req)
		switch code := rec.Code; {
		case code == 200:
			if (method != "GET" && method != "HEAD") || !served[req.URL.Path] || req.URL.RawPath != "" {
				t.Errorf("%q %q answered 200", method, target)
			}
		case code == 404 || code == 405:
		default:
			t.Errorf("%q %q answered %d", method, target, code)
		}
	})
}
