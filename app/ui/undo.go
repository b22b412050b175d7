package ui

import (
	"encoding/json"
	"slices"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/app/wording"
	"pairline/fitcore"
)

// undoDepth is how many earlier states undo keeps for the open session;
// each is a copy of the readings, so a very big session keeps fewer
// (undoReadings readings in all, and never fewer than 5 states).
const (
	undoDepth    = 20
	undoReadings = 1_000_000
)

// undoDepthFor is the number of states kept for a session of n readings.
func undoDepthFor(n int) int {
	return max(5, min(undoDepth, undoReadings/max(n, 1)))
}

// undoStep is one step of undo or redo: the state to go to (a copy without
// the history) and, in words, the change that going there takes back or
// makes again. hist0 and hist1 are the history entries [hist0, hist1) of
// the change while it is the latest one (typing on in the same cell still
// adds to it); -1 once undo or redo moved past it.
type undoStep struct {
	state        *session.Session
	what         string
	hist0, hist1 int
}

// undoUI (the controller's) keeps the states of the open session before its last edits (for
// undo) and after the edits undone since (for redo). One step per change
// in the history: typing a cell key by key is one entry, and one step.
// Undo and redo never rewrite the history: session.Restore appends an entry
// saying what was undone or redone (and, when rows come or go, the new
// count of readings), so every saved state is a valid record.
type undoUI struct {
	unSess  *session.Session // the session the stacks belong to
	unBase  *session.Session // copy of its state after the last edit
	unHist  int              // len(History) at unBase
	unStack []undoStep       // undo: earlier states, newest last
	unRedo  []undoStep       // redo: the states undone, newest last
	unMsg   string
}

// snapshot copies what an edit can change in s, without the history.
func snapshot(s *session.Session) *session.Session {
	c := *s
	c.History = nil
	c.Readings = slices.Clone(s.Readings)
	// The record's lists are changed in place by their setters: the copy
	// needs its own (an unknown's readings too).
	c.Conditions = slices.Clone(s.Conditions)
	c.Standards = slices.Clone(s.Standards)
	c.Unknowns = slices.Clone(s.Unknowns)
	for i := range c.Unknowns {
		c.Unknowns[i].Readings = slices.Clone(c.Unknowns[i].Readings)
	}
	// Seal and the sealed revisions are not part of a step (Restore keeps
	// the session's own); the copy holds none.
	c.Seal, c.Sealed = nil, nil
	if s.Location != nil {
		l := *s.Location
		c.Location = &l
	}
	if s.DecimalComma != nil {
		d := *s.DecimalComma
		c.DecimalComma = &d
	}
	// Settings hold pointers; a JSON round trip copies them deeply.
	if b, err := json.Marshal(s.Settings); err == nil {
		var st session.Settings
		if json.Unmarshal(b, &st) == nil {
			c.Settings = st
		}
	}
	return &c
}

// undoSync starts fresh stacks when another session (or another copy of
// it, from a file or another tab) is open.
func (k *controller) undoSync() {
	if k.sess != nil && k.unSess != k.sess {
		k.unSess, k.unBase, k.unHist, k.unStack, k.unRedo, k.unMsg = k.sess, snapshot(k.sess), len(k.sess.History), nil, nil, ""
	}
}

// undoRestart starts the stacks again from the open session's state
// (signing is no edit to undo).
func (k *controller) undoRestart() { k.unSess = nil }

// undoTrack is called by changed after every change: a change that added
// to the history pushes the state before it (and ends what redo could
// bring back); typing on in the cell of the latest change updates its
// words; a change typed back to what it was takes its step away.
func (k *controller) undoTrack() {
	if k.sess == nil {
		return
	}
	if k.unSess != k.sess {
		k.undoSync()
		return
	}
	h := k.sess.History
	n := len(h)
	top := len(k.unStack) - 1
	switch {
	case n > k.unHist && k.unBase != nil:
		k.unStack = append(k.unStack, undoStep{state: k.unBase, what: describeEdits(h[k.unHist:]), hist0: k.unHist, hist1: n})
		if d := undoDepthFor(len(k.sess.Readings)); len(k.unStack) > d {
			k.unStack = slices.Delete(k.unStack, 0, len(k.unStack)-d)
		}
		k.unRedo = nil
		k.unMsg = ""
	case top >= 0 && k.unStack[top].hist1 >= 0 && k.unStack[top].hist1 == k.unHist:
		// The latest change goes on (typing into the same cell) or was
		// typed back to what it was (its entry left the history).
		st := &k.unStack[top]
		if n <= st.hist0 {
			k.unStack = k.unStack[:top]
		} else {
			st.hist1, st.what = n, describeEdits(h[st.hist0:n])
		}
		k.unMsg = ""
	}
	k.unBase, k.unHist = snapshot(k.sess), n
}

