package main

import (
	"encoding/csv"
	"fmt"
	"io"
	"sort"
	"strconv"
	"text/tabwriter"
	"time"

	"dragdeck/feed/pipeline"
	"dragdeck/feed/store"
	"dragdeck/model"
)

// exportRow is one tail's factor in use, with its monitored level now.
type exportRow struct {
	Tail, Type string
	store.FactorSetting
	Level model.FactorLevel
	OK    bool // the tail has data in the run (Level holds its level)
}

// exportRows gives the factors in use, by tail, with the run's monitored
// levels and types.
func exportRows(inUse map[string]store.FactorSetting, r *pipeline.Result) []exportRow {
	out := make([]exportRow, 0, len(inUse))
	for tail, f := range inUse {
		row := exportRow{Tail: tail, FactorSetting: f}
		if a, ok := r.Tail(tail); ok {
			row.Type = a.Type
		}
		if tf, ok := r.Factor(tail); ok && len(tf.History) > 0 {
			row.Level, row.OK = tf.History[len(tf.History)-1], true
		}
		out = append(out, row)
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Tail < out[j].Tail })
	return out
}

// exportColumns are the CSV export's columns (README: the export).
var exportColumns = []string{"tail", "type", "factor_pct", "effective", "monitored_pct", "monitored_lo_pct", "monitored_hi_pct",
	"flights", "set_by", "basis"}

// writeExport writes the export whole or not at all (a temporary file
// renamed at the end).
func writeExport(path, format string, rows []exportRow, now time.Time) error {
	f, err := createAtomic(path)
	if err != nil {
		return err
	}
	defer f.Abort()
	if format == "json" {
		err = writeExportJSON(f, rows, now)
	} else {
		err = writeExportCSV(f, rows)
	}
	if err != nil {
		return err
	}
	return f.Commit()
}

func writeExportCSV(w io.Writer, rows []exportRow) error {
	cw := csv.NewWriter(w)
	cw.Write(exportColumns)
	for _, r := range rows {
		lv, lo, hi, n := "", "", "", ""
		if r.OK {
			lv, lo, hi, n = fmtF(r.Level.Pct, 2), fmtF(r.Level.Lo, 2), fmtF(r.Level.Hi, 2), strconv.Itoa(r.Level.Flights)
		}
		cw.Write([]string{csvSafe(r.Tail), csvSafe(r.Type), strconv.FormatFloat(r.Pct, 'f', -1, 64), r.Effective.Format(time.DateOnly),
			lv, lo, hi, n, csvSafe(r.By), csvSafe(r.Why)})
	}
	cw.Flush()
	return cw.Error()
}

// csvSafe keeps a text field from being read as a formula by a
// spreadsheet that opens the export: a leading =, +, - or @ gets a quote
// mark before it (the usual defence against CSV injection, common
// practice). encoding/csv quotes commas, quotes and line breaks, so every
// field stays one field.
func csvSafe(s string) string {
	if s != "" && (s[0] == '=' || s[0] == '+' || s[0] == '-' || s[0] == '@') {
		return "'" + s
	}
	return s
}

type exportJSON struct {
	Generated string            `json:"generated"`
	Caution   string            `json:"caution"`
	Factors   []exportEntryJSON `json:"factors"`
}

type exportEntryJSON struct {
	Tail             string     `json:"tail"`
	Type             string     `json:"type"`
	FactorPct        float64    `json:"factor_pct"`
	Effective        string     `json:"effective"`
	MonitoredPct     *float64   `json:"monitored_pct"`
	MonitoredCI95Pct []*float64 `json:"monitored_ci95_pct"`
	Flights          int        `json:"flights"`
	SetBy            string     `json:"set_by"`
	Basis            string     `json:"basis"`
}

func writeExportJSON(w io.Writer, rows []exportRow, now time.Time) error {
	j := exportJSON{Generated: now.Format(time.RFC3339), Caution: oneLine(factorCaution + " " + caution), Factors: []exportEntryJSON{}}
	for _, r := range rows {
		e := exportEntryJSON{Tail: r.Tail, Type: r.Type, FactorPct: r.Pct, Effective: r.Effective.Format(time.DateOnly),
			MonitoredCI95Pct: []*float64{nil, nil}, SetBy: r.By, Basis: r.Why}
		if r.OK {
			e.MonitoredPct, e.MonitoredCI95Pct, e.Flights = num(r.Level.Pct), []*float64{num(r.Level.Lo), num(r.Level.Hi)}, r.Level.Flights
		}
		j.Factors = append(j.Factors, e)
	}
	return writeJSON(w, j)
}

// factorBacktest runs the back-test on the PATHs or the store and prints
// it.
func factorBacktest(e *env, fs *flagSet, types typeChoice, c model.TrendConfig, policyOf func(*model.Roster) (*model.FactorPolicy, error),
	storePath, events string, paths []string, asJSON bool) error {
	r, err := factorPipeline(e, fs, types, c, policyOf, storePath, events, paths, true)
	if err != nil {
		return err
	}
	bt, ok := r.Backtest()
	if !ok {
		return usageErrorf("backtest: no usable snapshots")
	}
	if asJSON {
		pe := func(p model.PlanError) map[string]any {
			return map[string]any{"flights": p.Flights, "median_abs_kg_per_h": num(p.MedianAbs), "p95_abs_kg_per_h": num(p.P95Abs),
				"mean_kg_per_h": num(p.MeanSigned)}
		}
		return writeJSON(e.stdout, map[string]any{"months": bt.Months, "tail_changes": bt.Changes, "fleet_changes": bt.FleetChanges,
			"none": pe(bt.None), "fleet": pe(bt.Fleet), "per_tail": pe(bt.PerTail), "caution": oneLine(factorCaution)})
	}
	fmt.Fprintf(e.stdout, "Fuel-factor back-test: %s\n", r.Roster.Label())
	fmt.Fprintf(e.stdout, "%d flights over %d months; planned − burnt fuel per flight, kg per cruise\nhour; each month's factor is decided on the data before it\n", bt.None.Flights, bt.Months)
	fmt.Fprintln(e.stdout)
	tw := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "planning with\tmedian |error|\t95th pct |error|\tmean error\tchanges")
	row := func(name string, p model.PlanError, changes string) {
		fmt.Fprintf(tw, "%s\t%14.1f\t%16.1f\t%10s\t%7s\n", name, p.MedianAbs, p.P95Abs, signed(p.MeanSigned, 1), changes)
	}
	row("no factor", bt.None, "-")
	row("one fleet factor", bt.Fleet, strconv.Itoa(bt.FleetChanges))
	row("per-tail factors", bt.PerTail, strconv.Itoa(bt.Changes))
	tw.Flush()
	fmt.Fprintf(e.stdout, "\nmean error: + the plan carried fuel it did not need, − it planned too little.\n%s\n", factorCaution)
	return nil
}
