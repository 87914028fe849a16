// Command dragdeck is a desk tool for airline performance engineers: it turns
// cruise snapshots into measured drag, compares it with the aircraft type's
// baseline polar and answers the cruise questions that follow (bank-angle
// penalties, best Mach and altitude for a weight).
//
// It is an engineering monitoring aid, not approved performance data; it
// defers to the operator's approved procedures and local regulations.
//
// Run "dragdeck help" for the commands.
package main

import (
	"context"
	"os"
	"os/signal"
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	code := run(ctx, os.Args[1:], os.Stdin, os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}
