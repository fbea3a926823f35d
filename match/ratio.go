package match

import (
	"math/big"

	"loopmatch/expr"
	"loopmatch/expr/notation"
)

// rewriteSquares writes every even power M1^{2k} of p as (x·M2²)^k (one factor M1 stays with an
// odd power).
func rewriteSquares(p expr.Poly, r notation.Ratio) expr.Poly {
	out := expr.Poly{}
	x2 := expr.PolyVar(r.Name).Mul(expr.PolyVar(r.Den).Pow(2))
	for _, t := range p.Terms() {
		e := t.Mono.Exp(r.Num)
		var rest expr.Mono
		for _, vp := range t.Mono {
			if vp.Var != r.Num {
				rest = append(rest, vp)
			}
		}
		term := expr.PolyMono(t.Coef, rest).Mul(x2.Pow(e / 2))
		if e%2 == 1 {
			term = term.Mul(expr.PolyVar(r.Num))
		}
		out = out.Add(term)
	}
	return out
}

// applyRatio rewrites e with M1² = x·M2² and log(M1) = log(x)/2 + log(M2).
func applyRatio(e expr.Expr, r notation.Ratio) (expr.Expr, error) {
	e, err := e.MapCoef(func(c expr.RatFunc) (expr.RatFunc, error) {
		return expr.NewRatFunc(rewriteSquares(c.Num(), r), rewriteSquares(c.Den(), r))
	})
	if err != nil {
		return expr.Expr{}, err
	}
	lx := expr.FromAtom(expr.NewFn(expr.FnLog, 1, expr.Sym(r.Name)), 1).Scale(expr.RFRat(big.NewRat(1, 2)))
	lm := expr.FromAtom(expr.NewFn(expr.FnLog, 1, expr.Sym(r.Den)), 1)
	return e.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
		f, ok := a.(expr.Fn)
		if !ok || f.Name != expr.FnLog || len(f.Args) != 1 || !f.Args[0].Equal(expr.Sym(r.Num)) {
			return expr.Expr{}, false
		}
		return lx.Add(lm), true
	})
}
