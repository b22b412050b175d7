//go:build e2e

package e2e

import (
	"bytes"
	"encoding/base64"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"

	"pairline/app/session"
)

// captureDownloads makes the page keep every Blob it hands out as a download
// (and the file name), instead of saving it, so that the test can read the
// exact bytes a technician would get.
const captureDownloads = `(() => {
	window.__blobs = []; window.__names = [];
	const create = URL.createObjectURL.bind(URL);
	URL.createObjectURL = (b) => { window.__blobs.push(b); return create(b); };
	HTMLAnchorElement.prototype.click = function () { window.__names.push(this.download); };
	return true;
})()`

// lastDownload waits for the n-th download (from 1) and returns its name and bytes.
func lastDownload(t *testing.T, b *browser, n int) (string, []byte) {
	t.Helper()
	waitFor(t, b, fmt.Sprintf("download %d", n), fmt.Sprintf(`window.__names.length >= %d`, n), 20*time.Second)
	s := eval[string](t, b, fmt.Sprintf(`(async () => {
		const u = new Uint8Array(await window.__blobs[%d].arrayBuffer());
		let s = "";
		for (let i = 0; i < u.length; i += 0x8000) s += String.fromCharCode.apply(null, u.subarray(i, i + 0x8000));
		return btoa(s);
	})()`, n-1))
	raw, err := base64.StdEncoding.DecodeString(s)
	if err != nil {
		t.Fatal(err)
	}
	return eval[string](t, b, fmt.Sprintf(`window.__names[%d]`, n-1)), raw
}

// typeSteady types pairs as typePairs does, but waits for the focus to
// arrive in each cell first, so that a busy machine cannot send keys to the
// wrong cell.
func typeSteady(t *testing.T, b *browser, from int, pairs [][2]string) {
	t.Helper()
	eval[bool](t, b, fmt.Sprintf(`(tid("x-input-%d").focus(), true)`, from))
	for i, p := range pairs {
		for j, col := range []string{"x", "y"} {
			id := fmt.Sprintf("%s-input-%d", col, from+i)
			waitFor(t, b, "the focus in "+id, fmt.Sprintf(`document.activeElement && document.activeElement.dataset.testid === %q`, id), 10*time.Second)
			b.do(t, chromedp.KeyEvent(p[j]))
			waitForExplained(t, b, "the text in "+id, fmt.Sprintf(`document.activeElement.value === %q && document.activeElement.dataset.value === %q`, p[j], p[j]),
				fmt.Sprintf(`(() => { const a = document.activeElement, c = tid(%q); return "focus on " + (a && (a.dataset.testid || a.tagName)) + "; the cell holds " + JSON.stringify(c && c.value) + ", data-value " + JSON.stringify(c && c.dataset.value) })()`, id), 10*time.Second)
			b.do(t, chromedp.KeyEvent(kb.Enter))
		}
	}
}

func decodeFile(t *testing.T, raw []byte) *session.File {
	t.Helper()
	f, err := session.Decode(bytes.NewReader(raw))
	if err != nil {
		t.Fatalf("the exported file does not decode: %v", err)
	}
	return f
}

// importPath puts a file into the import input and waits until the import
// has ended (a report, an error or a question is shown).
func importPath(t *testing.T, b *browser, path string) {
	t.Helper()
	seq := eval[int](t, b, `(() => { let n = 0; for (const id of ["import-report", "import-error", "import-conflict", "import-columns"]) { const e = tid(id); if (e) n = Math.max(n, +e.dataset.seq || 0); } return n })()`)
	b.do(t, chromedp.SetUploadFiles(sel("import-file"), []string{path}))
	waitFor(t, b, "the import of "+filepath.Base(path), fmt.Sprintf(`(() => {
		for (const id of ["import-report", "import-error", "import-conflict", "import-columns"]) {
			const e = tid(id);
			if (e && +e.dataset.seq > %d) return true;
		}
		return false;
	})()`, seq), 120*time.Second)
}

