package webapp

import (
	"context"
	"crypto/tls"
	"crypto/x509"
	"errors"
	"fmt"
	"io"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"time"
)

// WithHeaders wraps h so that every response forbids other origins
// (Content-Security-Policy), sniffing, framing and referrers; over HTTPS it
// adds Strict-Transport-Security, so that a browser that has once reached
// the app over HTTPS keeps to HTTPS for a year. It is not sent over plain
// HTTP, where browsers ignore it, nor for subdomains, which may be other
// services of the organisation.
func WithHeaders(h http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		hd := w.Header()
		hd.Set("Content-Security-Policy", ContentSecurityPolicy+"; frame-ancestors 'none'")
		hd.Set("X-Content-Type-Options", "nosniff")
		hd.Set("Referrer-Policy", "no-referrer")
		if r.TLS != nil {
			hd.Set("Strict-Transport-Security", "max-age=31536000")
		}
		h.ServeHTTP(w, r)
	})
}

// allowed is the Allow header of a 405: the app is only ever read.
const allowed = "GET, HEAD"

// Site returns everything `serve` answers: the served set (Served) with
// WithHeaders' headers, for GET and HEAD. Any other method, OPTIONS
// included, is answered 405 with Allow: GET, HEAD (the app makes no
// cross-origin requests, so no browser sends it a CORS preflight). Any
// other path is 404, a folder included: the path as sent must be one of
// Served letter for letter, so percent-encoded names, "..", doubled or
// encoded slashes, backslashes and NUL bytes never reach a file.
func Site(webDir, version string) http.Handler {
	return site(webDir, version, defaultLimits)
}

func site(webDir, version string, lim limits) http.Handler {
	h, _ := siteEncoded(webDir, version, lim)
	return h
}

// siteEncoded is site and the store of its compressed files.
func siteEncoded(webDir, version string, lim limits) (http.Handler, *encoded) {
	next := newEncoded(WithManifest(Handler(webDir, version)))
	next.made = func(p string) []byte { return madeBrotli(webDir, p) }
	return progress(lim, WithHeaders(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if r.ContentLength != 0 && r.Body != nil && r.Body != http.NoBody {
			// Nothing the app asks for carries a body. Give its sender a
			// little time (the server reads up to 256 kB of an unread body
			// after the answer) and close the connection after the answer.
			http.NewResponseController(w).SetReadDeadline(time.Now().Add(lim.body))
			if r.ProtoMajor == 1 {
				w.Header().Set("Connection", "close")
			}
		}
		if r.Method != http.MethodGet && r.Method != http.MethodHead {
			w.Header().Set("Allow", allowed)
			http.Error(w, "Method not allowed: Pairline's server is only read, with GET or HEAD.", http.StatusMethodNotAllowed)
			return
		}
		if !served[r.URL.EscapedPath()] || r.URL.Path != r.URL.EscapedPath() {
			notFound(w)
			return
		}
		next.ServeHTTP(w, r)
	}))), next
}

// limits are the server's timeouts; tests set short ones.
type limits struct {
	// readHeader: a request's header (and a TLS handshake) must arrive
	// within this. Tablets send theirs in one packet; a connection that
	// dribbles a header is dropped.
	readHeader time.Duration
	// idle: a kept-alive connection with no request is closed after this.
	idle time.Duration
	// writeStall: a response that makes no progress for this long (the
	// client stopped reading) ends its connection. Each piece of at most
	// writeChunk bytes must be accepted within it, so a client reading
	// fewer than writeChunk/writeStall bytes a second is dropped.
	writeStall time.Duration
	// writeTotal: no response takes longer than this, however it trickles.
	writeTotal time.Duration
	// body: how long a request body (never wanted) may take to arrive.
	body time.Duration
}

// defaultLimits: app.wasm is about 18.6 MB; on a weak 1.6 Mbit/s link it
// takes about 95 s, so a fixed write timeout short enough to matter would
// cut it off. Instead a response must keep moving (64 kB within 30 s, about
// 2 kB/s) and end within 10 minutes (250 kbit/s on average for app.wasm).
var defaultLimits = limits{
	readHeader: 10 * time.Second,
	idle:       60 * time.Second,
	writeStall: 30 * time.Second,
	writeTotal: 10 * time.Minute,
	body:       10 * time.Second,
}

// writeChunk is the most written under one write deadline.
const writeChunk = 64 << 10

// maxHeaderBytes is the limit on a request's header (the app's requests
// carry a few hundred bytes; Go's server adds 4 kB of slack).
const maxHeaderBytes = 32 << 10

