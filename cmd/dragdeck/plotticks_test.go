package main

import (
	"strings"
	"testing"
	"time"
)

func TestRoundTicks(t *testing.T) {
	var labels []string
	for _, k := range (roundTicks{5}).Ticks(-0.8, 3.9) {
		labels = append(labels, k.Label)
	}
	if got := strings.Join(labels, " "); got != "0 1 2 3" {
		t.Errorf("ticks %q, want 0 1 2 3 (zero marked, round values)", got)
	}
}

// The tail plot's time axis is marked at month starts in UTC.
func TestMonthTicksAtMonthStarts(t *testing.T) {
	lo := float64(time.Date(2024, 7, 1, 0, 0, 0, 0, time.UTC).Unix())
	hi := float64(time.Date(2026, 6, 30, 0, 0, 0, 0, time.UTC).Unix())
	ticks := (monthTicks{8}).Ticks(lo, hi)
	if len(ticks) < 4 || len(ticks) > 8 {
		t.Fatalf("%d ticks over two years", len(ticks))
	}
	for _, k := range ticks {
		m := time.Unix(int64(k.Value), 0).UTC()
		if m.Day() != 1 || m.Hour() != 0 || k.Label != m.Format("2006-01") {
			t.Errorf("tick %q at %v is not a month start", k.Label, m)
		}
	}
	short := (monthTicks{8}).Ticks(lo, lo+10*86400)
	if len(short) == 0 {
		t.Error("ten days: no ticks")
	}
}