// listedIDs opens the session list and returns the listed IDs in order.
func listedIDs(t *testing.T, b *browser) []string {
	t.Helper()
	if attr(t, b, "sessions-open", "aria-expanded") != "true" {
		click(t, b, "sessions-open")
	}
	waitFor(t, b, "the session list", `!!tid("session-list")`, 10*time.Second)
	ids := eval[[]string](t, b, `tids("session-item").map(e => e.dataset.id)`)
	click(t, b, "sessions-open")
	// Wait for the page to be drawn again before anything else touches it.
	waitFor(t, b, "the session list to close", `!tid("session-list")`, 10*time.Second)
	return ids
}

// annotatedSession is an invented calibration record (a conductivity probe
// of the invented Larkwater Valley Water Board) with notes, an exclusion and
// edits, so that the history has every kind of entry a round trip must keep.
func annotatedSession(t *testing.T) *session.Session {
	t.Helper()
	t0 := time.Date(2026, 4, 14, 8, 30, 0, 0, time.UTC)
	s, err := session.New("Probe C-12 against standards (invented data)", t0, nil)
	if err != nil {
		t.Fatal(err)
	}
	must := func(err error) {
		if err != nil {
			t.Fatal(err)
		}
	}
	must(s.SetField(session.FieldSite, "Larkwater Valley intake (invented)", t0))
	must(s.SetField(session.FieldXName, "Standard", t0))
	must(s.SetField(session.FieldXUnit, "µS/cm", t0))
	must(s.SetField(session.FieldYName, "Probe", t0))
	must(s.SetField(session.FieldYUnit, "µS/cm", t0))
	for i, p := range [][2]string{{"84", "85.1"}, {"447", "449.0"}, {"1413", "1409.5"}, {"2764", "2771"}, {"12880", "12 805"}} {
		s.AddRow(p[0], p[1], t0.Add(time.Duration(i)*time.Minute))
	}
	must(s.SetCell(1, session.ColumnNote, "=bubble on the cell, shaken off", t0.Add(10*time.Minute)))
	must(s.Exclude(3, "standard bottle left open overnight", t0.Add(11*time.Minute)))
	must(s.SetCell(4, session.ColumnY, "12 810", t0.Add(40*time.Minute)))
	must(s.SetField(session.FieldNotes, "Second pass after cleaning.\nAll invented.", t0.Add(41*time.Minute)))
	return s
}

