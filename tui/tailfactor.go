package tui

import (
	"fmt"
	"math"
	"time"

	"dragdeck/feed/store"
	"dragdeck/model"
)

// The Tail screen's fuel-factor chart (the factor chart key turns the top
// chart to it): the monitored factor at each month's end with its 95 %
// interval (the pipeline's TailFactor.History), the factor in use as a
// step line (the store's history; 0 before the first setting, as the
// policy takes it), the proposal as a dotted line over its month, and
// the restarts of the monitored window (steps and events) as marks.

// inUseSteps is the factor in use over start … end as a step line: its
// value at start, then a rise or fall at each setting that takes effect
// inside, flat to end.
func inUseSteps(hist []store.FactorSetting, start, end time.Time, x func(time.Time) float64) [][2]float64 {
	cur := 0.0
	for _, h := range hist {
		if !h.Effective.After(start) {
			cur = h.Pct
		}
	}
	pts := [][2]float64{{x(start), cur}}
	for _, h := range hist {
		if h.Effective.After(start) && !h.Effective.After(end) {
			pts = append(pts, [2]float64{x(h.Effective), cur}, [2]float64{x(h.Effective), h.Pct})
			cur = h.Pct
		}
	}
	return append(pts, [2]float64{x(end), cur})
}

// factorChart is the legend, the fuel-factor chart of the tail and the
// caution, h lines in all, over the same window as the deviation chart.
func (s *tailScreen) factorChart(w, h int) string {
	end := s.a.Last.Add(-time.Duration(s.back * 24 * float64(time.Hour)))
	start := end.Add(-time.Duration(s.window * 24 * float64(time.Hour)))
	x := func(t time.Time) float64 { return float64(t.Unix()) / 86400 }
	f, _ := s.data.Factor(s.a.Tail)
	var mon, band [][2]float64
	var ys []float64
	for _, l := range f.History {
		if l.At.Before(start) || l.At.After(end) {
			continue
		}
		if !l.OK() {
			mon = append(mon, [2]float64{x(l.At), math.NaN()}) // a gap in the line
			continue
		}
		mon = append(mon, [2]float64{x(l.At), l.Pct})
		band = append(band, [2]float64{x(l.At), l.Lo}, [2]float64{x(l.At), l.Hi})
		ys = append(ys, l.Lo, l.Hi, l.Pct)
	}
	use := inUseSteps(s.factorHist, start, end, x)
	for _, p := range use {
		ys = append(ys, p[1])
	}
	p, hasP := shownProposal(f, s.factorOpen, s.a.Tail)
	var prop [][2]float64
	if hasP {
		// dotted over the proposal's month, up to the end of the data
		from := model.MonthStart(s.a.Last)
		if pe, err := model.PeriodEnd(p.Period); err == nil {
			from = pe.AddDate(0, -1, 0)
		}
		n := max(2, w/3)
		for i := 0; i <= n; i++ {
			t := from.Add(time.Duration(float64(s.a.Last.Sub(from)) * float64(i) / float64(n)))
			prop = append(prop, [2]float64{x(t), p.ProposedPct})
		}
		ys = append(ys, p.ProposedPct)
	}
	lo, hi := span(ys, 0.08, 0.5)
	spec := s.timeChart(w, h-2, start, end, lo, hi, x,
		series{points: band, style: s.st.Muted},
		series{points: mon, line: true, style: s.st.Accent},
		series{points: use, line: true, style: s.st.Plan},
		series{points: prop, style: s.st.Flag})
	for _, t := range f.Restarts {
		spec.marks = append(spec.marks, vmark{x: x(t), style: s.st.Event})
	}
	inUse := "in use none"
	if f.InUse {
		inUse = "in use " + fmtSigned(f.Proposal.InUsePct, 1)
	}
	proposal := s.st.Muted.Render("no proposal")
	if hasP {
		mark := ""
		if p.Status == store.FactorApproved {
			mark = " ✓"
		}
		proposal = s.st.Flag.Render("proposed " + fmtSigned(p.ProposedPct, 1) + mark)
	}
	legend := s.st.Muted.Render("fuel factor %: ") + s.st.Accent.Render("monitored") + s.st.Muted.Render(" (· 95 %) · ") +
		s.st.Plan.Render(inUse) + " · " + proposal + " · " + s.st.Event.Render("restart")
	note := s.st.Muted.Render(truncate("factors are engineering proposals, not approved performance data", w))
	return truncate(legend, w) + "\n" + spec.render("no monitored factor in this window") + "\n" + note
}

// factorFact is the facts block's line of the fuel factor: the factor in
// use, the proposal, and the monitored level with its interval or why
// there is none (most important first, as the line may be cut).
func (s *tailScreen) factorFact() string {
	if s.factorErr != nil {
		return "factor: the store could not be read: " + s.factorErr.Error()
	}
	f, _ := s.data.Factor(s.a.Tail)
	line := "factor none"
	if f.InUse {
		line = "factor " + fmtSigned(f.Proposal.InUsePct, 1)
	}
	if p, ok := shownProposal(f, s.factorOpen, s.a.Tail); ok {
		line += " → " + fmtSigned(p.ProposedPct, 1)
		if p.Status == store.FactorApproved {
			line += " ✓"
		}
	}
	if l := f.Proposal.Level; l.OK() {
		line += fmt.Sprintf(" · monitored %s [%s %s] %d fl.", fmtSigned(l.Pct, 2), fmtSigned(l.Lo, 2), fmtSigned(l.Hi, 2), l.Flights)
	} else if f.Proposal.Reason != "" {
		line += " · " + f.Proposal.Reason
	}
	return line
}
