package webapp

import (
	"bytes"
	"compress/gzip"
	"io"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"testing"

	"github.com/andybalholm/brotli"
)

// decode undoes a Content-Encoding with the decoders of Go's standard
// library (gzip, RFC 1952) and of the brotli module (RFC 7932).
func decode(t *testing.T, enc string, b []byte) []byte {
	t.Helper()
	var r io.Reader
	switch enc {
	case "":
		return b
	case "gzip":
		z, err := gzip.NewReader(bytes.NewReader(b))
		if err != nil {
			t.Fatalf("gzip body: %v", err)
		}
		r = z
	case "br":
		r = brotli.NewReader(bytes.NewReader(b))
	default:
		t.Fatalf("unknown Content-Encoding %q", enc)
	}
	out, err := io.ReadAll(r)
	if err != nil {
		t.Fatalf("%s body: %v", enc, err)
	}
	return out
}

func request(h http.Handler, method, target, ae, inm string) *http.Response {
	req := httptest.NewRequest(method, target, nil)
	if ae != "" {
		req.Header.Set("Accept-Encoding", ae)
	}
	if inm != "" {
		req.Header.Set("If-None-Match", inm)
	}
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	return rec.Result()
}

// Every file of the served set comes in the best encoding the request
// accepts (RFC 9110 §12.5.3), decodes to the raw file, carries Vary and an
// ETag of its own per encoding, and a matching If-None-Match gets 304.
func TestCompressedDelivery(t *testing.T) {
	h := Site(testWeb(t), "")
	cases := []struct {
		ae, want string
	}{
		{"", ""},
		{"identity", ""},
		{"gzip", "gzip"},
		{"gzip, deflate, br, zstd", "br"},
		{"br;q=0, gzip", "gzip"},
		{"br;q=0, gzip;q=0", ""},
		{"*", "br"},
		{"*;q=0, gzip", "gzip"},
		{"BR", "br"},
	}
	for _, p := range Served() {
		raw := request(h, http.MethodGet, p, "", "")
		rawBody, _ := io.ReadAll(raw.Body)
		if raw.StatusCode != http.StatusOK {
			t.Fatalf("%s: %d", p, raw.StatusCode)
		}
		etags := map[string]string{}
		for _, c := range cases {
			want := c.want
			if !compressible(p) {
				want = ""
			}
			res := request(h, http.MethodGet, p, c.ae, "")
			body, _ := io.ReadAll(res.Body)
			if got := res.Header.Get("Content-Encoding"); got != want {
				t.Errorf("%s with Accept-Encoding %q: Content-Encoding %q, want %q", p, c.ae, got, want)
				continue
			}
			if !bytes.Equal(decode(t, want, body), rawBody) {
				t.Errorf("%s as %q does not decode to the file", p, want)
			}
			if compressible(p) && res.Header.Get("Vary") != "Accept-Encoding" {
				t.Errorf("%s: Vary %q", p, res.Header.Get("Vary"))
			}
			if want != "" && len(rawBody) > 256 && len(body) >= len(rawBody) {
				t.Errorf("%s as %s: %d bytes, raw %d", p, want, len(body), len(rawBody))
			}
			etag := res.Header.Get("ETag")
			if old, seen := etags[want]; seen && old != etag {
				t.Errorf("%s as %q: ETag %s, then %s", p, want, old, etag)
			}
			etags[want] = etag
			head := request(h, http.MethodHead, p, c.ae, "")
			if head.Header.Get("Content-Length") != res.Header.Get("Content-Length") || head.Header.Get("ETag") != etag {
				t.Errorf("%s HEAD: length %s ETag %s, GET %s %s", p, head.Header.Get("Content-Length"), head.Header.Get("ETag"), res.Header.Get("Content-Length"), etag)
			}
			if nm := request(h, http.MethodGet, p, c.ae, etag); nm.StatusCode != http.StatusNotModified {
				t.Errorf("%s as %q with If-None-Match %s: %d, want 304", p, want, etag, nm.StatusCode)
			}
		}
		seen := map[string]string{}
		for enc, etag := range etags {
			if other, dup := seen[etag]; dup {
				t.Errorf("%s: encodings %q and %q share ETag %s", p, enc, other, etag)
			}
			seen[etag] = enc
		}
		// An ETag of one encoding does not match another.
		if compressible(p) {
			if res := request(h, http.MethodGet, p, "br", etags[""]); res.StatusCode != http.StatusOK {
				t.Errorf("%s: brotli request with the raw ETag answered %d", p, res.StatusCode)
			}
		}
	}
}

