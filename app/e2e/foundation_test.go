//go:build e2e

package e2e

import (
	"fmt"
	"math"
	"strconv"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
)

// fivePairs is a worked example small enough to check by hand (invented
// readings): x̄ = 3, ȳ = 7, Sxx = 10, Sxy = 19.7, so the least-squares slope
// is Sxy/Sxx = 1.97 and the intercept ȳ − 1.97·x̄ = 1.09 (the textbook
// formulas b1 = Sxy/Sxx, b0 = ȳ − b1·x̄; common practice).
var fivePairs = [][2]string{{"1", "3.1"}, {"2", "4.9"}, {"3", "7,2"}, {"4", "8.8"}, {"5", "11.0"}}

const (
	fiveSlope     = 1.97
	fiveIntercept = 1.09
)

// appReady is true once the wasm app has rendered the readings grid.
const appReady = `!!tid("x-input-0")`

func num(t *testing.T, b *browser, testid string) float64 {
	t.Helper()
	v := attr(t, b, testid, "data-value")
	f, err := strconv.ParseFloat(v, 64)
	if err != nil {
		t.Fatalf("%s has data-value %q: %v", testid, v, err)
	}
	return f
}

func near(a, b, tol float64) bool { return math.Abs(a-b) <= tol*math.Max(1, math.Abs(b)) }

// typePairs types the pairs from the first row with the keyboard, moving on
// with Enter as a technician does: Enter in x goes to y, Enter in y goes to
// the next row (typeSteady waits for the focus at each step).
func typePairs(t *testing.T, b *browser, pairs [][2]string) {
	t.Helper()
	typeSteady(t, b, 0, pairs)
}

// TestFoundation follows one technician: first visit, typing five pairs,
// reload, then the server goes away and the app still starts from the
// service worker with its readings. No request may leave the app's origin.
func TestFoundation(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)

	start := time.Now()
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	t.Logf("first visit to interactive: %v", time.Since(start).Round(time.Millisecond))

	if eval[bool](t, b, `!!tid("update-ready")`) {
		t.Error("a first visit must not announce an update")
	}
	typePairs(t, b, fivePairs)
	waitFor(t, b, "the line from 5 pairs", `tid("result-n")?.dataset.value === "5"`, 10*time.Second)
	if got := num(t, b, "result-n"); got != 5 {
		t.Fatalf("n = %v, want 5", got)
	}
	if got := num(t, b, "result-slope"); !near(got, fiveSlope, 1e-12) {
		t.Errorf("slope = %v, want %v (hand-computed)", got, fiveSlope)
	}
	if got := num(t, b, "result-intercept"); !near(got, fiveIntercept, 1e-12) {
		t.Errorf("intercept = %v, want %v (hand-computed)", got, fiveIntercept)
	}
	// Enter on the last y created row 5 (from 0) and moved the focus there.
	if got := eval[string](t, b, `document.activeElement.dataset.testid || ""`); got != "x-input-5" {
		t.Errorf("focus after the last Enter is on %q, want x-input-5", got)
	}
	waitFor(t, b, "the save", `tid("save-status").dataset.state === "saved"`, 10*time.Second)
	screenshot(t, b, "foundation-tablet")

	// Reload: the readings come back from IndexedDB.
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady+` && tid("y-input-4")`, 30*time.Second)
	checkPairs(t, b, fivePairs)

	// Offline: wait until the service worker has cached app.wasm (its install
	// does not block the page), stop the server, reload.
	waitFor(t, b, "app.wasm in the service worker's cache", `(async () => {
		for (const k of await caches.keys()) {
			const c = await caches.open(k);
			if (await c.match('/web/app.wasm')) return true;
		}
		return false;
	})()`, 60*time.Second)
	waitFor(t, b, "the service worker to be active", `navigator.serviceWorker.getRegistration().then(r => !!(r && r.active && r.active.state === "activated"))`, 30*time.Second)
	srv.Stop()
	start = time.Now()
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app to start offline", appReady+` && tid("y-input-4")`, 30*time.Second)
	cached := time.Since(start)
	t.Logf("cached (offline) start to interactive: %v", cached.Round(time.Millisecond))
	if cached > 2*time.Second {
		t.Logf("NOTE: offline start took more than 2 s on this machine")
	}
	checkPairs(t, b, fivePairs)
	if got := num(t, b, "result-slope"); !near(got, fiveSlope, 1e-12) {
		t.Errorf("offline slope = %v, want %v", got, fiveSlope)
	}

	if bad := b.foreign(srv.URL); len(bad) > 0 {
		t.Errorf("requests left the app's origin: %v", bad)
	}
	if n := eval[int](t, b, `performance.getEntriesByType('resource').filter(e => !e.name.startsWith(location.origin)).length`); n != 0 {
		t.Errorf("%d resources came from another origin", n)
	}
}

func checkPairs(t *testing.T, b *browser, pairs [][2]string) {
	t.Helper()
	for i, p := range pairs {
		for j, col := range []string{"x", "y"} {
			id := fmt.Sprintf("%s-input-%d", col, i)
			got := eval[string](t, b, fmt.Sprintf(`tid(%q).value`, id))
			if got != p[j] {
				t.Errorf("%s = %q after reload, want %q", id, got, p[j])
			}
		}
	}
}
