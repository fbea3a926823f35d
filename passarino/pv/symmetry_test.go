package pv

import (
	"math/rand/v2"
	"testing"

	"loopmatch/expr"
	"loopmatch/loops"
)

// canonical rewrites every scalar-integral atom into one representative of its symmetry class:
// a scalar integral does not depend on the labelling of its propagators, so of all the
// relabellings (with the invariants permuted along) the one with the smallest text is chosen.
func canonical(t *testing.T, e expr.Expr) expr.Expr {
	t.Helper()
	names := map[string]int{loops.TadName: 1, loops.BubName: 2, loops.TriName: 3, loops.BoxName: 4}
	out, err := e.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
		f, ok := a.(expr.Fn)
		n := names[f.Name]
		if !ok || n < 2 {
			return expr.Expr{}, false
		}
		pairs := invariantPairs[n]
		var s [MaxPoints][MaxPoints]expr.RatFunc
		for i, p := range pairs {
			x, _ := f.Args[i].AsRatFunc()
			s[p[0]][p[1]], s[p[1]][p[0]] = x, x
		}
		m := make([]expr.RatFunc, n)
		for i := range n {
			m[i], _ = f.Args[len(pairs)+i].AsRatFunc()
		}
		var best expr.Expr
		for _, perm := range permutations(n) {
			var inv, m2 []expr.RatFunc
			for _, p := range pairs {
				inv = append(inv, s[perm[p[0]]][perm[p[1]]])
			}
			for i := range n {
				m2 = append(m2, m[perm[i]])
			}
			c, err := loops.Atom(f.Name, inv, m2)
			if err != nil {
				t.Fatal(err)
			}
			if best.IsZero() || c.String() < best.String() {
				best = c
			}
		}
		return best, true
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// permutations lists the permutations of 0 … n−1.
func permutations(n int) [][]int {
	if n == 0 {
		return [][]int{{}}
	}
	var out [][]int
	for _, p := range permutations(n - 1) {
		for pos := 0; pos <= len(p); pos++ {
			q := append(append(append([]int{}, p[:pos]...), n-1), p[pos:]...)
			out = append(out, q)
		}
	}
	return out
}

// relabel returns the kinematics with the propagators 1 … N−1 permuted: new propagator i is
// old propagator perm[i] (perm[0] = 0, so the loop momentum and the basis stay; only the
// momenta P_i are renamed).
func relabel(t *testing.T, k *Kinematics, perm []int) *Kinematics {
	t.Helper()
	n := k.N()
	var inv, m2 []expr.RatFunc
	for _, p := range invariantPairs[n] {
		inv = append(inv, k.Invariant(perm[p[0]], perm[p[1]]))
	}
	for i := range n {
		m2 = append(m2, k.Mass2(perm[i]))
	}
	k2, err := NewKinematics(inv, m2)
	if err != nil {
		t.Fatal(err)
	}
	return k2
}

// TestLegExchange checks the exchange symmetry of the tensor coefficients, a fact of the
// decomposition (Denner 1993, section 4: the coefficients are symmetric functions of the
// momenta they multiply): renaming P_i ↔ P_j (with their masses) maps T_{…i…} to T_{…j…}, e.g.
// C1 ↔ C2, C11 ↔ C22, C001 ↔ C002, D13 ↔ D23. Exact symbolic equality (after choosing one
// labelling per scalar integral): the triangle with symbolic invariants and masses to rank 3,
// the box at an exact rational point to rank 4.
func TestLegExchange(t *testing.T) {
	_, box := euclideanPoint(rand.New(rand.NewPCG(11, 3)), 4)
	cases := []struct {
		name    string
		k       *Kinematics
		perm    []int
		maxRank int
	}{
		{"C 1↔2", symbolicKinematics(t, 3), []int{0, 2, 1}, 3},
		{"D 1↔3", box, []int{0, 3, 2, 1}, 4},
		{"D 1→2→3→1", box, []int{0, 2, 3, 1}, 3},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			n := tc.k.N()
			orig := NewReducer(tc.k)
			swapped := NewReducer(relabel(t, tc.k, tc.perm))
			for r := 0; r <= tc.maxRank; r++ {
				for _, idx := range Indices(n, r) {
					mapped := make([]int, len(idx))
					for i, x := range idx {
						mapped[i] = tc.perm[x]
					}
					a, err := swapped.Coefficient(idx)
					if err != nil {
						t.Fatal(err)
					}
					b, err := orig.Coefficient(mapped)
					if err != nil {
						t.Fatal(err)
					}
					if ca, cb := canonical(t, a), canonical(t, b); !ca.Equal(cb) {
						t.Errorf("%s of the relabelled function = %s,\n%s of the original = %s", Name(n, idx), ca, Name(n, mapped), cb)
					}
				}
			}
		})
	}
}
