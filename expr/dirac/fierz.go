package dirac

import (
	"fmt"
	"slices"

	"loopmatch/expr"
)

// Four-dimensional rewritings, done only on request.

// Fierz rearranges every product of two chains (ū1 M u2)(ū3 N u4) into chains (ū1 … u4)(ū3 … u2)
// in four dimensions, by the completeness of the sixteen Clifford matrices,
//
//	M_ij N_kl = ¼ Σ_A (M Γ_A N)_il (Γ^A)_kj,
//	Σ_A Γ_A ⊗ Γ^A = 1⊗1 + γ^α⊗γ_α + ½σ^{αβ}⊗σ_{αβ} + γ^αγ5⊗γ5γ_α + γ5⊗γ5
//
// (tr Γ_A Γ^B = 4δ_A^B; M. Fierz, Z. Phys. 104 (1937) 553; C.C. Nishi, Am. J. Phys. 73 (2005)
// 1160). The spinors are commuting c-numbers here: the sign from exchanging anticommuting
// field operators belongs to the amplitude, not to the chains. Colour follows with
// X_{i1 j2} Y_{i3 j4} = 2 (X T^c)_{i1 j4} (Y T^c)_{i3 j2} + X_{i1 j4} Y_{i3 j2}/N when the legs are
// coloured (Leg.Coloured) or the chains carry generators. The result is
// simplified at d = 4 (four-fermion images exact). Two new contracted Lorentz indices (and one
// adjoint index when colour is present) are taken from the contracted names of the input and
// opt.Dummies (opt.ColourDummies).
func Fierz(e expr.Expr, kin Kinematics, opt Options) (expr.Expr, Report, error) {
	s, err := newSimplifier(e, kin, opt)
	if err != nil {
		return expr.Expr{}, Report{}, err
	}
	s.d4 = true
	var parts []expr.Expr
	for _, t := range e.Terms() {
		x, err := s.fierzTerm(t)
		if err != nil {
			return expr.Expr{}, Report{}, err
		}
		parts = append(parts, x)
	}
	out, err := at4(expr.Sum(parts...))
	if err != nil {
		return expr.Expr{}, Report{}, err
	}
	if out, err = s.run(out); err != nil {
		return expr.Expr{}, Report{}, err
	}
	if out, err = at4(out); err != nil {
		return expr.Expr{}, Report{}, err
	}
	s.rep.Scheme = "four dimensions (Fierz); " + s.rep.Scheme
	return out, *s.rep, nil
}

func at4(e expr.Expr) (expr.Expr, error) { return e.Subst(expr.DimSymbol, expr.RFInt(4)) }

