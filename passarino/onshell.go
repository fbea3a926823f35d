package passarino

import (
	"fmt"
	"math/big"

	"loopmatch/expr"
	"loopmatch/loops/vacuum"
)

// This file reduces one-loop integrals of the on-shell family: a massless line l² and a massive
// line (l ± p)² − m² with an external momentum on its mass shell, p² = m² — the self-energy of a
// heavy particle at its pole, from which on-shell mass counterterms follow. Tensors along l are
// decomposed onto p and the metric (rank ≤ 2), l·p is written through the propagators, and
//
//	I(a, b) = ∫ 1/((l²)^a ((l + p)² − m²)^b)
//	        = (−1)^{a+b} e^{γ_E ε} μ^{2ε} (m²)^{d/2−a−b} Γ(a+b−d/2) Γ(d−2a−b) / (Γ(b) Γ(d−a−b))
//
// (the one-loop on-shell integral in closed form, as used by D.J. Broadhurst, N. Gray,
// K. Schilcher, Z. Phys. C52 (1991) 111; derived here by Feynman parameters, with the prefactor
// from the Wick rotation of our normalisation, and checked against B0 and A0 of package loops in
// onshell_test.go), which is a rational function of d times Tad(m²) = I(0, 1).

// onShellRatio returns I(a, b)/Tad(m²) = (−1)^{a+b+1} (m²)^{1−a−b} [Γ(a+b−2+ε)/Γ(−1+ε)]
// Γ(d−2a−b)/(Γ(b) Γ(d−a−b)) as a rational function of d and m².
func onShellRatio(a, b int, m2 expr.RatFunc) (expr.RatFunc, error) {
	if b <= 0 {
		return expr.RFInt(0), nil // no massive propagator: scaleless
	}
	d := expr.RFVar(expr.DimSymbol)
	eps, _ := expr.RFInt(4).Sub(d).Div(expr.RFInt(2))
	r := expr.RFInt(1)
	// Γ(n + ε)/Γ(−1 + ε) with n = a + b − 2
	n := a + b - 2
	switch {
	case n >= -1:
		for j := -1; j < n; j++ {
			r = r.Mul(eps.Add(expr.RFInt(int64(j))))
		}
	default:
		for j := n; j < -1; j++ {
			inv, err := eps.Add(expr.RFInt(int64(j))).Inv()
			if err != nil {
				return expr.RatFunc{}, err
			}
			r = r.Mul(inv)
		}
	}
	// Γ(d − 2a − b)/Γ(d − a − b): a factors (d−2a−b)…(d−a−b−1) in the denominator (a > 0),
	// or −a factors (d−a−b)…(d−2a−b−1) in the numerator (a < 0).
	switch {
	case a > 0:
		for j := 0; j < a; j++ {
			inv, err := d.Sub(expr.RFInt(int64(2*a + b - j))).Inv()
			if err != nil {
				return expr.RatFunc{}, err
			}
			r = r.Mul(inv)
		}
	case a < 0:
		for j := 0; j < -a; j++ {
			r = r.Mul(d.Sub(expr.RFInt(int64(a + b + j))))
		}
	}
	fact := new(big.Int).MulRange(1, int64(b-1))
	r = r.Scale(new(big.Rat).SetFrac(big.NewInt(1), fact))
	if (a+b+1)%2 != 0 {
		r = r.Neg()
	}
	mp, err := m2.Pow(1 - a - b)
	if err != nil {
		return expr.RatFunc{}, err
	}
	return r.Mul(mp), nil
}

// OnShell reduces the one-loop terms of e whose propagators are l² and (l ± p)² − m2, with p an
// external momentum on its mass shell (p² = m2), to Tad(m2) exactly in d, times i/(16π²). The
// loop momentum may appear in the numerator up to rank 2 (dot products, vector components,
// slashes in chains and traces); the tensor is decomposed onto p and the metric. Scalar products
// p·p are set to m2.
func OnShell(e expr.Expr, p string, m2 expr.RatFunc) (expr.Expr, error) {
	measure := expr.FromAtom(expr.I, 1).MustMul(expr.FromAtom(expr.Pi, -2)).Scale(expr.RFRat(big.NewRat(1, 16)))
	res := expr.Zero()
	for _, t := range e.Terms() {
		if len(t.Loops) == 0 {
			res = res.Add(expr.FromTerm(t))
			continue
		}
		if len(t.Loops) > 1 {
			return expr.Expr{}, fmt.Errorf("OnShell: %d-loop term", len(t.Loops))
		}
		l := t.Loops[0]
		r, err := onShellTerm(t, l, p, m2)
		if err != nil {
			return expr.Expr{}, err
		}
		res = res.Add(r.MustMul(measure))
	}
	// p² = m² wherever it appears.
	return res.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
		if d, ok := a.(expr.Dot); ok && d.A == p && d.B == p {
			return expr.FromRF(m2), true
		}
		return expr.Expr{}, false
	})
}