// undo takes back the latest change; false when there was none to take
// back (or the record is sealed).
func (k *controller) undo() bool { return k.undoRedo(true) }

// redo makes the latest change undone again.
func (k *controller) redo() bool { return k.undoRedo(false) }

// undoRedo moves one step back (undo) or forward (redo): the open session
// takes the state of the step through session.Restore, and the state it
// leaves goes on the other stack. The change then runs as any change does
// (changed: analysis, verdict, save). It reports whether a step was taken.
func (k *controller) undoRedo(back bool) bool {
	k.undoSync()
	from, to, field, word := &k.unStack, &k.unRedo, session.FieldUndo, "Undone: "
	if !back {
		from, to, field, word = &k.unRedo, &k.unStack, session.FieldRedo, "Redone: "
	}
	if k.sess == nil || len(*from) == 0 || k.locked() {
		return false
	}
	step := (*from)[len(*from)-1]
	leaving := snapshot(k.sess)
	if err := k.sess.Restore(step.state, field, step.what, time.Now()); err != nil {
		k.unMsg = "Could not do that: " + err.Error()
		return false
	}
	*from = (*from)[:len(*from)-1]
	*to = append(*to, undoStep{state: leaving, what: step.what, hist0: -1, hist1: -1})
	// The entries Restore added are no change of their own to undo.
	k.unBase, k.unHist = snapshot(k.sess), len(k.sess.History)
	k.changed()
	k.unMsg = word + step.what + "."
	return true
}

// undo is the undo button: the controller takes the step, then the screen
// drops what belonged to the state left (a field's error, the selected
// reading) and writes every text field again.
func (c *Shell) undo(ctx app.Context, e app.Event) { c.undoRedoShown(ctx, true) }

// redo is the redo button.
func (c *Shell) redo(ctx app.Context, e app.Event) { c.undoRedoShown(ctx, false) }

func (c *Shell) undoRedoShown(ctx app.Context, back bool) {
	if !c.ctl.undoRedo(back) {
		return
	}
	c.an.anFieldErr = nil
	c.pl.plSel = 0
	c.afterChange(ctx)
	c.resyncInputs()
}

// maxWhat bounds the words of one step (the history's New is at most
// session.MaxLongText bytes; a short sentence is what is useful).
const maxWhat = 400

// describeEdits says in words what the history entries of one change did,
// e.g. "x of reading 3 typed as 12.5" or "reading 2 left out (reason)".
func describeEdits(h []session.Edit) string {
	var parts []string
	for i := 0; i < len(h); i++ {
		e := h[i]
		// Leaving a reading out is two entries: say it once, with the reason.
		if e.Field == session.EditExcluded && e.New == "true" && i+1 < len(h) && h[i+1].Field == session.EditExcludeReason && h[i+1].Row == e.Row {
			parts = append(parts, "reading "+strconv.Itoa(e.Row+1)+" left out ("+h[i+1].New+")")
			i++
			continue
		}
		if e.Field == session.EditExcluded && e.New == "false" && i+1 < len(h) && h[i+1].Field == session.EditExcludeReason && h[i+1].Row == e.Row {
			i++
		}
		if p := describeEdit(e); p != "" {
			parts = append(parts, p)
		}
	}
	if len(parts) == 0 {
		return "the last change"
	}
	out := parts[0]
	switch {
	case len(parts) == 2:
		out += " and " + parts[1]
	case len(parts) > 2:
		out += " and " + strconv.Itoa(len(parts)-1) + " more changes"
	}
	return clip(out, maxWhat)
}