func writeSessions(t *testing.T, dir, name string, ss ...*session.Session) string {
	t.Helper()
	var buf bytes.Buffer
	if err := session.Encode(&buf, ss); err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// TestTransferRoundTrip: readings typed on the tablet and a session with
// notes, an exclusion and history go out as files and come back identical.
// The reference is the file itself: session.Decode of what was put in.
func TestTransferRoundTrip(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	dir := t.TempDir()
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	eval[bool](t, b, captureDownloads)

	// 1. Typed readings → session file.
	typeSteady(t, b, 0, fivePairs)
	waitFor(t, b, "the save", `tid("save-status").dataset.state === "saved"`, 10*time.Second)
	click(t, b, "export-session")
	name, rawA := lastDownload(t, b, 1)
	if !strings.HasSuffix(name, ".pairline") {
		t.Errorf("the session file is named %q, want …pairline", name)
	}
	fa := decodeFile(t, rawA)
	if len(fa.Sessions) != 1 {
		t.Fatalf("the file holds %d sessions", len(fa.Sessions))
	}
	a := fa.Sessions[0]
	for i, p := range fivePairs {
		if r := a.Readings[i]; r.X != p[0] || r.Y != p[1] {
			t.Errorf("exported reading %d = %q, %q; typed %q, %q", i, r.X, r.Y, p[0], p[1])
		}
	}
	if len(a.History) < 10 {
		t.Errorf("the exported history has %d entries; typing 5 pairs makes at least 10", len(a.History))
	}
	pathA := filepath.Join(dir, "typed.pairline")
	os.WriteFile(pathA, rawA, 0o644)

	// 2. A session with notes, an exclusion and history: import → export.
	orig := annotatedSession(t)
	pathB := writeSessions(t, dir, "annotated.pairline", orig)
	rawB, _ := os.ReadFile(pathB)
	want := decodeFile(t, rawB).Sessions[0]
	importPath(t, b, pathB)
	if r := textOf(t, b, "import-report"); !strings.Contains(r, "Imported 1 session") {
		t.Fatalf("import report %q", r)
	}
	waitFor(t, b, "the imported session to open", `tid("x-input-4")?.value === "12880"`, 10*time.Second)
	click(t, b, "export-session")
	_, rawB2 := lastDownload(t, b, 2)
	got := decodeFile(t, rawB2).Sessions[0]
	if !reflect.DeepEqual(got, want) {
		t.Errorf("import → export changed the session:\n got %+v\nwant %+v", got, want)
	}
	// Readings CSV: exactly what session.WriteReadingsCSV writes for it.
	click(t, b, "export-csv")
	csvName, csvGot := lastDownload(t, b, 3)
	var csvWant bytes.Buffer
	session.WriteReadingsCSV(&csvWant, want)
	if !bytes.Equal(csvGot, csvWant.Bytes()) {
		t.Errorf("%s:\n%s\nwant\n%s", csvName, csvGot, csvWant.Bytes())
	}
	if !strings.Contains(string(csvGot), "'=bubble") || !strings.Contains(string(csvGot), ",yes,standard bottle left open overnight,") {
		t.Errorf("the CSV lost the note or the exclusion:\n%s", csvGot)
	}

	// 3. The typed session again: its ID is stored, so Pairline asks.
	before := listedIDs(t, b)
	importPath(t, b, pathA)
	waitFor(t, b, "the question about the existing session", `!!tid("import-conflict")`, 10*time.Second)
	screenshot(t, b, "transfer-conflict-tablet")
	click(t, b, "import-keep-both")
	waitFor(t, b, "the kept copy", `(!!tid("import-report") || !!tid("import-error")) && !tid("import-conflict")`, 10*time.Second)
	if e := textOf(t, b, "import-error"); e != "<missing>" {
		t.Fatalf("keep both: %s", e)
	}
	after := listedIDs(t, b)
	if len(after) != len(before)+1 {
		t.Fatalf("keep both: %d sessions listed, want %d", len(after), len(before)+1)
	}
	click(t, b, "export-session")
	_, rawC := lastDownload(t, b, 4)
	c := decodeFile(t, rawC).Sessions[0]
	if c.ID == a.ID {
		t.Error("the kept copy has the ID of the stored session")
	}
	c.ID = a.ID
	if !reflect.DeepEqual(c, a) {
		t.Errorf("keep both changed the session beyond its ID:\n got %+v\nwant %+v", c, a)
	}
	// Replace: the count stays.
	importPath(t, b, pathB)
	click(t, b, "import-replace")
	waitFor(t, b, "the replacement", `!!tid("import-report") && !tid("import-conflict")`, 10*time.Second)
	if n := len(listedIDs(t, b)); n != len(after) {
		t.Errorf("replace: %d sessions listed, want %d", n, len(after))
	}
	// All sessions in one file.
	click(t, b, "export-all")
	_, rawAll := lastDownload(t, b, 5)
	if n := len(decodeFile(t, rawAll).Sessions); n != len(after) {
		t.Errorf("the bundle holds %d sessions, want %d", n, len(after))
	}
	// A table dropped onto the page, with three columns of numbers: Pairline
	// asks which two to use (invented readings).
	seq := eval[int](t, b, `+(tid("import-report")?.dataset.seq || 0)`)
	eval[bool](t, b, `(() => {
		const dt = new DataTransfer();
		dt.items.add(new File(["site;reference;reading;water temp\n" +
			"north;1;1,1;20,5\nnorth;2;2,1;20,7\n\nsouth;3;2,9;21,0\nsouth;4;;21,2\nsouth;5;5,2;21,4\n"], "three-columns.csv", {type: "text/csv"}));
		document.querySelector(".pl-main").dispatchEvent(new DragEvent("drop", {dataTransfer: dt, bubbles: true, cancelable: true}));
		return true;
	})()`)
	waitFor(t, b, "the column question", `!!tid("import-columns")`, 20*time.Second)
	screenshot(t, b, "transfer-columns-tablet")
	eval[bool](t, b, `(() => { const s = tid("import-y-col"); s.value = "3"; s.dispatchEvent(new Event("change", {bubbles: true})); return true })()`)
	click(t, b, "import-columns-ok")
	waitFor(t, b, "the table import", fmt.Sprintf(`+(tid("import-report")?.dataset.seq || 0) > %d`, seq), 20*time.Second)
	report := textOf(t, b, "import-report")
	for _, w := range []string{"Imported 5 readings", "x from column 2 “reference”", "y from column 4 “water temp”", "1 blank row"} {
		if !strings.Contains(report, w) {
			t.Errorf("the report does not say %q: %s", w, report)
		}
	}
	checkPairs(t, b, [][2]string{{"1", "20,5"}, {"2", "20,7"}, {"3", "21,0"}, {"4", "21,2"}, {"5", "21,4"}})
	screenshot(t, b, "transfer-tablet")

	// The installed app opens session files: the manifest the page links
	// declares them (W3C Web Application Manifest, WICG File Handling).
	if ext := eval[[]string](t, b, `fetch(document.querySelector('link[rel="manifest"]').href).then(r => r.json()).then(m => m.file_handlers[0].accept["application/vnd.pairline.session"])`); len(ext) != 1 || ext[0] != ".pairline" {
		t.Errorf("the manifest's file_handlers accept %v for session files, want [.pairline]", ext)
	}
	if bad := b.foreign(srv.URL); len(bad) > 0 {
		t.Errorf("requests left the app's origin: %v", bad)
	}
}

// TestImportBroken: damaged, cut and foreign files are refused with a
// sentence saying what is wrong and where, and the stored sessions stay as
// they were. The kinds of damage are those app/session/FORMAT.md names.
func TestImportBroken(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, phone)
	dir := t.TempDir()
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	good := writeSessions(t, dir, "good.pairline", annotatedSession(t))
	importPath(t, b, good)
	before := listedIDs(t, b)
	raw, _ := os.ReadFile(good)

	flipped := append([]byte(nil), raw...)
	flipped[len(flipped)/2] ^= 0x10
	cut := raw[:len(raw)-40]
	newer := append([]byte(nil), raw...)
	newer[9] = 2 // major version 2 (bytes 8–9, big-endian)
	cases := []struct {
		name string
		data []byte
		want []string
	}{
		{"damaged.pairline", flipped, []string{"damaged", "checksum", "at byte"}},
		{"cut.pairline", cut, []string{"incomplete", "at byte"}},
		{"newer.pairline", newer, []string{"newer version", "format 2."}}, // the minor version stays the file's (1.1 since the calibration record)
		{"readings.pairline", []byte("x,y\n1,2\n"), []string{"not a Pairline session file", "CSV"}},
		{"quotes.csv", []byte("x,y\n1,2\n3,\"4\n5,6\n"), []string{"line 3", "quote"}},
		{"words.csv", []byte("name,place\nalder,north\nbirch,south\n"), []string{"no two columns of numbers"}},
	}
	for _, tc := range cases {
		p := filepath.Join(dir, tc.name)
		os.WriteFile(p, tc.data, 0o644)
		importPath(t, b, p)
		msg := textOf(t, b, "import-error")
		for _, w := range tc.want {
			if !strings.Contains(msg, w) {
				t.Errorf("%s: import-error %q does not say %q", tc.name, msg, w)
			}
		}
		if tc.name == "damaged.pairline" {
			screenshot(t, b, "transfer-import-error-phone")
		}
		if got := listedIDs(t, b); !reflect.DeepEqual(got, before) {
			t.Errorf("%s: the stored sessions changed: %v, before %v", tc.name, got, before)
		}
	}
}

