//go:build e2e

package e2e

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"pairline/fitcore"
)

// unPairs are invented readings of a straight line (slope about 2).
var unPairs = [][2]string{{"1", "2.1"}, {"2", "4.0"}, {"3", "6.1"}, {"4", "7.9"}, {"5", "10.2"}}

// unScreen is what the screen shows of a session, as one text to compare:
// every reading's cells, every criterion box, the verdict and the slope.
const unScreen = `(() => {
	const v = (id) => { const e = document.querySelector('[data-testid="' + id + '"]'); return e ? e.value : "<missing>"; };
	const cells = [...document.querySelectorAll('input[data-testid^="x-input-"]')].map((e, i) => i + ": " + e.value + " | " + v("y-input-" + i));
	const boxes = ["acceptance-min-r2", "acceptance-slope-low", "acceptance-slope-high", "acceptance-intercept-low", "acceptance-intercept-high", "acceptance-max-residual"].map(id => id + "=" + v(id));
	const verdict = document.querySelector('[data-testid="verdict"]');
	const slope = document.querySelector('[data-testid="result-slope"]');
	return JSON.stringify({cells, boxes, verdict: verdict ? verdict.dataset.verdict : "<missing>", slope: slope ? slope.dataset.value : "<missing>"}, null, 1);
})()`

// unValue reads the value of an input.
func unValue(t *testing.T, b *browser, testid string) string {
	t.Helper()
	return eval[string](t, b, fmt.Sprintf(`(document.querySelector('[data-testid=%q]')||{value:"<missing>"}).value`, testid))
}

// unStep clicks undo or redo and waits until its depth has moved by one.
func unStep(t *testing.T, b *browser, testid string) string {
	t.Helper()
	before := attr(t, b, testid, "data-depth")
	click(t, b, testid)
	waitFor(t, b, testid+" to take a step", fmt.Sprintf(`document.querySelector('[data-testid=%q]').dataset.depth !== %q`, testid, before), 10*time.Second)
	msg := text(t, b, "undo-message")
	t.Logf("%s (depth %s): %s", testid, before, msg)
	return msg
}

// unReachable reports whether the undo and redo buttons lie inside the
// viewport, uncovered (the element at the centre of each is the button),
// with the page scrolled to the card of that aria-label.
func unReachable(t *testing.T, b *browser, card string) bool {
	t.Helper()
	return eval[bool](t, b, fmt.Sprintf(`(() => {
		document.querySelector('section[aria-label=%q]').scrollIntoView({block: "start"});
		return ["undo", "redo"].every(id => {
			const el = document.querySelector('[data-testid="' + id + '"]');
			const r = el.getBoundingClientRect();
			if (r.width < 40 || r.height < 40 || r.top < 0 || r.left < 0 || r.bottom > innerHeight || r.right > innerWidth) return false;
			const hit = document.elementFromPoint(r.left + r.width / 2, r.top + r.height / 2);
			return hit === el || el.contains(hit);
		});
	})()`, card))
}

