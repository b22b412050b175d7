//go:build e2e

package e2e

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/storage"
	"github.com/chromedp/chromedp"

	"pairline/app/session"
)

// frameCounter counts animation frames and the longest gap between two of
// them: while the page draws frames and the gap stays short, a technician
// can still scroll and tap.
const frameCounter = `(() => {
	window.__frames = 0; window.__maxGap = 0; window.__counting = true;
	let last = performance.now();
	const tick = (now) => {
		window.__frames++;
		window.__maxGap = Math.max(window.__maxGap, now - last);
		last = now;
		if (window.__counting) requestAnimationFrame(tick);
	};
	requestAnimationFrame(tick);
	return true;
})()`

// bigCSV writes n invented readings (a gauge-height/flow style pair with a
// fixed pattern of scatter), a header, two blank lines and one incomplete
// row, and returns its path.
func bigCSV(t *testing.T, dir string, n int) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("stage_m;flow_m3s;remark\n")
	for i := 0; i < n; i++ {
		x := 0.2 + float64(i)*0.00005
		y := 3.1*x - 0.4 + float64(i%7-3)*0.001
		fmt.Fprintf(&b, "%s;%s;invented\n", strings.Replace(strconv.FormatFloat(x, 'f', 5, 64), ".", ",", 1),
			strings.Replace(strconv.FormatFloat(y, 'f', 4, 64), ".", ",", 1))
		if i == n/2 {
			b.WriteString("\n\n0,9;;no flow reading\n")
		}
	}
	p := filepath.Join(dir, "invented-stage-flow.csv")
	if err := os.WriteFile(p, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// overrideQuota sets (nil: resets) the quota of origin, through the
// browser's own DevTools session (Storage.overrideQuotaForOrigin).
func overrideQuota(b *browser, origin string, quota *float64) error {
	return chromedp.Do(b.ctx, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		_, err := cdp.Call(ctx, tg, storage.OverrideQuotaForOrigin, storage.OverrideQuotaForOriginParams{Origin: origin, QuotaSize: quota})
		return err
	}))
}

// pasteInto sends a paste event with text to the cell with that data-testid,
// as a spreadsheet's copy and the device's paste would.
func pasteInto(t *testing.T, b *browser, testid, text string) {
	t.Helper()
	eval[bool](t, b, fmt.Sprintf(`(() => {
		const dt = new DataTransfer();
		dt.setData("text/plain", %q);
		const el = tid(%q);
		el.focus();
		el.dispatchEvent(new ClipboardEvent("paste", {clipboardData: dt, bubbles: true, cancelable: true}));
		return true;
	})()`, text, testid))
}

