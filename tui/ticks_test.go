package tui

import (
	"strconv"
	"strings"
	"testing"
	"time"
)

func TestNiceTicks(t *testing.T) {
	tests := []struct {
		name   string
		lo, hi float64
		n      int
		want   string
	}{
		{"bank 0–45°", 0, 45, 9, "0 5 10 15 20 25 30 35 40 45"},
		{"bank 0–45° few", 0, 45, 3, "0 20 40"},
		{"signed percent, one decimal dropped", -1.3, 2.7, 4, "-1 0 1 2"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var got []string
			for _, k := range niceTicks(tc.lo, tc.hi, tc.n, func(v float64) string { return strings.TrimSuffix(fmtG(v), ".0") }) {
				got = append(got, k.label)
			}
			if s := strings.Join(got, " "); s != tc.want {
				t.Errorf("ticks %q, want %q", s, tc.want)
			}
		})
	}
}

// Month ticks sit at the first of each month: a step of 6 June is after
// the June tick, not under May.
func TestMonthTicks(t *testing.T) {
	x := func(t time.Time) float64 { return float64(t.Unix()) / 86400 }
	start := time.Date(2026, 3, 17, 0, 0, 0, 0, time.UTC)
	end := time.Date(2026, 8, 2, 0, 0, 0, 0, time.UTC)
	ticks := monthTicks(start, end, 12, x)
	var labels []string
	for _, k := range ticks {
		labels = append(labels, k.label)
	}
	if got := strings.Join(labels, " "); got != "Apr May Jun Jul Aug" {
		t.Fatalf("labels %q", got)
	}
	june := ticks[2].v
	if want := x(time.Date(2026, 6, 1, 0, 0, 0, 0, time.UTC)); june != want {
		t.Errorf("June tick at %g, want the first of June %g", june, want)
	}
	if step := x(time.Date(2026, 6, 6, 0, 0, 0, 0, time.UTC)); !(step > june && step < ticks[3].v) {
		t.Error("6 June does not fall between the June and July ticks")
	}
	// Two years: every third month at most 12 labels, years named.
	long := monthTicks(time.Date(2024, 7, 1, 0, 0, 0, 0, time.UTC), time.Date(2026, 6, 30, 0, 0, 0, 0, time.UTC), 8, x)
	if len(long) > 8 || long[0].label != "Jul" {
		t.Errorf("two years: %+v", long)
	}
}

// Minute ticks of a short flight are at distinct round values.
func TestMinuteTicksDistinct(t *testing.T) {
	for _, span := range []float64{0.7, 2.6, 9, 47, 610} {
		ticks := niceTicks(0, span, 8, func(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) })
		seen := map[string]bool{}
		for _, k := range ticks {
			if seen[k.label] {
				t.Errorf("span %g: label %q twice in %+v", span, k.label, ticks)
			}
			seen[k.label] = true
		}
		if len(ticks) < 2 {
			t.Errorf("span %g: %d ticks", span, len(ticks))
		}
	}
}
