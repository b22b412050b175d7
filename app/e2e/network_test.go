//go:build e2e

package e2e

import (
	"bytes"
	"context"
	"io"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/andybalholm/brotli"
	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/chromedp"
)

// Download budgets of app.wasm. The first visit on a field connection is
// the time to download it: 2.5 MB of brotli is about 2 s at 10 Mbit/s and
// 12.5 s at 1.6 Mbit/s, before compiling and starting. The raw budget (a
// browser that accepts no compression, and the cache on the device) is
// 11.95 MB: 11.8 MB since the library code that runs once or never in the
// page is compiled without inlining (Makefile, WASM_GCFLAGS; DEVELOPERS.md,
// "What app.wasm is made of"), then 11.90 MB with the advice's parallel
// refits and bucket sort, the long report's paging and the guard for keys
// typed ahead, then 12.05 MB on 3 December: the advice's refits at 10⁶
// readings (fitcore +29.5 kB of code: the refits' own Shapiro–Wilk,
// influence and Durbin–Watson paths, the blocked Box–Cox grid, a pair sort)
// and the Shell's split into parts (+3.5 kB) made 12,013,189 bytes. The
// target is 11 MB. A build past it needs a look at what grew; the budgets
// move up only with what grew named here. wasmServeBudget is the brotli copy
// `pairline serve` makes at start (quality 5 for large files,
// app/webapp/compress.go, 2.46 MB); wasmMadeBudget is for the quality-11
// copy `make wasm-br` writes beside app.wasm (web/app.wasm.br), which serve
// sends when it matches the file (`make browser` makes it): the issue's
// target is 2.1 MB, met until 3 December (2.097 MB), 2.117 MB since the
// same change. Compiling app/session without inlining would win 20 kB of
// brotli back, but a 100,000-row import took 4.9 s instead of 4.4 and a
// 500-session bundle 4.8 s instead of 3.8 (TestCapacity, load about 2), so
// it stays inlined. Also 3 December: the drift's step check and its words
// (fitcore.DriftShifted, the instrument view's shift alert and chart) took
// 12,015,589 → 12,048,585 bytes raw and 2,118,012 → 2,123,897 of brotli,
// the emulated FMA and the comparisons of fitcore's loops about 3 kB raw;
// the budgets were raised by that and a small margin. Later that day
// session.ResultsTable's rows were added by two methods not inlined and
// the browser build compiled package time without inlining: 12,031,626
// bytes raw, 2,113,158 of brotli, and the brotli budget came down again;
// then the drift's allowance for estimated standard errors
// (fitcore.DriftEstimated, its simulation and χ² draws) took 12,057,825 raw
// and 2,115,473 brotli, within both budgets; the commits after it (one
// function split in two, one moved) made 12,058,639 and 2,118,036: the
// brotli size moves by a few kB with the order of the code alone, so a
// build just past the budget may be that, and needs a look all the same.
// Fifth cut (3 December, evening): fitcore's and the screen's sorts go
// through package sort's interface sort, which the standard library links
// anyway (three generic sorts and sort.Slice's copies gone: −31.6 kB raw,
// −7.5 kB brotli), and three element builders stand for the screen's most
// repeated chains (app/ui/elems.go) and one for the rows of the advice
// table (−54.5 kB raw together): 11,972,519 bytes raw and 2,095,468 of
// brotli, under the 2.1 MB, which is now the budget.
const (
	wasmRawBudget   = 12_000_000
	wasmServeBudget = 2_500_000
	wasmMadeBudget  = 2_100_000
)

// app.wasm stays within its raw budget.
func TestWasmSizeBudget(t *testing.T) {
	_, web := appPaths(t)
	info, err := os.Stat(filepath.Join(web, "app.wasm"))
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("app.wasm: %d bytes raw (budget %d)", info.Size(), wasmRawBudget)
	if info.Size() > wasmRawBudget {
		t.Errorf("app.wasm is %d bytes, past its budget of %d: see DEVELOPERS.md (what is large in app.wasm) and check what the browser build links (GOOS=js GOARCH=wasm go list -deps ./wasm)", info.Size(), wasmRawBudget)
	}
}

