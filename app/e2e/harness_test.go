//go:build e2e

package e2e

import (
	"context"
	"fmt"
	"net"
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"
)

// Viewports used for screenshots: a 10-inch tablet in portrait and a phone.
var (
	tablet = [2]int64{800, 1280}
	phone  = [2]int64{390, 844}
)

// chromiumPath returns the browser to drive. Without one the tests fail in
// CI (CI=true) and skip visibly elsewhere.
func chromiumPath(t testing.TB) string {
	p := os.Getenv("PAIRLINE_CHROMIUM")
	if p == "" {
		for _, c := range []string{"chromium", "chromium-browser"} {
			if lp, err := exec.LookPath(c); err == nil {
				p = lp
				break
			}
		}
	}
	if p == "" {
		if os.Getenv("CI") == "true" {
			t.Fatal("Chromium is not installed: CI must run the browser tests")
		}
		t.Skip("SKIPPED browser tests: Chromium is not installed")
	}
	return p
}

// server is a running `pairline serve`.
type server struct {
	URL  string
	cmd  *exec.Cmd
	once sync.Once
}

// startServer runs the native command on a free loopback port.
func startServer(t testing.TB) *server {
	t.Helper()
	bin, web := appPaths(t)
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	addr := ln.Addr().String()
	ln.Close()
	return startServerAt(t, bin, web, addr)
}

// appPaths returns the pairline command and the web folder under test.
func appPaths(t testing.TB) (bin, web string) {
	t.Helper()
	bin, web = os.Getenv("PAIRLINE_BIN"), os.Getenv("PAIRLINE_WEB")
	if bin == "" || web == "" {
		root, _ := filepath.Abs("../..")
		bin, web = filepath.Join(root, "bin", "pairline"), filepath.Join(root, "web")
	}
	if _, err := os.Stat(filepath.Join(web, "app.wasm")); err != nil {
		t.Fatalf("the app is not built (%v): run `make browser`", err)
	}
	return bin, web
}

// startServerAt serves web at addr and waits until it answers.
func startServerAt(t testing.TB, bin, web, addr string) *server {
	t.Helper()
	cmd := exec.Command(bin, "serve", "--addr", addr, "--web", web)
	cmd.Stdout, cmd.Stderr = os.Stderr, os.Stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	s := &server{URL: "http://" + addr, cmd: cmd}
	t.Cleanup(s.Stop)
	deadline := time.Now().Add(15 * time.Second)
	for {
		resp, err := http.Get(s.URL + "/web/app.wasm")
		if err == nil {
			resp.Body.Close()
			if resp.StatusCode == 200 {
				return s
			}
		}
		if time.Now().After(deadline) {
			t.Fatalf("the server did not answer at %s: %v", s.URL, err)
		}
		time.Sleep(100 * time.Millisecond)
	}
}

// Stop ends the server process and waits until the port no longer answers.
func (s *server) Stop() {
	s.once.Do(func() {
		s.cmd.Process.Kill()
		s.cmd.Wait()
	})
}

// browser is one headless Chromium with a fresh profile, and the record of
// every URL the page asked for.
type browser struct {
	ctx      context.Context
	mu       sync.Mutex
	requests []string
	console  []string // the page's console lines (Go's own output goes to console.log) and uncaught exceptions, the newest last
}

// maxConsole is how many console lines a browser keeps for a failing test.
const maxConsole = 40

// note keeps one console line.
func (b *browser) note(line string) {
	b.mu.Lock()
	defer b.mu.Unlock()
	b.console = append(b.console, line)
	if len(b.console) > maxConsole {
		b.console = b.console[len(b.console)-maxConsole:]
	}
}

// watchConsole keeps the page's console lines and exceptions (Go's
// WebAssembly runtime writes its output, a panic too, with console.log). When the
// test fails they are logged; a Go panic (the app has stopped) fails the
// test whatever else it checked.
func (b *browser) watchConsole(t testing.TB) {
	t.Helper()
	calls := chromedp.Events(b.ctx, runtime.ConsoleAPICalled)
	thrown := chromedp.Events(b.ctx, runtime.ExceptionThrown)
	go func() {
		for ev, err := range calls {
			if err != nil {
				return
			}
			switch ev.Type {
			case runtime.ConsoleAPICalledTypeError, runtime.ConsoleAPICalledTypeWarning, runtime.ConsoleAPICalledTypeLog:
			default:
				continue
			}
			var parts []string
			for _, a := range ev.Args {
				if len(a.Value) > 0 {
					parts = append(parts, string(a.Value))
				} else {
					parts = append(parts, a.Description)
				}
			}
			b.note("console." + string(ev.Type) + ": " + strings.Join(parts, " "))
		}
	}()
	go func() {
		for ev, err := range thrown {
			if err != nil {
				return
			}
			d := ev.ExceptionDetails
			line := "exception: " + d.Text
			if d.Exception != nil {
				line += " " + d.Exception.Description
			}
			b.note(line)
		}
	}()
	t.Cleanup(func() {
		b.mu.Lock()
		lines := append([]string(nil), b.console...)
		b.mu.Unlock()
		for _, l := range lines {
			if strings.Contains(l, "panic: ") || strings.Contains(l, "fatal error: ") {
				t.Errorf("the app stopped with a Go panic in the page: %s", l)
			}
		}
		if t.Failed() {
			for _, l := range lines {
				t.Logf("page %s", l)
			}
		}
	})
}

