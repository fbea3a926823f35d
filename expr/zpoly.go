package expr

import (
	"math/big"
)

// zpoly is a polynomial with integer coefficients, used inside the GCD and exact division where
// rational arithmetic (which reduces every coefficient by a GCD) would dominate the cost. Its
// terms are in the canonical order of monoCmp with nonzero coefficients. Coefficients are never
// modified after construction.
type zpoly []zterm

type zterm struct {
	m Mono
	c *big.Int
}

// toZ converts a polynomial with integer coefficients.
func toZ(p Poly) zpoly {
	out := make(zpoly, len(p.terms))
	for i, t := range p.terms {
		out[i] = zterm{t.Mono, t.Coef.Num()}
	}
	return out
}

func (z zpoly) toPoly() Poly {
	out := make([]PolyTerm, len(z))
	for i, t := range z {
		out[i] = PolyTerm{Mono: t.m, Coef: new(big.Rat).SetInt(t.c)}
	}
	return Poly{terms: out}
}

func (z zpoly) isConst() bool { return len(z) == 0 || (len(z) == 1 && len(z[0].m) == 0) }

func (z zpoly) isOne() bool {
	return len(z) == 1 && len(z[0].m) == 0 && z[0].c.IsInt64() && z[0].c.Int64() == 1
}

func (z zpoly) equal(w zpoly) bool {
	if len(z) != len(w) {
		return false
	}
	for i := range z {
		if !monoEqual(z[i].m, w[i].m) || z[i].c.Cmp(w[i].c) != 0 {
			return false
		}
	}
	return true
}

func (z zpoly) degree(v string) int {
	d := 0
	for _, t := range z {
		d = max(d, t.m.Exp(v))
	}
	return d
}

func (z zpoly) has(v string) bool {
	for _, t := range z {
		if t.m.Exp(v) > 0 {
			return true
		}
	}
	return false
}

func (z zpoly) vars() []string {
	var out []string
	for _, t := range z {
		vs := make([]string, len(t.m))
		for i, vp := range t.m {
			vs[i] = vp.Var
		}
		out = unionVars(out, vs)
	}
	return out
}

// subMul returns r − c·m·d, merging the sorted term lists in one pass.
func (r zpoly) subMul(c *big.Int, m Mono, d zpoly) zpoly {
	out := make(zpoly, 0, len(r)+len(d))
	i, j := 0, 0
	tmp := new(big.Int)
	for i < len(r) || j < len(d) {
		var dm Mono
		if j < len(d) {
			dm = monoMul(d[j].m, m)
		}
		var cmp int
		switch {
		case i == len(r):
			cmp = 1
		case j == len(d):
			cmp = -1
		default:
			cmp = monoCmp(r[i].m, dm)
		}
		switch {
		case cmp < 0:
			out = append(out, r[i])
			i++
		case cmp > 0:
			out = append(out, zterm{dm, new(big.Int).Neg(tmp.Mul(c, d[j].c))})
			j++
		default:
			s := new(big.Int).Sub(r[i].c, tmp.Mul(c, d[j].c))
			if s.Sign() != 0 {
				out = append(out, zterm{r[i].m, s})
			}
			i++
			j++
		}
	}
	return out
}

// divExact returns a/d when d divides a with an integer quotient (always the case for a
// primitive d that divides a over the rationals, by Gauss's lemma). The remainder is kept in
// two alternating buffers with coefficients owned by the division, so a step allocates only
// the terms it creates.
func (a zpoly) divExact(d zpoly) (zpoly, bool) {
	if len(d) == 0 {
		return nil, false
	}
	if len(a) == 0 {
		return zpoly{}, true
	}
	if d.isOne() {
		return a, true
	}
	deg := map[string]int{}
	for _, t := range a {
		for _, vp := range t.m {
			deg[vp.Var] = max(deg[vp.Var], vp.Exp)
		}
	}
	for _, t := range d {
		for _, vp := range t.m {
			if vp.Exp > deg[vp.Var] {
				return nil, false
			}
		}
	}
	if d[0].m.Degree() > a[0].m.Degree() {
		return nil, false
	}
	lt := d[0]
	var q zpoly
	r := make(zpoly, len(a), len(a)+len(d))
	for i, t := range a {
		r[i] = zterm{t.m, new(big.Int).Set(t.c)}
	}
	buf := make(zpoly, 0, len(a)+len(d))
	rem, tmp := new(big.Int), new(big.Int)
	for len(r) > 0 {
		t := r[0]
		m, ok := monoDiv(t.m, lt.m)
		if !ok {
			return nil, false
		}
		c, rm := new(big.Int).QuoRem(t.c, lt.c, rem)
		if rm.Sign() != 0 {
			return nil, false
		}
		q = append(q, zterm{m, c})
		// r ← r − c·m·d; the leading terms cancel by construction.
		buf = buf[:0]
		i, j := 1, 1
		mdeg := m.Degree()
		for i < len(r) || j < len(d) {
			var cmp int
			switch {
			case i == len(r):
				cmp = 1
			case j == len(d):
				cmp = -1
			default:
				cmp = monoCmpProd(r[i].m, d[j].m, m, mdeg)
			}
			switch {
			case cmp < 0:
				buf = append(buf, r[i])
				i++
			case cmp > 0:
				buf = append(buf, zterm{monoMul(d[j].m, m), new(big.Int).Neg(tmp.Mul(c, d[j].c))})
				j++
			default:
				r[i].c.Sub(r[i].c, tmp.Mul(c, d[j].c))
				if r[i].c.Sign() != 0 {
					buf = append(buf, r[i])
				}
				i++
				j++
			}
		}
		r, buf = buf, r
	}
	return q, true
}

