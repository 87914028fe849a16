package main

import (
	"bytes"
	"encoding/json"
	"flag"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"golang.org/x/net/html"

	"dragdeck/feed"
	"dragdeck/feed/pipeline"
	"dragdeck/model"
)

// testdataDir is this package's golden files, found before a test moves
// into a temporary folder.
var testdataDir, _ = filepath.Abs("testdata")

const hostileTail = `<script>x</script>&"'`

// hostileFleet is a demo fleet (not the built-in seed) whose most severe
// tail (flagged, so charted too) is renamed to a name full of markup, in
// its snapshots, events and fleet file.
func hostileFleet(t *testing.T) (dir, snaps, events string) {
	t.Helper()
	dir = demoFleet(t, "9", "240", "61")
	snaps, events = filepath.Join(dir, "snapshots", "fleet.csv"), filepath.Join(dir, "events.csv")
	fleet := filepath.Join(dir, "fleet.toml")
	_, js, _ := runArgs("report", "--format", "json", "--fleet", fleet, snaps)
	var rep struct {
		Tails []struct {
			Tail  string   `json:"tail"`
			Flags []string `json:"flags"`
		} `json:"tails"`
	}
	json.Unmarshal([]byte(js), &rep)
	if len(rep.Tails) == 0 || len(rep.Tails[0].Flags) == 0 {
		t.Fatal("no flagged tail in the demo")
	}
	victim := rep.Tails[0].Tail
	quoted := `"` + strings.ReplaceAll(hostileTail, `"`, `""`) + `"`
	for _, p := range []string{snaps, events} {
		b, _ := os.ReadFile(p)
		os.WriteFile(p, []byte(strings.ReplaceAll(string(b), ","+victim+",", ","+quoted+",")), 0o644)
	}
	b, _ := os.ReadFile(fleet)
	os.WriteFile(fleet, []byte(strings.ReplaceAll(string(b), `id = "`+victim+`"`, `id = "`+strings.ReplaceAll(hostileTail, `"`, `\"`)+`"`)), 0o644)
	return dir, snaps, events
}

// attr returns a node's attribute.
func attr(n *html.Node, name string) (string, bool) {
	for _, a := range n.Attr {
		if a.Key == name {
			return a.Val, true
		}
	}
	return "", false
}

func walk(n *html.Node, fn func(*html.Node)) {
	fn(n)
	for c := n.FirstChild; c != nil; c = c.NextSibling {
		walk(c, fn)
	}
}

func text(n *html.Node) string {
	var b strings.Builder
	walk(n, func(c *html.Node) {
		if c.Type == html.TextNode {
			b.WriteString(c.Data)
		}
	})
	return b.String()
}

