package expr

import (
	"errors"
	"math/big"
)

// RatFunc is a rational function Num/Den over the rationals, always in lowest terms: Num and
// Den are coprime, Den has coprime integer coefficients and a positive leading coefficient, and
// the zero function is 0/1. Equal rational functions therefore have equal parts. A RatFunc is
// immutable.
type RatFunc struct {
	num, den Poly
}

// ErrDivByZero is returned when dividing by a rational function that is identically zero.
var ErrDivByZero = errors.New("division by zero")

// RF returns the rational function p/1.
func RF(p Poly) RatFunc { return RatFunc{num: p, den: PolyInt(1)} }

// RFInt returns the constant n.
func RFInt(n int64) RatFunc { return RF(PolyInt(n)) }

// RFRat returns the constant c.
func RFRat(c *big.Rat) RatFunc { return RF(PolyConst(c)) }

// RFVar returns the variable v.
func RFVar(v string) RatFunc { return RF(PolyVar(v)) }

// NewRatFunc returns num/den in lowest terms, or ErrDivByZero when den is zero.
func NewRatFunc(num, den Poly) (RatFunc, error) {
	if den.IsZero() {
		return RatFunc{}, ErrDivByZero
	}
	return normalize(num, den), nil
}

// normalize brings num/den to lowest terms (den nonzero).
func normalize(num, den Poly) RatFunc {
	if num.IsZero() {
		return RatFunc{num: Poly{}, den: PolyInt(1)}
	}
	if c, ok := den.ConstValue(); ok {
		return RatFunc{num: num.Scale(new(big.Rat).Inv(c)), den: PolyInt(1)}
	}
	g := GCD(num, den)
	if !g.IsOne() {
		var ok1, ok2 bool
		num, ok1 = num.DivExact(g)
		den, ok2 = den.DivExact(g)
		if !ok1 || !ok2 {
			panic("expr: GCD does not divide its arguments")
		}
	}
	c, dp := den.PrimitiveZ()
	if dp.IsOne() {
		return RatFunc{num: num.Scale(new(big.Rat).Inv(c)), den: PolyInt(1)}
	}
	return RatFunc{num: num.Scale(new(big.Rat).Inv(c)), den: dp}
}

// Num is the numerator.
func (r RatFunc) Num() Poly { return r.num }

// Den is the denominator (1 for a polynomial).
func (r RatFunc) Den() Poly {
	if r.den.IsZero() { // zero value of RatFunc
		return PolyInt(1)
	}
	return r.den
}

// IsZero reports whether r is identically zero.
func (r RatFunc) IsZero() bool { return r.num.IsZero() }

// IsPoly reports whether r is a polynomial.
func (r RatFunc) IsPoly() bool { return r.den.IsZero() || r.den.IsOne() }

// IsConst reports whether r is a rational number.
func (r RatFunc) IsConst() bool { return r.num.IsConst() && r.IsPoly() }

// ConstValue returns the value of a constant r.
func (r RatFunc) ConstValue() (*big.Rat, bool) {
	if !r.IsPoly() {
		return nil, false
	}
	return r.num.ConstValue()
}

// IsOne reports whether r is 1.
func (r RatFunc) IsOne() bool { return r.IsPoly() && r.num.IsOne() }

// Equal reports whether r and s are the same rational function.
func (r RatFunc) Equal(s RatFunc) bool { return r.num.Equal(s.num) && r.Den().Equal(s.Den()) }

// Vars lists the variables of r, sorted.
func (r RatFunc) Vars() []string { return unionVars(r.num.Vars(), r.Den().Vars()) }

// Has reports whether v occurs in r.
func (r RatFunc) Has(v string) bool { return r.num.Has(v) || r.Den().Has(v) }

// Add returns r + s.
func (r RatFunc) Add(s RatFunc) RatFunc {
	if r.IsZero() {
		return s.fix()
	}
	if s.IsZero() {
		return r.fix()
	}
	rd, sd := r.Den(), s.Den()
	if rd.Equal(sd) {
		if rd.IsOne() {
			return RF(r.num.Add(s.num))
		}
		return normalize(r.num.Add(s.num), rd)
	}
	if rd.IsOne() {
		return RatFunc{num: r.num.Mul(sd).Add(s.num), den: sd}.reduceKnown()
	}
	if sd.IsOne() {
		return RatFunc{num: s.num.Mul(rd).Add(r.num), den: rd}.reduceKnown()
	}
	// a/b + c/d with g = gcd(b, d): (a·(d/g) + c·(b/g)) / (b·d/g)
	g := GCD(rd, sd)
	bg, _ := rd.DivExact(g)
	dg, _ := sd.DivExact(g)
	num := r.num.Mul(dg).Add(s.num.Mul(bg))
	return normalize(num, bg.Mul(sd))
}

// reduceKnown is used when den is already primitive with positive leading coefficient and the
// numerator was formed as p·den + q with q/den in lowest terms: the result is then in lowest terms
// as well (gcd(p·den + q, den) = gcd(q, den) = 1).
func (r RatFunc) reduceKnown() RatFunc {
	if r.num.IsZero() {
		return RatFunc{num: Poly{}, den: PolyInt(1)}
	}
	return r
}

func (r RatFunc) fix() RatFunc {
	if r.den.IsZero() {
		return RatFunc{num: r.num, den: PolyInt(1)}
	}
	return r
}

// Neg returns −r.
func (r RatFunc) Neg() RatFunc { return RatFunc{num: r.num.Neg(), den: r.Den()} }

// Sub returns r − s.
func (r RatFunc) Sub(s RatFunc) RatFunc { return r.Add(s.Neg()) }

