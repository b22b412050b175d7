package ui

import (
	"strconv"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/wording"
	"pairline/fitcore"
)

// anVerdict gives the icon and word of a verdict; the colour comes from the
// class, so that the verdict never depends on colour alone.
func anVerdict(v fitcore.Verdict) (icon, word, class string) {
	icon, word = wording.Verdict(v)
	switch v {
	case fitcore.Pass:
		return icon, word, "an-v-pass"
	case fitcore.Warn:
		return icon, word, "an-v-warn"
	case fitcore.Fail:
		return icon, word, "an-v-fail"
	}
	return icon, word, "an-v-na"
}

func anBadge(v fitcore.Verdict) app.UI {
	icon, word, cls := anVerdict(v)
	return app.Span().Class("an-badge "+cls).Body(
		app.Span().Class("an-badge-icon").Attr("aria-hidden", "true").Text(icon),
		app.Span().Text(" "+word),
	)
}

// renderChecks hands the checks card its data.
func (c *Shell) renderChecks() app.UI {
	if c.ctl.view.report == nil {
		return nil
	}
	return &checksCard{Report: c.ctl.view.report, Rows: c.ctl.view.rows, Digits: c.ctl.view.digits, Stale: c.ctl.view.stale,
		Open: c.an.anOpen, OnAction: c.cardAction}
}

// checksCard draws one row per assumption of the straight line, with its
// verdict (icon, word and colour), fitcore's sentence and advice, and the
// numbers of the underlying tests behind a button.
type checksCard struct {
	app.Compo

	Report   *fitcore.Report
	Rows     []int // grid row of each usable pair (fitcore's index → row)
	Digits   int
	Stale    bool
	Open     map[string]bool // rows whose numbers are shown, by check id
	OnAction func(CardAction)
}

func (r *checksCard) act(a CardAction) {
	if r.OnAction != nil {
		r.OnAction(a)
	}
}

// Render draws the card.
func (r *checksCard) Render() app.UI {
	rep := r.Report
	var rows []app.UI
	for _, as := range fitcore.AssumptionList() {
		x := as.Get(rep)
		switch {
		case x == nil:
		case as.ID == fitcore.AssumeInfluence:
			rows = append(rows, r.influenceRow(*x))
		default:
			var tests app.UI
			if ts := rep.TestsOf(as.ID); len(ts) > 0 {
				tests = anTests(ts)
			}
			rows = append(rows, r.checkRow(strings.ReplaceAll(string(as.ID), "_", "-"), wording.CheckName(as.ID), *x, tests))
		}
	}
	return app.Section().Class("pl-card an-checks").Attr("aria-label", "Checks").
		DataSet("testid", "checks").DataSet("slope", numfmt.Full(rep.Slope.Estimate)).Body(
		app.H2().Text(wording.ChecksTitle),
		app.P().Class("pl-stale").Hidden(!r.Stale).Text(staleNote(r.Stale)),
		app.Ul().Class("an-check-list").Body(rows...),
	)
}

// checkRow is one assumption: verdict, sentence, what to do, numbers.
func (r *checksCard) checkRow(id, title string, a fitcore.Assumption, details app.UI, extra ...app.UI) app.UI {
	_, _, cls := anVerdict(a.Verdict)
	open := r.Open[id]
	body := []app.UI{
		app.Div().Class("an-check-head").Body(
			anBadge(a.Verdict),
			app.H3().Text(title),
		),
		app.P().Class("an-check-msg").DataSet("testid", "check-"+id+"-message").Text(a.Message),
		app.If(a.Advice != "", func() app.UI {
			return app.P().Class("an-check-todo").DataSet("testid", "check-"+id+"-advice").Body(
				app.Strong().Text("What to do: "), app.Span().Text(a.Advice))
		}),
	}
	body = append(body, extra...)
	if details != nil {
		label := "Show the numbers"
		if open {
			label = "Hide the numbers"
		}
		body = append(body,
			app.Button().Class("pl-btn pl-btn-quiet an-toggle").Text(label).
				DataSet("testid", "check-"+id+"-more").DataSet("check", id).
				Attr("aria-expanded", strconv.FormatBool(open)).
				OnClick(func(ctx app.Context, e app.Event) {
					r.act(CardAction{Kind: caToggle, Key: ctx.JSSrc().Get("dataset").Get("check").String()})
				}),
			app.If(open, func() app.UI { return details }),
		)
	}
	return app.Li().Class("an-check "+cls).DataSet("testid", "check-"+id).DataSet("verdict", string(a.Verdict)).Body(body...)
}

