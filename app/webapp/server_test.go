//go:build !js

// The server tests need real sockets; the wasm build has none.

package webapp

import (
	"bufio"
	"bytes"
	"context"
	"crypto/ecdsa"
	"crypto/elliptic"
	"crypto/rand"
	"crypto/tls"
	"crypto/x509"
	"crypto/x509/pkix"
	"encoding/pem"
	"errors"
	"io"
	"math/big"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"
)

// syncBuffer is a log written by the server's goroutine and read by the test.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

// serving runs Serve on a free loopback port until the test ends and
// returns its address and log.
func serving(t *testing.T, o ServeOptions) (string, *syncBuffer) {
	t.Helper()
	log := &syncBuffer{}
	o.Log = log
	if o.Addr == "" {
		o.Addr = "127.0.0.1:0"
	}
	addr := make(chan string, 1)
	o.ready = func(a string) { addr <- a }
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan error, 1)
	go func() { done <- Serve(ctx, o) }()
	t.Cleanup(func() {
		cancel()
		if err := <-done; err != nil {
			t.Errorf("Serve: %v", err)
		}
	})
	select {
	case a := <-addr:
		return a, log
	case err := <-done:
		t.Fatalf("Serve did not start: %v", err)
	}
	return "", nil
}

// testCert writes a self-signed certificate for 127.0.0.1, valid from
// notBefore to notAfter, and its key; it returns the file names and the
// parsed certificate.
func testCert(t *testing.T, notBefore, notAfter time.Time) (certFile, keyFile string, cert *x509.Certificate) {
	t.Helper()
	key, err := ecdsa.GenerateKey(elliptic.P256(), rand.Reader)
	must(t, err)
	tmpl := &x509.Certificate{
		SerialNumber: big.NewInt(1),
		Subject:      pkix.Name{CommonName: "pairline test (invented)"},
		NotBefore:    notBefore,
		NotAfter:     notAfter,
		IPAddresses:  []net.IP{net.IPv4(127, 0, 0, 1)},
		KeyUsage:     x509.KeyUsageDigitalSignature,
		ExtKeyUsage:  []x509.ExtKeyUsage{x509.ExtKeyUsageServerAuth},
	}
	der, err := x509.CreateCertificate(rand.Reader, tmpl, tmpl, &key.PublicKey, key)
	must(t, err)
	cert, err = x509.ParseCertificate(der)
	must(t, err)
	kb, err := x509.MarshalECPrivateKey(key)
	must(t, err)
	dir := t.TempDir()
	certFile, keyFile = filepath.Join(dir, "cert.pem"), filepath.Join(dir, "key.pem")
	must(t, os.WriteFile(certFile, pem.EncodeToMemory(&pem.Block{Type: "CERTIFICATE", Bytes: der}), 0o644))
	must(t, os.WriteFile(keyFile, pem.EncodeToMemory(&pem.Block{Type: "EC PRIVATE KEY", Bytes: kb}), 0o600))
	return certFile, keyFile, cert
}

