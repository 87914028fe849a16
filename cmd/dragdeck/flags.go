package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"regexp"
	"strings"

	"dragdeck/feed"
	"dragdeck/model"
)

// flagSet is a flag.FlagSet with dragdeck's help and error conventions:
// --help prints a teaching usage to stdout and exits 0; a bad flag is one
// line on stderr and exit 2.
type flagSet struct {
	*flag.FlagSet
	usage    string // "dragdeck point --type T ..."
	about    string // paragraph(s) after the usage line
	example  string
	required []string
	argNames map[string]string // flag name → placeholder in help
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
// that no positional arguments are left.
func (f *flagSet) parse(args []string, stdout io.Writer) error {
	if err := f.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			f.printHelp(stdout)
			return errHelp
		}
		return usageErrorf("%s (see 'dragdeck %s --help')", dashed(err.Error()), f.Name())
	}
	set := map[string]bool{}
	f.Visit(func(fl *flag.Flag) { set[fl.Name] = true })
	for _, r := range f.required {
		if !set[r] {
			return usageErrorf("--%s: missing (required; see 'dragdeck %s --help')", r, f.Name())
		}
	}
	if f.NArg() > 0 {
		return errPositional
	}
	return nil
}

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

// flagMsg matches the flag package's bad-value message.
var flagMsg = regexp.MustCompile(`^invalid (boolean )?value "(.*)" for (?:flag )?-([\w-]+): (.*)$`)

// dashed rewrites the flag package's messages to name flags as "--name":
// `invalid value "abc" for flag -mach: parse error` → `--mach: "abc" is not a number`.
func dashed(msg string) string {
	if m := flagMsg.FindStringSubmatch(msg); m != nil {
		reason := m[4]
		if reason == "parse error" {
			reason = "not a number"
			if m[1] != "" {
				reason = "not true or false"
			}
		}
		return fmt.Sprintf("--%s: %q is %s", m[3], m[2], reason)
	}
	return strings.Replace(msg, ": -", ": --", 1)
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

// typeAndFiles loads --type and expands the PATH arguments, the preamble of
// every command that reads snapshot files.
func typeAndFiles(fs *flagSet, typ string) (*model.Type, []string, error) {
	t, err := loadType(typ)
	if err != nil {
		return nil, nil, err
	}
	files, err := inputFiles(fs)
	if err != nil {
		return nil, nil, err
	}
	return t, files, nil
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
