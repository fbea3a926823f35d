// Command loopmatch matches heavy-particle loops onto effective operators: it reads .lm files,
// reduces and evaluates their loop integrals, computes Wilson coefficients and runs them.
//
// Usage:
//
//	loopmatch <command> [arguments]
//
// Run "loopmatch help" for the list of commands.
package main

import (
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"sort"
	"strings"
)

// version is the program's version string.
const version = "loopmatch 0.1.0"

// Exit codes of every command.
const (
	exitOK       = 0 // success
	exitCheck    = 1 // a physics check failed
	exitBadInput = 2 // the input could not be read or understood
)

// command is one subcommand.
type command struct {
	name    string
	summary string
	usage   string // argument synopsis after the command name
	help    string // longer description
	run     func(args []string, out, errOut io.Writer) int
}

// commands holds every subcommand; each file registers its own with register in an init
// function, so adding a command touches only its file.
var commands = map[string]*command{}

func register(c *command) { commands[c.name] = c }

func init() {
	for _, c := range []*command{checkCmd, simplifyCmd, integralCmd, reduceCmd, matchCmd, versionCmd, helpCmd} {
		register(c)
	}
}

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

// run executes the command line args and returns the exit code.
func run(args []string, out, errOut io.Writer) int {
	if len(args) == 0 {
		printOverview(errOut)
		return exitBadInput
	}
	name := args[0]
	switch name {
	case "-h", "--help", "-help":
		printOverview(out)
		return exitOK
	case "--version", "-version":
		fmt.Fprintln(out, version)
		return exitOK
	}
	c, ok := commands[name]
	if !ok {
		fmt.Fprintf(errOut, "loopmatch: unknown command %q\n\n", name)
		printOverview(errOut)
		return exitBadInput
	}
	return c.run(args[1:], out, errOut)
}

func printOverview(w io.Writer) {
	fmt.Fprintln(w, "loopmatch matches heavy-particle loop amplitudes onto effective operators.")
	fmt.Fprintln(w, "\nUsage:\n\n\tloopmatch <command> [arguments]\n\nCommands:")
	names := make([]string, 0, len(commands))
	for n := range commands {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(w, "\t%-10s %s\n", n, commands[n].summary)
	}
	fmt.Fprintln(w, "\nRun \"loopmatch help <command>\" for the arguments of a command.")
	fmt.Fprintln(w, "Exit codes: 0 success, 1 a check failed, 2 bad input.")
}

var versionCmd = &command{
	name:    "version",
	summary: "print the version",
	run: func(args []string, out, errOut io.Writer) int {
		fmt.Fprintln(out, version)
		return exitOK
	},
}

var helpCmd = &command{
	name:    "help",
	summary: "describe a command",
	usage:   "[command]",
	run: func(args []string, out, errOut io.Writer) int {
		if len(args) == 0 {
			printOverview(out)
			return exitOK
		}
		c, ok := commands[args[0]]
		if !ok {
			fmt.Fprintf(errOut, "loopmatch help: unknown command %q\n", args[0])
			return exitBadInput
		}
		fmt.Fprintf(out, "usage: loopmatch %s %s\n\n%s\n", c.name, c.usage, c.summary)
		if c.help != "" {
			fmt.Fprintf(out, "\n%s\n", c.help)
		}
		fs := c.flags()
		if fs != nil {
			fmt.Fprintln(out, "\nFlags:")
			fs.SetOutput(out)
			fs.PrintDefaults()
		}
		return exitOK
	},
}

// flagSets builds a command's flag set for help output; commands register theirs here.
var flagSets = map[string]func() *flag.FlagSet{}

func (c *command) flags() *flag.FlagSet {
	if f, ok := flagSets[c.name]; ok {
		return f()
	}
	return nil
}

// parseFlags parses a command's flags (flags may come before or after the positional
// arguments) and reports errors in the program's own words.
func parseFlags(fs *flag.FlagSet, args []string, errOut io.Writer) ([]string, bool) {
	fs.SetOutput(io.Discard)
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				fmt.Fprintf(errOut, "run \"loopmatch help %s\" for the flags\n", fs.Name())
				return nil, false
			}
			fmt.Fprintf(errOut, "loopmatch %s: %v\n", fs.Name(), err)
			return nil, false
		}
		rest := fs.Args()
		if len(rest) == 0 {
			return pos, true
		}
		pos = append(pos, rest[0])
		args = rest[1:]
	}
}

// format is an output format flag with a fixed set of allowed values.
type format struct {
	value   string
	allowed []string
}

func (f *format) String() string { return f.value }
func (f *format) Set(s string) error {
	for _, a := range f.allowed {
		if s == a {
			f.value = s
			return nil
		}
	}
	return fmt.Errorf("unknown format %q (one of %s)", s, strings.Join(f.allowed, ", "))
}

func newFormat(allowed ...string) *format { return &format{value: allowed[0], allowed: allowed} }

// writeJSON writes v as indented JSON, the one JSON layout of every command.
func writeJSON(w io.Writer, v any) {
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	_ = enc.Encode(v)
}
