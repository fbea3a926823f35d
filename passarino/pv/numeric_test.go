package pv

import (
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"os"
	"testing"

	"loopmatch/expr"
	"loopmatch/loops"
)

// euclideanPoint draws a kinematic point of an N-point function from Euclidean momenta
// P_1 … P_{N−1} with half-integer components in [−2, 2] (so (P_i − P_j)² = −|P_i − P_j|²_E is
// spacelike and exact), squared masses k/4 with k in 2 … 16, and a well-conditioned Gram matrix
// (normalised determinant above 0.05), so that every integral is real and finite.
func euclideanPoint(rng *rand.Rand, n int) (fpPoint, *Kinematics) {
	for {
		var P [MaxPoints][4]float64
		for i := 1; i < n; i++ {
			for c := range 4 {
				P[i][c] = float64(rng.IntN(9)-4) / 2
			}
		}
		pt := fpPoint{n: n, mu2: 1.7}
		for i := range n {
			pt.m2[i] = float64(rng.IntN(15)+2) / 4
			for j := range n {
				s := 0.0
				for c := range 4 {
					d := P[i][c] - P[j][c]
					s += d * d
				}
				pt.s[i][j] = -s
			}
		}
		if n > 1 && !wellConditioned(P, n) {
			continue
		}
		var inv, m2 []expr.RatFunc
		for _, p := range invariantPairs[n] {
			inv = append(inv, ratOf(pt.s[p[0]][p[1]]))
		}
		for i := range n {
			m2 = append(m2, ratOf(pt.m2[i]))
		}
		k, err := NewKinematics(inv, m2)
		if err != nil {
			panic(err)
		}
		return pt, k
	}
}

// wellConditioned reports whether the Euclidean Gram determinant of P_1 … P_{n−1}, divided by
// the product of their squared lengths, exceeds 0.05.
func wellConditioned(P [MaxPoints][4]float64, n int) bool {
	m := n - 1
	var g [3][3]float64
	norm := 1.0
	for a := range m {
		for b := range m {
			for c := range 4 {
				g[a][b] += P[a+1][c] * P[b+1][c]
			}
		}
		norm *= g[a][a]
	}
	if norm == 0 {
		return false
	}
	var dt float64
	switch m {
	case 1:
		dt = g[0][0]
	case 2:
		dt = g[0][0]*g[1][1] - g[0][1]*g[1][0]
	case 3:
		dt = g[0][0]*(g[1][1]*g[2][2]-g[1][2]*g[2][1]) - g[0][1]*(g[1][0]*g[2][2]-g[1][2]*g[2][0]) + g[0][2]*(g[1][0]*g[2][1]-g[1][1]*g[2][0])
	}
	return dt/norm > 0.05
}

// ratOf converts an exactly representable float to a rational constant.
func ratOf(x float64) expr.RatFunc {
	r := new(big.Rat)
	r.SetFloat64(x)
	return expr.RFRat(r)
}

// numericCase is one row of the quadrature comparison: N and the highest rank.
type numericCase struct {
	n           int
	maxRank     int // default run
	maxRankLong int // LOOPMATCH_LONG=1 run
	points      int // default run
	pointsLong  int // LOOPMATCH_LONG=1 run
	nodes       int // Gauss–Legendre nodes per dimension
	seed        uint64
}

