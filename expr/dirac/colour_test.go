package dirac

import (
	"math/rand/v2"
	"testing"

	"loopmatch/expr"
)

func fabc(a, b, c string) expr.Expr {
	f, s := expr.NewStructureF(a, b, c)
	return expr.FromAtom(f, 1).Scale(expr.RFInt(int64(s)))
}

func delta(a, b string) expr.Expr { return expr.FromAtom(expr.NewDelta(a, b), 1) }

// ncExpr is an expression in Nc.
func ncExpr(num, den string) expr.Expr {
	n := map[string]expr.RatFunc{
		"CF":      rfNN1.Mul(rfInvN()).Mul(expr.RFRat(bigHalf)),
		"N":       rfN,
		"-1/2N":   rfInvN().Mul(expr.RFRat(bigHalf)).Neg(),
		"NN1":     rfN.Mul(rfNN1),
		"iN/2":    rfN.Mul(expr.RFRat(bigHalf)),
		"1/4-":    rfNN1.Mul(rfInvN()).Mul(rfInvN()).Mul(expr.RFRat(bigHalf)).Mul(expr.RFRat(bigHalf)),
		"-1/N":    rfInvN().Neg(),
		"N2-2/2N": rfN.Mul(rfN).Sub(expr.RFInt(2)).Mul(rfInvN()).Mul(expr.RFRat(bigHalf)),
	}[num]
	_ = den
	return expr.FromRF(n)
}

// SU(N) colour algebra: M.E. Peskin, D.V. Schroeder, section 15.4 (C_F = (N² − 1)/(2N),
// C_A = N, the completeness relation of the generators) and P. Cvitanović, Group Theory
// (Princeton 2008), chapter 9 (birdtrack forms of T^b T^a T^b and f^{abc} T^b T^c). The
// products of two lines in the singlet/octet basis (T^aT^b ⊗ T^aT^b, T^aT^b ⊗ T^bT^a) are from
// memory and checked here numerically with the Gell-Mann matrices (N = 3), as is every other
// identity, at all colour values of the legs and the free adjoint indices.
func TestColour(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	kin, mom, vals := spectators(rng, "a", "b", "c", "e")
	tests := []struct {
		name     string
		lhs, rhs expr.Expr
		free     []string
	}{
		{"T^aT^a = C_F", ch("ubar:a T:x T:x u:b"), mul(ncExpr("CF", ""), ch("ubar:a u:b")), nil},
		{"T^bT^aT^b = −T^a/(2N)", ch("ubar:a T:y T:x T:y u:b"), mul(ncExpr("-1/2N", ""), ch("ubar:a T:x u:b")), []string{"x"}},
		{"f^{abc}T^bT^c = (i/2) C_A T^a", mul(fabc("x", "y", "z"), ch("ubar:a T:y T:z u:b")), mul(iunit(), ncExpr("iN/2", ""), ch("ubar:a T:x u:b")), []string{"x"}},
		{"f^{acd}f^{bcd} = C_A δ^{ab}", mul(fabc("x", "z", "w"), fabc("y", "z", "w"), ch("ubar:a u:b")), mul(ncExpr("N", ""), delta("x", "y"), ch("ubar:a u:b")), []string{"x", "y"}},
		{"f^{abc}f^{abc} = N(N² − 1)", mul(fabc("x", "y", "z"), fabc("z", "x", "y"), ch("ubar:a u:b")), mul(ncExpr("NN1", ""), ch("ubar:a u:b")), nil},
		{"δ^{ab}T^b = T^a", mul(delta("x", "y"), ch("ubar:a T:y u:b")), ch("ubar:a T:x u:b"), []string{"x"}},
		{"T^a ⊗ T^a is the octet basis element", mul(ch("ubar:a T:x u:b"), ch("ubar:c T:x u:e")), mul(ch("ubar:a T:x u:b"), ch("ubar:c T:x u:e")), nil},
		{"T^aT^b ⊗ T^aT^b = (N²−1)/(4N²) 1⊗1 − (1/N) T^c⊗T^c", mul(ch("ubar:a T:x T:y u:b"), ch("ubar:c T:x T:y u:e")),
			mul(ncExpr("1/4-", ""), ch("ubar:a u:b"), ch("ubar:c u:e")).Add(mul(ncExpr("-1/N", ""), ch("ubar:a T:x u:b"), ch("ubar:c T:x u:e"))), nil},
		{"T^aT^b ⊗ T^bT^a = (N²−1)/(4N²) 1⊗1 + (N²−2)/(2N) T^c⊗T^c", mul(ch("ubar:a T:x T:y u:b"), ch("ubar:c T:y T:x u:e")),
			mul(ncExpr("1/4-", ""), ch("ubar:a u:b"), ch("ubar:c u:e")).Add(mul(ncExpr("N2-2/2N", ""), ch("ubar:a T:x u:b"), ch("ubar:c T:x u:e"))), nil},
		{"gluon emission T^b T^a ⊗ T^b", mul(ch("ubar:a T:y T:x u:b"), ch("ubar:c T:y u:e")), none, []string{"x"}},
		{"f^{abc} T^b ⊗ T^c", mul(fabc("x", "y", "z"), ch("ubar:a T:y u:b"), ch("ubar:c T:z u:e")), none, []string{"x"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			l, _ := mustSimplify(t, tc.lhs, Kinematics{}, Options{})
			if !tc.rhs.Equal(none) {
				r, _ := mustSimplify(t, tc.rhs, Kinematics{}, Options{})
				if !l.Equal(r) {
					t.Fatalf("left gives %s\n  right gives %s", l, r)
				}
			}
			p := newPoint(rand.New(rand.NewPCG(3, 4)), kin, mom, vals)
			// colour values of the legs a, b, c, e: diagonal, off-diagonal and crossed patterns
			for _, c := range [][4]int{{0, 0, 0, 0}, {0, 1, 1, 0}, {0, 0, 1, 1}, {1, 2, 2, 1}, {0, 1, 0, 1}, {2, 0, 1, 1}, {2, 2, 0, 0}} {
				p.colour = map[string]int{"a": c[0], "b": c[1], "c": c[2], "e": c[3]}
				p.compareNum(t, tc.name, tc.lhs, l, nil, tc.free)
			}
		})
	}
}

