package dirac

import (
	"fmt"
	"math/big"
	"math/rand/v2"
	"strings"
	"testing"

	"loopmatch/expr"
)

// sn builds the product γ^{μ1}…γ^{μn} X ⊗ (same or reversed) Y between the spectator legs.
func sn(n int, x, y string, reversed bool) expr.Expr {
	idx := []string{"i1", "i2", "i3", "i4", "i5"}[:n]
	var a, b []string
	for _, i := range idx {
		a = append(a, "g:"+i)
	}
	for k := range idx {
		j := k
		if reversed {
			j = n - 1 - k
		}
		b = append(b, "g:"+idx[j])
	}
	return mul(ch("ubar:a "+strings.Join(a, " ")+" "+x+" u:b"), ch("ubar:c "+strings.Join(b, " ")+" "+y+" u:e"))
}

// Four-fermion reduction. The four-dimensional images are checked numerically for every
// structure up to five contracted pairs, both chiralities and both orders (the evanescent
// remainder vanishes in four dimensions, so the unreduced product evaluated with explicit
// matrices must equal the reduced result at d = 4). The d-dimensional coefficients of the
// default definition are checked exactly: γ^μγ^νγ^ρPL⊗γ_μγ_νγ_ρPL = (16 − 4ε)γ^μPL⊗γ_μPL
// (A.J. Buras, P.H. Weisz, Nucl. Phys. B333 (1990) 66, from memory), and the 4-dimensional
// values 16, 4 of the same- and reversed-order products (e.g. A.J. Buras, hep-ph/9806471,
// common practice).
func TestFourFermion(t *testing.T) {
	rng := rand.New(rand.NewPCG(31, 32))
	kin, mom, vals := spectators(rng, "a", "b", "c", "e")
	p := newPoint(rng, kin, mom, vals)
	for n := 2; n <= 5; n++ {
		for _, xy := range [][2]string{{"PL", "PL"}, {"PL", "PR"}, {"PR", "PL"}, {"G5", "PL"}, {"", "PR"}} {
			for _, rev := range []bool{false, true} {
				name := fmt.Sprintf("S%d %s⊗%s reversed=%v", n, xy[0], xy[1], rev)
				t.Run(name, func(t *testing.T) {
					in := sn(n, xy[0], xy[1], rev)
					out, rep := mustSimplify(t, in, Kinematics{}, Options{})
					for _, e := range rep.Evanescent {
						if !strings.HasPrefix(e.Name, "E") || e.Def.IsZero() {
							t.Fatalf("bad evanescent entry %+v", e)
						}
					}
					// physical part only: at most S2 on each chain
					if strings.Contains(out.String(), "gamma(i3)") || strings.Count(out.String(), "gamma(") > 0 && n >= 3 && strings.Contains(out.String(), "gamma(i1) gamma(i2) gamma") {
						t.Fatalf("not reduced: %s", out)
					}
					p.compareNum(t, name, in, out, nil, nil)
					// the kept d-dimensional form equals the reduced one plus the remainder
					keep, _ := mustSimplify(t, in, Kinematics{}, Options{KeepD: true})
					sum := out
					for _, e := range rep.Evanescent {
						sum = sum.Add(e.Coef.MustMul(e.Def))
					}
					sum, _ = mustSimplify(t, sum, Kinematics{}, Options{KeepD: true})
					if !sum.Equal(keep) {
						t.Fatalf("reduced + evanescent ≠ d-dimensional form:\n  %s\n  %s", sum, keep)
					}
				})
			}
		}
	}
	d := sym("d")
	eps := num(2).Sub(mul(frac(1, 2), d))
	s1 := func(x, y string) expr.Expr { return sn(1, x, y, false) }
	exact := []struct {
		name string
		in   expr.Expr
		opt  Options
		want expr.Expr
	}{
		{"S3 LL = (16 − 4ε) S1 LL (Buras–Weisz)", sn(3, "PL", "PL", false), Options{}, mul(num(16).Sub(mul(num(4), eps)), s1("PL", "PL"))},
		{"S3 LR = (4 − 8ε) S1 LR", sn(3, "PL", "PR", false), Options{}, mul(num(4).Sub(mul(num(8), eps)), s1("PL", "PR"))},
		{"S3 LL reversed = (4 − 8ε) S1 LL", sn(3, "PL", "PL", true), Options{}, mul(num(4).Sub(mul(num(8), eps)), s1("PL", "PL"))},
		{"S3 LR reversed = (16 − 4ε) S1 LR", sn(3, "PL", "PR", true), Options{}, mul(num(16).Sub(mul(num(4), eps)), s1("PL", "PR"))},
		{"S3 LL with a = 6 (b3 = 0)", sn(3, "PL", "PL", false), Options{Evanescent: Evanescent{Same3: big.NewRat(0, 1)}}, mul(num(16).Sub(mul(num(6), eps)), s1("PL", "PL"))},
		{"S2 LR = d PL⊗PR", sn(2, "PL", "PR", false), Options{}, mul(d, ch("ubar:a PL u:b"), ch("ubar:c PR u:e"))},
	}
	for _, tc := range exact {
		got, _ := mustSimplify(t, tc.in, Kinematics{}, tc.opt)
		want, _ := mustSimplify(t, tc.want, Kinematics{}, Options{KeepD: true})
		if !got.Equal(want) {
			t.Errorf("%s: got %s, want %s", tc.name, got, want)
		}
	}
	// KeepD keeps the structure and reports nothing
	got, rep := mustSimplify(t, sn(3, "PL", "PL", false), Kinematics{}, Options{KeepD: true})
	if len(rep.Evanescent) != 0 || !strings.Contains(got.String(), "gamma(i3)") {
		t.Errorf("KeepD: %s, %v", got, rep.Evanescent)
	}
	// colour rides along with the Dirac reduction
	col := mul(ch("ubar:a T:x g:i1 g:i2 g:i3 PL u:b"), ch("ubar:c T:x g:i1 g:i2 g:i3 PL u:e"))
	got, _ = mustSimplify(t, col, Kinematics{}, Options{})
	want, _ := mustSimplify(t, mul(num(16).Sub(mul(num(4), eps)), ch("ubar:a T:x g:i1 PL u:b"), ch("ubar:c T:x g:i1 PL u:e")), Kinematics{}, Options{KeepD: true})
	if !got.Equal(want) {
		t.Errorf("with colour: %s, want %s", got, want)
	}
}
