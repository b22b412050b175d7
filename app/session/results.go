package session

import (
	"io"
	"strconv"
	"strings"

	"pairline/fitcore"
)

// RecordOptions are the options for fitcore.Analyze of the pairs x (as
// Pairs returns them): the session's settings (Settings.Options), one
// inverse prediction per convertible unknown (UnknownQueries) and the
// standards' uncertainties of the known values (StandardUncertainties).
// The tablet, `pairline inspect` and the sealed results summary all
// analyse a record through it. problems are those of the unknowns and of
// the standards, one sentence each.
func (s *Session) RecordOptions(x []float64) (opt fitcore.Options, unknowns UnknownSet, problems []string) {
	opt = s.Settings.Options()
	unknowns = s.UnknownQueries()
	opt.Inverse = unknowns.Queries
	u, sp := s.StandardUncertainties(x)
	opt.XStandardUncertainties = u
	problems = append(append(problems, unknowns.Problems...), sp...)
	return opt, unknowns, problems
}

// fullNumber is a number at full precision: the shortest text that reads
// back as the same float64.
func fullNumber(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// ResultsTable is the results of a record as rows for WriteTable: a header
// row (figure, value, unit, detail), then the pairs used, the line with
// its standard errors and confidence intervals at the report's level, r²
// and the residual standard deviation, each check's verdict with its
// sentence, the acceptance verdict with each criterion in words, and each
// unknown converted to x (value, combined standard uncertainty, interval),
// every number at full precision and every unit from the record. unknowns
// is what RecordOptions gave for rep (rep.Inverse[i] is the unknown
// s.Unknowns[unknowns.Index[i]]). The tablet's results export and
// `pairline export-csv --results` write this table, so both give the same
// file.
func ResultsTable(s *Session, rep *fitcore.Report, unknowns UnknownSet) [][]string {
	xu, yu := s.XUnit, s.YUnit
	slopeUnit := ""
	if xu != "" || yu != "" {
		slopeUnit = orOne(yu) + "/" + orOne(xu)
	}
	level := fullNumber(rep.Level*100) + " %"
	t := &resultRows{rows: [][]string{{"figure", "value", "unit", "detail"}}}
	add, addText := t.add, t.addText
	addText("record", s.Title, "revision "+strconv.Itoa(s.Revision))
	addText("x", s.XName, s.XUnit)
	addText("y", s.YName, s.YUnit)
	add("pairs used (n)", float64(rep.N), "", "")
	add("slope", rep.Slope.Estimate, slopeUnit, "")
	add("slope standard error", rep.Slope.SE, slopeUnit, "")
	add("slope interval low", rep.Slope.CILow, slopeUnit, level+" confidence")
	add("slope interval high", rep.Slope.CIHigh, slopeUnit, level+" confidence")
	if rep.Model != fitcore.ModelOrigin {
		add("intercept", rep.Intercept.Estimate, yu, "")
		add("intercept standard error", rep.Intercept.SE, yu, "")
		add("intercept interval low", rep.Intercept.CILow, yu, level+" confidence")
		add("intercept interval high", rep.Intercept.CIHigh, yu, level+" confidence")
	}
	add("r squared", rep.RSquared, "", "")
	add("residual standard deviation", rep.ResidualSE, yu, "")
	for _, info := range fitcore.CheckList() {
		ch := info.Get(rep)
		if ch == nil || ch.Name == "" {
			continue
		}
		addText("check: "+ch.Name, string(ch.Verdict), oneLineText(ch.Message))
	}
	if a := rep.Acceptance; a != nil {
		v := "fail"
		if a.Pass {
			v = "pass"
		}
		addText("acceptance", v, oneLineText(a.Summary))
		for _, r := range a.Results {
			pass := "fail"
			if r.Pass {
				pass = "pass"
			}
			t.rows = append(t.rows, []string{"criterion: " + r.Name, fullNumber(r.Value), "", pass + ": " + oneLineText(strings.TrimSpace(r.Limit+"; "+r.Reason))})
		}
	} else {
		addText("acceptance", "not set", "no acceptance criteria in the settings")
	}
	for i, inv := range rep.Inverse {
		name := ""
		if i < len(unknowns.Index) && unknowns.Index[i] < len(s.Unknowns) {
			name = s.Unknowns[unknowns.Index[i]].Name
		}
		p := "unknown " + strconv.Itoa(i+1) + " " + name
		add(p+": x", inv.X, xu, "mean of "+strconv.Itoa(inv.M)+" reading(s), y "+fullNumber(inv.Y)+" "+yu)
		detail := "combined standard uncertainty"
		if inv.UStandards > 0 {
			detail += "; from the fit " + fullNumber(inv.SEFit) + ", from the standards " + fullNumber(inv.UStandards)
		}
		add(p+": standard uncertainty", inv.SE, xu, detail)
		if inv.Bounded {
			add(p+": interval low", inv.Low, xu, level)
			add(p+": interval high", inv.High, xu, level)
		} else {
			addText(p+": interval", "unbounded", oneLineText(inv.Message))
		}
		if inv.Message != "" && inv.Bounded {
			addText(p+": note", "", oneLineText(inv.Message))
		}
	}
	for _, pr := range unknowns.Problems {
		addText("unknown not converted", "", pr)
	}
	return t.rows
}

// resultRows builds ResultsTable's rows. Its methods are not inlined: the
// table is made once per export, and each of its thirty-odd rows inlined
// cost app.wasm about 15 kB (DEVELOPERS.md, "What app.wasm is made of").
type resultRows struct{ rows [][]string }

// add appends a row of a number at full precision with its unit and detail.
//
//go:noinline
func (t *resultRows) add(name string, v float64, unit, detail string) {
	t.rows = append(t.rows, []string{name, fullNumber(v), unit, detail})
}

// addText appends a row of a text value and its detail (no unit).
//
//go:noinline
func (t *resultRows) addText(name, v, detail string) {
	t.rows = append(t.rows, []string{name, v, "", detail})
}

func orOne(u string) string {
	if u == "" {
		return "1"
	}
	return u
}

// oneLineText folds line ends and tabs to spaces (a results cell is one
// line of text).
func oneLineText(s string) string {
	return strings.Join(strings.Fields(s), " ")
}

// WriteResultsCSV writes ResultsTable with WriteTable (every cell
// neutralised against formulas). The numbers are written with a decimal
// point, whatever the session's choice, as full-precision figures for
// other programs to read.
func WriteResultsCSV(w io.Writer, s *Session, rep *fitcore.Report, unknowns UnknownSet) error {
	return WriteTable(w, ResultsTable(s, rep, unknowns), false)
}
