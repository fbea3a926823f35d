package pv

import (
	"fmt"
	"math/big"

	"loopmatch/expr"
	"loopmatch/loops"
)

// comb is a linear combination of scalar integrals: entry mask is the coefficient of the scalar
// integral whose propagators are the set bits of mask (original labels 0 … N−1). The zero
// value is the zero combination.
type comb [1 << MaxPoints]expr.RatFunc

// unit returns the scalar integral of the propagators in mask.
func unit(mask uint8) comb {
	var c comb
	c[mask] = expr.RFInt(1)
	return c
}

// addScaled returns c + x·o.
func (c comb) addScaled(o comb, x expr.RatFunc) comb {
	if x.IsZero() {
		return c
	}
	for i := range c {
		if o[i].IsZero() {
			continue
		}
		c[i] = c[i].Add(o[i].Mul(x))
	}
	return c
}

// scale returns x·c.
func (c comb) scale(x expr.RatFunc) comb {
	for i := range c {
		if !c[i].IsZero() {
			c[i] = c[i].Mul(x)
		}
	}
	return c
}

// size is the number of polynomial terms in all coefficients, the measure of growth.
func (c comb) size() int {
	s := 0
	for _, x := range c {
		if !x.IsZero() {
			s += x.Num().Len() + x.Den().Len()
		}
	}
	return s
}

// MaxCoefTerms bounds the size of one tensor coefficient during the reduction: the total number
// of polynomial terms in the numerators and denominators of its coefficients. Beyond it the
// reduction fails with an error wrapping expr.ErrTooLarge instead of exhausting time and memory.
var MaxCoefTerms = 20000

// checkSize reports a coefficient that outgrew MaxCoefTerms.
func checkSize(c comb, what string) error {
	if s := c.size(); s > MaxCoefTerms {
		return fmt.Errorf("%w: pv: the coefficients of %s have %d polynomial terms, more than MaxCoefTerms = %d", expr.ErrTooLarge, what, s, MaxCoefTerms)
	}
	return nil
}

// labelsOf returns the set bits of mask in increasing order.
func labelsOf(mask uint8) []int {
	var l []int
	for i := range MaxPoints {
		if mask&(1<<i) != 0 {
			l = append(l, i)
		}
	}
	return l
}

// atom returns the scalar-integral atom of the propagators in mask, in the argument order of
// loops.Atom with the momenta P_l − P_{l0} (l0 the lowest label), or ok = false for a scaleless
// tadpole (zero mass), which vanishes in dimensional regularisation.
func (k *Kinematics) atom(mask uint8) (e expr.Expr, ok bool, err error) {
	labels := labelsOf(mask)
	n := len(labels)
	var m2, inv []expr.RatFunc
	for _, l := range labels {
		m2 = append(m2, k.m2[l])
	}
	if n == 1 && m2[0].IsZero() {
		return expr.Expr{}, false, nil
	}
	for _, p := range invariantPairs[n] {
		inv = append(inv, k.s[labels[p[0]]][labels[p[1]]])
	}
	name := [...]string{1: loops.TadName, 2: loops.BubName, 3: loops.TriName, 4: loops.BoxName}[n]
	e, err = loops.Atom(name, inv, m2)
	return e, err == nil, err
}

// atomEntry is a cached scalar-integral atom; ok is false for a scaleless one.
type atomEntry struct {
	e  expr.Expr
	ok bool
}

// toExpr converts a combination to an expression in the scalar-integral atoms (r.mu held).
func (r *Reducer) toExpr(c comb) (expr.Expr, error) {
	var parts []expr.Expr
	for mask, x := range c {
		if x.IsZero() {
			continue
		}
		a, cached := r.atoms[uint8(mask)]
		if !cached {
			e, ok, err := r.kin.atom(uint8(mask))
			if err != nil {
				return expr.Expr{}, err
			}
			a = atomEntry{e, ok}
			r.atoms[uint8(mask)] = a
		}
		if a.ok {
			parts = append(parts, a.e.Scale(x))
		}
	}
	return expr.Sum(parts...), nil
}

// rat returns the rational constant a/b.
func rat(a, b int64) expr.RatFunc { return expr.RFRat(big.NewRat(a, b)) }

// epsilon returns ε = (4 − d)/2.
func epsilon() expr.RatFunc {
	return rat(2, 1).Sub(expr.RFVar(expr.DimSymbol).Scale(big.NewRat(1, 2)))
}

// factorial returns n! as an int64 (n ≤ 20).
func factorial(n int) int64 {
	f := int64(1)
	for i := 2; i <= n; i++ {
		f *= int64(i)
	}
	return f
}
