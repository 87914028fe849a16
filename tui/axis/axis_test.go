package axis

import (
	"fmt"
	"strings"
	"testing"
	"time"
)

func TestStep(t *testing.T) {
	tests := []struct {
		name string
		span float64
		n    int
		want float64
	}{
		{"45° in 9", 45, 9, 5},
		{"45° in 3", 45, 3, 20},
		{"a minute in 8", 0.7, 8, 0.1},
		{"4 pp in 4", 4, 4, 1},
		{"no span", 0, 5, 1},
		{"no intervals", 10, 0, 1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := Step(tc.span, tc.n); got != tc.want {
				t.Errorf("Step(%g, %d) = %g, want %g", tc.span, tc.n, got, tc.want)
			}
		})
	}
}

func TestValues(t *testing.T) {
	tests := []struct {
		name   string
		lo, hi float64
		n      int
		want   string
	}{
		{"signed percent", -1.3, 2.7, 4, "-1 0 1 2"},
		{"deviation bars", -0.8, 3.9, 5, "0 1 2 3"},
		{"minutes", 0, 92, 6, "0 20 40 60 80"},
		{"no negative zero", -0.3, 0.3, 3, "-0.2 0 0.2"},
		{"tenths without float error", 0, 0.7, 8, "0 0.1 0.2 0.3 0.4 0.5 0.6 0.7"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var got []string
			for _, v := range Values(tc.lo, tc.hi, tc.n) {
				got = append(got, fmt.Sprint(v))
			}
			if s := strings.Join(got, " "); s != tc.want {
				t.Errorf("Values = %q, want %q", s, tc.want)
			}
		})
	}
}

func TestMonths(t *testing.T) {
	day := func(y int, m time.Month, d int) time.Time { return time.Date(y, m, d, 0, 0, 0, 0, time.UTC) }
	tests := []struct {
		name       string
		start, end time.Time
		n          int
		want       string
		every      int
	}{
		{"five months", day(2026, 3, 17), day(2026, 8, 2), 12, "2026-04 2026-05 2026-06 2026-07 2026-08", 1},
		{"two years, 8 labels", day(2024, 7, 1), day(2026, 6, 30), 8, "2024-07 2024-10 2025-01 2025-04 2025-07 2025-10 2026-01 2026-04", 3},
		{"first of the month counts", day(2026, 6, 1), day(2026, 7, 1), 4, "2026-06 2026-07", 1},
		// 30 June 20:00 −05:00 is 1 July 01:00 UTC: after the July start.
		{"offset times are UTC", time.Date(2026, 6, 30, 20, 0, 0, 0, time.FixedZone("", -5*3600)), day(2026, 8, 15), 4, "2026-08", 1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			starts, every := Months(tc.start, tc.end, tc.n)
			var got []string
			for _, m := range starts {
				if m.Day() != 1 || m.Hour() != 0 || m.Location() != time.UTC {
					t.Errorf("%v is not a month start in UTC", m)
				}
				got = append(got, m.Format("2006-01"))
			}
			if s := strings.Join(got, " "); s != tc.want || every != tc.every {
				t.Errorf("Months = %q every %d, want %q every %d", s, every, tc.want, tc.every)
			}
		})
	}
}