// unViewShot saves what the viewport shows (not the whole page) under
// artifactDir, as screenshot does.
func unViewShot(t *testing.T, b *browser, name string) {
	t.Helper()
	dir := artifactDir(t)
	time.Sleep(200 * time.Millisecond) // the scroll and the frame after it
	buf, err := chromedp.Run(b.ctx, chromedp.CaptureScreenshot())
	if err != nil {
		t.Fatalf("screenshot: %v", err)
	}
	path := filepath.Join(dir, name+".png")
	if err := os.WriteFile(path, buf, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("screenshot: %s", path)
}

// TestUndoRedoReload: readings typed and criteria set, undo several times
// (a criterion, a reading added, a cell typed), redo once; the criteria
// boxes and the verdict follow every step, the session is saved, and a
// reload brings back exactly what was on the screen.
func TestUndoRedoReload(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)

	anSet(t, b, "acceptance-slope-high", "3", "change")
	typeSteady(t, b, 0, unPairs) // the Enter after the last y adds reading 6
	waitFor(t, b, "the line", `document.querySelector('[data-testid="result-n"]')?.dataset.value === "5"`, 10*time.Second)
	anSet(t, b, "acceptance-slope-low", "1.5", "change")
	anSet(t, b, "acceptance-min-r2", "0.999", "change")
	waitFor(t, b, "a verdict", `["pass", "fail"].includes(document.querySelector('[data-testid="verdict"]').dataset.verdict) && document.querySelectorAll('[data-testid="verdict-reason"]').length === 2`, 10*time.Second)
	// The verdict the criteria give for these readings, from fitcore.
	x, y := anParsed(t, unPairs)
	lo, hi, minR2 := 1.5, 3.0, 0.999
	rep := anAnalyze(t, x, y, fitcore.Options{Acceptance: &fitcore.Criteria{SlopeLow: &lo, SlopeHigh: &hi, MinRSquared: &minR2}})
	want := "fail"
	if rep.Acceptance.Pass {
		want = "pass"
	}
	verdict := attr(t, b, "verdict", "data-verdict")
	if verdict != want {
		t.Errorf("verdict %q with all three criteria, fitcore gives %q (R² %v, slope %v)", verdict, want, rep.RSquared, rep.Slope.Estimate)
	}
	if rep.RSquared >= minR2 || rep.Slope.Estimate < lo || rep.Slope.Estimate > hi {
		t.Fatalf("the invented readings no longer fail on R² alone (R² %v, slope %v): the undo checks below assume they do", rep.RSquared, rep.Slope.Estimate)
	}

	// A criterion undone leaves its box empty, and redone fills it again.
	if msg := unStep(t, b, "undo"); !strings.Contains(msg, "Undone: smallest R² allowed set to 0.999") {
		t.Errorf("undo message %q does not say which criterion was undone", msg)
	}
	waitFor(t, b, "the box of the undone criterion to empty", `document.querySelector('[data-testid="acceptance-min-r2"]').value === ""`, 5*time.Second)
	waitFor(t, b, "the verdict without the R² criterion", `document.querySelector('[data-testid="verdict"]').dataset.verdict === "pass" && document.querySelectorAll('[data-testid="verdict-reason"]').length === 1`, 5*time.Second)
	if msg := unStep(t, b, "redo"); !strings.Contains(msg, "Redone: smallest R² allowed set to 0.999") {
		t.Errorf("redo message %q", msg)
	}
	waitFor(t, b, "the box of the redone criterion", `document.querySelector('[data-testid="acceptance-min-r2"]').value === "0.999"`, 5*time.Second)
	if got := attr(t, b, "verdict", "data-verdict"); got != verdict {
		t.Errorf("verdict after redo %q, want %q as before the undo", got, verdict)
	}
	if !unReachable(t, b, "Acceptance") {
		t.Error("undo and redo are out of reach with the criteria card in view")
	}
	unViewShot(t, b, "undo-redo-tablet")

	// Undo four times: both criteria, the reading added, the last y typed.
	unStep(t, b, "undo")
	unStep(t, b, "undo")
	waitFor(t, b, "the criteria boxes to empty", `document.querySelector('[data-testid="acceptance-slope-low"]').value === "" && document.querySelector('[data-testid="acceptance-min-r2"]').value === ""`, 5*time.Second)
	if msg := unStep(t, b, "undo"); !strings.Contains(msg, "Undone: reading 6 added") {
		t.Errorf("undo message %q, want the reading added", msg)
	}
	waitFor(t, b, "reading 6 to go", `!document.querySelector('[data-testid="x-input-5"]')`, 5*time.Second)
	if msg := unStep(t, b, "undo"); !strings.Contains(msg, "Undone: y of reading 5 typed as 10.2") {
		t.Errorf("undo message %q, want the y typed", msg)
	}
	waitFor(t, b, "the y of reading 5 to empty", `document.querySelector('[data-testid="y-input-4"]').value === ""`, 5*time.Second)
	if msg := unStep(t, b, "redo"); !strings.Contains(msg, "Redone: y of reading 5 typed as 10.2") {
		t.Errorf("redo message %q", msg)
	}
	waitFor(t, b, "the y of reading 5 back", `document.querySelector('[data-testid="y-input-4"]').value === "10.2"`, 5*time.Second)
	waitFor(t, b, "the save", `document.querySelector('[data-testid="save-status"]').dataset.state === "saved"`, 10*time.Second)
	if got := attr(t, b, "redo", "data-depth"); got != "3" {
		t.Errorf("redo depth %s, want 3 (both criteria and the reading added)", got)
	}
	if got := unValue(t, b, "acceptance-slope-high"); got != "3" {
		t.Errorf("the criterion never undone shows %q, want 3", got)
	}
	before := eval[string](t, b, unScreen)

	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady+` && document.querySelector('[data-testid="y-input-4"]')?.value === "10.2"`, 30*time.Second)
	waitFor(t, b, "the verdict after reload", `!!document.querySelector('[data-testid="verdict"]') && !!document.querySelector('[data-testid="result-slope"]')`, 10*time.Second)
	after := eval[string](t, b, unScreen)
	if after != before {
		t.Errorf("what came back after the reload differs from what was on screen:\nbefore %s\nafter  %s", before, after)
	}
	if s := attr(t, b, "save-status", "data-state"); s == "failed" {
		t.Errorf("save status after reload: %s", text(t, b, "save-status"))
	}
}

