package webapp

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/hex"
	"io"
	"net/http"
	"path"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/andybalholm/brotli"
)

// Compressed delivery. app.wasm is about 11 MB; brotli at quality 11 makes
// it about 2 MB and gzip -9 about 2.8 MB, so a tablet on a field connection
// waits a fifth as long for its first start. Every file of the served set
// that is text or wasm is kept in memory raw, brotli-compressed and gzipped,
// compressed once (the first request of the file, or Prepare at start), and
// each request gets the smallest encoding its Accept-Encoding allows. Each
// file and encoding has an ETag of its own (a hash of the bytes sent), so a
// cache never mixes a compressed body with a raw one.

// Encodings, best first.
const (
	encBrotli   = "br"
	encGzip     = "gzip"
	encIdentity = ""
)

// compressible says whether the file at URL path p is worth compressing:
// text and wasm yes, PNG images (already compressed) no.
func compressible(p string) bool {
	switch path.Ext(p) {
	case ".png":
		return false
	}
	return true
}

// variant is one encoding of a file.
type variant struct {
	body []byte
	etag string
}

// entry is one file of the served set as the handler answered it.
type entry struct {
	header http.Header // the handler's own headers (type, cache policy)
	code   int
	vars   map[string]variant // by encoding; only identity when not compressible
}

// encoded answers the served set from memory in the encoding each request
// accepts. next is the handler that makes the files.
type encoded struct {
	next       http.Handler
	background bool // see ServeHTTP
	// made, when set, returns a brotli copy of the file at URL path p made
	// beforehand (web/app.wasm.br beside web/app.wasm: `make wasm-br`, or
	// the web folder `pairline build` writes), or nil. It is used only if
	// it decodes to the file's bytes exactly; otherwise the file is
	// compressed as usual.
	made func(p string) []byte
	mu   sync.Mutex
	once map[string]*sync.Once
	ents map[string]*entry
}

func newEncoded(next http.Handler) *encoded {
	return &encoded{next: next, once: map[string]*sync.Once{}, ents: map[string]*entry{}}
}

// get returns the entry of p, making it on first use.
func (e *encoded) get(p string) *entry {
	e.mu.Lock()
	o := e.once[p]
	if o == nil {
		o = new(sync.Once)
		e.once[p] = o
	}
	e.mu.Unlock()
	o.Do(func() {
		var raw bytes.Buffer
		c := &captured{header: http.Header{}, body: &raw}
		req, _ := http.NewRequest(http.MethodGet, p, nil)
		req.RequestURI = p
		e.next.ServeHTTP(c, req)
		if c.code == 0 {
			c.code = http.StatusOK
		}
		ent := &entry{header: c.header, code: c.code, vars: map[string]variant{}}
		ent.vars[encIdentity] = newVariant(raw.Bytes())
		if c.code == http.StatusOK && compressible(p) && c.err == nil {
			ent.vars[encGzip] = newVariant(gzipBytes(raw.Bytes()))
			var br []byte
			if e.made != nil {
				if b := e.made(p); b != nil && brotliOf(b, raw.Bytes()) {
					br = b
				}
			}
			if br == nil {
				q := brotli.BestCompression
				if e.background && raw.Len() > fastBrotliOver {
					q = fastBrotliQuality
				}
				br = brotliBytes(raw.Bytes(), q)
			}
			ent.vars[encBrotli] = newVariant(br)
		}
		e.mu.Lock()
		e.ents[p] = ent
		e.mu.Unlock()
	})
	e.mu.Lock()
	defer e.mu.Unlock()
	return e.ents[p]
}

func newVariant(b []byte) variant {
	sum := sha256.Sum256(b)
	return variant{body: b, etag: `"` + hex.EncodeToString(sum[:12]) + `"`}
}

// gzipBytes is gzip -9 of b.
func gzipBytes(b []byte) []byte {
	var out bytes.Buffer
	w, _ := gzip.NewWriterLevel(&out, gzip.BestCompression)
	w.Write(b)
	w.Close()
	return out.Bytes()
}

