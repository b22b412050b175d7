//go:build e2e

package e2e

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/chromedp"

	"pairline/app/demo"
)

// themes are the values of the theme-select element (app/ui/theme.go).
var themes = []string{"standard", "outdoor", "dark"}

// setTheme picks a screen theme and waits until the app's root wears it.
func setTheme(t *testing.T, b *browser, theme string) {
	t.Helper()
	setValue(t, b, "theme-select", theme, "change")
	waitFor(t, b, "the "+theme+" theme", fmt.Sprintf(`document.querySelector('.pl-app').classList.contains('pl-theme-%s')`, theme), 10*time.Second)
}

// axeViolation is one rule axe-core found broken, with where.
type axeViolation struct {
	ID      string   `json:"id"`
	Impact  string   `json:"impact"`
	Help    string   `json:"help"`
	Targets []string `json:"targets"`
}

// runAxe injects axe-core (app/e2e/testdata/axe, put there by make axe; read by the test and
// evaluated in the page: the app never serves it) and returns its
// violations of impact serious or critical on the whole document.
func runAxe(t *testing.T, b *browser) []axeViolation {
	t.Helper()
	if !eval[bool](t, b, `typeof window.axe === "object"`) {
		src, err := os.ReadFile(filepath.Join("testdata", "axe", "axe.min.js"))
		if err != nil {
			t.Fatalf("axe-core is missing: run make axe (see testdata/axe/README.md): %v", err)
		}
		if _, err := chromedp.Run(b.ctx, chromedp.Evaluate[bool](string(src)+"\n;true", chromedp.EvalAwaitPromise)); err != nil {
			t.Fatalf("injecting axe-core: %v", err)
		}
	}
	// A control first: axe-core, as injected here, does catch an image
	// without a text alternative (a rule of impact critical) in this page.
	control := eval[string](t, b, `(async () => {
		const d = document.createElement('div');
		d.id = 'axe-control';
		d.innerHTML = '<img src="/web/icons/icon.svg">';
		document.body.appendChild(d);
		try {
			const r = await axe.run('#axe-control', { runOnly: ['image-alt'] });
			return r.violations.map(v => v.id + ':' + v.impact).join(',');
		} finally { d.remove(); }
	})()`)
	if control != "image-alt:critical" {
		t.Fatalf("axe-core's control: an image without alt gave %q, want image-alt:critical", control)
	}
	out := eval[string](t, b, `(async () => {
		const r = await axe.run(document, { resultTypes: ['violations'] });
		if (r.passes.length < 20) throw new Error('axe-core ran only ' + r.passes.length + ' rules that passed');
		return JSON.stringify(r.violations.filter(v => v.impact === 'serious' || v.impact === 'critical').map(v => ({
			id: v.id, impact: v.impact, help: v.help,
			targets: v.nodes.slice(0, 6).map(n => n.target.join(' ') + (n.failureSummary ? ' — ' + n.failureSummary.replace(/\s+/g, ' ').slice(0, 160) : '')),
		})));
	})()`)
	var vs []axeViolation
	if err := json.Unmarshal([]byte(out), &vs); err != nil {
		t.Fatalf("axe-core's answer: %v (%s)", err, out)
	}
	return vs
}

func reportAxe(t *testing.T, where string, vs []axeViolation) {
	t.Helper()
	if len(vs) == 0 {
		t.Logf("%s: axe-core found no serious or critical violation", where)
		return
	}
	var b strings.Builder
	for _, v := range vs {
		fmt.Fprintf(&b, "\n  %s (%s): %s", v.ID, v.Impact, v.Help)
		for _, n := range v.Targets {
			fmt.Fprintf(&b, "\n      at %s", n)
		}
	}
	t.Errorf("%s: axe-core found %d serious or critical violations:%s", where, len(vs), b.String())
}

