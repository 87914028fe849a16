package model

import "strings"

// EngineEvent reports whether an event of this kind concerns the engines or
// the fuel-flow meter (an engine change, engine wash, shop visit, fuel flow
// meter replaced): such an event restarts the engine series, any other kind
// the airframe series. The kind is matched without regard to case.
func EngineEvent(kind string) bool {
	k := strings.ToLower(kind)
	return strings.Contains(k, "engine") || strings.Contains(k, "shop visit") || strings.Contains(k, "meter")
}

// SplitEvents returns the events that restart the airframe series and those
// that restart the engine series, each in the order given.
func SplitEvents(evs []Event) (airframe, engine []Event) {
	for _, e := range evs {
		if EngineEvent(e.Kind) {
			engine = append(engine, e)
		} else {
			airframe = append(airframe, e)
		}
	}
	return airframe, engine
}
