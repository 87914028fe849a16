package store

import (
	"database/sql"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"time"

	"dragdeck/feed"
)

// The fuel factor's life in the store: the proposals the policy makes
// (proposed → approved → applied, or rejected with a note, from proposed
// or approved; applied and rejected are final) and each tail's history
// of the factor in use (value, from when, who set it and why). Applying
// a proposal writes the history in the same transaction; every move is
// one transaction and a move the states do not allow is refused.
const (
	FactorProposed = "proposed"
	FactorApproved = "approved"
	FactorApplied  = "applied"
	FactorRejected = "rejected"
)

// FactorStatuses lists the proposal states in the order of the work.
var FactorStatuses = []string{FactorProposed, FactorApproved, FactorApplied, FactorRejected}

var factorNext = map[string][]string{
	FactorProposed: {FactorApproved, FactorRejected},
	FactorApproved: {FactorApplied, FactorRejected},
	FactorApplied:  nil,
	FactorRejected: nil,
}

// ErrNoProposal is an id that names no proposal; ErrNeedsNote a move that
// needs a note and has none.
var (
	ErrNoProposal = errors.New("no such proposal")
	ErrNeedsNote  = errors.New("needs a note")
)

// Proposal is one fuel-factor proposal kept in the store.
type Proposal struct {
	ID                 int64
	Tail, Type, Period string
	Status             string
	ProposedPct        float64 // the factor proposed, %
	InUsePct           float64 // the factor in use when it was proposed, %
	MonitoredPct       float64 // the monitored level it rests on, %
	LoPct, HiPct       float64 // its 95 % interval (NaN when none)
	Flights            int
	PlanFuel           float64 // kg a year the change puts into the plan (− takes out)
	// NeedsNote: outside the policy's range, approved only with a note;
	// SecondLook: a change larger than the policy's limit in one step.
	NeedsNote, SecondLook bool
	Created, Updated      time.Time
	Notes                 []FactorNote
}

// FactorNote is one move of a proposal: when, to what, by whom, why.
type FactorNote struct {
	Time   time.Time
	Status string
	By     string
	Text   string
}

// FactorSetting is one entry of a tail's factor history: from Effective on,
// the factor in use is Pct.
type FactorSetting struct {
	ID        int64
	Tail      string
	Pct       float64
	Effective time.Time
	By        string
	Why       string // the proposal ("proposal 12") or the note of a factor set by hand
	Proposal  int64  // 0 when set by hand
	Recorded  time.Time
}

// FileProposals files the proposals of one run in one transaction. A
// tail's proposal of the same period that is still proposed takes the new
// values; one that has moved on (approved, applied, rejected) is kept as
// it is. An older period's proposal of the tail that is still proposed is
// rejected as superseded. It returns the proposals filed new or updated
// and those kept.
func (s *Store) FileProposals(ps []Proposal, by string) (filed, kept int, err error) {
	tx, err := s.db.Begin()
	if err != nil {
		return 0, 0, err
	}
	defer tx.Rollback()
	now := s.now().UnixNano()
	for _, p := range ps {
		var id int64
		var status string
		err := tx.QueryRow("SELECT id, status FROM factor_proposals WHERE tail = ? AND period = ? ORDER BY id DESC LIMIT 1", p.Tail, p.Period).Scan(&id, &status)
		switch {
		case err == nil && status != FactorProposed:
			kept++
			continue
		case err == nil:
			if _, err := tx.Exec(`UPDATE factor_proposals SET type = ?, proposed_pct = ?, in_use_pct = ?, monitored_pct = ?, lo_pct = ?, hi_pct = ?,
				flights = ?, plan_fuel = ?, needs_note = ?, second_look = ?, updated = ? WHERE id = ?`,
				p.Type, p.ProposedPct, p.InUsePct, p.MonitoredPct, nullNaN(p.LoPct), nullNaN(p.HiPct), p.Flights, nullNaN(p.PlanFuel),
				p.NeedsNote, p.SecondLook, now, id); err != nil {
				return 0, 0, err
			}
		case errors.Is(err, sql.ErrNoRows):
			r, err := tx.Exec(`INSERT INTO factor_proposals (tail, type, period, status, proposed_pct, in_use_pct, monitored_pct, lo_pct, hi_pct,
				flights, plan_fuel, needs_note, second_look, created, updated) VALUES (?,?,?,?,?,?,?,?,?,?,?,?,?,?,?)`,
				p.Tail, p.Type, p.Period, FactorProposed, p.ProposedPct, p.InUsePct, p.MonitoredPct, nullNaN(p.LoPct), nullNaN(p.HiPct),
				p.Flights, nullNaN(p.PlanFuel), p.NeedsNote, p.SecondLook, now, now)
			if err != nil {
				return 0, 0, err
			}
			if id, err = r.LastInsertId(); err != nil {
				return 0, 0, err
			}
			if err := addFactorNote(tx, id, now, FactorProposed, by, ""); err != nil {
				return 0, 0, err
			}
		default:
			return 0, 0, err
		}
		filed++
		// an older period's open proposal gives way to this one
		rows, err := tx.Query("SELECT id FROM factor_proposals WHERE tail = ? AND period < ? AND status = ?", p.Tail, p.Period, FactorProposed)
		if err != nil {
			return 0, 0, err
		}
		var old []int64
		for rows.Next() {
			var o int64
			if err := rows.Scan(&o); err != nil {
				rows.Close()
				return 0, 0, err
			}
			old = append(old, o)
		}
		rows.Close()
		for _, o := range old {
			if _, err := tx.Exec("UPDATE factor_proposals SET status = ?, updated = ? WHERE id = ?", FactorRejected, now, o); err != nil {
				return 0, 0, err
			}
			if err := addFactorNote(tx, o, now, FactorRejected, by, fmt.Sprintf("superseded by proposal %d (%s)", id, p.Period)); err != nil {
				return 0, 0, err
			}
		}
	}
	return filed, kept, tx.Commit()
}

