package cli

import (
	"bytes"
	"crypto/sha256"
	"encoding/binary"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"pairline/app/session"
	"pairline/app/wording"
	"pairline/fitcore"
)

// oneVisibleLine fails unless s is exactly one line starting with prefix,
// with no control, bidirectional or separator character in it (the line's
// own newline aside).
func oneVisibleLine(t *testing.T, what, s, prefix string) {
	t.Helper()
	if !strings.HasSuffix(s, "\n") || strings.Count(s, "\n") != 1 || !strings.HasPrefix(s, prefix) {
		t.Errorf("%s: want one line starting %q, got %q", what, prefix, s)
	}
	noHidden(t, what, strings.TrimSuffix(s, "\n"))
}

// noHidden fails when s holds a character wording.Visible would escape or
// bytes that are not UTF-8 (newlines allowed: s may be a whole output).
func noHidden(t *testing.T, what, s string) {
	t.Helper()
	if !utf8.ValidString(s) {
		t.Errorf("%s: output is not valid UTF-8: %q", what, s)
	}
	for i, r := range s {
		if r != '\n' && wording.Hidden(r) {
			t.Errorf("%s: raw %U at byte %d in %q", what, r, i, s)
			return
		}
	}
}

// TestFitFlagRanges: every numeric flag is checked, before the file is read,
// against the range fitcore.Options.Normalize states; the error is one line
// that names the flag and the range, exit status 2. The cases of the
// hardening issue: --level 1e-300 and 5e-324 used to panic, --level 0 was
// silently read as 0.95.
func TestFitFlagRanges(t *testing.T) {
	file := filepath.Join(csvDir, "quoted.csv")
	levelRange := fmt.Sprintf("from %g to %g", fitcore.MinLevel, fitcore.MaxLevel)
	lambdaRange := fmt.Sprintf("from %g to %g", -fitcore.MaxBoxCoxLambda, fitcore.MaxBoxCoxLambda)
	ratioRange := fmt.Sprintf("from %g to %g", fitcore.MinVarianceRatio, fitcore.MaxVarianceRatio)
	bigRange := fmt.Sprintf("from %g to %g", -MaxFlagNumber, MaxFlagNumber)
	cases := []struct {
		name string
		args []string
		want []string
	}{
		{"level 1e-300", []string{"--level", "1e-300"}, []string{"--level 1e-300", levelRange}},
		{"level 5e-324", []string{"--level", "5e-324"}, []string{"--level 5e-324", levelRange}},
		{"level 0 typed", []string{"--level", "0"}, []string{"--level 0", levelRange}},
		{"level 0.3", []string{"--level", "0.3"}, []string{"--level 0.3", levelRange}},
		{"level 1", []string{"--level", "1"}, []string{"--level 1", levelRange}},
		{"level as percent", []string{"--level=95"}, []string{"--level 95", levelRange}},
		{"level negative", []string{"--level", "-0.95"}, []string{"--level -0.95", levelRange}},
		{"level NaN", []string{"--level", "NaN"}, []string{"--level", "not a finite number"}},
		{"level Inf", []string{"--level", "+Inf"}, []string{"--level", "not a finite number"}},
		{"level 1e999", []string{"--level", "1e999"}, []string{"--level"}},
		{"level text", []string{"--level", "high"}, []string{"--level", "not a number"}},
		{"lambda 6", []string{"--transform", "box_cox", "--box-cox-lambda", "6"}, []string{"--box-cox-lambda 6", lambdaRange}},
		{"lambda NaN", []string{"--transform", "box_cox", "--box-cox-lambda", "nan"}, []string{"--box-cox-lambda", "not a finite number"}},
		{"lambda without box_cox", []string{"--box-cox-lambda", "0.5"}, []string{"--box-cox-lambda 0.5", "box_cox"}},
		{"ratio 0 typed", []string{"--model", "deming", "--variance-ratio", "0"}, []string{"--variance-ratio 0", ratioRange}},
		{"ratio 1e7", []string{"--model", "deming", "--variance-ratio", "1e7"}, []string{"--variance-ratio 1e+07", ratioRange}},
		{"ratio negative", []string{"--model", "deming", "--variance-ratio", "-1"}, []string{"--variance-ratio -1", ratioRange}},
		{"ratio Inf", []string{"--model", "deming", "--variance-ratio", "Inf"}, []string{"--variance-ratio", "not a finite number"}},
		{"ratio without deming", []string{"--variance-ratio", "2"}, []string{"--variance-ratio", "deming"}},
		{"slope ref Inf", []string{"--slope-ref", "Inf"}, []string{"--slope-ref", "not a finite number"}},
		{"slope ref huge", []string{"--slope-ref", "1e101"}, []string{"--slope-ref", bigRange}},
		{"intercept ref NaN", []string{"--intercept-ref", "NaN"}, []string{"--intercept-ref", "not a finite number"}},
		{"x uncertainty negative", []string{"--x-uncertainty", "-0.1"}, []string{"--x-uncertainty -0.1", "zero or a positive number"}},
		{"x uncertainty huge", []string{"--x-uncertainty", "1e300"}, []string{"--x-uncertainty", bigRange}},
		{"y uncertainty NaN", []string{"--y-uncertainty", "NaN"}, []string{"--y-uncertainty", "not a finite number"}},
		{"predict NaN", []string{"--predict-x", "NaN"}, []string{"--predict-x", "not a finite number"}},
		{"predict Inf", []string{"--predict-x", "-Inf"}, []string{"--predict-x", "not a finite number"}},
		{"predict huge", []string{"--predict-x", "1e200"}, []string{"--predict-x", bigRange}},
		{"inverse Inf", []string{"--inverse-y", "100;Inf"}, []string{"--inverse-y", "not a finite number"}},
		{"inverse huge", []string{"--inverse-y", "-1e150"}, []string{"--inverse-y", bigRange}},
		{"model unknown", []string{"--model", "cubic"}, []string{`--model "cubic"`, "ols, origin, weighted or deming"}},
		{"transform unknown", []string{"--transform", "log"}, []string{`--transform "log"`, "log_y"}},
		{"weights unknown", []string{"--weights", "y"}, []string{`--weights "y"`, "power"}},
		{"weights given", []string{"--weights", "given"}, []string{"--weights given", "power"}},
		{"weights with origin", []string{"--origin", "--weights", "x"}, []string{"--weights x", "origin"}},
		{"weights with deming", []string{"--model", "deming", "--weights", "x2"}, []string{"--weights x2", "Deming"}},
		{"weighted without weights", []string{"--model", "weighted"}, []string{"--weights"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			code, out, errs := runFitCmd(t, "", append(c.args, file)...)
			if code != ExitUsage || out != "" {
				t.Fatalf("exit %d, stdout %q; want %d and nothing", code, out, ExitUsage)
			}
			oneVisibleLine(t, c.name, errs, "pairline fit: ")
			for _, w := range c.want {
				if !strings.Contains(errs, w) {
					t.Errorf("stderr %q does not say %q", errs, w)
				}
			}
		})
	}
}

