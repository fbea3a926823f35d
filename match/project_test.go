package match

import (
	"errors"
	"testing"

	"loopmatch/expr"
)

func chain(elems ...expr.NC) expr.Expr { return expr.FromAtom(expr.NewChain(elems), 1) }

func TestProject(t *testing.T) {
	ub := expr.NC{Op: expr.NCUBar, Args: []string{"b"}}
	u := expr.NC{Op: expr.NCU, Args: []string{"a"}}
	pl := expr.NC{Op: expr.NCPL}
	pr := expr.NC{Op: expr.NCPR}
	sL, sR := chain(ub, pl, u), chain(ub, pr, u)
	I := expr.FromAtom(expr.I, 1)
	lx, _ := expr.Log(expr.Sym("x"))
	// Basis: O1 = 2i P_L-chain + P_R-chain, O2 = P_R-chain.
	o1 := sL.MustMul(I).Scale(expr.RFInt(2)).Add(sR)
	o2 := sR
	c1 := lx.Add(expr.Sym("x"))
	c2 := expr.Sym("y").Sub(lx)
	amp := o1.MustMul(c1).Add(o2.MustMul(c2))
	got, err := Project(amp, []expr.Expr{o1, o2})
	if err != nil {
		t.Fatal(err)
	}
	if !got[0].Equal(c1) || !got[1].Equal(c2) {
		t.Errorf("Project = %v, %v; want %v, %v", got[0], got[1], c1, c2)
	}
	// A structure outside the basis is reported.
	extra := chain(ub, expr.NC{Op: expr.NCGamma, Args: []string{"al"}}, u).MustMul(expr.FromAtom(expr.Vec{P: "q", Mu: "al"}, 1))
	_, err = Project(amp.Add(extra.Scale(expr.RFVar("z"))), []expr.Expr{o1, o2})
	var pe *ProjectionError
	if !errors.As(err, &pe) || len(pe.Left) != 1 || pe.Left[0].Residual.String() != "z" {
		t.Errorf("unspanned structure not reported: %v", err)
	}
	// A dependent basis is an error.
	if _, err := Project(amp, []expr.Expr{o2, o2.Scale(expr.RFInt(3))}); err == nil {
		t.Error("dependent basis accepted")
	}
}

// TestProjectSeries checks the order-by-order projection onto a basis that depends on d. With
// S1 = 1⊗1-type and S2 = γγ⊗γγ-type structures, σ⊗σ = d S1 − S2 exactly in d dimensions, so an
// amplitude a(ε) S1 + b(ε) S2 has C_QS(ε) = a + b d and C_QT(ε) = −b exactly; MS-bar keeps the
// ε⁰ term, a₀ + 4b₀ − 2b₋₁ (d = 4 − 2ε; pure poles times the d-dimensional operators are
// subtracted; common practice, no source).
func TestProjectSeries(t *testing.T) {
	bar := func(n string) expr.NC { return expr.NC{Op: expr.NCUBar, Args: []string{n}} }
	spin := func(n string) expr.NC { return expr.NC{Op: expr.NCU, Args: []string{n}} }
	g := func(i string) expr.NC { return expr.NC{Op: expr.NCGamma, Args: []string{i}} }
	pl := expr.NC{Op: expr.NCPL}
	s1 := chain(bar("a2"), pl, spin("a1")).MustMul(chain(bar("b2"), pl, spin("b1")))
	s2 := chain(bar("a2"), g("al"), g("be"), pl, spin("a1")).MustMul(chain(bar("b2"), g("al"), g("be"), pl, spin("b1")))
	d := expr.Sym(expr.DimSymbol)
	qs, qt := s1, s1.MustMul(d).Sub(s2)
	bser, err := EpsBasis([]expr.Expr{qs, qt}, 2, func(string) bool { return true })
	if err != nil {
		t.Fatal(err)
	}
	am1, a0 := expr.Sym("am"), expr.Sym("a0")
	bm1, b0 := expr.Sym("bm"), expr.Sym("b0")
	amp := expr.Series{Lo: -1, C: []expr.Expr{s1.MustMul(am1).Add(s2.MustMul(bm1)), s1.MustMul(a0).Add(s2.MustMul(b0))}, Order: 1}
	cs, errs := ProjectSeries(amp, bser)
	if errs[-1] != nil || errs[0] != nil {
		t.Fatal(errs)
	}
	want := map[int][]expr.Expr{
		-1: {am1.Add(bm1.Scale(expr.RFInt(4))), bm1.Neg()},
		0:  {a0.Add(b0.Scale(expr.RFInt(4))).Sub(bm1.Scale(expr.RFInt(2))), b0.Neg()},
	}
	for k, w := range want {
		for i := range w {
			if !cs[k][i].Equal(w[i]) {
				t.Errorf("order %d, operator %d: %s, want %s", k, i, cs[k][i], w[i])
			}
		}
	}
}
