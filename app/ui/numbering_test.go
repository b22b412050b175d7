package ui

import (
	"reflect"
	"strings"
	"testing"

	"pairline/fitcore"
)

// TestRowWords: fitcore's sentences name readings by their position among
// the pairs it was given; the screen names them by the grid's rows. The
// sentences are fitcore's own forms (fitcore/assumptions.go ckReadingList,
// fitcore/slip.go); rows 0, 2, 3, 5, … stand for a grid whose row 2 (from
// 1) is blank and row 5 left out.
func TestRowWords(t *testing.T) {
	rows := []int{0, 2, 3, 5, 6, 7, 8, 9, 10, 11, 12}
	for _, tc := range []struct{ in, want string }{
		{"Reading 2 is out of line with the rest.", "Reading 3 is out of line with the rest."},
		{"Readings 9 and 11 stand out from the rest.", "Readings 11 and 13 stand out from the rest."},
		{"Readings 1, 4, 9, 10, 11 and 3 more stand out.", "Readings 1, 6, 11, 12, 13 and 3 more stand out."},
		{"This depends on reading 4 alone (it looks like a slipped decimal point).", "This depends on reading 6 alone (it looks like a slipped decimal point)."},
		{"Reading 3 looks like a slipped decimal point: 45.1 where the line expects about 4.5.", "Reading 4 looks like a slipped decimal point: 45.1 where the line expects about 4.5."},
		{"Reading 40 is beyond the pairs.", "Reading 40 is beyond the pairs."},
		{"No single reading dominates the line.", "No single reading dominates the line."},
		{"Proofreading 2 is not a reading number.", "Proofreading 2 is not a reading number."},
		{"Readings are counted.", "Readings are counted."},
		{"Reading 2", "Reading 3"},
		{"Readings 1 and", "Readings 1 and"},
	} {
		if got := rowWords(tc.in, rows); got != tc.want {
			t.Errorf("rowWords(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// TestRenumberReport: the influence sentence of a real fitcore report on
// invented readings with an outlier names the grid's row of the outlier,
// and the advice carried over from an earlier analysis is not renumbered
// twice.
func TestRenumberReport(t *testing.T) {
	// Invented: y = 2x + 1 with small scatter, the 6th pair far off.
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}
	y := []float64{3.01, 4.98, 7.02, 9.0, 10.97, 19.5, 15.01, 16.98, 19.02, 21.0}
	rep, err := fitcore.Analyze(x, y, fitcore.Options{})
	if err != nil {
		t.Fatal(err)
	}
	rows := []int{0, 1, 2, 3, 4, 8, 9, 10, 11, 12} // the 6th pair is grid row 9 (from 1)
	before := rep.Assumptions.Influence.Message
	renumberReport(rep, rows)
	got := rep.Assumptions.Influence.Message
	if before == got || !strings.Contains(got, "Reading 9") {
		t.Errorf("influence message %q (was %q): want it to name reading 9, the grid's row", got, before)
	}
	if strings.Contains(got, "Reading 6") {
		t.Errorf("influence message %q still names the pair's position 6", got)
	}
	ad := rep.Advice
	if ad == nil {
		t.Fatal("no advice")
	}
	reason := ad.Reason
	renumberAdvice(nil, rows) // nothing to do, no panic
	if ad.Reason != reason {
		t.Error("renumberAdvice(nil) changed the advice")
	}
}

// FuzzRowWords: any text, any numbering: rowWords never panics, keeps the
// text when positions are rows, and changes nothing but digits.
func FuzzRowWords(f *testing.F) {
	for _, s := range []string{"Readings 9 and 11 stand out.", "Reading 1, 2 and 3 more", "reading 0", "Readings 1, , 2", "Reading 99999999999"} {
		f.Add(s, uint8(3))
	}
	f.Fuzz(func(t *testing.T, s string, shift uint8) {
		rows := make([]int, 50)
		same := make([]int, 50)
		for i := range rows {
			rows[i], same[i] = i+int(shift), i
		}
		if got := rowWords(s, same); got != s {
			t.Fatalf("identity numbering changed %q to %q", s, got)
		}
		got := rowWords(s, rows)
		strip := func(v string) string {
			return strings.Map(func(r rune) rune {
				if r >= '0' && r <= '9' {
					return -1
				}
				return r
			}, v)
		}
		if strip(got) != strip(s) {
			t.Fatalf("rowWords(%q) = %q changed more than digits", s, got)
		}
	})
}

// TestRenumberEverySentence: every test's message and every assumption's
// message and advice (of the report and of the advice's before and after)
// is renumbered. The sentences are set by walking the report's structs, not
// through fitcore's lists, so a check that fitcore.CheckList or
// fitcore.AssumptionList left out would fail here.
func TestRenumberEverySentence(t *testing.T) {
	const in, want = "Reading 2 stands out.", "Reading 3 stands out."
	rows := []int{0, 2, 3} // grid row 2 (from 1) is blank
	// each calls fn on every value of type T in v (a struct), allocating
	// the nil pointers to T.
	each := func(v reflect.Value, typ reflect.Type, fn func(reflect.Value)) {
		for i := 0; i < v.NumField(); i++ {
			f := v.Field(i)
			switch {
			case f.Type() == typ:
				fn(f)
			case f.Kind() == reflect.Pointer && f.Type().Elem() == typ:
				if f.IsNil() {
					f.Set(reflect.New(typ))
				}
				fn(f.Elem())
			}
		}
	}
	checkT, assumeT := reflect.TypeOf(fitcore.Check{}), reflect.TypeOf(fitcore.Assumption{})
	set := func(f reflect.Value) {
		for _, name := range []string{"Message", "Advice"} {
			if m := f.FieldByName(name); m.IsValid() {
				m.SetString(in)
			}
		}
	}
	rep := &fitcore.Report{Advice: &fitcore.Advice{After: &fitcore.CheckSummary{}}}
	sums := []*fitcore.Assumptions{&rep.Assumptions, &rep.Advice.Before.Assumptions, &rep.Advice.After.Assumptions}
	each(reflect.ValueOf(&rep.Checks).Elem(), checkT, set)
	for _, a := range sums {
		each(reflect.ValueOf(a).Elem(), assumeT, set)
	}
	renumberReport(rep, rows)
	n := 0
	check := func(where string) func(reflect.Value) {
		return func(f reflect.Value) {
			for _, name := range []string{"Message", "Advice"} {
				if m := f.FieldByName(name); m.IsValid() {
					n++
					if m.String() != want {
						t.Errorf("%s: %s is %q, want %q", where, name, m.String(), want)
					}
				}
			}
		}
	}
	each(reflect.ValueOf(&rep.Checks).Elem(), checkT, check("checks"))
	for i, a := range sums {
		each(reflect.ValueOf(a).Elem(), assumeT, check([]string{"assumptions", "advice before", "advice after"}[i]))
	}
	if want := len(fitcore.CheckList()) + 3*2*len(fitcore.AssumptionList()); n != want {
		t.Errorf("%d sentences looked at, want %d", n, want)
	}
}
