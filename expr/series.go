package expr

import (
	"errors"
	"fmt"
	"math/big"
	"strings"
)

// EpsSymbol is the name of ε (d = 4 − 2ε) in printed series.
const EpsSymbol = "eps"

// Series is a truncated Laurent series in ε: Σ_{k=Lo}^{Order−1} C[k−Lo] ε^k + O(ε^Order), with
// expression coefficients (rational functions of the parameters times transcendental atoms).
// A Series is immutable.
type Series struct {
	Lo    int
	C     []Expr
	Order int
}

// ErrSeriesInverse reports a series whose leading coefficient cannot be inverted exactly.
var ErrSeriesInverse = errors.New("series has a leading coefficient that is not a single invertible term")

// SeriesConst returns e + O(ε^order).
func SeriesConst(e Expr, order int) Series {
	if order <= 0 {
		return Series{Lo: order, Order: order}
	}
	c := make([]Expr, order)
	c[0] = e
	return Series{Lo: 0, C: c, Order: order}.trim()
}

// SeriesEps returns ε^n + O(ε^order).
func SeriesEps(n, order int) Series {
	if n >= order {
		return Series{Lo: order, Order: order}
	}
	c := make([]Expr, order-n)
	c[0] = Int(1)
	return Series{Lo: n, C: c, Order: order}
}

// trim drops leading zero coefficients (raising Lo) so that Lo is the true leading power.
func (s Series) trim() Series {
	i := 0
	for i < len(s.C) && s.C[i].IsZero() {
		i++
	}
	if i == 0 {
		return s
	}
	return Series{Lo: s.Lo + i, C: s.C[i:], Order: s.Order}
}

// Coef returns the coefficient of ε^k (zero outside the known range; callers check Order).
func (s Series) Coef(k int) Expr {
	if k < s.Lo || k >= s.Order {
		return Expr{}
	}
	return s.C[k-s.Lo]
}

// IsZero reports whether every known coefficient vanishes.
func (s Series) IsZero() bool { return len(s.trim().C) == 0 }

// Truncate lowers the truncation order to n (no effect if n ≥ Order).
func (s Series) Truncate(n int) Series {
	if n >= s.Order {
		return s
	}
	if n <= s.Lo {
		return Series{Lo: n, Order: n}
	}
	return Series{Lo: s.Lo, C: s.C[:n-s.Lo], Order: n}
}

// Add returns s + t, known up to the lower of the two orders.
func (s Series) Add(t Series) Series {
	order := min(s.Order, t.Order)
	lo := min(s.Lo, t.Lo, order)
	c := make([]Expr, order-lo)
	for k := lo; k < order; k++ {
		c[k-lo] = s.Coef(k).Add(t.Coef(k))
	}
	return Series{Lo: lo, C: c, Order: order}.trim()
}

// Neg returns −s.
func (s Series) Neg() Series {
	c := make([]Expr, len(s.C))
	for i, x := range s.C {
		c[i] = x.Neg()
	}
	return Series{Lo: s.Lo, C: c, Order: s.Order}
}

// Sub returns s − t.
func (s Series) Sub(t Series) Series { return s.Add(t.Neg()) }

// ScaleExpr multiplies every coefficient by e (which must not contain ε).
func (s Series) ScaleExpr(e Expr) (Series, error) {
	c := make([]Expr, len(s.C))
	for i, x := range s.C {
		var err error
		if c[i], err = x.Mul(e); err != nil {
			return Series{}, err
		}
	}
	return Series{Lo: s.Lo, C: c, Order: s.Order}.trim(), nil
}

// Scale multiplies every coefficient by the rational function r.
func (s Series) Scale(r RatFunc) Series {
	c := make([]Expr, len(s.C))
	for i, x := range s.C {
		c[i] = x.Scale(r)
	}
	return Series{Lo: s.Lo, C: c, Order: s.Order}.trim()
}

