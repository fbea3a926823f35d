package expr

import (
	"fmt"
	"math/big"
)

// Function names the engine gives meaning to. Other names make opaque atoms (for example the
// scalar integrals, whose values live in package loops).
const (
	FnLog  = "log"
	FnLi2  = "Li2"
	FnCl2  = "Cl2"
	FnSqrt = "sqrt"
)

// Apply builds name(args…) with the simplifications that hold for every argument: logarithms
// of rational numbers are split into logarithms of primes (with iπ for negative numbers on the
// side the i0 prescription picks), Li2 at 0, ±1 and 1/2 is replaced by its value, square roots
// of rational squares are taken. i0 is +1 (arg + i0, the default reading of a negative real
// argument) or −1 (arg − i0); it is ignored by functions other than log and Li2.
func Apply(name string, i0 int, args ...Expr) (Expr, error) {
	if i0 == 0 {
		i0 = 1
	}
	switch name {
	case FnLog, FnLi2, FnCl2, FnSqrt:
		if len(args) != 1 {
			return Expr{}, fmt.Errorf("%s takes one argument, got %d", name, len(args))
		}
	}
	switch name {
	case FnLog:
		return applyLog(args[0], i0)
	case FnLi2:
		return applyLi2(args[0], i0)
	case FnSqrt:
		return applySqrt(args[0])
	case FnCl2:
		return FromAtom(NewFn(name, 1, args[0]), 1), nil
	}
	return FromAtom(NewFn(name, 1, args...), 1), nil
}

// Log returns log(x + i0).
func Log(x Expr) (Expr, error) { return Apply(FnLog, 1, x) }

func applyLog(x Expr, i0 int) (Expr, error) {
	r, ok := x.AsRatFunc()
	if ok {
		if r.IsZero() {
			return Expr{}, fmt.Errorf("log(0) is undefined")
		}
		if c, ok := r.ConstValue(); ok {
			return logRational(c, i0), nil
		}
	}
	return FromAtom(NewFn(FnLog, i0, x), 1), nil
}

// logRational returns log(c ± i0) for a nonzero rational c as a sum of logarithms of primes
// (small factors; a large remaining factor stays as one logarithm).
func logRational(c *big.Rat, i0 int) Expr {
	res := Expr{}
	if c.Sign() < 0 {
		// log(−|c| ± i0) = log|c| ± iπ
		res = FromAtom(I, 1).MustMul(FromAtom(Pi, 1)).Scale(RFInt(int64(i0)))
		c = new(big.Rat).Neg(c)
	}
	add := func(n *big.Int, sign int64) {
		for p, e := range smallFactors(n) {
			res = res.Add(FromAtom(NewFn(FnLog, 1, Num(new(big.Rat).SetInt(p))), 1).Scale(RFInt(sign * int64(e))))
		}
	}
	add(c.Num(), 1)
	add(c.Denom(), -1)
	return res
}

// smallFactors factors n > 0 over the primes below 1000; what remains (if > 1) is returned as
// one factor.
func smallFactors(n *big.Int) map[*big.Int]int {
	out := map[*big.Int]int{}
	m := new(big.Int).Set(n)
	one := big.NewInt(1)
	r := new(big.Int)
	for p := int64(2); p < 1000 && m.Cmp(one) > 0; p++ {
		bp := big.NewInt(p)
		if !bp.ProbablyPrime(0) {
			continue
		}
		e := 0
		for {
			q, rem := new(big.Int).QuoRem(m, bp, r)
			if rem.Sign() != 0 {
				break
			}
			m = q
			e++
		}
		if e > 0 {
			out[bp] = e
		}
	}
	if m.Cmp(one) > 0 {
		out[m] = 1
	}
	return out
}

func applyLi2(x Expr, i0 int) (Expr, error) {
	if r, ok := x.AsRatFunc(); ok {
		if c, ok := r.ConstValue(); ok {
			pi2 := FromAtom(Pi, 2)
			switch {
			case c.Sign() == 0:
				return Expr{}, nil
			case c.Cmp(big.NewRat(1, 1)) == 0: // Li2(1) = π²/6
				return pi2.Scale(RFRat(big.NewRat(1, 6))), nil
			case c.Cmp(big.NewRat(-1, 1)) == 0: // Li2(−1) = −π²/12
				return pi2.Scale(RFRat(big.NewRat(-1, 12))), nil
			case c.Cmp(big.NewRat(1, 2)) == 0: // Li2(1/2) = π²/12 − log²2/2
				l2, _ := Log(Int(2))
				l22, _ := l2.Pow(2)
				return pi2.Scale(RFRat(big.NewRat(1, 12))).Sub(l22.Scale(RFRat(big.NewRat(1, 2)))), nil
			}
			if c.Cmp(big.NewRat(1, 1)) <= 0 {
				i0 = 1 // no cut below 1
			}
		}
	}
	return FromAtom(NewFn(FnLi2, i0, x), 1), nil
}

func applySqrt(x Expr) (Expr, error) {
	if r, ok := x.AsRatFunc(); ok {
		if r.IsZero() {
			return Expr{}, nil
		}
		if c, ok := r.ConstValue(); ok {
			neg := c.Sign() < 0
			a := new(big.Rat).Abs(c)
			num, den := a.Num(), a.Denom()
			sn, rn := squarePart(num)
			sd, rd := squarePart(den)
			// sqrt(sn²·rn / (sd²·rd)) = (sn/(sd·rd))·sqrt(rn·rd)
			outside := new(big.Rat).SetFrac(sn, new(big.Int).Mul(sd, rd))
			inside := new(big.Int).Mul(rn, rd)
			res := Num(outside)
			if inside.Cmp(big.NewInt(1)) != 0 {
				res = res.MustMul(FromAtom(NewFn(FnSqrt, 1, Num(new(big.Rat).SetInt(inside))), 1))
			}
			if neg {
				res = res.MustMul(FromAtom(I, 1))
			}
			return res, nil
		}
	}
	return FromAtom(NewFn(FnSqrt, 1, x), 1), nil
}

// squarePart writes n = s²·r with r free of squares of primes below 1000.
func squarePart(n *big.Int) (s, r *big.Int) {
	s, r = big.NewInt(1), big.NewInt(1)
	for p, e := range smallFactors(n) {
		s.Mul(s, new(big.Int).Exp(p, big.NewInt(int64(e/2)), nil))
		if e%2 == 1 {
			r.Mul(r, p)
		}
	}
	return s, r
}
