package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"slices"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/loops"
	"loopmatch/match"
)

var matchCmd = &command{
	name:    "match",
	summary: "compute the Wilson coefficients of the match blocks of a .lm file",
	usage:   "FILE [--set name=value,…] [--format text|latex|json] [--evolve-to MU]",
	help: `match runs every match block of FILE. On the heavy-mass route (the default) the
full-theory amplitudes, at one or two loops, are expanded in the declared small quantities,
their loop integrals reduced and evaluated exactly in the heavy masses; on the general route
(route general) full and effective-theory amplitudes are reduced by Passarino-Veltman at the
block's kinematics and subtracted. Then the Dirac algebra and the on-shell kinematics are
applied, the result expanded in eps, renormalised in MS-bar and projected onto the declared
operators. It prints the Wilson coefficients C_i(mu) in the conventions it states, and the
built-in checks (poles, scale dependence, Ward identities, gauge parameter, regulators,
expected values; docs/GENERAL.md). With the file's values or --set (which overrides them and
the scale) the coefficients are also evaluated numerically, to float64 accuracy.

Exit codes: 0 all checks passed, 1 a check failed or the amplitude has structures the operators
do not span (they are printed), 2 bad input.`,
}

type matchOpts struct {
	set      string
	format   *format
	evolveTo string // --evolve-to (evolve.go)
}

func matchFlags() (*flag.FlagSet, *matchOpts) {
	fs := flag.NewFlagSet("match", flag.ContinueOnError)
	o := &matchOpts{format: newFormat("text", "latex", "json")}
	fs.StringVar(&o.set, "set", "", "numerical values, e.g. mF=1000,mS=1500,mu=1500")
	fs.Var(o.format, "format", "output format: text, latex or json")
	fs.StringVar(&o.evolveTo, "evolve-to", "", "also run the numerical coefficients from the match scale to this scale in GeV with the file's anomalous block")
	return fs, o
}

func init() {
	flagSets["match"] = func() *flag.FlagSet { fs, _ := matchFlags(); return fs }
	matchCmd.run = runMatch
}

// parseSet reads "a=1,b=2.5" (values may be expressions of numbers) into exact values.
func parseSet(s string) (map[string]expr.Expr, []string, error) {
	vals := map[string]expr.Expr{}
	var order []string
	if strings.TrimSpace(s) == "" {
		return vals, nil, nil
	}
	for _, kv := range strings.Split(s, ",") {
		k, v, ok := strings.Cut(kv, "=")
		k = strings.TrimSpace(k)
		if !ok || k == "" {
			return nil, nil, fmt.Errorf("--set: expected name=value, found %q", kv)
		}
		e, err := notation.ParseFreeExpr(v)
		if err != nil {
			return nil, nil, fmt.Errorf("--set %s: %v", k, err)
		}
		if r, ok := e.AsRatFunc(); !ok || !r.IsConst() {
			if _, err := e.Eval(nil); err != nil {
				return nil, nil, fmt.Errorf("--set %s: the value must be a number, found %s", k, v)
			}
		}
		if _, dup := vals[k]; !dup {
			order = append(order, k)
		}
		vals[k] = e
	}
	return vals, order, nil
}

// coefficientValue evaluates a Wilson coefficient at the values: exactly to float64 accuracy
// (closed forms cancel strongly near equal masses), or, when it holds scalar integrals (general
// route), with their MS-bar finite parts at the block's scale in arbitrary precision.
func coefficientValue(e expr.Expr, vals map[string]complex128, mb *notation.MatchBlock) (complex128, error) {
	if !hasScalarIntegral(e) {
		return e.EvalAccurate(vals)
	}
	pt := map[string]float64{}
	for n, v := range vals {
		if imag(v) != 0 {
			return 0, fmt.Errorf("the scalar integrals of the general route need real values; %s = %v", n, v)
		}
		pt[n] = real(v)
	}
	if mb.ScaleSet {
		mu, err := mb.Scale.EvalAccurate(vals)
		if err != nil {
			return 0, fmt.Errorf("scale: %v", err)
		}
		pt["mu"] = real(mu)
	}
	if _, ok := pt["mu"]; !ok {
		return 0, fmt.Errorf("the scalar integrals need the scale: give a scale line or --set mu=…")
	}
	v, err := match.EvalFinite(e, pt)
	if math.Abs(imag(v)) < 1e-30*math.Abs(real(v)) {
		v = complex(real(v), 0) // rounding residue of the 256-bit evaluation
	}
	return v, err
}

func hasScalarIntegral(e expr.Expr) bool {
	for _, t := range e.Terms() {
		for _, a := range t.Atoms {
			if loops.IsScalarAtom(a.A) {
				return true
			}
		}
	}
	return false
}