// clip shortens s to at most n bytes on a character boundary.
func clip(s string, n int) string {
	if len(s) <= n {
		return s
	}
	for n > 0 && !utf8.RuneStart(s[n]) {
		n--
	}
	return s[:n] + "…"
}

// fieldWords names the metadata fields in the words of the screen.
var fieldWords = map[string]string{
	session.FieldTitle: "title", session.FieldSite: "site", session.FieldInstrument: "instrument",
	session.FieldSerial: "serial number", session.FieldOperator: "operator", session.FieldXName: "name of x",
	session.FieldXUnit: "unit of x", session.FieldYName: "name of y", session.FieldYUnit: "unit of y",
	session.FieldNotes: "notes", session.FieldInstrumentID: "identifier of the instrument",
	session.FieldIntervalDays: "calibration interval (days)",
}

func describeEdit(e session.Edit) string {
	reading := "reading " + strconv.Itoa(e.Row+1)
	switch e.Field {
	case "x", "y", "note":
		switch {
		case e.New == "":
			return e.Field + " of " + reading + " cleared (was " + strconv.Quote(clip(e.Old, 40)) + ")"
		case e.Old == "":
			return e.Field + " of " + reading + " typed as " + clip(e.New, 40)
		}
		return e.Field + " of " + reading + " changed from " + clip(e.Old, 40) + " to " + clip(e.New, 40)
	case session.EditRowAdded:
		return reading + " added"
	case session.EditExcluded:
		if e.New == "true" {
			return reading + " left out"
		}
		return reading + " put back"
	case session.EditExcludeReason:
		return "reason for leaving out " + reading + " set to " + strconv.Quote(clip(e.New, 60))
	case session.EditSettings:
		return describeSettings(e.Old, e.New)
	case session.EditImport:
		return "import of " + e.New
	case session.EditPaste:
		return "paste of " + e.New
	case session.FieldDecimalComma:
		switch e.New {
		case "true":
			return "“1,234” read as 1.234 (decimal comma)"
		case "false":
			return "“1,234” read as 1234 (thousands)"
		}
		return "the reading of “1,234” left open"
	case session.EditLocation:
		return "location changed"
	case session.FieldUndo:
		return "undo of " + e.New
	case session.FieldRedo:
		return "redo of " + e.New
	case session.FieldRows:
		return ""
	case session.EditCondition, session.EditStandard, session.EditUnknown, session.EditSealed, session.EditReviewed:
		// The record's own entries say it in words: "standard 2
		// certificate set to C-2231", "revision 1 sealed, performed by …".
		return clip(e.New, 120)
	case session.EditRevision:
		return "revision " + e.New + " started"
	}
	if w, ok := fieldWords[e.Field]; ok {
		if e.New == "" {
			return w + " cleared"
		}
		return w + " set to " + strconv.Quote(clip(e.New, 60))
	}
	return e.Field + " changed"
}

// weightWords names a weighting scheme in words.
func weightWords(w fitcore.WeightScheme) string {
	switch w {
	case fitcore.WeightsNone:
		return "none"
	case fitcore.WeightsGiven:
		return "as given"
	case fitcore.WeightsX:
		return "1/x (spread grows with x)"
	case fitcore.WeightsX2:
		return "1/x² (spread grows with x²)"
	case fitcore.WeightsFitted2:
		return "1/ŷ² (spread grows with the fitted value)"
	case fitcore.WeightsRepeats:
		return "from the spread of repeats"
	case fitcore.WeightsPowerFit:
		return "a power of x, estimated"
	}
	return "1/" + string(w)
}

