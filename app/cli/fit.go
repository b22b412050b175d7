package cli

import (
	"bufio"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"runtime/debug"
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

// MaxInputBytes is the largest input fit reads: the limit of
// session.StreamCSV (1 GiB).
const MaxInputBytes = session.MaxStreamSize

// MaxFitRows is the most data rows `pairline fit` reads: the limit of
// session.StreamCSV (10⁷), forty times session.MaxReadings, the limit of a
// session in the app. Past it the command stops with a sentence naming the
// line and the limit.
const MaxFitRows = session.MaxStreamRows

// multiFlag collects a repeatable string flag.
type multiFlag []string

func (m *multiFlag) String() string     { return strings.Join(*m, " ") }
func (m *multiFlag) Set(s string) error { *m = append(*m, s); return nil }

// numFlag is a numeric flag kept as typed, with whether it was given: 0 is
// fitcore's "use the default" for some options, but a 0 typed on the
// command line is a value and is checked as one.
type numFlag struct {
	text string
	set  bool
}

func (n *numFlag) String() string     { return n.text }
func (n *numFlag) Set(s string) error { n.text, n.set = s, true; return nil }

// MaxFlagNumber is the largest size of a reading-like number the command
// takes in a flag (--predict-x, --inverse-y, the reference values and the
// uncertainties). Beyond it the squares in the intervals overflow a float64
// for any ordinary calibration; no instrument reads 1e100 of anything.
const MaxFlagNumber = 1e100

// fitFlags are the parsed command-line settings of `pairline fit`.
type fitFlags struct {
	json          bool
	noAdvice      bool
	origin        bool
	weights       string
	model         string
	transform     string
	lambda        numFlag
	level         numFlag
	varianceRatio numFlag
	slopeRef      numFlag
	interceptRef  numFlag
	xUncertainty  numFlag
	yUncertainty  numFlag
	xCol, yCol    string
	delimiter     string
	decimalComma  string
	header        string
	predictX      multiFlag
	inverseY      multiFlag
	file          string
}

var fitUsage = fmt.Sprintf(`usage: pairline fit [flags] FILE|-

Fits a straight line to paired readings in a CSV or TSV file (or standard
input with "-") and reports the line, its uncertainty, the assumption checks
and advice. The first two numeric columns are x and y unless --x-col/--y-col
say otherwise. A header row, the delimiter (comma, semicolon, tab) and decimal
commas are detected; blank and incomplete rows are skipped and counted.

flags:
  --json               print one JSON object (keys in app/cli/FIT-JSON.md)
  --no-advice          the line and its checks only: no remedy is tried (no
                       transform, weighting or Box–Cox power); about a
                       third of the time on a file of a million rows
  --model M            ols (default) | origin | weighted | deming
  --origin             same as --model origin
  --weights W          none | x | x2 | fitted2 | repeats | power (implies
                       --model weighted; power estimates the power of x)
  --transform T        none | log_y | sqrt_y | reciprocal_y | log_log | box_cox
  --box-cox-lambda L   fix λ for --transform box_cox, −%[4]g … %[4]g (default: estimated)
  --level P            confidence level, %[1]g … %[2]g (default %[3]g)
  --slope-ref S        value the slope is tested against (default 1)
  --intercept-ref I    value the intercept is tested against (default 0)
  --x-uncertainty U    standard uncertainty of one x reading, ≥ 0 (x units);
                       above 0 the x-exactness check is run
  --y-uncertainty U    standard uncertainty of one y reading, ≥ 0 (y units)
  --x-col C, --y-col C column number (1 = first) or header name; the other
                       column, if not given, is the first numeric one left
  --predict-x X        fitted y with intervals at X (repeatable)
  --inverse-y Y        x behind reading Y; "Y1;Y2;Y3" for repeat readings of
                       one unknown (repeatable, one unknown per flag)
  --variance-ratio D   var(y errors)/var(x errors) for --model deming,
                       %[5]g … %[6]g (default 1)
  --delimiter C        force the delimiter: "," ";" "tab" (default: detect)
  --decimal-comma B    yes | no | auto (default auto)
  --header B           yes | no | auto (default auto)

Numbers in flags are finite and at most %[7]g in size. A value out of range
is refused with one line naming the flag and the range (exit status 2).
The file may hold up to %[8]d data rows and %[9]d MiB. Only the two columns
are kept, as numbers; the file is read once, or twice when its later rows
change which columns hold numbers (standard input from a pipe is copied to a
temporary file for that).
`, fitcore.MinLevel, fitcore.MaxLevel, fitcore.DefaultLevel, fitcore.MaxBoxCoxLambda,
	fitcore.MinVarianceRatio, fitcore.MaxVarianceRatio, MaxFlagNumber, MaxFitRows, MaxInputBytes>>20)

// Fit runs `pairline fit`. It returns ExitOK on success and ExitUsage with
// one line on stderr for bad flags or unusable input.
func Fit(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	if os.Getenv("GOGC") == "" {
		defer debug.SetGCPercent(debug.SetGCPercent(fitGCPercent))
	}
	ff, err := parseFitFlags(args)
	if errors.Is(err, flag.ErrHelp) {
		fmt.Fprint(stdout, fitUsage)
		return ExitOK
	}
	var opt fitcore.Options
	if err == nil {
		opt, err = ff.options()
	}
	if err != nil {
		fail(stderr, "fit", "%v (see pairline fit --help)", err)
		return ExitUsage
	}
	name := ff.file
	if name == "-" {
		name = "standard input"
	}
	rep, err := runFit(ff, opt, stdin)
	if err != nil {
		fail(stderr, "fit", "%s: %s", name, oneLine(err.Error()))
		return ExitUsage
	}
	if ff.json {
		// Written member by member (see jsonStream): the report of a big
		// file is hundreds of MB of JSON.
		bw := bufio.NewWriterSize(stdout, 64<<10)
		err := writeJSONIndented(bw, rep.report, "", "  ")
		if err == nil {
			_, err = bw.WriteString("\n")
		}
		if err == nil {
			err = bw.Flush()
		}
		if err != nil {
			fail(stderr, "fit", "%s: the report could not be written: %v", name, err)
			return ExitFailure
		}
		return ExitOK
	}
	if _, err := io.WriteString(stdout, termLines(summary(term(name), rep))); err != nil {
		fail(stderr, "fit", "writing the result failed: %v", err)
		return ExitFailure
	}
	return ExitOK
}

// fitGCPercent is the garbage collector's target while fit runs (Go's
// default is 100: the heap may grow to twice what is live before a
// collection). The heap of a big fit is a few large arrays of numbers with
// no pointers in them, so a collection costs little, and a lower target
// lets the work space a check has let go be used again instead of new
// memory being taken: at 10⁶ rows --no-advice peaks at 78 MiB of resident
// memory with 10 (86 MiB with 25, 142 MiB with Go's default) in the same
// time, 0.31–0.32 s, and the default fit with its advice in 0.9 s either
// way (DEVELOPERS.md, "Memory of a big fit"). A GOGC set in the
// environment is left as it is.
const fitGCPercent = 10

func oneLine(s string) string {
	return strings.Join(strings.Fields(s), " ")
}

func parseFitFlags(args []string) (*fitFlags, error) {
	ff := &fitFlags{}
	fs := flag.NewFlagSet("fit", flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.Usage = func() {}
	fs.BoolVar(&ff.json, "json", false, "")
	fs.BoolVar(&ff.noAdvice, "no-advice", false, "")
	fs.BoolVar(&ff.origin, "origin", false, "")
	fs.StringVar(&ff.weights, "weights", "", "")
	fs.StringVar(&ff.model, "model", "", "")
	fs.StringVar(&ff.transform, "transform", "", "")
	fs.Var(&ff.lambda, "box-cox-lambda", "")
	fs.Var(&ff.level, "level", "")
	fs.Var(&ff.slopeRef, "slope-ref", "")
	fs.Var(&ff.interceptRef, "intercept-ref", "")
	fs.Var(&ff.xUncertainty, "x-uncertainty", "")
	fs.Var(&ff.yUncertainty, "y-uncertainty", "")
	fs.StringVar(&ff.xCol, "x-col", "", "")
	fs.StringVar(&ff.yCol, "y-col", "", "")
	fs.StringVar(&ff.delimiter, "delimiter", "", "")
	fs.StringVar(&ff.decimalComma, "decimal-comma", "auto", "")
	fs.StringVar(&ff.header, "header", "auto", "")
	fs.Var(&ff.predictX, "predict-x", "")
	fs.Var(&ff.inverseY, "inverse-y", "")
	fs.Var(&ff.varianceRatio, "variance-ratio", "")

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
		q := make([]string, len(files))
		for i, f := range files {
			q[i] = quoted(f)
		}
		return nil, fmt.Errorf("one input file expected, got %d (%s)", len(files), strings.Join(q, ", "))
	}
	return ff, nil
}

// fitResult is a report with what the command learnt about the input.
type fitResult struct {
	report *fitcore.Report
	lines  []int32 // file line of each pair given to Analyze (as StreamCSV keeps them)
	xName  string
	yName  string
	// xUnit, yUnit are the units of x and y (a CSV file's units row, a
	// session's units), made visible (term); "" when not known.
	xUnit, yUnit string
	// noAdvice: --no-advice was given, so the report has no advice.
	noAdvice bool
}

// flagName is the command-line flag of a fitcore option key
// ("box_cox_lambda" → "--box-cox-lambda").
func flagName(option string) string { return "--" + strings.ReplaceAll(option, "_", "-") }

// flagError turns fitcore's option error into the command's words: the
// flag, the value as fitcore read it, and the accepted range.
func flagError(err error) error {
	var oe *fitcore.OptionError
	if errors.As(err, &oe) {
		return fmt.Errorf("%s %s: %s", flagName(oe.Option), oe.Value, oe.Want)
	}
	return err
}

// number reads a numeric flag with session.ParseNumber (the rules of a
// typed reading: no NaN, no infinity, nothing too large for a float64).
func (n numFlag) number(name string) (float64, error) {
	v, err := session.ParseNumber(n.text)
	if err != nil {
		var ne *session.NumberError
		if errors.As(err, &ne) {
			return 0, fmt.Errorf("--%s %s %s", name, quoted(n.text), ne.Reason)
		}
		return 0, fmt.Errorf("--%s %s: %v", name, quoted(n.text), err)
	}
	return v, nil
}

// numberReason is the reason of a number error without the text (the
// caller names the text).
func numberReason(err error) string {
	var ne *session.NumberError
	if errors.As(err, &ne) {
		return ne.Reason
	}
	return err.Error()
}

// tooLarge refuses a reading-like number of a flag beyond MaxFlagNumber.
func tooLarge(v float64) error {
	if math.Abs(v) > MaxFlagNumber {
		return fmt.Errorf("is too large: numbers in flags must be from %g to %g", -MaxFlagNumber, MaxFlagNumber)
	}
	return nil
}

// zeroRefused is fitcore's error for an option whose 0 means "default"
// when 0 is typed: the accepted range comes from Normalize itself.
func zeroRefused(option string, probe fitcore.Options) error {
	_, err := probe.Normalize()
	var oe *fitcore.OptionError
	if errors.As(err, &oe) && oe.Option == option {
		return fmt.Errorf("%s 0: %s", flagName(option), oe.Want)
	}
	return fmt.Errorf("%s 0 is not accepted", flagName(option))
}

// options turns the flags into fitcore options (all but the values that need
// the file's decimal separator) and checks them with fitcore's one
// validation, Options.Normalize, before any file is read. The stages: the
// model and weights (modelOptions), the numbers that tune the fit
// (tuningOptions), the references and uncertainties (referenceOptions).
func (ff *fitFlags) options() (fitcore.Options, error) {
	var opt fitcore.Options
	for _, stage := range []func(*fitcore.Options) error{ff.modelOptions, ff.tuningOptions, ff.referenceOptions} {
		if err := stage(&opt); err != nil {
			return opt, err
		}
	}
	norm, err := opt.Normalize()
	if err != nil {
		return opt, flagError(err)
	}
	norm.SkipAdvice = ff.noAdvice
	return norm, nil
}

// modelOptions sets the model, weights and transform from --model,
// --origin, --weights and --transform, refusing the combinations that
// contradict each other.
func (ff *fitFlags) modelOptions(opt *fitcore.Options) error {
	opt.Model = fitcore.Model(ff.model)
	if ff.origin {
		if ff.model != "" && ff.model != string(fitcore.ModelOrigin) {
			return fmt.Errorf("--origin and --model %s contradict each other", quoted(ff.model))
		}
		opt.Model = fitcore.ModelOrigin
	}
	switch ff.weights {
	case "", "none":
		if opt.Model == fitcore.ModelWeighted {
			return errors.New("--model weighted needs --weights x, x2, fitted2, repeats or power")
		}
	case string(fitcore.WeightsGiven):
		return errors.New(`--weights given: the command reads no column of weights; use x, x2, fitted2, repeats or power`)
	default:
		opt.Weights = fitcore.WeightScheme(ff.weights)
	}
	opt.Transform = fitcore.Transform(ff.transform)
	return nil
}

// tuningOptions sets the Box–Cox λ, the level and the variance ratio
// (which goes with --model deming only); a level or ratio of 0 is refused
// with Normalize's reason.
func (ff *fitFlags) tuningOptions(opt *fitcore.Options) error {
	if ff.lambda.set {
		l, err := ff.lambda.number("box-cox-lambda")
		if err != nil {
			return err
		}
		opt.BoxCoxLambda = &l
	}
	if ff.level.set {
		l, err := ff.level.number("level")
		if err != nil {
			return err
		}
		if l == 0 {
			return zeroRefused("level", fitcore.Options{Level: math.Inf(-1)})
		}
		opt.Level = l
	}
	if !ff.varianceRatio.set {
		return nil
	}
	d, err := ff.varianceRatio.number("variance-ratio")
	if err != nil {
		return err
	}
	if opt.Model != fitcore.ModelDeming {
		return errors.New("--variance-ratio goes with --model deming")
	}
	if d == 0 {
		return zeroRefused("variance_ratio", fitcore.Options{Model: fitcore.ModelDeming, VarianceRatio: math.Inf(-1)})
	}
	opt.VarianceRatio = d
	return nil
}

// referenceOptions sets the slope and intercept references and the x and
// y uncertainties, each a number within the magnitude fitcore accepts.
func (ff *fitFlags) referenceOptions(opt *fitcore.Options) error {
	for _, r := range []struct {
		name string
		f    numFlag
		p    **float64
	}{{"slope-ref", ff.slopeRef, &opt.SlopeRef}, {"intercept-ref", ff.interceptRef, &opt.InterceptRef}} {
		v, ok, err := sizedNumber(r.name, r.f)
		if err != nil {
			return err
		}
		if ok {
			*r.p = &v
		}
	}
	for _, u := range []struct {
		name string
		f    numFlag
		p    *float64
	}{{"x-uncertainty", ff.xUncertainty, &opt.XUncertainty}, {"y-uncertainty", ff.yUncertainty, &opt.YUncertainty}} {
		v, ok, err := sizedNumber(u.name, u.f)
		if err != nil {
			return err
		}
		if ok {
			*u.p = v
		}
	}
	return nil
}

// sizedNumber is the number of flag --name when it was given (ok), refused
// when it is not a number or too large.
func sizedNumber(name string, f numFlag) (v float64, ok bool, err error) {
	if !f.set {
		return 0, false, nil
	}
	v, err = f.number(name)
	if err != nil {
		return 0, false, err
	}
	if err := tooLarge(v); err != nil {
		return 0, false, fmt.Errorf("--%s %s %v", name, quoted(f.text), err)
	}
	return v, true, nil
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

// runFit reads the input and analyses it with opt, the checked options of
// the flags. The input is streamed into float64 columns (session.StreamCSV):
// no cell is kept as text but those that are not numbers. The stages: read
// the columns (fitColumns), name the rows skipped (fitSkipNotes), check
// there is a line to fit (fitEnough), read --predict-x and --inverse-y in
// the file's decimal separator (fitQueries), then analyse.
func runFit(ff *fitFlags, opt fitcore.Options, stdin io.Reader) (*fitResult, error) {
	co, err := ff.csvOptions()
	if err != nil {
		return nil, err
	}
	in, done, err := openInput(ff.file, stdin)
	if err != nil {
		return nil, err
	}
	defer done()
	res, err := session.StreamCSV(in, session.StreamOptions{CSVOptions: co, Columns: ff.fitColumns()})
	if err != nil {
		return nil, err
	}
	x, y, lines := res.X, res.Y, res.Lines
	notes, skipped := fitSkipNotes(res)
	if err := fitEnough(x, notes, skipped); err != nil {
		return nil, err
	}
	if err := ff.fitQueries(&opt, res.DecimalComma); err != nil {
		return nil, err
	}
	// The text names only the flagged readings; the JSON has every one.
	opt.FlaggedInfluenceOnly = !ff.json
	rep, err := fitcore.Analyze(x, y, opt)
	if err != nil {
		return nil, explainFitError(err, lines)
	}
	rep.NSkipped = skipped
	rep.Notes = append(notes, rep.Notes...)
	rep.Notes = append(rep.Notes, res.Warnings...)
	out := &fitResult{report: rep, lines: lines,
		xName: term(columnName(res, res.XCol, "x")), yName: term(columnName(res, res.YCol, "y")),
		xUnit: term(unitOf(res, res.XCol)), yUnit: term(unitOf(res, res.YCol)), noAdvice: opt.SkipAdvice}
	return out, nil
}

// fitColumns chooses the x and y columns from the header by --x-col and
// --y-col (nil: neither given, the import detects them); the two must
// differ.
func (ff *fitFlags) fitColumns() func(header []string) (int, int, error) {
	if ff.xCol == "" && ff.yCol == "" {
		return nil
	}
	return func(header []string) (int, int, error) {
		x, y := -1, -1
		var err error
		if ff.xCol != "" {
			if x, err = column("x-col", ff.xCol, header); err != nil {
				return 0, 0, err
			}
		}
		if ff.yCol != "" {
			if y, err = column("y-col", ff.yCol, header); err != nil {
				return 0, 0, err
			}
		}
		if x == y {
			return 0, 0, fmt.Errorf("x and y are both column %d; choose two different columns", x+1)
		}
		return x, y, nil
	}
}

// fitSkipNotes names every row left out: the incomplete rows listed in
// Skipped, then the rows whose chosen cells are not numbers; skipped counts
// the rows.
func fitSkipNotes(res *session.StreamResult) (notes []string, skipped int) {
	for _, s := range res.Skipped {
		notes = append(notes, fmt.Sprintf("Line %d skipped: %s.", s.Line, strings.TrimSuffix(s.Reason, ".")))
	}
	badRows := map[int]bool{}
	for _, p := range res.Problems {
		badRows[p.Row] = true
		what, col := "x", res.XCol
		if p.Column == session.ColumnY {
			what, col = "y", res.YCol
		}
		notes = append(notes, fmt.Sprintf("Line %d skipped: the %s cell (column %d) %q %s.",
			p.Line, what, col+1, p.Text, strings.TrimSuffix(p.Reason, ".")))
	}
	return notes, len(res.Skipped) + len(badRows)
}

// fitEnough refuses fewer than 3 pairs (naming the first row skipped) and
// x values that are all the same.
func fitEnough(x []float64, notes []string, skipped int) error {
	if len(x) < 3 {
		why := ""
		if len(notes) > 0 {
			why = "; first: " + strings.TrimSuffix(notes[0], ".")
		}
		return fmt.Errorf("only %d usable pair(s) of readings (%d row(s) skipped%s); a line needs at least 3",
			len(x), skipped, why)
	}
	if allEqual(x) {
		return fmt.Errorf("all %d x values are %s, so no line can be fitted; x must vary",
			len(x), numfmt.Full(x[0]))
	}
	return nil
}

// fitQueries reads --predict-x and --inverse-y into opt, in the file's
// decimal separator (decimalComma).
func (ff *fitFlags) fitQueries(opt *fitcore.Options, decimalComma bool) error {
	for _, s := range ff.predictX {
		v, err := session.ParseNumberHint(s, decimalComma)
		if err == nil {
			err = tooLarge(v)
		}
		if err != nil {
			return fmt.Errorf("--predict-x %s %v", quoted(s), numberReason(err))
		}
		opt.PredictX = append(opt.PredictX, v)
	}
	for _, s := range ff.inverseY {
		q, err := fitInverseQuery(s, decimalComma)
		if err != nil {
			return err
		}
		opt.Inverse = append(opt.Inverse, q)
	}
	return nil
}

// fitInverseQuery reads one --inverse-y value: one or more repeat readings
// of an unknown, separated by ';' or spaces.
func fitInverseQuery(s string, decimalComma bool) (fitcore.InverseQuery, error) {
	var q fitcore.InverseQuery
	parts := session.SplitRepeats(s)
	if len(parts) == 0 {
		return q, fmt.Errorf("--inverse-y %s holds no reading (separate repeat readings with ';' or spaces)", quoted(s))
	}
	for _, part := range parts {
		v, err := session.ParseNumberHint(part, decimalComma)
		if err == nil {
			err = tooLarge(v)
		}
		if err != nil {
			return q, fmt.Errorf("--inverse-y %s: %s %v (separate repeat readings with ';' or spaces)", quoted(s), quoted(part), numberReason(err))
		}
		q.Y = append(q.Y, v)
	}
	return q, nil
}

// unitOf is the unit of column c from the file's units row, or "".
func unitOf(res *session.StreamResult, c int) string {
	if !res.UnitsRow || c < 0 || c >= len(res.Units) {
		return ""
	}
	return strings.TrimSpace(res.Units[c])
}

// columnName is the header of column c, or the fallback (with the column
// number) when there is no header.
func columnName(res *session.StreamResult, c int, fallback string) string {
	if c >= 0 && c < len(res.Header) {
		if h := strings.TrimSpace(res.Header[c]); h != "" {
			return h
		}
	}
	return fmt.Sprintf("%s (column %d)", fallback, c+1)
}

// openInput opens the file, or standard input for "-", for
// session.StreamCSV, which reads it once when it can tell its size and a
// second time when the first block chose other columns than the whole file
// does: standard input that cannot seek (a pipe) is copied to a temporary
// file first, at most MaxInputBytes+1 bytes of it. done closes and removes what
// openInput made.
func openInput(file string, stdin io.Reader) (io.ReadSeeker, func(), error) {
	if file != "-" {
		f, err := os.Open(file)
		if err != nil {
			return nil, nil, fmt.Errorf("cannot open the file: %v", unwrapPath(err))
		}
		if st, err := f.Stat(); err == nil && st.IsDir() {
			f.Close()
			return nil, nil, errFolder
		}
		return f, func() { f.Close() }, nil
	}
	if stdin == nil {
		return nil, nil, errors.New("no standard input to read")
	}
	if rs, ok := stdin.(io.ReadSeeker); ok {
		if base, err := rs.Seek(0, io.SeekCurrent); err == nil {
			return &fromOffset{rs, base}, func() {}, nil
		}
	}
	tmp, err := os.CreateTemp("", "pairline-fit-*.csv")
	if err != nil {
		return nil, nil, fmt.Errorf("standard input could not be kept for reading twice: %v", unwrapPath(err))
	}
	done := func() { tmp.Close(); os.Remove(tmp.Name()) }
	if _, err := io.Copy(tmp, io.LimitReader(stdin, MaxInputBytes+1)); err != nil {
		done()
		return nil, nil, fmt.Errorf("cannot read the input: %v", unwrapPath(err))
	}
	if _, err := tmp.Seek(0, io.SeekStart); err != nil {
		done()
		return nil, nil, fmt.Errorf("cannot read the input: %v", unwrapPath(err))
	}
	return tmp, done, nil
}

// fromOffset is a reader that can seek back to where it started.
type fromOffset struct {
	rs   io.ReadSeeker
	base int64
}

func (f *fromOffset) Read(p []byte) (int, error) { return f.rs.Read(p) }

func (f *fromOffset) Seek(off int64, whence int) (int64, error) {
	if whence == io.SeekStart {
		off += f.base
	}
	n, err := f.rs.Seek(off, whence)
	return n - f.base, err
}

// errFolder is the error for a folder named where a file is expected.
var errFolder = errors.New("this is a folder, not a file of readings or a session file")

func unwrapPath(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// explainFitError adds the file line to fitcore's data errors, which name
// the reading by its position.
func explainFitError(err error, lines []int32) error {
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