// The server sends app.wasm brotli-compressed to a browser that accepts it
// (once its background compression is done), within the brotli budget, and
// the body decodes to the file.
func TestServerSendsCompressedWasm(t *testing.T) {
	_, web := appPaths(t)
	raw, err := os.ReadFile(filepath.Join(web, "app.wasm"))
	if err != nil {
		t.Fatal(err)
	}
	s := startServer(t)
	client := &http.Client{Transport: &http.Transport{DisableCompression: true}}
	deadline := time.Now().Add(1 * time.Minute) // serve compresses in the background after it starts
	for {
		req, _ := http.NewRequest(http.MethodGet, s.URL+"/web/app.wasm", nil)
		req.Header.Set("Accept-Encoding", "gzip, deflate, br, zstd") // as Chromium sends it
		res, err := client.Do(req)
		if err != nil {
			t.Fatal(err)
		}
		body, _ := io.ReadAll(res.Body)
		res.Body.Close()
		if res.Header.Get("Content-Encoding") == "br" {
			budget, what := wasmServeBudget, "compressed by serve at start"
			if made, err := os.ReadFile(filepath.Join(web, "app.wasm.br")); err == nil {
				if bytes.Equal(body, made) {
					budget, what = wasmMadeBudget, "web/app.wasm.br, made by make wasm-br"
				} else {
					t.Logf("web/app.wasm.br is not a copy of this app.wasm (made for an older build?): serve ignored it; `make wasm-br` makes it again")
				}
			}
			t.Logf("app.wasm sent as brotli: %d bytes, %s (budget %d), raw %d", len(body), what, budget, len(raw))
			if len(body) > budget {
				t.Errorf("app.wasm is sent as %d bytes of brotli (%s), past its budget of %d", len(body), what, budget)
			}
			if res.Header.Get("Vary") != "Accept-Encoding" {
				t.Errorf("Vary %q, want Accept-Encoding", res.Header.Get("Vary"))
			}
			dec, err := io.ReadAll(brotli.NewReader(bytes.NewReader(body)))
			if err != nil || !bytes.Equal(dec, raw) {
				t.Errorf("the brotli body does not decode to app.wasm (%v)", err)
			}
			return
		}
		if time.Now().After(deadline) {
			t.Fatalf("the server still sends app.wasm with Content-Encoding %q after 4 minutes", res.Header.Get("Content-Encoding"))
		}
		time.Sleep(2 * time.Second)
	}
}

// waitBrotli waits until the server sends app.wasm as brotli (its
// background compression is done).
func waitBrotli(t *testing.T, url string) {
	t.Helper()
	client := &http.Client{Transport: &http.Transport{DisableCompression: true}}
	deadline := time.Now().Add(4 * time.Minute)
	for time.Now().Before(deadline) {
		req, _ := http.NewRequest(http.MethodHead, url+"/web/app.wasm", nil)
		req.Header.Set("Accept-Encoding", "br")
		if res, err := client.Do(req); err == nil {
			res.Body.Close()
			if res.Header.Get("Content-Encoding") == "br" {
				return
			}
		}
		time.Sleep(2 * time.Second)
	}
	t.Fatal("the server did not send app.wasm as brotli within 4 minutes")
}

// A first visit with a fresh profile over a throttled connection (Chromium's
// network emulation): the figures are logged, the assertion is on what
// decides them at a given rate, the bytes of app.wasm on the wire.
func TestThrottledFirstVisit(t *testing.T) {
	srv := startServer(t)
	waitBrotli(t, srv.URL)
	profiles := []struct {
		name      string
		bitsPerS  float64
		latencyMS float64
	}{
		{"10 Mbit/s, 40 ms", 10e6, 40},
		{"1.6 Mbit/s, 150 ms", 1.6e6, 150},
	}
	for _, pr := range profiles {
		t.Run(pr.name, func(t *testing.T) {
			b := newBrowser(t, [2]int64{1024, 768})
			var mu sync.Mutex
			wasmID, wasmEnc, wasmBytes := network.RequestID(""), "", 0.0
			go func() {
				for ev, err := range chromedp.Events(b.ctx, network.ResponseReceived) {
					if err != nil {
						return
					}
					if strings.HasSuffix(ev.Response.URL, "/web/app.wasm") && ev.LoaderID != "" {
						mu.Lock()
						wasmID = ev.RequestID
						wasmEnc, _ = ev.Response.Headers["Content-Encoding"].(string)
						if wasmEnc == "" {
							wasmEnc, _ = ev.Response.Headers["content-encoding"].(string)
						}
						mu.Unlock()
					}
				}
			}()
			go func() {
				for ev, err := range chromedp.Events(b.ctx, network.LoadingFinished) {
					if err != nil {
						return
					}
					mu.Lock()
					if ev.RequestID == wasmID {
						wasmBytes = ev.EncodedDataLength
					}
					mu.Unlock()
				}
			}()
			if err := chromedp.Do(b.ctx, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
				_, err := cdp.Call(ctx, tg, network.EmulateNetworkConditionsByRule, network.EmulateNetworkConditionsByRuleParams{
					MatchedNetworkConditions: []*network.Conditions{{
						Latency: pr.latencyMS, DownloadThroughput: pr.bitsPerS / 8, UploadThroughput: pr.bitsPerS / 8,
					}},
				})
				return err
			})); err != nil {
				t.Fatal(err)
			}
			start := time.Now()
			b.do(t, chromedp.Navigate(srv.URL))
			waitFor(t, b, "a reading cell to accept input", appReady+` && !document.querySelector('[data-testid="x-input-0"]').disabled`, 3*time.Minute)
			elapsed := time.Since(start)
			time.Sleep(500 * time.Millisecond) // the loadingFinished event
			mu.Lock()
			defer mu.Unlock()
			t.Logf("%s: first visit to a reading cell that accepts input: %v; app.wasm %.0f bytes on the wire, Content-Encoding %q", pr.name, elapsed.Round(10*time.Millisecond), wasmBytes, wasmEnc)
			if wasmEnc != "br" {
				t.Errorf("app.wasm came with Content-Encoding %q, want br", wasmEnc)
			}
			if wasmBytes == 0 || wasmBytes > wasmServeBudget+4096 {
				t.Errorf("app.wasm took %.0f bytes on the wire, budget %d", wasmBytes, wasmServeBudget)
			}
		})
	}
}
