package tui

import (
	"math"
	"strings"
	"testing"

	"dragdeck/model"
)

func TestTurnsKeys(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	press(m, "enter")
	m.activate(scrTurns)
	if len(m.turns.rows) != 10 {
		t.Fatalf("%d bank rows", len(m.turns.rows))
	}
	press(m, "+", "+") // away from the buffet-limited lowest Mach
	mach := m.turns.c.Mach
	press(m, "-")
	if math.Abs(m.turns.c.Mach-(mach-0.01)) > 0.006 {
		t.Errorf("- on Turns: Mach %g → %g", mach, m.turns.c.Mach)
	}
	if v := m.View(); !strings.Contains(v, "1.1547") || !strings.Contains(v, "+33.3%") {
		t.Errorf("turns view lacks the 30° row:\n%s", v)
	}
}

// The cost of a turn is 0 at 0° of bank, and the Turns screen does not go
// below the Mach that keeps the buffet margin wings level.
func TestTurnsBuffet(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	m.activate(scrTurns)
	if r := m.turns.rows[0]; r.TotalIncreasePct != 0 || r.InducedIncreasePct != 0 {
		t.Errorf("0° row: %+v", r)
	}
	c := m.turns.c
	min := model.MinBuffetMach(m.typ(), c.Weight, model.AirISA(c.Altitude, c.ISADev))
	for i := 0; i < 60; i++ {
		press(m, "-")
	}
	if got := m.turns.c.Mach; got < min-1e-9 || got > min+0.01+1e-9 {
		t.Errorf("Mach went to %.3f; the buffet-limited Mach is %.3f", got, min)
	}
	if m.turns.rows[0].Buffet {
		t.Error("wings level beyond buffet at the lowest Mach")
	}
	v := m.View()
	if !strings.Contains(v, "beyond buffet") {
		t.Errorf("no buffet warning at the lowest Mach:\n%s", v)
	}
	for _, lbl := range []string{"0°", "15°", "30°", "45°"} {
		if !strings.Contains(v, lbl) {
			t.Errorf("bank axis lacks %s:\n%s", lbl, v)
		}
	}
	for _, odd := range []string{" 4° ", " 9° ", " 14° "} {
		if strings.Contains(v, odd) {
			t.Errorf("odd bank tick %q:\n%s", odd, v)
		}
	}
	for i := 0; i < 10; i++ {
		press(m, "+")
	}
	if math.IsNaN(m.turns.c.Mach) || m.turns.c.Mach > m.typ().MMO {
		t.Errorf("Mach %g beyond MMO", m.turns.c.Mach)
	}
}