// TestCapacity fills the device as the issue asks: 500 sessions of 200
// readings (one bundle file) and one of 100,000 readings (a CSV). It reports
// the import times, the frames drawn during the CSV import and how long the
// session list takes to open.
func TestCapacity(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	dir := t.TempDir()
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)

	// 100,000 readings from CSV.
	const n = 100000
	p := bigCSV(t, dir, n)
	eval[bool](t, b, frameCounter)
	start := time.Now()
	b.do(t, chromedp.SetUploadFiles(sel("import-file"), []string{p}))
	waitFor(t, b, "the progress bar", `!!tid("import-progress") || !!tid("import-report")`, 30*time.Second)
	sawProgress := eval[bool](t, b, `!!tid("import-progress")`)
	if sawProgress {
		screenshot(t, b, "capacity-import-progress-tablet")
	}
	waitFor(t, b, "the 100,000-row import", `!!tid("import-report") || !!tid("import-error")`, 180*time.Second)
	took := time.Since(start)
	eval[bool](t, b, `(window.__counting = false, true)`)
	frames, gap := eval[int](t, b, `window.__frames`), eval[float64](t, b, `window.__maxGap`)
	t.Logf("100,000-row CSV import: %v to the report; %d frames drawn meanwhile (%.0f per second), longest gap between frames %.0f ms; progress bar seen: %v",
		took.Round(time.Millisecond), frames, float64(frames)/took.Seconds(), gap, sawProgress)
	if e := textOf(t, b, "import-error"); e != "<missing>" {
		t.Fatalf("the import was refused: %s", e)
	}
	report := textOf(t, b, "import-report")
	t.Logf("report: %s", report)
	t.Logf("steps: %s", attr(t, b, "import-report", "data-timing"))
	for _, w := range []string{"Imported 100000 readings", "2 blank rows", "1 incomplete row", "line 50005"} {
		if !strings.Contains(report, w) {
			t.Errorf("the report does not say %q: %s", w, report)
		}
	}
	if frames < 10 {
		t.Errorf("only %d frames were drawn during the import: the page was frozen", frames)
	}
	// Every reading is in the session: the file is the reference.
	waitFor(t, b, "the line from every pair", `tid("result-n")?.dataset.value === "100000"`, 60*time.Second)
	// (Counts from 10,000 up are grouped by threes with a narrow space,
	// ISO 80000-1 §7.3.1: numfmt.Count.)
	if got := textOf(t, b, "page-info"); !strings.Contains(got, "of 100\u202f000") {
		t.Errorf("page-info %q, want … of 100 000 (a narrow no-break space between the groups)", got)
	}
	if got := valueOf(t, b, "x-input-0"); got != "0,20000" {
		t.Errorf("first x = %q, want 0,20000 as written in the file", got)
	}
	waitFor(t, b, "the save", `tid("save-status").dataset.state === "saved"`, 60*time.Second)

	// 500 sessions of 200 readings, one bundle file.
	t0 := time.Date(2026, 5, 4, 7, 0, 0, 0, time.UTC)
	var bundle []*session.Session
	for k := 0; k < 500; k++ {
		s, err := session.New(fmt.Sprintf("Invented bench run %03d", k), t0, nil)
		if err != nil {
			t.Fatal(err)
		}
		s.Site = "Larkwater Valley lab (invented)"
		for i := 0; i < 200; i++ {
			s.AddRow(strconv.Itoa(i), strconv.FormatFloat(2*float64(i)+float64((i*k)%5)/10, 'f', 1, 64), t0.Add(time.Duration(i)*time.Second))
		}
		bundle = append(bundle, s)
	}
	bp := writeSessions(t, dir, "invented-500.pairline", bundle...)
	start = time.Now()
	importPath(t, b, bp)
	t.Logf("500-session bundle import: %v", time.Since(start).Round(time.Millisecond))
	if r := textOf(t, b, "import-report"); !strings.Contains(r, "Imported 500 sessions") {
		t.Fatalf("bundle import: %s / %s", r, textOf(t, b, "import-error"))
	}

	// Reload: the app opens the last session (200 readings) and the list.
	start = time.Now()
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady, 60*time.Second)
	t.Logf("start with 501 sessions stored: %v", time.Since(start).Round(time.Millisecond))
	waitFor(t, b, "the list count", `/\(50[12]\)/.test(tid("sessions-open").textContent)`, 30*time.Second)
	var opens, closes []float64
	for i := 0; i < 3; i++ {
		ms := eval[float64](t, b, `(async () => {
			const t0 = performance.now();
			tid("sessions-open").click();
			while (tids("session-item").length < 30)
				await new Promise(r => setTimeout(r, 0));
			await new Promise(r => requestAnimationFrame(() => r()));
			return performance.now() - t0;
		})()`)
		opens = append(opens, ms)
		if i == 0 {
			screenshot(t, b, "capacity-session-list-tablet")
		}
		// Closing redraws the page without the list: the part of the time
		// that is the page itself, not the list.
		closes = append(closes, eval[float64](t, b, `(async () => {
			const t0 = performance.now();
			tid("sessions-open").click();
			while (tid("session-list"))
				await new Promise(r => setTimeout(r, 0));
			await new Promise(r => requestAnimationFrame(() => r()));
			return performance.now() - t0;
		})()`))
	}
	t.Logf("closing it again (the page without the list): %.0f ms, %.0f ms, %.0f ms", closes[0], closes[1], closes[2])
	t.Logf("opening the session list with %d sessions (the newest 30 drawn, more on request): %.0f ms, %.0f ms, %.0f ms (click to drawn)",
		eval[int](t, b, `+tid("sessions-open").textContent.match(/\d+/)[0]`), opens[0], opens[1], opens[2])
	// "Show more" draws the next listPage (30) each time it is pressed: the
	// count is read when it is pressed, not when the button was first drawn.
	total := eval[int](t, b, `+tid("sessions-open").textContent.match(/\d+/)[0]`)
	b.do(t, chromedp.Click(sel("sessions-open")))
	waitFor(t, b, "the list", `tids("session-item").length === 30`, 10*time.Second)
	for _, n := range []int{60, 90} {
		b.do(t, chromedp.Click(sel("sessions-more")))
		waitFor(t, b, fmt.Sprintf("%d sessions drawn", n), fmt.Sprintf(`tids("session-item").length === %d`, n), 10*time.Second)
	}
	if got, want := textOf(t, b, "sessions-more"), fmt.Sprintf("Show 30 more of %d older sessions", total-90); got != want {
		t.Errorf("after two presses the button says %q, want %q", got, want)
	}
	screenshot(t, b, "capacity-session-list-more-tablet")
	b.do(t, chromedp.Click(sel("sessions-open")))
	u := attr(t, b, "storage-usage", "data-used")
	t.Logf("storage used: %s bytes (%s)", u, textOf(t, b, "storage-usage"))
}

