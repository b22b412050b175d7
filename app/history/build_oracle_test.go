package history

import (
	"fmt"
	"reflect"
	"sort"
	"strings"
	"testing"
	"time"

	"pairline/fitcore"
)

// buildOracle is build as it was before it was split into stages (one
// function of cyclomatic complexity 26), kept unchanged as the oracle of
// TestBuildMatchesOracle and FuzzBuildMatchesOracle.
func buildOracle(g []Summary, opt Options) (Instrument, error) {
	in := Instrument{Key: strings.TrimSpace(g[0].Key)}
	// Dedupe: the same digest (whatever the ID; "" falls back to the ID)
	// = one; same ID with other content = the highest revision (then latest
	// Modified) counts, the others are kept apart as earlier revisions.
	byID := map[string]int{}
	seen := map[string]bool{}
	var entries []Entry
	for _, s := range g {
		key := s.Digest
		if key == "" {
			key = "id\x00" + s.ID
		}
		if seen[key] {
			in.Duplicates++
			continue
		}
		seen[key] = true
		e := Entry{Summary: s, Verdict: verdictOf(s)}
		if j, ok := byID[s.ID]; ok {
			cur := &entries[j]
			if s.Revision > cur.Revision || s.Revision == cur.Revision && s.Modified.After(cur.Modified) {
				cur.Verdict = Superseded
				byID[s.ID] = len(entries)
			} else {
				e.Verdict = Superseded
			}
		} else {
			byID[s.ID] = len(entries)
		}
		entries = append(entries, e)
	}
	sort.SliceStable(entries, func(i, j int) bool {
		a, b := entries[i], entries[j]
		if !a.Taken.Equal(b.Taken) {
			return a.Taken.Before(b.Taken)
		}
		if a.ID != b.ID {
			return a.ID < b.ID
		}
		return a.Revision < b.Revision
	})
	in.Entries = entries
	var prev *Entry
	var acc []*Entry
	interval := opt.DefaultIntervalDays
	for i := range entries {
		e := &entries[i]
		if e.Verdict == Superseded {
			continue
		}
		if e.IntervalDays > 0 {
			interval = e.IntervalDays
		}
		if e.Verdict != Accepted {
			continue
		}
		if prev != nil {
			c, err := fitcore.CompareLines(prev.X, prev.Y, e.X, e.Y)
			if err == nil {
				in.Changes = append(in.Changes, Change{Session: e.ID, Previous: prev.ID, LineComparison: c})
			}
		}
		prev = e
		acc = append(acc, e)
	}
	in.Latest, in.LatestReason = latest(entries)
	if len(acc) > 0 {
		in.Origin = acc[0].Taken
		if interval > 0 {
			in.Due = acc[len(acc)-1].Taken.AddDate(0, 0, interval)
			in.Overdue = !opt.Now.IsZero() && opt.Now.After(in.Due)
		}
	}
	t := make([]float64, len(acc))
	sl, sls := make([]float64, len(acc)), make([]float64, len(acc))
	ic, ics := make([]float64, len(acc)), make([]float64, len(acc))
	df := make([]float64, len(acc))
	for i, e := range acc {
		t[i] = Years(e.Taken.Sub(in.Origin))
		sl[i], sls[i], ic[i], ics[i] = e.Slope, e.SlopeSE, e.Intercept, e.InterceptSE
		df[i] = seDF(e.DF)
	}
	// (Since 3 December the drift allows for the standard errors being
	// estimates: DriftEstimated, as Build does.)
	var err error
	if in.SlopeDrift, err = fitcore.DriftEstimated(t, sl, sls, df, opt.Level, opt.SlopeLow, opt.SlopeHigh); err != nil {
		in.SlopeDrift = &fitcore.DriftResult{N: len(acc), Status: "not fitted: " + err.Error()}
	}
	if in.InterceptDrift, err = fitcore.DriftEstimated(t, ic, ics, df, opt.Level, opt.InterceptLow, opt.InterceptHigh); err != nil {
		in.InterceptDrift = &fitcore.DriftResult{N: len(acc), Status: "not fitted: " + err.Error()}
	}
	for _, d := range []struct {
		name string
		r    *fitcore.DriftResult
	}{{"slope", in.SlopeDrift}, {"intercept", in.InterceptDrift}} {
		// Projected only for a trend that is significant (DriftDrifting):
		// a flat trend with a slight slope would give a far, meaningless day.
		if d.r.Leaves == nil || d.r.Status != fitcore.DriftDrifting {
			continue
		}
		at := in.Origin.Add(Duration(d.r.Leaves.At))
		if in.LeavesAt.IsZero() || at.Before(in.LeavesAt) {
			in.LeavesAt, in.LeavesWhich = at, d.name
		}
	}
	return in, nil
}

// dump prints v with every pointer followed, so that two results compare
// by what they hold (a NaN equal to itself).
func dump(sb *strings.Builder, v reflect.Value) {
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			sb.WriteString("nil")
			return
		}
		sb.WriteString("&")
		dump(sb, v.Elem())
	case reflect.Struct:
		if t, ok := v.Interface().(time.Time); ok {
			sb.WriteString(t.Format(time.RFC3339Nano))
			return
		}
		sb.WriteString("{")
		for i := range v.NumField() {
			fmt.Fprintf(sb, "%s:", v.Type().Field(i).Name)
			dump(sb, v.Field(i))
			sb.WriteString(" ")
		}
		sb.WriteString("}")
	case reflect.Slice, reflect.Array:
		fmt.Fprintf(sb, "[%d:", v.Len())
		for i := range v.Len() {
			dump(sb, v.Index(i))
			sb.WriteString(" ")
		}
		sb.WriteString("]")
	default:
		fmt.Fprintf(sb, "%v", v.Interface())
	}
}

