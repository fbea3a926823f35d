package dirac

import (
	"math/rand/v2"
	"testing"

	"loopmatch/expr"
)

// Contraction identities in d dimensions: M.E. Peskin, D.V. Schroeder, An Introduction to
// Quantum Field Theory, appendix A.3 (d-dimensional forms, eq. (A.52)–(A.53) there) and
// G. 't Hooft, M. Veltman, Nucl. Phys. B44 (1972) 189 (the P&S equation numbers in this
// package's tests are quoted from memory; every identity is verified numerically below, which
// does not depend on them). Each is checked exactly in d
// dimensions and, at d = 4, numerically against explicit Dirac matrices (the unsimplified
// left side evaluated with matrices against the simplified result).
func TestContractionIdentities(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	kinH, mom, vals := spectators(rng, "a", "b")
	randMoms(rng, mom, "p", "k")
	d := sym("d")
	tests := []struct {
		name     string
		lhs, rhs expr.Expr
		free     []string
	}{
		{"γ^μγ_μ = d (P&S A.52)", ch("ubar:a g:mu g:mu u:b"), mul(d, ch("ubar:a u:b")), nil},
		{"γ^μγ^νγ_μ = −(d−2)γ^ν (P&S A.52)", ch("ubar:a g:mu g:nu g:mu u:b"), mul(num(2).Sub(d), ch("ubar:a g:nu u:b")), []string{"nu"}},
		{"γ^μγ^νγ^ργ_μ = 4g^{νρ} − (4−d)γ^νγ^ρ (P&S A.52)", ch("ubar:a g:mu g:nu g:rho g:mu u:b"),
			mul(num(4), gmn("nu", "rho"), ch("ubar:a u:b")).Sub(mul(num(4).Sub(d), ch("ubar:a g:nu g:rho u:b"))), []string{"nu", "rho"}},
		{"γ^μγ^νγ^ργ^σγ_μ = −2γ^σγ^ργ^ν + (4−d)γ^νγ^ργ^σ (P&S A.52)", ch("ubar:a g:mu g:nu g:rho g:sg g:mu u:b"),
			mul(num(-2), ch("ubar:a g:sg g:rho g:nu u:b")).Add(mul(num(4).Sub(d), ch("ubar:a g:nu g:rho g:sg u:b"))), []string{"nu", "rho", "sg"}},
		{"k̸k̸ = k² (P&S A.2x)", ch("ubar:a s:k s:k u:b"), mul(dotp("k", "k"), ch("ubar:a u:b")), nil},
		{"γ^μ k̸ γ_μ = −(d−2)k̸", ch("ubar:a g:mu s:k g:mu u:b"), mul(num(2).Sub(d), ch("ubar:a s:k u:b")), nil},
		{"γ^μ p̸ k̸ γ_μ = 4p·k − (4−d)p̸k̸", ch("ubar:a g:mu s:p s:k g:mu u:b"),
			mul(num(4), dotp("p", "k"), ch("ubar:a u:b")).Sub(mul(num(4).Sub(d), ch("ubar:a s:p s:k u:b"))), nil},
		{"{γ^μ, γ^ν} = 2g^{μν} (P&S A.2x)", ch("ubar:a g:mu g:nu u:b").Add(ch("ubar:a g:nu g:mu u:b")), mul(num(2), gmn("mu", "nu"), ch("ubar:a u:b")), []string{"mu", "nu"}},
		{"σ^{μν} = (i/2)[γ^μ, γ^ν] (P&S eq. (3.17))", ch("ubar:a sig:mu:nu u:b"),
			mul(frac(1, 2), iunit(), ch("ubar:a g:mu g:nu u:b").Sub(ch("ubar:a g:nu g:mu u:b"))), []string{"mu", "nu"}},
		{"{γ5, γ^μ} = 0 (NDR)", ch("ubar:a G5 g:mu u:b").Add(ch("ubar:a g:mu G5 u:b")), expr.Zero(), []string{"mu"}},
		{"γ5² = 1", ch("ubar:a G5 G5 g:mu u:b"), ch("ubar:a g:mu u:b"), []string{"mu"}},
		{"PL γ^μ = γ^μ PR", ch("ubar:a PL g:mu u:b"), ch("ubar:a g:mu PR u:b"), []string{"mu"}},
		{"PL PR = 0", ch("ubar:a PL g:mu g:mu PR u:b"), expr.Zero(), nil},
		{"σ^{μν}γ5 = γ5 σ^{μν}", ch("ubar:a sig:mu:nu G5 u:b"), ch("ubar:a G5 sig:mu:nu u:b"), []string{"mu", "nu"}},
		{"γ^μ σ^{νρ} γ_μ = (d−4)σ^{νρ}", ch("ubar:a g:mu sig:nu:rho g:mu u:b"), mul(d.Sub(num(4)), ch("ubar:a sig:nu:rho u:b")), []string{"nu", "rho"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			l, _ := mustSimplify(t, tc.lhs, Kinematics{}, Options{})
			r, _ := mustSimplify(t, tc.rhs, Kinematics{}, Options{})
			if !l.Equal(r) {
				t.Fatalf("left %s\n  simplifies to %s\n  right %s\n  simplifies to %s", tc.lhs, l, tc.rhs, r)
			}
			p := newPoint(rand.New(rand.NewPCG(3, 4)), kinH, mom, vals)
			p.compareNum(t, tc.name, tc.lhs, l, tc.free, nil)
			p.compareNum(t, tc.name+" (right side)", tc.rhs, l, tc.free, nil)
		})
	}
}
