package cli

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"reflect"
	"runtime"
	"strings"
	"testing"
	"time"

	"pairline/app/demo"
	"pairline/app/session"
	"pairline/fitcore"
)

// streamed is what writeJSONIndented writes for v.
func streamed(t testing.TB, v any, prefix string) []byte {
	t.Helper()
	var b bytes.Buffer
	bw := bufio.NewWriter(&b)
	if err := writeJSONIndented(bw, v, prefix, "  "); err != nil {
		t.Fatal(err)
	}
	if err := bw.Flush(); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// marshalled is what json.MarshalIndent writes for v, escaped by jsonText:
// the oracle the streamed bytes must equal.
func marshalled(t testing.TB, v any, prefix string) []byte {
	t.Helper()
	b, err := json.MarshalIndent(v, prefix, "  ")
	if err != nil {
		t.Fatal(err)
	}
	return jsonText(b)
}

func firstDiff(a, b []byte) int {
	n := min(len(a), len(b))
	for i := 0; i < n; i++ {
		if a[i] != b[i] {
			return i
		}
	}
	return n
}

func sameJSON(t *testing.T, name string, v any, prefix string) {
	t.Helper()
	got, want := streamed(t, v, prefix), marshalled(t, v, prefix)
	if !bytes.Equal(got, want) {
		i := firstDiff(got, want)
		lo := max(0, i-80)
		t.Errorf("%s: streamed JSON differs from MarshalIndent at byte %d of %d/%d:\ngot  …%q\nwant …%q",
			name, i, len(got), len(want), got[lo:min(len(got), i+80)], want[lo:min(len(want), i+80)])
	}
}

// TestJSONStreamMatchesMarshal: the streamed JSON of real inspections (the
// invented demo sessions, and sessions long enough to be streamed in
// chunks, with notes holding commas, quotes, hidden characters and HTML)
// is byte for byte what json.MarshalIndent gives. The oracle is
// encoding/json itself.
func TestJSONStreamMatchesMarshal(t *testing.T) {
	file, err := session.Decode(bytes.NewReader(demo.File))
	if err != nil {
		t.Fatal(err)
	}
	for i, s := range file.Sessions {
		sameJSON(t, "demo session "+s.Title, analyse(s), "    ")
		if i == 0 {
			sameJSON(t, "demo report", analyse(s).Report, "")
		}
	}
	big := bigSessions(t, 3*streamThreshold+7)[0]
	for i := range big.Readings {
		if i%97 == 0 {
			big.Readings[i].Note = `a, "quoted" <b>note</b> & ` + "\u2028 \u202e bidi \x7f end"
		}
		if i%131 == 0 {
			big.Readings[i].Excluded, big.Readings[i].ExcludeReason = true, "bubble, on the probe"
		}
		if i%211 == 0 {
			big.Readings[i].Y = "12,5 oops"
		}
	}
	a := analyse(big)
	if a.Report == nil {
		t.Fatalf("the long session was not analysed: %s", a.AnalysisError)
	}
	if len(a.Report.Influence) < streamThreshold {
		t.Fatalf("the test needs a report with at least %d influence rows, has %d", streamThreshold, len(a.Report.Influence))
	}
	sameJSON(t, "long session", a, "    ")
	sameJSON(t, "long session, no prefix", a, "")
}

// TestJSONStreamShapes: the shapes encoding/json treats specially, each
// against MarshalIndent.
func TestJSONStreamShapes(t *testing.T) {
	type leaf struct {
		A int     `json:"a"`
		B string  `json:"b,omitempty"`
		C *int    `json:"c"`
		D []int   `json:"d,omitempty"`
		E float64 `json:"-"`
		F bool    `json:"f,omitempty"`
	}
	type embedded struct {
		leaf
		G []leaf `json:"g"`
	}
	type shadow struct {
		*leaf
		A      string `json:"a"` // shadows leaf.A
		G      []leaf `json:"g"`
		Nilemb *embedded
	}
	type twoDeep struct {
		shadow
		embedded `json:"named_embedded"`
		B        int
	}
	type outer struct {
		Shadow   shadow           `json:"shadow"`
		TwoDeep  twoDeep          `json:"two_deep"`
		NilEmb   shadow           `json:"nil_emb"`
		Empty    struct{}         `json:"empty"`
		AllOmit  leaf             `json:"all_omit"`
		Nil      []float64        `json:"nil"`
		Zero     []float64        `json:"zero"`
		Floats   []float64        `json:"floats"`
		Uints    []uint           `json:"uints"`
		Strings  []string         `json:"strings"`
		Leaves   []leaf           `json:"leaves"`
		Ptrs     []*leaf          `json:"ptrs"`
		Nested   [][]float64      `json:"nested"`
		Any      any              `json:"any"`
		Map      map[string][]int `json:"map"`
		Bytes    []byte           `json:"bytes"`
		Times    []time.Time      `json:"times"`
		Embedded embedded         `json:"embedded"`
		Pointer  *outer           `json:"pointer"`
		//lint:ignore SA5008 the "-," tag (a member named "-") is one of the shapes compared with encoding/json
		Dash   int `json:"-,"`
		NoTag  string
		Arr    [3]float64        `json:"arr"`
		RawMap map[string]string `json:"raw_map,omitempty"`
		Zerod  time.Time         `json:"zerod,omitzero"`
	}
	n := 2*chunkLen + 3
	o := outer{Zero: []float64{}, Any: []float64{1, 2}, Map: map[string][]int{"b": {1}, "a": nil}, Bytes: []byte("hi"),
		Embedded: embedded{G: make([]leaf, n)}, Dash: 4, NoTag: "x", Arr: [3]float64{1e-7, 1e21, -0}}
	seven := 7
	for i := 0; i < n; i++ {
		o.Floats = append(o.Floats, float64(i)*1.5e-8-3, 1e21*float64(i))
		o.Uints = append(o.Uints, uint(i)*1e12)
		o.Strings = append(o.Strings, strings.Repeat(",", i%3)+"é\u2029<&>")
		o.Leaves = append(o.Leaves, leaf{A: i, B: strings.Repeat("b", i%2), D: make([]int, i%3)})
		p := &leaf{A: -i}
		if i%5 == 0 {
			p = nil
		} else if i%5 == 1 {
			p.C = &seven
		}
		o.Ptrs = append(o.Ptrs, p)
		o.Times = append(o.Times, time.Date(2026, 1, 1, 0, 0, i, i, time.UTC))
		if i%600 == 0 {
			o.Nested = append(o.Nested, make([]float64, 600+i))
		}
	}
	o.Pointer = &outer{Floats: o.Floats[:streamThreshold]}
	o.Shadow = shadow{leaf: &leaf{A: 3, B: "promoted", D: make([]int, n)}, A: "outer", G: o.Leaves}
	o.TwoDeep = twoDeep{shadow: o.Shadow, embedded: o.Embedded, B: 9}
	for _, prefix := range []string{"", "    "} {
		sameJSON(t, "shapes", o, prefix)
		sameJSON(t, "pointer to shapes", &o, prefix)
		sameJSON(t, "slice at top", o.Leaves, prefix)
		sameJSON(t, "nil", nil, prefix)
	}
}

// FuzzJSONStream: any text in the strings of a streamed report gives the
// bytes MarshalIndent gives.
func FuzzJSONStream(f *testing.F) {
	f.Add("plain", "µS/cm", 3)
	f.Add("\x1b[2J\u2028\"\\", "<script>", 700)
	f.Fuzz(func(t *testing.T, a, b string, n int) {
		n = min(max(n, 0), 2*chunkLen)
		v := struct {
			S  []string  `json:"s"`
			F  []float64 `json:"f"`
			Ks []struct {
				K string   `json:"k"`
				L []string `json:"l,omitempty"`
			} `json:"ks"`
		}{}
		for i := 0; i < n; i++ {
			v.S = append(v.S, a)
			v.F = append(v.F, float64(len(b)*i)/7)
			v.Ks = append(v.Ks, struct {
				K string   `json:"k"`
				L []string `json:"l,omitempty"`
			}{K: b, L: v.S[:i%3]})
		}
		got, want := streamed(t, v, "  "), marshalled(t, v, "  ")
		if !bytes.Equal(got, want) {
			t.Fatalf("differs at byte %d", firstDiff(got, want))
		}
	})
}

// liveHeapWriter discards what is written and, every `every` bytes, runs a
// collection and records the live heap: the memory the writer's caller holds
// while it writes.
type liveHeapWriter struct {
	n, next, every int
	peak           uint64
}

func (w *liveHeapWriter) Write(p []byte) (int, error) {
	w.n += len(p)
	if w.n >= w.next {
		w.next = w.n + w.every
		runtime.GC()
		var m runtime.MemStats
		runtime.ReadMemStats(&m)
		w.peak = max(w.peak, m.HeapAlloc)
	}
	return len(p), nil
}

// TestJSONStreamMemory: writing the JSON of a 60,000-reading analysis holds
// a few MB beyond the analysis itself, not the text (which MarshalIndent
// builds whole: about 40 MB here, 160 MB for a session of 250,000
// readings, which made `inspect --json` of a 64 MiB file take 1.2 GB).
func TestJSONStreamMemory(t *testing.T) {
	if testing.Short() {
		t.Skip("analyses 60,000 readings")
	}
	a := analyse(bigSessions(t, 60_000)[0])
	if a.Report == nil {
		t.Fatal(a.AnalysisError)
	}
	runtime.GC()
	var m runtime.MemStats
	runtime.ReadMemStats(&m)
	base := m.HeapAlloc
	w := &liveHeapWriter{every: 2 << 20}
	bw := bufio.NewWriterSize(w, 64<<10)
	if err := writeJSONIndented(bw, a, "    ", "  "); err != nil {
		t.Fatal(err)
	}
	if err := bw.Flush(); err != nil {
		t.Fatal(err)
	}
	held := int64(w.peak) - int64(base)
	t.Logf("%d bytes of JSON written holding at most %d bytes beyond the analysis", w.n, held)
	if w.n < 20<<20 {
		t.Fatalf("only %d bytes written: the test needs an output much larger than its bound", w.n)
	}
	if held > 8<<20 {
		t.Errorf("writing %d bytes of JSON held %d bytes beyond the analysis; the bound is 8 MiB", w.n, held)
	}
	runtime.KeepAlive(a)
}

// jsonLoop embeds a pointer to itself: its fields are looked at once.
type jsonLoop struct {
	*jsonLoop
	L int `json:"l"`
}

// TestJSONStreamFieldRules: encoding/json's rules for which fields a struct
// writes (names shared at one depth with and without tags, unexported
// embedded structs and non-structs, embedded pointers, a type embedded
// twice or in itself, options after the name), each against MarshalIndent,
// in structs that hold a slice long enough to be streamed.
func TestJSONStreamFieldRules(t *testing.T) {
	type inner struct {
		X int `json:"x"`
		Y int
		Z int `json:",omitempty"`
	}
	type other struct {
		X int `json:"x"` // same depth, both tagged: neither is written
		Y int `json:"Y"` // tagged beats inner's untagged Y
		W int `json:"w,omitempty"`
	}
	type myInt int
	type deep struct{ inner }
	type rules struct {
		inner
		*other
		deep  // inner again, one level deeper: its fields lose
		myInt // unexported embedded non-struct: skipped
		jsonLoop
		Pub  myInt `json:"pub,omitzero"`
		skip int
		Dup  int   `json:"inner"`
		Long []int `json:"long"`
	}
	long := make([]int, streamThreshold+5)
	for i := range long {
		long[i] = i
	}
	for i, v := range []rules{
		{},
		{inner: inner{X: 1, Y: -1, Z: 1}, deep: deep{inner{X: 1, Y: 2, Z: 3}}, myInt: 4, Pub: 2, skip: 5, Dup: 6, Long: long},
		{other: &other{X: 7, Y: 8, W: 3}, jsonLoop: jsonLoop{jsonLoop: &jsonLoop{L: 9}, L: 10}, Long: long},
	} {
		_ = v.skip
		for _, prefix := range []string{"", "  "} {
			sameJSON(t, fmt.Sprintf("field rules %d", i), v, prefix)
			sameJSON(t, fmt.Sprintf("field rules %d, pointer", i), &v, prefix)
		}
	}
}

// FuzzJSONFloat: appendJSONFloat writes a float64 as json.Marshal does
// (the oracle), for any bits, and refuses what Marshal refuses.
func FuzzJSONFloat(f *testing.F) {
	for _, v := range []float64{0, math.Copysign(0, -1), 1, -1.5, 1e-6, 9.999999e-7, 1e-7, 1e21, 9.99e20, 1e-300,
		5e-324, math.MaxFloat64, 123456.789, 1e100, math.NaN(), math.Inf(1), math.Inf(-1)} {
		f.Add(math.Float64bits(v))
	}
	f.Fuzz(func(t *testing.T, bits uint64) {
		v := math.Float64frombits(bits)
		got, ok := appendJSONFloat(nil, v)
		want, err := json.Marshal(v)
		if ok != (err == nil) || ok && string(got) != string(want) {
			t.Fatalf("%v (%#x): %q %v; json.Marshal %q %v", v, bits, got, ok, want, err)
		}
	})
}

// TestJSONStreamInfluence: the influence rows of a big report, with
// reasons holding what JSON escapes, and long slices of numbers of every
// size of float, are MarshalIndent's bytes (the oracle) through fastJSON.
func TestJSONStreamInfluence(t *testing.T) {
	n := 3*chunkLen + 5
	rows := make([]fitcore.PointInfluence, n)
	nums := make([]float64, n)
	for i := range rows {
		v := math.Float64frombits(uint64(i)*0x9e3779b97f4a7c15 | 1)
		if math.IsNaN(v) || math.IsInf(v, 0) {
			v = float64(i)
		}
		nums[i] = v
		rows[i] = fitcore.PointInfluence{Index: i, Leverage: v, Residual: -v / 3, Studentized: float64(i) * 1e-8,
			CooksD: 1e21 * float64(i), DFFITS: 1 / float64(i+1), Flagged: i%7 == 0}
		if i%7 == 0 {
			rows[i].Reasons = []string{"leverage > 3p/n & \"large\"", "µ \u2028 \x7f tab\t", ""}
		}
	}
	v := struct {
		Rows []fitcore.PointInfluence `json:"rows"`
		Nums []float64                `json:"nums"`
	}{rows, nums}
	if !fastType(reflect.TypeFor[fitcore.PointInfluence]()) {
		t.Fatal("PointInfluence is not written by fastJSON")
	}
	sameJSON(t, "influence", v, "  ")
	sameJSON(t, "influence, no prefix", v, "")
}
