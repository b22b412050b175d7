//go:build e2e

package e2e

import (
	"context"
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
)

// TestFastTypingKeepsEveryKey: keys typed faster than the app takes them in
// (a slow tablet: the CPU is slowed 6×, and the session holds 40 invented
// readings, so each key is analysed for a while) all stay in the cell and
// reach the stored session. A redraw of the row for an earlier key must not
// put the cell back to the text it had then.
func TestFastTypingKeepsEveryKey(t *testing.T) {
	_, b := openApp(t, tablet)
	fillRows(t, b, 40, "String(i + 1)", "(2 * (i + 1) + (i % 7) * 0.1).toFixed(1)")
	waitFor(t, b, "40 pairs", `tid("usable-count")?.dataset.value === "40"`, 60*time.Second)
	slow := func(rate float64) {
		b.do(t, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
			_, err := cdp.Call(ctx, tg, emulation.SetCPUThrottlingRate, emulation.SetCPUThrottlingRateParams{Rate: rate})
			return err
		}))
	}
	slow(6)
	start := time.Now()
	for round, word := range []string{"12.3456", "7.0891", "305.25"} {
		id := fmt.Sprintf("y-input-%d", 3+round)
		eval[bool](t, b, fmt.Sprintf(`(tid(%q).focus(), tid(%q).select(), true)`, id, id))
		b.do(t, chromedp.KeyEvent(word))
		waitFor(t, b, "the app to take "+word, fmt.Sprintf(`tid(%q).dataset.value === tid(%q).value && tid("save-status").dataset.state === "saved"`, id, id), 30*time.Second)
		if got := valueOf(t, b, id); got != word {
			t.Errorf("typed %q quickly into %s: the cell holds %q", word, id, got)
		}
	}
	t.Logf("three words typed and stored at a 6× slower CPU in %v", time.Since(start).Round(time.Millisecond))
	slow(1)
	b.do(t, chromedp.Reload())
	waitFor(t, b, "the app after reload", appReady+` && !!tid("y-input-5")`, 60*time.Second)
	var got []string
	for round := range 3 {
		got = append(got, valueOf(t, b, fmt.Sprintf("y-input-%d", 3+round)))
	}
	if s := strings.Join(got, " "); s != "12.3456 7.0891 305.25" {
		t.Errorf("after reload the cells hold %s", s)
	}
}

// TestKeyAheadOfTheApp: a key whose input event the app has not taken yet
// when it draws a frame stays in the cell. The page plays it out: the
// first key goes in with its event, the second only into the cell, then
// frames are drawn (the first key's redraw among them), then the second
// key's event comes. Before readingRow.shownText the redraw wrote "7" back
// over "7." and the point was lost.
func TestKeyAheadOfTheApp(t *testing.T) {
	_, b := openApp(t, tablet)
	fillRows(t, b, 3, "String(i + 1)", "String(2 * (i + 1))")
	waitFor(t, b, "3 pairs", `tid("usable-count")?.dataset.value === "3"`, 30*time.Second)
	for _, id := range []string{"y-input-1", "x-input-2"} {
		got := eval[string](t, b, fmt.Sprintf(`(async () => {
			const c = tid(%q), frames = () => new Promise(r => requestAnimationFrame(() => setTimeout(r, 120)));
			const key = (v, withEvent) => { c.value = v; if (withEvent) c.dispatchEvent(new Event('input', {bubbles: true})); };
			c.focus();
			key("7", true);
			key("7.", false); // typed; its event still on its way
			await frames();
			const kept = c.value;
			c.dispatchEvent(new Event('input', {bubbles: true}));
			key("7.9", true);
			await frames();
			return kept + " " + c.value;
		})()`, id))
		if got != "7. 7.9" {
			t.Errorf("%s: the cell held %q after the frames and at the end (want \"7. 7.9\")", id, got)
		}
		waitTaken(t, b, id, "7.9")
	}
}
