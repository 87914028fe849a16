package store

import (
	"database/sql"
	"errors"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"

	"dragdeck/feed"
)

// TestMain lets a test kill a store's process half-way through an apply:
// with DRAGDECK_KILL_APPLY set to a store and ids, the test binary applies
// them and kills itself before the commit.
func TestMain(m *testing.M) {
	if path := os.Getenv("DRAGDECK_KILL_APPLY"); path != "" {
		s, err := Open(path, false)
		if err != nil {
			os.Exit(3)
		}
		applyHook = func() { syscall.Kill(os.Getpid(), syscall.SIGKILL) }
		var ids []int64
		for _, a := range os.Args[1:] {
			if id, err := strconv.ParseInt(a, 10, 64); err == nil {
				ids = append(ids, id)
			}
		}
		s.ApplyProposals(ids, "killed", time.Now())
		os.Exit(4) // never reached: the hook kills the process first
	}
	os.Exit(m.Run())
}

func proposal(tail, period string, pct float64) Proposal {
	return Proposal{Tail: tail, Type: "DD-200", Period: period, ProposedPct: pct, MonitoredPct: pct - 0.02,
		LoPct: pct - 0.3, HiPct: pct + 0.3, Flights: 58, PlanFuel: 12000 * pct}
}

// Every move of a proposal from every state, allowed or refused.
func TestFactorStateMachine(t *testing.T) {
	allowed := map[[2]string]bool{
		{FactorProposed, FactorApproved}: true, {FactorProposed, FactorRejected}: true,
		{FactorApproved, FactorApplied}: true, {FactorApproved, FactorRejected}: true,
	}
	path := map[string][]string{
		FactorProposed: nil, FactorApproved: {FactorApproved}, FactorApplied: {FactorApproved, FactorApplied},
		FactorRejected: {FactorRejected},
	}
	move := func(s *Store, id int64, to string) error {
		if to == FactorApplied {
			return s.ApplyProposals([]int64{id}, "tester", time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC))
		}
		return s.MoveProposal(id, to, "tester", "a note")
	}
	for _, from := range FactorStatuses {
		for _, to := range FactorStatuses {
			t.Run(from+" to "+to, func(t *testing.T) {
				s, _ := openTemp(t)
				if _, _, err := s.FileProposals([]Proposal{proposal("T1", "2026-11", 1.4)}, "tester"); err != nil {
					t.Fatal(err)
				}
				for _, st := range path[from] {
					if err := move(s, 1, st); err != nil {
						t.Fatal(err)
					}
				}
				err := move(s, 1, to)
				if allowed[[2]string{from, to}] != (err == nil) {
					t.Errorf("%s → %s: error %v", from, to, err)
				}
				if err != nil && to != FactorProposed && !errors.Is(err, ErrTransition) {
					t.Errorf("refused with %v, want ErrTransition", err)
				}
				hist, _ := s.FactorHistory("T1")
				if applied := from == FactorApplied || (from == FactorApproved && to == FactorApplied); applied != (len(hist) == 1) {
					t.Errorf("history %+v after %s → %s", hist, from, to)
				}
			})
		}
	}
}

