package session

import (
	"fmt"
	"strings"
	"time"

	"pairline/fitcore"
)

// parser returns the number reader the session's cells use: ParseNumberHint
// with DecimalComma when it is decided, ParseNumber otherwise.
func (s *Session) parser() func(string) (float64, error) {
	if s.DecimalComma != nil {
		dc := *s.DecimalComma
		return func(t string) (float64, error) { return ParseNumberHint(t, dc) }
	}
	return ParseNumber
}

// UnknownSet is what UnknownQueries makes of a record's unknowns.
type UnknownSet struct {
	// Queries are the inverse predictions to ask fitcore for, one per
	// unknown that can be converted.
	Queries []fitcore.InverseQuery
	// Index is the position in Session.Unknowns of each query's unknown.
	Index []int
	// Problems say, one sentence each, why an unknown is not converted
	// (a reading that is not a number, no readings).
	Problems []string
}

// UnknownQueries reads the y readings of each unknown (as the cells are
// read: ParseNumberHint with the session's decimal-comma choice) and makes
// one fitcore.InverseQuery per unknown, for Options.Inverse. Empty readings
// are skipped; an unknown with a reading that is not a number, or with no
// readings, is not converted and gets a problem sentence instead (a mean
// that silently left out a reading would misstate the sample). The cost is
// linear in the number of readings.
func (s *Session) UnknownQueries() UnknownSet {
	parse := s.parser()
	var out UnknownSet
	for i, u := range s.Unknowns {
		ys := make([]float64, 0, len(u.Readings))
		bad := ""
		for j, r := range u.Readings {
			if isBlank(r) {
				continue
			}
			v, err := parse(r)
			if err != nil {
				bad = fmt.Sprintf("unknown %d (%q) is not converted: reading %d, %q, %s", i+1, truncate(u.Name, 80), j+1, truncate(r, 80), reasonOf(err))
				break
			}
			ys = append(ys, v)
		}
		switch {
		case bad != "":
			out.Problems = append(out.Problems, bad)
		case len(ys) == 0:
			out.Problems = append(out.Problems, fmt.Sprintf("unknown %d (%q) is not converted: it has no readings", i+1, truncate(u.Name, 80)))
		default:
			out.Queries = append(out.Queries, fitcore.InverseQuery{Y: ys})
			out.Index = append(out.Index, i)
		}
	}
	return out
}

// StandardUncertainties gives the standard uncertainty u(xᵢ) of each known
// value x[i] (the x of the pairs, as Pairs returns them) for
// fitcore.Options.XStandardUncertainties: a reading is a reading of a
// standard when its x equals the standard's certified Value, parsed like
// the cells, exactly (numeric equality after parsing, so "100", "100.0"
// and "1,00e2" with a decimal comma are the same value; 99.99 is not 100).
// Its u is the standard's Uncertainty, parsed the same way; a reading that
// matches no standard, or a standard without an uncertainty, gets 0 (taken
// as exact). When two standards have the same value, the larger
// uncertainty is used, and a problem says so. A standard whose value or
// uncertainty cannot be read, or whose uncertainty is negative, is left out
// with a problem. u is nil when no reading matches a standard with an
// uncertainty. The cost is linear in len(x) plus the number of standards.
func (s *Session) StandardUncertainties(x []float64) (u []float64, problems []string) {
	parse := s.parser()
	byValue := make(map[float64]float64, len(s.Standards))
	from := make(map[float64]int, len(s.Standards))
	for i, st := range s.Standards {
		if isBlank(st.Value) {
			continue
		}
		v, err := parse(st.Value)
		if err != nil {
			problems = append(problems, fmt.Sprintf("standard %d (%q): its value %q %s", i+1, truncate(st.Name, 80), truncate(st.Value, 80), reasonOf(err)))
			continue
		}
		if isBlank(st.Uncertainty) {
			continue
		}
		uv, err := parse(st.Uncertainty)
		if err != nil {
			problems = append(problems, fmt.Sprintf("standard %d (%q): its uncertainty %q %s", i+1, truncate(st.Name, 80), truncate(st.Uncertainty, 80), reasonOf(err)))
			continue
		}
		if uv < 0 {
			problems = append(problems, fmt.Sprintf("standard %d (%q): its uncertainty %q is negative", i+1, truncate(st.Name, 80), truncate(st.Uncertainty, 80)))
			continue
		}
		if v == 0 {
			v = 0 // −0 and +0 are one value
		}
		if old, ok := byValue[v]; ok {
			if old != uv {
				problems = append(problems, fmt.Sprintf("standards %d and %d have the same value %s with different uncertainties; the larger is used", from[v]+1, i+1, truncate(st.Value, 80)))
			}
			if uv <= old {
				continue
			}
		}
		byValue[v], from[v] = uv, i
	}
	if len(byValue) == 0 {
		return nil, problems
	}
	u = make([]float64, len(x))
	found := false
	for i, v := range x {
		if uv, ok := byValue[v]; ok {
			u[i] = uv
			found = found || uv > 0
		}
	}
	if !found {
		return nil, problems
	}
	return u, problems
}