// Serve checks everything before it says where the app is served: with a
// bad address, web folder or TLS files it returns the reason and has printed
// nothing.
func TestServeChecksBeforeAnnouncing(t *testing.T) {
	web := testWeb(t)
	now := time.Now()
	cert, key, _ := testCert(t, now.Add(-time.Hour), now.Add(24*time.Hour))
	otherCert, otherKey, _ := testCert(t, now.Add(-time.Hour), now.Add(24*time.Hour))
	garbage := filepath.Join(t.TempDir(), "garbage.pem")
	writeFile(t, garbage, "-----BEGIN CERTIFICATE-----\nbm90IGEgY2VydGlmaWNhdGU=\n-----END CERTIFICATE-----\n")
	noWasm := testWeb(t)
	must(t, os.Remove(filepath.Join(noWasm, "app.wasm")))
	noCSS := testWeb(t)
	must(t, os.Remove(filepath.Join(noCSS, "report.css")))
	for _, c := range []struct {
		name string
		o    ServeOptions
		want string
	}{
		{"empty address", ServeOptions{Addr: "", WebDir: web}, "--addr is empty"},
		{"blank address", ServeOptions{Addr: "  ", WebDir: web}, "--addr is empty"},
		{"no port", ServeOptions{Addr: "127.0.0.1", WebDir: web}, "is not HOST:PORT"},
		{"empty port", ServeOptions{Addr: "127.0.0.1:", WebDir: web}, "has no port"},
		{"port in use", ServeOptions{Addr: "", WebDir: web}, "cannot listen"},
		{"no app.wasm", ServeOptions{Addr: "127.0.0.1:0", WebDir: noWasm}, "the app is not built"},
		{"no stylesheet", ServeOptions{Addr: "127.0.0.1:0", WebDir: noCSS}, "report.css is missing"},
		{"no web folder", ServeOptions{Addr: "127.0.0.1:0", WebDir: filepath.Join(web, "nothing")}, "cannot be used"},
		{"cert without key", ServeOptions{Addr: "127.0.0.1:0", WebDir: web, TLSCert: cert}, "both --tls-cert and --tls-key"},
		{"missing cert", ServeOptions{Addr: "127.0.0.1:0", WebDir: web, TLSCert: cert + ".none", TLSKey: key}, "cannot read the TLS file"},
		{"missing key", ServeOptions{Addr: "127.0.0.1:0", WebDir: web, TLSCert: cert, TLSKey: key + ".none"}, "cannot read the TLS file"},
		{"not a certificate", ServeOptions{Addr: "127.0.0.1:0", WebDir: web, TLSCert: garbage, TLSKey: key}, "cannot use the certificate"},
		{"key of another certificate", ServeOptions{Addr: "127.0.0.1:0", WebDir: web, TLSCert: cert, TLSKey: otherKey}, "cannot use the certificate"},
		{"certificate as key", ServeOptions{Addr: "127.0.0.1:0", WebDir: web, TLSCert: otherCert, TLSKey: otherCert}, "cannot use the certificate"},
	} {
		t.Run(c.name, func(t *testing.T) {
			if c.name == "port in use" {
				ln, err := net.Listen("tcp", "127.0.0.1:0")
				must(t, err)
				defer ln.Close()
				c.o.Addr = ln.Addr().String()
			}
			log := &syncBuffer{}
			c.o.Log = log
			err := Serve(context.Background(), c.o)
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %v, want %q", err, c.want)
			}
			if log.String() != "" {
				t.Errorf("printed %q before refusing", log.String())
			}
		})
	}
}

// HTTPS with a good certificate: served, with HSTS; the address printed is
// the one that answers.
func TestServeTLS(t *testing.T) {
	now := time.Now()
	certFile, keyFile, cert := testCert(t, now.Add(-time.Hour), now.Add(24*time.Hour))
	addr, log := serving(t, ServeOptions{WebDir: testWeb(t), TLSCert: certFile, TLSKey: keyFile})
	if want := "Pairline is served at https://" + addr + " "; !strings.HasPrefix(log.String(), want) {
		t.Errorf("log %q, want it to start with %q", log.String(), want)
	}
	pool := x509.NewCertPool()
	pool.AddCert(cert)
	client := &http.Client{Transport: &http.Transport{TLSClientConfig: &tls.Config{RootCAs: pool}, ForceAttemptHTTP2: true}}
	for _, p := range []string{"/", "/web/app.wasm"} {
		res, err := client.Get("https://" + addr + p)
		must(t, err)
		res.Body.Close()
		if res.StatusCode != 200 || res.Header.Get("Strict-Transport-Security") != "max-age=31536000" {
			t.Errorf("%s over %s: %d, HSTS %q", p, res.Proto, res.StatusCode, res.Header.Get("Strict-Transport-Security"))
		}
	}
	if res, err := http.Get("http://" + addr + "/"); err == nil {
		res.Body.Close()
		if res.StatusCode == 200 {
			t.Error("plain HTTP answered on the HTTPS port")
		}
	}
}

// An expired certificate, or one not valid yet, is served with a warning
// printed before the address (browsers refuse it; the technician should
// know why).
func TestServeWarnsOfCertificateDates(t *testing.T) {
	now := time.Now()
	for _, c := range []struct {
		name           string
		from, to       time.Time
		want, wantDate string
	}{
		{"expired", now.Add(-48 * time.Hour), now.Add(-24 * time.Hour), "expired on", now.Add(-24 * time.Hour).UTC().Format(time.DateOnly)},
		{"not yet valid", now.Add(24 * time.Hour), now.Add(48 * time.Hour), "is valid only from", now.Add(24 * time.Hour).UTC().Format(time.DateOnly)},
	} {
		t.Run(c.name, func(t *testing.T) {
			certFile, keyFile, _ := testCert(t, c.from, c.to)
			addr, log := serving(t, ServeOptions{WebDir: testWeb(t), TLSCert: certFile, TLSKey: keyFile})
			lines := strings.Split(log.String(), "\n")
			if !strings.HasPrefix(lines[0], "Warning: the certificate cert.pem "+c.want) || !strings.Contains(lines[0], c.wantDate) {
				t.Errorf("first line %q", lines[0])
			}
			if len(lines) < 2 || !strings.HasPrefix(lines[1], "Pairline is served at https://"+addr) {
				t.Errorf("log %q", log.String())
			}
		})
	}
	// A valid certificate: no warning.
	certFile, keyFile, _ := testCert(t, now.Add(-time.Hour), now.Add(time.Hour))
	if _, warning, err := loadCert(certFile, keyFile, now); err != nil || warning != "" {
		t.Errorf("valid certificate: %q, %v", warning, err)
	}
}

