package vacuum

import (
	"fmt"
	"math/big"

	"loopmatch/expr"
)

// The ε-expansion of the sunset master Sun(x, y, z) = J(1, 1, 1; x, y, z), x, y, z the squared
// masses.
//
// Normalisation. Wick rotation turns each loop factor (16π²/i) ∫ d^dk/(2π)^d into 16π² ∫ d^dk_E/(2π)^d
// and each propagator 1/(k² − m²) into −1/(k_E² + m²). With the Euclidean integral
//
//	E(x, y, z) = ∫∫ d^dk d^dl / π^d  1/((k² + x)(l² + y)((k+l)² + z))
//
// (the measure d^dk/π^{d/2} per loop in which A.I. Davydychev and J.B. Tausk, Nucl. Phys. B397
// (1993) 123, write their vacuum integrals, up to their overall factors) the conversion is
// (16π²)² (e^{γ_E}/4π)^{2ε} π^d/(2π)^{2d} = e^{2γ_E ε}, so
//
//	Sun(x, y, z) = −e^{2γ_E ε} μ^{4ε} E(x, y, z),    Tad(x) = −e^{γ_E ε} μ^{2ε} Γ(−1+ε) x^{1−ε}.
//
// Expansion. With L_i = ln(x_i/μ²),
//
//	Sun = (x+y+z)/(2ε²) + Σ_i x_i (3/2 − L_i)/ε − F + O(ε),
//	F = Σ_i x_i (−L_i²/2 + 3L_i − 7/2 − π²/12) + ½[(x−y−z) L_y L_z + (y−x−z) L_x L_z + (z−x−y) L_x L_y] − ξ/2,
//
// where ξ(x, y, z) depends on the Källén function λ² = x² + y² + z² − 2xy − 2xz − 2yz:
//
//   - λ² > 0 with z the largest mass (then √z > √x + √y), R = √λ², a = (z+x−y−R)/(2z),
//     b = (z+y−x−R)/(2z):
//     ξ = R [2 ln a ln b − ln(x/z) ln(y/z) − 2 Li2(a) − 2 Li2(b) + π²/3];
//   - λ² < 0 (√x, √y, √z are the sides of a triangle with angles φ_x, φ_y, φ_z opposite them):
//     ξ = −2 √(−λ²) [Cl2(2φ_x) + Cl2(2φ_y) + Cl2(2φ_z)];
//   - λ² = 0 (thresholds): ξ = 0 — the sunset is then a combination of tadpoles exactly in d, and
//     its expansion is taken from that combination (twoloop_ibp.go), to any order;
//   - one massless line: F(0, y, z) = −y L_y L_z + (y − z) L_z²/2 − (z − y) Li2(1 − y/z)
//     + Σ_{y,z} x_i (−L_i²/2 + 3L_i − 7/2 − π²/12), the limit x → 0 of the above (with y = 0 too);
//   - two massless lines: Sun(0, 0, z) = −z (z/μ²)^{−2ε} e^{2γ_E ε} Γ(ε)Γ(1−ε)²Γ(−1+2ε)/Γ(2−ε) exactly,
//     to any order (the massless bubble inserted into a tadpole).
//
// The pole terms and the function ξ are those of Davydychev and Tausk (section 4 of the paper
// above: their function Φ(x/z, y/z) with ξ = z λ²(x/z, y/z) Φ); the arrangement of the finite part
// follows S.P. Martin, Phys. Rev. D65 (2002) 116003 (hep-ph/0111209), section II, whose
// renormalised I(x, y, z) is F − Σ_i x_i(−L_i²/2 + L_i − 1 − π²/12). Both are quoted from memory;
// the tests establish every case against an independent numerical evaluation (the one-loop bubble
// inserted into a propagator, integrated numerically after subtracting its large-momentum
// behaviour in d dimensions) and the exact Γ-function cases.
//
// The Clausen function of a general angle is written through the dilogarithm on the unit circle,
// Cl2(θ) = (Li2(e^{iθ}) − Li2(e^{−iθ}))/(2i), with e^{iθ} rational in the masses and √(−λ²)
// (expr has no inverse cosine); angles that are rational multiples of π give Cl2 atoms, e.g. equal
// masses give 2φ = 2π/3 and Cl2(2π/3) = (2/3) Cl2(π/3). Where the sign of λ² or the largest mass
// cannot be decided from the symbols (e.g. three unrelated symbolic masses), ξ is written in the
// λ² > 0 form with R = √λ² and every logarithm and dilogarithm averaged over the two sides of its
// cut: evaluated with principal branches this gives the right real value for every ordering of the
// masses and both signs of λ² (checked numerically in the tests).

