package expr

import (
	"fmt"
	"math/big"
)

// Derivative returns ∂e/∂v. Coefficients are differentiated as rational functions; log, Li2 and
// sqrt by the chain rule (d log u = du/u, d Li2(u) = −log(1 − u) du/u, d sqrt(u) = du/(2 sqrt(u)));
// propagators through their mass (∂/∂v (K² − M²)^{−n} = n (K² − M²)^{−n−1} ∂M²/∂v). An atom whose
// derivative the engine does not know (an opaque function of v, Cl2) is an error.
func (e Expr) Derivative(v string) (Expr, error) {
	res := Expr{}
	for _, t := range e.terms {
		// Coefficient.
		if dc := t.Coef.Derivative(v); !dc.IsZero() {
			nt := t
			nt.Coef = dc
			res = res.Add(fromTerm(nt))
		}
		// Product rule over the atoms.
		for i, a := range t.Atoms {
			da, err := atomDerivative(a.A, v)
			if err != nil {
				return Expr{}, err
			}
			if da.IsZero() {
				continue
			}
			// n a^{n−1} da · (rest of the term)
			rest := Term{Coef: t.Coef.Scale(big.NewRat(int64(a.Pow), 1)), NC: t.NC, Loops: t.Loops}
			for j, b := range t.Atoms {
				switch {
				case j != i:
					rest.Atoms = append(rest.Atoms, b)
				case b.Pow != 1:
					rest.Atoms = append(rest.Atoms, AtomPow{b.A, b.Pow - 1})
				}
			}
			p, err := fromTerm(rest).Mul(da)
			if err != nil {
				return Expr{}, err
			}
			res = res.Add(p)
		}
	}
	return res, nil
}

func argHas(args []Expr, v string) bool {
	for _, a := range args {
		for _, x := range a.Vars() {
			if x == v {
				return true
			}
		}
	}
	return false
}

// atomDerivative returns ∂a/∂v for a single atom.
func atomDerivative(a Atom, v string) (Expr, error) {
	switch x := a.(type) {
	case Fn:
		if !argHas(x.Args, v) {
			return Expr{}, nil
		}
		u := x.Args[0]
		du, err := u.Derivative(v)
		if err != nil {
			return Expr{}, err
		}
		inv, err := u.Pow(-1)
		switch x.Name {
		case FnLog:
			if err != nil {
				return Expr{}, fmt.Errorf("derivative of %s: %v", x.Key(), err)
			}
			return du.Mul(inv)
		case FnLi2:
			if err != nil {
				return Expr{}, fmt.Errorf("derivative of %s: %v", x.Key(), err)
			}
			l, err := Apply(FnLog, -x.I0, Int(1).Sub(u))
			if err != nil {
				return Expr{}, err
			}
			q, err := l.Mul(inv)
			if err != nil {
				return Expr{}, err
			}
			q, err = q.Mul(du)
			return q.Neg(), err
		case FnSqrt:
			s := FromAtom(x, -1).Scale(RFRat(big.NewRat(1, 2)))
			return s.Mul(du)
		}
		return Expr{}, fmt.Errorf("the derivative of %s with respect to %s is not known", x.Key(), v)
	case Prop:
		if !x.M2.Has(v) {
			return Expr{}, nil
		}
		// ∂/∂v of the factor D = K² − M² is −∂M²/∂v.
		return FromRF(x.M2.Derivative(v).Neg()), nil
	}
	return Expr{}, nil
}

// LogSplit returns log(arg ± i0) with the logarithms of positive symbols split off: for
// arg = c·Π s_i^{e_i}·R with c > 0 a rational number, s_i symbols that positive accepts and R
// the rest, log(arg) = log(c) + Σ e_i log(s_i) + log(R), which holds for positive c and s_i
// whatever the sign of R (R keeps the i0 prescription). Masses and μ are positive.
func LogSplit(arg Expr, i0 int, positive func(string) bool) (Expr, error) {
	r, ok := arg.AsRatFunc()
	if !ok || r.IsZero() || r.IsConst() {
		return Apply(FnLog, i0, arg)
	}
	res := Expr{}
	split := func(p Poly, sign int64) (Poly, error) {
		c, pp := p.PrimitiveZ()
		// Monomial content in positive symbols.
		var m Mono
		for _, vp := range pp.monoGCDPoly() {
			if positive(vp.Var) {
				m = append(m, vp)
			}
		}
		if len(m) > 0 {
			pp, _ = pp.DivExact(PolyMono(ratOne, m))
			for _, vp := range m {
				l := FromAtom(NewFn(FnLog, 1, Sym(vp.Var)), 1)
				res = res.Add(l.Scale(RFInt(sign * int64(vp.Exp))))
			}
		}
		return pp.Scale(c), nil
	}
	num, err := split(r.Num(), 1)
	if err != nil {
		return Expr{}, err
	}
	den, err := split(r.Den(), -1)
	if err != nil {
		return Expr{}, err
	}
	// Positive numerical content.
	cn, nn := num.PrimitiveZ()
	cd, dd := den.PrimitiveZ()
	c := new(big.Rat).Quo(cn, cd)
	rest, err := NewRatFunc(nn, dd)
	if err != nil {
		return Expr{}, err
	}
	if c.Sign() < 0 {
		c.Neg(c)
		rest = rest.Neg()
	}
	if c.Cmp(ratOne) != 0 {
		res = res.Add(logRational(c, 1))
	}
	if !rest.IsOne() {
		l, err := Apply(FnLog, i0, FromRF(rest))
		if err != nil {
			return Expr{}, err
		}
		res = res.Add(l)
	}
	return res, nil
}

// monoGCDPoly is the largest monomial dividing every term of a nonzero p.
func (p Poly) monoGCDPoly() Mono {
	if p.IsZero() {
		return nil
	}
	m := append(Mono(nil), p.terms[0].Mono...)
	for _, t := range p.terms[1:] {
		if len(m) == 0 {
			break
		}
		m = monoMin(m, t.Mono)
	}
	return m
}
