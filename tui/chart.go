package tui

import (
	"math"
	"strings"

	"github.com/NimbleMarkets/ntcharts/canvas"
	"github.com/NimbleMarkets/ntcharts/canvas/graph"
	"github.com/NimbleMarkets/ntcharts/linechart"
	"github.com/charmbracelet/lipgloss"

	"dragdeck/model"
)

// series is one thing drawn on a chart.
type series struct {
	points [][2]float64 // x, y
	line   bool         // join the points (else dots)
	style  lipgloss.Style
}

// vmark is a vertical marker across the whole chart.
type vmark struct {
	x     float64
	style lipgloss.Style
}

// chartSpec describes a chart with fixed ranges (the chart library's
// auto-ranging is slow and depends on the clock, so it is not used).
type chartSpec struct {
	w, h                   int
	minX, maxX, minY, maxY float64
	xFmt, yFmt             linechart.LabelFormatter
	xTicks                 []tick // labels at these x values (instead of xFmt's evenly spaced ones)
	yTicks                 []tick // labels at these y values (instead of yFmt's every other row)
	series                 []series
	marks                  []vmark
	axis                   lipgloss.Style
}

// render draws the chart to a string. Too small a chart, or an empty range,
// gives a one-line placeholder instead of a panic.
func (c chartSpec) render(empty string) string {
	if c.w < 12 || c.h < 4 || !(c.maxX > c.minX) || !(c.maxY > c.minY) || math.IsNaN(c.minY) || math.IsNaN(c.maxY) {
		return placeholder(c.w, c.h, empty)
	}
	xStep, xFmt := 3, c.xFmt
	var gw int
	if c.xTicks != nil || xFmt == nil {
		// The chart asks for a label at every column; a tick's label goes
		// to the column that holds its value, so labels sit at their
		// values (the library skips one that would overlap the last).
		xStep = 1
		xFmt = func(i int, _ float64) string {
			for _, t := range c.xTicks {
				if col := int(math.Floor((t.v - c.minX) / (c.maxX - c.minX) * float64(gw))); col == i {
					return t.label
				}
			}
			return ""
		}
	}
	yStep, yFmt := 2, c.yFmt
	var gh int
	if c.yTicks != nil {
		// Likewise a label on every row, a tick's label on the row nearest
		// to its value.
		yStep = 1
		yFmt = func(_ int, v float64) string {
			half := (c.maxY - c.minY) / float64(max(gh, 1)) / 2
			for _, t := range c.yTicks {
				if v > t.v-half && v <= t.v+half {
					return t.label
				}
			}
			return ""
		}
	}
	lc := linechart.New(c.w, c.h, c.minX, c.maxX, c.minY, c.maxY,
		linechart.WithXYSteps(xStep, yStep),
		linechart.WithXLabelFormatter(xFmt),
		linechart.WithYLabelFormatter(yFmt),
		linechart.WithStyles(c.axis, c.axis, c.axis))
	gw, gh = lc.GraphWidth(), lc.GraphHeight()
	lc.DrawXYAxisAndLabel()
	if gw < 2 || gh < 2 {
		return placeholder(c.w, c.h, empty)
	}
	startX := 0
	if lc.YStep() > 0 {
		startX = lc.Origin().X + 1
	}
	clip := func(p [2]float64) canvas.Float64Point {
		return canvas.Float64Point{X: math.Max(c.minX, math.Min(c.maxX, p[0])), Y: math.Max(c.minY, math.Min(c.maxY, p[1]))}
	}
	for _, m := range c.marks {
		if m.x < c.minX || m.x > c.maxX {
			continue
		}
		g := graph.NewBrailleGrid(gw, gh, c.minX, c.maxX, c.minY, c.maxY)
		for _, p := range graph.GetLinePoints(g.GridPoint(clip([2]float64{m.x, c.minY})), g.GridPoint(clip([2]float64{m.x, c.maxY}))) {
			g.Set(p)
		}
		graph.DrawBraillePatterns(&lc.Canvas, canvas.Point{X: startX, Y: 0}, g.BraillePatterns(), m.style)
	}
	for _, s := range c.series {
		g := graph.NewBrailleGrid(gw, gh, c.minX, c.maxX, c.minY, c.maxY)
		for i, p := range s.points {
			if math.IsNaN(p[1]) || p[0] < c.minX || p[0] > c.maxX {
				continue
			}
			gp := g.GridPoint(clip(p))
			if s.line && i > 0 && !math.IsNaN(s.points[i-1][1]) && s.points[i-1][0] >= c.minX {
				for _, q := range graph.GetLinePoints(g.GridPoint(clip(s.points[i-1])), gp) {
					g.Set(q)
				}
				continue
			}
			g.Set(gp)
		}
		graph.DrawBraillePatterns(&lc.Canvas, canvas.Point{X: startX, Y: 0}, g.BraillePatterns(), s.style)
	}
	return lc.View()
}

