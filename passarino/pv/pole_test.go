package pv

import (
	"fmt"
	"math/big"
	"math/rand/v2"
	"os"
	"strings"
	"testing"
	"time"

	"loopmatch/expr"
	"loopmatch/loops"
)

// symbolicKinematics returns an N-point function with symbolic invariants s01, s12, … (in the
// order of invariantPairs) and squared masses M0, M1, ….
func symbolicKinematics(t *testing.T, n int) *Kinematics {
	t.Helper()
	var inv, m2 []expr.RatFunc
	for _, p := range invariantPairs[n] {
		inv = append(inv, expr.RFVar(fmt.Sprintf("s%d%d", p[0], p[1])))
	}
	for i := range n {
		m2 = append(m2, expr.RFVar(fmt.Sprintf("M%d", i)))
	}
	k, err := NewKinematics(inv, m2)
	if err != nil {
		t.Fatal(err)
	}
	return k
}

// analyticPole returns the UV pole of T^N_l from the Feynman-parameter form (F) of
// feynman_test.go, exactly: (−1)^P 2^{−j}/e! ∫dX X^α Δ^e with e = 2 + j − N ≥ 0 (zero
// otherwise), Δ = Σ X_i m_i² − Σ_{i<j} X_i X_j s_ij, and the simplex moments
// ∫dX Π X_i^{a_i} = Π a_i! / (N − 1 + Σ a_i)!.
func analyticPole(k *Kinematics, l label) (expr.RatFunc, error) {
	n := k.N()
	e := 2 + l.j - n
	if e < 0 {
		return expr.RFInt(0), nil
	}
	xv := func(i int) expr.RatFunc { return expr.RFVar(fmt.Sprintf("x%d", i)) }
	delta := expr.RFInt(0)
	for i := range n {
		delta = delta.Add(xv(i).Mul(k.Mass2(i)))
		for j := i + 1; j < n; j++ {
			delta = delta.Sub(xv(i).Mul(xv(j)).Mul(k.Invariant(i, j)))
		}
	}
	integrand, _ := delta.Pow(e)
	for a := 1; a < n; a++ {
		p, _ := xv(a).Pow(l.a[a-1])
		integrand = integrand.Mul(p)
	}
	// integrate the numerator term by term over the simplex
	var sum expr.Poly
	for _, t := range integrand.Num().Terms() {
		var rest expr.Mono
		deg := 0
		w := new(big.Rat).Set(t.Coef)
		for _, vp := range t.Mono {
			if strings.HasPrefix(vp.Var, "x") {
				deg += vp.Exp
				w.Mul(w, new(big.Rat).SetInt64(factorial(vp.Exp)))
				continue
			}
			rest = append(rest, vp)
		}
		w.Quo(w, new(big.Rat).SetInt64(factorial(n-1+deg)))
		sum = sum.Add(expr.PolyMono(w, rest))
	}
	r, err := expr.NewRatFunc(sum, integrand.Den())
	if err != nil {
		return expr.RatFunc{}, err
	}
	c := big.NewRat(1, int64(factorial(e))<<l.j)
	if l.rank()%2 == 1 {
		c.Neg(c)
	}
	return r.Scale(c), nil
}

// reducedPole returns the 1/ε pole of a reduced coefficient exactly: each coefficient at d = 4
// times the UV pole of its scalar integral, A0(M) → M, B0 → 1, C0 and D0 → 0 (PHYSICS.md;
// the kinematics here are generic, without infrared poles).
func reducedPole(e expr.Expr) (expr.RatFunc, error) {
	sum := expr.RFInt(0)
	for _, t := range e.Terms() {
		f := t.Atoms[0].A.(expr.Fn)
		c, err := t.Coef.Subst(expr.DimSymbol, expr.RFInt(4))
		if err != nil {
			return expr.RatFunc{}, err
		}
		switch f.Name {
		case loops.TadName:
			m, _ := f.Args[0].AsRatFunc()
			sum = sum.Add(c.Mul(m))
		case loops.BubName:
			sum = sum.Add(c)
		}
	}
	return sum, nil
}

// TestUVPoles checks the 1/ε pole of every coefficient with N ≤ 4 and rank ≤ 4 exactly against
// the analytic pole of the Feynman-parameter form (F). Kinematics: fully symbolic for N ≤ 3
// and for N = 4 to rank 1 (rank 2 with LOOPMATCH_LONG=1: about a minute, the symbolic box
// coefficients have thousands of terms); numeric invariants with symbolic masses, and an exact
// rational point, for N = 4 to rank 4.
func TestUVPoles(t *testing.T) {
	long := os.Getenv("LOOPMATCH_LONG") != "" && !testing.Short()
	type poleCase struct {
		name    string
		k       *Kinematics
		maxRank int
	}
	_, box := euclideanPoint(rand.New(rand.NewPCG(7, 7)), 4)
	var symInv []expr.RatFunc
	for _, p := range invariantPairs[4] {
		symInv = append(symInv, box.Invariant(p[0], p[1]))
	}
	boxSymMasses, err := NewKinematics(symInv, []expr.RatFunc{expr.RFVar("M0"), expr.RFVar("M1"), expr.RFVar("M2"), expr.RFVar("M3")})
	if err != nil {
		t.Fatal(err)
	}
	cases := []poleCase{
		{"A symbolic", symbolicKinematics(t, 1), 4},
		{"B symbolic", symbolicKinematics(t, 2), 4},
		{"C symbolic", symbolicKinematics(t, 3), 4},
		{"D symbolic", symbolicKinematics(t, 4), 1},
		{"D symbolic masses", boxSymMasses, 4},
		{"D numeric", box, 4},
	}
	if long {
		cases = append(cases, poleCase{"D symbolic (long)", symbolicKinematics(t, 4), 2})
	}
	for _, tc := range cases {
		t.Run(fmt.Sprintf("%s/rank≤%d", tc.name, tc.maxRank), func(t *testing.T) {
			start := time.Now()
			n := tc.k.N()
			red := NewReducer(tc.k)
			count := 0
			for r := 0; r <= tc.maxRank; r++ {
				for _, idx := range Indices(n, r) {
					l, _ := parseIndex(n, idx)
					e, err := red.Coefficient(idx)
					if err != nil {
						t.Fatalf("%s: %v", Name(n, idx), err)
					}
					got, err := reducedPole(e)
					if err != nil {
						t.Fatal(err)
					}
					want, err := analyticPole(tc.k, l)
					if err != nil {
						t.Fatal(err)
					}
					if !got.Equal(want) {
						t.Errorf("%s: pole %s, want %s", Name(n, idx), got, want)
					}
					count++
				}
			}
			t.Logf("%d coefficients in %v", count, time.Since(start))
		})
	}
}