// TestFitFlagsAccepted: the ends of each range and the options fitcore
// offers are taken, and reach the report.
func TestFitFlagsAccepted(t *testing.T) {
	file := filepath.Join(csvDir, "quoted.csv")
	cases := []struct {
		name  string
		args  []string
		check func(*fitcore.Report) error
	}{
		{"default level", nil, func(r *fitcore.Report) error {
			if r.Level != fitcore.DefaultLevel {
				return fmt.Errorf("level %v, want fitcore.DefaultLevel %v", r.Level, fitcore.DefaultLevel)
			}
			return nil
		}},
		{"lowest level", []string{"--level", "0.5"}, func(r *fitcore.Report) error {
			if r.Level != 0.5 {
				return fmt.Errorf("level %v", r.Level)
			}
			return nil
		}},
		{"highest level", []string{"--level", "0.9999"}, func(r *fitcore.Report) error {
			if r.Level != 0.9999 {
				return fmt.Errorf("level %v", r.Level)
			}
			return nil
		}},
		// The hardening issue's other known bug: fitcore offers the power
		// weights the advice uses, the command refused them.
		{"power weights", []string{"--weights", "power"}, func(r *fitcore.Report) error {
			if r.Model != fitcore.ModelWeighted || len(r.Weights) != r.N || r.WeightPower == 0 {
				return fmt.Errorf("model %s, %d weights, power %v", r.Model, len(r.Weights), r.WeightPower)
			}
			return nil
		}},
		{"lambda at the limit", []string{"--transform", "box_cox", "--box-cox-lambda", "-5"}, func(r *fitcore.Report) error {
			if r.TransformLambda == nil || *r.TransformLambda != -5 {
				return fmt.Errorf("transform_lambda %v", r.TransformLambda)
			}
			return nil
		}},
		{"references", []string{"--slope-ref", "0,98", "--intercept-ref", "-2"}, func(r *fitcore.Report) error {
			if r.Slope.Ref != 0.98 || r.Intercept.Ref != -2 {
				return fmt.Errorf("refs %v %v", r.Slope.Ref, r.Intercept.Ref)
			}
			return nil
		}},
		{"x uncertainty", []string{"--x-uncertainty", "0.5", "--y-uncertainty", "0"}, func(r *fitcore.Report) error {
			if r.Checks.XExactness == nil {
				return fmt.Errorf("no x-exactness check with --x-uncertainty 0.5")
			}
			return nil
		}},
		{"deming ratio", []string{"--model", "deming", "--variance-ratio", "1e6"}, func(r *fitcore.Report) error {
			if r.Model != fitcore.ModelDeming {
				return fmt.Errorf("model %s", r.Model)
			}
			return nil
		}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			code, out, errs := runFitCmd(t, "", append(append([]string{"--json"}, c.args...), file)...)
			if code != ExitOK {
				t.Fatalf("exit %d: %s", code, errs)
			}
			if err := c.check(decodeReport(t, out)); err != nil {
				t.Error(err)
			}
		})
	}
}