// The page parses; it fetches nothing (no src, no href but the SVG
// namespaces, no script, no url()); every tail's numbers are the JSON
// report's, rounded as shown; the fleet's total excess fuel is the JSON's;
// every flagged tail has a chart; the hostile tail name is text, never
// markup; the caution is there.
func TestReportHTML(t *testing.T) {
	dir, snaps, events := hostileFleet(t)
	fleet := filepath.Join(dir, "fleet.toml")
	args := []string{"report", "--fleet", fleet, "--events", events, snaps}
	code, page, errs := runArgs(append(args, "--format", "html")...)
	if code != 0 {
		t.Fatalf("exit %d %s", code, errs)
	}
	_, js, _ := runArgs(append(args, "--format", "json")...)
	var rep struct {
		Fleet struct {
			ExcessFuel *float64 `json:"excess_fuel_kg_per_year"`
			Engine     *struct {
				ExcessFuel *float64 `json:"excess_fuel_kg_per_year"`
			} `json:"engine"`
		} `json:"fleet"`
		Tails []struct {
			Tail         string   `json:"tail"`
			DeviationPct *float64 `json:"deviation_pct"`
			Drift        *float64 `json:"drift_pct_per_100d"`
			Fuel         *float64 `json:"excess_fuel_kg_per_year"`
			Flags        []string `json:"flags"`
			Engine       *struct {
				DeviationPct *float64 `json:"deviation_pct"`
				Flags        []string `json:"flags"`
			} `json:"engine"`
			Factor struct {
				Monitored *float64 `json:"monitored_pct"`
				Proposed  *float64 `json:"proposed_pct"`
				PlanFuel  *float64 `json:"plan_fuel_kg_per_year"`
			} `json:"fuel_factor"`
		} `json:"tails"`
	}
	var fleetFactor struct {
		Fleet struct {
			F fleetFactorJSON `json:"fuel_factor"`
		} `json:"fleet"`
	}
	json.Unmarshal([]byte(js), &fleetFactor)
	if err := json.Unmarshal([]byte(js), &rep); err != nil {
		t.Fatal(err)
	}
	if strings.Contains(page, hostileTail) || strings.Contains(page, "<script") {
		t.Error("the hostile tail name is in the page unescaped")
	}
	doc, err := html.Parse(strings.NewReader(page))
	if err != nil {
		t.Fatal(err)
	}
	rows, factorRows := map[string]map[string]string{}, map[string]map[string]string{}
	var order []string
	charts := map[string]bool{}
	svgs := 0
	ids := map[string]string{}
	walk(doc, func(n *html.Node) {
		if n.Type != html.ElementNode {
			return
		}
		for _, a := range n.Attr {
			switch {
			case a.Key == "src", a.Key == "srcset", a.Key == "href" && !strings.HasPrefix(a.Val, "#"):
				t.Errorf("<%s %s=%q>: an external reference", n.Data, a.Key, a.Val)
			case a.Key == "xmlns" || a.Key == "xmlns:xlink":
			case strings.Contains(a.Val, "url(") && !strings.Contains(a.Val, "url(#"):
				t.Errorf("<%s %s=%q>: a url()", n.Data, a.Key, a.Val)
			}
		}
		switch n.Data {
		case "script", "link", "img", "iframe", "object", "embed":
			t.Errorf("a <%s> element", n.Data)
		case "style":
			if s := text(n); strings.Contains(s, "url(") || strings.Contains(s, "@import") {
				t.Error("the style sheet fetches something")
			}
		case "svg":
			svgs++
		case "figure":
			if tail, ok := attr(n, "data-tail"); ok {
				charts[tail] = true
			}
		case "tr":
			if tail, ok := attr(n, "data-tail"); ok {
				cells := map[string]string{}
				walk(n, func(c *html.Node) {
					if k, ok := attr(c, "data-k"); ok {
						cells[k] = text(c)
					}
				})
				rows[tail] = cells
				order = append(order, tail)
			}
			if tail, ok := attr(n, "data-factor-tail"); ok {
				cells := map[string]string{}
				walk(n, func(c *html.Node) {
					if k, ok := attr(c, "data-k"); ok {
						cells[k] = text(c)
					}
				})
				factorRows[tail] = cells
			}
		}
		if id, ok := attr(n, "id"); ok {
			ids[id] = text(n)
		}
	})
	shown := func(s string) float64 {
		s = strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(s), "t"))
		v, err := strconv.ParseFloat(strings.ReplaceAll(s, "−", "-"), 64)
		if err != nil {
			return math.NaN()
		}
		return v
	}
	near := func(got string, want *float64, tol float64) bool {
		if want == nil {
			return strings.TrimSpace(got) == "–"
		}
		return math.Abs(shown(got)-*want) <= tol
	}
	if !near(ids["fuel-airframe"], scaled(rep.Fleet.ExcessFuel, 1e-3), 0.5) {
		t.Errorf("fleet excess fuel %q, JSON %v kg", ids["fuel-airframe"], *rep.Fleet.ExcessFuel)
	}
	if e := rep.Fleet.Engine; e != nil && !near(ids["fuel-engine"], scaled(e.ExcessFuel, 1e-3), 0.5) {
		t.Errorf("engine excess fuel %q, JSON %v kg", ids["fuel-engine"], *e.ExcessFuel)
	}
	if len(order) != len(rep.Tails) {
		t.Fatalf("%d rows, %d tails in the JSON", len(order), len(rep.Tails))
	}
	hostileSeen := false
	for i, jt := range rep.Tails {
		if order[i] != jt.Tail {
			t.Errorf("row %d is %q, the JSON's %q (same severity order)", i, order[i], jt.Tail)
		}
		hostileSeen = hostileSeen || jt.Tail == hostileTail
		c := rows[jt.Tail]
		if !near(c["level"], jt.DeviationPct, 0.005) || !near(c["drift"], jt.Drift, 0.005) || !near(c["fuel"], scaled(jt.Fuel, 1e-3), 0.5) {
			t.Errorf("%s: row %v, JSON level %v drift %v fuel %v", jt.Tail, c, jt.DeviationPct, jt.Drift, jt.Fuel)
		}
		if jt.Engine != nil && !near(c["engine"], jt.Engine.DeviationPct, 0.005) {
			t.Errorf("%s: engine %q, JSON %v", jt.Tail, c["engine"], jt.Engine.DeviationPct)
		}
		// the fuel factor: the JSON's monitored and proposed factor, the plan's fuel in tonnes
		fc := factorRows[jt.Tail]
		if !near(fc["monitored"], jt.Factor.Monitored, 0.005) || !near(fc["proposed"], jt.Factor.Proposed, 0.05) || !near(fc["plan"], scaled(jt.Factor.PlanFuel, 1e-3), 0.05) {
			t.Errorf("%s: fuel factor row %v, JSON %+v", jt.Tail, fc, jt.Factor)
		}
		flagged := len(jt.Flags) > 0 || jt.Engine != nil && len(jt.Engine.Flags) > 0
		if flagged != charts[jt.Tail] {
			t.Errorf("%s: flagged %v, chart %v", jt.Tail, flagged, charts[jt.Tail])
		}
	}
	ff := fleetFactor.Fleet.F
	if ids["factor-proposals"] != strconv.Itoa(ff.Proposals) || math.Abs(shown(ids["factor-in"])-ff.PlanFuelInKgPerYear/1000) > 0.05 ||
		math.Abs(shown(ids["factor-out"])-ff.PlanFuelOutKgPerYear/1000) > 0.05 {
		t.Errorf("fuel factor totals %q %q %q, JSON %+v", ids["factor-proposals"], ids["factor-in"], ids["factor-out"], ff)
	}
	if len(factorRows) != len(rep.Tails) {
		t.Errorf("%d fuel factor rows, %d tails", len(factorRows), len(rep.Tails))
	}
	if !hostileSeen || !charts[hostileTail] {
		t.Errorf("the hostile tail is not in the report, or has no chart (%v)", hostileSeen)
	}
	if svgs != len(charts)+1 {
		t.Errorf("%d inline SVG, want %d charts and the overview", svgs, len(charts))
	}
	if !strings.Contains(text(doc), "not approved performance data") || !strings.Contains(text(doc), "engineering proposal for the operator's approved") {
		t.Error("no caution, or none beside the fuel factors")
	}
}

