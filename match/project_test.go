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
