// Command sill helps choose, justify and hand over the operating cut of a
// binary classifier. See README.md.
package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"
	_ "time/tzdata" // --tz and decision files name zones; a release build for another system may have no zone database

	"github.com/sill-tool/sill/internal/format"
)

// exitError carries an exit status other than 2 for an error, or a status
// with no message (message "").
type exitError struct {
	code    int
	message string
}

func (e *exitError) Error() string { return e.message }

func main() {
	os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}

// exitInterrupted is the exit status after an interrupt, as a shell
// reports a process that Ctrl-C ended.
const exitInterrupted = 130

// run executes the command line with the given standard streams and
// returns the exit status: 0 for success, 1 where a check found drift, 2
// for any error, 130 when interrupted. Errors are one line on stderr.
//
// The command runs under a context that an interrupt or a termination
// signal cancels: loading, the bootstrap and writing stop at their next
// block and clean up. A second interrupt ends the process at once.
func run(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	go func() {
		<-ctx.Done()
		stop() // the next signal takes its default course
	}()
	root := newRootCmd()
	root.SetArgs(args)
	root.SetIn(stdin)
	root.SetOut(stdout)
	root.SetErr(stderr)
	err := root.ExecuteContext(ctx)
	if err == nil {
		return 0
	}
	if ctx.Err() != nil && errors.Is(err, context.Canceled) {
		fmt.Fprintln(stderr, "sill: interrupted")
		return exitInterrupted
	}
	var exit *exitError
	if errors.As(err, &exit) {
		if exit.message != "" {
			fmt.Fprintln(stderr, "sill: "+format.Printable(exit.message))
		}
		return exit.code
	}
	fmt.Fprintln(stderr, "sill: "+format.Printable(err.Error())) // an error may quote input
	return 2
}
