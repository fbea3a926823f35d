package pv

import (
	"math"

	"gonum.org/v1/gonum/integrate/quad"
)

// The independent reference: every tensor coefficient as a Feynman-parameter integral.
//
// With 1/(N0⋯N_{N−1}) = Γ(N) ∫dX δ(1−ΣX) [Σ X_i N_i]^{−N} and p_0 = 0,
// Σ X_i N_i = (q + P_X)² − Δ with P_X = Σ X_i p_i and
//
//	Δ = Σ_i X_i m_i² − Σ_{i<j} X_i X_j (p_i − p_j)²   (positive at Euclidean points).
//
// Shifting q = l − P_X and contracting the tensor with an auxiliary vector v,
// (q·v)^P = Σ_j C(P,2j) (l·v)^{2j} (−P_X·v)^{P−2j}; the even l-moments are
// (l·v)^{2j} → (v²)^j (l²)^j (2j)!/(4^j j!) Γ(D/2)/Γ(D/2+j), and with
// ∫d^Dl/(2π)^D (l²)^j/(l²−Δ)^N = i(−1)^{N+j}/(4π)^{D/2} Γ(j+D/2)Γ(N−j−D/2)/(Γ(D/2)Γ(N)) Δ^{D/2+j−N}
// and the MS-bar measure μ^{2ε}(e^{γ_E}/4π)^ε of PHYSICS.md (common factor i/(16π²) removed),
// the coefficient of the structure {g^j p_{i…}} — read off from (q·v)^P, whose y^j x^α term
// (y = v², x_i = p_i·v) carries the weight P!/(2^j j! α!) times T_{0^{2j}α} — is
//
//	T_{0^{2j}α} = (−1)^{N+j+P} 2^{−j} e^{γε} Γ(N−2−j+ε) ∫dX X^α Δ^{2+j−N} (Δ/μ²)^{−ε}.     (F)
//
// With e = 2 + j − N ≥ 0 (UV divergent) e^{γε}Γ(−e+ε) = (−1)^e/e! [1/ε + H_e + O(ε)], H_e the
// harmonic number, so
//
//	pole   = (−1)^P 2^{−j}/e! ∫dX X^α Δ^e,
//	finite = (−1)^P 2^{−j}/e! ∫dX X^α Δ^e (H_e − ln(Δ/μ²)),
//
// and with e < 0 the integral is finite: (−1)^{N+j+P} 2^{−j} (−e−1)! ∫dX X^α Δ^e.
// Checks of (F): N = 2, P = 0 gives B0 = 1/ε − ∫ln(Δ/μ²); N = 1 gives A0 = m²(1/ε + 1 − ln(m²/μ²))
// (PHYSICS.md); N = 2, B1 has the pole −1/2 and B00 the pole (m0² + m1²)/4 − p²/12 (Denner
// 1993, eq. (4.18) expanded).

// fpPoint is a numerical kinematic point: s[i][j] = (p_i − p_j)², m2[i] = m_i², μ².
type fpPoint struct {
	n   int
	s   [MaxPoints][MaxPoints]float64
	m2  [MaxPoints]float64
	mu2 float64
}

// fpResult is the pole and the finite part of one coefficient from (F).
type fpResult struct {
	pole, finite float64
}

// fpCoefficients evaluates (F) for all the labels by nested Gauss–Legendre quadrature (gonum)
// over the simplex with nodes points per dimension, mapped from the unit cube by
// X_1 = u_1, X_2 = (1−u_1)u_2, X_3 = (1−u_1)(1−u_2)u_3, X_0 = the rest.
func fpCoefficients(pt fpPoint, ls []label, nodes int) []fpResult {
	n := pt.n - 1
	x := make([]float64, nodes)
	w := make([]float64, nodes)
	quad.Legendre{}.FixedLocations(x, w, 0, 1)
	sum := make([]float64, len(ls))
	sumLog := make([]float64, len(ls))
	exps := make([]int, len(ls))
	for i, l := range ls {
		exps[i] = 2 + l.j - pt.n
	}
	var X [MaxPoints]float64
	eval := func(weight float64) {
		delta := 0.0
		for i := 0; i <= n; i++ {
			delta += X[i] * pt.m2[i]
			for j := i + 1; j <= n; j++ {
				delta -= X[i] * X[j] * pt.s[i][j]
			}
		}
		lg := math.Log(delta / pt.mu2)
		for i, l := range ls {
			v := weight * math.Pow(delta, float64(exps[i]))
			for a := 0; a < n; a++ {
				for range l.a[a] {
					v *= X[a+1]
				}
			}
			sum[i] += v
			sumLog[i] += v * lg
		}
	}
	switch n {
	case 0:
		X[0] = 1
		eval(1)
	case 1:
		for a := range nodes {
			X[1], X[0] = x[a], 1-x[a]
			eval(w[a])
		}
	case 2:
		for a := range nodes {
			for b := range nodes {
				X[1] = x[a]
				X[2] = (1 - x[a]) * x[b]
				X[0] = (1 - x[a]) * (1 - x[b])
				eval(w[a] * w[b] * (1 - x[a]))
			}
		}
	case 3:
		for a := range nodes {
			for b := range nodes {
				for c := range nodes {
					X[1] = x[a]
					X[2] = (1 - x[a]) * x[b]
					X[3] = (1 - x[a]) * (1 - x[b]) * x[c]
					X[0] = (1 - x[a]) * (1 - x[b]) * (1 - x[c])
					eval(w[a] * w[b] * w[c] * (1 - x[a]) * (1 - x[a]) * (1 - x[b]))
				}
			}
		}
	}
	out := make([]fpResult, len(ls))
	for i, l := range ls {
		p := l.rank()
		e := exps[i]
		sign := 1.0
		if e >= 0 {
			if p%2 == 1 {
				sign = -1
			}
			c := sign * math.Pow(2, -float64(l.j)) / float64(factorial(e))
			h := 0.0
			for k := 1; k <= e; k++ {
				h += 1 / float64(k)
			}
			out[i] = fpResult{pole: c * sum[i], finite: c * (h*sum[i] - sumLog[i])}
			continue
		}
		if (pt.n+l.j+p)%2 == 1 {
			sign = -1
		}
		out[i] = fpResult{finite: sign * math.Pow(2, -float64(l.j)) * float64(factorial(-e-1)) * sum[i]}
	}
	return out
}