// progress sets each response's write deadline as its bytes flow: writeStall
// from now for each piece of at most writeChunk bytes, never later than
// writeTotal after the request.
func progress(lim limits, h http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		p := &progressWriter{ResponseWriter: w, rc: http.NewResponseController(w), lim: lim, end: time.Now().Add(lim.writeTotal)}
		p.extend()
		h.ServeHTTP(p, r)
	})
}

// progressWriter is a ResponseWriter whose Write extends the write
// deadline. It has no ReadFrom, so a file is copied through Write in
// pieces (the 18 MB app.wasm is otherwise sent in one sendfile call under
// one deadline).
type progressWriter struct {
	http.ResponseWriter
	rc  *http.ResponseController
	lim limits
	end time.Time
}

func (p *progressWriter) extend() {
	d := time.Now().Add(p.lim.writeStall)
	if d.After(p.end) {
		d = p.end
	}
	p.rc.SetWriteDeadline(d) // not supported by a recorder in tests: then no deadline
}

func (p *progressWriter) WriteHeader(code int) {
	p.extend()
	p.ResponseWriter.WriteHeader(code)
}

func (p *progressWriter) Write(b []byte) (int, error) {
	n := 0
	for len(b) > 0 {
		k := min(len(b), writeChunk)
		p.extend()
		m, err := p.ResponseWriter.Write(b[:k])
		n += m
		if err != nil {
			return n, err
		}
		b = b[k:]
	}
	return n, nil
}

// Unwrap lets http.ResponseController reach the connection.
func (p *progressWriter) Unwrap() http.ResponseWriter { return p.ResponseWriter }

// ServeOptions configure Serve.
type ServeOptions struct {
	Addr    string // host:port, e.g. 127.0.0.1:8000
	WebDir  string // folder with app.wasm, stylesheets and icons
	TLSCert string // PEM certificate file; with TLSKey, serve HTTPS
	TLSKey  string
	Log     io.Writer

	limits *limits      // tests: shorter timeouts; nil is defaultLimits
	ready  func(string) // tests: told the address once listening
}

// Serve runs the app's HTTP server until ctx ends. Before it says where the
// app is served it checks everything that would make that untrue: the
// address, the web folder's files (app.wasm missing would leave the page
// loading forever, another file missing would break the offline start) and,
// for HTTPS, that the certificate and key load and belong together (an
// expired or not yet valid certificate is served with a warning: tablets
// will refuse it).
func Serve(ctx context.Context, o ServeOptions) error {
	lim := defaultLimits
	if o.limits != nil {
		lim = *o.limits
	}
	if err := checkAddr(o.Addr); err != nil {
		return err
	}
	if (o.TLSCert == "") != (o.TLSKey == "") {
		return errors.New("HTTPS needs both --tls-cert and --tls-key")
	}
	if err := checkWebDir(o.WebDir); err != nil {
		return err
	}
	handler, enc := siteEncoded(o.WebDir, "", lim)
	// brotli at quality 11 of app.wasm takes 15–60 s of one core; until a
	// file's copies are made it is served raw.
	enc.background = true
	go enc.Prepare()
	srv := &http.Server{
		Addr:              o.Addr,
		Handler:           handler,
		ReadHeaderTimeout: lim.readHeader,
		IdleTimeout:       lim.idle,
		// The deadline of a response is set as it flows (progress); this
		// bounds what is written outside a handler.
		WriteTimeout:   lim.writeTotal,
		MaxHeaderBytes: maxHeaderBytes,
		// "OPTIONS *" goes to Site too, and gets its 405.
		DisableGeneralOptionsHandler: true,
	}
	scheme := "http"
	if o.TLSCert != "" {
		scheme = "https"
		cert, warning, err := loadCert(o.TLSCert, o.TLSKey, time.Now())
		if err != nil {
			return err
		}
		if warning != "" && o.Log != nil {
			fmt.Fprintln(o.Log, "Warning:", warning)
		}
		srv.TLSConfig = &tls.Config{Certificates: []tls.Certificate{cert}, MinVersion: tls.VersionTLS12}
	}
	ln, err := net.Listen("tcp", o.Addr)
	if err != nil {
		return fmt.Errorf("cannot listen on %s: %w", o.Addr, err)
	}
	if o.Log != nil {
		fmt.Fprintf(o.Log, "Pairline is served at %s://%s (Ctrl+C stops it)\n", scheme, ln.Addr())
	}
	if o.ready != nil {
		o.ready(ln.Addr().String())
	}
	errc := make(chan error, 1)
	go func() {
		if srv.TLSConfig != nil {
			errc <- srv.ServeTLS(ln, "", "")
		} else {
			errc <- srv.Serve(ln)
		}
	}()
	select {
	case err := <-errc:
		return err
	case <-ctx.Done():
		sctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
		defer cancel()
		return srv.Shutdown(sctx)
	}
}

