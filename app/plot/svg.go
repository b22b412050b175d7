package plot

import (
	"html"
	"math"
	"strconv"
	"strings"
)

// Marker is the shape a point is drawn with. Shapes differ, not only
// colours, so that a print in black and white or a colour-blind reader
// still tells them apart.
type Marker int

// The markers.
const (
	Dot          Marker = iota // a reading used in the fit: filled circle
	Flagged                    // an influential reading: filled diamond, drawn larger
	HollowSquare               // a reading left out of the fit: hollow square with its centre open
)

// Point is one marker. Row is the reading's index in the session (from 0),
// written as data-row so that a tap can find the reading.
type Point struct {
	X, Y     float64
	Row      int
	Marker   Marker
	Selected bool
}

// Band is a filled area between Lo and Hi over X (confidence or prediction
// band). Points with a non-finite value are skipped.
type Band struct {
	X, Lo, Hi []float64
	Class     string
	Fill      string // presentation colour, overridable by CSS through Class
}

// Path is a polyline through (X[i], Y[i]).
type Path struct {
	X, Y   []float64
	Class  string
	Stroke string
	Width  float64
	Dash   string // stroke-dasharray, "" for solid
}

// Chart is one plot. Width and Height are the viewBox size (the SVG scales
// to its container; 400×300 when zero, small enough that the text stays
// readable on a phone). XRange/YRange fix the axes; nil
// fits them to the data with a little margin.
type Chart struct {
	TestID string // data-testid of the svg element
	Label  string // aria-label: a one-sentence summary for screen readers
	XTitle string // axis titles: quantity and unit
	YTitle string
	Width  float64
	Height float64
	XRange *Range
	YRange *Range
	Bands  []Band
	Paths  []Path
	Points []Point
	// HLines are horizontal reference lines (for example zero on a
	// residual plot).
	HLines []float64
	// Attrs are extra attributes written on the svg element, in order
	// (name, value pairs), e.g. data-n.
	Attrs [][2]string
}

// Layout in viewBox units.
const (
	marginLeft   = 66.0
	marginRight  = 14.0
	marginTop    = 12.0
	marginBottom = 54.0
	fontSize     = 15.0
	tickFont     = 14
)

// Colours used as presentation attributes; the app's stylesheets override
// them per theme through the classes, a saved report keeps them.
const (
	inkColour   = "#101418"
	gridColour  = "#d5d9dc"
	lineColour  = "#0b4f5c"
	ciColour    = "#7fb4c0"
	piColour    = "#d3e6ea"
	flagColour  = "#9b1c1c"
	paperColour = "#ffffff"
)

// num writes a coordinate with one decimal at most (a tenth of a viewBox
// unit is far below a screen pixel), without the cost of a general float
// formatter: plots of thousands of points are drawn on every edit.
func num(v float64) string {
	if !finite(v) || math.Abs(v) > 1e12 {
		if finite(v) {
			return strconv.FormatFloat(v, 'f', 0, 64)
		}
		return "0"
	}
	t := int64(math.Round(v * 10))
	neg := t < 0
	if neg {
		t = -t
	}
	var buf [24]byte
	i := len(buf)
	if d := t % 10; d != 0 {
		i--
		buf[i] = byte('0' + d)
		i--
		buf[i] = '.'
	}
	t /= 10
	for {
		i--
		buf[i] = byte('0' + t%10)
		t /= 10
		if t == 0 {
			break
		}
	}
	if neg && string(buf[i:]) != "0" {
		i--
		buf[i] = '-'
	}
	return string(buf[i:])
}

