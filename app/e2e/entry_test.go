//go:build e2e

package e2e

import (
	"fmt"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"

	"pairline/fitcore"
)

// Invalid cells are marked with their reason and never silently dropped;
// too few pairs and x without spread give a sentence, never NaN.
func TestEntryProblemsAndSentences(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, phone)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app", appReady, 60*time.Second)

	typePairs(t, b, [][2]string{{"1", "2.0"}, {"2", "abc"}})
	waitFor(t, b, "the problem mark", `!!tid("y-input-1-problem")`, 5*time.Second)
	if got := attr(t, b, "y-input-1", "aria-invalid"); got != "true" {
		t.Errorf("invalid cell aria-invalid = %q", got)
	}
	if got := attr(t, b, "usable-count", "data-value"); got != "1" {
		t.Errorf("usable pairs = %s, want 1", got)
	}
	msg := textOf(t, b, "result-message")
	if !strings.Contains(msg, "at least 3") {
		t.Errorf("fewer than 3 pairs: message %q", msg)
	}
	screenshot(t, b, "entry-problem-phone")

	// Fix the cell, then make every x equal.
	typeInto(t, b, "y-input-1", "2.5")
	b.do(t, chromedp.Click(sel("x-input-2")), chromedp.KeyEvent("1"), chromedp.KeyEvent(kb.Enter), chromedp.KeyEvent("3"))
	typeInto(t, b, "x-input-1", "1")
	waitFor(t, b, "three usable pairs", `tid("usable-count").dataset.value === "3"`, 5*time.Second)
	waitFor(t, b, "the all-x-equal sentence", `!!tid("result-message")`, 5*time.Second)
	msg = textOf(t, b, "result-message")
	t.Logf("all x equal says: %s", msg)
	if body := eval[string](t, b, `document.body.innerText`); strings.Contains(body, "NaN") || strings.Contains(body, "Inf") {
		t.Errorf("the page shows NaN or Inf:\n%s", body)
	}
	screenshot(t, b, "entry-all-x-equal-phone")
}

// New, rename and delete (with confirmation) in the session list; the open
// session survives a reload.
func TestSessionList(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app", appReady, 60*time.Second)
	typePairs(t, b, [][2]string{{"10", "11"}})
	waitFor(t, b, "the save", `tid("save-status").dataset.state === "saved"`, 10*time.Second)

	// (A click on the element, not at its place on the screen: on 4
	// December the pointer click failed to open a new session in the first
	// run of every test process, 4 of 4, with go-app's server still in the
	// browser build and without, and passed in the runs after; the page's
	// first visit in a fresh profile, probably a layout still moving, not
	// the button, is what differs.)
	click(t, b, "session-new")
	waitFor(t, b, "an empty new session", `tid("x-input-0").value === ""`, 5*time.Second)
	// An empty session is not stored until its first real change.
	b.do(t, chromedp.Click(sel("sessions-open")))
	waitFor(t, b, "one listed session", `tids("session-item").length === 1`, 10*time.Second)
	if got := eval[string](t, b, `tid("session-item").textContent`); !strings.Contains(got, "1 reading ") {
		t.Errorf("the stored session is listed as %q, want 1 reading (the blank row not counted)", got)
	}
	typeInto(t, b, "x-input-0", "20")
	waitFor(t, b, "two listed sessions", `tids("session-item").length === 2`, 10*time.Second)

	// Rename the older one (second in the list: newest first).
	b.do(t, chromedp.Click(chromedp.CSS(`[data-testid="session-item"]:nth-child(2) [data-testid="session-rename"]`)))
	waitFor(t, b, "the rename field", `!!tid("session-rename-input")`, 5*time.Second)
	typeInto(t, b, "session-rename-input", "Probe C-14 check (invented)")
	b.do(t, chromedp.Click(sel("session-rename-save")))
	waitFor(t, b, "the new title in the list", `tids("session-item").some(e => e.textContent.includes("Probe C-14 check (invented)"))`, 10*time.Second)
	screenshot(t, b, "sessions-tablet")

	// Open it (renaming made it the newest, so it is listed first now): its
	// reading is there.
	eval[bool](t, b, `(() => { const it = tids("session-item").find(e => e.textContent.includes("Probe C-14 check (invented)"));
		it.querySelector('[data-testid="session-open"]').click(); return true })()`)
	waitFor(t, b, "the renamed session open", `tid("x-input-0").value === "10"`, 10*time.Second)
	if got := valueOf(t, b, "session-title"); got != "Probe C-14 check (invented)" {
		t.Errorf("title %q", got)
	}

	// Delete asks first; "Keep it" keeps it; confirming moves it away.
	b.do(t, chromedp.Click(sel("sessions-open")))
	waitFor(t, b, "the list", `!!tid("session-delete")`, 5*time.Second)
	b.do(t, chromedp.Click(sel("session-delete")))
	waitFor(t, b, "the confirmation", `!!tid("session-delete-confirm")`, 5*time.Second)
	b.do(t, chromedp.Click(sel("session-delete-confirm")))
	waitFor(t, b, "the next session open", `tid("x-input-0").value === "20"`, 10*time.Second)
	b.do(t, chromedp.Click(sel("sessions-open")))
	waitFor(t, b, "one listed session", `tids("session-item").length === 1`, 10*time.Second)

	// The session open now survives a reload.
	open := valueOf(t, b, "session-title")
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady, 30*time.Second)
	waitFor(t, b, "the same session", fmt.Sprintf(`tid("session-title").value === %q`, open), 10*time.Second)
}

