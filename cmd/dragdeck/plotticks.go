package main

import (
	"strconv"
	"time"

	"gonum.org/v1/plot"

	"dragdeck/tui/axis"
)

// roundTicks marks an axis at round multiples of a 1-2-5 step, about n of
// them, the same ticks as the dashboard's charts (gonum's default ticks can
// fall at −0.5, 1.5, 3.5 and miss zero).
type roundTicks struct{ n int }

func (r roundTicks) Ticks(lo, hi float64) []plot.Tick {
	var out []plot.Tick
	for _, v := range axis.Values(lo, hi, r.n) {
		out = append(out, plot.Tick{Value: v, Label: strconv.FormatFloat(v, 'f', -1, 64)})
	}
	return out
}

// monthTicks marks an axis of Unix seconds at month starts (every 1st, 2nd,
// 3rd, 6th or 12th month, about n labels), labelled year-month, so that a
// step on 6 June is drawn after the June tick. Under two month starts it
// falls back to gonum's dated ticks.
type monthTicks struct{ n int }

func (m monthTicks) Ticks(lo, hi float64) []plot.Tick {
	starts, _ := axis.Months(time.Unix(int64(lo), 0), time.Unix(int64(hi), 0), m.n)
	if len(starts) < 2 {
		return plot.TimeTicks{Format: "2006-01-02"}.Ticks(lo, hi)
	}
	out := make([]plot.Tick, len(starts))
	for i, s := range starts {
		out[i] = plot.Tick{Value: float64(s.Unix()), Label: s.Format("2006-01")}
	}
	return out
}