// numericValues merges the file's values with --set (which wins) and evaluates them.
func numericValues(p *notation.Program, set map[string]expr.Expr) (map[string]complex128, error) {
	out := map[string]complex128{}
	for _, n := range p.ValueOrder {
		v, err := p.Values[n].Eval(out)
		if err != nil {
			return nil, fmt.Errorf("value of %s: %v", n, err)
		}
		out[n] = v
	}
	for n, e := range set {
		if _, ok := p.Decls[n]; !ok && n != "mu" {
			return nil, fmt.Errorf("--set: %s is not declared in %s", n, p.File)
		}
		v, err := e.Eval(out)
		if err != nil {
			return nil, fmt.Errorf("--set %s: %v", n, err)
		}
		out[n] = v
	}
	return out, nil
}

func formatComplex(z complex128) string {
	if imag(z) == 0 {
		return fmt.Sprintf("%.12g", real(z))
	}
	if real(z) == 0 {
		return fmt.Sprintf("%.12g*I", imag(z))
	}
	sign := "+"
	if imag(z) < 0 {
		sign = "-"
	}
	return fmt.Sprintf("%.12g %s %.12g*I", real(z), sign, math.Abs(imag(z)))
}

type matchOut struct {
	res     *match.Result
	numbers []complex128 // per coefficient, when values were given
	numErr  error
	at      string // the values used, as text
}

func runMatch(args []string, out, errOut io.Writer) int {
	fs, o := matchFlags()
	pos, ok := parseFlags(fs, args, errOut)
	if !ok {
		return exitBadInput
	}
	if len(pos) != 1 {
		fmt.Fprintln(errOut, "loopmatch match: expected one FILE argument")
		return exitBadInput
	}
	p, err := loadProgram(pos[0])
	if err != nil {
		fmt.Fprintln(errOut, err)
		return exitBadInput
	}
	if len(p.Matches) == 0 {
		fmt.Fprintf(errOut, "loopmatch match: %s has no match block\n", p.File)
		return exitBadInput
	}
	set, _, err := parseSet(o.set)
	if err != nil {
		fmt.Fprintf(errOut, "loopmatch match: %v\n", err)
		return exitBadInput
	}
	var results []matchOut
	code := exitOK
	for _, mb := range p.Matches {
		if mu, ok := set["mu"]; ok {
			mb.Scale, mb.ScaleSet = mu, true
		}
		r, err := match.Run(p, mb, match.Options{})
		if err != nil {
			var pe *match.ProjectionError
			if errors.As(err, &pe) {
				fmt.Fprintf(errOut, "%s: match %s onto %s:\n%v\n", mb.Pos, strings.Join(mb.Amps, ", "), strings.Join(mb.Ops, ", "), err)
				return exitCheck
			}
			fmt.Fprintln(errOut, err)
			return exitBadInput
		}
		mo := matchOut{res: r}
		if len(set) > 0 || len(p.Values) > 0 {
			vals, err := numericValues(p, set)
			if err != nil {
				fmt.Fprintf(errOut, "loopmatch match: %v\n", err)
				return exitBadInput
			}
			mo.at = valuesText(p, vals)
			for _, c := range r.Coeffs {
				v, err := coefficientValue(c.Value, vals, mb)
				if err != nil {
					mo.numErr = err
					break
				}
				mo.numbers = append(mo.numbers, v)
			}
		}
		if r.Failed() {
			code = exitCheck
		}
		results = append(results, mo)
	}
	if o.evolveTo != "" { // --evolve-to: evolve.go runs and prints match and evolution
		return finishEvolveTo(out, errOut, p, results, set, o.evolveTo, o.format.value, code)
	}
	switch o.format.value {
	case "json":
		writeMatchJSON(out, p, results)
	case "latex":
		writeMatchLaTeX(out, p, results)
	default:
		writeMatchText(out, p, results)
	}
	return code
}

// prettyLines prints a sum with factored coefficients, one term per line.
func prettyLines(e expr.Expr, indent string) string {
	if e.IsZero() {
		return indent + "  0"
	}
	var sb strings.Builder
	for i, t := range e.Terms() {
		s := expr.FromTerm(t).Pretty()
		sign := "+ "
		if strings.HasPrefix(s, "-") {
			sign, s = "- ", s[1:]
		} else if i == 0 {
			sign = "  "
		}
		if i > 0 {
			sb.WriteString("\n")
		}
		sb.WriteString(indent + sign + s)
	}
	return sb.String()
}

func passWord(ok bool) string {
	if ok {
		return "passed"
	}
	return "FAILED"
}