// short are timeouts small enough for a test to watch them act.
var short = limits{
	readHeader: 300 * time.Millisecond,
	idle:       300 * time.Millisecond,
	writeStall: 300 * time.Millisecond,
	writeTotal: time.Minute,
	body:       300 * time.Millisecond,
}

// closedByServer reads c until the server closes it. The safety deadline is
// far beyond the timeouts under test; reaching it means the server kept the
// connection.
func closedByServer(t *testing.T, c net.Conn) []byte {
	t.Helper()
	c.SetReadDeadline(time.Now().Add(20 * time.Second))
	b, err := io.ReadAll(c)
	var ne net.Error
	if errors.As(err, &ne) && ne.Timeout() {
		t.Fatalf("the server kept the connection open (read %d bytes)", len(b))
	}
	if err != nil && !errors.Is(err, syscall.ECONNRESET) {
		t.Fatalf("reading: %v", err)
	}
	return b
}

func dial(t *testing.T, addr string) net.Conn {
	t.Helper()
	c, err := net.Dial("tcp", addr)
	must(t, err)
	t.Cleanup(func() { c.Close() })
	return c
}

// A client that sends part of a header and then nothing is dropped after
// readHeader; one that keeps a connection idle after an answer is dropped
// after idle; one that announces a body and never sends it gets its 405 and
// is dropped after body.
func TestSlowClientsAreDropped(t *testing.T) {
	addr, _ := serving(t, ServeOptions{WebDir: testWeb(t), limits: &short})

	t.Run("partial header", func(t *testing.T) {
		c := dial(t, addr)
		io.WriteString(c, "GET / HTTP/1.1\r\nHost: tablet\r\nUser-Agent: slow")
		if b := closedByServer(t, c); len(b) != 0 && !strings.HasPrefix(string(b), "HTTP/1.1 408") {
			t.Errorf("answer to a partial header: %q", b)
		}
	})
	t.Run("idle keep-alive", func(t *testing.T) {
		c := dial(t, addr)
		io.WriteString(c, "GET /app.css HTTP/1.1\r\nHost: tablet\r\n\r\n")
		res, err := http.ReadResponse(bufio.NewReader(c), nil)
		must(t, err)
		io.Copy(io.Discard, res.Body)
		if res.StatusCode != 200 || res.Close {
			t.Fatalf("status %d, close %v", res.StatusCode, res.Close)
		}
		closedByServer(t, c)
	})
	t.Run("body never sent", func(t *testing.T) {
		c := dial(t, addr)
		io.WriteString(c, "PUT /web/app.wasm HTTP/1.1\r\nHost: tablet\r\nContent-Length: 100000\r\n\r\n")
		b := closedByServer(t, c)
		if !strings.HasPrefix(string(b), "HTTP/1.1 405 ") || !strings.Contains(string(b), "Allow: GET, HEAD") {
			t.Errorf("answer %q", b)
		}
	})
	t.Run("GET with a trickled body", func(t *testing.T) {
		c := dial(t, addr)
		io.WriteString(c, "GET / HTTP/1.1\r\nHost: tablet\r\nContent-Length: 1000\r\n\r\nx")
		if b := closedByServer(t, c); !strings.HasPrefix(string(b), "HTTP/1.1 200 ") {
			t.Errorf("answer %.100q", b)
		}
	})
	t.Run("OPTIONS *", func(t *testing.T) {
		c := dial(t, addr)
		io.WriteString(c, "OPTIONS * HTTP/1.1\r\nHost: tablet\r\nConnection: close\r\n\r\n")
		if b := closedByServer(t, c); !strings.HasPrefix(string(b), "HTTP/1.1 405 ") {
			t.Errorf("answer %.100q", b)
		}
	})
}