// The completeness relation itself, T^a_ij T^a_kl = ½(δ_il δ_kj − δ_ij δ_kl/N), with the
// Gell-Mann matrices (P&S eq. (15.xx) normalisation tr T^aT^b = δ^{ab}/2).
func TestColourCompletenessNumeric(t *testing.T) {
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			for k := 0; k < 3; k++ {
				for l := 0; l < 3; l++ {
					var s complex128
					for a := 0; a < 8; a++ {
						s += gellMann[a][i][j] * gellMann[a][k][l]
					}
					want := 0.0
					if i == l && k == j {
						want += 0.5
					}
					if i == j && k == l {
						want -= 0.5 / 3
					}
					if !closeTo(s, complex(want, 0), 1) {
						t.Fatalf("T^a_%d%d T^a_%d%d = %v, want %v", i, j, k, l, s, want)
					}
				}
			}
		}
	}
}

func TestColourTrace(t *testing.T) {
	tests := []struct {
		adj  []string
		want expr.Expr
		free []string
	}{
		{nil, ncExpr("N", ""), nil},
		{[]string{"x"}, expr.Zero(), []string{"x"}},
		{[]string{"x", "y"}, mul(frac(1, 2), delta("x", "y")), []string{"x", "y"}},
		{[]string{"x", "x"}, mul(ncExpr("N", ""), ncExpr("CF", "")), nil},
		{[]string{"x", "y", "x", "y"}, mul(ncExpr("N", ""), ncExpr("CF", ""), ncExpr("-1/2N", "")), nil},
		{[]string{"x", "y", "y", "x"}, mul(ncExpr("N", ""), ncExpr("CF", ""), ncExpr("CF", "")), nil},
	}
	p := p0()
	for _, tc := range tests {
		got, err := ColourTrace(tc.adj, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if !got.Equal(tc.want) {
			t.Fatalf("tr %v = %s, want %s", tc.adj, got, tc.want)
		}
		for _, asg := range assignments(nil, tc.free) {
			x := p.evalNum(t, got, asg)
			// sum over repeated indices with explicit matrices
			var y complex128
			rep := map[string]bool{}
			cnt := map[string]int{}
			for _, a := range tc.adj {
				cnt[a]++
			}
			var dum []string
			for a, c := range cnt {
				if c == 2 && !rep[a] {
					rep[a] = true
					dum = append(dum, a)
				}
			}
			for _, a2 := range assignments(nil, dum) {
				for k, v := range asg {
					a2[k] = v
				}
				m := [3][3]complex128{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
				for _, a := range tc.adj {
					m = mul3(m, gellMann[a2[a]])
				}
				y += m[0][0] + m[1][1] + m[2][2]
			}
			if !closeTo(x, y, 1) {
				t.Fatalf("tr %v at %v: %v vs matrices %v", tc.adj, asg, x, y)
			}
		}
	}
	if _, err := ColourTrace([]string{"x", "y", "z"}, Options{}); err == nil {
		t.Fatal("a trace of three free generators needs d^{abc} and must be refused")
	}
}