// unRefuseStores makes IndexedDB refuse every write as a full device does
// (the DOMException Chromium raises, QuotaExceededError; see TestQuotaFull
// for why it is raised here rather than through a lowered quota), or,
// with refuse false, lets writes through again.
func unRefuseStores(t *testing.T, b *browser, refuse bool) {
	t.Helper()
	eval[bool](t, b, fmt.Sprintf(`(() => {
		if (!window.__put) window.__put = IDBObjectStore.prototype.put;
		IDBObjectStore.prototype.put = %t
			? function () { throw new DOMException("The quota has been exceeded.", "QuotaExceededError"); }
			: window.__put;
		return true;
	})()`, refuse))
}

// TestSaveFailureRecovers: a refused save is said in plain words with its
// detail and a way to try again; edits made meanwhile stay on screen and
// waiting; once the device takes writes again, "Try again" stores the
// latest state and a reload brings every edit back.
func TestSaveFailureRecovers(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, phone)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	typeSteady(t, b, 0, unPairs)
	waitFor(t, b, "the save", `document.querySelector('[data-testid="save-status"]').dataset.state === "saved"`, 10*time.Second)
	if !eval[bool](t, b, `document.querySelector('[data-testid="save-retry"]').hidden`) {
		t.Error("save-retry is shown while nothing failed")
	}

	unRefuseStores(t, b, true)
	setCell(t, b, "x-input-5", "6")
	waitFor(t, b, "the refused save", `document.querySelector('[data-testid="save-status"]').dataset.state === "failed"`, 20*time.Second)
	status := text(t, b, "save-status")
	t.Logf("save status: %s", status)
	for _, want := range []string{"Not saved: this device refused to store the session", "no room left", "Your changes are kept on screen"} {
		if !strings.Contains(status, want) {
			t.Errorf("save status %q does not say %q", status, want)
		}
	}
	if eval[bool](t, b, `document.querySelector('[data-testid="save-retry"]').hidden`) {
		t.Error("no save-retry after a refused save")
	}
	eval[bool](t, b, `(window.scrollTo(0, 0), true)`)
	unViewShot(t, b, "save-failed-phone")
	// Edits go on while the device refuses: kept on screen, still refused.
	setCell(t, b, "y-input-5", "12.1")
	waitFor(t, b, "the second refusal", `document.querySelector('[data-testid="save-status"]').dataset.state === "failed"`, 20*time.Second)
	if got := unValue(t, b, "y-input-5"); got != "12.1" {
		t.Errorf("y of reading 6 shows %q while saves are refused, want 12.1", got)
	}

	unRefuseStores(t, b, false)
	click(t, b, "save-retry")
	waitFor(t, b, "the retried save", `document.querySelector('[data-testid="save-status"]').dataset.state === "saved"`, 20*time.Second)
	if !eval[bool](t, b, `document.querySelector('[data-testid="save-retry"]').hidden`) {
		t.Error("save-retry still shown after the save succeeded")
	}
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady+` && !!document.querySelector('[data-testid="y-input-5"]')`, 30*time.Second)
	checkPairs(t, b, append(append([][2]string{}, unPairs...), [2]string{"6", "12.1"}))
}