// anTests lists the tests behind an assumption: name and result, then the
// statistic, its degrees of freedom and p, then fitcore's sentence. Blocks
// rather than a table, so that a phone needs no sideways scrolling.
func anTests(cs []fitcore.CheckPresent) app.UI {
	return app.Ul().Class("an-tests-list").Body(app.Range(cs).Slice(func(i int) app.UI {
		k, sym := cs[i].Check, cs[i].Symbol
		id := "test-" + anSlug(k.Name) + "-"
		ran := k.Verdict != fitcore.NA
		var nums []app.UI
		if ran {
			nums = append(nums,
				app.Span().Text(sym+" = "), anNum(id+"statistic", k.Statistic, numfmt.Sig(k.Statistic, 4)))
			if k.DF != 0 {
				df := anDF(k.DF)
				if k.DF2 != 0 {
					df += ", " + anDF(k.DF2)
				}
				nums = append(nums, app.Span().Text(" · df "), anNum(id+"df", k.DF, df))
			}
			nums = append(nums, app.Span().Text(" · p = "), anNum(id+"p", k.P, anP(k.P)))
		}
		return app.Li().Class("an-test").DataSet("testid", "test-"+anSlug(k.Name)).DataSet("verdict", string(k.Verdict)).Body(
			app.Div().Class("an-test-head").Body(app.Strong().Text(k.Name), anBadge(k.Verdict)),
			app.If(len(nums) > 0, func() app.UI { return app.P().Class("an-test-nums").Body(nums...) }),
			app.If(k.Message != "", func() app.UI { return anPText("an-test-msg", k.Message) }),
		)
	}))
}

func anSlug(name string) string {
	var b strings.Builder
	for _, r := range strings.ToLower(name) {
		switch {
		case r >= 'a' && r <= 'z', r >= '0' && r <= '9':
			b.WriteRune(r)
		case r == ' ' || r == '–' || r == '-':
			b.WriteByte('-')
		}
	}
	return b.String()
}

// influenceRow is the influence assumption: it names the flagged readings
// by their row in the grid (from 1), each with a button that jumps there.
func (r *checksCard) influenceRow(a fitcore.Assumption) app.UI {
	rep := r.Report
	var flagged []fitcore.PointInfluence
	for _, p := range rep.Influence {
		if p.Flagged {
			flagged = append(flagged, p)
		}
	}
	var extra []app.UI
	if len(flagged) > 0 {
		const show = 12
		btns := make([]app.UI, 0, min(len(flagged), show))
		for i, p := range flagged {
			if i == show {
				break
			}
			row := r.rowOf(p.Index)
			btns = append(btns, app.Button().Class("pl-btn pl-btn-quiet an-jump").
				Text("Go to row "+strconv.Itoa(row+1)).
				DataSet("testid", "influence-jump-"+strconv.Itoa(row+1)).DataSet("row", strconv.Itoa(row+1)).
				OnClick(func(ctx app.Context, e app.Event) {
					n, err := strconv.Atoi(ctx.JSSrc().Get("dataset").Get("row").String())
					if err == nil {
						r.act(CardAction{Kind: caJump, Row: n - 1})
					}
				}))
		}
		extra = append(extra, app.Div().Class("an-jumps").DataSet("testid", "influence-rows").Body(btns...))
	}
	var details app.UI
	switch {
	case len(rep.Influence) == 0:
	case r.Open["influence"]:
		details = r.influenceTable(flagged)
	default:
		// Closed: the table of every flagged reading is only built when it
		// is shown (at 1,000 readings it costs a good part of a frame).
		details = app.Text("")
	}
	return r.checkRow("influence", wording.CheckInfluence, a, details, extra...)
}

// rowOf maps a position among the usable pairs to the row of the grid.
func (r *checksCard) rowOf(i int) int {
	if i >= 0 && i < len(r.Rows) {
		return r.Rows[i]
	}
	return i
}

func (r *checksCard) influenceTable(flagged []fitcore.PointInfluence) app.UI {
	if len(flagged) == 0 {
		return anPText("an-hint", "No reading is flagged by leverage, studentized residual, Cook's distance or DFFITS.")
	}
	sig := numfmt.Precision(r.Digits)
	return app.Ul().Class("an-tests-list").DataSet("testid", "influence-table").Body(app.Range(flagged).Slice(func(i int) app.UI {
		p := flagged[i]
		row := strconv.Itoa(r.rowOf(p.Index) + 1)
		id := "influence-" + row + "-"
		return app.Li().Class("an-test").Body(
			app.Div().Class("an-test-head").Body(app.Strong().Text("Row "+row)),
			app.P().Class("an-test-nums").Body(
				app.Span().Text("residual "), anNum(id+"residual", p.Residual, numfmt.Sig(p.Residual, sig)),
				app.Span().Text(" · studentized "), anNum(id+"studentized", p.Studentized, numfmt.Sig(p.Studentized, 3)),
				app.Span().Text(" · leverage "), anNum(id+"leverage", p.Leverage, numfmt.Sig(p.Leverage, 3)),
				app.Span().Text(" · Cook's D "), anNum(id+"cooks", p.CooksD, numfmt.Sig(p.CooksD, 3)),
			),
			anPText("an-test-msg", strings.Join(p.Reasons, "; ")),
		)
	}))
}