// SVG returns the chart as one <svg> element.
func (c *Chart) SVG() string {
	w, h := c.Width, c.Height
	if !(w > 0) {
		w = 400
	}
	if !(h > 0) {
		h = 300
	}
	xr, yr := c.ranges()
	sx := Scale{D: xr, P0: marginLeft, P1: w - marginRight}
	sy := Scale{D: yr, P0: h - marginBottom, P1: marginTop}
	var b strings.Builder
	b.Grow(4096 + 64*len(c.Points))
	b.WriteString(`<svg xmlns="http://www.w3.org/2000/svg" class="pl-plot-svg" viewBox="0 0 `)
	b.WriteString(num(w) + " " + num(h) + `" role="img"`)
	if c.TestID != "" {
		b.WriteString(` data-testid="` + esc(c.TestID) + `"`)
	}
	b.WriteString(` aria-label="` + esc(c.Label) + `"`)
	for _, a := range c.Attrs {
		b.WriteString(" " + esc(a[0]) + `="` + esc(a[1]) + `"`)
	}
	b.WriteString(` font-family="system-ui, sans-serif" font-size="` + num(fontSize) + `">`)
	b.WriteString(`<title>` + esc(c.Label) + `</title>`)
	// Plot area.
	b.WriteString(`<rect class="pl-plot-area" x="` + num(marginLeft) + `" y="` + num(marginTop) + `" width="` +
		num(w-marginLeft-marginRight) + `" height="` + num(h-marginTop-marginBottom) + `" fill="` + paperColour + `" stroke="` + inkColour + `" stroke-width="1.2"/>`)
	// Grid and ticks.
	xt, yt := Ticks(xr, 6), Ticks(yr, 6)
	xstep, ystep := NiceStep(xr.Span(), 6), NiceStep(yr.Span(), 6)
	b.WriteString(`<g class="pl-plot-grid" stroke="` + gridColour + `" stroke-width="1">`)
	for _, v := range xt {
		x := num(sx.At(v))
		b.WriteString(`<line x1="` + x + `" x2="` + x + `" y1="` + num(marginTop) + `" y2="` + num(h-marginBottom) + `"/>`)
	}
	for _, v := range yt {
		y := num(sy.At(v))
		b.WriteString(`<line x1="` + num(marginLeft) + `" x2="` + num(w-marginRight) + `" y1="` + y + `" y2="` + y + `"/>`)
	}
	b.WriteString(`</g>`)
	b.WriteString(`<g class="pl-plot-text" fill="` + inkColour + `" font-size="` + num(tickFont) + `">`)
	for _, v := range xt {
		b.WriteString(`<text x="` + num(sx.At(v)) + `" y="` + num(h-marginBottom+18) + `" text-anchor="middle">` + esc(TickLabel(v, xstep)) + `</text>`)
	}
	for _, v := range yt {
		b.WriteString(`<text x="` + num(marginLeft-6) + `" y="` + num(sy.At(v)+4.5) + `" text-anchor="end">` + esc(TickLabel(v, ystep)) + `</text>`)
	}
	b.WriteString(`</g>`)
	// Axis titles.
	b.WriteString(`<g class="pl-plot-text" fill="` + inkColour + `" font-weight="600">`)
	b.WriteString(`<text x="` + num((marginLeft+w-marginRight)/2) + `" y="` + num(h-10) + `" text-anchor="middle">` + esc(c.XTitle) + `</text>`)
	b.WriteString(`<text transform="translate(15 ` + num((marginTop+h-marginBottom)/2) + `) rotate(-90)" text-anchor="middle">` + esc(c.YTitle) + `</text>`)
	b.WriteString(`</g>`)
	// Clip the data to the plot area.
	b.WriteString(`<clipPath id="` + c.clipID() + `"><rect x="` + num(marginLeft) + `" y="` + num(marginTop) + `" width="` +
		num(w-marginLeft-marginRight) + `" height="` + num(h-marginTop-marginBottom) + `"/></clipPath>`)
	b.WriteString(`<g clip-path="url(#` + c.clipID() + `)">`)
	for _, bd := range c.Bands {
		writeBand(&b, bd, sx, sy)
	}
	for _, v := range c.HLines {
		y := num(sy.At(v))
		b.WriteString(`<line class="pl-plot-ref" x1="` + num(marginLeft) + `" x2="` + num(w-marginRight) + `" y1="` + y + `" y2="` + y + `" stroke="` + inkColour + `" stroke-width="1.5" stroke-dasharray="6 4"/>`)
	}
	for _, p := range c.Paths {
		writePath(&b, p, sx, sy)
	}
	b.WriteString(`</g>`)
	writePoints(&b, c.Points, sx, sy)
	b.WriteString(`</svg>`)
	return b.String()
}

// clipID is unique per chart on a page (charts differ by test id).
func (c *Chart) clipID() string {
	id := "pl-clip-" + c.TestID
	return strings.Map(func(r rune) rune {
		if r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '-' {
			return r
		}
		return '-'
	}, id)
}

func (c *Chart) ranges() (Range, Range) {
	var xs, ys []float64
	for _, p := range c.Points {
		xs, ys = append(xs, p.X), append(ys, p.Y)
	}
	for _, bd := range c.Bands {
		xs = append(xs, bd.X...)
		ys = append(ys, bd.Lo...)
		ys = append(ys, bd.Hi...)
	}
	for _, p := range c.Paths {
		xs, ys = append(xs, p.X...), append(ys, p.Y...)
	}
	ys = append(ys, c.HLines...)
	xr, ok := Extent(xs)
	if !ok {
		xr = Range{0, 1}
	}
	yr, ok := Extent(ys)
	if !ok {
		yr = Range{0, 1}
	}
	xr, yr = xr.Pad(0.04), yr.Pad(0.06)
	if c.XRange != nil && c.XRange.Span() > 0 {
		xr = *c.XRange
	}
	if c.YRange != nil && c.YRange.Span() > 0 {
		yr = *c.YRange
	}
	return xr, yr
}