// The served set's files of different content never share an ETag.
func TestETagPerFile(t *testing.T) {
	h := Site(testWeb(t), "")
	seen := map[string]string{}
	for _, p := range Served() {
		etag := request(h, http.MethodGet, p, "br", "").Header.Get("ETag")
		if etag == "" {
			t.Errorf("%s: no ETag", p)
		}
		if other, dup := seen[etag]; dup {
			t.Errorf("%s and %s share ETag %s", p, other, etag)
		}
		seen[etag] = p
	}
}

// A brotli copy made beforehand beside a web file (app.wasm.br, as
// `make wasm-br` writes it) is sent as it is when it decodes to the file,
// and ignored (the file compressed as usual) when it belongs to another
// build of the file or is not brotli at all.
func TestMadeBrotliCopy(t *testing.T) {
	raw := bytes.Repeat([]byte("made beforehand, invented content 0123456789\n"), 4000)
	made := brotliBytes(raw, 3) // quality 3: not what the server makes (11), so its bytes tell which was sent
	if bytes.Equal(made, brotliBytes(raw, brotli.BestCompression)) {
		t.Fatal("quality 3 and 11 give the same bytes; the test cannot tell them apart")
	}
	cases := []struct {
		name   string
		copyOf []byte // nil: no copy written
		junk   bool
		want   []byte // the body expected (nil: the server's own copy)
	}{
		{"matching copy", raw, false, made},
		{"copy of an older build", append(append([]byte(nil), raw...), 'x'), false, nil},
		{"copy of a shorter build", raw[:len(raw)-1], false, nil},
		{"not brotli", nil, true, nil},
		{"no copy", nil, false, nil},
	}
	for _, c := range cases {
		dir := testWeb(t)
		os.Remove(filepath.Join(dir, "app.wasm.br"))
		if err := os.WriteFile(filepath.Join(dir, "app.wasm"), raw, 0o644); err != nil {
			t.Fatal(err)
		}
		switch {
		case c.junk:
			os.WriteFile(filepath.Join(dir, "app.wasm.br"), []byte("not a brotli stream"), 0o644)
		case c.copyOf != nil:
			b := made
			if !bytes.Equal(c.copyOf, raw) {
				b = brotliBytes(c.copyOf, 3)
			}
			os.WriteFile(filepath.Join(dir, "app.wasm.br"), b, 0o644)
		}
		res := request(Site(dir, ""), http.MethodGet, "/web/app.wasm", "br", "")
		body, _ := io.ReadAll(res.Body)
		if res.Header.Get("Content-Encoding") != "br" {
			t.Errorf("%s: Content-Encoding %q", c.name, res.Header.Get("Content-Encoding"))
			continue
		}
		if !bytes.Equal(decode(t, "br", body), raw) {
			t.Errorf("%s: the body does not decode to app.wasm", c.name)
		}
		if c.want != nil && !bytes.Equal(body, c.want) {
			t.Errorf("%s: the copy made beforehand was not sent (%d bytes, copy %d)", c.name, len(body), len(c.want))
		}
		if c.want == nil && bytes.Equal(body, made) {
			t.Errorf("%s: a copy that does not match the file was sent", c.name)
		}
	}
}
