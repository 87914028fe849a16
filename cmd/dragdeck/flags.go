package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// flagSet declares flags in a flag.FlagSet (the registry: names, values,
// defaults, help) and parses them itself, with dragdeck's conventions:
// --name value or --name=value (one dash works too), flags and PATHs in any
// order, "--" ends the flags; --help prints a teaching usage to stdout and
// exits 0; a bad flag is one line on stderr naming it, and exit 2. Errors
// are made here from the flag's kind, not from the flag package's text.
type flagSet struct {
	*flag.FlagSet
	usage    string // "dragdeck point --type T ..."
	about    string // paragraph(s) after the usage line
	example  string
	required []string
	argNames map[string]string // flag name → placeholder in help
	args     []string          // the positional arguments, in order
}

func newFlagSet(name, usage, about, example string) *flagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	return &flagSet{FlagSet: fs, usage: usage, about: about, example: example, argNames: map[string]string{}}
}

// float declares a float flag; placeholder "" makes it a required value-less
// description only for help.
func (f *flagSet) float(name, placeholder string, def float64, required bool, help string) *float64 {
	if required {
		f.required = append(f.required, name)
		help += " (required)"
	}
	f.argNames[name] = placeholder
	return f.Float64(name, def, help)
}

func (f *flagSet) str(name, placeholder, def, help string) *string {
	f.argNames[name] = placeholder
	return f.String(name, def, help)
}

// typeFlag declares the common --type flag.
func (f *flagSet) typeFlag() *string {
	return f.str("type", "FILE", "", "aircraft type file (TOML); default: the built-in demo type")
}

// jsonFlag declares the common --json flag.
func (f *flagSet) jsonFlag() *bool {
	return f.Bool("json", false, "print JSON instead of a table")
}

// errHelp means help was printed; the command exits 0.
var errHelp = errors.New("help shown")

// parse parses args, prints help on --help, and checks required flags and
// that no positional arguments are left (errPositional if some are).
func (f *flagSet) parse(args []string, stdout io.Writer) error {
	f.args = f.args[:0]
	for i := 0; i < len(args); i++ {
		a := args[i]
		if a == "--" {
			f.args = append(f.args, args[i+1:]...)
			break
		}
		if len(a) < 2 || a[0] != '-' {
			f.args = append(f.args, a)
			continue
		}
		name, value, hasValue := strings.Cut(strings.TrimPrefix(a[1:], "-"), "=")
		if name == "help" || name == "h" {
			f.printHelp(stdout)
			return errHelp
		}
		fl := f.Lookup(name)
		if fl == nil {
			return usageErrorf("flag provided but not defined: --%s (see 'dragdeck %s --help')", name, f.Name())
		}
		if b, ok := fl.Value.(interface{ IsBoolFlag() bool }); ok && b.IsBoolFlag() && !hasValue {
			value, hasValue = "true", true
		}
		if !hasValue {
			if i+1 >= len(args) {
				return usageErrorf("--%s: needs a value (see 'dragdeck %s --help')", name, f.Name())
			}
			i++
			value = args[i]
		}
		if err := f.Set(name, value); err != nil {
			if kind := kindOf(fl, value, err); kind != "" {
				return usageErrorf("--%s: %s is %s (see 'dragdeck %s --help')", name, shortQuote(value), kind, f.Name())
			}
			return usageErrorf("--%s: %v (see 'dragdeck %s --help')", name, err, f.Name())
		}
	}
	for _, r := range f.required {
		if !f.isSet(r) {
			return usageErrorf("--%s: missing (required; see 'dragdeck %s --help')", r, f.Name())
		}
	}
	if len(f.args) > 0 {
		return errPositional
	}
	return nil
}

