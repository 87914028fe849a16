package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strings"
)

// Exit codes: 0 success, 1 findings, 2 usage or input errors.
const (
	exitOK       = 0
	exitFindings = 1
	exitUsage    = 2
)

// caution is printed under every human-readable result.
const caution = "Engineering monitoring aid, not approved performance data; the operator's\napproved procedures and local regulations prevail."

// env is what a command gets from run.
type env struct {
	ctx    context.Context
	stdin  io.Reader
	stdout io.Writer
	stderr io.Writer
}

// command is one subcommand.
type command struct {
	name    string
	summary string
	run     func(e *env, args []string) error
}

func commands() []command {
	return []command{
		{"dash", "the dashboard on snapshot files or folders", runDash},
		{"point", "analyse one cruise snapshot: measured drag, split and excess", runPoint},
		{"speed", "cruise optimum for a weight: best Mach numbers and altitudes", runSpeed},
		{"bank", "bank-angle penalty table: load factor, drag and fuel", runBank},
		{"check", "validate snapshot files; list every rejected row", runCheck},
		{"extract", "stable windows of continuous recordings, written as snapshots", runExtract},
		{"replay", "play snapshots in time order, analysed, at a chosen speed", runReplay},
		{"follow", "watch a growing snapshot file; analyse rows as they arrive", runFollow},
		{"report", "per-tail drag trends, flags and cost for a fleet", runReport},
		{"fit", "fit a baseline drag polar to measured drag; writes a type file", runFit},
		{"demo", "write the invented demo fleet, its type file and its truth", runDemo},
		{"import", "add snapshot, events and fleet files to the fleet store", runImport},
		{"worklist", "the work list: items for maintenance, from open to closed", runWorklist},
		{"review", "what changed since the last review: flags, steps, work, events", runReview},
		{"factor", "fuel factors for flight planning: propose, approve, apply, export", runFactor},
	}
}

// run is the whole program: it parses args, runs a command and returns the
// exit code. Data goes to stdout, diagnostics to stderr.
func run(ctx context.Context, args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	e := &env{ctx: ctx, stdin: stdin, stdout: stdout, stderr: stderr}
	if len(args) == 0 {
		if isTerminal(stdout) {
			return exitCode(e, "dragdeck", demoDashboard(e))
		}
		return exitCode(e, "dragdeck", runOverview(e))
	}
	name := args[0]
	switch name {
	case "help", "-h", "-help", "--help":
		topUsage(stdout)
		return exitOK
	case "version", "--version", "-version":
		fmt.Fprintf(stdout, "dragdeck %s\n", version())
		return exitOK
	}
	for _, c := range commands() {
		if c.name == name {
			return exitCode(e, "dragdeck "+name, c.run(e, args[1:]))
		}
	}
	fmt.Fprintf(stderr, "dragdeck: unknown command %q (run 'dragdeck help' for the list)\n", name)
	return exitUsage
}

// exitCode prints err (if any) on one line and maps it to an exit code.
func exitCode(e *env, prefix string, err error) int {
	if err == nil {
		return exitOK
	}
	var x *exitErr
	if errors.As(err, &x) {
		if x.err != nil {
			fmt.Fprintf(e.stderr, "%s: %v\n", prefix, x.err)
		}
		return x.code
	}
	fmt.Fprintf(e.stderr, "%s: %v\n", prefix, err)
	return exitUsage
}

// exitErr carries an exit code; a nil err prints nothing.
type exitErr struct {
	code int
	err  error
}

func (x *exitErr) Error() string {
	if x.err == nil {
		return fmt.Sprintf("exit %d", x.code)
	}
	return x.err.Error()
}

func (x *exitErr) Unwrap() error { return x.err }

// usageErrorf is a usage or input error: exit 2.
func usageErrorf(format string, args ...any) error {
	return &exitErr{code: exitUsage, err: fmt.Errorf(format, args...)}
}

func topUsage(w io.Writer) {
	var b strings.Builder
	b.WriteString(`dragdeck: measured drag, excess drag and cruise optima for airline performance engineers.

usage: dragdeck [command] [flags]

With no command, dragdeck opens the dashboard on the built-in demo fleet (when
stdout is not a terminal, it prints the demo type's cruise table instead).

commands:
`)
	for _, c := range commands() {
		fmt.Fprintf(&b, "  %-8s %s\n", c.name, c.summary)
	}
	b.WriteString(`
Run 'dragdeck COMMAND --help' for a command's flags and an example, and
'dragdeck --version' for the version.
Units: weights in kg, altitudes in ft (pressure altitude), temperatures in °C,
fuel flow in kg/h; --json output uses the same units, named in each field.
Exit codes: 0 success, 1 findings, 2 usage or input error.

` + caution + "\n")
	io.WriteString(w, b.String())
}