// An edit at 100 readings reaches the screen: after each of 10 edits the
// slope shown is fitcore's slope of the readings the grid then holds, with
// all 100 pairs used. How long each edit took to reach the slope is logged,
// never asserted; BenchmarkEdit100 measures it.
func TestEditLatency100(t *testing.T) {
	b := edit100Setup(t)
	var times []float64
	for k := 0; k < 10; k++ {
		e := edit100(t, b, k)
		if e.MS < 0 {
			t.Fatalf("edit %d: the shown slope did not change (still %s)", k, e.Shown)
		}
		times = append(times, e.MS)
		x, y := anParsed(t, gridPairs(t, b, 100))
		rep := anAnalyze(t, x, y, fitcore.Options{})
		if rep.N != 100 {
			t.Fatalf("edit %d: fitcore uses %d of the grid's pairs, want 100", k, rep.N)
		}
		if got, err := strconv.ParseFloat(e.Shown, 64); err != nil || !relClose(got, rep.Slope.Estimate) {
			t.Errorf("edit %d: the slope shown is %q, fitcore gives %v for the readings on the screen", k, e.Shown, rep.Slope.Estimate)
		}
		if got := attr(t, b, "result-n", "data-value"); got != "100" {
			t.Errorf("edit %d: result-n = %q, want 100", k, got)
		}
	}
	t.Logf("edit to updated slope at 100 readings (ms, 10 edits): %.1f", times)
}

// BenchmarkEdit100 is the time from an edit of one cell at 100 readings to
// the new slope on the screen, as the page measures it (ms/edit):
// go test -tags e2e -run '^$' -bench Edit100 ./app/e2e/
func BenchmarkEdit100(bm *testing.B) {
	b := edit100Setup(bm)
	var total float64
	k := 0
	for bm.Loop() {
		e := edit100(bm, b, k)
		if e.MS < 0 {
			bm.Fatalf("edit %d: the shown slope did not change", k)
		}
		total += e.MS
		k++
	}
	bm.ReportMetric(total/float64(k), "ms/edit")
}

// edit100Setup opens the app and types 100 invented readings.
func edit100Setup(t testing.TB) *browser {
	t.Helper()
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app", appReady, 60*time.Second)
	// 100 invented readings, typed through input and Enter events.
	fillRows(t, b, 100, "String(i + 1)", "(2 * (i + 1) + 0.5 + ((i * 7) % 5) / 10).toFixed(2)")
	waitFor(t, b, "100 pairs", `tid("result-n")?.dataset.value === "100"`, 30*time.Second)
	return b
}

// edited is what edit100 saw: the milliseconds from the edit to the new
// slope on the screen (−1 when it did not change within 30 s) and the
// slope's data-value then.
type edited struct {
	MS    float64 `json:"ms"`
	Shown string  `json:"shown"`
}