// kindOf says what a flag's value is not, for an error message; "" for a
// flag of dragdeck's own type, whose error says it. A number or duration
// of the right form that does not fit is "out of range", not "not a
// number".
func kindOf(fl *flag.Flag, value string, err error) string {
	g, ok := fl.Value.(flag.Getter)
	if !ok {
		return ""
	}
	// the flag package turns strconv.ErrRange into its own "value out of range"
	outOfRange := errors.Is(err, strconv.ErrRange) || strings.Contains(err.Error(), "out of range")
	switch g.Get().(type) {
	case float64:
		if outOfRange {
			return "out of range"
		}
		return "not a number"
	case int, int64, uint, uint64:
		if outOfRange {
			return "out of range"
		}
		return "not a whole number"
	case bool:
		return "not true or false"
	case time.Duration:
		if durationForm.MatchString(value) {
			return "too long (at most 2562047h, about 292 years)"
		}
		return "not a duration (like 5s, 2m or 1h30m)"
	}
	return ""
}

// durationForm is the form of a Go duration, for telling a duration too
// long to hold from one written wrong.
var durationForm = regexp.MustCompile(`^[-+]?([0-9]*(\.[0-9]*)?(ns|us|µs|ms|s|m|h))+$`)

// shortQuote quotes a value for a message, cut to 40 bytes.
func shortQuote(s string) string {
	if len(s) > 40 {
		return strconv.Quote(s[:40]) + "…"
	}
	return strconv.Quote(s)
}

// NArg, Arg and Args are the positional arguments, wherever they stood
// among the flags.
func (f *flagSet) NArg() int { return len(f.args) }

func (f *flagSet) Arg(i int) string {
	if i < 0 || i >= len(f.args) {
		return ""
	}
	return f.args[i]
}

func (f *flagSet) Args() []string { return f.args }

// errPositional is returned by parse when arguments follow the flags;
// commands that take PATH arguments accept it, others report it.
var errPositional = errors.New("positional arguments")

// noArgs turns errPositional into a usage error for commands without PATHs.
func (f *flagSet) noArgs(err error) error {
	if err == errPositional {
		return usageErrorf("unexpected argument %q (see 'dragdeck %s --help')", f.Arg(0), f.Name())
	}
	return err
}

func (f *flagSet) printHelp(w io.Writer) {
	var b strings.Builder
	fmt.Fprintf(&b, "usage: %s\n\n%s\n", f.usage, strings.TrimSpace(f.about))
	heading := "\nflags:\n"
	f.VisitAll(func(fl *flag.Flag) {
		b.WriteString(heading)
		heading = ""
		left := "--" + fl.Name
		if p := f.argNames[fl.Name]; p != "" {
			left += " " + p
		}
		def := ""
		if fl.DefValue != "" && fl.DefValue != "0" && fl.DefValue != "false" {
			def = " (default " + fl.DefValue + ")"
		}
		fmt.Fprintf(&b, "  %-24s %s%s\n", left, fl.Usage, def)
	})
	if f.example != "" {
		fmt.Fprintf(&b, "\nexample:\n  %s\n", f.example)
	}
	fmt.Fprintf(&b, "\n%s\n", caution)
	io.WriteString(w, b.String())
}

// loadType loads --type (empty: the demo type); errors are input errors.
func loadType(path string) (*model.Type, error) {
	t, err := feed.LoadType(path)
	if err != nil {
		return nil, usageErrorf("--type: %v", err)
	}
	return t, nil
}

// typeChoice is the --type and --fleet flags of a command: one type for
// every tail, or a fleet file that gives each tail its type.
type typeChoice struct{ typ, fleet, layout *string }

// typeFlags declares --type, --fleet and --layout.
func (f *flagSet) typeFlags() typeChoice {
	return typeChoice{f.typeFlag(), f.str("fleet", "FILE", "",
		"fleet file (TOML): the type of each tail, a retrofit from its date on, per-tail cruise hours and meter correction; in place of --type"),
		f.layoutFlag()}
}

// layoutFlag declares --layout.
func (f *flagSet) layoutFlag() *string {
	return f.str("layout", "FILE", "", "layout file (TOML): read an export as it is, in its own columns, units, time format, separator and decimal mark (README: layout files)")
}

