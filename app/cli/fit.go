// Package cli holds the native sub-commands of the pairline program. Each
// command is a function of its arguments and streams that returns the exit
// status, so tests can run it without a process.
package cli

import (
	"bytes"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/fitcore"
)

// Exit statuses of the commands.
const (
	ExitOK      = 0
	ExitFailure = 1 // the command ran but could not finish (e.g. a write failed)
	ExitUsage   = 2 // bad flags or unusable input; one line on stderr says why
)

// MaxInputBytes is the largest input fit reads: the limit of session.ReadCSV.
const MaxInputBytes = session.MaxCSVSize

// multiFlag collects a repeatable string flag.
type multiFlag []string

func (m *multiFlag) String() string     { return strings.Join(*m, " ") }
func (m *multiFlag) Set(s string) error { *m = append(*m, s); return nil }

// fitFlags are the parsed command-line settings of `pairline fit`.
type fitFlags struct {
	json          bool
	origin        bool
	weights       string
	model         string
	transform     string
	lambda        string
	level         float64
	xCol, yCol    string
	delimiter     string
	decimalComma  string
	header        string
	predictX      multiFlag
	inverseY      multiFlag
	varianceRatio float64
	file          string
}

const fitUsage = `usage: pairline fit [flags] FILE|-

Fits a straight line to paired readings in a CSV or TSV file (or standard
input with "-") and reports the line, its uncertainty, the assumption checks
and advice. The first two numeric columns are x and y unless --x-col/--y-col
say otherwise. A header row, the delimiter (comma, semicolon, tab) and decimal
commas are detected; blank and incomplete rows are skipped and counted.

flags:
  --json               print one JSON object (keys in docs/fit-json.md)
  --model M            ols (default) | origin | weighted | deming
  --origin             same as --model origin
  --weights W          none | x | x2 | fitted2 | repeats (implies --model weighted)
  --transform T        none | log_y | sqrt_y | reciprocal_y | log_log | box_cox
  --box-cox-lambda L   fix λ for --transform box_cox (default: estimated)
  --level P            confidence level, 0 < P < 1 (default 0.95)
  --x-col C, --y-col C column number (1 = first) or header name; the other
                       column, if not given, is the first numeric one left
  --predict-x X        fitted y with intervals at X (repeatable)
  --inverse-y Y        x behind reading Y; "Y1;Y2;Y3" for repeat readings of
                       one unknown (repeatable, one unknown per flag)
  --variance-ratio D   var(y errors)/var(x errors) for --model deming (default 1)
  --delimiter C        force the delimiter: "," ";" "tab" (default: detect)
  --decimal-comma B    yes | no | auto (default auto)
  --header B           yes | no | auto (default auto)
`

// Fit runs `pairline fit`. It returns ExitOK on success and ExitUsage with
// one line on stderr for bad flags or unusable input.
func Fit(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	ff, err := parseFitFlags(args)
	if errors.Is(err, flag.ErrHelp) {
		fmt.Fprint(stdout, fitUsage)
		return ExitOK
	}
	if err != nil {
		fmt.Fprintf(stderr, "pairline fit: %v (see pairline fit --help)\n", err)
		return ExitUsage
	}
	name := ff.file
	if name == "-" {
		name = "standard input"
	}
	rep, err := runFit(ff, stdin)
	if err != nil {
		fmt.Fprintf(stderr, "pairline fit: %s: %s\n", name, oneLine(err.Error()))
		return ExitUsage
	}
	var out []byte
	if ff.json {
		out, err = json.MarshalIndent(rep.report, "", "  ")
		if err != nil {
			fmt.Fprintf(stderr, "pairline fit: %s: the report could not be written as JSON: %v\n", name, err)
			return ExitFailure
		}
		out = append(out, '\n')
	} else {
		out = []byte(summary(name, rep))
	}
	if _, err := stdout.Write(out); err != nil {
		fmt.Fprintf(stderr, "pairline fit: writing the result failed: %v\n", err)
		return ExitFailure
	}
	return ExitOK
}

func oneLine(s string) string {
	return strings.Join(strings.Fields(s), " ")
}