// checkAddr refuses an address that would not say where the app is: an
// empty one (every interface, a random port) or one without a port.
func checkAddr(addr string) error {
	const example = "for example --addr 127.0.0.1:8000 (this computer only) or --addr 0.0.0.0:8443 (the network, with HTTPS)"
	if strings.TrimSpace(addr) == "" {
		return fmt.Errorf("--addr is empty: give HOST:PORT, %s", example)
	}
	_, port, err := net.SplitHostPort(addr)
	if err != nil {
		return fmt.Errorf("--addr %q is not HOST:PORT (%v): %s", addr, err, example)
	}
	if port == "" {
		return fmt.Errorf("--addr %q has no port: %s", addr, example)
	}
	return nil
}

// loadCert loads the PEM certificate and key files and checks that they
// belong together. A certificate that is not valid at now loads, with a
// warning.
func loadCert(certFile, keyFile string, now time.Time) (tls.Certificate, string, error) {
	cert, err := tls.LoadX509KeyPair(certFile, keyFile)
	if err != nil {
		for _, f := range []string{certFile, keyFile} {
			if _, serr := os.Stat(f); serr != nil {
				return cert, "", fmt.Errorf("cannot read the TLS file %s: %w", f, serr)
			}
		}
		return cert, "", fmt.Errorf("cannot use the certificate %s with the key %s (both PEM, and the key must be the certificate's): %w", certFile, keyFile, err)
	}
	leaf := cert.Leaf
	if leaf == nil {
		if leaf, err = x509.ParseCertificate(cert.Certificate[0]); err != nil {
			return cert, "", fmt.Errorf("cannot read the certificate %s: %w", certFile, err)
		}
	}
	base := filepath.Base(certFile)
	switch {
	case now.After(leaf.NotAfter):
		return cert, fmt.Sprintf("the certificate %s expired on %s; browsers will refuse the connection until it is renewed", base, leaf.NotAfter.UTC().Format(time.DateOnly)), nil
	case now.Before(leaf.NotBefore):
		return cert, fmt.Sprintf("the certificate %s is valid only from %s; browsers will refuse the connection until then (check the computer's clock)", base, leaf.NotBefore.UTC().Format(time.DateTime)+" UTC"), nil
	}
	return cert, "", nil
}

// Build writes a self-contained static site to outDir: exactly the served
// set (Served), each file as Site answers it ("/" as index.html), and beside
// each text and wasm file its brotli (.br, quality 11) and gzip (.gz, -9)
// copies, byte for byte what `serve` sends with Content-Encoding br and
// gzip. Any static HTTPS host can serve it; one that serves precompressed
// copies sends the small ones. Other files already in outDir are left alone.
func Build(outDir, webDir string) error {
	if err := checkWebDir(webDir); err != nil {
		return err
	}
	h, enc := siteEncoded(webDir, "", defaultLimits)
	for _, p := range Served() {
		name := strings.TrimPrefix(p, "/")
		if name == "" {
			name = "index.html"
		}
		target := filepath.Join(outDir, filepath.FromSlash(name))
		if err := buildFile(h, p, target); err != nil {
			return err
		}
		ent := enc.get(p)
		for suffix, e := range map[string]string{".br": encBrotli, ".gz": encGzip} {
			v, ok := ent.vars[e]
			if !ok {
				continue
			}
			if err := os.WriteFile(target+suffix, v.body, 0o644); err != nil {
				return fmt.Errorf("writing %s: %w", target+suffix, err)
			}
		}
	}
	return nil
}

func buildFile(h http.Handler, p, target string) error {
	if err := os.MkdirAll(filepath.Dir(target), 0o755); err != nil {
		return err
	}
	f, err := os.Create(target)
	if err != nil {
		return err
	}
	code, err := fetch(h, p, f)
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err == nil && code != http.StatusOK {
		err = fmt.Errorf("%s answered %d", p, code)
	}
	if err != nil {
		return fmt.Errorf("writing %s: %w", target, err)
	}
	return nil
}

// madeBrotliMax bounds a brotli copy read from the web folder (app.wasm's is
// about 2.1 MB).
const madeBrotliMax = 64 << 20

// madeBrotli is the brotli copy of the web folder's file at URL path p
// (/web/app.wasm → app.wasm.br in webDir) when there is one, else nil. The
// copy is checked against the file before use (encoded.get).
func madeBrotli(webDir, p string) []byte {
	name, ok := strings.CutPrefix(p, "/web/")
	if !ok {
		return nil
	}
	f, info, err := openWebFile(webDir, name+".br")
	if err != nil {
		return nil
	}
	defer f.Close()
	if info.Size() > madeBrotliMax {
		return nil
	}
	b, err := io.ReadAll(io.LimitReader(f, madeBrotliMax))
	if err != nil {
		return nil
	}
	return b
}
