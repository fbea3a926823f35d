package dirac

import (
	"fmt"

	"loopmatch/expr"
)

// parsed is a chain split into its spinors, its colour generators (in order) and the Dirac
// part as a sum of strings.
type parsed struct {
	bar, spinor expr.NC
	colour      []string
	dirac       []dterm
}

// parseChain reads the elements of a chain: σ^{μν} = i(γ^μγ^ν − g^{μν}), every γ5, PL, PR is
// moved to the right end (γ5 anticommutes with every gamma matrix: NDR) and multiplied into one
// chirality factor; colour generators commute with Dirac matrices and are collected apart.
func parseChain(c expr.Chain) (parsed, error) {
	el := c.Elems
	if len(el) < 2 || !el[0].IsBar() || !el[len(el)-1].IsSpinor() {
		return parsed{}, fmt.Errorf("malformed spinor chain %s: it must run from ubar/vbar to u/v", c.Key())
	}
	p := parsed{bar: el[0], spinor: el[len(el)-1]}
	var err error
	p.dirac, p.colour, err = parseElems(el[1 : len(el)-1])
	if err != nil {
		return parsed{}, fmt.Errorf("%w in the spinor chain %s", err, c.Key())
	}
	return p, nil
}

// parseElems reads Dirac and colour matrices; a nil Dirac part means the string vanishes.
func parseElems(el []expr.NC) ([]dterm, []string, error) {
	var colour []string
	cur := []dterm{{c: rfOne, x: xOne}}
	for _, n := range el {
		switch n.Op {
		case expr.NCGamma, expr.NCSlash:
			s := slot{mom: n.Op == expr.NCSlash, name: n.Args[0]}
			for i := range cur {
				x, sign := chirFlip(cur[i].x)
				cur[i].g = append(append([]slot{}, cur[i].g...), s)
				cur[i].x = x
				if sign < 0 {
					cur[i].c = cur[i].c.Neg()
				}
			}
		case expr.NCG5, expr.NCPL, expr.NCPR:
			y := map[expr.NCOp]chir{expr.NCG5: xG5, expr.NCPL: xL, expr.NCPR: xR}[n.Op]
			next := cur[:0]
			for _, t := range cur {
				x, sign := chirMul(t.x, y)
				if sign == 0 {
					continue
				}
				t.x = x
				if sign < 0 {
					t.c = t.c.Neg()
				}
				next = append(next, t)
			}
			cur = next
		case expr.NCSigma:
			mu, nu := slot{name: n.Args[0]}, slot{name: n.Args[1]}
			if mu == nu {
				return nil, nil, nil // σ^{μ}_{μ} = 0
			}
			var next []dterm
			for _, t := range cur {
				// i γ^μ γ^ν (two flips leave the chirality as it is)
				a := t
				a.g = append(append([]slot{}, t.g...), mu, nu)
				// −i g^{μν}
				b := t
				b.c = b.c.Neg()
				b.f = t.withPair(newPair(mu, nu))
				for _, u := range []*dterm{&a, &b} {
					if u.i {
						u.c = u.c.Neg()
					}
					u.i = !u.i
				}
				next = append(next, a, b)
			}
			cur = next
		case expr.NCT:
			colour = append(colour, n.Args[0])
		default:
			return nil, nil, fmt.Errorf("unexpected %s", n.Key())
		}
	}
	if len(cur) == 0 {
		return nil, nil, nil
	}
	return cur, colour, nil
}

// canonDirac brings the Dirac part of a chain to canonical form: contracted index pairs inside
// the chain are removed, slashes of the pivot momenta are rewritten through the legs' momenta,
// the strings are sorted, and the Dirac equation is applied at both ends.
func (s *simplifier) canonDirac(p parsed, outside map[string]bool) ([]dterm, *ends, error) {
	e := &ends{}
	if l, ok := s.kin.leg(p.bar.Args[0]); ok {
		e.left = &l
	}
	if l, ok := s.kin.leg(p.spinor.Args[0]); ok {
		e.right = &l
	}
	e.leftSign, e.rtSign = 1, 1
	if p.bar.Op == expr.NCVBar {
		e.leftSign = -1
	}
	if p.spinor.Op == expr.NCV {
		e.rtSign = -1
	}
	e.pivots()
	terms := p.dirac
	var err error
	if len(e.rules) > 0 {
		if terms, err = expandSlashes(terms, e.rules, s.limit); err != nil {
			return nil, nil, err
		}
	}
	if terms, err = contractInside(terms, s.limit); err != nil {
		return nil, nil, err
	}
	rank := func(a slot) (int, string) {
		switch {
		case a.mom && a.name == pseudoL:
			return 0, ""
		case a.mom && a.name == pseudoR:
			return 4, ""
		case a.mom:
			return 2, a.name
		case outside[a.name]:
			return 3, a.name
		}
		return 1, a.name
	}
	if terms, err = sortStrings(terms, rank, s.limit); err != nil {
		return nil, nil, err
	}
	out := newTermSet(s.limit)
	for _, t := range terms {
		if n := len(t.g); n > 0 && t.g[n-1].mom && t.g[n-1].name == pseudoR {
			// … slash(P) x u = … x' slash(P) u = ±m … x' u
			x, sign := chirFlip(t.x)
			t.x = x
			t.c = t.c.Mul(e.right.Mass).Mul(expr.RFInt(int64(sign * e.rtSign)))
			t.g = t.g[:n-1]
		}
		if len(t.g) > 0 && t.g[0].mom && t.g[0].name == pseudoL {
			t.c = t.c.Mul(e.left.Mass).Mul(expr.RFInt(int64(e.leftSign)))
			t.g = t.g[1:]
		}
		if err := out.add(t); err != nil {
			return nil, nil, err
		}
	}
	return out.list(), e, nil
}