func writeBand(b *strings.Builder, bd Band, sx, sy Scale) {
	var up, down []string
	for i := range bd.X {
		if i >= len(bd.Lo) || i >= len(bd.Hi) || !finite(bd.X[i]) || !finite(bd.Lo[i]) || !finite(bd.Hi[i]) {
			continue
		}
		x := num(sx.At(bd.X[i]))
		up = append(up, x+","+num(sy.At(bd.Hi[i])))
		down = append(down, x+","+num(sy.At(bd.Lo[i])))
	}
	if len(up) < 2 {
		return
	}
	for i, j := 0, len(down)-1; i < j; i, j = i+1, j-1 {
		down[i], down[j] = down[j], down[i]
	}
	fill := bd.Fill
	if fill == "" {
		fill = piColour
	}
	b.WriteString(`<polygon class="` + esc(bd.Class) + `" fill="` + esc(fill) + `" stroke="none" points="` +
		strings.Join(up, " ") + " " + strings.Join(down, " ") + `"/>`)
}

func writePath(b *strings.Builder, p Path, sx, sy Scale) {
	var pts []string
	for i := range p.X {
		if i >= len(p.Y) || !finite(p.X[i]) || !finite(p.Y[i]) {
			continue
		}
		pts = append(pts, num(sx.At(p.X[i]))+","+num(sy.At(p.Y[i])))
	}
	if len(pts) < 2 {
		return
	}
	stroke, width := p.Stroke, p.Width
	if stroke == "" {
		stroke = lineColour
	}
	if !(width > 0) {
		width = 2.5
	}
	b.WriteString(`<polyline class="` + esc(p.Class) + `" fill="none" stroke="` + esc(stroke) + `" stroke-width="` + num(width) + `"`)
	if p.Dash != "" {
		b.WriteString(` stroke-dasharray="` + esc(p.Dash) + `"`)
	}
	b.WriteString(` stroke-linejoin="round" points="` + strings.Join(pts, " ") + `"/>`)
}

// writePoints draws the markers. Every marker carries a wide transparent
// stroke, so a gloved finger finds it (about 20 viewBox units across).
func writePoints(b *strings.Builder, pts []Point, sx, sy Scale) {
	b.WriteString(`<g class="pl-plot-points" stroke="transparent" stroke-width="14" fill="` + inkColour + `">`)
	var sel *Point
	for i := range pts {
		p := &pts[i]
		if !finite(p.X) || !finite(p.Y) {
			continue
		}
		x, y := sx.At(p.X), sy.At(p.Y)
		row := strconv.Itoa(p.Row)
		switch p.Marker {
		case Flagged:
			d := 7.5
			b.WriteString(`<path class="pl-pt pl-pt-flag" data-row="` + row + `" fill="` + flagColour + `" d="M` + num(x) + " " + num(y-d) +
				"L" + num(x+d) + " " + num(y) + "L" + num(x) + " " + num(y+d) + "L" + num(x-d) + " " + num(y) + `Z"/>`)
		case HollowSquare:
			s := 5.5
			b.WriteString(`<g class="pl-pt pl-pt-excl" data-row="` + row + `"><circle cx="` + num(x) + `" cy="` + num(y) + `" r="9" fill="transparent"/>` +
				`<rect x="` + num(x-s) + `" y="` + num(y-s) + `" width="` + num(2*s) + `" height="` + num(2*s) + `" fill="` + paperColour + `" stroke="` + inkColour + `" stroke-width="2"/></g>`)
		default:
			b.WriteString(`<circle data-row="` + row + `" cx="` + num(x) + `" cy="` + num(y) + `" r="4.5"/>`)
		}
		if p.Selected {
			sel = p
		}
	}
	b.WriteString(`</g>`)
	if sel != nil {
		b.WriteString(`<circle class="pl-pt-selected" data-row="` + strconv.Itoa(sel.Row) + `" cx="` + num(sx.At(sel.X)) + `" cy="` + num(sy.At(sel.Y)) +
			`" r="12" fill="none" stroke="` + lineColour + `" stroke-width="3"/>`)
	}
}

// esc escapes text for XML and drops what XML 1.0 cannot hold (control
// characters, invalid UTF-8), so that any title a technician types gives
// well-formed markup.
func esc(s string) string {
	clean := strings.Map(func(r rune) rune {
		switch {
		case r == '\t' || r == '\n' || r == '\r':
			return ' '
		case r < 0x20, r >= 0xD800 && r <= 0xDFFF, r == 0xFFFE, r == 0xFFFF:
			return -1
		}
		return r
	}, strings.ToValidUTF8(s, ""))
	return html.EscapeString(clean)
}
