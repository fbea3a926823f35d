package pv

import (
	"fmt"
	"math/big"

	"loopmatch/expr"
)

// comb is a linear combination of scalar integrals: num[mask]/den[mask] is the coefficient of
// the scalar integral whose propagators are the set bits of mask (original labels 0 … N−1).
// Each coefficient keeps its own denominator: a common one would multiply every numerator by
// the Gram determinants of unrelated sub-integrals. The zero value is the zero combination.
type comb struct {
	num [1 << MaxPoints]expr.Poly
	den [1 << MaxPoints]denom
}

// unit returns the scalar integral of the propagators in mask.
func unit(mask uint8) comb {
	var c comb
	c.num[mask] = expr.PolyInt(1)
	return c
}

func (c comb) isZero() bool {
	for _, x := range c.num {
		if !x.IsZero() {
			return false
		}
	}
	return true
}

// add returns c + m·o.
func (fs *factorSet) add(c, o comb, m mult) comb {
	if m.num.IsZero() {
		return c
	}
	for i, x := range o.num {
		if x.IsZero() {
			continue
		}
		od := mulDen(o.den[i], m.den)
		if c.num[i].IsZero() {
			c.num[i], c.den[i] = x.Mul(m.num), od
			continue
		}
		l := lcmDen(c.den[i], od)
		a := c.num[i]
		if q := quoDen(l, c.den[i]); len(q) > 0 {
			a = a.Mul(fs.poly(q))
		}
		b := x.Mul(m.num)
		if q := quoDen(l, od); len(q) > 0 {
			b = b.Mul(fs.poly(q))
		}
		c.num[i] = a.Add(b)
		c.den[i] = l
		if c.num[i].IsZero() {
			c.den[i] = nil
		}
	}
	return c
}

// scale returns m·c.
func (fs *factorSet) scale(c comb, m mult) comb {
	if m.num.IsZero() {
		return comb{}
	}
	for i, x := range c.num {
		if !x.IsZero() {
			c.num[i] = x.Mul(m.num)
			c.den[i] = mulDen(c.den[i], m.den)
		}
	}
	return c
}

// size is the number of polynomial terms in the numerators, the measure of growth.
func (c comb) size() int {
	s := 0
	for _, x := range c.num {
		s += x.Len()
	}
	return s
}

// MaxCoefTerms bounds the size of one tensor coefficient during the reduction: the total number
// of polynomial terms in the numerators of its coefficients. Beyond it the reduction fails
// with an error wrapping expr.ErrTooLarge instead of exhausting time and memory.
var MaxCoefTerms = 50000

// checkSize reports a coefficient of the sub-integral mask that outgrew MaxCoefTerms.
func (k *Kinematics) checkSize(c comb, mask uint8) error {
	if s := c.size(); s > MaxCoefTerms {
		return fmt.Errorf("%w: pv: the coefficients of %s have %d polynomial terms, more than MaxCoefTerms = %d", expr.ErrTooLarge, k.describe(mask), s, MaxCoefTerms)
	}
	return nil
}

// tidy cancels denominator factors that divide their numerator, keeping the growth of the
// fraction-free numerators in check.
func (fs *factorSet) tidy(c comb) comb {
	for i, x := range c.num {
		if x.IsZero() {
			continue
		}
		var den denom
		for _, f := range c.den[i] {
			e := f.e
			for e > 0 {
				q, ok := x.DivExact(fs.polys[f.id])
				if !ok {
					break
				}
				x = q
				e--
			}
			if e > 0 {
				den = append(den, fexp{f.id, e})
			}
		}
		c.num[i], c.den[i] = x, den
	}
	return c
}

// epsilon returns ε = (4 − d)/2.
func epsilon() expr.RatFunc {
	return expr.RFInt(2).Sub(expr.RFVar(expr.DimSymbol).Scale(big.NewRat(1, 2)))
}

// factorial returns n! as an int64 (n ≤ 20).
func factorial(n int) int64 {
	f := int64(1)
	for i := 2; i <= n; i++ {
		f *= int64(i)
	}
	return f
}
