package dirac

import (
	"testing"

	"loopmatch/expr"
)

// TestEvalTraces checks tr(γ^μ γ_μ) = 4d and tr(p̸ q̸) = 4 p·q (M.E. Peskin, D.V. Schroeder,
// An Introduction to Quantum Field Theory, eqs. A.27, A.53) through trace atoms.
func TestEvalTraces(t *testing.T) {
	g := func(i string) expr.NC { return expr.NC{Op: expr.NCGamma, Args: []string{i}} }
	sl := func(p string) expr.NC { return expr.NC{Op: expr.NCSlash, Args: []string{p}} }
	cases := []struct {
		e    expr.Expr
		want string
	}{
		{expr.FromAtom(expr.NewTrace([]expr.NC{g("mu"), g("mu")}), 1), "4*d"},
		{expr.FromAtom(expr.NewTrace([]expr.NC{sl("p"), sl("q")}), 1).Scale(expr.RFVar("x")), "4*x*p.q"},
		{expr.FromAtom(expr.NewTrace(nil), 1), "4"},
	}
	for _, c := range cases {
		got, err := EvalTraces(c.e, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if got.String() != c.want {
			t.Errorf("%s = %s, want %s", c.e, got, c.want)
		}
	}
}
