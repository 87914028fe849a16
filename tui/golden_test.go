package tui

import (
	"bytes"
	"context"
	"strings"
	"testing"
	"time"

	"github.com/charmbracelet/x/exp/golden"
	"github.com/charmbracelet/x/exp/teatest"
)

// step is a key and text that appears on the screen once it took effect
// (a key's command may finish after the next key, so each waits).
type step struct{ key, wait string }

// Golden files of each screen on the built-in demo at 100 × 30 with an
// ASCII colour profile, driven through the bubbletea runtime. Update them
// with 'go test ./tui -update' after a deliberate change, and look at them.
func TestGoldenScreens(t *testing.T) {
	openTail := step{"enter", "newest first"}
	tests := []struct {
		name  string
		steps []step
	}{
		{"fleet", []step{{"", "flagged"}}},
		{"tail", []step{openTail}},
		{"tail-factor", []step{openTail, {"f", "fuel factor %"}}},
		// Timers are instant in tests, so the replay runs to its end at once.
		{"flight", []step{openTail, {"down", ""}, {"enter", "at the end"}}},
		{"cruise", []step{openTail, {"tab", "no flight"}, {"tab", "max range M"}}},
		{"turns", []step{openTail, {"tab", "no flight"}, {"tab", "max range M"}, {"tab", "beyond buffet"}}},
		{"about", []step{{"shift+tab", "Caution"}}},
		{"help", []step{{"?", "previous screen"}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			m := New(context.Background(), demoFleet(t), nil)
			tm := teatest.NewTestModel(t, m, teatest.WithInitialTermSize(100, 30))
			for _, st := range tc.steps {
				if st.key != "" {
					tm.Send(keyMsg(st.key))
				}
				if st.wait != "" {
					teatest.WaitFor(t, tm.Output(), func(b []byte) bool { return bytes.Contains(b, []byte(st.wait)) },
						teatest.WithDuration(5*time.Second))
				}
			}
			if err := tm.Quit(); err != nil {
				t.Fatal(err)
			}
			final := tm.FinalModel(t, teatest.WithFinalTimeout(5*time.Second)).(*Model)
			golden.RequireEqual(t, []byte(final.View()))
		})
	}
}

func TestGoldenFiles80x24(t *testing.T) {
	m := sized(demoFleet(t), 80, 24)
	v := checkFrame(t, m, 80, 24)
	if !strings.Contains(v, "DD101") {
		t.Fatal("no worst tail at 80 × 24")
	}
	golden.RequireEqual(t, []byte(v))
}
