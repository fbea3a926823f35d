package match

import (
	"fmt"
	"math/big"
	"slices"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/loops"
	"loopmatch/loops/vacuum"
	"loopmatch/passarino"
)

// This file runs the match blocks that the heavy-mass code path of Run does not: the general
// route (full and effective-theory amplitudes with the same infrared regulator, reduced by
// Passarino–Veltman and subtracted) and off-shell matching on either route (docs/GENERAL.md).

// extended reports whether a block takes the route of this file.
func extended(mb *notation.MatchBlock) bool {
	return mb.Route == "general" || mb.OffShell
}

// route reduces an amplitude to its ε-expansion in canonical form.
type route interface {
	// reduce returns the coefficients of 1/ε², 1/ε and ε⁰ of e in canonical form, and notes.
	reduce(e expr.Expr) (expr.Series, []string, error)
	// symbolic reports whether the last reductions left scalar integrals without closed form.
	numericAtoms() bool
}

// heavyRoute is the heavy-mass route with the block's canonical form (which may be off shell).
type heavyRoute struct {
	p     *notation.Program
	small passarino.Small
	canon *Canon
}

func (h *heavyRoute) reduce(e expr.Expr) (expr.Series, []string, error) {
	red, info, err := passarino.Heavy(e, h.small)
	if err != nil {
		return expr.Series{}, nil, err
	}
	var notes []string
	for _, s := range info.Scaleless {
		notes = append(notes, "scaleless integral set to zero (infrared poles become EFT ultraviolet poles here): "+s)
	}
	if red, err = h.canon.Apply(red); err != nil {
		return expr.Series{}, nil, err
	}
	ser, err := vacuum.ExpandEps(red, 1, positiveOf(h.p))
	return ser, notes, err
}

func (h *heavyRoute) numericAtoms() bool { return false }

// generalRoute is the Passarino–Veltman route.
type generalRoute struct {
	p       *notation.Program
	canon   *Canon
	dot     passarino.DotFunc
	numeric bool
}

func (g *generalRoute) reduce(e expr.Expr) (expr.Series, []string, error) {
	red, info, err := passarino.General(e, g.dot)
	if err != nil {
		return expr.Series{}, nil, err
	}
	var notes []string
	for _, s := range info.Scaleless {
		notes = append(notes, "scaleless integral set to zero: "+s)
	}
	if red, err = treeProps(red, g.dot); err != nil {
		return expr.Series{}, nil, err
	}
	if red, err = g.canon.Apply(red); err != nil {
		return expr.Series{}, nil, err
	}
	ser, num, err := expandGeneral(red, positiveOf(g.p))
	g.numeric = g.numeric || num
	return ser, notes, err
}

func (g *generalRoute) numericAtoms() bool { return g.numeric }

// positiveOf treats masses, μ and gauge parameters as positive when logarithms are split.
func positiveOf(p *notation.Program) func(string) bool {
	return func(n string) bool {
		if p.Positive(n) {
			return true
		}
		d, ok := p.Decls[n]
		return ok && d.Kind == notation.KindGauge
	}
}

// treeProps replaces tree-level propagators (no loop momentum) by 1/(K² − M²) through the
// scalar products of dot; a propagator on its own mass shell is an error.
func treeProps(e expr.Expr, dot passarino.DotFunc) (expr.Expr, error) {
	var ferr error
	out, err := e.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
		pr, ok := a.(expr.Prop)
		if !ok || ferr != nil {
			return expr.Expr{}, false
		}
		s := expr.RFInt(0)
		for _, x := range pr.K {
			for _, y := range pr.K {
				v, err := dot(x.Name, y.Name)
				if err != nil {
					ferr = err
					return expr.Expr{}, false
				}
				s = s.Add(v.Scale(new(big.Rat).Mul(x.Coef, y.Coef)))
			}
		}
		s = s.Sub(pr.M2)
		if s.IsZero() {
			ferr = fmt.Errorf("propagator %s is on its own mass shell", pr.Key())
			return expr.Expr{}, false
		}
		return expr.FromRF(s), true
	})
	if ferr != nil {
		return expr.Expr{}, ferr
	}
	return out, err
}

