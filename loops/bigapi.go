package loops

import (
	"errors"
	"fmt"
	"math"
	"math/big"

	"loopmatch/expr/specfun"
)

// errIllConditioned marks a float64 evaluation that lost too many digits; such evaluations are
// redone in arbitrary precision.
var errIllConditioned = errors.New("ill-conditioned")

func isIllConditioned(err error) bool { return errors.Is(err, errIllConditioned) }

// checkBig validates arbitrary-precision inputs (invariants finite, squared masses finite and
// non-negative, μ² positive and finite, a positive precision).
func checkBig(fn string, inv, m2 []*big.Float, mu2 *big.Float, prec uint) error {
	if prec < 16 {
		return fmt.Errorf("loops.%s: precision %d bits is too small (want ≥ 16)", fn, prec)
	}
	for i, s := range inv {
		if s == nil || s.IsInf() {
			return fmt.Errorf("loops.%s: invariant %d is %v, want a finite number", fn, i+1, s)
		}
	}
	for i, m := range m2 {
		if m == nil || m.IsInf() {
			return fmt.Errorf("loops.%s: squared mass m%d² is %v, want a finite number", fn, i, m)
		}
		if m.Sign() < 0 {
			return fmt.Errorf("loops.%s: squared mass m%d² = %s is negative (masses must be real)", fn, i, m.Text('g', 10))
		}
	}
	if mu2 == nil || mu2.IsInf() || mu2.Sign() <= 0 {
		return fmt.Errorf("loops.%s: scale μ² = %v, want a positive finite number", fn, mu2)
	}
	return nil
}

// converge evaluates at prec+64 and prec+128 bits (and more if needed) until two successive
// results agree to prec bits, so that the result is correct to the requested precision even when
// the formula cancels digits.
func converge(prec uint, eval func(n bnum) (BigValue, error)) (BigValue, error) {
	guard := uint(64)
	prev, err := eval(bnum{w: prec + guard})
	if err != nil {
		return BigValue{}, err
	}
	for i := 0; i < 5; i++ {
		guard *= 2
		cur, err := eval(bnum{w: prec + guard})
		if err != nil {
			return BigValue{}, err
		}
		if agrees(prev, cur, prec) {
			return BigValue{cur.Pole2.SetPrec(prec), cur.Pole1.SetPrec(prec), cur.Finite.SetPrec(prec)}, nil
		}
		prev = cur
	}
	return BigValue{}, fmt.Errorf("loops: the arbitrary-precision evaluation did not settle to %d bits within %d guard bits", prec, guard)
}

func agrees(a, b BigValue, prec uint) bool {
	m := 0.0
	pairs := [][2]specfun.Complex{{a.Pole2, b.Pole2}, {a.Pole1, b.Pole1}, {a.Finite, b.Finite}}
	for _, p := range pairs {
		if f, _ := p[1].Abs().Float64(); f > m {
			m = f
		}
	}
	for _, p := range pairs {
		d, _ := p[0].Sub(p[1]).Abs().Float64()
		s, _ := p[1].Abs().Float64()
		if d > math.Ldexp(s, -int(prec)-2)+math.Ldexp(m, -2*int(prec)) {
			return false
		}
	}
	return true
}

// A0Big is A0 in arbitrary precision (prec bits).
func A0Big(m2, mu2 *big.Float, prec uint) (BigValue, error) {
	if err := checkBig("A0Big", nil, []*big.Float{m2}, mu2, prec); err != nil {
		return BigValue{}, err
	}
	return converge(prec, func(n bnum) (BigValue, error) {
		if m2.Sign() == 0 {
			return BigValue{n.zero(), n.zero(), n.zero()}, nil
		}
		l := n.log(n.r(new(big.Float).SetPrec(n.w).Quo(m2, mu2)))
		return BigValue{n.zero(), n.r(m2), n.one().Sub(l).Scale(m2)}, nil
	})
}

// B0Big is B0 in arbitrary precision.
func B0Big(p2, m02, m12, mu2 *big.Float, prec uint) (BigValue, error) {
	if err := checkBig("B0Big", []*big.Float{p2}, []*big.Float{m02, m12}, mu2, prec); err != nil {
		return BigValue{}, err
	}
	return converge(prec, func(n bnum) (BigValue, error) {
		if p2.Sign() == 0 && m02.Sign() == 0 && m12.Sign() == 0 {
			return BigValue{n.zero(), n.zero(), n.zero()}, nil
		}
		f := n.logIntegral(n.fl(p2), n.fl(m02), n.fl(m12)).Neg().Add(n.log(n.r(mu2)))
		return BigValue{n.zero(), n.one(), f}, nil
	})
}

// B0PrimeBig is B0Prime in arbitrary precision.
func B0PrimeBig(p2, m02, m12, mu2 *big.Float, prec uint) (BigValue, error) {
	if err := checkBig("B0PrimeBig", []*big.Float{p2}, []*big.Float{m02, m12}, mu2, prec); err != nil {
		return BigValue{}, err
	}
	return converge(prec, func(n bnum) (BigValue, error) { return n.b0Prime(p2, m02, m12, mu2) })
}

