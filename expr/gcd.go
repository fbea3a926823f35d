package expr

import (
	"math/big"
)

// This file holds exact division and the multivariate greatest common divisor that keeps
// rational functions in lowest terms. The GCD first removes what is cheap (integer content,
// common monomials, variables present in only one argument), then tries the heuristic GCD of
// B.W. Char, K.O. Geddes, G.H. Gonnet, J. Symbolic Comput. 7 (1989) 31 (evaluation at a large
// integer, recursive GCD of the images, ξ-adic reconstruction, verification by exact division),
// and falls back to the recursive primitive polynomial remainder sequence (D.E. Knuth, TAOCP
// vol. 2, §4.6.1, Algorithm E), which always succeeds.

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
	// Quick rejection on degrees.
	for _, v := range d.Vars() {
		if d.Degree(v) > p.Degree(v) {
			return Poly{}, false
		}
	}
	if d.TotalDegree() > p.TotalDegree() {
		return Poly{}, false
	}
	lt := d.terms[0]
	inv := new(big.Rat).Inv(lt.Coef)
	var q []PolyTerm
	r := p
	for !r.IsZero() {
		t := r.terms[0]
		m, ok := monoDiv(t.Mono, lt.Mono)
		if !ok {
			return Poly{}, false
		}
		c := new(big.Rat).Mul(t.Coef, inv)
		q = append(q, PolyTerm{Mono: m, Coef: c})
		r = r.Sub(d.MulMono(c, m))
	}
	// Quotient terms come out in decreasing order already.
	return Poly{terms: q}, true
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

// monoGCD is the largest monomial dividing every term of p (p nonzero).
func (p Poly) monoGCD() Mono {
	if p.IsZero() {
		return nil
	}
	m := append(Mono(nil), p.terms[0].Mono...)
	for _, t := range p.terms[1:] {
		out := m[:0]
		for _, vp := range m {
			if e := t.Mono.Exp(vp.Var); e > 0 {
				out = append(out, VarPow{vp.Var, min(e, vp.Exp)})
			}
		}
		m = out
		if len(m) == 0 {
			break
		}
	}
	return m
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
	return gcdPrim(a, b)
}

// gcdPrim computes the GCD of two nonzero primitive integer polynomials.
func gcdPrim(a, b Poly) Poly {
	if a.IsConst() || b.IsConst() {
		return PolyInt(1)
	}
	if a.Equal(b) {
		return a
	}
	// Common monomial factor.
	ma, mb := a.monoGCD(), b.monoGCD()
	m := monoMin(ma, mb)
	if len(ma) > 0 {
		a, _ = a.DivExact(PolyMono(ratOne, ma))
	}
	if len(mb) > 0 {
		b, _ = b.DivExact(PolyMono(ratOne, mb))
	}
	g := gcdNoMono(a, b)
	if len(m) > 0 {
		g = g.MulMono(ratOne, m)
	}
	return g
}

// gcdNoMono is gcdPrim after the monomial content has been removed from both arguments.
func gcdNoMono(a, b Poly) Poly {
	if a.IsConst() || b.IsConst() {
		return PolyInt(1)
	}
	// A variable that occurs in only one argument cannot occur in the GCD: the GCD is the GCD of
	// the other argument with all coefficients in that variable.
	av, bv := a.Vars(), b.Vars()
	if v, ok := firstMissing(av, b); ok {
		return gcdWithCoeffs(b, a, v)
	}
	if v, ok := firstMissing(bv, a); ok {
		return gcdWithCoeffs(a, b, v)
	}
	if a.Equal(b) {
		return a
	}
	if h, ok := heuGCD(a, b); ok {
		_, h = h.PrimitiveZ()
		return h
	}
	_, h := prsGCD(a, b).PrimitiveZ()
	return h
}

func firstMissing(vars []string, p Poly) (string, bool) {
	for _, v := range vars {
		if !p.Has(v) {
			return v, true
		}
	}
	return "", false
}

// gcdWithCoeffs returns gcd(b, coefficients of a in v), where b is free of v.
func gcdWithCoeffs(b, a Poly, v string) Poly {
	g := b
	for _, c := range a.CoeffsIn(v) {
		if c.IsZero() {
			continue
		}
		g = GCD(g, c)
		if g.IsConst() {
			return PolyInt(1)
		}
	}
	return g
}

// maxNorm is the largest absolute value of an (integer) coefficient.
func maxNorm(p Poly) *big.Int {
	m := new(big.Int)
	for _, t := range p.terms {
		a := new(big.Int).Abs(t.Coef.Num())
		if a.Cmp(m) > 0 {
			m = a
		}
	}
	return m
}

// evalVarInt substitutes the integer x for v.
func evalVarInt(p Poly, v string, x *big.Int) Poly {
	cs := p.CoeffsIn(v)
	xr := new(big.Rat).SetInt(x)
	res := cs[len(cs)-1]
	for e := len(cs) - 2; e >= 0; e-- {
		res = res.Scale(xr).Add(cs[e])
	}
	return res
}

// interpolate rebuilds a polynomial in v from its image h at v = x by the symmetric ξ-adic
// expansion of every integer coefficient.
func interpolate(h Poly, v string, x *big.Int) Poly {
	var ts []PolyTerm
	half := new(big.Int).Rsh(x, 1)
	for _, t := range h.terms {
		c := new(big.Int).Set(t.Coef.Num())
		e := 0
		for c.Sign() != 0 {
			r := new(big.Int).Mod(c, x) // 0 ≤ r < x
			if r.Cmp(half) > 0 {
				r.Sub(r, x)
			}
			if r.Sign() != 0 {
				m := t.Mono
				if e > 0 {
					m = monoMul(t.Mono, Mono{{v, e}})
				}
				ts = append(ts, PolyTerm{Mono: m, Coef: new(big.Rat).SetInt(r)})
			}
			c.Sub(c, r)
			c.Quo(c, x)
			e++
		}
	}
	return fromTerms(ts)
}