// TestReloadWhileTyping: a reload right after the last key keeps every
// reading. It also measures how soon after the last key a reload keeps it.
func TestReloadWhileTyping(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	typeSteady(t, b, 0, fivePairs)
	waitFor(t, b, "the focus in x-input-5", `document.activeElement.dataset.testid === "x-input-5"`, 10*time.Second)
	b.do(t, chromedp.KeyEvent("6"), chromedp.KeyEvent(kb.Enter))
	waitFor(t, b, "the focus in y-input-5", `document.activeElement.dataset.testid === "y-input-5"`, 10*time.Second)
	b.do(t, chromedp.KeyEvent("13.1"))
	waitTaken(t, b, "y-input-5", "13.1")
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady+` && !!tid("y-input-5")`, 30*time.Second)
	checkPairs(t, b, append(fivePairs, [2]string{"6", "13.1"}))

	// How soon may the tab die? Type one more digit into y of row 6, wait d,
	// reload, and see whether the digit survived.
	for _, d := range []time.Duration{0, 10 * time.Millisecond, 25 * time.Millisecond, 50 * time.Millisecond, 100 * time.Millisecond, 250 * time.Millisecond} {
		eval[bool](t, b, `(tid("y-input-5").focus(), tid("y-input-5").setSelectionRange(99, 99), true)`)
		before := valueOf(t, b, "y-input-5")
		b.do(t, chromedp.KeyEvent("7"))
		time.Sleep(d)
		b.do(t, chromedp.Reload())
		waitFor(t, b, "the app after reload", appReady+` && !!tid("y-input-5")`, 30*time.Second)
		after := valueOf(t, b, "y-input-5")
		t.Logf("reload %v after the last key: y6 %q → %q (kept: %v)", d, before, after, after == before+"7")
	}
}