// edit100 gives reading 50 a new y (k picks it) and waits for the shown
// slope to change. A MutationObserver sees the new slope as soon as go-app
// writes it, without the delay a polling loop would add.
func edit100(t testing.TB, b *browser, k int) edited {
	t.Helper()
	return eval[edited](t, b, fmt.Sprintf(`new Promise((resolve) => {
		const el = tid("y-input-50");
		const slope = tid("result-slope");
		const before = slope.dataset.value;
		const t0 = performance.now();
		const obs = new MutationObserver(() => {
			if (slope.dataset.value !== before) { obs.disconnect(); resolve({ms: performance.now() - t0, shown: slope.dataset.value}); }
		});
		obs.observe(slope, {attributes: true, attributeFilter: ['data-value']});
		setTimeout(() => { obs.disconnect(); resolve({ms: -1, shown: slope.dataset.value}); }, 30000);
		el.value = (%d + 110.25).toFixed(2); el.dispatchEvent(new Event('input', {bubbles: true}));
	})`, k))
}

// gridPairs reads the x and y cells of the first n readings as shown.
func gridPairs(t testing.TB, b *browser, n int) [][2]string {
	t.Helper()
	return eval[[][2]string](t, b, fmt.Sprintf(`Array.from({length: %d}, (_, i) => [tid('x-input-' + i).value, tid('y-input-' + i).value])`, n))
}

// Long sessions are paged; an edit on the second page lands in the right
// reading (go-app reuses the row elements of the first page) and the first
// page's readings are untouched.
func TestPagingEditsTheRightRow(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app", appReady, 60*time.Second)
	fillRows(t, b, 101, "String(i + 1)", "String(3 * (i + 1))")
	waitFor(t, b, "101 pairs", `tid("usable-count")?.dataset.value === "101"`, 30*time.Second)
	if got := textOf(t, b, "page-info"); !strings.Contains(got, "101–101 of 101") {
		t.Errorf("page info %q", got)
	}
	// Back to page 1: the first row shows reading 1, not reading 101.
	b.do(t, chromedp.Click(sel("page-prev")))
	waitFor(t, b, "page 1", `!!tid("x-input-0")`, 5*time.Second)
	if got := valueOf(t, b, "x-input-0"); got != "1" {
		t.Errorf("row 1 shows %q after paging back, want 1", got)
	}
	typeInto(t, b, "x-input-0", "1.5")
	b.do(t, chromedp.Click(sel("page-next")))
	waitFor(t, b, "page 2", `!!tid("x-input-100")`, 5*time.Second)
	typeInto(t, b, "y-input-100", "303.5")
	waitTaken(t, b, "y-input-100", "303.5")
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady, 30*time.Second)
	if got := valueOf(t, b, "x-input-0"); got != "1.5" {
		t.Errorf("row 1 x = %q after reload, want 1.5", got)
	}
	if got := valueOf(t, b, "y-input-0"); got != "3" {
		t.Errorf("row 1 y = %q after reload, want 3 (an edit on page 2 landed on page 1)", got)
	}
	b.do(t, chromedp.Click(sel("page-next")))
	waitFor(t, b, "page 2", `!!tid("y-input-100")`, 5*time.Second)
	if got := valueOf(t, b, "y-input-100"); got != "303.5" {
		t.Errorf("row 101 y = %q after reload, want 303.5", got)
	}
}

// fillRows fills n rows from the first through input events, moving on with
// Enter after each y as a technician does; xExpr and yExpr are JavaScript
// expressions of the row index i (invented readings).
func fillRows(t testing.TB, b *browser, n int, xExpr, yExpr string) {
	t.Helper()
	eval[bool](t, b, fmt.Sprintf(`(async () => {
		const until = async (f) => { while (!f()) await new Promise(r => setTimeout(r, 5)); };
		for (let i = 0; i < %d; i++) {
			await until(() => tid('x-input-' + i));
			const x = tid('x-input-' + i), y = tid('y-input-' + i);
			x.value = %s; x.dispatchEvent(new Event('input', {bubbles: true}));
			y.value = %s; y.dispatchEvent(new Event('input', {bubbles: true}));
			if (i < %d) y.dispatchEvent(new KeyboardEvent('keydown', {key: 'Enter', bubbles: true}));
		}
		return true; })()`, n, xExpr, yExpr, n-1))
}