// StandardExpiry is a standard that was past its expiry date on the day of
// the readings.
type StandardExpiry struct {
	Index  int       `json:"index"`  // position in Session.Standards
	Expiry time.Time `json:"expiry"` // the standard's last valid day (UTC date)
	Day    time.Time `json:"day"`    // the day of the readings it is checked against (UTC date)
}

// ReadingsDay is the day the readings were taken, as a UTC date: the
// latest Taken date of the readings, or the session's Created date when no
// reading has a time.
func (s *Session) ReadingsDay() time.Time {
	var day time.Time
	for i := range s.Readings {
		if t := s.Readings[i].Taken; !t.IsZero() && t.After(day) {
			day = t
		}
	}
	if day.IsZero() {
		day = s.Created
	}
	return utcDate(day)
}

// ExpiredStandards lists the standards past expiry on the day of the
// readings (ReadingsDay): those whose Expiry date is before that day (the
// expiry is the last day a certificate is valid, common practice for
// certificates of reference materials). Standards without an expiry are
// not listed. The UI shows its standard-expired warning for each; a record
// made with an expired standard should not be used until the standard's
// maker or the lab's procedure says otherwise.
func (s *Session) ExpiredStandards() []StandardExpiry {
	day := s.ReadingsDay()
	var out []StandardExpiry
	for i, st := range s.Standards {
		if st.Expiry.IsZero() {
			continue
		}
		if e := utcDate(st.Expiry); e.Before(day) {
			out = append(out, StandardExpiry{Index: i, Expiry: e, Day: day})
		}
	}
	return out
}

// InstrumentKey is the key that names an instrument across records: its ID
// (asset tag) when given, else its serial number, else its description,
// trimmed. It is "" when the record names no instrument.
func InstrumentKey(in Instrument) string {
	for _, v := range []string{in.ID, in.Serial, in.Description} {
		if t := strings.TrimSpace(v); t != "" {
			return t
		}
	}
	return ""
}

// LastRecordFor returns the most recently created record among sessions
// for the instrument with the given key (InstrumentKey, compared without
// regard to case and surrounding spaces) at the given site (compared the
// same way; "" = any site), so that a new record can offer the values used
// last time (standards, conditions, interval, units, settings). It returns
// nil when there is none or instrumentKey is empty. Pass the sessions
// other than the one being filled in. The cost is linear in the number of
// sessions.
func LastRecordFor(sessions []*Session, instrumentKey, site string) *Session {
	key := strings.TrimSpace(instrumentKey)
	site = strings.TrimSpace(site)
	if key == "" {
		return nil
	}
	var best *Session
	for _, s := range sessions {
		if s == nil || !strings.EqualFold(InstrumentKey(s.Instrument), key) {
			continue
		}
		if site != "" && !strings.EqualFold(strings.TrimSpace(s.Site), site) {
			continue
		}
		if best == nil || s.Created.After(best.Created) || (s.Created.Equal(best.Created) && s.Modified.After(best.Modified)) {
			best = s
		}
	}
	return best
}
