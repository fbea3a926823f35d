package dirac

import (
	"loopmatch/expr"
)

// EvalTraces replaces every trace atom tr(…) of e (a closed fermion loop written with the
// notation's tr) by its value, term by term: the rest of the term is passed to Trace as the
// factor it multiplies, so that a γ5-odd part is kept only where it survives the contraction
// (and refused without a reading point, as Trace does).
func EvalTraces(e expr.Expr, opt Options) (expr.Expr, error) {
	res := expr.Zero()
	for _, t := range e.Terms() {
		var traces []expr.Trace
		rest := t
		rest.Atoms = nil
		for _, a := range t.Atoms {
			if tr, ok := a.A.(expr.Trace); ok && a.Pow > 0 {
				for range a.Pow {
					traces = append(traces, tr)
				}
				continue
			}
			rest.Atoms = append(rest.Atoms, a)
		}
		cur := expr.FromTerm(rest)
		for _, tr := range traces {
			v, _, err := Trace(tr.Elems, cur, opt)
			if err != nil {
				return expr.Expr{}, err
			}
			cur = v
		}
		res = res.Add(cur)
	}
	return res, nil
}
