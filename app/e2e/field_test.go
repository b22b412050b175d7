//go:build e2e

package e2e

import (
	"context"
	"fmt"
	"math"
	"strconv"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"

	"pairline/app/demo"
	"pairline/app/session"
)

// visualBand is the visual viewport (window.visualViewport, in the layout
// viewport's coordinates) and the bottom of the sticky jump bar.
type visualBand struct{ Top, Bottom, Sticky float64 }

func visualOf(t *testing.T, b *browser) visualBand {
	t.Helper()
	v := eval[[]float64](t, b, `(() => { const vv = window.visualViewport;
		return [vv.offsetTop, vv.offsetTop + vv.height, tid("jumps").getBoundingClientRect().bottom]; })()`)
	return visualBand{v[0], v[1], v[2]}
}

// TestFieldKeyboard: on a phone (390×844) a grid cell low on the screen,
// once it has the focus, moves to the upper part of the screen (above 55 %,
// where the on-screen keyboard will not come) and below the sticky jump
// bar; when the visual viewport then shrinks to 500 px as it does when the
// keyboard opens (the device metrics are set to 390×500), the cell is still
// inside it and below the bar. A cell focused while the viewport is short
// is placed inside it too.
func TestFieldKeyboard(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, phone)
	b.do(t, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		_, err := cdp.Call(ctx, tg, emulation.SetFocusEmulationEnabled, emulation.SetFocusEmulationEnabledParams{Enabled: true})
		return err
	}))
	fuDemo(t, b, srv)
	last := eval[int](t, b, `document.querySelectorAll('input.pl-cell[data-testid^="y-input-"]').length`) - 1
	if last < 6 {
		t.Fatalf("the demo session has %d rows: too few for a cell low in the grid", last+1)
	}
	cell := "y-input-" + strconv.Itoa(last)
	eval[bool](t, b, fmt.Sprintf(`(tid(%q).scrollIntoView({block: 'end'}), true)`, cell))
	time.Sleep(300 * time.Millisecond)
	before := boxOf(t, b, cell)
	if before.Top < 0.6*float64(phone[1]) {
		t.Fatalf("the cell is at %.0f px before the focus, not low on the screen: the test proves nothing", before.Top)
	}
	eval[bool](t, b, fmt.Sprintf(`(tid(%q).focus(), true)`, cell))
	waitFor(t, b, "the cell in the upper part of the screen", fmt.Sprintf(
		`tid(%q).getBoundingClientRect().bottom <= 0.55 * window.visualViewport.height`, cell), 10*time.Second)
	time.Sleep(200 * time.Millisecond)
	at := boxOf(t, b, cell)
	vb := visualOf(t, b)
	t.Logf("phone 390×844: %s at %.0f–%.0f px before the focus, %.0f–%.0f px after (jump bar to %.0f px)", cell, before.Top, before.Bottom, at.Top, at.Bottom, vb.Sticky)
	if at.Top < vb.Sticky {
		t.Errorf("the focused cell (top %.0f px) is under the sticky jump bar (bottom %.0f px)", at.Top, vb.Sticky)
	}
	viewShot(t, b, "field-keyboard-focus-phone")

	// The keyboard opens: the visual viewport becomes 500 px high.
	b.do(t, chromedp.EmulateViewport(phone[0], 500))
	inside := fmt.Sprintf(`(() => { const r = tid(%q).getBoundingClientRect(), vv = window.visualViewport,
		bar = tid("jumps").getBoundingClientRect();
		return vv.height < 520 && r.top >= Math.max(vv.offsetTop, bar.bottom) && r.bottom <= vv.offsetTop + vv.height; })()`, cell)
	waitFor(t, b, "the focused cell inside the short visual viewport", inside, 10*time.Second)
	at, vb = boxOf(t, b, cell), visualOf(t, b)
	t.Logf("keyboard up (visual viewport %.0f–%.0f px): %s at %.0f–%.0f px, jump bar to %.0f px", vb.Top, vb.Bottom, cell, at.Top, at.Bottom, vb.Sticky)
	if got := eval[string](t, b, `document.activeElement?.dataset?.testid || ""`); got != cell {
		t.Errorf("the focus moved to %q", got)
	}

	// With the keyboard up, a cell that sits under it is brought up on focus.
	other := "x-input-" + strconv.Itoa(last-1)
	eval[bool](t, b, `(tid("session-title").focus(), true)`)
	eval[bool](t, b, fmt.Sprintf(`(() => { const r = tid(%q).getBoundingClientRect(); window.scrollBy(0, r.top - 470); return true; })()`, other))
	time.Sleep(200 * time.Millisecond)
	if low := boxOf(t, b, other); low.Bottom <= 500 {
		t.Fatalf("%s is at %.0f–%.0f px before the focus, not under the keyboard: the test proves nothing", other, low.Top, low.Bottom)
	}
	eval[bool](t, b, fmt.Sprintf(`(tid(%q).focus(), true)`, other))
	waitFor(t, b, "the second cell inside the short visual viewport", fmt.Sprintf(`(() => { const r = tid(%q).getBoundingClientRect(), vv = window.visualViewport,
		bar = tid("jumps").getBoundingClientRect();
		return r.top >= Math.max(vv.offsetTop, bar.bottom) && r.bottom <= vv.offsetTop + vv.height; })()`, other), 10*time.Second)
	viewShot(t, b, "field-keyboard-up-phone")
}

