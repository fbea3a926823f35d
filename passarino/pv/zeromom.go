package pv

import (
	"math/big"

	"loopmatch/expr"
)

var bigTwo = big.NewRat(2, 1)

// zeroMomentum returns the coefficient l of a two-point function with p² = 0, where the Gram
// "matrix" p² vanishes and the recursion cannot divide by it. The Feynman-parameter form of
// docs/PASSARINO.md, eq. (F), with N = 2, j pairs of 0 and a indices 1 (rank P = 2j + a) is
//
//	T_{0…0 1…1} = (−1)^{j+P} 2^{−j} e^{γε} Γ(−j+ε) ∫₀¹ dx x^a Δ^{j−ε},  Δ = (1−x) m0² + x m1²,
//
// independent of p. Integrating over Δ and writing e^{γε} M^{k−ε} through
// A0(M) = −e^{γε} Γ(−1+ε) M^{1−ε} gives, with g_j = Γ(−j+ε)/Γ(−1+ε) rational in ε,
//
//	m0² ≠ m1²: ∫ = −g_j (m1²−m0²)^{−a−1} Σ_k C(a,k) (−m0²)^{a−k} [m1^{2(k+j)} A0(m1) − m0^{2(k+j)} A0(m0)]/(k+j+1−ε)
//	m0² = m1² = M: ∫ = −g_j M^{j−1} A0(M)/(a+1),
//
// (the e^{γε}Γ(−j+ε) included), a combination of tadpoles exact in d; A0(0) = 0.
func (r *Reducer) zeroMomentum(fr *frame, l label) comb {
	j, a := l.j, l.a[0]
	k := r.kin
	l0, l1 := fr.labels[0], fr.labels[1]
	M0, M1 := k.m2[l0], k.m2[l1]
	t0, t1 := uint8(1<<l0), uint8(1<<l1)
	eps := epsilon()

	// g_j = Γ(−j+ε)/Γ(−1+ε): ε − 1 for j = 0, 1/Π_{i=2}^{j} (ε − i) for j ≥ 1.
	g := expr.RFInt(1)
	if j == 0 {
		g = eps.Sub(expr.RFInt(1))
	}
	for i := 2; i <= j; i++ {
		x := eps.Sub(expr.RFInt(int64(i)))
		r.fs.register(x.Num())
		g, _ = g.Div(x) // ε − i ≠ 0 as a function of d
	}
	// prefactor (−1)^{j+P} 2^{−j} times the leading −g_j
	pre := g.Neg().Scale(big.NewRat(1, 1<<j))
	if p := 2*j + a; (j+p)%2 == 1 {
		pre = pre.Neg()
	}

	fs := r.fs
	if M0.Equal(M1) {
		if M0.IsZero() {
			return comb{} // scaleless
		}
		mp, _ := M0.Pow(j - 1)
		return fs.add(comb{}, unit(t0), fs.fromRat(pre.Mul(mp).Scale(big.NewRat(1, int64(a+1)))))
	}
	delta := M1.Sub(M0)
	if !delta.IsConst() {
		fs.register(delta.Num()) // so that its powers split off denominators
	}
	dinv, _ := delta.Pow(-a - 1) // delta ≠ 0
	var c0, c1 expr.RatFunc = expr.RFInt(0), expr.RFInt(0)
	for kk := 0; kk <= a; kk++ {
		w, _ := M0.Neg().Pow(a - kk)
		w = w.Scale(new(big.Rat).SetInt(binomial(a, kk)))
		den := expr.RFInt(int64(kk + j + 1)).Sub(eps)
		fs.register(den.Num())
		w, _ = w.Div(den)
		p1, _ := M1.Pow(kk + j)
		p0, _ := M0.Pow(kk + j)
		c1 = c1.Add(w.Mul(p1))
		c0 = c0.Sub(w.Mul(p0))
	}
	f := pre.Mul(dinv)
	var c comb
	if !M1.IsZero() {
		c = fs.add(c, unit(t1), fs.fromRat(c1.Mul(f)))
	}
	if !M0.IsZero() {
		c = fs.add(c, unit(t0), fs.fromRat(c0.Mul(f)))
	}
	return c
}

// binomial returns C(n, k).
func binomial(n, k int) *big.Int { return new(big.Int).Binomial(int64(n), int64(k)) }
