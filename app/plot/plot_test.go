package plot

import (
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"strings"
	"testing"
)

// The 1-2-5 steps below are worked by hand from the rule in NiceStep's doc
// (common practice for chart axes).
func TestNiceStep(t *testing.T) {
	cases := []struct {
		span float64
		max  int
		want float64
	}{
		{10, 5, 2},
		{10, 10, 1},
		{1, 6, 0.2},
		{0.003, 6, 0.0005},
		{12880, 6, 2000},
		{7, 6, 1},
		{6, 6, 1},
		{0, 6, 0},
		{-1, 6, 0},
		{math.Inf(1), 6, 0},
		{math.NaN(), 6, 0},
		{1e300, 6, 2e299},
	}
	for _, c := range cases {
		got := NiceStep(c.span, c.max)
		if math.Abs(got-c.want) > 1e-12*math.Abs(c.want) {
			t.Errorf("NiceStep(%v, %d) = %v, want %v", c.span, c.max, got, c.want)
		}
	}
}

func TestTicks(t *testing.T) {
	cases := []struct {
		r    Range
		want string
	}{
		{Range{0, 10}, "0 2 4 6 8 10"},
		{Range{-0.3, 0.45}, "-0.3 -0.2 -0.1 0 0.1 0.2 0.3 0.4"},
		{Range{84, 12880}, "2000 4000 6000 8000 10000 12000"},
		{Range{0.1, 0.1}, ""},
		{Range{-3.2, -0.9}, "-3 -2.5 -2 -1.5 -1"},
	}
	for _, c := range cases {
		var parts []string
		for _, v := range Ticks(c.r, 6) {
			parts = append(parts, fmt.Sprint(math.Round(v*1e9)/1e9))
		}
		if got := strings.Join(parts, " "); got != c.want {
			t.Errorf("Ticks(%v) = %q, want %q", c.r, got, c.want)
		}
	}
}

func TestTickLabel(t *testing.T) {
	cases := []struct {
		v, step float64
		want    string
	}{
		{0.2, 0.2, "0.2"},
		{-0.4, 0.2, "−0.4"},
		{5000, 5000, "5000"},
		{2.5, 0.5, "2.5"},
		{0.25, 0.05, "0.25"},
		{0, 0.05, "0.00"},
		{3e-7, 1e-7, "3e-07"},
	}
	for _, c := range cases {
		if got := TickLabel(c.v, c.step); got != c.want {
			t.Errorf("TickLabel(%v, %v) = %q, want %q", c.v, c.step, got, c.want)
		}
	}
}

func TestScale(t *testing.T) {
	s := Scale{D: Range{0, 10}, P0: 100, P1: 0}
	for _, c := range []struct{ v, want float64 }{{0, 100}, {10, 0}, {2.5, 75}, {math.NaN(), 50}} {
		if got := s.At(c.v); got != c.want {
			t.Errorf("At(%v) = %v, want %v", c.v, got, c.want)
		}
	}
	if got := (Scale{D: Range{3, 3}, P0: 0, P1: 10}).At(3); got != 5 {
		t.Errorf("degenerate scale gives %v, want the middle 5", got)
	}
}

func TestThin(t *testing.T) {
	// Few points: all of them.
	if got := Thin(5, 10, nil, nil, nil); len(got) != 5 {
		t.Fatalf("Thin(5, 10) kept %d", len(got))
	}
	n := 10000
	xs, ys := make([]float64, n), make([]float64, n)
	for i := range xs {
		xs[i] = float64(i)
		ys[i] = math.Sin(float64(i) / 50)
	}
	ys[7777] = 40 // an outlier must survive
	flagged := map[int]bool{123: true, 4567: true}
	got := Thin(n, 2000, xs, ys, func(i int) bool { return flagged[i] })
	if len(got) > 2000 || len(got) < 1900 {
		t.Fatalf("kept %d of %d, want about 2000", len(got), n)
	}
	has := map[int]bool{}
	for k, i := range got {
		if k > 0 && got[k-1] >= i {
			t.Fatal("indexes are not increasing")
		}
		has[i] = true
	}
	for _, i := range []int{0, n - 1, 7777, 123, 4567} {
		if !has[i] {
			t.Errorf("point %d (extreme or flagged) was thinned away", i)
		}
	}
}

