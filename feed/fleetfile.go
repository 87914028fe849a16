package feed

import (
	"errors"
	"fmt"
	"path/filepath"
	"strings"
	"time"

	"github.com/pelletier/go-toml/v2"

	"dragdeck/model"
)

// fleetFile mirrors the TOML layout of a fleet file (DESIGN.md §3.4).
type fleetFile struct {
	Name  string            `toml:"name"`
	Types map[string]string `toml:"types"` // type name -> type file, relative to the fleet file
	Tail  []fleetTail       `toml:"tail"`
	// FuelFactor is the fuel-factor policy (model.FactorPolicy); every key
	// is optional, the defaults stand for those left out.
	FuelFactor *fleetFactor `toml:"fuel_factor"`
}

type fleetFactor struct {
	WindowDays   *float64           `toml:"window_days"`
	MinFlights   *int               `toml:"min_flights"`
	RoundPct     *float64           `toml:"round_pct"`
	DeadBandPct  *float64           `toml:"dead_band_pct"`
	Periods      *int               `toml:"periods"`
	MinPct       *float64           `toml:"min_pct"`
	MaxPct       *float64           `toml:"max_pct"`
	MaxChangePct *float64           `toml:"max_change_pct"`
	BasicPct     map[string]float64 `toml:"basic_pct"` // by type name
}

// policy is the fleet file's fuel-factor policy over the defaults; nil
// without a [fuel_factor] table. Errors name the key and its line.
func (f *fleetFactor) policy(types map[string]*model.Type, at func(string) string) (*model.FactorPolicy, error) {
	if f == nil {
		return nil, nil
	}
	p := model.DefaultFactorPolicy()
	for _, v := range []struct {
		dst *float64
		src *float64
	}{{&p.WindowDays, f.WindowDays}, {&p.RoundPct, f.RoundPct}, {&p.DeadBandPct, f.DeadBandPct},
		{&p.MinPct, f.MinPct}, {&p.MaxPct, f.MaxPct}, {&p.MaxChangePct, f.MaxChangePct}} {
		if v.src != nil {
			*v.dst = *v.src
		}
	}
	if f.MinFlights != nil {
		p.MinFlights = *f.MinFlights
	}
	if f.Periods != nil {
		p.Periods = *f.Periods
	}
	for name := range f.BasicPct {
		if _, ok := types[name]; !ok {
			return nil, fmt.Errorf("%s: fuel_factor.basic_pct: %q is not a type of [types]", at("fuel_factor.basic_pct."+name), name)
		}
	}
	p.BasicPct = f.BasicPct
	if err := p.Check(); err != nil {
		key, _, _ := strings.Cut(err.Error(), ":")
		key, _, _ = strings.Cut(key, ",") // "min_pct, max_pct"
		return nil, fmt.Errorf("%s: fuel_factor.%v", at("fuel_factor."+key), err)
	}
	return &p, nil
}

// fleetSchema is the keys a fleet file may hold.
var fleetSchema = newTOMLSchema(fleetFile{})

type fleetTail struct {
	ID          *string  `toml:"id"`
	Type        *string  `toml:"type"`
	Since       any      `toml:"since"` // a TOML date, local date-time or offset date-time
	CruiseHours *float64 `toml:"cruise_hours_per_year"`
	FFCorrPct   *float64 `toml:"fuel_flow_correction_pct"`
}

// LoadFleet reads a fleet file and the type files it names (relative to
// the fleet file's folder) and returns its roster. Errors read
// "file:line: key: reason".
func LoadFleet(path string) (*model.Roster, error) {
	data, err := ReadSmall(path, MaxFleetFile)
	if err != nil {
		return nil, fmt.Errorf("fleet file: %w", err)
	}
	dir := filepath.Dir(path)
	return ParseFleet(path, data, func(rel string) (*model.Type, error) {
		p := rel
		if !filepath.IsAbs(p) {
			p = filepath.Join(dir, rel)
		}
		return LoadType(p)
	})
}