// Mul returns s·t. The product is known up to min(s.Lo + t.Order, t.Lo + s.Order).
func (s Series) Mul(t Series) (Series, error) {
	s, t = s.trim(), t.trim()
	lo := s.Lo + t.Lo
	order := min(s.Lo+t.Order, t.Lo+s.Order)
	if order <= lo {
		return Series{Lo: order, Order: order}, nil
	}
	c := make([]Expr, order-lo)
	for k := lo; k < order; k++ {
		acc := Expr{}
		for i := s.Lo; i <= k-t.Lo; i++ {
			a, b := s.Coef(i), t.Coef(k-i)
			if a.IsZero() || b.IsZero() {
				continue
			}
			p, err := a.Mul(b)
			if err != nil {
				return Series{}, err
			}
			acc = acc.Add(p)
		}
		c[k-lo] = acc
	}
	return Series{Lo: lo, C: c, Order: order}.trim(), nil
}

// Inv returns 1/s. The leading coefficient must be a single term without non-commuting parts
// or loops (for example a rational function, or π² times one).
func (s Series) Inv() (Series, error) {
	s = s.trim()
	if len(s.C) == 0 {
		return Series{}, fmt.Errorf("%w: the series is zero to the known order", ErrSeriesInverse)
	}
	a0 := s.C[0]
	if a0.Len() != 1 {
		return Series{}, ErrSeriesInverse
	}
	inv0, err := a0.Pow(-1)
	if err != nil {
		return Series{}, fmt.Errorf("%w: %v", ErrSeriesInverse, err)
	}
	// s = ε^Lo·a0·(1 + u), u = Σ_{k≥1} (C[k]/a0) ε^k; 1/(1+u) = Σ (−u)^j.
	n := len(s.C) // relative order
	u := make([]Expr, n)
	u[0] = Expr{}
	for k := 1; k < n; k++ {
		if u[k], err = s.C[k].Mul(inv0); err != nil {
			return Series{}, err
		}
	}
	U := Series{Lo: 0, C: u, Order: n}.trim()
	res := SeriesConst(Int(1), n)
	pow := SeriesConst(Int(1), n)
	negU := U.Neg()
	for j := 1; j < n; j++ {
		if pow, err = pow.Mul(negU); err != nil {
			return Series{}, err
		}
		res = res.Add(pow)
	}
	res, err = res.ScaleExpr(inv0)
	if err != nil {
		return Series{}, err
	}
	return Series{Lo: res.Lo - s.Lo, C: res.C, Order: res.Order - s.Lo}.trim(), nil
}

// Div returns s/t.
func (s Series) Div(t Series) (Series, error) {
	inv, err := t.Inv()
	if err != nil {
		return Series{}, err
	}
	return s.Mul(inv)
}

// Pow returns s^n for an integer n (negative n through Inv).
func (s Series) Pow(n int) (Series, error) {
	if n < 0 {
		inv, err := s.Inv()
		if err != nil {
			return Series{}, err
		}
		return inv.Pow(-n)
	}
	s = s.trim()
	if n == 0 {
		return SeriesConst(Int(1), max(s.Order-s.Lo, 1)), nil
	}
	res := s
	for i := 1; i < n; i++ {
		var err error
		if res, err = res.Mul(s); err != nil {
			return Series{}, err
		}
	}
	return res, nil
}

// Exp returns exp(s) for a series without constant or pole terms (s.Lo ≥ 1 after trimming).
func (s Series) Exp() (Series, error) {
	s = s.trim()
	if len(s.C) > 0 && s.Lo < 1 {
		return Series{}, fmt.Errorf("exp of a series with ε^%d term", s.Lo)
	}
	res := SeriesConst(Int(1), s.Order)
	if len(s.C) == 0 {
		return res, nil
	}
	term := SeriesConst(Int(1), s.Order)
	var err error
	for j := 1; j*s.Lo < s.Order; j++ {
		if term, err = term.Mul(s); err != nil {
			return Series{}, err
		}
		term = term.Scale(RFRat(big.NewRat(1, int64(j))))
		res = res.Add(term)
	}
	return res, nil
}