func newBrowser(t testing.TB, size [2]int64) *browser {
	t.Helper()
	profile, err := os.MkdirTemp("", "pairline-chromium-")
	if err != nil {
		t.Fatal(err)
	}
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(chromiumPath(t)),
		chromedp.Headless,
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.NoFirstRun,
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.UserDataDir(profile),
		chromedp.WindowSize(int(size[0]), int(size[1])),
	}
	actx, cancelA := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelC := chromedp.NewContext(actx)
	ctx, cancelT := context.WithTimeout(ctx, 4*time.Minute)
	t.Cleanup(func() {
		cancelT()
		cancelC()
		cancelA()
		// Chromium may still be writing its profile for a moment after it
		// was told to quit; a leftover folder in /tmp is no test failure.
		for i := 0; i < 20 && os.RemoveAll(profile) != nil; i++ {
			time.Sleep(100 * time.Millisecond)
		}
	})
	b := &browser{ctx: ctx}
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(size[0], size[1])); err != nil {
		t.Fatalf("cannot start Chromium: %v", err)
	}
	b.watchConsole(t)
	addTestIDs(t, ctx)
	events := chromedp.Events(ctx, network.RequestWillBeSent)
	if err := chromedp.Do(ctx, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		_, err := cdp.Call(ctx, tg, network.Enable, network.EnableParams{})
		return err
	})); err != nil {
		t.Fatal(err)
	}
	go func() {
		for ev, err := range events {
			if err != nil {
				return
			}
			b.mu.Lock()
			b.requests = append(b.requests, ev.Request.URL)
			b.mu.Unlock()
		}
	}()
	return b
}

// addTestIDs makes tid and tids (testidJS) exist in every page the tab of
// ctx opens.
func addTestIDs(t testing.TB, ctx context.Context) {
	t.Helper()
	if err := chromedp.Do(ctx, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		now := true
		_, err := cdp.Call(ctx, tg, page.AddScriptToEvaluateOnNewDocument, page.AddScriptToEvaluateOnNewDocumentParams{Source: testidJS, RunImmediately: &now})
		return err
	})); err != nil {
		t.Fatal(err)
	}
}

// newTab opens a second tab in b's browser (same profile, so the same
// storage and BroadcastChannel); it closes with the test.
func (b *browser) newTab(t testing.TB) *browser {
	t.Helper()
	ctx, cancel := chromedp.NewContext(b.ctx)
	t.Cleanup(cancel)
	addTestIDs(t, ctx)
	tab := &browser{ctx: ctx}
	tab.watchConsole(t)
	return tab
}

// foreign returns the requests that went anywhere but origin.
func (b *browser) foreign(origin string) []string {
	b.mu.Lock()
	defer b.mu.Unlock()
	var out []string
	for _, u := range b.requests {
		if strings.HasPrefix(u, origin+"/") || u == origin || strings.HasPrefix(u, "data:") || strings.HasPrefix(u, "blob:") {
			continue
		}
		out = append(out, u)
	}
	return out
}

func (b *browser) do(t testing.TB, actions ...chromedp.Action[chromedp.Void]) {
	t.Helper()
	if err := chromedp.Do(b.ctx, actions...); err != nil {
		t.Fatal(err)
	}
}

// eval evaluates a JavaScript expression (awaiting a promise) and returns its value.
func eval[T any](t testing.TB, b *browser, expr string) T {
	t.Helper()
	v, err := chromedp.Run(b.ctx, chromedp.Evaluate[T](expr, chromedp.EvalAwaitPromise))
	if err != nil {
		t.Fatalf("evaluating %s: %v", expr, err)
	}
	return v
}

// waitFor evaluates a JavaScript condition (which may be a promise) every
// 100 ms until it is truthy.
func waitFor(t testing.TB, b *browser, what, cond string, timeout time.Duration) {
	t.Helper()
	waitForExplained(t, b, what, cond, "", timeout)
}

