package expr

import (
	"errors"
	"fmt"
	"math/big"
)

// This file expands an expression in one symbol around a point: a truncated Laurent series in
// h = v − a with exact coefficients, or in t = 1/v around v = ∞. Rational functions are expanded
// by the power-series division recursion; log, Li2 and sqrt of rational functions through their
// derivatives (log u = log u(a) + ∫ u'/u, Li2(u) = Li2(u(a)) − ∫ log(1 − u) u'/u, and the
// binomial recursion of J.C.P. Miller for (u/u(a))^{1/2}, D.E. Knuth, TAOCP vol. 2, §4.7). A
// removable singularity shows up as pole terms that cancel exactly in the sum.
//
// At v = 0 and v = ∞ a logarithm whose argument vanishes or diverges there is split as
// log u = k log v + log w with w regular and nonzero; the coefficients then contain log(v), and
// the series is one in h (or t) with coefficients polynomial in log(v). Such a split assumes
// v > 0. At other points a logarithm that is singular there is an error.

// Taylor is the truncated Laurent series Σ_{n=Low}^{Order−1} Coef[n−Low]·h^n + O(h^Order) of an
// expression in h = Var − At, or in t = 1/Var when At is nil. The coefficients are free of Var
// except for log(Var) at the points 0 and ∞. A Taylor is immutable.
type Taylor struct {
	Var  string
	At   *big.Rat // nil: around Var = ∞, in t = 1/Var
	Low  int
	Coef []Expr
}

// Order is the first power that is not known.
func (s Taylor) Order() int { return s.Low + len(s.Coef) }

// Coeff returns the coefficient of h^n (zero below Low; callers stay below Order).
func (s Taylor) Coeff(n int) Expr {
	if n < s.Low || n >= s.Order() {
		return Expr{}
	}
	return s.Coef[n-s.Low]
}

// ErrTaylor reports an expression that has no Laurent expansion of the kind Taylor computes at
// the requested point (a function the engine cannot expand, a logarithm singular at an interior
// point, a branch point).
var ErrTaylor = errors.New("no series expansion")

// taylorSym is the expansion variable inside the computation; it cannot be a notation name.
const taylorSym = "·h"

// TaylorAt expands e around v = a to the order h^order (exclusive), h = v − a.
func TaylorAt(e Expr, v string, a *big.Rat, order int) (Taylor, error) {
	sub := RF(PolyConst(a).Add(PolyVar(taylorSym)))
	return taylorExpand(e, v, new(big.Rat).Set(a), sub, order)
}

// TaylorAtInfinity expands e around v = ∞ in t = 1/v to the order t^order (exclusive).
func TaylorAtInfinity(e Expr, v string, order int) (Taylor, error) {
	sub, _ := NewRatFunc(PolyInt(1), PolyVar(taylorSym))
	return taylorExpand(e, v, nil, sub, order)
}

func taylorExpand(e Expr, v string, at *big.Rat, sub RatFunc, order int) (Taylor, error) {
	x := &expander{v: v, at: at, sub: sub}
	extra := 8
	for try := 0; try < 4; try++ {
		s, err := x.expr(e, order+extra)
		if err != nil {
			return Taylor{}, err
		}
		s = s.trim()
		if s.order() >= order {
			out := Taylor{Var: v, At: at, Low: s.low}
			if s.low >= order {
				out.Low = order
				return out, nil
			}
			out.Coef = s.c[:order-s.low]
			return out, nil
		}
		extra += order - s.order() + 8
	}
	return Taylor{}, fmt.Errorf("%w of %s around %s: the expansion does not reach order %d", ErrTaylor, v, pointText(at), order)
}

func pointText(at *big.Rat) string {
	if at == nil {
		return "infinity"
	}
	return at.RatString()
}

// laurent is Σ c[i] h^(low+i), known exactly below h^(low+len(c)).
type laurent struct {
	low int
	c   []Expr
}

func (s laurent) order() int { return s.low + len(s.c) }

func (s laurent) at(n int) Expr {
	if n < s.low || n >= s.order() {
		return Expr{}
	}
	return s.c[n-s.low]
}

// trim drops leading zero coefficients.
func (s laurent) trim() laurent {
	i := 0
	for i < len(s.c) && s.c[i].IsZero() {
		i++
	}
	return laurent{low: s.low + i, c: s.c[i:]}
}

// constLaurent is e + O(h^n).
func constLaurent(e Expr, n int) laurent {
	if n <= 0 {
		return laurent{low: n}
	}
	c := make([]Expr, n)
	c[0] = e
	return laurent{c: c}.trim()
}

