package expr

import (
	"math/big"
)

// This file holds exact division and the multivariate greatest common divisor that keeps
// rational functions in lowest terms. The GCD works on primitive integer polynomials (zpoly):
// it first removes what is cheap (common monomials, variables present in only one argument),
// then tries the heuristic GCD of B.W. Char, K.O. Geddes, G.H. Gonnet, J. Symbolic Comput. 7
// (1989) 31 (evaluation at a large integer, recursive GCD of the images, ξ-adic reconstruction,
// verification by exact division), and falls back to the recursive primitive polynomial
// remainder sequence (D.E. Knuth, TAOCP vol. 2, §4.6.1, Algorithm E), which always succeeds.

// DivExact returns p/d and true when d divides p exactly over the rationals; otherwise false.
func (p Poly) DivExact(d Poly) (Poly, bool) {
	if d.IsZero() {
		return Poly{}, false
	}
	if p.IsZero() {
		return Poly{}, true
	}
	if c, ok := d.ConstValue(); ok {
		return p.Scale(new(big.Rat).Inv(c)), true
	}
	if len(d.terms) == 1 {
		inv := new(big.Rat).Inv(d.terms[0].Coef)
		out := make([]PolyTerm, len(p.terms))
		for i, t := range p.terms {
			m, ok := monoDiv(t.Mono, d.terms[0].Mono)
			if !ok {
				return Poly{}, false
			}
			out[i] = PolyTerm{Mono: m, Coef: new(big.Rat).Mul(t.Coef, inv)}
		}
		return Poly{terms: out}, true
	}
	// p/d = (cp/cd)·(P/D) with P, D primitive; P/D is integral when it exists (Gauss).
	cp, P := p.PrimitiveZ()
	cd, D := d.PrimitiveZ()
	q, ok := toZ(P).divExact(toZ(D))
	if !ok {
		return Poly{}, false
	}
	return q.toPoly().Scale(new(big.Rat).Quo(cp, cd)), true
}

// PrimitiveZ writes p = c·q with q having coprime integer coefficients and a positive leading
// coefficient. For p = 0 it returns (0, 0).
func (p Poly) PrimitiveZ() (*big.Rat, Poly) {
	if p.IsZero() {
		return new(big.Rat), Poly{}
	}
	// lcm of denominators, gcd of numerators
	l := big.NewInt(1)
	g := new(big.Int)
	for _, t := range p.terms {
		den := t.Coef.Denom()
		if !(den.IsInt64() && den.Int64() == 1) {
			gg := new(big.Int).GCD(nil, nil, l, den)
			l.Mul(l, new(big.Int).Quo(den, gg))
		}
		g.GCD(nil, nil, g, new(big.Int).Abs(t.Coef.Num()))
	}
	c := new(big.Rat).SetFrac(g, l)
	if p.terms[0].Coef.Sign() < 0 {
		c.Neg(c)
	}
	if c.Cmp(ratOne) == 0 {
		return c, p
	}
	return c, p.Scale(new(big.Rat).Inv(c))
}

func monoMin(a, b Mono) Mono {
	var out Mono
	for _, vp := range a {
		if e := b.Exp(vp.Var); e > 0 {
			out = append(out, VarPow{vp.Var, min(e, vp.Exp)})
		}
	}
	return out
}

// GCD returns the greatest common divisor of p and q over the rationals, normalised to have
// coprime integer coefficients and a positive leading coefficient. GCD(0, 0) is 0.
func GCD(p, q Poly) Poly {
	switch {
	case p.IsZero() && q.IsZero():
		return Poly{}
	case p.IsZero():
		_, g := q.PrimitiveZ()
		return g
	case q.IsZero():
		_, g := p.PrimitiveZ()
		return g
	}
	_, a := p.PrimitiveZ()
	_, b := q.PrimitiveZ()
	return gcdZ(toZ(a), toZ(b)).toPoly()
}

var zOne = zpoly{{nil, big.NewInt(1)}}

// gcdZ computes the GCD of two nonzero primitive integer polynomials (result primitive, with a
// positive leading coefficient).
func gcdZ(a, b zpoly) zpoly {
	if a.isConst() || b.isConst() {
		return zOne
	}
	if a.equal(b) {
		return a
	}
	// Common monomial factor.
	ma, mb := a.monoGCD(), b.monoGCD()
	m := monoMin(ma, mb)
	if len(ma) > 0 {
		a = a.divMono(ma)
	}
	if len(mb) > 0 {
		b = b.divMono(mb)
	}
	g := gcdNoMono(a, b)
	if len(m) > 0 {
		g = g.mulMono(m)
	}
	return g
}

