package emit

import (
	"math"
	"math/big"
	"slices"

	"loopmatch/expr"
)

// This file finds the candidate singular points of a function: the positive zeros of its
// denominators.

// positiveRoots returns the positive rational roots of p (a polynomial in x) and approximate
// positive roots that are not rational.
func positiveRoots(p expr.Poly, x string) ([]*big.Rat, []float64) {
	_, pp := p.PrimitiveZ()
	cs := pp.CoeffsIn(x)
	ints := make([]*big.Int, len(cs))
	for i, c := range cs {
		v, ok := c.ConstValue()
		if !ok || !v.IsInt() {
			return nil, nil
		}
		ints[i] = v.Num()
	}
	for len(ints) > 0 && ints[0].Sign() == 0 { // x = 0 is the domain's end, not inside it
		ints = ints[1:]
	}
	if len(ints) < 2 {
		return nil, nil
	}
	var roots []*big.Rat
	a0, an := ints[0], ints[len(ints)-1]
	if a0.IsInt64() && an.IsInt64() && abs64(a0.Int64()) <= 1e6 && abs64(an.Int64()) <= 1e6 {
		for _, pn := range divisors(abs64(a0.Int64())) {
			for _, qn := range divisors(abs64(an.Int64())) {
				r := big.NewRat(pn, qn)
				if evalInt(ints, r).Sign() == 0 && !slices.ContainsFunc(roots, func(s *big.Rat) bool { return s.Cmp(r) == 0 }) {
					roots = append(roots, r)
				}
			}
		}
	}
	// Sign changes of the polynomial on a grid find the other positive real roots.
	var approx []float64
	prev := math.NaN()
	for k := -400; k <= 400; k++ {
		xv := math.Pow(10, float64(k)/40)
		v, _ := evalInt(ints, new(big.Rat).SetFloat64(xv)).Float64()
		if !math.IsNaN(prev) && (v == 0 || prev*v < 0) {
			near := false
			for _, r := range roots {
				rf, _ := r.Float64()
				if math.Abs(rf-xv) < 0.2*xv {
					near = true
				}
			}
			if !near {
				approx = append(approx, xv)
			}
		}
		prev = v
	}
	return roots, approx
}

func abs64(n int64) int64 {
	if n < 0 {
		return -n
	}
	return n
}

func divisors(n int64) []int64 {
	var out []int64
	for d := int64(1); d*d <= n; d++ {
		if n%d == 0 {
			out = append(out, d)
			if d*d != n {
				out = append(out, n/d)
			}
		}
	}
	return out
}

func evalInt(cs []*big.Int, x *big.Rat) *big.Rat {
	acc := new(big.Rat)
	for i := len(cs) - 1; i >= 0; i-- {
		acc.Mul(acc, x)
		acc.Add(acc, new(big.Rat).SetInt(cs[i]))
	}
	return acc
}
