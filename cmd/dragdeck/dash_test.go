package main

import (
	"io"
	"path/filepath"
	"strings"
	"sync/atomic"
	"testing"

	"dragdeck/feed/store"
	"dragdeck/model"
)

// The dashboard's factor book on a store: a move on a proposal of the run
// files it and makes the move in the store (what 'factor list' shows), a
// refused move leaves the proposal as it was, and the store's history is
// what the Tail screen draws.
func TestDashFactorBook(t *testing.T) {
	dir := demoFleet(t, "8", "200", "13")
	db := filepath.Join(dir, "s.db")
	importJSONOf(t, "--store", db, filepath.Join(dir, "snapshots"), filepath.Join(dir, "fleet.toml"))
	fs := newFlagSet("dash", "", "", "")
	types := fs.typeFlags()
	if err := fs.parse(nil, io.Discard); err != nil && err != errPositional {
		t.Fatal(err)
	}
	in, err := openInput(io.Discard, fs, types, db, "")
	if err != nil {
		t.Fatal(err)
	}
	defer in.close()
	d, err := dashData(in, model.DefaultTrendConfig(), &atomic.Int64{})
	if err != nil {
		t.Fatal(err)
	}
	if d.Factors == nil {
		t.Fatal("a store's dashboard has a factor book")
	}
	tail := ""
	for _, a := range d.Fleet.Tails {
		if f, _ := d.Factor(a.Tail); f.Proposal.Proposed && !f.Proposal.NeedsNote {
			tail = a.Tail
			break
		}
	}
	if tail == "" {
		t.Fatal("no tail with a proposal in the test fleet")
	}
	if _, err := d.Factors.Decide(tail, 0, store.FactorRejected, ""); err == nil {
		t.Fatal("a rejection without a note must be refused")
	}
	msg, err := d.Factors.Decide(tail, 0, store.FactorApproved, "looks right")
	if err != nil || !strings.Contains(msg, "approved") {
		t.Fatalf("approve: %q %v", msg, err)
	}
	open, err := d.Factors.Open()
	if err != nil || open[tail].Status != store.FactorApproved {
		t.Fatalf("open proposals %v %v", open, err)
	}
	ps, err := in.store.Proposals("", "")
	if err != nil || len(ps) != 1 || ps[0].Tail != tail || ps[0].Status != store.FactorApproved || len(ps[0].Notes) != 2 {
		t.Fatalf("the store holds %+v (%v); want the one proposal, filed and approved", ps, err)
	}
	if _, err := in.store.SetFactor(tail, 1.2, in.store.Now(), "t", "by hand"); err != nil {
		t.Fatal(err)
	}
	h, err := d.Factors.History()
	if err != nil || len(h[tail]) != 1 || h[tail][0].Pct != 1.2 {
		t.Fatalf("history %v %v", h, err)
	}
}