// MoveProposals moves proposals to status (approved or rejected), by
// whom, with a note, in one transaction: one move that is refused refuses
// them all. A rejection always needs a note, and so does approving a
// proposal outside the policy's range (NeedsNote). Applying is
// ApplyProposals.
func (s *Store) MoveProposals(ids []int64, status, by, note string) error {
	if status != FactorApproved && status != FactorRejected {
		return fmt.Errorf("%q: %w (approve or reject here; apply writes the history)", status, ErrStatus)
	}
	tx, err := s.db.Begin()
	if err != nil {
		return err
	}
	defer tx.Rollback()
	now := s.now().UnixNano()
	for _, id := range ids {
		if err := moveProposal(tx, id, status, by, note, now); err != nil {
			return err
		}
	}
	return tx.Commit()
}

// MoveProposal is MoveProposals of one proposal.
func (s *Store) MoveProposal(id int64, status, by, note string) error {
	return s.MoveProposals([]int64{id}, status, by, note)
}

// moveProposal checks and makes one move inside tx.
func moveProposal(tx *sql.Tx, id int64, status, by, note string, now int64) error {
	var cur string
	var needsNote bool
	err := tx.QueryRow("SELECT status, needs_note FROM factor_proposals WHERE id = ?", id).Scan(&cur, &needsNote)
	if errors.Is(err, sql.ErrNoRows) {
		return fmt.Errorf("%d: %w", id, ErrNoProposal)
	} else if err != nil {
		return err
	}
	note = strings.TrimSpace(feed.PlainText(note))
	if !slices.Contains(factorNext[cur], status) {
		allowed := "none: it is done with"
		if n := factorNext[cur]; len(n) > 0 {
			allowed = strings.Join(n, " or ")
		}
		return fmt.Errorf("proposal %d: %s → %s is %w (from %s: %s)", id, cur, status, ErrTransition, cur, allowed)
	}
	switch {
	case status == FactorRejected && note == "":
		return fmt.Errorf("proposal %d: a rejection %w", id, ErrNeedsNote)
	case status == FactorApproved && needsNote && note == "":
		return fmt.Errorf("proposal %d is outside the policy's range and %w to be approved (--note: why)", id, ErrNeedsNote)
	}
	if _, err := tx.Exec("UPDATE factor_proposals SET status = ?, updated = ? WHERE id = ?", status, now, id); err != nil {
		return err
	}
	return addFactorNote(tx, id, now, status, by, note)
}

// applyHook, when set (by a test), runs inside ApplyProposals' transaction
// after its writes and before the commit.
var applyHook func()

// ApplyProposals applies approved proposals in one transaction: each
// becomes the tail's factor in use from effective on, written in its
// history with who applied it and the proposal it came from. A proposal
// that is not approved refuses the whole call.
func (s *Store) ApplyProposals(ids []int64, by string, effective time.Time) error {
	tx, err := s.db.Begin()
	if err != nil {
		return err
	}
	defer tx.Rollback()
	now := s.now().UnixNano()
	for _, id := range ids {
		if err := moveProposal(tx, id, FactorApplied, by, "", now); err != nil {
			return err
		}
		var tail string
		var pct float64
		if err := tx.QueryRow("SELECT tail, proposed_pct FROM factor_proposals WHERE id = ?", id).Scan(&tail, &pct); err != nil {
			return err
		}
		if _, err := tx.Exec("INSERT INTO factor_history (tail, pct, effective, set_by, why, proposal, recorded) VALUES (?,?,?,?,?,?,?)",
			tail, pct, effective.UTC().UnixNano(), by, fmt.Sprintf("proposal %d", id), id, now); err != nil {
			return err
		}
	}
	if applyHook != nil {
		applyHook()
	}
	return tx.Commit()
}

