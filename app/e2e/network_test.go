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
// the time to download it: 1.8 MB of brotli is about 1.5 s at 10 Mbit/s and
// 9 s at 1.6 Mbit/s, before compiling and starting. The raw budget is for a
// browser that accepts no compression and for the cache on the device. The
// issue's targets are 11 MB raw and 2.1 MB of brotli; since the browser
// build leaves out go-app's server and with it net/http and crypto/tls
// (testdata/wasmdeps, 4 December: 11,967,596 → 10,372,677 bytes raw,
// 2,099,226 → 1,799,618 of quality-11 brotli) both are met with room, and
// the budgets sit a little above that build. The history of each cut and
// what was measured and left out is in DEVELOPERS.md ("What app.wasm is
// made of"). A build past a budget needs a look at what grew, and the
// budgets only move down (brotli's size moves by a few kB with the order of
// the code alone). wasmServeBudget is for the brotli copy `pairline serve`
// makes at start (quality 5 for large files, app/webapp/compress.go);
// wasmMadeBudget is for the quality-11 copy `make wasm-br` writes beside
// app.wasm (web/app.wasm.br), which serve sends when it matches the file
// (`make browser` makes it).
const (
	wasmRawBudget   = 10_500_000
	wasmServeBudget = 2_200_000
	wasmMadeBudget  = 1_850_000
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
