package fitcore

import (
	"errors"
	"fmt"
	"strconv"
)

// Sentinel errors returned (usually wrapped in a *DataError or with
// fmt.Errorf %w) when the readings or options cannot give a straight line.
// Test for them with errors.Is.
var (
	// ErrTooFewPoints: fewer than three usable pairs. A line through two
	// points always fits perfectly and leaves nothing to check.
	ErrTooFewPoints = errors.New("fewer than 3 usable pairs of readings")
	// ErrLengthMismatch: x and y (or the weights) do not have one value per pair.
	ErrLengthMismatch = errors.New("the columns do not have the same number of readings")
	// ErrNoSpreadInX: every x is the same, so no slope can be estimated.
	ErrNoSpreadInX = errors.New("all x readings are the same")
	// ErrNoSpreadInY: every y is the same, so there is no line to check.
	ErrNoSpreadInY = errors.New("all y readings are the same")
	// ErrNotFinite: a reading is NaN or infinite.
	ErrNotFinite = errors.New("a reading is not a finite number")
	// ErrBadWeight: a weight is zero, negative or not finite.
	ErrBadWeight = errors.New("a weight is not a positive finite number")
	// ErrBadOption: an option value is out of range or unknown.
	ErrBadOption = errors.New("an option is not valid")
	// ErrTransformDomain: the data cannot take the requested transform
	// (for example a log of a zero or negative reading).
	ErrTransformDomain = errors.New("the readings cannot take this transform")
	// ErrNoRepeats: repeat-based weights were asked for but some x level
	// has fewer than two readings or no spread among its repeats.
	ErrNoRepeats = errors.New("repeat readings are needed at every x level")
	// ErrDegenerate: the arithmetic broke down (for example a perfect
	// vertical line for Deming regression, or weights that make x constant).
	ErrDegenerate = errors.New("the readings do not determine a line")
	// ErrOutOfRange: a reading is larger than MaxMagnitude, or the sums
	// of squares the report gives in the units of the readings (Sxx, the
	// ANOVA table) would overflow or underflow float64. Rescaling the units
	// (kilo-, micro-, …) cures it.
	ErrOutOfRange = errors.New("the readings are too large or too small for the figures of the report")
)

// DataError reports a problem with one reading. Index is the position of
// the pair in the input, counted from 0 (Error prints it counted from 1, the
// way a technician numbers rows); Value is the offending number; Err is one
// of the sentinel errors above. Column names which value ("x", "y",
// "weight"); it may be empty.
type DataError struct {
	Index  int
	Column string
	Value  float64
	Err    error
	// Hint is an optional sentence saying what to do about it.
	Hint string
}

// Error gives a sentence a technician can act on plus the detail.
func (e *DataError) Error() string {
	col := e.Column
	if col == "" {
		col = "reading"
	}
	msg := fmt.Sprintf("pair %d: %s value %s: %v", e.Index+1, col, formatValue(e.Value), e.Err)
	if e.Hint != "" {
		msg += ". " + e.Hint
	}
	return msg
}

// Unwrap returns the sentinel error so errors.Is works.
func (e *DataError) Unwrap() error { return e.Err }

func formatValue(v float64) string {
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// tooFewError is an error that says how many readings something needs and
// counts as ErrTooFewPoints for errors.Is (whose own text names the three
// pairs a line needs, not the larger number a check or estimate needs).
type tooFewError string

func (e tooFewError) Error() string { return string(e) }

// Is makes errors.Is(err, ErrTooFewPoints) true.
func (e tooFewError) Is(target error) bool { return target == ErrTooFewPoints }