func (s *simplifier) fierzTerm(t expr.Term) (expr.Expr, error) {
	var chains []expr.Chain
	var rest []expr.AtomPow
	for _, a := range t.Atoms {
		if c, ok := a.A.(expr.Chain); ok && a.Pow > 0 {
			for range a.Pow {
				chains = append(chains, c)
			}
			continue
		}
		rest = append(rest, a)
	}
	if len(chains) == 0 {
		return expr.FromTerm(t), nil
	}
	if len(chains) != 2 {
		return expr.Expr{}, fmt.Errorf("Fierz rearranges products of two chains; this term has %d: %s", len(chains), t)
	}
	used := map[string]bool{}
	lc, cc := termIndexCounts(t)
	for n := range lc {
		used[n] = true
	}
	for n := range cc {
		used[n] = true
	}
	var fresh []string
	for _, n := range s.pool {
		if !used[n] {
			fresh = append(fresh, n)
		}
	}
	if len(fresh) < 2 {
		return expr.Expr{}, fmt.Errorf("Fierz needs two contracted Lorentz indices that the term does not use; pass declared index names in Options.Dummies")
	}
	al, be := fresh[0], fresh[1]
	c1, c2 := chains[0].Elems, chains[1].Elems
	split := func(c []expr.NC) (dir, col []expr.NC) {
		for _, e := range c[1 : len(c)-1] {
			if e.Op == expr.NCT {
				col = append(col, e)
			} else {
				dir = append(dir, e)
			}
		}
		return dir, col
	}
	M, X := split(c1)
	N, Y := split(c2)
	// colour: crossed lines resolved into the two new chains
	type colTerm struct {
		c    expr.RatFunc
		a, b []expr.NC
	}
	cols := []colTerm{{rfOne, X, Y}}
	coloured := 0
	for _, c := range [][]expr.NC{c1, c2} {
		for _, sp := range []expr.NC{c[0], c[len(c)-1]} {
			if l, ok := s.kin.leg(sp.Args[0]); ok && l.Coloured {
				coloured++
			}
		}
	}
	if (len(X) > 0 || len(Y) > 0) && coloured == 0 {
		coloured = 4 // generators imply colour lines
	}
	if coloured != 0 && coloured != 4 {
		return expr.Expr{}, fmt.Errorf("Fierz would join coloured and colourless legs in one chain: %s", t)
	}
	if coloured == 4 {
		var cn string
		for _, n := range s.cpool {
			if !used[n] {
				cn = n
				break
			}
		}
		if cn == "" {
			return expr.Expr{}, fmt.Errorf("Fierz of coloured chains needs a contracted adjoint index that the term does not use; pass one in Options.ColourDummies")
		}
		tc := expr.NC{Op: expr.NCT, Args: []string{cn}}
		cols = []colTerm{
			{rfTwo, append(slices.Clone(X), tc), append(slices.Clone(Y), tc)},
			{rfInvN(), X, Y},
		}
	}
	g := func(i string) expr.NC { return expr.NC{Op: expr.NCGamma, Args: []string{i}} }
	g5 := expr.NC{Op: expr.NCG5}
	basis := []struct {
		c    expr.RatFunc
		a, b []expr.NC
	}{
		{rfOne, nil, nil},
		{rfOne, []expr.NC{g(al)}, []expr.NC{g(al)}},
		{expr.RFRat(bigHalf), []expr.NC{{Op: expr.NCSigma, Args: []string{al, be}}}, []expr.NC{{Op: expr.NCSigma, Args: []string{al, be}}}},
		{rfOne, []expr.NC{g(al), g5}, []expr.NC{g5, g(al)}},
		{rfOne, []expr.NC{g5}, []expr.NC{g5}},
	}
	quarter := expr.RFRat(bigHalf).Mul(expr.RFRat(bigHalf))
	out := expr.Zero()
	base := expr.FromTerm(expr.Term{Coef: t.Coef.Mul(quarter), Atoms: rest, Loops: t.Loops})
	for _, ct := range cols {
		for _, b := range basis {
			a := []expr.NC{c1[0]}
			a = append(a, ct.a...)
			a = append(a, M...)
			a = append(a, b.a...)
			a = append(a, N...)
			a = append(a, c2[len(c2)-1])
			bb := []expr.NC{c2[0]}
			bb = append(bb, ct.b...)
			bb = append(bb, b.b...)
			bb = append(bb, c1[len(c1)-1])
			x, err := expr.FromTerm(expr.Term{Coef: ct.c.Mul(b.c), NC: append(a, bb...)}).Mul(base)
			if err != nil {
				return expr.Expr{}, err
			}
			out = out.Add(x)
		}
	}
	return out, nil
}

// Chisholm rewrites every chain in four dimensions with the Chisholm identity
//
//	γ^μγ^νγ^ρ = g^{μν}γ^ρ − g^{μρ}γ^ν + g^{νρ}γ^μ + c iε^{μνρσ}γ_σγ5,  c = ε^{0123} = −1
//
// (J.S.R. Chisholm, Nuovo Cim. 30 (1963) 426; P&S appendix A; the sign follows γ5 = iγ⁰γ¹γ²γ³
// and is checked against explicit matrices), applied to the first three matrices of each
// canonical string until at most two remain: chains end up with at most two gamma matrices
// (or slashes), and Levi-Civita symbols carry the rest. One new contracted index σ is taken
// from the contracted names of the input and opt.Dummies.
func Chisholm(e expr.Expr, kin Kinematics, opt Options) (expr.Expr, Report, error) {
	opt.KeepD = true
	s, err := newSimplifier(e, kin, opt)
	if err != nil {
		return expr.Expr{}, Report{}, err
	}
	cur, err := s.run(e)
	if err != nil {
		return expr.Expr{}, Report{}, err
	}
	if cur, err = at4(cur); err != nil {
		return expr.Expr{}, Report{}, err
	}
	for range maxPasses {
		next, changed, err := s.chisholmPass(cur)
		if err != nil {
			return expr.Expr{}, Report{}, err
		}
		if !changed {
			s.rep.Scheme = "four dimensions (Chisholm); " + s.rep.Scheme
			return cur, *s.rep, nil
		}
		if next, err = s.run(next); err != nil {
			return expr.Expr{}, Report{}, err
		}
		if cur, err = at4(next); err != nil {
			return expr.Expr{}, Report{}, err
		}
	}
	return expr.Expr{}, Report{}, ErrNotCanonical
}