// TestA11yAxeAndScreens: on a tablet (800×1280) and a phone (390×844), in
// each of the three themes, axe-core 4.14.1 finds no violation of impact
// serious or critical on the main screen with the (invented) demo data
// and on its report; screenshots of both are saved for a person to look at.
func TestA11yAxeAndScreens(t *testing.T) {
	srv := startServer(t)
	for _, vp := range []struct {
		name string
		size [2]int64
	}{{"tablet", tablet}, {"phone", phone}} {
		t.Run(vp.name, func(t *testing.T) {
			b := newBrowser(t, vp.size)
			fuDemo(t, b, srv)
			for _, th := range themes {
				setTheme(t, b, th)
				eval[bool](t, b, `(window.scrollTo(0, 0), true)`)
				reportAxe(t, vp.name+", "+th+", main screen", runAxe(t, b))
				screenshot(t, b, "a11y-"+vp.name+"-"+th+"-main")
				viewShot(t, b, "a11y-"+vp.name+"-"+th+"-main-screen")
				eval[bool](t, b, `(tid("plot-fit").scrollIntoView({block: 'start'}), true)`)
				viewShot(t, b, "a11y-"+vp.name+"-"+th+"-plots-screen")
				eval[bool](t, b, `(window.scrollTo(0, 0), true)`)
				click(t, b, "report-open")
				waitFor(t, b, "the report", `!!tid("report", ' @plot-qq')`, 20*time.Second)
				reportAxe(t, vp.name+", "+th+", report", runAxe(t, b))
				screenshot(t, b, "a11y-"+vp.name+"-"+th+"-report")
				click(t, b, "report-close")
				waitFor(t, b, "the report closed", `!tid("report")`, 10*time.Second)
			}
			// The bands show on a wide one: demo B (invented, its scatter
			// grows with the level), dark theme.
			fuOpenTitled(t, b, demo.Titles[1])
			setTheme(t, b, "dark")
			waitFor(t, b, "the plot of demo B", `!!tid("plot-fit")`, 20*time.Second)
			eval[bool](t, b, `(tid("plot-fit").scrollIntoView({block: 'center'}), true)`)
			viewShot(t, b, "a11y-"+vp.name+"-dark-bands-screen")
			if bad := b.foreign(srv.URL); len(bad) > 0 {
				t.Errorf("requests left the app's origin: %v", bad)
			}
		})
	}
}

