package main

import (
	"fmt"
	"io"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/loops"
	"loopmatch/match"
)

// generalAmp is one amplitude on the general route: its parts grouped by scalar integral.
type generalAmp struct {
	name  string
	parts []expr.Group // by scalar integral; the group without one holds the tree terms
	notes []string
}

// reduceGeneral prints every amplitude of p as a combination of scalar integrals (the general
// route of "loopmatch reduce" without --expand).
func reduceGeneral(p *notation.Program, format string, out, errOut io.Writer) int {
	var res []generalAmp
	for _, a := range p.Amplitudes {
		e, notes, err := match.ReduceGeneral(p, a.Body, match.Options{})
		if err != nil {
			fmt.Fprintf(errOut, "%s: amplitude %s: %v\n", a.Pos, a.Name, err)
			return exitBadInput
		}
		res = append(res, generalAmp{a.Name, e.Collect(loops.IsScalarAtom), notes})
	}
	what := "general route: Passarino–Veltman reduction at the on-shell kinematics, exact in d = 4 - 2*eps, NDR; scalar integrals with squared masses, loop factor i/(16 pi^2) included"
	atomText := func(g expr.Group) string {
		if len(g.Atoms) == 0 {
			return "1"
		}
		var parts []string
		for _, a := range g.Atoms {
			s := a.A.Key()
			if a.Pow != 1 {
				s = fmt.Sprintf("%s^%d", s, a.Pow)
			}
			parts = append(parts, s)
		}
		return strings.Join(parts, "*")
	}
	switch format {
	case "json":
		type jpart struct {
			Integral    string `json:"integral"`
			Coefficient string `json:"coefficient"`
		}
		type jamp struct {
			Name  string   `json:"name"`
			Parts []jpart  `json:"scalar_integrals"`
			Notes []string `json:"notes,omitempty"`
		}
		doc := struct {
			File       string `json:"file"`
			Method     string `json:"method"`
			Amplitudes []jamp `json:"amplitudes"`
		}{File: p.File, Method: what}
		for _, r := range res {
			j := jamp{Name: r.name, Notes: r.notes}
			for _, g := range r.parts {
				j.Parts = append(j.Parts, jpart{atomText(g), g.Coef.String()})
			}
			doc.Amplitudes = append(doc.Amplitudes, j)
		}
		writeJSON(out, doc)
	case "latex":
		fmt.Fprintf(out, "%% loopmatch reduce %s: %s\n", p.File, what)
		for _, r := range res {
			fmt.Fprintf(out, "\\begin{align}\n  i\\mathcal{M}_{\\mathrm{%s}} &= ", strings.ReplaceAll(r.name, "_", `\_`))
			if len(r.parts) == 0 {
				fmt.Fprint(out, "0")
			}
			for i, g := range r.parts {
				if i > 0 {
					fmt.Fprint(out, " \\nonumber\\\\\n  &\\quad + ")
				}
				fmt.Fprintf(out, "\\left(%s\\right)", g.Coef.LaTeX())
				for _, a := range g.Atoms {
					fmt.Fprintf(out, " %s", expr.FromAtom(a.A, a.Pow).LaTeX())
				}
			}
			fmt.Fprint(out, "\n\\end{align}\n")
		}
	default:
		fmt.Fprintf(out, "file %s: %s\n", p.File, what)
		for _, r := range res {
			fmt.Fprintf(out, "amplitude %s =\n", r.name)
			if len(r.parts) == 0 {
				fmt.Fprintln(out, "  0")
			}
			for _, g := range r.parts {
				fmt.Fprintf(out, "  [%s]\n%s\n", atomText(g), termLines(g.Coef, "    "))
			}
			for _, n := range r.notes {
				fmt.Fprintf(out, "  note: %s\n", n)
			}
		}
	}
	return exitOK
}
