package tui

import (
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"

	"dragdeck/model"
)

func TestCruiseKeys(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	press(m, "enter")
	m.activate(scrCruise)
	c := m.cruise.c
	press(m, "up", "]", "I")
	if m.cruise.c.Altitude <= c.Altitude || m.cruise.c.CostIndex != c.CostIndex+5 || m.cruise.c.ISADev != c.ISADev+5 {
		t.Errorf("cruise keys: %+v → %+v", c, m.cruise.c)
	}
	if m.cruise.tail.MaxRange.SR >= m.cruise.base.MaxRange.SR {
		t.Error("a flagged tail's own polar should have less range than the baseline")
	}
	if v := m.View(); !strings.Contains(v, "max range M") || !strings.Contains(v, "level") {
		t.Errorf("cruise view:\n%s", v)
	}
}

// The Cruise screen's own polar is the tail's recent level from the
// pipeline, not the deviation of the flight last replayed.
func TestCruiseOwnPolarIsTheTailsLevel(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	press(m, "enter")
	a := m.tail.a
	press(m, "enter", "G") // replay a flight whose own median differs
	m.activate(scrCruise)
	if got := m.cruise.c.ExcessPct; got != a.RecentPct {
		t.Errorf("own polar at %+.3f %%, the tail's recent level is %+.3f %%", got, a.RecentPct)
	}
	if !strings.Contains(m.View(), "recent level") {
		t.Errorf("the own polar's source is not named:\n%s", m.View())
	}
}

// Under a replay, with no fleet and so no recent level, the own polar is
// the current flight's median so far, and the Cruise screen says so.
func TestCruiseOwnPolarUnderReplay(t *testing.T) {
	d := demoFleet(t)
	recs := d.Records[d.Fleet.Tails[0].Tail][:6]
	m := New(t.Context(), nil, nil, WithReplay(d.Roster, d.Config, recs, 0))
	m.Update(tea.WindowSizeMsg{Width: 100, Height: 30})
	m.flight.seek(3)
	played, _ := m.flight.flightSpan()
	var devs []float64
	for _, i := range played {
		if m.flight.left[i] == "" {
			devs = append(devs, m.flight.points[i].DragDevPct)
		}
	}
	m.activate(scrCruise)
	if want := model.Median(devs); m.cruise.c.ExcessPct != want {
		t.Errorf("own polar at %+.3f %%, the flight's median so far is %+.3f %%", m.cruise.c.ExcessPct, want)
	}
	if v := m.View(); !strings.Contains(v, "this flight so far") || strings.Contains(v, "recent level") {
		t.Errorf("the own polar's source is misnamed:\n%s", v)
	}
}

// The help lists both keys of every pair, each with its own text.
func TestCruiseAndTurnsHelpBothHalves(t *testing.T) {
	for name, s := range map[string]Screen{"cruise": newCruiseScreen(NewStyles(DefaultTheme)), "turns": newTurnsScreen(NewStyles(DefaultTheme))} {
		seen := map[string]string{}
		for _, col := range s.FullHelp() {
			for _, b := range col {
				h := b.Help()
				if prev, dup := seen[h.Desc]; dup {
					t.Errorf("%s: %q and %q share the text %q", name, prev, h.Key, h.Desc)
				}
				seen[h.Desc] = h.Key
				if strings.Contains(h.Key, "/") && !strings.Contains(h.Key, "↑/") && !strings.Contains(h.Key, "↓/") {
					t.Errorf("%s: %q names two keys in one entry", name, h.Key)
				}
			}
		}
		want := map[string][]string{"cruise": {"+", "-", "]", "[", "I", "i"}, "turns": {"+", "-"}}[name]
		for _, k := range want {
			found := false
			for _, key := range seen {
				found = found || key == k
			}
			if !found {
				t.Errorf("%s: help lacks the %q key", name, k)
			}
		}
	}
}
