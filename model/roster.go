package model

import (
	"fmt"
	"math"
	"sort"
	"strings"
	"time"
)

// RosterEntry says that a tail flies a type from a date on (a fleet file's
// [[tail]] entry, DESIGN.md §3.4).
type RosterEntry struct {
	Tail  string
	Type  string    // a name of Roster.Types
	Since time.Time // in force from this instant on; zero: from the start
	// CruiseHours is the tail's cruise hours a year for the cost; 0: the
	// command line's (TrendConfig.CruiseHours).
	CruiseHours float64
	// FuelFlowCorrectionPct is a known fuel-flow meter bias, %: readings
	// are multiplied by (1 + x/100) before the analysis.
	FuelFlowCorrectionPct float64
	Line                  int // where the entry was given (0: unknown), for errors
}

// Roster gives the type in force for each tail at each time: a fleet of
// several types and variants, a retrofit changing a tail's type from a date
// on. A single-type roster (SingleType) lets every tail fly its one type.
type Roster struct {
	Name  string           // free text from the fleet file
	Types map[string]*Type // by the fleet file's name
	// FuelFactor is the fleet file's fuel-factor policy; nil when it has
	// none (the defaults apply).
	FuelFactor *FactorPolicy

	single  *Type                    // a single-type roster's type
	entries map[string][]RosterEntry // by tail, ascending Since
}

// EntryError is a fleet-file entry that cannot be used: Key names the
// fleet-file key (tail.type, tail.since, …), Line the entry's line (0:
// unknown).
type EntryError struct {
	Line   int
	Key    string
	Reason string
}

func (e *EntryError) Error() string { return e.Key + ": " + e.Reason }

// SingleType returns the roster in which every tail flies t at all times.
func SingleType(t *Type) *Roster {
	return &Roster{Name: t.Name, Types: map[string]*Type{t.Name: t}, single: t}
}

// NewRoster checks the entries and returns the roster. Errors name the
// entry's line: an empty tail, a type not in types, two entries of one tail
// with the same Since, a cruise-hour figure outside (0, 8784] h or a
// fuel-flow correction outside (−50, 50) %.
func NewRoster(name string, types map[string]*Type, entries []RosterEntry) (*Roster, error) {
	if len(types) == 0 {
		return nil, &EntryError{Key: "types", Reason: "no type given"}
	}
	if len(entries) == 0 {
		return nil, &EntryError{Key: "tail", Reason: "no [[tail]] entry given"}
	}
	r := &Roster{Name: name, Types: types, entries: map[string][]RosterEntry{}}
	for _, e := range entries {
		at := func(key, format string, args ...any) error {
			return &EntryError{Line: e.Line, Key: "tail." + key, Reason: fmt.Sprintf(format, args...)}
		}
		switch {
		case strings.TrimSpace(e.Tail) == "":
			return nil, at("id", "missing or empty")
		case types[e.Type] == nil:
			return nil, at("type", "%q is not a type of [types] (%s)", e.Type, strings.Join(typeNames(types), ", "))
		case e.CruiseHours < 0 || e.CruiseHours > 8784 || math.IsNaN(e.CruiseHours):
			return nil, at("cruise_hours_per_year", "must be in (0, 8784] h, got %g", e.CruiseHours)
		case !(math.Abs(e.FuelFlowCorrectionPct) < 50):
			return nil, at("fuel_flow_correction_pct", "must be within ±50 %%, got %g", e.FuelFlowCorrectionPct)
		}
		for _, o := range r.entries[e.Tail] {
			if o.Since.Equal(e.Since) {
				since := "no since"
				if !e.Since.IsZero() {
					since = "since " + e.Since.Format("2006-01-02")
				}
				return nil, at("since", "tail %s has two entries with %s (the other on line %d)", e.Tail, since, o.Line)
			}
		}
		e.Since = e.Since.UTC()
		r.entries[e.Tail] = append(r.entries[e.Tail], e)
	}
	for _, es := range r.entries {
		sort.SliceStable(es, func(i, j int) bool { return es[i].Since.Before(es[j].Since) })
	}
	return r, nil
}

func typeNames(types map[string]*Type) []string {
	names := make([]string, 0, len(types))
	for n := range types {
		names = append(names, n)
	}
	sort.Strings(names)
	return names
}

// TypeNames returns the roster's type names, sorted.
func (r *Roster) TypeNames() []string { return typeNames(r.Types) }

// Single returns the type of a single-type roster, or nil for a fleet file.
func (r *Roster) Single() *Type { return r.single }

// Mixed reports whether the roster has more than one type (a fleet file
// of one type is not mixed).
func (r *Roster) Mixed() bool { return len(r.Types) > 1 }

