package demo

import (
	_ "embed"
	"fmt"
	"math"
	"sort"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// Group is the part of the demo fleet that flies one type.
type Group struct {
	Name   string      // the type's name in the fleet file, e.g. "DD-200"
	Type   *model.Type // the type flown
	Share  float64     // share of the fleet's tails (relative to the other groups')
	Prefix string      // first letters of the group's tail ids
	// RetrofitFrom names another group: one of its steady tails is
	// retrofitted to this group's type half-way through the period (a
	// wingtip-device variant, say), from that day on.
	RetrofitFrom string
	// CruiseHours is the group's cruise hours a year for the fleet file
	// (0: the command line's).
	CruiseHours float64
}

// The invented types of the built-in mixed fleet beside the demo type:
// the demo twin's wingtip-device variant and a long-range twin.
var (
	//go:embed types/dd200w.toml
	wingtipTOML []byte
	//go:embed types/dw300.toml
	wideTOML []byte
)

// MixedGroups is the built-in demo fleet: the invented DD-200 twin, its
// wingtip-device variant DD-200W (with one DD-200 retrofitted half-way) and
// the invented DW-300 long-range twin, all with thrust tables.
func MixedGroups() []Group {
	parse := func(name string, b []byte) *model.Type {
		t, err := feed.ParseType(name, b)
		if err != nil {
			panic("demo: built-in type " + name + " is invalid: " + err.Error()) // a build defect, covered by tests
		}
		return t
	}
	return []Group{
		{Name: "DD-200", Type: feed.DemoType(), Share: 0.5, Prefix: "DD"},
		{Name: "DD-200W", Type: parse("types/dd200w.toml (built in)", wingtipTOML), Share: 0.2, Prefix: "DD", RetrofitFrom: "DD-200"},
		{Name: "DW-300", Type: parse("types/dw300.toml (built in)", wideTOML), Share: 0.3, Prefix: "DW", CruiseHours: 4200},
	}
}

// groups returns the config's groups: Groups, or one group of Type, or
// the built-in mixed fleet when neither is given.
func (c Config) groups() []Group {
	switch {
	case len(c.Groups) > 0:
		return c.Groups
	case c.Type != nil:
		return []Group{{Name: shortName(c.Type), Type: c.Type, Share: 1, Prefix: "DD"}}
	}
	return MixedGroups()
}

// shortName is a type's name in the fleet file: the first word of its name.
func shortName(t *model.Type) string {
	var w string
	fmt.Sscan(t.Name+" type", &w)
	return w
}

// split shares n tails among the groups by the largest remainder; a group
// left without a tail takes one from the largest, as long as that keeps one.
func split(n int, groups []Group) []int {
	counts := make([]int, len(groups))
	shares := make([]float64, len(groups))
	total := 0.0
	for i, g := range groups {
		shares[i] = math.Max(g.Share, 0)
		total += shares[i]
	}
	if total == 0 {
		for i := range shares {
			shares[i] = 1
		}
		total = float64(len(shares))
	}
	rem := make([]float64, len(groups))
	order := make([]int, len(groups))
	used := 0
	for i := range groups {
		want := float64(n) * shares[i] / total
		counts[i] = int(want)
		rem[i] = want - float64(counts[i])
		used += counts[i]
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return rem[order[a]] > rem[order[b]] })
	for k := 0; used < n; k++ {
		counts[order[k%len(order)]]++
		used++
	}
	for i := range counts {
		big := 0
		for j := range counts {
			if counts[j] > counts[big] {
				big = j
			}
		}
		if counts[i] == 0 && counts[big] > 1 {
			counts[big]--
			counts[i]++
		}
	}
	return counts
}

// typeCtx is what the generator needs of one type: its cruise weights,
// levels, Mach range and the reference CD of its deviations.
type typeCtx struct {
	group Group
	ty    *model.Type
	wMid  float64 // a mid cruise weight of the type, kg
	// optimum altitude (m) by weight in steps of 2 % of wMid, for levels
	optAlt         map[int]float64
	machLo, machHi float64 // cruise Mach range flown
	// refCD is the baseline drag coefficient at the reference cruise (mid
	// weight, its optimum altitude, mid Mach, ISA): a tail's deviation d %
	// is the lift-independent excess ΔCD = d/100 · refCD, so that the
	// deviation measured at another condition is ΔCD over that condition's
	// baseline, as the analysis takes it.
	refCD float64
}

// wingLoading is the demo's mid cruise weight per wing area at a buffet
// CL of 0.85, kg/m² (65 t on 112 m²).
const wingLoading = 580.0