// placeholder fills a w × h area with one centred message.
func placeholder(w, h int, msg string) string {
	w, h = max(w, 1), max(h, 1)
	lines := make([]string, h)
	for i := range lines {
		lines[i] = strings.Repeat(" ", w)
	}
	lines[h/2] = lipgloss.PlaceHorizontal(w, lipgloss.Center, truncate(msg, w))
	return strings.Join(lines, "\n")
}

// span returns the min and max of vals with a margin of frac of the range
// (and at least pad), ignoring NaN.
func span(vals []float64, frac, pad float64) (float64, float64) {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range vals {
		if !math.IsNaN(v) {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	if math.IsInf(lo, 0) {
		return 0, 1
	}
	m := math.Max((hi-lo)*frac, pad)
	return lo - m, hi + m
}

// sparkRunes are the eight heights of a sparkline cell.
var sparkRunes = []rune("▁▂▃▄▅▆▇█")

// sparkline draws vals as width cells, each the median of its share of the
// values, on the common scale lo…hi (so that tails can be compared). The
// result has no colour codes, so that it can sit in a table cell.
func sparkline(vals []float64, width int, lo, hi float64) string {
	if width <= 0 || len(vals) == 0 || !(hi > lo) {
		return strings.Repeat(" ", max(width, 0))
	}
	out := make([]rune, width)
	for i := range out {
		a := i * len(vals) / width
		b := max((i+1)*len(vals)/width, a+1)
		if a >= len(vals) {
			out[i] = ' '
			continue
		}
		v := model.Median(vals[a:min(b, len(vals))])
		k := int(math.Round((v - lo) / (hi - lo) * float64(len(sparkRunes)-1)))
		out[i] = sparkRunes[max(0, min(len(sparkRunes)-1, k))]
	}
	return string(out)
}

// thin keeps at most about 2 × buckets of pts (in ascending x): per bucket
// of equal x width, the lowest and the highest point, in x order. A chart
// cannot show more than its dots anyway, and a long live flight would
// otherwise cost a frame per thousand rows; the drawn shape is the same.
func thin(pts [][2]float64, buckets int) [][2]float64 {
	if buckets < 1 || len(pts) <= 2*buckets {
		return pts
	}
	x0, x1 := pts[0][0], pts[len(pts)-1][0]
	if !(x1 > x0) {
		return pts
	}
	out := make([][2]float64, 0, 2*buckets)
	lo, hi, cur := -1, -1, -1
	flush := func() {
		switch {
		case lo < 0:
		case lo == hi:
			out = append(out, pts[lo])
		case lo < hi:
			out = append(out, pts[lo], pts[hi])
		default:
			out = append(out, pts[hi], pts[lo])
		}
	}
	for i, p := range pts {
		k := min(buckets-1, int(float64(buckets)*(p[0]-x0)/(x1-x0)))
		if k != cur {
			flush()
			lo, hi, cur = i, i, k
			continue
		}
		if p[1] < pts[lo][1] {
			lo = i
		}
		if p[1] > pts[hi][1] {
			hi = i
		}
	}
	flush()
	return out
}