// hostileCSV has header names that retitle the terminal (OSC 0), clear it
// (CSI 2J), reverse the text after them (U+202E) and, through a quoted
// newline, forge a line of their own.
const hostileCSV = "\"std\x1b]0;owned\x07\",\"meter\u202e\nchecksum OK\x1b[2J\"\n1,1.1\n2,2.0\n3,3.2\n4,3.9\n5,5.1\n\"x\x1b[31m\",6\n"

// TestFitEscapesFileText: header names and cell text from the file reach
// the terminal only as visible escapes; no output line is a forged
// "checksum OK".
func TestFitEscapesFileText(t *testing.T) {
	for _, args := range [][]string{{"-"}, {"--json", "-"}, {"--x-col", "nope", "-"}} {
		code, out, errs := runFitCmd(t, hostileCSV, args...)
		what := strings.Join(args, " ")
		noHidden(t, what+" stdout", out)
		noHidden(t, what+" stderr", errs)
		for _, l := range strings.Split(out+errs, "\n") {
			if strings.HasPrefix(strings.TrimSpace(l), "checksum OK") {
				t.Errorf("%s: forged line %q", what, l)
			}
		}
		switch args[0] {
		case "-":
			if code != ExitOK || !strings.Contains(out, `std\x1b]0;owned\x07`) || !strings.Contains(out, `meter\u202e\x0achecksum OK\x1b[2J`) {
				t.Errorf("text: exit %d, the header names are not shown escaped:\n%s", code, out)
			}
			if !strings.Contains(out, `x\x1b[31m`) {
				t.Errorf("text: the skipped cell is not shown escaped:\n%s", out)
			}
		case "--json":
			if code != ExitOK || !json.Valid([]byte(out)) {
				t.Errorf("json: exit %d, valid %v", code, json.Valid([]byte(out)))
			}
		default:
			if code != ExitUsage {
				t.Errorf("--x-col nope: exit %d", code)
			}
			oneVisibleLine(t, what, errs, "pairline fit: ")
		}
	}
}