// expandSlashes replaces the slashes of pivot momenta by their rewritten combinations.
func expandSlashes(in []dterm, rules map[string][]comp, limit int) ([]dterm, error) {
	out := newTermSet(limit)
	for _, t := range in {
		cur := []dterm{{c: t.c, i: t.i, f: t.f, x: t.x}}
		for _, s := range t.g {
			r, ok := rules[s.name]
			if !s.mom || !ok {
				for i := range cur {
					cur[i].g = append(cur[i].g, s)
				}
				continue
			}
			next := make([]dterm, 0, len(cur)*len(r))
			for _, u := range cur {
				for _, c := range r {
					v := u
					v.c = u.c.Mul(ratOf(c.c))
					v.g = append(append(make([]slot, 0, len(u.g)+1), u.g...), slot{mom: true, name: c.name})
					next = append(next, v)
				}
			}
			if len(next) > limit {
				return nil, fmt.Errorf("%w: rewriting slashed momenta gives more than %d terms", expr.ErrTooLarge, limit)
			}
			cur = next
		}
		for _, u := range cur {
			if err := out.add(u); err != nil {
				return nil, err
			}
		}
	}
	return out.list(), nil
}

// pairExpr turns a scalar factor into an expression in the momentum names; the pseudo slots of
// the chain's ends stand for the legs' momenta, and P·P = m² on shell.
func (e *ends) pairExpr(p pair) expr.Expr {
	a, b := p[0], p[1]
	if a.isPseudo() && a == b {
		l := e.right
		if a.name == pseudoL {
			l = e.left
		}
		return expr.FromRF(l.Mass.Mul(l.Mass))
	}
	switch {
	case !a.mom && !b.mom:
		return expr.FromAtom(expr.NewMetric(a.name, b.name), 1)
	case !a.mom || !b.mom:
		if !b.mom {
			a, b = b, a
		}
		// a index, b momentum
		out := expr.Zero()
		for _, t := range e.mom(b) {
			out = out.Add(expr.FromAtom(expr.Vec{P: t.Name, Mu: a.name}, 1).Scale(ratOf(t.Coef)))
		}
		return out
	}
	out := expr.Zero()
	for _, x := range e.mom(a) {
		for _, y := range e.mom(b) {
			out = out.Add(expr.FromAtom(expr.NewDot(x.Name, y.Name), 1).Scale(ratOf(x.Coef).Mul(ratOf(y.Coef))))
		}
	}
	return out
}

func (e *ends) mom(s slot) expr.Mom {
	switch s.name {
	case pseudoL:
		return e.left.Mom
	case pseudoR:
		return e.right.Mom
	}
	return expr.MomOf(s.name)
}

// chainExprs turns canonical strings into expressions: the scalar factors times the chain atom
// with the colour generators after the bar spinor and the chirality written in the basis of
// opt.Chirality.
func (s *simplifier) chainExprs(p parsed, terms []dterm, e *ends, colour []string) (expr.Expr, error) {
	out := expr.Zero()
	for _, t := range terms {
		base := make([]expr.NC, 0, len(t.g)+len(colour)+3)
		base = append(base, p.bar)
		for _, a := range colour {
			base = append(base, expr.NC{Op: expr.NCT, Args: []string{a}})
		}
		for _, g := range t.g {
			op := expr.NCGamma
			if g.mom {
				op = expr.NCSlash
			}
			base = append(base, expr.NC{Op: op, Args: []string{g.name}})
		}
		type part struct {
			c  expr.RatFunc
			op expr.NCOp
			no bool
		}
		half := expr.RFRat(bigHalf)
		var parts []part
		switch {
		case s.opt.Chirality == ParityBasis && t.x == xL:
			parts = []part{{half, 0, true}, {half.Neg(), expr.NCG5, false}}
		case s.opt.Chirality == ParityBasis && t.x == xR:
			parts = []part{{half, 0, true}, {half, expr.NCG5, false}}
		case s.opt.Chirality == ParityBasis && t.x == xG5:
			parts = []part{{rfOne, expr.NCG5, false}}
		case s.opt.Chirality == ParityBasis:
			parts = []part{{rfOne, 0, true}}
		case t.x == xOne:
			parts = []part{{rfOne, expr.NCPL, false}, {rfOne, expr.NCPR, false}}
		case t.x == xG5:
			parts = []part{{rfMinus1, expr.NCPL, false}, {rfOne, expr.NCPR, false}}
		case t.x == xL:
			parts = []part{{rfOne, expr.NCPL, false}}
		default:
			parts = []part{{rfOne, expr.NCPR, false}}
		}
		scal := expr.Int(1)
		for _, f := range t.f {
			var err error
			if scal, err = scal.Mul(e.pairExpr(f)); err != nil {
				return expr.Expr{}, err
			}
		}
		for _, pt := range parts {
			el := append([]expr.NC{}, base...)
			if !pt.no {
				el = append(el, expr.NC{Op: pt.op})
			}
			el = append(el, p.spinor)
			atoms := []expr.AtomPow{{A: expr.NewChain(el), Pow: 1}}
			if t.i {
				atoms = append(atoms, expr.AtomPow{A: expr.I, Pow: 1})
			}
			x, err := expr.FromTerm(expr.Term{Coef: t.c.Mul(pt.c), Atoms: atoms}).Mul(scal)
			if err != nil {
				return expr.Expr{}, err
			}
			out = out.Add(x)
		}
	}
	return out, nil
}