// From a store, the page has the changes since the last review and the
// work in progress, with a note's markup escaped.
func TestReportHTMLStore(t *testing.T) {
	dir := demoFleet(t, "6", "200", "62")
	db := filepath.Join(dir, "s.db")
	importJSONOf(t, "--store", db, filepath.Join(dir, "snapshots"), filepath.Join(dir, "events.csv"), filepath.Join(dir, "fleet.toml"))
	runArgs("worklist", "--store", db, "add", "DD102", "--reason", "<i>seals</i> & more", "--flag", "level")
	code, page, errs := runArgs("report", "--store", db, "--format", "html")
	if code != 0 {
		t.Fatal(errs)
	}
	for _, want := range []string{"Since the last review", "No review marked yet", "Work in progress", "&lt;i&gt;seals&lt;/i&gt; &amp; more", "#1 open"} {
		if !strings.Contains(page, want) {
			t.Errorf("the page lacks %q", want)
		}
	}
	if strings.Contains(page, "<i>seals") {
		t.Error("a note's markup is in the page")
	}
}

var updateGolden = flag.Bool("update", false, "rewrite the golden files")

// The page of a small fleet, kept as a golden file (written at a fixed
// time; rerun with -update after a deliberate change and look at it:
// testdata/checks/render_html.sh renders it).
func TestReportHTMLGolden(t *testing.T) {
	dir := demoFleet(t, "4", "150", "9")
	t.Chdir(dir)
	ros, err := feed.LoadFleet("fleet.toml")
	if err != nil {
		t.Fatal(err)
	}
	evs, _ := feed.ReadEvents("events.csv")
	in := &input{roster: ros, files: []string{filepath.Join("snapshots", "fleet.csv")}, events: evs}
	r := pipeline.Run(in.pipelineInput(model.DefaultTrendConfig()))
	var b bytes.Buffer
	if err := writeReportHTML(&b, r, in, time.Date(2026, 12, 1, 8, 0, 0, 0, time.UTC)); err != nil {
		t.Fatal(err)
	}
	golden := filepath.Join(testdataDir, "report-small.html")
	if *updateGolden {
		os.MkdirAll(filepath.Dir(golden), 0o755)
		if err := os.WriteFile(golden, b.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("%v (run with -update to write it)", err)
	}
	if !bytes.Equal(b.Bytes(), want) {
		t.Errorf("the page differs from %s (rerun with -update after a deliberate change)", golden)
	}
}