// Mul returns r·s.
func (r RatFunc) Mul(s RatFunc) RatFunc {
	if r.IsZero() || s.IsZero() {
		return RFInt(0)
	}
	rd, sd := r.Den(), s.Den()
	if rd.IsOne() && sd.IsOne() {
		return RF(r.num.Mul(s.num))
	}
	// Cross-cancel: (a/b)(c/d) = (a/g1)(c/g2) / ((b/g2)(d/g1)), g1 = gcd(a, d), g2 = gcd(c, b).
	a, b, c, d := r.num, rd, s.num, sd
	if !d.IsOne() {
		if g := GCD(a, d); !g.IsOne() {
			a, _ = a.DivExact(g)
			d, _ = d.DivExact(g)
		}
	}
	if !b.IsOne() {
		if g := GCD(c, b); !g.IsOne() {
			c, _ = c.DivExact(g)
			b, _ = b.DivExact(g)
		}
	}
	num := a.Mul(c)
	den := b.Mul(d)
	cst, dp := den.PrimitiveZ()
	return RatFunc{num: num.Scale(new(big.Rat).Inv(cst)), den: dp}
}

// Inv returns 1/r, or ErrDivByZero.
func (r RatFunc) Inv() (RatFunc, error) {
	if r.IsZero() {
		return RatFunc{}, ErrDivByZero
	}
	c, np := r.num.PrimitiveZ()
	return RatFunc{num: r.Den().Scale(new(big.Rat).Inv(c)), den: np}, nil
}

// Div returns r/s, or ErrDivByZero.
func (r RatFunc) Div(s RatFunc) (RatFunc, error) {
	inv, err := s.Inv()
	if err != nil {
		return RatFunc{}, err
	}
	return r.Mul(inv), nil
}

// Scale returns c·r.
func (r RatFunc) Scale(c *big.Rat) RatFunc {
	if c.Sign() == 0 {
		return RFInt(0)
	}
	return RatFunc{num: r.num.Scale(c), den: r.Den()}
}

// Pow returns r^n for any integer n (ErrDivByZero for 0^negative).
func (r RatFunc) Pow(n int) (RatFunc, error) {
	if n < 0 {
		inv, err := r.Inv()
		if err != nil {
			return RatFunc{}, err
		}
		return inv.Pow(-n)
	}
	num := r.num.Pow(n)
	den := r.Den().Pow(n)
	// Powers of coprime polynomials are coprime; the denominator stays primitive (Gauss) with a
	// positive leading coefficient.
	return RatFunc{num: num, den: den}, nil
}

// Derivative returns ∂r/∂v.
func (r RatFunc) Derivative(v string) RatFunc {
	d := r.Den()
	if d.IsOne() {
		return RF(r.num.Derivative(v))
	}
	num := r.num.Derivative(v).Mul(d).Sub(r.num.Mul(d.Derivative(v)))
	return normalize(num, d.Mul(d))
}

// Subst replaces the variable v by s. It fails only when the denominator becomes zero.
func (r RatFunc) Subst(v string, s RatFunc) (RatFunc, error) {
	if !r.Has(v) {
		return r, nil
	}
	num, err := substPoly(r.num, v, s)
	if err != nil {
		return RatFunc{}, err
	}
	den, err := substPoly(r.Den(), v, s)
	if err != nil {
		return RatFunc{}, err
	}
	return num.Div(den)
}

// substPoly substitutes the rational function s for v in p.
func substPoly(p Poly, v string, s RatFunc) (RatFunc, error) {
	if s.IsPoly() {
		return RF(p.Subst(v, s.num)), nil
	}
	// Σ c_e v^e with v = N/D: (Σ c_e N^e D^{n−e}) / D^n
	cs := p.CoeffsIn(v)
	n := len(cs) - 1
	N, D := s.num, s.Den()
	num := Poly{}
	for e, c := range cs {
		if c.IsZero() {
			continue
		}
		num = num.Add(c.Mul(N.Pow(e)).Mul(D.Pow(n - e)))
	}
	return NewRatFunc(num, D.Pow(n))
}

// String prints r in canonical text: "x + 1", "(a^2 + a*b + b^2)/(a + b)", "-b/(3*a)".
// The rational content of the numerator is split into the integers in front of numerator and
// denominator, so that both print with integer coefficients.
func (r RatFunc) String() string {
	d := r.Den()
	if d.IsOne() {
		return r.num.String()
	}
	c, np := r.num.PrimitiveZ()
	sign := ""
	if c.Sign() < 0 {
		sign = "-"
		c = new(big.Rat).Neg(c)
	}
	return sign + fracText(c.Num(), np, c.Denom(), d)
}

// fracText writes (p·N)/(q·D) for positive integers p, q and primitive polynomials N, D.
func fracText(p *big.Int, N Poly, q *big.Int, D Poly) string {
	num := scaledText(p, N)
	den := scaledText(q, D)
	if needsParens(p, N) {
		num = "(" + num + ")"
	}
	if needsParens(q, D) {
		den = "(" + den + ")"
	}
	return num + "/" + den
}

// scaledText prints k·P with k a positive integer.
func scaledText(k *big.Int, P Poly) string {
	one := k.IsInt64() && k.Int64() == 1
	switch {
	case P.IsOne():
		return k.String()
	case one:
		return P.String()
	case P.Len() == 1:
		return k.String() + "*" + P.String()
	default:
		return k.String() + "*(" + P.String() + ")"
	}
}

// needsParens reports whether k·P must be parenthesised as an operand of "/".
func needsParens(k *big.Int, P Poly) bool {
	if P.IsOne() {
		return false
	}
	one := k.IsInt64() && k.Int64() == 1
	if !one || P.Len() > 1 {
		return true
	}
	m := P.terms[0].Mono
	return len(m) > 1 // a product of variables
}
