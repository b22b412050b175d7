package fitcore

import (
	"fmt"
	"strings"
)

// Summarize combines the checks into one verdict per assumption of the
// straight-line fit, each with a plain sentence and, when something is
// wrong, a short piece of advice:
//
//	linearity     Curvature and LackOfFit (when there are repeats)
//	spread        BreuschPagan and White
//	independence  DurbinWatson and Runs (in entry order)
//	normality     ShapiroWilk
//	influence     the flagged readings of Influence, named by their number
//	              from 1 ("Reading 7 …")
//	x exactness   XExactness, when it was run
//
// The verdict of an assumption is the worst verdict among its checks that
// could be run (fail > warn > pass); it is NA only when none could be run,
// with the first check's reason (NoScatterSentence alone when the readings
// have no scatter; see checkmin.go for the minimum number of readings of
// each check).
// For influence: fail when some reading is an outlier by the Bonferroni test
// at 1 % (see Influence), warn when a reading is out of line at 5 %, moves
// the line beyond its 90 % confidence region, or alone fixes the line
// (leverage 1); pass otherwise. Leverage alone is shown, never a flag.
func Summarize(c Checks, infl []PointInfluence) Assumptions {
	return summarize(c, ckSummarizeInfluence(infl), nil)
}

// summarize is Summarize with the influence assumption already worded and
// the practical sizes d (nil: not known, the evidence alone decides). A
// linearity, spread or independence Fail whose size in d is below its
// threshold becomes a Warn that keeps the Fail's wording and adds the
// sentence that the effect is clear but small (see Departures).
func summarize(c Checks, influence Assumption, d *Departures) Assumptions {
	var a Assumptions
	lin := []Check{c.Curvature}
	if c.LackOfFit != nil {
		lin = append(lin, *c.LackOfFit)
	}
	a.Linearity = ckCombine(lin,
		"The readings follow a straight line.",
		"The readings may bend slightly away from a straight line.",
		"The readings bend away from a straight line.",
		"Look at the advice for a transform, use only the part of the range that is straight, or follow the instrument maker's procedure for a curved response.",
		"Whether the readings follow a straight line could not be checked", d.smallCurvature())
	a.Spread = ckCombine([]Check{c.BreuschPagan, c.White},
		"The scatter about the line is about the same across the whole range.",
		"The scatter about the line may change across the range.",
		"The scatter about the line changes across the range (bigger at one end or in the middle).",
		spreadWhatToDo,
		"Whether the scatter is even across the range could not be checked", d.smallScatter())
	a.Independence = ckCombine([]Check{c.DurbinWatson, c.Runs},
		"In the order entered, the readings look independent of each other.",
		"In the order entered, neighbouring readings may be related (a drift or a pattern).",
		"In the order entered, neighbouring readings are related: there is a drift or a pattern.",
		"Check for drift (warm-up, temperature, a sensor settling) and, if you can, repeat the readings in a shuffled order.",
		"Whether the readings are independent could not be checked", d.smallDrift())
	a.Normality = ckCombine([]Check{c.ShapiroWilk},
		"The scatter about the line has the usual bell shape.",
		"The scatter about the line may not have the usual bell shape.",
		"The scatter about the line does not have the usual bell shape.",
		"Look for outlying readings first; intervals and limits from this line may be less reliable than stated.",
		"Whether the scatter is bell-shaped could not be checked", "")
	a.Influence = influence
	if c.XExactness != nil {
		x := ckXExactAssumption(*c.XExactness)
		a.XExactness = &x
	}
	return a
}

// ckVerdictRank orders verdicts from NA (nothing known) to Fail.
func ckVerdictRank(v Verdict) int {
	switch v {
	case Pass:
		return 1
	case Warn:
		return 2
	case Fail:
		return 3
	}
	return 0
}

