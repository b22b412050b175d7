package cli

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"pairline/app/session"
)

// TestInspectRecordJSON: the record fields of the sample (invented data)
// in `inspect --json`: the seal and its check, the expired standard and
// the unknown converted to x. The x is checked against Debian
// python3-scipy's scipy.stats.linregress line of the seven usable pairs
// (slope 1.0030654587866064, intercept 0.9987259012600589, see
// TestInspectJSON): x = (mean(612, 615.5, 611) − intercept)/slope.
func TestInspectRecordJSON(t *testing.T) {
	readSampleSession(t)
	var out, errs bytes.Buffer
	if code := Inspect([]string{"--json", sampleSession}, &out, &errs); code != ExitOK {
		t.Fatalf("exit %d, stderr %q", code, errs.String())
	}
	var got struct {
		Sessions []struct {
			Session struct {
				Standards []session.Standard
				Seal      *session.Seal
				Unknowns  []struct {
					Name     string
					Readings []string
					X, Low   *float64
					High, SE *float64
					UStd     *float64 `json:"u_standards"`
				}
			}
			SealValid        *bool                    `json:"seal_valid"`
			ExpiredStandards []session.StandardExpiry `json:"expired_standards"`
		}
	}
	if err := json.Unmarshal(out.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	s0, s1 := got.Sessions[0], got.Sessions[1]
	if s0.SealValid == nil || !*s0.SealValid || s1.SealValid != nil {
		t.Errorf("seal_valid %v and %v; want true and null", s0.SealValid, s1.SealValid)
	}
	if s0.Session.Seal == nil || len(s0.Session.Seal.Digest) != 64 || len(s0.Session.Standards) != 3 {
		t.Errorf("seal %+v, %d standards", s0.Session.Seal, len(s0.Session.Standards))
	}
	if len(s0.ExpiredStandards) != 1 || s0.ExpiredStandards[0].Index != 1 {
		t.Errorf("expired %+v; want standard 2 (expired 2025-02-28, readings of 2025-03-14)", s0.ExpiredStandards)
	}
	u := s0.Session.Unknowns
	want := ((612+615.5+611)/3 - 0.9987259012600589) / 1.0030654587866064
	if len(u) != 1 || u[0].X == nil || math.Abs(*u[0].X-want) > 1e-9*want || len(u[0].Readings) != 3 ||
		u[0].SE == nil || u[0].UStd == nil || !(*u[0].Low < *u[0].X && *u[0].X < *u[0].High) {
		t.Errorf("unknowns %+v; want x %.12g", u, want)
	}
}

// TestInspectBrokenSeal: a file changed after its seal (a reading edited,
// the file's checksum made again) opens; inspect says the seal is not
// valid and why, in JSON and in text, and exits 0: the file is readable,
// the record is what is wrong. Text from the file stays visible, not
// obeyed.
func TestInspectBrokenSeal(t *testing.T) {
	t0 := time.Date(2025, 3, 14, 8, 30, 0, 0, time.UTC)
	s, err := session.New("Tampered (invented)", t0, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range [][2]string{{"0", "0.1"}, {"10", "10.2"}, {"20", "19.9"}, {"30", "30.3"}} {
		s.AddRow(r[0], r[1], t0)
	}
	if _, err := s.AddStandard(session.Standard{Name: "lot \x1b[2J7", Value: "10", Uncertainty: "0.1"}, t0); err != nil {
		t.Fatal(err)
	}
	if err := s.SignPerformed("A. Marsh", t0.Add(time.Hour)); err != nil {
		t.Fatal(err)
	}
	s.Readings[2].Y = "20.0" // outside the methods: no new revision
	path := filepath.Join(t.TempDir(), "tampered.pairline")
	b, err := session.EncodeBytes([]*session.Session{s})
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
	var out, errs bytes.Buffer
	if code := Inspect([]string{"--json", path}, &out, &errs); code != ExitOK {
		t.Fatalf("exit %d, stderr %q", code, errs.String())
	}
	var got struct {
		Sessions []struct {
			SealValid   *bool  `json:"seal_valid"`
			SealProblem string `json:"seal_problem"`
		}
	}
	if err := json.Unmarshal(out.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	if v := got.Sessions[0]; v.SealValid == nil || *v.SealValid || !strings.Contains(v.SealProblem, "changed after revision 1 was sealed") {
		t.Errorf("seal_valid %v, problem %q", v.SealValid, v.SealProblem)
	}
	out.Reset()
	if code := Inspect([]string{path}, &out, &errs); code != ExitOK {
		t.Fatalf("exit %d, stderr %q", code, errs.String())
	}
	text := out.String()
	if !strings.Contains(text, "seal check  NOT VALID: the seal does not match the record") || strings.Contains(text, "\x1b") || !strings.Contains(text, `lot \x1b[2J7`) {
		t.Errorf("text output:\n%s", text)
	}
}

// TestExportResults: `export-csv --results` writes session.ResultsTable of
// the record (the same table as the tablet), with the unknown and units.
func TestExportResults(t *testing.T) {
	readSampleSession(t)
	var out, errs bytes.Buffer
	if code := ExportCSV([]string{"--session", "1", "--results", sampleSession}, &out, &errs); code != ExitOK {
		t.Fatalf("exit %d, stderr %q", code, errs.String())
	}
	text := out.String()
	for _, want := range []string{"figure,value,unit,detail\n", "slope,1.003065458786", "µS/cm/µS/cm", "\"unknown 1 Heron Ford raw water, bottle 3 (invented): x\",609.96478552", "acceptance,"} {
		if !strings.Contains(text, want) {
			t.Errorf("results CSV lacks %q:\n%s", want, text)
		}
	}
}
