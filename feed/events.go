package feed

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"
	"time"

	"dragdeck/model"
)

// ReadEvents reads an events file (DESIGN.md §3.3): time,tail,kind,note,
// with '#' comments. It returns the events by tail. A bad row is an error
// "file:line: column: reason"; events are few, so one bad row stops it.
func ReadEvents(path string) (map[string][]model.Event, error) {
	f, err := OpenRegular(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	r := csv.NewReader(&cappedReader{r: f, n: MaxEventsFile, path: path, limit: MaxEventsFile})
	r.Comment = '#'
	r.FieldsPerRecord = -1
	r.TrimLeadingSpace = true
	out := map[string][]model.Event{}
	var idx map[string]int
	for {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				return nil, fmt.Errorf("%s:%d: row: %v", path, pe.Line, pe.Err)
			}
			return nil, fmt.Errorf("%s: %w", path, err)
		}
		line, _ := r.FieldPos(0) // only after a record was read without error
		if idx == nil {
			idx = map[string]int{}
			for i, name := range rec {
				idx[strings.ToLower(strings.TrimSpace(strings.TrimPrefix(name, "\ufeff")))] = i
			}
			for _, need := range []string{"time", "tail", "kind"} {
				if _, ok := idx[need]; !ok {
					return nil, fmt.Errorf("%s:%d: missing required column %s (events files have time,tail,kind,note)", path, line, need)
				}
			}
			continue
		}
		get := func(col string) string {
			if i, ok := idx[col]; ok && i < len(rec) {
				return strings.TrimSpace(rec[i])
			}
			return ""
		}
		t, err := time.Parse(time.RFC3339, get("time"))
		if err != nil {
			return nil, fmt.Errorf("%s:%d: time: %s is not an RFC 3339 time", path, line, quoteField([]byte(get("time"))))
		}
		tail := get("tail")
		if tail == "" {
			return nil, fmt.Errorf("%s:%d: tail: empty", path, line)
		}
		if why := badID([]byte(tail)); why != "" {
			return nil, fmt.Errorf("%s:%d: tail: %s", path, line, why)
		}
		out[tail] = append(out[tail], model.Event{Time: t.UTC(), Kind: PlainText(get("kind")), Note: PlainText(get("note"))})
	}
	if idx == nil {
		return nil, fmt.Errorf("%s: no header line (events files have time,tail,kind,note)", path)
	}
	return out, nil
}