func onShellTerm(t expr.Term, l, p string, m2 expr.RatFunc) (expr.Expr, error) {
	// Normalise the massive propagator to (l + p)² − m² by l → −l when it reads (l − p)².
	sign := 0
	for _, a := range t.Atoms {
		if pr, ok := a.A.(expr.Prop); ok && pr.K.Coef(l).Sign() != 0 && !pr.M2.IsZero() {
			kp := pr.K.Coef(p)
			kl := pr.K.Coef(l)
			s := new(big.Rat).Mul(kp, kl)
			switch {
			case s.Cmp(big.NewRat(1, 1)) == 0:
				sign = 1
			case s.Cmp(big.NewRat(-1, 1)) == 0:
				sign = -1
			}
		}
	}
	if sign == 0 {
		return expr.Expr{}, fmt.Errorf("OnShell: no propagator (l ± %s)² − m² in %s", p, t)
	}
	e := expr.FromTerm(t)
	if sign < 0 {
		var err error
		if e, err = flipLoop(e, l); err != nil {
			return expr.Expr{}, err
		}
	}
	// Tensor decomposition (rank ≤ 2) onto p and the metric: replace l^μ slots by fresh indices
	// and multiply by the projector.
	out := expr.Zero()
	for _, st := range e.Terms() {
		r, err := onShellTensor(st, l, p, m2)
		if err != nil {
			return expr.Expr{}, err
		}
		out = out.Add(r)
	}
	return out, nil
}

// flipLoop replaces l by −l in every term.
func flipLoop(e expr.Expr, l string) (expr.Expr, error) {
	res := expr.Zero()
	for _, t := range e.Terms() {
		sign := 1
		nt := expr.Term{Coef: t.Coef, NC: t.NC, Loops: t.Loops}
		for _, a := range t.Atoms {
			switch x := a.A.(type) {
			case expr.Prop:
				c := x.K.Coef(l)
				if c.Sign() != 0 {
					k := x.K.Sub(expr.Mom{{Name: l, Coef: new(big.Rat).Mul(c, big.NewRat(2, 1))}})
					nt.Atoms = append(nt.Atoms, expr.AtomPow{A: expr.NewProp(k, x.M2), Pow: a.Pow})
					continue
				}
			case expr.Dot:
				n := 0
				if x.A == l {
					n++
				}
				if x.B == l {
					n++
				}
				if n%2 == 1 && a.Pow%2 != 0 {
					sign = -sign
				}
			case expr.Vec:
				if x.P == l && a.Pow%2 != 0 {
					sign = -sign
				}
			case expr.Chain, expr.Trace:
				elems, _, _ := stringOf(x)
				for _, el := range elems {
					if el.Op == expr.NCSlash && el.Args[0] == l {
						sign = -sign
					}
				}
			case expr.Levi:
				for _, s := range x.S {
					if !s.Index && s.Name == l {
						sign = -sign
					}
				}
			}
			nt.Atoms = append(nt.Atoms, a)
		}
		nt.Coef = nt.Coef.Scale(big.NewRat(int64(sign), 1))
		res = res.Add(expr.FromTerm(nt))
	}
	return res, nil
}

