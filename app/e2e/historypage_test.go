//go:build e2e

package e2e

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"

	"pairline/app/cli"
	"pairline/app/history"
	"pairline/app/session"
)

// cspJS records every Content-Security-Policy violation of a page (what
// the page tried to load or run and was refused).
const cspJS = `window.__csp = []; document.addEventListener('securitypolicyviolation', e => window.__csp.push(e.violatedDirective + ' ' + e.blockedURI));`

// TestHistoryPage writes `pairline history --html` for the invented
// three-instrument year (history.Scenario; one file per session, one of
// them cut short and one foreign file beside them) and opens the page from
// a file in headless Chromium at tablet and phone size. The page asks for
// nothing but itself and breaks no rule of its own policy, nothing is wider
// than the screen except inside a table's own scrolling box, the six
// charts are drawn at a readable size, the drifting analyser and the
// overdue instruments are marked as the scenario was generated, and axe-core
// finds no violation of impact serious or critical. Screenshots go to the
// artifacts folder for a person to look at.
func TestHistoryPage(t *testing.T) {
	chromiumPath(t)
	dir := t.TempDir()
	ss, err := history.Scenario(2026, time.Date(2025, 1, 6, 0, 0, 0, 0, time.UTC), 1)
	if err != nil {
		t.Fatal(err)
	}
	var first []byte
	for i, s := range ss {
		if i%12 < 6 {
			if err := s.SignPerformed("A. Technician (invented)", s.Created.Add(time.Hour)); err != nil {
				t.Fatal(err)
			}
		}
		b, err := session.EncodeBytes([]*session.Session{s})
		if err != nil {
			t.Fatal(err)
		}
		if i == 0 {
			first = b
		}
		if err := os.WriteFile(filepath.Join(dir, fmt.Sprintf("%02d.pairline", i)), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if err := os.WriteFile(filepath.Join(dir, "cut.pairline"), first[:len(first)/2], 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "notes.pairline"), []byte("a,b\n1,2\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(artifactDir(t), "history-page.html")
	var so, se bytes.Buffer
	if code := cli.Main([]string{"history", "--html", out, "--slope-limits", "1.40,1.60", dir}, nil, &so, &se); code != cli.ExitOK {
		t.Fatalf("pairline history --html: exit %d: %s", code, se.String())
	}
	t.Logf("page: %s", out)
	url := "file://" + out
	overdue := time.Now().After(time.Date(2026, 1, 10, 0, 0, 0, 0, time.UTC))

	for _, size := range []struct {
		name string
		wh   [2]int64
	}{{"tablet", tablet}, {"phone", phone}} {
		t.Run(size.name, func(t *testing.T) {
			b := newBrowser(t, size.wh)
			if err := chromedp.Do(b.ctx, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
				now := true
				_, err := cdp.Call(ctx, tg, page.AddScriptToEvaluateOnNewDocument, page.AddScriptToEvaluateOnNewDocumentParams{Source: cspJS, RunImmediately: &now})
				return err
			})); err != nil {
				t.Fatal(err)
			}
			b.do(t, chromedp.Navigate(url))
			waitFor(t, b, "the page", `document.readyState === "complete" && !!tid("hfile-page")`, 20*time.Second)

			if n := eval[int](t, b, `tids("hfile-instrument").length`); n != 3 {
				t.Errorf("%d instrument sections, want 3", n)
			}
			drift := eval[string](t, b, `document.querySelector('[data-testid="hfile-instrument"][data-key="LVWB-CL-02"]').dataset.slopeDrift`)
			if drift != "drifting" {
				t.Errorf("the drifting analyser's slope is %q, want drifting", drift)
			}
			states := eval[string](t, b, `tids("hfile-instrument").map(e => e.dataset.dueState).join(",")`)
			want := "due,due,due"
			if overdue {
				want = "overdue,overdue,overdue"
			}
			if states != want {
				t.Errorf("due states %s, want %s", states, want)
			}
			if n := eval[int](t, b, `tids("hfile-skipped-file").length`); n != 2 {
				t.Errorf("%d skipped files listed, want 2", n)
			}
			// Charts: six, each drawn at least 300 px wide (a phone's column).
			widths := eval[[]float64](t, b, `[...document.querySelectorAll('svg[data-testid^="hfile-chart-"]')].map(s => s.getBoundingClientRect().width)`)
			if len(widths) != 6 {
				t.Errorf("%d charts, want 6", len(widths))
			}
			for i, w := range widths {
				if w < 300 {
					t.Errorf("chart %d is %.0f px wide", i, w)
				}
			}
			// Nothing wider than the screen outside a table's scroll box.
			wide := eval[[]string](t, b, `(() => {
				const vw = document.documentElement.clientWidth, out = [];
				for (const e of document.querySelectorAll('body *')) {
					if (e.closest('.pl-rt-wrap')) continue;
					const r = e.getBoundingClientRect();
					if (r.width > 0 && (r.right > vw + 0.5 || r.left < -0.5)) out.push(e.tagName + '.' + e.className + ' ' + Math.round(r.left) + '…' + Math.round(r.right));
				}
				return out.slice(0, 8);
			})()`)
			if len(wide) > 0 {
				t.Errorf("wider than the %d px screen: %v", size.wh[0], wide)
			}
			if sw := eval[int](t, b, `document.documentElement.scrollWidth - document.documentElement.clientWidth`); sw > 0 {
				t.Errorf("the page scrolls sideways by %d px", sw)
			}
			screenshot(t, b, "history-page-"+size.name)
			if csp := eval[[]string](t, b, `window.__csp`); len(csp) > 0 {
				t.Errorf("the page broke its Content-Security-Policy: %v", csp)
			}
			b.mu.Lock()
			reqs := append([]string(nil), b.requests...)
			b.mu.Unlock()
			for _, r := range reqs {
				if r != url && !strings.HasPrefix(r, "data:") {
					t.Errorf("the page asked for %s", r)
				}
			}
			if len(reqs) == 0 {
				t.Error("no request recorded at all: the recorder is not working")
			}
			reportAxe(t, "history page ("+size.name+")", runAxe(t, b))
		})
	}
}
