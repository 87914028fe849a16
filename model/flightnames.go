package model

// FlightID is a flight name as a number: TrendPoint keeps it in place of
// the name, so that a point holds no pointer (a million points are then
// not scanned by the garbage collector) and compares flights in one
// instruction. FlightNames gives the names back.
type FlightID uint32

// FlightNames numbers flight names in the order they are first met: the
// table of a set of TrendPoints. ID adds and must not be called
// concurrently; Name may be, once the table is complete.
type FlightNames struct {
	names []string
	ids   map[string]FlightID
}

// NewFlightNames returns an empty table.
func NewFlightNames() *FlightNames {
	return &FlightNames{ids: map[string]FlightID{}}
}

// ID returns the id of name, adding it when it is new.
func (f *FlightNames) ID(name string) FlightID {
	if id, ok := f.ids[name]; ok {
		return id
	}
	id := FlightID(len(f.names))
	f.names = append(f.names, name)
	f.ids[name] = id
	return id
}

// Name returns the name of id ("" for an id the table did not give).
func (f *FlightNames) Name(id FlightID) string {
	if f == nil || int(id) >= len(f.names) {
		return ""
	}
	return f.names[id]
}
