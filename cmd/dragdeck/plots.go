package main

import (
	"fmt"
	"hash/fnv"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"dragdeck/model"
)

// Plot colours: one meaning each, the same in every picture.
var (
	colPoints  = color.RGBA{150, 150, 150, 255} // per-flight deviations
	colMedian  = color.RGBA{30, 90, 160, 255}   // rolling median
	colDrift   = color.RGBA{200, 110, 0, 255}   // drift line, growth
	colStep    = color.RGBA{190, 30, 45, 255}   // steps up, flagged tails
	colImprove = color.RGBA{30, 140, 70, 255}   // steps down (improvements)
	colEvent   = color.RGBA{110, 70, 160, 255}  // maintenance events
	colSteady  = color.RGBA{120, 140, 160, 255} // unflagged tails
)

// maxOverview is the number of tails fleet.png shows at most: the most
// severe, so that the picture stays a readable size on any fleet.
const maxOverview = 60

// writePlots writes one PNG per tail with flights (tail-NAME.png, names
// from plotNames) and, when there are tails, fleet.png into dir. It
// returns how many it wrote.
func writePlots(dir string, f model.Fleet, c model.TrendConfig, inputs []string) (int, error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return 0, err
	}
	var in []os.FileInfo
	for _, p := range inputs {
		if fi, err := os.Stat(p); err == nil {
			in = append(in, fi)
		}
	}
	// An input file in the place of a picture is never written over.
	save := func(p *plot.Plot, w, h vg.Length, path string) error {
		if fi, err := os.Stat(path); err == nil {
			for _, i := range in {
				if os.SameFile(fi, i) {
					return fmt.Errorf("%s is one of the input files; writing it would destroy it", path)
				}
			}
		}
		return p.Save(w, h, path)
	}
	tails := make([]string, len(f.Tails))
	for i, a := range f.Tails {
		tails[i] = a.Tail
	}
	names := plotNames(tails)
	n := 0
	for _, a := range f.Tails {
		if len(a.Flights) == 0 {
			continue
		}
		p := tailPlot(a, c)
		if err := save(p, 24*vg.Centimeter, 12*vg.Centimeter, filepath.Join(dir, names[a.Tail])); err != nil {
			return n, err
		}
		n++
	}
	if len(f.Tails) == 0 {
		return n, nil
	}
	p, shown := fleetPlot(f)
	return n + 1, save(p, 20*vg.Centimeter, fleetPlotHeight(shown), filepath.Join(dir, "fleet.png"))
}

// plotNames gives each tail a file name of its own: "tail-" and the tail
// with every character but letters, digits, '-' and '_' replaced by '_',
// cut to 60 bytes. Where that changed the name, or two names would meet
// (case aside, for file systems that ignore it), the name gets 8 hex
// digits of a hash of the tail, so DD 101, DD.101 and DD/101 stay apart.
// The prefix keeps a tail called "fleet" off the overview.
func plotNames(tails []string) map[string]string {
	out := map[string]string{}
	used := map[string]bool{}
	sorted := append([]string(nil), tails...)
	sort.Strings(sorted) // the same names whatever the order of the tails
	for _, t := range sorted {
		safe := safeName(t)
		if safe != t || used[strings.ToLower(safe)] {
			h := fnv.New32a()
			h.Write([]byte(t))
			safe = fmt.Sprintf("%s-%08x", safe, h.Sum32())
		}
		used[strings.ToLower(safe)] = true
		out[t] = "tail-" + safe + ".png"
	}
	return out
}

// safeName keeps a tail name usable as a file name, cut to 60 bytes.
func safeName(s string) string {
	b := []byte(s)
	if len(b) > 60 {
		b = b[:60]
	}
	for i, c := range b {
		if !(c >= 'A' && c <= 'Z' || c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '-' || c == '_') {
			b[i] = '_'
		}
	}
	return string(b)
}

func unix(tr model.TailTrend, i int) float64 { return float64(tr.Flights[i].UnixNano / 1e9) }