// Tails returns the tails the roster names, sorted (none for a single-type
// roster, which names none and accepts all).
func (r *Roster) Tails() []string {
	out := make([]string, 0, len(r.entries))
	for t := range r.entries {
		out = append(out, t)
	}
	sort.Strings(out)
	return out
}

// At returns the entry in force for tail at time t and its type: the last
// entry whose Since is not after t. It returns ok = false, with the reason,
// when the roster does not name the tail or names it only from a later date.
func (r *Roster) At(tail string, t time.Time) (e RosterEntry, typ *Type, why string) {
	if r.single != nil {
		return RosterEntry{Tail: tail, Type: r.single.Name}, r.single, ""
	}
	es := r.entries[tail]
	i, why := entryAt(tail, es, t)
	if why != "" {
		return RosterEntry{}, nil, why
	}
	return es[i], r.Types[es[i].Type], ""
}

// entryAt is the index of the entry of es (one tail's, ascending Since) in
// force at t, or why there is none.
func entryAt(tail string, es []RosterEntry, t time.Time) (int, string) {
	if len(es) == 0 {
		return 0, fmt.Sprintf("tail %s is not in the fleet file", tail)
	}
	if len(es) == 1 && !es[0].Since.After(t) { // most tails: one entry
		return 0, ""
	}
	i := sort.Search(len(es), func(i int) bool { return es[i].Since.After(t) })
	if i == 0 {
		return 0, fmt.Sprintf("tail %s has no fleet-file entry before %s", tail, es[0].Since.Format("2006-01-02"))
	}
	return i - 1, ""
}

// TailRoster is one tail's part of a roster, its entries with their types,
// for analysing many snapshots of the tail without looking it up for each.
type TailRoster struct {
	tail    string
	single  *Type
	entries []RosterEntry
	types   []*Type // of entries
}

// Tail returns the roster of one tail.
func (r *Roster) Tail(tail string) TailRoster {
	tr := TailRoster{tail: tail, single: r.single, entries: r.entries[tail]}
	for _, e := range tr.entries {
		tr.types = append(tr.types, r.Types[e.Type])
	}
	return tr
}

// Analyze is Roster.Analyze for the tail.
func (tr *TailRoster) Analyze(t time.Time, s Snapshot) (Point, Snapshot, *Type, string) {
	var p Point
	typ, why := tr.AnalyzeInto(&p, t, &s, nil)
	return p, s, typ, why
}

// AnalyzeInto is Analyze in place (AnalyzeInto of the package): s is
// corrected as Analyze corrects it, and the point is written into p, with
// the air of the levels l remembers (nil: none).
func (tr *TailRoster) AnalyzeInto(p *Point, t time.Time, s *Snapshot, l *Levels) (*Type, string) {
	typ := tr.single
	if typ == nil {
		i, why := entryAt(tr.tail, tr.entries, t)
		if why != "" {
			*p = Point{}
			return nil, why
		}
		typ = tr.types[i]
		correct(s, tr.entries[i].FuelFlowCorrectionPct)
	}
	AnalyzeInto(p, typ, s, l)
	return typ, ""
}

// Changes returns the type changes of a tail (a retrofit, a conversion): the
// entries after its first whose type differs from the one before, as events
// of the kind "type NAME (fleet file)". A change of baseline restarts the
// airframe series, like a repair, so that the tail's own polar and its
// steps are measured within one type.
func (r *Roster) Changes(tail string) []Event {
	es := r.entries[tail]
	var out []Event
	for i := 1; i < len(es); i++ {
		if es[i].Type != es[i-1].Type {
			out = append(out, Event{Time: es[i].Since, Kind: "type " + es[i].Type + " (fleet file)",
				Note: "baseline changes from " + es[i-1].Type})
		}
	}
	return out
}

// Analyze analyses s, a snapshot of tail at time t, with the type in force
// and the fuel flow corrected by the entry's known meter bias
// (FuelFlow × (1 + FuelFlowCorrectionPct/100)). It returns the point, the
// corrected snapshot and the type; a nil type, with the reason, when no
// entry is in force.
func (r *Roster) Analyze(tail string, t time.Time, s Snapshot) (Point, Snapshot, *Type, string) {
	e, typ, why := r.At(tail, t)
	if typ == nil {
		return Point{}, s, nil, why
	}
	correct(&s, e.FuelFlowCorrectionPct)
	return Analyze(typ, s), s, typ, ""
}

// correct corrects the fuel flow of s by the meter bias pct.
func correct(s *Snapshot, pct float64) {
	if pct != 0 {
		s.FuelFlow *= 1 + pct/100
	}
}

// Label names the roster for a header: the type's name for a single type,
// else the fleet file's name and its types.
func (r *Roster) Label() string {
	if r.single != nil {
		return r.single.Name
	}
	return fmt.Sprintf("%s (%s)", r.Name, strings.Join(r.TypeNames(), ", "))
}
