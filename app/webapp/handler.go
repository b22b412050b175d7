// Package webapp configures how Pairline is served: the go-app handler
// (manifest, icons, service worker, stylesheet), the HTTP headers that keep
// every request on the app's own origin, the `serve` server and the static
// site that `build` writes.
package webapp

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"net/http"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// ContentSecurityPolicy allows the app's own origin only. Go's WebAssembly
// needs 'wasm-unsafe-eval'; go-app sets element styles from the wasm side, so
// inline style attributes are allowed, but no inline script and nothing from
// another origin is.
const ContentSecurityPolicy = "default-src 'self'; " +
	"script-src 'self' 'wasm-unsafe-eval'; " +
	"style-src 'self' 'unsafe-inline'; " +
	"img-src 'self' data: blob:; " +
	"font-src 'self'; " +
	"connect-src 'self'; " +
	"worker-src 'self'; " +
	"manifest-src 'self'; " +
	"object-src 'none'; " +
	"base-uri 'self'; " +
	"form-action 'self'"

// Colours of the installed app (manifest and browser chrome).
const (
	ThemeColor      = "#0b4f5c"
	BackgroundColor = "#f4f1ea"
)

// The served set. Everything `serve` answers, everything `build` writes to
// dist/ and everything the service worker caches comes from these lists and
// nothing else: the worker's cache.addAll fails as a whole when one URL is
// refused, and then the app cannot start offline.

// stylesheets are the files of the web folder the page loads, in this order;
// each part of the UI keeps its rules in a file of its own.
var stylesheets = []string{
	"pairline.css",
	"analysis.css",
	"plots.css",
	"report.css",
	"transfer.css",
	"record.css",
	"history.css",
	"themes.css",
}

// The icons in the web folder (`make icons` draws them).
const (
	iconDefault  = "icons/icon-192.png"
	iconLarge    = "icons/icon-512.png"
	iconSVG      = "icons/icon.svg"
	iconMaskable = "icons/maskable-512.png"
)

// webFiles are the files of the web folder that are served under /web/, by
// their slash-separated names in it. Go source, generators and anything else
// put in the folder are not.
var webFiles = append(append([]string{"app.wasm"}, stylesheets...),
	iconDefault, iconLarge, iconSVG, iconMaskable)

// generated are the URLs go-app writes itself: the page (the app has the one
// route "/"), its script, the Go runtime's loader, its base stylesheet, the
// manifest (ours, see Manifest) and the service worker.
var generated = []string{"/", "/app.js", "/wasm_exec.js", "/app.css", "/manifest.webmanifest", workerPath}

const workerPath = "/app-worker.js"

// webTypes are the media types of the files in webFiles, by extension. They
// are set here rather than from the system's MIME table, which may lack
// application/wasm (browsers refuse to compile wasm served as anything else).
var webTypes = map[string]string{
	".wasm": "application/wasm",
	".css":  "text/css; charset=utf-8",
	".png":  "image/png",
	".svg":  "image/svg+xml",
}

// served holds every URL path Served returns.
var served = func() map[string]bool {
	m := map[string]bool{}
	for _, p := range Served() {
		m[p] = true
	}
	return m
}()

// Served returns, sorted, the URL paths the app consists of: the page,
// go-app's scripts, stylesheet, manifest and service worker, and the files
// of the web folder under /web/ (app.wasm, stylesheets, icons). The server
// answers these and no other path; the static build writes exactly these;
// the service worker caches all of them except itself.
func Served() []string {
	list := append([]string(nil), generated...)
	for _, f := range webFiles {
		list = append(list, "/web/"+f)
	}
	sort.Strings(list)
	return list
}

func webURLs(names ...string) []string {
	urls := make([]string, len(names))
	for i, n := range names {
		urls[i] = "/web/" + n
	}
	return urls
}

// Handler returns the go-app handler for Pairline. webDir is the folder
// holding app.wasm, the stylesheets and the icons (served under /web/);
// version identifies the build: the service worker offers an update whenever
// it changes. An empty version is computed from the files in webDir.
//
// The handler alone answers more than the app's files (go-app's aliases and
// proxies); Site puts it behind the served set.
func Handler(webDir, version string) *app.Handler {
	if version == "" {
		version = Version(webDir)
	}
	return &app.Handler{
		Name:        "Pairline",
		ShortName:   "Pairline",
		Title:       "Pairline",
		Description: "Paired readings to a trustworthy straight line, offline in the field.",
		Author:      "Pairline developers",
		Lang:        "en",
		Icon: app.Icon{
			Default:  "/web/" + iconDefault,
			Large:    "/web/" + iconLarge,
			SVG:      "/web/" + iconSVG,
			Maskable: "/web/" + iconMaskable,
		},
		BackgroundColor: BackgroundColor,
		ThemeColor:      ThemeColor,
		LoadingLabel:    "Loading Pairline… {progress}%",
		Styles:          webURLs(stylesheets...),
		// go-app's worker caches its own files, the stylesheets and three
		// of the icons; the rest of the web folder's set is added here, so
		// that the worker caches the whole served set.
		CacheableResources:    webURLs(webFiles...),
		RawHeaders:            []string{`<meta http-equiv="Content-Security-Policy" content="` + ContentSecurityPolicy + `">`},
		ServiceWorkerTemplate: workerJS,
		Resources:             files{dir: webDir},
		Version:               version,
	}
}