func writeMatchText(w io.Writer, p *notation.Program, rs []matchOut) {
	for _, mo := range rs {
		r := mo.res
		mb := r.Block
		fmt.Fprintf(w, "match %s onto %s  (%s)\n", strings.Join(mb.Amps, ", "), strings.Join(mb.Ops, ", "), mb.Pos)
		fmt.Fprintln(w, "conventions")
		for _, c := range r.Conventions {
			fmt.Fprintf(w, "  %s\n", c)
		}
		if len(r.Kinematics) > 0 {
			fmt.Fprintf(w, "  on shell: %s\n", strings.Join(r.Kinematics, ", "))
		}
		scale := "mu"
		if mb.ScaleSet {
			scale = mb.Scale.String()
		}
		fmt.Fprintf(w, "Wilson coefficients at mu = %s\n", scale)
		var ratios []string
		for _, ra := range mb.Ratios {
			ratios = append(ratios, fmt.Sprintf("%s = %s^2/%s^2", ra.Name, ra.Num, ra.Den))
		}
		if len(ratios) > 0 {
			fmt.Fprintf(w, "  (with %s)\n", strings.Join(ratios, ", "))
		}
		for _, c := range r.Coeffs {
			fmt.Fprintf(w, "  C_%s =\n%s\n", c.Operator, prettyLines(c.InRatios, "    "))
		}
		if mo.numErr != nil {
			fmt.Fprintf(w, "numerical values: not available (%v)\n", mo.numErr)
		} else if len(mo.numbers) > 0 {
			fmt.Fprintf(w, "numerical values at %s\n", mo.at)
			for i, c := range r.Coeffs {
				fmt.Fprintf(w, "  C_%s = %s\n", c.Operator, formatComplex(mo.numbers[i]))
			}
		}
		fmt.Fprintln(w, "checks")
		for _, c := range slices.Concat(r.Checks, r.Expectations) {
			fmt.Fprintf(w, "  %-6s  %s\n          %s\n", passWord(c.Passed), c.Name, c.Detail)
		}
		if len(r.Notes) > 0 {
			fmt.Fprintln(w, "notes")
			for _, n := range r.Notes {
				fmt.Fprintf(w, "  %s\n", n)
			}
		}
		all := slices.Concat(r.Checks, r.Expectations)
		failed := 0
		for _, c := range all {
			if !c.Passed {
				failed++
			}
		}
		if failed == 0 {
			fmt.Fprintf(w, "result: all %d checks passed\n", len(all))
		} else {
			fmt.Fprintf(w, "result: %d of %d checks FAILED\n", failed, len(all))
		}
	}
}

// valuesText lists the numerical values used, in declaration order.
func valuesText(p *notation.Program, vals map[string]complex128) string {
	var parts []string
	names := append(slices.Clone(p.DeclOrder), "mu")
	for _, n := range names {
		v, ok := vals[n]
		if !ok {
			continue
		}
		parts = append(parts, n+" = "+formatComplex(v))
	}
	return strings.Join(parts, ", ")
}

func writeMatchLaTeX(w io.Writer, p *notation.Program, rs []matchOut) {
	for _, mo := range rs {
		r := mo.res
		fmt.Fprintf(w, "%% loopmatch match %s: %s onto %s\n", p.File, strings.Join(r.Block.Amps, ", "), strings.Join(r.Block.Ops, ", "))
		for _, c := range r.Conventions {
			fmt.Fprintf(w, "%% %s\n", c)
		}
		fmt.Fprintln(w, "\\begin{align}")
		for i, c := range r.Coeffs {
			sep := " \\\\"
			if i == len(r.Coeffs)-1 {
				sep = ""
			}
			fmt.Fprintf(w, "  C_{\\mathrm{%s}} &= %s%s\n", strings.ReplaceAll(c.Operator, "_", `\_`), c.InRatios.LaTeX(), sep)
		}
		fmt.Fprintln(w, "\\end{align}")
	}
}

func writeMatchJSON(w io.Writer, p *notation.Program, rs []matchOut) {
	type jcheck struct {
		Name   string `json:"name"`
		Passed bool   `json:"passed"`
		Detail string `json:"detail"`
	}
	type jblock struct {
		Amplitudes  []string `json:"amplitudes"`
		Operators   []string `json:"operators"`
		Conventions []string `json:"conventions"`
		Kinematics  []string `json:"on_shell"`
		Coeffs      []any    `json:"coefficients"`
		Checks      []jcheck `json:"checks"`
		Notes       []string `json:"notes,omitempty"`
	}
	doc := struct {
		File   string   `json:"file"`
		Blocks []jblock `json:"matches"`
	}{File: p.File}
	for _, mo := range rs {
		r := mo.res
		b := jblock{Amplitudes: r.Block.Amps, Operators: r.Block.Ops, Conventions: r.Conventions, Kinematics: r.Kinematics, Notes: r.Notes}
		for i, c := range r.Coeffs {
			m := map[string]any{"operator": c.Operator, "text": c.Value.String(), "latex": c.Value.LaTeX(), "text_in_ratios": c.InRatios.String()}
			if mo.numErr == nil && i < len(mo.numbers) {
				m["value"] = [2]float64{real(mo.numbers[i]), imag(mo.numbers[i])}
			}
			b.Coeffs = append(b.Coeffs, m)
		}
		for _, c := range slices.Concat(r.Checks, r.Expectations) {
			b.Checks = append(b.Checks, jcheck{c.Name, c.Passed, c.Detail})
		}
		doc.Blocks = append(doc.Blocks, b)
	}
	writeJSON(w, doc)
}
