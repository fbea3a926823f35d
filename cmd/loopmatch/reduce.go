package main

import (
	"flag"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/match"
	"loopmatch/passarino"
)

var reduceCmd = &command{
	name:    "reduce",
	summary: "reduce the loop integrals of each amplitude",
	usage:   "FILE [--expand p,q:ORDER] [--format text|latex|json]",
	help: `reduce prints each amplitude of FILE with its loop integrals reduced. Without --expand
(the general route) every one-loop integral is reduced by Passarino–Veltman at the on-shell
kinematics of the legs and each amplitude is printed as a combination of the scalar integrals
Tad(M0^2) = A0, Bub(p^2; M0^2, M1^2) = B0, Tri(…; …) = C0, Box(…; …) = D0 (squared masses),
exact in d, with the loop factor i/(16 pi^2) included; scalar products the legs leave free are
kept as symbols (p.q). With --expand, the
propagators are Taylor-expanded in the listed small quantities (external momenta and light
masses) to the given total order, tensor integrals are reduced by symmetric integration and the
vacuum integrals are evaluated exactly in d; fermion-loop traces and Dirac chains are simplified
(NDR, on-shell external legs); the result is printed as an eps-expansion (poles and finite part,
MS-bar, the loop factor i/(16 pi^2) included). Integrals without a scale after the expansion are
zero in dimensional regularisation and are listed.`,
}

type reduceOpts struct {
	expand string
	format *format
}

func reduceFlags() (*flag.FlagSet, *reduceOpts) {
	fs := flag.NewFlagSet("reduce", flag.ContinueOnError)
	o := &reduceOpts{format: newFormat("text", "latex", "json")}
	fs.StringVar(&o.expand, "expand", "", "small quantities and order, e.g. p,q,m1:2 (:0 when nothing is small)")
	fs.Var(o.format, "format", "output format: text, latex or json")
	return fs, o
}

func init() {
	flagSets["reduce"] = func() *flag.FlagSet { fs, _ := reduceFlags(); return fs }
	reduceCmd.run = runReduce
}

// parseExpand reads "p,q,m1:2" against the program's declarations.
func parseExpand(p *notation.Program, s string) (passarino.Small, error) {
	names, ord, ok := strings.Cut(s, ":")
	if !ok {
		return passarino.Small{}, fmt.Errorf("--expand: expected NAMES:ORDER, e.g. p,q:2, found %q", s)
	}
	n, err := strconv.Atoi(strings.TrimSpace(ord))
	if err != nil || n < 0 || n > 12 {
		return passarino.Small{}, fmt.Errorf("--expand: the order must be an integer from 0 to 12, found %q", ord)
	}
	sm := passarino.Small{Order: n}
	for _, name := range strings.Split(names, ",") {
		name = strings.TrimSpace(name)
		if name == "" {
			continue // "--expand :0": nothing small, vacuum integrals only
		}
		d, ok := p.Decls[name]
		switch {
		case !ok:
			return passarino.Small{}, fmt.Errorf("--expand: %s is not declared in %s", name, p.File)
		case d.Kind == notation.KindMomentum:
			sm.Momenta = append(sm.Momenta, name)
		case d.Kind == notation.KindLight:
			sm.Masses = append(sm.Masses, name)
		default:
			return passarino.Small{}, fmt.Errorf("--expand: %s is a %s; only momenta and light masses are expanded", name, d.Kind)
		}
	}
	return sm, nil
}

// reduced is one amplitude after reduction.
type reduced struct {
	name      string
	series    expr.Series
	scaleless []string
}

func runReduce(args []string, out, errOut io.Writer) int {
	fs, o := reduceFlags()
	pos, ok := parseFlags(fs, args, errOut)
	if !ok {
		return exitBadInput
	}
	if len(pos) != 1 {
		fmt.Fprintln(errOut, "loopmatch reduce: expected one FILE argument")
		return exitBadInput
	}
	p, err := loadProgram(pos[0])
	if err != nil {
		fmt.Fprintln(errOut, err)
		return exitBadInput
	}
	if o.expand == "" {
		return reduceGeneral(p, o.format.value, out, errOut)
	}
	small, err := parseExpand(p, o.expand)
	if err != nil {
		fmt.Fprintf(errOut, "loopmatch reduce: %v\n", err)
		return exitBadInput
	}
	var res []reduced
	for _, a := range p.Amplitudes {
		s, notes, err := match.Reduce(p, a.Body, small, match.Options{})
		if err != nil {
			fmt.Fprintf(errOut, "%s: amplitude %s: %v\n", a.Pos, a.Name, err)
			return exitBadInput
		}
		res = append(res, reduced{a.Name, s, notes})
	}
	what := fmt.Sprintf("heavy-mass expansion in %s to order %d; MS-bar, d = 4 - 2*eps, NDR", strings.Join(slices.Concat(small.Momenta, small.Masses), ", "), small.Order)
	switch o.format.value {
	case "json":
		type jamp struct {
			Name   string            `json:"name"`
			Coeffs map[string]string `json:"eps_coefficients"`
			Notes  []string          `json:"notes,omitempty"`
		}
		doc := struct {
			File       string `json:"file"`
			Method     string `json:"method"`
			Amplitudes []jamp `json:"amplitudes"`
		}{File: p.File, Method: what}
		for _, r := range res {
			j := jamp{Name: r.name, Coeffs: map[string]string{}, Notes: r.scaleless}
			for k := -2; k <= 0; k++ {
				j.Coeffs[strconv.Itoa(k)] = r.series.Coef(k).String()
			}
			doc.Amplitudes = append(doc.Amplitudes, j)
		}
		writeJSON(out, doc)
	case "latex":
		fmt.Fprintf(out, "%% loopmatch reduce %s: %s\n", p.File, what)
		for _, r := range res {
			fmt.Fprintf(out, "\\begin{align}\n  i\\mathcal{M}_{\\mathrm{%s}} &= ", strings.ReplaceAll(r.name, "_", `\_`))
			first := true
			for k := -2; k <= 0; k++ {
				c := r.series.Coef(k)
				if c.IsZero() {
					continue
				}
				if !first {
					fmt.Fprint(out, " \\nonumber\\\\\n  &\\quad + ")
				}
				first = false
				fmt.Fprintf(out, "\\left(%s\\right)", c.LaTeX())
				if k < 0 {
					fmt.Fprintf(out, "\\frac{1}{\\epsilon^{%d}}", -k)
				}
			}
			if first {
				fmt.Fprint(out, "0")
			}
			fmt.Fprint(out, " + \\mathcal{O}(\\epsilon)\n\\end{align}\n")
		}
	default:
		fmt.Fprintf(out, "file %s: %s\n", p.File, what)
		for _, r := range res {
			fmt.Fprintf(out, "amplitude %s =\n", r.name)
			for k := -2; k <= 0; k++ {
				c := r.series.Coef(k)
				if c.IsZero() {
					continue
				}
				label := "eps^0"
				if k < 0 {
					label = fmt.Sprintf("1/eps^%d", -k)
				}
				fmt.Fprintf(out, "  [%s]\n%s\n", label, termLines(c, "    "))
			}
			if r.series.IsZero() {
				fmt.Fprintln(out, "  0")
			}
			fmt.Fprintln(out, "  + O(eps)")
			for _, s := range r.scaleless {
				fmt.Fprintf(out, "  note: %s\n", s)
			}
		}
	}
	return exitOK
}