// gcdNoMono is gcdZ after the monomial content has been removed from both arguments.
func gcdNoMono(a, b zpoly) zpoly {
	if a.isConst() || b.isConst() {
		return zOne
	}
	// A variable that occurs in only one argument cannot occur in the GCD: the GCD is the GCD of
	// the other argument with all coefficients in that variable.
	for _, v := range a.vars() {
		if !b.has(v) {
			return gcdWithCoeffs(b, a, v)
		}
	}
	for _, v := range b.vars() {
		if !a.has(v) {
			return gcdWithCoeffs(a, b, v)
		}
	}
	if a.equal(b) {
		return a
	}
	if h, _, _, ok := heuGCDZ(a, b); ok {
		return h.primitive()
	}
	return prsGCDZ(a, b).primitive()
}

// gcdWithCoeffs returns gcd(b, coefficients of a in v), where b is free of v.
func gcdWithCoeffs(b, a zpoly, v string) zpoly {
	g := b
	for _, c := range a.coeffsIn(v) {
		if len(c) == 0 {
			continue
		}
		g = gcdZ(g, c.primitive())
		if g.isConst() {
			return zOne
		}
	}
	return g
}

// interpolate rebuilds a polynomial in v from its image h at v = x by the symmetric ξ-adic
// expansion of every integer coefficient.
func interpolate(h zpoly, v string, x *big.Int) zpoly {
	var ts []PolyTerm
	half := new(big.Int).Rsh(x, 1)
	r := new(big.Int)
	for _, t := range h {
		c := new(big.Int).Set(t.c)
		e := 0
		for c.Sign() != 0 {
			r.Mod(c, x) // 0 ≤ r < x
			if r.Cmp(half) > 0 {
				r.Sub(r, x)
			}
			if r.Sign() != 0 {
				m := t.m
				if e > 0 {
					m = monoMul(t.m, Mono{{v, e}})
				}
				ts = append(ts, PolyTerm{Mono: m, Coef: new(big.Rat).SetInt(r)})
			}
			c.Sub(c, r)
			c.Quo(c, x)
			e++
		}
	}
	return toZ(fromTerms(ts))
}

// heuGCDMaxBits bounds the evaluation point of the heuristic GCD; beyond it the PRS is used.
const heuGCDMaxBits = 1 << 14

// heuGCD is the heuristic GCD on Poly arguments with integer coefficients (for tests).
func heuGCD(a, b Poly) (Poly, bool) {
	h, _, _, ok := heuGCDZ(toZ(a), toZ(b))
	return h.toPoly(), ok
}

// prsGCD is the primitive-PRS GCD on Poly arguments with integer coefficients (for tests).
func prsGCD(a, b Poly) Poly { return prsGCDZ(toZ(a), toZ(b)).toPoly() }

// heuGCDZ returns a GCD h of the integer polynomials a, b with cofactors a/h, b/h, and whether
// the heuristic succeeded. Results are always verified by exact division.
func heuGCDZ(a, b zpoly) (h, ca, cb zpoly, ok bool) {
	if len(a) == 0 || len(b) == 0 {
		return nil, nil, nil, false
	}
	if a.isConst() && b.isConst() {
		g := new(big.Int).GCD(nil, nil, new(big.Int).Abs(a[0].c), new(big.Int).Abs(b[0].c))
		return zpoly{{nil, g}}, a.quoInt(g), b.quoInt(g), true
	}
	vars := unionVars(a.vars(), b.vars())
	v := vars[len(vars)-1]
	// Divide out the integer content common to both (not each one's own content, so that the
	// cofactors of the images stay consistent with the arguments).
	gint := new(big.Int).GCD(nil, nil, a.content(), b.content())
	pa, pb := a.quoInt(gint), b.quoInt(gint)
	fa, fb := pa.maxNorm(), pb.maxNorm()
	mn := fa
	if fb.Cmp(mn) < 0 {
		mn = fb
	}
	B := new(big.Int).Lsh(mn, 1)
	B.Add(B, big.NewInt(29))
	// x = max(min(B, 99·√B), 2·min(|a|/|lc a|, |b|/|lc b|) + 2)
	s := new(big.Int).Sqrt(B)
	s.Mul(s, big.NewInt(99))
	x := B
	if s.Cmp(B) < 0 {
		x = s
	}
	la := new(big.Int).Quo(fa, new(big.Int).Abs(pa[0].c))
	lb := new(big.Int).Quo(fb, new(big.Int).Abs(pb[0].c))
	if lb.Cmp(la) < 0 {
		la = lb
	}
	la.Lsh(la, 1)
	la.Add(la, big.NewInt(2))
	if la.Cmp(x) > 0 {
		x = la
	}
	x = new(big.Int).Set(x)
	for range 6 {
		if x.BitLen() > heuGCDMaxBits {
			break
		}
		ea, eb := pa.evalInt(v, x), pb.evalInt(v, x)
		if len(ea) > 0 && len(eb) > 0 {
			hh, cfa, cfb, ok := heuGCDZ(ea, eb)
			if ok {
				if c, ok := tryCandidate(interpolate(hh, v, x), pa, pb); ok {
					return c.h.scale(gint), c.ca, c.cb, true
				}
				if Ca := interpolate(cfa, v, x); len(Ca) > 0 {
					if hq, ok := pa.divExact(Ca.primitive()); ok {
						if c, ok := tryCandidate(hq, pa, pb); ok {
							return c.h.scale(gint), c.ca, c.cb, true
						}
					}
				}
				if Cb := interpolate(cfb, v, x); len(Cb) > 0 {
					if hq, ok := pb.divExact(Cb.primitive()); ok {
						if c, ok := tryCandidate(hq, pa, pb); ok {
							return c.h.scale(gint), c.ca, c.cb, true
						}
					}
				}
			}
		}
		// Next evaluation point: x ← ⌊73794·x·x^{1/4} / 27011⌋ (Char, Geddes, Gonnet).
		q := new(big.Int).Sqrt(new(big.Int).Sqrt(x))
		x.Mul(x, big.NewInt(73794))
		x.Mul(x, q)
		x.Quo(x, big.NewInt(27011))
	}
	return nil, nil, nil, false
}

