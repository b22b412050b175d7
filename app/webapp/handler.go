// Package webapp configures how Pairline is served: the go-app handler
// (manifest, icons, service worker, stylesheet), the HTTP headers that keep
// every request on the app's own origin, the `serve` server and the static
// site that `build` writes.
package webapp

import (
	"crypto/sha256"
	"encoding/hex"
	"io"
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

// staticFiles are the files under web/ that the app uses and the service
// worker must cache, besides app.wasm and the icons that go-app adds itself.
var staticFiles = append([]string{"/web/icons/icon.svg"}, stylesheets...)

// stylesheets are loaded in this order; each part of the UI keeps its rules
// in a file of its own.
var stylesheets = []string{
	"/web/pairline.css",
	"/web/analysis.css",
	"/web/plots.css",
	"/web/report.css",
	"/web/transfer.css",
	"/web/themes.css",
}

// Handler returns the go-app handler for Pairline. webDir is the folder
// holding app.wasm, the stylesheet and the icons (served under /web/);
// version identifies the build: the service worker offers an update whenever
// it changes. An empty version is computed from the files in webDir.
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
			Default:  "/web/icons/icon-192.png",
			Large:    "/web/icons/icon-512.png",
			SVG:      "/web/icons/icon.svg",
			Maskable: "/web/icons/maskable-512.png",
		},
		BackgroundColor:       BackgroundColor,
		ThemeColor:            ThemeColor,
		LoadingLabel:          "Loading Pairline… {progress}%",
		Styles:                stylesheets,
		CacheableResources:    staticFiles,
		RawHeaders:            []string{`<meta http-equiv="Content-Security-Policy" content="` + ContentSecurityPolicy + `">`},
		ServiceWorkerTemplate: workerJS,
		Resources:             files{Handler: http.StripPrefix("/web", http.FileServer(http.Dir(webDir)))},
		Version:               version,
	}
}

// Version is a short hash of the files under webDir (app.wasm, stylesheet,
// icons), so that a rebuilt app gets a new service-worker version and an
// unchanged one does not. A missing folder hashes as empty.
func Version(webDir string) string {
	h := sha256.New()
	var files []string
	filepath.WalkDir(webDir, func(path string, d os.DirEntry, err error) error {
		if err == nil && !d.IsDir() && filepath.Ext(path) != ".go" {
			files = append(files, path)
		}
		return nil
	})
	sort.Strings(files)
	for _, f := range files {
		io.WriteString(h, filepath.ToSlash(f)+"\x00")
		if fh, err := os.Open(f); err == nil {
			io.Copy(h, fh)
			fh.Close()
		}
	}
	return hex.EncodeToString(h.Sum(nil))[:16]
}

// files serves webDir under /web/ and resolves resource paths as they are:
// go-app's LocalDir would prefix them with the folder name.
type files struct{ http.Handler }

func (files) Resolve(location string) string {
	if location == "" || location == "/" {
		return "/"
	}
	if strings.HasPrefix(location, "/web/") || strings.HasPrefix(location, "web/") {
		return "/" + strings.TrimPrefix(location, "/")
	}
	return location
}
