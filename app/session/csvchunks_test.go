package session

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"reflect"
	"strings"
	"testing"
	"unicode/utf8"
)

// chunked is what CSVChunks gives, gathered into the form of one
// CSVResult, with the tally of the chunks.
type chunked struct {
	X, Y       []string
	Notes      []string
	Excluded   []bool
	Lines      []int
	Skipped    []int
	Incomplete int
}

func readAllChunks(data []byte, probe *CSVResult, n int) (chunked, error) {
	var got chunked
	var tally CSVTally
	c := NewCSVChunks(data, probe, probe.XCol, probe.YCol, n)
	last := -1.0
	for {
		res, err := c.Next()
		if done := c.Done(); done < last || done > 1 {
			return got, fmt.Errorf("Done went from %v to %v", last, done)
		} else {
			last = done
		}
		if err == io.EOF {
			break
		}
		if err != nil {
			return got, err
		}
		if res == nil {
			continue
		}
		got.X = append(got.X, res.X...)
		got.Y = append(got.Y, res.Y...)
		got.Lines = append(got.Lines, res.Lines...)
		got.Notes = append(got.Notes, res.Notes...)
		got.Excluded = append(got.Excluded, res.Excluded...)
		tally.Add(res)
	}
	if last != 1 {
		return got, fmt.Errorf("Done is %v at the end", last)
	}
	got.Skipped, got.Incomplete = tally.Skipped, tally.Incomplete
	return got, nil
}

func whole(res *CSVResult) chunked {
	var tally CSVTally
	tally.Add(res)
	return chunked{X: res.X, Y: res.Y, Notes: res.Notes, Excluded: res.Excluded, Lines: res.Lines, Skipped: tally.Skipped, Incomplete: res.Incomplete}
}

// TestCSVChunksMatchWholeText: reading a table in chunks (as the screen
// does, to stay responsive) gives exactly the readings, lines, skipped and
// incomplete rows that ReadCSV gives for the whole text. (The count of
// blank rows is not compared: a blank line at the edge of a chunk is not
// between two of its data rows, and a chunk of blank lines only counts in
// Blank; the import's summary has always counted them so.) The tables are
// invented.
func TestCSVChunksMatchWholeText(t *testing.T) {
	tables := map[string]string{
		"semicolon, decimal comma, header":   "stage;flow\n0,5;1,2\n0,6;1,4\n\n0,7;1,6\n0,8;\n0,9;2,0\n",
		"comma, no header, CRLF":             "1,2.5\r\n2,4.9\r\n3,7.6\r\n4,9.8\r\n",
		"tab, blank lines at the ends":       "\n\nref\tprobe\n10\t10.2\n\n\n20\t19.9\n30\t30.4\n\n",
		"three columns, incomplete runs":     "a,b,c\n1,,x\n2,,x\n3,6,x\n4,8,x\n5,,x\n6,12,x\n",
		"no final newline":                   "x;y\n1;2\n3;4",
		"units row":                          "stage,flow\nm,m3/s\n0.5,1.2\n0.6,1.4\n0.7,1.6\n",
		"blank lines, then header and units": "\n\nstage,flow\n\nm,m3/s\n0.5,1.2\n0.6,1.4\n",
		"Pairline's export": "x (µS/cm),y (µS/cm),note,excluded,exclude_reason,taken\n" +
			"84,83.1,first,false,,2025-03-14T09:00:00Z\n1413,1420,,true,bubble,2025-03-14T09:05:00Z\n2764,2750,last,false,,\n",
	}
	for name, text := range tables {
		data := []byte(text)
		probe, chunkable, err := ProbeCSV(data)
		if err != nil || !chunkable {
			t.Fatalf("%s: chunkable %v, %v", name, chunkable, err)
		}
		if strings.Contains(name, "units") && !probe.UnitsRow || strings.Contains(name, "export") && (!probe.PairlineExport || len(probe.Notes) != 3) {
			t.Fatalf("%s: the table does not test what it says (units row %v, export %v)", name, probe.UnitsRow, probe.PairlineExport)
		}
		want := whole(probe)
		for _, n := range []int{1, 2, 3, 5, 1000} {
			got, err := readAllChunks(data, probe, n)
			if err != nil {
				t.Errorf("%s, %d lines a chunk: %v", name, n, err)
				continue
			}
			if !reflect.DeepEqual(got, want) {
				t.Errorf("%s, %d lines a chunk:\n got %+v\nwant %+v", name, n, got, want)
			}
		}
	}
	// Blank lines that make up whole chunks are counted by the reader.
	data := []byte("x,y\n1,2\n\n\n\n\n3,4\n")
	probe, _, _ := ProbeCSV(data)
	c := NewCSVChunks(data, probe, probe.XCol, probe.YCol, 2)
	for _, err := c.Next(); err != io.EOF; _, err = c.Next() {
		if err != nil {
			t.Fatal(err)
		}
	}
	if c.Blank() != 4 {
		t.Errorf("%d blank lines in chunks without data, want 4 (lines 3–6, two chunks)", c.Blank())
	}
}

// TestCSVChunksErrorLine: an error in a later chunk names the line of the
// whole text (as ReadCSV of the whole text does), not of the chunk.
func TestCSVChunksErrorLine(t *testing.T) {
	long := strings.Repeat("9", MaxCSVFieldLen+1)
	data := []byte("x,y\n1,2\n3,4\n5,6\n7," + long + "\n9,10\n")
	probe, chunkable, err := ProbeCSV(data[:20])
	if err != nil || !chunkable {
		t.Fatal(chunkable, err)
	}
	c := NewCSVChunks(data, probe, probe.XCol, probe.YCol, 2)
	var ce *CSVError
	for err == nil {
		_, err = c.Next()
	}
	if !errors.As(err, &ce) || !errors.Is(err, ErrCSVLongField) {
		t.Fatalf("error %v, want a *CSVError for the long cell", err)
	}
	_, werr := ReadCSV(bytes.NewReader(data), CSVOptions{})
	var we *CSVError
	if !errors.As(werr, &we) || we.Line != 5 || ce.Line != we.Line {
		t.Errorf("chunked error at line %d, whole-text error %v; want line 5 for both", ce.Line, werr)
	}
}