type gcdCand struct{ h, ca, cb zpoly }

func tryCandidate(H, a, b zpoly) (gcdCand, bool) {
	if len(H) == 0 {
		return gcdCand{}, false
	}
	H = H.primitive()
	ca, ok := a.divExact(H)
	if !ok {
		return gcdCand{}, false
	}
	cb, ok := b.divExact(H)
	if !ok {
		return gcdCand{}, false
	}
	return gcdCand{H, ca, cb}, true
}

func unionVars(a, b []string) []string {
	out := make([]string, 0, len(a)+len(b))
	i, j := 0, 0
	for i < len(a) || j < len(b) {
		switch {
		case j == len(b) || (i < len(a) && a[i] < b[j]):
			out = append(out, a[i])
			i++
		case i == len(a) || b[j] < a[i]:
			out = append(out, b[j])
			j++
		default:
			out = append(out, a[i])
			i++
			j++
		}
	}
	return out
}

// prsGCDZ is the recursive primitive-PRS GCD (always succeeds).
func prsGCDZ(a, b zpoly) zpoly {
	vars := unionVars(a.vars(), b.vars())
	if len(vars) == 0 {
		return zOne
	}
	x := vars[0]
	if a.degree(x) < b.degree(x) {
		a, b = b, a
	}
	if b.degree(x) == 0 {
		return gcdWithCoeffs(b.primitive(), a, x)
	}
	ca, pa := contentIn(a, x)
	cb, pb := contentIn(b, x)
	c := gcdZ(ca, cb)
	for {
		r := pseudoRem(pa, pb, x)
		if len(r) == 0 {
			break
		}
		if r.degree(x) == 0 {
			pb = zOne
			break
		}
		_, pr := contentIn(r, x)
		pa, pb = pb, pr
	}
	return c.mul(pb)
}

// contentIn writes p = c·q with c the GCD of the coefficients of p in x (a primitive polynomial
// free of x) and q primitive in x.
func contentIn(p zpoly, x string) (zpoly, zpoly) {
	var g zpoly
	for _, c := range p.coeffsIn(x) {
		if len(c) == 0 {
			continue
		}
		if g == nil {
			g = c.primitive()
		} else {
			g = gcdZ(g, c.primitive())
		}
		if g.isOne() {
			break
		}
	}
	if g.isOne() {
		return g, p.primitive()
	}
	q, ok := p.primitive().divExact(g)
	if !ok {
		panic("expr: content does not divide polynomial")
	}
	return g, q.primitive()
}

// pseudoRem returns a multiple of the pseudo-remainder of a by b in x.
func pseudoRem(a, b zpoly, x string) zpoly {
	db := b.degree(x)
	lcB := b.coeffsIn(x)[db]
	r := a
	for len(r) > 0 && r.degree(x) >= db {
		dr := r.degree(x)
		lcR := r.coeffsIn(x)[dr]
		shift := b
		if dr > db {
			shift = b.mulMono(Mono{{x, dr - db}})
		}
		r = zAdd(r.mul(lcB), shift.mul(lcR).scale(big.NewInt(-1))).primitive()
	}
	return r
}
