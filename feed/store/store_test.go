package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"

	"dragdeck/feed"
)

// csvHeader is a snapshot file's header (§3.1).
const csvHeader = "time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,bank_deg\n"

// writeSnapshots writes n invented snapshots of tails T0..T(tails-1), one
// every 10 minutes, and returns the file.
func writeSnapshots(t *testing.T, dir, name string, n, tails int, edit func(i int, row string) string) string {
	t.Helper()
	var b strings.Builder
	b.WriteString(csvHeader)
	t0 := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)
	for i := 0; i < n; i++ {
		row := fmt.Sprintf("%s,T%d,F%d,%d,%d,0.78,-52.5,%d,0\n", t0.Add(time.Duration(i/tails)*10*time.Minute).Format(time.RFC3339),
			i%tails, i/tails/3, 60000+i%5000, 35000+i%7*10, 2300+i%50)
		if edit != nil {
			row = edit(i, row)
		}
		b.WriteString(row)
	}
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

func openTemp(t *testing.T) (*Store, string) {
	t.Helper()
	p := filepath.Join(t.TempDir(), "s.db")
	s, err := Open(p, true)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { s.Close() })
	return s, p
}

// Importing twice adds nothing the second time: every row is a
// duplicate. One changed row is one conflict, listed, and the stored row
// is kept. Rejected rows are counted and told.
func TestImportTwiceAndConflict(t *testing.T) {
	dir := t.TempDir()
	s, _ := openTemp(t)
	a := writeSnapshots(t, dir, "a.csv", 1000, 4, func(i int, row string) string {
		if i == 500 {
			return strings.Replace(row, "0.78", "M.78", 1) // rejected
		}
		return row
	})
	ctx := context.Background()
	var rejects int
	first, err := s.Import(ctx, ImportInput{Files: []string{a}, Reject: func(*feed.RowError) { rejects++ }})
	if err != nil {
		t.Fatal(err)
	}
	if first.New != 999 || first.Rejected != 1 || rejects != 1 || first.Duplicate != 0 || first.Conflict != 0 {
		t.Fatalf("first import: %+v", first)
	}
	second, err := s.Import(ctx, ImportInput{Files: []string{a}})
	if err != nil {
		t.Fatal(err)
	}
	if second.New != 0 || second.Duplicate != 999 || second.Conflict != 0 {
		t.Fatalf("second import: %+v", second)
	}
	// the same rows in another file, one with another weight
	b := writeSnapshots(t, dir, "b.csv", 1000, 4, func(i int, row string) string {
		if i == 123 {
			return strings.Replace(row, ",60123,", ",60124,", 1)
		}
		return row
	})
	var cs []Conflict
	third, err := s.Import(ctx, ImportInput{Files: []string{b}, Conflict: func(c Conflict) { cs = append(cs, c) }})
	if err != nil {
		t.Fatal(err)
	}
	if third.New != 1 || third.Conflict != 1 || third.Duplicate != 998 || len(cs) != 1 {
		t.Fatalf("third import (the rejected row of a.csv is new here): %+v, %d listed", third, len(cs))
	}
	if c := cs[0]; c.Line != 125 || c.Tail != "T3" || len(c.Fields) != 1 || c.Fields[0] != "weight" || !strings.HasSuffix(c.Stored, "a.csv:125") {
		t.Errorf("conflict %+v", c)
	}
	// the stored row is kept
	var w float64
	s.Each(func(r feed.Record) {
		if r.Line == 125 && strings.HasSuffix(r.File, "a.csv") {
			w = r.Snap.Weight
		}
	})
	if w != 60123 {
		t.Errorf("stored weight %g, want the first import's 60123", w)
	}
	// the same row twice in one import: the second is a duplicate
	c := writeSnapshots(t, dir, "c.csv", 0, 1, nil)
	os.WriteFile(c, []byte(csvHeader+"2027-01-01T00:00:00Z,T9,F1,60000,35000,0.78,-52.5,2300,0\n2027-01-01T00:00:00Z,T9,F1,60000,35000,0.78,-52.5,2300,0\n"), 0o644)
	fourth, err := s.Import(ctx, ImportInput{Files: []string{c}})
	if err != nil || fourth.New != 1 || fourth.Duplicate != 1 {
		t.Fatalf("a row twice in one file: %+v %v", fourth, err)
	}
}