func TestFactorMovesAndHistory(t *testing.T) {
	s, _ := openTemp(t)
	s.Now = func() time.Time { return time.Date(2026, 12, 2, 9, 0, 0, 0, time.UTC) }
	far := proposal("T2", "2026-11", 9.1)
	far.NeedsNote = true
	filed, kept, err := s.FileProposals([]Proposal{proposal("T1", "2026-11", 1.4), far}, "planner")
	if err != nil || filed != 2 || kept != 0 {
		t.Fatalf("filed %d kept %d: %v", filed, kept, err)
	}
	tests := []struct {
		name string
		do   func() error
		want error // nil: allowed
	}{
		{"reject without a note", func() error { return s.MoveProposal(1, FactorRejected, "a", "") }, ErrNeedsNote},
		{"approve outside the range without a note", func() error { return s.MoveProposal(2, FactorApproved, "a", " ") }, ErrNeedsNote},
		{"approve outside the range with a note", func() error { return s.MoveProposal(2, FactorApproved, "a", "engine change due") }, nil},
		{"apply a proposal not approved", func() error { return s.ApplyProposals([]int64{1, 2}, "a", s.Now()) }, ErrTransition},
		{"no such proposal", func() error { return s.MoveProposal(99, FactorApproved, "a", "") }, ErrNoProposal},
		{"approve", func() error { return s.MoveProposal(1, FactorApproved, "b", "") }, nil},
		{"apply both", func() error {
			return s.ApplyProposals([]int64{1, 2}, "c", time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC))
		}, nil},
		{"apply again", func() error { return s.ApplyProposals([]int64{1}, "c", s.Now()) }, ErrTransition},
		{"set by hand without a note", func() error { _, err := s.SetFactor("T1", 1, s.Now(), "d", ""); return err }, ErrNeedsNote},
		{"set by hand", func() error {
			_, err := s.SetFactor("T1", 2.2, time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC), "d", "meter replaced")
			return err
		}, nil},
	}
	for _, tc := range tests {
		err := tc.do()
		if (tc.want == nil) != (err == nil) || (tc.want != nil && !errors.Is(err, tc.want)) {
			t.Errorf("%s: error %v, want %v", tc.name, err, tc.want)
		}
	}
	// the failed apply of 1 and 2 together changed nothing: 2 stayed approved
	ps, err := s.Proposals("2026-11", "")
	if err != nil || len(ps) != 2 || ps[0].Status != FactorApplied || ps[1].Status != FactorApplied {
		t.Fatalf("proposals %+v %v", ps, err)
	}
	if n := ps[1].Notes; len(n) != 3 || n[1].Text != "engine change due" || n[1].By != "a" || n[2].By != "c" {
		t.Errorf("notes of 2: %+v", n)
	}
	if math.Abs(ps[0].LoPct-1.1) > 1e-12 || ps[0].Flights != 58 {
		t.Errorf("values read back: %+v", ps[0])
	}
	hist, _ := s.FactorHistory("")
	if len(hist) != 3 || hist[0].Tail != "T1" || hist[0].Why != "proposal 1" || hist[0].Proposal != 1 || hist[1].Why != "meter replaced" || hist[2].Tail != "T2" {
		t.Fatalf("history %+v", hist)
	}
	// in use: in December the applied 1.4, from January the 2.2 set by hand
	if u := InUse(hist, time.Date(2026, 12, 15, 0, 0, 0, 0, time.UTC)); u["T1"].Pct != 1.4 || u["T2"].Pct != 9.1 {
		t.Errorf("in use in December: %+v", u)
	}
	if u := InUse(hist, time.Date(2027, 1, 2, 0, 0, 0, 0, time.UTC)); u["T1"].Pct != 2.2 {
		t.Errorf("in use in January: %+v", u)
	}
	if u := InUse(hist, time.Date(2026, 11, 1, 0, 0, 0, 0, time.UTC)); len(u) != 0 {
		t.Errorf("in use before any was set: %+v", u)
	}
}

// Filing again: a proposal still proposed takes the new values, one moved
// on is kept, an older period's open one is superseded.
func TestFileProposalsAgain(t *testing.T) {
	s, _ := openTemp(t)
	s.FileProposals([]Proposal{proposal("T1", "2026-10", 1.0), proposal("T2", "2026-10", 2.0), proposal("T3", "2026-11", 3.0)}, "p")
	s.MoveProposal(2, FactorApproved, "p", "")
	filed, kept, err := s.FileProposals([]Proposal{proposal("T1", "2026-11", 1.2), proposal("T2", "2026-10", 2.5), proposal("T3", "2026-11", 3.3)}, "p")
	if err != nil || filed != 2 || kept != 1 {
		t.Fatalf("filed %d kept %d: %v", filed, kept, err)
	}
	ps, _ := s.Proposals("", "")
	want := []struct {
		status string
		pct    float64
	}{{FactorRejected, 1.0}, {FactorApproved, 2.0}, {FactorProposed, 3.3}, {FactorProposed, 1.2}}
	if len(ps) != len(want) {
		t.Fatalf("%d proposals, want %d", len(ps), len(want))
	}
	for i, w := range want {
		if ps[i].Status != w.status || ps[i].ProposedPct != w.pct {
			t.Errorf("proposal %d: %s %.1f, want %s %.1f", ps[i].ID, ps[i].Status, ps[i].ProposedPct, w.status, w.pct)
		}
	}
	if n := ps[0].Notes; len(n) != 2 || n[1].Text != "superseded by proposal 4 (2026-11)" {
		t.Errorf("the superseded one's notes: %+v", n)
	}
	if open, _ := s.Proposals("", FactorProposed); len(open) != 2 {
		t.Errorf("%d open proposals, want 2", len(open))
	}
}