// TestAgainstFeynmanParameters compares every coefficient with N ≤ 4 and rank ≤ 4 (all the
// 00-pairs included; with LOOPMATCH_LONG=1 more points and ranks up to 6 for N ≤ 2, 5 for N = 3)
// against the Feynman-parameter quadrature (F) of feynman_test.go at random
// Euclidean points. The reduced expression is evaluated twice with loops:
//
//   - with its exact coefficients and loops' arbitrary-precision scalar integrals: finite part
//     and 1/ε pole to 1e-8 relative (the check of the reduction itself);
//   - in float64 with loops.EvalLaurent, the way callers evaluate it: Passarino–Veltman results
//     cancel between their terms (inverse Gram determinants, momenta small against the masses),
//     by a factor κ = Σ|term|/|sum| that reaches 1e8 for rank-4 boxes, so the tolerance is
//     1e-8 or 1e-14·κ (the scalar integrals' float64 accuracy times κ), whichever is larger.
//
// The poles themselves are compared exactly in TestUVPoles.
func TestAgainstFeynmanParameters(t *testing.T) {
	long := os.Getenv("LOOPMATCH_LONG") != "" && !testing.Short()
	cases := []numericCase{
		{n: 1, maxRank: 4, maxRankLong: 6, points: 10, pointsLong: 10, nodes: 1, seed: 1},
		{n: 2, maxRank: 4, maxRankLong: 6, points: 10, pointsLong: 20, nodes: 40, seed: 2},
		{n: 3, maxRank: 4, maxRankLong: 5, points: 10, pointsLong: 20, nodes: 40, seed: 3},
		{n: 4, maxRank: 4, maxRankLong: 4, points: 3, pointsLong: 10, nodes: 40, seed: 4},
	}
	for _, tc := range cases {
		t.Run(fmt.Sprintf("N=%d", tc.n), func(t *testing.T) {
			rng := rand.New(rand.NewPCG(tc.seed, 99))
			points, maxRank := tc.points, tc.maxRank
			if long {
				points, maxRank = tc.pointsLong, tc.maxRankLong
			}
			var idxs [][]int
			var ls []label
			for r := 0; r <= maxRank; r++ {
				for _, idx := range Indices(tc.n, r) {
					l, err := parseIndex(tc.n, idx)
					if err != nil {
						t.Fatal(err)
					}
					idxs = append(idxs, idx)
					ls = append(ls, l)
				}
			}
			worstBig, worstFloat, worstKappa := 0.0, 0.0, 0.0
			for p := range points {
				pt, k := euclideanPoint(rng, tc.n)
				ref := fpCoefficients(pt, ls, tc.nodes)
				red := NewReducer(k)
				ev := newBigEvaluator(pt.mu2)
				for i, idx := range idxs {
					name := Name(tc.n, idx)
					e, err := red.Coefficient(idx)
					if err != nil {
						t.Fatalf("point %d %s: %v", p, name, err)
					}
					want := ref[i]
					// exact coefficients, arbitrary-precision scalar integrals
					bp, bf, err := ev.eval(e)
					if err != nil {
						t.Fatalf("point %d %s: %v", p, name, err)
					}
					pole, _ := bp.Float64()
					fin, _ := bf.Float64()
					rel := math.Abs(fin-want.finite) / math.Abs(want.finite)
					worstBig = math.Max(worstBig, rel)
					if !(rel <= 1e-8) || math.Abs(pole-want.pole) > 1e-8*math.Max(1, math.Abs(want.pole)) {
						t.Errorf("point %d %s: reduced pole %.15g finite %.15g, quadrature pole %.15g finite %.15g", p, name, pole, fin, want.pole, want.finite)
					}
					// float64, as callers evaluate it
					v, err := loops.EvalLaurent(e, nil, pt.mu2)
					if err != nil {
						t.Fatalf("point %d %s: %v", p, name, err)
					}
					kappa := cancellation(t, e, pt.mu2, real(v.Finite))
					worstKappa = math.Max(worstKappa, kappa)
					relF := math.Abs(real(v.Finite)-want.finite) / math.Abs(want.finite)
					worstFloat = math.Max(worstFloat, relF)
					if !(relF <= math.Max(1e-8, 1e-14*kappa)) || math.Abs(real(v.Pole1)-want.pole) > 1e-10*math.Max(1, math.Abs(want.pole)) || v.Pole2 != 0 {
						t.Errorf("point %d %s: float64 %v (κ = %.2g), quadrature pole %.15g finite %.15g", p, name, v, kappa, want.pole, want.finite)
					}
				}
			}
			t.Logf("%d points: largest relative difference %.2g (exact coefficients, 128-bit integrals), %.2g (float64; largest κ %.2g)", points, worstBig, worstFloat, worstKappa)
		})
	}
}

// cancellation returns κ = Σ|term|/|sum| of the finite parts of e's terms in float64.
func cancellation(t *testing.T, e expr.Expr, mu2, sum float64) float64 {
	s := 0.0
	for _, tm := range e.Terms() {
		v, err := loops.EvalLaurent(expr.FromTerm(tm), nil, mu2)
		if err != nil {
			t.Fatal(err)
		}
		s += math.Abs(real(v.Finite))
	}
	return s / math.Abs(sum)
}