// tailPlot draws what the pipeline found for one tail: its flights, their
// rolling median, the drift line, the steps and the events.
func tailPlot(a model.TailAssessment, c model.TrendConfig) *plot.Plot {
	p := plot.New()
	name := a.Tail
	if r := []rune(name); len(r) > 40 {
		name = string(r[:39]) + "…"
	}
	title := fmt.Sprintf("%s: drag deviation per flight", name)
	if len(a.Flags) > 0 {
		title += "  (flags: " + strings.Join(a.Flags, ", ") + ")"
	}
	p.Title.Text = title
	p.Y.Label.Text = "drag deviation from baseline, %"
	p.X.Tick.Marker = monthTicks{8}
	p.Y.Tick.Marker = roundTicks{6}
	p.Add(plotter.NewGrid())

	n := len(a.Flights)
	pts := make(plotter.XYs, n)
	ys := make([]float64, n)
	for i, fl := range a.Flights {
		pts[i] = plotter.XY{X: unix(a.TailTrend, i), Y: fl.DevPct}
		ys[i] = fl.DevPct
	}
	sc, _ := plotter.NewScatter(pts)
	sc.GlyphStyle = draw.GlyphStyle{Color: colPoints, Radius: vg.Points(1.2), Shape: draw.CircleGlyph{}}
	p.Add(sc)
	p.Legend.Add("flights", sc)

	mline := make(plotter.XYs, n)
	for i, r := range a.Rolling() {
		mline[i] = plotter.XY{X: pts[i].X, Y: r}
	}
	ml, _ := plotter.NewLine(mline)
	ml.Color, ml.Width = colMedian, vg.Points(1.5)
	p.Add(ml)
	p.Legend.Add(fmt.Sprintf("rolling median (%d flights)", 2*c.RollingHalf+1), ml)

	lo, hi := minMax(ys)
	if !math.IsNaN(a.Drift.Slope) {
		x0, x1 := float64(a.DriftFrom.Unix()), float64(a.DriftTo.Unix())
		d, _ := plotter.NewLine(plotter.XYs{{X: x0, Y: a.DriftAt(a.DriftFrom)}, {X: x1, Y: a.DriftAt(a.DriftTo)}})
		d.Color, d.Width = colDrift, vg.Points(2.5)
		p.Add(d)
		p.Legend.Add(fmt.Sprintf("drift %+.2f pp/100 d", a.Drift.Slope), d)
	}
	for _, s := range a.Steps {
		c := colStep
		if s.SizePct < 0 {
			c = colImprove
		}
		v := vline(float64(s.Time.Unix()), lo, hi, c, nil)
		p.Add(v)
		p.Legend.Add(fmt.Sprintf("step %s %+.1f pp", s.Time.Format("2006-01-02"), s.SizePct), v)
	}
	for _, e := range a.Events {
		v := vline(float64(e.Time.Unix()), lo, hi, colEvent, []vg.Length{vg.Points(4), vg.Points(3)})
		p.Add(v)
		p.Legend.Add(fmt.Sprintf("%s %s", e.Kind, e.Time.Format("2006-01-02")), v)
	}
	// Room above the data for the legend, a line per entry.
	entries := 2 + len(a.Steps) + len(a.Events)
	if !math.IsNaN(a.Drift.Slope) {
		entries++
	}
	p.Y.Min, p.Y.Max = lo-0.05*(hi-lo), hi+(hi-lo)*0.07*float64(entries+1)
	p.Legend.Top, p.Legend.Left = true, true
	return p
}

func vline(x, lo, hi float64, c color.Color, dashes []vg.Length) *plotter.Line {
	l, _ := plotter.NewLine(plotter.XYs{{X: x, Y: lo}, {X: x, Y: hi}})
	l.Color, l.Width, l.Dashes = c, vg.Points(1.5), dashes
	return l
}

func minMax(v []float64) (float64, float64) {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, x := range v {
		lo, hi = math.Min(lo, x), math.Max(hi, x)
	}
	return lo, hi
}

// fleetPlotHeight is the height of the fleet picture for its number of
// tails: a readable line per tail.
func fleetPlotHeight(tails int) vg.Length { return vg.Length(6+0.45*float64(tails)) * vg.Centimeter }

// fleetPlot draws each tail's recent deviation as a horizontal bar, highest
// at the top, flagged tails in the flag colour.
func fleetPlot(f model.Fleet) (*plot.Plot, int) {
	p := plot.New()
	p.Title.Text = fmt.Sprintf("Fleet: recent drag deviation per tail (%d flagged)", f.Flagged)
	p.X.Label.Text = "recent drag deviation from baseline, %"
	p.X.Tick.Marker = roundTicks{8}
	p.Add(plotter.NewGrid())
	tails := append([]model.TailAssessment(nil), f.Tails...)
	if len(tails) > maxOverview { // the most severe (the fleet's order)
		p.Title.Text = fmt.Sprintf("Fleet: the %d most severe of %d tails, recent drag deviation (%d flagged)", maxOverview, len(tails), f.Flagged)
		tails = tails[:maxOverview]
	}
	sort.SliceStable(tails, func(i, j int) bool { return nanLowF(tails[i].RecentPct) < nanLowF(tails[j].RecentPct) })
	names := make([]string, len(tails))
	for i, a := range tails {
		names[i] = a.Tail
		if r := []rune(a.Tail); len(r) > 24 {
			names[i] = string(r[:23]) + "…"
		}
		c := colSteady
		if len(a.Flags) > 0 {
			c = colStep
		}
		v := a.RecentPct
		if math.IsNaN(v) {
			v = 0
		}
		bar, _ := plotter.NewBarChart(plotter.Values{v}, vg.Points(7))
		bar.Horizontal, bar.Color, bar.LineStyle.Width, bar.XMin = true, c, 0, float64(i)
		p.Add(bar)
	}
	if !math.IsNaN(f.MedianRecentPct) {
		l, _ := plotter.NewLine(plotter.XYs{{X: f.MedianRecentPct, Y: -0.5}, {X: f.MedianRecentPct, Y: float64(len(tails)) - 0.5}})
		l.Color, l.Dashes = colMedian, []vg.Length{vg.Points(4), vg.Points(3)}
		p.Add(l)
		p.Legend.Add(fmt.Sprintf("fleet median %+.2f %%", f.MedianRecentPct), l)
	}
	p.NominalY(names...)
	return p, len(tails)
}

func nanLowF(v float64) float64 {
	if math.IsNaN(v) {
		return math.Inf(-1)
	}
	return v
}
