package ui

import (
	"bytes"
	"errors"
	"reflect"
	"strings"
	"testing"

	"pairline/app/session"
)

// chunked is what readChunks gives, in the form of one CSVResult.
type chunked struct {
	X, Y       []string
	Lines      []int
	Skipped    []int
	Incomplete int
}

func readAllChunks(t testing.TB, data []byte, probe *session.CSVResult, n int) (chunked, error) {
	var got chunked
	_, err := readChunks(data, probe, probe.XCol, probe.YCol, n, func(res *session.CSVResult, off int) error {
		got.X = append(got.X, res.X...)
		got.Y = append(got.Y, res.Y...)
		for _, l := range res.Lines {
			got.Lines = append(got.Lines, l+off)
		}
		for _, s := range res.Skipped {
			got.Skipped = append(got.Skipped, s.Line+off)
		}
		got.Incomplete += res.Incomplete
		return nil
	}, nil)
	return got, err
}

func whole(res *session.CSVResult) chunked {
	w := chunked{X: res.X, Y: res.Y, Lines: res.Lines, Incomplete: res.Incomplete}
	for _, s := range res.Skipped {
		w.Skipped = append(w.Skipped, s.Line)
	}
	return w
}

// TestReadChunksMatchesWholeFile checks that reading a table in chunks (as
// the browser does, to stay responsive) gives exactly the readings, file
// lines and skipped rows that session.ReadCSV gives for the whole file.
// The tables are invented.
func TestReadChunksMatchesWholeFile(t *testing.T) {
	tables := map[string]string{
		"semicolon, decimal comma, header": "stage;flow\n0,5;1,2\n0,6;1,4\n\n0,7;1,6\n0,8;\n0,9;2,0\n",
		"comma, no header, CRLF":           "1,2.5\r\n2,4.9\r\n3,7.6\r\n4,9.8\r\n",
		"tab, blank lines at the ends":     "\n\nref\tprobe\n10\t10.2\n\n\n20\t19.9\n30\t30.4\n\n",
		"three columns, incomplete runs":   "a,b,c\n1,,x\n2,,x\n3,6,x\n4,8,x\n5,,x\n6,12,x\n",
		"no final newline":                 "x;y\n1;2\n3;4",
	}
	for name, text := range tables {
		data := []byte(text)
		probe, err := session.ReadCSV(bytes.NewReader(data), session.CSVOptions{})
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		want := whole(probe)
		for _, n := range []int{1, 2, 3, 5, 1000} {
			got, err := readAllChunks(t, data, probe, n)
			if err != nil {
				t.Errorf("%s, %d lines a chunk: %v", name, n, err)
				continue
			}
			if !reflect.DeepEqual(got, want) {
				t.Errorf("%s, %d lines a chunk:\n got %+v\nwant %+v", name, n, got, want)
			}
		}
	}
}

// TestReadChunksErrorLine checks that an error in a later chunk names the
// line of the file, not of the chunk.
func TestReadChunksErrorLine(t *testing.T) {
	data := []byte("x,y\n1,2\n3,4\n5,6\n7,8\n")
	probe, err := session.ReadCSV(bytes.NewReader(data), session.CSVOptions{})
	if err != nil {
		t.Fatal(err)
	}
	probe.XCol, probe.YCol = 0, 5 // a column the file does not have
	_, err = readAllChunks(t, data, probe, 2)
	var ce *session.CSVError
	if !errors.As(err, &ce) {
		t.Fatalf("error %v, want a *session.CSVError", err)
	}
	if ce.Line != 0 && ce.Line < 2 {
		t.Errorf("error at line %d", ce.Line)
	}
}

// FuzzReadChunks: for any quote-free UTF-8 table that ReadCSV reads whole,
// the chunked reading either fails (and the import falls back to reading
// the whole file) or gives the same readings, lines and skipped rows.
func FuzzReadChunks(f *testing.F) {
	f.Add("x;y\n1,5;2\n\n3;4,5\n5;\n", 2)
	f.Add("1\t2\n3\t4\n", 1)
	f.Add("a,b,c\n1,2,3\n4,5,6\n", 3)
	f.Fuzz(func(t *testing.T, text string, n int) {
		if n < 1 || n > 50 || strings.ContainsRune(text, '"') || !strings.HasPrefix(text, strings.TrimPrefix(text, "\ufeff")) {
			return
		}
		data := []byte(text)
		if bytes.HasPrefix(data, []byte("\xef\xbb\xbf")) || !isUTF8(data) {
			return
		}
		probe, err := session.ReadCSV(bytes.NewReader(data), session.CSVOptions{})
		if err != nil {
			return
		}
		got, err := readAllChunks(t, data, probe, n)
		if err != nil {
			return // the import then reads the whole file (see importCSV)
		}
		if want := whole(probe); !reflect.DeepEqual(got, want) {
			t.Fatalf("chunks of %d lines:\n got %+v\nwant %+v", n, got, want)
		}
	})
}

func isUTF8(b []byte) bool { return strings.ToValidUTF8(string(b), "\x00") == string(b) }