func addLaurent(a, b laurent) laurent {
	lo := min(a.low, b.low)
	hi := min(a.order(), b.order())
	if hi <= lo {
		return laurent{low: hi}
	}
	c := make([]Expr, hi-lo)
	for n := lo; n < hi; n++ {
		c[n-lo] = a.at(n).Add(b.at(n))
	}
	return laurent{low: lo, c: c}
}

func mulLaurent(a, b laurent) (laurent, error) {
	a, b = a.trim(), b.trim()
	lo := a.low + b.low
	hi := min(a.order()+b.low, b.order()+a.low)
	if hi <= lo {
		return laurent{low: hi}, nil
	}
	c := make([]Expr, hi-lo)
	for n := lo; n < hi; n++ {
		var terms []Expr
		for i := a.low; i < a.order() && n-i >= b.low; i++ {
			if n-i >= b.order() {
				continue
			}
			x, y := a.at(i), b.at(n-i)
			if x.IsZero() || y.IsZero() {
				continue
			}
			p, err := x.Mul(y)
			if err != nil {
				return laurent{}, err
			}
			terms = append(terms, p)
		}
		c[n-lo] = Sum(terms...)
	}
	return laurent{low: lo, c: c}, nil
}

// invLaurent returns 1/a; its leading coefficient must be invertible.
func invLaurent(a laurent) (laurent, error) {
	a = a.trim()
	if len(a.c) == 0 {
		return laurent{}, fmt.Errorf("%w: a factor vanishes to the order computed", ErrTaylor)
	}
	b0, err := a.c[0].Pow(-1)
	if err != nil {
		return laurent{}, fmt.Errorf("%w: %v", ErrTaylor, err)
	}
	n := len(a.c)
	b := make([]Expr, n)
	b[0] = b0
	for k := 1; k < n; k++ {
		var terms []Expr
		for j := 1; j <= k; j++ {
			if a.c[j].IsZero() || b[k-j].IsZero() {
				continue
			}
			p, err := a.c[j].Mul(b[k-j])
			if err != nil {
				return laurent{}, err
			}
			terms = append(terms, p)
		}
		s, err := Sum(terms...).Mul(b0)
		if err != nil {
			return laurent{}, err
		}
		b[k] = s.Neg()
	}
	return laurent{low: -a.low, c: b}, nil
}

func powLaurent(a laurent, p int) (laurent, error) {
	if p < 0 {
		inv, err := invLaurent(a)
		if err != nil {
			return laurent{}, err
		}
		return powLaurent(inv, -p)
	}
	if p == 0 {
		return constLaurent(Int(1), a.order()-a.low+max(a.low, 0)), nil
	}
	res := a
	for i := 1; i < p; i++ {
		var err error
		if res, err = mulLaurent(res, a); err != nil {
			return laurent{}, err
		}
	}
	return res, nil
}

// integrate returns ∫_0^h a; a must have no h^{−1} term.
func integrate(a laurent) (laurent, error) {
	c := make([]Expr, len(a.c))
	for i, x := range a.c {
		n := a.low + i
		if n == -1 {
			if !x.IsZero() {
				return laurent{}, fmt.Errorf("%w: an integrand has a 1/h term", ErrTaylor)
			}
			continue
		}
		c[i] = x.Scale(RFRat(big.NewRat(1, int64(n+1))))
	}
	return laurent{low: a.low + 1, c: c}, nil
}

// expander holds the variable, the point and the substitution v → a + h (or 1/t).
type expander struct {
	v   string
	at  *big.Rat
	sub RatFunc
}

func (x *expander) expr(e Expr, n int) (laurent, error) {
	sum := laurent{low: n}
	for _, t := range e.Terms() {
		s, err := x.term(t, n)
		if err != nil {
			return laurent{}, err
		}
		sum = addLaurent(sum, s)
	}
	return sum, nil
}

// term expands one term with n coefficients beyond each factor's leading power.
func (x *expander) term(t Term, n int) (laurent, error) {
	if len(t.Loops) > 0 || len(t.NC) > 0 {
		return laurent{}, fmt.Errorf("%w: %s is a loop integral or a Dirac string", ErrTaylor, t)
	}
	s, err := x.ratFunc(t.Coef, n)
	if err != nil {
		return laurent{}, err
	}
	var consts []AtomPow
	for _, a := range t.Atoms {
		if !x.atomHasVar(a.A) {
			consts = append(consts, a)
			continue
		}
		f, err := x.atom(a.A, n)
		if err != nil {
			return laurent{}, err
		}
		if f, err = powLaurent(f, a.Pow); err != nil {
			return laurent{}, err
		}
		if s, err = mulLaurent(s, f); err != nil {
			return laurent{}, err
		}
	}
	if len(consts) > 0 {
		k := FromTerm(Term{Coef: RFInt(1), Atoms: consts})
		for i := range s.c {
			var err error
			if s.c[i], err = s.c[i].Mul(k); err != nil {
				return laurent{}, err
			}
		}
	}
	return s, nil
}

