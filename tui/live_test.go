package tui

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"dragdeck/feed"
	"dragdeck/model"
)

// The Flight screen follows a live file: the rows already there, then an
// appended row, on screen.
func TestFollowLive(t *testing.T) {
	path := filepath.Join(t.TempDir(), "live.csv")
	head := "time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n"
	os.WriteFile(path, []byte(head+"2026-03-01T10:00:00Z,DD101,F7,65000,35000,0.78,-54,2400\n"), 0o644)
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	m := New(ctx, nil, nil, WithLive(model.SingleType(feed.DemoType()), model.DefaultTrendConfig(), path, ""))
	m.Update(tea.WindowSizeMsg{Width: 100, Height: 30})
	pump := func(want int) {
		t.Helper()
		cmd := m.Init()
		deadline := time.Now().Add(5 * time.Second)
		for len(m.flight.recs) < want && time.Now().Before(deadline) {
			ch := make(chan tea.Msg, 1)
			go func(c tea.Cmd) { ch <- c() }(cmd)
			select {
			case msg := <-ch:
				_, cmd = m.Update(msg)
			case <-time.After(time.Until(deadline)):
			}
		}
		if len(m.flight.recs) < want {
			t.Fatalf("%d live records, want %d", len(m.flight.recs), want)
		}
	}
	pump(1)
	f, _ := os.OpenFile(path, os.O_APPEND|os.O_WRONLY, 0)
	f.WriteString("2026-03-01T10:20:00Z,DD101,F7,64800,35000,0.78,-54,2460\n")
	f.Close()
	pump(2)
	v := m.View()
	if !strings.Contains(v, "LIVE") || !strings.Contains(v, "2 snapshots") || !strings.Contains(v, "10:20Z") {
		t.Errorf("live view:\n%s", v)
	}
	if m.flight.ShortHelp() != nil {
		t.Error("replay keys should not show while live")
	}
}
