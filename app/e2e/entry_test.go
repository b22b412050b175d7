//go:build e2e

package e2e

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"
)

// setCell types text into a cell the way the browser reports typing: the
// value changes and an input event fires.
func setCell(t *testing.T, b *browser, testid, text string) {
	t.Helper()
	eval[bool](t, b, fmt.Sprintf(`(() => { const el = document.querySelector('[data-testid=%q]');
		el.value = %q; el.dispatchEvent(new Event('input', {bubbles: true})); return true })()`, testid, text))
}

// Invalid cells are marked with their reason and never silently dropped;
// too few pairs and x without spread give a sentence, never NaN.
func TestEntryProblemsAndSentences(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, phone)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app", appReady, 60*time.Second)

	typePairs(t, b, [][2]string{{"1", "2.0"}, {"2", "abc"}})
	waitFor(t, b, "the problem mark", `!!document.querySelector('[data-testid="y-input-1-problem"]')`, 5*time.Second)
	if got := attr(t, b, "y-input-1", "aria-invalid"); got != "true" {
		t.Errorf("invalid cell aria-invalid = %q", got)
	}
	if got := attr(t, b, "usable-count", "data-value"); got != "1" {
		t.Errorf("usable pairs = %s, want 1", got)
	}
	msg := eval[string](t, b, `document.querySelector('[data-testid="result-message"]').textContent`)
	if !strings.Contains(msg, "at least 3") {
		t.Errorf("fewer than 3 pairs: message %q", msg)
	}
	screenshot(t, b, "entry-problem-phone")

	// Fix the cell, then make every x equal.
	setCell(t, b, "y-input-1", "2.5")
	b.do(t, chromedp.Click(sel("x-input-2")), chromedp.KeyEvent("1"), chromedp.KeyEvent(kb.Enter), chromedp.KeyEvent("3"))
	setCell(t, b, "x-input-1", "1")
	waitFor(t, b, "three usable pairs", `document.querySelector('[data-testid="usable-count"]').dataset.value === "3"`, 5*time.Second)
	waitFor(t, b, "the all-x-equal sentence", `!!document.querySelector('[data-testid="result-message"]')`, 5*time.Second)
	msg = eval[string](t, b, `document.querySelector('[data-testid="result-message"]').textContent`)
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
	waitFor(t, b, "the save", `document.querySelector('[data-testid="save-status"]').dataset.state === "saved"`, 10*time.Second)

	b.do(t, chromedp.Click(sel("session-new")))
	waitFor(t, b, "an empty new session", `document.querySelector('[data-testid="x-input-0"]').value === ""`, 5*time.Second)
	b.do(t, chromedp.Click(sel("sessions-open")))
	waitFor(t, b, "two listed sessions", `document.querySelectorAll('[data-testid="session-item"]').length === 2`, 10*time.Second)

	// Rename the older one (second in the list: newest first).
	b.do(t, chromedp.Click(chromedp.CSS(`[data-testid="session-item"]:nth-child(2) [data-testid="session-rename"]`)))
	waitFor(t, b, "the rename field", `!!document.querySelector('[data-testid="session-rename-input"]')`, 5*time.Second)
	setCell(t, b, "session-rename-input", "Probe C-14 check (invented)")
	b.do(t, chromedp.Click(sel("session-rename-save")))
	waitFor(t, b, "the new title in the list", `[...document.querySelectorAll('[data-testid="session-item"]')].some(e => e.textContent.includes("Probe C-14 check (invented)"))`, 10*time.Second)
	screenshot(t, b, "sessions-tablet")

	// Open it (renaming made it the newest, so it is listed first now): its
	// reading is there.
	eval[bool](t, b, `(() => { const it = [...document.querySelectorAll('[data-testid="session-item"]')].find(e => e.textContent.includes("Probe C-14 check (invented)"));
		it.querySelector('[data-testid="session-open"]').click(); return true })()`)
	waitFor(t, b, "the renamed session open", `document.querySelector('[data-testid="x-input-0"]').value === "10"`, 10*time.Second)
	if got := eval[string](t, b, `document.querySelector('[data-testid="session-title"]').value`); got != "Probe C-14 check (invented)" {
		t.Errorf("title %q", got)
	}

	// Delete asks first; "Keep it" keeps it; confirming moves it away.
	b.do(t, chromedp.Click(sel("sessions-open")))
	waitFor(t, b, "the list", `!!document.querySelector('[data-testid="session-delete"]')`, 5*time.Second)
	b.do(t, chromedp.Click(sel("session-delete")))
	waitFor(t, b, "the confirmation", `!!document.querySelector('[data-testid="session-delete-confirm"]')`, 5*time.Second)
	b.do(t, chromedp.Click(sel("session-delete-confirm")))
	waitFor(t, b, "the next session open", `document.querySelector('[data-testid="x-input-0"]').value === ""`, 10*time.Second)
	b.do(t, chromedp.Click(sel("sessions-open")))
	waitFor(t, b, "one listed session", `document.querySelectorAll('[data-testid="session-item"]').length === 1`, 10*time.Second)

	// The session open now survives a reload.
	open := eval[string](t, b, `document.querySelector('[data-testid="session-title"]').value`)
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady, 30*time.Second)
	waitFor(t, b, "the same session", fmt.Sprintf(`document.querySelector('[data-testid="session-title"]').value === %q`, open), 10*time.Second)
}

