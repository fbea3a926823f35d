package passarino

import (
	"math/big"
	"testing"

	"loopmatch/expr"
	"loopmatch/loops/vacuum"
)

// TestPairingTensors checks the two-loop tensor reduction on contractions that fix the answer:
// k^μ l^ν → g^{μν} k·l/d, and the rank-4 k^μ k^ν l^ρ l^σ contracted back with g_μν g_ρσ gives
// k² l², contracted with g_μρ g_νσ gives (k·l)² (symmetric integration, exact in d).
func TestPairingTensors(t *testing.T) {
	src := `masses M m
index al be ga de
amplitude t2 = loop k, l { k[al]*l[be] / ((k^2 - M^2)*(l^2 - m^2)*((k + l)^2 - M^2)) }
amplitude t4 = loop k, l { k[al]*k[be]*l[ga]*l[de] / ((k^2 - M^2)*(l^2 - m^2)*((k + l)^2 - M^2)) }
amplitude s4a = loop k, l { k^2*l^2 / ((k^2 - M^2)*(l^2 - m^2)*((k + l)^2 - M^2)) }
amplitude s4b = loop k, l { k.l^2 / ((k^2 - M^2)*(l^2 - m^2)*((k + l)^2 - M^2)) }
amplitude s2 = loop k, l { k.l / ((k^2 - M^2)*(l^2 - m^2)*((k + l)^2 - M^2)) }
`
	red := func(name string) expr.Expr {
		r, _, err := ReduceVacuum(amp(t, src, name))
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	// Reduce the open rank-4 tensor, then contract: it must equal the reduction of the scalar
	// integral with the contracted numerator.
	open4 := red("t4")
	for _, c := range []struct {
		g    [2][2]string
		want string
	}{{[2][2]string{{"al", "be"}, {"ga", "de"}}, "s4a"}, {[2][2]string{{"al", "ga"}, {"be", "de"}}, "s4b"}} {
		g := expr.FromAtom(expr.NewMetric(c.g[0][0], c.g[0][1]), 1).MustMul(expr.FromAtom(expr.NewMetric(c.g[1][0], c.g[1][1]), 1))
		if a, b := open4.MustMul(g), red(c.want); !a.Equal(b) {
			t.Errorf("contracted rank-4 tensor != %s:\n%s\n%s", c.want, a, b)
		}
	}
	// k^al l^be → g(al,be) (k·l)/d
	t2 := red("t2")
	s2 := red("s2")
	want := s2.MustMul(expr.FromAtom(expr.NewMetric("al", "be"), 1))
	inv, _ := expr.RFVar("d").Inv()
	if !t2.Equal(want.Scale(inv)) {
		t.Errorf("k[al] l[be] = %s\nwant g(al,be)/d × %s", t2, s2)
	}
	// The sunset with unit powers is the master itself, times the two-loop factor (i/16π²)².
	sun := red2(t, "masses M m\namplitude s = loop k, l { 1/((k^2 - M^2)*(l^2 - m^2)*((k + l)^2 - M^2)) }\n")
	m2 := expr.RFVar("M").Mul(expr.RFVar("M"))
	if !sun.Equal(vacuum.Sun(m2, expr.RFVar("m").Mul(expr.RFVar("m")), m2).MustMul(expr.FromAtom(expr.Pi, -4)).Scale(expr.RFRat(big.NewRat(-1, 256)))) {
		t.Errorf("sunset = %s", sun)
	}
}

func red2(t *testing.T, src string) expr.Expr {
	r, _, err := ReduceVacuum(amp(t, src, "s"))
	if err != nil {
		t.Fatal(err)
	}
	return r
}