// viewShot saves what the screen shows (the viewport, not the whole page)
// in artifactDir: the top of the screen as a technician first sees it.
func viewShot(t *testing.T, b *browser, name string) {
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

// relLuminance is the relative luminance of an sRGB colour as WCAG 2.x
// defines it (WCAG 2.1, "relative luminance"): each channel c = C/255 is
// linearised as c/12.92 when c ≤ 0.04045 (the WCAG text prints 0.03928,
// the sRGB standard 0.04045; no 8-bit value lies between them), else
// ((c+0.055)/1.055)^2.4, and L = 0.2126 R + 0.7152 G + 0.0722 B.
func relLuminance(rgb [3]uint8) float64 {
	lin := func(v uint8) float64 {
		c := float64(v) / 255
		if c <= 0.04045 {
			return c / 12.92
		}
		return math.Pow((c+0.055)/1.055, 2.4)
	}
	return 0.2126*lin(rgb[0]) + 0.7152*lin(rgb[1]) + 0.0722*lin(rgb[2])
}

// contrastRatio is WCAG 2.x's (L1 + 0.05) / (L2 + 0.05), L1 the lighter.
func contrastRatio(a, b [3]uint8) float64 {
	la, lb := relLuminance(a), relLuminance(b)
	if la < lb {
		la, lb = lb, la
	}
	return (la + 0.05) / (lb + 0.05)
}

// parseHex reads #rgb or #rrggbb.
func parseHex(s string) ([3]uint8, error) {
	s = strings.TrimSpace(s)
	if !strings.HasPrefix(s, "#") {
		return [3]uint8{}, fmt.Errorf("%q is not a #rrggbb colour", s)
	}
	h := s[1:]
	if len(h) == 3 {
		h = string([]byte{h[0], h[0], h[1], h[1], h[2], h[2]})
	}
	if len(h) != 6 {
		return [3]uint8{}, fmt.Errorf("%q is not a #rrggbb colour", s)
	}
	v, err := strconv.ParseUint(h, 16, 32)
	if err != nil {
		return [3]uint8{}, fmt.Errorf("%q is not a #rrggbb colour", s)
	}
	return [3]uint8{uint8(v >> 16), uint8(v >> 8), uint8(v)}, nil
}

// The formula's two fixed points: black on white is 21:1 (1.05/0.05) and
// a colour on itself 1:1, both by the definition. #767676 on white is the
// well-known lightest grey that reaches 4.5:1 (common practice, a value
// from memory: 4.54), and #777777 just misses it (4.48).
func TestA11yContrastFormula(t *testing.T) {
	for _, c := range []struct {
		a, b     string
		lo, high float64
	}{
		{"#000000", "#ffffff", 21, 21},
		{"#0b4f5c", "#0b4f5c", 1, 1},
		{"#767676", "#ffffff", 4.5, 4.6},
		{"#777777", "#ffffff", 4.4, 4.5},
	} {
		a, _ := parseHex(c.a)
		b, _ := parseHex(c.b)
		if r := contrastRatio(a, b); r < c.lo-1e-9 || r > c.high+1e-9 {
			t.Errorf("contrast %s on %s = %.4f, want in [%v, %v]", c.a, c.b, r, c.lo, c.high)
		}
	}
}

// TestA11yContrast reads each theme's colour variables (CSS custom
// properties of web/pairline.css and web/themes.css, as the browser
// resolves them on the app's root) and computes WCAG 2.x contrast ratios:
// text and lines at least 7:1 in the outdoor theme (WCAG 2.1 SC 1.4.6,
// enhanced contrast); text at least 4.5:1 (SC 1.4.3) and lines at least
// 3:1 (SC 1.4.11, non-text contrast) in the others; the edge of the
// prediction band at least 3:1 against the plot in every theme.
func TestA11yContrast(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, tablet)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	type pair struct{ fg, bg, kind string }
	pairs := []pair{
		{"--ink", "--paper", "text"}, {"--ink", "--card", "text"}, {"--ink-soft", "--card", "text"},
		{"--ink-soft", "--paper", "text"}, {"--teal-ink", "--teal", "text"}, {"--amber-ink", "--amber", "text"},
		{"--bad", "--card", "text"}, {"--bad", "--bad-bg", "text"}, {"--good", "--card", "text"}, {"--warn", "--card", "text"},
		{"--rule", "--card", "line"}, {"--focus", "--card", "line"}, {"--plot-line", "--card", "line"},
		{"--plot-line", "--plot-ci", "line"}, {"--plot-line", "--plot-pi", "line"}, {"--plot-flag", "--card", "line"},
		{"--plot-pi-edge", "--card", "band"},
	}
	for _, th := range themes {
		setTheme(t, b, th)
		for _, p := range pairs {
			get := func(name string) [3]uint8 {
				v := eval[string](t, b, fmt.Sprintf(`getComputedStyle(document.querySelector('.pl-app')).getPropertyValue(%q)`, name))
				c, err := parseHex(v)
				if err != nil {
					t.Fatalf("%s theme, %s: %v", th, name, err)
				}
				return c
			}
			r := contrastRatio(get(p.fg), get(p.bg))
			want := map[string]float64{"text": 4.5, "line": 3, "band": 3}[p.kind]
			if th == "outdoor" && p.kind != "band" {
				want = 7
			}
			if r < want {
				t.Errorf("%s theme: %s on %s (%s) has contrast %.2f:1, want at least %v:1", th, p.fg, p.bg, p.kind, r, want)
			} else {
				t.Logf("%s theme: %s on %s %.2f:1 (≥ %v)", th, p.fg, p.bg, r, want)
			}
		}
	}
	// Heavier lines and type outdoors: the fitted line and the body text
	// weigh more than in the standard theme.
	weights := map[string][2]float64{}
	for _, th := range []string{"standard", "outdoor"} {
		setTheme(t, b, th)
		w := eval[[]float64](t, b, `(() => {
			const el = document.querySelector('.pl-app');
			return [parseFloat(getComputedStyle(el).fontWeight), parseFloat(getComputedStyle(el).fontSize)];
		})()`)
		weights[th] = [2]float64{w[0], w[1]}
	}
	if o, s := weights["outdoor"], weights["standard"]; o[0] <= s[0] || o[1] <= s[1] {
		t.Errorf("outdoor type (weight %v, size %v px) is not heavier and larger than standard (%v, %v px)", o[0], o[1], s[0], s[1])
	}
}