// TestFitBadNames: a file name with a newline or an escape sequence, and a
// folder, give one readable line.
func TestFitBadNames(t *testing.T) {
	dir := t.TempDir()
	for _, c := range []struct{ name, path, want string }{
		{"newline", filepath.Join(dir, "a\nb.csv"), `a\x0ab.csv: cannot open`},
		{"escape", filepath.Join(dir, "\x1b]0;t\x07.csv"), `\x1b]0;t\x07.csv`},
		{"folder", dir, "is a folder"},
	} {
		code, _, errs := runFitCmd(t, "", c.path)
		if code != ExitUsage || !strings.Contains(errs, c.want) {
			t.Errorf("%s: exit %d, stderr %q; want %d and %q", c.name, code, errs, ExitUsage, c.want)
		}
		oneVisibleLine(t, c.name, errs, "pairline fit: ")
	}
	// Flags given with control characters.
	code, _, errs := runFitCmd(t, "", "--bo\ngus", "-")
	if code != ExitUsage {
		t.Errorf("--bo\\ngus: exit %d", code)
	}
	oneVisibleLine(t, "unknown flag with a newline", errs, "pairline fit: ")
}

// messageTexts collects the sentences of a report's JSON: every string
// under a key that holds words for people. The checks of the advice's
// candidate fits (before, after and each candidate's summary) are left
// out: they are the messages of other fits, which the text sums up as
// verdicts.
func messageTexts(v any, key string, out *[]string) {
	switch x := v.(type) {
	case map[string]any:
		if key == "before" || key == "after" || key == "summary" {
			return
		}
		for k, e := range x {
			messageTexts(e, k, out)
		}
	case []any:
		for _, e := range x {
			messageTexts(e, key, out)
		}
	case string:
		switch key {
		case "message", "advice", "reason", "why", "notes", "reasons", "summary":
			if strings.TrimSpace(x) != "" {
				*out = append(*out, x)
			}
		}
	}
}

// TestFitTextHasEveryMessage: the text summary shows every sentence the
// JSON has: range warnings of predictions, the explanation of an interval
// shown as 0 to 0 after a reciprocal transform, an unbounded inverse
// interval, skipped rows, transform notes, check messages and advice.
func TestFitTextHasEveryMessage(t *testing.T) {
	quoted := filepath.Join(csvDir, "quoted.csv")
	cases := []struct {
		name string
		args []string
		must []string // substrings of messages the case is there for
	}{
		{"reciprocal outside range", []string{"--transform", "reciprocal_y", "--predict-x", "5000", "--predict-x", "100", "--inverse-y", "1", quoted},
			[]string{"outside the calibrated range", "shown as 0", "unbounded"}},
		{"box-cox estimated", []string{"--transform", "box_cox", "--predict-x", "-50", quoted}, []string{"Box–Cox λ"}},
		{"skipped rows", []string{filepath.Join(csvDir, "blank_incomplete.csv")}, []string{"skipped"}},
		{"x exactness", []string{"--x-uncertainty", "3", "--weights", "power", quoted}, nil},
		{"log scale", []string{"--transform", "log_log", "--predict-x", "0", quoted}, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			code, js, errs := runFitCmd(t, "", append([]string{"--json"}, c.args...)...)
			if code != ExitOK {
				t.Fatalf("--json: exit %d: %s", code, errs)
			}
			code, text, errs := runFitCmd(t, "", c.args...)
			if code != ExitOK {
				t.Fatalf("text: exit %d: %s", code, errs)
			}
			var v any
			if err := json.Unmarshal([]byte(js), &v); err != nil {
				t.Fatal(err)
			}
			var msgs []string
			messageTexts(v, "", &msgs)
			for _, m := range c.must {
				found := false
				for _, s := range msgs {
					found = found || strings.Contains(s, m)
				}
				if !found {
					t.Errorf("the JSON has no message with %q; the case no longer tests it", m)
				}
			}
			for _, m := range msgs {
				if !strings.Contains(text, oneLine(m)) {
					t.Errorf("the text summary lacks the JSON's message %q", m)
				}
			}
			t.Logf("%d messages of the JSON found in the text", len(msgs))
		})
	}
}