// loadLayout reads the --layout file (nil without one).
func loadLayout(path *string) (*feed.Layout, error) {
	if path == nil || *path == "" {
		return nil, nil
	}
	l, err := feed.LoadLayout(*path)
	if err != nil {
		return nil, usageErrorf("--layout: %v", err)
	}
	return l, nil
}

// oneTypeFlags declares --type and --fleet for a command that analyses one
// condition: with --fleet, --type names one of its types.
func (f *flagSet) oneTypeFlags() typeChoice {
	return typeChoice{f.typeFlag(), f.str("fleet", "FILE", "",
		"fleet file (TOML); then --type NAME picks one of its types (not needed when it has one)"), nil}
}

// roster loads --fleet, or --type as a single-type roster; giving both is
// a usage error.
func (c typeChoice) roster() (*model.Roster, error) {
	if *c.fleet == "" {
		t, err := loadType(*c.typ)
		if err != nil {
			return nil, err
		}
		return model.SingleType(t), nil
	}
	if *c.typ != "" {
		return nil, usageErrorf("--type and --fleet: give one (a fleet file names the type of each tail)")
	}
	r, err := feed.LoadFleet(*c.fleet)
	if err != nil {
		return nil, usageErrorf("--fleet: %v", err)
	}
	return r, nil
}

// one returns the type of a command that analyses one condition: --type,
// or with --fleet the fleet file's type that --type names (the only one
// when it has one).
func (c typeChoice) one() (*model.Type, error) {
	if *c.fleet == "" {
		return loadType(*c.typ)
	}
	r, err := feed.LoadFleet(*c.fleet)
	if err != nil {
		return nil, usageErrorf("--fleet: %v", err)
	}
	names := r.TypeNames()
	if *c.typ == "" && len(names) == 1 {
		return r.Types[names[0]], nil
	}
	if t := r.Types[*c.typ]; t != nil {
		return t, nil
	}
	return nil, usageErrorf("--type: with --fleet, name one of its types: %s", strings.Join(names, ", "))
}

// typeAndFiles loads --type or --fleet and expands the PATH arguments, the
// preamble of every command that reads snapshot files.
func typeAndFiles(stderr io.Writer, fs *flagSet, c typeChoice) (*model.Roster, []string, error) {
	r, err := c.roster()
	if err != nil {
		return nil, nil, err
	}
	files, err := inputFiles(fs)
	if err != nil {
		return nil, nil, err
	}
	if *c.typ == "" && *c.fleet == "" {
		if f := fleetBeside(fs.Args()); f != "" {
			fmt.Fprintf(stderr, "dragdeck: note: %s lies beside the snapshots, but without --fleet (or --type) every tail is analysed as the built-in demo type\n", f)
		}
	}
	return r, files, nil
}

// fleetBeside returns a fleet file (fleet.toml) in a folder given, or in
// the folder of a path given or its parent, when there is one: the user
// probably meant to pass it with --fleet.
func fleetBeside(paths []string) string {
	for _, p := range paths {
		dir := p
		if fi, err := os.Stat(p); err != nil || !fi.IsDir() {
			dir = filepath.Dir(p)
		}
		for _, d := range []string{dir, filepath.Dir(dir)} {
			f := filepath.Join(d, "fleet.toml")
			if fi, err := os.Stat(f); err == nil && fi.Mode().IsRegular() {
				return f
			}
		}
	}
	return ""
}

// readEvents reads --events, if given.
func readEvents(path string) (map[string][]model.Event, error) {
	if path == "" {
		return nil, nil
	}
	evs, err := feed.ReadEvents(path)
	if err != nil {
		return nil, usageErrorf("--events: %v", err)
	}
	return evs, nil
}

// flagError turns a snapshot validation error into a usage error that names
// the flag (the column name with dashes).
func flagError(e *feed.SnapshotError) error {
	return usageErrorf("--%s: %s", strings.ReplaceAll(string(e.Field), "_", "-"), e.Reason)
}

// isSet reports whether the flag was given on the command line.
func (f *flagSet) isSet(name string) bool {
	set := false
	f.Visit(func(fl *flag.Flag) { set = set || fl.Name == name })
	return set
}