// The stored records are those the reader gave, value for value, in the
// order of the files.
func TestEachGivesTheRecordsRead(t *testing.T) {
	dir := t.TempDir()
	s, _ := openTemp(t)
	a := writeSnapshots(t, dir, "a.csv", 300, 3, nil)
	if _, err := s.Import(context.Background(), ImportInput{Files: []string{a}}); err != nil {
		t.Fatal(err)
	}
	var want, got []feed.Record
	feed.ReadFile(a, func(r feed.Record) { want = append(want, r) }, nil)
	st, err := s.Each(func(r feed.Record) { got = append(got, r) })
	if err != nil || st.Accepted != len(want) || len(got) != len(want) {
		t.Fatalf("%v: %d stored, %d read", err, len(got), len(want))
	}
	// the store gives them by tail within an import: compare in the
	// pipeline's order, by tail and time
	order := func(rs []feed.Record) {
		sort.SliceStable(rs, func(a, b int) bool {
			if rs[a].Tail != rs[b].Tail {
				return rs[a].Tail < rs[b].Tail
			}
			return rs[a].Time.Before(rs[b].Time)
		})
	}
	order(want)
	order(got)
	for i := range want {
		w, g := want[i], got[i]
		w.Offset = 0 // a store keeps file and line, not the byte offset
		if w != g {
			t.Fatalf("record %d: stored %+v, read %+v", i, g, w)
		}
	}
	var t1 []feed.Record
	for _, r := range got {
		if r.Tail == "T1" {
			t1 = append(t1, r)
		}
	}
	recs, err := s.Flight("T1", t1[1].Time, t1[4].Time)
	if err != nil || len(recs) != 4 || recs[0] != t1[1] || recs[3] != t1[4] {
		t.Errorf("Flight: %d records, %v", len(recs), err)
	}
}