// writeSessionFile encodes sessions as a .pairline file in dir and applies
// the byte replacements patch (each must occur exactly once in the body),
// then writes a fresh SHA-256: a file as a tablet could have written it
// before the validation of settings was what it is now (layout in
// app/session/FORMAT.md: 20-byte header, body, 32-byte SHA-256 of both).
func writeSessionFile(t *testing.T, dir, name string, sessions []*session.Session, patch ...[2][]byte) string {
	t.Helper()
	b, err := session.EncodeBytes(sessions)
	if err != nil {
		t.Fatal(err)
	}
	const header = 20
	n := binary.BigEndian.Uint64(b[12:20])
	body := b[header : header+n]
	for _, p := range patch {
		if bytes.Count(body, p[0]) != 1 || len(p[0]) != len(p[1]) {
			t.Fatalf("patch %q → %q does not apply once", p[0], p[1])
		}
		i := bytes.Index(body, p[0])
		copy(body[i:], p[1])
	}
	sum := sha256.Sum256(b[:header+n])
	copy(b[header+n:], sum[:])
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func testSession(t *testing.T, title string) *session.Session {
	t.Helper()
	s, err := session.New(title, time.Date(2026, 3, 1, 9, 0, 0, 0, time.UTC), bytes.NewReader(bytes.Repeat([]byte{7}, 64)))
	if err != nil {
		t.Fatal(err)
	}
	for i, y := range []string{"1.1", "2.0", "3.2", "3.9", "5.1"} {
		s.Readings = append(s.Readings, session.Reading{X: fmt.Sprint(i + 1), Y: y})
	}
	return s
}

// f64 is the MessagePack encoding of a float64 (0xcb and 8 big-endian bytes).
func f64(key string, v float64) []byte {
	b := append([]byte{0xa0 | byte(len(key))}, key...)
	b = append(b, 0xcb)
	return binary.BigEndian.AppendUint64(b, math.Float64bits(v))
}

// TestInspectStoredSettings: a session file whose stored level or setting
// combination the command would refuse is never analysed. Either the file
// is refused by the session validation (one line, exit 2) or inspect shows
// why the settings cannot be used; it never panics, in text or JSON.
func TestInspectStoredSettings(t *testing.T) {
	dir := t.TempDir()
	mk := func(name string, edit func(*session.Session), patch ...[2][]byte) string {
		s := testSession(t, "Invented check "+name)
		edit(s)
		return writeSessionFile(t, dir, name+".pairline", []*session.Session{s}, patch...)
	}
	cases := []struct {
		name, path, want string
	}{
		{"level 1e-300", mk("tiny", func(s *session.Session) { s.Settings.Level = 0.5 },
			[2][]byte{f64("level", 0.5), f64("level", 1e-300)}), "level"},
		{"level 5e-324", mk("subnormal", func(s *session.Session) { s.Settings.Level = 0.5 },
			[2][]byte{f64("level", 0.5), f64("level", 5e-324)}), "level"},
		{"level 0.3", mk("low", func(s *session.Session) { s.Settings.Level = 0.5 },
			[2][]byte{f64("level", 0.5), f64("level", 0.3)}), "level"},
		{"lambda without box_cox", mk("lambda", func(s *session.Session) {
			s.Settings.Transform = fitcore.TransformBoxCox
			l := 0.5
			s.Settings.BoxCoxLambda = &l
		}, [2][]byte{[]byte("\xa9transform\xa7box_cox"), []byte("\xa9transform\xa7log_log")}), "box_cox_lambda"},
	}
	for _, c := range cases {
		for _, asJSON := range []bool{false, true} {
			args := []string{c.path}
			if asJSON {
				args = []string{"--json", c.path}
			}
			var out, errs bytes.Buffer
			code := Inspect(args, &out, &errs)
			what := fmt.Sprintf("%s (json %v)", c.name, asJSON)
			switch code {
			case ExitUsage: // refused by the session validation
				oneVisibleLine(t, what, errs.String(), "pairline inspect: ")
				if !strings.Contains(errs.String(), c.want) {
					t.Errorf("%s: the refusal %q does not name %s", what, errs.String(), c.want)
				}
			case ExitOK: // read, then refused before the analysis
				if asJSON {
					var in struct {
						Sessions []struct {
							Report        *fitcore.Report `json:"report"`
							AnalysisError string          `json:"analysis_error"`
						}
					}
					if err := json.Unmarshal(out.Bytes(), &in); err != nil || len(in.Sessions) != 1 {
						t.Fatalf("%s: %v", what, err)
					}
					if in.Sessions[0].Report != nil || !strings.Contains(in.Sessions[0].AnalysisError, c.want) {
						t.Errorf("%s: report %v, analysis_error %q; want none and a reason naming %s", what,
							in.Sessions[0].Report != nil, in.Sessions[0].AnalysisError, c.want)
					}
				} else if !strings.Contains(out.String(), "Analysis not possible: the session's fit settings cannot be used: "+c.want) {
					t.Errorf("%s: output does not say the settings cannot be used:\n%s", what, out.String())
				}
			default:
				t.Errorf("%s: exit %d, stderr %q", what, code, errs.String())
			}
		}
	}
}

// TestInspectEscapesFileText: titles, names, units, notes, reasons and cell
// text of a session reach the terminal only as visible escapes, so that a
// title cannot forge "checksum OK" or retitle the terminal; the JSON form
// escapes what encoding/json leaves raw and still decodes to the same text.
func TestInspectEscapesFileText(t *testing.T) {
	s := testSession(t, "Probe\nchecksum OK (SHA-256 forged)\x1b]0;owned\x07")
	s.Notes = "line one\nchecksum OK\x1b[2J\u202eevil"
	s.XName, s.XUnit = "std\u009b2J", "µS/cm\x7f"
	s.YName, s.YUnit = "meter\u2066", "\x1b[31mred"
	s.Site, s.Operator = "site\r\x1b[K", "op\u200f"
	s.Instrument = session.Instrument{Description: "meter\x1b]2;x\x1b\\", Serial: "\u202a1"}
	s.Readings[1].Excluded, s.Readings[1].ExcludeReason = true, "bubble\n\x1b[2Jchecksum OK"
	s.Readings = append(s.Readings, session.Reading{X: "7", Y: "\x1b[2J"})
	dir := t.TempDir()
	path := writeSessionFile(t, dir, "hostile.pairline", []*session.Session{s})

	var out, errs bytes.Buffer
	if code := Inspect([]string{path}, &out, &errs); code != ExitOK {
		t.Fatalf("exit %d: %s", code, errs.String())
	}
	text := out.String()
	noHidden(t, "inspect text", text)
	for _, l := range strings.Split(text, "\n") {
		if strings.HasPrefix(strings.TrimSpace(l), "checksum OK") {
			t.Errorf("forged line %q", l)
		}
	}
	for _, want := range []string{`Probe\x0achecksum OK (SHA-256 forged)\x1b]0;owned\x07`, `std\u009b2J (µS/cm\x7f)`,
		`\x1b[31mred`, `\u202eevil`, `"\x1b[2J"`, `bubble \x1b[2Jchecksum OK`} {
		if !strings.Contains(text, want) {
			t.Errorf("text lacks %q:\n%s", want, text)
		}
	}

	out.Reset()
	if code := Inspect([]string{"--json", path}, &out, &errs); code != ExitOK {
		t.Fatalf("--json: exit %d: %s", code, errs.String())
	}
	noHidden(t, "inspect --json", out.String())
	var in struct {
		Sessions []struct{ Session *session.Session }
	}
	if err := json.Unmarshal(out.Bytes(), &in); err != nil {
		t.Fatal(err)
	}
	got := in.Sessions[0].Session
	if got.Title != s.Title || got.Notes != s.Notes || got.XName != s.XName || got.YName != s.YName || got.Operator != s.Operator {
		t.Errorf("the JSON does not decode to the stored text: %q %q %q", got.Title, got.Notes, got.XName)
	}
}

// TestInspectBadNames: a folder is named as a folder (not "incomplete … cut
// short?"), and a name with a newline or an escape gives one visible line.
func TestInspectBadNames(t *testing.T) {
	dir := t.TempDir()
	odd := filepath.Join(dir, "a\nb\x1b[2J.pairline")
	if err := os.WriteFile(odd, []byte("x,y\n1,2\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ name, path, want string }{
		{"folder", dir, "is a folder, not a session file"},
		{"odd name", odd, `a\x0ab\x1b[2J.pairline: `},
		{"missing odd name", odd + "\n", `.pairline\x0a: cannot open`},
	} {
		for cmd, run := range map[string]func([]string, *bytes.Buffer, *bytes.Buffer) int{
			"inspect":    func(a []string, o, e *bytes.Buffer) int { return Inspect(a, o, e) },
			"export-csv": func(a []string, o, e *bytes.Buffer) int { return ExportCSV(a, o, e) },
		} {
			var out, errs bytes.Buffer
			code := run([]string{c.path}, &out, &errs)
			if code != ExitUsage || !strings.Contains(errs.String(), c.want) {
				t.Errorf("%s %s: exit %d, stderr %q; want %d and %q", cmd, c.name, code, errs.String(), ExitUsage, c.want)
			}
			oneVisibleLine(t, cmd+" "+c.name, errs.String(), "pairline "+cmd+": ")
		}
	}
	var out, errs bytes.Buffer
	if code := Inspect([]string{"--x\x1b[2J", "f"}, &out, &errs); code != ExitUsage {
		t.Errorf("unknown flag: exit %d", code)
	}
	first, _, _ := strings.Cut(errs.String(), "\n")
	if first != `pairline inspect: flag provided but not defined: -x\x1b[2J` {
		t.Errorf("unknown flag: first line %q", first)
	}
	noHidden(t, "unknown flag", first)
}

// FuzzFitFlags: any argument list (NUL separates the arguments) on a small
// valid file never panics, exits 0 or 2, and on 2 writes one visible line.
func FuzzFitFlags(f *testing.F) {
	for _, s := range []string{
		"--level\x001e-300\x00-",
		"--level\x005e-324\x00-",
		"--level\x000\x00-",
		"--json\x00--weights\x00power\x00-",
		"--transform\x00box_cox\x00--box-cox-lambda\x005\x00-",
		"--model\x00deming\x00--variance-ratio\x000\x00-",
		"--predict-x\x00NaN\x00--inverse-y\x001;2\x00-",
		"--slope-ref\x001e400\x00-",
		"--x-col\x00\x1b]0;t\x07\x00-",
		"-\x00--bo\ngus",
		"--origin\x00--weights\x00x\x00-",
		"--x-uncertainty\x00-0\x00--json\x00-",
	} {
		f.Add(s)
	}
	const csv = "x,y\n1,1.1\n2,2.0\n3,3.2\n4,3.9\n5,5.1\n"
	f.Fuzz(func(t *testing.T, s string) {
		args := strings.Split(s, "\x00")
		if len(args) > 40 {
			return
		}
		for _, a := range args {
			if a != "-" && !strings.HasPrefix(a, "-") && a != "" && !strings.ContainsAny(a, "=;.0123456789") {
				return // a file name: the fuzzer would only probe the file system
			}
		}
		var out, errb bytes.Buffer
		code := Fit(args, strings.NewReader(csv), &out, &errb)
		switch code {
		case ExitOK:
			if errb.Len() != 0 {
				t.Fatalf("exit 0 with stderr %q", errb.String())
			}
			noHidden(t, "stdout", out.String())
		case ExitUsage:
			oneVisibleLine(t, fmt.Sprintf("%q", args), errb.String(), "pairline fit: ")
		default:
			t.Fatalf("exit %d for %q: %s", code, args, errb.String())
		}
	})
}

// TestExportCSVTerminal: on a terminal (a character device) export-csv
// shows control characters of the cells as escapes; into a file or a pipe
// it writes them as typed.
func TestExportCSVTerminal(t *testing.T) {
	s := testSession(t, "Invented export")
	s.Readings[0].Y = "1.1\x1b[2J"
	path := writeSessionFile(t, t.TempDir(), "e.pairline", []*session.Session{s})
	var buf, errs bytes.Buffer
	if code := ExportCSV([]string{path}, &buf, &errs); code != ExitOK || !strings.Contains(buf.String(), "1.1\x1b[2J") {
		t.Errorf("to a buffer: exit %d, %q (the CSV must keep the text as typed)", code, buf.String())
	}
	buf.Reset()
	if err := writeReadings(&buf, s, true); err != nil || !strings.Contains(buf.String(), `1.1\x1b[2J`) || strings.Contains(buf.String(), "\x1b") {
		t.Errorf("on a terminal: %v, %q (want the escape shown)", err, buf.String())
	}
	if !isTerminal(mustOpen(t, os.DevNull)) {
		t.Skipf("SKIP: %s is not a character device here", os.DevNull)
	}
	if isTerminal(&buf) {
		t.Error("a buffer taken for a terminal")
	}
}

func mustOpen(t *testing.T, name string) *os.File {
	t.Helper()
	f, err := os.OpenFile(name, os.O_WRONLY, 0)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { f.Close() })
	return f
}