// TestQuotaFull: a full device refuses a save with a clear message and
// keeps the record as it was before. The quota is lowered with the DevTools
// protocol's Storage.overrideQuotaForOrigin; where the browser does not
// apply it, the test says so and skips (store.TestErrorForName covers the
// mapping of the browser's error).
func TestQuotaFull(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, phone)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	typeSteady(t, b, 0, fivePairs)
	waitFor(t, b, "the save", `tid("save-status").dataset.state === "saved"`, 10*time.Second)

	used := eval[float64](t, b, `navigator.storage.estimate().then(e => e.usage)`)
	quota := used + 4096
	if err := overrideQuota(b, srv.URL, &quota); err != nil {
		t.Skipf("SKIPPED quota check: the browser cannot lower the quota: %v", err)
	}
	defer overrideQuota(b, srv.URL, nil)
	if q := eval[float64](t, b, `navigator.storage.estimate().then(e => e.quota)`); q > quota*1.01 {
		// This Chromium accepts the override but does not apply it, and the
		// real quota (gigabytes) cannot be filled in a test. Then the
		// browser's refusal is reproduced where IndexedDB reports it: every
		// put throws the DOMException a full quota raises
		// (QuotaExceededError); the store's transaction, its abort and the
		// whole UI path are the real ones.
		t.Logf("NOTE: Storage.overrideQuotaForOrigin(%.0f) is not applied here (quota still %.0f bytes); IndexedDB's QuotaExceededError is raised instead", quota, q)
		eval[bool](t, b, `(() => {
			IDBObjectStore.prototype.put = function () { throw new DOMException("The quota has been exceeded.", "QuotaExceededError"); };
			return true;
		})()`)
	}
	// Paste 20,000 readings into the grid: far more than 4 kB.
	var block strings.Builder
	for i := 0; i < 20000; i++ {
		fmt.Fprintf(&block, "%d\t%d.5\n", i+10, 2*i+20)
	}
	pasteInto(t, b, "x-input-5", block.String())
	waitFor(t, b, "the refused save", `tid("save-status").dataset.state === "failed"`, 60*time.Second)
	status := textOf(t, b, "save-status")
	t.Logf("save status: %s", status)
	if !strings.Contains(status, "no room left") {
		t.Errorf("save-status %q does not say the device is full", status)
	}
	waitFor(t, b, "the storage-full message", `!!tid("storage-full")`, 10*time.Second)
	screenshot(t, b, "storage-full-phone")
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady+` && !!tid("y-input-4")`, 30*time.Second)
	checkPairs(t, b, fivePairs)
	if eval[bool](t, b, `!!tid("x-input-6")`) {
		t.Errorf("a reading of the refused save was stored")
	}
}

