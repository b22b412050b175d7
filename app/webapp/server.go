package webapp

import (
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// WithHeaders wraps h so that every response forbids other origins
// (Content-Security-Policy), sniffing and framing, and serves the session
// file type and the manifest with their media types.
func WithHeaders(h http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		hd := w.Header()
		hd.Set("Content-Security-Policy", ContentSecurityPolicy+"; frame-ancestors 'none'")
		hd.Set("X-Content-Type-Options", "nosniff")
		hd.Set("Referrer-Policy", "no-referrer")
		if strings.HasSuffix(r.URL.Path, ".wasm") {
			hd.Set("Content-Type", "application/wasm")
		}
		h.ServeHTTP(w, r)
	})
}

// ServeOptions configure Serve.
type ServeOptions struct {
	Addr    string // host:port, e.g. 127.0.0.1:8000
	WebDir  string // folder with app.wasm, stylesheet and icons
	TLSCert string // PEM certificate file; with TLSKey, serve HTTPS
	TLSKey  string
	Log     io.Writer
}

// Serve runs the app's HTTP server until ctx ends. It refuses to start when
// app.wasm is missing, because the page would then load forever.
func Serve(ctx context.Context, o ServeOptions) error {
	if _, err := os.Stat(filepath.Join(o.WebDir, "app.wasm")); err != nil {
		return fmt.Errorf("the app is not built: %s is missing (run `make run` or `make wasm` first)", filepath.Join(o.WebDir, "app.wasm"))
	}
	if (o.TLSCert == "") != (o.TLSKey == "") {
		return errors.New("HTTPS needs both --tls-cert and --tls-key")
	}
	srv := &http.Server{
		Addr:              o.Addr,
		Handler:           WithHeaders(WithManifest(Handler(o.WebDir, ""))),
		ReadHeaderTimeout: 10 * time.Second,
	}
	ln, err := net.Listen("tcp", o.Addr)
	if err != nil {
		return fmt.Errorf("cannot listen on %s: %w", o.Addr, err)
	}
	scheme := "http"
	if o.TLSCert != "" {
		scheme = "https"
	}
	if o.Log != nil {
		fmt.Fprintf(o.Log, "Pairline is served at %s://%s (Ctrl+C stops it)\n", scheme, ln.Addr())
	}
	errc := make(chan error, 1)
	go func() {
		if o.TLSCert != "" {
			errc <- srv.ServeTLS(ln, o.TLSCert, o.TLSKey)
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

// Build writes a self-contained static site to outDir: the prerendered
// pages, go-app's scripts and manifest, the service worker, and a copy of
// webDir under outDir/web. Any static HTTPS host can serve it.
func Build(outDir, webDir string) error {
	if _, err := os.Stat(filepath.Join(webDir, "app.wasm")); err != nil {
		return fmt.Errorf("the app is not built: %s is missing", filepath.Join(webDir, "app.wasm"))
	}
	if err := os.MkdirAll(outDir, 0o755); err != nil {
		return err
	}
	h := Handler(webDir, "")
	if err := app.GenerateStaticWebsite(outDir, h); err != nil {
		return err
	}
	if err := writeManifest(outDir, h); err != nil {
		return err
	}
	return copyTree(filepath.Join(outDir, "web"), webDir)
}

func copyTree(dst, src string) error {
	return filepath.WalkDir(src, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(src, path)
		target := filepath.Join(dst, rel)
		if d.IsDir() {
			return os.MkdirAll(target, 0o755)
		}
		if filepath.Ext(path) == ".go" {
			return nil
		}
		in, err := os.Open(path)
		if err != nil {
			return err
		}
		defer in.Close()
		out, err := os.Create(target)
		if err != nil {
			return err
		}
		if _, err := io.Copy(out, in); err != nil {
			out.Close()
			return err
		}
		return out.Close()
	})
}
