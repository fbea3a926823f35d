package main

import (
	"errors"
	"flag"
	"fmt"
	"go/token"
	"io"
	"path/filepath"
	"strings"
	"unicode"

	"loopmatch/expr"
	"loopmatch/expr/emit"
	"loopmatch/expr/notation"
	"loopmatch/match"
)

var emitCmd = &command{
	name:    "emit",
	summary: "write the Wilson coefficients of a .lm file as Go code, LaTeX or JSON",
	usage:   "FILE [--format go|latex|json] [--package NAME] [-o OUT] [--set name=value,…] [--match N]",
	help: `emit runs a match block of FILE and writes its Wilson coefficients:

  go     one exported function per coefficient (arguments: the mass ratios, masses, mu and
         couplings that remain symbolic), documented with its formula, the operator and the
         conventions. Where the closed form loses digits in float64 (removable singularities
         such as x -> 1 in the Inami-Lim functions, cancellations at small or large x) the
         function switches to a series derived exactly from the formula; the switch-over and
         the number of terms follow from an error estimate (docs/OUTPUT.md). With -o X.go the
         file X_test.go is written beside it: reference values computed in arbitrary
         precision, checked against the functions, and benchmarks.
  latex  a complete amsmath document: conventions, operators, the coefficients in terms of
         auxiliary functions F_1, F_2, ... defined once.
  json   the coefficients as text and LaTeX, their auxiliary functions and series branches.

--set name=value,… substitutes exact values (rational numbers) before writing, so those
symbols are no longer arguments. Output files are written atomically and never over FILE.

Exit codes: 0 written, 1 the match block failed its checks (nothing is written), 2 bad input.`,
}

type emitOpts struct {
	format  *format
	pkg     string
	out     string
	set     string
	block   int
	noTests bool
}

func emitFlags() (*flag.FlagSet, *emitOpts) {
	fs := flag.NewFlagSet("emit", flag.ContinueOnError)
	o := &emitOpts{format: newFormat("go", "latex", "json")}
	fs.Var(o.format, "format", "output format: go, latex or json")
	fs.StringVar(&o.pkg, "package", "", "Go package name (default: from the file name)")
	fs.StringVar(&o.out, "o", "", "output file (default: standard output)")
	fs.StringVar(&o.set, "set", "", "exact values substituted before writing, e.g. eQF=2/3,eQS=-1/3")
	fs.IntVar(&o.block, "match", 0, "which match block of FILE (1, 2, …; needed when there are several)")
	fs.BoolVar(&o.noTests, "no-test", false, "with --format go and -o: do not write the _test.go file")
	return fs, o
}

func init() {
	flagSets["emit"] = func() *flag.FlagSet { fs, _ := emitFlags(); return fs }
	emitCmd.run = runEmit
	register(emitCmd)
}

func runEmit(args []string, out, errOut io.Writer) int {
	fs, o := emitFlags()
	pos, ok := parseFlags(fs, args, errOut)
	if !ok {
		return exitBadInput
	}
	if len(pos) != 1 {
		fmt.Fprintln(errOut, "loopmatch emit: expected one FILE argument")
		return exitBadInput
	}
	file := pos[0]
	if o.out != "" {
		if err := checkNotInput(o.out, file); err != nil {
			fmt.Fprintf(errOut, "loopmatch emit: %v\n", err)
			return exitBadInput
		}
	}
	pkg := o.pkg
	if pkg == "" {
		pkg = packageName(file)
	} else if !isPackageName(pkg) {
		fmt.Fprintf(errOut, "loopmatch emit: --package %q is not a Go package name (lower-case letters, digits and _; not a keyword)\n", pkg)
		return exitBadInput
	}
	set, _, err := parseSet(o.set)
	if err != nil {
		fmt.Fprintf(errOut, "loopmatch emit: %v\n", err)
		return exitBadInput
	}
	m, code := matchProgram("emit", file, o.block, set, true, false, pkg, errOut)
	if m == nil {
		return code
	}
	prog := m.prog
	for _, n := range prog.Notes {
		fmt.Fprintf(errOut, "loopmatch emit: note: %s\n", n)
	}
	data, test, err := emitData(prog, o.format.value, o.out != "" && !o.noTests)
	if err != nil {
		fmt.Fprintf(errOut, "loopmatch emit: %v\n", err)
		return exitBadInput
	}
	if o.out == "" {
		out.Write(data)
		return exitOK
	}
	if err := writeOutput(o.out, data, file); err != nil {
		fmt.Fprintf(errOut, "loopmatch emit: %v\n", err)
		return exitBadInput
	}
	if test != nil {
		tp := strings.TrimSuffix(o.out, ".go") + "_test.go"
		if err := writeOutput(tp, test, file, o.out); err != nil {
			fmt.Fprintf(errOut, "loopmatch emit: %v\n", err)
			return exitBadInput
		}
	}
	return exitOK
}