func init() {
	Register(SunName, Master{Poles: 2, Series: sunSeries})
}

// sunSeries expands Sun(x, y, z) up to O(ε^order).
func sunSeries(args []expr.Expr, order int, positive func(string) bool) (expr.Series, error) {
	if len(args) != 3 {
		return expr.Series{}, fmt.Errorf("Sun takes three arguments, got %d", len(args))
	}
	var x [3]expr.RatFunc
	for i, a := range args {
		r, ok := a.AsRatFunc()
		if !ok {
			return expr.Series{}, fmt.Errorf("Sun: argument %s must be a rational expression in the parameters", a)
		}
		x[i] = r
	}
	x = sortMasses(x)
	// massless lines first
	for i := 0; i < 3; i++ {
		for j := 2; j > i; j-- {
			if x[j].IsZero() && !x[j-1].IsZero() {
				x[j], x[j-1] = x[j-1], x[j]
			}
		}
	}
	if order <= -2 {
		return expr.Series{Lo: order, Order: order}, nil
	}
	switch {
	case x[2].IsZero():
		return expr.SeriesConst(expr.Zero(), order), nil
	case x[1].IsZero():
		return sunOneMass(x[2], order, positive)
	}
	lam := kallen(x[0], x[1], x[2])
	if lam.IsZero() {
		// Threshold: J(1,1,1) is a combination of tadpoles.
		r := reducerFor(sortMasses(x), 0)
		r.mu.Lock()
		e, _, err := r.integral([3]int{1, 1, 1})
		r.mu.Unlock()
		if err != nil {
			return expr.Series{}, err
		}
		return ExpandEps(e, order, positive)
	}
	if order > 1 {
		return expr.Series{}, fmt.Errorf("Sun(%s, %s, %s): the O(ε) term of the sunset is not available for these masses", x[0], x[1], x[2])
	}
	L := make([]expr.Expr, 3)
	mu2 := expr.RFVar("mu").Mul(expr.RFVar("mu"))
	for i, xi := range x {
		if xi.IsZero() {
			continue
		}
		ratio, err := xi.Div(mu2)
		if err != nil {
			return expr.Series{}, err
		}
		if L[i], err = expr.LogSplit(expr.FromRF(ratio), 1, positive); err != nil {
			return expr.Series{}, err
		}
	}
	sum := x[0].Add(x[1]).Add(x[2])
	c2 := expr.FromRF(sum.Scale(big.NewRat(1, 2)))
	c1 := expr.Zero()
	for i, xi := range x {
		if xi.IsZero() {
			continue
		}
		c1 = c1.Add(expr.Num(big.NewRat(3, 2)).Sub(L[i]).Scale(xi))
	}
	var F expr.Expr
	var err error
	if x[0].IsZero() {
		F, err = sunFiniteOneMassless(x[1], x[2], L[1], L[2])
	} else {
		F, err = sunFinite(x, lam, L, positive)
	}
	if err != nil {
		return expr.Series{}, err
	}
	c := []expr.Expr{c2, c1, F.Neg()}
	return expr.Series{Lo: -2, C: c[:order+2], Order: order}, nil
}

