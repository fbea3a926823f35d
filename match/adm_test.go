package match

import (
	"testing"

	"loopmatch/expr"
	"loopmatch/expr/notation"
)

// TestCurrentCurrentADM derives the one-loop anomalous dimensions of Q1, Q2 from the UV poles of
// their one-loop matrix elements (gluon exchange between the four legs and quark field
// renormalisation) and compares with A.J. Buras, hep-ph/9806471 (the current-current section):
// γ^{(0)} = [[−6/N, 6], [6, −6/N]], eigenvalues 6 − 6/N and −6 − 6/N (+4 and −8 for N = 3,
// PHYSICS.md).
func TestCurrentCurrentADM(t *testing.T) {
	p, err := notation.ParseFile("../testdata/sm/current_current.lm")
	if err != nil {
		t.Fatal(err)
	}
	a1, _ := p.Amplitude("Q1_loop")
	a2, _ := p.Amplitude("Q2_loop")
	g, err := AnomalousDimension(p, []expr.Expr{a1.Body, a2.Body}, []string{"Q1", "Q2"})
	if err != nil {
		t.Fatal(err)
	}
	want := [][]string{{"-6/Nc", "6"}, {"6", "-6/Nc"}}
	for i := range want {
		for j := range want[i] {
			w, _ := notation.ParseFreeExpr(want[i][j])
			if !g[i][j].Equal(w) {
				t.Errorf("gamma(0)[%d][%d] = %s, want %s", i, j, g[i][j], w)
			}
		}
	}
}

// TestDipoleADM derives γ77 from the UV poles of the one-loop matrix element of Q7 (gluon
// exchange between the quark legs, quark field and b-mass renormalisation) and compares with
// γ77 = 8 C_F (A.J. Buras, hep-ph/9806471; PHYSICS.md).
func TestDipoleADM(t *testing.T) {
	p, err := notation.ParseFile("../testdata/sm/dipole77.lm")
	if err != nil {
		t.Fatal(err)
	}
	a, _ := p.Amplitude("Q7_loop")
	g, err := AnomalousDimension(p, []expr.Expr{a.Body}, []string{"Q7"})
	if err != nil {
		t.Fatal(err)
	}
	w, _ := notation.ParseFreeExpr("8*(Nc^2 - 1)/(2*Nc)")
	if !g[0][0].Equal(w) {
		t.Errorf("gamma77 = %s, want %s", g[0][0], w)
	}
}

// TestChromoDipoleADM derives γ88 from the UV poles of the one-loop matrix element of Q8 in a
// general covariant gauge (eight 1PI diagrams: gluon exchange, the external gluon from an internal
// quark, triple-gluon vertices, the operator's two-gluon vertex, and the gluon bubble on it; field,
// mass and coupling renormalisation) and compares with γ88 = 16 C_F − 4N (A.J. Buras,
// hep-ph/9806471; PHYSICS.md). The gauge parameter must drop out; without the bubble diagram it
// does not, which shows that the check can fail.
func TestChromoDipoleADM(t *testing.T) {
	p, err := notation.ParseFile("../testdata/sm/dipole88.lm")
	if err != nil {
		t.Fatal(err)
	}
	gamma := func(name string) expr.Expr {
		a, _ := p.Amplitude(name)
		g, err := AnomalousDimension(p, []expr.Expr{a.Body}, []string{"Q8"})
		if err != nil {
			t.Fatal(err)
		}
		return g[0][0]
	}
	w, _ := notation.ParseFreeExpr("16*(Nc^2 - 1)/(2*Nc) - 4*Nc")
	if got := gamma("Q8_loop"); !got.Equal(w) {
		t.Errorf("gamma88 = %s, want %s", got, w)
	}
	partial := gamma("Q8_diagrams")
	dxi, err := partial.Derivative("xi")
	if err != nil {
		t.Fatal(err)
	}
	if dxi.IsZero() {
		t.Errorf("without the gluon bubble gamma88 = %s does not depend on xi; the gauge check is blind", partial)
	}
}