func dumpString(v any) string {
	var sb strings.Builder
	dump(&sb, reflect.ValueOf(v))
	return sb.String()
}

// buildCase builds the summaries of one invented instrument from data:
// a few IDs given more than once (the same content, or a later revision
// or modification), days taken out of order and on the same day, fitted
// or not, accepted or not, lines that drift or not, and intervals; and
// options with limits that the drift may reach.
func buildCase(data []byte) ([]Summary, Options) {
	at := func(i int) byte {
		if len(data) == 0 {
			return 0
		}
		return data[i%len(data)]
	}
	start := time.Date(2024, 1, 10, 0, 0, 0, 0, time.UTC)
	n := int(at(0)) % 24
	sums := make([]Summary, 0, n)
	for i := range n {
		b := at(i + 1)
		day := int(at(i+7)) % 40
		if at(4)%5 == 0 {
			day = 3 // every session on one day: the drift cannot be fitted
		}
		s := Summary{
			ID: fmt.Sprintf("s%d", b%9), Key: "PB-7 (invented)", Digest: fmt.Sprintf("d%d", b%5),
			Revision: int(b>>4) % 3, Modified: start.Add(time.Duration(b%7) * time.Hour),
			Taken:        start.AddDate(0, 0, 30*day),
			IntervalDays: []int{0, 0, 90, 180}[int(b>>2)%4],
			Fitted:       b%11 != 0, Accepted: b%7 != 3,
		}
		drift := float64(at(1)%3) * 0.002
		s.Slope = 1 + drift*float64(day) + 0.0005*float64(int(b%5)-2)
		s.SlopeSE = 0.001 + 0.0001*float64(b%3)
		s.Intercept = 0.1 - 0.01*float64(day)*float64(at(2)%2) + 0.001*float64(b%4)
		s.InterceptSE = 0.005
		s.X = []float64{0, 5, 10, 20}
		s.Y = make([]float64, len(s.X))
		for j, x := range s.X {
			s.Y[j] = s.Intercept + s.Slope*x + 0.001*float64(int(at(i+j)%5)-2)
		}
		if b%13 == 0 {
			s.X, s.Y = nil, nil // no readings to compare lines with
		}
		sums = append(sums, s)
	}
	lim := func(k byte, v float64) *float64 {
		if k == 0 {
			return nil
		}
		return &v
	}
	f := at(3)
	opt := Options{
		DefaultIntervalDays: []int{0, 365}[int(f)%2],
		Level:               []float64{0, 0.9, 0.99}[int(f>>1)%3],
		SlopeLow:            lim(f&8, 0.9), SlopeHigh: lim(f&16, 1.1),
		InterceptLow: lim(f&32, -0.2), InterceptHigh: lim(f&64, 0.2),
	}
	if f&128 != 0 {
		opt.Now = start.AddDate(3, 0, 0)
	}
	return sums, opt
}

// sameBuild compares build with its oracle on the summaries of data.
func sameBuild(t *testing.T, data []byte) {
	t.Helper()
	sums, opt := buildCase(data)
	if len(sums) == 0 {
		return
	}
	g, gerr := build(append([]Summary(nil), sums...), opt)
	w, werr := buildOracle(append([]Summary(nil), sums...), opt)
	got, want := dumpString(g)+fmt.Sprint(gerr), dumpString(w)+fmt.Sprint(werr)
	if got != want {
		i := 0
		for i < len(got) && i < len(want) && got[i] == want[i] {
			i++
		}
		t.Fatalf("data %v: build differs from its oracle at byte %d:\n got …%s\nwant …%s", data, i, got[max(0, i-80):min(len(got), i+80)], want[max(0, i-80):min(len(want), i+80)])
	}
}

func TestBuildMatchesOracle(t *testing.T) {
	reached := map[string]bool{}
	for n := range 24 {
		for _, f := range []byte{0, 1, 2, 9, 24, 120, 255, 128, 200, 77} {
			data := []byte{byte(n), byte(3*n + 1), f, f ^ byte(n), byte(n * 17), 5, 250, byte(n), 33, 64}
			sameBuild(t, data)
			sums, opt := buildCase(data)
			if len(sums) == 0 {
				continue
			}
			in, _ := build(sums, opt)
			reached["duplicates"] = reached["duplicates"] || in.Duplicates > 0
			reached["leaves"] = reached["leaves"] || !in.LeavesAt.IsZero()
			reached["overdue"] = reached["overdue"] || in.Overdue
			reached["changes"] = reached["changes"] || len(in.Changes) > 0
			reached["latest"] = reached["latest"] || in.Latest != nil
			reached["too few"] = reached["too few"] || in.SlopeDrift.Status == fitcore.DriftTooFew
			reached["not fitted"] = reached["not fitted"] || strings.HasPrefix(in.SlopeDrift.Status, "not fitted")
			for _, e := range in.Entries {
				reached[e.Verdict] = true
			}
		}
	}
	for _, k := range []string{"duplicates", "leaves", "overdue", "changes", "latest", "too few", "not fitted", Accepted, NotAccepted, NoFit, Superseded} {
		if !reached[k] {
			t.Errorf("no case reaches %q", k)
		}
	}
}

// FuzzBuildMatchesOracle: build gives what the body it was split from
// gives, for any summaries buildCase makes.
func FuzzBuildMatchesOracle(f *testing.F) {
	f.Add([]byte{12, 1, 2, 3, 4, 5, 6, 7, 8})
	f.Add([]byte{23, 255, 9, 200, 17, 5, 250})
	f.Fuzz(func(t *testing.T, data []byte) {
		sameBuild(t, data)
	})
}