// ParseFleet decodes a fleet file called name; load reads the type file
// that a [types] entry names. It is decoded as type files are
// (decodeTOML): unknown keys are errors with their lines.
func ParseFleet(name string, data []byte, load func(rel string) (*model.Type, error)) (*model.Roster, error) {
	var f fleetFile
	doc, at, err := decodeTOML(name, data, &f, fleetSchema, nil)
	if err != nil {
		return nil, err
	}
	types := map[string]*model.Type{}
	for tn, rel := range f.Types {
		if strings.TrimSpace(tn) == "" || strings.TrimSpace(rel) == "" {
			return nil, fmt.Errorf("%s: types: a type needs a name and a file", at("types."+tn))
		}
		if why := badID([]byte(tn)); why != "" {
			return nil, fmt.Errorf("%s: types: the name %s %s", at("types."+tn), quoteField([]byte(tn)), why)
		}
		t, err := load(rel)
		if err != nil {
			return nil, fmt.Errorf("%s: types.%s: %w", at("types."+tn), tn, err)
		}
		types[tn] = t
	}
	tailLines := doc.arrays["tail"]
	entries := make([]model.RosterEntry, 0, len(f.Tail))
	for i, ft := range f.Tail {
		e := model.RosterEntry{}
		if i < len(tailLines) {
			e.Line = tailLines[i]
		}
		where := name
		if e.Line > 0 {
			where = fmt.Sprintf("%s:%d", name, e.Line)
		}
		if ft.ID == nil {
			return nil, fmt.Errorf("%s: tail.id: missing (required)", where)
		}
		if ft.Type == nil {
			return nil, fmt.Errorf("%s: tail.type: missing (required) for tail %s", where, *ft.ID)
		}
		e.Tail, e.Type = strings.TrimSpace(*ft.ID), strings.TrimSpace(*ft.Type)
		if why := badID([]byte(e.Tail)); why != "" {
			return nil, fmt.Errorf("%s: tail.id: %s %s", where, quoteField([]byte(e.Tail)), why)
		}
		since, err := tomlTime(ft.Since)
		if err != nil {
			return nil, fmt.Errorf("%s: tail.since: %v", where, err)
		}
		e.Since = since
		if ft.CruiseHours != nil {
			if !(*ft.CruiseHours > 0) {
				return nil, fmt.Errorf("%s: tail.cruise_hours_per_year: must be > 0, got %g", where, *ft.CruiseHours)
			}
			e.CruiseHours = *ft.CruiseHours
		}
		if ft.FFCorrPct != nil {
			e.FuelFlowCorrectionPct = *ft.FFCorrPct
		}
		entries = append(entries, e)
	}
	if why := badText([]byte(f.Name)); why != "" || len(f.Name) > 200 {
		if why == "" {
			why = "longer than 200 bytes"
		}
		return nil, fmt.Errorf("%s: name: %s", at("name"), why)
	}
	r, err := model.NewRoster(f.Name, types, entries)
	if err != nil {
		var ee *model.EntryError
		if errors.As(err, &ee) && ee.Line > 0 {
			return nil, fmt.Errorf("%s:%d: %w", name, ee.Line, err)
		}
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	if r.FuelFactor, err = f.FuelFactor.policy(types, at); err != nil {
		return nil, err
	}
	return r, nil
}

// tomlTime turns a TOML date or date-time into a UTC time; a local date or
// date-time is taken as UTC. Nil gives the zero time (no since).
func tomlTime(v any) (time.Time, error) {
	switch x := v.(type) {
	case nil:
		return time.Time{}, nil
	case toml.LocalDate:
		return time.Date(x.Year, time.Month(x.Month), x.Day, 0, 0, 0, 0, time.UTC), nil
	case toml.LocalDateTime:
		return time.Date(x.Year, time.Month(x.Month), x.Day, x.Hour, x.Minute, x.Second, x.Nanosecond, time.UTC), nil
	case time.Time:
		return x.UTC(), nil
	case string:
		if t, err := time.Parse("2006-01-02", x); err == nil {
			return t, nil
		}
		if t, err := time.Parse(time.RFC3339, x); err == nil {
			return t.UTC(), nil
		}
		return time.Time{}, fmt.Errorf("%q is not a date such as 2026-03-01", x)
	}
	return time.Time{}, fmt.Errorf("must be a date such as 2026-03-01, got %v", v)
}

// tomlError turns a go-toml decoding error into "name:line: key: reason";
// kinds gives, for a key, what its value must be ("a number").
func tomlError(name string, err error, kinds map[string]string) error {
	var sm *toml.StrictMissingError
	if errors.As(err, &sm) && len(sm.Errors) > 0 {
		var msgs []string
		for i := range sm.Errors {
			if i == maxListed {
				msgs = append(msgs, fmt.Sprintf("and %d more unknown keys", len(sm.Errors)-i))
				break
			}
			e := &sm.Errors[i]
			row, _ := e.Position()
			msgs = append(msgs, fmt.Sprintf("%s:%d: %s: unknown key", name, row, keyText(e.Key())))
		}
		return errors.New(strings.Join(msgs, "; "))
	}
	var de *toml.DecodeError
	if errors.As(err, &de) {
		row, _ := de.Position()
		key := keyText(de.Key())
		if kind, ok := kinds[key]; ok {
			return fmt.Errorf("%s:%d: %s: must be %s", name, row, key, kind)
		}
		if key != "" {
			key = " " + key + ":"
		}
		return fmt.Errorf("%s:%d:%s %s", name, row, key, strings.TrimPrefix(de.Error(), "toml: "))
	}
	return fmt.Errorf("%s: %w", name, err)
}

// maxListed is how many unknown keys an error lists.
const maxListed = 10

// keyText is a dotted TOML key for a message, cut to 60 runes: a hostile
// file's key can be thousands of parts long.
func keyText(parts []string) string {
	k := strings.Join(parts, ".")
	if r := []rune(k); len(r) > 60 {
		return string(r[:59]) + "…"
	}
	return k
}

// RosterCheck is the reader's tail check of a roster: a snapshot of a tail
// that has no entry in force at its time is rejected with the roster's
// reason. Nil for a single-type roster, which accepts every tail.
func RosterCheck(r *model.Roster) TailCheck {
	if r == nil || r.Single() != nil {
		return nil
	}
	return func(tail string, t time.Time) string {
		_, _, why := r.At(tail, t)
		return why
	}
}