// bigWeb is a web folder whose app.wasm (size bytes) is larger than what
// the loopback's socket buffers hold, so a client that does not read makes
// the server's writes wait.
func bigWeb(t *testing.T, size int) string {
	t.Helper()
	web := testWeb(t)
	b := make([]byte, size)
	copy(b, "\x00asm\x01\x00\x00\x00")
	must(t, os.WriteFile(filepath.Join(web, "app.wasm"), b, 0o644))
	return web
}

// smallWindow dials addr with a small receive buffer, so the server's
// writes wait on this client's reading sooner.
func smallWindow(t *testing.T, addr string) net.Conn {
	t.Helper()
	d := net.Dialer{Control: func(_, _ string, rc syscall.RawConn) error {
		return rc.Control(func(fd uintptr) {
			syscall.SetsockoptInt(int(fd), syscall.SOL_SOCKET, syscall.SO_RCVBUF, 32<<10)
		})
	}}
	c, err := d.Dial("tcp", addr)
	must(t, err)
	t.Cleanup(func() { c.Close() })
	return c
}

const bigSize = 24 << 20

// A client that stops reading app.wasm is dropped once the writes stall for
// writeStall: after a pause of several times writeStall it gets only part
// of the file.
func TestStalledReaderIsDropped(t *testing.T) {
	addr, _ := serving(t, ServeOptions{WebDir: bigWeb(t, bigSize), limits: &short})
	c := smallWindow(t, addr)
	io.WriteString(c, "GET /web/app.wasm HTTP/1.1\r\nHost: tablet\r\n\r\n")
	time.Sleep(10 * short.writeStall)
	b := closedByServer(t, c)
	if !strings.HasPrefix(string(b), "HTTP/1.1 200 ") {
		t.Fatalf("answer %.100q", b)
	}
	if len(b) >= bigSize {
		t.Errorf("the stalled client got all %d bytes", len(b))
	}
	t.Logf("the stalled client got %d of %d bytes", len(b), bigSize)
}

// A slow client that keeps reading gets the whole of app.wasm although the
// download lasts many times writeStall: the write deadline moves with the
// bytes (a fixed WriteTimeout would cut a tablet's 95 s download).
func TestSlowSteadyReaderGetsTheFile(t *testing.T) {
	lim := short
	lim.writeStall = time.Second
	const size = 16 << 20
	addr, _ := serving(t, ServeOptions{WebDir: bigWeb(t, size), limits: &lim})
	c := smallWindow(t, addr)
	io.WriteString(c, "GET /web/app.wasm HTTP/1.1\r\nHost: tablet\r\nConnection: close\r\n\r\n")
	c.SetReadDeadline(time.Now().Add(2 * time.Minute))
	r := bufio.NewReaderSize(c, 64<<10)
	res, err := http.ReadResponse(r, nil)
	must(t, err)
	// Pauses of a tenth of writeStall between reads of 512 kB: 32 pauses,
	// so the download takes over 3 writeStalls. (Linux wakes a blocked
	// write once half of the send buffer has drained; on loopback that
	// buffer grows to 4 MB, so 4 reads must fit in a writeStall.)
	var got int64
	for {
		time.Sleep(lim.writeStall / 10)
		n, err := io.CopyN(io.Discard, res.Body, 512<<10)
		got += n
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("after %d bytes: %v", got, err)
		}
	}
	if got != size {
		t.Errorf("got %d bytes, want %d", got, size)
	}
}

// Odd request targets sent over a real connection get 400 (refused by Go's
// parser) or 404, never 500 or a file.
func TestOddTargetsOnTheWire(t *testing.T) {
	addr, _ := serving(t, ServeOptions{WebDir: testWeb(t), limits: &short})
	for _, target := range []string{
		"/web/" + strings.Repeat("a", 256),
		"/web/" + strings.Repeat("a", 4000),
		"/web/app.wasm%00",
		"/web/app.wasm\x00",
		"/web\\app.wasm",
		"/web/..\\..\\etc\\passwd",
		"/web/%2e%2e/%2e%2e/etc/passwd",
		"/web/../../etc/passwd",
		"/web%2fapp.wasm",
		"/web/",
		"http://elsewhere.invalid/robots.txt",
	} {
		c := dial(t, addr)
		io.WriteString(c, "GET "+target+" HTTP/1.1\r\nHost: tablet\r\nConnection: close\r\n\r\n")
		b := closedByServer(t, c)
		status, _, _ := strings.Cut(string(b), "\r\n")
		if status != "HTTP/1.1 404 Not Found" && status != "HTTP/1.1 400 Bad Request" {
			t.Errorf("GET %.60q: %q", target, status)
		}
	}
}