// sunOneMass is Sun(0, 0, z) = −z (z/μ²)^{−2ε} e^{2γ_E ε} Γ(ε)Γ(1−ε)²Γ(−1+2ε)/Γ(2−ε). Derivation:
// the massless bubble ∫ d^dl/π^{d/2} 1/(l²(k+l)²) = Γ(ε)Γ(1−ε)²/Γ(2−2ε) (k²)^{−ε}, then
// ∫ d^dk/π^{d/2} (k²)^{−ε}/(k² + z) = Γ(2−2ε)Γ(−1+2ε)/Γ(2−ε) z^{1−2ε}.
func sunOneMass(z expr.RatFunc, order int, positive func(string) bool) (expr.Series, error) {
	g, err := gammaProduct([]gammaFactor{{0, 1, 1}, {1, -1, 2}, {-1, 2, 1}, {2, -1, -1}}, order+3)
	if err != nil {
		return expr.Series{}, err
	}
	ratio, err := z.Div(expr.RFVar("mu").Mul(expr.RFVar("mu")))
	if err != nil {
		return expr.Series{}, err
	}
	L, err := expr.LogSplit(expr.FromRF(ratio), 1, positive)
	if err != nil {
		return expr.Series{}, err
	}
	pw, err := expr.ExpEpsLog(big.NewRat(-2, 1), L, order+3)
	if err != nil {
		return expr.Series{}, err
	}
	s, err := g.Mul(pw)
	if err != nil {
		return expr.Series{}, err
	}
	return s.Scale(z.Neg()).Truncate(order), nil
}

// gammaFactor is (e^{γ_E b ε} Γ(n + bε))^pow.
type gammaFactor struct{ n, b, pow int }

// gammaProduct returns Π (e^{γ_E b ε} Γ(n + bε))^pow up to O(ε^order) (the order is lowered by
// the poles of the other factors, so callers ask for a few orders more than they need).
func gammaProduct(fs []gammaFactor, order int) (expr.Series, error) {
	res := expr.SeriesConst(expr.Int(1), order)
	for _, f := range fs {
		g, err := expr.ExpGamma(f.n, big.NewRat(int64(f.b), 1), order)
		if err != nil {
			return expr.Series{}, err
		}
		if g, err = g.Pow(f.pow); err != nil {
			return expr.Series{}, err
		}
		if res, err = res.Mul(g); err != nil {
			return expr.Series{}, err
		}
	}
	return res, nil
}

// kallen returns λ²(x, y, z) = x² + y² + z² − 2xy − 2xz − 2yz.
func kallen(x, y, z expr.RatFunc) expr.RatFunc {
	s := x.Mul(x).Add(y.Mul(y)).Add(z.Mul(z))
	return s.Sub(x.Mul(y).Add(x.Mul(z)).Add(y.Mul(z)).Scale(big.NewRat(2, 1)))
}

// pTerm is x (−L²/2 + 3L − 7/2 − π²/12).
func pTerm(x expr.RatFunc, L expr.Expr) (expr.Expr, error) {
	L2, err := L.Pow(2)
	if err != nil {
		return expr.Expr{}, err
	}
	p := L2.Scale(expr.RFRat(big.NewRat(-1, 2))).Add(L.Scale(expr.RFInt(3))).
		Add(expr.Num(big.NewRat(-7, 2))).Add(expr.FromAtom(expr.Pi, 2).Scale(expr.RFRat(big.NewRat(-1, 12))))
	return p.Scale(x), nil
}

// sunFiniteOneMassless is F(0, y, z) = −y L_y L_z + (y − z) L_z²/2 − (z − y) Li2(1 − y/z)
// + y(…) + z(…), y, z ≠ 0.
func sunFiniteOneMassless(y, z expr.RatFunc, Ly, Lz expr.Expr) (expr.Expr, error) {
	LyLz, err := Ly.Mul(Lz)
	if err != nil {
		return expr.Expr{}, err
	}
	Lz2, err := Lz.Pow(2)
	if err != nil {
		return expr.Expr{}, err
	}
	r, err := y.Div(z)
	if err != nil {
		return expr.Expr{}, err
	}
	li, err := expr.Apply(expr.FnLi2, 1, expr.FromRF(expr.RFInt(1).Sub(r)))
	if err != nil {
		return expr.Expr{}, err
	}
	F := LyLz.Scale(y.Neg()).Add(Lz2.Scale(y.Sub(z).Scale(big.NewRat(1, 2)))).Sub(li.Scale(z.Sub(y)))
	for _, t := range []struct {
		x expr.RatFunc
		L expr.Expr
	}{{y, Ly}, {z, Lz}} {
		p, err := pTerm(t.x, t.L)
		if err != nil {
			return expr.Expr{}, err
		}
		F = F.Add(p)
	}
	return F, nil
}

