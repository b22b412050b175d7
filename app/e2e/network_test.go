//go:build e2e

package e2e

import (
	"bytes"
	"io"
	"net/http"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/andybalholm/brotli"
)

// Download budgets of app.wasm. The first visit on a field connection is
// the time to download it: 2.1 MB of brotli is about 1.7 s at 10 Mbit/s and
// 10.5 s at 1.6 Mbit/s, before compiling and starting. The raw budget is
// 11 MiB (a browser that accepts no compression, and the cache on the
// device).
const (
	wasmRawBudget    = 11 << 20
	wasmBrotliBudget = 2_100_000
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
	deadline := time.Now().Add(4 * time.Minute) // brotli q11 on a shared 2-core machine
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
			t.Logf("app.wasm sent as brotli: %d bytes (budget %d), raw %d", len(body), wasmBrotliBudget, len(raw))
			if len(body) > wasmBrotliBudget {
				t.Errorf("app.wasm is sent as %d bytes of brotli, past its budget of %d", len(body), wasmBrotliBudget)
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