// setOffline switches the page's network off or on through the DevTools
// protocol: every request fails and navigator.onLine follows.
func setOffline(t *testing.T, b *browser, off bool) {
	t.Helper()
	if err := chromedp.Do(b.ctx, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		if _, err := cdp.Call(ctx, tg, network.EmulateNetworkConditionsByRule, network.EmulateNetworkConditionsByRuleParams{
			MatchedNetworkConditions: []*network.Conditions{{Offline: off, DownloadThroughput: -1, UploadThroughput: -1}},
		}); err != nil {
			return err
		}
		_, err := cdp.Call(ctx, tg, network.OverrideNetworkState, network.OverrideNetworkStateParams{Offline: off, DownloadThroughput: -1, UploadThroughput: -1})
		return err
	})); err != nil {
		t.Fatalf("switching the network %s: %v", map[bool]string{true: "off", false: "on"}[off], err)
	}
}

// TestA11yOffline: the tools strip says online, then "Offline" once the
// network is switched off, and online again; headless Chromium runs the
// app in a tab, so it says the app is not installed, with the hint.
func TestA11yOffline(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, phone)
	b.do(t, chromedp.Navigate(srv.URL))
	waitFor(t, b, "the app to start", appReady, 60*time.Second)
	if got := attr(t, b, "net-status", "data-state"); got != "online" {
		t.Errorf("net-status %q before the network is switched off, want online", got)
	}
	if got := attr(t, b, "install-status", "data-state"); got != "browser" {
		t.Errorf("install-status %q in a browser tab, want browser", got)
	}
	if hint := attr(t, b, "install-status", "title"); !strings.Contains(hint, "Install") {
		t.Errorf("the install hint %q does not say how to install", hint)
	}
	setOffline(t, b, true)
	waitFor(t, b, "the offline word", `tid("net-status").dataset.state === "offline" && tid("net-status").textContent.startsWith("Offline")`, 10*time.Second)
	screenshot(t, b, "a11y-phone-offline")
	// The app still works offline: a reading typed is analysed and saved.
	typeInto(t, b, "x-input-0", "1")
	typeInto(t, b, "y-input-0", "2")
	waitFor(t, b, "the pair analysed offline", `tid("usable-count").dataset.value === "1"`, 10*time.Second)
	waitFor(t, b, "the save while offline", `tid("save-status").dataset.state === "saved"`, 10*time.Second)
	setOffline(t, b, false)
	waitFor(t, b, "online again", `tid("net-status").dataset.state === "online"`, 10*time.Second)
}

// rect is an element's box (getBoundingClientRect) by data-testid.
type rect struct{ Top, Bottom, Left, Right, Width, Height float64 }

func boxOf(t *testing.T, b *browser, testid string) rect {
	t.Helper()
	v := eval[[]float64](t, b, fmt.Sprintf(`(() => { const r = tid(%q).getBoundingClientRect(); return [r.top, r.bottom, r.left, r.right, r.width, r.height]; })()`, testid))
	return rect{v[0], v[1], v[2], v[3], v[4], v[5]}
}