// MapCoef applies f to every coefficient.
func (s Series) MapCoef(f func(Expr) (Expr, error)) (Series, error) {
	c := make([]Expr, len(s.C))
	for i, x := range s.C {
		var err error
		if c[i], err = f(x); err != nil {
			return Series{}, err
		}
	}
	return Series{Lo: s.Lo, C: c, Order: s.Order}.trim(), nil
}

// String prints the series: "a/eps^2 + b/eps + c + d*eps + O(eps^2)".
func (s Series) String() string {
	var parts []string
	for i, c := range s.C {
		if c.IsZero() {
			continue
		}
		k := s.Lo + i
		var eps string
		switch {
		case k == 0:
		case k == 1:
			eps = EpsSymbol
		case k == -1:
			eps = "/" + EpsSymbol
		case k < 0:
			eps = fmt.Sprintf("/%s^%d", EpsSymbol, -k)
		default:
			eps = fmt.Sprintf("%s^%d", EpsSymbol, k)
		}
		cs := c.String()
		if c.Len() > 1 {
			cs = "(" + cs + ")"
		}
		switch {
		case k == 0:
			parts = append(parts, cs)
		case k < 0:
			parts = append(parts, cs+eps)
		case cs == "1":
			parts = append(parts, eps)
		default:
			parts = append(parts, cs+"*"+eps)
		}
	}
	o := "O(1)"
	switch s.Order {
	case 0:
	case 1:
		o = "O(" + EpsSymbol + ")"
	default:
		o = fmt.Sprintf("O(%s^%d)", EpsSymbol, s.Order)
	}
	parts = append(parts, o)
	out := strings.Join(parts, " + ")
	return strings.ReplaceAll(out, " + -", " - ")
}

// SeriesFromRatFunc expands the rational function r, in which the symbol d stands for 4 − 2ε,
// up to O(ε^order).
func SeriesFromRatFunc(r RatFunc, order int) (Series, error) {
	if !r.Has(DimSymbol) {
		return SeriesConst(FromRF(r), order), nil
	}
	num := polyInEps(r.Num())
	den := polyInEps(r.Den())
	// The denominator may vanish at ε = 0 to some power v; the quotient then starts at ε^{−v}
	// and the inverse of the denominator loses 2v orders, so expand both to order + 2v.
	v := 0
	for v < len(den) && den[v].IsZero() {
		v++
	}
	N := seriesFromPolyCoeffs(num, order+2*v)
	D := seriesFromPolyCoeffs(den, order+2*v)
	q, err := N.Div(D)
	if err != nil {
		return Series{}, err
	}
	return q.Truncate(order), nil
}

// polyInEps substitutes d = 4 − 2ε into p and returns the coefficients of ε^0, ε^1, ….
func polyInEps(p Poly) []Poly {
	cs := p.CoeffsIn(DimSymbol) // Σ c_j d^j
	out := make([]Poly, len(cs))
	for i := range out {
		out[i] = Poly{}
	}
	// (4 − 2ε)^j = Σ_i binom(j, i) 4^{j−i} (−2)^i ε^i
	for j, c := range cs {
		if c.IsZero() {
			continue
		}
		b := big.NewInt(1)
		for i := 0; i <= j; i++ {
			if i > 0 {
				b.Mul(b, big.NewInt(int64(j-i+1)))
				b.Quo(b, big.NewInt(int64(i)))
			}
			f := new(big.Int).Mul(b, new(big.Int).Exp(big.NewInt(4), big.NewInt(int64(j-i)), nil))
			f.Mul(f, new(big.Int).Exp(big.NewInt(-2), big.NewInt(int64(i)), nil))
			out[i] = out[i].Add(c.Scale(new(big.Rat).SetInt(f)))
		}
	}
	return out
}

func seriesFromPolyCoeffs(cs []Poly, order int) Series {
	c := make([]Expr, max(order, 0))
	for i := range c {
		if i < len(cs) {
			c[i] = FromRF(RF(cs[i]))
		}
	}
	return Series{Lo: 0, C: c, Order: max(order, 0)}.trim()
}