// plotRects are the boxes of the four plots, top and left of each.
func plotRects(t *testing.T, b *browser) []float64 {
	t.Helper()
	return eval[[]float64](t, b, `["plot-fit", "plot-residuals", "plot-order", "plot-qq"].flatMap(id => {
		const r = tid(id).getBoundingClientRect(); return [r.top, r.left, r.width, r.height]; })`)
}

// tapPlotPlaced scrolls a plot to block ("start", "center" or "end") and
// taps the data point (x, y) on it with a real mouse click; it returns
// the screen point.
func tapPlotPlaced(t *testing.T, b *browser, testID, block string, x, y float64) [2]float64 {
	t.Helper()
	eval[bool](t, b, fmt.Sprintf(`(tid(%q).scrollIntoView({block: %q}), true)`, testID, block))
	time.Sleep(300 * time.Millisecond) // the jump bar settles
	p := eval[[]float64](t, b, fmt.Sprintf(`(() => { const p = %s(tid(%q), %v, %v); return [p.x, p.y]; })()`, plotPointJS, testID, x, y))
	b.do(t, chromedp.MouseClickXY(p[0], p[1]))
	return [2]float64{p[0], p[1]}
}

// TestFieldPanel: at phone and tablet size, tapping a point on a plot
// opens the reading panel without moving any plot (each plot's box is the
// same before and after, to 0.5 px), fully inside the screen, and the
// point tapped is not covered by it; for plots at the top, middle and
// bottom of the screen.
func TestFieldPanel(t *testing.T) {
	srv := startServer(t)
	ss, reps := fuReports(t)
	s, rep := ss[2], reps[2]
	_, _, rows, _ := s.Pairs()
	idx := -1
	for i, r := range rows {
		if r == demo.MistypedRow {
			idx = i
		}
	}
	xs, _ := session.ParseNumber(s.Readings[demo.MistypedRow].X)
	ys, _ := session.ParseNumber(s.Readings[demo.MistypedRow].Y)
	x0, _ := session.ParseNumber(s.Readings[0].X)
	y0, _ := session.ParseNumber(s.Readings[0].Y)
	for _, vp := range []struct {
		name string
		size [2]int64
	}{{"phone", phone}, {"tablet", tablet}} {
		t.Run(vp.name, func(t *testing.T) {
			b := newBrowser(t, vp.size)
			fuDemo(t, b, srv)
			fuOpenTitled(t, b, s.Title)
			waitFor(t, b, "the plots", `!!tid("plot-qq")`, 20*time.Second)
			for _, tc := range []struct {
				plot, block string
				x, y        float64
				row         int
			}{
				{"plot-fit", "center", x0, y0, 0},
				{"plot-fit", "end", xs, ys, demo.MistypedRow},
				{"plot-fit", "start", x0, y0, 0},
				{"plot-residuals", "center", rep.Fitted[idx], rep.Residuals[idx], demo.MistypedRow},
				{"plot-residuals", "start", rep.Fitted[idx], rep.Residuals[idx], demo.MistypedRow},
			} {
				where := fmt.Sprintf("%s, %s at the %s of the screen", vp.name, tc.plot, tc.block)
				if exists(t, b, "plot-point-panel") {
					click(t, b, "plot-point-close")
					waitFor(t, b, "the panel closed", `!tid("plot-point-panel")`, 10*time.Second)
				}
				tap := tapPlotPlaced(t, b, tc.plot, tc.block, tc.x, tc.y)
				before := plotRects(t, b)
				waitFor(t, b, where+": the panel", fmt.Sprintf(`tid("plot-point-panel")?.dataset.row === "%d"`, tc.row), 10*time.Second)
				time.Sleep(300 * time.Millisecond)
				after := plotRects(t, b)
				for i := range before {
					if math.Abs(before[i]-after[i]) > 0.5 {
						t.Errorf("%s: opening the panel moved the plots: %v → %v", where, before, after)
						break
					}
				}
				p := boxOf(t, b, "plot-point-panel")
				vw := eval[float64](t, b, `document.documentElement.clientWidth`)
				vh := eval[float64](t, b, `window.visualViewport.height`)
				t.Logf("%s: tap at (%.0f, %.0f), panel %s at %.0f–%.0f px (x %.0f–%.0f) of %.0f×%.0f", where, tap[0], tap[1],
					attr(t, b, "plot-point-panel", "data-place"), p.Top, p.Bottom, p.Left, p.Right, vw, vh)
				if p.Top < 0 || p.Bottom > vh+0.5 || p.Left < 0 || p.Right > vw+0.5 || p.Height < 100 {
					t.Errorf("%s: the panel is at %.0f–%.0f px (x %.0f–%.0f), not inside the %.0f×%.0f screen", where, p.Top, p.Bottom, p.Left, p.Right, vw, vh)
				}
				if bar := boxOf(t, b, "jumps"); p.Top < bar.Bottom && p.Bottom > bar.Top && vp.name == "phone" {
					t.Errorf("%s: the panel (%.0f–%.0f px) covers the jump bar (%.0f–%.0f px)", where, p.Top, p.Bottom, bar.Top, bar.Bottom)
				}
				if p.Top <= tap[1] && tap[1] <= p.Bottom {
					t.Errorf("%s: the panel (%.0f–%.0f px) covers the point tapped at %.0f px", where, p.Top, p.Bottom, tap[1])
				}
				// The panel's buttons are inside it and reachable.
				if !eval[bool](t, b, `(() => { const pn = tid("plot-point-panel"), c = tid("plot-point-close").getBoundingClientRect();
					return pn.contains(document.elementFromPoint(c.left + c.width / 2, c.top + c.height / 2)); })()`) {
					t.Errorf("%s: the panel's Close button is covered", where)
				}
				if tc.block == "end" {
					viewShot(t, b, "field-panel-"+vp.name+"-"+tc.plot+"-low")
				}
			}
			// A second tap while the panel is open reaches a plot point
			// it does not cover, and the panel follows.
			click(t, b, "plot-point-close")
			waitFor(t, b, "the panel closed", `!tid("plot-point-panel")`, 10*time.Second)
			tapPlotPlaced(t, b, "plot-fit", "center", x0, y0)
			waitFor(t, b, "the panel on reading 1", `tid("plot-point-panel")?.dataset.row === "0"`, 10*time.Second)
			p := eval[[]float64](t, b, fmt.Sprintf(`(() => { const p = %s(tid("plot-fit"), %v, %v); return [p.x, p.y]; })()`, plotPointJS, xs, ys))
			if eval[bool](t, b, fmt.Sprintf(`tid("plot-point-panel").contains(document.elementFromPoint(%v, %v))`, p[0], p[1])) {
				t.Logf("%s: the panel covers the slipped reading's point; not tapped", vp.name)
				return
			}
			b.do(t, chromedp.MouseClickXY(p[0], p[1]))
			waitFor(t, b, "the panel on the slipped reading", fmt.Sprintf(`tid("plot-point-panel")?.dataset.row === "%d"`, demo.MistypedRow), 10*time.Second)
		})
	}
}
