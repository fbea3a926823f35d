package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/dirac"
	"loopmatch/expr/notation"
)

var checkCmd = &command{
	name:    "check",
	summary: "parse and validate a .lm file and print its amplitudes in canonical form",
	usage:   "FILE [--format text|latex|json]",
	help: `check reads a .lm file, reports the first error with file:line:col, and otherwise prints
the declarations, external legs, each amplitude in canonical form (one term per line, Dirac
chains simplified: NDR, on-shell external legs), the operators and the match blocks.`,
}

func checkFlags() (*flag.FlagSet, *format) {
	fs := flag.NewFlagSet("check", flag.ContinueOnError)
	f := newFormat("text", "latex", "json")
	fs.Var(f, "format", "output format: text, latex or json")
	return fs, f
}

func init() {
	flagSets["check"] = func() *flag.FlagSet { fs, _ := checkFlags(); return fs }
	checkCmd.run = runCheck
}

func runCheck(args []string, out, errOut io.Writer) int {
	fs, f := checkFlags()
	pos, ok := parseFlags(fs, args, errOut)
	if !ok {
		return exitBadInput
	}
	if len(pos) != 1 {
		fmt.Fprintln(errOut, "loopmatch check: expected one FILE argument")
		return exitBadInput
	}
	p, err := loadProgram(pos[0])
	if err != nil {
		fmt.Fprintln(errOut, err)
		return exitBadInput
	}
	// Dirac and colour algebra on every amplitude (NDR, on-shell legs).
	for _, a := range p.Amplitudes {
		s, err := simplifyChains(p, a.Body)
		if err != nil {
			fmt.Fprintf(errOut, "%s: amplitude %s: %v\n", a.Pos, a.Name, err)
			return exitBadInput
		}
		a.Body = s
	}
	switch f.value {
	case "json":
		writeCheckJSON(out, p)
	case "latex":
		writeCheckLaTeX(out, p)
	default:
		writeCheckText(out, p)
	}
	return exitOK
}

// diracKinematics describes the file's legs for the Dirac algebra.
func diracKinematics(p *notation.Program) dirac.Kinematics {
	var k dirac.Kinematics
	for _, l := range p.Legs {
		m := expr.RFInt(0)
		if l.Mass != "" {
			m = expr.RFVar(l.Mass)
		}
		k.Legs = append(k.Legs, dirac.Leg{Name: l.Name, Mom: l.Mom, Mass: m, Coloured: l.Colour != ""})
	}
	return k
}

// simplifyChains brings the chains of e to the canonical form of the Dirac algebra, using the
// file's declared indices as names for contracted pairs.
func simplifyChains(p *notation.Program, e expr.Expr) (expr.Expr, error) {
	opt := dirac.Options{Dummies: p.NamesOf(notation.KindIndex), ColourDummies: p.NamesOf(notation.KindAdjoint)}
	e, err := dirac.EvalTraces(e, opt)
	if err != nil {
		return expr.Expr{}, err
	}
	s, _, err := dirac.Simplify(e, diracKinematics(p), opt)
	return s, err
}

// loadProgram reads a .lm file and returns a positioned error on failure.
func loadProgram(path string) (*notation.Program, error) {
	p, err := notation.ParseFile(path)
	if err != nil {
		var pe *os.PathError
		if errors.As(err, &pe) {
			return nil, fmt.Errorf("loopmatch: cannot read %s: %v", path, pe.Err)
		}
		return nil, err
	}
	return p, nil
}

// declKeyword is the declaration keyword of each kind, for printing declarations as written.
var declKeyword = map[notation.Kind]string{
	notation.KindCoupling: "couplings", notation.KindComplex: "complex", notation.KindMass: "masses",
	notation.KindLight: "light", notation.KindSymbol: "symbols", notation.KindGauge: "gauge",
	notation.KindIndex: "index", notation.KindColour: "colour", notation.KindAdjoint: "adjoint",
	notation.KindMomentum: "momenta",
}