// TestA11yField: on a phone and a tablet, the bar and the tools strip
// together take at most 160 px; the jump bar stays on the screen when the
// page is scrolled and, where it is cut, shows a shade at its edge; an
// empty y cell is not marked while its row is being typed, only once the
// row is left, and an empty x is marked as soon as y is filled; Enter in
// the reason box leaves the reading out and its grid row shows why.
func TestA11yField(t *testing.T) {
	srv := startServer(t)
	for _, vp := range []struct {
		name string
		size [2]int64
	}{{"phone", phone}, {"tablet", tablet}} {
		t.Run(vp.name, func(t *testing.T) {
			b := newBrowser(t, vp.size)
			// Focus and blur events as on a device whose window has the focus.
			b.do(t, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
				_, err := cdp.Call(ctx, tg, emulation.SetFocusEmulationEnabled, emulation.SetFocusEmulationEnabledParams{Enabled: true})
				return err
			}))
			fuDemo(t, b, srv)
			eval[bool](t, b, `(window.scrollTo(0, 0), true)`)
			for _, th := range themes { // the outdoor theme's type is larger
				setTheme(t, b, th)
				bar, tools := boxOf(t, b, "app-bar"), boxOf(t, b, "tools")
				used := tools.Bottom - bar.Top
				t.Logf("%s, %s: bar %.0f px + tools %.0f px = %.0f px of %d", vp.name, th, bar.Height, tools.Height, used, vp.size[1])
				if used > 160 {
					t.Errorf("%s, %s theme: the bar and the tools strip take %.0f px, want at most 160", vp.name, th, used)
				}
			}
			setTheme(t, b, "standard")

			// The jump bar while the page is scrolled far down.
			eval[bool](t, b, `(window.scrollTo(0, document.body.scrollHeight * 0.6), true)`)
			time.Sleep(300 * time.Millisecond)
			if j := boxOf(t, b, "jumps"); j.Top < 0 || j.Bottom > float64(vp.size[1]) || j.Height == 0 {
				t.Errorf("%s: scrolled down, the jump bar is at %.0f–%.0f px, not on the screen", vp.name, j.Top, j.Bottom)
			}
			cut := eval[bool](t, b, `tid("jumps").scrollWidth > tid("jumps").clientWidth + 1`)
			bg := eval[string](t, b, `getComputedStyle(tid("jumps")).backgroundImage + ' | ' + getComputedStyle(tid("jumps")).backgroundAttachment`)
			if vp.name == "phone" && !cut {
				t.Errorf("phone: the jump bar is not cut at 390 px; the test of its shade proves nothing")
			}
			if cut && (strings.Count(bg, "gradient") < 4 || !strings.Contains(bg, "local") || !strings.Contains(bg, "scroll")) {
				t.Errorf("%s: the jump bar is cut but shows no shade at its edge (background %s)", vp.name, bg)
			}
			eval[bool](t, b, `(window.scrollTo(0, 0), true)`)

			// An empty cell waits for its row to be left.
			click(t, b, "session-new")
			waitFor(t, b, "the new session", `document.activeElement === tid("x-input-0")`, 20*time.Second)
			depth := attr(t, b, "undo", "data-depth")
			typeInto(t, b, "x-input-0", "1.5")
			waitFor(t, b, "the edit drawn", fmt.Sprintf(`tid("undo").dataset.depth !== %q`, depth), 10*time.Second)
			if exists(t, b, "y-input-0-problem") {
				t.Errorf("%s: y of reading 1 is marked %q while x was just typed", vp.name, textOf(t, b, "y-input-0-problem"))
			}
			if got := attr(t, b, "y-input-0", "aria-invalid"); got == "true" {
				t.Errorf("%s: y of reading 1 is aria-invalid while its row is typed", vp.name)
			}
			eval[bool](t, b, `(tid("y-input-0").focus(), true)`)
			time.Sleep(200 * time.Millisecond)
			if exists(t, b, "y-input-0-problem") {
				t.Errorf("%s: y of reading 1 is marked when the focus moves to it", vp.name)
			}
			eval[bool](t, b, `(tid("session-title").focus(), true)`)
			waitFor(t, b, "y of reading 1 marked once the row is left", `!!tid("y-input-0-problem")`, 10*time.Second)
			click(t, b, "add-row")
			waitFor(t, b, "reading 2", `document.activeElement === tid("x-input-1")`, 10*time.Second)
			eval[bool](t, b, `(tid("y-input-1").focus(), true)`)
			typeInto(t, b, "y-input-1", "3")
			waitFor(t, b, "x of reading 2 marked as soon as y is filled", `!!tid("x-input-1-problem")`, 10*time.Second)

			// Enter in the reason box leaves the reading out.
			for i, p := range [][2]string{{"1.5", "2.9"}, {"", ""}, {"2", "4.1"}, {"3", "6.2"}, {"4", "7.8"}, {"5", "10.1"}} {
				if i == 1 {
					typeInto(t, b, "x-input-1", "2.5")
					continue
				}
				if i > 1 {
					click(t, b, "add-row")
					waitFor(t, b, "the new row", fmt.Sprintf(`!!tid("x-input-%d")`, i), 10*time.Second)
				}
				typeInto(t, b, fmt.Sprintf("x-input-%d", i), p[0])
				typeInto(t, b, fmt.Sprintf("y-input-%d", i), p[1])
			}
			waitFor(t, b, "the line of 6 readings", `tid("result-n")?.dataset.value === "6"`, 20*time.Second)
			click(t, b, "plot-point-open")
			waitFor(t, b, "the reading panel", `!!tid("plot-point-reason")`, 10*time.Second)
			row := attr(t, b, "plot-point-panel", "data-row")
			b.do(t, chromedp.SendKeys(sel("plot-point-reason"), "invented: probe not settled\r"))
			waitFor(t, b, "the reading left out by Enter", `tid("result-n")?.dataset.value === "5"`, 10*time.Second)
			got := textOf(t, b, "row-reason-"+row)
			if !strings.Contains(got, "invented: probe not settled") {
				t.Errorf("%s: the grid row of reading %s says %q, want its reason", vp.name, row, got)
			}
			screenshot(t, b, "a11y-"+vp.name+"-grid-reason")
		})
	}
}