func (x *expander) atomHasVar(a Atom) bool {
	switch y := a.(type) {
	case Fn:
		return argHas(y.Args, x.v)
	case Prop:
		return y.M2.Has(x.v)
	}
	return false
}

// inH substitutes the expansion variable into a rational function.
func (x *expander) inH(r RatFunc) (RatFunc, error) { return r.Subst(x.v, x.sub) }

// valuation splits p (a polynomial in h) as h^k·q with q(0) ≠ 0 and returns k and the
// coefficients of q by powers of h.
func valuation(p Poly) (int, []Poly) {
	cs := p.CoeffsIn(taylorSym)
	k := 0
	for k < len(cs) && cs[k].IsZero() {
		k++
	}
	return k, cs[k:]
}

// ratFunc expands r (a function of v) with n coefficients from its leading power on.
func (x *expander) ratFunc(r RatFunc, n int) (laurent, error) {
	rh, err := x.inH(r)
	if err != nil {
		return laurent{}, err
	}
	return seriesOfH(rh, n)
}

// seriesOfH expands a rational function of h with n coefficients from its leading power on.
func seriesOfH(r RatFunc, n int) (laurent, error) {
	if r.IsZero() {
		return laurent{low: n}, nil
	}
	kn, num := valuation(r.Num())
	kd, den := valuation(r.Den())
	inv0, err := RF(den[0]).Inv()
	if err != nil {
		return laurent{}, err
	}
	// 1/den by b_k = −b_0 Σ_{j≥1} den_j b_{k−j}.
	b := make([]RatFunc, n)
	b[0] = inv0
	for k := 1; k < n; k++ {
		acc := RFInt(0)
		for j := 1; j <= k && j < len(den); j++ {
			if den[j].IsZero() {
				continue
			}
			acc = acc.Add(RF(den[j]).Mul(b[k-j]))
		}
		b[k] = acc.Mul(inv0).Neg()
	}
	c := make([]Expr, n)
	for k := 0; k < n; k++ {
		acc := RFInt(0)
		for j := 0; j <= k && j < len(num); j++ {
			if num[j].IsZero() {
				continue
			}
			acc = acc.Add(RF(num[j]).Mul(b[k-j]))
		}
		c[k] = FromRF(acc)
	}
	return laurent{low: kn - kd, c: c}, nil
}

// atom expands a function atom that depends on v.
func (x *expander) atom(a Atom, n int) (laurent, error) {
	f, ok := a.(Fn)
	if !ok || len(f.Args) != 1 {
		return laurent{}, fmt.Errorf("%w: %s cannot be expanded in %s", ErrTaylor, a.Key(), x.v)
	}
	r, ok := f.Args[0].AsRatFunc()
	if !ok {
		return laurent{}, fmt.Errorf("%w: the argument of %s is not a rational function of %s", ErrTaylor, a.Key(), x.v)
	}
	u, err := x.inH(r)
	if err != nil {
		return laurent{}, err
	}
	switch f.Name {
	case FnLog:
		return x.log(u, f.I0, n, a.Key())
	case FnLi2:
		return x.li2(u, f.I0, n, a.Key())
	case FnSqrt:
		return x.sqrt(u, n, a.Key())
	}
	return laurent{}, fmt.Errorf("%w: %s cannot be expanded in %s", ErrTaylor, a.Key(), x.v)
}

// lead returns the valuation k of u in h and the leading coefficient u_k.
func lead(u RatFunc) (int, RatFunc, error) {
	kn, num := valuation(u.Num())
	kd, den := valuation(u.Den())
	c, err := RF(num[0]).Div(RF(den[0]))
	return kn - kd, c, err
}

// log expands log(u(h)).
func (x *expander) log(u RatFunc, i0, n int, key string) (laurent, error) {
	k, u0, err := lead(u)
	if err != nil {
		return laurent{}, err
	}
	res := laurent{low: n}
	if k != 0 {
		// log u = k log h + log w at v = 0 (h = v), or −k log v + log w at ∞ (t = 1/v).
		if x.at != nil && x.at.Sign() != 0 {
			return laurent{}, fmt.Errorf("%w: %s is singular at %s = %s", ErrTaylor, key, x.v, pointText(x.at))
		}
		kk := int64(k)
		if x.at == nil {
			kk = -kk
		}
		lv := FromAtom(NewFn(FnLog, 1, Sym(x.v)), 1).Scale(RFInt(kk))
		res = constLaurent(lv, n)
		hk, err := NewRatFunc(PolyInt(1), PolyVar(taylorSym).Pow(max(k, 0)))
		if err != nil {
			return laurent{}, err
		}
		u = u.Mul(hk).Mul(RF(PolyVar(taylorSym).Pow(max(-k, 0))))
	}
	l0, err := Apply(FnLog, i0, FromRF(u0))
	if err != nil {
		return laurent{}, err
	}
	// ∫ u'/u with u now regular and nonzero at h = 0.
	du := u.Derivative(taylorSym)
	q, err := du.Div(u)
	if err != nil {
		return laurent{}, err
	}
	qs, err := seriesOfH(q, n)
	if err != nil {
		return laurent{}, err
	}
	integ, err := integrate(qs)
	if err != nil {
		return laurent{}, err
	}
	return addLaurent(addLaurent(res, constLaurent(l0, n)), integ), nil
}

