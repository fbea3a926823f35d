package expr

import (
	"math/big"
	"math/rand/v2"
	"testing"
)

// matchingSized returns a numerator and denominator in four variables (d, x, mF, mS) that
// share a nontrivial factor, with degree up to 8 per variable — the size of the rational
// functions that heavy-mass matching produces (partial fractions in masses times polynomials
// in d).
func matchingSized(seed uint64) (Poly, Poly) {
	r := rand.New(rand.NewPCG(seed, 7))
	vars := []string{"d", "mF", "mS", "x"}
	g := randNonzero(r, vars, 4, 2)
	a := randNonzero(r, vars, 6, 3)
	b := randNonzero(r, vars, 6, 3)
	return g.Mul(a).Mul(g), g.Mul(b)
}

// BenchmarkRatFuncNormalize measures bringing num/den to lowest terms (one multivariate GCD
// and two exact divisions).
func BenchmarkRatFuncNormalize(b *testing.B) {
	type pair struct{ n, d Poly }
	var ps []pair
	for s := range uint64(16) {
		n, d := matchingSized(s)
		ps = append(ps, pair{n, d})
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		p := ps[i%len(ps)]
		if _, err := NewRatFunc(p.n, p.d); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkRatFuncMulAdd multiplies and adds rational functions of the same size.
func BenchmarkRatFuncMulAdd(b *testing.B) {
	var fs []RatFunc
	for s := range uint64(16) {
		n, d := matchingSized(s)
		f, _ := NewRatFunc(n, d)
		fs = append(fs, f)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		f, g := fs[i%len(fs)], fs[(i+5)%len(fs)]
		_ = f.Mul(g).Add(g)
	}
}

// BenchmarkSeriesMul multiplies two ε-series to O(ε³) whose coefficients are rational
// functions times logarithms and π², as in one-loop matching.
func BenchmarkSeriesMul(b *testing.B) {
	g, err := ExpGamma(-1, big.NewRat(1, 1), 3)
	if err != nil {
		b.Fatal(err)
	}
	L, _ := Log(Sym("mS"))
	x, _ := RFVar("mF").Div(RFVar("mS").Sub(RFVar("mF")))
	pw, _ := ExpEpsLog(big.NewRat(-2, 1), L, 4)
	s := pw.Scale(x)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := g.Mul(s); err != nil {
			b.Fatal(err)
		}
	}
}
