package match

import (
	"fmt"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/loops/vacuum"
	"loopmatch/passarino"
)

// PoleResidues returns the matrix b of the ultraviolet poles of one-loop matrix elements:
// insertion i (the one-loop amplitude with operator ops[i] inserted through the vertex i·Q_i, its
// coupling stripped, loop factor i/(16π²) included by the notation) has the UV pole
// (1/(16π²))(1/ε) Σ_j b_ij · i⟨Q_j⟩. Tree-level terms of the insertions (counterterms such as
// field renormalisation written with 1/(d − 4)) contribute their poles. Structures outside the
// span of the operators give a *ProjectionError.
func PoleResidues(p *notation.Program, insertions []expr.Expr, ops []string) ([][]expr.Expr, error) {
	c, err := NewCanon(p, passarino.Small{}, false, Options{})
	if err != nil {
		return nil, err
	}
	basis := make([]expr.Expr, len(ops))
	for j, name := range ops {
		op := operatorByName(p, name)
		if op == nil {
			return nil, fmt.Errorf("no operator %s", name)
		}
		me, err := p.MatrixElement(op)
		if err != nil {
			return nil, err
		}
		if me, err = c.Apply(me); err != nil {
			return nil, err
		}
		basis[j] = me.MustMul(expr.FromAtom(expr.I, 1))
	}
	loopFactor := expr.FromAtom(expr.Pi, 2).Scale(expr.RFInt(16)) // 16π²
	b := make([][]expr.Expr, len(insertions))
	for i, a := range insertions {
		uv, err := passarino.UVPole(a, massSymbols(p), nil)
		if err != nil {
			return nil, err
		}
		var tree expr.Expr
		for _, t := range a.Terms() {
			if len(t.Loops) == 0 {
				tree = tree.Add(expr.FromTerm(t))
			}
		}
		ts, err := vacuum.ExpandEps(tree, 1, p.Positive)
		if err != nil {
			return nil, err
		}
		pole := uv.Add(ts.Coef(-1))
		if pole, err = c.Apply(pole); err != nil {
			return nil, err
		}
		if pole, err = pole.Subst(expr.DimSymbol, expr.RFInt(4)); err != nil {
			return nil, err
		}
		row, err := Project(pole.MustMul(loopFactor), basis)
		if err != nil {
			return nil, fmt.Errorf("insertion of %s: %w", ops[i], err)
		}
		b[i] = row
	}
	return b, nil
}

// AnomalousDimension returns γ^{(0)} in the convention μ dC/dμ = γ^T C, γ = a γ^{(0)} + …, with a
// the stripped coupling over 16π² (a = α_s/4π for QCD): renormalising Q_i = Z_ij Q_j^ren with
// Z = 1 + a b/ε makes the matrix elements finite, and μ da/dμ = −2ε a + O(a²) gives
// γ = Z^{-1} μ dZ/dμ = −2 a b.
func AnomalousDimension(p *notation.Program, insertions []expr.Expr, ops []string) ([][]expr.Expr, error) {
	b, err := PoleResidues(p, insertions, ops)
	if err != nil {
		return nil, err
	}
	for i := range b {
		for j := range b[i] {
			b[i][j] = b[i][j].Scale(expr.RFInt(-2))
		}
	}
	return b, nil
}