// sunFinite is F(x, y, z) for three nonzero masses with λ² ≠ 0.
func sunFinite(x [3]expr.RatFunc, lam expr.RatFunc, L []expr.Expr, positive func(string) bool) (expr.Expr, error) {
	F := expr.Zero()
	for i := range 3 {
		p, err := pTerm(x[i], L[i])
		if err != nil {
			return expr.Expr{}, err
		}
		F = F.Add(p)
		j, k := (i+1)%3, (i+2)%3
		LL, err := L[j].Mul(L[k])
		if err != nil {
			return expr.Expr{}, err
		}
		F = F.Add(LL.Scale(x[i].Sub(x[j]).Sub(x[k]).Scale(big.NewRat(1, 2))))
	}
	xi, err := sunXi(x, lam, positive)
	if err != nil {
		return expr.Expr{}, err
	}
	return F.Sub(xi.Scale(expr.RFRat(big.NewRat(1, 2)))), nil
}

// sunXi chooses the form of ξ(x, y, z) by what is known of the sign of λ² and the masses' order.
func sunXi(x [3]expr.RatFunc, lam expr.RatFunc, positive func(string) bool) (expr.Expr, error) {
	sl, known := signOf(lam, positive)
	switch {
	case known && sl < 0:
		return xiClausen(x, lam, positive)
	case known && sl > 0:
		for k := range 3 {
			i, j := (k+1)%3, (k+2)%3
			si, ok1 := signOf(x[k].Sub(x[i]), positive)
			sj, ok2 := signOf(x[k].Sub(x[j]), positive)
			if ok1 && ok2 && si > 0 && sj > 0 {
				R, _, _ := sqrtRF(lam, positive)
				return xiLog(x[i], x[j], x[k], R, []int{1}, positive)
			}
		}
	}
	R, err := expr.Apply(expr.FnSqrt, 1, expr.FromRF(lam))
	if err != nil {
		return expr.Expr{}, err
	}
	return xiLog(x[0], x[1], x[2], R, []int{1, -1}, positive)
}

// xiLog is R [2 ln a ln b − ln(x/z) ln(y/z) − 2 Li2(a) − 2 Li2(b) + π²/3] with
// a = (z+x−y−R)/(2z), b = (z+y−x−R)/(2z), averaged over the given sides (i0 = ±1) of the cuts of
// the logarithms and dilogarithms of a and b.
func xiLog(x, y, z expr.RatFunc, R expr.Expr, sides []int, positive func(string) bool) (expr.Expr, error) {
	inv2z, err := z.Scale(big.NewRat(2, 1)).Inv()
	if err != nil {
		return expr.Expr{}, err
	}
	a := expr.FromRF(z.Add(x).Sub(y).Mul(inv2z)).Sub(R.Scale(inv2z))
	b := expr.FromRF(z.Add(y).Sub(x).Mul(inv2z)).Sub(R.Scale(inv2z))
	xz, err := x.Div(z)
	if err != nil {
		return expr.Expr{}, err
	}
	yz, err := y.Div(z)
	if err != nil {
		return expr.Expr{}, err
	}
	lxz, err := expr.LogSplit(expr.FromRF(xz), 1, positive)
	if err != nil {
		return expr.Expr{}, err
	}
	lyz, err := expr.LogSplit(expr.FromRF(yz), 1, positive)
	if err != nil {
		return expr.Expr{}, err
	}
	lxy, err := lxz.Mul(lyz)
	if err != nil {
		return expr.Expr{}, err
	}
	br := expr.FromAtom(expr.Pi, 2).Scale(expr.RFRat(big.NewRat(1, 3))).Sub(lxy)
	w := expr.RFRat(big.NewRat(1, int64(len(sides))))
	for _, s := range sides {
		la, err := expr.Apply(expr.FnLog, s, a)
		if err != nil {
			return expr.Expr{}, err
		}
		lb, err := expr.Apply(expr.FnLog, s, b)
		if err != nil {
			return expr.Expr{}, err
		}
		lab, err := la.Mul(lb)
		if err != nil {
			return expr.Expr{}, err
		}
		li2a, err := expr.Apply(expr.FnLi2, s, a)
		if err != nil {
			return expr.Expr{}, err
		}
		li2b, err := expr.Apply(expr.FnLi2, s, b)
		if err != nil {
			return expr.Expr{}, err
		}
		part := lab.Scale(expr.RFInt(2)).Sub(li2a.Scale(expr.RFInt(2))).Sub(li2b.Scale(expr.RFInt(2)))
		br = br.Add(part.Scale(w))
	}
	return R.Mul(br)
}