// TestSaveFailureBelongsToSession: the failure of one session's save is
// not shown as the state of another session opened after it (a notice
// names the session not saved), and the next change tries the refused
// state again: after the device takes writes again, both sessions come
// back whole.
func TestSaveFailureBelongsToSession(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, phone)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	anSet(t, b, "session-title", "Invented first probe", "change")
	typeSteady(t, b, 0, unPairs[:3])
	waitFor(t, b, "the save", `document.querySelector('[data-testid="save-status"]').dataset.state === "saved"`, 10*time.Second)
	click(t, b, "session-new")
	waitFor(t, b, "an empty new session", `document.querySelector('[data-testid="x-input-0"]').value === ""`, 10*time.Second)
	anSet(t, b, "session-title", "Invented second probe", "change")
	setCell(t, b, "x-input-0", "10")
	waitTaken(t, b, "x-input-0", "10")

	fuOpenTitled(t, b, "Invented first probe")
	unRefuseStores(t, b, true)
	setCell(t, b, "x-input-3", "4")
	waitFor(t, b, "the refused save", `document.querySelector('[data-testid="save-status"]').dataset.state === "failed"`, 20*time.Second)

	fuOpenTitled(t, b, "Invented second probe")
	if s := attr(t, b, "save-status", "data-state"); s == "failed" {
		t.Errorf("the second session shows the first one's failure: %s", text(t, b, "save-status"))
	}
	notice := eval[string](t, b, `[...document.querySelectorAll('.pl-strip')].map(e => e.textContent).join(" / ")`)
	t.Logf("notice: %s", notice)
	if !strings.Contains(notice, "Invented first probe") || !strings.Contains(notice, "not saved") {
		t.Errorf("no notice says that the first session is not saved: %q", notice)
	}

	if eval[bool](t, b, `document.querySelector('[data-testid="save-retry"]').hidden`) {
		t.Error("no save-retry while the first session's refused state waits")
	}
	unRefuseStores(t, b, false)
	// A session opened from the device shows "saved" already: wait for the
	// edit itself (undo's depth grows) before waiting for its save.
	depth := attr(t, b, "undo", "data-depth")
	setCell(t, b, "y-input-0", "20") // the next change: both sessions are written
	waitFor(t, b, "the save", fmt.Sprintf(`document.querySelector('[data-testid="undo"]').dataset.depth !== %q && document.querySelector('[data-testid="save-status"]').dataset.state === "saved"`, depth), 20*time.Second)
	waitFor(t, b, "save-retry to go", `document.querySelector('[data-testid="save-retry"]').hidden`, 10*time.Second)
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady, 30*time.Second)
	// (Which one opens depends on whether the device took the note of the
	// last session open while it refused writes: open both.)
	fuOpenTitled(t, b, "Invented second probe")
	waitFor(t, b, "the second session's readings", `document.querySelector('[data-testid="y-input-0"]')?.value === "20"`, 10*time.Second)
	checkPairs(t, b, [][2]string{{"10", "20"}})
	fuOpenTitled(t, b, "Invented first probe")
	waitFor(t, b, "the first session's readings", `document.querySelector('[data-testid="x-input-3"]')?.value === "4"`, 10*time.Second)
	checkPairs(t, b, unPairs[:3])
}

// TestUndoRedoPhone: on a phone the undo and redo buttons stay in reach,
// uncovered, wherever the page is scrolled, and say what they undid.
func TestUndoRedoPhone(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, phone)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	typeSteady(t, b, 0, unPairs[:4])
	anSet(t, b, "acceptance-min-r2", "0.99", "change")
	waitFor(t, b, "a verdict", `document.querySelector('[data-testid="verdict"]').dataset.verdict !== "n/a"`, 10*time.Second)
	for _, card := range []string{"Readings", "Acceptance", "Fit settings", "Files"} {
		if !unReachable(t, b, card) {
			t.Errorf("undo and redo are out of reach with the %s card in view", card)
		}
	}
	unReachable(t, b, "Acceptance")
	if msg := unStep(t, b, "undo"); !strings.Contains(msg, "Undone: smallest R² allowed set to 0.99") {
		t.Errorf("undo message %q", msg)
	}
	waitFor(t, b, "the box to empty", `document.querySelector('[data-testid="acceptance-min-r2"]').value === "" && document.querySelector('[data-testid="verdict"]').dataset.verdict === "n/a"`, 5*time.Second)
	unViewShot(t, b, "undo-redo-phone")
	unStep(t, b, "redo")
	waitFor(t, b, "the box back", `document.querySelector('[data-testid="acceptance-min-r2"]').value === "0.99" && document.querySelector('[data-testid="verdict"]').dataset.verdict !== "n/a"`, 5*time.Second)
	unViewShot(t, b, "undo-redo-phone-redone")
}
