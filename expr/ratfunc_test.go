package expr

import (
	"math/big"
	"math/rand/v2"
	"testing"
)

// randPoly returns a random polynomial in vars with at most n terms, per-variable degree ≤ deg
// and small integer (occasionally fractional) coefficients.
func randPoly(r *rand.Rand, vars []string, n, deg int) Poly {
	var ts []PolyTerm
	for range n {
		var m Mono
		for _, v := range vars {
			if e := r.IntN(deg + 1); e > 0 {
				m = append(m, VarPow{v, e})
			}
		}
		c := big.NewRat(int64(r.IntN(19)-9), int64(1+r.IntN(2)))
		ts = append(ts, PolyTerm{Mono: m, Coef: c})
	}
	return fromTerms(ts)
}

func randNonzero(r *rand.Rand, vars []string, n, deg int) Poly {
	for {
		p := randPoly(r, vars, n, deg)
		if !p.IsZero() {
			return p
		}
	}
}

func randRF(r *rand.Rand, vars []string) RatFunc {
	num := randPoly(r, vars, 3, 2)
	den := randNonzero(r, vars, 2, 2)
	f, err := NewRatFunc(num, den)
	if err != nil {
		panic(err)
	}
	return f
}

func TestPolyBasics(t *testing.T) {
	x, y := PolyVar("x"), PolyVar("y")
	cases := []struct {
		got  Poly
		want string
	}{
		{x.Add(PolyInt(1)).Mul(x.Sub(PolyInt(1))), "x^2 - 1"},
		{x.Add(y).Pow(2), "x^2 + 2*x*y + y^2"},
		{x.Add(y).Pow(3).Sub(x.Pow(3)), "3*x^2*y + 3*x*y^2 + y^3"},
		{x.Pow(2).Scale(big.NewRat(1, 2)).Add(PolyConst(big.NewRat(-1, 3))), "x^2/2 - 1/3"},
		{x.Pow(3).Mul(y).Derivative("x"), "3*x^2*y"},
		{x.Pow(2).Add(y).Subst("x", y.Add(PolyInt(1))), "y^2 + 3*y + 1"},
		{PolyInt(0), "0"},
	}
	for _, c := range cases {
		if s := c.got.String(); s != c.want {
			t.Errorf("got %q, want %q", s, c.want)
		}
	}
}

func TestRatFuncSimplify(t *testing.T) {
	x, a, b := PolyVar("x"), PolyVar("a"), PolyVar("b")
	cases := []struct {
		num, den Poly
		want     string
	}{
		// The examples of the project's issue 2.
		{x.Pow(2).Sub(PolyInt(1)), x.Sub(PolyInt(1)), "x + 1"},
		{a.Pow(3).Sub(b.Pow(3)), a.Pow(2).Sub(b.Pow(2)), "(a^2 + a*b + b^2)/(a + b)"},
		{PolyInt(2), PolyInt(4), "1/2"},
		{x, x.Scale(big.NewRat(-2, 1)), "-1/2"},
		{a.Mul(b).Mul(x), a.Pow(2).Mul(x).Scale(big.NewRat(3, 1)), "b/(3*a)"},
		{PolyInt(1), x.Neg().Add(PolyInt(1)), "-1/(x - 1)"},
	}
	for _, c := range cases {
		f, err := NewRatFunc(c.num, c.den)
		if err != nil {
			t.Fatal(err)
		}
		if s := f.String(); s != c.want {
			t.Errorf("(%v)/(%v) = %q, want %q", c.num, c.den, s, c.want)
		}
	}
	if _, err := NewRatFunc(x, Poly{}); err == nil {
		t.Error("division by zero polynomial accepted")
	}
}

// TestGCDKnownFactors builds random products g·u and g·v of known factors and checks that the
// GCD is a multiple of g that divides both, and that dividing by it leaves coprime cofactors.
func TestGCDKnownFactors(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	vars := []string{"d", "m", "x", "y"}
	for i := range 300 {
		nv := 1 + i%4
		vs := vars[:nv]
		g := randNonzero(r, vs, 3, 2)
		u := randNonzero(r, vs, 3, 2)
		v := randNonzero(r, vs, 3, 2)
		A, B := g.Mul(u), g.Mul(v)
		h := GCD(A, B)
		if _, ok := h.DivExact(g); !ok && !g.IsConst() {
			t.Fatalf("gcd(%v, %v) = %v is not a multiple of %v", A, B, h, g)
		}
		qa, ok1 := A.DivExact(h)
		qb, ok2 := B.DivExact(h)
		if !ok1 || !ok2 {
			t.Fatalf("gcd %v does not divide %v and %v", h, A, B)
		}
		// Multiply back.
		if !qa.Mul(h).Equal(A) || !qb.Mul(h).Equal(B) {
			t.Fatalf("cofactors do not multiply back")
		}
		if c := GCD(qa, qb); !c.IsOne() {
			t.Fatalf("cofactors %v, %v not coprime: gcd %v", qa, qb, c)
		}
	}
}

