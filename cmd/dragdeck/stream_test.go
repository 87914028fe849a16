package main

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"io"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"
)

// Piped replay --speed 0 prints one JSON object per snapshot, with time,
// tail, flight and the point fields.
func TestReplayJSONLines(t *testing.T) {
	code, out, errs := runArgs("replay", "--speed", "0", "../../testdata/snapshots/good_kg_sat.csv", "../../testdata/snapshots/good_lb_tat.csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	lines := strings.Split(strings.TrimSpace(out), "\n")
	if len(lines) != 10 {
		t.Fatalf("%d lines, want 10 (5 snapshots in each file)", len(lines))
	}
	prev := ""
	for _, l := range lines {
		keys := jsonKeys(t, l)
		hasAll(t, keys, "time", "tail", "flight", "cl", "excess_drag_counts", "drag_deviation_pct", "q_pa")
		var v struct{ Time string }
		json.Unmarshal([]byte(l), &v)
		if v.Time < prev {
			t.Errorf("not in time order: %s after %s", v.Time, prev)
		}
		prev = v.Time
	}
	code, out, _ = runArgs("replay", "--speed", "0", "--tail", "DD102", "--flight", "DDF0218", "../../testdata/snapshots/good_kg_sat.csv")
	if code != 0 || strings.Count(out, "\n") != 1 || !strings.Contains(out, `"flight":"DDF0218"`) {
		t.Errorf("filtered replay: exit %d\n%s", code, out)
	}
	if code, _, errs := runArgs("replay", "--speed", "-1", "x.csv"); code != 2 || !strings.Contains(errs, "--speed") {
		t.Errorf("negative speed: exit %d %s", code, errs)
	}
	if code, _, errs := runArgs("replay"); code != 2 || !strings.Contains(errs, "give at least one") {
		t.Errorf("no path: exit %d %s", code, errs)
	}
}

// syncBuffer is a bytes.Buffer safe for one writer and one reader.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

func waitFor(t *testing.T, what string, cond func() bool) {
	t.Helper()
	for deadline := time.Now().Add(5 * time.Second); time.Now().Before(deadline); time.Sleep(5 * time.Millisecond) {
		if cond() {
			return
		}
	}
	t.Fatalf("timed out waiting for %s", what)
}

// follow prints the rows already in the file, then an appended row, and
// exits 0 when stopped.
func TestFollowCommand(t *testing.T) {
	p := filepath.Join(t.TempDir(), "live.csv")
	src, _ := os.ReadFile("../../testdata/snapshots/good_kg_sat.csv")
	os.WriteFile(p, src, 0o644)
	var out, errs syncBuffer
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan int)
	go func() { done <- run(ctx, []string{"follow", p}, strings.NewReader(""), &out, &errs) }()
	lines := func() int { return strings.Count(out.String(), "\n") }
	waitFor(t, "the 5 rows already there", func() bool { return lines() == 5 })
	f, _ := os.OpenFile(p, os.O_APPEND|os.O_WRONLY, 0)
	f.WriteString("2026-03-02T09:00:00Z,DD103,DDF0300,66000,35000,0.78,-55,2400,0,0,0\n")
	f.Close()
	waitFor(t, "the appended row", func() bool { return lines() == 6 })
	cancel()
	if code := <-done; code != 0 {
		t.Errorf("exit %d: %s", code, errs.String())
	}
	sc := bufio.NewScanner(strings.NewReader(out.String()))
	var last string
	for sc.Scan() {
		last = sc.Text()
	}
	if !strings.Contains(last, `"tail":"DD103"`) {
		t.Errorf("last line %s", last)
	}
	if code := run(context.Background(), []string{"follow"}, strings.NewReader(""), io.Discard, io.Discard); code != 2 {
		t.Errorf("follow without FILE: exit %d", code)
	}
}

// /dev/null is a character device but not a terminal: replay, follow,
// dash and plain dragdeck write to it as to a file or pipe, exit 0.
func TestDevNullIsNotATerminal(t *testing.T) {
	null, err := os.Open(os.DevNull)
	if err != nil {
		t.Skip(err)
	}
	defer null.Close()
	if isTerminal(null) {
		t.Fatal("/dev/null taken for a terminal")
	}
	out, _ := os.OpenFile(os.DevNull, os.O_WRONLY, 0)
	defer out.Close()
	for _, args := range [][]string{
		{"replay", "--speed", "0", "../../testdata/snapshots/good_kg_sat.csv"},
		nil, // plain dragdeck: the cruise table
	} {
		var errb bytes.Buffer
		if code := run(context.Background(), args, strings.NewReader(""), out, &errb); code != 0 {
			t.Errorf("%v >/dev/null: exit %d: %s", args, code, errb.String())
		}
	}
	var errb bytes.Buffer
	if code := run(context.Background(), []string{"dash", "../../testdata/snapshots/good_kg_sat.csv"}, strings.NewReader(""), out, &errb); code != exitUsage ||
		!strings.Contains(errb.String(), "needs a terminal") {
		t.Errorf("dash >/dev/null: exit %d: %s", code, errb.String())
	}
}

// follow --tail keeps one tail's rows.
func TestFollowTail(t *testing.T) {
	path := filepath.Join(t.TempDir(), "live.csv")
	os.WriteFile(path, []byte("time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n"+
		"2026-03-01T10:00:00Z,AAA,F1,65000,35000,0.78,-54,2400\n"+
		"2026-03-01T10:01:00Z,BBB,F2,65000,35000,0.78,-54,2400\n"), 0o644)
	ctx, cancel := context.WithCancel(context.Background())
	var out syncBuffer
	done := make(chan int)
	go func() {
		done <- run(ctx, []string{"follow", "--tail", "BBB", path}, strings.NewReader(""), &out, io.Discard)
	}()
	for !strings.Contains(out.String(), "BBB") {
		time.Sleep(10 * time.Millisecond)
	}
	cancel()
	<-done
	if strings.Contains(out.String(), "AAA") || strings.Count(out.String(), "\n") != 1 {
		t.Errorf("follow --tail BBB wrote:\n%s", out.String())
	}
}