var kindOrder = []notation.Kind{
	notation.KindCoupling, notation.KindComplex, notation.KindMass, notation.KindLight,
	notation.KindSymbol, notation.KindGauge, notation.KindIndex, notation.KindColour,
	notation.KindAdjoint, notation.KindMomentum,
}

// termLines prints a sum with one term per line.
func termLines(e expr.Expr, indent string) string {
	if e.IsZero() {
		return indent + "  0"
	}
	var sb strings.Builder
	for i, t := range e.Terms() {
		s := t.String()
		switch {
		case i == 0 && strings.HasPrefix(s, "-"):
			sb.WriteString(indent + "- " + s[1:])
		case i == 0:
			sb.WriteString(indent + "  " + s)
		case strings.HasPrefix(s, "-"):
			sb.WriteString("\n" + indent + "- " + s[1:])
		default:
			sb.WriteString("\n" + indent + "+ " + s)
		}
	}
	return sb.String()
}

func legText(l *notation.Leg) string {
	dir := "out"
	if l.In {
		dir = "in"
	}
	s := fmt.Sprintf("%s: %s %s, momentum %s", l.Name, l.Type, dir, l.Mom)
	if l.Mass != "" {
		s += ", mass " + l.Mass
	} else if l.Type == "fermion" || l.Type == "antifermion" || l.Type == "scalar" {
		s += ", massless"
	}
	if l.Pol != "" {
		s += ", polarization " + l.Pol
	}
	if l.Colour != "" {
		s += ", colour " + l.Colour
	}
	return s
}

func plural(n int, word string) string {
	if n == 1 {
		return fmt.Sprintf("1 %s", word)
	}
	return fmt.Sprintf("%d %ss", n, word)
}

func writeCheckText(w io.Writer, p *notation.Program) {
	fmt.Fprintf(w, "file %s\n", p.File)
	fmt.Fprintln(w, "declarations")
	for _, k := range kindOrder {
		if names := p.NamesOf(k); len(names) > 0 {
			fmt.Fprintf(w, "  %-9s %s\n", declKeyword[k], strings.Join(names, " "))
		}
	}
	if len(p.ValueOrder) > 0 {
		var vs []string
		for _, n := range p.ValueOrder {
			vs = append(vs, n+" = "+p.Values[n].String())
		}
		fmt.Fprintf(w, "  %-9s %s\n", "values", strings.Join(vs, ", "))
	}
	if len(p.Legs) > 0 {
		fmt.Fprintln(w, "external legs")
		for _, l := range p.Legs {
			fmt.Fprintf(w, "  %s\n", legText(l))
		}
	}
	for _, a := range p.Amplitudes {
		kind := "amplitude"
		if a.Counterterm {
			kind = "counterterm"
		}
		fmt.Fprintf(w, "%s %s (%s) =\n%s\n", kind, a.Name, plural(a.Body.Len(), "term"), termLines(a.Body, "  "))
	}
	if len(p.Operators) > 0 {
		fmt.Fprintln(w, "operators")
		for _, o := range p.Operators {
			fmt.Fprintf(w, "  %s = %s\n", o.Name, o.Text)
		}
	}
	for _, m := range p.Matches {
		fmt.Fprintf(w, "match %s onto %s\n", strings.Join(m.Amps, ", "), strings.Join(m.Ops, ", "))
		fmt.Fprintf(w, "  normalization: %s\n", m.Norm)
		if m.HasExpand {
			fmt.Fprintf(w, "  expand: %s to order %d\n", strings.Join(m.Expand, ", "), m.Order)
		}
		if len(m.Scheme) > 0 {
			fmt.Fprintf(w, "  scheme: %s\n", strings.Join(m.Scheme, " "))
		}
		if m.ScaleSet {
			fmt.Fprintf(w, "  scale: mu = %s\n", m.Scale)
		}
		fmt.Fprintf(w, "  route: %s\n", m.Route)
		for _, op := range m.ExpectOrder {
			fmt.Fprintf(w, "  expect: C_%s = %s\n", op, m.Expect[op])
		}
	}
	fmt.Fprintf(w, "ok: %s, %s, %s\n", plural(len(p.Amplitudes), "amplitude"), plural(len(p.Operators), "operator"), plural(len(p.Matches), "match block"))
}