// TestGCDPathsAgree compares the heuristic GCD with the primitive PRS on the same inputs.
func TestGCDPathsAgree(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	vars := []string{"a", "b", "c"}
	for range 100 {
		g := randNonzero(r, vars, 3, 2)
		A := g.Mul(randNonzero(r, vars, 3, 2))
		B := g.Mul(randNonzero(r, vars, 3, 2))
		_, A = A.PrimitiveZ()
		_, B = B.PrimitiveZ()
		if A.IsConst() || B.IsConst() {
			continue
		}
		_, p := prsGCD(A, B).PrimitiveZ()
		h, ok := heuGCD(A, B)
		if !ok {
			continue
		}
		_, h = h.PrimitiveZ()
		if !h.Equal(p) {
			t.Fatalf("heuristic %v != prs %v for %v, %v", h, p, A, B)
		}
	}
}

// TestFieldAxioms checks the field axioms on random rational functions.
func TestFieldAxioms(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	vars := []string{"x", "y", "z"}
	one := RFInt(1)
	for range 150 {
		a, b, c := randRF(r, vars), randRF(r, vars), randRF(r, vars)
		eq := func(name string, p, q RatFunc) {
			t.Helper()
			if !p.Equal(q) {
				t.Fatalf("%s fails: %v != %v (a=%v b=%v c=%v)", name, p, q, a, b, c)
			}
		}
		eq("a+b=b+a", a.Add(b), b.Add(a))
		eq("ab=ba", a.Mul(b), b.Mul(a))
		eq("(a+b)+c", a.Add(b).Add(c), a.Add(b.Add(c)))
		eq("(ab)c", a.Mul(b).Mul(c), a.Mul(b.Mul(c)))
		eq("a(b+c)", a.Mul(b.Add(c)), a.Mul(b).Add(a.Mul(c)))
		eq("a-a", a.Sub(a), RFInt(0))
		eq("a·1", a.Mul(one), a)
		if !a.IsZero() {
			inv, err := a.Inv()
			if err != nil {
				t.Fatal(err)
			}
			eq("a/a", a.Mul(inv), one)
			q, _ := b.Div(a)
			eq("(b/a)a", q.Mul(a), b)
		}
		// The canonical form is unique: the same function built two ways prints the same.
		if s1, s2 := a.Add(b).Mul(c).String(), c.Mul(b).Add(a.Mul(c)).String(); s1 != s2 {
			t.Fatalf("canonical forms differ: %q vs %q", s1, s2)
		}
	}
}

func TestRatFuncDerivSubst(t *testing.T) {
	x := RFVar("x")
	f, _ := RFInt(1).Div(x.Add(RFInt(1))) // 1/(x+1)
	d := f.Derivative("x")
	if got := d.String(); got != "-1/(x^2 + 2*x + 1)" {
		t.Errorf("d/dx 1/(x+1) = %s", got)
	}
	g, err := f.Subst("x", RFVar("y").Mul(RFVar("y")))
	if err != nil || g.String() != "1/(y^2 + 1)" {
		t.Errorf("subst: %v %v", g, err)
	}
	h, _ := RFInt(1).Div(RFVar("y"))
	k, err := x.Mul(x).Add(RFInt(1)).Subst("x", h) // (1/y)^2 + 1 = (1 + y^2)/y^2
	if err != nil || k.String() != "(y^2 + 1)/y^2" {
		t.Errorf("subst rational: %v %v", k, err)
	}
	if _, err := f.Subst("x", RFInt(-1)); err == nil {
		t.Error("substitution making the denominator zero accepted")
	}
}

// TestMonoCmpProd checks the allocation-free comparison against building the product.
func TestMonoCmpProd(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 9))
	vars := []string{"a", "b", "c", "d"}
	rm := func() Mono {
		var m Mono
		for _, v := range vars {
			if e := r.IntN(3); e > 0 {
				m = append(m, VarPow{v, e})
			}
		}
		return m
	}
	for range 5000 {
		a, b, m := rm(), rm(), rm()
		if got, want := monoCmpProd(a, b, m, m.Degree()), monoCmp(a, monoMul(b, m)); got != want {
			t.Fatalf("monoCmpProd(%v, %v, %v) = %d, want %d", a, b, m, got, want)
		}
	}
}
