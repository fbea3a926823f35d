package expr

import (
	"fmt"
	"math/big"

	"loopmatch/expr/specfun"
)

// ZetaValue returns ζ(k) for k ≥ 2 as an exact expression: a rational multiple of π^k for even
// k (ζ(2n) = (−1)^{n+1} B_{2n} (2π)^{2n} / (2 (2n)!)), the constant atom zeta<k> for odd k.
func ZetaValue(k int) Expr {
	if k < 2 {
		panic(fmt.Sprintf("expr: ZetaValue(%d)", k))
	}
	if k%2 == 1 {
		return FromAtom(Const{fmt.Sprintf("zeta%d", k)}, 1)
	}
	b := specfun.BernoulliEven(k / 2)
	c := new(big.Rat).Abs(b)
	c.Mul(c, new(big.Rat).SetInt(new(big.Int).Lsh(big.NewInt(1), uint(k)))) // 2^k
	fact := new(big.Int).MulRange(1, int64(k))
	c.Quo(c, new(big.Rat).SetInt(new(big.Int).Mul(big.NewInt(2), fact)))
	return FromAtom(Pi, k).Scale(RFRat(c))
}

// ExpGamma returns e^{γ_E b ε} Γ(n + b ε) + O(ε^order) for an integer n and a rational b ≠ 0.
// It uses ln Γ(1+z) = −γ_E z + Σ_{k≥2} (−1)^k ζ(k) z^k / k (M. Abramowitz, I.A. Stegun,
// Handbook of Mathematical Functions, 6.1.33) and Γ(x+1) = x Γ(x).
func ExpGamma(n int, b *big.Rat, order int) (Series, error) {
	if b.Sign() == 0 {
		return Series{}, fmt.Errorf("ExpGamma: b must be nonzero")
	}
	extra := 0
	if n <= 0 {
		extra = 1 // the factor 1/(b ε) of Γ(bε)
	}
	o := order + extra
	// exponent Σ_{k≥2} (−1)^k ζ(k) b^k ε^k / k
	c := make([]Expr, max(o, 2))
	for k := 2; k < o; k++ {
		f := new(big.Rat).SetFrac(new(big.Int).Exp(b.Num(), big.NewInt(int64(k)), nil), new(big.Int).Exp(b.Denom(), big.NewInt(int64(k)), nil))
		f.Quo(f, big.NewRat(int64(k), 1))
		if k%2 == 1 {
			f.Neg(f)
		}
		c[k] = ZetaValue(k).Scale(RFRat(f))
	}
	expo := Series{Lo: 0, C: c[:max(o, 0)], Order: max(o, 0)}.trim()
	g1, err := expo.Exp() // e^{γ b ε} Γ(1 + b ε)
	if err != nil {
		return Series{}, err
	}
	lin := func(j int) Series { // j + b ε
		s := SeriesConst(Int(int64(j)), o+1)
		return s.Add(SeriesEps(1, o+1).Scale(RFRat(b)))
	}
	res := g1
	switch {
	case n >= 1:
		for j := 1; j < n; j++ {
			if res, err = res.Mul(lin(j)); err != nil {
				return Series{}, err
			}
		}
	default:
		for j := n; j <= 0; j++ {
			if res, err = res.Div(lin(j)); err != nil {
				return Series{}, err
			}
		}
	}
	return res.Truncate(order), nil
}

// ExpEpsLog returns exp(a·ε·L) + O(ε^order) for an ε-free expression L, e.g. (m²/μ²)^{−ε} with
// a = −1 and L = log(m²/μ²).
func ExpEpsLog(a *big.Rat, L Expr, order int) (Series, error) {
	c := make([]Expr, max(order, 1))
	if order > 1 {
		c[1] = L.Scale(RFRat(a))
	}
	return Series{Lo: 0, C: c[:max(order, 0)], Order: max(order, 0)}.trim().Exp()
}