// Version is a short hash of the names and contents of the web folder's
// served files (app.wasm, stylesheets, icons), so that a rebuilt app gets a
// new service-worker version and an unchanged one does not, wherever the
// folder lies. A missing file hashes as absent.
func Version(webDir string) string {
	h := sha256.New()
	for _, name := range webFiles {
		f, _, err := openWebFile(webDir, name)
		if err != nil {
			continue
		}
		io.WriteString(h, name+"\x00")
		io.Copy(h, f)
		f.Close()
	}
	return hex.EncodeToString(h.Sum(nil))[:16]
}

// files serves the web folder's files of webFiles under /web/ and resolves
// resource paths as they are (go-app's LocalDir would prefix them with the
// folder name).
type files struct{ dir string }

func (files) Resolve(location string) string {
	if location == "" || location == "/" {
		return "/"
	}
	if strings.HasPrefix(location, "/web/") || strings.HasPrefix(location, "web/") {
		return "/" + strings.TrimPrefix(location, "/")
	}
	return location
}

// isWebFile holds the names of webFiles.
var isWebFile = func() map[string]bool {
	m := map[string]bool{}
	for _, f := range webFiles {
		m[f] = true
	}
	return m
}()

func (f files) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	name, ok := strings.CutPrefix(r.URL.Path, "/web/")
	if !ok || !isWebFile[name] {
		notFound(w)
		return
	}
	file, info, err := openWebFile(f.dir, name)
	if err != nil {
		notFound(w)
		return
	}
	defer file.Close()
	w.Header().Set("Content-Type", webTypes[filepath.Ext(name)])
	http.ServeContent(w, r, "", info.ModTime(), file)
}

// errOutside is why a file reached through a link that leaves the web
// folder is not served.
var errOutside = errors.New("it is a link that leads out of the web folder")

// openWebFile opens name (slash-separated) inside dir. It follows links only
// while they stay inside dir (os.Root) and opens regular files only.
func openWebFile(dir, name string) (*os.File, fs.FileInfo, error) {
	root, err := os.OpenRoot(dir)
	if err != nil {
		return nil, nil, err
	}
	defer root.Close()
	f, err := root.Open(filepath.FromSlash(name))
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, nil, fs.ErrNotExist
		}
		if _, lerr := root.Lstat(filepath.FromSlash(name)); lerr == nil {
			return nil, nil, errOutside
		}
		return nil, nil, err
	}
	info, err := f.Stat()
	if err == nil && !info.Mode().IsRegular() {
		err = fmt.Errorf("it is a %s, not a file", kind(info))
	}
	if err != nil {
		f.Close()
		return nil, nil, err
	}
	return f, info, nil
}

func kind(info fs.FileInfo) string {
	if info.IsDir() {
		return "folder"
	}
	return "special file"
}

// checkWebDir says what keeps dir from being served or built: app.wasm or
// another file of the served set missing, a link leading out of the folder,
// a folder where a file should be.
func checkWebDir(dir string) error {
	if _, err := os.Stat(dir); err != nil {
		return fmt.Errorf("the web folder %s cannot be used: %w (give the repository's web folder with --web)", dir, err)
	}
	if f, _, err := openWebFile(dir, "app.wasm"); err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return fmt.Errorf("the app is not built: %s is missing (run `make run` or `make wasm` first)", filepath.Join(dir, "app.wasm"))
		}
	} else {
		f.Close()
	}
	var problems []string
	for _, name := range webFiles {
		f, _, err := openWebFile(dir, name)
		switch {
		case err == nil:
			f.Close()
		case errors.Is(err, fs.ErrNotExist):
			problems = append(problems, name+" is missing")
		default:
			problems = append(problems, fmt.Sprintf("%s cannot be served: %v", name, err))
		}
	}
	if len(problems) > 0 {
		return fmt.Errorf("the web folder %s is not complete, so the app could not start offline: %s", dir, strings.Join(problems, "; "))
	}
	return nil
}

// notFound answers 404 with a sentence for people.
func notFound(w http.ResponseWriter) {
	http.Error(w, "Not found: this address is not part of Pairline.", http.StatusNotFound)
}