// An edit at 100 readings reaches the shown slope within about one frame.
// The time is reported, not asserted (tests never assert on wall-clock time).
func TestEditLatency100(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app", appReady, 60*time.Second)
	// 100 invented readings, typed through input and Enter events.
	fillRows(t, b, 100, "String(i + 1)", "(2 * (i + 1) + 0.5 + ((i * 7) % 5) / 10).toFixed(2)")
	waitFor(t, b, "100 pairs", `document.querySelector('[data-testid="result-n"]')?.dataset.value === "100"`, 30*time.Second)
	var times []float64
	for k := 0; k < 10; k++ {
		// A MutationObserver sees the new slope as soon as go-app writes it,
		// without the delay a polling loop would add.
		ms := eval[float64](t, b, fmt.Sprintf(`new Promise((resolve) => {
			const el = document.querySelector('[data-testid="y-input-50"]');
			const slope = document.querySelector('[data-testid="result-slope"]');
			const t0 = performance.now();
			const obs = new MutationObserver(() => { obs.disconnect(); resolve(performance.now() - t0); });
			obs.observe(slope, {attributes: true, attributeFilter: ['data-value']});
			setTimeout(() => { obs.disconnect(); resolve(5000); }, 5000);
			el.value = (%d + 110.25).toFixed(2); el.dispatchEvent(new Event('input', {bubbles: true}));
		})`, k))
		times = append(times, ms)
	}
	t.Logf("edit to updated slope at 100 readings: %v ms (10 edits)", times)
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
	waitFor(t, b, "101 pairs", `document.querySelector('[data-testid="usable-count"]')?.dataset.value === "101"`, 30*time.Second)
	if got := eval[string](t, b, `document.querySelector('[data-testid="page-info"]').textContent`); !strings.Contains(got, "101–101 of 101") {
		t.Errorf("page info %q", got)
	}
	// Back to page 1: the first row shows reading 1, not reading 101.
	b.do(t, chromedp.Click(sel("page-prev")))
	waitFor(t, b, "page 1", `!!document.querySelector('[data-testid="x-input-0"]')`, 5*time.Second)
	if got := eval[string](t, b, `document.querySelector('[data-testid="x-input-0"]').value`); got != "1" {
		t.Errorf("row 1 shows %q after paging back, want 1", got)
	}
	setCell(t, b, "x-input-0", "1.5")
	b.do(t, chromedp.Click(sel("page-next")))
	waitFor(t, b, "page 2", `!!document.querySelector('[data-testid="x-input-100"]')`, 5*time.Second)
	setCell(t, b, "y-input-100", "303.5")
	waitFor(t, b, "the save", `document.querySelector('[data-testid="save-status"]').dataset.state === "saved"`, 10*time.Second)
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady, 30*time.Second)
	if got := eval[string](t, b, `document.querySelector('[data-testid="x-input-0"]').value`); got != "1.5" {
		t.Errorf("row 1 x = %q after reload, want 1.5", got)
	}
	if got := eval[string](t, b, `document.querySelector('[data-testid="y-input-0"]').value`); got != "3" {
		t.Errorf("row 1 y = %q after reload, want 3 (an edit on page 2 landed on page 1)", got)
	}
	b.do(t, chromedp.Click(sel("page-next")))
	waitFor(t, b, "page 2", `!!document.querySelector('[data-testid="y-input-100"]')`, 5*time.Second)
	if got := eval[string](t, b, `document.querySelector('[data-testid="y-input-100"]').value`); got != "303.5" {
		t.Errorf("row 101 y = %q after reload, want 303.5", got)
	}
}

// fillRows fills n rows from the first through input events, moving on with
// Enter after each y as a technician does; xExpr and yExpr are JavaScript
// expressions of the row index i (invented readings).
func fillRows(t *testing.T, b *browser, n int, xExpr, yExpr string) {
	t.Helper()
	eval[bool](t, b, fmt.Sprintf(`(async () => {
		const q = (id) => document.querySelector('[data-testid="' + id + '"]');
		const until = async (f) => { while (!f()) await new Promise(r => setTimeout(r, 5)); };
		for (let i = 0; i < %d; i++) {
			await until(() => q('x-input-' + i));
			const x = q('x-input-' + i), y = q('y-input-' + i);
			x.value = %s; x.dispatchEvent(new Event('input', {bubbles: true}));
			y.value = %s; y.dispatchEvent(new Event('input', {bubbles: true}));
			if (i < %d) y.dispatchEvent(new KeyboardEvent('keydown', {key: 'Enter', bubbles: true}));
		}
		return true; })()`, n, xExpr, yExpr, n-1))
}