func (s *simplifier) chisholmPass(e expr.Expr) (expr.Expr, bool, error) {
	changed := false
	var parts []expr.Expr
	for _, t := range e.Terms() {
		k := -1
		var c expr.Chain
		for i, a := range t.Atoms {
			if ch, ok := a.A.(expr.Chain); ok && a.Pow == 1 && diracLen(ch) >= 3 {
				k, c = i, ch
				break
			}
		}
		if k < 0 {
			parts = append(parts, expr.FromTerm(t))
			continue
		}
		changed = true
		lc, _ := termIndexCounts(t)
		sg := ""
		for _, n := range s.pool {
			if lc[n] == 0 {
				sg = n
				break
			}
		}
		if sg == "" {
			return expr.Expr{}, false, fmt.Errorf("the Chisholm identity needs a contracted Lorentz index that the term does not use; pass declared index names in Options.Dummies")
		}
		rest := append(slices.Clone(t.Atoms[:k]), t.Atoms[k+1:]...)
		base := expr.FromTerm(expr.Term{Coef: t.Coef, Atoms: rest, Loops: t.Loops})
		// positions of the first three Dirac slots
		var pos []int
		for i, el := range c.Elems {
			if el.Op == expr.NCGamma || el.Op == expr.NCSlash {
				pos = append(pos, i)
				if len(pos) == 3 {
					break
				}
			}
		}
		sl := make([]slot, 3)
		for i, p := range pos {
			sl[i] = slot{mom: c.Elems[p].Op == expr.NCSlash, name: c.Elems[p].Args[0]}
		}
		without := func(keep int) []expr.NC {
			var out []expr.NC
			for i, el := range c.Elems {
				switch {
				case i == pos[0] || i == pos[1] || i == pos[2]:
					if i == pos[keep] {
						out = append(out, el)
					}
				default:
					out = append(out, el)
				}
			}
			return out
		}
		res := expr.Zero()
		for _, r := range []struct {
			x, y, keep int
			s          int64
		}{{0, 1, 2, 1}, {0, 2, 1, -1}, {1, 2, 0, 1}} {
			at, cf := pairAtom(sl[r.x], sl[r.y])
			x := expr.FromTerm(expr.Term{Coef: cf.Mul(expr.RFInt(r.s)), Atoms: append(at, expr.AtomPow{A: expr.NewChain(without(r.keep)), Pow: 1})})
			res = res.Add(x)
		}
		lv, sign := expr.NewLevi([4]expr.Slot{levSlot(sl[0]), levSlot(sl[1]), levSlot(sl[2]), {Name: sg, Index: true}})
		if sign != 0 {
			var el []expr.NC
			for i, x := range c.Elems {
				switch i {
				case pos[0]:
					el = append(el, expr.NC{Op: expr.NCGamma, Args: []string{sg}}, expr.NC{Op: expr.NCG5})
				case pos[1], pos[2]:
				default:
					el = append(el, x)
				}
			}
			res = res.Add(expr.FromTerm(expr.Term{Coef: expr.RFInt(int64(epsilon0123 * sign)),
				Atoms: []expr.AtomPow{{A: lv, Pow: 1}, {A: expr.I, Pow: 1}, {A: expr.NewChain(el), Pow: 1}}}))
		}
		x, err := res.Mul(base)
		if err != nil {
			return expr.Expr{}, false, err
		}
		parts = append(parts, x)
	}
	return expr.Sum(parts...), changed, nil
}

func diracLen(c expr.Chain) int {
	n := 0
	for _, e := range c.Elems {
		if e.Op == expr.NCGamma || e.Op == expr.NCSlash {
			n++
		}
	}
	return n
}