// xiClausen is −2 s [Cl2(2φ_x) + Cl2(2φ_y) + Cl2(2φ_z)], s = √(−λ²) > 0 (λ² < 0). The angle
// opposite √x_k has e^{iφ_k} = (x_i + x_j − x_k + i s)/(2√(x_i x_j)), so θ_k = 2φ_k has
// cos θ_k = (x_i + x_j − x_k)²/(2 x_i x_j) − 1 and sin θ_k = s (x_i + x_j − x_k)/(2 x_i x_j).
func xiClausen(x [3]expr.RatFunc, lam expr.RatFunc, positive func(string) bool) (expr.Expr, error) {
	s, ssign, sknown := sqrtRF(lam.Neg(), positive)
	sum := expr.Zero()
	for k := range 3 {
		i, j := (k+1)%3, (k+2)%3
		g := x[i].Add(x[j]).Sub(x[k])
		den := x[i].Mul(x[j]).Scale(big.NewRat(2, 1))
		g2, err := g.Mul(g).Div(den)
		if err != nil {
			return expr.Expr{}, err
		}
		cos := g2.Sub(expr.RFInt(1))
		sinFactor, err := g.Div(den) // sin θ = s · sinFactor
		if err != nil {
			return expr.Expr{}, err
		}
		if c, ok := cos.ConstValue(); ok && sknown {
			gs, gok := signOf(g, positive)
			if gok {
				if v, ok := clausenExact(c, ssign*gs); ok {
					sum = sum.Add(v)
					continue
				}
			}
		}
		// Cl2(θ) = −(i/2) [Li2(w) − Li2(w̄)], w = cos θ + i sin θ.
		im, err := s.Mul(expr.FromRF(sinFactor))
		if err != nil {
			return expr.Expr{}, err
		}
		iIm, err := im.Mul(expr.FromAtom(expr.I, 1))
		if err != nil {
			return expr.Expr{}, err
		}
		w := expr.FromRF(cos).Add(iIm)
		wb := expr.FromRF(cos).Sub(iIm)
		l1, err := expr.Apply(expr.FnLi2, 1, w)
		if err != nil {
			return expr.Expr{}, err
		}
		l2, err := expr.Apply(expr.FnLi2, 1, wb)
		if err != nil {
			return expr.Expr{}, err
		}
		cl, err := l1.Sub(l2).Mul(expr.FromAtom(expr.I, 1))
		if err != nil {
			return expr.Expr{}, err
		}
		sum = sum.Add(cl.Scale(expr.RFRat(big.NewRat(-1, 2))))
	}
	return s.Scale(expr.RFInt(-2)).Mul(sum)
}

