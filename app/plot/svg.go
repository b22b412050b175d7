package plot

import (
	"html"
	"math"
	"strconv"
	"strings"

	"pairline/app/wording"
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

// Point is one marker. Row is the reading's index in the session (from 0):
// Draw returns it with the marker's position so that a tap can find the
// reading, and flagged and left-out markers carry it as data-row.
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
	var buf [24]byte
	return string(appendNum(buf[:0], v))
}

// appendNum appends num(v) to dst.
func appendNum(dst []byte, v float64) []byte {
	if !finite(v) || math.Abs(v) > 1e12 {
		if finite(v) {
			return strconv.AppendFloat(dst, v, 'f', 0, 64)
		}
		return append(dst, '0')
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
	return append(dst, buf[i:]...)
}

// SVG returns the chart as one <svg> element.
func (c *Chart) SVG() string {
	s, _ := c.Draw()
	return s
}

// Size returns the viewBox width and height (400×300 when not set).
func (c *Chart) Size() (w, h float64) {
	w, h = c.Width, c.Height
	if !(w > 0) {
		w = 400
	}
	if !(h > 0) {
		h = 300
	}
	return w, h
}

// Draw returns the chart as one <svg> element and where each finite point
// was drawn. The svg's data-frame holds its two scales (data range, then
// viewBox interval, x then y; see Scale) at full precision, so that a test
// can tap a reading where it is drawn.
func (c *Chart) Draw() (string, []Mark) {
	w, h := c.Size()
	xr, yr := c.ranges()
	sx := Scale{D: xr, P0: marginLeft, P1: w - marginRight}
	sy := Scale{D: yr, P0: h - marginBottom, P1: marginTop}
	var b strings.Builder
	b.Grow(4096 + 20*len(c.Points))
	b.WriteString(`<svg xmlns="http://www.w3.org/2000/svg" class="pl-plot-svg" viewBox="0 0 `)
	b.WriteString(num(w) + " " + num(h) + `" role="img"`)
	if c.TestID != "" {
		b.WriteString(` data-testid="` + esc(c.TestID) + `"`)
	}
	b.WriteString(` aria-label="` + esc(c.Label) + `"`)
	for _, a := range c.Attrs {
		b.WriteString(" " + esc(a[0]) + `="` + esc(a[1]) + `"`)
	}
	g := func(v float64) string {
		if !finite(v) {
			return "0"
		}
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	b.WriteString(` data-frame="` + g(sx.D.Lo) + " " + g(sx.D.Hi) + " " + g(sx.P0) + " " + g(sx.P1) + " " +
		g(sy.D.Lo) + " " + g(sy.D.Hi) + " " + g(sy.P0) + " " + g(sy.P1) + `"`)
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
	marks := writePoints(&b, c.Points, sx, sy)
	b.WriteString(`</svg>`)
	return b.String(), marks
}

// extent gathers the range of the finite values added.
type extent struct {
	r  Range
	ok bool
}

func (e *extent) add(v float64) {
	if !finite(v) {
		return
	}
	if !e.ok {
		e.r, e.ok = Range{v, v}, true
		return
	}
	if v < e.r.Lo {
		e.r.Lo = v
	}
	if v > e.r.Hi {
		e.r.Hi = v
	}
}

func (e *extent) addAll(vs []float64) {
	for _, v := range vs {
		e.add(v)
	}
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
	// The extents of every finite value drawn (Extent's rule), without
	// gathering them first: this runs for thousands of points per edit.
	var xe, ye extent
	for i := range c.Points {
		xe.add(c.Points[i].X)
		ye.add(c.Points[i].Y)
	}
	for _, bd := range c.Bands {
		xe.addAll(bd.X)
		ye.addAll(bd.Lo)
		ye.addAll(bd.Hi)
	}
	for _, p := range c.Paths {
		xe.addAll(p.X)
		ye.addAll(p.Y)
	}
	ye.addAll(c.HLines)
	xr, ok := xe.r, xe.ok
	if !ok {
		xr = Range{0, 1}
	}
	yr, ok := ye.r, ye.ok
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
	var pts []byte
	n := 0
	for i := range p.X {
		if i >= len(p.Y) || !finite(p.X[i]) || !finite(p.Y[i]) {
			continue
		}
		if n > 0 {
			pts = append(pts, ' ')
		}
		pts = appendNum(pts, sx.At(p.X[i]))
		pts = append(pts, ',')
		pts = appendNum(pts, sy.At(p.Y[i]))
		n++
	}
	if n < 2 {
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
	b.WriteString(` stroke-linejoin="round" points="`)
	b.Write(pts)
	b.WriteString(`"/>`)
}

// Mark is where one point was drawn, in viewBox units: what a tap is
// matched against (Nearest), since the plain dots are one path with no
// element per reading.
type Mark struct {
	X, Y   float64
	Row    int
	Marker Marker
}

// dotWidth is the diameter of a plain dot in viewBox units: a round-capped
// zero-length stroke draws it (SVG 1.1, 11.4 "stroke-linecap": a zero-length
// subpath with round caps is drawn as a circle).
const dotWidth = 9.0

// writePoints draws the markers and returns where each finite one went.
// The plain dots, most of a big record, are one path, so that thousands of
// readings cost the page one element; flagged and left-out readings are few
// and keep an element each with its data-row. Later marks are drawn on top.
func writePoints(b *strings.Builder, pts []Point, sx, sy Scale) []Mark {
	// Drawing order: dots, then left-out squares, then flagged diamonds.
	kind := func(m Marker) Marker {
		if m == Flagged || m == HollowSquare {
			return m
		}
		return Dot
	}
	var count [3]int
	for i := range pts {
		if p := &pts[i]; finite(p.X) && finite(p.Y) {
			count[kind(p.Marker)]++
		}
	}
	slot := [3]int{Dot: 0, HollowSquare: count[Dot], Flagged: count[Dot] + count[HollowSquare]}
	order := make([]Mark, count[0]+count[1]+count[2])
	for i := range pts {
		if p := &pts[i]; finite(p.X) && finite(p.Y) {
			k := kind(p.Marker)
			order[slot[k]] = Mark{X: sx.At(p.X), Y: sy.At(p.Y), Row: p.Row, Marker: k}
			slot[k]++
		}
	}
	b.WriteString(`<g class="pl-plot-points" data-count="` + strconv.Itoa(len(order)) + `">`)
	dots := 0
	tmp := make([]byte, 0, 64)
	for _, m := range order {
		if m.Marker != Dot {
			continue
		}
		if dots == 0 {
			b.WriteString(`<path class="pl-pt-dots" fill="none" stroke="` + inkColour + `" stroke-width="` + num(dotWidth) + `" stroke-linecap="round" d="`)
		}
		dots++
		tmp = append(tmp[:0], 'M')
		tmp = appendNum(tmp, m.X)
		tmp = append(tmp, ' ')
		tmp = append(appendNum(tmp, m.Y), 'h', '0')
		b.Write(tmp)
	}
	if dots > 0 {
		b.WriteString(`"/>`)
	}
	// Left-out squares, then flagged diamonds: an element each with its
	// data-row while there are few; beyond markerElems of a kind, one path
	// with the rows listed in data-rows (a record with a spread that grows
	// can have hundreds flagged).
	for _, mk := range []Marker{HollowSquare, Flagged} {
		group := order[slot[mk]-count[mk] : slot[mk]]
		if len(group) == 0 {
			continue
		}
		if len(group) > markerElems {
			writeMarkerPath(b, mk, group)
			continue
		}
		for _, m := range group {
			b.WriteString(`<path class="` + markerClass(mk) + `" data-row="` + strconv.Itoa(m.Row) + `"` + markerPaint(mk) + ` d="`)
			b.Write(appendMarker(nil, mk, m.X, m.Y))
			b.WriteString(`"/>`)
		}
	}
	b.WriteString(`</g>`)
	for _, p := range pts {
		if p.Selected && finite(p.X) && finite(p.Y) {
			b.WriteString(ringMarkup(Mark{X: sx.At(p.X), Y: sy.At(p.Y), Row: p.Row}, ""))
			break
		}
	}
	return order
}

// markerElems is the most markers of one kind drawn as elements of their
// own (see writePoints).
const markerElems = 32

func markerClass(mk Marker) string {
	if mk == Flagged {
		return "pl-pt pl-pt-flag"
	}
	return "pl-pt pl-pt-excl"
}

func markerPaint(mk Marker) string {
	if mk == Flagged {
		return ` fill="` + flagColour + `"`
	}
	return ` fill="` + paperColour + `" stroke="` + inkColour + `" stroke-width="2"`
}

// appendMarker appends the path data of one marker centred at (x, y): a
// diamond 15 units across, or a square 11 units across.
func appendMarker(dst []byte, mk Marker, x, y float64) []byte {
	if mk == Flagged {
		const d = 7.5
		dst = append(dst, 'M')
		dst = appendNum(dst, x)
		dst = append(dst, ' ')
		dst = appendNum(dst, y-d)
		dst = append(dst, "l7.5 7.5l-7.5 7.5l-7.5-7.5z"...)
		return dst
	}
	const h = 5.5
	dst = append(dst, 'M')
	dst = appendNum(dst, x-h)
	dst = append(dst, ' ')
	dst = appendNum(dst, y-h)
	return append(dst, "h11v11h-11z"...)
}

// writeMarkerPath draws many markers of one kind as one path.
func writeMarkerPath(b *strings.Builder, mk Marker, group []Mark) {
	rows := make([]byte, 0, 6*len(group))
	d := make([]byte, 0, 40*len(group))
	for i, m := range group {
		if i > 0 {
			rows = append(rows, ' ')
		}
		rows = strconv.AppendInt(rows, int64(m.Row), 10)
		d = appendMarker(d, mk, m.X, m.Y)
	}
	b.WriteString(`<path class="` + markerClass(mk) + `s" data-rows="`)
	b.Write(rows)
	b.WriteString(`"` + markerPaint(mk) + ` d="`)
	b.Write(d)
	b.WriteString(`"/>`)
}

// ringMarkup is the ring drawn around a selected reading.
func ringMarkup(m Mark, testID string) string {
	id := ""
	if testID != "" {
		id = ` data-testid="` + esc(testID) + `"`
	}
	return `<circle class="pl-pt-selected"` + id + ` data-row="` + strconv.Itoa(m.Row) + `" cx="` + num(m.X) + `" cy="` + num(m.Y) +
		`" r="12" fill="none" stroke="` + lineColour + `" stroke-width="4"/>`
}

// Ring returns a transparent SVG of a chart's size holding only the ring
// around m, to lay over the chart: selecting a reading then redraws a few
// bytes, not the chart.
func Ring(w, h float64, m Mark, testID string) string {
	return `<svg xmlns="http://www.w3.org/2000/svg" class="pl-plot-over" viewBox="0 0 ` + num(w) + " " + num(h) + `" aria-hidden="true">` +
		ringMarkup(m, testID) + `</svg>`
}

// Nearest returns the mark nearest to (x, y) within radius (all in viewBox
// units), preferring the one drawn last (on top) between equally near ones.
func Nearest(marks []Mark, x, y, radius float64) (Mark, bool) {
	best, bestD := -1, radius*radius
	for i, m := range marks {
		dx, dy := m.X-x, m.Y-y
		if d := dx*dx + dy*dy; d <= bestD {
			best, bestD = i, d
		}
	}
	if best < 0 {
		return Mark{}, false
	}
	return marks[best], true
}

// esc escapes text for XML and drops what XML 1.0 cannot hold (control
// characters, invalid UTF-8), so that any title a technician types gives
// well-formed markup. It drops as well what would act instead of showing
// (DEL, C1 controls, bidirectional controls: wording.Hidden), so that an
// axis title cannot reorder itself.
func esc(s string) string {
	clean := strings.Map(func(r rune) rune {
		switch {
		case r == '\t' || r == '\n' || r == '\r':
			return ' '
		case r < 0x20, r >= 0xD800 && r <= 0xDFFF, r == 0xFFFE, r == 0xFFFF, wording.Hidden(r):
			return -1
		}
		return r
	}, strings.ToValidUTF8(s, ""))
	return html.EscapeString(clean)
}
