package main

import (
	"fmt"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"dragdeck/feed/store"
)

const worklistUsage = "dragdeck worklist [--store FILE] list [--json] | add TAIL --reason TEXT [--flag FLAG] | set ID STATUS [--note TEXT]"

func runWorklist(e *env, args []string) error {
	fs := newFlagSet("worklist", worklistUsage,
		`The work list: an item per tail for maintenance to act on, kept in the store.
An item moves open → inspect → found or not found → closed, or is dismissed
(from open or inspect); closed and dismissed are final. Every change is
timestamped (UTC) with an optional note; setting the status an item has,
with --note, adds a note alone. A tail has one item in progress at a time.
  list            every item, oldest first (--json: with its notes)
  add TAIL        open an item (--reason says why; --flag names the flag
                  that raised it: level, growth, step, e-level, ...);
                  prints its id
  set ID STATUS   move item ID to STATUS (quote "not found")
The report of a store shows each tail's items in progress.`,
		`dragdeck worklist --store fleet.db add DD107 --reason "drift +0.9 pp/100 d" --flag growth
  dragdeck worklist --store fleet.db set 1 inspect --note "door seals, slot 12 Dec"`)
	storePath := fs.str("store", "FILE", store.DefaultFile, "the store")
	asJSON := fs.Bool("json", false, "list: print JSON")
	reason := fs.str("reason", "TEXT", "", "add: why the item is opened")
	flagName := fs.str("flag", "FLAG", "", "add: the flag that raised it")
	note := fs.str("note", "TEXT", "", "set: a note with the change")
	if err := fs.parse(args, e.stdout); err != nil && err != errPositional {
		return helpOK(err)
	}
	if fs.NArg() == 0 {
		return usageErrorf("give list, add or set (see 'dragdeck worklist --help')")
	}
	verb, rest := fs.Arg(0), fs.Args()[1:]
	// Only the flags of the verb given.
	for name, verbs := range map[string]string{"json": "list", "reason": "add", "flag": "add", "note": "set"} {
		if fs.isSet(name) && verb != verbs {
			return usageErrorf("--%s goes with %s, not %s", name, verbs, verb)
		}
	}
	switch verb {
	case "list", "add", "set":
	default:
		return usageErrorf("%q: give list, add or set (see 'dragdeck worklist --help')", verb)
	}
	st, err := store.Open(*storePath, verb == "add")
	if err != nil {
		return usageErrorf("--store: %v", err)
	}
	defer st.Close()
	switch verb {
	case "list":
		if len(rest) > 0 {
			return usageErrorf("list takes no arguments")
		}
		items, err := st.Work()
		if err != nil {
			return err
		}
		if *asJSON {
			return writeJSON(e.stdout, worklistJSON(items))
		}
		writeWorklist(e, items)
		return nil
	case "add":
		if len(rest) != 1 {
			return usageErrorf("add takes one TAIL")
		}
		if strings.TrimSpace(*reason) == "" {
			return usageErrorf("add: give --reason TEXT (why the item is opened)")
		}
		id, err := st.AddWork(rest[0], *reason, *flagName)
		if err != nil {
			return usageErrorf("add: %v", err)
		}
		fmt.Fprintln(e.stdout, id)
		return nil
	default: // set
		if len(rest) != 2 {
			return usageErrorf("set takes ID and STATUS (one of %s; quote \"not found\")", strings.Join(store.Statuses, ", "))
		}
		id, err := strconv.ParseInt(rest[0], 10, 64)
		if err != nil || id <= 0 {
			return usageErrorf("set: %q is not an item id (see 'dragdeck worklist list')", rest[0])
		}
		if err := st.SetWork(id, rest[1], *note); err != nil {
			return usageErrorf("set: %v", err) // an unknown status, a move not allowed, no such item: exit 2
		}
		fmt.Fprintf(e.stderr, "dragdeck worklist: item %d is %s\n", id, rest[1])
		return nil
	}
}

// workItemJSON is an item of worklist list --json (stable names).
type workItemJSON struct {
	ID      int64      `json:"id"`
	Tail    string     `json:"tail"`
	Status  string     `json:"status"`
	Reason  string     `json:"reason"`
	Flag    string     `json:"flag"`
	Opened  string     `json:"opened"`
	Updated string     `json:"updated"`
	Notes   []noteJSON `json:"notes"`
}

type noteJSON struct {
	Time   string `json:"time"`
	Status string `json:"status"`
	Text   string `json:"text"`
}

func worklistJSON(items []store.WorkItem) []workItemJSON {
	out := []workItemJSON{}
	for _, w := range items {
		j := workItemJSON{ID: w.ID, Tail: w.Tail, Status: w.Status, Reason: w.Reason, Flag: w.Flag,
			Opened: w.Opened.Format(time.RFC3339), Updated: w.Updated.Format(time.RFC3339), Notes: []noteJSON{}}
		for _, n := range w.Notes {
			j.Notes = append(j.Notes, noteJSON{Time: n.Time.Format(time.RFC3339), Status: n.Status, Text: n.Text})
		}
		out = append(out, j)
	}
	return out
}

// writeWorklist prints the list as a table, the last note of each item.
func writeWorklist(e *env, items []store.WorkItem) {
	if len(items) == 0 {
		fmt.Fprintln(e.stdout, "The work list is empty ('dragdeck worklist add TAIL --reason TEXT' opens an item).")
		return
	}
	tw := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "id\ttail\tstatus\tflag\topened\tupdated\treason / last note")
	for _, w := range items {
		text := w.Reason
		if n := len(w.Notes); n > 1 && w.Notes[n-1].Text != "" {
			text = w.Notes[n-1].Text
		}
		flag := w.Flag
		if flag == "" {
			flag = "-"
		}
		fmt.Fprintf(tw, "%d\t%s\t%s\t%s\t%s\t%s\t%s\n", w.ID, w.Tail, w.Status, flag,
			w.Opened.Format(time.DateOnly), w.Updated.Format(time.DateOnly), text)
	}
	tw.Flush()
}