// waitForExplained is waitFor that, when the time is up, also reports what
// the JavaScript expression explain says of the page (a string).
func waitForExplained(t testing.TB, b *browser, what, cond, explain string, timeout time.Duration) {
	t.Helper()
	expr := "(async () => !!(await (" + cond + ")))()"
	deadline := time.Now().Add(timeout)
	var last error
	for time.Now().Before(deadline) {
		ok, err := chromedp.Run(b.ctx, chromedp.Evaluate[bool](expr, chromedp.EvalAwaitPromise))
		if err == nil && ok {
			return
		}
		last = err
		time.Sleep(100 * time.Millisecond)
	}
	if explain != "" {
		seen, err := chromedp.Run(b.ctx, chromedp.Evaluate[string](explain, chromedp.EvalAwaitPromise))
		if err != nil {
			seen = "(" + err.Error() + ")"
		}
		t.Fatalf("waiting for %s: not true after %v (last error: %v); the page: %s", what, timeout, last, seen)
	}
	t.Fatalf("waiting for %s: not true after %v (last error: %v)", what, timeout, last)
}

// testidJS defines two functions in every page the tests open, so that
// the tests' JavaScript never spells out a data-testid selector:
//
//	tid(id, more)  the first element with data-testid=id, or null
//	tids(id, more) all of them, as an array
//
// more, when given, is appended to the selector as CSS, with @name standing
// for [data-testid="name"]: tid("plot-fit", " [data-row='3']") is the point
// of row 3 on the fit plot, tid("session-item", "[data-id='…'] @session-open")
// the open button of one listed session (so more holds no other @).
//
// Tests read and act through the Go helpers below (attr, textOf, valueOf,
// exists, click, setValue, typeInto) and use tid in their own JavaScript.
const testidJS = `(() => {
	const sel = (id, more) => '[data-testid="' + id + '"]' + (more || '').replace(/@([\w-]+)/g, '[data-testid="$1"]');
	window.tid = (id, more) => document.querySelector(sel(id, more));
	window.tids = (id, more) => [...document.querySelectorAll(sel(id, more))];
})()`

// byID is the CSS selector of the element with that data-testid.
func byID(testid string) string { return `[data-testid="` + testid + `"]` }

func sel(testid string) chromedp.CSS { return chromedp.CSS(byID(testid)) }

// attr reads an attribute of the element with that data-testid ("" when it
// has none, "<missing>" when there is no such element).
func attr(t testing.TB, b *browser, testid, name string) string {
	t.Helper()
	return eval[string](t, b, fmt.Sprintf(`(tid(%q)||{getAttribute:()=>"<missing>"}).getAttribute(%q) || ""`, testid, name))
}

// textOf reads the text of the element with that data-testid ("<missing>"
// when there is none).
func textOf(t testing.TB, b *browser, testid string) string {
	t.Helper()
	return eval[string](t, b, fmt.Sprintf(`(tid(%q)||{textContent:"<missing>"}).textContent`, testid))
}

// valueOf reads the value of the input with that data-testid ("<missing>"
// when there is none).
func valueOf(t testing.TB, b *browser, testid string) string {
	t.Helper()
	return eval[string](t, b, fmt.Sprintf(`(tid(%q)||{value:"<missing>"}).value`, testid))
}

// exists says whether an element with that data-testid is on the page.
func exists(t testing.TB, b *browser, testid string) bool {
	t.Helper()
	return eval[bool](t, b, fmt.Sprintf(`!!tid(%q)`, testid))
}

// click clicks the element with that data-testid once it exists.
func click(t testing.TB, b *browser, testid string) {
	t.Helper()
	waitFor(t, b, testid, fmt.Sprintf(`!!tid(%q)`, testid), 20*time.Second)
	eval[bool](t, b, fmt.Sprintf(`(tid(%q).click(), true)`, testid))
}

// setValue sets an input's text and fires the event its handler listens to
// ("input" or "change").
func setValue(t testing.TB, b *browser, testid, value, event string) {
	t.Helper()
	// A cell the last key press adds (the empty row after the last
	// reading) is on the page a frame later.
	waitFor(t, b, testid, fmt.Sprintf(`!!tid(%q)`, testid), 20*time.Second)
	eval[bool](t, b, fmt.Sprintf(`(() => { const el = tid(%q); if (!el) throw new Error('no %s');
		el.value = %q; el.dispatchEvent(new Event(%q, { bubbles: true })); return true; })()`, testid, testid, value, event))
}

// typeInto types text into a cell the way the browser reports typing: the
// value changes and an input event fires.
func typeInto(t testing.TB, b *browser, testid, text string) {
	t.Helper()
	setValue(t, b, testid, text, "input")
}

// openApp serves the app, opens it in a fresh browser of the given size
// and waits until a reading can be typed.
func openApp(t testing.TB, size [2]int64) (*server, *browser) {
	t.Helper()
	srv := startServer(t)
	b := newBrowser(t, size)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app", appReady, 60*time.Second)
	return srv, b
}

