package expr

import (
	"math/big"
	"math/rand/v2"
	"testing"
)

// randExpr builds a random sum of rational functions times atoms (logs, π, a propagator, a
// dot product).
func randExpr(r *rand.Rand) Expr {
	vars := []string{"x", "y"}
	lx, _ := Log(Sym("x"))
	atoms := []Expr{Int(1), lx, FromAtom(Pi, 2), FromAtom(NewDot("p", "q"), 1),
		FromAtom(NewProp(MomOf("k"), RFVar("x")), -1), FromAtom(I, 1)}
	res := Expr{}
	for range 1 + r.IntN(3) {
		c := FromRF(randRF(r, vars))
		res = res.Add(c.MustMul(atoms[r.IntN(len(atoms))]))
	}
	return res
}

// TestExprRingAxioms checks the ring axioms for sums of terms with atoms.
func TestExprRingAxioms(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 12))
	for range 60 {
		a, b, c := randExpr(r), randExpr(r), randExpr(r)
		eq := func(name string, p, q Expr) {
			t.Helper()
			if !p.Equal(q) {
				t.Fatalf("%s: %v != %v", name, p, q)
			}
		}
		eq("a+b", a.Add(b), b.Add(a))
		eq("ab", a.MustMul(b), b.MustMul(a))
		eq("(ab)c", a.MustMul(b).MustMul(c), a.MustMul(b.MustMul(c)))
		eq("a(b+c)", a.MustMul(b.Add(c)), a.MustMul(b).Add(a.MustMul(c)))
		eq("a-a", a.Sub(a), Zero())
		eq("sum", Sum(a, b, c), a.Add(b).Add(c))
	}
}

func TestDerivative(t *testing.T) {
	x := Sym("x")
	lx, _ := Log(x)
	li, _ := Apply(FnLi2, 1, x)
	sq, _ := Apply(FnSqrt, 1, x)
	cases := []struct {
		f    Expr
		want string
	}{
		{lx.MustMul(x), "1 + log(x)"},                                    // d(x log x) = log x + 1
		{li, "-1/x*log(-x + 1 - i0)"},                                    // d Li2(x + i0) = −log(1 − x − i0)/x
		{sq, "1/(2*x)*sqrt(x)"},                                          // d sqrt(x) = 1/(2 sqrt x) = sqrt(x)/(2x)
		{FromAtom(NewProp(MomOf("k"), RFVar("x")), -2), "2/(k^2 - x)^3"}, // ∂/∂M² (k² − M²)^{−2}
	}
	for _, c := range cases {
		d, err := c.f.Derivative("x")
		if err != nil {
			t.Fatal(err)
		}
		if got := d.String(); got != c.want {
			t.Errorf("d/dx %v = %s, want %s", c.f, got, c.want)
		}
	}
}

func TestLogSplit(t *testing.T) {
	pos := func(s string) bool { return s == "m" || s == "M" || s == "mu" }
	arg, _ := RFVar("m").Mul(RFVar("m")).Div(RFVar("mu").Mul(RFVar("mu")).Scale(big.NewRat(4, 1)))
	e, err := LogSplit(FromRF(arg), 1, pos) // log(m²/(4 μ²)) = 2 log m − 2 log μ − 2 log 2
	if err != nil {
		t.Fatal(err)
	}
	if got, want := e.String(), "-2*log(2) + 2*log(m) - 2*log(mu)"; got != want {
		t.Errorf("log(m^2/(4 mu^2)) = %s, want %s", got, want)
	}
	// log(−M² + x) with x of unknown sign keeps the difference; log(−M²) = 2 log M + iπ.
	neg, _ := LogSplit(FromRF(RFVar("M").Mul(RFVar("M")).Neg()), 1, pos)
	if got, want := neg.String(), "I*pi + 2*log(M)"; got != want {
		t.Errorf("log(-M^2) = %s, want %s", got, want)
	}
	// Values agree numerically where both sides are defined.
	vals := map[string]complex128{"m": 3, "mu": 1.5}
	a, _ := e.Eval(vals)
	b, _ := FromAtom(NewFn(FnLog, 1, FromRF(arg)), 1).Eval(vals)
	if d := a - b; real(d)*real(d)+imag(d)*imag(d) > 1e-28 {
		t.Errorf("split log differs numerically: %v vs %v", a, b)
	}
}
