package main

import (
	"bytes"
	_ "embed"
	"fmt"
	"html/template"
	"io"
	"math"
	"regexp"
	"strings"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"dragdeck/feed/pipeline"
	"dragdeck/feed/store"
	"dragdeck/model"
)

// The weekly page: report --format html. It presents the pipeline's result
// as the JSON does (every number is the JSON's, rounded for reading), with
// the charts of --plots drawn as inline SVG, and from a store the changes
// since the last review and the work in progress. html/template escapes
// every text from the data; the charts are gonum/plot's SVG, whose text
// it escapes as XML.

//go:embed report.html.tmpl
var reportHTML string

var reportTemplate = template.Must(template.New("report").Funcs(template.FuncMap{
	"signed": func(v *float64, prec int) string {
		if v == nil {
			return "–"
		}
		return signed(*v, prec)
	},
	// thousands shows kg as tonnes (and money as thousands), signed
	// tonnes shows kg as tonnes, signed, to a tenth
	"tonnes": func(v any) string {
		switch x := v.(type) {
		case float64:
			return signed(x/1000, 1)
		case *float64:
			if x != nil {
				return signed(*x/1000, 1)
			}
		}
		return "–"
	},
	"thousands": func(v *float64) string {
		if v == nil {
			return "–"
		}
		return signed(*v/1000, 0)
	},
}).Parse(reportHTML))

// htmlPage is what the template draws.
type htmlPage struct {
	Title     string
	Source    string
	Types     string
	Period    string
	Generated string
	Tails     int
	Read      int
	Rejected  int
	Flagged   int
	Airframe  htmlTotals
	Engine    *htmlTotals
	HasEngine bool
	HasPrice  bool
	Rows      []htmlRow
	Overview  template.HTML
	Charts    []htmlChart
	Store     bool
	Review    *reviewJSON
	Work      []store.WorkItem
	Settings  model.TrendConfig
	Caution   string
	// The fuel factors: per tail, and the fleet's sums of the proposals.
	Factors       []htmlFactorRow
	Factor        fleetFactorJSON
	FactorCaution string
	FactorPeriod  string
}

// htmlFactorRow is a tail's fuel factor on the page: the report JSON's
// fuel_factor of the tail.
type htmlFactorRow struct {
	Tail, Type string
	factorJSON
	Lo, Hi *float64
}

type htmlTotals struct {
	FuelKg, CO2T, Money, MedianPct *float64
	Flagged                        int
}

type htmlRow struct {
	Tail, Type          string
	Flagged             bool
	Level, Drift        *float64
	LastStep            string
	Flags               []string
	EngineLevel         *float64
	EngineFlags         []string
	HasEngine           bool
	FuelKg, CO2T, Money *float64
	Work                string
}

type htmlChart struct {
	Tail string
	SVG  template.HTML
}