// TestA11yWide: on a wide screen (1280×800) the line's figures stay in
// view beside the grid while the readings are scrolled to their end.
func TestA11yWide(t *testing.T) {
	srv := startServer(t)
	b := newBrowser(t, [2]int64{1280, 800})
	fuDemo(t, b, srv)
	for i := 0; i < 40 && eval[float64](t, b, `tid("readings-card").getBoundingClientRect().height`) < 1600; i++ {
		click(t, b, "add-row")
	}
	last := eval[int](t, b, `document.querySelectorAll('input.pl-cell[data-testid^="x-input-"]').length`) - 1
	eval[bool](t, b, fmt.Sprintf(`(tid("x-input-%d").scrollIntoView({block: 'end'}), true)`, last))
	time.Sleep(300 * time.Millisecond)
	line, grid, bar := boxOf(t, b, "line-card"), boxOf(t, b, "readings-card"), boxOf(t, b, "app-bar")
	slope := boxOf(t, b, "result-slope")
	t.Logf("wide: readings %.0f–%.0f px (x %.0f–%.0f), line card %.0f–%.0f px (x %.0f–%.0f), bar bottom %.0f", grid.Top, grid.Bottom, grid.Left, grid.Right, line.Top, line.Bottom, line.Left, line.Right, bar.Bottom)
	if grid.Top >= 0 {
		t.Fatalf("the readings did not scroll (top %.0f): the test proves nothing", grid.Top)
	}
	if line.Left < grid.Right {
		t.Errorf("the line card (x %.0f) is not beside the readings (right edge %.0f)", line.Left, grid.Right)
	}
	if slope.Top < bar.Bottom || slope.Bottom > 800 {
		t.Errorf("the slope is at %.0f–%.0f px, out of view (bar bottom %.0f, screen 800)", slope.Top, slope.Bottom, bar.Bottom)
	}
}
