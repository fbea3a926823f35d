package expr

import (
	"math/rand/v2"
	"testing"
)

func TestSquareFree(t *testing.T) {
	x, y := PolyVar("x"), PolyVar("y")
	one := PolyInt(1)
	cases := []struct {
		p    Poly
		want string
	}{
		{x.Sub(one).Pow(3), "(x - 1)^3"},
		{x.Sub(one).Pow(2).Mul(x.Add(one)).Scale(ratOne).Mul(PolyInt(4)), "4*(x + 1)*(x - 1)^2"},
		{x.Pow(2).Mul(y).Mul(x.Sub(y).Pow(4)), "x^2*y*(x - y)^4"},
		{x.Sub(y).Pow(2).Mul(x.Add(y)), "(x + y)*(x - y)^2"},
	}
	for _, c := range cases {
		if got := RF(c.p).Pretty(); got != c.want {
			t.Errorf("Pretty(%v) = %s, want %s", c.p, got, c.want)
		}
	}
	// Property: the product of the factors is the polynomial, the factors are square-free.
	r := rand.New(rand.NewPCG(8, 8))
	vars := []string{"a", "b"}
	for range 40 {
		f := randNonzero(r, vars, 3, 1)
		g := randNonzero(r, vars, 2, 1)
		p := f.Mul(g).Mul(g).Mul(f.Pow(2))
		c, fs := SquareFree(p)
		prod := PolyConst(c)
		for _, fp := range fs {
			prod = prod.Mul(fp.P.Pow(fp.Pow))
			if d := GCD(fp.P, fp.P.Derivative(fp.P.Vars()[0])); !d.IsConst() && len(fp.P.Vars()) == 1 {
				t.Errorf("factor %v is not square-free", fp.P)
			}
		}
		if !prod.Equal(p) {
			t.Fatalf("factors of %v multiply to %v", p, prod)
		}
	}
}