// heuGCDMaxBits bounds the evaluation point of the heuristic GCD; beyond it the PRS is used.
const heuGCDMaxBits = 1 << 14

// heuGCD returns a GCD of integer polynomials a and b (up to sign and integer content), and
// whether the heuristic succeeded. Results are always verified by exact division.
func heuGCD(a, b Poly) (Poly, bool) {
	h, _, _, ok := heuGCDCof(a, b)
	return h, ok
}

func heuGCDCof(a, b Poly) (h, ca, cb Poly, ok bool) {
	if a.IsZero() || b.IsZero() {
		return Poly{}, Poly{}, Poly{}, false
	}
	if a.IsConst() && b.IsConst() {
		x := a.terms[0].Coef.Num()
		y := b.terms[0].Coef.Num()
		g := new(big.Int).GCD(nil, nil, new(big.Int).Abs(x), new(big.Int).Abs(y))
		gr := new(big.Rat).SetInt(g)
		return PolyConst(gr), a.Scale(new(big.Rat).Inv(gr)), b.Scale(new(big.Rat).Inv(gr)), true
	}
	vars := unionVars(a.Vars(), b.Vars())
	v := vars[len(vars)-1]
	// Divide out the integer content common to both (not each one's own content, so that the
	// cofactors of the images stay consistent with the arguments).
	ga, _ := a.PrimitiveZ()
	gb, _ := b.PrimitiveZ()
	gint := new(big.Int).GCD(nil, nil, new(big.Int).Abs(ga.Num()), new(big.Int).Abs(gb.Num()))
	scale := new(big.Rat).SetInt(gint)
	inv := new(big.Rat).Inv(scale)
	pa, pb := a.Scale(inv), b.Scale(inv)
	fa, fb := maxNorm(pa), maxNorm(pb)
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
	la := new(big.Int).Quo(fa, new(big.Int).Abs(pa.LeadCoef().Num()))
	lb := new(big.Int).Quo(fb, new(big.Int).Abs(pb.LeadCoef().Num()))
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
		ea, eb := evalVarInt(pa, v, x), evalVarInt(pb, v, x)
		if !ea.IsZero() && !eb.IsZero() {
			hh, cfa, cfb, ok := heuGCDCof(ea, eb)
			if ok {
				cands := []Poly{interpolate(hh, v, x)}
				if Ca := interpolate(cfa, v, x); !Ca.IsZero() {
					if hq, ok := pa.DivExact(Ca); ok {
						cands = append(cands, hq)
					}
				}
				if Cb := interpolate(cfb, v, x); !Cb.IsZero() {
					if hq, ok := pb.DivExact(Cb); ok {
						cands = append(cands, hq)
					}
				}
				for _, H := range cands {
					if c, ok := tryCandidate(H, pa, pb); ok {
						return c.h.Scale(scale), c.ca, c.cb, true
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
	return Poly{}, Poly{}, Poly{}, false
}

type gcdCand struct{ h, ca, cb Poly }

func tryCandidate(H, a, b Poly) (gcdCand, bool) {
	if H.IsZero() {
		return gcdCand{}, false
	}
	_, H = H.PrimitiveZ()
	ca, ok := a.DivExact(H)
	if !ok {
		return gcdCand{}, false
	}
	cb, ok := b.DivExact(H)
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

// prsGCD is the recursive primitive-PRS GCD (always succeeds).
func prsGCD(a, b Poly) Poly {
	vars := unionVars(a.Vars(), b.Vars())
	if len(vars) == 0 {
		return PolyInt(1)
	}
	x := vars[0]
	if a.Degree(x) < b.Degree(x) {
		a, b = b, a
	}
	if b.Degree(x) == 0 {
		return gcdWithCoeffs(b, a, x)
	}
	ca, pa := contentIn(a, x)
	cb, pb := contentIn(b, x)
	c := GCD(ca, cb)
	for {
		r := pseudoRem(pa, pb, x)
		if r.IsZero() {
			break
		}
		if r.Degree(x) == 0 {
			pb = PolyInt(1)
			break
		}
		_, pr := contentIn(r, x)
		pa, pb = pb, pr
	}
	return c.Mul(pb)
}

// contentIn writes p = c·q with c the GCD of the coefficients of p in x (a polynomial free of x)
// and q primitive in x.
func contentIn(p Poly, x string) (Poly, Poly) {
	cs := p.CoeffsIn(x)
	g := Poly{}
	for _, c := range cs {
		if c.IsZero() {
			continue
		}
		if g.IsZero() {
			_, g = c.PrimitiveZ()
		} else {
			g = GCD(g, c)
		}
		if g.IsOne() {
			break
		}
	}
	if g.IsOne() {
		_, q := p.PrimitiveZ()
		return g, q
	}
	q, ok := p.DivExact(g)
	if !ok {
		panic("expr: content does not divide polynomial")
	}
	_, q = q.PrimitiveZ()
	return g, q
}

// pseudoRem returns a multiple of the pseudo-remainder of a by b in x.
func pseudoRem(a, b Poly, x string) Poly {
	db := b.Degree(x)
	bc := b.CoeffsIn(x)
	lcB := bc[db]
	r := a
	for !r.IsZero() && r.Degree(x) >= db {
		dr := r.Degree(x)
		lcR := r.CoeffsIn(x)[dr]
		shift := b.MulMono(ratOne, Mono{{x, dr - db}})
		if dr == db {
			shift = b
		}
		r = r.Mul(lcB).Sub(shift.Mul(lcR))
		_, r = r.PrimitiveZ()
	}
	return r
}
