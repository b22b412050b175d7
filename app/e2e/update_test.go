//go:build e2e

package e2e

import (
	"net"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
)

// When a new version is served, the app offers it and does not reload by
// itself: the readings typed stay on screen until the technician chooses.
func TestUpdateOffered(t *testing.T) {
	bin, web := appPaths(t)
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	addr := ln.Addr().String()
	ln.Close()

	srv := startServerAt(t, bin, web, addr)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app", appReady, 60*time.Second)
	waitFor(t, b, "the service worker", `navigator.serviceWorker.getRegistration().then(r => !!(r && r.active))`, 60*time.Second)
	// The worker does not claim the page of the first visit (so that visit is
	// not taken for an update); from the next visit on it controls the page.
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app, controlled by the worker", appReady+` && !!navigator.serviceWorker.controller`, 60*time.Second)
	typePairs(t, b, [][2]string{{"1", "1.1"}})

	// Version 2: the same app with one changed file, served at the same origin.
	web2 := filepath.Join(t.TempDir(), "web")
	if err := os.CopyFS(web2, os.DirFS(web)); err != nil {
		t.Fatal(err)
	}
	css := filepath.Join(web2, "pairline.css")
	old, _ := os.ReadFile(css)
	if err := os.WriteFile(css, append(old, []byte("\n/* version 2 */\n")...), 0o644); err != nil {
		t.Fatal(err)
	}
	srv.Stop()
	startServerAt(t, bin, web2, addr)

	eval[bool](t, b, `navigator.serviceWorker.getRegistration().then(r => r.update()).then(() => true)`)
	waitFor(t, b, "the update offer", `!!tid("update-ready")`, 60*time.Second)
	if got := valueOf(t, b, "x-input-0"); got != "1" {
		t.Errorf("the page changed under the technician: x-input-0 = %q", got)
	}
	screenshot(t, b, "update-offered-tablet")
}
