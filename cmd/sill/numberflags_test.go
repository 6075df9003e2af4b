package main

import (
	"path/filepath"
	"testing"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
)

// TestNumberFlagValues runs every number and duration flag of every
// command with a value that is not of its kind: one line naming the flag,
// the value and what it takes (the words written out here by hand), exit
// status 2, nothing on standard output, never Go's strconv message.
func TestNumberFlagValues(t *testing.T) {
	dir := t.TempDir()
	good := writeFile(t, dir, "good.csv", []byte("score,label\n0.9,1\n0.2,0\n"))
	cases := []struct {
		command, flag, value string
		want                 string
	}{
		{"report", "volume", "abc", `sill: --volume "abc": expected a number of cases per shift, such as 20000`},
		{"explore", "volume", "12k", `sill: --volume "12k": expected a number of cases per shift, such as 20000`},
		{"serve", "volume", "lots", `sill: --volume "lots": expected a number of cases per shift, such as 20000`},
		{"report", "capacity", "x", `sill: --capacity "x": expected a number of alerts one shift can work, such as 400`},
		{"explore", "capacity", "", `sill: --capacity "": expected a number of alerts one shift can work, such as 400`},
		{"serve", "capacity", "1,5", `sill: --capacity "1,5": expected a number of alerts one shift can work, such as 400`},
		{"report", "cost-false-alert", "€12", `sill: --cost-false-alert "€12": expected an amount per wrong alert, such as 12.5`},
		{"explore", "cost-false-alert", "12 EUR", `sill: --cost-false-alert "12 EUR": expected an amount per wrong alert, such as 12.5`},
		{"serve", "cost-false-alert", "a", `sill: --cost-false-alert "a": expected an amount per wrong alert, such as 12.5`},
		{"report", "cost-miss", "$300", `sill: --cost-miss "$300": expected an amount per missed true case, such as 300`},
		{"explore", "cost-miss", "ten", `sill: --cost-miss "ten": expected an amount per missed true case, such as 300`},
		{"serve", "cost-miss", "?", `sill: --cost-miss "?": expected an amount per missed true case, such as 300`},
		{"report", "cost-hit", "-", `sill: --cost-hit "-": expected an amount per caught true case, such as 20 (negative for a benefit)`},
		{"explore", "cost-hit", "+-2", `sill: --cost-hit "+-2": expected an amount per caught true case, such as 20 (negative for a benefit)`},
		{"serve", "cost-hit", "x", `sill: --cost-hit "x": expected an amount per caught true case, such as 20 (negative for a benefit)`},
		{"report", "bootstrap", "1e3", `sill: --bootstrap "1e3": expected a whole number of resampled sets, such as 200 (0: off)`},
		{"explore", "bootstrap", "2.5", `sill: --bootstrap "2.5": expected a whole number of resampled sets, such as 200 (0: off)`},
		{"serve", "bootstrap", "many", `sill: --bootstrap "many": expected a whole number of resampled sets, such as 200 (0: off)`},
		{"report", "seed", "-1", `sill: --seed "-1": expected a whole number from 0 up, such as 1`},
		{"explore", "seed", "abc", `sill: --seed "abc": expected a whole number from 0 up, such as 1`},
		{"serve", "seed", "0x", `sill: --seed "0x": expected a whole number from 0 up, such as 1`},
		{"demo", "seed", "99999999999999999999", `sill: --seed "99999999999999999999": expected a whole number from 0 up, such as 1`},
		{"report", "calibration-bins", "ten", `sill: --calibration-bins "ten": expected a whole number of bins, such as 10`},
		{"explore", "calibration-bins", "5.5", `sill: --calibration-bins "5.5": expected a whole number of bins, such as 10`},
		{"serve", "calibration-bins", "x", `sill: --calibration-bins "x": expected a whole number of bins, such as 10`},
		{"report", "segments-shown", "all", `sill: --segments-shown "all": expected a whole number of segments, such as 20 (0: all)`},
		{"demo", "rows", "5k", `sill: --rows "5k": expected a whole number of rows, such as 5000`},
		{"sql", "digits", "two", `sill: --digits "two": expected a whole number of decimal digits from 0 to 12, or -1 to keep the scores as they are`},
		{"serve", "max-sessions", "4.0", `sill: --max-sessions "4.0": expected a whole number of connections, such as 4`},
		{"serve", "idle-timeout", "15", `sill: --idle-timeout "15": expected a duration such as 15m or 1h30m`},
	}
	for _, c := range cases {
		args := []string{c.command, "--" + c.flag + "=" + c.value}
		switch c.command {
		case "report", "explore":
			args = append(args, good)
		case "serve":
			args = append(args, "--listen", filepath.Join(dir, "never"))
		}
		t.Run(c.command+" --"+c.flag, func(t *testing.T) {
			got := runSill(t, "", args...)
			if got.code != 2 || got.stdout != "" || got.stderr != c.want+"\n" {
				t.Errorf("sill %q: exit %d, stdout %q, stderr\n got %q\nwant %q", args, got.code, got.stdout, got.stderr, c.want+"\n")
			}
		})
	}

	// Every number and duration flag of every command is in the table
	// above, so that a new one cannot fall back to strconv's message.
	tried := map[string]bool{}
	for _, c := range cases {
		tried[c.command+" --"+c.flag] = true
	}
	eachValueFlag(newRootCmd(), func(cmd *cobra.Command, flag *pflag.Flag) {
		name := cmd.Name() + " --" + flag.Name
		if !tried[name] {
			t.Errorf("%s (%s) is not tried with a bad value here", name, flag.Value.Type())
		}
		if _, ok := flagTakes[flag.Name]; !ok {
			t.Errorf("%s (%s) has no entry in flagTakes", name, flag.Value.Type())
		}
	})
}

// eachValueFlag calls f for each flag of cmd and its subcommands whose
// value is a number or a duration.
func eachValueFlag(cmd *cobra.Command, f func(*cobra.Command, *pflag.Flag)) {
	cmd.Flags().VisitAll(func(flag *pflag.Flag) {
		switch flag.Value.Type() {
		case "int", "int64", "uint", "uint64", "float64", "float32", "duration":
			f(cmd, flag)
		}
	})
	for _, sub := range cmd.Commands() {
		eachValueFlag(sub, f)
	}
}
