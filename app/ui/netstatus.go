package ui

import (
	"github.com/maxence-charriere/go-app/v10/pkg/app"
)

// netUI says whether the device is on the network and whether Pairline
// runs installed (its own window, display-mode standalone). Both matter in
// the field: offline, everything still works and is saved on the device,
// but a share or an update waits; not installed, the browser may clear the
// stored sessions sooner and the app needs its tab.
type netUI struct {
	offline   bool // zero value online: the prerendered page says nothing alarming
	installed bool
	watching  bool
}

// watch reads both states and follows the browser's online and offline
// events and the display mode (natively, Window is a no-op: online, not
// installed); dispatch runs a change on the UI goroutine (the Shell's).
func (n *netUI) watch(dispatch func(func(app.Context))) {
	win := app.Window()
	nav := win.Get("navigator")
	if !nav.Truthy() || n.watching {
		return
	}
	n.watching = true
	n.offline = !nav.Get("onLine").Bool()
	n.installed = netStandalone()
	on := func(offline bool) app.Func {
		return app.FuncOf(func(this app.Value, args []app.Value) any {
			dispatch(func(ctx app.Context) { n.offline = offline })
			return nil
		})
	}
	win.Call("addEventListener", "online", on(false))
	win.Call("addEventListener", "offline", on(true))
	if mq := win.Call("matchMedia", "(display-mode: standalone)"); mq.Truthy() {
		mq.Call("addEventListener", "change", app.FuncOf(func(this app.Value, args []app.Value) any {
			dispatch(func(ctx app.Context) { n.installed = netStandalone() })
			return nil
		}))
	}
}

// OnAppInstallChange is called by go-app when the app is installed or
// removed.
func (c *Shell) OnAppInstallChange(ctx app.Context) {
	c.net.installed = netStandalone()
}

// netStandalone: the page runs in the installed app's own window.
func netStandalone() bool {
	win := app.Window()
	if nav := win.Get("navigator"); nav.Truthy() && nav.Get("standalone").Truthy() {
		return true // Safari on iOS and iPadOS
	}
	mq := win.Call("matchMedia", "(display-mode: standalone)")
	return mq.Truthy() && mq.Get("matches").Bool()
}

// netWords are the two short lines shown in the tools strip, and the hint
// behind the install line (its title, read out with it).
func netWords(online, installed bool) (net, inst, hint string) {
	net = "Online"
	if !online {
		net = "Offline: working on this device"
	}
	inst, hint = "Installed", "Pairline runs in its own window and keeps working without the network."
	if !installed {
		inst = "In the browser"
		hint = "To keep Pairline on this device, open the browser menu and choose Install or Add to Home screen once, while online."
	}
	return net, inst, hint
}

// render draws the network and install states.
func (n *netUI) render() app.UI {
	net, inst, hint := netWords(!n.offline, n.installed)
	return app.Div().Class("pl-net").Body(
		app.Span().Class("pl-net-state").DataSet("testid", "net-status").
			DataSet("state", pick(n.offline, "offline", "online")).
			Attr("role", "status").Text(net),
		app.Span().Class("pl-net-inst").DataSet("testid", "install-status").
			DataSet("state", pick(n.installed, "installed", "browser")).
			Attr("title", hint).Body(
			app.Span().Text(inst),
			app.If(!n.installed, func() app.UI {
				return anSpanText("pl-net-hint", " · menu › Install")
			}),
		),
	)
}