func parseFitFlags(args []string) (*fitFlags, error) {
	ff := &fitFlags{}
	fs := flag.NewFlagSet("fit", flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.Usage = func() {}
	fs.BoolVar(&ff.json, "json", false, "")
	fs.BoolVar(&ff.origin, "origin", false, "")
	fs.StringVar(&ff.weights, "weights", "", "")
	fs.StringVar(&ff.model, "model", "", "")
	fs.StringVar(&ff.transform, "transform", "", "")
	fs.StringVar(&ff.lambda, "box-cox-lambda", "", "")
	fs.Float64Var(&ff.level, "level", 0, "")
	fs.StringVar(&ff.xCol, "x-col", "", "")
	fs.StringVar(&ff.yCol, "y-col", "", "")
	fs.StringVar(&ff.delimiter, "delimiter", "", "")
	fs.StringVar(&ff.decimalComma, "decimal-comma", "auto", "")
	fs.StringVar(&ff.header, "header", "auto", "")
	fs.Var(&ff.predictX, "predict-x", "")
	fs.Var(&ff.inverseY, "inverse-y", "")
	fs.Float64Var(&ff.varianceRatio, "variance-ratio", 0, "")

	// Flags may come before or after the file name.
	var files []string
	rest := args
	for {
		if err := fs.Parse(rest); err != nil {
			return nil, err
		}
		rest = fs.Args()
		if len(rest) == 0 {
			break
		}
		files = append(files, rest[0])
		rest = rest[1:]
	}
	switch len(files) {
	case 0:
		return nil, errors.New("no input file given; name a CSV file or - for standard input")
	case 1:
		ff.file = files[0]
	default:
		return nil, fmt.Errorf("one input file expected, got %d (%s)", len(files), strings.Join(files, ", "))
	}
	if ff.level != 0 && !(ff.level > 0 && ff.level < 1) {
		return nil, fmt.Errorf("--level %g is not between 0 and 1; write 0.95 for 95 %%", ff.level)
	}
	if ff.varianceRatio < 0 || math.IsNaN(ff.varianceRatio) || math.IsInf(ff.varianceRatio, 0) {
		return nil, fmt.Errorf("--variance-ratio %g must be a positive number", ff.varianceRatio)
	}
	return ff, nil
}

// fitResult is a report with what the command learnt about the input.
type fitResult struct {
	report *fitcore.Report
	csv    *session.CSVResult
	lines  []int // file line of each pair given to Analyze
	xName  string
	yName  string
}

// options turns the flags into fitcore options (all but the values that need
// the file's decimal separator).
func (ff *fitFlags) options() (fitcore.Options, error) {
	var opt fitcore.Options
	switch ff.model {
	case "", "ols":
		opt.Model = fitcore.ModelOLS
	case "origin":
		opt.Model = fitcore.ModelOrigin
	case "weighted":
		opt.Model = fitcore.ModelWeighted
	case "deming":
		opt.Model = fitcore.ModelDeming
	default:
		return opt, fmt.Errorf("--model %q is not one of ols, origin, weighted, deming", ff.model)
	}
	if ff.origin {
		if ff.model != "" && ff.model != "origin" {
			return opt, fmt.Errorf("--origin and --model %s contradict each other", ff.model)
		}
		opt.Model = fitcore.ModelOrigin
	}
	switch ff.weights {
	case "", "none":
		if opt.Model == fitcore.ModelWeighted {
			return opt, errors.New("--model weighted needs --weights x, x2, fitted2 or repeats")
		}
	case "x", "x2", "fitted2", "repeats":
		if ff.model != "" && ff.model != "weighted" || ff.origin {
			return opt, fmt.Errorf("--weights %s goes with the weighted model, not %s", ff.weights, opt.Model)
		}
		opt.Model = fitcore.ModelWeighted
		opt.Weights = fitcore.WeightScheme(ff.weights)
	default:
		return opt, fmt.Errorf("--weights %q is not one of none, x, x2, fitted2, repeats", ff.weights)
	}
	switch t := fitcore.Transform(ff.transform); t {
	case "":
		opt.Transform = fitcore.TransformNone
	case fitcore.TransformNone, fitcore.TransformLogY, fitcore.TransformSqrtY, fitcore.TransformReciprocal,
		fitcore.TransformLogLog, fitcore.TransformBoxCox:
		opt.Transform = t
	default:
		return opt, fmt.Errorf("--transform %q is not one of none, log_y, sqrt_y, reciprocal_y, log_log, box_cox", ff.transform)
	}
	if ff.lambda != "" {
		if opt.Transform != fitcore.TransformBoxCox {
			return opt, errors.New("--box-cox-lambda needs --transform box_cox")
		}
		l, err := strconv.ParseFloat(ff.lambda, 64)
		if err != nil || math.IsNaN(l) || math.IsInf(l, 0) {
			return opt, fmt.Errorf("--box-cox-lambda %q is not a number", ff.lambda)
		}
		opt.BoxCoxLambda = &l
	}
	if ff.varianceRatio != 0 && opt.Model != fitcore.ModelDeming {
		return opt, errors.New("--variance-ratio goes with --model deming")
	}
	opt.VarianceRatio = ff.varianceRatio
	opt.Level = ff.level
	return opt, nil
}

func triState(flagName, v string) (*bool, error) {
	switch strings.ToLower(v) {
	case "", "auto":
		return nil, nil
	case "yes", "true", "1":
		b := true
		return &b, nil
	case "no", "false", "0":
		b := false
		return &b, nil
	}
	return nil, fmt.Errorf("--%s %q: write yes, no or auto", flagName, v)
}

func (ff *fitFlags) csvOptions() (session.CSVOptions, error) {
	co := session.CSVOptions{XCol: session.DetectColumn, YCol: session.DetectColumn}
	switch ff.delimiter {
	case "":
	case ",", ";":
		co.Delimiter = rune(ff.delimiter[0])
	case "tab", `\t`, "\t":
		co.Delimiter = '\t'
	default:
		return co, fmt.Errorf("--delimiter %q: write \",\", \";\" or tab", ff.delimiter)
	}
	var err error
	if co.DecimalComma, err = triState("decimal-comma", ff.decimalComma); err != nil {
		return co, err
	}
	if co.Header, err = triState("header", ff.header); err != nil {
		return co, err
	}
	return co, nil
}

// column resolves a --x-col/--y-col value against the header: a 1-based
// column number or a header name (matched ignoring case and surrounding
// spaces). It returns the 0-based index.
func column(flagName, v string, header []string) (int, error) {
	v = strings.TrimSpace(v)
	if n, err := strconv.Atoi(v); err == nil {
		if n < 1 {
			return 0, fmt.Errorf("--%s %d: columns are numbered from 1", flagName, n)
		}
		return n - 1, nil
	}
	for i, h := range header {
		if strings.EqualFold(strings.TrimSpace(h), v) {
			return i, nil
		}
	}
	if len(header) == 0 {
		return 0, fmt.Errorf("--%s %q: the file has no header row, so give the column number", flagName, v)
	}
	return 0, fmt.Errorf("--%s %q: no such column; the header has %s", flagName, v, quoteList(header))
}

func quoteList(h []string) string {
	q := make([]string, len(h))
	for i, s := range h {
		q[i] = strconv.Quote(s)
	}
	return strings.Join(q, ", ")
}

func runFit(ff *fitFlags, stdin io.Reader) (*fitResult, error) {
	opt, err := ff.options()
	if err != nil {
		return nil, err
	}
	co, err := ff.csvOptions()
	if err != nil {
		return nil, err
	}
	data, err := readInput(ff.file, stdin)
	if err != nil {
		return nil, err
	}
	if ff.xCol != "" || ff.yCol != "" {
		// A first pass finds the header, so columns can be named.
		first, err := session.ReadCSV(bytes.NewReader(data), co)
		if err != nil {
			return nil, err
		}
		x, y := -1, -1
		if ff.xCol != "" {
			if x, err = column("x-col", ff.xCol, first.Header); err != nil {
				return nil, err
			}
		}
		if ff.yCol != "" {
			if y, err = column("y-col", ff.yCol, first.Header); err != nil {
				return nil, err
			}
		}
		if x == y {
			return nil, fmt.Errorf("x and y are both column %d; choose two different columns", x+1)
		}
		co.XCol, co.YCol = x, y
	}
	res, err := session.ReadCSV(bytes.NewReader(data), co)
	if err != nil {
		return nil, err
	}
	// Rows whose chosen cells are not numbers are skipped and named, like
	// the incomplete rows ReadCSV already lists in Skipped.
	x, y, lines, problems := session.ParsedPairs(res)
	var notes []string
	for _, s := range res.Skipped {
		notes = append(notes, fmt.Sprintf("Line %d skipped: %s.", s.Line, strings.TrimSuffix(s.Reason, ".")))
	}
	badRows := map[int]bool{}
	for _, p := range problems {
		badRows[p.Row] = true
		what, col := "x", res.XCol
		if p.Column == session.ColumnY {
			what, col = "y", res.YCol
		}
		notes = append(notes, fmt.Sprintf("Line %d skipped: the %s cell (column %d) %q %s.",
			res.Lines[p.Row], what, col+1, p.Text, strings.TrimSuffix(p.Reason, ".")))
	}
	skipped := len(res.Skipped) + len(badRows)
	if len(x) < 3 {
		why := ""
		if len(notes) > 0 {
			why = "; first: " + strings.TrimSuffix(notes[0], ".")
		}
		return nil, fmt.Errorf("only %d usable pair(s) of readings (%d row(s) skipped%s); a line needs at least 3",
			len(x), skipped, why)
	}
	if allEqual(x) {
		return nil, fmt.Errorf("all %d x values are %s, so no line can be fitted; x must vary",
			len(x), numfmt.Full(x[0]))
	}
	for _, s := range ff.predictX {
		v, err := session.ParseNumberHint(s, res.DecimalComma)
		if err != nil {
			return nil, fmt.Errorf("--predict-x: %v", err)
		}
		opt.PredictX = append(opt.PredictX, v)
	}
	for _, s := range ff.inverseY {
		var q fitcore.InverseQuery
		for _, part := range strings.Split(s, ";") {
			v, err := session.ParseNumberHint(part, res.DecimalComma)
			if err != nil {
				return nil, fmt.Errorf("--inverse-y %q: %v (separate repeat readings with ';')", s, err)
			}
			q.Y = append(q.Y, v)
		}
		opt.Inverse = append(opt.Inverse, q)
	}
	rep, err := fitcore.Analyze(x, y, opt)
	if err != nil {
		return nil, explainFitError(err, lines)
	}
	rep.NSkipped = skipped
	rep.Notes = append(notes, rep.Notes...)
	rep.Notes = append(rep.Notes, res.Warnings...)
	out := &fitResult{report: rep, csv: res, lines: lines,
		xName: columnName(res, res.XCol, "x"), yName: columnName(res, res.YCol, "y")}
	return out, nil
}

// columnName is the header of column c, or the fallback (with the column
// number) when there is no header.
func columnName(res *session.CSVResult, c int, fallback string) string {
	if c >= 0 && c < len(res.Header) {
		if h := strings.TrimSpace(res.Header[c]); h != "" {
			return h
		}
	}
	return fmt.Sprintf("%s (column %d)", fallback, c+1)
}

func readInput(file string, stdin io.Reader) ([]byte, error) {
	var r io.Reader
	if file == "-" {
		if stdin == nil {
			return nil, errors.New("no standard input to read")
		}
		r = stdin
	} else {
		f, err := os.Open(file)
		if err != nil {
			return nil, fmt.Errorf("cannot open the file: %v", unwrapPath(err))
		}
		defer f.Close()
		r = f
	}
	b, err := io.ReadAll(io.LimitReader(r, MaxInputBytes+1))
	if err != nil {
		return nil, fmt.Errorf("cannot read the input: %v", unwrapPath(err))
	}
	if len(b) > MaxInputBytes {
		return nil, fmt.Errorf("the input is larger than %d MiB; is this the right file?", MaxInputBytes>>20)
	}
	return b, nil
}

func unwrapPath(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// explainFitError adds the file line to fitcore's data errors, which name
// the reading by its position.
func explainFitError(err error, lines []int) error {
	var de *fitcore.DataError
	if errors.As(err, &de) && de.Index >= 0 && de.Index < len(lines) {
		return fmt.Errorf("line %d: %v", lines[de.Index], err)
	}
	return err
}

func allEqual(v []float64) bool {
	for _, u := range v[1:] {
		if u != v[0] {
			return false
		}
	}
	return true
}
