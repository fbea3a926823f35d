package emit

import (
	"encoding/json"
	"fmt"
	"math"
	"strings"
)

// This file writes a Program as JSON: the coefficients as text and LaTeX, their split into
// factors and auxiliary functions, and for every auxiliary function its series branches with
// their float64 coefficients, so that other languages can reproduce the stable evaluation.

type jsonParam struct {
	Name       string `json:"name"`
	Kind       string `json:"kind"`
	Definition string `json:"definition,omitempty"`
}

type jsonTerm struct {
	Factor   string `json:"factor"`
	Function string `json:"function,omitempty"`
}

type jsonCoeff struct {
	Name      string     `json:"name"`
	GoName    string     `json:"go_name"`
	Operator  string     `json:"operator"`
	Arguments []string   `json:"arguments"`
	Real      bool       `json:"real"`
	Text      string     `json:"text"`
	LaTeX     string     `json:"latex"`
	Common    string     `json:"common_factor"`
	Terms     []jsonTerm `json:"terms"`
}

type jsonBranch struct {
	Kind     string      `json:"kind"` // "around", "small", "large"
	At       string      `json:"at,omitempty"`
	Variable string      `json:"variable"`
	Lo       *float64    `json:"from,omitempty"`
	Hi       *float64    `json:"to,omitempty"`
	Low      int         `json:"lowest_power"`
	Coef     [][]float64 `json:"coefficients"` // [j][n]: coefficient of log(x)^j · v^(lowest_power+n)
}

type jsonFunc struct {
	Name      string       `json:"name"`
	Variables []string     `json:"variables"`
	Text      string       `json:"text"`
	LaTeX     string       `json:"latex"`
	Series    []jsonBranch `json:"series,omitempty"`
	Zeros     []float64    `json:"zeros,omitempty"`
	Poles     []string     `json:"poles,omitempty"`
	Notes     []string     `json:"notes,omitempty"`
}

type jsonDoc struct {
	Source      string      `json:"source"`
	Match       string      `json:"match"`
	Conventions []string    `json:"conventions"`
	Scale       string      `json:"scale,omitempty"`
	Tolerance   [2]float64  `json:"tolerance"` // relative, and relative to the local maximum
	Domain      [2]float64  `json:"domain"`
	Parameters  []jsonParam `json:"parameters"`
	Coeffs      []jsonCoeff `json:"coefficients"`
	Functions   []jsonFunc  `json:"functions"`
	Notes       []string    `json:"notes,omitempty"`
}

// JSON returns the program as indented JSON.
func (p *Program) JSON() ([]byte, error) {
	d := jsonDoc{Source: p.Spec.Source, Match: p.Spec.Title, Conventions: append([]string{}, p.Spec.Conventions...),
		Tolerance: [2]float64{Tolerance.Rel, Tolerance.Abs}, Domain: [2]float64{Domain.Lo, Domain.Hi}, Notes: p.Notes}
	if !p.Spec.Scale.IsZero() {
		d.Scale = "mu = " + p.Spec.Scale.String()
	}
	for _, par := range p.Spec.Params {
		jp := jsonParam{Name: par.Name, Kind: par.Kind.String()}
		if par.Kind == Ratio && par.Num != "" {
			jp.Definition = par.Doc()
		}
		d.Parameters = append(d.Parameters, jp)
	}
	for _, c := range p.Coeffs {
		jc := jsonCoeff{Name: c.Label, GoName: c.Name, Operator: c.Operator, Arguments: []string{}, Real: c.Real,
			Text: c.Expr.String(), LaTeX: exprLaTeX(c.Expr), Common: c.Common.String(), Terms: []jsonTerm{}}
		for _, a := range c.Args {
			jc.Arguments = append(jc.Arguments, a.Name)
		}
		for _, t := range c.Terms {
			jt := jsonTerm{Factor: t.Factor.String()}
			if t.Part != nil {
				jt.Function = p.partName(t.Part)
			}
			jc.Terms = append(jc.Terms, jt)
		}
		d.Coeffs = append(d.Coeffs, jc)
	}
	for _, part := range p.Parts {
		jf := jsonFunc{Name: p.partName(part), Variables: part.Vars, Text: strings.Join(FormulaLines(part.Expr), " "), LaTeX: exprLaTeX(part.Expr)}
		if fn := part.fn; fn != nil {
			x := part.Vars[0]
			for _, b := range fn.branches {
				jb := jsonBranch{Low: b.low}
				switch b.kind {
				case around:
					jb.Kind, jb.At = "around", b.at.RatString()
					jb.Variable = "w = (" + x + " - " + b.at.RatString() + ")/(" + x + " + " + b.at.RatString() + ")"
				case atZero:
					jb.Kind, jb.Variable = "small", x
				case atInf:
					jb.Kind, jb.Variable = "large", "1/"+x
				}
				if !math.IsInf(b.lo, 0) {
					jb.Lo = ptr(b.lo)
				}
				if !math.IsInf(b.hi, 0) {
					jb.Hi = ptr(b.hi)
				}
				for _, row := range b.coef {
					fs := make([]float64, b.terms)
					for i := range fs {
						fs[i], _ = row[i].Float64()
					}
					jb.Coef = append(jb.Coef, fs)
				}
				jf.Series = append(jf.Series, jb)
			}
			jf.Zeros = fn.zeros
			for _, q := range fn.poles {
				jf.Poles = append(jf.Poles, q.RatString())
			}
			jf.Notes = fn.notes
		}
		d.Functions = append(d.Functions, jf)
	}
	return json.MarshalIndent(d, "", "  ")
}

// partName is F_i's name in JSON, or the coefficient's label for a function written inside it.
func (p *Program) partName(part *Part) string {
	if part.inline {
		return p.partLabel(part)
	}
	return fmt.Sprintf("F%d", part.Index)
}

func ptr(f float64) *float64 { return &f }
