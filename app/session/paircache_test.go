package session

import (
	"math"
	"testing"
	"time"
)

// samePairs compares two results of Pairs (nil and empty alike).
func samePairs(t *testing.T, what string, s *Session, pc *PairCache) {
	t.Helper()
	x1, y1, r1, p1 := s.Pairs()
	x2, y2, r2, p2 := pc.Pairs(s)
	if len(x1) != len(x2) || len(y1) != len(y2) || len(r1) != len(r2) || len(p1) != len(p2) {
		t.Fatalf("%s: cache gives %d pairs and %d problems, Pairs %d and %d", what, len(x2), len(p2), len(x1), len(p1))
	}
	for i := range x1 {
		if math.Float64bits(x1[i]) != math.Float64bits(x2[i]) || math.Float64bits(y1[i]) != math.Float64bits(y2[i]) || r1[i] != r2[i] {
			t.Fatalf("%s: pair %d: cache (%v, %v, row %d), Pairs (%v, %v, row %d)", what, i, x2[i], y2[i], r2[i], x1[i], y1[i], r1[i])
		}
	}
	for i := range p1 {
		if p1[i] != p2[i] {
			t.Fatalf("%s: problem %d: cache %+v, Pairs %+v", what, i, p2[i], p1[i])
		}
	}
	if c1, c2 := s.Count(), pc.Count(s); c1 != c2 {
		t.Fatalf("%s: counts through the cache %+v, Count %+v", what, c2, c1)
	}
}

// TestPairCache: after each kind of change a technician makes (typing,
// clearing, adding and deleting rows, leaving out, the decimal-comma
// choice) the cache gives exactly what Pairs gives.
func TestPairCache(t *testing.T) {
	now := time.Date(2026, 6, 1, 9, 0, 0, 0, time.UTC)
	s, err := New("Invented cache check", now, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range [][2]string{{"1", "2.1"}, {"2", "4,2"}, {"3", "abc"}, {"", ""}, {"5", "10.2"}, {"1,5", "3"}} {
		s.AddRow(r[0], r[1], now)
	}
	var pc PairCache
	tr, fa := true, false
	steps := []struct {
		name string
		do   func()
	}{
		{"first read", func() {}},
		{"typing a digit", func() { s.Readings[0].Y = "2.15" }},
		{"fixing a bad cell", func() { s.Readings[2].Y = "6.3" }},
		{"breaking a cell", func() { s.Readings[4].X = "5..0" }},
		{"clearing a row", func() { s.Readings[1].X, s.Readings[1].Y = "", "" }},
		{"adding a row", func() { s.AddRow("7", "14.1", now) }},
		{"leaving one out", func() {
			if err := s.Exclude(0, "invented reason", now); err != nil {
				t.Fatal(err)
			}
		}},
		{"deleting rows", func() { s.Readings = s.Readings[:3] }},
		{"decimal comma", func() { s.DecimalComma = &tr }},
		{"decimal point", func() { s.DecimalComma = &fa; s.Readings[2].X = "1,500" }},
		{"undecided again", func() { s.DecimalComma = nil }},
		{"rows shifted", func() { s.Readings = append([]Reading{{X: "0", Y: "0.1"}}, s.Readings...) }},
	}
	for _, st := range steps {
		st.do()
		samePairs(t, st.name, s, &pc)
	}
}

// FuzzPairCache: any sequence of cell edits leaves the cache agreeing
// with Pairs.
func FuzzPairCache(f *testing.F) {
	f.Add([]byte{0, 1, 2, 3}, "1,5", "2.0")
	f.Add([]byte{5, 9, 200, 3, 3}, "", "x")
	f.Fuzz(func(t *testing.T, ops []byte, a, b string) {
		now := time.Date(2026, 6, 1, 9, 0, 0, 0, time.UTC)
		s, err := New("Invented fuzz", now, nil)
		if err != nil {
			t.Fatal(err)
		}
		var pc PairCache
		texts := []string{a, b, "1", "2,5", "", " 3 ", "1e3", a + b}
		tr := true
		for i, op := range ops {
			switch op % 6 {
			case 0:
				s.Readings = append(s.Readings, Reading{X: texts[int(op)%len(texts)], Y: texts[(int(op)/6)%len(texts)]})
			case 1:
				if len(s.Readings) > 0 {
					s.Readings[int(op)%len(s.Readings)].X = texts[i%len(texts)]
				}
			case 2:
				if len(s.Readings) > 0 {
					s.Readings[int(op)%len(s.Readings)].Y = texts[(i+3)%len(texts)]
				}
			case 3:
				if len(s.Readings) > 0 {
					s.Readings = s.Readings[:int(op)%len(s.Readings)]
				}
			case 4:
				if s.DecimalComma == nil {
					s.DecimalComma = &tr
				} else {
					s.DecimalComma = nil
				}
			case 5:
				if len(s.Readings) > 0 {
					r := &s.Readings[int(op)%len(s.Readings)]
					r.Excluded = !r.Excluded
				}
			}
			samePairs(t, "fuzz step", s, &pc)
		}
	})
}