// onShellTensor decomposes the l-tensor of one term onto p and the metric and evaluates the
// scalar integrals.
func onShellTensor(t expr.Term, l, p string, m2 expr.RatFunc) (expr.Expr, error) {
	// Reuse the slot machinery of the vacuum reduction: count the slots and replace them.
	rank := 0
	for _, a := range t.Atoms {
		switch x := a.A.(type) {
		case expr.Dot:
			if (x.A == l) != (x.B == l) {
				rank += a.Pow
			}
		case expr.Vec:
			if x.P == l {
				rank += a.Pow
			}
		case expr.Chain, expr.Trace:
			elems, _, _ := stringOf(x)
			for _, el := range elems {
				if el.Op == expr.NCSlash && el.Args[0] == l {
					rank++
				}
			}
		case expr.Levi:
			for _, s := range x.S {
				if !s.Index && s.Name == l {
					rank++
				}
			}
		}
	}
	if rank > 2 {
		return expr.Expr{}, fmt.Errorf("OnShell: tensor rank %d in the loop momentum (at most 2)", rank)
	}
	idx := freshIndices(t, rank)
	var slots []string
	take := func() string { s := idx[len(slots)]; slots = append(slots, s); return s }
	nt := expr.Term{Coef: t.Coef, NC: t.NC}
	for _, a := range t.Atoms {
		switch x := a.A.(type) {
		case expr.Dot:
			if (x.A == l) != (x.B == l) {
				other := x.B
				if x.B == l {
					other = x.A
				}
				for range a.Pow {
					nt.Atoms = append(nt.Atoms, expr.AtomPow{A: expr.Vec{P: other, Mu: take()}, Pow: 1})
				}
				continue
			}
		case expr.Vec:
			if x.P == l {
				for range a.Pow {
					slots = append(slots, x.Mu)
				}
				continue
			}
		case expr.Chain, expr.Trace:
			orig, rebuild, _ := stringOf(x)
			elems := append([]expr.NC{}, orig...)
			changed := false
			for i, el := range elems {
				if el.Op == expr.NCSlash && el.Args[0] == l {
					elems[i] = expr.NC{Op: expr.NCGamma, Args: []string{take()}}
					changed = true
				}
			}
			if changed {
				nt.Atoms = append(nt.Atoms, expr.AtomPow{A: rebuild(elems), Pow: a.Pow})
				continue
			}
		case expr.Levi:
			s := x.S
			changed := false
			for i := range s {
				if !s[i].Index && s[i].Name == l {
					s[i] = expr.Slot{Name: take(), Index: true}
					changed = true
				}
			}
			if changed {
				lv, sg := expr.NewLevi(s)
				if sg == 0 {
					return expr.Zero(), nil
				}
				nt.Coef = nt.Coef.Scale(big.NewRat(int64(sg), 1))
				nt.Atoms = append(nt.Atoms, expr.AtomPow{A: lv, Pow: a.Pow})
				continue
			}
		}
		nt.Atoms = append(nt.Atoms, a)
	}
	base := expr.FromTerm(nt)
	lp := expr.FromAtom(expr.NewDot(l, p), 1)
	ll := expr.FromAtom(expr.NewDot(l, l), 1)
	pp := expr.FromRF(m2)
	inv := func(r expr.RatFunc) expr.RatFunc { x, _ := r.Inv(); return x }
	var proj expr.Expr
	switch rank {
	case 0:
		proj = expr.Int(1)
	case 1: // l^μ → p^μ (l·p)/p²
		proj = expr.FromAtom(expr.Vec{P: p, Mu: slots[0]}, 1).MustMul(lp).Scale(inv(m2))
	case 2: // l^μ l^ν → A g^{μν} + B p^μ p^ν
		d := expr.RFVar(expr.DimSymbol)
		dm1 := inv(d.Sub(expr.RFInt(1)))
		g := expr.FromAtom(expr.NewMetric(slots[0], slots[1]), 1)
		ppv := expr.FromAtom(expr.Vec{P: p, Mu: slots[0]}, 1).MustMul(expr.FromAtom(expr.Vec{P: p, Mu: slots[1]}, 1))
		lp2 := lp.MustMul(lp)
		A := ll.MustMul(pp).Sub(lp2).Scale(dm1.Mul(inv(m2)))
		B := lp2.Scale(d).Sub(ll.MustMul(pp)).Scale(dm1.Mul(inv(m2.Mul(m2))))
		proj = g.MustMul(A).Add(ppv.MustMul(B))
	}
	x, err := base.Mul(proj)
	if err != nil {
		return expr.Expr{}, err
	}
	// Scalar integrals: l·p = (D_b − D_a)/2 with D_a = l², D_b = (l + p)² − m² (p² = m²).
	res := expr.Zero()
	for _, st := range x.Terms() {
		a, b, nlp := 0, 0, 0
		rest := expr.Term{Coef: st.Coef, NC: st.NC}
		for _, at := range st.Atoms {
			switch y := at.A.(type) {
			case expr.Prop:
				if y.K.Coef(l).Sign() != 0 {
					if y.M2.IsZero() && len(y.K) == 1 {
						a -= at.Pow
					} else {
						b -= at.Pow
					}
					continue
				}
			case expr.Dot:
				if y.A == l && y.B == l {
					a -= at.Pow
					continue
				}
				if (y.A == l && y.B == p) || (y.A == p && y.B == l) {
					nlp += at.Pow
					continue
				}
			}
			rest.Atoms = append(rest.Atoms, at)
		}
		// (l·p)^n = Σ binom(n, j) (D_b/2)^j (−D_a/2)^{n−j}
		for j := 0; j <= nlp; j++ {
			c := new(big.Rat).SetInt(new(big.Int).Binomial(int64(nlp), int64(j)))
			c.Quo(c, new(big.Rat).SetInt(new(big.Int).Lsh(big.NewInt(1), uint(nlp))))
			if (nlp-j)%2 == 1 {
				c.Neg(c)
			}
			ratio, err := onShellRatio(a-(nlp-j), b-j, m2)
			if err != nil {
				return expr.Expr{}, err
			}
			if ratio.IsZero() {
				continue
			}
			term := expr.FromTerm(rest).Scale(ratio.Scale(c)).MustMul(vacuum.Tad(m2))
			res = res.Add(term)
		}
	}
	return res, nil
}
