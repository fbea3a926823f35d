package passarino

import (
	"fmt"
	"math/big"

	"loopmatch/expr"
	"loopmatch/loops/vacuum"
)

// UVPole returns the coefficient of 1/ε of the ultraviolet divergences of the one-loop terms of
// e (the loop factor i/(16π²) included), leaving infrared poles out. It expands every integrand
// for large loop momentum — all external momenta and all masses treated as small, to the order
// of the superficial degree of divergence — reduces the tensors by symmetric integration and
// keeps the logarithmically divergent part: ∫ (k²)^a/(k²)^n with a − n = −2 has the UV pole 1/ε
// (in the package's normalisation; with an infrared regulator, ∫ 1/(k² − Λ²)² = 1/ε − ln(Λ²/μ²)),
// and every other power is scaleless. The result may still contain d from the tensor reduction:
// the residue is its value at d = 4, to be taken after any further d-dimensional algebra.
// masses lists the symbols that carry mass dimension; onShell lists the external-leg momenta
// whose tree-level propagators are evaluated on shell (as in Small.OnShell).
func UVPole(e expr.Expr, masses []string, onShell []OnShellMomentum) (expr.Expr, error) {
	measure := expr.FromAtom(expr.I, 1).MustMul(expr.FromAtom(expr.Pi, -2)).Scale(expr.RFRat(big.NewRat(1, 16)))
	var out []expr.Expr
	for _, t := range e.Terms() {
		switch len(t.Loops) {
		case 0:
			continue
		case 1:
		default:
			return expr.Expr{}, fmt.Errorf("UVPole: %d-loop terms are not handled", len(t.Loops))
		}
		k := t.Loops[0]
		omega, moms, err := uvDegree(t, k)
		if err != nil {
			return expr.Expr{}, err
		}
		if omega < 0 {
			continue
		}
		// Expansion order: the degree of divergence on top of the small factors that the
		// numerator already carries (only the −4 powers of k are kept below).
		s := Small{Momenta: moms, Masses: masses, OnShell: onShell}
		num, err := s.termDegree(t)
		if err != nil {
			return expr.Expr{}, err
		}
		cdeg := 0
		for _, pt := range t.Coef.Num().Terms() {
			cdeg = max(cdeg, s.monoDegree(pt.Mono))
		}
		s.Order = omega + num + cdeg
		x, _, err := s.ExpandProps(expr.FromTerm(t))
		if err != nil {
			return expr.Expr{}, fmt.Errorf("UVPole: %v", err)
		}
		for _, xt := range x.Terms() {
			r, _, err := reduceVacuumTerm(xt, k, logDivergent)
			if err != nil {
				return expr.Expr{}, err
			}
			out = append(out, r.MustMul(measure))
		}
	}
	// The pole's residue is the coefficient at d = 4; the caller sets d = 4 after any further
	// d-dimensional algebra (Dirac matrices) on the result.
	return expr.Sum(out...), nil
}

// logDivergent is the UV pole coefficient of ∫ (k²)^a / Π (k² − M_i²)^{n_i} with all M_i = 0:
// 1 when a − Σn = −2, otherwise 0 (scaleless).
func logDivergent(a int, lines []vacuum.Line) (expr.Expr, vacuum.Info, error) {
	n := 0
	for _, l := range lines {
		if !l.M2.IsZero() {
			return expr.Expr{}, vacuum.Info{}, fmt.Errorf("UVPole: massive line %s left after the large-momentum expansion", l.M2)
		}
		n += l.Pow
	}
	if a-n == -2 {
		return expr.Int(1), vacuum.Info{}, nil
	}
	return expr.Zero(), vacuum.Info{}, nil
}

// uvDegree is the superficial degree of divergence of a one-loop term (4 + numerator power of
// k − 2 × propagator powers) and the external momenta in its propagators.
func uvDegree(t expr.Term, k string) (int, []string, error) {
	deg := 4
	seen := map[string]bool{}
	var moms []string
	addMom := func(p string) {
		if p != k && !seen[p] {
			seen[p] = true
			moms = append(moms, p)
		}
	}
	for _, a := range t.Atoms {
		switch x := a.A.(type) {
		case expr.Prop:
			if x.K.Coef(k).Sign() == 0 {
				continue
			}
			deg += 2 * a.Pow
			for _, m := range x.K {
				addMom(m.Name)
			}
		case expr.Dot:
			n := 0
			if x.A == k {
				n++
			}
			if x.B == k {
				n++
			}
			deg += n * a.Pow
		case expr.Vec:
			if x.P == k {
				deg += a.Pow
			}
		case expr.Levi:
			for _, sl := range x.S {
				if !sl.Index && sl.Name == k {
					deg++
				}
			}
		case expr.Chain, expr.Trace:
			elems, _, _ := stringOf(x)
			for _, el := range elems {
				if el.Op == expr.NCSlash && el.Args[0] == k {
					deg++
				}
			}
		}
	}
	for _, el := range t.NC {
		if el.Op == expr.NCSlash && el.Args[0] == k {
			deg++
		}
	}
	return deg, moms, nil
}