// li2 expands Li2(u(h)).
func (x *expander) li2(u RatFunc, i0, n int, key string) (laurent, error) {
	k, u0, err := lead(u)
	if err != nil {
		return laurent{}, err
	}
	if k < 0 {
		return laurent{}, fmt.Errorf("%w: the argument of %s diverges at %s = %s", ErrTaylor, key, x.v, pointText(x.at))
	}
	if k > 0 {
		u0 = RFInt(0)
	}
	one := RFInt(1)
	if u0.Equal(one) {
		// Li2(u) = π²/6 − log(u) log(1 − u) − Li2(1 − u).
		lu, err := x.log(u, i0, n, key)
		if err != nil {
			return laurent{}, err
		}
		l1u, err := x.log(one.Sub(u), -i0, n, key)
		if err != nil {
			return laurent{}, err
		}
		p, err := mulLaurent(lu, l1u)
		if err != nil {
			return laurent{}, err
		}
		r, err := x.li2(one.Sub(u), -i0, n, key)
		if err != nil {
			return laurent{}, err
		}
		pi2 := constLaurent(FromAtom(Pi, 2).Scale(RFRat(big.NewRat(1, 6))), n)
		return addLaurent(pi2, negLaurent(addLaurent(p, r))), nil
	}
	c0, err := Apply(FnLi2, i0, FromRF(u0))
	if err != nil {
		return laurent{}, err
	}
	// d Li2(u)/dh = −log(1 − u)·u'/u
	l, err := x.log(one.Sub(u), -i0, n+1, key)
	if err != nil {
		return laurent{}, err
	}
	q, err := u.Derivative(taylorSym).Div(u)
	if err != nil {
		return laurent{}, err
	}
	qs, err := seriesOfH(q, n+1)
	if err != nil {
		return laurent{}, err
	}
	d, err := mulLaurent(l, qs)
	if err != nil {
		return laurent{}, err
	}
	integ, err := integrate(negLaurent(d))
	if err != nil {
		return laurent{}, err
	}
	return addLaurent(constLaurent(c0, n), integ), nil
}

// sqrt expands sqrt(u(h)) for u regular and nonzero at the point.
func (x *expander) sqrt(u RatFunc, n int, key string) (laurent, error) {
	k, u0, err := lead(u)
	if err != nil {
		return laurent{}, err
	}
	if k != 0 {
		return laurent{}, fmt.Errorf("%w: %s has a branch point at %s = %s", ErrTaylor, key, x.v, pointText(x.at))
	}
	inv0, err := u0.Inv()
	if err != nil {
		return laurent{}, err
	}
	ps, err := seriesOfH(u.Mul(inv0), n)
	if err != nil {
		return laurent{}, err
	}
	p := ps.c // p[0] = 1
	// g = p^α, α = 1/2: g_m = (1/m) Σ_{j=1}^m ((α + 1) j − m) p_j g_{m−j}.
	alpha := big.NewRat(1, 2)
	g := make([]Expr, n)
	g[0] = Int(1)
	for m := 1; m < n; m++ {
		var terms []Expr
		for j := 1; j <= m; j++ {
			if p[j].IsZero() || g[m-j].IsZero() {
				continue
			}
			w := new(big.Rat).Add(alpha, big.NewRat(1, 1))
			w.Mul(w, big.NewRat(int64(j), 1))
			w.Sub(w, big.NewRat(int64(m), 1))
			w.Quo(w, big.NewRat(int64(m), 1))
			pr, err := p[j].Mul(g[m-j])
			if err != nil {
				return laurent{}, err
			}
			terms = append(terms, pr.Scale(RFRat(w)))
		}
		g[m] = Sum(terms...)
	}
	s0, err := Apply(FnSqrt, 1, FromRF(u0))
	if err != nil {
		return laurent{}, err
	}
	for i := range g {
		if g[i], err = g[i].Mul(s0); err != nil {
			return laurent{}, err
		}
	}
	return laurent{c: g}, nil
}

func negLaurent(a laurent) laurent {
	c := make([]Expr, len(a.c))
	for i, x := range a.c {
		c[i] = x.Neg()
	}
	return laurent{low: a.low, c: c}
}
