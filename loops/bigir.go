package loops

import (
	"math/big"
)

// c0Divergent is the arbitrary-precision counterpart of c0Divergent: the same classification (on
// the float64 image ft of the triangle, with exact zero masses and on-shell conditions within
// 2^{−w/2} of the scale) and the same formulas.
func (n bnum) c0Divergent(t *btri, ft *tri, sc float64, mu2 *big.Float) (BigValue, bool) {
	var zero, massive []int
	for i := 0; i < 3; i++ {
		if t.m2[i].Sign() == 0 {
			zero = append(zero, i)
		} else {
			massive = append(massive, i)
		}
	}
	w := n.w
	sub := func(a, b *big.Float) *big.Float { return new(big.Float).SetPrec(w).Sub(a, b) }
	switch len(zero) {
	case 1:
		a := zero[0]
		b, c := massive[0], massive[1]
		if n.same(t.s[a][b], t.m2[b], sc) && n.same(t.s[a][c], t.m2[c], sc) {
			return n.c0Soft(t.m2[b], t.m2[c], t.s[b][c], mu2), true
		}
	case 2:
		a, b := zero[0], zero[1]
		c := massive[0]
		if n.same(t.s[a][b], n.f(0), sc) {
			M2 := t.m2[c]
			al, be := sub(M2, t.s[a][c]), sub(M2, t.s[b][c])
			if n.same(al, n.f(0), sc) {
				al = n.f(0)
			}
			if n.same(be, n.f(0), sc) {
				be = n.f(0)
			}
			return n.c0Collinear(M2, al, be, mu2), true
		}
	case 3:
		var zs, nz []int
		pairs := [][2]int{{0, 1}, {1, 2}, {0, 2}}
		for k, p := range pairs {
			if n.same(t.s[p[0]][p[1]], n.f(0), sc) {
				zs = append(zs, k)
			} else {
				nz = append(nz, k)
			}
		}
		switch len(zs) {
		case 3:
			return BigValue{n.zero(), n.zero(), n.zero()}, true
		case 2:
			p := pairs[nz[0]]
			return n.c0TwoLightlike(t.s[p[0]][p[1]], mu2), true
		case 1:
			p := pairs[zs[0]]
			c := 3 - p[0] - p[1]
			return n.c0Collinear(n.f(0), new(big.Float).Neg(t.s[p[0]][c]), new(big.Float).Neg(t.s[p[1]][c]), mu2), true
		}
	}
	return BigValue{}, false
}

func (n bnum) c0Soft(mb2, mc2, s, mu2 *big.Float) BigValue {
	w := n.w
	lmu := n.log(n.r(mu2))
	half := n.f(0.5)
	if s.Sign() == 0 {
		lb := n.log(n.r(mb2)).Sub(lmu)
		lc := n.log(n.r(mc2)).Sub(lmu)
		var i1 bc
		if mb2.Cmp(mc2) == 0 {
			i1 = n.r(new(big.Float).SetPrec(w).Quo(n.f(1), mb2))
		} else {
			i1 = lb.Sub(lc).Quo(n.r(new(big.Float).SetPrec(w).Sub(mb2, mc2)))
		}
		i2 := lb.Add(lc).Mul(i1).Scale(half)
		return BigValue{n.zero(), i1.Scale(half), i2.Scale(half).Neg()}
	}
	B := new(big.Float).SetPrec(w).Sub(mb2, mc2)
	B.Sub(B, s)
	roots, lnLead, _ := n.quadRootsI0(s, B, mc2)
	y1, y2 := roots[0], roots[1]
	L := func(y bc) bc { return n.log(n.one().Sub(y)).Sub(n.log(y.Neg())) }
	pre := n.r(s).Mul(y1.Sub(y2)).Inv()
	i1 := pre.Mul(L(y1).Sub(L(y2)))
	J := func(ya, yb bc) bc {
		la := L(ya)
		l1, l0 := n.log(n.one().Sub(ya)), n.log(ya.Neg())
		sq := l1.Mul(l1).Sub(l0.Mul(l0)).Scale(half)
		r := n.rfun(ya, yb)
		return lnLead.Sub(lmu).Mul(la).Add(sq).Add(r).Add(n.log(ya.Sub(yb)).Mul(la))
	}
	i2 := pre.Mul(J(y1, y2).Sub(J(y2, y1)))
	return BigValue{n.zero(), i1.Scale(half), i2.Scale(half).Neg()}
}

