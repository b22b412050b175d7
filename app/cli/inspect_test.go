package cli

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"pairline/app/session"
	"pairline/app/wording"
)

const sampleSession = "../../testdata/session/sample.pairline"

func readSampleSession(t *testing.T) []byte {
	t.Helper()
	b, err := os.ReadFile(sampleSession)
	if err != nil {
		t.Skipf("%s is missing: %v", sampleSession, err)
	}
	return b
}

func TestInspectJSON(t *testing.T) {
	readSampleSession(t)
	var out, errs bytes.Buffer
	if code := Inspect([]string{"--json", sampleSession}, &out, &errs); code != ExitOK {
		t.Fatalf("exit %d, stderr %q", code, errs.String())
	}
	var got struct {
		Checksum string
		Sessions []struct {
			Counts session.Counts
			Report *struct {
				N        int
				RSquared float64 `json:"r_squared"`
				Slope    struct{ Estimate float64 }
				Intercpt struct{ Estimate float64 } `json:"intercept"`
			}
		}
	}
	if err := json.Unmarshal(out.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	if got.Checksum != "ok" || len(got.Sessions) != 2 {
		t.Fatalf("checksum %q, %d sessions", got.Checksum, len(got.Sessions))
	}
	c := got.Sessions[0].Counts
	if c.Rows != 9 || c.Usable != 7 || c.Excluded != 1 || c.Problems != 1 {
		t.Errorf("counts %+v", c)
	}
	// Reference: Debian python3-scipy, scipy.stats.linregress on the seven
	// usable pairs of the invented sample (x 0 84 147 1000 1413 2000 2764,
	// y 1.2 85.9 146.1 1004.5 1419 2010 2771):
	// slope 1.0030654587866064, intercept 0.9987259012600589, r² 0.9999969476166828.
	// And on the second session (0.42 0.55 0.71 / 1.10 1.92 3.05):
	// slope 6.736966824644549, intercept −1.7493680884676137.
	want := []struct {
		n                int
		slope, icept, r2 float64
	}{
		{7, 1.0030654587866064, 0.9987259012600589, 0.9999969476166828},
		{3, 6.736966824644549, -1.7493680884676137, 0.9994921173452213 * 0.9994921173452213},
	}
	for i, w := range want {
		r := got.Sessions[i].Report
		if r == nil {
			t.Fatalf("session %d has no report", i+1)
		}
		if r.N != w.n || math.Abs(r.Slope.Estimate-w.slope) > 1e-9*math.Abs(w.slope) ||
			math.Abs(r.Intercpt.Estimate-w.icept) > 1e-8 || math.Abs(r.RSquared-w.r2) > 1e-10 {
			t.Errorf("session %d: n %d slope %v intercept %v R² %v; want %+v", i+1, r.N, r.Slope.Estimate, r.Intercpt.Estimate, r.RSquared, w)
		}
	}
}

func TestInspectText(t *testing.T) {
	readSampleSession(t)
	var out, errs bytes.Buffer
	if code := Inspect([]string{sampleSession}, &out, &errs); code != ExitOK {
		t.Fatalf("exit %d, stderr %q", code, errs.String())
	}
	for _, s := range []string{"checksum OK", "Session 1 of 2", "Larkwater Valley Water Board (invented)",
		"9 rows: 7 used, 1 left out", "row 4", "air bubble", `row 9, y: "" is empty`, "y = 0.998726 + 1.00307 · x",
		"0.999997", wording.ChecksTitle, "Shapiro–Wilk", "Acceptance criteria: " + wording.Accepted, "Session 2 of 2"} {
		if !strings.Contains(out.String(), s) {
			t.Errorf("output lacks %q", s)
		}
	}
}

func TestInspectBadFiles(t *testing.T) {
	sample := readSampleSession(t)
	dir := t.TempDir()
	write := func(name string, b []byte) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	damaged := append([]byte{}, sample...)
	damaged[len(damaged)/2] ^= 0x20
	cases := map[string]struct {
		args []string
		want string
	}{
		"missing":   {[]string{filepath.Join(dir, "nope.pairline")}, "cannot open the file"},
		"csv":       {[]string{write("a.csv", []byte("x,y\n1,2\n"))}, "not a Pairline session file"},
		"truncated": {[]string{write("t.pairline", sample[:len(sample)-10])}, "incomplete"},
		"damaged":   {[]string{write("d.pairline", damaged)}, "damaged"},
		"no file":   {nil, "usage"},
		"two files": {[]string{"a", "b"}, "usage"},
	}
	for name, tc := range cases {
		for _, cmd := range []func([]string, *bytes.Buffer, *bytes.Buffer) int{
			func(a []string, o, e *bytes.Buffer) int { return Inspect(a, o, e) },
			func(a []string, o, e *bytes.Buffer) int { return ExportCSV(a, o, e) },
		} {
			var out, errs bytes.Buffer
			code := cmd(tc.args, &out, &errs)
			if code != ExitUsage || !strings.Contains(errs.String(), tc.want) {
				t.Errorf("%s: exit %d, stderr %q; want %d and %q", name, code, errs.String(), ExitUsage, tc.want)
			}
			if tc.want != "usage" && strings.Count(errs.String(), "\n") != 1 {
				t.Errorf("%s: stderr is not one line: %q", name, errs.String())
			}
		}
	}
}

func TestExportCSV(t *testing.T) {
	sample := readSampleSession(t)
	f, err := session.Decode(bytes.NewReader(sample))
	if err != nil {
		t.Fatal(err)
	}
	var out, errs bytes.Buffer
	if code := ExportCSV([]string{sampleSession}, &out, &errs); code != ExitUsage || !strings.Contains(errs.String(), "--session") {
		t.Errorf("two sessions without --session: exit %d, %q", code, errs.String())
	}
	for _, sel := range []string{"2", f.Sessions[1].ID} {
		out.Reset()
		errs.Reset()
		if code := ExportCSV([]string{"--session", sel, sampleSession}, &out, &errs); code != ExitOK {
			t.Fatalf("--session %s: exit %d, %q", sel, code, errs.String())
		}
		res, err := session.ReadCSV(&out, session.CSVOptions{})
		if err != nil {
			t.Fatal(err)
		}
		s := f.Sessions[1]
		if len(res.X) != len(s.Readings) || res.X[0] != s.Readings[0].X || res.Y[2] != s.Readings[2].Y || !res.DecimalComma {
			t.Errorf("--session %s: read back %q %q", sel, res.X, res.Y)
		}
	}
	if code := ExportCSV([]string{"--session", "3", sampleSession}, &out, &errs); code != ExitUsage {
		t.Errorf("--session 3: exit %d", code)
	}
}

func TestMainWiresSessionCommands(t *testing.T) {
	readSampleSession(t)
	var out, errs bytes.Buffer
	if code := Main([]string{"inspect", "--json", sampleSession}, nil, &out, &errs); code != ExitOK || !json.Valid(out.Bytes()) {
		t.Errorf("pairline inspect: exit %d, stderr %q", code, errs.String())
	}
	out.Reset()
	if code := Main([]string{"export-csv", "--session", "1", sampleSession}, nil, &out, &errs); code != ExitOK || !strings.HasPrefix(out.String(), "Standard (µS/cm),") {
		t.Errorf("pairline export-csv: exit %d, output %q", code, out.String())
	}
}