func newTypeCtx(gr Group) *typeCtx {
	c := &typeCtx{group: gr, ty: gr.Type, optAlt: map[int]float64{}}
	c.wMid = wingLoading * c.ty.WingArea * c.ty.CLBuffet / 0.85
	for k := 35; k <= 65; k++ {
		w := c.wMid * float64(k) / 50
		maxAlt, _ := model.MaxAltitude(c.ty, w, 0, 0)
		c.optAlt[k], _ = model.OptimumAltitude(c.ty, w, 0, 0, maxAlt)
	}
	mr := model.MaxRangeMach(c.ty, c.wMid, model.AirISA(c.optAlt[50], 0), 0).Mach
	c.machHi = math.Min(mr+0.022, c.ty.MMO-0.005)
	c.machLo = c.machHi - 0.03
	air := model.AirISA(c.optAlt[50], 0)
	mRef := (c.machLo + c.machHi) / 2
	cl := model.LiftCoefficient(1, c.wMid, air.DynamicPressure(mRef), c.ty.WingArea)
	c.refCD = c.ty.CD(cl, mRef, 0)
	return c
}

// cruiseLevel returns the flight level (ft, odd thousands) at or below the
// optimum altitude for weight w.
func (c *typeCtx) cruiseLevel(w float64) float64 {
	opt := c.optAlt[max(35, min(65, int(math.Round(50*w/c.wMid))))] / model.Foot
	fl := math.Floor((opt-1000)/2000)*2000 + 1000
	return max(29000, fl)
}

// RetrofitTruth is a tail's change of type from a date on (a fleet file
// entry with since): its deviation stays measured against the type in
// force, so a true retrofit shows no step.
type RetrofitTruth struct {
	Date string `json:"date"`
	Type string `json:"type"` // the fleet file's name of the new type

	at  time.Time
	ctx *typeCtx
}

// TypeTruth is one type of the demo fleet.
type TypeTruth struct {
	Name     string `json:"name"`      // the fleet file's name
	TypeName string `json:"type_name"` // the type file's name
	File     string `json:"file"`
	Tails    int    `json:"tails"` // flying it at the end
	// MedianRecentPct and EngineMedianRecentPct are the medians of the
	// recent levels of its tails at the end (the reference of their level
	// flags); null when no tail flies it or none records fan speed.
	MedianRecentPct       *float64 `json:"recent_level_median_pct"`
	EngineMedianRecentPct *float64 `json:"engine_recent_level_median_pct"`
}

// ctxAt returns the type context in force for tail tt at t.
func (tt *TailTruth) ctxAt(t time.Time) *typeCtx {
	if r := tt.Retrofit; r != nil && !t.Before(r.at) {
		return r.ctx
	}
	return tt.ctx
}

// finalType is the fleet-file name of the type tt flies at the end.
func (tt *TailTruth) finalType() string {
	if tt.Retrofit != nil {
		return tt.Retrofit.Type
	}
	return tt.Type
}

// hasThrust reports whether every type tt flies has a thrust table.
func (tt *TailTruth) hasThrust() bool {
	return tt.ctx.ty.Thrust != nil && (tt.Retrofit == nil || tt.Retrofit.ctx.ty.Thrust != nil)
}

// TypeFilePath is where Write writes the type file of the named type.
func TypeFilePath(name string) string { return TypeDir + "/" + name + ".toml" }

// Roster returns the demo fleet's fleet file as a roster: each tail on its
// group's type, a retrofit from its date on.
func (g *demoGen) roster() (*model.Roster, error) {
	types := map[string]*model.Type{}
	for _, c := range g.types {
		types[c.group.Name] = c.ty
	}
	var entries []model.RosterEntry
	for _, tt := range g.tails {
		entries = append(entries, model.RosterEntry{Tail: tt.Tail, Type: tt.Type, CruiseHours: tt.ctx.group.CruiseHours})
		if r := tt.Retrofit; r != nil {
			entries = append(entries, model.RosterEntry{Tail: tt.Tail, Type: r.Type, Since: r.at, CruiseHours: r.ctx.group.CruiseHours})
		}
	}
	return model.NewRoster(Airline, types, entries)
}

// typeTruths describes the fleet's types for the truth, with the medians
// of the planted recent levels of the tails flying each at the end.
func (g *demoGen) typeTruths() []TypeTruth {
	var out []TypeTruth
	for _, c := range g.types {
		tt := TypeTruth{Name: c.group.Name, TypeName: c.ty.Name, File: TypeFilePath(c.group.Name)}
		for i := range g.tails {
			if g.tails[i].finalType() == c.group.Name {
				tt.Tails++
			}
		}
		if m, ok := g.typeMedians[c.group.Name]; ok {
			tt.MedianRecentPct = &m
		}
		if m, ok := g.engineMedians[c.group.Name]; ok {
			tt.EngineMedianRecentPct = &m
		}
		out = append(out, tt)
	}
	return out
}

// referenceCDs is each type's reference CD by the fleet file's name.
func (g *demoGen) referenceCDs() map[string]float64 {
	out := map[string]float64{}
	for _, c := range g.types {
		out[c.group.Name] = c.refCD
	}
	return out
}