// emitData renders a program in a format; for Go with withTest also its _test.go file.
func emitData(prog *emit.Program, format string, withTest bool) (data, test []byte, err error) {
	switch format {
	case "latex":
		return []byte(prog.LaTeX()), nil, nil
	case "json":
		data, err = prog.JSON()
		return append(data, '\n'), nil, err
	}
	if data, err = prog.Go(); err != nil || !withTest {
		return data, nil, err
	}
	test, err = prog.GoTest()
	return data, test, err
}

// matchProgram loads FILE, runs the chosen match block and builds the numerical program of its
// coefficients. With subst, the values of set are substituted exactly; otherwise they only
// override the file's values. With freeMu the block's scale is ignored, so that μ stays a
// parameter. It prints errors itself and returns nil with the exit code.
func matchProgram(cmd, file string, block int, set map[string]expr.Expr, subst, freeMu bool, pkg string, errOut io.Writer) (*matched, int) {
	p, err := loadProgram(file)
	if err != nil {
		fmt.Fprintln(errOut, err)
		return nil, exitBadInput
	}
	if len(p.Matches) == 0 {
		fmt.Fprintf(errOut, "loopmatch %s: %s has no match block\n", cmd, p.File)
		return nil, exitBadInput
	}
	if block == 0 && len(p.Matches) > 1 {
		var at []string
		for i, mb := range p.Matches {
			at = append(at, fmt.Sprintf("%d at %s", i+1, mb.Pos))
		}
		fmt.Fprintf(errOut, "loopmatch %s: %s has %d match blocks (%s); choose one with --match N\n", cmd, p.File, len(p.Matches), strings.Join(at, ", "))
		return nil, exitBadInput
	}
	if block == 0 {
		block = 1
	}
	if block < 1 || block > len(p.Matches) {
		fmt.Fprintf(errOut, "loopmatch %s: --match %d: %s has %d match block(s)\n", cmd, block, p.File, len(p.Matches))
		return nil, exitBadInput
	}
	mb := p.Matches[block-1]
	for n := range set {
		if _, ok := p.Decls[n]; !ok && n != "mu" && !isRatio(mb, n) {
			fmt.Fprintf(errOut, "loopmatch %s: --set: %s is not declared in %s\n", cmd, n, p.File)
			return nil, exitBadInput
		}
	}
	if mu, ok := set["mu"]; ok && subst {
		mb.Scale, mb.ScaleSet = mu, true
	}
	if freeMu {
		mb.ScaleSet = false
	}
	r, err := match.Run(p, mb, match.Options{})
	if err != nil {
		var pe *match.ProjectionError
		if errors.As(err, &pe) {
			fmt.Fprintf(errOut, "%s: match %s onto %s:\n%v\n", mb.Pos, strings.Join(mb.Amps, ", "), strings.Join(mb.Ops, ", "), err)
			return nil, exitCheck
		}
		fmt.Fprintln(errOut, err)
		return nil, exitBadInput
	}
	if r.Failed() {
		fmt.Fprintf(errOut, "loopmatch %s: the match block at %s failed its checks; run loopmatch match %s for details\n", cmd, mb.Pos, file)
		return nil, exitCheck
	}
	spec, err := specOf(p, mb, r, set, subst, pkg)
	if err != nil {
		fmt.Fprintf(errOut, "loopmatch %s: %v\n", cmd, err)
		return nil, exitBadInput
	}
	prog, err := emit.Build(spec)
	if err != nil {
		fmt.Fprintf(errOut, "loopmatch %s: %v\n", cmd, err)
		return nil, exitBadInput
	}
	return &matched{prog: prog, file: p, block: mb}, exitOK
}