// writeReportHTML writes the page for r (in: where it came from, its work
// list and review when it is a store).
func writeReportHTML(w io.Writer, r *pipeline.Result, in *input, now time.Time) error {
	f, c := r.Fleet, r.Config
	pg := htmlPage{
		Title: "Fleet drag report", Source: in.source(), Types: r.Roster.Label(), Generated: now.UTC().Format("2006-01-02 15:04 UTC"),
		Tails: len(f.Tails), Read: r.Stats.Read, Rejected: r.Stats.Rejected, Flagged: f.Flagged,
		Airframe: htmlTotals{FuelKg: num(f.ExcessFuel), CO2T: num(f.CO2 / 1000), MedianPct: num(f.MedianRecentPct), Flagged: f.Flagged},
		HasPrice: c.FuelPrice > 0, Settings: c, Caution: caution, Store: in.store != nil,
	}
	if pg.HasPrice {
		pg.Airframe.Money = num(f.Money)
	}
	pg.Period = "no data"
	if !r.First.IsZero() {
		pg.Period = r.First.Format(time.DateOnly) + " to " + r.Last.Format(time.DateOnly) + " (UTC)"
	}
	if e := r.Engine; len(e.Tails) > 0 {
		pg.HasEngine = true
		pg.Engine = &htmlTotals{FuelKg: num(e.ExcessFuel), CO2T: num(e.CO2 / 1000), MedianPct: num(e.MedianRecentPct), Flagged: e.Flagged}
		if pg.HasPrice {
			pg.Engine.Money = num(e.Money)
		}
	}
	for _, a := range f.Tails {
		row := htmlRow{Tail: a.Tail, Type: a.Type, Level: num(a.RecentPct), Drift: num(a.Drift.Slope), Flags: a.Flags,
			FuelKg: num(a.ExcessFuel), CO2T: num(a.CO2 / 1000), Work: "–"}
		if pg.HasPrice {
			row.Money = num(a.Money)
		}
		if k := len(a.Steps); k > 0 {
			s := a.Steps[k-1]
			row.LastStep = s.Time.Format(time.DateOnly) + " " + signed(s.SizePct, 1) + " pp"
		}
		if e, ok := r.EngineTail(a.Tail); ok {
			row.HasEngine, row.EngineLevel, row.EngineFlags = true, num(e.RecentPct), e.Flags
		}
		row.Flagged = len(row.Flags) > 0 || len(row.EngineFlags) > 0
		if items := in.work[a.Tail]; len(items) > 0 {
			row.Work = fmt.Sprintf("#%d %s", items[len(items)-1].ID, items[len(items)-1].Status)
		}
		pg.Rows = append(pg.Rows, row)
		fj := newFactorJSON(r.Factors[a.Tail])
		pg.Factors = append(pg.Factors, htmlFactorRow{Tail: a.Tail, Type: a.Type, factorJSON: fj, Lo: fj.MonitoredCI95Pct[0], Hi: fj.MonitoredCI95Pct[1]})
		if fj.Period > pg.FactorPeriod {
			pg.FactorPeriod = fj.Period
		}
	}
	pg.Factor, pg.FactorCaution = newFleetFactorJSON(r), factorCaution
	if len(f.Tails) > 0 {
		p, n := fleetPlot(f)
		svg, err := plotSVG(p, 20*vg.Centimeter, fleetPlotHeight(n))
		if err != nil {
			return err
		}
		pg.Overview = svg
	}
	for _, a := range f.Tails {
		e, hasE := r.EngineTail(a.Tail)
		if len(a.Flags) == 0 && !(hasE && len(e.Flags) > 0) || len(a.Flights) == 0 {
			continue
		}
		svg, err := plotSVG(tailPlot(a, c), 20*vg.Centimeter, 9*vg.Centimeter)
		if err != nil {
			return err
		}
		pg.Charts = append(pg.Charts, htmlChart{Tail: a.Tail, SVG: svg})
	}
	if in.store != nil {
		rv, err := newReview(in.store, r)
		if err != nil {
			return err
		}
		pg.Review = &rv
		items, err := in.store.Work()
		if err != nil {
			return usageErrorf("--store: %v", err)
		}
		for _, it := range items {
			if !store.Final(it.Status) {
				pg.Work = append(pg.Work, it)
			}
		}
	}
	var buf bytes.Buffer
	if err := reportTemplate.Execute(&buf, pg); err != nil {
		return err
	}
	_, err := w.Write(buf.Bytes())
	return err
}

var xmlProlog = regexp.MustCompile(`^\s*<\?xml[^>]*\?>\s*(<!DOCTYPE[^>]*>\s*)?`)

// plotSVG draws p as SVG for inline use: without the XML prolog, and
// scaling to the page's width.
func plotSVG(p *plot.Plot, w, h vg.Length) (template.HTML, error) {
	wt, err := p.WriterTo(w, h, "svg")
	if err != nil {
		return "", err
	}
	var b bytes.Buffer
	if _, err := wt.WriteTo(&b); err != nil {
		return "", err
	}
	s := xmlProlog.ReplaceAllString(b.String(), "")
	// gonum gives width and height in points; a viewBox lets the page scale it
	s = strings.Replace(s, "<svg ", fmt.Sprintf(`<svg role="img" viewBox="0 0 %.0f %.0f" `, math.Ceil(w.Points()), math.Ceil(h.Points())), 1)
	return template.HTML(s), nil // gonum's SVG: the data's text in it is XML-escaped
}