// SetFactor sets a tail's factor by hand from effective on, with a note
// that says why (required), and returns the history entry's id.
func (s *Store) SetFactor(tail string, pct float64, effective time.Time, by, note string) (int64, error) {
	tail, note = strings.TrimSpace(tail), strings.TrimSpace(feed.PlainText(note))
	switch {
	case tail == "":
		return 0, errors.New("a factor needs a tail")
	case feed.BadID(tail) != "":
		return 0, fmt.Errorf("tail %q: %s", tail, feed.BadID(tail))
	case math.IsNaN(pct) || math.IsInf(pct, 0) || math.Abs(pct) > 50:
		return 0, fmt.Errorf("factor %g %%: must be −50 … +50", pct)
	case note == "":
		return 0, fmt.Errorf("a factor set by hand %w", ErrNeedsNote)
	}
	r, err := s.db.Exec("INSERT INTO factor_history (tail, pct, effective, set_by, why, proposal, recorded) VALUES (?,?,?,?,?,NULL,?)",
		tail, pct, effective.UTC().UnixNano(), by, note, s.now().UnixNano())
	if err != nil {
		return 0, err
	}
	return r.LastInsertId()
}

// FactorHistory returns the factor history, of one tail or (tail "") of
// all, by tail and then in the order it takes effect.
func (s *Store) FactorHistory(tail string) ([]FactorSetting, error) {
	q := "SELECT id, tail, pct, effective, set_by, why, COALESCE(proposal, 0), recorded FROM factor_history"
	var args []any
	if tail != "" {
		q += " WHERE tail = ?"
		args = append(args, tail)
	}
	rows, err := s.db.Query(q+" ORDER BY tail, effective, id", args...)
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	var out []FactorSetting
	for rows.Next() {
		var f FactorSetting
		var eff, rec int64
		if err := rows.Scan(&f.ID, &f.Tail, &f.Pct, &eff, &f.By, &f.Why, &f.Proposal, &rec); err != nil {
			return nil, err
		}
		f.Effective, f.Recorded = unixTime(eff), unixTime(rec)
		out = append(out, f)
	}
	return out, rows.Err()
}

// InUse returns each tail's factor in use at t: the last entry of its
// history in effect by then (the latest recorded among entries of the
// same effective time).
func InUse(hist []FactorSetting, t time.Time) map[string]FactorSetting {
	out := map[string]FactorSetting{}
	for _, f := range hist { // by tail, effective, id
		if !f.Effective.After(t) {
			out[f.Tail] = f
		}
	}
	return out
}

// Proposals returns the proposals, oldest first, of one period and
// status ("" for any), each with its notes.
func (s *Store) Proposals(period, status string) ([]Proposal, error) {
	q := `SELECT id, tail, type, period, status, proposed_pct, in_use_pct, monitored_pct, lo_pct, hi_pct, flights, plan_fuel,
		needs_note, second_look, created, updated FROM factor_proposals WHERE (? = '' OR period = ?) AND (? = '' OR status = ?) ORDER BY id`
	rows, err := s.db.Query(q, period, period, status, status)
	if err != nil {
		return nil, err
	}
	var out []Proposal
	at := map[int64]int{}
	for rows.Next() {
		var p Proposal
		var lo, hi, fuel sql.NullFloat64
		var created, updated int64
		if err := rows.Scan(&p.ID, &p.Tail, &p.Type, &p.Period, &p.Status, &p.ProposedPct, &p.InUsePct, &p.MonitoredPct, &lo, &hi,
			&p.Flights, &fuel, &p.NeedsNote, &p.SecondLook, &created, &updated); err != nil {
			rows.Close()
			return nil, err
		}
		p.LoPct, p.HiPct, p.PlanFuel = nanNull(lo), nanNull(hi), nanNull(fuel)
		p.Created, p.Updated = unixTime(created), unixTime(updated)
		at[p.ID] = len(out)
		out = append(out, p)
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return nil, err
	}
	notes, err := s.db.Query("SELECT proposal, time, status, set_by, text FROM factor_notes ORDER BY rowid")
	if err != nil {
		return nil, err
	}
	defer notes.Close()
	for notes.Next() {
		var id, t int64
		var n FactorNote
		if err := notes.Scan(&id, &t, &n.Status, &n.By, &n.Text); err != nil {
			return nil, err
		}
		n.Time = unixTime(t)
		if i, ok := at[id]; ok {
			out[i].Notes = append(out[i].Notes, n)
		}
	}
	return out, notes.Err()
}

func addFactorNote(tx *sql.Tx, id, now int64, status, by, text string) error {
	_, err := tx.Exec("INSERT INTO factor_notes (proposal, time, status, set_by, text) VALUES (?,?,?,?,?)", id, now, status, by, text)
	return err
}

// nullNaN stores a NaN as NULL (SQLite has no NaN); nanNull reads it back.
func nullNaN(v float64) any {
	if math.IsNaN(v) {
		return nil
	}
	return v
}

func nanNull(v sql.NullFloat64) float64 {
	if !v.Valid {
		return math.NaN()
	}
	return v.Float64
}
