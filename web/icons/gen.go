//go:build ignore

// gen draws Pairline's own icons: a deep-teal tile with a rising straight
// line through five reading dots. Run with `go run web/icons/gen.go` from the
// repository root; it writes icon-192.png, icon-512.png, maskable-512.png
// (content kept inside the 80 % safe zone) and icon.svg.
package main

import (
	"fmt"
	"image"
	"image/color"
	"image/png"
	"math"
	"os"
)

var (
	bg   = color.RGBA{0x0b, 0x4f, 0x5c, 0xff}
	line = color.RGBA{0xff, 0xd1, 0x4a, 0xff}
	dot  = color.RGBA{0xff, 0xff, 0xff, 0xff}
)

// points are in a unit square (0,0 top-left).
var points = [][2]float64{{0.18, 0.74}, {0.34, 0.62}, {0.5, 0.52}, {0.66, 0.36}, {0.82, 0.27}}

func main() {
	write("web/icons/icon-192.png", draw(192, 1.0, true))
	write("web/icons/icon-512.png", draw(512, 1.0, true))
	write("web/icons/maskable-512.png", draw(512, 0.72, false))
	svg := `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 100 100">` +
		`<rect width="100" height="100" rx="18" fill="#0b4f5c"/>` +
		`<line x1="12" y1="80" x2="88" y2="22" stroke="#ffd14a" stroke-width="6" stroke-linecap="round"/>`
	for _, p := range points {
		svg += fmt.Sprintf(`<circle cx="%.0f" cy="%.0f" r="6.5" fill="#fff"/>`, p[0]*100, p[1]*100)
	}
	svg += "</svg>\n"
	if err := os.WriteFile("web/icons/icon.svg", []byte(svg), 0o644); err != nil {
		panic(err)
	}
}

func write(path string, img image.Image) {
	f, err := os.Create(path)
	if err != nil {
		panic(err)
	}
	defer f.Close()
	if err := png.Encode(f, img); err != nil {
		panic(err)
	}
}

// draw renders at size×size with 4×4 supersampling. scale shrinks the
// drawing towards the centre (for the maskable safe zone); rounded gives the
// tile rounded corners and a transparent outside.
func draw(size int, scale float64, rounded bool) image.Image {
	img := image.NewRGBA(image.Rect(0, 0, size, size))
	const ss = 4
	for py := 0; py < size; py++ {
		for px := 0; px < size; px++ {
			var r, g, b, a float64
			for sy := 0; sy < ss; sy++ {
				for sx := 0; sx < ss; sx++ {
					u := (float64(px) + (float64(sx)+0.5)/ss) / float64(size)
					v := (float64(py) + (float64(sy)+0.5)/ss) / float64(size)
					c := sample(u, v, scale, rounded)
					r += float64(c.R)
					g += float64(c.G)
					b += float64(c.B)
					a += float64(c.A)
				}
			}
			n := float64(ss * ss)
			img.SetRGBA(px, py, color.RGBA{uint8(r / n), uint8(g / n), uint8(b / n), uint8(a / n)})
		}
	}
	return img
}

func sample(u, v, scale float64, rounded bool) color.RGBA {
	if rounded && !insideRounded(u, v, 0.18) {
		return color.RGBA{}
	}
	// map into the drawing's own unit square
	du := (u-0.5)/scale + 0.5
	dv := (v-0.5)/scale + 0.5
	for _, p := range points {
		if math.Hypot(du-p[0], dv-p[1]) < 0.065 {
			return dot
		}
	}
	if segDist(du, dv, 0.12, 0.80, 0.88, 0.22) < 0.03 {
		return line
	}
	return bg
}

func insideRounded(u, v, r float64) bool {
	cx := math.Max(r, math.Min(1-r, u))
	cy := math.Max(r, math.Min(1-r, v))
	return math.Hypot(u-cx, v-cy) <= r
}

func segDist(px, py, ax, ay, bx, by float64) float64 {
	dx, dy := bx-ax, by-ay
	t := ((px-ax)*dx + (py-ay)*dy) / (dx*dx + dy*dy)
	t = math.Max(0, math.Min(1, t))
	return math.Hypot(px-(ax+t*dx), py-(ay+t*dy))
}
