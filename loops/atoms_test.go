package loops

import (
	"math"
	"math/big"
	"math/cmplx"
	"testing"

	"loopmatch/expr"
)

// TestEvalLaurent checks the ε bookkeeping of coefficients rational in d times scalar atoms:
// (d − 2)/(2m²)·A0(m) = B0(0; m, m) = 1/ε − ln(m²/μ²) (PHYSICS.md), where the O(ε) part of the
// coefficient multiplies the pole of A0.
func TestEvalLaurent(t *testing.T) {
	m2 := expr.RFVar("m").Mul(expr.RFVar("m"))
	tad, err := Atom(TadName, nil, []expr.RatFunc{m2})
	if err != nil {
		t.Fatal(err)
	}
	c, _ := expr.RFVar("d").Sub(expr.RFInt(2)).Div(m2.Scale(big.NewRat(2, 1)))
	e := tad.Scale(c)
	v, err := EvalLaurent(e, map[string]complex128{"m": 3}, 2)
	if err != nil {
		t.Fatal(err)
	}
	want := -math.Log(9.0 / 2)
	if cmplx.Abs(v.Pole1-1) > 1e-14 || math.Abs(real(v.Finite)-want) > 1e-13 {
		t.Errorf("(d-2)/(2m^2) Tad = %v, want 1/eps %v", v, want)
	}
	// The notation's call B0(p2; m0, m1) and the atom Bub(p2; m0^2, m1^2) agree.
	b1, _ := Atom(BubName, []expr.RatFunc{expr.RFInt(5)}, []expr.RatFunc{expr.RFInt(1), expr.RFInt(4)})
	b2 := expr.FromAtom(expr.NewFnSplit("B0", 1, 1, expr.Int(5), expr.Int(1), expr.Int(2)), 1)
	x1, err1 := EvalLaurent(b1, nil, 2)
	x2, err2 := EvalLaurent(b2, nil, 2)
	ref, _ := B0(5, 1, 4, 2)
	if err1 != nil || err2 != nil || x1 != ref || x2 != ref {
		t.Errorf("Bub %v (%v), B0 %v (%v), direct %v", x1, err1, x2, err2, ref)
	}
	// A product of two divergent integrals needs their O(ε) parts: refused.
	if _, err := EvalLaurent(tad.MustMul(tad), map[string]complex128{"m": 1}, 1); err == nil {
		t.Error("product of two divergent integrals evaluated without their O(eps) parts")
	}
}