// describeSettings names what changed between two settings (as the
// history keeps them, JSON): "smallest R² allowed set to 0.999", "scale set to log y".
func describeSettings(oldJSON, newJSON string) string {
	var a, b session.Settings
	if json.Unmarshal([]byte(oldJSON), &a) != nil || json.Unmarshal([]byte(newJSON), &b) != nil {
		return "fit settings changed"
	}
	var out []string
	opt := func(name string, p, q *float64) {
		switch {
		case p == nil && q == nil, p != nil && q != nil && *p == *q:
		case q == nil:
			out = append(out, name+" cleared (was "+numfmt.Full(*p)+")")
		default:
			out = append(out, name+" set to "+numfmt.Full(*q))
		}
	}
	num := func(name string, p, q float64) {
		if p != q {
			if q == 0 {
				out = append(out, name+" cleared")
			} else {
				out = append(out, name+" set to "+numfmt.Full(q))
			}
		}
	}
	if a.Model != b.Model {
		out = append(out, "fit set to "+wording.Model(b.Model))
	}
	if a.Weights != b.Weights {
		out = append(out, "weights set to "+weightWords(b.Weights))
	}
	if a.Transform != b.Transform {
		scale := wording.Scale(b.Transform)
		if scale == "" {
			scale = "the readings as entered"
		}
		out = append(out, "scale set to "+scale)
	}
	opt("Box–Cox power", a.BoxCoxLambda, b.BoxCoxLambda)
	num("confidence level", a.Level, b.Level)
	opt("slope reference", a.SlopeRef, b.SlopeRef)
	opt("intercept reference", a.InterceptRef, b.InterceptRef)
	num("variance ratio", a.VarianceRatio, b.VarianceRatio)
	num("x uncertainty", a.XUncertainty, b.XUncertainty)
	num("y uncertainty", a.YUncertainty, b.YUncertainty)
	var ka, kb fitcore.Criteria
	if a.Acceptance != nil {
		ka = *a.Acceptance
	}
	if b.Acceptance != nil {
		kb = *b.Acceptance
	}
	opt("smallest R² allowed", ka.MinRSquared, kb.MinRSquared)
	opt("lowest slope", ka.SlopeLow, kb.SlopeLow)
	opt("highest slope", ka.SlopeHigh, kb.SlopeHigh)
	opt("lowest intercept", ka.InterceptLow, kb.InterceptLow)
	opt("highest intercept", ka.InterceptHigh, kb.InterceptHigh)
	opt("largest residual", ka.MaxResidual, kb.MaxResidual)
	if ka.MaxResidualPercentOfSpan != kb.MaxResidualPercentOfSpan {
		if kb.MaxResidualPercentOfSpan {
			out = append(out, "largest residual counted in % of the span of y")
		} else {
			out = append(out, "largest residual counted in y units")
		}
	}
	if len(out) == 0 {
		return "fit settings changed"
	}
	return strings.Join(out, ", ")
}

// renderUndo is the undo/redo pair with the message of the last step. It
// floats at the bottom corner (web/plots.css), in reach of a thumb wherever
// the page is scrolled; on a phone it docks as a bar along the bottom edge.
func (c *Shell) renderUndo() app.UI {
	c.ctl.undoSync()
	nu, nr := len(c.ctl.unStack), len(c.ctl.unRedo)
	undoLabel, redoLabel := "Nothing to undo", "Nothing to redo"
	if nu > 0 {
		undoLabel = "Undo " + c.ctl.unStack[nu-1].what + " (" + strconv.Itoa(nu) + " can be undone)"
	}
	if nr > 0 {
		redoLabel = "Redo " + c.ctl.unRedo[nr-1].what + " (" + strconv.Itoa(nr) + " can be redone)"
	}
	return app.Div().Class("pl-undo").Attr("role", "group").Attr("aria-label", "Undo and redo").Body(
		anButton("pl-btn pl-btn-quiet", "↶ Undo", "undo").
			DataSet("depth", strconv.Itoa(nu)).Attr("aria-label", undoLabel).Attr("title", undoLabel).
			Disabled(nu == 0 || c.ctl.locked()).OnClick(c.undo),
		anButton("pl-btn pl-btn-quiet", "↷ Redo", "redo").
			DataSet("depth", strconv.Itoa(nr)).Attr("aria-label", redoLabel).Attr("title", redoLabel).
			Disabled(nr == 0 || c.ctl.locked()).OnClick(c.redo),
		app.Span().Class("pl-tools-msg").Attr("role", "status").DataSet("testid", "undo-message").
			Hidden(c.ctl.unMsg == "").Text(c.ctl.unMsg),
	)
}