// fastBrotliOver and fastBrotliQuality: `serve` compresses a file larger
// than fastBrotliOver bytes (app.wasm) at brotli quality 5 instead of 11.
// Measured on the 2-core build machine for the 11.2 MB app.wasm: quality 5
// takes about 1 s and gives 2.44 MB, quality 11 takes about a minute of one
// core and gives 2.06 MB. A minute of a core at every start of the server
// (and for every server the browser tests start) is not worth 0.4 MB;
// `pairline build` writes quality 11 copies for a static host.
const (
	fastBrotliOver    = 1 << 20
	fastBrotliQuality = 5
)

// brotliBytes is brotli at the given quality (11 is the best) of b, with a
// 16 MiB window.
func brotliBytes(b []byte, quality int) []byte {
	var out bytes.Buffer
	w := brotli.NewWriterOptions(&out, brotli.WriterOptions{Quality: quality, LGWin: 24})
	w.Write(b)
	w.Close()
	return out.Bytes()
}

// brotliOf says whether br is a brotli stream that decodes to raw exactly
// (a copy made for an older build of the file does not). Decoding stops one
// byte past len(raw), so a wrong copy costs at most the file's length.
func brotliOf(br, raw []byte) bool {
	got, err := io.ReadAll(io.LimitReader(brotli.NewReader(bytes.NewReader(br)), int64(len(raw))+1))
	return err == nil && bytes.Equal(got, raw)
}

// Prepare compresses every file of the served set now, so that no request
// waits for it (brotli at quality 11 of app.wasm takes seconds).
func (e *encoded) Prepare() {
	for _, p := range Served() {
		e.get(p)
	}
}

// accepts returns the best encoding of offered that the Accept-Encoding
// header ae allows (q=0 refuses one; "*" stands for any not named).
func accepts(ae string, has map[string]variant) string {
	q := map[string]float64{}
	for _, part := range strings.Split(ae, ",") {
		name, params, _ := strings.Cut(strings.TrimSpace(part), ";")
		name = strings.ToLower(strings.TrimSpace(name))
		if name == "" {
			continue
		}
		v := 1.0
		if k, val, ok := strings.Cut(strings.TrimSpace(params), "="); ok && strings.TrimSpace(k) == "q" {
			if f, err := strconv.ParseFloat(strings.TrimSpace(val), 64); err == nil {
				v = f
			}
		}
		q[name] = v
	}
	ok := func(enc string) bool {
		if v, named := q[enc]; named {
			return v > 0
		}
		v, star := q["*"]
		return star && v > 0
	}
	for _, enc := range []string{encBrotli, encGzip} {
		if _, have := has[enc]; have && ok(enc) {
			return enc
		}
	}
	return encIdentity
}

// ready returns the entry of p when it is made, else nil.
func (e *encoded) ready(p string) *entry {
	e.mu.Lock()
	defer e.mu.Unlock()
	return e.ents[p]
}

// ServeHTTP answers from memory. With background set, a file whose
// compressed copies are still being made is answered raw by next at once
// (the first minute after `serve` starts on a busy machine) rather than
// kept waiting.
func (e *encoded) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	var ent *entry
	if e.background {
		if ent = e.ready(r.URL.Path); ent == nil {
			e.next.ServeHTTP(w, r)
			return
		}
	} else {
		ent = e.get(r.URL.Path)
	}
	if ent.code != http.StatusOK {
		// Errors are not kept: ask the handler again.
		e.next.ServeHTTP(w, r)
		return
	}
	enc := accepts(r.Header.Get("Accept-Encoding"), ent.vars)
	v := ent.vars[enc]
	hd := w.Header()
	for k, vals := range ent.header {
		switch k {
		case "Content-Length", "Etag", "Last-Modified", "Content-Encoding", "Vary":
			continue
		}
		hd[k] = vals
	}
	if len(ent.vars) > 1 {
		hd.Set("Vary", "Accept-Encoding")
	}
	if enc != encIdentity {
		hd.Set("Content-Encoding", enc)
	}
	hd.Set("ETag", v.etag)
	// ServeContent answers If-None-Match with 304, HEAD without a body, and
	// sets Content-Length; a zero time sends no Last-Modified.
	http.ServeContent(w, r, "", time.Time{}, bytes.NewReader(v.body))
}
