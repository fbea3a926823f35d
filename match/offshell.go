package match

import (
	"fmt"
	"slices"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/passarino"
)

// applyEOM turns the coefficients of an off-shell match into on-shell ones. Every operator
// marked eom vanishes by the equations of motion or reduces to the others: its on-shell matrix
// element is projected onto the on-shell matrix elements of the remaining (physical) operators,
// ⟨Q_E⟩ = Σ_j r_Ej ⟨Q_j⟩, and C_j(on shell) = C_j(off shell) + Σ_E r_Ej C_E. The result keeps
// the physical operators; with "offshell report" the off-shell coefficients follow, named
// "NAME (off shell)".
func applyEOM(p *notation.Program, mb *notation.MatchBlock, opt Options, res *Result) error {
	// on-shell matrix elements: the legs' kinematics only (the block's kinematics lines give
	// off-shell values)
	on, err := NewCanon(p, passarino.Small{}, false, opt)
	if err != nil {
		return err
	}
	var phys []string
	var basis []expr.Expr
	me := func(name string) (expr.Expr, error) {
		m, err := p.MatrixElement(operatorByName(p, name))
		if err != nil {
			return expr.Expr{}, err
		}
		return on.Apply(m)
	}
	for _, o := range mb.Ops {
		if slices.Contains(mb.EOM, o) {
			continue
		}
		m, err := me(o)
		if err != nil {
			return fmt.Errorf("operator %s on shell: %v", o, err)
		}
		phys = append(phys, o)
		basis = append(basis, m)
	}
	off := map[string]Coefficient{}
	for _, c := range res.Coeffs {
		off[c.Operator] = c
	}
	onC := map[string]expr.Expr{}
	for _, o := range phys {
		onC[o] = off[o].Value
	}
	var rules []string
	for _, e := range mb.EOM {
		m, err := me(e)
		if err != nil {
			return fmt.Errorf("operator %s on shell: %v", e, err)
		}
		r, err := Project(m, basis)
		if err != nil {
			return fmt.Errorf("the on-shell matrix element of the eom operator %s is not a combination of %s: %v", e, strings.Join(phys, ", "), err)
		}
		var terms []string
		for j, o := range phys {
			if r[j].IsZero() {
				continue
			}
			x, err := off[e].Value.Mul(r[j])
			if err != nil {
				return err
			}
			onC[o] = onC[o].Add(x)
			terms = append(terms, fmt.Sprintf("(%s) %s", r[j], o))
		}
		if len(terms) == 0 {
			rules = append(rules, e+" = 0")
		} else {
			rules = append(rules, e+" = "+strings.Join(terms, " + "))
		}
	}
	res.Notes = append(res.Notes, "equations of motion (on-shell matrix elements): "+strings.Join(rules, ", "))
	res.Conventions = append(res.Conventions, "coefficients on shell after the equations of motion; operators "+strings.Join(mb.EOM, ", ")+" removed")
	var out []Coefficient
	for _, o := range phys {
		c := Coefficient{Operator: o, Value: onC[o], InRatios: onC[o], Pole: off[o].Pole}
		for _, r := range mb.Ratios {
			if c.InRatios, err = applyRatio(c.InRatios, r); err != nil {
				return err
			}
		}
		out = append(out, c)
	}
	if mb.ReportOffShell {
		for _, o := range mb.Ops {
			c := off[o]
			c.Operator = o + " (off shell)"
			out = append(out, c)
		}
	}
	res.Coeffs = out
	return nil
}
