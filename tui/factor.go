package tui

import (
	"fmt"
	"strings"

	"github.com/charmbracelet/lipgloss"

	"dragdeck/feed/pipeline"
	"dragdeck/feed/store"
	"dragdeck/model"
)

// FactorBook is the store's fuel factors as the dashboard uses them: the
// factor history the Tail screen draws, the proposals still open, and the
// one move the factor key makes, written to the store at once. The
// dashboard has one only when its data come from a store.
type FactorBook interface {
	// History is each tail's factor history, in the order it takes effect.
	History() (map[string][]store.FactorSetting, error)
	// Open is each tail's latest proposal that is proposed or approved.
	Open() (map[string]store.Proposal, error)
	// Decide moves proposal id of the tail to status with a note (id 0:
	// the run's proposal, filed first) and says what it did.
	Decide(tail string, id int64, status, note string) (string, error)
}

// factorCaution is the caution on one line, beside every proposal.
var factorCaution = strings.ReplaceAll(model.FactorCaution, "\n", " ")

// shownProposal is the proposal the dashboard shows for a tail: the
// store's open one unless the run's is of a later period (filing it
// supersedes the store's), else the run's (id 0, not filed yet). ok is
// false when there is neither.
func shownProposal(f pipeline.TailFactor, open map[string]store.Proposal, tail string) (p store.Proposal, ok bool) {
	sp, filed := open[tail]
	run := f.Proposal
	if filed && (!run.Proposed || sp.Period >= run.Period) {
		return sp, true
	}
	if !run.Proposed {
		return store.Proposal{}, false
	}
	return f.StoreProposal(tail), true
}

// factorCell is the Fleet screen's factor column: the factor in use ("-"
// when none was ever set), then "→" and the proposed factor when there is
// a proposal, marked ✓ when approved and ! when it needs a note or a
// second look; so it reads without colour. Compact, a proposal shows
// without the factor in use.
func factorCell(f pipeline.TailFactor, p store.Proposal, hasProposal, compact bool) string {
	use := "-"
	if f.InUse {
		use = fmtSigned(f.Proposal.InUsePct, 1)
	}
	if !hasProposal {
		return use
	}
	if compact {
		use = ""
	}
	mark := ""
	switch {
	case p.Status == store.FactorApproved:
		mark = "✓"
	case p.NeedsNote || p.SecondLook:
		mark = "!"
	}
	return use + "→" + fmtSigned(p.ProposedPct, 1) + mark
}

// factorForm approves or rejects a tail's proposal with a note: the Fleet
// screen's form behind the factor key, a sibling of the work form. Its
// choices are the statuses the proposal may move to here (applying needs
// an effective date: the factor command's apply).
type factorForm struct {
	tail string
	prop store.Proposal // ID 0: the run's, filed on saving
	noteForm
}

func newFactorForm(tail string, p store.Proposal) *factorForm {
	choices := []string{store.FactorApproved, store.FactorRejected}
	if p.Status == store.FactorApproved {
		choices = []string{store.FactorRejected}
	}
	return &factorForm{tail: tail, prop: p, noteForm: newNoteForm("note: ", "", choices)}
}

// save makes the move in the store and says what it did.
func (f *factorForm) save(b FactorBook) (string, error) {
	return b.Decide(f.tail, f.prop.ID, f.chosen(), f.note())
}

// view is the form's lines, each wrapped at w: the proposal and what it
// rests on, the choices, the note, and the caution in full.
func (f *factorForm) view(st Styles, w int) string {
	p := f.prop
	wrap := lipgloss.NewStyle().Width(max(1, w))
	head := fmt.Sprintf("fuel factor %s %s: %s → %s %%", clean(f.tail), p.Period, fmtSigned(p.InUsePct, 1), fmtSigned(p.ProposedPct, 1))
	basis := fmt.Sprintf(" · monitored %s [%s, %s] %%, %d flights", fmtSigned(p.MonitoredPct, 2), fmtSigned(p.LoPct, 2), fmtSigned(p.HiPct, 2), p.Flights)
	opts := f.options(st, func(c string) string {
		return map[string]string{store.FactorApproved: "approve", store.FactorRejected: "reject"}[c]
	})
	status := "proposed → "
	if p.Status == store.FactorApproved {
		status = "approved (apply: dragdeck factor apply) → "
	}
	line2 := st.Muted.Render(status) + opts
	if p.NeedsNote {
		line2 += " " + st.Flag.Render("! outside the policy's range: approve with a note")
	}
	if p.SecondLook {
		line2 += " " + st.Flag.Render("! a large change: second look")
	}
	return wrap.Render(st.Accent.Render(head)+st.Muted.Render(basis)) + "\n" + wrap.Render(line2) + "\n" +
		truncate(f.text.View(), w) + "\n" + wrap.Render(st.Muted.Render(factorCaution))
}
