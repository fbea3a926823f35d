package expr

import (
	"math"
	"math/big"
	"math/cmplx"
	"testing"

	"loopmatch/expr/specfun"
)

// TestEvalKnownValues evaluates exact expressions with known values in float64 and at 50
// digits: Li2(1) = π²/6, Li2(1/2) = π²/12 − ln²2/2 (L. Lewin, Polylogarithms and Associated
// Functions, 1981, eq. 1.16), Cl2(π/3) = 1.0149416064096536250… (PHYSICS.md, mpmath).
func TestEvalKnownValues(t *testing.T) {
	li2 := func(x int64, y int64) Expr {
		e, err := Apply(FnLi2, 1, Num(big.NewRat(x, y)))
		if err != nil {
			t.Fatal(err)
		}
		return e
	}
	// Li2(1/2) built from the atom directly (Apply already knows the value): the sum below
	// must vanish.
	atomHalf := FromAtom(NewFn(FnLi2, 1, Num(big.NewRat(1, 2))), 1)
	diff := atomHalf.Sub(li2(1, 2))
	if v, err := diff.Eval(nil); err != nil || cmplx.Abs(v) > 1e-15 {
		t.Errorf("Li2(1/2) atom minus closed form = %v (%v)", v, err)
	}
	big50 := uint(170)
	if v, err := diff.EvalBig(nil, big50); err != nil || v.Abs().Cmp(big.NewFloat(1e-49)) > 0 {
		t.Errorf("Li2(1/2) at 50 digits: %v (%v)", v.Text(20), err)
	}
	one := FromAtom(NewFn(FnLi2, 1, Int(1)), 1).Sub(li2(1, 1))
	if v, _ := one.Eval(nil); cmplx.Abs(v) > 1e-15 {
		t.Errorf("Li2(1) - pi^2/6 = %v", v)
	}
	third, _ := RFInt(1).Div(RFInt(3))
	cl := FromAtom(NewFn(FnCl2, 1, FromAtom(Pi, 1).Scale(third)), 1)
	v, err := cl.Eval(nil)
	if err != nil || math.Abs(real(v)-1.0149416064096536250) > 1e-15 {
		t.Errorf("Cl2(pi/3) = %v (%v)", v, err)
	}
	vb, err := cl.EvalBig(nil, big50)
	// 50 digits of Cl2(π/3): the first 20 from PHYSICS.md (mpmath), the rest from memory.
	ref, _ := new(big.Float).SetPrec(big50).SetString("1.01494160640965362502120255427452028594168930753029")
	if err != nil || new(big.Float).Sub(vb.Re, ref).Abs(new(big.Float).Sub(vb.Re, ref)).Cmp(big.NewFloat(1e-48)) > 0 {
		t.Errorf("Cl2(pi/3) at 50 digits = %s (%v)", vb.Text(50), err)
	}
}

func TestEvalLogI0(t *testing.T) {
	x := Sym("x")
	lp, _ := Apply(FnLog, 1, x)
	lm, _ := Apply(FnLog, -1, x)
	vals := map[string]complex128{"x": -2}
	a, _ := lp.Eval(vals)
	b, _ := lm.Eval(vals)
	if math.Abs(imag(a)-math.Pi) > 1e-15 || math.Abs(imag(b)+math.Pi) > 1e-15 || math.Abs(real(a)-math.Log(2)) > 1e-15 {
		t.Errorf("log(-2 ± i0) = %v, %v", a, b)
	}
	ab, _ := lm.EvalBig(map[string]specfun.Complex{"x": specfun.NewComplex(-2, 0, 100)}, 100)
	if f, _ := ab.Im.Float64(); math.Abs(f+math.Pi) > 1e-15 {
		t.Errorf("big log(-2 - i0) = %v", ab.Text(20))
	}
	// conj(y) takes the conjugate of y's value.
	y := Sym("y").MustMul(Sym("conj(y)"))
	if v, _ := y.Eval(map[string]complex128{"y": 3 + 4i}); v != 25 {
		t.Errorf("y conj(y) = %v", v)
	}
}