// clausenExact returns Cl2(θ) for cos θ = c ∈ {1/2, 0, −1/2, −1} and sin θ of sign sgn, as Cl2
// atoms of rational multiples of π: Cl2(2π − θ) = −Cl2(θ), Cl2(π) = 0 and
// Cl2(2π/3) = (2/3) Cl2(π/3) (duplication Cl2(2θ) = 2Cl2(θ) − 2Cl2(π − θ) at θ = π/3; L. Lewin,
// Polylogarithms and Associated Functions (1981), ch. 4).
func clausenExact(c *big.Rat, sgn int) (expr.Expr, bool) {
	cl := func(num, den int64) expr.Expr {
		arg := expr.FromAtom(expr.Pi, 1).Scale(expr.RFRat(big.NewRat(num, den)))
		return expr.FromAtom(expr.NewFn(expr.FnCl2, 1, arg), 1)
	}
	var v expr.Expr
	switch {
	case c.Cmp(big.NewRat(-1, 1)) == 0:
		return expr.Zero(), true
	case c.Cmp(big.NewRat(1, 2)) == 0:
		v = cl(1, 3)
	case c.Sign() == 0:
		v = cl(1, 2)
	case c.Cmp(big.NewRat(-1, 2)) == 0:
		v = cl(1, 3).Scale(expr.RFRat(big.NewRat(2, 3)))
	default:
		return expr.Expr{}, false
	}
	if sgn < 0 {
		v = v.Neg()
	}
	return v, sgn != 0
}

// signOf returns the sign of r where it follows from the form alone: a constant, or numerator and
// denominator each with coefficients of one sign in symbols that positive accepts.
func signOf(r expr.RatFunc, positive func(string) bool) (int, bool) {
	if r.IsZero() {
		return 0, true
	}
	ps := func(p expr.Poly) (int, bool) {
		s := 0
		for _, t := range p.Terms() {
			for _, vp := range t.Mono {
				if !positive(vp.Var) {
					return 0, false
				}
			}
			ts := t.Coef.Sign()
			if s != 0 && ts != s {
				return 0, false
			}
			s = ts
		}
		return s, true
	}
	sn, ok1 := ps(r.Num())
	sd, ok2 := ps(r.Den())
	if !ok1 || !ok2 {
		return 0, false
	}
	return sn * sd, true
}

// sqrtRF returns √r for r > 0: exact when numerator and denominator are single monomials
// c·Π v^{2e} (times √c), else the atom sqrt(r). It also returns the sign of the result where it is
// known (the principal root of a positive number is positive).
func sqrtRF(r expr.RatFunc, positive func(string) bool) (expr.Expr, int, bool) {
	root := func(p expr.Poly) (*big.Rat, expr.Poly, bool) {
		ts := p.Terms()
		if len(ts) != 1 {
			return nil, expr.Poly{}, false
		}
		var m expr.Mono
		for _, vp := range ts[0].Mono {
			if vp.Exp%2 != 0 {
				return nil, expr.Poly{}, false
			}
			m = append(m, expr.VarPow{Var: vp.Var, Exp: vp.Exp / 2})
		}
		return ts[0].Coef, expr.PolyMono(big.NewRat(1, 1), m), true
	}
	cn, pn, ok1 := root(r.Num())
	cd, pd, ok2 := root(r.Den())
	if ok1 && ok2 {
		c := new(big.Rat).Quo(cn, cd)
		sc, err := expr.Apply(expr.FnSqrt, 1, expr.Num(c))
		if err == nil {
			mono, err := expr.NewRatFunc(pn, pd)
			if err == nil {
				sg, known := signOf(mono, positive)
				return sc.Scale(mono), sg, known
			}
		}
	}
	s, err := expr.Apply(expr.FnSqrt, 1, expr.FromRF(r))
	if err != nil {
		return expr.Expr{}, 0, false
	}
	return s, 1, true
}

func ratInt(n int64) *big.Rat     { return big.NewRat(n, 1) }
func ratFrac(a, b int64) *big.Rat { return big.NewRat(a, b) }