func (n bnum) b0Prime(p2, a, b, mu2 *big.Float) (BigValue, error) {
	w := n.w
	z := n.zero()
	if a.Sign() == 0 && b.Sign() == 0 {
		if p2.Sign() == 0 {
			return BigValue{}, fmt.Errorf("loops.B0PrimeBig: B0′(0; 0, 0) is undefined (∂/∂p² of a scaleless integral at p² = 0)")
		}
		return BigValue{z, z, n.r(new(big.Float).SetPrec(w).Quo(n.f(-1), p2))}, nil
	}
	if (a.Sign() == 0 && p2.Cmp(b) == 0) || (b.Sign() == 0 && p2.Cmp(a) == 0) {
		m2 := new(big.Float).SetPrec(w).Add(a, b)
		im := new(big.Float).SetPrec(w).Quo(n.f(1), m2)
		l := n.log(n.r(new(big.Float).SetPrec(w).Quo(m2, mu2)))
		return BigValue{z, n.r(new(big.Float).Mul(im, n.f(-0.5))), l.Scale(n.f(0.5)).Sub(n.one()).Scale(im)}, nil
	}
	gt := func(x bc) bc { // x(1−x)L(x) − x + ½
		one := n.one()
		omx := one.Sub(x)
		if x.IsZero() {
			return n.c(0.5, 0)
		}
		if omx.IsZero() {
			return n.c(-0.5, 0)
		}
		L := n.log(omx).Sub(n.log(x.Neg()))
		return x.Mul(omx).Mul(L).Sub(x).Add(n.c(0.5, 0))
	}
	if p2.Sign() == 0 {
		d := new(big.Float).SetPrec(w).Sub(b, a)
		if d.Sign() == 0 {
			return BigValue{z, z, n.r(new(big.Float).SetPrec(w).Quo(n.f(1), new(big.Float).SetPrec(w).Mul(a, n.f(6))))}, nil
		}
		x0 := new(big.Float).SetPrec(w).Quo(a, d)
		x0.Neg(x0)
		return BigValue{z, z, gt(n.r(x0)).Quo(n.r(d))}, nil
	}
	B := new(big.Float).SetPrec(w).Sub(b, a)
	B.Sub(B, p2)
	disc := new(big.Float).SetPrec(w).Mul(B, B)
	disc.Sub(disc, new(big.Float).SetPrec(w).Mul(new(big.Float).SetPrec(w).Mul(p2, a), n.f(4)))
	if disc.Sign() == 0 {
		x0 := new(big.Float).SetPrec(w).Quo(B, new(big.Float).SetPrec(w).Mul(p2, n.f(-2)))
		if x0.Sign() > 0 && x0.Cmp(n.f(1)) < 0 {
			return BigValue{}, fmt.Errorf("loops.B0PrimeBig: B0′ is singular at the threshold p² = (m0+m1)²")
		}
		one := n.one()
		xc := n.r(x0)
		L := n.log(one.Sub(xc)).Sub(n.log(xc.Neg()))
		num := one.Sub(xc.Scale(n.f(2))).Mul(L).Sub(n.c(2, 0))
		return BigValue{z, z, num.Quo(n.r(p2))}, nil
	}
	roots, _, _ := n.quadRootsI0(p2, B, a)
	x1, x2 := roots[0], roots[1]
	return BigValue{z, z, gt(x1).Sub(gt(x2)).Quo(x1.Sub(x2).Scale(p2))}, nil
}

// C0Big is C0 in arbitrary precision (same conventions and coverage as C0).
func C0Big(s1, s2, s3, m02, m12, m22, mu2 *big.Float, prec uint) (BigValue, error) {
	if err := checkBig("C0Big", []*big.Float{s1, s2, s3}, []*big.Float{m02, m12, m22}, mu2, prec); err != nil {
		return BigValue{}, err
	}
	return converge(prec, func(n bnum) (BigValue, error) {
		t := n.tri(s1, s2, s3, m02, m12, m22)
		return n.c0(&t, mu2)
	})
}

// D0Big is D0 in arbitrary precision (same conventions and coverage as D0).
func D0Big(s1, s2, s3, s4, s5, s6, m02, m12, m22, m32, mu2 *big.Float, prec uint) (BigValue, error) {
	inv := [6]*big.Float{s1, s2, s3, s4, s5, s6}
	m := [4]*big.Float{m02, m12, m22, m32}
	if err := checkBig("D0Big", inv[:], m[:], mu2, prec); err != nil {
		return BigValue{}, err
	}
	return converge(prec, func(n bnum) (BigValue, error) {
		b := n.box(inv, m)
		return n.d0(&b, mu2)
	})
}

// c0BigFallback re-evaluates an ill-conditioned float64 triangle in arbitrary precision.
func c0BigFallback(t *tri) (complex128, error) {
	v, err := converge(53, func(n bnum) (BigValue, error) {
		bt := n.triFromFloat(t)
		f, err := n.c0Finite(&bt)
		return BigValue{n.zero(), n.zero(), f}, err
	})
	return v.Finite.Complex128(), err
}

// d0BigFallback re-evaluates an ill-conditioned float64 box in arbitrary precision.
func d0BigFallback(b *box) (complex128, error) {
	v, err := converge(53, func(n bnum) (BigValue, error) {
		bb := n.boxFromFloat(b)
		f, err := n.d0Finite(&bb)
		return BigValue{n.zero(), n.zero(), f}, err
	})
	return v.Finite.Complex128(), err
}