// expandGeneral expands a reduced general-route expression in ε to the finite part. Tadpoles
// and two-point functions at zero momentum (rewritten as tadpoles exactly in d) expand in closed
// form; the other scalar integrals stay as atoms that stand for their finite parts, with their
// ultraviolet poles (B0: 1/ε) taken into account exactly. numeric reports such atoms.
func expandGeneral(e expr.Expr, positive func(string) bool) (expr.Series, bool, error) {
	e, err := zeroMomentumBubbles(e)
	if err != nil {
		return expr.Series{}, false, err
	}
	var vac, rest []expr.Term
	for _, t := range e.Terms() {
		if slices.ContainsFunc(t.Atoms, func(a expr.AtomPow) bool {
			f, ok := a.A.(expr.Fn)
			return ok && loops.IsScalarAtom(f) && f.Name != loops.TadName
		}) {
			rest = append(rest, t)
		} else {
			vac = append(vac, t)
		}
	}
	var vacE expr.Expr
	for _, t := range vac {
		vacE = vacE.Add(expr.FromTerm(t))
	}
	ser, err := vacuum.ExpandEps(vacE, 1, positive)
	if err != nil {
		return expr.Series{}, false, err
	}
	for _, t := range rest {
		var atom expr.Fn
		n := 0
		other := expr.Term{Coef: expr.RFInt(1), NC: t.NC}
		for _, a := range t.Atoms {
			if f, ok := a.A.(expr.Fn); ok && loops.IsScalarAtom(f) {
				atom = f
				n += a.Pow
				continue
			}
			other.Atoms = append(other.Atoms, a)
		}
		if n != 1 {
			return expr.Series{}, false, fmt.Errorf("a product of scalar integrals at one loop: %s", expr.FromTerm(t))
		}
		pole := expr.Zero()
		if atom.Name == loops.BubName {
			pole = expr.Int(1)
		}
		cs, err := expr.SeriesFromRatFunc(t.Coef, 2) // to O(ε): it multiplies the 1/ε of B0
		if err != nil {
			return expr.Series{}, false, err
		}
		if cs.Lo < 0 {
			return expr.Series{}, false, fmt.Errorf("the coefficient of %s has a pole in eps; its O(eps) part would be needed", atom.Key())
		}
		base := expr.FromTerm(other)
		fin := expr.FromAtom(atom, 1).MustMul(base).MustMul(cs.Coef(0))
		fin = fin.Add(base.MustMul(cs.Coef(1)).MustMul(pole))
		p1 := base.MustMul(cs.Coef(0)).MustMul(pole)
		part := expr.Series{Lo: -1, Order: 1, C: []expr.Expr{p1, fin}}
		ser = ser.Add(part)
	}
	return ser, len(rest) > 0, nil
}

// zeroMomentumBubbles rewrites B0(0; a, b) through tadpoles, exactly in d:
// (A0(a) − A0(b))/(a − b), A0(a)/a for b = 0, (d − 2)/(2a) A0(a) for a = b, 0 for a = b = 0.
func zeroMomentumBubbles(e expr.Expr) (expr.Expr, error) {
	return e.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
		f, ok := a.(expr.Fn)
		if !ok || f.Name != loops.BubName || len(f.Args) != 3 || !f.Args[0].IsZero() {
			return expr.Expr{}, false
		}
		x, ok1 := f.Args[1].AsRatFunc()
		y, ok2 := f.Args[2].AsRatFunc()
		if !ok1 || !ok2 {
			return expr.Expr{}, false
		}
		tad := func(m expr.RatFunc) expr.Expr { return vacuum.Tad(m) }
		switch {
		case x.IsZero() && y.IsZero():
			return expr.Zero(), true
		case x.Equal(y):
			c, _ := expr.RFVar(expr.DimSymbol).Sub(expr.RFInt(2)).Div(x.Scale(big.NewRat(2, 1)))
			return tad(x).Scale(c), true
		case y.IsZero():
			c, _ := x.Inv()
			return tad(x).Scale(c), true
		case x.IsZero():
			c, _ := y.Inv()
			return tad(y).Scale(c), true
		}
		c, _ := x.Sub(y).Inv()
		return tad(x).Sub(tad(y)).Scale(c), true
	})
}

// ReduceGeneral reduces e on the general route at the on-shell kinematics of the legs of p:
// one-loop integrals become Passarino–Veltman combinations of the scalar integrals (loops.Atom:
// Tad, Bub, Tri, Box, exact in d, the loop factor i/(16π²) included), tree-level propagators
// are evaluated, and the Dirac algebra is applied with on-shell legs. Scalar products of
// external momenta that the legs leave free become symbols named like the product ("p.q").
// The notes list scaleless integrals set to zero and dropped evanescent remainders.
func ReduceGeneral(p *notation.Program, e expr.Expr, opt Options) (expr.Expr, []string, error) {
	canon, err := NewCanon(p, passarino.Small{}, false, opt)
	if err != nil {
		return expr.Expr{}, nil, err
	}
	if e, err = resolveOnShell(p, e); err != nil {
		return expr.Expr{}, nil, err
	}
	dot := func(a, b string) (expr.RatFunc, error) {
		x, err := canon.kin.Apply(expr.FromAtom(expr.NewDot(a, b), 1))
		if err != nil {
			return expr.RatFunc{}, err
		}
		if x, err = x.MapAtoms(func(at expr.Atom) (expr.Expr, bool) {
			d, ok := at.(expr.Dot)
			if !ok {
				return expr.Expr{}, false
			}
			return expr.Sym(d.Key()), true
		}); err != nil {
			return expr.RatFunc{}, err
		}
		r, ok := x.AsRatFunc()
		if !ok {
			return expr.RatFunc{}, fmt.Errorf("the scalar product %s.%s is not a parameter expression: %s", a, b, x)
		}
		return r, nil
	}
	red, info, err := passarino.General(e, dot)
	if err != nil {
		return expr.Expr{}, nil, err
	}
	var notes []string
	for _, s := range info.Scaleless {
		notes = append(notes, "scaleless integral set to zero: "+s)
	}
	if red, err = treeProps(red, dot); err != nil {
		return expr.Expr{}, nil, err
	}
	if red, err = canon.Apply(red); err != nil {
		return expr.Expr{}, nil, err
	}
	return red, append(notes, canon.Notes...), nil
}
