// Command sill helps choose, justify and hand over the operating cut of a
// binary classifier. See README.md.
package main

import (
	"errors"
	"fmt"
	"os"
)

// Set by the release build.
var (
	version = "dev"
	commit  = ""
)

// exitError carries an exit status other than 2 for an error, or a status
// with no message (message "").
type exitError struct {
	code    int
	message string
}

func (e *exitError) Error() string { return e.message }

func main() {
	os.Exit(run(os.Args[1:]))
}

// run executes the command line and returns the exit status: 0 for
// success, 1 where a check found drift, 2 for any error.
func run(args []string) int {
	root := newRootCmd()
	root.SetArgs(args)
	err := root.Execute()
	if err == nil {
		return 0
	}
	var exit *exitError
	if errors.As(err, &exit) {
		if exit.message != "" {
			fmt.Fprintln(os.Stderr, "sill: "+exit.message)
		}
		return exit.code
	}
	fmt.Fprintln(os.Stderr, "sill: "+err.Error())
	return 2
}
