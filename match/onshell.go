package match

import (
	"fmt"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/passarino"
)

// OnShellMass returns the on-shell mass counterterm δm (m_bare = m + δm, so δm = −Σ at the pole)
// of the fermion whose self-energy is the amplitude a = ubar(t2) (−iΣ(P)) u(t1), with t1, t2
// legs of momentum P and mass m. The self-energy is reduced on the on-shell family (exactly in d,
// package passarino) and the Dirac equation applied; the result multiplies ubar(t2) u(t1).
func OnShellMass(p *notation.Program, a *notation.Amplitude) (expr.Expr, error) {
	var chain expr.Chain
	found := false
	for _, t := range a.Body.Terms() {
		for _, at := range t.Atoms {
			if c, ok := at.A.(expr.Chain); ok {
				if found && c.Elems[0].Args[0] != chain.Elems[0].Args[0] {
					return expr.Expr{}, fmt.Errorf("onshell(%s): the amplitude must be one chain ubar(t2) … u(t1)", a.Name)
				}
				chain, found = c, true
			}
		}
	}
	if !found {
		return expr.Expr{}, fmt.Errorf("onshell(%s): the amplitude has no spinor chain ubar(t2) … u(t1)", a.Name)
	}
	bar, _ := p.Leg(chain.Elems[0].Args[0])
	spin, _ := p.Leg(chain.Elems[len(chain.Elems)-1].Args[0])
	if !bar.Mom.Equal(spin.Mom) || len(bar.Mom) != 1 || bar.Mass != spin.Mass || bar.Mass == "" {
		return expr.Expr{}, fmt.Errorf("onshell(%s): the two legs must carry the same single momentum and the same mass", a.Name)
	}
	mom := bar.Mom[0].Name
	m2 := expr.RFVar(bar.Mass).Mul(expr.RFVar(bar.Mass))
	r, err := passarino.OnShell(a.Body, mom, m2)
	if err != nil {
		return expr.Expr{}, fmt.Errorf("onshell(%s): %v", a.Name, err)
	}
	c, err := NewCanon(p, passarino.Small{}, false, Options{})
	if err != nil {
		return expr.Expr{}, err
	}
	if r, err = c.Apply(r); err != nil {
		return expr.Expr{}, err
	}
	// r = X (ubar PL u + ubar PR u): read X from both chiralities.
	var xs []expr.Expr
	for _, g := range r.Collect(func(a expr.Atom) bool { _, ok := a.(expr.Chain); return ok }) {
		if len(g.Atoms) != 1 || len(g.Atoms[0].A.(expr.Chain).Elems) != 3 {
			return expr.Expr{}, fmt.Errorf("onshell(%s): the self-energy between on-shell spinors is not a mass term: %s", a.Name, r)
		}
		xs = append(xs, g.Coef)
	}
	if len(xs) != 2 || !xs[0].Equal(xs[1]) {
		return expr.Expr{}, fmt.Errorf("onshell(%s): the self-energy has different left- and right-handed parts: %s", a.Name, r)
	}
	// ubar (−iΣ) u = X ubar u  ⇒  Σ = i X,  δm = −Σ = −i X.
	return xs[0].MustMul(expr.FromAtom(expr.I, 1)).Neg(), nil
}

// resolveOnShell replaces every onshell(A) atom of e by the mass counterterm of A.
func resolveOnShell(p *notation.Program, e expr.Expr) (expr.Expr, error) {
	cache := map[string]expr.Expr{}
	var ferr error
	out, err := e.MapAtoms(func(at expr.Atom) (expr.Expr, bool) {
		f, ok := at.(expr.Fn)
		if !ok || f.Name != notation.OnShellFn {
			return expr.Expr{}, false
		}
		name := f.Args[0].String()
		if v, ok := cache[name]; ok {
			return v, true
		}
		a, ok := p.Amplitude(name)
		if !ok {
			ferr = fmt.Errorf("onshell(%s): no such amplitude", name)
			return expr.Expr{}, false
		}
		v, err := OnShellMass(p, a)
		if err != nil {
			ferr = err
			return expr.Expr{}, false
		}
		cache[name] = v
		return v, true
	})
	if ferr != nil {
		return expr.Expr{}, ferr
	}
	return out, err
}