// matched is a built program with the file and match block it came from.
type matched struct {
	prog  *emit.Program
	file  *notation.Program
	block *notation.MatchBlock
}

func isRatio(mb *notation.MatchBlock, n string) bool {
	for _, ra := range mb.Ratios {
		if ra.Name == n {
			return true
		}
	}
	return false
}

// specOf describes a match result for package emit.
func specOf(p *notation.Program, mb *notation.MatchBlock, r *match.Result, set map[string]expr.Expr, subst bool, pkg string) (emit.Spec, error) {
	spec := emit.Spec{
		Package:     pkg,
		Source:      filepath.ToSlash(p.File),
		Title:       strings.Join(mb.Amps, ", ") + " onto " + strings.Join(mb.Ops, ", "),
		Conventions: append([]string{}, r.Conventions...),
		Values:      map[string]complex128{},
	}
	if len(r.Kinematics) > 0 {
		spec.Conventions = append(spec.Conventions, "on shell: "+strings.Join(r.Kinematics, ", "))
	}
	if mb.ScaleSet {
		spec.Scale = mb.Scale
	}
	for _, ra := range mb.Ratios {
		spec.Params = append(spec.Params, emit.Param{Name: ra.Name, Kind: emit.Ratio, Num: ra.Num, Den: ra.Den})
	}
	for _, n := range p.DeclOrder {
		d := p.Decls[n]
		switch d.Kind {
		case notation.KindMass, notation.KindLight:
			spec.Params = append(spec.Params, emit.Param{Name: n, Kind: emit.Mass})
		}
	}
	spec.Params = append(spec.Params, emit.Param{Name: "mu", Kind: emit.Scale})
	for _, n := range p.DeclOrder {
		switch p.Decls[n].Kind {
		case notation.KindCoupling, notation.KindSymbol, notation.KindGauge:
			spec.Params = append(spec.Params, emit.Param{Name: n, Kind: emit.Real})
		case notation.KindComplex:
			spec.Params = append(spec.Params, emit.Param{Name: n, Kind: emit.Complex})
		}
	}
	numSet := set
	if subst {
		numSet = nil
	}
	if vals, err := numericValues(p, numSet); err == nil {
		spec.Values = vals
	}
	ops := map[string]*notation.Operator{}
	for _, o := range p.Operators {
		ops[o.Name] = o
	}
	for _, c := range r.Coeffs {
		e := c.InRatios
		if subst {
			for n, v := range set {
				rv, ok := v.AsRatFunc()
				if !ok || !rv.IsConst() {
					return spec, fmt.Errorf("--set %s: emit substitutes exact values; %s is not a rational number", n, v)
				}
				var err error
				if e, err = e.Subst(n, rv); err != nil {
					return spec, fmt.Errorf("--set %s: %v", n, err)
				}
			}
		}
		def := c.Operator
		if o, ok := ops[c.Operator]; ok {
			def = c.Operator + " = " + strings.TrimSpace(o.Text)
		}
		spec.Coeffs = append(spec.Coeffs, emit.Coefficient{Name: "C" + goName(c.Operator), Label: "C_" + c.Operator, Operator: def, Expr: e})
	}
	return spec, nil
}

// goName turns an operator name into the tail of an exported Go identifier.
func goName(s string) string {
	var sb strings.Builder
	for _, r := range s {
		if r < 128 && (unicode.IsLetter(r) || unicode.IsDigit(r)) {
			sb.WriteRune(r)
		} else {
			sb.WriteRune('_')
		}
	}
	return sb.String()
}

// packageName derives a Go package name from a file name: "dipole_vlf.lm" → "dipolevlf".
func packageName(file string) string {
	base := strings.TrimSuffix(filepath.Base(file), filepath.Ext(file))
	var sb strings.Builder
	for _, r := range strings.ToLower(base) {
		if r < 128 && (unicode.IsLetter(r) || unicode.IsDigit(r) && sb.Len() > 0) {
			sb.WriteRune(r)
		}
	}
	s := sb.String()
	if s == "" || token.IsKeyword(s) {
		s = "coeffs"
	}
	return s
}

func isPackageName(s string) bool {
	if s == "" || !token.IsIdentifier(s) || token.IsKeyword(s) {
		return false
	}
	for _, r := range s {
		if r >= 128 || unicode.IsUpper(r) {
			return false
		}
	}
	return true
}
