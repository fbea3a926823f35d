package main

import (
	"flag"
	"fmt"
	"io"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/notation"
)

var simplifyCmd = &command{
	name:    "simplify",
	summary: "bring an expression to canonical form with exact algebra",
	usage:   "'EXPR' [--format text|latex|go|json]",
	help: `simplify reads one expression in the notation of .lm files (every undeclared name is a real
symbol), brings it to canonical form with exact rational arithmetic (rational functions in
lowest terms, logarithms of numbers split into primes) and prints it. Example:

	loopmatch simplify '(a^3-b^3)/(a^2-b^2)' --format latex`,
}

func simplifyFlags() (*flag.FlagSet, *format) {
	fs := flag.NewFlagSet("simplify", flag.ContinueOnError)
	f := newFormat("text", "latex", "go", "json")
	fs.Var(f, "format", "output format: text, latex, go or json")
	return fs, f
}

func init() {
	flagSets["simplify"] = func() *flag.FlagSet { fs, _ := simplifyFlags(); return fs }
	simplifyCmd.run = runSimplify
}

func runSimplify(args []string, out, errOut io.Writer) int {
	fs, f := simplifyFlags()
	// An expression may start with "-", which the flag package would take for a flag.
	var exprArgs, flagArgs []string
	for i := 0; i < len(args); i++ {
		a := args[i]
		switch {
		case a == "--format" || a == "-format":
			flagArgs = append(flagArgs, a)
			if i+1 < len(args) {
				flagArgs = append(flagArgs, args[i+1])
				i++
			}
		case strings.HasPrefix(a, "--format=") || strings.HasPrefix(a, "-format="), a == "-h", a == "--help":
			flagArgs = append(flagArgs, a)
		default:
			exprArgs = append(exprArgs, a)
		}
	}
	if _, ok := parseFlags(fs, flagArgs, errOut); !ok {
		return exitBadInput
	}
	if len(exprArgs) != 1 {
		fmt.Fprintln(errOut, "loopmatch simplify: expected one expression argument (quote it)")
		return exitBadInput
	}
	e, err := notation.ParseFreeExpr(exprArgs[0])
	if err != nil {
		fmt.Fprintf(errOut, "loopmatch simplify: %v\n", err)
		return exitBadInput
	}
	switch f.value {
	case "latex":
		fmt.Fprintln(out, e.LaTeX())
	case "go":
		s, err := expr.GoExpr(e)
		if err != nil {
			fmt.Fprintf(errOut, "loopmatch simplify: %v\n", err)
			return exitBadInput
		}
		fmt.Fprintln(out, s)
	case "json":
		doc := map[string]any{"input": exprArgs[0], "text": e.String(), "latex": e.LaTeX(), "terms": e.Len()}
		if g, err := expr.GoExpr(e); err == nil {
			doc["go"] = g
		}
		writeJSON(out, doc)
	default:
		fmt.Fprintln(out, e.String())
	}
	return exitOK
}
