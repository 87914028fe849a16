package tui

import (
	"strings"
	"testing"
)

// At 80 × 24 the caution is on the first page, whole, and the rest of the
// About text scrolls into view.
func TestAboutCautionAndScroll(t *testing.T) {
	m := sized(demoFleet(t), 80, 24)
	m.activate(scrAbout)
	v := checkFrame(t, m, 80, 24)
	flat := strings.Join(strings.Fields(v), " ")
	if !strings.Contains(flat, strings.Join(strings.Fields(Caution), " ")) {
		t.Errorf("the caution is not whole at 80 × 24:\n%s", v)
	}
	if strings.Contains(v, "Cruise: specific range") {
		t.Skip("everything fits; nothing to scroll")
	}
	for i := 0; i < 30; i++ {
		press(m, "down")
	}
	if v := m.View(); !strings.Contains(strings.Join(strings.Fields(v), " "), "Turns: the cost of a bank") {
		t.Errorf("scrolled About lacks its end:\n%s", v)
	}
}
