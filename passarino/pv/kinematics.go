package pv

import (
	"fmt"
	"math/big"

	"loopmatch/expr"
)

// MaxPoints is the largest number of propagators the reduction handles.
const MaxPoints = 4

// invariantPairs lists, for each N, the pairs (i, j) whose invariants (P_i − P_j)² are passed to
// NewKinematics, in the argument order of the scalar integrals (loops, Denner 1993):
// B0(p1²), C0(p1², (p2−p1)², p2²), D0(p1², (p2−p1)², (p3−p2)², p3², p2², (p3−p1)²).
var invariantPairs = [MaxPoints + 1][][2]int{
	2: {{0, 1}},
	3: {{0, 1}, {1, 2}, {0, 2}},
	4: {{0, 1}, {1, 2}, {2, 3}, {0, 3}, {0, 2}, {1, 3}},
}

// Kinematics describes an N-point one-loop integral, N = 1 … 4: the invariants
// s_ij = (P_i − P_j)² of the propagator momenta (P_0 = 0) and the squared masses m_i². Both are
// rational functions, symbolic or numeric as the caller chooses; they must not contain the
// dimension d. A Kinematics is immutable.
type Kinematics struct {
	n  int
	s  [MaxPoints][MaxPoints]expr.RatFunc
	m2 [MaxPoints]expr.RatFunc
}

// NewKinematics returns the kinematics of the N-point function with N = len(masses2). The
// invariants come in the argument order of the scalar integral of the same N: none for N = 1,
// [p1²] for N = 2, [p1², (p2−p1)², p2²] for N = 3 and
// [p1², (p2−p1)², (p3−p2)², p3², p2², (p3−p1)²] for N = 4, where p_i = P_i.
func NewKinematics(invariants, masses2 []expr.RatFunc) (*Kinematics, error) {
	n := len(masses2)
	if n < 1 || n > MaxPoints {
		return nil, fmt.Errorf("pv: %d propagators; the reduction handles 1 to %d", n, MaxPoints)
	}
	pairs := invariantPairs[n]
	if len(invariants) != len(pairs) {
		return nil, fmt.Errorf("pv: a %d-point function takes %d invariants, got %d", n, len(pairs), len(invariants))
	}
	k := &Kinematics{n: n}
	for i := range k.s {
		for j := range k.s[i] {
			k.s[i][j] = expr.RFInt(0)
		}
	}
	for i, x := range invariants {
		if x.Has(expr.DimSymbol) {
			return nil, fmt.Errorf("pv: invariant %d (%s) contains the dimension %s", i+1, x, expr.DimSymbol)
		}
		a, b := pairs[i][0], pairs[i][1]
		k.s[a][b], k.s[b][a] = x, x
	}
	for i, m := range masses2 {
		if m.Has(expr.DimSymbol) {
			return nil, fmt.Errorf("pv: squared mass %d (%s) contains the dimension %s", i, m, expr.DimSymbol)
		}
		if c, ok := m.ConstValue(); ok && c.Sign() < 0 {
			return nil, fmt.Errorf("pv: squared mass %d is negative (%s)", i, m)
		}
		k.m2[i] = m
	}
	for i := n; i < MaxPoints; i++ {
		k.m2[i] = expr.RFInt(0)
	}
	return k, nil
}

// N is the number of propagators.
func (k *Kinematics) N() int { return k.n }

// Invariant returns (P_i − P_j)², 0 ≤ i, j < N.
func (k *Kinematics) Invariant(i, j int) expr.RatFunc { return k.s[i][j] }

// Mass2 returns the squared mass of propagator i.
func (k *Kinematics) Mass2(i int) expr.RatFunc { return k.m2[i] }

// Gram returns the Gram matrix G_kl = P_k·P_l, k, l = 1 … N−1 (row and column 0 of the result
// belong to P_1), computed as (P_k² + P_l² − (P_k − P_l)²)/2.
func (k *Kinematics) Gram() [][]expr.RatFunc {
	g := gramOf(k, propagators(k.n))
	half := big.NewRat(1, 2)
	for i := range g {
		for j := range g[i] {
			g[i][j] = g[i][j].Scale(half)
		}
	}
	return g
}

// GramDet returns det(P_k·P_l), 1 for N = 1.
func (k *Kinematics) GramDet() expr.RatFunc {
	g := k.Gram()
	return det(g)
}

// propagators returns the labels 0 … n−1.
func propagators(n int) []int {
	l := make([]int, n)
	for i := range l {
		l[i] = i
	}
	return l
}

// gramOf returns Z_ab = 2 p_a·p_b for the sub-integral with propagators labels (sorted), whose
// momenta are p_a = P_{labels[a]} − P_{labels[0]}, a = 1 … len(labels)−1.
func gramOf(k *Kinematics, labels []int) [][]expr.RatFunc {
	n := len(labels) - 1
	r := labels[0]
	z := make([][]expr.RatFunc, n)
	for a := range n {
		z[a] = make([]expr.RatFunc, n)
		for b := range n {
			la, lb := labels[a+1], labels[b+1]
			z[a][b] = k.s[r][la].Add(k.s[r][lb]).Sub(k.s[la][lb])
		}
	}
	return z
}

// det is the determinant of a square matrix of size ≤ 3 (1 for size 0).
func det(m [][]expr.RatFunc) expr.RatFunc {
	switch len(m) {
	case 0:
		return expr.RFInt(1)
	case 1:
		return m[0][0]
	case 2:
		return m[0][0].Mul(m[1][1]).Sub(m[0][1].Mul(m[1][0]))
	}
	var s expr.RatFunc = expr.RFInt(0)
	for c := range 3 {
		minor := m[1][(c+1)%3].Mul(m[2][(c+2)%3]).Sub(m[1][(c+2)%3].Mul(m[2][(c+1)%3]))
		s = s.Add(m[0][c].Mul(minor))
	}
	return s
}

// adjugate returns the adjugate of a square matrix of size 1 … 3 (adj·m = det·1).
func adjugate(m [][]expr.RatFunc) [][]expr.RatFunc {
	n := len(m)
	adj := make([][]expr.RatFunc, n)
	for i := range adj {
		adj[i] = make([]expr.RatFunc, n)
	}
	if n == 1 {
		adj[0][0] = expr.RFInt(1)
		return adj
	}
	for i := range n {
		for j := range n {
			// (adj)_ij is the cofactor C_ji
			var minor [][]expr.RatFunc
			for r := range n {
				if r == j {
					continue
				}
				var row []expr.RatFunc
				for c := range n {
					if c != i {
						row = append(row, m[r][c])
					}
				}
				minor = append(minor, row)
			}
			c := det(minor)
			if (i+j)%2 == 1 {
				c = c.Neg()
			}
			adj[i][j] = c
		}
	}
	return adj
}