// monoCmpProd compares a with b·m (mdeg = m.Degree()) in the order of monoCmp without
// building the product.
func monoCmpProd(a, b, m Mono, mdeg int) int {
	da, db := a.Degree(), b.Degree()+mdeg
	if da != db {
		if da > db {
			return -1
		}
		return 1
	}
	i, j, k := 0, 0, 0
	for {
		// next factor of b·m
		var v string
		var e int
		switch {
		case j < len(b) && k < len(m) && b[j].Var == m[k].Var:
			v, e = b[j].Var, b[j].Exp+m[k].Exp
			j++
			k++
		case j < len(b) && (k == len(m) || b[j].Var < m[k].Var):
			v, e = b[j].Var, b[j].Exp
			j++
		case k < len(m):
			v, e = m[k].Var, m[k].Exp
			k++
		default:
			if i < len(a) {
				return -1
			}
			return 0
		}
		if i == len(a) {
			return 1
		}
		if a[i].Var != v {
			if a[i].Var < v {
				return -1
			}
			return 1
		}
		if a[i].Exp != e {
			if a[i].Exp > e {
				return -1
			}
			return 1
		}
		i++
	}
}

// content is the positive GCD of the coefficients.
func (z zpoly) content() *big.Int {
	g := new(big.Int)
	for _, t := range z {
		g.GCD(nil, nil, g, new(big.Int).Abs(t.c))
		if g.IsInt64() && g.Int64() == 1 {
			break
		}
	}
	return g
}

// primitive divides by the content and makes the leading coefficient positive.
func (z zpoly) primitive() zpoly {
	if len(z) == 0 {
		return z
	}
	g := z.content()
	if z[0].c.Sign() < 0 {
		g.Neg(g)
	}
	if g.IsInt64() && g.Int64() == 1 {
		return z
	}
	out := make(zpoly, len(z))
	for i, t := range z {
		out[i] = zterm{t.m, new(big.Int).Quo(t.c, g)}
	}
	return out
}

func (z zpoly) scale(k *big.Int) zpoly {
	out := make(zpoly, len(z))
	for i, t := range z {
		out[i] = zterm{t.m, new(big.Int).Mul(t.c, k)}
	}
	return out
}

func (z zpoly) quoInt(k *big.Int) zpoly {
	out := make(zpoly, len(z))
	for i, t := range z {
		out[i] = zterm{t.m, new(big.Int).Quo(t.c, k)}
	}
	return out
}

func (z zpoly) mulMono(m Mono) zpoly {
	out := make(zpoly, len(z))
	for i, t := range z {
		out[i] = zterm{monoMul(t.m, m), t.c}
	}
	return out
}

func (z zpoly) mul(w zpoly) zpoly {
	return toZ(z.toPoly().Mul(w.toPoly()))
}

// coeffsIn writes z = Σ_e c_e v^e and returns the c_e.
func (z zpoly) coeffsIn(v string) []zpoly {
	out := make([]zpoly, z.degree(v)+1)
	for _, t := range z {
		e := t.m.Exp(v)
		m := t.m
		if e > 0 {
			m = make(Mono, 0, len(t.m)-1)
			for _, vp := range t.m {
				if vp.Var != v {
					m = append(m, vp)
				}
			}
		}
		out[e] = append(out[e], zterm{m, t.c})
	}
	return out
}

// evalInt substitutes the integer x for v (Horner).
func (z zpoly) evalInt(v string, x *big.Int) zpoly {
	cs := z.coeffsIn(v)
	res := cs[len(cs)-1]
	for e := len(cs) - 2; e >= 0; e-- {
		res = zAdd(res.scale(x), cs[e])
	}
	return res
}

// zAdd returns a + b.
func zAdd(a, b zpoly) zpoly {
	return a.subMul(big.NewInt(-1), nil, b)
}

func (z zpoly) maxNorm() *big.Int {
	m := new(big.Int)
	for _, t := range z {
		if t.c.CmpAbs(m) > 0 {
			m = new(big.Int).Abs(t.c)
		}
	}
	return m
}

// monoGCD is the largest monomial dividing every term (z nonzero).
func (z zpoly) monoGCD() Mono {
	m := append(Mono(nil), z[0].m...)
	for _, t := range z[1:] {
		if len(m) == 0 {
			break
		}
		m = monoMin(m, t.m)
	}
	return m
}

// divMono divides every term by m (which must divide them).
func (z zpoly) divMono(m Mono) zpoly {
	out := make(zpoly, len(z))
	for i, t := range z {
		q, _ := monoDiv(t.m, m)
		out[i] = zterm{q, t.c}
	}
	return out
}