// TestTrash: a deleted session is listed in the trash with its restore
// date and comes back whole. Pasting a block into the grid is checked on the
// way: the rows are those of the block.
func TestTrash(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, phone)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	var block strings.Builder
	for _, p := range fivePairs {
		block.WriteString(p[0] + "\t" + p[1] + "\r\n")
	}
	pasteInto(t, b, "x-input-0", block.String())
	waitFor(t, b, "the pasted rows", `tid("y-input-4")?.value === "11.0"`, 10*time.Second)
	checkPairs(t, b, fivePairs)
	waitFor(t, b, "the save", `tid("save-status").dataset.state === "saved"`, 10*time.Second)
	id := eval[string](t, b, `(async () => {
		const db = await new Promise((ok, bad) => { const r = indexedDB.open("pairline"); r.onsuccess = () => ok(r.result); r.onerror = bad; });
		const last = await new Promise(ok => { const r = db.transaction("meta").objectStore("meta").get("last"); r.onsuccess = () => ok(r.result); });
		db.close();
		return last;
	})()`)
	click(t, b, "sessions-open")
	waitFor(t, b, "the list", fmt.Sprintf(`!!tid("session-item", '[data-id=%q] @session-delete')`, id), 10*time.Second)
	eval[bool](t, b, fmt.Sprintf(`(tid("session-item", '[data-id=%q] @session-delete').click(), true)`, id))
	click(t, b, "session-delete-confirm")
	waitFor(t, b, "the session to leave the list", fmt.Sprintf(`!tid("session-item", '[data-id=%q]')`, id), 10*time.Second)
	if attr(t, b, "sessions-open", "aria-expanded") != "true" {
		click(t, b, "sessions-open")
	}
	click(t, b, "trash-open")
	waitFor(t, b, "the deleted session in the trash", fmt.Sprintf(`!!tid("trash", ' [data-id=%q]')`, id), 10*time.Second)
	if m := eval[string](t, b, fmt.Sprintf(`tid("trash", ' [data-id=%q]').textContent`, id)); !strings.Contains(m, "can be restored until") {
		t.Errorf("the trash entry does not say until when it can be restored: %q", m)
	}
	screenshot(t, b, "trash-phone")
	eval[bool](t, b, fmt.Sprintf(`(tid("trash", ' [data-id=%q] @trash-restore').click(), true)`, id))
	waitFor(t, b, "the restored session in the list", fmt.Sprintf(`!!tid("session-item", '[data-id=%q]') && !tid("trash", ' [data-id=%q]')`, id, id), 10*time.Second)
	eval[bool](t, b, fmt.Sprintf(`(tid("session-item", '[data-id=%q] @session-open').click(), true)`, id))
	waitFor(t, b, "the restored readings", `tid("y-input-4")?.value === "11.0"`, 10*time.Second)
	checkPairs(t, b, fivePairs)
}