func (n bnum) c0Collinear(M2, al, be, mu2 *big.Float) BigValue {
	w := n.w
	lmu := n.log(n.r(mu2))
	lnx := func(x *big.Float) bc { return n.lnMinusI0(x).Sub(lmu) }
	li := func(x *big.Float) bc {
		if M2.Sign() == 0 {
			return n.li2(n.one())
		}
		a := new(big.Float).SetPrec(w).Quo(M2, x)
		a.Sub(n.f(1), a)
		return n.li2Side(a, -1)
	}
	if al.Sign() == 0 && be.Sign() == 0 {
		lm := n.log(n.r(M2)).Sub(lmu)
		im := new(big.Float).SetPrec(w).Quo(n.f(1), M2)
		return BigValue{n.zero(), n.r(new(big.Float).Mul(im, n.f(-0.5))), lm.Scale(n.f(0.5)).Add(n.one()).Scale(im)}
	}
	if be.Sign() == 0 {
		al, be = be, al
	}
	if al.Sign() == 0 {
		lb := lnx(be)
		lm := n.log(n.r(M2)).Sub(lmu)
		ib := new(big.Float).SetPrec(w).Quo(n.f(1), be)
		pi2 := new(big.Float).SetPrec(w).Mul(n.pi(), n.pi())
		pi2.Quo(pi2, n.f(24))
		fin := lb.Mul(lb).Scale(n.f(-0.5)).Add(lm.Mul(lm).Scale(n.f(0.25))).Add(li(be)).Sub(n.r(pi2))
		return BigValue{
			Pole2:  n.r(new(big.Float).Mul(ib, n.f(-0.5))),
			Pole1:  lb.Sub(lm.Scale(n.f(0.5))).Scale(ib),
			Finite: fin.Scale(ib),
		}
	}
	la, lb := lnx(al), lnx(be)
	if al.Cmp(be) == 0 {
		// −g′(a) + h′(a), g = ½ ln²(a/μ²), h = Li2(1 − M²/a) (see c0Collinear)
		a := al
		ia := new(big.Float).SetPrec(w).Quo(n.f(1), a)
		var fin bc
		switch {
		case M2.Sign() == 0:
			fin = la.Scale(ia).Neg()
		case a.Cmp(M2) == 0:
			fin = n.one().Sub(la).Scale(ia)
		default:
			d := new(big.Float).SetPrec(w).Sub(a, M2)
			d.Mul(d, a)
			lr := n.log(n.r(M2)).Sub(n.lnMinusI0(a))
			fin = la.Scale(ia).Neg().Sub(lr.Scale(new(big.Float).SetPrec(w).Quo(M2, d)))
		}
		return BigValue{n.zero(), n.r(ia), fin}
	}
	d := n.r(new(big.Float).SetPrec(w).Sub(be, al))
	return BigValue{
		Pole2:  n.zero(),
		Pole1:  lb.Sub(la).Quo(d),
		Finite: lb.Mul(lb).Sub(la.Mul(la)).Quo(d.Scale(n.f(2))).Neg().Sub(li(al).Sub(li(be)).Quo(d)),
	}
}

func (n bnum) c0TwoLightlike(s, mu2 *big.Float) BigValue {
	w := n.w
	L := n.lnMinusI0(new(big.Float).Neg(s)).Sub(n.log(n.r(mu2)))
	is := new(big.Float).SetPrec(w).Quo(n.f(1), s)
	pi2 := new(big.Float).SetPrec(w).Mul(n.pi(), n.pi())
	pi2.Quo(pi2, n.f(12))
	return BigValue{
		Pole2:  n.r(is),
		Pole1:  L.Scale(is).Neg(),
		Finite: L.Mul(L).Scale(n.f(0.5)).Sub(n.r(pi2)).Scale(is),
	}
}