// waitTaken waits until the app has taken value into the grid cell testid
// and stored it: the cell's data-value is the session's text, and the save
// status says saved. The status alone is not enough right after a key: the
// app takes the key at once but draws the next frame up to a frame later,
// and until then the status still shows the previous save.
func waitTaken(t testing.TB, b *browser, testid, value string) {
	t.Helper()
	waitFor(t, b, testid+" = "+value+" stored", fmt.Sprintf(`tid(%q)?.dataset.value === %q && tid("save-status").dataset.state === "saved"`, testid, value), 20*time.Second)
}

// artifactDir is the folder for screenshots and saved reports:
// PAIRLINE_ARTIFACTS when set, else app/e2e/testdata/artifacts (git-ignored).
func artifactDir(t testing.TB) string {
	t.Helper()
	dir := os.Getenv("PAIRLINE_ARTIFACTS")
	if dir == "" {
		dir, _ = filepath.Abs(filepath.Join("testdata", "artifacts"))
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatalf("cannot make the artifacts folder: %v", err)
	}
	return dir
}

// screenshot saves a full-page PNG in artifactDir.
func screenshot(t testing.TB, b *browser, name string) {
	t.Helper()
	dir := artifactDir(t)
	buf, err := chromedp.Run(b.ctx, chromedp.FullScreenshot(100))
	if err != nil {
		t.Fatalf("screenshot: %v", err)
	}
	path := filepath.Join(dir, name+".png")
	if err := os.WriteFile(path, buf, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("screenshot: %s", path)
}

// screenshotView saves what the viewport shows (screenshot saves the whole
// page, which Chromium refuses for a very long one).
func screenshotView(t testing.TB, b *browser, name string) {
	t.Helper()
	buf, err := chromedp.Run(b.ctx, chromedp.CaptureScreenshot())
	if err != nil {
		t.Fatalf("screenshot: %v", err)
	}
	path := filepath.Join(artifactDir(t), name+".png")
	if err := os.WriteFile(path, buf, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("screenshot: %s", path)
}

// plotPointJS is a JavaScript function (svg, x, y) giving the screen
// point (a DOMPoint) where the data point (x, y) is drawn on a plot: the
// svg's data-frame holds its scales (app/plot.Draw).
const plotPointJS = `((svg, x, y) => {
	const f = svg.dataset.frame.split(' ').map(Number);
	return new DOMPoint(f[2] + (x - f[0]) * (f[3] - f[2]) / (f[1] - f[0]), f[6] + (y - f[4]) * (f[7] - f[6]) / (f[5] - f[4])).matrixTransform(svg.getScreenCTM());
})`

// tapPlotAt taps a plot where the data point (x, y) is drawn, as a finger
// would: the plot is scrolled into view, plotPointJS finds the point on
// the screen and Chromium gets a real mouse click there. It returns the
// screen point tapped.
func tapPlotAt(t testing.TB, b *browser, testID string, x, y float64) [2]float64 {
	t.Helper()
	p := eval[[]float64](t, b, fmt.Sprintf(`(() => {
		const svg = tid(%q);
		svg.scrollIntoView({block: 'center'});
		const p = %s(svg, %v, %v);
		return [p.x, p.y];
	})()`, testID, plotPointJS, x, y))
	b.do(t, chromedp.MouseClickXY(p[0], p[1]))
	return [2]float64{p[0], p[1]}
}

// Earlier names of the helpers above, kept so that tests written alongside
// this change still build; new tests use click, exists, setValue, typeInto
// and textOf.
//
//lint:ignore U1000 kept until the tests written alongside use the new name
func fuClick(t testing.TB, b *browser, testid string) { t.Helper(); click(t, b, testid) }

//lint:ignore U1000 kept until the tests written alongside use the new name
func anClick(t testing.TB, b *browser, testid string) { t.Helper(); click(t, b, testid) }

//lint:ignore U1000 kept until the tests written alongside use the new name
func anExists(t testing.TB, b *browser, testid string) bool { t.Helper(); return exists(t, b, testid) }

//lint:ignore U1000 kept until the tests written alongside use the new name
func anSet(t testing.TB, b *browser, testid, value, event string) {
	t.Helper()
	setValue(t, b, testid, value, event)
}

//lint:ignore U1000 kept until the tests written alongside use the new name
func setCell(t testing.TB, b *browser, testid, text string) { t.Helper(); typeInto(t, b, testid, text) }

//lint:ignore U1000 kept until the tests written alongside use the new name
func text(t testing.TB, b *browser, testid string) string { t.Helper(); return textOf(t, b, testid) }