func TestChartSVG(t *testing.T) {
	c := Chart{
		TestID: "plot-fit", Label: `Readings & "line"`, XTitle: "Standard (µS/cm)", YTitle: "Probe (µS/cm)",
		Points: []Point{{X: 1, Y: 2, Row: 0}, {X: 2, Y: 4.1, Row: 1, Marker: Flagged}, {X: 3, Y: 5.9, Row: 3, Marker: HollowSquare, Selected: true},
			{X: math.NaN(), Y: 1, Row: 4}},
		Bands:  []Band{{X: []float64{1, 2, 3}, Lo: []float64{1, 3, 5}, Hi: []float64{3, 5, 7}, Class: "pi"}},
		Paths:  []Path{{X: []float64{1, 3}, Y: []float64{2, 6}}},
		HLines: []float64{0},
		Attrs:  [][2]string{{"data-n", "3"}},
	}
	s := c.SVG()
	if strings.Contains(s, "NaN") || strings.Contains(s, "Inf") {
		t.Fatal("the markup holds NaN or Inf")
	}
	d := xml.NewDecoder(strings.NewReader(s))
	rows := 0
	for {
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("not well-formed XML: %v\n%s", err, s)
		}
		if se, ok := tok.(xml.StartElement); ok && se.Name.Local != "svg" {
			for _, a := range se.Attr {
				if a.Name.Local == "data-row" && (se.Name.Local == "circle" || se.Name.Local == "path" || se.Name.Local == "rect") {
					rows++
				}
			}
		}
	}
	// The flagged and the left-out point and the selection ring; the plain
	// dot is part of the one dots path.
	if rows != 3 {
		t.Errorf("%d elements carry data-row, want 3", rows)
	}
	if !strings.Contains(s, `data-count="3"`) || strings.Count(s, "h0") != 1 {
		t.Errorf("want 3 points drawn, one of them in the dots path:\n%s", s)
	}
	for _, c := range []struct {
		v    float64
		want string
	}{{0, "0"}, {-0.04, "0"}, {12.34, "12.3"}, {-12.36, "-12.4"}, {5, "5"}, {0.95, "1"}, {-0.5, "-0.5"}, {math.NaN(), "0"}} {
		if got := num(c.v); got != c.want {
			t.Errorf("num(%v) = %q, want %q", c.v, got, c.want)
		}
	}
	for _, want := range []string{`data-testid="plot-fit"`, `aria-label="Readings &amp; &#34;line&#34;"`, `data-n="3"`, "Standard (µS/cm)", "pl-pt-flag", "pl-pt-excl"} {
		if !strings.Contains(s, want) {
			t.Errorf("missing %s", want)
		}
	}
}

func FuzzTicks(f *testing.F) {
	f.Add(0.0, 10.0, 6)
	f.Add(-1e-300, 1e300, 3)
	f.Fuzz(func(t *testing.T, lo, hi float64, max int) {
		max = max%50 + 1
		if max < 1 {
			max = -max + 1
		}
		ts := Ticks(Range{lo, hi}, max)
		if len(ts) > 4*max+5 {
			t.Fatalf("%d ticks for max %d", len(ts), max)
		}
		step := NiceStep(hi-lo, max)
		for i, v := range ts {
			if !finite(v) || v < lo-math.Abs(step) || v > hi+math.Abs(step) {
				t.Fatalf("tick %v outside [%v, %v]", v, lo, hi)
			}
			if i > 0 && v <= ts[i-1] {
				t.Fatalf("ticks not increasing: %v", ts)
			}
			if l := TickLabel(v, step); l == "" || strings.Contains(l, "NaN") {
				t.Fatalf("label %q", l)
			}
		}
	})
}

func FuzzThin(f *testing.F) {
	f.Add(50, 7, []byte{1, 2, 3, 4, 5})
	f.Fuzz(func(t *testing.T, n, maxDraw int, data []byte) {
		n, maxDraw = n%3000, maxDraw%500
		if n < 0 {
			n = -n
		}
		xs, ys := make([]float64, n), make([]float64, n/2)
		for i := range xs {
			if len(data) > 0 {
				xs[i] = float64(data[i%len(data)]) - 100
			}
		}
		for i := range ys {
			ys[i] = float64(i % 17)
		}
		got := Thin(n, maxDraw, xs, ys, func(i int) bool { return i%97 == 0 })
		limit := max(maxDraw, 1)
		if n <= limit && len(got) != n || n > limit && len(got) > limit {
			t.Fatalf("Thin(%d, %d) kept %d", n, maxDraw, len(got))
		}
		for k, i := range got {
			if i < 0 || i >= n || k > 0 && got[k-1] >= i {
				t.Fatalf("bad index list %v", got)
			}
		}
	})
}