// TestProbeCSV: which texts can be read in chunks, how much is probed,
// and that a beginning that fails alone gives the whole text's error.
func TestProbeCSV(t *testing.T) {
	big := func(head string, rows int, row string) []byte {
		var b strings.Builder
		b.WriteString(head)
		for range rows {
			b.WriteString(row)
		}
		return []byte(b.String())
	}
	tests := []struct {
		name      string
		data      []byte
		chunkable bool
		err       bool
	}{
		{"plain", []byte("x,y\n1,2\n3,4\n"), true, false},
		{"quotes", []byte("x,y\n\"1\",2\n3,4\n"), false, false},
		{"lone CR", []byte("x,y\r1,2\r3,4\r"), false, false},
		{"CRLF", []byte("x,y\r\n1,2\r\n3,4\r\n"), true, false},
		{"Latin-1", []byte("temp\xe9rature,y\n1,2\n3,4\n"), false, false},
		{"large", big("x;y\n", 20000, "1,5;2,5\n"), true, false},
		// The first 64 KiB hold no data row (only the header and blank
		// lines): probing them alone fails, so the whole text is probed.
		// The first 64 KiB hold no data row (only the header and blank
		// lines): probing them alone fails, so the whole text is probed.
		{"header then blank lines", append(big("x;y\n", CSVProbeSize, "\n"), "1;2\n3;4\n"...), false, false},
		{"header and blank lines only", big("x;y\n", CSVProbeSize, "\n"), false, true},
		{"empty", nil, true, true},
	}
	for _, tc := range tests {
		probe, chunkable, err := ProbeCSV(tc.data)
		if (err != nil) != tc.err || chunkable != tc.chunkable {
			t.Errorf("%s: chunkable %v, error %v; want %v, error %v", tc.name, chunkable, err, tc.chunkable, tc.err)
			continue
		}
		if err != nil {
			continue
		}
		whole, werr := ReadCSV(bytes.NewReader(tc.data), CSVOptions{})
		if werr != nil {
			t.Fatalf("%s: %v", tc.name, werr)
		}
		if probe.Delimiter != whole.Delimiter || probe.DecimalComma != whole.DecimalComma || probe.HasHeader != whole.HasHeader ||
			probe.XCol != whole.XCol || probe.YCol != whole.YCol {
			t.Errorf("%s: the probe found %q/%v/%v/%d,%d, the whole text %q/%v/%v/%d,%d", tc.name,
				probe.Delimiter, probe.DecimalComma, probe.HasHeader, probe.XCol, probe.YCol,
				whole.Delimiter, whole.DecimalComma, whole.HasHeader, whole.XCol, whole.YCol)
		}
		if len(tc.data) > CSVProbeSize && chunkable && len(probe.X) >= len(whole.X) {
			t.Errorf("%s: the probe read %d readings of %d, want only the first %d bytes", tc.name, len(probe.X), len(whole.X), CSVProbeSize)
		}
	}
}

// TestCSVTally: warnings are kept once each, in order; skipped lines and
// counts add up.
func TestCSVTally(t *testing.T) {
	var tl CSVTally
	tl.Add(&CSVResult{Blank: 1, Incomplete: 2, Skipped: []SkippedRow{{Line: 3}, {Line: 5}}, Warnings: []string{"a.", "b."}})
	tl.Add(&CSVResult{Blank: 2, Incomplete: 1, Skipped: []SkippedRow{{Line: 9}}, Warnings: []string{"b.", "c."}})
	want := CSVTally{Blank: 3, Incomplete: 3, Skipped: []int{3, 5, 9}, Warnings: []string{"a.", "b.", "c."}}
	if !reflect.DeepEqual(tl, want) {
		t.Errorf("got %+v, want %+v", tl, want)
	}
}

// FuzzCSVChunks: for any quote-free UTF-8 table that ReadCSV reads whole,
// the chunked reading either fails (and the import falls back to reading
// the whole text) or gives the same readings, lines and skipped and
// incomplete rows.
func FuzzCSVChunks(f *testing.F) {
	f.Add("x;y\n1,5;2\n\n3;4,5\n5;\n", 2)
	f.Add("1\t2\n3\t4\n", 1)
	f.Add("a,b,c\n1,2,3\n4,5,6\n", 3)
	f.Add("A\nA\n0,0", 1)
	f.Fuzz(func(t *testing.T, text string, n int) {
		data := []byte(text)
		if n < 1 || n > 50 || bytes.HasPrefix(data, []byte("\xef\xbb\xbf")) || !utf8.Valid(data) {
			return
		}
		probe, chunkable, err := ProbeCSV(data)
		if err != nil || !chunkable {
			if chunkable && len(data) <= CSVProbeSize {
				if _, werr := ReadCSV(bytes.NewReader(data), CSVOptions{}); werr == nil {
					t.Fatalf("ProbeCSV failed (%v) where ReadCSV reads the text", err)
				}
			}
			return
		}
		got, err := readAllChunks(data, probe, n)
		if err != nil {
			return // the import then reads the whole text
		}
		if want := whole(probe); !reflect.DeepEqual(got, want) {
			t.Fatalf("chunks of %d lines:\n got %+v\nwant %+v", n, got, want)
		}
	})
}
