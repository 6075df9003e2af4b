// Command sill helps choose, justify and hand over the operating cut of a
// binary classifier. See README.md.
package main

import (
	"errors"
	"fmt"
	"io"
	"os"
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

// run executes the command line with the given standard streams and
// returns the exit status: 0 for success, 1 where a check found drift, 2
// for any error. Errors are one line on stderr.
func run(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	root := newRootCmd()
	root.SetArgs(args)
	root.SetIn(stdin)
	root.SetOut(stdout)
	root.SetErr(stderr)
	err := root.Execute()
	if err == nil {
		return 0
	}
	var exit *exitError
	if errors.As(err, &exit) {
		if exit.message != "" {
			fmt.Fprintln(stderr, "sill: "+exit.message)
		}
		return exit.code
	}
	fmt.Fprintln(stderr, "sill: "+err.Error())
	return 2
}
