package dirac

import (
	"math/rand/v2"
	"strings"
	"testing"

	"loopmatch/expr"
)

// Fierz rearrangement in four dimensions: every rearranged product is compared with the
// original one numerically (explicit matrices, random spinors), the rearrangement applied twice
// returns the original, and the chiral identities of C.C. Nishi, Am. J. Phys. 73 (2005) 1160
// (for commuting spinors, i.e. without the sign of field exchange) hold exactly:
// (γ^μPL)[γ_μPL] = −(γ^μPL][γ_μPL), (PL)[PR] = ½(γ^μPR][γ_μPL), (γ^μPL)[γ_μPR] = 2(PR][PL)
// (the signs for field operators are the opposite; our expectations were fixed by the
// numerical check, which shares nothing with the algebra).
func TestFierz(t *testing.T) {
	rng := rand.New(rand.NewPCG(41, 42))
	kin, mom, vals := spectators(rng, "a", "b", "c", "e")
	p := newPoint(rng, kin, mom, vals)
	opt := Options{Dummies: []string{"al", "be", "mu", "nu"}, ColourDummies: []string{"x", "y", "z", "w"}}
	tests := []struct {
		name string
		in   expr.Expr
		want expr.Expr
	}{
		{"(γ^μPL)(γ_μPL) = −(γ^μPL](γ_μPL] (commuting spinors)", mul(ch("ubar:a g:mu PL u:b"), ch("ubar:c g:mu PL u:e")),
			mul(num(-1), ch("ubar:a g:mu PL u:e"), ch("ubar:c g:mu PL u:b"))},
		{"(PL)(PR) = ½(γ^μPR](γ_μPL]", mul(ch("ubar:a PL u:b"), ch("ubar:c PR u:e")),
			mul(frac(1, 2), ch("ubar:a g:al PR u:e"), ch("ubar:c g:al PL u:b"))},
		{"(γ^μPL)(γ_μPR) = 2(PR](PL]", mul(ch("ubar:a g:mu PL u:b"), ch("ubar:c g:mu PR u:e")),
			mul(num(2), ch("ubar:a PR u:e"), ch("ubar:c PL u:b"))},
		{"(PL)(PL)", mul(ch("ubar:a PL u:b"), ch("ubar:c PL u:e")), none},
		{"(σ^{μν}PL)(σ_{μν}PL)", mul(ch("ubar:a sig:mu:nu PL u:b"), ch("ubar:c sig:mu:nu PL u:e")), none},
		{"(γ^μ)(γ_μ γ5)", mul(ch("ubar:a g:mu u:b"), ch("ubar:c g:mu G5 u:e")), none},
		{"colour octet (T^x γ^μPL)(T^x γ_μPL)", mul(ch("ubar:a T:x g:mu PL u:b"), ch("ubar:c T:x g:mu PL u:e")), none},
		{"colour singlet with a free gamma", mul(ch("ubar:a g:nu PL u:b"), ch("ubar:c PR u:e")), none},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			out, _, err := Fierz(tc.in, Kinematics{}, opt)
			if err != nil {
				t.Fatal(err)
			}
			var free []string
			if tc.name == "colour singlet with a free gamma" {
				free = []string{"nu"}
			}
			p.colour = map[string]int{}
			p.compareNum(t, tc.name, tc.in, out, free, nil)
			if !tc.want.Equal(none) {
				w4, _ := mustSimplify(t, tc.want, Kinematics{}, Options{Dummies: opt.Dummies})
				w4, _ = at4(w4)
				if !out.Equal(w4) {
					t.Fatalf("got %s\n want %s", out, w4)
				}
			}
			twice, _, err := Fierz(out, Kinematics{}, opt)
			if err != nil {
				t.Fatal(err)
			}
			in4, _ := mustSimplify(t, tc.in, Kinematics{}, opt)
			in4, _ = at4(in4)
			in4, _ = mustSimplify(t, in4, Kinematics{}, opt)
			if !twice.Equal(in4) {
				p.compareNum(t, tc.name+" (twice)", tc.in, twice, free, nil)
			}
		})
	}
	// quarks: colour lines are crossed as well
	var qkin Kinematics
	for _, l := range kin.Legs {
		l.Coloured = true
		qkin.Legs = append(qkin.Legs, l)
	}
	for _, in := range []expr.Expr{
		mul(ch("ubar:a g:mu PL u:b"), ch("ubar:c g:mu PL u:e")),
		mul(ch("ubar:a T:x g:mu PL u:b"), ch("ubar:c T:x g:mu PR u:e")),
		mul(ch("ubar:a T:y g:mu PL u:b"), ch("ubar:c g:mu PR u:e")),
	} {
		out, _, err := Fierz(in, qkin, opt)
		if err != nil {
			t.Fatal(err)
		}
		twice, _, err := Fierz(out, qkin, opt)
		if err != nil {
			t.Fatal(err)
		}
		var free []string
		if strings.Contains(in.String(), "T(y)") {
			free = []string{"y"}
		}
		for _, c := range [][4]int{{0, 0, 0, 0}, {0, 1, 1, 0}, {0, 0, 1, 1}, {1, 2, 2, 1}, {0, 1, 0, 1}, {2, 0, 1, 1}} {
			p.colour = map[string]int{"a": c[0], "b": c[1], "c": c[2], "e": c[3]}
			p.compareNum(t, "coloured Fierz", in, out, nil, free)
			p.compareNum(t, "coloured Fierz twice", in, twice, nil, free)
		}
	}
	if _, _, err := Fierz(mul(ch("ubar:a g:mu u:b"), ch("ubar:c g:mu u:e")), Kinematics{}, Options{}); err == nil {
		t.Error("Fierz without spare index names must explain the need for Options.Dummies")
	}
}