func writeCheckLaTeX(w io.Writer, p *notation.Program) {
	fmt.Fprintf(w, "%% loopmatch check %s\n", p.File)
	for _, a := range p.Amplitudes {
		fmt.Fprintf(w, "\\begin{align}\n  i\\mathcal{M}_{\\mathrm{%s}} &= ", strings.ReplaceAll(a.Name, "_", `\_`))
		for i, t := range a.Body.Terms() {
			s := t.LaTeX()
			switch {
			case i == 0:
				fmt.Fprint(w, s)
			case strings.HasPrefix(s, "-"):
				fmt.Fprintf(w, " \\nonumber\\\\\n  &\\quad - %s", s[1:])
			default:
				fmt.Fprintf(w, " \\nonumber\\\\\n  &\\quad + %s", s)
			}
		}
		if a.Body.IsZero() {
			fmt.Fprint(w, "0")
		}
		fmt.Fprint(w, "\n\\end{align}\n")
	}
}

type jsonLeg struct {
	Name     string `json:"name"`
	Type     string `json:"type"`
	In       bool   `json:"incoming"`
	Momentum string `json:"momentum"`
	Mass     string `json:"mass,omitempty"`
	Pol      string `json:"polarization,omitempty"`
	Colour   string `json:"colour,omitempty"`
}

type jsonAmp struct {
	Name        string   `json:"name"`
	Counterterm bool     `json:"counterterm,omitempty"`
	Terms       []string `json:"terms"`
	Text        string   `json:"text"`
}

type jsonMatch struct {
	Amplitudes []string          `json:"amplitudes"`
	Operators  []string          `json:"operators"`
	Norm       string            `json:"normalization"`
	Expand     []string          `json:"expand,omitempty"`
	Order      int               `json:"order"`
	Scheme     []string          `json:"scheme,omitempty"`
	Scale      string            `json:"scale,omitempty"`
	Route      string            `json:"route"`
	Expect     map[string]string `json:"expect,omitempty"`
}

func writeCheckJSON(w io.Writer, p *notation.Program) {
	doc := struct {
		File         string              `json:"file"`
		Declarations map[string][]string `json:"declarations"`
		Legs         []jsonLeg           `json:"legs"`
		Amplitudes   []jsonAmp           `json:"amplitudes"`
		Operators    map[string]string   `json:"operators"`
		Matches      []jsonMatch         `json:"matches"`
	}{File: p.File, Declarations: map[string][]string{}, Operators: map[string]string{}}
	for _, k := range kindOrder {
		if names := p.NamesOf(k); len(names) > 0 {
			doc.Declarations[declKeyword[k]] = names
		}
	}
	for _, l := range p.Legs {
		doc.Legs = append(doc.Legs, jsonLeg{l.Name, l.Type, l.In, l.Mom.String(), l.Mass, l.Pol, l.Colour})
	}
	for _, a := range p.Amplitudes {
		ja := jsonAmp{Name: a.Name, Counterterm: a.Counterterm, Text: a.Body.String(), Terms: []string{}}
		for _, t := range a.Body.Terms() {
			ja.Terms = append(ja.Terms, t.String())
		}
		doc.Amplitudes = append(doc.Amplitudes, ja)
	}
	for _, o := range p.Operators {
		doc.Operators[o.Name] = o.Text
	}
	for _, m := range p.Matches {
		jm := jsonMatch{Amplitudes: m.Amps, Operators: m.Ops, Norm: m.Norm.String(), Expand: m.Expand, Order: m.Order, Scheme: m.Scheme, Route: m.Route}
		if m.ScaleSet {
			jm.Scale = m.Scale.String()
		}
		if len(m.Expect) > 0 {
			jm.Expect = map[string]string{}
			for k, v := range m.Expect {
				jm.Expect["C_"+k] = v.String()
			}
		}
		doc.Matches = append(doc.Matches, jm)
	}
	writeJSON(w, doc)
}