// TestBigSessionSaveTiming: a session of 5,000 invented readings is saved
// once typing pauses (300 ms). It logs how long after a key the save is
// done when the technician stays, and when the app is left at once
// (visibilitychange to hidden, as when another app comes to the front:
// the waiting edit is written then), and whether the key survives a reload
// in the pause (the browser tears the page down before a save can finish).
// Figures are logged; what is asserted is that the typed keys end up
// stored.
func TestBigSessionSaveTiming(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	now := time.Date(2026, 6, 1, 9, 0, 0, 0, time.UTC)
	s, err := session.New("Invented big session, 5000 readings", now, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i := range 5000 {
		s.Readings = append(s.Readings, session.Reading{X: fmt.Sprint(i), Y: fmt.Sprintf("%.2f", 2*float64(i)+1)})
	}
	var buf bytes.Buffer
	if err := session.Encode(&buf, []*session.Session{s}); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "big.pairline")
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	b.do(t, chromedp.SetUploadFiles(sel("import-file"), []string{path}))
	waitFor(t, b, "the imported session", `tid("result-n")?.dataset.value === "5000"`, 60*time.Second)
	waitFor(t, b, "saved", `tid("save-status").dataset.state === "saved"`, 20*time.Second)
	caret := `(tid("y-input-0").focus(), tid("y-input-0").setSelectionRange(99, 99), true)`
	timeToSaved := func(leave bool) float64 {
		eval[bool](t, b, caret)
		b.do(t, chromedp.KeyEvent("7"))
		return eval[float64](t, b, fmt.Sprintf(`new Promise((resolve, reject) => {
			const st = tid("save-status");
			const t0 = performance.now();
			if (%v) {
				Object.defineProperty(document, 'visibilityState', {value: 'hidden', configurable: true});
				document.dispatchEvent(new Event('visibilitychange'));
				delete document.visibilityState;
			}
			const tick = () => { if (st.dataset.state === 'saved') resolve(performance.now() - t0); else if (performance.now() - t0 > 5000) reject(new Error('not saved')); else setTimeout(tick, 2); };
			setTimeout(tick, 2);
		})`, leave))
	}
	stay, leave := timeToSaved(false), timeToSaved(true)
	t.Logf("5,000 readings: a key → saved in %.0f ms when typing pauses; %.0f ms when the app is left at once", stay, leave)
	want := valueOf(t, b, "y-input-0")
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady+` && tid("result-n")?.dataset.value === "5000"`, 60*time.Second)
	if got := valueOf(t, b, "y-input-0"); got != want {
		t.Errorf("after the saves, y of reading 1 is %q, want %q", got, want)
	}
	for _, d := range []time.Duration{20 * time.Millisecond, 150 * time.Millisecond} {
		eval[bool](t, b, caret)
		before := valueOf(t, b, "y-input-0")
		b.do(t, chromedp.KeyEvent("7"))
		time.Sleep(d)
		b.do(t, chromedp.Reload())
		waitFor(t, b, "the app after reload", appReady+` && tid("result-n")?.dataset.value === "5000"`, 60*time.Second)
		after := valueOf(t, b, "y-input-0")
		t.Logf("5,000 readings: reload %v after the last key: y1 %q → %q (kept: %v)", d, before, after, after == before+"7")
	}
}
