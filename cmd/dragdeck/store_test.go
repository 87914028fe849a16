package main

import (
	"context"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// TestMain lets a test run dragdeck as a real process: the test binary
// itself, with DRAGDECK_AS_MAIN set, runs the command line it is given.
func TestMain(m *testing.M) {
	if os.Getenv("DRAGDECK_AS_MAIN") == "1" {
		os.Exit(run(context.Background(), os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
	}
	os.Exit(m.Run())
}

// dragdeckProcess starts dragdeck with args as a process of its own.
func dragdeckProcess(t *testing.T, args ...string) *exec.Cmd {
	t.Helper()
	cmd := exec.Command(os.Args[0], args...)
	cmd.Env = append(os.Environ(), "DRAGDECK_AS_MAIN=1")
	return cmd
}

// demoFleet writes a demo fleet of another seed than the built-in one.
func demoFleet(t *testing.T, tails, days, seed string) string {
	t.Helper()
	dir := t.TempDir()
	if code, _, errs := runArgs("demo", "--out", dir, "--tails", tails, "--days", days, "--seed", seed); code != 0 {
		t.Fatal(errs)
	}
	return dir
}

func importJSONOf(t *testing.T, args ...string) importJSON {
	t.Helper()
	code, out, errs := runArgs(append([]string{"import", "--json"}, args...)...)
	if code != 0 {
		t.Fatalf("import %v: exit %d: %s", args, code, errs)
	}
	var j importJSON
	if err := json.Unmarshal([]byte(out), &j); err != nil {
		t.Fatal(err, out)
	}
	return j
}

// report --store gives the report of the files it was imported from: the
// same JSON but for the rows read and rejected (a store holds no rejected
// rows), on two seeds and a mixed fleet with events.
func TestReportStoreEqualsFiles(t *testing.T) {
	for _, seed := range []string{"5", "21"} {
		dir := demoFleet(t, "10", "260", seed)
		db := filepath.Join(dir, "s.db")
		snaps, events, fleet := filepath.Join(dir, "snapshots"), filepath.Join(dir, "events.csv"), filepath.Join(dir, "fleet.toml")
		j := importJSONOf(t, "--store", db, snaps, events, fleet)
		if j.New == 0 || j.Rejected != 8 || j.Events == 0 {
			t.Fatalf("seed %s: import %+v", seed, j)
		}
		_, fromFiles, _ := runArgs("report", "--format", "json", "--fleet", fleet, "--events", events, snaps)
		code, fromStore, errs := runArgs("report", "--format", "json", "--store", db)
		if code != 0 {
			t.Fatalf("report --store: exit %d %s", code, errs)
		}
		var a, b map[string]any
		json.Unmarshal([]byte(fromFiles), &a)
		json.Unmarshal([]byte(fromStore), &b)
		if b["read"].(float64) != float64(j.New) || b["rejected"].(float64) != 0 {
			t.Errorf("seed %s: store read %v rejected %v, want %d and 0", seed, b["read"], b["rejected"], j.New)
		}
		for _, k := range []string{"read", "rejected"} {
			delete(a, k)
			delete(b, k)
		}
		ja, _ := json.Marshal(a)
		jb, _ := json.Marshal(b)
		if string(ja) != string(jb) {
			t.Errorf("seed %s: report --store differs from the report of the files", seed)
		}
		// and the table and CSV run
		for _, f := range []string{"table", "csv"} {
			if code, _, errs := runArgs("report", "--format", f, "--store", db); code != 0 {
				t.Errorf("report --format %s --store: %s", f, errs)
			}
		}
		if code, out, _ := runArgs("check", "--store", db); code != 0 || !strings.Contains(out, "0 rejected") {
			t.Errorf("check --store: exit %d %s", code, out)
		}
	}
}

// A second import adds nothing; one changed row is one conflict.
func TestImportCommandCounts(t *testing.T) {
	dir := demoFleet(t, "6", "120", "33")
	db := filepath.Join(dir, "s.db")
	snaps := filepath.Join(dir, "snapshots")
	first := importJSONOf(t, "--store", db, snaps)
	second := importJSONOf(t, "--store", db, snaps)
	if second.New != 0 || second.Duplicate != first.New || second.Conflict != 0 || second.Rejected != first.Rejected {
		t.Errorf("second import %+v after %+v", second, first)
	}
	data, _ := os.ReadFile(filepath.Join(snaps, "fleet.csv"))
	lines := strings.Split(string(data), "\n")
	h := 0
	for strings.HasPrefix(lines[h], "#") {
		h++
	}
	f := strings.Split(lines[h+1], ",")
	f[3] = f[3] + "1" // a weight with one more digit
	changed := filepath.Join(dir, "changed.csv")
	os.WriteFile(changed, []byte(lines[h]+"\n"+strings.Join(f, ",")+"\n"), 0o644)
	code, out, errs := runArgs("import", "--store", db, changed)
	if code != 0 || !strings.Contains(out, "0 new, 0 duplicate, 1 conflicting") || !strings.Contains(errs, "changed.csv:2:") || !strings.Contains(errs, "weight differs)") {
		t.Errorf("a changed row: exit %d\n%s\n%s", code, out, errs)
	}
	// a missing path: exit 2, nothing added
	if code, _, _ := runArgs("import", "--store", db, filepath.Join(dir, "nothing.csv")); code != 2 {
		t.Errorf("a missing path: exit %d", code)
	}
	// the store named as an input
	if code, _, errs := runArgs("import", "--store", db, db); code != 2 {
		t.Errorf("the store as its own input: exit %d %s", code, errs)
	}
	if code, _, errs := runArgs("report", "--store", db, snaps); code != 2 || !strings.Contains(errs, "not both") {
		t.Errorf("--store and paths: exit %d %s", code, errs)
	}
	if code, _, errs := runArgs("report", "--store", filepath.Join(dir, "none.db")); code != 2 {
		t.Errorf("a missing store: exit %d %s", code, errs)
	}
}

// bigCSV writes n snapshots of 50 tails, fast (a string per row built by
// hand), for the import that is killed.
func bigCSV(t *testing.T, path string, n int) {
	t.Helper()
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	b := []byte("time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,bank_deg\n")
	t0 := time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC)
	for i := 0; i < n; i++ {
		b = t0.Add(time.Duration(i/50)*5*time.Minute).AppendFormat(b, time.RFC3339)
		b = fmt.Appendf(b, ",K%02d,KF%d,%d,%d,0.78,-52.0,%d,0\n", i%50, i/50/4, 60000+i%4000, 35000+i%5*20, 2300+i%40)
		if len(b) > 1<<20 {
			f.Write(b)
			b = b[:0]
		}
	}
	f.Write(b)
}

// An import killed by a signal half-way leaves the store as it was before
// it: it opens, reports, and takes the complete import again. While an
// import runs, another process reads the store (WAL): it sees the store as
// it was before the import.
func TestImportKilledAndConcurrentRead(t *testing.T) {
	if testing.Short() {
		t.Skip("imports 300,000 rows")
	}
	dir := demoFleet(t, "4", "60", "12")
	db := filepath.Join(dir, "s.db")
	small := importJSONOf(t, "--store", db, filepath.Join(dir, "snapshots"))
	big := filepath.Join(dir, "big.csv")
	bigCSV(t, big, 300000)

	// a reader while an import runs, then the kill
	p := dragdeckProcess(t, "import", "--store", db, big)
	if err := p.Start(); err != nil {
		t.Fatal(err)
	}
	deadline := time.Now().Add(20 * time.Second)
	for { // wait until the import is writing its transaction
		if fi, err := os.Stat(db + "-wal"); err == nil && fi.Size() > 4<<20 {
			break
		}
		if time.Now().After(deadline) {
			p.Process.Kill()
			t.Fatal("the import never started writing")
		}
		time.Sleep(20 * time.Millisecond)
	}
	reader := dragdeckProcess(t, "report", "--format", "json", "--store", db)
	out, err := reader.Output()
	if err != nil {
		t.Fatalf("a report while an import runs: %v", err)
	}
	var rep struct{ Read int }
	json.Unmarshal(out, &rep)
	if rep.Read != small.New {
		t.Errorf("the report during the import read %d snapshots, want the %d before it", rep.Read, small.New)
	}
	if err := p.Process.Signal(syscall.SIGKILL); err != nil {
		t.Fatal(err)
	}
	p.Wait()

	code, out2, errs := runArgs("report", "--format", "json", "--store", db)
	if code != 0 {
		t.Fatalf("report after the kill: exit %d %s", code, errs)
	}
	json.Unmarshal([]byte(out2), &rep)
	if rep.Read != small.New {
		t.Errorf("after the kill the store holds %d snapshots, want the %d before the import", rep.Read, small.New)
	}
	again := importJSONOf(t, "--store", db, big)
	if again.New != 300000 || again.Duplicate != 0 {
		t.Errorf("the import again after the kill: %+v", again)
	}
	if code, _, errs := runArgs("check", "--store", db); code != 0 {
		t.Errorf("check --store after it all: %s", errs)
	}
}

// The work list from the command line: add, advance, refuse, list, and
// the report shows the tail's item; review after a mark shows no change.
func TestWorklistAndReview(t *testing.T) {
	dir := demoFleet(t, "8", "200", "44")
	db := filepath.Join(dir, "s.db")
	importJSONOf(t, "--store", db, filepath.Join(dir, "snapshots"), filepath.Join(dir, "events.csv"), filepath.Join(dir, "fleet.toml"))
	code, out, errs := runArgs("worklist", "--store", db, "add", "DD103", "--reason", "drift <0.9> & \"more\"", "--flag", "growth")
	if code != 0 || strings.TrimSpace(out) != "1" {
		t.Fatalf("add: exit %d %q %s", code, out, errs)
	}
	steps := []struct {
		args []string
		code int
	}{
		{[]string{"set", "1", "inspect", "--note", "seals, slot 12 Dec"}, 0},
		{[]string{"set", "1", "closed"}, 2},
		{[]string{"set", "1", "repaired"}, 2},
		{[]string{"set", "7", "inspect"}, 2},
		{[]string{"set", "1", "not found", "--note", "nothing seen"}, 0},
		{[]string{"add", "DD103", "--reason", "again"}, 2},
		{[]string{"list", "--note", "x"}, 2},
		{[]string{"frobnicate"}, 2},
	}
	for _, s := range steps {
		if code, _, errs := runArgs(append([]string{"worklist", "--store", db}, s.args...)...); code != s.code {
			t.Errorf("worklist %v: exit %d, want %d (%s)", s.args, code, s.code, errs)
		}
	}
	_, out, _ = runArgs("worklist", "--store", db, "list", "--json")
	var items []workItemJSON
	if err := json.Unmarshal([]byte(out), &items); err != nil || len(items) != 1 {
		t.Fatalf("list --json: %v %s", err, out)
	}
	if it := items[0]; it.Status != "not found" || it.Reason != "drift <0.9> & \"more\"" || len(it.Notes) != 3 || it.Notes[1].Text != "seals, slot 12 Dec" {
		t.Errorf("item %+v", it)
	}
	_, out, _ = runArgs("report", "--format", "json", "--store", db)
	var rep struct {
		Tails []struct {
			Tail string        `json:"tail"`
			Work []workRefJSON `json:"work"`
		} `json:"tails"`
	}
	json.Unmarshal([]byte(out), &rep)
	found := false
	for _, tl := range rep.Tails {
		if tl.Tail == "DD103" {
			found = len(tl.Work) == 1 && tl.Work[0].ID == 1 && tl.Work[0].Status == "not found"
		} else if len(tl.Work) != 0 {
			t.Errorf("%s has work %v", tl.Tail, tl.Work)
		}
	}
	if !found {
		t.Errorf("the report does not show DD103's item: %s", out)
	}
	if _, out, _ := runArgs("report", "--store", db); !strings.Contains(out, "DD103 #1 not found") {
		t.Errorf("the report table does not show the item:\n%s", out)
	}

	// review: everything new before the first mark; nothing after it
	var before, after reviewJSON
	_, out, _ = runArgs("review", "--store", db, "--json", "--mark")
	json.Unmarshal([]byte(out), &before)
	if before.Since != nil || len(before.FlagsRaised) == 0 || len(before.WorkOpened) != 1 || len(before.Events) == 0 {
		t.Errorf("first review %+v", before)
	}
	for _, ev := range before.Events {
		if ev.StepPct != nil && ev.FuelKgPerYear == nil {
			t.Errorf("event %+v: a step without its fuel", ev)
		}
	}
	_, out, _ = runArgs("review", "--store", db, "--json")
	json.Unmarshal([]byte(out), &after)
	if after.Since == nil || len(after.FlagsRaised)+len(after.FlagsCleared)+len(after.StepsNew)+len(after.WorkOpened)+len(after.WorkClosed)+len(after.Events) != 0 {
		t.Errorf("review after a mark: %s", out)
	}
	runArgs("worklist", "--store", db, "set", "1", "closed")
	_, out, _ = runArgs("review", "--store", db, "--json")
	json.Unmarshal([]byte(out), &after)
	if len(after.WorkClosed) != 1 || after.WorkClosed[0] != 1 {
		t.Errorf("review after closing item 1: %s", out)
	}
}
