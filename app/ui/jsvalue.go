package ui

// JavaScript plumbing for files: Blob, object-URL download, File for sharing, Promise awaiting, reading a picked file.

import (
	"errors"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/session"
)

// download hands bytes to the browser as a file (a Blob behind an object
// URL and a temporary <a download>; blob: URLs are allowed by the CSP).
func download(name, mime string, b []byte) {
	win := app.Window()
	doc := win.Get("document")
	if !doc.Truthy() {
		return
	}
	blob := newBlob(mime, b)
	url := win.Get("URL").Call("createObjectURL", blob)
	a := doc.Call("createElement", "a")
	a.Set("href", url)
	a.Set("download", name)
	a.Set("rel", "noopener")
	doc.Get("body").Call("appendChild", a)
	a.Call("click")
	a.Call("remove")
	// Revoke once the browser has taken the file.
	win.Call("setTimeout", app.FuncOf(func(this app.Value, args []app.Value) any {
		win.Get("URL").Call("revokeObjectURL", url)
		return nil
	}), 60000)
}

func newBlob(mime string, b []byte) app.Value {
	win := app.Window()
	u8 := win.Get("Uint8Array").New(len(b))
	app.CopyBytesToJS(u8, b)
	parts := win.Get("Array").New()
	parts.Call("push", u8)
	opts := win.Get("Object").New()
	opts.Set("type", mime)
	return win.Get("Blob").New(parts, opts)
}

// fileShareData is {files: [File], title} for navigator.share.
func fileShareData(name, mime, title string, b []byte) app.Value {
	win := app.Window()
	u8 := win.Get("Uint8Array").New(len(b))
	app.CopyBytesToJS(u8, b)
	parts := win.Get("Array").New()
	parts.Call("push", u8)
	opts := win.Get("Object").New()
	opts.Set("type", mime)
	files := win.Get("Array").New()
	files.Call("push", win.Get("File").New(parts, name, opts))
	data := win.Get("Object").New()
	data.Set("files", files)
	if title != "" {
		data.Set("title", title)
	}
	return data
}

// canShareFiles reports whether navigator.share can send files here.
func canShareFiles() bool {
	nav := app.Window().Get("navigator")
	if !nav.Truthy() || !nav.Get("canShare").Truthy() || !app.Window().Get("File").Truthy() {
		return false
	}
	return nav.Call("canShare", fileShareData("probe"+session.FileExtension, session.MediaType, "", []byte{0})).Truthy()
}

// shareFile opens the device's share sheet with one file (blocks; call off
// the UI goroutine).
func shareFile(name, mime, title string, b []byte) error {
	_, err := awaitJS(app.Window().Get("navigator").Call("share", fileShareData(name, mime, title, b)))
	return err
}

// awaitJS waits for a JavaScript promise (off the UI goroutine).
func awaitJS(p app.Value) (app.Value, error) {
	done := make(chan struct{})
	var res app.Value
	var err error
	ok := app.FuncOf(func(this app.Value, args []app.Value) any {
		if len(args) > 0 {
			res = args[0]
		}
		close(done)
		return nil
	})
	bad := app.FuncOf(func(this app.Value, args []app.Value) any {
		err = errors.New("the browser refused")
		if len(args) > 0 && args[0].Truthy() {
			if m := args[0].Get("message"); m.Type() == app.TypeString && m.String() != "" {
				err = errors.New(m.String())
			}
		}
		close(done)
		return nil
	})
	defer ok.Release()
	defer bad.Release()
	p.Call("then", ok, bad)
	<-done
	return res, err
}

// readFile reads a File or Blob (off the UI goroutine).
func readFile(f app.Value) ([]byte, error) {
	buf, err := awaitJS(f.Call("arrayBuffer"))
	if err != nil {
		return nil, err
	}
	u8 := app.Window().Get("Uint8Array").New(buf)
	b := make([]byte, u8.Length())
	app.CopyBytesToGo(b, u8)
	return b, nil
}
