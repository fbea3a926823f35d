package vacuum

import (
	"math/big"

	"loopmatch/expr"
)

// Fast arithmetic for the recursion of twoloop_ibp.go. Every coefficient that the recursion
// produces has a denominator made of the Källén function λ² and the squared masses only (the
// preferred rows have determinant −m_k² λ², the tadpoles bring powers of masses), so it is kept
// as a polynomial numerator over Π f_k^{e_k}, f = (λ², m1², m2², m3²): sums and products then need
// no greatest common divisors, which dominate the cost of rational-function arithmetic. Each
// result is brought to lowest terms once, when it leaves the reducer.

// lcoef is num / Π f_k^{e[k]}.
type lcoef struct {
	num expr.Poly
	e   [4]int
}

// lfactors holds the factors f_k and their powers.
type lfactors struct {
	f    [4]expr.Poly
	use  [4]bool // false for zero or constant factors, which never appear
	pows [4][]expr.Poly
}

// newLFactors returns the factors for the masses x, or false if a mass is not a polynomial. The
// first factor is λ² with the masses divided out (λ² = m3²(m3² − 4m²) for masses (m, m, m3));
// with a massless line k, λ² is the square (m_i² − m_j²)² and its root is the factor.
func newLFactors(x [3]expr.RatFunc, lam expr.RatFunc) (*lfactors, bool) {
	lf := &lfactors{}
	for _, r := range append([]expr.RatFunc{lam}, x[:]...) {
		if !r.IsPoly() {
			return nil, false
		}
	}
	l := lam.Num()
	for k := range 3 {
		if x[k].IsZero() {
			l = x[(k+1)%3].Sub(x[(k+2)%3]).Num()
			break
		}
		if x[k].IsConst() {
			continue
		}
		for {
			q, ok := l.DivExact(x[k].Num())
			if !ok || q.IsConst() {
				break
			}
			l = q
		}
	}
	all := []expr.RatFunc{expr.RF(l), x[0], x[1], x[2]}
	for k, r := range all {
		lf.f[k] = r.Num()
		lf.use[k] = !r.IsZero() && !r.IsConst()
		lf.pows[k] = []expr.Poly{expr.PolyInt(1)}
	}
	return lf, true
}

func (lf *lfactors) pow(k, n int) expr.Poly {
	for len(lf.pows[k]) <= n {
		p := lf.pows[k]
		lf.pows[k] = append(p, p[len(p)-1].Mul(lf.f[k]))
	}
	return lf.pows[k][n]
}

// fromRat writes r over the factors, or reports false if its denominator has another factor.
func (lf *lfactors) fromRat(r expr.RatFunc) (lcoef, bool) {
	den := r.Den()
	var c lcoef
	for k := range 4 {
		if !lf.use[k] {
			continue
		}
		for !den.IsConst() {
			q, ok := den.DivExact(lf.f[k])
			if !ok {
				break
			}
			den = q
			c.e[k]++
		}
	}
	dc, ok := den.ConstValue()
	if !ok {
		return lcoef{}, false
	}
	c.num = r.Num().Scale(new(big.Rat).Inv(dc))
	return c, true
}

func (lf *lfactors) mul(a, b lcoef) lcoef {
	var c lcoef
	c.num = a.num.Mul(b.num)
	for k := range 4 {
		c.e[k] = a.e[k] + b.e[k]
	}
	return c
}

func (lf *lfactors) add(a, b lcoef) lcoef {
	if a.num.IsZero() {
		return b
	}
	if b.num.IsZero() {
		return a
	}
	var c lcoef
	na, nb := a.num, b.num
	for k := range 4 {
		c.e[k] = max(a.e[k], b.e[k])
		if d := c.e[k] - a.e[k]; d > 0 {
			na = na.Mul(lf.pow(k, d))
		}
		if d := c.e[k] - b.e[k]; d > 0 {
			nb = nb.Mul(lf.pow(k, d))
		}
	}
	c.num = na.Add(nb)
	return c
}

// toRat returns the coefficient in lowest terms: factors that divide the numerator are removed
// by exact division first, so that the final normalisation works on smaller polynomials.
func (lf *lfactors) toRat(c lcoef) (expr.RatFunc, error) {
	num := c.num
	den := expr.PolyInt(1)
	if num.IsZero() {
		return expr.RFInt(0), nil
	}
	for k := range 4 {
		e := c.e[k]
		for e > 0 {
			q, ok := num.DivExact(lf.f[k])
			if !ok {
				break
			}
			num = q
			e--
		}
		if e > 0 {
			den = den.Mul(lf.pow(k, e))
		}
	}
	return expr.NewRatFunc(num, den)
}

// lvec is a linear combination of atom products (Sun, Tad·Tad) with lcoef coefficients.
type lvec struct {
	c    map[string]lcoef
	info Info
}

// toLVec converts an expression; atom products are remembered in r.atoms by their text.
func (r *reducer) toLVec(e expr.Expr, info Info) (lvec, bool) {
	v := lvec{c: map[string]lcoef{}, info: info}
	for _, t := range e.Terms() {
		one := expr.FromTerm(expr.Term{Coef: expr.RFInt(1), Atoms: t.Atoms})
		key := one.String()
		r.atoms[key] = one
		c, ok := r.lf.fromRat(t.Coef)
		if !ok {
			return lvec{}, false
		}
		v.c[key] = c
	}
	return v, true
}

// fromLVec builds the expression in lowest terms.
func (r *reducer) fromLVec(v lvec) (expr.Expr, error) {
	res := expr.Zero()
	for key, c := range v.c {
		q, err := r.lf.toRat(c)
		if err != nil {
			return expr.Expr{}, err
		}
		res = res.Add(r.atoms[key].Scale(q))
	}
	return res, nil
}