// The Chisholm identity (J.S.R. Chisholm, Nuovo Cim. 30 (1963) 426; P&S appendix A):
// γ^μγ^νγ^ρ = g^{μν}γ^ρ − g^{μρ}γ^ν + g^{νρ}γ^μ + c iε^{μνρσ}γ_σγ5 with c = ε^{0123} = −1 for
// γ5 = iγ⁰γ¹γ²γ³, reproduced by Chisholm and checked numerically; and its trace form
// γ_μ tr(γ^μ a̸ b̸ c̸) = 2(a̸b̸c̸ + c̸b̸a̸), valid in d dimensions.
func TestChisholm(t *testing.T) {
	rng := rand.New(rand.NewPCG(43, 44))
	kin, mom, vals := spectators(rng, "a", "b")
	randMoms(rng, mom, "p", "k", "q")
	p := newPoint(rng, kin, mom, vals)
	opt := Options{Dummies: []string{"sg"}}
	lhs := ch("ubar:a g:mu g:nu g:rho u:b")
	rhs := mul(gmn("mu", "nu"), ch("ubar:a g:rho u:b")).Sub(mul(gmn("mu", "rho"), ch("ubar:a g:nu u:b"))).Add(mul(gmn("nu", "rho"), ch("ubar:a g:mu u:b"))).Add(
		mul(num(epsilon0123), iunit(), levi("mu", "nu", "rho", "sg", [4]bool{true, true, true, true}), ch("ubar:a g:sg G5 u:b")))
	got, _, err := Chisholm(lhs, Kinematics{}, opt)
	if err != nil {
		t.Fatal(err)
	}
	want, _, err := Chisholm(rhs, Kinematics{}, opt)
	if err != nil {
		t.Fatal(err)
	}
	if !got.Equal(want) {
		t.Fatalf("Chisholm: %s\n  want %s", got, want)
	}
	free := []string{"mu", "nu", "rho"}
	p.compareNum(t, "Chisholm identity, right side", rhs, lhs, free, nil)
	p.compareNum(t, "Chisholm reduction", lhs, got, free, nil)
	// longer strings reduce to at most two matrices per chain
	long := ch("ubar:a g:mu s:p g:nu s:k PL u:b")
	got, _, err = Chisholm(long, Kinematics{}, opt)
	if err != nil {
		t.Fatal(err)
	}
	for _, tm := range got.Terms() {
		for _, a := range tm.Atoms {
			if c, ok := a.A.(expr.Chain); ok && diracLen(c) > 2 {
				t.Fatalf("chain with more than two matrices left: %s", got)
			}
		}
	}
	p.compareNum(t, "Chisholm of four matrices", long, got, []string{"mu", "nu"}, nil)

	// trace form, d-dimensional
	tr, _, err := Trace(el("g:al s:p s:k s:q"), ch("ubar:a g:al u:b"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	l, _ := mustSimplify(t, tr, Kinematics{}, Options{})
	r, _ := mustSimplify(t, mul(num(2), ch("ubar:a s:p s:k s:q u:b").Add(ch("ubar:a s:q s:k s:p u:b"))), Kinematics{}, Options{})
	if !l.Equal(r) {
		t.Fatalf("γ_μ tr(γ^μ p̸ k̸ q̸): %s, want %s", l, r)
	}
	p.compareNum(t, "trace form of Chisholm", r, l, nil, nil)
}