// ckCombine takes the worst verdict of the checks that ran and words it.
// small, when not empty, turns a Fail into a Warn worded as the Fail with
// small after it (the size of the effect is below its threshold).
func ckCombine(cs []Check, pass, warn, fail, advice, naLead, small string) Assumption {
	worst := NA
	var worstMsg string
	var why []string
	for _, c := range cs {
		if ckVerdictRank(c.Verdict) == 0 {
			if c.Message != "" {
				why = append(why, c.Message)
			}
			continue
		}
		if ckVerdictRank(c.Verdict) > ckVerdictRank(worst) {
			worst, worstMsg = c.Verdict, c.Message
		}
	}
	switch worst {
	case Pass:
		return Assumption{Verdict: Pass, Message: pass}
	case Warn:
		return Assumption{Verdict: Warn, Message: ckJoin(warn, worstMsg), Advice: advice}
	case Fail:
		if small != "" {
			return Assumption{Verdict: Warn, Message: ckJoin(fail, worstMsg) + " " + small, Advice: advice}
		}
		return Assumption{Verdict: Fail, Message: ckJoin(fail, worstMsg), Advice: advice}
	}
	msg := naLead + "."
	if len(why) > 0 {
		msg = naLead + ": " + why[0]
		if why[0] == NoScatterSentence {
			msg = NoScatterSentence
		}
	}
	return Assumption{Verdict: NA, Message: msg}
}

// The spread assumption's "What to do", one text for the checks and the
// advice: spreadWhatToDo while the advice has not been worked out or offers
// a remedy, spreadNoRemedy when it tried every remedy and none helped.
const (
	spreadWhatToDo = "Use a weighted fit or the transform in the advice, and do not quote one ± figure for the whole range."
	spreadNoRemedy = "None of the weightings or changes of scale the advice tried evens out the scatter: do not quote one ± figure for the whole range, look at the readings at the ends, and follow the instrument maker's procedure."
)

// ckJoin puts the assumption's lead sentence before the check's message,
// unless the message already starts with the lead's words (then it says
// the same with its figures, and the lead would repeat it).
func ckJoin(lead, msg string) string {
	if msg == "" {
		return lead
	}
	if strings.HasPrefix(msg, strings.TrimSuffix(lead, ".")) {
		return msg
	}
	return lead + " " + msg
}

// ckSummarizeInfluence words the flagged readings.
func ckSummarizeInfluence(infl []PointInfluence) Assumption {
	if len(infl) == 0 {
		return ckInfluenceNA()
	}
	var serious, mild []int
	for _, p := range infl {
		if !p.Flagged {
			continue
		}
		isSerious := false
		for _, r := range p.Reasons {
			if strings.HasPrefix(r, ckReasonOutlier) {
				isSerious = true
			}
		}
		if isSerious {
			serious = append(serious, p.Index+1)
		} else {
			mild = append(mild, p.Index+1)
		}
	}
	return ckWordInfluence(serious, mild)
}

// ckInfluenceNA is the influence assumption when it could not be checked.
func ckInfluenceNA() Assumption {
	return Assumption{Verdict: NA, Message: "The influence of single readings could not be checked."}
}

// ckWordInfluence words the seriously and mildly flagged readings
// (numbered from 1).
func ckWordInfluence(serious, mild []int) Assumption {
	switch {
	case len(serious) > 0:
		msg := fmt.Sprintf("%s %s out of line with the rest.",
			ckReadingList(serious), ckPlural(len(serious), "is", "are"))
		if len(mild) > 0 {
			msg += fmt.Sprintf(" %s also %s out.", ckReadingList(mild), ckPlural(len(mild), "stands", "stand"))
		}
		return Assumption{Verdict: Fail, Message: msg,
			Advice: "Check those readings for a typing or reading mistake and repeat them if you can; exclude a reading only with a recorded reason."}
	case len(mild) > 0:
		return Assumption{Verdict: Warn,
			Message: fmt.Sprintf("%s %s out from the rest (see the reasons listed with each reading).", ckReadingList(mild), ckPlural(len(mild), "stands", "stand")),
			Advice:  "Check those readings; a reading far from the others in x deserves a repeat or a neighbour."}
	}
	return Assumption{Verdict: Pass, Message: "No single reading dominates the line."}
}

// ckReadingList names readings by number from 1: "Reading 7",
// "Readings 3 and 7", "Readings 1, 4, 9, 12, 15 and 3 more".
func ckReadingList(ix []int) string {
	const show = 5
	parts := make([]string, 0, show)
	for i, v := range ix {
		if i == show {
			break
		}
		parts = append(parts, fmt.Sprint(v))
	}
	if len(ix) == 1 {
		return "Reading " + parts[0]
	}
	if len(ix) > show {
		return fmt.Sprintf("Readings %s and %d more", strings.Join(parts, ", "), len(ix)-show)
	}
	return "Readings " + strings.Join(parts[:len(parts)-1], ", ") + " and " + parts[len(parts)-1]
}

func ckPlural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}