// TestDrawMarks: Draw says where each finite point went, the svg's
// data-frame holds the same scales, and Nearest finds a point from a tap
// near it (topmost first) but not from one farther than the radius.
func TestDrawMarks(t *testing.T) {
	c := Chart{Points: []Point{{X: 0, Y: 0, Row: 7}, {X: 10, Y: 5, Row: 8, Marker: Flagged}, {X: 10, Y: 5, Row: 9}, {X: math.Inf(1), Y: 1, Row: 10}}}
	s, marks := c.Draw()
	if len(marks) != 3 {
		t.Fatalf("%d marks, want 3 (the infinite point is not drawn)", len(marks))
	}
	var f [8]float64
	i := strings.Index(s, `data-frame="`)
	if i < 0 {
		t.Fatal("no data-frame")
	}
	fields := strings.Fields(s[i+len(`data-frame="`) : i+strings.Index(s[i:], `" `)])
	if len(fields) != 8 {
		t.Fatalf("data-frame %q", fields)
	}
	for k, v := range fields {
		fmt.Sscan(v, &f[k])
	}
	sx, sy := Scale{D: Range{f[0], f[1]}, P0: f[2], P1: f[3]}, Scale{D: Range{f[4], f[5]}, P0: f[6], P1: f[7]}
	for _, m := range marks {
		p := c.Points[m.Row-7]
		if math.Abs(sx.At(p.X)-m.X) > 1e-9 || math.Abs(sy.At(p.Y)-m.Y) > 1e-9 {
			t.Errorf("mark of row %d at (%v, %v), data-frame puts it at (%v, %v)", m.Row, m.X, m.Y, sx.At(p.X), sy.At(p.Y))
		}
	}
	// Rows 8 (flagged) and 9 (dot) are at the same place: the flagged one
	// is drawn on top and wins.
	top := marks[len(marks)-1]
	if top.Row != 8 {
		t.Errorf("last drawn mark is row %d, want the flagged row 8", top.Row)
	}
	if m, ok := Nearest(marks, top.X+3, top.Y-2, 10); !ok || m.Row != 8 {
		t.Errorf("Nearest next to rows 8/9 = %v %v, want row 8", m, ok)
	}
	first := marks[0]
	if m, ok := Nearest(marks, first.X+6, first.Y, 10); !ok || m.Row != 7 {
		t.Errorf("Nearest 6 units from row 7 = %v %v", m, ok)
	}
	if _, ok := Nearest(marks, first.X+11, first.Y, 10); ok {
		t.Error("Nearest found a point 11 units away with radius 10")
	}
	r := Ring(400, 300, first, "plot-fit-selected")
	for _, want := range []string{`viewBox="0 0 400 300"`, `data-testid="plot-fit-selected"`, `data-row="7"`} {
		if !strings.Contains(r, want) {
			t.Errorf("ring %q lacks %s", r, want)
		}
	}
}

// TestManyFlagged: beyond markerElems flagged readings, they are one path
// listing its rows; below, an element each.
func TestManyFlagged(t *testing.T) {
	for _, n := range []int{markerElems, markerElems + 8} {
		var pts []Point
		for i := 0; i < n; i++ {
			pts = append(pts, Point{X: float64(i), Y: float64(i % 7), Row: 100 + i, Marker: Flagged})
		}
		pts = append(pts, Point{X: 1, Y: 1, Row: 1})
		c := Chart{Points: pts}
		s, marks := c.Draw()
		if len(marks) != n+1 {
			t.Fatalf("%d flagged: %d marks", n, len(marks))
		}
		elems, paths := strings.Count(s, `class="pl-pt pl-pt-flag" data-row=`), strings.Count(s, `class="pl-pt pl-pt-flags" data-rows="100 101 `)
		if n <= markerElems && (elems != n || paths != 0) || n > markerElems && (elems != 0 || paths != 1) {
			t.Errorf("%d flagged: %d elements and %d paths", n, elems, paths)
		}
	}
}

func FuzzChartSVG(f *testing.F) {
	f.Add(1.0, 2.0, 3.0, 4.0, "x <unit>", "y & z")
	f.Fuzz(func(t *testing.T, a, b, c, d float64, xt, yt string) {
		ch := Chart{TestID: "t", Label: xt, XTitle: xt, YTitle: yt,
			Points: []Point{{X: a, Y: b}, {X: c, Y: d, Marker: Flagged}, {X: a, Y: d, Marker: HollowSquare, Selected: true}},
			Bands:  []Band{{X: []float64{a, c}, Lo: []float64{b, d}, Hi: []float64{d, b}}},
			Paths:  []Path{{X: []float64{a, c}, Y: []float64{b, d}}}, HLines: []float64{0}}
		s := ch.SVG()
		if strings.Contains(s, "NaN") || strings.Contains(s, "Inf") {
			t.Fatalf("non-finite number in markup")
		}
		dec := xml.NewDecoder(strings.NewReader(s))
		for {
			_, err := dec.Token()
			if err == io.EOF {
				break
			}
			if err != nil {
				t.Fatalf("not well-formed: %v", err)
			}
		}
	})
}

func ExampleTicks() {
	r := Range{Lo: 84, Hi: 1413}
	for _, v := range Ticks(r, 6) {
		fmt.Print(TickLabel(v, NiceStep(r.Span(), 6)), " ")
	}
	fmt.Println()
	// Output: 200 400 600 800 1000 1200 1400
}

func BenchmarkChartSVG2000(b *testing.B) {
	pts := make([]Point, 2000)
	for i := range pts {
		pts[i] = Point{X: float64(i), Y: math.Sin(float64(i)), Row: i}
	}
	c := Chart{TestID: "b", Points: pts}
	for b.Loop() {
		_ = c.SVG()
	}
}

func BenchmarkThin10000(b *testing.B) {
	n := 10000
	xs, ys := make([]float64, n), make([]float64, n)
	for i := range xs {
		xs[i], ys[i] = float64(i), math.Cos(float64(i))
	}
	for b.Loop() {
		_ = Thin(n, 2000, xs, ys, nil)
	}
}