// A file that cannot be read stops the import, and the store keeps
// nothing of it: one transaction.
func TestImportAllOrNothing(t *testing.T) {
	dir := t.TempDir()
	s, _ := openTemp(t)
	a := writeSnapshots(t, dir, "a.csv", 100, 2, nil)
	bad := filepath.Join(dir, "bad.csv")
	os.WriteFile(bad, []byte("when,who\n1,2\n"), 0o644)
	if _, err := s.Import(context.Background(), ImportInput{Files: []string{a, bad}}); err == nil {
		t.Fatal("a file without the required columns was imported")
	}
	c, _ := s.Counts()
	if c.Snapshots != 0 {
		t.Errorf("%d snapshots kept from a failed import", c.Snapshots)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := s.Import(ctx, ImportInput{Files: []string{a}}); err == nil {
		t.Error("a cancelled import reported success")
	}
	if c, _ := s.Counts(); c.Snapshots != 0 {
		t.Errorf("%d snapshots kept from a cancelled import", c.Snapshots)
	}
}

// Events are kept once; a fleet file is kept with its type files and read
// back as the same roster.
func TestEventsAndFleet(t *testing.T) {
	dir := t.TempDir()
	s, _ := openTemp(t)
	ev := filepath.Join(dir, "events.csv")
	os.WriteFile(ev, []byte("time,tail,kind,note\n2026-03-02T00:00:00Z,T1,wash,\"<b>&\"\"x\"\"\"\n2026-03-03T00:00:00Z,T2,engine change,\n"), 0o644)
	typ, _ := os.ReadFile("../demo_type.toml")
	os.MkdirAll(filepath.Join(dir, "types"), 0o755)
	os.WriteFile(filepath.Join(dir, "types", "a.toml"), typ, 0o644)
	fleet := filepath.Join(dir, "fleet.toml")
	os.WriteFile(fleet, []byte("name = \"test fleet\"\n[types]\n\"AA-1\" = \"types/a.toml\"\n[[tail]]\nid = \"T1\"\ntype = \"AA-1\"\n"), 0o644)
	for run := 0; run < 2; run++ {
		res, err := s.Import(context.Background(), ImportInput{Files: []string{ev}, Fleet: fleet})
		if err != nil {
			t.Fatal(err)
		}
		if want := 2 - 2*run; res.Events != want {
			t.Errorf("run %d: %d events added, want %d", run, res.Events, want)
		}
	}
	evs, err := s.Events()
	if err != nil || len(evs["T1"]) != 1 || evs["T1"][0].Note != "<b>&\"x\"" || evs["T2"][0].Kind != "engine change" {
		t.Errorf("events %v %v", evs, err)
	}
	r, err := s.Roster()
	if err != nil {
		t.Fatal(err)
	}
	want, _ := feed.LoadFleet(fleet)
	if r.Label() != want.Label() || len(r.Types) != 1 || r.Types["AA-1"].CD0 != want.Types["AA-1"].CD0 || r.Types["AA-1"].WingArea != want.Types["AA-1"].WingArea {
		t.Errorf("roster %q %v, want %q", r.Label(), r.TypeNames(), want.Label())
	}
}

// A store of schema version 1 (before the work list) is upgraded in
// place and keeps its snapshots; a store of a newer version is refused.
func TestSchemaUpgradeAndNewer(t *testing.T) {
	p := filepath.Join(t.TempDir(), "old.db")
	db, err := sql.Open("sqlite", "file:"+p)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := db.Exec(migrations[0] + "; PRAGMA user_version = 1"); err != nil {
		t.Fatal(err)
	}
	blk := encodeBlock([]feed.Record{{Tail: "T1", Time: time.Unix(0, 0).UTC(), Flight: "F1", File: "old.csv", Line: 2}})
	if _, err := db.Exec("INSERT INTO blocks (tail, first, last, n, data, imported) VALUES ('T1', 0, 0, 1, ?, 0)", blk); err != nil {
		t.Fatal(err)
	}
	db.Close()
	s, err := Open(p, false)
	if err != nil {
		t.Fatalf("upgrade: %v", err)
	}
	if v, _ := s.version(); v != Version {
		t.Errorf("version %d after the upgrade, want %d", v, Version)
	}
	if c, err := s.Counts(); err != nil || c.Snapshots != 1 {
		t.Errorf("after the upgrade: %+v %v", c, err)
	}
	if _, err := s.AddWork("T1", "after the upgrade", ""); err != nil {
		t.Errorf("work list after the upgrade: %v", err)
	}
	s.db.Exec(fmt.Sprintf("PRAGMA user_version = %d", Version+1))
	s.Close()
	if _, err := Open(p, false); !errors.Is(err, ErrNewer) {
		t.Errorf("a newer store: %v, want ErrNewer", err)
	}
	junk := filepath.Join(t.TempDir(), "junk.db")
	os.WriteFile(junk, []byte(strings.Repeat("not a database ", 100)), 0o644)
	if _, err := Open(junk, false); err == nil || !strings.Contains(err.Error(), "not a dragdeck store") {
		t.Errorf("a file that is no database: %v", err)
	}
	if _, err := Open(filepath.Join(t.TempDir(), "missing.db"), false); err == nil {
		t.Error("a missing store opened without create")
	}
}

// An import reads a stored block only when an incoming snapshot falls in
// its time span: a week's export reads the recent blocks, not the whole
// history.
func TestImportReadsOnlyOverlappingBlocks(t *testing.T) {
	dir := t.TempDir()
	s, _ := openTemp(t)
	old := writeSnapshots(t, dir, "old.csv", 3000, 1, nil) // one tail, 3 blocks
	if _, err := s.Import(context.Background(), ImportInput{Files: []string{old}}); err != nil {
		t.Fatal(err)
	}
	tx, err := s.db.Begin()
	if err != nil {
		t.Fatal(err)
	}
	defer tx.Rollback()
	k, err := loadKeys(tx)
	if err != nil || len(k.unread["T0"]) != 3 {
		t.Fatalf("%v: %d blocks", err, len(k.unread["T0"]))
	}
	var recs []feed.Record
	feed.ReadFile(old, func(r feed.Record) { recs = append(recs, r) }, nil)
	later := recs[len(recs)-1].Time.Add(time.Hour).UnixNano()
	if _, ok, err := k.lookup("T0", later); ok || err != nil || len(k.unread["T0"]) != 3 {
		t.Errorf("a time after every block: found %v, %v, %d blocks left unread", ok, err, len(k.unread["T0"]))
	}
	last := recs[len(recs)-1]
	d, ok, err := k.lookup("T0", last.Time.UnixNano())
	if !ok || err != nil || d != digest(last) || len(k.unread["T0"]) != 2 {
		t.Errorf("the last snapshot: found %v, %v, %d blocks left unread", ok, err, len(k.unread["T0"]))
	}
}