// TestTwoTabs: a save in one tab reaches the other tab with the same
// session open. When both tabs change it at nearly the same moment, the app
// never merges and never drops a change (app/ui/tabs.go): a tab that hears
// of the other's save while it has a change of its own, or after storing
// one, asks (changed-elsewhere). A, whose last save is long past, stores
// its edit in the edit's first turn; B's edit is already made by the time
// A's save reaches it, so B asks. (A asks too when B's own save went out
// before A's reached it.) Each tab still shows its own change and not the
// other's; keeping a copy opens the asking tab's version as a new session
// with its change in it.
func TestTwoTabs(t *testing.T) {
	srv := startServer(t)
	a := newBrowser(t, tablet)
	a.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, a, "tab A", appReady, 60*time.Second)
	typeSteady(t, a, 0, fivePairs[:3])
	waitFor(t, a, "the save in A", `tid("save-status").dataset.state === "saved"`, 10*time.Second)

	b := a.newTab(t)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "tab B", appReady+` && tid("y-input-2")?.value === "7,2"`, 60*time.Second)

	// A adds a reading: B shows it without a reload.
	typeSteady(t, a, 3, fivePairs[3:4])
	waitFor(t, a, "the save in A", `tid("save-status").dataset.state === "saved"`, 10*time.Second)
	waitFor(t, b, "A's reading in B", `tid("y-input-3")?.value === "8.8"`, 10*time.Second)

	// A big session (saved once typing pauses) makes both tabs hold an
	// unsaved change at the same time.
	var block strings.Builder
	for i := 0; i < 2500; i++ {
		fmt.Fprintf(&block, "%d\t%d.5\n", i+10, 2*i+20)
	}
	pasteInto(t, a, "x-input-4", block.String())
	waitFor(t, a, "the save in A", `tid("save-status").dataset.state === "saved"`, 30*time.Second)
	waitFor(t, b, "the pasted rows in B", `/of 2504/.test(tid("page-info")?.textContent || "")`, 30*time.Second)
	set := func(tab *browser, testid, v string) {
		eval[bool](t, tab, fmt.Sprintf(`(() => { const el = tid(%q); el.focus(); el.value = %q; el.dispatchEvent(new Event("input", {bubbles: true})); return true })()`, testid, v))
	}
	set(a, "x-input-0", "1.5")
	set(b, "x-input-1", "2.5")
	time.Sleep(3 * time.Second)
	askA := exists(t, a, "changed-elsewhere")
	askB := exists(t, b, "changed-elsewhere")
	t.Logf("near-simultaneous changes: A asks %v, B asks %v", askA, askB)
	if !askB {
		t.Error("B holds a change of its own when A's save reaches it, and does not ask: one change was overwritten without a word")
	}
	// Each tab shows its own change and not the other's (x0 and x1 as
	// typed into the grid earlier: fivePairs).
	for _, c := range []struct {
		name   string
		tab    *browser
		x0, x1 string
	}{{"A", a, "1.5", fivePairs[1][0]}, {"B", b, fivePairs[0][0], "2.5"}} {
		if x0, x1 := valueOf(t, c.tab, "x-input-0"), valueOf(t, c.tab, "x-input-1"); x0 != c.x0 || x1 != c.x1 {
			t.Errorf("tab %s shows x0 = %q, x1 = %q; want its own change only: %q, %q", c.name, x0, x1, c.x0, c.x1)
		}
	}
	for _, c := range []struct {
		name string
		tab  *browser
		ask  bool
		id   string
		want string
	}{{"A", a, askA, "x-input-0", "1.5"}, {"B", b, askB, "x-input-1", "2.5"}} {
		if !c.ask {
			continue
		}
		screenshot(t, c.tab, "changed-elsewhere-tablet-"+c.name)
		click(t, c.tab, "changed-elsewhere-copy")
		waitFor(t, c.tab, "the copy in "+c.name, `!tid("changed-elsewhere") && tid("save-status").dataset.state === "saved"`, 30*time.Second)
		if title := valueOf(t, c.tab, "session-title"); !strings.Contains(title, "(copy from this tab)") {
			t.Errorf("tab %s: keeping a copy did not open the copy (title %q)", c.name, title)
		}
		if got := valueOf(t, c.tab, c.id); got != c.want {
			t.Errorf("tab %s: the copy shows %s = %q, want its own change %q", c.name, c.id, got, c.want)
		}
	}
}
