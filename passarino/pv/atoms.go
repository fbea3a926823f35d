package pv

import (
	"loopmatch/expr"
	"loopmatch/loops"
)

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

// toExpr converts a combination to an expression in the scalar-integral atoms, each
// coefficient in lowest terms (r.mu held).
func (r *Reducer) toExpr(c comb) (expr.Expr, error) {
	var parts []expr.Expr
	for mask, x := range c.num {
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
		if !a.ok {
			continue
		}
		coef, err := expr.NewRatFunc(x, r.fs.poly(c.den[mask]))
		if err != nil {
			return expr.Expr{}, err
		}
		parts = append(parts, a.e.Scale(coef))
	}
	return expr.Sum(parts...), nil
}