// A store of schema version 2 (work list and reviews, before the fuel
// factors) is upgraded in place with nothing lost, and takes factors.
func TestSchemaUpgradeToFactors(t *testing.T) {
	p := filepath.Join(t.TempDir(), "v2.db")
	db, err := sql.Open("sqlite", "file:"+p)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := db.Exec(migrations[0] + ";" + migrations[1] + "; PRAGMA user_version = 2"); err != nil {
		t.Fatal(err)
	}
	blk := encodeBlock([]feed.Record{{Tail: "T1", Time: time.Unix(0, 0).UTC(), Flight: "F1", File: "old.csv", Line: 2}})
	for _, q := range []string{
		"INSERT INTO blocks (tail, first, last, n, data, imported) VALUES ('T1', 0, 0, 1, ?, 0)",
		"INSERT INTO work (tail, status, reason, flag, opened, updated) VALUES ('T1', 'inspect', 'level', 'level', 1, 2)",
		"INSERT INTO work_notes (item, time, status, text) VALUES (1, 2, 'inspect', 'seals')",
		"INSERT INTO reviews (time, state) VALUES (5, '{}')",
	} {
		var args []any
		if strings.Contains(q, "?") {
			args = append(args, blk)
		}
		if _, err := db.Exec(q, args...); err != nil {
			t.Fatal(q, err)
		}
	}
	db.Close()
	s, err := Open(p, false)
	if err != nil {
		t.Fatalf("upgrade: %v", err)
	}
	defer s.Close()
	if v, _ := s.version(); v != Version || Version < 3 {
		t.Errorf("version %d after the upgrade, want %d", v, Version)
	}
	if c, err := s.Counts(); err != nil || c.Snapshots != 1 {
		t.Errorf("snapshots after the upgrade: %+v %v", c, err)
	}
	if w, err := s.Work(); err != nil || len(w) != 1 || w[0].Status != StatusInspect || len(w[0].Notes) != 1 || w[0].Notes[0].Text != "seals" {
		t.Errorf("work after the upgrade: %+v %v", w, err)
	}
	if _, err := s.SetFactor("T1", 0.8, time.Now(), "me", "first factor"); err != nil {
		t.Errorf("a factor after the upgrade: %v", err)
	}
}

// An apply killed before its commit leaves the store as it was: the
// proposals approved, no history, the file sound; the apply again works.
func TestApplyKilled(t *testing.T) {
	s, path := openTemp(t)
	var ps []Proposal
	for i := range 200 {
		ps = append(ps, proposal("T"+strconv.Itoa(i), "2026-11", 1+float64(i%20)/10))
	}
	if _, _, err := s.FileProposals(ps, "p"); err != nil {
		t.Fatal(err)
	}
	args := []string{"-test.run=^$"}
	for id := int64(1); id <= 200; id++ {
		if err := s.MoveProposal(id, FactorApproved, "p", ""); err != nil {
			t.Fatal(err)
		}
		args = append(args, strconv.FormatInt(id, 10))
	}
	s.Close()
	cmd := exec.Command(os.Args[0], args...)
	cmd.Env = append(os.Environ(), "DRAGDECK_KILL_APPLY="+path)
	err := cmd.Run()
	var ee *exec.ExitError
	if !errors.As(err, &ee) || ee.Sys().(syscall.WaitStatus).Signal() != syscall.SIGKILL {
		t.Fatalf("the apply was not killed: %v", err)
	}
	s, err = Open(path, false)
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	if err := s.Integrity(); err != nil {
		t.Error(err)
	}
	hist, _ := s.FactorHistory("")
	approved, _ := s.Proposals("", FactorApproved)
	if len(hist) != 0 || len(approved) != 200 {
		t.Fatalf("after the kill: %d history entries, %d approved; want 0 and 200", len(hist), len(approved))
	}
	ids := make([]int64, 200)
	for i := range ids {
		ids[i] = int64(i + 1)
	}
	if err := s.ApplyProposals(ids, "again", time.Now()); err != nil {
		t.Fatal(err)
	}
	if hist, _ := s.FactorHistory(""); len(hist) != 200 {
		t.Errorf("%d history entries after the apply again, want 200", len(hist))
	}
}
